/* fences.h — the fences stage (src/fences.c): the raw fenced blocks
 * markdown.c left (```calc, ```sources, ```path, ```curve, ```network,
 * ```cases) parsed into the document's statements, sources and case
 * tables, in document order, each line at its true file position. */
#ifndef HEADROOM_FENCES_H
#define HEADROOM_FENCES_H

#include "doc.h"

#include "bounds.h" /* SOURCE_MAX_LINE, DOC_MAX_STATEMENTS */

void fences_read(Document *doc, DiagList *diags);

#endif
