/* resolve.h — the resolution stage: names -> slots, dependencies,
 * citations (src/resolve.c).
 *
 * Runs after the fences are parsed (fences.h) and before evaluation: it
 * gives every name in every expression, inline value and `cases` column its
 * statement slot (or SLOT_PI / SLOT_G, lexicon.h), records each statement's
 * dependencies, fills the name table doc_lookup() reads, and reports names
 * used before their definition, defined twice, unknown (with the nearest
 * one), labels used twice and citations of unknown sources. */
#ifndef HEADROOM_RESOLVE_H
#define HEADROOM_RESOLVE_H

#include "doc.h"

void resolve_document(Document *doc, DiagList *diags);

#endif
