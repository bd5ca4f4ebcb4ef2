/* test_diff.c — the semantic diff as an API: the tolerance rule, matching
 * and renames, which changed inputs a result depends on (through the
 * dependency graph, not through the text), and the revision marks that the
 * PDF's `build --since` reads for every statement and prose block of NEW.
 *
 * Reference values: 1 gal = 231 in^3 and 1 in = 0.0254 m exactly (NIST SP
 * 811), so 40 gal/min = 2.523607856e-3 m^3/s (GNU units agrees to 10 digits). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "diff.h"
#include "load.h"

typedef struct Side {
    DiagList dl;
    Document *doc;
    Evaluated *ev;
} Side;

static void load(Side *s, const char *text)
{
    s->dl = (DiagList){0};
    s->doc = doc_from_text("t.calc.md", text, strlen(text), &s->dl);
    s->ev = eval_document(s->doc, &s->dl);
    assert_int_equal(s->dl.errors, 0);
}

static void unload(Side *s)
{
    doc_free(s->doc);
    diag_free(&s->dl);
}

static const char OLD[] =
    "# Purpose\n\nFirst paragraph.\n\nSecond paragraph.\n\n"
    "# Data\n\n```calc\n"
    "Q = 40 gal/min\n"
    "D = 2 in\n"
    "L = 100 ft\n"
    "A = pi*D^2/4\n"
    "V = Q/A as ft/s\n"
    "W = L*2\n"
    "U = V*L\n"
    "check speed: V <= 5 ft/s\n"
    "```\n";

static void tolerance_rule(void **state)
{
    (void)state;
    DiffOptions o = diff_options_default();
    assert_true(o.rel_tol == 1e-9);
    static const struct { double a, b; bool differ; } cases[] = {
        {1.0, 1.0 + 5e-10, false},     /* inside the relative tolerance */
        {1.0, 1.0 + 2e-9, true},
        {1e5, 1e5 + 1e-5, false},      /* relative, not absolute */
        {0.0, 1e-16, false},           /* below the absolute floor */
        {0.0, 1e-12, true},
        {-1.0, 1.0, true},
        {NAN, NAN, false},
        {NAN, 1.0, true},
        {INFINITY, INFINITY, false},
        {INFINITY, 1e300, true},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
        assert_int_equal(diff_numbers_differ(cases[i].a, cases[i].b, &o), cases[i].differ);
}

/* An input change reaches V and U (through V), not W; V's list of changed
 * inputs is found through the graph. Marks follow. */
static void inputs_through_the_graph(void **state)
{
    (void)state;
    Side a, b;
    load(&a, OLD);
    char text[2048];
    snprintf(text, sizeof text, "%s", OLD);
    char *q = strstr(text, "Q = 40");
    memcpy(q, "Q = 60", 6);
    load(&b, text);
    Diff *d = diff_compute(a.ev, b.ev, NULL);
    assert_true(d->changed);
    assert_int_equal(d->ninputs, 1);
    assert_string_equal(d->inputs[0].name, "Q");
    assert_true(fabs(d->inputs[0].old_value.q.si - 2.523607856e-3) < 1e-12);
    assert_true(fabs(d->inputs[0].rel - 0.5) < 1e-12);
    assert_int_equal(d->nresults, 2);
    assert_string_equal(d->results[0].name, "V");
    assert_string_equal(d->results[1].name, "U");
    for (size_t i = 0; i < 2; i++) {
        assert_int_equal(d->results[i].ninputs, 1);
        assert_string_equal(d->inputs[d->results[i].inputs[0]].name, "Q");
        assert_false(d->results[i].formula_changed);
    }
    assert_int_equal(d->nchecks, 1);
    assert_int_equal(d->checks[0].kind, CHECK_NOW_FAILS);
    const Document *nd = b.doc;
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(nd, "Q")), MARK_CHANGED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(nd, "V")), MARK_CHANGED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(nd, "U")), MARK_CHANGED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(nd, "W")), MARK_SAME);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(nd, "A")), MARK_SAME);
    assert_int_equal(diff_stmt_mark(d, 7), MARK_CHANGED); /* the check */
    assert_int_equal(diff_stmt_mark(d, 999), MARK_SAME);
    for (const Block *bl = nd->blocks; bl; bl = bl->next)
        assert_int_equal(diff_block_mark(d, bl), MARK_SAME);
    diff_free(d);
    unload(&a);
    unload(&b);
}

