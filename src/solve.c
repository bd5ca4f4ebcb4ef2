/* solve.c — Brent's method for one equation in one unknown.
 *
 * Brent, R. P. (1973). Algorithms for Minimization without Derivatives,
 * Prentice-Hall, chapter 4: keep a bracket [b, c] with f(b) and f(c) of
 * opposite sign, b the best estimate; try inverse quadratic interpolation (or
 * the secant step when only two points are distinct), and fall back to
 * bisection whenever the step would leave the bracket or shrink it too
 * slowly. Convergence is guaranteed for a continuous f with a sign change. */
#include "solve.h"

#include <float.h>
#include <math.h>

static bool eval_at(SolveFn f, void *ctx, double x, double *fx, SolveReport *r)
{
    r->evaluations++;
    if (!f(x, ctx, fx) || !isfinite(*fx))
        return false;
    return true;
}

SolveReport solve_brent(SolveFn f, void *ctx, double lo, double hi, double xtol)
{
    SolveReport r = {0};
    r.start_lo = r.lo = lo;
    r.start_hi = r.hi = hi;
    double a = lo, b = hi, fa = NAN, fb = NAN;
    if (!eval_at(f, ctx, a, &fa, &r) || !eval_at(f, ctx, b, &fb, &r)) {
        r.status = SOLVE_NOT_FINITE;
        r.f_lo = fa;
        r.f_hi = fb;
        return r;
    }
    r.f_lo = fa;
    r.f_hi = fb;
    if (fa == 0) {
        r.root = a;
        r.residual = 0;
        return r;
    }
    if (fb == 0) {
        r.root = b;
        r.residual = 0;
        return r;
    }
    if ((fa > 0) == (fb > 0)) {
        r.status = SOLVE_NO_BRACKET;
        r.root = fabs(fa) < fabs(fb) ? a : b;
        r.residual = fabs(fa) < fabs(fb) ? fa : fb;
        return r;
    }
    double c = a, fc = fa, d = b - a, e = d;
    for (r.iterations = 1; r.iterations <= SOLVE_MAX_ITERATIONS; r.iterations++) {
        if ((fb > 0) == (fc > 0)) { /* keep the root between b and c */
            c = a;
            fc = fa;
            d = e = b - a;
        }
        if (fabs(fc) < fabs(fb)) { /* b is the better estimate */
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        double tol = 2 * DBL_EPSILON * fabs(b) + 0.5 * xtol;
        double m = 0.5 * (c - b);
        if (fabs(m) <= tol || fb == 0) {
            r.root = b;
            r.residual = fb;
            r.lo = b < c ? b : c;
            r.hi = b < c ? c : b;
            return r;
        }
        if (fabs(e) >= tol && fabs(fa) > fabs(fb)) {
            double p, q, s = fb / fa;
            if (a == c) { /* secant */
                p = 2 * m * s;
                q = 1 - s;
            } else { /* inverse quadratic interpolation */
                double qa = fa / fc, rb = fb / fc;
                p = s * (2 * m * qa * (qa - rb) - (b - a) * (rb - 1));
                q = (qa - 1) * (rb - 1) * (s - 1);
            }
            if (p > 0)
                q = -q;
            else
                p = -p;
            if (2 * p < fmin(3 * m * q - fabs(tol * q), fabs(e * q))) {
                e = d;
                d = p / q;
            } else {
                d = m;
                e = m;
            }
        } else {
            d = m;
            e = m;
        }
        a = b;
        fa = fb;
        b += fabs(d) > tol ? d : (m > 0 ? tol : -tol);
        if (!eval_at(f, ctx, b, &fb, &r)) {
            r.status = SOLVE_NOT_FINITE;
            r.root = b;
            return r;
        }
    }
    r.status = SOLVE_MAX_ITER;
    r.root = b;
    r.residual = fb;
    return r;
}

SolveReport solve_expand(SolveFn f, void *ctx, double trial, bool positive, double xtol)
{
    SolveReport r = {0};
    double step = trial != 0 ? fabs(trial) * 0.1 : 1.0;
    double lo = trial - step, hi = trial + step;
    if (positive && lo <= 0)
        lo = trial > 0 ? trial / 2 : DBL_MIN;
    double flo, fhi;
    int evals = 0;
    bool ok_lo = f(lo, ctx, &flo) && isfinite(flo);
    bool ok_hi = f(hi, ctx, &fhi) && isfinite(fhi);
    evals += 2;
    for (int k = 0; k < 60; k++) {
        if (ok_lo && ok_hi && (flo > 0) != (fhi > 0))
            break;
        if (ok_lo && flo == 0)
            break;
        if (ok_hi && fhi == 0)
            break;
        /* Grow the side with the smaller |f| (or the one that failed). */
        bool grow_lo = !ok_lo || (ok_hi && fabs(flo) < fabs(fhi));
        if (positive && lo <= DBL_MIN * 4)
            grow_lo = false;
        if (grow_lo) {
            double width = hi - lo;
            lo = positive ? lo / 4 : lo - 1.6 * width;
            ok_lo = f(lo, ctx, &flo) && isfinite(flo);
        } else {
            double width = hi - lo;
            hi = hi + 1.6 * width;
            ok_hi = f(hi, ctx, &fhi) && isfinite(fhi);
        }
        evals++;
    }
    if (!(ok_lo && ok_hi)) {
        r.status = SOLVE_NOT_FINITE;
        r.start_lo = r.lo = lo;
        r.start_hi = r.hi = hi;
        r.f_lo = ok_lo ? flo : NAN;
        r.f_hi = ok_hi ? fhi : NAN;
        r.evaluations = evals;
        return r;
    }
    r = solve_brent(f, ctx, lo, hi, xtol);
    r.evaluations += evals;
    return r;
}
