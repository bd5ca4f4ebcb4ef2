/* test_pipes.c — pipe dimension tables, size and class parsing, the
 * roughness table, and the pipe()/roughness() calc functions.
 *
 * Sources of the asserted values are named beside them: published copies
 * of the standards' tables read for this check (the Hydraulic Institute
 * Engineering Data Book, Section IV; the Copper Development Association's
 * Copper Tube Handbook, Table 14.2f; SD-W "PVC Pipe Data"; Professional
 * Plastics' CPVC pipe tables; the Pipe Fitter's Calculator PEX tubing
 * chart; ASME B31.9 Table 919.3.1 and ASME B31.1 Table C-1 for moduli;
 * eFunda and Piping Designer for Moody's roughness), and rules the
 * standards state (copper tube od = nominal + 1/8 in; SDR pipe wall =
 * od/SDR with a floor). ASME B36.10M, D1785, F441 and D2241 are also
 * compared row by row with python3-fluids 1.0.22 in tests/ref/pipes-*. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>

#include <cmocka.h>

#include "library.h"
#include "parse.h"
#include "methods/pipes.h"
#include "methods/roughness.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#define IN 0.0254
#define FT 0.3048
#define PSI 6894.757293168361

bool fn_pipe(CallCtx *cx, const CallArgs *a, Value *out);
bool fn_roughness(CallCtx *cx, const CallArgs *a, Value *out);

static void assert_close(double got, double want, double tol)
{
    if (!(fabs(got - want) <= tol)) {
        print_error("got %.12g, want %.12g (tolerance %g)\n", got, want, tol);
        fail();
    }
}

/* ---- size text ---------------------------------------------------------- */

static void test_size_parse(void **state)
{
    (void)state;
    static const struct { const char *text; double nps; } good[] = {
        {"1-1/2", 1.5}, {"1 1/2", 1.5}, {"1  1/2", 1.5}, {" 3/4 ", 0.75}, {"3/4", 0.75},
        {"2", 2.0},     {"1.5", 1.5},   {"0.5", 0.5},    {"1/8", 0.125},  {"2-1/2", 2.5},
        {"24", 24.0},   {"1-1/4", 1.25}, {".75", 0.75},
    };
    for (size_t i = 0; i < sizeof good / sizeof good[0]; i++) {
        double x = -1;
        assert_true(pipe_size_parse(good[i].text, &x));
        assert_close(x, good[i].nps, 1e-15);
    }
    static const char *const bad[] = {"", " ", "abc", "1-", "3/0", "1/2/3", "-1", "1.5.2",
                                      "4/3", "1-1/2 in", "0", "1 - 1/2", "1/", "/2", "2/2"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        double x = -1;
        if (pipe_size_parse(bad[i], &x)) {
            print_error("\"%s\" parsed as %g\n", bad[i], x);
            fail();
        }
    }
}

static void test_standard_names(void **state)
{
    (void)state;
    static const struct { const char *text; PipeStandardId id; } names[] = {
        {"ASME B36.10M", PIPE_ASME_B36_10M}, {"b36.10m", PIPE_ASME_B36_10M},
        {"B36.10", PIPE_ASME_B36_10M},       {"asme b36.10", PIPE_ASME_B36_10M},
        {"ASTM D1785", PIPE_ASTM_D1785},     {"D1785", PIPE_ASTM_D1785},
        {"astm  d 1785", PIPE_ASTM_D1785},   {"F441", PIPE_ASTM_F441},
        {"ASTM D2241", PIPE_ASTM_D2241},     {"astm b88", PIPE_ASTM_B88},
        {"F876", PIPE_ASTM_F876},
    };
    for (size_t i = 0; i < sizeof names / sizeof names[0]; i++) {
        const PipeStandard *s = pipe_standard_find(names[i].text);
        assert_non_null(s);
        assert_int_equal(s->id, names[i].id);
    }
    assert_null(pipe_standard_find("D9999"));
    assert_null(pipe_standard_find(""));
    assert_null(pipe_standard_find("ASTM"));
    assert_null(pipe_standard_find("B36.19M"));
}

