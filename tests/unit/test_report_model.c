/* test_report_model.c — the report model (report_model.h): the rows the
 * text listing, the JSON results and the PDF all show, for each statement
 * kind; a solve row substituted at its root; the governing check; a
 * method's formula parsed once; and the renderers carrying the model's rows.
 *
 * Reference values are worked by hand here: 2 ft = 0.6096 m exactly (NIST
 * SP 811: 1 ft = 0.3048 m); x^2 = 2 has the root sqrt(2) = 1.41421356...;
 * utilisations are lhs/rhs for <= and rhs/lhs for >=. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "eval.h"
#include "load.h"
#include "render.h"
#include "report_model.h"

static DiagList dl;
static Document *doc;
static Evaluated *ev;
static Arena arena;
static const ReportModel *model;

static void load(const char *front, const char *calc)
{
    arena_free(&arena);
    arena_init(&arena);
    doc_free(doc);
    diag_free(&dl);
    char text[8192];
    snprintf(text, sizeof text, "---\n%s---\n# t\n\n```calc\n%s\n```\n", front, calc);
    doc = doc_from_text("t.calc.md", text, strlen(text), &dl);
    assert_non_null(doc);
    ev = eval_document(doc, &dl);
    assert_non_null(ev);
    model = report_model_build(ev, &arena);
    assert_non_null(model);
    assert_int_equal(model->nrows, doc->nstmts);
}

static const ModelRow *row_of(const char *name)
{
    int slot = doc_lookup(doc, name);
    assert_true(slot >= 0);
    return &model->rows[slot];
}

static const ModelRow *check_row(const char *label)
{
    for (size_t i = 0; i < model->nrows; i++)
        if (model->rows[i].stmt->kind == STMT_CHECK && strcmp(model->rows[i].stmt->label, label) == 0)
            return &model->rows[i];
    fail_msg("no check %s", label);
    return NULL;
}

static void assert_close(double got, double want, double rel)
{
    if (!(fabs(got - want) <= rel * fabs(want)))
        fail_msg("got %.17g, want %.17g (rel %g)", got, want, rel);
}

static void test_def_rows(void **state)
{
    (void)state;
    load("units: SI\n", "L = 2 ft   # run length\nn = 3\nA = L*n\nB = A\nt = \"text\"\n");
    const ModelRow *L = row_of("L");
    assert_string_equal(L->symbol, "L");
    assert_string_equal(L->formula, "2 ft");
    assert_string_equal(L->description, "run length");
    assert_false(L->show_substituted);
    /* written in ft, shown in m: the result line says the value the sheet uses */
    assert_true(L->show_result);
    assert_string_equal(L->result.text, "0.6096 m");
    assert_close(L->result.shown, 0.6096, 1e-15);
    assert_string_equal(L->result.unit.text, "m");

    const ModelRow *n = row_of("n");
    assert_false(n->show_result);   /* an input shown as written */

    const ModelRow *A = row_of("A");
    assert_string_equal(A->formula, "L*n");
    assert_true(A->show_substituted);
    assert_string_equal(A->substituted, "(0.6096 m)*3.000");
    assert_string_equal(A->result.text, "1.829 m");
    assert_close(A->result.shown, 1.8288, 1e-14);   /* full precision, not 1.829 */

    const ModelRow *B = row_of("B");   /* a reference: no line that only repeats */
    assert_false(B->show_substituted);
    assert_true(B->show_result);

    const ModelRow *t = row_of("t");
    assert_false(t->show_result);
    assert_false(t->result.number);
}

/* pi stays the letter in the substituted line, as the PDF sets it. */
static void test_pi_is_a_letter(void **state)
{
    (void)state;
    load("units: SI\n", "D = 0.1 m\nA = pi*D^2/4\n");
    const ModelRow *A = row_of("A");
    assert_string_equal(A->substituted, "pi*(0.1000 m)^2/4");
    assert_string_equal(A->result.text, "0.007854 m^2");
}

/* A solve row shows the equation at its root, never at the trial value. */
static void test_solve_at_root(void **state)
{
    (void)state;
    load("units: SI\n", "x = 1\ny = x^2\nr = solve x where y = 2 between 0.5 and 3\n");
    const ModelRow *r = row_of("r");
    assert_true(r->evaluated);
    assert_string_equal(r->lhs_formula, "y");
    assert_string_equal(r->rhs_formula, "2");
    assert_close(r->result.shown, sqrt(2.0), 1e-9);
    assert_string_equal(r->result.text, "1.414");
    /* y = x^2 read at the root: 2.000, not the trial value 1 */
    assert_string_equal(r->lhs_at_root.text, "2.000");
    assert_string_equal(r->rhs_at_root.text, "2.000");
    assert_non_null(r->residual.text);
    assert_true(fabs(r->residual.si) < 1e-9);
    assert_string_equal(r->lo_text, "0.5");
    assert_string_equal(r->hi_text, "3");
    assert_true(r->iterations > 0);
}

