/* test_ticks.c — cmocka tests of tick placement (ticks.h): a table of
 * linear ranges with the ticks they must get (round steps of 1, 2, 2.5 and
 * 5 × 10^n, four to seven ticks, the axis ending on ticks), zero-width and
 * reversed ranges, and log ranges (whole decades for wide spans, 1-2-5 ends
 * for short ones, labelled 2 and 5 on axes of three decades or fewer).
 * The expected ticks follow from the rules stated in ticks.h, worked by
 * hand; they are not taken from any other program. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "ticks.h"

/* Tick values compare to 1e-12 relative; labels exactly. */
static void expect_major(const TickSet *ts, const double *v, const char *const *label, size_t n)
{
    size_t k = 0;
    for (size_t i = 0; i < ts->n; i++) {
        if (ts->t[i].kind == TICK_MINOR)
            continue;
        if (k >= n)
            fail_msg("more labelled ticks than the %zu expected (extra %s)", n, ts->t[i].label);
        if (!(fabs(ts->t[i].v - v[k]) <= 1e-12 * fmax(1, fabs(v[k]))))
            fail_msg("tick %zu = %.17g, want %.17g", k, ts->t[i].v, v[k]);
        if (strcmp(ts->t[i].label, label[k]) != 0)
            fail_msg("tick %zu label '%s', want '%s'", k, ts->t[i].label, label[k]);
        k++;
    }
    if (k != n)
        fail_msg("%zu labelled ticks, want %zu", k, n);
}

typedef struct LinCase {
    double lo, hi;
    size_t n;
    double v[8];
    const char *label[8];
} LinCase;

static const LinCase LINEAR[] = {
    /* the hgl demo's head range */
    {0, 184.7, 5, {0, 50, 100, 150, 200}, {"0", "50", "100", "150", "200"}},
    {0.3, 0.7, 5, {0.3, 0.4, 0.5, 0.6, 0.7}, {"0.3", "0.4", "0.5", "0.6", "0.7"}},
    {-12, 3, 5, {-15, -10, -5, 0, 5}, {"-15", "-10", "-5", "0", "5"}},
    /* steps of 2.5 carry one more decimal than the step's power */
    {0, 14, 7, {0, 2.5, 5, 7.5, 10, 12.5, 15}, {"0", "2.5", "5.0", "7.5", "10.0", "12.5", "15.0"}},
    {0, 17, 5, {0, 5, 10, 15, 20}, {"0", "5", "10", "15", "20"}},
    {50, 200, 7, {50, 75, 100, 125, 150, 175, 200}, {"50", "75", "100", "125", "150", "175", "200"}},
    {0, 115, 7, {0, 20, 40, 60, 80, 100, 120}, {"0", "20", "40", "60", "80", "100", "120"}},
    {0.0012, 0.0031, 6, {0.001, 0.0015, 0.002, 0.0025, 0.003, 0.0035},
     {"0.0010", "0.0015", "0.0020", "0.0025", "0.0030", "0.0035"}},
    {176.9, 185.3, 6, {176, 178, 180, 182, 184, 186}, {"176", "178", "180", "182", "184", "186"}},
    /* a zero-width range is widened by ±10 %: [4.5, 5.5] */
    {5, 5, 7, {4.4, 4.6, 4.8, 5, 5.2, 5.4, 5.6}, {"4.4", "4.6", "4.8", "5.0", "5.2", "5.4", "5.6"}},
    /* zero width at zero: ±1 */
    {0, 0, 5, {-1, -0.5, 0, 0.5, 1}, {"-1.0", "-0.5", "0", "0.5", "1.0"}},
    /* reversed ends are the same range */
    {3, -12, 5, {-15, -10, -5, 0, 5}, {"-15", "-10", "-5", "0", "5"}},
    /* large values: labels switch to a power of ten at 10^6 (num_parts) */
    {0, 2.3e6, 6, {0, 5e5, 1e6, 1.5e6, 2e6, 2.5e6}, {"0", "500000", "1.0e6", "1.5e6", "2.0e6", "2.5e6"}},
};

static void test_linear_table(void **state)
{
    (void)state;
    for (size_t c = 0; c < sizeof LINEAR / sizeof LINEAR[0]; c++) {
        const LinCase *lc = &LINEAR[c];
        TickSet ts;
        assert_true(ticks_linear(lc->lo, lc->hi, &ts));
        print_message("[%g, %g]: %zu ticks, %s .. %s\n", lc->lo, lc->hi, ts.n, ts.t[0].label,
                      ts.t[ts.n - 1].label);
        expect_major(&ts, lc->v, lc->label, lc->n);
        assert_true(ts.lo == ts.t[0].v && ts.hi == ts.t[ts.n - 1].v);
    }
}

/* Every range of a sweep gets 4..7 ticks that cover it, on a step of
 * 1, 2, 2.5 or 5 × 10^n. */
