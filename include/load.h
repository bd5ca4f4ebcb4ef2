/* load.h — reading a calc into a Document: the stages chained (load.c).
 *
 * source -> front matter -> Markdown -> fences -> resolution; the tree they
 * build is doc.h's. */
#ifndef HEADROOM_LOAD_H
#define HEADROOM_LOAD_H

#include <stddef.h>

#include "diag.h"
#include "doc.h"

/* Read a whole calc file (or standard input for "-") into a Document: front
 * matter, Markdown, calc statements, sources, name resolution. Problems go to
 * `diags`; the document is returned even when it has errors, so every error
 * of a run is found. NULL only when the file cannot be read (an I/O error,
 * reported in `diags` without a line). */
Document *doc_load(const char *path, DiagList *diags);

/* The same for text already in memory (the tests, the diff of git revisions). */
Document *doc_from_text(const char *display_name, const char *text, size_t len, DiagList *diags);

#endif
