/* diag.h — source positions and collected diagnostics.
 *
 * Library code never prints or exits: it appends to a DiagList, and main.c
 * prints the list as `file:line:col: error: message`, the source line and a
 * caret. A DiagList owns its messages (heap) and is freed with diag_free(). */
#ifndef HEADROOM_DIAG_H
#define HEADROOM_DIAG_H

#include <stdarg.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>

/* A place in a source file: 1-based line and column (column in bytes). */
typedef struct Pos {
    const char *file; /* display name of the file; not owned */
    int line;
    int col;
} Pos;

typedef enum Severity { SEV_ERROR, SEV_WARNING, SEV_NOTE } Severity;

typedef struct Diag {
    Severity severity;
    Pos pos;
    char *message;
} Diag;

typedef struct DiagList {
    Diag *items;
    size_t len;
    size_t cap;
    size_t errors;
    size_t warnings;
    int muted;          /* > 0: diagnostics are dropped (solver trials) */
} DiagList;

void diag_add(DiagList *dl, Severity sev, Pos pos, const char *fmt, ...)
    __attribute__((format(printf, 4, 5)));
void diag_vadd(DiagList *dl, Severity sev, Pos pos, const char *fmt, va_list ap);
#define diag_error(dl, pos, ...) diag_add((dl), SEV_ERROR, (pos), __VA_ARGS__)
#define diag_warning(dl, pos, ...) diag_add((dl), SEV_WARNING, (pos), __VA_ARGS__)
void diag_free(DiagList *dl);
/* Sort by file, line, column, keeping insertion order for ties. */
void diag_sort(DiagList *dl);

/* Print every diagnostic with the offending source line and a caret.
 * `text` is the whole source (may be NULL), used to show the line. */
void diag_print(FILE *out, const DiagList *dl, const char *text, size_t text_len, bool color);

/* Write `s` with control and bidirectional-control characters shown as
 * escapes (`\x1b`, `\u202e`), so text from a file or a command line never
 * drives the terminal. diag_print escapes every line and message this way. */
void diag_print_escaped(FILE *out, const char *s);
/* The same when the diagnostics fall in several files (a calc and the files
 * it uses): each is shown with the line of the source whose `file` matches
 * its position's. */
typedef struct DiagSource {
    const char *file;
    const char *text;
    size_t len;
} DiagSource;
void diag_print_sources(FILE *out, const DiagList *dl, const DiagSource *src, size_t nsrc, bool color);

#endif
