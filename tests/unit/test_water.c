/* test_water.c — IAPWS-IF97 region 1 and 4, IAPWS 2008 viscosity, water().
 *
 * Values are the verification tables printed in the IAPWS releases
 * (recalled, marked "from memory", and each matches python3-iapws 1.5.3's
 * own doctests for the same states). Tolerances: the releases print 9
 * significant figures for IF97 and 6 decimals of uPa*s for viscosity, so
 * asserts allow half a unit in that last printed digit. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>

#include <math.h>
#include <string.h>

#include "library.h"
#include "methods/water.h"

#include "builtin_fns.h"

static void assert_rel(double got, double want, double rel)
{
    double err = fabs(got - want) / fabs(want);
    if (!(err <= rel))
        fail_msg("got %.12g, want %.12g (relative error %.3g > %.3g)", got, want, err, rel);
}

/* IAPWS-IF97 Table 5: region 1 at (300 K, 3 MPa), (300 K, 80 MPa),
 * (500 K, 3 MPa): v in m^3/kg, w in m/s, cp in kJ/(kg*K) (from memory). */
static void test_if97_region1_table5(void **state)
{
    (void)state;
    static const struct { double T, p, v, w, cp; } t5[] = {
        {300.0, 3e6, 0.100215168e-2, 0.150773921e4, 0.417301218e1},
        {300.0, 80e6, 0.971180894e-3, 0.163469054e4, 0.401008987e1},
        {500.0, 3e6, 0.120241800e-2, 0.124071337e4, 0.465580682e1},
    };
    for (size_t i = 0; i < sizeof t5 / sizeof t5[0]; i++) {
        double v, w, cp;
        water_if97_region1(t5[i].T, t5[i].p, &v, &w, &cp);
        assert_rel(v, t5[i].v, 5e-9);
        assert_rel(w, t5[i].w, 5e-9);
        assert_rel(cp / 1000.0, t5[i].cp, 5e-9);
    }
}

/* IAPWS-IF97 Table 35: saturation pressure at 300, 500, 600 K, in MPa
 * (from memory). */
static void test_if97_psat_table35(void **state)
{
    (void)state;
    assert_rel(water_psat(300.0) / 1e6, 0.353658941e-2, 5e-9);
    assert_rel(water_psat(500.0) / 1e6, 0.263889776e1, 5e-9);
    assert_rel(water_psat(600.0) / 1e6, 0.123443146e2, 5e-9);
    /* Normal boiling point: 373.124 K at 101.325 kPa (IAPWS, from memory):
     * the saturation pressure there is one atmosphere within 0.01 %. */
    assert_rel(water_psat(373.124), 101325.0, 1e-4);
}

/* IAPWS 2008 viscosity, Table 4 check values with mu2 = 1, in uPa*s
 * (from memory). Tolerance 1e-6 uPa*s absolute: the release prints six
 * decimals. */
static void test_viscosity_2008_table4(void **state)
{
    (void)state;
    static const struct { double T, rho, mu; } t4[] = {
        {298.15, 998.0, 889.735100},  {298.15, 1200.0, 1437.649467},
        {373.15, 1000.0, 307.883622}, {433.15, 1.0, 14.538324},
        {433.15, 1000.0, 217.685358}, {873.15, 1.0, 32.619287},
        {873.15, 100.0, 35.802262},   {873.15, 600.0, 77.430195},
        {1173.15, 1.0, 44.217245},    {1173.15, 100.0, 47.640433},
        {1173.15, 400.0, 64.154608},
    };
    for (size_t i = 0; i < sizeof t4 / sizeof t4[0]; i++)
        assert_true(fabs(water_viscosity(t4[i].rho, t4[i].T) * 1e6 - t4[i].mu) < 1e-6);
}

/* Water at 20 degC and one atmosphere against handbook values: density
 * 998.21 kg/m^3, viscosity 1.0016 mPa*s, vapour pressure 2.339 kPa, speed
 * of sound 1482.3 m/s (CRC Handbook / NIST webbook, from memory). */
static void test_props_20C(void **state)
{
    (void)state;
    WaterProps w;
    assert_int_equal(water_props(293.15, 101325.0, &w), WATER_OK);
    assert_rel(w.rho, 998.21, 2e-5);
    assert_rel(w.mu, 1.0016e-3, 2e-4);
    assert_rel(w.p_vap, 2339.0, 1e-3);
    assert_rel(w.w, 1482.3, 1e-3);
    assert_rel(w.nu, w.mu / w.rho, 1e-15);
    assert_rel(w.gamma, w.rho * 9.80665, 1e-15);
    assert_rel(w.K, w.rho * w.w * w.w, 1e-15);
    /* isentropic K of water at 20 degC is about 2.2 GPa (from memory) */
    assert_rel(w.K, 2.2e9, 0.01);
}

