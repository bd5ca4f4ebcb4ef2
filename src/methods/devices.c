/* devices.c — the static pressure change across a device in a line.
 *
 * A valve or meter by flow coefficient follows ANSI/ISA-75.01.01 (IEC
 * 60534-2-1) for non-choked turbulent flow of an incompressible liquid,
 * Q = N1*C*sqrt(Delta_p/(rho/rho_0)), here with C converted to SI once so
 * no N1 constant is needed. A pressure-reducing valve holds its outlet at
 * the set pressure less the fall-off at the flow (the catalogue's fall-off,
 * as the ASSE 1003 performance test measures it), until the inlet is too low
 * for that: it then stands wide open with its least drop. A curve device
 * reads a tabulated drop or head (curves.h); a pump adds its head. */
#include "methods/devices.h"

#include <math.h>

#include "methods/water.h"

static const double GPM = 3.785411784e-3 / 60.0;   /* m^3/s: 231 in^3 a minute */
static const double PSI = 6894.757293168361;       /* Pa: lbf/in^2 */
static const double M3H = 1.0 / 3600.0;            /* m^3/s */
static const double BAR = 1.0e5;                   /* Pa */

double device_coeff_from_cv(double cv)
{
    return cv * GPM / sqrt(PSI);
}

double device_coeff_from_kv(double kv)
{
    return kv * M3H / sqrt(BAR);
}

static double rho_at(double T)
{
    WaterProps w;
    return water_props(T, WATER_P_DEFAULT, &w) == WATER_OK ? w.rho : NAN;
}

double device_rho_ref_cv(void)
{
    return rho_at((60.0 - 32.0) * 5.0 / 9.0 + 273.15);
}

double device_rho_ref_kv(void)
{
    return rho_at(288.15);
}

double device_coeff_dp(double coeff, double rho_ref, double rho, double Q)
{
    double r = Q / coeff;
    return rho / rho_ref * r * fabs(r);
}

static double head_gain(const Device *d, double Q, double *slope)
{
    if (d->kind == DEVICE_PUMP) {
        if (slope)
            *slope = d->pump->b + 2.0 * d->pump->c * Q;
        return pump_head(d->pump, Q);
    }
    return curve_eval(d->curve, Q, slope);
}

bool device_loss(const Device *d, double Q, double rho, double *dp, double *slope, DeviceStatus *status)
{
    double s = 0.0, x = 0.0;
    *status = DEVICE_OK;
    switch (d->kind) {
    case DEVICE_PRV:
        return false;
    case DEVICE_FLOW_COEFF:
        x = device_coeff_dp(d->coeff, d->rho_ref, rho, Q);
        s = 2.0 * rho / d->rho_ref * fabs(Q) / (d->coeff * d->coeff);
        break;
    case DEVICE_CHECK_VALVE:
        if (!(Q > 0.0)) {
            *status = DEVICE_CLOSED;
            break;
        }
        x = d->cracking;
        if (d->coeff > 0.0) {
            x += device_coeff_dp(d->coeff, d->rho_ref, rho, Q);
            s = 2.0 * rho / d->rho_ref * Q / (d->coeff * d->coeff);
        }
        break;
    case DEVICE_LOSS_CURVE:
        x = curve_eval(d->curve, Q, &s);
        break;
    case DEVICE_HEAD_CURVE:
    case DEVICE_PUMP: {
        double h = head_gain(d, Q, &s);
        x = -rho * WATER_G * h;
        s = -rho * WATER_G * s;
        break;
    }
    }
    if (!isfinite(x) || !isfinite(s))
        *status = DEVICE_NOT_FINITE;
    *dp = x;
    if (slope)
        *slope = s;
    return true;
}

DeviceStatus device_apply(const Device *d, double Q, double p_in, double rho, double *p_out)
{
    if (!isfinite(Q) || !isfinite(p_in) || !isfinite(rho))
        return DEVICE_NOT_FINITE;
    if (d->kind == DEVICE_PRV) {
        double held = d->set - d->falloff, open = p_in - d->dp_min;
        if (held <= open) {
            *p_out = held;
            return DEVICE_OK;
        }
        *p_out = open;
        return DEVICE_NOT_REGULATING;
    }
    double dp = 0.0;
    DeviceStatus st;
    device_loss(d, Q, rho, &dp, NULL, &st);
    *p_out = p_in - dp;
    if (st == DEVICE_OK && !isfinite(*p_out))
        st = DEVICE_NOT_FINITE;
    return st;
}

const char *device_kind_name(DeviceKind k)
{
    switch (k) {
    case DEVICE_PRV: return "prv";
    case DEVICE_FLOW_COEFF: return "flow coefficient";
    case DEVICE_CHECK_VALVE: return "check_valve";
    case DEVICE_LOSS_CURVE: return "loss curve";
    case DEVICE_HEAD_CURVE: return "head curve";
    case DEVICE_PUMP: return "pump";
    }
    return "device";
}