static void test_linear_sweep(void **state)
{
    (void)state;
    for (int i = 0; i < 2000; i++) {
        double lo = -50 + 0.731 * i * (i % 7 == 0 ? -1 : 1);
        double hi = lo + pow(10, (i % 13) - 6) * (1 + (i % 17) * 0.37);
        TickSet ts;
        assert_true(ticks_linear(lo, hi, &ts));
        if (ts.n < 4 || ts.n > 7)
            fail_msg("[%g, %g]: %zu ticks", lo, hi, ts.n);
        double step = ts.t[1].v - ts.t[0].v;
        double e = pow(10, floor(log10(step) + 1e-4));
        double m = step / e;
        /* the step is a difference of two ticks: loose where the range is tiny against its values */
        if (!(fabs(m - 1) < 1e-4 || fabs(m - 2) < 1e-4 || fabs(m - 2.5) < 1e-4 || fabs(m - 5) < 1e-4))
            fail_msg("[%g, %g]: step %g", lo, hi, step);
        double tol = 1e-9 * fmax(fabs(lo), fabs(hi));
        if (!(ts.lo <= lo + tol && ts.hi >= hi - tol))
            fail_msg("[%g, %g] not covered by [%g, %g]", lo, hi, ts.lo, ts.hi);
        /* not more than one step of slack at either end */
        if (!(ts.lo > lo - step - tol && ts.hi < hi + step + tol))
            fail_msg("[%g, %g]: slack in [%g, %g]", lo, hi, ts.lo, ts.hi);
    }
}

static void test_linear_rejects(void **state)
{
    (void)state;
    TickSet ts;
    assert_false(ticks_linear(NAN, 1, &ts));
    assert_false(ticks_linear(0, INFINITY, &ts));
}

static void test_log_wide_decades(void **state)
{
    (void)state;
    TickSet ts;
    /* the Moody chart's Reynolds numbers: whole decades 10^2 .. 10^8 */
    assert_true(ticks_log(600, 1e8, &ts));
    static const double v[] = {1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8};
    static const char *const l[] = {"10^2", "10^3", "10^4", "10^5", "10^6", "10^7", "10^8"};
    expect_major(&ts, v, l, 7);
    assert_true(ts.lo == 100 && ts.hi == 1e8);
    /* unlabelled minors 2..9 in each of six decades */
    size_t minor = 0;
    for (size_t i = 0; i < ts.n; i++)
        minor += ts.t[i].kind == TICK_MINOR;
    assert_int_equal(minor, 6 * 8);
    assert_int_equal(ts.t[1].exp10, 0);
    assert_string_equal(ts.t[0].mantissa, "");
    assert_int_equal(ts.t[0].exp10, 2);
    /* data on a decade keep that decade as the end */
    assert_true(ticks_log(1000, 1e7, &ts));
    assert_true(ts.lo == 1000 && ts.hi == 1e7);
}

static void test_log_short_one_two_five(void **state)
{
    (void)state;
    TickSet ts;
    /* the Moody chart's friction factors: 1-2-5 ends 0.005 .. 0.2 */
    assert_true(ticks_log(0.006, 0.11, &ts));
    static const double v[] = {0.005, 0.01, 0.02, 0.05, 0.1, 0.2};
    static const char *const l[] = {"0.005", "0.01", "0.02", "0.05", "0.1", "0.2"};
    expect_major(&ts, v, l, 6);
    assert_true(fabs(ts.lo - 0.005) < 1e-15 && fabs(ts.hi - 0.2) < 1e-15);
    /* minors 6..9 × 10^-3 and 3, 4, 6..9 × 10^-2: 4 + 6 */
    size_t minor = 0;
    for (size_t i = 0; i < ts.n; i++)
        minor += ts.t[i].kind == TICK_MINOR;
    assert_int_equal(minor, 10);

    /* within one decade: 20 .. 50 */
    assert_true(ticks_log(23, 48, &ts));
    static const double v2[] = {20, 50};
    static const char *const l2[] = {"20", "50"};
    expect_major(&ts, v2, l2, 2);

    /* three decades exactly: whole decades, 2 and 5 labelled */
    assert_true(ticks_log(1, 1000, &ts));
    static const double v3[] = {1, 2, 5, 10, 20, 50, 100, 200, 500, 1000};
    static const char *const l3[] = {"1", "2", "5", "10", "20", "50", "100", "200", "500", "1000"};
    expect_major(&ts, v3, l3, 10);

    /* a zero-width log range is halved and doubled: [0.5, 2] -> 0.5 .. 2 */
    assert_true(ticks_log(1, 1, &ts));
    static const double v4[] = {0.5, 1, 2};
    static const char *const l4[] = {"0.5", "1", "2"};
    expect_major(&ts, v4, l4, 3);
}

static void test_log_rejects(void **state)
{
    (void)state;
    TickSet ts;
    assert_false(ticks_log(0, 10, &ts));
    assert_false(ticks_log(-1, 10, &ts));
    assert_false(ticks_log(10, 1, &ts));
    assert_false(ticks_log(1, NAN, &ts));
    /* a huge span keeps within the fixed array: decades only */
    assert_true(ticks_log(1e-30, 1e30, &ts));
    assert_true(ts.n <= TICKS_MAX && ts.n == 61);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_linear_table),
        cmocka_unit_test(test_linear_sweep),
        cmocka_unit_test(test_linear_rejects),
        cmocka_unit_test(test_log_wide_decades),
        cmocka_unit_test(test_log_short_one_two_five),
        cmocka_unit_test(test_log_rejects),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
