/* textpos.h — columns in a line of UTF-8 text, counted three ways.
 *
 * Diagnostics and tokens carry 1-based byte columns. Tools count otherwise:
 * SARIF and the Language Server Protocol count UTF-16 code units by default,
 * and some clients count bytes or code points. These convert a byte column of
 * one line to another count and back. Pure functions, no allocation. */
#ifndef HEADROOM_TEXTPOS_H
#define HEADROOM_TEXTPOS_H

#include <stddef.h>

typedef enum ColumnUnit {
    COL_UTF8,    /* bytes */
    COL_UTF16,   /* UTF-16 code units: 2 for a character beyond U+FFFF */
    COL_CODEPOINT
} ColumnUnit;

/* The number of `unit`s in the first `nbytes` bytes of `line` (`len` bytes,
 * no newline). A malformed byte counts as one unit of every kind. */
size_t textpos_units(const char *line, size_t len, size_t nbytes, ColumnUnit unit);

/* The byte offset of unit offset `units` in `line`; past the end gives `len`,
 * and an offset inside a character gives that character's start. */
size_t textpos_bytes(const char *line, size_t len, size_t units, ColumnUnit unit);

#endif
