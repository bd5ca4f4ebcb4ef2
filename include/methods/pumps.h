/* pumps.h — a pump's head curve through three points and its intersection
 * with a system curve.
 *
 * Pure numerics in SI (m^3/s, m): H(Q) = a + b*Q + c*Q^2 fitted exactly
 * through three (Q, H) points, and the operating point where it meets the
 * system curve H = H_static + k*Q^2. Nothing allocates. */
#ifndef HEADROOM_METHODS_PUMPS_H
#define HEADROOM_METHODS_PUMPS_H

typedef enum PumpStatus {
    PUMP_OK,
    PUMP_DUPLICATE_FLOW,     /* two points share a flow: no unique quadratic */
    PUMP_NOT_FINITE,         /* an input is NaN or infinite */
    PUMP_NO_INTERSECTION     /* the curves do not meet at Q >= 0 */
} PumpStatus;

typedef struct PumpCurve {
    double a, b, c;          /* m, m/(m^3/s), m/(m^3/s)^2 */
    double q_min, q_max;     /* the span of the three points, m^3/s */
} PumpCurve;

/* Fit through (Q[i], H[i]). On PUMP_DUPLICATE_FLOW, *dup is the index
 * (1 or 2) of the point that repeats an earlier flow. */
PumpStatus pump_fit(const double Q[3], const double H[3], PumpCurve *out, int *dup);

double pump_head(const PumpCurve *p, double Q);

/* Intersection with H = Hs + k*Q^2 at Q >= 0. When the curves meet twice
 * the larger flow is returned and *count is 2. */
PumpStatus pump_operating_point(const PumpCurve *p, double Hs, double k, double *Q,
                                double *H, int *count);

#endif
