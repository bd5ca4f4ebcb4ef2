/* test_pagelayout.c — cmocka tests of the page layout pass: items are never
 * split, space above an item disappears at the top of a sheet, headings never
 * end a sheet, forced breaks start a sheet, oversize items get a sheet of
 * their own; and a generated flow of a thousand items keeps every rule. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "pagelayout.h"

#define assert_near(got, want)                                                              \
    do {                                                                                   \
        double g_ = (got), w_ = (want);                                                    \
        if (!(fabs(g_ - w_) <= 1e-9))                                                      \
            fail_msg("%s = %.12g, want %.12g", #got, g_, w_);                              \
    } while (0)

static void test_fill_in_order(void **state)
{
    (void)state;
    PageItem it[7];
    PagePlace pl[7];
    for (int i = 0; i < 7; i++)
        it[i] = (PageItem){30, 0, false, false};
    assert_int_equal(pagelayout_assign(it, 7, 100, pl), 3);
    int want[7] = {0, 0, 0, 1, 1, 1, 2};
    for (int i = 0; i < 7; i++)
        assert_int_equal(pl[i].page, want[i]);
    assert_near(pl[1].y, 30);
    assert_near(pl[2].y, 60);
    assert_near(pl[3].y, 0);
}

static void test_row_never_split(void **state)
{
    (void)state;
    PageItem it[2] = {{60, 0, false, false}, {50, 0, false, false}};
    PagePlace pl[2];
    assert_int_equal(pagelayout_assign(it, 2, 100, pl), 2);
    assert_int_equal(pl[1].page, 1);
    assert_near(pl[1].y, 0);
}

static void test_space_before_dropped_at_top(void **state)
{
    (void)state;
    PageItem it[3] = {{40, 10, false, false}, {40, 10, false, false}, {40, 10, false, false}};
    PagePlace pl[3];
    assert_int_equal(pagelayout_assign(it, 3, 100, pl), 2);
    assert_near(pl[0].y, 0);  /* first item: no space above */
    assert_near(pl[1].y, 50); /* 40 + 10 */
    assert_int_equal(pl[2].page, 1);
    assert_near(pl[2].y, 0);  /* 50 + 40 + 10 + 40 > 100: top of the next sheet, no space */
}

static void test_heading_never_ends_a_sheet(void **state)
{
    (void)state;
    /* 70 used; the heading (20) fits but its row (20) would not */
    PageItem it[3] = {{70, 0, false, false}, {20, 0, true, false}, {20, 0, false, false}};
    PagePlace pl[3];
    assert_int_equal(pagelayout_assign(it, 3, 100, pl), 2);
    assert_int_equal(pl[1].page, 1);
    assert_int_equal(pl[2].page, 1);
    /* with room for both they stay */
    it[0].height = 50;
    assert_int_equal(pagelayout_assign(it, 3, 100, pl), 1);
    /* two headings in a row travel together with the first row */
    PageItem h[4] = {{60, 0, false, false}, {15, 0, true, false}, {15, 0, true, false},
                     {20, 0, false, false}};
    PagePlace ph[4];
    assert_int_equal(pagelayout_assign(h, 4, 100, ph), 2);
    assert_int_equal(ph[1].page, 1);
    assert_int_equal(ph[2].page, 1);
    assert_int_equal(ph[3].page, 1);
}

static void test_break_before_and_oversize(void **state)
{
    (void)state;
    PageItem it[4] = {{10, 0, false, false}, {10, 0, false, true}, {150, 0, false, false},
                      {10, 0, false, false}};
    PagePlace pl[4];
    assert_int_equal(pagelayout_assign(it, 4, 100, pl), 4);
    assert_int_equal(pl[1].page, 1); /* forced */
    assert_int_equal(pl[2].page, 2); /* too tall for any sheet: a sheet of its own */
    assert_near(pl[2].y, 0);
    assert_int_equal(pl[3].page, 3); /* nothing shares the oversize item's sheet */
    assert_int_equal(pagelayout_assign(it, 0, 100, pl), 1);
    /* a forced break on an empty first sheet does not leave a blank sheet */
    PageItem f[1] = {{10, 0, false, true}};
    assert_int_equal(pagelayout_assign(f, 1, 100, pl), 1);
    assert_int_equal(pl[0].page, 0);
}

/* A generated flow (fixed LCG so the run is repeatable) */
static void test_generated_flow_keeps_rules(void **state)
{
    (void)state;
    enum { N = 1000 };
    static PageItem it[N];
    static PagePlace pl[N];
    uint32_t s = 12345;
    const double body = 600;
    for (int i = 0; i < N; i++) {
        s = s * 1664525u + 1013904223u;
        double h = 8 + (double)(s >> 24) * 0.6; /* 8 .. 161 */
        bool head = (s & 7) == 0;
        it[i] = (PageItem){head ? 16 : h, head ? 12 : 3, head, (s & 0x3ff) == 5};
    }
    it[N - 1].keep_with_next = false;
    int pages = pagelayout_assign(it, N, body, pl);
    assert_true(pages > 1);
    for (int i = 0; i < N; i++) {
        /* never split: the item ends inside the body */
        assert_true(pl[i].y + it[i].height <= body + 1e-9);
        assert_true(pl[i].page < pages);
        if (i > 0) {
            assert_true(pl[i].page >= pl[i - 1].page);
            if (pl[i].page == pl[i - 1].page)
                assert_near(pl[i].y, pl[i - 1].y + it[i - 1].height + it[i].space_before);
            else
                assert_near(pl[i].y, 0);
            if (it[i].break_before)
                assert_true(pl[i].page > pl[i - 1].page);
            /* a heading shares its sheet with what follows */
            if (it[i - 1].keep_with_next)
                assert_int_equal(pl[i].page, pl[i - 1].page);
        }
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_fill_in_order),
        cmocka_unit_test(test_row_never_split),
        cmocka_unit_test(test_space_before_dropped_at_top),
        cmocka_unit_test(test_heading_never_ends_a_sheet),
        cmocka_unit_test(test_break_before_and_oversize),
        cmocka_unit_test(test_generated_flow_keeps_rules),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
