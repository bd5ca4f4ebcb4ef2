/* test_gradient.c — the global gradient solver (methods/gradient.c) on
 * small networks whose answers are worked by hand, with loss laws chosen so
 * the arithmetic is exact: h = r*Q*|Q| per link (a pump link subtracts
 * a + c*Q^2). Each case asserts the flows and heads to 1e-9 and that the
 * solver's own record (iterations, imbalance) is consistent. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>

#include "methods/gradient.h"

typedef struct Laws {
    double r[8];          /* h = r*Q*|Q| */
    double pump_a[8];     /* pump shutoff head, 0 when none */
    double pump_c[8];     /* pump curve curvature (negative) */
} Laws;

static bool quad_loss(void *ctx, size_t l, double Q, double *h, double *d)
{
    const Laws *w = ctx;
    *h = w->r[l] * Q * fabs(Q);
    *d = 2 * w->r[l] * fabs(Q);
    if (w->pump_a[l] != 0) {
        double q = Q > 0 ? Q : 0;
        *h -= w->pump_a[l] + w->pump_c[l] * q * q;
        *d -= 2 * w->pump_c[l] * q;
    }
    return true;
}

typedef struct Net {
    GradientNetwork n;
    size_t from[8], to[8];
    bool fixed[8];
    double demand[8], set_head[8], min_drop[8];
    GradientLinkKind kind[8];
    double H[8], Q[8], drop[8];
    GradientLinkState state[8];
    GradientResult res;
    Laws laws;
} Net;

static void net_init(Net *t, size_t nn, size_t nl)
{
    memset(t, 0, sizeof *t);
    t->n = (GradientNetwork){nn, nl, t->from, t->to, t->fixed, t->demand, t->kind, t->set_head, t->min_drop,
                             quad_loss, &t->laws, 1e-12, 100};
    for (size_t l = 0; l < nl; l++)
        t->Q[l] = 0.5;
}

static void net_link(Net *t, size_t l, size_t a, size_t b, double r)
{
    t->from[l] = a;
    t->to[l] = b;
    t->laws.r[l] = r;
}

static GradientStatus net_solve(Net *t)
{
    return gradient_solve(&t->n, t->H, t->Q, t->state, t->drop, &t->res);
}

/* R (H = 10) -> A (q = 1) -> B (q = 1): Q0 = 2, Q1 = 1;
 * H_A = 10 - 2*2^2 = 2, H_B = 2 - 3*1^2 = -1. */
static void test_series(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 3, 2);
    t.fixed[0] = true;
    t.H[0] = 10;
    t.demand[1] = t.demand[2] = 1;
    net_link(&t, 0, 0, 1, 2);
    net_link(&t, 1, 1, 2, 3);
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_true(fabs(t.Q[0] - 2) < 1e-9 && fabs(t.Q[1] - 1) < 1e-9);
    assert_true(fabs(t.H[1] - 2) < 1e-9 && fabs(t.H[2] + 1) < 1e-9);
    assert_true(t.res.imbalance < 1e-12);
    assert_true(t.res.iterations >= 2 && t.res.iterations < 40);
}

/* A link drawn against the flow carries a negative flow. R (H = 5) joined
 * to A (q = 1) by a link from A to R with r = 1: Q = -1, H_A = 5 - 1 = 4. */
static void test_reversed_link(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 2, 1);
    t.fixed[0] = true;
    t.H[0] = 5;
    t.demand[1] = 1;
    net_link(&t, 0, 1, 0, 1);
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_true(fabs(t.Q[0] + 1) < 1e-9);
    assert_true(fabs(t.H[1] - 4) < 1e-9);
}

/* Two equal parallel links share the flow: R (H = 10) to A (q = 2) twice
 * with r = 1: Q = 1 each, H_A = 9. A third node hangs off A in a loop
 * with a supply on each side: R1 (H = 10) -> A <- R2 (H = 10), A q = 2, r = 2
 * each: Q = 1 each, H_A = 10 - 2 = 8. */
static void test_parallel_and_two_supplies(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 2, 2);
    t.fixed[0] = true;
    t.H[0] = 10;
    t.demand[1] = 2;
    net_link(&t, 0, 0, 1, 1);
    net_link(&t, 1, 0, 1, 1);
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_true(fabs(t.Q[0] - 1) < 1e-9 && fabs(t.Q[1] - 1) < 1e-9 && fabs(t.H[1] - 9) < 1e-9);

    net_init(&t, 3, 2);
    t.fixed[0] = t.fixed[2] = true;
    t.H[0] = t.H[2] = 10;
    t.demand[1] = 2;
    net_link(&t, 0, 0, 1, 2);
    net_link(&t, 1, 2, 1, 2);
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_true(fabs(t.Q[0] - 1) < 1e-9 && fabs(t.Q[1] - 1) < 1e-9 && fabs(t.H[1] - 8) < 1e-9);
}

