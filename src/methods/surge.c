/* surge.c — Korteweg wave speed and the Joukowsky pressure rise.
 *
 * A velocity change in a full pipe travels as a pressure wave whose speed is
 * set by the water's bulk modulus and the pipe wall's stretch. These are
 * the classical closed forms used to screen water hammer; they assume a
 * linear-elastic, thin-walled pipe and an instantaneous (or faster than
 * 2L/a) change of velocity, and they ignore friction and cavitation. */
#include "methods/surge.h"

#include <ctype.h>
#include <math.h>
#include <stddef.h>

/* Wylie, E. B. and Streeter, V. L. (1993). Fluid Transients in Systems.
 * Prentice Hall, section 2.6: for a thin-walled pipe
 *   c1 = 1 - nu/2   anchored at its upstream end only,
 *   c1 = 1 - nu^2   anchored throughout against axial movement,
 *   c1 = 1          with expansion joints throughout. */
double surge_support_c1(SurgeSupport s, double poisson)
{
    switch (s) {
    case SURGE_SUPPORT_UPSTREAM: return 1.0 - poisson / 2.0;
    case SURGE_SUPPORT_ANCHORED: return 1.0 - poisson * poisson;
    case SURGE_SUPPORT_JOINTS: break;
    }
    return 1.0;
}

/* Thick-walled elastic pipe (D/e below about 25), as derived in Wylie and
 * Streeter (1993), section 2.6:
 *   expansion joints throughout:   c1 = 2e/D*(1 + nu) + D/(D + e)
 *   anchored at the upstream end:  c1 = 2e/D*(1 + nu) + D*(1 - nu/2)/(D + e)
 *   anchored throughout:           c1 = 2e/D*(1 + nu) + D*(1 - nu^2)/(D + e)
 * Each tends to the thin-wall factor as e/D -> 0. */
double surge_support_c1_thick(SurgeSupport s, double poisson, double D, double e)
{
    double shell = 2.0 * e / D * (1.0 + poisson);
    return shell + D * surge_support_c1(s, poisson) / (D + e);
}

/* Poisson's ratios of pipe materials, each as a published copy prints it:
 * PVC 0.410 and CPVC 0.386 at 73 degF, GF Harvel's pipe properties (U.S.
 * Plastic Corp., "PVC and CPVC pipe" property table); steel 0.30, the upper
 * end of "steel 0.27 - 0.3" (Altair Radioss help, "Poisson's ratio"
 * material table), the end that gives the faster wave and so the larger
 * surge. Copper and polyethylene (PEX) have no row: no published value
 * could be read, and wave_speed() asks for poisson= where one is needed. */
static const struct { const char *word; double nu; } POISSON[] = {
    {"stainless", 0.30}, {"steel", 0.30}, {"cpvc", 0.386}, {"pvc", 0.410},
};

static int starts_with_ci(const char *s, const char *w)
{
    for (; *w; s++, w++)
        if (tolower((unsigned char)*s) != *w)
            return 0;
    return 1;
}

double surge_poisson(const char *material)
{
    if (!material)
        return -1.0;
    for (const char *s = material; *s; s++) {
        if (s != material && isalpha((unsigned char)s[-1]))
            continue;
        for (size_t i = 0; i < sizeof POISSON / sizeof POISSON[0]; i++)
            if (starts_with_ci(s, POISSON[i].word))
                return POISSON[i].nu;
    }
    return -1.0;
}

/* Korteweg, D. J. (1878). Ueber die Fortpflanzungsgeschwindigkeit des
 * Schalles in elastischen Roehren. Ann. Phys. 241(12), 525-542; in the form
 * of Wylie and Streeter (1993), eq. 2.6.x:
 *   a = sqrt( (K/rho) / (1 + c1*(K/E)*(D/e)) ) */
SurgeStatus surge_wave_speed(double K, double rho, double D, double e, double E, double c1,
                             double *a)
{
    if (!(K > 0.0) || !(rho > 0.0) || !(D > 0.0) || !(e > 0.0) || !(E > 0.0) || !(c1 > 0.0) ||
        !isfinite(K) || !isfinite(rho) || !isfinite(D) || !isfinite(e) || !isfinite(E))
        return SURGE_BAD_INPUT;
    *a = sqrt((K / rho) / (1.0 + c1 * K * D / (E * e)));
    return SURGE_OK;
}

/* Joukowsky, N. (1898/1900). Ueber den hydraulischen Stoss in
 * Wasserleitungsroehren. Mem. Acad. Imp. Sci. St.-Petersbourg 9(5):
 *   dp = rho * a * dV */
double surge_joukowsky(double rho, double a, double dV)
{
    return rho * a * dV;
}

/* The time a wave needs to run to the reservoir and back: 2*L/a. A valve
 * closed faster than this sees the full Joukowsky rise. */
double surge_closure_time(double L, double a)
{
    return 2.0 * L / a;
}
