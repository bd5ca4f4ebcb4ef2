/* water.c — liquid water properties from IAPWS-IF97 and IAPWS 2008.
 *
 * Density, speed of sound and heat capacity come from the region-1 Gibbs
 * free energy of IAPWS-IF97, the saturation pressure from the region-4
 * equation, and viscosity from the IAPWS 2008 release evaluated with the
 * IF97 density. The critical enhancement of the viscosity (mu2) is taken as
 * 1: the release confines it to a small region around the critical point
 * (roughly 645.91 K < T < 650.77 K), far above the 150 degC served here, so
 * neglecting it changes nothing in this range. The bulk modulus reported is
 * the isentropic one, K_s = rho*w^2 from the IF97 speed of sound: it is the
 * modulus of a pressure wave, which is what the Korteweg wave speed needs. */
#include "methods/water.h"

#include <math.h>
#include <stddef.h>

/* IAPWS-IF97 (IAPWS R7-97(2012)), region 1: dimensionless Gibbs free energy
 *   g/(R*T) = gamma(pi, tau) = sum n_i (7.1 - pi)^I_i (tau - 1.222)^J_i
 * with pi = p/16.53 MPa, tau = 1386 K/T, R = 0.461526 kJ/(kg*K).
 * Coefficients of Table 2 of the release. */
static const struct { int I, J; double n; } IF97_R1[34] = {
    {0, -2, 0.14632971213167},     {0, -1, -0.84548187169114},
    {0, 0, -0.37563603672040e1},   {0, 1, 0.33855169168385e1},
    {0, 2, -0.95791963387872},     {0, 3, 0.15772038513228},
    {0, 4, -0.16616417199501e-1},  {0, 5, 0.81214629983568e-3},
    {1, -9, 0.28319080123804e-3},  {1, -7, -0.60706301565874e-3},
    {1, -1, -0.18990068218419e-1}, {1, 0, -0.32529748770505e-1},
    {1, 1, -0.21841717175414e-1},  {1, 3, -0.52838357969930e-4},
    {2, -3, -0.47184321073267e-3}, {2, 0, -0.30001780793026e-3},
    {2, 1, 0.47661393906987e-4},   {2, 3, -0.44141845330846e-5},
    {2, 17, -0.72694996297594e-15},{3, -4, -0.31679644845054e-4},
    {3, 0, -0.28270797985312e-5},  {3, 6, -0.85205128120103e-9},
    {4, -5, -0.22425281908000e-5}, {4, -2, -0.65171222895601e-6},
    {4, 10, -0.14341729937924e-12},{5, -8, -0.40516996860117e-6},
    {8, -11, -0.12734301741641e-8},{8, -6, -0.17424871230634e-9},
    {21, -29, -0.68762131295531e-18},{23, -31, 0.14478307828521e-19},
    {29, -38, 0.26335781662795e-22},{30, -39, -0.11947622640071e-22},
    {31, -40, 0.18228094581404e-23},{32, -41, -0.93537087292458e-25},
};

static const double IF97_R = 461.526;      /* J/(kg*K), specific gas constant */
static const double IF97_PSTAR = 16.53e6;  /* Pa */
static const double IF97_TSTAR = 1386.0;   /* K */

/* x^k for a small signed integer k by repeated squaring: exact in the
 * sense that it rounds like a product chain, and far cheaper than pow(). */
static double ipow(double x, int k)
{
    unsigned m = (unsigned)(k < 0 ? -k : k);
    double r = 1.0, b = x;
    while (m) {
        if (m & 1u)
            r *= b;
        b *= b;
        m >>= 1;
    }
    return k < 0 ? 1.0 / r : r;
}

void water_if97_region1(double T, double p, double *v, double *w, double *cp)
{
    double pi = p / IF97_PSTAR, tau = IF97_TSTAR / T;
    double a = 7.1 - pi, b = tau - 1.222;
    double g_p = 0, g_pp = 0, g_t = 0, g_tt = 0, g_pt = 0;
    for (size_t i = 0; i < sizeof IF97_R1 / sizeof IF97_R1[0]; i++) {
        int I = IF97_R1[i].I, J = IF97_R1[i].J;
        double n = IF97_R1[i].n;
        double aI1 = ipow(a, I - 1), bJ1 = ipow(b, J - 1);
        double aI = aI1 * a, bJ = bJ1 * b;
        g_p += -n * I * aI1 * bJ;
        g_pp += n * I * (I - 1) * ipow(a, I - 2) * bJ;
        g_t += n * aI * J * bJ1;
        g_tt += n * aI * J * (J - 1) * ipow(b, J - 2);
        g_pt += -n * I * aI1 * J * bJ1;
    }
    (void)g_t;
    if (v)
        *v = pi * g_p * IF97_R * T / p;
    if (cp)
        *cp = -tau * tau * g_tt * IF97_R;
    if (w) {
        double d = g_p - tau * g_pt;
        double den = d * d / (tau * tau * g_tt) - g_pp;
        *w = sqrt(IF97_R * T * g_p * g_p / den);
    }
}

