/* test_eval.c — the evaluator on whole calc texts: values in SI with
 * tolerances, the temperature rules, dimension errors worded as the user
 * sees them, solve with re-evaluation of dependents, checks and utilisation.
 *
 * Reference values: unit factors are exact by definition (NIST SP 811:
 * 1 gal = 231 in^3 = 3.785411784e-3 m^3, 1 ft = 0.3048 m, 1 lbf =
 * 4.4482216152605 N, 1 in = 0.0254 m); the temperature scales by their
 * definitions (degF = K*9/5 - 459.67). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "eval.h"
#include "load.h"

static DiagList dl;
static Document *doc;
static Evaluated *ev;

static void load(const char *calc)
{
    doc_free(doc);
    diag_free(&dl);
    char text[8192];
    snprintf(text, sizeof text, "# t\n\n```calc\n%s\n```\n", calc);
    doc = doc_from_text("t.calc.md", text, strlen(text), &dl);
    ev = eval_document(doc, &dl);
}

static double si(const char *name)
{
    int slot = doc_lookup(doc, name);
    assert_true(slot >= 0);
    assert_int_equal(ev->results[slot].state, RES_OK);
    return ev->results[slot].value.q.si;
}

static void assert_close(double got, double want, double rel)
{
    if (!(fabs(got - want) <= rel * fabs(want)))
        fail_msg("got %.17g, want %.17g (rel %g)", got, want, rel);
}

/* The first error's line (in the calc block: line 4 is its first line) and
 * a fragment of its message. */
static void assert_error(int line, int col, const char *fragment)
{
    for (size_t i = 0; i < dl.len; i++)
        if (dl.items[i].severity == SEV_ERROR && dl.items[i].pos.line == line &&
            dl.items[i].pos.col == col && strstr(dl.items[i].message, fragment))
            return;
    for (size_t i = 0; i < dl.len; i++)
        print_message("  have %d:%d %s\n", dl.items[i].pos.line, dl.items[i].pos.col, dl.items[i].message);
    fail_msg("no error at %d:%d containing '%s'", line, col, fragment);
}

