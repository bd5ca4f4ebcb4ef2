/* test_demand.c — fixture loads, the demand table engine, the peak demand
 * model (src/methods/demand.c).
 *
 * Every shipped load row is checked against its published source, named
 * beside the check: International Plumbing Code, 2018 edition (ICC),
 * Appendix E, Table E103.3(2), "Load values assigned to fixtures", read
 * from a published copy of that page. The demand table engine is checked on
 * a small table worked by hand (no code's demand table is shipped: see
 * demand.c). The binomial model is checked on cases worked by hand here and
 * against python3-scipy in tests/ref/demand-scipy.sh. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>

#include <math.h>
#include <string.h>

#include "methods/demand.h"

static void assert_near(double got, double want, double tol)
{
    if (!(fabs(got - want) <= tol))
        fail_msg("got %.15g, want %.15g (tolerance %.3g)", got, want, tol);
}

/* One row as the published table prints it; NAN for its dash. */
typedef struct Published {
    const char *kind;
    FixtureUse use;
    const char *occupancy, *control;
    double cold, hot, total;
} Published;

/* IPC 2018, Appendix E, Table E103.3(2) — every row this program ships,
 * typed from the published copy of the table (not from demand.c). */
static const Published IPC2018_E103_3_2[] = {
    {"bathroom group flush tank", FIXTURE_PRIVATE, "Private", "Flush tank", 2.7, 1.5, 3.6},
    {"bathroom group flush valve", FIXTURE_PRIVATE, "Private", "Flushometer valve", 6.0, 3.0, 8.0},
    {"bathtub", FIXTURE_PRIVATE, "Private", "Faucet", 1.0, 1.0, 1.4},
    {"bathtub", FIXTURE_PUBLIC, "Public", "Faucet", 3.0, 3.0, 4.0},
    {"bidet", FIXTURE_PRIVATE, "Private", "Faucet", 1.5, 1.5, 2.0},
    {"combination fixture", FIXTURE_PRIVATE, "Private", "Faucet", 2.25, 2.25, 3.0},
    {"dishwashing machine", FIXTURE_PRIVATE, "Private", "Automatic", NAN, 1.4, 1.4},
    {"drinking fountain", FIXTURE_PUBLIC, "Offices, etc.", "3/8 in valve", 0.25, NAN, 0.25},
    {"kitchen sink", FIXTURE_PRIVATE, "Private", "Faucet", 1.0, 1.0, 1.4},
    {"kitchen sink", FIXTURE_PUBLIC, "Hotel, restaurant", "Faucet", 3.0, 3.0, 4.0},
    {"laundry trays", FIXTURE_PRIVATE, "Private", "Faucet", 1.0, 1.0, 1.4},
    {"lavatory", FIXTURE_PRIVATE, "Private", "Faucet", 0.5, 0.5, 0.7},
    {"lavatory", FIXTURE_PUBLIC, "Public", "Faucet", 1.5, 1.5, 2.0},
    {"service sink", FIXTURE_PUBLIC, "Offices, etc.", "Faucet", 2.25, 2.25, 3.0},
};

static void same_or_dash(double got, double want)
{
    if (isnan(want))
        assert_true(isnan(got));
    else
        assert_near(got, want, 0);
}

/* Source: IPC 2018, Appendix E, Table E103.3(2), row by row; and nothing
 * shipped that the source does not print. */
static void test_loads_ipc2018_table_e103_3_2(void **state)
{
    (void)state;
    const PlumbingCode *c = plumbing_code_find("IPC 2018");
    assert_non_null(c);
    assert_ptr_equal(c, plumbing_code_default());
    size_t n = sizeof IPC2018_E103_3_2 / sizeof IPC2018_E103_3_2[0];
    assert_int_equal(c->nloads, n);
    for (size_t i = 0; i < n; i++) {
        const Published *p = &IPC2018_E103_3_2[i];
        const FixtureLoadRow *r = NULL;
        assert_int_equal(fixture_load_find(c, p->kind, p->use, &r), LOAD_OK);
        assert_string_equal(r->kind, p->kind);
        assert_string_equal(r->occupancy, p->occupancy);
        assert_string_equal(r->control, p->control);
        same_or_dash(r->cold, p->cold);
        same_or_dash(r->hot, p->hot);
        same_or_dash(r->total, p->total);
        /* a dash is no connection: zero load on that side */
        assert_near(fixture_load_value(r, WATER_COLD), isnan(p->cold) ? 0 : p->cold, 0);
        assert_near(fixture_load_value(r, WATER_HOT), isnan(p->hot) ? 0 : p->hot, 0);
        assert_near(fixture_load_value(r, WATER_TOTAL), p->total, 0);
    }
    assert_string_equal(c->load_table, "Appendix E, Table E103.3(2), Load values assigned to fixtures");
}

