/* test_figlayout.c — cmocka tests of a figure's geometry (figlayout.h):
 * the head axis of a grade-line figure (its range from the data, the pipe
 * elevation on it only while the grade lines fill 30 % of it, then nice
 * ticks over that range), and the segment-box test that keeps marker
 * labels off the plotted lines. The expected values are worked by hand
 * from the rules in figlayout.h and ticks.h. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>

#include <cmocka.h>

#include "report/figlayout.h"
#include "ticks.h"

/* A header's grade lines 38.60 to 39.07 m above a pipe at 0 to 0.9 m: with
 * the pipe the lines would fill 0.47/39.07 = 1.2 % of the axis, so the
 * axis is the lines' own and its ticks run 38.6 to 39.1 m by 0.1 m. */
static void test_small_loss_far_above_the_pipe(void **state)
{
    (void)state;
    double lo, hi;
    assert_false(figlayout_grade_range(38.60, 39.07, 0.0, 0.9, &lo, &hi));
    assert_true(fabs(lo - 38.60) < 1e-12 && fabs(hi - 39.07) < 1e-12);
    TickSet ts;
    assert_true(ticks_linear(lo, hi, &ts));
    assert_true(fabs(ts.lo - 38.6) < 1e-9);
    assert_true(fabs(ts.hi - 39.1) < 1e-9);
    assert_int_equal(ts.n, 6);
    /* the 0.47 m loss spans 0.47/0.5 = 94 % of the axis (it was 1.2 %) */
    assert_true(fabs((hi - lo) / (ts.hi - ts.lo) - 0.94) < 1e-9);
}

/* A pumped path: lines 1.5 to 58 m, pipe 0 to 10 m; with the pipe the lines
 * fill 56.5/58 = 97 %: the pipe stays, the axis runs 0 to 58 m (ticks 0 to
 * 60 by 10), not forced further. */
static void test_pipe_kept_when_the_lines_stay_readable(void **state)
{
    (void)state;
    double lo, hi;
    assert_true(figlayout_grade_range(1.5, 58.0, 0.0, 10.0, &lo, &hi));
    assert_true(lo == 0.0 && hi == 58.0);
    TickSet ts;
    assert_true(ticks_linear(lo, hi, &ts));
    assert_true(fabs(ts.lo - 0) < 1e-9 && fabs(ts.hi - 60) < 1e-9);
}

/* The rule's edge: lines 70 to 100 over a pipe 0 to 10 fill 30/100 = 30 %
 * (kept); 71 to 100 fill 29 % (dropped). Not forced to zero either way:
 * a pipe at 50 to 60 under lines 80 to 100 gives 50 to 100. */
static void test_share_edge_and_no_zero(void **state)
{
    (void)state;
    double lo, hi;
    assert_true(figlayout_grade_range(70, 100, 0, 10, &lo, &hi));
    assert_true(lo == 0 && hi == 100);
    assert_false(figlayout_grade_range(71, 100, 0, 10, &lo, &hi));
    assert_true(lo == 71 && hi == 100);
    assert_true(figlayout_grade_range(80, 100, 50, 60, &lo, &hi));
    assert_true(lo == 50 && hi == 100);
    /* no pipe: the lines alone */
    assert_false(figlayout_grade_range(12, 13, NAN, NAN, &lo, &hi));
    assert_true(lo == 12 && hi == 13);
}

/* Segments against the box [0, 10] x [0, 10], edges included. */
static void test_segment_hits_box(void **state)
{
    (void)state;
    assert_true(figlayout_segment_hits(-5, 5, 15, 5, 0, 0, 10, 10));     /* straight across */
    assert_true(figlayout_segment_hits(2, 2, 3, 3, 0, 0, 10, 10));       /* inside */
    assert_true(figlayout_segment_hits(-1, 12, 12, -1, 0, 0, 10, 10));   /* corner cut, x + y = 11 */
    assert_false(figlayout_segment_hits(5, 16, 16, 5, 0, 0, 10, 10));    /* x + y = 21 misses */
    assert_false(figlayout_segment_hits(-5, -5, -1, 20, 0, 0, 10, 10));  /* left of it */
    assert_true(figlayout_segment_hits(10, -5, 10, 15, 0, 0, 10, 10));   /* along the right edge */
    assert_false(figlayout_segment_hits(10.01, -5, 10.01, 15, 0, 0, 10, 10));
    assert_false(figlayout_segment_hits(-3, 4, -0.5, 4, 0, 0, 10, 10));  /* stops short */
    assert_true(figlayout_segment_hits(5, 5, 5, 5, 0, 0, 10, 10));       /* a point inside */
    assert_false(figlayout_segment_hits(11, 5, 11, 5, 0, 0, 10, 10));    /* a point outside */
    /* a long segment crossing a small label box between sample points */
    assert_true(figlayout_segment_hits(0, 0, 1000, 1, 400, 0.2, 402, 0.5));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_small_loss_far_above_the_pipe),
        cmocka_unit_test(test_pipe_kept_when_the_lines_stay_readable),
        cmocka_unit_test(test_share_edge_and_no_zero),
        cmocka_unit_test(test_segment_hits_box),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
