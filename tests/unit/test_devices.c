/* test_devices.c — tabulated curves (linear and log-log) and the devices of a
 * line, against values worked by hand: interpolation and extrapolation of
 * small tables, the ISA-75.01 flow-coefficient relation, the PRV and check
 * valve rules, and a pump's head gain. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>

#include "methods/curves.h"
#include "methods/devices.h"

#define NEAR(a, b, tol) assert_true(fabs((a) - (b)) <= (tol))

static const double PSI = 6894.757293168361; /* Pa, NIST SP 811 */
static const double GPM = 3.785411784e-3 / 60.0;

/* Linear: (0, 10), (2, 14), (5, 8). By hand: y(1) = 12; y(3.5) = 14 +
 * 1.5*(8 - 14)/3 = 11; above, y(6) = 8 + 1*(-2) = 6; below, y(-1) = 10 -
 * 2 = 8; the points themselves exactly. */
static void curve_linear(void **state)
{
    (void)state;
    double x[] = {0, 2, 5}, y[] = {10, 14, 8};
    Curve c = {x, y, 3, CURVE_LINEAR};
    size_t bad;
    assert_int_equal(curve_check(&c, &bad), CURVE_OK);
    double s;
    NEAR(curve_eval(&c, 1, &s), 12, 1e-12);
    NEAR(s, 2, 1e-12);
    NEAR(curve_eval(&c, 3.5, &s), 11, 1e-12);
    NEAR(s, -2, 1e-12);
    assert_true(curve_eval(&c, 2, NULL) == 14);
    assert_true(curve_eval(&c, 5, NULL) == 8);
    assert_true(curve_eval(&c, 0, NULL) == 10);
    NEAR(curve_eval(&c, 6, NULL), 6, 1e-12);
    NEAR(curve_eval(&c, -1, NULL), 8, 1e-12);
    assert_int_equal(curve_side(&c, 6), 1);
    assert_int_equal(curve_side(&c, -1), -1);
    assert_int_equal(curve_side(&c, 5), 0);
    assert_int_equal(curve_side(&c, 0), 0);
}

/* Log-log: (10, 2), (40, 32) is y = 2*(x/10)^2, slope m = ln 16/ln 4 = 2.
 * By hand: y(20) = 8, dy/dx = m*y/x = 0.8; extrapolated y(80) = 128 and
 * y(5) = 0.5. Three points (1, 1), (10, 100), (100, 1000): the second
 * interval has m = 1, so y(50) = 500; the first has m = 2, y(2) = 4. */
static void curve_loglog(void **state)
{
    (void)state;
    double x[] = {10, 40}, y[] = {2, 32};
    Curve c = {x, y, 2, CURVE_LOGLOG};
    size_t bad;
    assert_int_equal(curve_check(&c, &bad), CURVE_OK);
    double s;
    NEAR(curve_eval(&c, 20, &s), 8, 1e-12);
    NEAR(s, 0.8, 1e-12);
    NEAR(curve_eval(&c, 80, NULL), 128, 1e-10);
    NEAR(curve_eval(&c, 5, NULL), 0.5, 1e-12);
    assert_true(isnan(curve_eval(&c, 0, NULL)));
    double x3[] = {1, 10, 100}, y3[] = {1, 100, 1000};
    Curve c3 = {x3, y3, 3, CURVE_LOGLOG};
    NEAR(curve_eval(&c3, 50, NULL), 500, 1e-9);
    NEAR(curve_eval(&c3, 2, NULL), 4, 1e-12);
    assert_true(curve_eval(&c3, 100, NULL) == 1000);
}

static void curve_errors(void **state)
{
    (void)state;
    size_t bad;
    double x[] = {0, 2, 2, 3}, y[] = {1, 2, 3, 4};
    Curve c = {x, y, 4, CURVE_LINEAR};
    assert_int_equal(curve_check(&c, &bad), CURVE_NOT_INCREASING);
    assert_int_equal(bad, 2);
    double xd[] = {0, 2, 1};
    Curve cd = {xd, y, 3, CURVE_LINEAR};
    assert_int_equal(curve_check(&cd, &bad), CURVE_NOT_INCREASING);
    assert_int_equal(bad, 2);
    double xl[] = {0, 1, 2};
    Curve cl = {xl, y, 3, CURVE_LOGLOG};
    assert_int_equal(curve_check(&cl, &bad), CURVE_NOT_POSITIVE);
    assert_int_equal(bad, 0);
    Curve c1 = {x, y, 1, CURVE_LINEAR};
    assert_int_equal(curve_check(&c1, &bad), CURVE_TOO_FEW);
    double xn[] = {0, NAN};
    Curve cn = {xn, y, 2, CURVE_LINEAR};
    assert_int_equal(curve_check(&cn, &bad), CURVE_NOT_FINITE);
    assert_int_equal(bad, 1);
}

/* ISA-75.01 by hand: Cv 20 at 10 gal/min, SG 1: Delta_p = (10/20)^2 psi =
 * 0.25 psi = 1723.689 Pa; SG 0.98: 0.245 psi. Kv 10 at 5 m^3/h: 0.25 bar =
 * 25 kPa. Kv/Cv = 0.865 (ISA-75.01.01 Table 1, N1 = 0.865 for Cv with Q in
 * m^3/h and Delta_p in bar). */
