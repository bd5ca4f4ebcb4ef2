/* ticks.c — tick placement for the axes of figures (rules in ticks.h).
 *
 * Tick values are built from integers and powers of ten (k × 10^p with an
 * integer k), never by adding a step repeatedly, so 0.3 is the double
 * nearest to 0.3 and a label never reads 0.30000000000000004. Labels go
 * through num_parts, the one place numbers are formatted. */
#include "ticks.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"

/* k × 10^p as the double nearest to the decimal (pow is exact for these). */
static double scaled(long long k, int p)
{
    return p >= 0 ? (double)k * pow(10, p) : (double)k / pow(10, -p);
}

/* Floor and ceiling of a quotient that is an integer up to rounding. */
static long long floor_q(double q)
{
    double r = nearbyint(q);
    return (long long)(fabs(q - r) <= 1e-9 * fmax(1, fabs(q)) ? r : floor(q));
}

static long long ceil_q(double q)
{
    double r = nearbyint(q);
    return (long long)(fabs(q - r) <= 1e-9 * fmax(1, fabs(q)) ? r : ceil(q));
}

static int digits_of(long long k)
{
    int n = 1;
    for (k = k < 0 ? -k : k; k >= 10; k /= 10)
        n++;
    return n;
}

static void set_label(Tick *t, double v, int digits)
{
    NumParts np = num_parts(v, digits);
    snprintf(t->mantissa, sizeof t->mantissa, "%s", np.mantissa);
    t->exp10 = np.exp10;
    num_sig(v, digits, t->label, sizeof t->label);
}

bool ticks_linear(double dmin, double dmax, TickSet *out)
{
    memset(out, 0, sizeof *out);
    if (!isfinite(dmin) || !isfinite(dmax))
        return false;
    if (dmin > dmax) {
        double s = dmin;
        dmin = dmax;
        dmax = s;
    }
    if (dmax - dmin <= 1e-12 * fmax(fabs(dmin), fabs(dmax))) {
        double w = dmin == 0 ? 1 : fabs(dmin) * 0.1;
        dmin -= w;
        dmax += w;
    }
    /* candidate steps k × 10^p, smallest first, from a tenth of range/7 */
    static const int MANT[4][2] = {{1, 0}, {2, 0}, {25, -1}, {5, 0}};
    int e0 = (int)floor(log10((dmax - dmin) / 7)) - 1;
    for (int e = e0; e < e0 + 4; e++)
        for (int m = 0; m < 4; m++) {
            long long k = MANT[m][0];
            int p = e + MANT[m][1];
            double step = scaled(k, p);
            long long a = floor_q(dmin / step), b = ceil_q(dmax / step);
            if (b - a + 1 > 7)
                continue;
            out->n = (size_t)(b - a + 1);
            for (long long i = a; i <= b; i++) {
                Tick *t = &out->t[i - a];
                long long ki = i * k;
                t->v = scaled(ki, p);
                t->kind = TICK_MAJOR;
                if (ki == 0) {
                    set_label(t, 0, 1);
                } else {
                    int lead = digits_of(ki) - 1 + p; /* the power of the first digit */
                    set_label(t, t->v, lead - p + 1);
                }
            }
            out->lo = out->t[0].v;
            out->hi = out->t[out->n - 1].v;
            return true;
        }
    return false; /* not reached: a step of 10^(e0+3) always fits */
}

/* The largest of 1, 2, 5 × 10^n at or below x (up = false), or the smallest
 * at or above it (up = true). */
static double one_two_five(double x, bool up)
{
    static const int M[3] = {1, 2, 5};
    int n = (int)floor(log10(x));
    if (!up) {
        for (int i = 2; i >= 0; i--)
            if (scaled(M[i], n) <= x * (1 + 1e-12))
                return scaled(M[i], n);
        return scaled(5, n - 1);
    }
    for (int i = 0; i < 3; i++)
        if (scaled(M[i], n) >= x * (1 - 1e-12))
            return scaled(M[i], n);
    return scaled(1, n + 1);
}

bool ticks_log(double dmin, double dmax, TickSet *out)
{
    memset(out, 0, sizeof *out);
    out->log = true;
    if (!isfinite(dmin) || !isfinite(dmax) || !(dmin > 0) || dmax < dmin)
        return false;
    if (dmax <= dmin * (1 + 1e-12)) {
        dmin /= 2;
        dmax *= 2;
    }
    bool whole = log10(dmax / dmin) > 2.5;
    if (whole) {
        out->lo = scaled(1, (int)floor_q(log10(dmin) - 1e-12));
        out->hi = scaled(1, (int)ceil_q(log10(dmax) + 1e-12));
        /* floor_q/ceil_q snap a value within rounding of a decade onto it */
        if (out->lo > dmin * (1 + 1e-12))
            out->lo /= 10;
        if (out->hi < dmax * (1 - 1e-12))
            out->hi *= 10;
    } else {
        out->lo = one_two_five(dmin, false);
        out->hi = one_two_five(dmax, true);
    }
    int n0 = (int)floor_q(log10(out->lo)), n1 = (int)ceil_q(log10(out->hi));
    double decades = log10(out->hi / out->lo);
    bool few = decades <= 3 + 1e-9;
    bool minors = n1 - n0 <= 10;
    bool power_labels = whole && !few;
    for (int n = n0; n <= n1; n++)
        for (int m = 1; m <= 9; m++) {
            double v = scaled(m, n);
            if (v < out->lo * (1 - 1e-9) || v > out->hi * (1 + 1e-9))
                continue;
            TickKind kind = m == 1 ? TICK_MAJOR : few && (m == 2 || m == 5) ? TICK_LABELLED : TICK_MINOR;
            if (kind == TICK_MINOR && !minors)
                continue;
            if (out->n == TICKS_MAX)
                return true;
            Tick *t = &out->t[out->n++];
            t->v = v;
            t->kind = kind;
            if (kind == TICK_MINOR)
                continue;
            if (power_labels) {
                t->exp10 = n;
                snprintf(t->label, sizeof t->label, "10^%d", n);
            } else {
                set_label(t, v, 1);
            }
        }
    return true;
}