/* A loop whose answer is not symmetric: every equation must hold. */
static void test_loop_equations_hold(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 4, 5);
    t.fixed[0] = true;
    t.H[0] = 50;
    t.demand[1] = 1.5;
    t.demand[2] = 0.7;
    t.demand[3] = 2.2;
    net_link(&t, 0, 0, 1, 1.0);
    net_link(&t, 1, 1, 2, 2.5);
    net_link(&t, 2, 2, 3, 0.8);
    net_link(&t, 3, 1, 3, 4.0);
    net_link(&t, 4, 0, 2, 3.0);
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    for (size_t l = 0; l < 5; l++) {
        double h, d;
        quad_loss(&t.laws, l, t.Q[l], &h, &d);
        assert_true(fabs(t.H[t.from[l]] - t.H[t.to[l]] - h) < 1e-9);
    }
    double in[4] = {0};
    for (size_t l = 0; l < 5; l++) {
        in[t.to[l]] += t.Q[l];
        in[t.from[l]] -= t.Q[l];
    }
    for (size_t i = 1; i < 4; i++)
        assert_true(fabs(in[i] - t.demand[i]) < 1e-12);
    assert_true(t.res.energy_residual < 1e-9);
}

/* A check valve from A to a higher supply B would run backwards: it closes
 * with no flow, and A is fed from R alone. R (H = 10) -> A (q = 1), r = 1:
 * H_A = 9; B (H = 20), link A -> B one-way: closed. */
static void test_check_valve_closes(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 3, 2);
    t.fixed[0] = t.fixed[2] = true;
    t.H[0] = 10;
    t.H[2] = 20;
    t.demand[1] = 1;
    net_link(&t, 0, 0, 1, 1);
    net_link(&t, 1, 1, 2, 1);
    t.kind[1] = GRADIENT_LINK_ONE_WAY;
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_int_equal(t.state[1], GRADIENT_STATE_CLOSED);
    assert_true(t.Q[1] == 0);
    assert_true(fabs(t.Q[0] - 1) < 1e-9 && fabs(t.H[1] - 9) < 1e-9);
}

/* A pump lifts from a sump at H = 0 to A (q = 1): the link loss is
 * Q^2 - (10 - Q^2), so H_A = 0 - (1 - 10 + 1) = 8. */
static void test_pump(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 2, 1);
    t.fixed[0] = true;
    t.demand[1] = 1;
    net_link(&t, 0, 0, 1, 1);
    t.laws.pump_a[0] = 10;
    t.laws.pump_c[0] = -1;
    t.kind[0] = GRADIENT_LINK_ONE_WAY;
    assert_int_equal(net_solve(&t), GRADIENT_OK);
    assert_true(fabs(t.Q[0] - 1) < 1e-9 && fabs(t.H[1] - 8) < 1e-9);
}

/* A pressure-reducing link holds its outlet at the set head while the
 * inlet is high enough: R (H = 100) -> A -> PRV -> B (q = 2), r = 1 each.
 * Q = 2; H_A = 96; H_B = 50; the valve takes 96 - 4 - 50 = 42. With the
 * setting above what the inlet can give (99), it opens wide and takes only
 * its least drop (0.5): H_B = 96 - 4 - 0.5 = 91.5. */
static void test_prv(void **state)
{
    (void)state;
    for (int wide = 0; wide < 2; wide++) {
        Net t;
        net_init(&t, 3, 2);
        t.fixed[0] = true;
        t.H[0] = 100;
        t.demand[2] = 2;
        net_link(&t, 0, 0, 1, 1);
        net_link(&t, 1, 1, 2, 1);
        t.kind[1] = GRADIENT_LINK_PRV;
        t.set_head[1] = wide ? 99 : 50;
        t.min_drop[1] = 0.5;
        assert_int_equal(net_solve(&t), GRADIENT_OK);
        assert_true(fabs(t.Q[0] - 2) < 1e-9 && fabs(t.Q[1] - 2) < 1e-9);
        assert_true(fabs(t.H[1] - 96) < 1e-9);
        if (wide) {
            assert_int_equal(t.state[1], GRADIENT_STATE_WIDE_OPEN);
            assert_true(fabs(t.H[2] - 91.5) < 1e-9 && fabs(t.drop[1] - 0.5) < 1e-12);
        } else {
            assert_int_equal(t.state[1], GRADIENT_STATE_ACTIVE);
            assert_true(fabs(t.H[2] - 50) < 1e-9 && fabs(t.drop[1] - 42) < 1e-9);
        }
    }
}

/* A junction whose only link is a check valve pointing at it from the
 * wrong side cannot be supplied: no convergence, named at that node. */
static void test_unsupplied_junction(void **state)
{
    (void)state;
    Net t;
    net_init(&t, 3, 2);
    t.fixed[0] = true;
    t.H[0] = 10;
    t.demand[1] = 1;
    t.demand[2] = 1;
    net_link(&t, 0, 0, 1, 1);
    net_link(&t, 1, 2, 1, 1);
    t.kind[1] = GRADIENT_LINK_ONE_WAY;
    t.n.max_iter = 30;
    assert_int_equal(net_solve(&t), GRADIENT_NO_CONVERGENCE);
    assert_int_equal(t.res.imbalance_node, 2);
    assert_true(fabs(t.res.imbalance - 1) < 1e-9);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_series),
        cmocka_unit_test(test_reversed_link),
        cmocka_unit_test(test_parallel_and_two_supplies),
        cmocka_unit_test(test_loop_equations_hold),
        cmocka_unit_test(test_check_valve_closes),
        cmocka_unit_test(test_pump),
        cmocka_unit_test(test_prv),
        cmocka_unit_test(test_unsupplied_junction),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
