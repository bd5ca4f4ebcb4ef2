/* figlayout.c — a figure's axis range and label geometry (figlayout.h). */
#include "report/figlayout.h"

#include <math.h>

bool figlayout_grade_range(double g_lo, double g_hi, double z_lo, double z_hi, double *lo, double *hi)
{
    *lo = g_lo;
    *hi = g_hi;
    if (isnan(z_lo) || isnan(z_hi))
        return false;
    double a = fmin(g_lo, z_lo), b = fmax(g_hi, z_hi);
    if (!(b > a) || (g_hi - g_lo) >= FIGLAYOUT_GRADE_SHARE * (b - a)) {
        *lo = a;
        *hi = b;
        return true;
    }
    return false;
}

/* Liang-Barsky: clip the segment's parameter range to each slab. */
bool figlayout_segment_hits(double ax, double ay, double bx, double by, double x0, double y0,
                            double x1, double y1)
{
    double t0 = 0, t1 = 1, dx = bx - ax, dy = by - ay;
    double p[4] = {-dx, dx, -dy, dy}, q[4] = {ax - x0, x1 - ax, ay - y0, y1 - ay};
    for (int i = 0; i < 4; i++) {
        if (p[i] == 0) {
            if (q[i] < 0)
                return false;   /* parallel to the slab and outside it */
            continue;
        }
        double t = q[i] / p[i];
        if (p[i] < 0) {
            if (t > t1)
                return false;
            if (t > t0)
                t0 = t;
        } else {
            if (t < t0)
                return false;
            if (t < t1)
                t1 = t;
        }
    }
    return t0 <= t1;
}
