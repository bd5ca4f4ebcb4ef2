/* test_units.c — cmocka tests of the units module: dimension algebra, the
 * registry and its prefixes, compound expressions, temperatures, errors with
 * their locations, suggestions, SI spelling and default display units.
 *
 * Expected factors come from the exact definitions (1 in = 0.0254 m,
 * 1 ft = 0.3048 m, 1 lbm = 0.45359237 kg, g_n = 9.80665 m/s^2,
 * 1 gal = 231 in^3, 1 Btu_IT = 1055.05585262 J), evaluated as exact
 * fractions outside C and written here as decimals; they are checked to
 * 1e-12 relative. A second table checks against the seven-digit factors
 * printed in NIST SP 811 (2008) Appendix B.8, recalled (from memory), to
 * the 5e-7 relative that seven digits allow. The water columns are checked
 * against GNU units 2.22 (`inH2O`, `ft water`, `m water`). */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "units.h"

#define LEN(a) (sizeof(a) / sizeof((a)[0]))

/* Relative closeness, with a small absolute floor for values that are
 * zero. Prints the case so a table failure names its row. */
#define assert_close(got, want, rel, what)                                                  \
    do {                                                                                   \
        double g_ = (got), w_ = (want);                                                    \
        if (!(fabs(g_ - w_) <= (rel) * fabs(w_) + 1e-300))                                 \
            fail_msg("%s: got %.17g, want %.17g (rel tol %g)", (what), g_, w_, (double)(rel)); \
    } while (0)

#define assert_dim(got, want, what)                                                          \
    do {                                                                                    \
        if (!dim_eq((got), (want))) {                                                        \
            char g_[64], w_[64];                                                            \
            dim_format_si((got), g_, sizeof g_);                                              \
            dim_format_si((want), w_, sizeof w_);                                            \
            fail_msg("%s: dimension %s, want %s", (what), g_, w_);                           \
        }                                                                                   \
    } while (0)

static Unit parse_ok(const char *s)
{
    Unit u;
    size_t off = 99, n = 99;
    UnitStatus st = unit_parse(s, strlen(s), &u, &off, &n);
    if (st != UNIT_OK)
        fail_msg("unit_parse(\"%s\") = %d at %zu+%zu, want UNIT_OK", s, (int)st, off, n);
    return u;
}

static Dim dim_of(double l, double m, double t, double th)
{
    Dim d = dim_none();
    d.e[DIM_LENGTH] = l;
    d.e[DIM_MASS] = m;
    d.e[DIM_TIME] = t;
    d.e[DIM_TEMPERATURE] = th;
    return d;
}

/* ---- dimension algebra ------------------------------------------------- */

static void test_dim_algebra(void **state)
{
    (void)state;
    Dim m = dim_base(DIM_LENGTH), s = dim_base(DIM_TIME), kg = dim_base(DIM_MASS);
    assert_true(dim_eq(m, DIM_L));
    assert_true(dim_eq(kg, DIM_M));
    assert_true(dim_eq(s, DIM_T));
    assert_true(dim_is_none(dim_none()));
    assert_true(dim_is_none(dim_base(-1)));        /* out of range: no dimension */
    assert_true(dim_is_none(dim_base(DIM_COUNT)));
    assert_false(dim_is_none(m));
    assert_false(dim_eq(m, s));

    /* m^0.5 * m^0.5 is m exactly, not 0.99999999... */
    Dim root = dim_pow(m, 0.5);
    assert_true(dim_mul(root, root).e[DIM_LENGTH] == 1.0);
    assert_true(dim_eq(dim_mul(root, root), m));
    /* (m^3)^(1/3) is m exactly; 1/3 is not a double */
    assert_true(dim_pow(DIM_VOLUME, 1.0 / 3.0).e[DIM_LENGTH] == 1.0);
    /* 0.1 + 0.2 lands on the 1e-9 grid at 0.3 */
    Dim a = dim_pow(m, 0.1), b = dim_pow(m, 0.2);
    assert_true(dim_mul(a, b).e[DIM_LENGTH] == 0.3);
    /* m / m is none, and no -0 is left over */
    Dim none = dim_div(m, m);
    assert_true(dim_is_none(none));
    assert_false(signbit(none.e[DIM_LENGTH]));

    assert_true(dim_eq(dim_div(m, s), DIM_VELOCITY));
    assert_true(dim_eq(dim_div(DIM_VELOCITY, s), DIM_ACCEL));
    assert_true(dim_eq(dim_mul(DIM_VELOCITY, DIM_AREA), DIM_FLOW));
    assert_true(dim_eq(dim_mul(kg, DIM_ACCEL), DIM_FORCE));
    assert_true(dim_eq(dim_div(DIM_FORCE, DIM_AREA), DIM_PRESSURE));
    assert_true(dim_eq(dim_div(kg, DIM_VOLUME), DIM_DENSITY));
    assert_true(dim_eq(dim_mul(DIM_DENSITY, DIM_ACCEL), DIM_SPECIFIC_WEIGHT));
    assert_true(dim_eq(dim_mul(DIM_PRESSURE, s), DIM_DYN_VISC));
    assert_true(dim_eq(dim_div(DIM_DYN_VISC, DIM_DENSITY), DIM_KIN_VISC));
    assert_true(dim_eq(dim_mul(DIM_FORCE, m), DIM_ENERGY));
    assert_true(dim_eq(dim_div(DIM_ENERGY, s), DIM_POWER));
    assert_true(dim_eq(dim_mul(DIM_PRESSURE, DIM_FLOW), DIM_POWER)); /* hydraulic power */
    assert_true(dim_eq(dim_pow(DIM_AREA, 0.5), m));
    assert_true(dim_eq(dim_pow(DIM_VELOCITY, 2), dim_div(DIM_ENERGY, kg)));
    assert_true(dim_eq(dim_pow(m, -2), dim_div(dim_none(), DIM_AREA)));
    assert_true(dim_eq(DIM_THETA, dim_base(DIM_TEMPERATURE)));
    assert_true(dim_is_none(DIM_NONE));
}

