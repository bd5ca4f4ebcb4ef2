/* friction.c — Darcy friction factor: Colebrook-White and explicit fits.
 *
 * Colebrook-White is implicit in f; it is solved by Clamond's (2009)
 * two-step scheme, which reaches machine precision on the whole chart for
 * three logarithms, and far below the chart (Re < 100) for x = 1/sqrt(f) by
 * Halley's method on the equation's own residual, started from one
 * fixed-point pass of the equation itself. The
 * residual F(x) = x + 2*log10(rr/3.7 + 2.51*x/Re) is increasing and concave
 * in x, so Newton-type steps approach the root from below without
 * overshooting into the logarithm's forbidden region; two or three steps
 * reach machine precision, each costing one logarithm. The explicit
 * correlations are evaluated as published. */
#include "methods/friction.h"

#include <math.h>
#include <string.h>

#include "constants.h"

/* Validity ranges as stated by the authors or the usual secondary sources:
 * - Colebrook (1939) was fitted to turbulent data; the Moody (1944) chart
 *   spans 4000 <= Re <= 1e8 and 0 <= rr <= 0.05 (the range of the chart's
 *   data as tabulated in Inflection Point Engineering's "Moody Friction
 *   Factor Reference", Re 4000 to 1e8, eps/D to 0.05).
 * - Swamee & Jain (1976): 5000 <= Re <= 1e8, 1e-6 <= rr <= 0.05, as listed
 *   by Winning & Coole (2013).
 * - Haaland (1983): 4000 <= Re <= 1e8, 1e-6 <= rr <= 0.05 (Winning & Coole
 *   2013).
 * - Churchill (1977): all regimes, no published limits on Re; rr limited to
 *   the Moody chart's 0.05 here (common practice, no source).
 * - Laminar Hagen-Poiseuille f = 64/Re: Re < 2000 (common practice for the
 *   lower critical Reynolds number of pipe flow). */
static const FrictionRange RANGES[FRICTION_METHOD_COUNT] = {
    [FRICTION_COLEBROOK] = {4000.0, 1e8, 0.0, 0.05},
    [FRICTION_SWAMEE_JAIN] = {5000.0, 1e8, 1e-6, 0.05},
    [FRICTION_HAALAND] = {4000.0, 1e8, 1e-6, 0.05},
    [FRICTION_CHURCHILL] = {0.0, INFINITY, 0.0, 0.05},
    [FRICTION_LAMINAR] = {0.0, FRICTION_RE_LAMINAR, 0.0, INFINITY},
};

static const char *const NAMES[FRICTION_METHOD_COUNT] = {
    [FRICTION_COLEBROOK] = "colebrook",
    [FRICTION_SWAMEE_JAIN] = "swamee_jain",
    [FRICTION_HAALAND] = "haaland",
    [FRICTION_CHURCHILL] = "churchill",
    [FRICTION_LAMINAR] = "laminar",
};

const FrictionRange *friction_range(FrictionMethod m)
{
    return &RANGES[m];
}

const char *friction_method_name(FrictionMethod m)
{
    return NAMES[m];
}

int friction_method_lookup(const char *name)
{
    for (int i = 0; i < FRICTION_METHOD_COUNT; i++)
        if (strcmp(NAMES[i], name) == 0)
            return i;
    return -1;
}

size_t friction_method_choices(const char **out, size_t max)
{
    size_t k = 0;
    for (int i = 0; i < FRICTION_METHOD_COUNT && k < max; i++)
        if (i != FRICTION_LAMINAR)
            out[k++] = NAMES[i];
    return k;
}

static FrictionStatus check_inputs(double Re, double rr)
{
    if (!(Re > 0.0) || !isfinite(Re))
        return FRICTION_BAD_RE;
    if (!(rr >= 0.0) || !(rr < 1.0))
        return FRICTION_BAD_RR;
    return FRICTION_OK;
}

/* Swamee, P. K. and Jain, A. K. (1976). Explicit equations for pipe-flow
 * problems. J. Hydraulics Div. ASCE 102(5), 657-664:
 *   f = 0.25 / [log10(rr/3.7 + 5.74/Re^0.9)]^2 */
FrictionStatus friction_swamee_jain(double Re, double rr, double *f)
{
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    double l = log10(rr / 3.7 + 5.74 / pow(Re, 0.9));
    *f = 0.25 / (l * l);
    return FRICTION_OK;
}