static void test_load_lookup(void **state)
{
    (void)state;
    const PlumbingCode *c = plumbing_code_default();
    const FixtureLoadRow *r = NULL;
    /* without use=: the private row where there is one, else the only row */
    assert_int_equal(fixture_load_find(c, "Lavatory", FIXTURE_USE_ANY, &r), LOAD_OK);
    assert_int_equal(r->use, FIXTURE_PRIVATE);
    assert_int_equal(fixture_load_find(c, "service  sink", FIXTURE_USE_ANY, &r), LOAD_OK);
    assert_int_equal(r->use, FIXTURE_PUBLIC);
    assert_int_equal(fixture_load_find(c, "dishwasher", FIXTURE_USE_ANY, &r), LOAD_OK);
    assert_string_equal(r->kind, "dishwashing machine");
    assert_int_equal(fixture_load_find(c, "drinking fountain", FIXTURE_PRIVATE, &r), LOAD_NO_USE);
    assert_int_equal(fixture_load_find(c, "shower", FIXTURE_USE_ANY, &r), LOAD_NOT_SHIPPED);
    assert_int_equal(fixture_load_find(c, "water closet tank", FIXTURE_USE_ANY, &r), LOAD_NOT_SHIPPED);
    assert_int_equal(fixture_load_find(c, "garbage disposer", FIXTURE_USE_ANY, &r), LOAD_UNKNOWN_KIND);
    assert_string_equal(fixture_kind_nearest(c, "lavatry"), "lavatory");
    assert_string_equal(fixture_kind_nearest(c, "kitchen snk"), "kitchen sink");
    assert_null(fixture_kind_nearest(c, "xyz"));
    assert_null(plumbing_code_find("UPC 2021"));
    assert_non_null(plumbing_code_find("2018 IPC"));
    /* no demand table is shipped for IPC 2018: none could be verified */
    assert_null(c->demand);
    assert_non_null(c->why_no_demand);
    double gpm;
    size_t lo, hi;
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 10, &gpm, &lo, &hi),
                     DEMAND_NO_TABLE);
}

/* Illinois Plumbing Code, 77 Ill. Adm. Code 890, Appendix A, Table N, "Water
 * Supply Fixture Units (WSFU) for a Supply System with Flush Tanks Water
 * Closets", the WSFU and Demand (GPM) columns, row by row as the Joint
 * Committee on Administrative Rules publishes Section 890.TABLE N
 * (ilga.gov). */
static const double IL_TABLE_N[][2] = {
    {2, 2},       {4, 3},       {6, 5},       {8, 6.5},     {10, 8},      {12, 9.2},    {14, 10.4},
    {16, 11.6},   {20, 14},     {25, 17},     {30, 20},     {35, 22.5},   {40, 25},     {45, 27},
    {50, 29},     {60, 32},     {70, 35},     {80, 38},     {90, 41},     {100, 43.5},  {120, 48},
    {140, 52.5},  {160, 57},    {180, 61},    {200, 65},    {225, 70},    {250, 75},    {275, 80},
    {300, 85},    {350, 95},    {400, 105},   {450, 115},   {500, 125},   {600, 145},   {750, 170},
    {1000, 208},  {1250, 240},  {1500, 267},  {1750, 294},  {2000, 320},
};