static void test_dim_name(void **state)
{
    (void)state;
    static const struct {
        const Dim *d;
        const char *name;
    } cases[] = {
        {&DIM_NONE, "dimensionless"},
        {&DIM_L, "length"},
        {&DIM_M, "mass"},
        {&DIM_T, "time"},
        {&DIM_THETA, "temperature"},
        {&DIM_AREA, "area"},
        {&DIM_VOLUME, "volume"},
        {&DIM_VELOCITY, "velocity"},
        {&DIM_ACCEL, "acceleration"},
        {&DIM_FLOW, "flow rate"},
        {&DIM_FORCE, "force"},
        {&DIM_PRESSURE, "pressure"},
        {&DIM_DENSITY, "density"},
        {&DIM_SPECIFIC_WEIGHT, "specific weight"},
        {&DIM_DYN_VISC, "dynamic viscosity"},
        {&DIM_KIN_VISC, "kinematic viscosity"},
        {&DIM_ENERGY, "energy"},
        {&DIM_POWER, "power"},
    };
    for (size_t i = 0; i < LEN(cases); i++) {
        const char *got = dim_name(*cases[i].d);
        if (!got || strcmp(got, cases[i].name) != 0)
            fail_msg("dim_name: got %s, want %s", got ? got : "NULL", cases[i].name);
    }
    assert_string_equal(dim_name(dim_of(0, 0, -1, 0)), "frequency");
    assert_string_equal(dim_name(dim_of(0, 1, -1, 0)), "mass flow rate");
    assert_string_equal(dim_name(dim_of(2, 0, -2, -1)), "specific heat capacity");
    assert_null(dim_name(dim_of(7, 0, 0, 0)));
    assert_null(dim_name(dim_of(0.5, 0, 0, 0)));
}

static void test_dim_format_si(void **state)
{
    (void)state;
    static const struct {
        double l, m, t, th;
        const char *want;
    } cases[] = {
        {0, 0, 0, 0, "1"},
        {1, 0, 0, 0, "m"},
        {0, 1, 0, 0, "kg"},
        {0, 0, 0, 1, "K"},
        {2, 0, 0, 0, "m^2"},
        {1, 0, -1, 0, "m/s"},
        {1, 0, -2, 0, "m/s^2"},
        {3, 0, -1, 0, "m^3/s"},
        {-3, 1, 0, 0, "kg/m^3"},
        {2, 0, -1, 0, "m^2/s"},
        {0, 0, -1, 0, "1/s"},
        {-2, 0, 0, 0, "1/m^2"},
        {0, 1, -1, 0, "kg/s"},
        {1, 1, -2, 0, "N"},
        {-1, 1, -2, 0, "Pa"},
        {2, 1, -2, 0, "J"},
        {2, 1, -3, 0, "W"},
        {-1, 1, -1, 0, "Pa*s"},
        {-2, 1, -2, 0, "N/m^3"},
        {2, 0, -2, -1, "m^2/(s^2*K)"},          /* J/(kg*K) in base units */
        {1, 1, -3, -1, "kg*m/(s^3*K)"},         /* W/(m*K) */
        {0.5, 0, 0, 0, "m^0.5"},
        {-0.5, 1, 0, 0, "kg/m^0.5"},
        {1.0 / 3.0, 0, 0, 0, "m^0.333333333"},
        {1.85, 0, -1.85, 0, "m^1.85/s^1.85"},    /* Hazen-Williams exponents */
    };
    for (size_t i = 0; i < LEN(cases); i++) {
        char buf[64];
        Dim d = dim_of(cases[i].l, cases[i].m, cases[i].t, cases[i].th);
        if (cases[i].l == 1.0 / 3.0)
            d = dim_pow(dim_base(DIM_LENGTH), 1.0 / 3.0);
        dim_format_si(d, buf, sizeof buf);
        assert_string_equal(buf, cases[i].want);
        /* The spelling parses back to the same dimension and factor 1. */
        Unit u = parse_ok(buf);
        assert_dim(u.dim, d, buf);
        assert_close(u.factor, 1.0, 1e-15, buf);
    }
    Dim cur = dim_base(DIM_CURRENT);
    cur.e[DIM_AMOUNT] = -1;
    cur.e[DIM_LUMINOUS] = 2;
    char buf[32];
    dim_format_si(cur, buf, sizeof buf);
    assert_string_equal(buf, "A*cd^2/mol");

    /* Truncation: at most n bytes, NUL included; n = 0 writes nothing. */
    char small[4] = "xyz";
    dim_format_si(DIM_DENSITY, small, sizeof small);
    assert_string_equal(small, "kg/");
    char untouched[2] = "q";
    dim_format_si(DIM_DENSITY, untouched, 0);
    assert_string_equal(untouched, "q");
}

/* ---- the registry and compound expressions ---------------------------- */

typedef struct FactorCase {
    const char *text;
    double factor; /* to coherent SI */
    double l, m, t, th;
} FactorCase;

/* Every unit DESIGN 2.3 lists, plus compounds. Values: exact fractions of
 * the defining constants, rounded to 17 digits. */
