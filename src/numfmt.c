/* numfmt.c — number literals in, numbers out, independent of the locale.
 *
 * Literals are validated here by hand (digits, optional fraction, optional
 * exponent: no hex, no "inf", no leading '+') and then converted by strtod,
 * which is exact and, since headroom never calls setlocale, reads '.' as the
 * decimal point. Output goes through snprintf's %e/%f/%g for the same reason. */
#include "numfmt.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

size_t num_parse(const char *s, size_t len, double *out)
{
    size_t i = 0, digits = 0;
    while (i < len && s[i] >= '0' && s[i] <= '9')
        i++, digits++;
    if (i < len && s[i] == '.') {
        i++;
        while (i < len && s[i] >= '0' && s[i] <= '9')
            i++, digits++;
    }
    if (digits == 0)
        return 0;
    if (i < len && (s[i] == 'e' || s[i] == 'E')) {
        size_t j = i + 1;
        if (j < len && (s[j] == '+' || s[j] == '-'))
            j++;
        size_t k = j;
        while (k < len && s[k] >= '0' && s[k] <= '9')
            k++;
        if (k > j) /* "2e" without digits is a number followed by a name */
            i = k;
    }
    char buf[512];
    if (i >= sizeof buf) {
        /* Absurdly long literals: convert from a heap copy. */
        char *heap = malloc(i + 1);
        if (!heap)
            return 0;
        memcpy(heap, s, i);
        heap[i] = '\0';
        *out = strtod(heap, NULL);
        free(heap);
        return i;
    }
    memcpy(buf, s, i);
    buf[i] = '\0';
    *out = strtod(buf, NULL);
    return i;
}

/* Strip a redundant leading zero and '+' from a C exponent: "e-05" -> -5. */
static int exponent_of(const char *e)
{
    return atoi(e + 1);
}

NumParts num_parts(double x, int digits)
{
    NumParts p = {{0}, 0};
    if (digits < 1)
        digits = 1;
    if (digits > 17)
        digits = 17;
    if (!isfinite(x)) {
        snprintf(p.mantissa, sizeof p.mantissa, "%s", isnan(x) ? "NaN" : x > 0 ? "∞" : "−∞");
        return p;
    }
    if (x == 0) {
        snprintf(p.mantissa, sizeof p.mantissa, "0");
        return p;
    }
    char sci[40];
    snprintf(sci, sizeof sci, "%.*e", digits - 1, x);
    char *e = strchr(sci, 'e');
    int ex = e ? exponent_of(e) : 0;
    if (ex >= -3 && ex < 6) {
        int decimals = digits - 1 - ex;
        if (decimals < 0)
            decimals = 0;
        /* Print the value rounded to `digits` figures, so 136302 with four
         * figures reads 136300, not 136302. */
        snprintf(p.mantissa, sizeof p.mantissa, "%.*f", decimals, strtod(sci, NULL));
        return p;
    }
    if (e)
        *e = '\0';
    snprintf(p.mantissa, sizeof p.mantissa, "%s", sci);
    p.exp10 = ex;
    return p;
}

void num_sig(double x, int digits, char *buf, size_t n)
{
    NumParts p = num_parts(x, digits);
    if (p.exp10)
        snprintf(buf, n, "%se%d", p.mantissa, p.exp10);
    else
        snprintf(buf, n, "%s", p.mantissa);
}

static const char *const SUPERSCRIPT[] = {"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"};

/* Append s to buf[0..n) at *at, keeping it terminated; what does not fit is dropped. */
static void append(char *buf, size_t n, size_t *at, const char *s)
{
    size_t l = strlen(s);
    if (*at + l + 1 > n)
        return;
    memcpy(buf + *at, s, l);
    *at += l;
    buf[*at] = '\0';
}

void num_superscript(const char *digits, size_t len, char *buf, size_t n)
{
    size_t at = 0;
    if (!n)
        return;
    buf[0] = '\0';
    for (size_t i = 0; i < len; i++) {
        char c = digits[i];
        if (c == '-')
            append(buf, n, &at, "⁻");
        else if (c >= '0' && c <= '9')
            append(buf, n, &at, SUPERSCRIPT[c - '0']);
    }
}

void num_typeset(double x, int digits, char *buf, size_t n)
{
    size_t at = 0;
    if (!n)
        return;
    buf[0] = '\0';
    NumParts p = num_parts(x, digits);
    for (const char *c = p.mantissa; *c; c++) {
        char one[2] = {*c, 0};
        append(buf, n, &at, *c == '-' ? "−" : one);
    }
    if (p.exp10) {
        char e[16], sup[64];
        snprintf(e, sizeof e, "%d", p.exp10);
        num_superscript(e, strlen(e), sup, sizeof sup);
        append(buf, n, &at, "×10");
        append(buf, n, &at, sup);
    }
}