static void test_demand_illinois_table_n(void **state)
{
    (void)state;
    const PlumbingCode *c = plumbing_code_find("Illinois 2014");
    assert_non_null(c);
    assert_ptr_equal(c, plumbing_code_find("77 Ill. Adm. Code 890"));
    assert_ptr_equal(c, plumbing_code_find("illinois plumbing code"));
    size_t n = sizeof IL_TABLE_N / sizeof IL_TABLE_N[0];
    assert_int_equal(c->ndemand, n);
    double q;
    size_t lo, hi;
    for (size_t i = 0; i < n; i++) {
        /* every row as printed, and no flush valve column */
        assert_true(c->demand[i].load == IL_TABLE_N[i][0]);
        assert_true(c->demand[i].q_tank == IL_TABLE_N[i][1]);
        assert_true(isnan(c->demand[i].q_valve));
        assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, IL_TABLE_N[i][0], &q, &lo, &hi),
                         DEMAND_OK);
        assert_true(q == IL_TABLE_N[i][1] && lo == i && hi == i);
    }
    /* between rows, by hand: 3 wsfu, 2 + (3 - 2)*(3 - 2)/(4 - 2) = 2.5 gal/min;
     * 17 wsfu, 11.6 + (14 - 11.6)*(17 - 16)/(20 - 16) = 12.2; 110 wsfu,
     * 43.5 + (48 - 43.5)*(110 - 100)/(120 - 100) = 45.75; 1900 wsfu,
     * 294 + (320 - 294)*(1900 - 1750)/(2000 - 1750) = 309.6 */
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 3, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 2.5, 1e-12);
    assert_true(lo == 0 && hi == 1);
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 17, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 12.2, 1e-12);
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 110, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 45.75, 1e-12);
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 1900, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 309.6, 1e-12);
    /* outside the table, and the column it does not have, refused */
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 1.5, &q, &lo, &hi), DEMAND_BELOW);
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_TANK, 2001, &q, &lo, &hi), DEMAND_ABOVE);
    assert_int_equal(demand_interpolate(c->demand, c->ndemand, SYSTEM_FLUSH_VALVE, 100, &q, &lo, &hi),
                     DEMAND_NO_TABLE);
    assert_non_null(c->why_no_valve);
    /* no load table: every kind is refused as a table not shipped */
    const FixtureLoadRow *r;
    assert_null(c->loads);
    assert_non_null(c->why_no_loads);
    assert_int_equal(fixture_load_find(c, "lavatory", FIXTURE_USE_ANY, &r), LOAD_NO_TABLE);
}

/* A demand table worked by hand (test data, not a code's table): rows
 * 2, 4, 10 with flush-tank 5, 8, 14 and flush-valve blank, 20, 30. */
static const DemandRow HAND[] = {{2, 5, NAN}, {4, 8, 20}, {10, 14, 30}};

static void test_interpolation_by_hand(void **state)
{
    (void)state;
    double q;
    size_t lo, hi;
    /* on a row */
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 4, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 8, 0);
    assert_true(lo == 1 && hi == 1);
    /* 3 wsfu: 5 + (8 - 5)*(3 - 2)/(4 - 2) = 6.5 */
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 3, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 6.5, 1e-12);
    assert_true(lo == 0 && hi == 1);
    /* 7 wsfu: 8 + (14 - 8)*(7 - 4)/(10 - 4) = 11 */
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 7, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 11, 1e-12);
    /* flush valves: 5.5 wsfu: 20 + (30 - 20)*(5.5 - 4)/(10 - 4) = 22.5 */
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_VALVE, 5.5, &q, &lo, &hi), DEMAND_OK);
    assert_near(q, 22.5, 1e-12);
    assert_true(lo == 1 && hi == 2);
    /* outside: the flush-valve column starts at 4, not 2 */
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_VALVE, 3, &q, &lo, &hi), DEMAND_BELOW);
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 1.99, &q, &lo, &hi), DEMAND_BELOW);
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 10.01, &q, &lo, &hi), DEMAND_ABOVE);
    assert_int_equal(demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, NAN, &q, &lo, &hi), DEMAND_BAD_LOAD);
    double first, last;
    assert_true(demand_column_range(HAND, 3, SYSTEM_FLUSH_VALVE, &first, &last));
    assert_near(first, 4, 0);
    assert_near(last, 10, 0);
    /* loads are summed, then converted: 3 + 4 = 7 wsfu gives 11, while the
     * flows of 3 and 4 wsfu summed would give 6.5 + 8 = 14.5 */
    double q3, q4, q7;
    demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 3, &q3, &lo, &hi);
    demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 4, &q4, &lo, &hi);
    demand_interpolate(HAND, 3, SYSTEM_FLUSH_TANK, 7, &q7, &lo, &hi);
    assert_near(q7, 11, 1e-12);
    assert_near(q3 + q4, 14.5, 1e-12);
}

