/* curves.c — reading a tabulated curve between and beyond its points.
 *
 * Linear: y = y_i + (x - x_i)*(y_{i+1} - y_i)/(x_{i+1} - x_i).
 * Log-log: ln y is linear in ln x, so y = y_i*(x/x_i)^m with
 * m = ln(y_{i+1}/y_i)/ln(x_{i+1}/x_i), the straight line a manufacturer's
 * pressure-drop chart on logarithmic axes shows. Outside the table the end
 * interval's line (or power law) is continued: an extrapolation the caller
 * warns about. The interval is found by bisection. */
#include "methods/curves.h"

#include <math.h>

CurveStatus curve_check(const Curve *c, size_t *bad)
{
    *bad = 0;
    if (c->n < 2)
        return CURVE_TOO_FEW;
    for (size_t i = 0; i < c->n; i++) {
        *bad = i;
        if (!isfinite(c->x[i]) || !isfinite(c->y[i]))
            return CURVE_NOT_FINITE;
        if (i > 0 && !(c->x[i] > c->x[i - 1]))
            return CURVE_NOT_INCREASING;
        if (c->interp == CURVE_LOGLOG && !(c->x[i] > 0 && c->y[i] > 0))
            return CURVE_NOT_POSITIVE;
    }
    *bad = 0;
    return CURVE_OK;
}

int curve_side(const Curve *c, double x)
{
    if (x < c->x[0])
        return -1;
    if (x > c->x[c->n - 1])
        return 1;
    return 0;
}

/* The interval [i, i+1] that holds x, or the end interval beyond the table. */
static size_t interval_of(const Curve *c, double x)
{
    if (x <= c->x[0])
        return 0;
    if (x >= c->x[c->n - 1])
        return c->n - 2;
    size_t lo = 0, hi = c->n - 1; /* x[lo] < x < x[hi] */
    while (hi - lo > 1) {
        size_t mid = lo + (hi - lo) / 2;
        if (c->x[mid] <= x)
            lo = mid;
        else
            hi = mid;
    }
    return lo;
}

double curve_eval(const Curve *c, double x, double *slope)
{
    size_t i = interval_of(c, x);
    double x0 = c->x[i], x1 = c->x[i + 1], y0 = c->y[i], y1 = c->y[i + 1];
    if (c->interp == CURVE_LINEAR) {
        double m = (y1 - y0) / (x1 - x0);
        if (slope)
            *slope = m;
        /* from the nearer end, so a table point is returned exactly */
        return x - x0 <= x1 - x ? y0 + (x - x0) * m : y1 + (x - x1) * m;
    }
    if (!(x > 0)) {
        if (slope)
            *slope = NAN;
        return NAN;
    }
    double m = log(y1 / y0) / log(x1 / x0);
    double y = x == x1 ? y1 : y0 * pow(x / x0, m);
    if (slope)
        *slope = m * y / x;
    return y;
}
