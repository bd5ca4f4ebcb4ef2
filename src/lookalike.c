/* lookalike.c — hidden characters and look-alike letters (see lookalike.h). */
#include "lookalike.h"

#include <stdint.h>
#include <string.h>

/* One UTF-8 character at s (n bytes left): its code point and length; a
 * malformed byte decodes as itself, one byte long (the source check has
 * refused malformed text before this runs). */
static unsigned decode(const unsigned char *s, size_t n, size_t *len)
{
    if (s[0] < 0x80 || n < 2) {
        *len = 1;
        return s[0];
    }
    if ((s[0] & 0xE0) == 0xC0) {
        *len = 2;
        return ((unsigned)(s[0] & 0x1F) << 6) | (s[1] & 0x3F);
    }
    if ((s[0] & 0xF0) == 0xE0 && n >= 3) {
        *len = 3;
        return ((unsigned)(s[0] & 0x0F) << 12) | ((unsigned)(s[1] & 0x3F) << 6) | (s[2] & 0x3F);
    }
    if ((s[0] & 0xF8) == 0xF0 && n >= 4) {
        *len = 4;
        return ((unsigned)(s[0] & 0x07) << 18) | ((unsigned)(s[1] & 0x3F) << 12) |
               ((unsigned)(s[2] & 0x3F) << 6) | (s[3] & 0x3F);
    }
    *len = 1;
    return s[0];
}

/* Default-ignorable and format characters that draw nothing, and the
 * bidirectional controls. */
static bool hidden(unsigned c)
{
    return c == 0x00AD || c == 0x034F || c == 0x061C || c == 0x115F || c == 0x1160 ||
           c == 0x17B4 || c == 0x17B5 || c == 0x180E || (c >= 0x180B && c <= 0x180F) ||
           (c >= 0x200B && c <= 0x200F) || (c >= 0x202A && c <= 0x202E) ||
           (c >= 0x2060 && c <= 0x206F) || c == 0x3164 || (c >= 0xFE00 && c <= 0xFE0F) ||
           c == 0xFEFF || c == 0xFFA0 || (c >= 0xFFF0 && c <= 0xFFF8) ||
           (c >= 0x1D173 && c <= 0x1D17A) || (c >= 0xE0000 && c <= 0xE0FFF);
}

size_t lookalike_find_hidden(const char *s, size_t len, unsigned *cp)
{
    const unsigned char *u = (const unsigned char *)s;
    for (size_t i = 0; i < len;) {
        uint64_t w;
        if (i + 8 <= len && (memcpy(&w, u + i, 8), (w & 0x8080808080808080u) == 0)) {
            i += 8; /* eight ASCII bytes: no hidden character is ASCII */
            continue;
        }
        if (u[i] < 0x80) {
            i++;
            continue;
        }
        size_t k;
        unsigned c = decode(u + i, len - i, &k);
        if (hidden(c)) {
            *cp = c;
            return i;
        }
        i += k;
    }
    return len;
}

/* Cyrillic and Greek letters drawn like a Latin letter in common fonts. */
static const struct {
    unsigned cp;
    char latin;
} twins[] = {
    /* Cyrillic capitals and small letters */
    {0x0405, 'S'}, {0x0406, 'I'}, {0x0408, 'J'}, {0x0410, 'A'}, {0x0412, 'B'}, {0x0415, 'E'},
    {0x041A, 'K'}, {0x041C, 'M'}, {0x041D, 'H'}, {0x041E, 'O'}, {0x0420, 'P'}, {0x0421, 'C'},
    {0x0422, 'T'}, {0x0425, 'X'}, {0x0430, 'a'}, {0x0435, 'e'}, {0x043E, 'o'}, {0x0440, 'p'},
    {0x0441, 'c'}, {0x0443, 'y'}, {0x0445, 'x'}, {0x0455, 's'}, {0x0456, 'i'}, {0x0458, 'j'},
    {0x04BB, 'h'}, {0x0501, 'd'}, {0x051B, 'q'}, {0x051D, 'w'},
    /* Greek capitals, and small omicron */
    {0x0391, 'A'}, {0x0392, 'B'}, {0x0395, 'E'}, {0x0396, 'Z'}, {0x0397, 'H'}, {0x0399, 'I'},
    {0x039A, 'K'}, {0x039C, 'M'}, {0x039D, 'N'}, {0x039F, 'O'}, {0x03A1, 'P'}, {0x03A4, 'T'},
    {0x03A5, 'Y'}, {0x03A7, 'X'}, {0x03BF, 'o'},
};

bool lookalike_skeleton(const char *name, char *out, size_t cap, int *scripts, unsigned *twin)
{
    const unsigned char *u = (const unsigned char *)name;
    size_t n = strlen(name), o = 0;
    *scripts = 0;
    *twin = 0;
    for (size_t i = 0; i < n;) {
        size_t k;
        unsigned c = decode(u + i, n - i, &k);
        if ((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'))
            *scripts |= LOOK_LATIN;
        else if (c >= 0x0400 && c <= 0x052F)
            *scripts |= LOOK_CYRILLIC;
        else if (c >= 0x0370 && c <= 0x03FF)
            *scripts |= LOOK_GREEK;
        char latin = 0;
        for (size_t t = 0; t < sizeof twins / sizeof twins[0] && !latin; t++)
            if (twins[t].cp == c)
                latin = twins[t].latin;
        if (latin && !*twin)
            *twin = c;
        size_t w = latin ? 1 : k;
        if (o + w + 1 > cap)
            return false;
        if (latin)
            out[o++] = latin;
        else
            memcpy(out + o, name + i, k), o += k;
        i += k;
    }
    out[o] = '\0';
    return true;
}