/* Worked by hand. One fixture, p = 0.1, q = 4: P(0) = 0.9 < 0.99, so the
 * 99th percentile is 4; the 80th is 0. Two fixtures, p = 0.5, q = 1 and 2:
 * flows 0, 1, 2, 3 each 1/4; cumulative 0.25, 0.5, 0.75, 1: the 60th
 * percentile is 2, the 75th exactly 2 (cumulative reaches 0.75 there). */
static void test_peak_exact_by_hand(void **state)
{
    (void)state;
    double y;
    FixtureGroup one = {1, 0.1, 4};
    assert_int_equal(peak_exact(&one, 1, 0.99, &y), PEAK_OK);
    assert_near(y, 4, 0);
    assert_int_equal(peak_exact(&one, 1, 0.80, &y), PEAK_OK);
    assert_near(y, 0, 0);
    FixtureGroup two[] = {{1, 0.5, 1}, {1, 0.5, 2}};
    assert_int_equal(peak_exact(two, 2, 0.60, &y), PEAK_OK);
    assert_near(y, 2, 0);
    assert_int_equal(peak_exact(two, 2, 0.75, &y), PEAK_OK);
    assert_near(y, 2, 0);
    assert_int_equal(peak_exact(two, 2, 0.76, &y), PEAK_OK);
    assert_near(y, 3, 0);
    /* 3 fixtures, p = 0.2, q = 1: P(<=1) = 0.8^3 + 3*0.2*0.8^2 = 0.896,
     * P(<=2) = 0.992: the 99th percentile is 2 */
    FixtureGroup three = {3, 0.2, 1};
    assert_int_equal(peak_exact(&three, 1, 0.99, &y), PEAK_OK);
    assert_near(y, 2, 0);
    FixtureGroup bad = {2.5, 0.2, 1};
    assert_int_equal(peak_exact(&bad, 1, 0.99, &y), PEAK_BAD_INPUT);
    FixtureGroup badp = {2, 1.2, 1};
    assert_int_equal(peak_exact(&badp, 1, 0.99, &y), PEAK_BAD_INPUT);
    assert_int_equal(peak_exact(&three, 1, 1.0, &y), PEAK_BAD_INPUT);
    FixtureGroup huge[] = {{1000, 0.1, 1}, {1000, 0.1, 2}};
    assert_int_equal(peak_exact(huge, 2, 0.99, &y), PEAK_TOO_MANY_STATES);
}

/* Normal approximation by hand: 100 fixtures, p = 0.05, q = 2: mean
 * 100*0.05*2 = 10, variance 100*0.05*0.95*4 = 19; at the 99th percentile
 * z = 2.326347874040841 (the standard normal quantile, from memory), so
 * y = 10 + 2.326347874040841*sqrt(19). */
static void test_peak_normal_by_hand(void **state)
{
    (void)state;
    assert_near(normal_quantile(0.99), 2.326347874040841, 1e-12);
    assert_near(normal_quantile(0.5), 0, 1e-15);
    assert_near(normal_quantile(0.975), 1.959963984540054, 1e-12);
    double y;
    FixtureGroup g = {100, 0.05, 2};
    assert_int_equal(peak_normal(&g, 1, 0.99, &y), PEAK_OK);
    assert_near(y, 10 + 2.326347874040841 * sqrt(19.0), 1e-11);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_loads_ipc2018_table_e103_3_2),
        cmocka_unit_test(test_load_lookup),
        cmocka_unit_test(test_demand_illinois_table_n),
        cmocka_unit_test(test_interpolation_by_hand),
        cmocka_unit_test(test_peak_exact_by_hand),
        cmocka_unit_test(test_peak_normal_by_hand),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
