/* pumps.c — quadratic pump curve and operating point.
 *
 * Centrifugal pump head falls roughly with the square of flow, so a
 * quadratic through three catalogue points (shutoff, design, run-out, say)
 * is the usual working model of the curve between them; outside the points
 * it is an extrapolation. The operating point solves one quadratic, with
 * the cancellation-free form of its roots. */
#include "methods/pumps.h"

#include <math.h>

/* Newton's divided differences for the interpolating quadratic:
 *   c = ([Q1,Q3] - [Q1,Q2]) / (Q3 - Q2), with [Qi,Qj] = (Hj - Hi)/(Qj - Qi)
 *   b = [Q1,Q2] - c*(Q1 + Q2),  a = H1 - b*Q1 - c*Q1^2 */
PumpStatus pump_fit(const double Q[3], const double H[3], PumpCurve *out, int *dup)
{
    for (int i = 0; i < 3; i++)
        if (!isfinite(Q[i]) || !isfinite(H[i]))
            return PUMP_NOT_FINITE;
    for (int i = 1; i < 3; i++)
        for (int j = 0; j < i; j++)
            if (Q[i] == Q[j]) {
                if (dup)
                    *dup = i;
                return PUMP_DUPLICATE_FLOW;
            }
    double d12 = (H[1] - H[0]) / (Q[1] - Q[0]);
    double d13 = (H[2] - H[0]) / (Q[2] - Q[0]);
    out->c = (d13 - d12) / (Q[2] - Q[1]);
    out->b = d12 - out->c * (Q[0] + Q[1]);
    out->a = H[0] - out->b * Q[0] - out->c * Q[0] * Q[0];
    out->q_min = fmin(Q[0], fmin(Q[1], Q[2]));
    out->q_max = fmax(Q[0], fmax(Q[1], Q[2]));
    return PUMP_OK;
}

double pump_head(const PumpCurve *p, double Q)
{
    return p->a + Q * (p->b + Q * p->c);
}

/* a + b*Q + c*Q^2 = Hs + k*Q^2  <=>  A*Q^2 + B*Q + C = 0 with A = c - k,
 * B = b, C = a - Hs. Roots by q = -(B + sign(B)*sqrt(B^2 - 4AC))/2,
 * Q = q/A and Q = C/q (Press et al., Numerical Recipes, 5.6), which avoids
 * subtracting nearly equal numbers. */
PumpStatus pump_operating_point(const PumpCurve *p, double Hs, double k, double *Q,
                                double *H, int *count)
{
    if (!isfinite(Hs) || !isfinite(k))
        return PUMP_NOT_FINITE;
    double A = p->c - k, B = p->b, C = p->a - Hs;
    double roots[2];
    int n = 0;
    double scale = fabs(p->c) + fabs(k);
    if (fabs(A) <= 1e-14 * scale || A == 0.0) {
        if (B != 0.0)
            roots[n++] = -C / B;
    } else {
        double disc = B * B - 4.0 * A * C;
        if (disc >= 0.0) {
            double q = -0.5 * (B + copysign(sqrt(disc), B));
            if (q != 0.0) {
                roots[n++] = q / A;
                roots[n++] = C / q;
            } else {
                roots[n++] = 0.0;   /* B = 0 and C = 0: touching at Q = 0 */
            }
        }
    }
    int found = 0;
    double best = 0.0;
    for (int i = 0; i < n; i++) {
        if (roots[i] >= 0.0 && isfinite(roots[i])) {
            if (!found || roots[i] > best)
                best = roots[i];
            found++;
        }
    }
    if (!found)
        return PUMP_NO_INTERSECTION;
    if (found == 2 && n == 2 && roots[0] == roots[1])
        found = 1;
    *Q = best;
    *H = Hs + k * best * best;
    if (count)
        *count = found;
    return PUMP_OK;
}