static void test_class_normalize(void **state)
{
    (void)state;
    const PipeStandard *steel = pipe_standard(PIPE_ASME_B36_10M);
    const PipeStandard *sdr = pipe_standard(PIPE_ASTM_D2241);
    const PipeStandard *cu = pipe_standard(PIPE_ASTM_B88);
    char buf[32];
    static const struct { int std; const char *in, *out; } cases[] = {
        {0, "40", "40"},  {0, "Sch 40", "40"},   {0, "schedule 80", "80"}, {0, "std", "STD"},
        {0, "xs", "XS"},  {0, "Standard", "STD"}, {1, "SDR21", "SDR 21"},  {1, "21", "SDR 21"},
        {1, "32.5", "SDR 32.5"}, {1, "sdr 26", "SDR 26"}, {2, "type l", "L"}, {2, "K", "K"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        const PipeStandard *s = cases[i].std == 0 ? steel : cases[i].std == 1 ? sdr : cu;
        assert_true(pipe_class_normalize(s, cases[i].in, buf, sizeof buf));
        assert_string_equal(buf, cases[i].out);
    }
    assert_false(pipe_class_normalize(steel, "", buf, sizeof buf));
}

/* ---- every row of every table ------------------------------------------- */

/* id = od - 2 wall, positive bore, area = pi/4 id^2, and the SI values are
 * the inch values times 0.0254 exactly. */
static void test_rows_consistent(void **state)
{
    (void)state;
    size_t checked = 0;
    for (size_t i = 0; i < pipe_row_count(); i++) {
        const PipeRow *r = pipe_row(i);
        if (r->wall_in <= 0)
            continue;
        double nps;
        assert_true(pipe_size_parse(r->nps, &nps));
        PipeDims d;
        assert_int_equal(pipe_lookup(pipe_standard(r->standard), nps, r->cls, &d), PIPE_OK);
        assert_ptr_equal(d.row, r);
        assert_close(d.id, d.od - 2.0 * d.wall, 1e-15);
        assert_close(d.od, r->od_in * IN, 1e-15);
        assert_close(d.wall, r->wall_in * IN, 1e-15);
        assert_true(d.id > 0 && d.wall < d.od / 4.0);
        assert_close(d.area, 3.14159265358979323846 / 4.0 * d.id * d.id, 1e-18);
        assert_close(d.sdr * (d.sdr_nominal ? 1.0 : d.wall), d.sdr_nominal ? d.sdr : d.od, 1e-12);
        checked++;
    }
    /* 23 steel sizes x up to 6 classes and so on: rows that exist. */
    assert_true(checked > 250);
}

/* Within one standard and size every class has one od; walls grow from
 * lighter to heavier classes. */
static void test_walls_ordered(void **state)
{
    (void)state;
    static const struct { PipeStandardId s; const char *lighter, *heavier; } order[] = {
        {PIPE_ASME_B36_10M, "10", "40"},   {PIPE_ASME_B36_10M, "40", "80"},
        {PIPE_ASME_B36_10M, "80", "160"},  {PIPE_ASME_B36_10M, "STD", "XS"},
        {PIPE_ASTM_D1785, "40", "80"},     {PIPE_ASTM_F441, "40", "80"},
        {PIPE_ASTM_D2241, "SDR 32.5", "SDR 26"}, {PIPE_ASTM_D2241, "SDR 26", "SDR 21"},
        {PIPE_ASTM_B88, "M", "L"},         {PIPE_ASTM_B88, "L", "K"},
    };
    size_t pairs = 0;
    for (size_t k = 0; k < sizeof order / sizeof order[0]; k++)
        for (size_t i = 0; i < pipe_row_count(); i++) {
            const PipeRow *a = pipe_row(i);
            if (a->standard != order[k].s || strcmp(a->cls, order[k].lighter) || a->wall_in <= 0)
                continue;
            for (size_t j = 0; j < pipe_row_count(); j++) {
                const PipeRow *b = pipe_row(j);
                if (b->standard != a->standard || strcmp(b->nps, a->nps) ||
                    strcmp(b->cls, order[k].heavier) || b->wall_in <= 0)
                    continue;
                assert_close(b->od_in, a->od_in, 0);
                /* SDR 32.5 and 26 share the 0.060 in floor at the small sizes. */
                assert_true(b->wall_in > a->wall_in ||
                            (a->standard == PIPE_ASTM_D2241 && b->wall_in == 0.060));
                pairs++;
            }
        }
    assert_true(pairs > 100);
}

/* ASME B36.10M: STD equals schedule 40 through NPS 10 and XS equals
 * schedule 80 through NPS 8; above that STD is 0.375 in and XS 0.500 in
 * (the standard's table as python3-fluids 1.0.22 reproduces it: fluids.
 * piping NPSSTD/STDt and NPSXS/XSt, 9.53 and 12.7 mm above those sizes). */
static void test_steel_std_xs(void **state)
{
    (void)state;
    const PipeStandard *s = pipe_standard(PIPE_ASME_B36_10M);
    static const double sizes[] = {0.125, 0.25, 0.375, 0.5, 0.75, 1, 1.25, 1.5, 2, 2.5, 3,
                                   3.5, 4, 5, 6, 8, 10, 12, 14, 16, 18, 20, 24};
    for (size_t i = 0; i < sizeof sizes / sizeof sizes[0]; i++) {
        PipeDims std, xs, s40, s80;
        assert_int_equal(pipe_lookup(s, sizes[i], "STD", &std), PIPE_OK);
        assert_int_equal(pipe_lookup(s, sizes[i], "XS", &xs), PIPE_OK);
        assert_int_equal(pipe_lookup(s, sizes[i], "40", &s40), PIPE_OK);
        assert_int_equal(pipe_lookup(s, sizes[i], "80", &s80), PIPE_OK);
        if (sizes[i] <= 10)
            assert_close(std.wall, s40.wall, 0);
        else
            assert_close(std.wall, 0.375 * IN, 1e-15);
        if (sizes[i] <= 8)
            assert_close(xs.wall, s80.wall, 0);
        else
            assert_close(xs.wall, 0.500 * IN, 1e-15);
    }
}

/* Bores printed in published tables, to the printed 0.001 in: ASME B36.10M
 * schedule bores as python3-fluids 1.0.22 reproduces them (fluids.piping
 * S40i, S80i, S10i, S160i, STDi, in mm / 25.4), and the ASTM B88 inside
 * diameters of the Copper Tube Handbook, Table 14.2f (K and L) and the
 * Hydraulic Institute Engineering Data Book, Section IV, B88 table (M). */
static void test_published_bores(void **state)
{
    (void)state;
    static const struct { PipeStandardId s; const char *nps, *cls; double id_in; } rows[] = {
        {PIPE_ASME_B36_10M, "1/2", "40", 0.622},  {PIPE_ASME_B36_10M, "3/4", "40", 0.824},
        {PIPE_ASME_B36_10M, "1", "40", 1.049},    {PIPE_ASME_B36_10M, "1-1/2", "40", 1.610},
        {PIPE_ASME_B36_10M, "2", "40", 2.067},    {PIPE_ASME_B36_10M, "3", "40", 3.068},
        {PIPE_ASME_B36_10M, "4", "40", 4.026},    {PIPE_ASME_B36_10M, "6", "40", 6.065},
        {PIPE_ASME_B36_10M, "8", "40", 7.981},    {PIPE_ASME_B36_10M, "12", "STD", 12.000},
        {PIPE_ASME_B36_10M, "2", "80", 1.939},    {PIPE_ASME_B36_10M, "4", "80", 3.826},
        {PIPE_ASME_B36_10M, "6", "10", 6.357},    {PIPE_ASME_B36_10M, "2", "160", 1.687},
        {PIPE_ASTM_B88, "1/2", "K", 0.527},       {PIPE_ASTM_B88, "1/2", "L", 0.545},
        {PIPE_ASTM_B88, "1/2", "M", 0.569},       {PIPE_ASTM_B88, "3/4", "L", 0.785},
        {PIPE_ASTM_B88, "3/4", "M", 0.811},       {PIPE_ASTM_B88, "1", "K", 0.995},
        {PIPE_ASTM_B88, "1", "L", 1.025},         {PIPE_ASTM_B88, "1", "M", 1.055},
        {PIPE_ASTM_B88, "1-1/4", "L", 1.265},     {PIPE_ASTM_B88, "1-1/2", "L", 1.505},
        {PIPE_ASTM_B88, "2", "K", 1.959},         {PIPE_ASTM_B88, "2", "L", 1.985},
        {PIPE_ASTM_B88, "3", "L", 2.945},         {PIPE_ASTM_B88, "4", "L", 3.905},
        {PIPE_ASTM_B88, "6", "K", 5.741},         {PIPE_ASTM_B88, "6", "L", 5.845},
        {PIPE_ASTM_B88, "6", "M", 5.881},         {PIPE_ASTM_B88, "1/4", "L", 0.315},
    };
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        double nps;
        PipeDims d;
        assert_true(pipe_size_parse(rows[i].nps, &nps));
        assert_int_equal(pipe_lookup(pipe_standard(rows[i].s), nps, rows[i].cls, &d), PIPE_OK);
        assert_close(d.id / IN, rows[i].id_in, 0.0005);
    }
}