static void test_props_range(void **state)
{
    (void)state;
    WaterProps w;
    assert_int_equal(water_props(273.0, 101325.0, &w), WATER_T_OUT_OF_RANGE);
    assert_int_equal(water_props(424.0, 1e6, &w), WATER_T_OUT_OF_RANGE);
    assert_int_equal(water_props(393.15, 101325.0, &w), WATER_P_BELOW_SATURATION);
    assert_int_equal(water_props(393.15, 300e3, &w), WATER_OK);
    assert_int_equal(water_props(300.0, 101e6, &w), WATER_P_TOO_HIGH);
    assert_int_equal(water_props(NAN, 1e5, &w), WATER_NOT_FINITE);
    assert_int_equal(water_props(WATER_T_MIN, 101325.0, &w), WATER_OK);
    assert_int_equal(water_props(WATER_T_MAX, 1e6, &w), WATER_OK);
}

/* ---- the calc function water() ---------------------------------------- */

typedef struct Harness {
    Arena arena;
    DiagList diags;
    CallCtx cx;
} Harness;

static void harness_init(Harness *h)
{
    memset(h, 0, sizeof *h);
    arena_init(&h->arena);
    h->cx.arena = &h->arena;
    h->cx.diags = &h->diags;
    h->cx.units = UNITS_SI;
}

static void harness_free(Harness *h)
{
    diag_free(&h->diags);
    arena_free(&h->arena);
}

static Value temp_c(double c)
{
    Quantity q = qty(c + 273.15, DIM_THETA);
    q.temp = TEMP_ABSOLUTE_OFFSET;
    return value_number(q);
}

static Value abs_pressure(double pa)
{
    Value v = value_number(qty(pa, DIM_PRESSURE));
    v.q.pref = PRES_ABSOLUTE;
    return v;
}

static bool call_water(Harness *h, const Value *args, size_t n, Value *out)
{
    static const Pos pos[2] = {{"t.calc.md", 3, 11}, {"t.calc.md", 3, 20}};
    CallArgs a = {.n = n, .args = args, .arg_pos = pos, .pos = {"t.calc.md", 3, 5},
                  .name = "water"};
    return fn_water(&h->cx, &a, out);
}


static double field(const Value *v, const char *name)
{
    const Value *f = record_get(v->rec, name);
    assert_non_null(f);
    assert_int_equal(f->kind, VAL_NUMBER);
    return f->q.si;
}

static void assert_dim(const Value *rec, const char *name, Dim d)
{
    const Value *f = record_get(rec->rec, name);
    assert_non_null(f);
    assert_true(dim_eq(f->q.dim, d));
}

static void test_fn_water(void **state)
{
    (void)state;
    Harness h;
    harness_init(&h);
    Value args[2] = {temp_c(20.0)}, out;
    assert_true(call_water(&h, args, 1, &out));
    assert_int_equal(out.kind, VAL_RECORD);
    assert_string_equal(out.rec->type, "water");
    assert_rel(field(&out, "rho"), 998.21, 2e-5);
    assert_rel(field(&out, "mu"), 1.0016e-3, 2e-4);
    assert_rel(field(&out, "nu"), 1.0016e-3 / 998.21, 3e-4);
    assert_rel(field(&out, "gamma"), 998.21 * 9.80665, 2e-5);
    assert_rel(field(&out, "p_vap"), 2339.0, 1e-3);
    assert_rel(field(&out, "K"), 2.2e9, 0.01);
    assert_rel(field(&out, "T"), 293.15, 1e-15);
    assert_rel(field(&out, "p"), 101325.0, 1e-15);
    assert_dim(&out, "rho", DIM_DENSITY);
    assert_dim(&out, "mu", DIM_DYN_VISC);
    assert_dim(&out, "nu", DIM_KIN_VISC);
    assert_dim(&out, "gamma", DIM_SPECIFIC_WEIGHT);
    assert_dim(&out, "p_vap", DIM_PRESSURE);
    assert_dim(&out, "K", DIM_PRESSURE);
    assert_int_equal(h.diags.errors, 0);
    assert_int_equal(h.diags.warnings, 0);
    assert_true(h.cx.nmethods == 3);

    /* 120 degC at one atmosphere boils: an error at the temperature. */
    args[0] = temp_c(120.0);
    assert_false(call_water(&h, args, 1, &out));
    assert_int_equal(h.diags.errors, 1);
    assert_int_equal(h.diags.items[0].pos.col, 11);
    assert_non_null(strstr(h.diags.items[0].message, "saturation pressure is 198.7 kPa"));

    /* ... and is liquid at 300 kPa (absolute). */
    args[1] = abs_pressure(300e3);
    assert_true(call_water(&h, args, 2, &out));
    assert_rel(field(&out, "rho"), 943.0, 1e-3); /* 943.1 kg/m^3 at 120 degC (from memory) */
    assert_int_equal(record_get(out.rec, "p")->q.pref, PRES_ABSOLUTE);

    /* Outside 0..150 degC: an error at the temperature naming the range. */
    args[0] = temp_c(200.0);
    args[1] = abs_pressure(2e6);
    assert_false(call_water(&h, args, 2, &out));
    assert_int_equal(h.diags.errors, 2);
    assert_int_equal(h.diags.items[1].pos.col, 11);
    assert_non_null(strstr(h.diags.items[1].message, "0 degC to 150 degC"));

    /* Above 100 MPa: an error at the pressure. */
    args[0] = temp_c(20.0);
    args[1] = abs_pressure(200e6);
    assert_false(call_water(&h, args, 2, &out));
    assert_int_equal(h.diags.items[2].pos.col, 20);

    /* A temperature difference is not a temperature. */
    args[0] = value_number(qty(20.0, DIM_THETA));
    assert_false(call_water(&h, args, 1, &out));
    assert_non_null(strstr(h.diags.items[3].message, "temperature difference"));

    /* A length is not a temperature. */
    args[0] = value_number(qty(20.0, DIM_L));
    assert_false(call_water(&h, args, 1, &out));
    assert_int_equal(h.diags.errors, 5);

    /* DESIGN 2.9: a plain pressure is refused, naming both spellings; a
     * gauge one has the atmosphere added (here the context's 90 kPa). */
    args[0] = temp_c(20.0);
    args[1] = value_number(qty(300e3, DIM_PRESSURE));
    assert_false(call_water(&h, args, 2, &out));
    assert_int_equal(h.diags.errors, 6);
    assert_non_null(strstr(h.diags.items[5].message, "kPaa (absolute) or kPag (gauge)"));
    assert_int_equal(h.diags.items[5].pos.col, 20);
    args[1].q.pref = PRES_GAUGE;
    h.cx.atmosphere = 90e3;
    assert_true(call_water(&h, args, 2, &out));
    assert_rel(field(&out, "p"), 390e3, 1e-15);
    assert_true(h.cx.atmosphere_used);
    /* water(T) is at the calc's atmosphere */
    assert_true(call_water(&h, args, 1, &out));
    assert_rel(field(&out, "p"), 90e3, 1e-15);

    /* IF97 region 1 starts at 273.15 K: 0 degC and 32 degF are served. */
    args[0] = temp_c(0.0);
    assert_true(call_water(&h, args, 1, &out));
    assert_rel(field(&out, "rho"), 999.8385458, 1e-8); /* python3-iapws 1.5.2, IAPWS97(T=273.15, P=0.09).rho */
    Quantity f32 = qty(32.0 * 5.0 / 9.0 + 459.67 * 5.0 / 9.0, DIM_THETA);
    f32.temp = TEMP_ABSOLUTE_OFFSET;
    args[0] = value_number(f32);
    assert_true(call_water(&h, args, 1, &out));
    args[0] = temp_c(-0.01);
    assert_false(call_water(&h, args, 1, &out));
    assert_int_equal(h.diags.errors, 7);
    harness_free(&h);
}

