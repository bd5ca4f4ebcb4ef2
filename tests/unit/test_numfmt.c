/* test_numfmt.c — cmocka tests of the number formats (numfmt.h): the plain
 * significant-figure text of the listing and JSON (num_sig) and the typeset
 * text of the sheets (num_typeset: a typographic minus, ×10 with a
 * superscript power), on a table of values worked by hand from the rule in
 * numfmt.h (plain for 1e-3 <= |x| < 1e6, scientific otherwise, trailing
 * zeros kept to the stated significance). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
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

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_formats),
        cmocka_unit_test(test_superscript),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
