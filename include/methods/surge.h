/* surge.h — pressure-wave speed and water-hammer screening.
 *
 * Pure numerics in SI (Pa, kg/m^3, m, m/s, s): the Korteweg wave speed in a
 * thin-walled elastic pipe, the Joukowsky pressure rise for an instantaneous
 * velocity change, and the wave's round-trip time. A screening, not a
 * transient analysis. Nothing allocates. */
#ifndef HEADROOM_METHODS_SURGE_H
#define HEADROOM_METHODS_SURGE_H

/* How the pipe is restrained axially; sets the Korteweg factor c1. */
typedef enum SurgeSupport {
    SURGE_SUPPORT_JOINTS,     /* expansion joints throughout: c1 = 1 */
    SURGE_SUPPORT_UPSTREAM,   /* anchored at the upstream end only: c1 = 1 - nu/2 */
    SURGE_SUPPORT_ANCHORED    /* anchored throughout against axial movement: c1 = 1 - nu^2 */
} SurgeSupport;

typedef enum SurgeStatus {
    SURGE_OK,
    SURGE_BAD_INPUT           /* a non-positive or non-finite modulus, density or size */
} SurgeStatus;

#define SURGE_THIN_WALL_RATIO 25.0   /* D/e above which the thin-wall form holds */

double surge_support_c1(SurgeSupport s, double poisson);

/* The thick-walled factor (Wylie and Streeter 1993, 2.6), for D/e below
 * SURGE_THIN_WALL_RATIO; D the bore, e the wall. */
double surge_support_c1_thick(SurgeSupport s, double poisson, double D, double e);

/* Poisson's ratio for a pipe material ("steel", "copper", "PVC", ...), or a
 * negative number when the material is not tabulated. */
double surge_poisson(const char *material);

/* a = sqrt((K/rho) / (1 + c1*K*D/(E*e))) */
SurgeStatus surge_wave_speed(double K, double rho, double D, double e, double E, double c1,
                             double *a);

/* Joukowsky: dp = rho * a * dV. */
double surge_joukowsky(double rho, double a, double dV);

/* Wave round trip over a length L: 2*L/a. */
double surge_closure_time(double L, double a);

#endif