/* Haaland, S. E. (1983). Simple and explicit formulas for the friction
 * factor in turbulent pipe flow. J. Fluids Eng. 105(1), 89-90:
 *   1/sqrt(f) = -1.8*log10((rr/3.7)^1.11 + 6.9/Re) */
FrictionStatus friction_haaland(double Re, double rr, double *f)
{
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    double x = -1.8 * log10(pow(rr / 3.7, 1.11) + 6.9 / Re);
    *f = 1.0 / (x * x);
    return FRICTION_OK;
}

/* Churchill, S. W. (1977). Friction-factor equation spans all fluid-flow
 * regimes. Chem. Eng. 84(24), 91-92:
 *   f = 8*((8/Re)^12 + (A + B)^-1.5)^(1/12)
 *   A = (2.457*ln(1/((7/Re)^0.9 + 0.27*rr)))^16,  B = (37530/Re)^16 */
FrictionStatus friction_churchill(double Re, double rr, double *f)
{
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    double A = pow(2.457 * log(1.0 / (pow(7.0 / Re, 0.9) + 0.27 * rr)), 16.0);
    double B = pow(37530.0 / Re, 16.0);
    *f = 8.0 * pow(pow(8.0 / Re, 12.0) + pow(A + B, -1.5), 1.0 / 12.0);
    return FRICTION_OK;
}

/* Colebrook, C. F. (1939). Turbulent flow in pipes, with particular reference
 * to the transition region between the smooth and rough pipe laws. J. Inst.
 * Civil Eng. 11(4), 133-156:
 *   1/sqrt(f) = -2*log10(rr/3.7 + 2.51/(Re*sqrt(f)))
 * With x = 1/sqrt(f), a = rr/3.7, b = 2.51/Re and c = 2/ln(10) the residual
 *   F(x) = x + c*ln(a + b*x),  F' = 1 + c*b/u,  F'' = -c*b^2/u^2  (u = a+b*x)
 * is driven to zero by Halley's step dx = (F/F') / (1 - F*F''/(2*F'^2)).
 * Halley's method triples the correct digits per step, so once a step is
 * below 1e-6 relative the next iterate is exact to rounding. */
/* Clamond, D. (2009). Efficient resolution of the Colebrook equation. Ind.
 * Eng. Chem. Res. 48(7), 3665-3671. With x1 = rr*Re*ln(10)/18.574 and
 * x2 = ln(Re*ln(10)/5.02) the equation becomes F + ln(x1 + F) = x2 for
 * F = ln(10)/(2*sqrt(f)); two steps of the paper's third-order iteration from F0 = x2 - 0.2 reach machine
 * precision over the whole chart, for three logarithms and no loop. The
 * start needs x1 + F0 > 0 (Re above about 3 in smooth pipe); below
 * CLAMOND_MIN_RE, far off the chart, the Halley solver below is used. */
static const double CLAMOND_MIN_RE = 100.0;

static double colebrook_clamond(double Re, double rr)
{
    double x1 = rr * Re * 0.123968186335417556;  /* rr*Re*ln(10)/18.574 */
    double x2 = log(Re) - 0.779397488455682028;  /* ln(Re*ln(10)/5.02) */
    double F = x2 - 0.2;
    double e = (log(x1 + F) - 0.2) / (1.0 + x1 + F);
    F -= (1.0 + x1 + F + 0.5 * e) * e * (x1 + F) / (1.0 + x1 + F + e * (1.0 + e / 3.0));
    e = (log(x1 + F) + F - x2) / (1.0 + x1 + F);
    F -= (1.0 + x1 + F + 0.5 * e) * e * (x1 + F) / (1.0 + x1 + F + e * (1.0 + e / 3.0));
    F = 1.151292546497022842 / F;                /* ln(10)/2 / F = 1/sqrt(f) */
    return F * F;
}

FrictionStatus friction_colebrook_iter(double Re, double rr, double *f, int *iterations)
{
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    if (Re >= CLAMOND_MIN_RE) {
        double fc = colebrook_clamond(Re, rr);
        if (isfinite(fc) && fc > 0.0) {
            if (iterations)
                *iterations = 2;
            *f = fc;
            return FRICTION_OK;
        }
    }
    return friction_colebrook_halley(Re, rr, f, iterations);
}

