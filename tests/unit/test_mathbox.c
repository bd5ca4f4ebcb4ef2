/* test_mathbox.c — cmocka tests of the equation layout.
 *
 * A fixed fake metric makes every dimension computable by hand: each
 * character (UTF-8 code point) is half the font size wide, text runs rise
 * 0.7 of the size above the baseline and hang 0.2 below, the math axis is at
 * 0.25. The expected widths, heights and depths below are worked out from
 * the rules stated in src/report/mathbox.c (gaps and paddings as fractions
 * of the size) and checked to 1e-9 pt. The row tests evaluate a small calc
 * with the real pipeline and check where a long row breaks. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "eval.h"
#include "load.h"
#include "mathbox.h"
#include "report_model.h"

#define TOL 1e-9

/* cmocka 1.1's assert_float_equal works in float; these are doubles. */
#define assert_near(got, want, tol)                                                         \
    do {                                                                                   \
        double g_ = (got), w_ = (want);                                                    \
        if (!(fabs(g_ - w_) <= (tol)))                                                     \
            fail_msg("%s = %.12g, want %.12g (tol %g)", #got, g_, w_, (double)(tol));      \
    } while (0)

static double fake_width(void *ctx, FontRole f, double size, const char *s)
{
    (void)ctx;
    (void)f;
    size_t cps = 0;
    for (const unsigned char *p = (const unsigned char *)s; *p; p++)
        if ((*p & 0xC0) != 0x80)
            cps++;
    return 0.5 * size * (double)cps;
}

static const MathMetrics FAKE = {fake_width, NULL, 0.7, 0.2, 0.25};

static Arena arena;
static MathEnv env;

static int setup(void **state)
{
    (void)state;
    arena_init(&arena);
    env = (MathEnv){&arena, &FAKE, NULL, 4, NULL, NULL};
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    arena_free(&arena);
    return 0;
}

static void test_text_box(void **state)
{
    (void)state;
    MathBox *b = mbox_text(&env, FONT_SERIF, 10, "abc");
    assert_near(b->w, 15, TOL);
    assert_near(b->h, 7, TOL);
    assert_near(b->d, 2, TOL);
    /* Greek counts as one character per letter */
    assert_near(mbox_text(&env, FONT_SERIF, 10, "ρΔ")->w, 10, TOL);
}

/* num "ab" (10 wide) over den "abcd" (20 wide) at 10 pt: bar 0.55 thick on
 * the axis at 2.5, gaps 1.4, side padding 1.2. */
static void test_fraction(void **state)
{
    (void)state;
    MathBox *num = mbox_text(&env, FONT_SERIF, 10, "ab");
    MathBox *den = mbox_text(&env, FONT_SERIF, 10, "abcd");
    MathBox *f = mbox_frac(&env, num, den, 10);
    assert_near(f->w, 22.4, TOL);
    assert_near(num->y, 2.5 + 0.275 + 1.4 + 2, TOL);   /* numerator baseline */
    assert_near(den->y, 2.5 - 0.275 - 1.4 - 7, TOL);   /* denominator baseline */
    assert_near(f->h, 6.175 + 7, TOL);
    assert_near(f->d, 6.175 + 2, TOL);
    assert_near(num->x, 1.2 + 5, TOL);                 /* centred */
    assert_near(den->x, 1.2, TOL);
    assert_near(f->rule, 0.55, TOL);
}

static void test_superscript(void **state)
{
    (void)state;
    MathBox *base = mbox_text(&env, FONT_SERIF_ITALIC, 10, "x");
    MathBox *sup = mbox_text(&env, FONT_SERIF, 10 * MATH_SCRIPT_SCALE, "2");
    MathBox *s = mbox_script(&env, base, sup, NULL, 10);
    /* raised by max(7 - 0.55*4.9, 0.40*10) = 4.305 */
    assert_near(sup->y, 4.305, TOL);
    assert_near(sup->x, 5 + 0.4, TOL);
    assert_near(s->w, 5 + 0.4 + 3.5, TOL);
    assert_near(s->h, 4.305 + 4.9, TOL);
    assert_near(s->d, 2, TOL);
}

static void test_subscript(void **state)
{
    (void)state;
    MathBox *base = mbox_text(&env, FONT_SERIF_ITALIC, 10, "h");
    MathBox *sub = mbox_text(&env, FONT_SERIF_ITALIC, 7, "f");
    MathBox *s = mbox_script(&env, base, NULL, sub, 10);
    /* lowered by max(2 - 0.3*4.9, 0.20*10) = 2 */
    assert_near(sub->y, -2, TOL);
    assert_near(s->d, 2 + 1.4, TOL);
    assert_near(s->h, 7, TOL);
    assert_near(s->w, 5 + 0.4 + 3.5, TOL);
}

/* A superscript over a tall base (a fraction) rides higher. */
static void test_script_on_fraction(void **state)
{
    (void)state;
    MathBox *f = mbox_frac(&env, mbox_text(&env, FONT_SERIF, 10, "a"),
                           mbox_text(&env, FONT_SERIF, 10, "b"), 10);
    MathBox *sup = mbox_text(&env, FONT_SERIF, 7, "2");
    mbox_script(&env, f, sup, NULL, 10);
    assert_near(sup->y, f->h - 0.55 * 4.9, TOL);
    assert_true(sup->y > 4.0);
}

/* Radicand "ab" at 10 pt: sign 5 + 0.08*(7+2) wide, radicand after a 0.6
 * gap, vinculum 1.2 above it plus the 0.55 rule and 0.4 clearance. */
static void test_root(void **state)
{
    (void)state;
    MathBox *in = mbox_text(&env, FONT_SERIF, 10, "ab");
    MathBox *r = mbox_root(&env, in, 10);
    assert_near(in->x, 5.72 + 0.6, TOL);
    assert_near(r->w, 6.32 + 10 + 0.8, TOL);
    assert_near(r->h, 7 + 1.2 + 0.55 + 0.4, TOL);
    assert_near(r->d, 2 + 0.6, TOL);
    /* a taller radicand gets a wider sign */
    MathBox *tall = mbox_frac(&env, mbox_text(&env, FONT_SERIF, 10, "a"),
                              mbox_text(&env, FONT_SERIF, 10, "b"), 10);
    MathBox *r2 = mbox_root(&env, tall, 10);
    assert_true(r2->a->x > in->x);
    assert_near(r2->h, tall->h + 1.2 + 0.55 + 0.4, TOL);
}

static void test_fence_grows(void **state)
{
    (void)state;
    MathBox *in = mbox_text(&env, FONT_SERIF, 10, "ab");
    MathBox *f = mbox_fence(&env, in, 10, "(", ")");
    assert_false(f->drawn_fence);
    assert_near(f->w, 5 + 10 + 5, TOL);
    assert_near(f->h, 7, TOL);

    MathBox *tall = mbox_frac(&env, mbox_text(&env, FONT_SERIF, 10, "ab"),
                              mbox_text(&env, FONT_SERIF, 10, "abcd"), 10);
    double ht = tall->h + tall->d; /* 21.35 */
    MathBox *g = mbox_fence(&env, tall, 10, "(", ")");
    assert_true(g->drawn_fence);
    double pw = 2.2 + 0.04 * ht;
    assert_near(g->w, 2 * pw + 22.4, TOL);
    assert_near(g->h, tall->h + 0.8, TOL);
    assert_near(g->d, tall->d + 0.8, TOL);
}

static void test_hlist(void **state)
{
    (void)state;
    MathBox *k[3] = {mbox_text(&env, FONT_SERIF, 10, "a"), mbox_space(&env, 2),
                     mbox_frac(&env, mbox_text(&env, FONT_SERIF, 10, "b"),
                               mbox_text(&env, FONT_SERIF, 10, "c"), 10)};
    MathBox *h = mbox_hlist(&env, k, 3);
    assert_near(k[2]->x, 7, TOL);
    assert_near(h->w, 5 + 2 + 7.4, TOL);
    assert_near(h->h, k[2]->h, TOL);
}

static void test_unit_text(void **state)
{
    (void)state;
    static const char *const cases[][2] = {
        {"lbf*s/ft^2", "lbf·s/ft²"}, {"ft^2", "ft²"},      {"m^3/h", "m³/h"},
        {"degF", "°F"},             {"delta_degC", "Δ°C"}, {"ftH2O", "ftH₂O"},
        {"kg/m^3", "kg/m³"},         {"1", ""},            {"gal/min", "gal/min"},
        {"s^-1", "s⁻¹"},             {"percent", "%"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char buf[64];
        mbox_unit_text(cases[i][0], buf, sizeof buf);
        if (strcmp(buf, cases[i][1]) != 0)
            fail_msg("unit %s: got '%s', want '%s'", cases[i][0], buf, cases[i][1]);
    }
}

/* Numbers outside 1e-3..1e6 get a ×10ⁿ superscript (num_parts). */
static void test_number_scientific(void **state)
{
    (void)state;
    MathBox *b = mbox_number(&env, 1.234e-5, 10, FONT_SERIF);
    assert_int_equal(b->kind, BOX_SCRIPT);
    assert_string_equal(b->a->text, "1.234×10");
    assert_string_equal(b->b->text, "−5");
    MathBox *p = mbox_number(&env, 4.05, 10, FONT_SERIF);
    assert_int_equal(p->kind, BOX_TEXT);
    assert_string_equal(p->text, "4.050");
}

/* Greedy breaking at relations. */
static void test_break_pieces(void **state)
{
    (void)state;
    size_t line[4];
    double w[4] = {30, 40, 50, 60};
    assert_int_equal(mbox_break(w, NULL, 4, 100, 20, line), 3);
    assert_int_equal(line[0], 0);
    assert_int_equal(line[1], 0);
    assert_int_equal(line[2], 1); /* 70 + 50 > 100: continues at the indent */
    assert_int_equal(line[3], 2); /* 20 + 50 + 60 > 100 */

    /* a chain start always begins a line, at the margin */
    bool nl[4] = {false, false, true, false};
    assert_int_equal(mbox_break(w, nl, 4, 120, 20, line), 2);
    assert_int_equal(line[2], 1);
    assert_int_equal(line[3], 1); /* 50 + 60 <= 120 */

    /* a piece wider than the line sits alone */
    double wide[3] = {30, 150, 30};
    assert_int_equal(mbox_break(wide, NULL, 3, 100, 20, line), 3);
    assert_int_equal(line[1], 1);
    assert_int_equal(line[2], 2);
    assert_int_equal(mbox_break(w, NULL, 0, 100, 20, line), 0);
}

/* A real statement: the row is symbol, = formula, = substituted, = result,
 * one chain; on a narrow line it breaks before the '=' of later pieces. */
static void test_statement_row_breaks_at_equals(void **state)
{
    (void)state;
    static const char text[] =
        "```calc\n"
        "Q = 95 gal/min\n"
        "D = 2.465 in\n"
        "V = Q / (pi * D^2 / 4) as ft/s   # mean velocity\n"
        "check velocity: V <= 8 ft/s\n"
        "```\n";
    DiagList dl = {0};
    Document *doc = doc_from_text("t.calc.md", text, strlen(text), &dl);
    assert_non_null(doc);
    Evaluated *ev = eval_document(doc, &dl);
    assert_int_equal(dl.errors, 0);
    MathEnv e = {&doc->arena, &FAKE, ev, 4, NULL, NULL};
    const ReportModel *model = report_model_build(ev, &doc->arena);
    MathRow row;
    mbox_stmt_row(&e, doc->stmts[2], &model->rows[2], 10, &row);
    assert_int_equal(row.n, 4);
    assert_true(row.chain_start[0]);
    for (size_t i = 1; i < row.n; i++) {
        assert_false(row.chain_start[i]);
        /* every later piece opens with its relation: space, "=", space, ... */
        assert_int_equal(row.piece[i]->kind, BOX_HLIST);
        const MathBox *op = row.piece[i]->kids[0];
        assert_int_equal(op->kind, BOX_HLIST);
        assert_string_equal(op->kids[1]->text, "=");
    }
    /* the result piece is the value in its display unit, bold */
    const MathBox *res = row.piece[3]->kids[1];
    assert_int_equal(res->kind, BOX_HLIST);
    /* 95 gal/min in a 2.465 in bore: 0.0059935 m^3/s over 0.0030788 m^2 = 1.9467 m/s =
     * 6.3868 ft/s, by hand from the exact definitions of gal and in */
    assert_string_equal(res->kids[0]->text, "6.387");
    assert_int_equal(res->kids[0]->font, FONT_SERIF_BOLD);
    assert_string_equal(res->kids[2]->text, "ft/s");

    double w[MATHROW_MAX], total = 0;
    size_t line[MATHROW_MAX];
    for (size_t i = 0; i < row.n; i++) {
        w[i] = row.piece[i]->w;
        total += w[i];
    }
    assert_int_equal(mbox_break(w, row.chain_start, row.n, total + 1, 30, line), 1);
    /* narrower than the whole row but wider than each piece plus the indent */
    double widest = 0;
    for (size_t i = 0; i < row.n; i++)
        if (w[i] > widest)
            widest = w[i];
    double avail = widest + 31;
    assert_true(avail < total);
    size_t nl = mbox_break(w, row.chain_start, row.n, avail, 30, line);
    assert_true(nl >= 2);
    for (size_t l = 0; l < nl; l++) {
        double x = l ? 30 : 0;
        for (size_t i = 0; i < row.n; i++)
            if (line[i] == l)
                x += w[i];
        assert_true(x <= avail + TOL);
    }

    /* a check: formulas, then values (no middle line for names and literals) */
    mbox_stmt_row(&e, doc->stmts[3], &model->rows[3], 10, &row);
    assert_int_equal(row.n, 4);
    assert_true(row.chain_start[0]);
    assert_true(row.chain_start[2]);
    diag_free(&dl);
    doc_free(doc);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test_setup_teardown(test_text_box, setup, teardown),
        cmocka_unit_test_setup_teardown(test_fraction, setup, teardown),
        cmocka_unit_test_setup_teardown(test_superscript, setup, teardown),
        cmocka_unit_test_setup_teardown(test_subscript, setup, teardown),
        cmocka_unit_test_setup_teardown(test_script_on_fraction, setup, teardown),
        cmocka_unit_test_setup_teardown(test_root, setup, teardown),
        cmocka_unit_test_setup_teardown(test_fence_grows, setup, teardown),
        cmocka_unit_test_setup_teardown(test_hlist, setup, teardown),
        cmocka_unit_test_setup_teardown(test_unit_text, setup, teardown),
        cmocka_unit_test_setup_teardown(test_number_scientific, setup, teardown),
        cmocka_unit_test_setup_teardown(test_break_pieces, setup, teardown),
        cmocka_unit_test(test_statement_row_breaks_at_equals),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
