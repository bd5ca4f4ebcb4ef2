/* fuzz_eval.c — libFuzzer target for evaluation and the text renderers.
 *
 * As `headroom check --json` and `headroom build --format text` do: read the
 * input with doc_from_text, evaluate it, write the JSON results always and
 * the text listing when there are no errors, both into memory streams. A
 * finding is a crash, a sanitizer report, a timeout or running out of
 * memory. */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>

#include "doc.h"
#include "eval.h"
#include "load.h"
#include "render.h"
#include "source.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > SOURCE_MAX_BYTES)
        return 0;
    DiagList diags = {0};
    Document *doc = doc_from_text("fuzz.calc.md", (const char *)data, size, &diags);
    Evaluated *ev = eval_document(doc, &diags);
    char *buf = NULL;
    size_t n = 0;
    FILE *out = open_memstream(&buf, &n);
    if (out) {
        render_json((const Evaluated *const *)&ev, &diags, 1, out);
        if (diags.errors == 0)
            render_text(ev, out);
        fclose(out);
    }
    free(buf);
    diag_free(&diags);
    doc_free(doc);
    return 0;
}
