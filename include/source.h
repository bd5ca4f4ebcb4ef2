/* source.h — reading a calc file: bytes, checks, digest and line index.
 *
 * The bytes are read whole (a file, standard input for "-", or a buffer),
 * checked to be UTF-8 without control characters other than tab, CR and LF,
 * bounded in size, and hashed with SHA-256 (nettle) so every report can be
 * traced to the exact source. The caller owns the returned buffer (free()). */
#ifndef HEADROOM_SOURCE_H
#define HEADROOM_SOURCE_H

#include <stdbool.h>
#include <stddef.h>

#include "diag.h"

#include "bounds.h" /* SOURCE_MAX_BYTES, SOURCE_MAX_LINE */

/* Read a file ("-": standard input). NULL on an I/O error or an oversize
 * file, reported in diags (an oversize file sets *len above SOURCE_MAX_BYTES,
 * so callers can treat it as bad input, not an I/O failure). The buffer is
 * NUL-terminated. */
char *source_read(const char *path, const char *display, size_t *len, DiagList *diags);

/* Report the first byte that is not valid UTF-8, or a forbidden control
 * character, with its line and column. */
/* Length of the UTF-8 sequence at s (1..4, reading at most left bytes), or 0
 * if it is not well formed (overlong forms, surrogates and code points above
 * U+10FFFF are rejected). The one UTF-8 decoder: the source check and the JSON
 * writer use it. */
size_t source_utf8_len(const unsigned char *s, size_t left);

bool source_check_text(const char *text, size_t len, const char *display, DiagList *diags);

/* SHA-256 as 64 lower-case hex digits and a NUL. */
void source_digest(const char *text, size_t len, char out[65]);

/* The line index: the byte offset where each line of text starts (index 0
 * is line 1), allocated in `a`; *nlines gets their number. */
struct Arena;
size_t *source_line_index(struct Arena *a, const char *text, size_t len, size_t *nlines);
/* Line `line` (1-based) of text by its index, without the newline or a CR
 * before it; NULL when there is no such line. */
const char *source_line(const char *text, size_t len, const size_t *line_start, size_t nlines, int line,
                        size_t *n);

#endif