static const FactorCase factor_cases[] = {
    {"m", 1, 1, 0, 0, 0},
    {"cm", 0.01, 1, 0, 0, 0},
    {"mm", 0.001, 1, 0, 0, 0},
    {"km", 1000, 1, 0, 0, 0},
    {"in", 0.0254, 1, 0, 0, 0},
    {"ft", 0.3048, 1, 0, 0, 0},
    {"yd", 0.9144, 1, 0, 0, 0},
    {"mi", 1609.344, 1, 0, 0, 0},
    {"s", 1, 0, 0, 1, 0},
    {"min", 60, 0, 0, 1, 0},
    {"h", 3600, 0, 0, 1, 0},
    {"kg", 1, 0, 1, 0, 0},
    {"g", 0.001, 0, 1, 0, 0},
    {"lbm", 0.45359237, 0, 1, 0, 0},
    {"slug", 14.593902937206364, 0, 1, 0, 0},
    {"N", 1, 1, 1, -2, 0},
    {"kN", 1000, 1, 1, -2, 0},
    {"lbf", 4.4482216152605, 1, 1, -2, 0},
    {"Pa", 1, -1, 1, -2, 0},
    {"kPa", 1000, -1, 1, -2, 0},
    {"MPa", 1e6, -1, 1, -2, 0},
    {"bar", 1e5, -1, 1, -2, 0},
    {"mbar", 100, -1, 1, -2, 0},
    {"psi", 6894.757293168362, -1, 1, -2, 0},
    {"psf", 47.880258980335846, -1, 1, -2, 0},
    {"ksi", 6894757.293168361, -1, 1, -2, 0},
    {"atm", 101325, -1, 1, -2, 0},
    {"ftH2O", 2989.06692, -1, 1, -2, 0},
    {"inH2O", 249.08891, -1, 1, -2, 0},
    {"mH2O", 9806.65, -1, 1, -2, 0},
    {"L", 0.001, 3, 0, 0, 0},
    {"mL", 1e-6, 3, 0, 0, 0},
    {"m^3", 1, 3, 0, 0, 0},
    {"gal", 0.003785411784, 3, 0, 0, 0},
    {"ft^3", 0.028316846592, 3, 0, 0, 0},
    {"in^3", 1.6387064e-05, 3, 0, 0, 0},
    {"gal/min", 6.30901964e-05, 3, 0, -1, 0},
    {"gpm", 6.30901964e-05, 3, 0, -1, 0},
    {"L/s", 0.001, 3, 0, -1, 0},
    {"L/min", 1.6666666666666667e-05, 3, 0, -1, 0},
    {"m^3/h", 2.7777777777777778e-04, 3, 0, -1, 0},
    {"ft^3/s", 0.028316846592, 3, 0, -1, 0},
    {"cfs", 0.028316846592, 3, 0, -1, 0},
    {"Pa*s", 1, -1, 1, -1, 0},
    {"cP", 0.001, -1, 1, -1, 0},
    {"P", 0.1, -1, 1, -1, 0},
    {"lbf*s/ft^2", 47.880258980335846, -1, 1, -1, 0},
    {"m^2/s", 1, 2, 0, -1, 0},
    {"ft^2/s", 0.09290304, 2, 0, -1, 0},
    {"St", 1e-4, 2, 0, -1, 0},
    {"cSt", 1e-6, 2, 0, -1, 0},
    {"J", 1, 2, 1, -2, 0},
    {"kJ", 1000, 2, 1, -2, 0},
    {"Btu", 1055.05585262, 2, 1, -2, 0},
    {"ft*lbf", 1.3558179483314003, 2, 1, -2, 0},
    {"W", 1, 2, 1, -3, 0},
    {"kW", 1000, 2, 1, -3, 0},
    {"hp", 745.69987158227022, 2, 1, -3, 0},
    {"K", 1, 0, 0, 0, 1},
    {"degR", 5.0 / 9.0, 0, 0, 0, 1},
    {"delta_degC", 1, 0, 0, 0, 1},
    {"delta_degF", 5.0 / 9.0, 0, 0, 0, 1},
    {"rad", 1, 0, 0, 0, 0},
    {"deg", 0.017453292519943295, 0, 0, 0, 0},
    {"percent", 0.01, 0, 0, 0, 0},
    {"Hz", 1, 0, 0, -1, 0},
    /* compounds */
    {"kg/m^3", 1, -3, 1, 0, 0},
    {"lbm/ft^3", 16.018463373960138, -3, 1, 0, 0},
    {"lbf/ft^3", 157.0874638462462, -2, 1, -2, 0},
    {"ft/s^2", 0.3048, 1, 0, -2, 0},
    {"J/(kg*K)", 1, 2, 0, -2, -1},
    {"Btu/(lbm*degF)", 4186.8, 2, 0, -2, -1}, /* exactly 4186.8 J/(kg*K) */
    {"J/(kg*degC)", 1, 2, 0, -2, -1},
    {"m^0.5", 1, 0.5, 0, 0, 0},
    {"ft^0.5", 0.55208694967369044, 0.5, 0, 0, 0}, /* sqrt(0.3048) */
    {"ft^(1/2)", 0.55208694967369044, 0.5, 0, 0, 0},
    {"s^-1", 1, 0, 0, -1, 0},
    {"ft^-2", 10.763910416709722, -2, 0, 0, 0},
    {"ft^(-2)", 10.763910416709722, -2, 0, 0, 0},
    {"m^+2", 1, 2, 0, 0, 0},
    {"1/s", 1, 0, 0, -1, 0},
    {"1/min", 1.0 / 60, 0, 0, -1, 0},
    {"(m/s)^2", 1, 2, 0, -2, 0},
    {"(ft/s)^2/ft", 0.3048, 1, 0, -2, 0},
    {"N*m", 1, 2, 1, -2, 0},
    {"kW*h", 3.6e6, 2, 1, -2, 0},
    /* left-associative: a/b*c = (a/b)*c and a/b/c = a/(b*c) */
    {"m/s*s", 1, 1, 0, 0, 0},
    {"ft/min*h", 18.288, 1, 0, 0, 0},
    {"m/s/s", 1, 1, 0, -2, 0},
    {"ft/s/min", 0.00508, 1, 0, -2, 0},
    {"kg/(m*s)", 1, -1, 1, -1, 0},
    /* UTF-8 spellings */
    {"N\xc2\xb7m", 1, 2, 1, -2, 0},                     /* N·m */
    {"lbf\xc2\xb7s/ft\xc2\xb2", 47.880258980335846, -1, 1, -1, 0}, /* lbf·s/ft² */
    {"m\xc2\xb3/h", 2.7777777777777778e-04, 3, 0, -1, 0},     /* m³/h */
    {"J/(kg\xc2\xb7\xc2\xb0" "C)", 1, 2, 0, -2, -1},           /* J/(kg·°C) */
    {"\xc2\xb0", 0.017453292519943295, 0, 0, 0, 0},           /* ° alone: the angle */
};

static void test_parse_factors(void **state)
{
    (void)state;
    for (size_t i = 0; i < LEN(factor_cases); i++) {
        const FactorCase *c = &factor_cases[i];
        Unit u = parse_ok(c->text);
        assert_close(u.factor, c->factor, 1e-12, c->text);
        assert_dim(u.dim, dim_of(c->l, c->m, c->t, c->th), c->text);
        if (u.offset != 0)
            fail_msg("%s: offset %g, want 0", c->text, u.offset);
    }
}

/* NIST SP 811 (2008) Appendix B.8 factors, seven significant digits
 * (from memory), and GNU units 2.22 for the conventional water columns. */
static void test_parse_against_sp811(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        double si;
        double rel;
    } cases[] = {
        {"psi", 6.894757e3, 5e-7},          {"psf", 4.788026e1, 5e-7},
        {"ksi", 6.894757e6, 5e-7},          {"lbf", 4.448222, 5e-7},
        {"slug", 1.459390e1, 5e-7},         {"gal", 3.785412e-3, 5e-7},
        {"gpm", 6.309020e-5, 5e-7},         {"cfs", 2.831685e-2, 5e-7},
        {"Btu", 1.055056e3, 5e-7},          {"hp", 7.456999e2, 5e-7},
        {"lbf*s/ft^2", 4.788026e1, 5e-7},   {"ft^2/s", 9.290304e-2, 1e-15},
        {"lbm/ft^3", 1.601846e1, 5e-7},     {"ft*lbf", 1.355818, 5e-7},
        {"in^3", 1.6387064e-5, 1e-15},      {"atm", 1.01325e5, 1e-15},
        {"inH2O", 249.08891, 1e-12},        {"ftH2O", 2989.06692, 1e-12}, /* GNU units */
        {"mH2O", 9806.65, 1e-12},                                         /* GNU units */
    };
    for (size_t i = 0; i < LEN(cases); i++)
        assert_close(parse_ok(cases[i].text).factor, cases[i].si, cases[i].rel, cases[i].text);
}

/* Exact names win over prefix readings; prefixes attach only to SI units
 * that take them and never stack. */
