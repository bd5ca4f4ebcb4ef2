/* test_lex.c — the tokens of calc lines: numbers with units, names,
 * operators, comments and the positions every token carries. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <string.h>

#include "lex.h"

static Lexer lx;
static DiagList dl;

static void start(const char *line)
{
    diag_free(&dl);
    Pos p = {"t", 7, 1};
    lex_init(&lx, line, strlen(line), p, &dl);
}

static void test_number_takes_unit(void **state)
{
    (void)state;
    start("Q = 38 gal/min + 2 L");
    Token t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_NAME);
    assert_int_equal(lex_next(&lx).kind, TOK_ASSIGN);
    t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_NUMBER);
    assert_true(t.number == 38.0);
    assert_int_equal(t.unit_len, 7);
    assert_memory_equal(t.unit, "gal/min", 7);
    assert_int_equal(t.unit_pos.col, 8);
    assert_int_equal(lex_next(&lx).kind, TOK_PLUS);
    t = lex_next(&lx);
    assert_int_equal(t.unit_len, 1); /* 2 L is two litres */
    assert_int_equal(lex_next(&lx).kind, TOK_EOL);
}

static void test_bare_name_is_not_unit(void **state)
{
    (void)state;
    start("2*L");
    Token t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_NUMBER);
    assert_null(t.unit);
    assert_int_equal(lex_next(&lx).kind, TOK_STAR);
    t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_NAME);
    assert_int_equal(t.pos.col, 3);
}

static void test_compound_units(void **state)
{
    (void)state;
    static const struct { const char *line; const char *unit; } cases[] = {
        {"2.34e-5 lbf*s/ft^2", "lbf*s/ft^2"},
        {"4186 J/(kg*K))", "J/(kg*K)"},
        {"9.81 m/s^2,", "m/s^2"},
        {"3 m^3/h)", "m^3/h"},
        {"1 s^-1", "s^-1"},
        {"5 kPa·s", "kPa·s"},
        {"55 degF and", "degF"},
        {"10 ft*", "ft"},
        {"0.002 ft/(gal/min)^2 +", "ft/(gal/min)^2"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        start(cases[i].line);
        Token t = lex_next(&lx);
        assert_int_equal(t.kind, TOK_NUMBER);
        assert_int_equal(t.unit_len, strlen(cases[i].unit));
        assert_memory_equal(t.unit, cases[i].unit, t.unit_len);
    }
}

static void test_keyword_is_not_unit(void **state)
{
    (void)state;
    start("between 1 and 10");
    assert_true(lex_next(&lx).kind == TOK_NAME);
    Token t = lex_next(&lx);
    assert_null(t.unit);
    t = lex_next(&lx);
    assert_true(tok_is_word(&t, "and"));
}

static void test_exponent_forms(void **state)
{
    (void)state;
    start("1.5e3 2E-2 .25 7e");
    assert_true(lex_next(&lx).number == 1500.0);
    assert_true(lex_next(&lx).number == 0.02);
    assert_true(lex_next(&lx).number == 0.25);
    Token t = lex_next(&lx); /* "7e": seven with the unit "e" */
    assert_true(t.number == 7.0);
    assert_int_equal(t.unit_len, 1);
}

static void test_comment_and_strings(void **state)
{
    (void)state;
    start("s = \"a # b\" # the note");
    assert_int_equal(lx.comment_at, 12);
    lex_next(&lx);
    lex_next(&lx);
    Token t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_STRING);
    assert_int_equal(t.len, 5);
    assert_int_equal(lex_next(&lx).kind, TOK_EOL);
}

static void test_operators(void **state)
{
    (void)state;
    start("a <= b < c >= d > e ≤ f ≥ g · h ^ ( ) , . :");
    TokKind want[] = {TOK_NAME, TOK_LE, TOK_NAME, TOK_LT, TOK_NAME, TOK_GE, TOK_NAME, TOK_GT,
                      TOK_NAME, TOK_LE, TOK_NAME, TOK_GE, TOK_NAME, TOK_STAR, TOK_NAME, TOK_CARET,
                      TOK_LPAREN, TOK_RPAREN, TOK_COMMA, TOK_DOT, TOK_COLON, TOK_EOL};
    for (size_t i = 0; i < sizeof want / sizeof want[0]; i++)
        assert_int_equal(lex_next(&lx).kind, want[i]);
    assert_int_equal(dl.errors, 0);
}

static void test_greek_names(void **state)
{
    (void)state;
    start("ρ_w = 1");
    Token t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_NAME);
    assert_int_equal(t.len, strlen("ρ_w"));
}

static void test_errors_carry_positions(void **state)
{
    (void)state;
    start("x = 3 $ 4");
    lex_next(&lx);
    lex_next(&lx);
    lex_next(&lx);
    Token t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_ERROR);
    assert_int_equal(dl.errors, 1);
    assert_int_equal(dl.items[0].pos.line, 7);
    assert_int_equal(dl.items[0].pos.col, 7);
    assert_non_null(strstr(dl.items[0].message, "unexpected character '$'"));
    start("s = \"open");
    lex_next(&lx);
    lex_next(&lx);
    t = lex_next(&lx);
    assert_int_equal(t.kind, TOK_ERROR);
    assert_non_null(strstr(dl.items[0].message, "unterminated string"));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_number_takes_unit),  cmocka_unit_test(test_bare_name_is_not_unit),
        cmocka_unit_test(test_compound_units),     cmocka_unit_test(test_keyword_is_not_unit),
        cmocka_unit_test(test_exponent_forms),     cmocka_unit_test(test_comment_and_strings),
        cmocka_unit_test(test_operators),          cmocka_unit_test(test_greek_names),
        cmocka_unit_test(test_errors_carry_positions),
    };
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    diag_free(&dl);
    return rc;
}
