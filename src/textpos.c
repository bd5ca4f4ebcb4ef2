/* textpos.c — byte, UTF-16 and code point columns of a UTF-8 line.
 *
 * The source stage has already checked that a calc is valid UTF-8, but these
 * also run on text a language client sends, so a malformed byte is counted as
 * one unit instead of trusted. */
#include "textpos.h"

/* The length of the UTF-8 sequence starting at s[i] (1 for a bad byte). */
static size_t seq_len(const unsigned char *s, size_t i, size_t len)
{
    unsigned char c = s[i];
    size_t n = c < 0x80 ? 1 : (c & 0xE0) == 0xC0 ? 2 : (c & 0xF0) == 0xE0 ? 3 : (c & 0xF8) == 0xF0 ? 4 : 1;
    if (i + n > len)
        return 1;
    for (size_t k = 1; k < n; k++)
        if ((s[i + k] & 0xC0) != 0x80)
            return 1;
    return n;
}

static size_t unit_count(size_t n, ColumnUnit unit)
{
    if (unit == COL_UTF8)
        return n;
    if (unit == COL_UTF16)
        return n == 4 ? 2 : 1;
    return 1;
}

size_t textpos_units(const char *line, size_t len, size_t nbytes, ColumnUnit unit)
{
    const unsigned char *s = (const unsigned char *)line;
    if (nbytes > len)
        nbytes = len;
    size_t units = 0;
    for (size_t i = 0; i < nbytes;) {
        size_t n = seq_len(s, i, len);
        units += unit_count(n, unit);
        i += n;
    }
    return units;
}

size_t textpos_bytes(const char *line, size_t len, size_t units, ColumnUnit unit)
{
    const unsigned char *s = (const unsigned char *)line;
    size_t i = 0, u = 0;
    while (i < len) {
        size_t n = seq_len(s, i, len);
        size_t w = unit_count(n, unit);
        if (u + w > units)
            break;
        u += w;
        i += n;
    }
    return i;
}