FrictionStatus friction_colebrook_halley(double Re, double rr, double *f, int *iterations)
{
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    const double c = 2.0 / 2.302585092994045684; /* 2/ln(10) */
    double a = rr / 3.7, b = 2.51 / Re;
    /* Start: one fixed-point pass x0 = -2*log10(a + b*8) from x = 8 (f near
     * 0.016, mid-chart); it costs one logarithm and is within a few percent
     * of the root across the chart. Far outside (very low Re) it can be
     * small or negative; any x >= 1 keeps a + b*x > 0, and the concave
     * residual's first step then lands at or below the root. */
    double x = -c * log(a + 8.0 * b);
    if (!(x > 1.0))
        x = 1.0;
    int it = 0;
    bool converged = false;
    while (!converged && it < 50 && isfinite(x)) {
        double u = a + b * x;
        double F = x + c * log(u);
        double d1 = 1.0 + c * b / u;
        double d2 = -c * b * b / (u * u);
        double q = F / d1;
        double dx = q / (1.0 - 0.5 * q * d2 / d1);
        double xn = x - dx;
        it++;
        if (!(a + b * xn > 0.0)) {
            /* Far from the chart a step may leave the logarithm's domain
             * u > 0; go half way to its edge instead. */
            x = 0.5 * (x - a / b);
            continue;
        }
        x = xn;
        converged = fabs(dx) <= 1e-7 * fabs(x);
    }
    if (iterations)
        *iterations = it;
    if (!converged || !(x > 0.0))
        return FRICTION_NO_CONVERGENCE;
    *f = 1.0 / (x * x);
    return FRICTION_OK;
}

FrictionStatus friction_colebrook(double Re, double rr, double *f)
{
    return friction_colebrook_iter(Re, rr, f, NULL);
}

FrictionStatus friction_eval(FrictionMethod m, double Re, double rr, double *f)
{
    switch (m) {
    case FRICTION_COLEBROOK: return friction_colebrook(Re, rr, f);
    case FRICTION_SWAMEE_JAIN: return friction_swamee_jain(Re, rr, f);
    case FRICTION_HAALAND: return friction_haaland(Re, rr, f);
    case FRICTION_CHURCHILL: return friction_churchill(Re, rr, f);
    case FRICTION_LAMINAR:
    case FRICTION_METHOD_COUNT: break;
    }
    FrictionStatus s = check_inputs(Re, rr);
    if (s != FRICTION_OK)
        return s;
    /* Hagen-Poiseuille: f = 64/Re for fully developed laminar flow. */
    *f = 64.0 / Re;
    return FRICTION_OK;
}

FrictionStatus friction_factor(FrictionMethod m, double Re, double rr, double *f,
                               FrictionMethod *used)
{
    FrictionMethod use = m;
    if (m != FRICTION_CHURCHILL && Re < FRICTION_RE_LAMINAR)
        use = FRICTION_LAMINAR;
    if (used)
        *used = use;
    return friction_eval(use, Re, rr, f);
}

/* Hazen-Williams (Williams, G. S. and Hazen, A., Hydraulic Tables, 1905;
 * 3rd ed. 1920), velocity form V = k*C*R^0.63*S^0.54 with k = 1.318 in
 * ft-s units and k = 0.849 in SI. Solved for the head loss of a full
 * circular pipe (R = D/4, V = 4Q/(pi*D^2)) it becomes
 *   h = 10.67 * L * Q^1.852 / (C^1.852 * D^4.8704)        (SI: m, m^3/s)
 * with 1.852 = 1/0.54 and 4.8704 = 2.63/0.54. The constant 10.67 is
 * (4/pi/(0.849*0.25^0.63))^(1/0.54) = 10.674 rounded to four digits, as the
 * unit tests show. The US form h_f = 4.52*Q^1.852/(C^1.852*d^4.87) in
 * psi per foot (Q in gal/min, d in in, water near 60 degF) is the same law. */
double friction_hazen_williams(double Q, double C, double D, double L)
{
    return HW_K_SI * L * pow(fabs(Q), 1.852) / (pow(C, 1.852) * pow(D, 4.8704));
}

double friction_hazen_williams_k_derived(void)
{
    const double pi = CONST_PI;
    return pow(4.0 / pi / (0.849 * pow(0.25, 0.63)), 1.0 / 0.54);
}