/* ASTM B88: od = nominal + 1/8 in for every size (a rule of the standard).
 * ASTM F876: CTS od, the same rule, and minimum wall = od/9 rounded to
 * 0.001 in, not less than 0.070 in (the rule of its SDR 9 table; the rows
 * are held to a published copy in test_pex_rows). ASTM D2241: wall = od/SDR, floor 0.060 in, within 0.0015 in
 * (the printed walls sit up to 0.0011 in from od/SDR: NPS 12 SDR 21 is
 * printed 0.606 in against 12.75/21 = 0.6071 in). */
static void test_rules_of_the_standards(void **state)
{
    (void)state;
    size_t cu = 0, pex = 0, sdr = 0;
    for (size_t i = 0; i < pipe_row_count(); i++) {
        const PipeRow *r = pipe_row(i);
        if (r->wall_in <= 0)
            continue;
        double nps;
        assert_true(pipe_size_parse(r->nps, &nps));
        if (r->standard == PIPE_ASTM_B88) {
            assert_close(r->od_in, nps + 0.125, 1e-12);
            cu++;
        } else if (r->standard == PIPE_ASTM_F876) {
            assert_close(r->od_in, nps + 0.125, 1e-12);
            assert_close(r->wall_in, fmax(r->od_in / 9.0, 0.070), 0.0005);
            pex++;
        } else if (r->standard == PIPE_ASTM_D2241) {
            double ratio = strtod(r->cls + 4, NULL);
            assert_close(r->wall_in, fmax(r->od_in / ratio, 0.060), 0.0015);
            sdr++;
        }
    }
    assert_int_equal(cu, 15 * 3 - 2);   /* no type M at 1/4 and 5/8 */
    assert_int_equal(pex, 5);
    assert_int_equal(sdr, 14 + 13 + 12);   /* SDR 21 from 3/4, 26 from 1, 32.5 from 1-1/4 */
}