static void test_prefixes(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        double factor;
        double l, m, t;
        int other; /* a base dimension other than L M T, or -1 */
    } ok[] = {
        {"min", 60, 0, 0, 1, -1},            /* minute, not milli-inch */
        {"mm", 1e-3, 1, 0, 0, -1},
        {"Mm", 1e6, 1, 0, 0, -1},            /* megametre: case matters */
        {"cd", 1, 0, 0, 0, DIM_LUMINOUS},    /* candela, not centi-day */
        {"Pa", 1, -1, 1, -2, -1},            /* pascal, not peta-annum */
        {"PPa", 1e15, -1, 1, -2, -1},
        {"hp", 745.69987158227022, 2, 1, -3, -1}, /* horsepower, not hecto-p */
        {"hPa", 100, -1, 1, -2, -1},         /* hectopascal */
        {"mi", 1609.344, 1, 0, 0, -1},
        {"ms", 1e-3, 0, 0, 1, -1},           /* millisecond */
        {"Ms", 1e6, 0, 0, 1, -1},
        {"dam", 10, 1, 0, 0, -1},            /* deca- tried before deci- */
        {"daN", 10, 1, 1, -2, -1},
        {"dm", 0.1, 1, 0, 0, -1},
        {"dL", 1e-4, 3, 0, 0, -1},
        {"cL", 1e-5, 3, 0, 0, -1},
        {"hL", 0.1, 3, 0, 0, -1},
        {"um", 1e-6, 1, 0, 0, -1},
        {"\xc2\xb5m", 1e-6, 1, 0, 0, -1},    /* µm, micro sign U+00B5 */
        {"\xce\xbcm", 1e-6, 1, 0, 0, -1},    /* μm, Greek mu U+03BC */
        {"nm", 1e-9, 1, 0, 0, -1},
        {"fs", 1e-15, 0, 0, 1, -1},
        {"mg", 1e-6, 0, 1, 0, -1},
        {"Mg", 1e3, 0, 1, 0, -1},
        {"kg", 1, 0, 1, 0, -1},
        {"GPa", 1e9, -1, 1, -2, -1},
        {"MN", 1e6, 1, 1, -2, -1},
        {"MJ", 1e6, 2, 1, -2, -1},
        {"MW", 1e6, 2, 1, -3, -1},
        {"kbar", 1e8, -1, 1, -2, -1},
        {"mP", 1e-4, -1, 1, -1, -1},
        {"mSt", 1e-7, 2, 0, -1, -1},
        {"kHz", 1e3, 0, 0, -1, -1},
        {"mrad", 1e-3, 0, 0, 0, -1},
        {"mA", 1e-3, 0, 0, 0, DIM_CURRENT},
        {"kmol", 1e3, 0, 0, 0, DIM_AMOUNT},
        {"Ym", 1e24, 1, 0, 0, -1},
        {"am", 1e-18, 1, 0, 0, -1},
        {"yd", 0.9144, 1, 0, 0, -1},          /* no yocto, so the yard is safe */
        {"ft", 0.3048, 1, 0, 0, -1},          /* not femto-t */
        {"mH2O", 9806.65, -1, 1, -2, -1},     /* metre of water, not milli-H2O */
        {"cP", 1e-3, -1, 1, -1, -1},
        {"gpm", 6.30901964e-05, 3, 0, -1, -1}, /* not giga-pm */
    };
    for (size_t i = 0; i < LEN(ok); i++) {
        Unit u = parse_ok(ok[i].text);
        assert_close(u.factor, ok[i].factor, 1e-12, ok[i].text);
        Dim want = dim_of(ok[i].l, ok[i].m, ok[i].t, 0);
        if (ok[i].other >= 0)
            want = dim_base(ok[i].other);
        assert_dim(u.dim, want, ok[i].text);
    }
    /* Not prefixable, stacked, refused or meaningless. */
    static const char *const unknown[] = {
        "kft", "kpsi", "mgal", "kmin", "kh", "mkm", "kkg", "mdegC", "kdelta_degF", "Mlbm",
        "cgpm", "katm", "kBtu", "khp", "lb", "lbs", "as", "hr", "sec", "ym", "zm", "mm2",
    };
    for (size_t i = 0; i < LEN(unknown); i++) {
        Unit u;
        size_t off = 99, n = 99;
        UnitStatus st = unit_parse(unknown[i], strlen(unknown[i]), &u, &off, &n);
        if (st != UNIT_UNKNOWN || off != 0 || n != strlen(unknown[i]))
            fail_msg("%s: status %d at %zu+%zu, want UNIT_UNKNOWN over the name", unknown[i],
                     (int)st, off, n);
    }
}

/* ---- temperatures ------------------------------------------------------- */

static void test_temperature_units(void **state)
{
    (void)state;
    Unit c = parse_ok("degC"), f = parse_ok("degF"), k = parse_ok("K"), r = parse_ok("degR");
    assert_int_equal(c.temp, TEMP_ABSOLUTE_OFFSET);
    assert_int_equal(f.temp, TEMP_ABSOLUTE_OFFSET);
    assert_int_equal(k.temp, TEMP_ABSOLUTE);
    assert_int_equal(r.temp, TEMP_ABSOLUTE);
    assert_close(c.offset, 273.15, 1e-15, "degC offset");
    assert_close(f.offset, 255.37222222222222, 1e-15, "degF offset"); /* 459.67 * 5/9 */
    assert_true(k.offset == 0 && r.offset == 0);

    /* UTF-8 degree signs, and the spelling kept for display */
    Unit uc = parse_ok("\xc2\xb0" "C"), uf = parse_ok("\xc2\xb0" "F");
    assert_string_equal(uc.text, "degC");
    assert_string_equal(uf.text, "degF");
    assert_int_equal(uc.temp, TEMP_ABSOLUTE_OFFSET);
    assert_close(uf.offset, f.offset, 1e-15, "°F offset");

    /* Inside a compound, or raised to a power, an offset unit is a
     * difference; so is anything with K in it. */
    static const char *const differences[] = {"J/(kg*degC)", "degF^2", "1/degC", "degF/ft",
                                              "J/K",         "K^1",    "delta_degC", "delta_degF",
                                              "degC*1"};
    for (size_t i = 0; i < LEN(differences); i++) {
        Unit u = parse_ok(differences[i]);
        if (u.temp != TEMP_NONE || u.offset != 0)
            fail_msg("%s: temp %d offset %g, want a difference", differences[i], (int)u.temp,
                     u.offset);
    }
    assert_close(parse_ok("degF/ft").factor, (5.0 / 9.0) / 0.3048, 1e-15, "degF/ft");
    /* A prefixed kelvin is still an absolute scale; parentheses keep a lone
     * name lone. */
    assert_int_equal(parse_ok("mK").temp, TEMP_ABSOLUTE);
    assert_int_equal(parse_ok("(degF)").temp, TEMP_ABSOLUTE_OFFSET);
}

/* Fixed points of the scales (ITS-90 conventions: 0 degC = 273.15 K,
 * degF = degR - 459.67, 9/5 degR per K; exact by definition). */
