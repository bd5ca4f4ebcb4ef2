/* solve.h — scalar root finding by Brent's method.
 *
 * A clean, general root finder: the caller passes a function of one double
 * and a bracket (or a trial value to expand a bracket around). Statuses are
 * specific so the report can explain a failure, and the report shows the
 * iterations, the final bracket and the residual. No allocation, no output. */
#ifndef HEADROOM_SOLVE_H
#define HEADROOM_SOLVE_H

#include <stdbool.h>

typedef enum SolveStatus {
    SOLVE_OK,
    SOLVE_NO_BRACKET,        /* f has the same sign at both ends */
    SOLVE_NOT_FINITE,        /* f returned NaN or infinity inside the bracket */
    SOLVE_MAX_ITER           /* did not converge within the iteration limit */
} SolveStatus;

typedef struct SolveReport {
    SolveStatus status;
    double root;
    double residual;         /* f(root) */
    double lo, hi;           /* final bracket */
    double f_lo, f_hi;       /* f at the ends of the starting bracket */
    double start_lo, start_hi;
    int iterations;
    int evaluations;
} SolveReport;

/* f returns false when it cannot be evaluated at x (treated as not finite). */
typedef bool (*SolveFn)(double x, void *ctx, double *fx);

#include "bounds.h" /* SOLVE_MAX_ITERATIONS */

/* Brent (1973), "Algorithms for Minimization without Derivatives", ch. 4:
 * inverse quadratic interpolation with bisection safeguards. Converges when
 * the bracket is below xtol + 4*eps*|x| or f is exactly zero. */
SolveReport solve_brent(SolveFn f, void *ctx, double lo, double hi, double xtol);

/* Expand a bracket geometrically around `trial` (both directions, then the
 * positive side only if `positive`), up to 60 expansions, then run Brent. */
SolveReport solve_expand(SolveFn f, void *ctx, double trial, bool positive, double xtol);

#endif
