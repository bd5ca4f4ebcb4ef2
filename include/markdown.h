/* markdown.h — the Markdown body of a calc file, read with cmark-gfm.
 *
 * Only this stage includes cmark. It turns cmark's tree into our Block and
 * Inline model (doc.h), hands every line of a ```calc fence to the statement
 * parser with its true file position, reads ```sources fences, and finds the
 * inline {name} values in prose. */
#ifndef HEADROOM_MARKDOWN_H
#define HEADROOM_MARKDOWN_H

#include "doc.h"

/* Parse doc->text from byte `body_start` (after the front matter). */
void markdown_read(Document *doc, size_t body_start, DiagList *diags);

#include "bounds.h" /* MARKDOWN_MAX_DEPTH, SOURCE_MAX_LINE, DOC_MAX_STATEMENTS */

#endif