/* Both sides, the verdict, the utilisation and the one check that governs. */
static void test_checks_and_governing(void **state)
{
    (void)state;
    load("units: SI\n",
         "V = 1.5 m/s\np = 300 kPa\n"
         "check velocity: V <= 2 m/s\n"
         "check pressure: p >= 350 kPa\n"
         "check easy: V <= 3 m/s\n"
         "finding big: V > 1 m/s\n");
    const ModelRow *v = check_row("velocity");
    assert_true(v->check.holds);
    assert_string_equal(v->check.verdict, "HOLDS");
    assert_close(v->check.utilization, 0.75, 1e-12);
    assert_string_equal(v->check.utilization_text, "0.750");
    assert_string_equal(v->check.lhs.text, "1.500 m/s");
    assert_string_equal(v->check.rhs.text, "2.000 m/s");
    assert_false(v->check.governs);
    const ModelRow *p = check_row("pressure");
    assert_false(p->check.holds);
    assert_string_equal(p->check.verdict, "FAILS");
    assert_close(p->check.utilization, 350.0 / 300.0, 1e-12);
    assert_true(p->check.governs);
    assert_int_equal(model->governing, p->stmt->index);
    const ModelRow *f = check_row("big");
    assert_true(f->check.finding);
    assert_string_equal(f->check.verdict, "yes");
    assert_false(f->check.governs);
    /* exactly one check governs */
    int n = 0;
    for (size_t i = 0; i < model->nrows; i++)
        n += model->rows[i].check.governs;
    assert_int_equal(n, 1);
    assert_int_equal(model->nchecks, 3);
    assert_int_equal(model->nfailed, 1);
}

/* A method's formula is parsed once, into the model; its first use is the
 * statement that shows it. */
static void test_method_formula(void **state)
{
    (void)state;
    load("units: SI\n", "f1 = friction_factor(1e5, 0.001)\nf2 = friction_factor(2e5, 0.001)\n");
    int s1 = doc_lookup(doc, "f1");
    assert_true(model->nmethods >= 1);
    const ModelRow *r1 = row_of("f1"), *r2 = row_of("f2");
    assert_true(r1->nmethods >= 1);
    const ModelMethod *mm = &model->methods[r1->methods[0]];
    assert_int_equal(mm->first_use, s1);
    assert_non_null(mm->lhs);
    assert_ptr_equal(report_model_method(model, mm->method), mm);
    assert_int_equal(r2->methods[0], r1->methods[0]);
}

/* A method call's inputs are substituted like any formula: Joukowsky's
 * rise 1000 kg/m^3 * 1200 m/s * 1.5 m/s = 1.8 MPa (by hand), shown as the
 * method's formula with the call's values. */
static void test_method_use_substituted(void **state)
{
    (void)state;
    load("units: SI\n", "rho = 1000 kg/m^3\na = 1200 m/s\ndp = surge(rho, a, 1.5 m/s)\n");
    const ModelRow *r = row_of("dp");
    assert_int_equal(r->nuses, 1);
    const ModelUse *u = &r->uses[0];
    assert_string_equal(u->lhs, "Delta_p");
    assert_string_equal(u->formula, "rho*a*Delta_V");
    assert_non_null(u->substituted);
    assert_string_equal(u->substituted, "(1000 kg/m^3)*(1200 m/s)*(1.500 m/s)");
    assert_true(u->result.number);
    assert_close(u->result.si, 1.8e6, 1e-12);
    assert_string_equal(u->result.text, r->result.text);
}

/* wave_speed names the support and the c1 it used, with Poisson's ratio:
 * anchored throughout, c1 = 1 - nu^2 = 1 - 0.30^2 = 0.9100 for steel (nu
 * 0.30, the value the library tabulates for steel); 12 in schedule 40 has
 * D/e = 11.938/0.406 = 29.4, a thin wall. */
static void test_wave_speed_branch(void **state)
{
    (void)state;
    load("units: US\n", "w = water(60 degF)\np = pipe(\"ASME B36.10M\", \"12\", \"40\")\n"
                         "a = wave_speed(p, w, support=\"anchored\")\n");
    const ModelRow *r = row_of("a");
    assert_true(r->nuses >= 1);
    const ModelUse *u = &r->uses[0];
    assert_non_null(u->branch);
    assert_non_null(strstr(u->branch, "anchored throughout"));
    assert_non_null(strstr(u->branch, "c₁ = 1 − ν²"));
    assert_non_null(strstr(u->branch, "0.9100"));
    assert_non_null(strstr(u->branch, "ν = 0.3000"));
    assert_non_null(u->substituted);
    assert_non_null(strstr(u->substituted, "0.9100"));
    assert_close(u->result.si, r->res->value.q.si, 1e-15);
}

/* A solve row's method uses are those at the root, never at the trial
 * value: the curve through (0, 30 m), (2 L/s, 28 m), (4 L/s, 22 m) is
 * H = 30 m - 0.5 m/(L/s)^2 * Q^2 (by hand), so pump(Q) = 20 m at
 * Q = sqrt(20) L/s = 4.472 L/s; the trial value is 1 L/s. */
