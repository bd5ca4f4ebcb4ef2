/* test_json_out.c — the streaming JSON writer against jansson 2.14.
 *
 * The build and diff JSON were written through jansson's tree with
 * JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17); the
 * streaming writer must print the same bytes. Each case writes one document
 * both ways and compares: reals over many decades (and the exponent and
 * ".0" rules), integers, booleans, null, every control character, quotes and
 * backslashes, UTF-8 text, empty and nested containers, and the members
 * jansson leaves out (a NULL or non-UTF-8 text, a non-UTF-8 key); and the
 * compact form the language server sends, against JSON_COMPACT. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>

#include <jansson.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "json_out.h"

static char *jansson_text(json_t *root)
{
    char *s = json_dumps(root, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17));
    json_decref(root);
    return s;
}

static char *stream_text(void (*write)(JsonOut *), size_t *len)
{
    char *buf = NULL;
    FILE *f = open_memstream(&buf, len);
    JsonOut w;
    json_out_init(&w, f);
    write(&w);
    assert_true(json_out_finish(&w));
    fclose(f);
    return buf;
}

static double sample_real(int i)
{
    static const double fixed[] = {0.0, -0.0, 1.0, -3.0, 0.1, 1.0 / 3.0, 1e20, 1e21, 1e-7, 1.5e-7, 123456789012345678.0,
                                   1e300, -1e-300, 5e-324, 2.2250738585072014e-308, 9007199254740993.0, 1e16, 1e17};
    int nf = (int)(sizeof fixed / sizeof fixed[0]);
    if (i < nf)
        return fixed[i];
    /* a spread over decades, from a fixed linear congruential sequence */
    unsigned long long x = 6364136223846793005ULL * (unsigned long long)i + 1442695040888963407ULL;
    double m = (double)(x >> 11) / 9007199254740992.0;
    return (i % 2 ? -1 : 1) * m * pow(10.0, (double)(i % 61) - 30.0);
}

enum { NREALS = 2000 };

static void write_reals(JsonOut *w)
{
    json_out_begin_object(w, NULL);
    json_out_begin_array(w, "reals");
    for (int i = 0; i < NREALS; i++)
        json_out_real(w, NULL, sample_real(i));
    json_out_end_array(w);
    json_out_real(w, "inf", INFINITY);
    json_out_real(w, "nan", NAN);
    json_out_int(w, "int", -1234567890123LL);
    json_out_bool(w, "yes", true);
    json_out_bool(w, "no", false);
    json_out_null(w, "none");
    json_out_end_object(w);
}

static void test_reals_and_scalars(void **state)
{
    (void)state;
    json_t *o = json_object();
    json_t *a = json_array();
    for (int i = 0; i < NREALS; i++)
        json_array_append_new(a, json_real(sample_real(i)));
    json_object_set_new(o, "reals", a);
    json_object_set_new(o, "inf", json_null());   /* the tree writer wrote null for these */
    json_object_set_new(o, "nan", json_null());
    json_object_set_new(o, "int", json_integer(-1234567890123LL));
    json_object_set_new(o, "yes", json_true());
    json_object_set_new(o, "no", json_false());
    json_object_set_new(o, "none", json_null());
    char *want = jansson_text(o);
    size_t len;
    char *got = stream_text(write_reals, &len);
    assert_string_equal(got, want);
    free(got);
    free(want);
}

static char controls[64];
static const char *const BAD_UTF8 = "bad \xff byte";
static const char *const OVERLONG = "\xc0\xaf";
static const char *const SURROGATE = "\xed\xa0\x80";

static void string_members(JsonOut *w)
{
    json_out_string(w, "controls", controls);
    json_out_string(w, "quotes", "say \"hi\" \\ back/slash \x7f");
    json_out_string(w, "utf8", "\xc2\xb0" "C, \xce\xbc" "m, \xe2\x80\xa8, \xf0\x9f\x92\xa7");
    json_out_string(w, "null text", NULL);
    json_out_string(w, "bad text", BAD_UTF8);
    json_out_string(w, "overlong", OVERLONG);
    json_out_string(w, "surrogate", SURROGATE);
    json_out_string(w, BAD_UTF8, "bad key");
    json_out_begin_object(w, BAD_UTF8);
    json_out_string(w, "inside", "a left-out member");
    json_out_end_object(w);
    json_out_begin_object(w, "empty object");
    json_out_end_object(w);
    json_out_begin_array(w, "empty array");
    json_out_end_array(w);
    json_out_begin_array(w, "nested");
    json_out_begin_object(w, NULL);
    json_out_end_object(w);
    json_out_begin_array(w, NULL);
    json_out_string(w, NULL, "x");
    json_out_string(w, NULL, BAD_UTF8);
    json_out_end_array(w);
    json_out_end_array(w);
    json_out_text(w, "text", BAD_UTF8);
}

static void write_strings(JsonOut *w)
{
    json_out_begin_object(w, NULL);
    string_members(w);
    json_out_end_object(w);
}

