/* water.h — properties of liquid water from the IAPWS releases.
 *
 * Pure numerics on SI doubles (K, Pa, kg/m^3, Pa*s): no parser, no printing.
 * Liquid water in IAPWS-IF97 region 1, restricted here to the temperatures a
 * water piping calc needs (0.01 to 150 degC) at pressures above saturation
 * and up to 100 MPa. Nothing here allocates. */
#ifndef HEADROOM_METHODS_WATER_H
#define HEADROOM_METHODS_WATER_H

#include "constants.h"

#define WATER_T_MIN 273.15            /* K: 0 degC, the lower bound of IF97 region 1 */
#define WATER_T_MAX 423.15            /* K: 150 degC */
#define WATER_P_MAX 100.0e6           /* Pa: upper bound of IF97 region 1 */
#define WATER_P_DEFAULT CONST_STANDARD_ATMOSPHERE /* Pa */
#define WATER_G CONST_STANDARD_GRAVITY           /* m/s^2 */

typedef enum WaterStatus {
    WATER_OK,
    WATER_T_OUT_OF_RANGE,     /* T outside WATER_T_MIN..WATER_T_MAX */
    WATER_P_BELOW_SATURATION, /* p < p_sat(T): the water would boil */
    WATER_P_TOO_HIGH,         /* p > WATER_P_MAX */
    WATER_NOT_FINITE          /* an input is NaN or infinite */
} WaterStatus;

typedef struct WaterProps {
    double T;       /* K */
    double p;       /* Pa */
    double rho;     /* kg/m^3, IF97 region 1 */
    double mu;      /* Pa*s, IAPWS 2008 without critical enhancement */
    double nu;      /* m^2/s, mu/rho */
    double gamma;   /* N/m^3, rho*g with standard gravity */
    double p_vap;   /* Pa, IF97 region 4 saturation pressure at T */
    double K;       /* Pa, isentropic bulk modulus rho*w^2 */
    double w;       /* m/s, speed of sound (IF97 region 1) */
    double cp;      /* J/(kg*K), isobaric heat capacity (for tests) */
} WaterProps;

/* Region-1 properties at (T, p). Returns WATER_OK and fills *out, or the
 * reason the state is outside the range served here. */
WaterStatus water_props(double T, double p, WaterProps *out);

/* IF97 region 4 saturation pressure, Pa, valid 273.15 K <= T <= 647.096 K. */
double water_psat(double T);

/* IF97 region 1 specific volume (m^3/kg), speed of sound (m/s) and isobaric
 * heat capacity (J/(kg*K)) without range checks (for the verification tables). */
void water_if97_region1(double T, double p, double *v, double *w, double *cp);

/* IAPWS 2008 viscosity (Pa*s) from density and temperature, critical
 * enhancement mu2 taken as 1. */
double water_viscosity(double rho, double T);

#endif