static void flow_coefficients(void **state)
{
    (void)state;
    double c = device_coeff_from_cv(20);
    NEAR(device_coeff_dp(c, 999.0, 999.0, 10 * GPM), 0.25 * PSI, 1e-9);
    NEAR(device_coeff_dp(c, 1000.0, 980.0, 10 * GPM), 0.245 * PSI, 1e-9);
    NEAR(device_coeff_dp(c, 999.0, 999.0, -10 * GPM), -0.25 * PSI, 1e-9);
    double k = device_coeff_from_kv(10);
    NEAR(device_coeff_dp(k, 998.0, 998.0, 5.0 / 3600), 25000, 1e-7);
    NEAR(device_coeff_from_kv(1) / device_coeff_from_cv(1), 1 / 0.865, 0.0006);
    /* the reference densities: python3-iapws IAPWS97 at 101.325 kPa gives
     * 999.0156 kg/m^3 at 60 degF and 999.1011 at 15 degC */
    NEAR(device_rho_ref_cv(), 999.0156, 0.001);
    NEAR(device_rho_ref_kv(), 999.1011, 0.001);

    Device d = {.kind = DEVICE_FLOW_COEFF, .coeff = c, .rho_ref = 999.0};
    double p_out, dp, s;
    DeviceStatus st;
    assert_int_equal(device_apply(&d, 10 * GPM, 500000, 999.0, &p_out), DEVICE_OK);
    NEAR(p_out, 500000 - 0.25 * PSI, 1e-7);
    assert_true(device_loss(&d, 10 * GPM, 999.0, &dp, &s, &st));
    double h = 1e-3 * GPM, dp1, dp2;
    device_loss(&d, 10 * GPM + h, 999.0, &dp1, NULL, &st);
    device_loss(&d, 10 * GPM - h, 999.0, &dp2, NULL, &st);
    NEAR(s, (dp1 - dp2) / (2 * h), 1e-6 * fabs(s));
}

/* PRV set 350 kPa, fall-off 20 kPa, least drop 35 kPa: from 568.5 kPa it
 * holds 330 kPa; from 300 kPa it cannot (300 - 35 = 265 < 330): 265 kPa,
 * not regulating. At exactly 365 kPa in it still holds 330 kPa. */
static void prv_rule(void **state)
{
    (void)state;
    Device d = {.kind = DEVICE_PRV, .set = 350e3, .falloff = 20e3, .dp_min = 35e3};
    double p;
    assert_int_equal(device_apply(&d, 1e-3, 568.5e3, 998, &p), DEVICE_OK);
    NEAR(p, 330e3, 1e-9);
    assert_int_equal(device_apply(&d, 1e-3, 365e3, 998, &p), DEVICE_OK);
    NEAR(p, 330e3, 1e-9);
    assert_int_equal(device_apply(&d, 1e-3, 300e3, 998, &p), DEVICE_NOT_REGULATING);
    NEAR(p, 265e3, 1e-9);
    double dp, s;
    DeviceStatus st;
    assert_false(device_loss(&d, 1e-3, 998, &dp, &s, &st));
}

/* Check valve, cracking 3 kPa and Cv 10: at 10 gal/min, SG 1, 3 kPa + 1 psi;
 * reverse flow closes it. */
static void check_valve_rule(void **state)
{
    (void)state;
    Device d = {.kind = DEVICE_CHECK_VALVE, .cracking = 3000, .coeff = device_coeff_from_cv(10), .rho_ref = 999};
    double p;
    assert_int_equal(device_apply(&d, 10 * GPM, 400e3, 999, &p), DEVICE_OK);
    NEAR(p, 400e3 - 3000 - PSI, 1e-7);
    assert_int_equal(device_apply(&d, -1e-4, 400e3, 999, &p), DEVICE_CLOSED);
    NEAR(p, 400e3, 1e-9);
    Device open = {.kind = DEVICE_CHECK_VALVE};
    assert_int_equal(device_apply(&open, 1e-3, 400e3, 999, &p), DEVICE_OK);
    NEAR(p, 400e3, 1e-9);
}

/* A pump H = 40 m - 1e4 m/(m^3/s)^2 * Q^2 at 0.01 m^3/s: 39 m, so the
 * static pressure rises by rho*g*39 m; a head curve (0, 40 m), (0.02, 36 m)
 * gives 38 m at 0.01 m^3/s; a loss curve in Pa reads directly. */
static void head_and_loss(void **state)
{
    (void)state;
    PumpCurve pc = {40, 0, -1e4, 0, 0.02};
    Device d = {.kind = DEVICE_PUMP, .pump = &pc};
    double p;
    assert_int_equal(device_apply(&d, 0.01, 100e3, 998, &p), DEVICE_OK);
    NEAR(p, 100e3 + 998 * 9.80665 * 39, 1e-7);
    double qx[] = {0, 0.02}, hy[] = {40, 36};
    Curve hc = {qx, hy, 2, CURVE_LINEAR};
    Device dh = {.kind = DEVICE_HEAD_CURVE, .curve = &hc};
    assert_int_equal(device_apply(&dh, 0.01, 100e3, 998, &p), DEVICE_OK);
    NEAR(p, 100e3 + 998 * 9.80665 * 38, 1e-7);
    double lq[] = {0.001, 0.004}, ly[] = {10e3, 40e3};
    Curve lc = {lq, ly, 2, CURVE_LINEAR};
    Device dl = {.kind = DEVICE_LOSS_CURVE, .curve = &lc};
    assert_int_equal(device_apply(&dl, 0.002, 300e3, 998, &p), DEVICE_OK);
    NEAR(p, 280e3, 1e-7);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(curve_linear),     cmocka_unit_test(curve_loglog),     cmocka_unit_test(curve_errors),
        cmocka_unit_test(flow_coefficients), cmocka_unit_test(prv_rule),        cmocka_unit_test(check_valve_rule),
        cmocka_unit_test(head_and_loss),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
