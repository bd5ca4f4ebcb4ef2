/* test_pipes.c — pipe dimension tables, size and class parsing, the
 * roughness table, and the pipe()/roughness() calc functions.
 *
 * Sources of the asserted values are named beside them: the standards'
 * published tables (ASME B36.10M, ASTM B88 via the Copper Development
 * Association's Copper Tube Handbook, ASTM F876) recalled from memory and
 * marked so, and rules the standards state (copper tube od = nominal +
 * 1/8 in; SDR pipe wall = od/SDR with a floor). The tables are also
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
 * (the standard's table, from memory). */
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

/* Bores printed in the standards' tables (from memory), to the printed
 * 0.001 in: ASME B36.10M and the Copper Tube Handbook's ASTM B88 table. */
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
 * 0.001 in, not less than 0.070 in (the standard's SDR 9 table, from
 * memory). ASTM D2241: wall = od/SDR, floor 0.060 in, within 0.0015 in
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
    assert_int_equal(pex, 10);
    assert_int_equal(sdr, 14 + 13 + 11);   /* SDR 21 from 3/4, 26 from 1, 32.5 from 1-1/2 */
}

static void test_pex_rows(void **state)
{
    (void)state;
    /* ASTM F876 SDR 9 minimum walls, in (from memory). */
    static const struct { double nps, od, wall; } rows[] = {
        {0.375, 0.500, 0.070}, {0.5, 0.625, 0.070}, {0.75, 0.875, 0.097}, {1, 1.125, 0.125},
        {1.25, 1.375, 0.153}, {1.5, 1.625, 0.181}, {2, 2.125, 0.236}, {3, 3.125, 0.347},
    };
    const PipeStandard *s = pipe_standard(PIPE_ASTM_F876);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        PipeDims d;
        assert_int_equal(pipe_lookup(s, rows[i].nps, "SDR 9", &d), PIPE_OK);
        assert_close(d.od / IN, rows[i].od, 1e-12);
        assert_close(d.wall / IN, rows[i].wall, 1e-12);
        assert_true(d.sdr_nominal);
        assert_close(d.sdr, 9.0, 0);
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
 * source (values as tabulated in pipes.c). */
static void test_material_data(void **state)
{
    (void)state;
    PipeDims d;
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASME_B36_10M), 2, "40", &d), PIPE_OK);
    assert_close(d.roughness, 0.00015 * FT, 1e-18);
    assert_close(d.E, 29.0e6 * PSI, 1.0);
    assert_close(d.E / 1e9, 200.0, 0.1);
    assert_close(d.sdr, 2.375 / 0.154, 1e-12);
    assert_false(d.sdr_nominal);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_B88), 1, "L", &d), PIPE_OK);
    assert_close(d.roughness, 0.000005 * FT, 1e-18);
    assert_close(d.E / 1e9, 117.2, 0.1);
    assert_int_equal(pipe_lookup(pipe_standard(PIPE_ASTM_D1785), 4, "40", &d), PIPE_OK);
    assert_close(d.E / 1e9, 2.758, 0.001);
    assert_close(d.sdr, 4.5 / 0.237, 1e-12);
    assert_string_equal(d.std->material, "PVC");
    assert_string_equal(d.std->wall_basis, "minimum wall");
    /* every standard names a roughness row by its canonical name */
    for (int i = 0; i < PIPE_STANDARD_COUNT; i++) {
        const RoughnessRow *row = NULL;
        const PipeStandard *s = pipe_standard((PipeStandardId)i);
        assert_int_equal(roughness_lookup(s->roughness_of, &row), ROUGHNESS_OK);
        assert_string_equal(row->name, s->roughness_of);
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

/* ---- roughness table (Moody 1944, Fig. 2, values in ft) -------------------- */

static void test_roughness(void **state)
{
    (void)state;
    static const struct { const char *name; double ft; } rows[] = {
        {"steel", 0.00015},          {"Commercial Steel", 0.00015}, {"wrought iron", 0.00015},
        {"galvanized", 0.0005},      {"galvanised", 0.0005},        {"GALVANISED STEEL", 0.0005},
        {"cast iron", 0.00085},      {"asphalted cast iron", 0.0004}, {"drawn tubing", 0.000005},
        {"copper", 0.000005},        {"PVC", 0.000005},             {"plastic", 0.000005},
        {"concrete", 0.001},         {"ductile iron cement-lined", 0.001},
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
        cmocka_unit_test(test_material_data),      cmocka_unit_test(test_nps_from_bore),
        cmocka_unit_test(test_roughness),          cmocka_unit_test(test_fn_pipe),
        cmocka_unit_test(test_fn_pipe_errors),     cmocka_unit_test(test_fn_roughness),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
