/* test_parse.c — statements and expression trees: precedence, statement
 * forms, descriptions and citations, and syntax errors with positions. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "parse.h"

static Arena arena;
static DiagList dl;

static Stmt *parse(const char *line)
{
    diag_free(&dl);
    Pos p = {"t", 3, 1};
    return parse_statement(&arena, line, strlen(line), p, &dl);
}

/* The tree in prefix form, to assert structure compactly. */
static void shape(const Expr *e, char *buf, size_t n)
{
    size_t len = strlen(buf);
    switch (e->kind) {
    case EXPR_NUMBER:
    case EXPR_NAME:
        snprintf(buf + len, n - len, "%s", e->text);
        return;
    case EXPR_STRING:
        snprintf(buf + len, n - len, "\"%s\"", e->text);
        return;
    case EXPR_PAREN:
        shape(e->lhs, buf, n);
        return;
    case EXPR_NEG:
        snprintf(buf + len, n - len, "(neg ");
        shape(e->lhs, buf, n);
        break;
    case EXPR_FIELD:
        snprintf(buf + len, n - len, "(. ");
        shape(e->lhs, buf, n);
        len = strlen(buf);
        snprintf(buf + len, n - len, " %s", e->text);
        break;
    case EXPR_BINARY:
        snprintf(buf + len, n - len, "(%c ", "+-*/^"[e->op]);
        shape(e->lhs, buf, n);
        len = strlen(buf);
        snprintf(buf + len, n - len, " ");
        shape(e->rhs, buf, n);
        break;
    case EXPR_CALL:
        snprintf(buf + len, n - len, "(%s", e->text);
        for (size_t i = 0; i < e->call->nargs; i++) {
            len = strlen(buf);
            snprintf(buf + len, n - len, " ");
            shape(e->call->args[i], buf, n);
        }
        for (size_t i = 0; i < e->call->nkw; i++) {
            len = strlen(buf);
            snprintf(buf + len, n - len, " %s=", e->call->kw_names[i]);
            shape(e->call->kw[i], buf, n);
        }
        break;
    }
    len = strlen(buf);
    snprintf(buf + len, n - len, ")");
}

static void assert_shape(const char *line, const char *want)
{
    Stmt *s = parse(line);
    assert_non_null(s);
    assert_int_equal(dl.errors, 0);
    assert_false(s->parse_failed);
    char buf[512] = "";
    shape(s->expr, buf, sizeof buf);
    assert_string_equal(buf, want);
}

static void test_precedence(void **state)
{
    (void)state;
    assert_shape("x = a + b*c", "(+ a (* b c))");
    assert_shape("x = a - b - c", "(- (- a b) c)");
    assert_shape("x = a/b/c", "(/ (/ a b) c)");
    assert_shape("x = -a^2", "(neg (^ a 2))");
    assert_shape("x = a^b^c", "(^ a (^ b c))");
    assert_shape("x = 2^-1", "(^ 2 (neg 1))");
    assert_shape("x = (a + b)·c", "(* (+ a b) c)");
    assert_shape("x = tube.id/2", "(/ (. tube id) 2)");
    assert_shape("x = f(Re, rr, method=\"haaland\")", "(f Re rr method=\"haaland\")");
    assert_shape("x = 38 gal/min * 2", "(* 38 gal/min 2)");
}

