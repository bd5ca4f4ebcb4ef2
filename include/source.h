/* source.h — reading a calc file: bytes, checks and digest.
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
bool source_check_text(const char *text, size_t len, const char *display, DiagList *diags);

/* SHA-256 as 64 lower-case hex digits and a NUL. */
void source_digest(const char *text, size_t len, char out[65]);

#endif