/* A rename with the readers rewritten is one rename and nothing else; an
 * added statement is marked added; a reworded paragraph is marked changed. */
static void renames_and_marks(void **state)
{
    (void)state;
    Side a, b;
    load(&a, OLD);
    load(&b, "# Purpose\n\nFirst paragraph, reworded.\n\nSecond paragraph.\n\n"
             "# Data\n\n```calc\n"
             "Q_d = 40 gal/min\n"
             "L = 100 ft\n"
             "D = 50.8 mm\n"
             "A = pi*D^2/4\n"
             "V = Q_d/A as m/s\n"
             "W = L*2\n"
             "U = V*L\n"
             "extra = W + L\n"
             "check speed: V <= 5 ft/s\n"
             "```\n");
    Diff *d = diff_compute(a.ev, b.ev, NULL);
    assert_int_equal(d->ninputs, 0);
    assert_int_equal(d->nresults, 0);
    assert_int_equal(d->nchecks, 0);
    assert_int_equal(d->nstmts, 2);
    assert_int_equal(d->stmts[0].kind, STMT_RENAMED);
    assert_string_equal(a.doc->stmts[d->stmts[0].old_slot]->name, "Q");
    assert_string_equal(b.doc->stmts[d->stmts[0].new_slot]->name, "Q_d");
    assert_int_equal(d->stmts[1].kind, STMT_ADDED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(b.doc, "extra")), MARK_ADDED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(b.doc, "Q_d")), MARK_CHANGED);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(b.doc, "V")), MARK_SAME);
    assert_int_equal(diff_stmt_mark(d, (size_t)doc_lookup(b.doc, "D")), MARK_SAME);
    assert_int_equal(d->nprose, 1);
    assert_int_equal(d->prose[0].changed, 1);
    const Block *first = b.doc->blocks->next, *second = first->next;
    assert_int_equal(first->kind, BLK_PARAGRAPH);
    assert_int_equal(diff_block_mark(d, first), MARK_CHANGED);
    assert_int_equal(diff_block_mark(d, second), MARK_SAME);
    assert_int_equal(diff_block_mark(d, b.doc->blocks), MARK_SAME);
    diff_free(d);
    unload(&a);
    unload(&b);
}

/* Renames among many statements of one shape (a name times a literal): each
 * NEW statement takes the first OLD orphan whose formula is the same
 * (literals equal in SI: 12 in is 1 ft), not the first of its shape; one
 * whose literal differs from every orphan's is added, and the orphan left
 * over is removed. A rename seen earlier (L to L2) counts in later formulas. */
static void renames_of_one_shape(void **state)
{
    (void)state;
    Side a, b;
    load(&a, "```calc\nL = 10 ft\na1 = L*2\na2 = L*3\na3 = L*4\na4 = L*5\nm = 1 ft\n```\n");
    load(&b, "```calc\nL2 = 10 ft\nb4 = L2*5\nb2 = L2*3\nb9 = L2*9\nb1 = L2*2\nn = 12 in\n```\n");
    Diff *d = diff_compute(a.ev, b.ev, NULL);
    static const char *const pairs[][2] = {{"L", "L2"}, {"a4", "b4"}, {"a2", "b2"}, {"a1", "b1"}, {"m", "n"}};
    size_t renamed = 0, added = 0, removed = 0;
    for (size_t k = 0; k < d->nstmts; k++) {
        const StmtChange *c = &d->stmts[k];
        if (c->kind == STMT_RENAMED) {
            assert_true(renamed < sizeof pairs / sizeof pairs[0]);
            assert_string_equal(a.doc->stmts[c->old_slot]->name, pairs[renamed][0]);
            assert_string_equal(b.doc->stmts[c->new_slot]->name, pairs[renamed][1]);
            renamed++;
        } else if (c->kind == STMT_ADDED) {
            assert_string_equal(b.doc->stmts[c->new_slot]->name, "b9");
            added++;
        } else {
            assert_string_equal(a.doc->stmts[c->old_slot]->name, "a3");
            removed++;
        }
    }
    assert_int_equal(renamed, 5);
    assert_int_equal(added, 1);
    assert_int_equal(removed, 1);
    diff_free(d);
    unload(&a);
    unload(&b);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(tolerance_rule),
        cmocka_unit_test(inputs_through_the_graph),
        cmocka_unit_test(renames_and_marks),
        cmocka_unit_test(renames_of_one_shape),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
