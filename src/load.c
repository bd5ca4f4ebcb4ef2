/* load.c — loading a document: the reading stages chained.
 *
 * source (bytes checked as UTF-8, SHA-256, line index: source.c) ->
 * front matter (frontmatter.c) -> Markdown (blocks and raw fences:
 * markdown.c) -> fences (calc lines, sources, path, curve, network and
 * cases tables: fences.c) -> resolution (resolve.c). Each stage reads what
 * the one before it left in the Document and writes its own part; none
 * calls back into another. */
#include "load.h"

#include <stdlib.h>
#include <string.h>

#include "fences.h"
#include "frontmatter.h"
#include "markdown.h"
#include "resolve.h"
#include "source.h"

/* The stages over `text` (NUL-terminated, len bytes); `owned` is text itself
 * when the document takes the heap buffer over, else NULL and text is
 * copied into the arena. */
static Document *doc_read(const char *display_name, const char *text, size_t len, char *owned, DiagList *diags)
{
    Document *doc = xcalloc(1, sizeof *doc);
    /* a calc's arena grows to about 30 times its text (27 to 31 on the
     * benchmark calcs, issue 17): reserve that at once */
    arena_init_sized(&doc->arena, 32 * len);
    doc->file = arena_strdup(&doc->arena, display_name);
    if (owned) {
        doc->own_text = owned;
    } else {
        char *copy = arena_alloc(&doc->arena, len + 1);
        memcpy(copy, text, len);
        copy[len] = '\0';
        text = copy;
    }
    doc->text = text;
    doc->len = len;
    source_digest(text, len, doc->digest);
    doc->line_start = source_line_index(&doc->arena, text, len, &doc->nlines);
    doc->meta.units = UNITS_US;
    doc->meta.paper = PAPER_LETTER;
    doc->meta.digits = 4;
    if (len == 0) {
        Pos p = {doc->file, 1, 1};
        diag_error(diags, p, "the file is empty: a calc file needs at least one ```calc block");
        return doc;
    }
    if (!source_check_text(text, len, doc->file, diags))
        return doc;
    size_t body = frontmatter_read(doc, diags);
    markdown_read(doc, body, diags);
    fences_read(doc, diags);
    resolve_document(doc, diags);
    if (doc->nstmts == 0 && diags->errors == 0 && !doc->meta.has_parts) {
        Pos p = {doc->file, 1, 1};
        diag_warning(diags, p, "the file has no calc statements (no ```calc block)");
    }
    return doc;
}

Document *doc_from_text(const char *display_name, const char *text, size_t len, DiagList *diags)
{
    return doc_read(display_name, text, len, NULL, diags);
}

Document *doc_load(const char *path, DiagList *diags)
{
    const char *display = strcmp(path, "-") == 0 ? "<stdin>" : path;
    size_t len = 0;
    char *text = source_read(path, display, &len, diags);
    if (!text && len > SOURCE_MAX_BYTES) {
        /* Too large is an input error (exit 2), already reported at 1:1:
         * give the caller an empty document to carry it. */
        DiagList ignored = {0};
        Document *doc = doc_from_text(display, "", 0, &ignored);
        diag_free(&ignored);
        return doc;
    }
    if (!text)
        return NULL;
    return doc_read(display, text, len, text, diags); /* the document keeps the buffer */
}
