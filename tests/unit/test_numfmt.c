/* test_numfmt.c — cmocka tests of the number formats (numfmt.h): the plain
 * significant-figure text of the listing and JSON (num_sig) and the typeset
 * text of the sheets (num_typeset: a typographic minus, ×10 with a
 * superscript power), on a table of values worked by hand from the rule in
 * numfmt.h (plain for 1e-3 <= |x| < 1e6, scientific otherwise, trailing
 * zeros kept to the stated significance), and the exact rounding
 * (num_round) against glibc's printf, which rounds the exact binary value
 * with arbitrary precision, over many thousands of doubles. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

#include "numfmt.h"

typedef struct Case {
    double x;
    int digits;
    const char *sig, *typeset;
} Case;

static const Case CASES[] = {
    {6.343e-4, 4, "6.343e-4", "6.343×10⁻⁴"},
    {-4.22e-15, 3, "-4.22e-15", "−4.22×10⁻¹⁵"},
    {1.0e7, 4, "1.000e7", "1.000×10⁷"},
    {80.0, 4, "80.00", "80.00"},
    {-2.5, 4, "-2.500", "−2.500"},
    {136300.4, 4, "136300", "136300"},
    {0.001, 4, "0.001000", "0.001000"},
    {2.3e12, 2, "2.3e12", "2.3×10¹²"},
};

static void test_formats(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof CASES / sizeof CASES[0]; i++) {
        char buf[64];
        num_sig(CASES[i].x, CASES[i].digits, buf, sizeof buf);
        if (strcmp(buf, CASES[i].sig) != 0)
            fail_msg("num_sig(%g, %d) = '%s', want '%s'", CASES[i].x, CASES[i].digits, buf, CASES[i].sig);
        num_typeset(CASES[i].x, CASES[i].digits, buf, sizeof buf);
        if (strcmp(buf, CASES[i].typeset) != 0)
            fail_msg("num_typeset(%g, %d) = '%s', want '%s'", CASES[i].x, CASES[i].digits, buf,
                     CASES[i].typeset);
    }
}

static void test_superscript(void **state)
{
    (void)state;
    char buf[64];
    num_superscript("-12", 3, buf, sizeof buf);
    assert_string_equal(buf, "⁻¹²");
    num_superscript("3", 1, buf, sizeof buf);
    assert_string_equal(buf, "³");
    /* too small a buffer: the digits that fit, still terminated */
    char small[4];
    num_superscript("12", 2, small, sizeof small);
    assert_string_equal(small, "¹");
}

/* The values the printf comparisons run over: random bit patterns over the
 * whole range of doubles, random significands over the decades engineering
 * values live in, short decimals (k / 10^j) and exact ties (an odd multiple
 * of a power of two, whose decimal expansion ends in 5 at every length). */
static double sample(unsigned i)
{
    uint64_t r = 6364136223846793005ULL * (i + 1) + 1442695040888963407ULL;
    r ^= r >> 29;
    r *= 0xbf58476d1ce4e5b9ULL;
    r ^= r >> 32;
    double x;
    switch (i % 4) {
    case 0:
        memcpy(&x, &r, sizeof x);
        return isfinite(x) ? x : 1.0;
    case 1:
        return ((double)(r >> 11) / 9007199254740992.0 + 0.1) * pow(10.0, (double)(int)(r % 61) - 30);
    case 2:
        return (double)(int64_t)(r % 2000001 - 1000000) / pow(10.0, (double)(r % 9));
    default:
        return ldexp((double)((r >> 12) | 1), -(int)(r % 60));
    }
}

enum { NSAMPLES = 40000 };

/* The old num_parts, all snprintf: the reference for the fast one. */
static NumParts parts_printf(double x, int digits)
{
    NumParts p = {{0}, 0};
    char sci[40];
    snprintf(sci, sizeof sci, "%.*e", digits - 1, x);
    char *e = strchr(sci, 'e');
    int ex = atoi(e + 1);
    if (ex >= -3 && ex < 6) {
        int decimals = digits - 1 - ex;
        snprintf(p.mantissa, sizeof p.mantissa, "%.*f", decimals < 0 ? 0 : decimals, strtod(sci, NULL));
        return p;
    }
    *e = '\0';
    snprintf(p.mantissa, sizeof p.mantissa, "%s", sci);
    p.exp10 = ex;
    return p;
}

