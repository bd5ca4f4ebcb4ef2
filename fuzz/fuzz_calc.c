/* fuzz_calc.c — libFuzzer target for reading a calc file.
 *
 * doc_from_text runs every reading stage on the input: the source checks,
 * front matter, Markdown (cmark-gfm), the calc statement parser, path and
 * cases tables, sources and name resolution. It never fails: problems are
 * diagnostics. A finding is a crash, a sanitizer report, a timeout or running
 * out of memory; the one property checked besides is that every diagnostic
 * carries a position inside the file or at 1:1. */
#include <stdint.h>
#include <stdlib.h>

#include "doc.h"
#include "load.h"
#include "source.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > SOURCE_MAX_BYTES)
        return 0;
    DiagList diags = {0};
    Document *doc = doc_from_text("fuzz.calc.md", (const char *)data, size, &diags);
    for (size_t i = 0; i < diags.len; i++) {
        Pos p = diags.items[i].pos;
        if (p.line < 1 || (size_t)p.line > doc->nlines || p.col < 1)
            abort(); /* a diagnostic placed outside the file */
    }
    diag_free(&diags);
    doc_free(doc);
    return 0;
}