static void test_temperature_conversions(void **state)
{
    (void)state;
    static const struct {
        double v;
        const char *from;
        double kelvin;
    } points[] = {
        {0, "degC", 273.15},     {100, "degC", 373.15},   {-40, "degC", 233.15},
        {32, "degF", 273.15},    {212, "degF", 373.15},   {-40, "degF", 233.15},
        {-459.67, "degF", 0},    {0, "K", 0},             {491.67, "degR", 273.15},
        {671.67, "degR", 373.15}, {68, "\xc2\xb0" "F", 293.15}, {20, "\xc2\xb0" "C", 293.15},
    };
    for (size_t i = 0; i < LEN(points); i++) {
        Unit u = parse_ok(points[i].from);
        Quantity q = unit_to_qty(points[i].v, &u);
        char what[64];
        snprintf(what, sizeof what, "%g %s in K", points[i].v, points[i].from);
        if (points[i].kelvin == 0)
            assert_true(fabs(q.si) < 1e-12);
        else
            assert_close(q.si, points[i].kelvin, 1e-14, what);
        assert_dim(q.dim, DIM_THETA, what);
        assert_int_equal(q.temp, u.temp);
    }
    Unit c = parse_ok("degC"), f = parse_ok("degF"), r = parse_ok("degR");
    Quantity q = unit_to_qty(50, &f);
    assert_close(unit_from_si(q.si, &c, false), 10, 1e-14, "50 degF in degC");
    assert_close(unit_from_si(q.si, &r, false), 509.67, 1e-14, "50 degF in degR");
    assert_close(unit_from_si(373.15, &f, false), 212, 1e-14, "373.15 K in degF");
    /* a difference converts without the offset */
    Unit df = parse_ok("delta_degF"), dc = parse_ok("delta_degC"), k = parse_ok("K");
    Quantity d = unit_to_qty(18, &df);
    assert_int_equal(d.temp, TEMP_NONE);
    assert_close(d.si, 10, 1e-14, "18 delta_degF in K");
    assert_close(unit_from_si(d.si, &dc, true), 10, 1e-14, "18 delta_degF in delta_degC");
    assert_close(unit_from_si(d.si, &k, true), 10, 1e-14, "18 delta_degF in K");
    assert_close(unit_from_si(d.si, &f, true), 18, 1e-14, "18 delta_degF shown on degF");
    assert_close(unit_from_si(d.si, &c, true), 10, 1e-14, "10 K difference in degC");
    /* a non-temperature unit ignores is_difference */
    Unit psi = parse_ok("psi");
    assert_close(unit_from_si(6894.757293168362, &psi, false), 1, 1e-14, "psi");
    assert_close(unit_from_si(6894.757293168362, &psi, true), 1, 1e-14, "psi diff");
    Quantity p = unit_to_qty(2, &psi);
    assert_int_equal(p.temp, TEMP_NONE);
    assert_dim(p.dim, DIM_PRESSURE, "2 psi");
}

/* ---- text kept for display --------------------------------------------- */

static void test_display_text(void **state)
{
    (void)state;
    static const struct {
        const char *in, *text;
    } cases[] = {
        {"gal/min", "gal/min"},
        {"gpm", "gpm"}, /* the user's choice is kept */
        {"lbf*s/ft^2", "lbf*s/ft^2"},
        {"N\xc2\xb7m", "N*m"},
        {"m\xc2\xb3/h", "m^3/h"},
        {"ft\xc2\xb2", "ft^2"},
        {"J/(kg\xc2\xb7\xc2\xb0" "C)", "J/(kg*degC)"},
        {"\xc2\xb5m", "\xc2\xb5m"},
        {"\xc2\xb0", "deg"},
    };
    for (size_t i = 0; i < LEN(cases); i++)
        assert_string_equal(parse_ok(cases[i].in).text, cases[i].text);
}

/* ---- errors ------------------------------------------------------------ */

static void test_errors(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        UnitStatus st;
        size_t off, len;
    } cases[] = {
        {"", UNIT_SYNTAX, 0, 0},
        {"foo", UNIT_UNKNOWN, 0, 3},
        {"gal/mn", UNIT_UNKNOWN, 4, 2},
        {"J/(kg*Kx)", UNIT_UNKNOWN, 6, 2},
        {"lbf*s/ft^2/xx", UNIT_UNKNOWN, 11, 2},
        {"\xc2\xb0X", UNIT_UNKNOWN, 0, 3},        /* °X: the whole name, in bytes */
        {"lb/ft^3", UNIT_UNKNOWN, 0, 2},          /* ambiguous pound */
        {"ft/", UNIT_SYNTAX, 3, 0},
        {"*m", UNIT_SYNTAX, 0, 1},
        {"m//s", UNIT_SYNTAX, 2, 1},
        {"m)", UNIT_SYNTAX, 1, 1},
        {"kg/(m*s", UNIT_SYNTAX, 3, 1},           /* the '(' left open */
        {"m^", UNIT_SYNTAX, 1, 1},
        {"m^x", UNIT_SYNTAX, 1, 2},
        {"m^(1/0)", UNIT_SYNTAX, 1, 6},
        {"m s", UNIT_SYNTAX, 1, 1},               /* no implicit product */
        {"10/s", UNIT_SYNTAX, 0, 1},
        {"1.5/s", UNIT_SYNTAX, 0, 1},
        {"m\xe2\x82\xac", UNIT_SYNTAX, 1, 3},     /* m€ */
        {"()", UNIT_SYNTAX, 1, 1},
        {"km^999", UNIT_SYNTAX, 2, 4},            /* factor overflows */
        {"((((((((((((((((((m))))))))))))))))))", UNIT_SYNTAX, 17, 1}, /* nesting limit */
        {"mm/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s", UNIT_TOO_LONG, 0, 48},
    };
    for (size_t i = 0; i < LEN(cases); i++) {
        Unit u;
        size_t off = 99, n = 99;
        UnitStatus st = unit_parse(cases[i].text, strlen(cases[i].text), &u, &off, &n);
        if (st != cases[i].st || off != cases[i].off || n != cases[i].len)
            fail_msg("\"%s\": status %d at %zu+%zu, want %d at %zu+%zu", cases[i].text, (int)st,
                     off, n, (int)cases[i].st, cases[i].off, cases[i].len);
    }
    /* 47 bytes is the longest accepted text */
    const char *s47 = "m/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s/s";
    assert_int_equal(strlen(s47), 47);
    Unit u = parse_ok(s47);
    assert_close(u.dim.e[DIM_TIME], -23, 0, "47-byte text");
    /* ... and the display spelling must fit as well: each ° grows by one */
    const char *degs = "\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0"
                       "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C*\xc2\xb0" "C";
    assert_true(strlen(degs) <= 47);
    assert_int_equal(unit_parse(degs, strlen(degs), &u, NULL, NULL), UNIT_TOO_LONG);
    /* The length is honoured: no read past len, no NUL needed. */
    char raw[3] = {'f', 't', 'x'};
    assert_int_equal(unit_parse(raw, 2, &u, NULL, NULL), UNIT_OK);
    assert_string_equal(u.text, "ft");
    /* An embedded NUL is a syntax error, not the end of the text. */
    assert_int_equal(unit_parse("m\0s", 3, &u, NULL, NULL), UNIT_SYNTAX);
}