static void test_round_matches_printf(void **state)
{
    (void)state;
    size_t exact = 0, inside = 0;
    for (unsigned i = 0; i < NSAMPLES; i++) {
        double x = sample(i);
        if (x == 0)
            continue;
        for (int p = 1; p <= 17; p++) {
            uint64_t d;
            int ex;
            char want[48], got[48];
            snprintf(want, sizeof want, "%.*e", p - 1, x);
            bool in_range = fabs(x) >= 1e-14 && fabs(x) <= 1e37;
            inside += in_range;
            if (!num_round(x, p, &d, &ex)) {
                if (in_range)
                    fail_msg("num_round(%.17g, %d) refused a value in its range", x, p);
                continue;
            }
            exact += in_range;
            char dig[20];
            num_digit_text(d, p, dig);
            snprintf(got, sizeof got, "%s%c%s%se%c%02d", x < 0 ? "-" : "", dig[0], p > 1 ? "." : "", dig + 1,
                     ex < 0 ? '-' : '+', ex < 0 ? -ex : ex);
            if (strcmp(got, want) != 0)
                fail_msg("num_round(%a, %d): '%s', printf '%s'", x, p, got, want);
            NumParts a = num_parts(x, p), b = parts_printf(x, p);
            if (strcmp(a.mantissa, b.mantissa) != 0 || a.exp10 != b.exp10)
                fail_msg("num_parts(%a, %d): '%s' e%d, printf '%s' e%d", x, p, a.mantissa, a.exp10, b.mantissa,
                         b.exp10);
        }
    }
    assert_int_equal(exact, inside);
    assert_true(inside > (size_t)NSAMPLES * 17 / 2); /* the comparison ran mostly on the fast path */
    /* ties to even, worked by hand: 0.125 -> 0.12, 0.375 -> 0.38, 2.5 -> 2 */
    uint64_t d;
    int ex;
    assert_true(num_round(0.125, 2, &d, &ex));
    assert_int_equal(d, 12);
    assert_int_equal(ex, -1);
    assert_true(num_round(0.375, 2, &d, &ex));
    assert_int_equal(d, 38);
    assert_true(num_round(2.5, 1, &d, &ex));
    assert_int_equal(d, 2);
    /* rounding up into the next decade: 9.9996 to four figures is 10.00 */
    assert_true(num_round(9.9996, 4, &d, &ex));
    assert_int_equal(d, 1000);
    assert_int_equal(ex, 1);
    assert_false(num_round(5e-324, 17, &d, &ex)); /* subnormal: printf's */
    assert_false(num_round(0.0, 3, &d, &ex));
}

/* num_parse against glibc's strtod (correctly rounded) on literals of every
 * shape the lexer passes: up to 20 digits with the point anywhere, leading
 * and trailing zeros, exponents -30..30 with and without a sign; the result
 * must be the same double, bit for bit. */
static void test_parse_matches_strtod(void **state)
{
    (void)state;
    uint64_t x = 88172645463325252u;
    int tested = 0;
    for (int n = 0; n < 400000; n++) {
        x ^= x << 13, x ^= x >> 7, x ^= x << 17;
        char lit[64];
        size_t len = 0;
        int ndig = 1 + (int)(x % 20), point = (int)((x >> 8) % (uint64_t)(ndig + 2));
        for (int d = 0; d < ndig; d++) {
            if (d == point && d > 0)
                lit[len++] = '.';
            uint64_t r = x >> (16 + 2 * (d % 20));
            lit[len++] = (char)('0' + ((x >> 5) % 3 == 0 && d > ndig / 2 ? 0 : (int)((r ^ (uint64_t)d * 2654435761u) % 10)));
        }
        if ((x >> 40) % 4 == 0) {
            int e = (int)((x >> 44) % 61) - 30;
            len += (size_t)snprintf(lit + len, sizeof lit - len, (x >> 50) % 2 ? "e%d" : "E%+d", e);
        }
        lit[len] = '\0';
        double got = -1, want = strtod(lit, NULL);
        size_t used = num_parse(lit, len, &got);
        assert_int_equal(used, len);
        if (memcmp(&got, &want, sizeof got) != 0)
            fail_msg("num_parse(\"%s\") = %.17g, strtod gives %.17g", lit, got, want);
        tested++;
    }
    assert_int_equal(tested, 400000);
    /* the edges of the exact path: 15 and 16 digits, 10^22 and 10^23 */
    const char *edge[] = {"999999999999999", "9999999999999999", "123456789012345e22", "123456789012345e23",
                          "1e-22", "1e-23", "0.000000000000000000000001", "4.35", "0.1", "2.675", "0"};
    for (size_t i = 0; i < sizeof edge / sizeof *edge; i++) {
        double got = -1, want = strtod(edge[i], NULL);
        num_parse(edge[i], strlen(edge[i]), &got);
        assert_memory_equal(&got, &want, sizeof got);
    }
}

/* num_digit_text writes 8 to 17 digits eight at a time by a fixed-point
 * product: the digits of every width, at the ends of each group, against
 * printf's %0*llu (and the last p digits of a value with more). */
static void test_digit_text(void **state)
{
    (void)state;
    static const uint64_t values[] = {0ULL, 1ULL, 9ULL, 10ULL, 99999999ULL, 100000000ULL, 100000001ULL,
                                      12345678901234567ULL, 99999999999999999ULL, 10000000000000000ULL,
                                      10000000099999999ULL, 99999999000000009ULL, 18446744073709551615ULL};
    for (size_t i = 0; i < sizeof values / sizeof values[0]; i++)
        for (int p = 1; p <= 17; p++) {
            uint64_t pow = 1;
            for (int k = 0; k < p; k++)
                pow *= 10;
            char want[24], got[24];
            snprintf(want, sizeof want, "%0*llu", p, (unsigned long long)(values[i] % pow));
            memset(got, 'x', sizeof got);
            num_digit_text(values[i], p, got);
            if (strcmp(got, want) != 0)
                fail_msg("num_digit_text(%llu, %d): '%s', printf '%s'", (unsigned long long)values[i], p, got,
                         want);
        }
    char dig[20];
    num_digit_text(12345678901234567ULL, 17, dig);
    assert_string_equal(dig, "12345678901234567");
    num_digit_text(100000000ULL, 9, dig);
    assert_string_equal(dig, "100000000");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_formats),
        cmocka_unit_test(test_superscript),
        cmocka_unit_test(test_round_matches_printf),
        cmocka_unit_test(test_parse_matches_strtod),
        cmocka_unit_test(test_digit_text),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
