/* friction.h — Darcy friction factor correlations for full pipe flow.
 *
 * Pure numerics on dimensionless inputs: Reynolds number Re and relative
 * roughness rr = roughness/diameter. Each correlation has its own function
 * and a stated validity range; the caller decides what to do outside it
 * (the calc glue warns). Nothing here allocates or prints. */
#ifndef HEADROOM_METHODS_FRICTION_H
#define HEADROOM_METHODS_FRICTION_H

#include <stdbool.h>
#include <stddef.h>

#define FRICTION_RE_LAMINAR 2000.0     /* below: laminar, f = 64/Re */
#define FRICTION_RE_TURBULENT 4000.0   /* 2000..4000: transition zone */

typedef enum FrictionMethod {
    FRICTION_COLEBROOK,
    FRICTION_SWAMEE_JAIN,
    FRICTION_HAALAND,
    FRICTION_CHURCHILL,
    FRICTION_LAMINAR,
    FRICTION_METHOD_COUNT
} FrictionMethod;

typedef enum FrictionStatus {
    FRICTION_OK,
    FRICTION_BAD_RE,          /* Re <= 0 or not finite */
    FRICTION_BAD_RR,          /* rr < 0, rr >= 1 or not finite */
    FRICTION_NO_CONVERGENCE   /* the Colebrook iteration did not settle */
} FrictionStatus;

/* Validity range of a correlation as published (see friction.c). */
typedef struct FrictionRange {
    double re_min, re_max, rr_min, rr_max;
} FrictionRange;

const FrictionRange *friction_range(FrictionMethod m);

/* Name used in calc files ("colebrook", ...) and back; -1 if unknown. */
const char *friction_method_name(FrictionMethod m);
int friction_method_lookup(const char *name);
/* The names a calc may choose (every method but the laminar law, which is
 * chosen by Re), in enum order, into out; their count. */
size_t friction_method_choices(const char **out, size_t max);

/* The correlations themselves; each checks Re > 0, 0 <= rr < 1. */
FrictionStatus friction_colebrook(double Re, double rr, double *f);
FrictionStatus friction_swamee_jain(double Re, double rr, double *f);
FrictionStatus friction_haaland(double Re, double rr, double *f);
FrictionStatus friction_churchill(double Re, double rr, double *f);

/* Colebrook with the number of correction steps taken (for the bench):
 * Clamond's (2009) two-step solution for Re >= 100, the Halley solver
 * below it. */
FrictionStatus friction_colebrook_iter(double Re, double rr, double *f, int *iterations);
/* Colebrook by Halley's method on the equation's own residual, to rounding
 * (any Re > 0); the tests hold the Clamond solution to it. */
FrictionStatus friction_colebrook_halley(double Re, double rr, double *f, int *iterations);

/* One correlation by enum (FRICTION_LAMINAR: 64/Re). */
FrictionStatus friction_eval(FrictionMethod m, double Re, double rr, double *f);

/* The regime-aware choice of friction_factor(): 64/Re below Re 2000 for
 * every method but Churchill (which spans all regimes itself); otherwise the
 * chosen correlation. *used is the method actually applied. */
FrictionStatus friction_factor(FrictionMethod m, double Re, double rr, double *f,
                               FrictionMethod *used);

/* Hazen-Williams head loss in SI: Q in m^3/s, D and L in m, C dimensionless;
 * returns the head loss in m (see friction.c for the constant). */
double friction_hazen_williams(double Q, double C, double D, double L);

/* The SI constant derived from the velocity form V = 0.849*C*R^0.63*S^0.54
 * (R = D/4), for the tests: (4/pi / (0.849*0.25^0.63))^(1/0.54). */
double friction_hazen_williams_k_derived(void);

#define HW_K_SI 10.67      /* SI coefficient (m, m^3/s), see friction.c */
#define HW_V_MIN 0.3       /* m/s, common practice, no source */
#define HW_V_MAX 3.0       /* m/s, common practice, no source */

#endif