static void test_arithmetic_and_units(void **state)
{
    (void)state;
    load("Q = 38 gal/min\n"
         "A = 0.05 ft^2\n"
         "V = Q/A\n"
         "L = 2*3 ft + 6 in\n"
         "p = 10 psi + 1 kPa\n"
         "x = -2^2\n"
         "y = 2^-1\n"
         "z = 12/3/2\n"
         "r = sqrt(4 m^2)\n"
         "h = sqrt(2 m)^2\n"
         "n = 3 ft/(1 in)\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("Q"), 38 * 3.785411784e-3 / 60, 1e-15);
    assert_close(si("V"), 38 * 3.785411784e-3 / 60 / (0.05 * 0.3048 * 0.3048), 1e-15);
    assert_close(si("L"), 6 * 0.3048 + 6 * 0.0254, 1e-15);
    assert_close(si("p"), 10 * 4.4482216152605 / (0.0254 * 0.0254) + 1000, 1e-15);
    assert_close(si("x"), -4, 0);
    assert_close(si("y"), 0.5, 0);
    assert_close(si("z"), 2, 0);
    assert_close(si("r"), 2, 1e-15);
    assert_true(dim_eq(ev->results[doc_lookup(doc, "r")].value.q.dim, DIM_L));
    assert_true(dim_eq(ev->results[doc_lookup(doc, "h")].value.q.dim, DIM_L));
    assert_close(si("n"), 36, 1e-15);
    assert_true(dim_is_none(ev->results[doc_lookup(doc, "n")].value.q.dim));
}

static void test_temperatures(void **state)
{
    (void)state;
    load("T1 = 68 degF\n"
         "T2 = 50 degF\n"
         "dT = T1 - T2\n"
         "T3 = 20 degC + 5 delta_degC\n"
         "T4 = T2 + dT\n"
         "T5 = 300 K * 2\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("T1"), 293.15, 1e-15);
    assert_close(si("dT"), 10, 1e-13);
    assert_int_equal(ev->results[doc_lookup(doc, "dT")].value.q.temp, TEMP_NONE);
    assert_close(si("T3"), 298.15, 1e-15);
    assert_int_equal(ev->results[doc_lookup(doc, "T3")].value.q.temp, TEMP_ABSOLUTE_OFFSET);
    assert_close(si("T4"), 293.15, 1e-15);
    assert_close(si("T5"), 600, 1e-15);

    load("a = 2*(20 degC)\n"
         "b = 20 degC + 30 degC\n"
         "c = 5 delta_degC - 20 degC\n");
    assert_error(4, 7, "cannot multiply an absolute temperature");
    assert_error(5, 13, "cannot add two absolute temperatures");
    assert_error(6, 18, "cannot subtract an absolute temperature");
}

/* A whole file, front matter included. */
static void load_file(const char *text)
{
    doc_free(doc);
    diag_free(&dl);
    doc = doc_from_text("t.calc.md", text, strlen(text), &dl);
    ev = eval_document(doc, &dl);
}

static PressureRef ref_of(const char *name)
{
    int slot = doc_lookup(doc, name);
    assert_true(slot >= 0);
    return ev->results[slot].value.q.pref;
}

/* DESIGN 2.9: the point/difference algebra of gauge and absolute pressures.
 * psi = 4.4482216152605 N / (0.0254 m)^2 = 6894.757293168361 Pa (exact
 * definitions); the standard atmosphere is 101325 Pa. */
static void test_pressure_points(void **state)
{
    (void)state;
    const double PSI = 4.4482216152605 / (0.0254 * 0.0254), ATM = 101325.0;
    load("pa = 30 psia\n"
         "pb = 20 psia\n"
         "dp = pa - pb\n"       /* point - point: plain */
         "pc = pb + 5 psi\n"    /* point + plain: point */
         "pd = pa - 5 psi\n"
         "pe = 5 psi + pb\n"    /* plain + point: point */
         "g1 = 40 psig\n"
         "g2 = g1 - 10 psig\n"  /* gauge - gauge: plain */
         "g3 = 50 psi - g1\n"   /* plain - gauge: plain, read as gauge */
         "ga = g1 as psia\n"    /* adds the atmosphere */
         "ag = pa as psig\n"    /* takes it away */
         "pl = 12 psi as kPaa\n" /* a plain pressure read as gauge */
         "gp = g1 as psi\n"     /* gauge shown plain: plain */
         "vac = -5 psig\n"      /* a negative literal on a scale is a value */
         "m = mean(pa, pb)\n"
         "l = lerp(pa, pb, 0.25)\n"
         "mg = mean(g1, 10 psi)\n"
         "check gauge_vs_plain: g1 <= 50 psi\n"
         "check abs_vs_abs: pb <= pa\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("dp"), 10 * PSI, 1e-14);
    assert_int_equal(ref_of("dp"), PRES_PLAIN);
    assert_close(si("pc"), 25 * PSI, 1e-14);
    assert_int_equal(ref_of("pc"), PRES_ABSOLUTE);
    assert_int_equal(ref_of("pd"), PRES_ABSOLUTE);
    assert_int_equal(ref_of("pe"), PRES_ABSOLUTE);
    assert_int_equal(ref_of("g1"), PRES_GAUGE);
    assert_int_equal(ref_of("g2"), PRES_PLAIN);
    assert_close(si("g3"), 10 * PSI, 1e-14);
    assert_int_equal(ref_of("g3"), PRES_PLAIN);
    assert_close(si("ga"), 40 * PSI + ATM, 1e-14);
    assert_int_equal(ref_of("ga"), PRES_ABSOLUTE);
    assert_close(si("ag"), 30 * PSI - ATM, 1e-14);
    assert_int_equal(ref_of("ag"), PRES_GAUGE);
    assert_close(si("pl"), 12 * PSI + ATM, 1e-14);
    assert_int_equal(ref_of("gp"), PRES_PLAIN);
    assert_close(si("vac"), -5 * PSI, 1e-14);
    assert_int_equal(ref_of("vac"), PRES_GAUGE);
    assert_close(si("m"), 25 * PSI, 1e-14);
    assert_int_equal(ref_of("m"), PRES_ABSOLUTE);
    assert_close(si("l"), 27.5 * PSI, 1e-14);
    assert_int_equal(ref_of("l"), PRES_ABSOLUTE);
    assert_int_equal(ref_of("mg"), PRES_GAUGE);
    assert_true(ev->results[doc_lookup(doc, "ga")].shown->pref == PRES_ABSOLUTE);
    assert_string_equal(ev->results[doc_lookup(doc, "ag")].shown->text, "psig");
    assert_string_equal(ev->results[doc_lookup(doc, "dp")].shown->text, "psi");
    assert_string_equal(ev->results[doc_lookup(doc, "m")].shown->text, "psia");
    assert_int_equal(ev->nchecks, 2);
    assert_int_equal(ev->nfailed, 0);
    assert_false(ev->atmosphere_used == false);

    /* The forbidden mixes, each an error that says how to restate a side. */
    load("a = 10 psig\n"
         "b = 20 psia\n"
         "c = a + b\n"
         "d = b - a\n"
         "e = b + b\n"
         "f = 3 psi - b\n"
         "h = 2*b\n"
         "check k: b <= 30 psi\n"
         "check m: a <= b\n"
         "n = b as kPa\n");
    assert_error(6, 7, "cannot add an absolute pressure (psia) to a gauge pressure (psig)");
    assert_error(6, 7, "(write `as psia`");
    assert_error(7, 7, "cannot subtract a gauge pressure (psig) from an absolute pressure (psia)");
    assert_error(8, 7, "cannot add two absolute pressures");
    assert_error(9, 11, "cannot subtract an absolute pressure (psia) from pressure (psi)");
    assert_error(10, 7, "cannot multiply an absolute pressure");
    assert_error(11, 10, "cannot compare an absolute pressure (psia) with pressure (psi)");
    assert_error(12, 10, "cannot compare a gauge pressure (psig) with an absolute pressure (psia)");
    assert_error(13, 10, "an absolute pressure is shown in psia, kPaa, bara or MPaa, not kPa");

    /* The atmosphere from the front matter: given, or from the elevation by
     * 101.325 kPa*(1 - 2.25577e-5*z/m)^5.25588 (worked here by hand: at
     * 1500 m, 101325*(0.96616345)^5.25588 = 84556 Pa). */
    load_file("---\natmosphere: 12 psia\n---\n```calc\np = 10 psig as psia\n```\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("p"), 22 * PSI, 1e-14);
    assert_int_equal(doc->meta.atm_source, ATM_GIVEN);
    load_file("---\nunits: SI\nelevation: 1500 m\n---\n```calc\np = 0 kPag as kPaa\n```\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("p"), 101325.0 * pow(1 - 2.25577e-5 * 1500, 5.25588), 1e-14);
    assert_close(si("p"), 84556, 1e-4);
    assert_int_equal(doc->meta.atm_source, ATM_ELEVATION);
    load_file("---\nelevation: 0 ft\n---\n```calc\np = 0 psig as psia\n```\n");
    assert_close(si("p"), ATM, 1e-15);
}

static void test_dimension_errors(void **state)
{
    (void)state;
    load("L = 3 ft\n"
         "p = 2 psi\n"
         "s = L + p\n"
         "t = sqrt(L) + 1\n"
         "u = L^(2 ft)\n"
         "v = exp(L)\n"
         "check c: L <= p\n"
         "w = L as psi\n");
    assert_error(6, 7, "cannot add pressure (psi) to length (ft)");
    assert_error(7, 13, "cannot add a pure number to");
    assert_error(8, 7, "exponent must be a pure number");
    assert_error(9, 9, "exp: argument 1 (a pure number) must be a pure number, found length (ft)");
    assert_error(10, 10, "cannot compare length (ft) with pressure (psi)");
    assert_error(11, 10, "cannot show length");
}

static void test_math_errors(void **state)
{
    (void)state;
    load("a = sqrt(-4)\n"
         "b = log10(0)\n"
         "c = 1/0\n"
         "d = 1e308*10\n"
         "e = (-8)^(1/3)\n"
         "f = 0^-1\n");
    assert_error(4, 10, "sqrt: argument is negative");
    assert_error(5, 11, "must be positive");
    assert_error(6, 6, "division by zero");
    assert_error(7, 10, "overflows");
    assert_error(8, 9, "negative number to the fractional power");
    assert_error(9, 6, "zero raised to a negative power");
}

static void test_failure_does_not_cascade(void **state)
{
    (void)state;
    load("a = 1 ft + 1 psi\n"
         "b = a*2\n"
         "c = b + 1 ft\n"
         "d = 3 m\n"
         "e = d + 1 furlong\n");
    /* One error for a, none for b and c (not evaluated), one for e. */
    assert_int_equal(dl.errors, 2);
    assert_int_equal(ev->results[doc_lookup(doc, "b")].state, RES_NOT_EVALUATED);
    assert_int_equal(ev->results[doc_lookup(doc, "c")].state, RES_NOT_EVALUATED);
    assert_close(si("d"), 3, 0);
}

static void test_names(void **state)
{
    (void)state;
    load("a = 1\n"
         "a = 2\n"
         "b = c + 1\n"
         "c = 3\n"
         "d = d + 1\n"
         "e = alpha + 1\n"
         "alpha2 = 1\n");
    assert_error(5, 1, "'a' is already defined at 4:1");
    assert_error(6, 5, "'c' is used before its definition at 7:1");
    assert_error(8, 5, "'d' is used in its own definition");
    assert_error(9, 5, "unknown name 'alpha'");
}

static void test_solve_reevaluates_dependents(void **state)
{
    (void)state;
    load("x = 2 m\n"
         "y = x^2\n"
         "z = y + 1 m^2\n"
         "r = solve x where z = 10 m^2 between 0 m and 10 m\n"
         "s = solve x where z = 10 m^2\n"
         "check after: y <= 5 m^2\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("r"), 3, 1e-14);
    assert_close(si("s"), 3, 1e-14);
    /* The varied name and its dependents are put back afterwards. */
    assert_close(si("x"), 2, 0);
    assert_close(si("y"), 4, 1e-15);
    const StmtResult *r = &ev->results[doc_lookup(doc, "r")];
    assert_true(fabs(r->sides->solve.residual) < 1e-12);
    assert_close(r->sides->lhs.q.si, 10, 1e-14);
    /* The row substitutes what the equation read at the root, never the
     * trial: z = 3^2 + 1 = 10 m^2 there (x = 2 m gives 5 m^2). */
    Unit shown;
    const Value *zr = eval_read(ev, r, doc_lookup(doc, "z"), &shown);
    assert_non_null(zr);
    assert_close(zr->q.si, 10, 1e-14);
    const Value *zt = eval_read(ev, NULL, doc_lookup(doc, "z"), &shown);
    assert_close(zt->q.si, 5, 1e-15);
    /* x itself is not read by `z = 10 m^2`: it stays the trial value */
    assert_close(eval_read(ev, r, doc_lookup(doc, "x"), &shown)->q.si, 2, 0);
    load("x = 2 m\n"
         "y = x^2\n"
         "r = solve x where x*x + y = 18 m^2 between 0 m and 10 m\n");
    r = &ev->results[doc_lookup(doc, "r")];
    assert_close(eval_read(ev, r, doc_lookup(doc, "x"), &shown)->q.si, 3, 1e-14);
    assert_close(eval_read(ev, r, doc_lookup(doc, "y"), &shown)->q.si, 9, 1e-14);

    /* A root far below the trial value is still resolved to its own
     * precision: x^(1/3) = 1e-30 has the root 1e-90. */
    load("x = 2\n"
         "r = solve x where x^(1/3) = 1e-30 between 1e-300 and 1e100\n"
         "z = solve x where x^3 = 0 between -1 and 2\n");
    assert_int_equal(dl.errors, 0);
    assert_close(si("r"), 1e-90, 1e-12);
    assert_true(fabs(si("z")) < 1e-100);
    /* A jump is a sign change but no root: (x - 1.1)/|x - 1.1| jumps from
     * -1 to 1 at 1.1 and never equals 0.5. */
    load("x = 2\n"
         "r = solve x where (x - 1.1)/(abs(x - 1.1) + 1e-300) = 0.5 between 0 and 3\n");
    assert_error(5, 67, "changes sign near x = 1.100 but has no root there");
    load("x = 2\n"
         "r = solve x where x^2 = -1 between 0 and 10\n");
    assert_error(5, 36, "no root of the equation between 0 and 10");
    load("x = 2 m\n"
         "r = solve x where x = 3 m between 0 s and 10 m\n");
    assert_error(5, 35, "the bracket must have the dimension of 'x'");
}

static void test_checks(void **state)
{
    (void)state;
    load("V = 4 ft/s\n"
         "p = 40 psi\n"
         "check velocity: V <= 8 ft/s\n"
         "check pressure: p >= 20 psi\n"
         "check strict: V < 2 ft/s\n");
    assert_int_equal(dl.errors, 0);
    assert_int_equal(ev->nchecks, 3);
    assert_int_equal(ev->nfailed, 1);
    const StmtResult *c = &ev->results[2];
    assert_true(c->holds);
    assert_close(c->utilization, 0.5, 1e-15);
    c = &ev->results[3];
    assert_true(c->holds);
    assert_close(c->utilization, 0.5, 1e-15);
    c = &ev->results[4];
    assert_false(c->holds);
    assert_close(c->utilization, 2, 1e-15);
}

static void test_display_units(void **state)
{
    (void)state;
    load("Q = 10 L/s\n"
         "p = 100 kPa\n"
         "q = Q as gal/min\n");
    assert_string_equal(ev->results[0].shown->text, "gal/min"); /* US default */
    assert_string_equal(ev->results[1].shown->text, "psi");
    assert_string_equal(ev->results[2].shown->text, "gal/min");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_arithmetic_and_units),
        cmocka_unit_test(test_temperatures),
        cmocka_unit_test(test_pressure_points),
        cmocka_unit_test(test_dimension_errors),
        cmocka_unit_test(test_math_errors),
        cmocka_unit_test(test_failure_does_not_cascade),
        cmocka_unit_test(test_names),
        cmocka_unit_test(test_solve_reevaluates_dependents),
        cmocka_unit_test(test_checks),
        cmocka_unit_test(test_display_units),
    };
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    doc_free(doc);
    diag_free(&dl);
    return rc;
}
