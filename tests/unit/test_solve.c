/* test_solve.c — Brent's method and bracket expansion on functions with
 * known roots, and the specific statuses for the ways a solve can fail. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>

#include "solve.h"

/* Wallis's cubic x^3 - 2x - 5, root 2.0945514815423265 (a classical test
 * equation of root finding; value from memory, verified below by the
 * residual). */
static bool wallis(double x, void *ctx, double *fx)
{
    (void)ctx;
    *fx = x * x * x - 2 * x - 5;
    return true;
}

/* cos x = x, root 0.7390851332151607 (the Dottie number, from memory). */
static bool dottie(double x, void *ctx, double *fx)
{
    (void)ctx;
    *fx = cos(x) - x;
    return true;
}

static bool square_minus(double x, void *ctx, double *fx)
{
    *fx = x * x - *(double *)ctx;
    return true;
}

static bool fails_below_one(double x, void *ctx, double *fx)
{
    (void)ctx;
    if (x < 1)
        return false;
    *fx = log(x) - 1;
    return true;
}

static void test_known_roots(void **state)
{
    (void)state;
    SolveReport r = solve_brent(wallis, NULL, 2, 3, 0);
    assert_int_equal(r.status, SOLVE_OK);
    assert_true(fabs(r.root - 2.0945514815423265) < 4e-16 * 2.1);
    assert_true(fabs(r.residual) < 1e-14);
    assert_true(r.iterations > 0 && r.iterations < 20);

    r = solve_brent(dottie, NULL, 0, 1, 0);
    assert_int_equal(r.status, SOLVE_OK);
    assert_true(fabs(r.root - 0.7390851332151607) < 1e-15);

    double two = 2;
    r = solve_brent(square_minus, &two, 0, 2, 0);
    assert_true(fabs(r.root - sqrt(2.0)) < 1e-15);
}

static void test_root_at_an_end(void **state)
{
    (void)state;
    double four = 4;
    SolveReport r = solve_brent(square_minus, &four, 2, 5, 0);
    assert_int_equal(r.status, SOLVE_OK);
    assert_true(r.root == 2.0);
    assert_true(r.residual == 0.0);
}

static void test_no_bracket(void **state)
{
    (void)state;
    double four = 4;
    SolveReport r = solve_brent(square_minus, &four, 3, 5, 0);
    assert_int_equal(r.status, SOLVE_NO_BRACKET);
    assert_true(fabs(r.f_lo - 5) < 1e-15);  /* 3^2 - 4 */
    assert_true(fabs(r.f_hi - 21) < 1e-15); /* 5^2 - 4 */
}

static void test_not_finite(void **state)
{
    (void)state;
    SolveReport r = solve_brent(fails_below_one, NULL, 0.5, 5, 0);
    assert_int_equal(r.status, SOLVE_NOT_FINITE);
}

static void test_expand(void **state)
{
    (void)state;
    double target = 1e6;
    SolveReport r = solve_expand(square_minus, &target, 1.0, true, 0);
    assert_int_equal(r.status, SOLVE_OK);
    assert_true(fabs(r.root - 1000) < 1e-9);
    r = solve_expand(fails_below_one, NULL, 5.0, true, 0);
    assert_int_equal(r.status, SOLVE_OK);
    assert_true(fabs(r.root - exp(1.0)) < 1e-14);
    double neg = -1; /* x^2 = -1 has no real root */
    r = solve_expand(square_minus, &neg, 1.0, true, 0);
    assert_true(r.status != SOLVE_OK);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_known_roots), cmocka_unit_test(test_root_at_an_end),
        cmocka_unit_test(test_no_bracket),  cmocka_unit_test(test_not_finite),
        cmocka_unit_test(test_expand),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
