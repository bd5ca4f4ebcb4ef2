/* markdown.h — the Markdown body of a calc file, read with cmark-gfm.
 *
 * Only this stage includes cmark. It turns cmark's tree into our Block and
 * Inline model (doc.h) and finds the inline {name} values in prose; the
 * fences the calc language owns (```calc, ```sources, ```path, ```curve,
 * ```network, ```cases) it checks are closed and leaves raw, their lines
 * for the fences stage (fences.h). */
#ifndef HEADROOM_MARKDOWN_H
#define HEADROOM_MARKDOWN_H

#include "doc.h"

/* Parse doc->text from byte `body_start` (after the front matter). */
void markdown_read(Document *doc, size_t body_start, DiagList *diags);

/* cmark turns `\{` into a plain `{`; before it parses, `\{` is replaced
 * by this byte and `{`, the same number of bytes, and restored after. A
 * checked source cannot hold it. */
#define MARKDOWN_ESCAPED_BRACE 0x1A

#include "bounds.h" /* MARKDOWN_MAX_DEPTH */

#endif