/* The tree write_strings must match, as jansson builds it. */
static json_t *strings_tree(void)
{
    for (int c = 1; c < 0x40; c++)
        controls[c - 1] = (char)c;
    json_t *o = json_object();
    json_object_set_new(o, "controls", json_string(controls));
    json_object_set_new(o, "quotes", json_string("say \"hi\" \\ back/slash \x7f"));
    json_object_set_new(o, "utf8", json_string("\xc2\xb0" "C, \xce\xbc" "m, \xe2\x80\xa8, \xf0\x9f\x92\xa7"));
    json_object_set_new(o, "null text", json_string(NULL));
    json_object_set_new(o, "bad text", json_string(BAD_UTF8));
    json_object_set_new(o, "overlong", json_string(OVERLONG));
    json_object_set_new(o, "surrogate", json_string(SURROGATE));
    json_object_set_new(o, BAD_UTF8, json_string("bad key"));
    json_t *inner = json_object();
    json_object_set_new(inner, "inside", json_string("a left-out member"));
    json_object_set_new(o, BAD_UTF8, inner);
    json_object_set_new(o, "empty object", json_object());
    json_object_set_new(o, "empty array", json_array());
    json_t *nested = json_array(), *in = json_array();
    json_array_append_new(nested, json_object());
    json_array_append_new(in, json_string("x"));
    json_array_append_new(in, json_string(BAD_UTF8));
    json_array_append_new(nested, in);
    json_object_set_new(o, "nested", nested);
    json_object_set_new(o, "text", json_string("bad ? byte"));
    return o;
}

static void test_strings_and_containers(void **state)
{
    (void)state;
    char *want = jansson_text(strings_tree());
    size_t len;
    char *got = stream_text(write_strings, &len);
    assert_string_equal(got, want);
    assert_true(json_out_utf8_ok("\xf4\x8f\xbf\xbf"));    /* U+10FFFF */
    assert_false(json_out_utf8_ok("\xf4\x90\x80\x80"));   /* above U+10FFFF */
    assert_false(json_out_utf8_ok("\xe0\x80\x80"));       /* overlong */
    free(got);
    free(want);
}

/* The compact form of a language-server message, into a StrBuf: the same
 * bytes as jansson's JSON_COMPACT. */
static void test_compact(void **state)
{
    (void)state;
    json_t *tree = strings_tree();
    json_object_set_new(tree, "reals", json_pack("[f,f,f]", 0.1, -1e-7, 1e21));
    json_object_set_new(tree, "int", json_integer(-42));
    char *want = json_dumps(tree, JSON_COMPACT | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17));
    json_decref(tree);
    StrBuf sb = {0};
    JsonOut w;
    json_out_init_compact(&w, &sb);
    json_out_begin_object(&w, NULL);
    string_members(&w);
    json_out_begin_array(&w, "reals");
    json_out_real(&w, NULL, 0.1);
    json_out_real(&w, NULL, -1e-7);
    json_out_real(&w, NULL, 1e21);
    json_out_end_array(&w);
    json_out_int(&w, "int", -42);
    json_out_end_object(&w);
    assert_true(json_out_finish(&w));
    assert_string_equal(sb_str(&sb), want);
    assert_int_equal(sb.len, strlen(want));
    sb_free(&sb);
    free(want);
}

/* Random bit patterns over the whole range of doubles and exact decimal
 * ties: the same bytes as jansson's %.17g, and each reads back (strtod) as
 * the very double written. */
enum { NBITS = 50000 };

static double bits_real(int i)
{
    uint64_t r = 0x9e3779b97f4a7c15ULL * (uint64_t)(i + 1);
    r ^= r >> 31;
    r *= 0x94d049bb133111ebULL;
    r ^= r >> 29;
    double x;
    if (i % 3 == 2)
        return ldexp((double)((r >> 12) | 1), -(int)(r % 70));
    memcpy(&x, &r, sizeof x);
    return isfinite(x) ? x : 2.0;
}

static void write_bits(JsonOut *w)
{
    json_out_begin_array(w, NULL);
    for (int i = 0; i < NBITS; i++)
        json_out_real(w, NULL, bits_real(i));
    json_out_end_array(w);
}

static void test_reals_round_trip(void **state)
{
    (void)state;
    json_t *a = json_array();
    for (int i = 0; i < NBITS; i++)
        json_array_append_new(a, json_real(bits_real(i)));
    char *want = jansson_text(a);
    size_t len;
    char *got = stream_text(write_bits, &len);
    assert_string_equal(got, want);
    char *p = got + 1; /* past '[' */
    for (int i = 0; i < NBITS; i++) {
        char *end;
        double x = strtod(p, &end), y = bits_real(i);
        assert_true(end > p);
        if (memcmp(&x, &y, sizeof x) != 0)
            fail_msg("%.17g read back as %.17g", y, x);
        p = end + 1; /* past ',' */
    }
    free(got);
    free(want);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_reals_and_scalars),
        cmocka_unit_test(test_strings_and_containers),
        cmocka_unit_test(test_reals_round_trip),
        cmocka_unit_test(test_compact),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