/* ASTM B88, every row, against the Hydraulic Institute Engineering Data
 * Book, Section IV, "Copper water tube, seamless (ASTM B88)" table: nominal
 * wall, in, of types K, L, M; 0 where the table prints no tube (type M 1/4
 * and 5/8 in). Types K and L also agree with the Copper Tube Handbook,
 * Table 14.2f. */
static void test_b88_rows(void **state)
{
    (void)state;
    static const struct { double nps, k, l, m; } rows[] = {
        {0.25, 0.035, 0.030, 0},     {0.375, 0.049, 0.035, 0.025}, {0.5, 0.049, 0.040, 0.028},
        {0.625, 0.049, 0.042, 0},    {0.75, 0.065, 0.045, 0.032},  {1, 0.065, 0.050, 0.035},
        {1.25, 0.065, 0.055, 0.042}, {1.5, 0.072, 0.060, 0.049},   {2, 0.083, 0.070, 0.058},
        {2.5, 0.095, 0.080, 0.065},  {3, 0.109, 0.090, 0.072},     {3.5, 0.120, 0.100, 0.083},
        {4, 0.134, 0.110, 0.095},    {5, 0.160, 0.125, 0.109},     {6, 0.192, 0.140, 0.122},
    };
    const PipeStandard *s = pipe_standard(PIPE_ASTM_B88);
    size_t n = 0;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        const double want[3] = {rows[i].k, rows[i].l, rows[i].m};
        static const char *const cls[3] = {"K", "L", "M"};
        for (int c = 0; c < 3; c++) {
            PipeDims d;
            PipeStatus st = pipe_lookup(s, rows[i].nps, cls[c], &d);
            if (want[c] == 0) {
                assert_int_equal(st, PIPE_NOT_IN_CLASS);
                continue;
            }
            assert_int_equal(st, PIPE_OK);
            assert_close(d.od / IN, rows[i].nps + 0.125, 1e-12);
            assert_close(d.wall / IN, want[c], 1e-12);
            n++;
        }
    }
    /* every B88 row the table holds was asked */
    size_t rows_b88 = 0;
    for (size_t i = 0; i < pipe_row_count(); i++)
        rows_b88 += pipe_row(i)->standard == PIPE_ASTM_B88 && pipe_row(i)->wall_in > 0;
    assert_int_equal(n, rows_b88);
}

/* ASTM F876 SDR 9, every row, against the Pipe Fitter's Calculator "PEX
 * Tubing Chart" (and PEX Supply's "PEX Tubing Technical Specifications",
 * which prints the same): od, minimum wall and inside diameter, in. The
 * larger sizes are not in the table (no published copy was read). */
static void test_pex_rows(void **state)
{
    (void)state;
    static const struct { double nps, od, wall, id; } rows[] = {
        {0.375, 0.500, 0.070, 0.360}, {0.5, 0.625, 0.070, 0.485}, {0.625, 0.750, 0.083, 0.584},
        {0.75, 0.875, 0.097, 0.681},  {1, 1.125, 0.125, 0.875},
    };
    const PipeStandard *s = pipe_standard(PIPE_ASTM_F876);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        PipeDims d;
        assert_int_equal(pipe_lookup(s, rows[i].nps, "SDR 9", &d), PIPE_OK);
        assert_close(d.od / IN, rows[i].od, 1e-12);
        assert_close(d.wall / IN, rows[i].wall, 1e-12);
        assert_close(d.id / IN, rows[i].id, 1e-12);
        assert_true(d.sdr_nominal);
        assert_close(d.sdr, 9.0, 0);
    }
    PipeDims d;
    assert_int_equal(pipe_lookup(s, 1.25, "SDR 9", &d), PIPE_UNKNOWN_SIZE);
    assert_int_equal(pipe_lookup(s, 2, "SDR 9", &d), PIPE_UNKNOWN_SIZE);
    char buf[256];
    pipe_sizes_list(s, NULL, buf, sizeof buf);
    assert_string_equal(buf, "3/8, 1/2, 5/8, 3/4, 1");
}

