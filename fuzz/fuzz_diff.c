/* fuzz_diff.c — libFuzzer target for `headroom diff`.
 *
 * The input is split at the first 0x01 byte (a byte no calc file may hold)
 * into an old and a new revision; without one, both halves of the input
 * serve. Each is read and evaluated, and, as main.c does, the two are
 * compared only when neither has errors; the diff is written as text and as
 * JSON into a memory stream. A finding is a crash, a sanitizer report, a
 * timeout or running out of memory. */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "diff.h"
#include "doc.h"
#include "eval.h"
#include "load.h"
#include "source.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > SOURCE_MAX_BYTES)
        return 0;
    const uint8_t *sep = memchr(data, 0x01, size);
    size_t old_len = sep ? (size_t)(sep - data) : size / 2;
    const char *parts[2] = {(const char *)data, (const char *)data + old_len + (sep ? 1 : 0)};
    size_t lens[2] = {old_len, size - old_len - (sep ? 1 : 0)};
    DiagList dl[2] = {{0}, {0}};
    Document *doc[2];
    Evaluated *ev[2];
    for (int k = 0; k < 2; k++) {
        doc[k] = doc_from_text(k ? "new.calc.md" : "old.calc.md", parts[k], lens[k], &dl[k]);
        ev[k] = eval_document(doc[k], &dl[k]);
    }
    if (dl[0].errors == 0 && dl[1].errors == 0) {
        DiffOptions opt = diff_options_default();
        Diff *d = diff_compute(ev[0], ev[1], &opt);
        char *buf = NULL;
        size_t n = 0;
        FILE *out = open_memstream(&buf, &n);
        if (out) {
            render_diff_text(d, out);
            render_diff_json(d, out);
            for (size_t i = 0; i < doc[1]->nstmts; i++)
                (void)diff_stmt_mark(d, i);
            fclose(out);
        }
        free(buf);
        diff_free(d);
    }
    for (int k = 0; k < 2; k++) {
        diag_free(&dl[k]);
        doc_free(doc[k]);
    }
    return 0;
}
