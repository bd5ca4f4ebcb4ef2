/* curves.h — tabulated curves y(x): interpolation and extrapolation.
 *
 * Pure numerics on SI doubles. A curve is a table of points with strictly
 * increasing x, read between points by straight lines (linear) or by
 * straight lines on logarithmic axes (log-log: a power law between each
 * pair of points), and beyond its ends by continuing the end interval. The
 * caller owns the arrays; nothing here allocates. */
#ifndef HEADROOM_METHODS_CURVES_H
#define HEADROOM_METHODS_CURVES_H

#include <stdbool.h>
#include <stddef.h>

typedef enum CurveInterp { CURVE_LINEAR, CURVE_LOGLOG } CurveInterp;

typedef struct Curve {
    const double *x, *y;     /* n points, x strictly increasing */
    size_t n;                /* at least 2 */
    CurveInterp interp;
} Curve;

typedef enum CurveStatus {
    CURVE_OK,
    CURVE_TOO_FEW,           /* fewer than two points */
    CURVE_NOT_FINITE,        /* a point is NaN or infinite (index in *bad) */
    CURVE_NOT_INCREASING,    /* x[*bad] <= x[*bad - 1] */
    CURVE_NOT_POSITIVE       /* log-log: x[*bad] or y[*bad] is not above zero */
} CurveStatus;

/* Check a table before use; *bad is the offending point's index. */
CurveStatus curve_check(const Curve *c, size_t *bad);

/* Where x lies: -1 below the first point, +1 above the last, 0 inside. */
int curve_side(const Curve *c, double x);

/* y(x), and optionally dy/dx, by the curve's interpolation; outside the
 * table, from the end interval. A log-log curve at x <= 0 gives NaN. */
double curve_eval(const Curve *c, double x, double *slope);

#endif