/* ASTM D2241 sizes 3 through 12 in against the Hydraulic Institute
 * Engineering Data Book, Section IV, Table 4.E.2 (minimum wall, in). That
 * table prints SDR 21 at 6 to 12 in as od/21 rounded (0.315, 0.411, 0.512,
 * 0.607); the standard's table, as python3-fluids reproduces it
 * (SDR21t_D2241) and as pipetab.def keeps it, prints 0.316, 0.410, 0.511,
 * 0.606: within 0.001 in of the Data Book, which is asserted. */
static void test_d2241_rows(void **state)
{
    (void)state;
    static const struct { double nps, s21, s26, s325; } rows[] = {
        {3, 0.167, 0.135, 0.108}, {4, 0.214, 0.173, 0.138},  {5, 0.265, 0.214, 0.171},
        {6, 0.315, 0.255, 0.204}, {8, 0.411, 0.332, 0.265},  {10, 0.512, 0.413, 0.331},
        {12, 0.607, 0.490, 0.392},
    };
    const PipeStandard *s = pipe_standard(PIPE_ASTM_D2241);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        PipeDims d21, d26, d325;
        assert_int_equal(pipe_lookup(s, rows[i].nps, "SDR 21", &d21), PIPE_OK);
        assert_int_equal(pipe_lookup(s, rows[i].nps, "SDR 26", &d26), PIPE_OK);
        assert_int_equal(pipe_lookup(s, rows[i].nps, "SDR 32.5", &d325), PIPE_OK);
        assert_close(d21.wall / IN, rows[i].s21, rows[i].nps >= 6 ? 0.0010001 : 1e-12);
        assert_close(d26.wall / IN, rows[i].s26, 1e-12);
        assert_close(d325.wall / IN, rows[i].s325, 1e-12);
    }
}

/* ASTM D1785 and F441 schedule 40 and 80 minimum walls, in, every row:
 * D1785 against SD-W "PVC Pipe Data" (Schedule 40 and Schedule 80 tables,
 * 1/8 through 12 in); F441 against Professional Plastics, "CPVC Pipe -
 * Sizes, Specifications & Applications" (1/4 through 12 in), which prints
 * the same walls. */
static void test_schedule_rows(void **state)
{
    (void)state;
    static const struct { double nps, od, s40, s80; } rows[] = {
        {0.125, 0.405, 0.068, 0.095}, {0.25, 0.540, 0.088, 0.119}, {0.375, 0.675, 0.091, 0.126},
        {0.5, 0.840, 0.109, 0.147},   {0.75, 1.050, 0.113, 0.154}, {1, 1.315, 0.133, 0.179},
        {1.25, 1.660, 0.140, 0.191},  {1.5, 1.900, 0.145, 0.200},  {2, 2.375, 0.154, 0.218},
        {2.5, 2.875, 0.203, 0.276},   {3, 3.500, 0.216, 0.300},    {3.5, 4.000, 0.226, 0.318},
        {4, 4.500, 0.237, 0.337},     {5, 5.563, 0.258, 0.375},    {6, 6.625, 0.280, 0.432},
        {8, 8.625, 0.322, 0.500},     {10, 10.750, 0.365, 0.593},  {12, 12.750, 0.406, 0.687},
    };
    const PipeStandardId ids[2] = {PIPE_ASTM_D1785, PIPE_ASTM_F441};
    for (int k = 0; k < 2; k++)
        for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
            PipeDims d40, d80;
            const PipeStandard *s = pipe_standard(ids[k]);
            if (ids[k] == PIPE_ASTM_F441 && rows[i].nps < 0.25) {
                assert_int_equal(pipe_lookup(s, rows[i].nps, "40", &d40), PIPE_UNKNOWN_SIZE);
                continue;
            }
            assert_int_equal(pipe_lookup(s, rows[i].nps, "40", &d40), PIPE_OK);
            assert_int_equal(pipe_lookup(s, rows[i].nps, "80", &d80), PIPE_OK);
            assert_close(d40.od / IN, rows[i].od, 1e-12);
            assert_close(d40.wall / IN, rows[i].s40, 1e-12);
            assert_close(d80.wall / IN, rows[i].s80, 1e-12);
        }
}

