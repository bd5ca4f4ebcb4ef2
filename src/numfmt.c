/* numfmt.c — number literals in, numbers out, independent of the locale.
 *
 * Literals are validated here by hand (digits, optional fraction, optional
 * exponent: no hex, no "inf", no leading '+') and then converted by strtod,
 * which is exact and, since headroom never calls setlocale, reads '.' as the
 * decimal point. Output goes through snprintf's %e/%f/%g for the same reason. */
#include "numfmt.h"

#include <math.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* The literal s[0..n) (digits, an optional fraction and exponent, already
 * checked) converted without strtod where that is exact: with at most 15
 * significant digits the digits make an integer m below 2^53, and with a
 * power of ten 10^k, |k| <= 22, exact as a double too, m * 10^k or m / 10^k is
 * one correctly rounded operation on two exact numbers, which is what strtod
 * returns (Clinger, "How to read floating point numbers accurately", PLDI
 * 1990). False for anything else: strtod then. */
static bool parse_exact(const char *s, size_t n, double *out)
{
    static const double pow10[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
                                   1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
    uint64_t m = 0;
    int sig = 0, scale = 0; /* significant digits in m; digits after the point */
    size_t i = 0;
    bool point = false;
    for (; i < n && ((s[i] >= '0' && s[i] <= '9') || (s[i] == '.' && !point)); i++) {
        if (s[i] == '.') {
            point = true;
            continue;
        }
        if (m == 0 && s[i] == '0') { /* a leading zero adds no digit */
            scale += point;
            continue;
        }
        if (++sig > 15)
            return false;
        m = m * 10 + (uint64_t)(s[i] - '0');
        scale += point;
    }
    int exp10 = 0;
    if (i < n) { /* the exponent: e or E, a sign, digits */
        i++;
        bool neg = i < n && s[i] == '-';
        if (i < n && (s[i] == '+' || s[i] == '-'))
            i++;
        for (; i < n; i++) {
            if (exp10 > 1000)
                return false;
            exp10 = exp10 * 10 + (s[i] - '0');
        }
        exp10 = neg ? -exp10 : exp10;
    }
    int k = exp10 - scale;
    if (m == 0) {
        *out = 0.0;
        return true;
    }
    if (k < -22 || k > 22)
        return false;
    *out = k >= 0 ? (double)m * pow10[k] : (double)m / pow10[-k];
    return true;
}

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
    double fast;
    if (parse_exact(s, i, &fast)) {
        *out = fast;
        return i;
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

/* ---- exact rounding to significant digits --------------------------------
 *
 * |x| = m * 2^e exactly (m the 53-bit significand), so |x| * 10^k is the
 * fraction m * 5^k * 2^(e+k) (k >= 0) or m * 2^(e+k) / 5^-k (k < 0): held in
 * 128-bit integers, its quotient and remainder give the digits and the exact
 * rounding, where printf needs arbitrary precision and costs ten times as much. */

typedef unsigned __int128 U128;

static const uint64_t POW10[18] = {1ULL, 10ULL, 100ULL, 1000ULL, 10000ULL, 100000ULL, 1000000ULL, 10000000ULL,
                                   100000000ULL, 1000000000ULL, 10000000000ULL, 100000000000ULL,
                                   1000000000000ULL, 10000000000000ULL, 100000000000000ULL,
                                   1000000000000000ULL, 10000000000000000ULL, 100000000000000000ULL};

/* 5^k for 0 <= k <= 27, the largest below 2^63 */
static const uint64_t POW5[28] = {1ULL, 5ULL, 25ULL, 125ULL, 625ULL, 3125ULL, 15625ULL, 78125ULL, 390625ULL,
                                  1953125ULL, 9765625ULL, 48828125ULL, 244140625ULL, 1220703125ULL,
                                  6103515625ULL, 30517578125ULL, 152587890625ULL, 762939453125ULL,
                                  3814697265625ULL, 19073486328125ULL, 95367431640625ULL, 476837158203125ULL,
                                  2384185791015625ULL, 11920928955078125ULL, 59604644775390625ULL,
                                  298023223876953125ULL, 1490116119384765625ULL, 7450580596923828125ULL};

static U128 pow5(int k) /* 0 <= k <= 54 */
{
    return k <= 27 ? (U128)POW5[k] : (U128)POW5[27] * POW5[k - 27];
}

static int bit_length(U128 v)
{
    uint64_t hi = (uint64_t)(v >> 64), lo = (uint64_t)v;
    return hi ? 128 - __builtin_clzll(hi) : lo ? 64 - __builtin_clzll(lo) : 0;
}

bool num_round(double x, int p, uint64_t *digits, int *exp10)
{
    if (p < 1 || p > 17 || !isfinite(x) || x == 0)
        return false;
    uint64_t bits;
    memcpy(&bits, &x, sizeof bits);
    int biased = (int)((bits >> 52) & 0x7ff);
    if (biased == 0)
        return false; /* subnormal */
    uint64_t m = (bits & ((1ULL << 52) - 1)) | (1ULL << 52);
    int e = biased - 1075;
    /* a guess at the power of ten from the binary one, corrected below:
     * floor((e + 52) * log10(2)) in integers (78913 / 2^18 = 0.3010292, the
     * same floor for every exponent of a double; the shift of a negative
     * product rounds down) */
    int ex = ((e + 52) * 78913) >> 18;
    for (int tries = 0; tries < 6; tries++) {
        int k = p - 1 - ex; /* |x| * 10^k should lie in [10^(p-1), 10^p) */
        if (k > 54 || k < -54)
            return false;
        U128 num = m, den = 1;
        if (k >= 0) {
            U128 f = pow5(k);
            if (bit_length(num) + bit_length(f) > 127)
                return false;
            num *= f;
        } else {
            den = pow5(-k);
        }
        int t = e + k;
        U128 q, r;
        if (t >= 0) {
            if (bit_length(num) + t > 126)
                return false;
            num <<= t;
        } else {
            if (bit_length(den) - t > 126)
                return false;
            den <<= -t;
        }
        if (k >= 0 && t < 0) { /* den is 2^-t: a shift, not a division */
            q = num >> -t;
            r = num & (den - 1);
        } else {
            q = num / den;
            r = num % den;
        }
        if (q >= POW10[p]) {
            ex++;
            continue;
        }
        if (q < POW10[p - 1]) {
            ex--;
            continue;
        }
        uint64_t d = (uint64_t)q;
        if (2 * r > den || (2 * r == den && (d & 1))) /* to nearest, a tie to even */
            d++;
        if (d == POW10[p]) {
            d = POW10[p - 1];
            ex++;
        }
        *digits = d;
        *exp10 = ex;
        return true;
    }
    return false;
}

static const char PAIRS[] = "00010203040506070809101112131415161718192021222324252627282930313233343536373839"
                            "40414243444546474849505152535455565758596061626364656667686970717273747576777879"
                            "8081828384858687888990919293949596979899";

/* The eight digits of n < 10^8, two a step without a division: y holds
 * n / 10^6 as a fixed-point number with 57 bits of fraction (the factor is
 * 2^57 / 10^6 rounded up), its integer part the first two digits; times 100
 * the fraction gives the next two. Checked for every n below 10^8. */
static inline void eight_digits(uint32_t n, char *out)
{
    const uint64_t frac = (1ULL << 57) - 1;
    uint64_t y = (uint64_t)n * 144115188076ULL;
    memcpy(out, PAIRS + 2 * (y >> 57), 2);
    y = (y & frac) * 100;
    memcpy(out + 2, PAIRS + 2 * (y >> 57), 2);
    y = (y & frac) * 100;
    memcpy(out + 4, PAIRS + 2 * (y >> 57), 2);
    y = (y & frac) * 100;
    memcpy(out + 6, PAIRS + 2 * (y >> 57), 2);
}

void num_digit_text(uint64_t digits, int p, char *out)
{
    if (p >= 8 && p <= 17) {
        /* the last p of its digits (p <= 17): the last sixteen eight at a
         * time, the one before them alone */
        char all[17];
        all[0] = (char)('0' + digits / 10000000000000000ULL % 10);
        eight_digits((uint32_t)(digits / 100000000ULL % 100000000ULL), all + 1);
        eight_digits((uint32_t)(digits % 100000000ULL), all + 9);
        memcpy(out, all + 17 - p, (size_t)p);
        out[p] = '\0';
        return;
    }
    int i = p;
    out[p] = '\0';
    for (; i >= 2; i -= 2) { /* fewer: two digits a step */
        unsigned two = (unsigned)(digits % 100);
        digits /= 100;
        out[i - 2] = PAIRS[2 * two];
        out[i - 1] = PAIRS[2 * two + 1];
    }
    if (i == 1)
        out[0] = (char)('0' + digits % 10);
}

/* num_parts from the exact digits: as the snprintf path below prints. */
static void parts_of_digits(double x, int digits, uint64_t d, int ex, NumParts *p)
{
    char dig[20];
    num_digit_text(d, digits, dig);
    char *o = p->mantissa;
    if (x < 0)
        *o++ = '-';
    if (ex < -3 || ex >= 6) {
        *o++ = dig[0];
        if (digits > 1) {
            *o++ = '.';
            memcpy(o, dig + 1, (size_t)digits - 1);
            o += digits - 1;
        }
        p->exp10 = ex;
    } else if (ex < 0) {
        *o++ = '0';
        *o++ = '.';
        for (int i = 0; i < -ex - 1; i++)
            *o++ = '0';
        memcpy(o, dig, (size_t)digits);
        o += digits;
    } else if (ex >= digits - 1) {
        memcpy(o, dig, (size_t)digits);
        o += digits;
        for (int i = 0; i < ex - digits + 1; i++)
            *o++ = '0';
    } else {
        memcpy(o, dig, (size_t)ex + 1);
        o += ex + 1;
        *o++ = '.';
        memcpy(o, dig + ex + 1, (size_t)(digits - 1 - ex));
        o += digits - 1 - ex;
    }
    *o = '\0';
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
    /* Up to 15 figures, the plain form of the rounded value printed by %f
     * (below) is its digits: the double nearest it is within half a unit of
     * its last figure. Beyond that, and outside num_round's range, printf. */
    uint64_t d;
    int dex;
    if (digits <= 15 && num_round(x, digits, &d, &dex)) {
        parts_of_digits(x, digits, d, dex, &p);
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
    if (!n)
        return;
    char text[64];
    size_t len = strlen(p.mantissa);
    memcpy(text, p.mantissa, len);
    if (p.exp10) {
        /* "e" and the power, written by hand: this runs for every number shown */
        char pow[16];
        char *o = pow + sizeof pow;
        unsigned u = p.exp10 < 0 ? 0u - (unsigned)p.exp10 : (unsigned)p.exp10;
        do {
            *--o = (char)('0' + u % 10);
            u /= 10;
        } while (u);
        if (p.exp10 < 0)
            *--o = '-';
        *--o = 'e';
        memcpy(text + len, o, (size_t)(pow + sizeof pow - o));
        len += (size_t)(pow + sizeof pow - o);
    }
    if (len >= n) /* cut as snprintf would */
        len = n - 1;
    memcpy(buf, text, len);
    buf[len] = '\0';
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