static void test_statement_forms(void **state)
{
    (void)state;
    Stmt *s = parse("V = Q/A as ft/s   # velocity in the riser [ipc] [b1]");
    assert_int_equal(s->kind, STMT_DEF);
    assert_string_equal(s->name, "V");
    assert_true(s->has_as);
    assert_string_equal(s->as->text, "ft/s");
    assert_string_equal(s->description, "velocity in the riser");
    assert_int_equal(s->ncites, 2);
    assert_string_equal(s->cites[0].key, "ipc");
    assert_string_equal(s->cites[1].key, "b1");
    assert_int_equal(s->cites[0].pos.col, 44); /* the key, after "[" */

    s = parse("Q2 = solve Q where h(Q) = 10 ft between 1 gal/min and 500 gal/min as L/s");
    assert_int_equal(s->kind, STMT_SOLVE);
    assert_string_equal(s->solve->var, "Q");
    assert_non_null(s->solve->lo);
    assert_non_null(s->solve->hi);
    assert_string_equal(s->as->text, "L/s");

    s = parse("Q3 = solve Q where a = b");
    assert_int_equal(s->kind, STMT_SOLVE);
    assert_null(s->solve->lo);

    s = parse("check velocity limit: V <= 8 ft/s  # erosion [ashrae]");
    assert_int_equal(s->kind, STMT_CHECK);
    assert_string_equal(s->label, "velocity limit");
    assert_int_equal(s->cmp, CMP_LE);
    assert_string_equal(s->description, "erosion");

    s = parse("check p: p_min >= 20 psi");
    assert_int_equal(s->cmp, CMP_GE);

    s = parse("   # a note on its own line");
    assert_int_equal(s->kind, STMT_NOTE);
    assert_string_equal(s->description, "a note on its own line");

    assert_null(parse("    "));
}

typedef struct BadCase {
    const char *line;
    int col;
    const char *fragment;
} BadCase;

static void test_errors(void **state)
{
    (void)state;
    static const BadCase cases[] = {
        {"x = (a + b", 11, "')' to close '(' opened at 3:5"},
        {"x = a +", 8, "expected a number, a name"},
        {"x = 3 furlongs", 7, "unknown unit 'furlongs'"},
        {"x = 3 ft/D", 10, "put the quantity in parentheses: (3 ft)/D"},
        {"x == 3", 3, "'==' is not an operator"},
        {"x 3", 3, "expected '=' after the name"},
        {"check : a <= b", 1, "expected 'check LABEL: A <= B'"},
        {"check lim: a = b", 14, "expected a comparison"},
        {"x = f(a=1, 2)", 12, "positional argument cannot follow"},
        {"x = 3 as", 7, "expected a unit after 'as'"},
        {"x = 3 as lbf * s", 13, "without spaces"},
        {"pi = 3", 1, "'pi' is reserved"},
        {"x = solve", 10, "name to vary"},
        {"x = a b", 7, "expected the end of the statement"},
        {"x = tube.", 10, "field name"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        Stmt *s = parse(cases[i].line);
        assert_non_null(s);
        assert_true(s->parse_failed);
        assert_true(dl.errors >= 1);
        if (!strstr(dl.items[0].message, cases[i].fragment) || dl.items[0].pos.col != cases[i].col)
            fail_msg("%s -> %d:%s (want %d:%s)", cases[i].line, dl.items[0].pos.col, dl.items[0].message,
                     cases[i].col, cases[i].fragment);
        assert_int_equal(dl.items[0].pos.line, 3);
    }
}

static void test_deep_nesting_is_bounded(void **state)
{
    (void)state;
    size_t n = 10000;
    char *line = malloc(2 * n + 16);
    strcpy(line, "x = ");
    size_t k = 4;
    for (size_t i = 0; i < n; i++)
        line[k++] = '(';
    line[k++] = '1';
    for (size_t i = 0; i < n; i++)
        line[k++] = ')';
    line[k] = '\0';
    Stmt *s = parse(line);
    assert_true(s->parse_failed);
    assert_int_equal(dl.errors, 1);
    assert_non_null(strstr(dl.items[0].message, "nested too deeply"));
    free(line);
}

static void test_equation_text(void **state)
{
    (void)state;
    Expr *l, *r;
    diag_free(&dl);
    assert_true(parse_equation_text(&arena, "1/sqrt(f) = -2*log10(rr/3.7 + 2.51/(Re*sqrt(f)))", &dl, &l, &r));
    char buf[256] = "";
    shape(l, buf, sizeof buf);
    assert_string_equal(buf, "(/ 1 (sqrt f))");
    assert_non_null(r);
}

int main(void)
{
    arena_init(&arena);
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_precedence),
        cmocka_unit_test(test_statement_forms),
        cmocka_unit_test(test_errors),
        cmocka_unit_test(test_deep_nesting_is_bounded),
        cmocka_unit_test(test_equation_text),
    };
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    diag_free(&dl);
    arena_free(&arena);
    return rc;
}