/* ---- suggestions --------------------------------------------------------- */

static void test_suggest(void **state)
{
    (void)state;
    static const struct {
        const char *in, *want; /* want NULL: nothing close */
    } cases[] = {
        {"gpm ", "gpm"},
        {"Gal/min", "gal/min"},
        {"gal/mn", "gal/min"},
        {"psig", "psig"},      /* gauge and absolute are units of their own (DESIGN 2.9) */
        {"psia", "psia"},
        {"PSIA", "psia"},
        {"kpag", "kPag"},
        {"barA", "bara"},
        {"MPag", NULL},        /* never kPag or MPa: another quantity */
        {"psiaa", "psia"},     /* a doubled letter keeps the reference */
        {"lps", "L/s"},
        {"F", "degF"},
        {"lb", "lbm"},
        {"lbs", "lbm"},
        {"Psi", "psi"},
        {"PSI", "psi"},
        {"KPA", "kPa"},
        {"kpa", "kPa"},
        {"mpa", "MPa"},
        {"GPA", "GPa"},
        {"btu", "Btu"},
        {"BTU", "Btu"},
        {"degc", "degC"},
        {"DegF", "degF"},
        {"ftH20", "ftH2O"},    /* zero for the letter O */
        {"inh2o", "inH2O"},
        {"ml", "ml"},          /* l is the litre too (SP 811) */
        {"hr", "h"},
        {"sec", "s"},
        {"gallons", "gal"},
        {"mn", "min"},
        {"MN", "MN"},          /* meganewton is a valid spelling */
        {"gpa", "GPa"},
        {"kgs", "kg"},
        {"m3", "m^3"},
        {"m3/h", "m^3/h"},
        {"kg/m3", "kg/m^3"},
        {"ft2/s", "ft^2/s"},
        {"J/(kg K)", "J/(kg*K)"}, /* a space between names reads as `*` */
        {"lbf s/ft^2", "lbf*s/ft^2"},
        {"percnet", "percent"},
        {"delta_degf", "delta_degF"},
        {"\xc2\xb0" "c", "degC"},
        {"xyzzy", NULL},
        {"q", NULL},
        {"C", "degC"},         /* 140 F, 60 C: the scale was meant */
        {"", NULL},
        {"as", NULL},
        {"gal/xyzzy", NULL},
        {"deg2212", NULL}, /* deg^2212 would underflow: never suggest what fails */
    };
    for (size_t i = 0; i < LEN(cases); i++) {
        const char *got = unit_suggest(cases[i].in, strlen(cases[i].in));
        if (cases[i].want == NULL ? got != NULL : (got == NULL || strcmp(got, cases[i].want) != 0))
            fail_msg("unit_suggest(\"%s\") = %s, want %s", cases[i].in, got ? got : "NULL",
                     cases[i].want ? cases[i].want : "NULL");
        /* every suggestion parses */
        if (got)
            parse_ok(got);
    }
}

/* ---- defaults ------------------------------------------------------------ */

static void test_defaults(void **state)
{
    (void)state;
    static const struct {
        const Dim *dim;
        const char *us;
        double us_factor;
        const char *si;
        double si_factor;
    } cases[] = {
        {&DIM_L, "ft", 0.3048, "m", 1},
        {&DIM_AREA, "ft^2", 0.09290304, "m^2", 1},
        {&DIM_VOLUME, "gal", 0.003785411784, "m^3", 1},
        {&DIM_T, "s", 1, "s", 1},
        {&DIM_M, "lbm", 0.45359237, "kg", 1},
        {&DIM_VELOCITY, "ft/s", 0.3048, "m/s", 1},
        {&DIM_ACCEL, "ft/s^2", 0.3048, "m/s^2", 1},
        {&DIM_FLOW, "gal/min", 6.30901964e-05, "L/s", 1e-3},
        {&DIM_PRESSURE, "psi", 6894.757293168362, "kPa", 1e3},
        {&DIM_FORCE, "lbf", 4.4482216152605, "N", 1},
        {&DIM_DENSITY, "lbm/ft^3", 16.018463373960138, "kg/m^3", 1},
        {&DIM_SPECIFIC_WEIGHT, "lbf/ft^3", 157.0874638462462, "N/m^3", 1},
        {&DIM_DYN_VISC, "cP", 1e-3, "Pa*s", 1},
        {&DIM_KIN_VISC, "ft^2/s", 0.09290304, "m^2/s", 1},
        {&DIM_ENERGY, "Btu", 1055.05585262, "J", 1},
        {&DIM_POWER, "hp", 745.69987158227022, "kW", 1e3},
    };
    for (size_t i = 0; i < LEN(cases); i++) {
        Unit us = unit_default(*cases[i].dim, TEMP_NONE, UNITS_US);
        Unit si = unit_default(*cases[i].dim, TEMP_NONE, UNITS_SI);
        assert_string_equal(us.text, cases[i].us);
        assert_string_equal(si.text, cases[i].si);
        assert_close(us.factor, cases[i].us_factor, 1e-12, cases[i].us);
        assert_close(si.factor, cases[i].si_factor, 1e-12, cases[i].si);
        assert_dim(us.dim, *cases[i].dim, cases[i].us);
        assert_dim(si.dim, *cases[i].dim, cases[i].si);
    }
    /* temperatures: points with their offset, differences without */
    Unit f = unit_default(DIM_THETA, TEMP_ABSOLUTE_OFFSET, UNITS_US);
    assert_string_equal(f.text, "degF");
    assert_close(f.offset, 255.37222222222222, 1e-15, "degF default");
    assert_string_equal(unit_default(DIM_THETA, TEMP_ABSOLUTE, UNITS_US).text, "degF");
    assert_string_equal(unit_default(DIM_THETA, TEMP_ABSOLUTE, UNITS_SI).text, "degC");
    Unit df = unit_default(DIM_THETA, TEMP_NONE, UNITS_US);
    assert_string_equal(df.text, "delta_degF");
    assert_true(df.offset == 0);
    assert_string_equal(unit_default(DIM_THETA, TEMP_NONE, UNITS_SI).text, "delta_degC");
    /* beyond the list: coherent SI with factor 1; a pure number is bare */
    Dim odd = dim_of(1, 1, -3, -1); /* W/(m*K) */
    Unit o = unit_default(odd, TEMP_NONE, UNITS_US);
    assert_string_equal(o.text, "kg*m/(s^3*K)");
    assert_true(o.factor == 1 && o.offset == 0);
    assert_string_equal(unit_default(dim_of(0, 0, -1, 0), TEMP_NONE, UNITS_SI).text, "1/s");
    Unit none = unit_default(DIM_NONE, TEMP_NONE, UNITS_SI);
    assert_string_equal(none.text, "");
    assert_true(none.factor == 1);
    assert_string_equal(unit_default(dim_of(0, 1, -1, 0), TEMP_NONE, UNITS_US).text, "lbm/s");
    assert_string_equal(unit_default(dim_of(2, 0, -2, -1), TEMP_NONE, UNITS_US).text,
                        "Btu/(lbm*degF)");
}

