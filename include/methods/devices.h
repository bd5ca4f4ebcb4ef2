/* devices.h — devices in a line: pressure-reducing valves, valves and meters
 * by flow coefficient, check valves, loss curves and pumps.
 *
 * Pure numerics on SI doubles (m^3/s, Pa, kg/m^3, m). A Device says what
 * the element is and holds its parameters; device_apply gives the static
 * pressure after it from the pressure before it and the flow through it,
 * and device_loss the pressure change of the flow-dependent kinds with its
 * derivative, for a network solver. Both a path (a device at a segment's
 * outlet) and a network (a device on a link) use the same Device. A curve
 * or pump curve a device points to is owned by the caller. Nothing here
 * allocates or prints. */
#ifndef HEADROOM_METHODS_DEVICES_H
#define HEADROOM_METHODS_DEVICES_H

#include <stdbool.h>

#include "methods/curves.h"
#include "methods/pumps.h"

typedef enum DeviceKind {
    DEVICE_PRV,              /* pressure-reducing valve: set, falloff, dp_min */
    DEVICE_FLOW_COEFF,       /* valve or meter by Cv or Kv: coeff, rho_ref */
    DEVICE_CHECK_VALVE,      /* one-way valve: cracking, and coeff when given */
    DEVICE_LOSS_CURVE,       /* Delta_p = curve(Q), the curve in Pa against m^3/s */
    DEVICE_HEAD_CURVE,       /* head gain H = curve(Q), in m against m^3/s */
    DEVICE_PUMP              /* head gain H = pump_head(Q) (pumps.h) */
} DeviceKind;

typedef struct Device {
    DeviceKind kind;
    double set;              /* PRV: outlet set pressure, Pa (gauge) */
    double falloff;          /* PRV: drop of the outlet below set at the flow, Pa */
    double dp_min;           /* PRV: least static drop across the valve, Pa */
    double coeff;            /* FLOW_COEFF, CHECK_VALVE: SI flow coefficient,
                              * m^3/s per Pa^0.5 (0: no flow loss) */
    double rho_ref;          /* FLOW_COEFF, CHECK_VALVE: density the coefficient
                              * is referred to, kg/m^3 */
    bool by_kv;              /* FLOW_COEFF, CHECK_VALVE: given as Kv (else Cv) */
    double cracking;         /* CHECK_VALVE: opening pressure, Pa */
    const Curve *curve;      /* LOSS_CURVE, HEAD_CURVE */
    const PumpCurve *pump;   /* PUMP */
} Device;

typedef enum DeviceStatus {
    DEVICE_OK,
    DEVICE_NOT_REGULATING,   /* PRV: the inlet is too low to hold the set pressure */
    DEVICE_CLOSED,           /* CHECK_VALVE: flow is not in the forward direction */
    DEVICE_NOT_FINITE        /* an input or a curve reading is not finite */
} DeviceStatus;

/* SI flow coefficients from the catalogue units, by the units' exact
 * definitions (NIST SP 811): Cv in gal/min per psi^0.5, Kv in m^3/h per
 * bar^0.5. */
double device_coeff_from_cv(double cv);
double device_coeff_from_kv(double kv);

/* Reference densities of the coefficients: water at 60 degF (15.56 degC)
 * for Cv (ISA-75.01) and at 15 degC for Kv (IEC 60534-2-1), both at one
 * standard atmosphere, from IAPWS-IF97. */
double device_rho_ref_cv(void);
double device_rho_ref_kv(void);

/* ISA-75.01 non-choked turbulent liquid flow, Q = N1*C*sqrt(Delta_p/SG),
 * solved for the drop: Delta_p = (rho/rho_ref)*(Q/C)^2 (Pa), C the SI
 * coefficient; signed with Q so a reverse flow has a negative drop. */
double device_coeff_dp(double coeff, double rho_ref, double rho, double Q);

/* The static pressure after the device, *p_out, from the pressure before
 * it p_in, the flow Q through it (positive forward) and the density:
 *   PRV          p_out = min(set - falloff, p_in - dp_min); NOT_REGULATING
 *                when p_in - dp_min is the smaller (the valve is wide open)
 *   FLOW_COEFF   p_out = p_in - device_coeff_dp(...)
 *   CHECK_VALVE  p_out = p_in - cracking - device_coeff_dp(...) for Q > 0;
 *                CLOSED for Q <= 0 (p_out = p_in)
 *   LOSS_CURVE   p_out = p_in - curve(Q)
 *   HEAD_CURVE   p_out = p_in + rho*g*curve(Q)
 *   PUMP         p_out = p_in + rho*g*pump_head(Q) */
DeviceStatus device_apply(const Device *d, double Q, double p_in, double rho, double *p_out);

/* The flow-dependent kinds (all but PRV): the static pressure drop at Q,
 * *dp (negative for a head gain), and its derivative d(dp)/dQ, *slope.
 * A closed check valve returns DEVICE_CLOSED with dp = 0 and slope = 0.
 * For a PRV, false is returned: its drop depends on the inlet pressure. */
bool device_loss(const Device *d, double Q, double rho, double *dp, double *slope, DeviceStatus *status);

/* "prv", "cv", "check_valve", "curve", "pump": a short word for the kind. */
const char *device_kind_name(DeviceKind k);

#endif