static void test_solve_uses_at_root(void **state)
{
    (void)state;
    load("units: SI\n", "pmp = pump_curve(0 L/s, 30 m, 2 L/s, 28 m, 4 L/s, 22 m)\nQ = 1 L/s\n"
                         "Qr = solve Q where pmp(Q) = 20 m between 0.5 L/s and 10 L/s\n");
    const ModelRow *r = row_of("Qr");
    assert_close(r->result.si, sqrt(20.0) * 1e-3, 1e-9);
    assert_int_equal(r->nuses, 1);
    const ModelUse *u = &r->uses[0];
    assert_non_null(u->substituted);
    assert_non_null(strstr(u->substituted, "(4.472 L/s)"));
    assert_null(strstr(u->substituted, "(1.000 L/s)"));
    assert_string_equal(u->result.text, "20.00 m");
}

/* The text listing and the JSON results carry the model's rows. */
static void test_renderers_carry_rows(void **state)
{
    (void)state;
    load("units: SI\n", "L = 2 ft\nn = 3\nA = L*n\ncheck len: A <= 2 m\n");
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    assert_true(render_text(ev, f));
    fclose(f);
    const ModelRow *A = row_of("A");
    char want[256];
    snprintf(want, sizeof want, "A = %s = %s = %s", A->formula, A->substituted, A->result.text);
    assert_non_null(strstr(buf, want));
    const ModelRow *c = check_row("len");
    snprintf(want, sizeof want, "%s <= %s : %s (utilisation %s)", c->check.lhs.text, c->check.rhs.text,
             c->check.verdict, c->check.utilization_text);
    assert_non_null(strstr(buf, want));
    free(buf);

    buf = NULL;
    f = open_memstream(&buf, &len);
    const Evaluated *one[1] = {ev};
    assert_true(render_json(one, &dl, 1, f));
    fclose(f);
    snprintf(want, sizeof want, "\"text\": \"%s\"", A->result.text);
    assert_non_null(strstr(buf, want));
    assert_non_null(strstr(buf, "\"governing\": true"));
    free(buf);
}

/* A network's columns are the model's: the load column only where the
 * demands come from fixtures, the pressure last, and each cell the
 * node's or link's own value in SI (NAN where there is none). */
static void test_network_columns(void **state)
{
    (void)state;
    load("units: US\n", "x = 1");
    NetColumns plain = report_node_columns(ev, false), fx = report_node_columns(ev, true);
    assert_int_equal(plain.n, 5);
    assert_int_equal(fx.n, 6);
    assert_int_equal(fx.map[2], NCOL_LOAD);
    assert_string_equal(fx.word[2], "fixture load, wsfu");
    assert_false(fx.has_unit[2]);
    for (int i = 0; i < plain.n; i++)
        assert_int_not_equal(plain.map[i], NCOL_LOAD);
    assert_int_equal(plain.map[plain.n - 1], NCOL_P);
    assert_string_equal(plain.unit[plain.n - 1].text, "psi");
    assert_string_equal(plain.key[plain.n - 1], "p");
    NodeResult g = {.z = 3, .head = 40, .p = 2e5, .demand = 0.001, .has_load = true, .load = 12.6};
    assert_true(report_node_cell(&g, NCOL_LOAD) == 12.6);
    assert_true(report_node_cell(&g, NCOL_DEMAND) == 0.001);
    assert_true(report_node_cell(&g, NCOL_P) == 2e5);
    g.has_load = false;
    assert_true(isnan(report_node_cell(&g, NCOL_LOAD)));
    assert_true(isnan(report_node_cell(&g, NCOL_NODE)));
    NetColumns lc = report_link_columns(ev);
    assert_int_equal(lc.n, 14);
    assert_true(lc.text[LCOL_FROM] && lc.text[LCOL_DEVICE] && !lc.text[LCOL_Q]);
    assert_string_equal(lc.unit[LCOL_D].text, "in");
    assert_string_equal(lc.key[LCOL_DPDEV], "dp_device");
    LinkResult k = {.Q = 0.002, .f = NAN, .h_f = 1.5, .dp_device = 0, .device = NET_DEVICE_NONE};
    assert_true(report_link_cell(&k, LCOL_Q) == 0.002);
    assert_true(isnan(report_link_cell(&k, LCOL_F)));
    assert_true(report_link_cell(&k, LCOL_DPDEV) == 0);
    assert_true(isnan(report_link_cell(&k, LCOL_DEVICE)));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_def_rows),
        cmocka_unit_test(test_pi_is_a_letter),
        cmocka_unit_test(test_solve_at_root),
        cmocka_unit_test(test_checks_and_governing),
        cmocka_unit_test(test_method_formula),
        cmocka_unit_test(test_method_use_substituted),
        cmocka_unit_test(test_wave_speed_branch),
        cmocka_unit_test(test_solve_uses_at_root),
        cmocka_unit_test(test_renderers_carry_rows),
        cmocka_unit_test(test_network_columns),
    };
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    arena_free(&arena);
    doc_free(doc);
    diag_free(&dl);
    return rc;
}