/* ---- the registry as a whole -------------------------------------------- */

typedef struct Seen {
    size_t count;
    char names[128][24];
} Seen;

static void visit(const char *name, const Unit *u, void *ctx)
{
    Seen *seen = ctx;
    for (size_t i = 0; i < seen->count; i++)
        if (strcmp(seen->names[i], name) == 0)
            fail_msg("unit_each: %s visited twice", name);
    if (seen->count < LEN(seen->names))
        snprintf(seen->names[seen->count++], sizeof seen->names[0], "%s", name);
    if (!(u->factor > 0 && isfinite(u->factor)))
        fail_msg("%s: factor %g", name, u->factor);
    assert_string_equal(u->text, name);
    /* a value survives the trip to SI and back, as a point and as a
     * difference */
    Quantity q = unit_to_qty(12.5, u);
    assert_close(unit_from_si(q.si, u, false), 12.5, 1e-14, name);
    assert_close(unit_from_si(12.5 * u->factor, u, true), 12.5, 1e-14, name);
    /* the name is spelt alike when parsed again */
    Unit again = parse_ok(name);
    assert_true(again.factor == u->factor && again.offset == u->offset);
}

static void test_each(void **state)
{
    (void)state;
    Seen seen = {0};
    unit_each(visit, &seen);
    static const char *const required[] = {
        "m",     "cm",   "mm",    "km",   "in",    "ft",   "yd",   "mi",   "s",    "min",
        "h",     "kg",   "g",     "lbm",  "slug",  "N",    "kN",   "lbf",  "Pa",   "kPa",
        "MPa",   "bar",  "mbar",  "psi",  "psf",   "ksi",  "atm",  "ftH2O", "inH2O", "mH2O",
        "L",     "mL",   "gal",   "gpm",  "cfs",   "cP",   "P",    "St",   "cSt",  "J",
        "kJ",    "Btu",  "W",     "kW",   "hp",    "K",    "degC", "degF", "degR", "delta_degC",
        "delta_degF", "rad", "deg", "percent", "A", "mol", "cd",   "Hz",
        /* DESIGN 2.9 and issue 12 */
        "psig", "kPag", "barg", "psia", "kPaa", "bara", "MPaa", "l", "lpm", "%", "ppm",
    };
    for (size_t i = 0; i < LEN(required); i++) {
        bool found = false;
        for (size_t j = 0; j < seen.count; j++)
            found = found || strcmp(seen.names[j], required[i]) == 0;
        if (!found)
            fail_msg("unit_each did not visit %s", required[i]);
    }
    assert_int_equal(seen.count, LEN(required));
    /* Every exact name resolves to itself, not to a prefix reading. */
    for (size_t j = 0; j < seen.count; j++) {
        const char *sug = unit_suggest(seen.names[j], strlen(seen.names[j]));
        assert_non_null(sug);
        assert_string_equal(sug, seen.names[j]);
    }
}

/* DESIGN 2.9 and issue 12: units that state a pressure reference, rates
 * and ratios, gradients per hundred lengths, the trade's flow spellings.
 * Factors from the exact definitions (1 lbf = 0.45359237 kg * 9.80665 m/s^2,
 * 1 in = 0.0254 m, 1 ft = 0.3048 m). */
static void test_references_and_rates(void **state)
{
    (void)state;
    const double PSI = 0.45359237 * 9.80665 / (0.0254 * 0.0254);
    static const struct {
        const char *text;
        PressureRef ref;
    } refs[] = {
        {"psig", PRES_GAUGE},    {"kPag", PRES_GAUGE}, {"barg", PRES_GAUGE}, {"psia", PRES_ABSOLUTE},
        {"kPaa", PRES_ABSOLUTE}, {"bara", PRES_ABSOLUTE}, {"MPaa", PRES_ABSOLUTE}, {"psi", PRES_PLAIN},
        {"kPa", PRES_PLAIN},     {"psia/ft", PRES_PLAIN}, /* inside a compound: no reference */
    };
    for (size_t i = 0; i < LEN(refs); i++) {
        Unit u = parse_ok(refs[i].text);
        if (u.pref != refs[i].ref)
            fail_msg("%s: reference %d, want %d", refs[i].text, (int)u.pref, (int)refs[i].ref);
        Quantity q = unit_to_qty(2, &u);
        assert_int_equal(q.pref, refs[i].ref);
    }
    assert_close(parse_ok("psig").factor, PSI, 1e-15, "psig");
    assert_close(parse_ok("psia").factor, PSI, 1e-15, "psia");
    assert_close(parse_ok("MPaa").factor, 1e6, 0, "MPaa");
    assert_close(parse_ok("barg").factor, 1e5, 0, "barg");

    /* qty_to_ref: plain or gauge -> absolute adds the atmosphere, absolute
     * -> gauge takes it away, plain <-> gauge changes nothing. */
    Quantity g = qty(10 * PSI, DIM_PRESSURE);
    g.pref = PRES_GAUGE;
    Quantity a = qty_to_ref(g, PRES_ABSOLUTE, 101325);
    assert_close(a.si, 10 * PSI + 101325, 1e-15, "gauge -> absolute");
    assert_int_equal(a.pref, PRES_ABSOLUTE);
    Quantity back = qty_to_ref(a, PRES_GAUGE, 101325);
    assert_close(back.si, 10 * PSI, 1e-12, "absolute -> gauge");
    Quantity plain = qty_to_ref(g, PRES_PLAIN, 101325);
    assert_true(plain.si == g.si && plain.pref == PRES_PLAIN);
    Quantity len = qty_to_ref(qty(3, DIM_L), PRES_ABSOLUTE, 101325);
    assert_true(len.si == 3 && len.pref == PRES_PLAIN); /* not a pressure: untouched */

    /* rates, ratios and gradients */
    assert_close(parse_ok("%").factor, 0.01, 0, "%");
    assert_true(dim_is_none(parse_ok("%").dim));
    assert_close(parse_ok("ppm").factor, 1e-6, 0, "ppm");
    assert_close(parse_ok("psi/100ft").factor, PSI / (100 * 0.3048), 1e-15, "psi/100ft");
    assert_dim(parse_ok("psi/100ft").dim, dim_div(DIM_PRESSURE, DIM_L), "psi/100ft");
    assert_close(parse_ok("ft/100ft").factor, 0.01, 1e-15, "ft/100ft");
    assert_close(parse_ok("m/100m").factor, 0.01, 1e-15, "m/100m");
    assert_close(parse_ok("kPa/100m").factor, 10, 1e-15, "kPa/100m");
    assert_string_equal(parse_ok("psi/100ft").text, "psi/100ft");
    Unit u;
    assert_int_equal(unit_parse("psi/200ft", 9, &u, NULL, NULL), UNIT_SYNTAX); /* only a hundred */
    assert_int_equal(unit_parse("100", 3, &u, NULL, NULL), UNIT_SYNTAX);

    /* flow as the trade writes it; the litre as l */
    assert_close(parse_ok("lpm").factor, 1e-3 / 60, 1e-15, "lpm");
    assert_close(parse_ok("l/s").factor, 1e-3, 1e-15, "l/s");
    assert_close(parse_ok("ml").factor, 1e-6, 1e-15, "ml");
    assert_close(parse_ok("Btu/h").factor, 1055.05585262 / 3600, 1e-15, "Btu/h");

    /* default display of points */
    assert_string_equal(unit_default_ref(DIM_PRESSURE, TEMP_NONE, PRES_GAUGE, UNITS_US).text, "psig");
    assert_string_equal(unit_default_ref(DIM_PRESSURE, TEMP_NONE, PRES_ABSOLUTE, UNITS_SI).text, "kPaa");
    assert_string_equal(unit_default_ref(DIM_PRESSURE, TEMP_NONE, PRES_PLAIN, UNITS_US).text, "psi");
    assert_string_equal(pressure_ref_name(PRES_ABSOLUTE), "absolute");
    assert_null(pressure_ref_name(PRES_PLAIN));
}