static void test_lookup_errors(void **state)
{
    (void)state;
    PipeDims d;
    const PipeStandard *steel = pipe_standard(PIPE_ASME_B36_10M);
    const PipeStandard *cu = pipe_standard(PIPE_ASTM_B88);
    assert_int_equal(pipe_lookup(NULL, 2, "40", &d), PIPE_UNKNOWN_STANDARD);
    assert_int_equal(pipe_lookup(cu, 7, "L", &d), PIPE_UNKNOWN_SIZE);
    assert_int_equal(pipe_lookup(steel, 2.2, "40", &d), PIPE_UNKNOWN_SIZE);
    assert_int_equal(pipe_lookup(steel, 0, "40", &d), PIPE_BAD_SIZE);
    assert_int_equal(pipe_lookup(steel, NAN, "40", &d), PIPE_BAD_SIZE);
    assert_int_equal(pipe_lookup(steel, 2, "XXS", &d), PIPE_UNKNOWN_CLASS);
    assert_int_equal(pipe_lookup(steel, 2, "K", &d), PIPE_UNKNOWN_CLASS);
    assert_int_equal(pipe_lookup(steel, 0.25, "160", &d), PIPE_NOT_IN_CLASS);
    assert_int_equal(pipe_lookup(steel, 3.5, "160", &d), PIPE_NOT_IN_CLASS);
    assert_int_equal(pipe_lookup(cu, 0.25, "M", &d), PIPE_NOT_IN_CLASS);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_D2241), 0.75, "SDR 26", &d),
                     PIPE_NOT_IN_CLASS);

    char buf[512];
    pipe_classes_list(pipe_standard(PIPE_ASTM_D2241), buf, sizeof buf);
    assert_string_equal(buf, "\"SDR 21\", \"SDR 26\", \"SDR 32.5\"");
    pipe_sizes_list(cu, "M", buf, sizeof buf);
    assert_string_equal(buf, "3/8, 1/2, 3/4, 1, 1-1/4, 1-1/2, 2, 2-1/2, 3, 3-1/2, 4, 5, 6");
    pipe_standards_list(buf, sizeof buf);
    assert_non_null(strstr(buf, "\"ASTM F876\""));
    char tiny[8];
    pipe_sizes_list(steel, NULL, tiny, sizeof tiny);   /* truncates, stays a string */
    assert_true(strlen(tiny) < sizeof tiny);
}

/* Material data carried by a pipe: roughness from the table, E with its
 * source. Moduli: steel 29.5e6 psi, ASME B31.1 Appendix C Table C-1
 * (carbon steel C <= 0.30 %, 70 degF, as The Engineering ToolBox
 * reproduces it); copper C12200 17.0e6 psi, PVC 1120 and CPVC 4120
 * 0.42e6 psi, ASME B31.9 Table 919.3.1. PEX has no verified modulus. */
static void test_material_data(void **state)
{
    (void)state;
    PipeDims d;
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASME_B36_10M), 2, "40", &d), PIPE_OK);
    assert_close(d.roughness, 0.00015 * FT, 1e-18);
    assert_close(d.E, 29.5e6 * PSI, 1.0);
    assert_close(d.E / 1e9, 203.4, 0.1);
    assert_close(d.sdr, 2.375 / 0.154, 1e-12);
    assert_false(d.sdr_nominal);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_B88), 1, "L", &d), PIPE_OK);
    assert_close(d.roughness, 0.000005 * FT, 1e-18);
    assert_close(d.E, 17.0e6 * PSI, 1.0);
    assert_close(d.E / 1e9, 117.2, 0.1);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_F441), 2, "80", &d), PIPE_OK);
    assert_close(d.E, 420000.0 * PSI, 1e-3);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_D2241), 4, "SDR 26", &d), PIPE_OK);
    assert_close(d.E, 420000.0 * PSI, 1e-3);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_F876), 1, "SDR 9", &d), PIPE_OK);
    assert_close(d.E, 0.0, 0);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_D1785), 4, "40", &d), PIPE_OK);
    assert_close(d.E, 420000.0 * PSI, 1e-3);
    assert_close(d.E / 1e9, 2.896, 0.001);
    assert_close(d.sdr, 4.5 / 0.237, 1e-12);
    assert_string_equal(d.std->material, "PVC");
    assert_string_equal(d.std->wall_basis, "minimum wall");
    /* every standard names a roughness row by its canonical name */
    for (int i = 0; i < PIPE_STANDARD_COUNT; i++) {
        const RoughnessRow *row = NULL;
        const PipeStandard *s = pipe_standard((PipeStandardId)i);
        assert_int_equal(roughness_lookup(s->roughness_of, &row), ROUGHNESS_OK);
        assert_string_equal(row->name, s->roughness_of);
        if (s->id == PIPE_ASTM_F876)
            assert_true(s->E == 0.0 && s->E_source == NULL);
        else
            assert_true(s->E > 1e8 && strlen(s->E_source) > 20);
    }
}

static void test_nps_from_bore(void **state)
{
    (void)state;
    assert_close(pipe_nps_from_sch40_bore(2.067 * IN), 2.0, 1e-12);
    assert_close(pipe_nps_from_sch40_bore(0.622 * IN), 0.5, 1e-12);
    /* halfway between the 2 and 2-1/2 bores */
    assert_close(pipe_nps_from_sch40_bore((2.067 + 2.469) / 2 * IN), 2.25, 1e-12);
    assert_true(pipe_nps_from_sch40_bore(0.05 * IN) > 0);
    assert_true(pipe_nps_from_sch40_bore(30 * IN) > 24);
}