/* npsh_available against values worked by hand from the same record:
 * NPSHa = (p_abs - p_vap)/(rho*g) + z - h_f. */
static void test_fn_npsh(void **state)
{
    (void)state;
    Harness h;
    harness_init(&h);
    Value wargs[1] = {temp_c(60.0)}, w;
    assert_true(call_water(&h, wargs, 1, &w));
    double rho = field(&w, "rho"), pv = field(&w, "p_vap");
    Value p0 = value_number(qty(0, DIM_PRESSURE));
    p0.q.pref = PRES_GAUGE;
    Value args[4] = {p0, w, value_number(qty(2.0, DIM_L)), value_number(qty(0.5, DIM_L))}, out;
    static const Pos pos[4] = {{"t.calc.md", 3, 20}, {"t.calc.md", 3, 28}, {"t.calc.md", 3, 31}, {"t.calc.md", 3, 36}};
    CallArgs a = {.n = 4, .args = args, .arg_pos = pos, .pos = {"t.calc.md", 3, 5}, .name = "npsh_available"};
    assert_true(fn_npsh_available(&h.cx, &a, &out));
    assert_rel(out.q.si, (101325.0 - pv) / (rho * 9.80665) + 2.0 - 0.5, 1e-15);
    assert_true(dim_eq(out.q.dim, DIM_L));
    /* an absolute surface pressure is taken as it is */
    args[0] = abs_pressure(50e3);
    assert_true(fn_npsh_available(&h.cx, &a, &out));
    assert_rel(out.q.si, (50e3 - pv) / (rho * 9.80665) + 1.5, 1e-15);
    /* a lift so high the liquid flashes: a warning, not an error */
    args[2] = value_number(qty(-20.0, DIM_L));
    assert_true(fn_npsh_available(&h.cx, &a, &out));
    assert_int_equal(h.diags.warnings, 1);
    /* a plain pressure states no reference */
    args[0] = value_number(qty(0, DIM_PRESSURE));
    assert_false(fn_npsh_available(&h.cx, &a, &out));
    assert_int_equal(h.diags.errors, 1);
    assert_int_equal(h.diags.items[1].pos.col, 20);
    harness_free(&h);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_if97_region1_table5),
        cmocka_unit_test(test_if97_psat_table35),
        cmocka_unit_test(test_viscosity_2008_table4),
        cmocka_unit_test(test_props_20C),
        cmocka_unit_test(test_props_range),
        cmocka_unit_test(test_fn_water),
        cmocka_unit_test(test_fn_npsh),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