static void test_qty(void **state)
{
    (void)state;
    Quantity q = qty(3.5, DIM_PRESSURE);
    assert_true(q.si == 3.5 && q.temp == TEMP_NONE);
    assert_dim(q.dim, DIM_PRESSURE, "qty");
    Quantity n = qty_number(0.25);
    assert_true(n.si == 0.25 && dim_is_none(n.dim) && n.temp == TEMP_NONE);
}

/* unit_shared: one parsed copy per spelling, the same pointer every time,
 * equal to what unit_parse gives; NULL for what does not parse. */
static void test_shared(void **state)
{
    (void)state;
    const Unit *a = unit_shared("gal/min", 7), *b = unit_shared("gal/min xx", 7);
    assert_non_null(a);
    assert_ptr_equal(a, b);
    Unit u;
    assert_int_equal(unit_parse("gal/min", 7, &u, NULL, NULL), UNIT_OK);
    assert_true(a->factor == u.factor && dim_eq(a->dim, u.dim));
    assert_string_equal(a->text, "gal/min");
    /* 1 gal/min = 231 in^3 / 60 s = 6.30901964e-5 m^3/s (exact definition) */
    assert_close(a->factor, 231 * 0.0254 * 0.0254 * 0.0254 / 60, 1e-12, "gal/min");
    const Unit *ft = unit_shared("ft", 2), *m = unit_shared("m", 1);
    assert_true(ft != m && ft->factor == 0.3048 && m->factor == 1);
    assert_null(unit_shared("furlongz", 8));
    assert_null(unit_shared("ft/", 3));
    /* a point unit keeps its offset and kind */
    const Unit *f = unit_shared("degF", 4);
    assert_true(f->temp == TEMP_ABSOLUTE_OFFSET && fabs(f->offset - 255.3722222222222) < 1e-9);
}

/* unit_intern: equal units give one pointer, different ones differ; the
 * all-zero unit is unit_blank. */
static void test_intern(void **state)
{
    (void)state;
    Unit u1, u2, u3;
    assert_int_equal(unit_parse("psi", 3, &u1, NULL, NULL), UNIT_OK);
    u2 = u1;
    memset(u2.text + strlen(u2.text) + 1, 'x', sizeof u2.text - strlen(u2.text) - 1); /* bytes after the NUL */
    assert_int_equal(unit_parse("psig", 4, &u3, NULL, NULL), UNIT_OK);
    const Unit *p1 = unit_intern(&u1), *p2 = unit_intern(&u2), *p3 = unit_intern(&u3);
    assert_ptr_equal(p1, p2);
    assert_true(p1 != p3 && p3->pref == PRES_GAUGE && p1->pref == PRES_PLAIN);
    assert_string_equal(p1->text, "psi");
    /* the same text standing for another unit is another entry */
    Unit odd = u1;
    odd.factor *= 2;
    const Unit *po = unit_intern(&odd);
    assert_true(po != p1 && po->factor == 2 * p1->factor);
    assert_ptr_equal(unit_intern(&odd), po);
    Unit zero;
    memset(&zero, 0, sizeof zero);
    assert_ptr_equal(unit_intern(&zero), &unit_blank);
}

/* Both memos from two threads at once, as diff evaluates two revisions:
 * every spelling still has one pointer, with the right factor. */
#include <pthread.h>
enum { SHARED_N = 300 };
static const Unit *thread_seen[2][SHARED_N];

static void *shared_worker(void *arg)
{
    int t = (int)(size_t)arg;
    for (int i = 0; i < SHARED_N; i++) {
        int k = t ? SHARED_N - 1 - i : i;
        char s[32];
        int n = snprintf(s, sizeof s, "m^%d", k % 7 + 1);
        n += snprintf(s + n, sizeof s - (size_t)n, "/s^%d", k / 7 + 1);
        thread_seen[t][k] = unit_shared(s, (size_t)n);
        Unit copy = *thread_seen[t][k];
        (void)unit_intern(&copy);
    }
    return NULL;
}

static void test_shared_threads(void **state)
{
    (void)state;
    pthread_t th;
    assert_int_equal(pthread_create(&th, NULL, shared_worker, (void *)(size_t)1), 0);
    shared_worker((void *)(size_t)0);
    pthread_join(th, NULL);
    for (int k = 0; k < SHARED_N; k++) {
        assert_non_null(thread_seen[0][k]);
        assert_ptr_equal(thread_seen[0][k], thread_seen[1][k]);
        assert_true(thread_seen[0][k]->dim.e[DIM_LENGTH] == k % 7 + 1 &&
                    thread_seen[0][k]->dim.e[DIM_TIME] == -(k / 7 + 1));
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_dim_algebra),
        cmocka_unit_test(test_dim_name),
        cmocka_unit_test(test_dim_format_si),
        cmocka_unit_test(test_parse_factors),
        cmocka_unit_test(test_parse_against_sp811),
        cmocka_unit_test(test_prefixes),
        cmocka_unit_test(test_temperature_units),
        cmocka_unit_test(test_temperature_conversions),
        cmocka_unit_test(test_display_text),
        cmocka_unit_test(test_errors),
        cmocka_unit_test(test_suggest),
        cmocka_unit_test(test_defaults),
        cmocka_unit_test(test_each),
        cmocka_unit_test(test_qty),
        cmocka_unit_test(test_references_and_rates),
        cmocka_unit_test(test_shared),
        cmocka_unit_test(test_intern),
        cmocka_unit_test(test_shared_threads),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