/* ---- roughness table (Moody 1944, Fig. 2, values in ft) --------------------
 * Each value as two published copies of Moody's table print it: eFunda,
 * "Absolute Pipe Roughness" (drawn brass/copper 5e-6 ft, commercial steel
 * and wrought iron 150e-6, asphalted cast iron 400e-6, galvanized iron
 * 500e-6, cast iron 850e-6, concrete 1000e-6 to 10,000e-6) and Piping
 * Designer, "Absolute Roughness" (drawn tubing, glass, brass, plastic
 * 0.000005 ft, and the same steel, iron and concrete values). */

static void test_roughness(void **state)
{
    (void)state;
    static const struct { const char *name; double ft; } rows[] = {
        {"steel", 0.00015},          {"Commercial Steel", 0.00015}, {"wrought iron", 0.00015},
        {"galvanized", 0.0005},      {"galvanised", 0.0005},        {"GALVANISED STEEL", 0.0005},
        {"cast iron", 0.00085},      {"asphalted cast iron", 0.0004}, {"drawn tubing", 0.000005},
        {"copper", 0.000005},        {"PVC", 0.000005},             {"plastic", 0.000005},
        {"concrete", 0.001},
    };
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        const RoughnessRow *r;
        assert_int_equal(roughness_lookup(rows[i].name, &r), ROUGHNESS_OK);
        assert_close(r->eps, rows[i].ft * FT, 1e-18);
        assert_true(strlen(r->source) > 10);
    }
    const RoughnessRow *r;
    assert_int_equal(roughness_lookup("unobtainium", &r), ROUGHNESS_UNKNOWN);
    assert_int_equal(roughness_lookup("", &r), ROUGHNESS_UNKNOWN);
    /* no published value for a cement-mortar lining was read: no row */
    assert_int_equal(roughness_lookup("ductile iron cement-lined", &r), ROUGHNESS_UNKNOWN);
    assert_int_equal(roughness_lookup("cement-lined", &r), ROUGHNESS_UNKNOWN);
    char buf[512];
    roughness_list(buf, sizeof buf);
    assert_non_null(strstr(buf, "\"concrete\""));
    assert_non_null(strstr(buf, "\"commercial steel\""));
}

/* ---- the calc functions ------------------------------------------------- */

typedef struct Harness {
    Arena arena;
    DiagList diags;
    CallCtx cx;
    Value args[3];
    Pos pos[3];
    CallArgs a;
} Harness;

static void harness_init(Harness *h, const char *name, size_t n)
{
    memset(h, 0, sizeof *h);
    arena_init(&h->arena);
    h->cx.arena = &h->arena;
    h->cx.diags = &h->diags;
    h->cx.units = UNITS_US;
    for (size_t i = 0; i < 3; i++)
        h->pos[i] = (Pos){"t.calc.md", 7, (int)(10 * (i + 1))};
    h->a = (CallArgs){.n = n, .args = h->args, .arg_pos = h->pos, .pos = {"t.calc.md", 7, 5},
                      .name = name};
}

static void harness_free(Harness *h)
{
    diag_free(&h->diags);
    arena_free(&h->arena);
}

static const Value *field(const Value *v, const char *name)
{
    assert_int_equal(v->kind, VAL_RECORD);
    const Value *f = record_get(v->rec, name);
    assert_non_null(f);
    return f;
}

static void test_fn_pipe(void **state)
{
    (void)state;
    Harness h;
    harness_init(&h, "pipe", 3);
    h.args[0] = value_string("ASME B36.10M");
    h.args[1] = value_string("1-1/2");
    h.args[2] = value_string("40");
    Value out;
    assert_true(fn_pipe(&h.cx, &h.a, &out));
    assert_int_equal(h.diags.len, 0);
    assert_string_equal(out.rec->type, "pipe");
    assert_close(field(&out, "id")->q.si, 1.610 * IN, 1e-12);
    assert_true(dim_eq(field(&out, "id")->q.dim, DIM_L));
    assert_string_equal(field(&out, "id")->hint[UNITS_US], "in");
    assert_close(field(&out, "od")->q.si, 1.900 * IN, 1e-12);
    assert_close(field(&out, "wall")->q.si, 0.145 * IN, 1e-12);
    assert_close(field(&out, "area")->q.si, 3.14159265358979 / 4 * pow(1.61 * IN, 2), 1e-12);
    assert_true(dim_eq(field(&out, "E")->q.dim, DIM_PRESSURE));
    assert_string_equal(field(&out, "material")->str, "steel");
    assert_string_equal(field(&out, "standard")->str, "ASME B36.10M");
    assert_string_equal(field(&out, "nps")->str, "1-1/2");
    assert_string_equal(field(&out, "class")->str, "40");
    assert_null(record_get(out.rec, "sdr"));
    assert_true(h.cx.nmethods >= 1);
    assert_string_equal(h.cx.methods[0]->key, "asme_b36_10m");
    /* the display formula parses as a calc equation (for the report) */
    Expr *lhs = NULL, *rhs = NULL;
    DiagList dl = {0};
    assert_true(parse_equation_text(&h.arena, h.cx.methods[0]->formula, &dl, &lhs, &rhs));
    assert_int_equal(dl.errors, 0);
    assert_non_null(rhs);
    diag_free(&dl);
    harness_free(&h);

    /* numbers for SIZE and CLASS; SDR standard */
    harness_init(&h, "pipe", 3);
    h.args[0] = value_string("d2241");
    h.args[1] = value_number(qty_number(4));
    h.args[2] = value_number(qty_number(21));
    assert_true(fn_pipe(&h.cx, &h.a, &out));
    assert_close(field(&out, "sdr")->q.si, 21, 0);
    assert_close(field(&out, "wall")->q.si, 0.214 * IN, 1e-12);
    assert_string_equal(field(&out, "class")->str, "SDR 21");
    harness_free(&h);

    harness_init(&h, "pipe", 3);
    h.args[0] = value_string("ASTM D1785");
    h.args[1] = value_number(qty_number(1.5));
    h.args[2] = value_number(qty_number(40));
    assert_true(fn_pipe(&h.cx, &h.a, &out));
    assert_close(field(&out, "sdr")->q.si, 1.9 / 0.145, 1e-12);
    harness_free(&h);
}

