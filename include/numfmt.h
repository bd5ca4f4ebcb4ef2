/* numfmt.h — reading and writing numbers, independent of the locale.
 *
 * One module parses number literals and prints numbers everywhere: JSON uses
 * round-trip precision (17 significant digits, %.17g),
 * the text listing and the report use significant figures, and `convert`
 * prints 10 significant digits. The C locale is never changed, and these
 * functions do not depend on it. */
#ifndef HEADROOM_NUMFMT_H
#define HEADROOM_NUMFMT_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>

/* Parse a decimal literal (digits, optional fraction, optional exponent) at
 * s[0..]; returns the number of bytes used (0: not a number). */
size_t num_parse(const char *s, size_t len, double *out);

/* A number split for display with `digits` significant figures: mantissa text
 * and a power of ten (exp10 == 0 when no ×10^n is needed). Plain notation is
 * used for 1e-3 <= |x| < 1e6 (and for 0); otherwise scientific. Trailing
 * zeros are kept to show the significance ("4.000", "80.00"); a number of
 * more digits than `digits` is rounded to them ("136300"). */
typedef struct NumParts {
    char mantissa[40];
    int exp10;
} NumParts;

NumParts num_parts(double x, int digits);
/* |x| rounded to p significant digits (1..17) exactly as printf's %.*e
 * rounds (to nearest, a tie to even, on the exact binary value): *digits
 * holds them as an integer in [10^(p-1), 10^p) and *exp10 the power of ten
 * of the first. False, with nothing written, for 0, subnormal and non-finite
 * x and magnitudes outside about 1e-15..1e38, where callers use printf. */
bool num_round(double x, int p, uint64_t *digits, int *exp10);
/* The p digits of num_round's integer as text (p + 1 bytes with the NUL). */
void num_digit_text(uint64_t digits, int p, char *out);
/* num_parts joined as plain text: "4.050", "1.234e-05" -> "1.234e-5". */
void num_sig(double x, int digits, char *buf, size_t n);
/* The same as print sets it, in UTF-8: a typographic minus and ×10 with a
 * superscript power ("−4.220×10⁻¹⁵", "6.343×10⁻⁴", "80.00"). */
void num_typeset(double x, int digits, char *buf, size_t n);
/* An integer's digits (and sign) as superscripts: -12 -> "⁻¹²". */
void num_superscript(const char *digits, size_t len, char *buf, size_t n);

#endif