/* IAPWS-IF97 region 4, saturation-pressure equation (eq. 30), coefficients
 * of Table 34:
 *   theta = T/1K + n9/(T/1K - n10)
 *   A = theta^2 + n1*theta + n2, B = n3*theta^2 + n4*theta + n5,
 *   C = n6*theta^2 + n7*theta + n8
 *   p_s/1MPa = (2C/(-B + sqrt(B^2 - 4AC)))^4 */
double water_psat(double T)
{
    static const double n[11] = {
        0.0,
        0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2,
        0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2,
        -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
        0.65017534844798e3,
    };
    double th = T + n[9] / (T - n[10]);
    double A = th * th + n[1] * th + n[2];
    double B = n[3] * th * th + n[4] * th + n[5];
    double C = n[6] * th * th + n[7] * th + n[8];
    double x = 2.0 * C / (-B + sqrt(B * B - 4.0 * A * C));
    x *= x;
    return x * x * 1.0e6;
}

/* IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of
 * Ordinary Water Substance:
 *   mu/mu* = mu0(Tb) * mu1(Tb, rhob) * mu2,   mu* = 1e-6 Pa*s
 *   mu0 = 100*sqrt(Tb) / sum_{i=0..3} H_i/Tb^i                    (eq. 11)
 *   mu1 = exp(rhob * sum_i sum_j H_ij (1/Tb - 1)^i (rhob - 1)^j)  (eq. 12)
 * with Tb = T/647.096 K and rhob = rho/322 kg/m^3; mu2 = 1 (see the top). */
double water_viscosity(double rho, double T)
{
    static const double H[4] = {1.67752, 2.20462, 0.6366564, -0.241605};
    static const double Hij[6][7] = {
        {0.520094, 0.222531, -0.281378, 0.161913, -0.0325372, 0.0, 0.0},
        {0.0850895, 0.999115, -0.906851, 0.257399, 0.0, 0.0, 0.0},
        {-1.08374, 1.88797, -0.772479, 0.0, 0.0, 0.0, 0.0},
        {-0.289555, 1.26613, -0.489837, 0.0, 0.0698452, 0.0, -0.00435673},
        {0.0, 0.0, -0.25704, 0.0, 0.0, 0.00872102, 0.0},
        {0.0, 0.120573, 0.0, 0.0, 0.0, 0.0, -0.000593264},
    };
    double Tb = T / 647.096, rb = rho / 322.0;
    double s0 = H[0] + H[1] / Tb + H[2] / (Tb * Tb) + H[3] / (Tb * Tb * Tb);
    double mu0 = 100.0 * sqrt(Tb) / s0;
    double x = 1.0 / Tb - 1.0, y = rb - 1.0;
    double sum = 0.0, xi = 1.0;
    for (int i = 0; i < 6; i++) {
        double inner = 0.0, yj = 1.0;
        for (int j = 0; j < 7; j++) {
            inner += Hij[i][j] * yj;
            yj *= y;
        }
        sum += xi * inner;
        xi *= x;
    }
    return 1.0e-6 * mu0 * exp(rb * sum);
}

WaterStatus water_props(double T, double p, WaterProps *out)
{
    if (!isfinite(T) || !isfinite(p))
        return WATER_NOT_FINITE;
    /* 32 degF converts to 273.15 K give or take an ulp: the bound admits it. */
    if (T < WATER_T_MIN - 1e-9 || T > WATER_T_MAX)
        return WATER_T_OUT_OF_RANGE;
    if (p > WATER_P_MAX)
        return WATER_P_TOO_HIGH;
    double ps = water_psat(T);
    if (p < ps)
        return WATER_P_BELOW_SATURATION;
    double v, w, cp;
    water_if97_region1(T, p, &v, &w, &cp);
    out->T = T;
    out->p = p;
    out->rho = 1.0 / v;
    out->mu = water_viscosity(out->rho, T);
    out->nu = out->mu / out->rho;
    out->gamma = out->rho * WATER_G;
    out->p_vap = ps;
    out->w = w;
    out->K = out->rho * w * w;
    out->cp = cp;
    return WATER_OK;
}