/* An error names the argument's position and lists what exists. */
static void expect_pipe_error(const char *std, Value size, const char *cls, int col,
                              const char *needle)
{
    Harness h;
    harness_init(&h, "pipe", 3);
    h.args[0] = value_string(std);
    h.args[1] = size;
    h.args[2] = value_string(cls);
    Value out;
    assert_false(fn_pipe(&h.cx, &h.a, &out));
    assert_int_equal(h.diags.errors, 1);
    assert_int_equal(h.diags.items[0].pos.col, col);
    if (!strstr(h.diags.items[0].message, needle)) {
        print_error("message \"%s\" lacks \"%s\"\n", h.diags.items[0].message, needle);
        fail();
    }
    harness_free(&h);
}

static void test_fn_pipe_errors(void **state)
{
    (void)state;
    expect_pipe_error("ASTM X1", value_string("2"), "40", 10,
                      "unknown standard \"ASTM X1\"; known standards: \"ASME B36.10M\", \"ASTM D1785\"");
    expect_pipe_error("B88", value_string("7"), "L", 20,
                      "ASTM B88 has no size 7; its sizes are 1/4, 3/8, 1/2, 5/8, 3/4");
    expect_pipe_error("B88", value_string("one"), "L", 20, "cannot read the size \"one\"");
    expect_pipe_error("B36.10M", value_string("2"), "XXS", 30,
                      "has no class \"XXS\"; its classes are \"10\", \"40\", \"80\", \"160\", \"STD\", \"XS\"");
    expect_pipe_error("B36.10M", value_string("1/4"), "160", 30,
                      "lists no \"160\" at size 1/4; that size comes in \"10\", \"40\", \"80\", \"STD\", \"XS\", and \"160\" in sizes 1/2, 3/4");
    expect_pipe_error("B36.10M", value_number(qty(2 * IN, DIM_L)), "40", 20,
                      "must be a string in \"...\" or a pure number, found length");
}

static void test_fn_roughness(void **state)
{
    (void)state;
    Harness h;
    harness_init(&h, "roughness", 1);
    h.args[0] = value_string("Galvanized");
    Value out;
    assert_true(fn_roughness(&h.cx, &h.a, &out));
    assert_close(out.q.si, 0.0005 * FT, 1e-18);
    assert_true(dim_eq(out.q.dim, DIM_L));
    assert_int_equal(h.cx.nmethods, 1);
    assert_non_null(strstr(h.cx.methods[0]->reference, "Moody"));
    harness_free(&h);

    harness_init(&h, "roughness", 1);
    h.args[0] = value_string("teflon");
    assert_false(fn_roughness(&h.cx, &h.a, &out));
    assert_int_equal(h.diags.items[0].pos.col, 10);
    assert_non_null(strstr(h.diags.items[0].message,
                           "unknown material \"teflon\"; known materials: \"drawn tubing\""));
    harness_free(&h);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_size_parse),         cmocka_unit_test(test_standard_names),
        cmocka_unit_test(test_class_normalize),    cmocka_unit_test(test_rows_consistent),
        cmocka_unit_test(test_walls_ordered),      cmocka_unit_test(test_steel_std_xs),
        cmocka_unit_test(test_published_bores),    cmocka_unit_test(test_rules_of_the_standards),
        cmocka_unit_test(test_pex_rows),           cmocka_unit_test(test_lookup_errors),
        cmocka_unit_test(test_b88_rows),           cmocka_unit_test(test_d2241_rows),
        cmocka_unit_test(test_schedule_rows),
        cmocka_unit_test(test_material_data),      cmocka_unit_test(test_nps_from_bore),
        cmocka_unit_test(test_roughness),          cmocka_unit_test(test_fn_pipe),
        cmocka_unit_test(test_fn_pipe_errors),     cmocka_unit_test(test_fn_roughness),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
