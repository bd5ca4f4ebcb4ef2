/* fuzz_frontmatter.c — libFuzzer target for the front matter stage.
 *
 * The input becomes the text of a Document as doc_from_text would set it up,
 * opened with a `---` line when it lacks one so the fuzzer spends its time
 * inside the YAML block, then checked (UTF-8, control bytes) and read by
 * frontmatter_read. Nothing here prints; a finding is a crash, a sanitizer
 * report, a timeout or running out of memory. */
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "doc.h"
#include "frontmatter.h"
#include "source.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > SOURCE_MAX_BYTES)
        return 0;
    bool opened = size >= 3 && memcmp(data, "---", 3) == 0;
    size_t len = size + (opened ? 0 : 4);
    Document *doc = calloc(1, sizeof *doc);
    arena_init(&doc->arena);
    doc->file = "fuzz.calc.md";
    char *text = arena_alloc(&doc->arena, len + 1);
    if (!opened)
        memcpy(text, "---\n", 4);
    if (size)
        memcpy(text + (opened ? 0 : 4), data, size);
    text[len] = '\0';
    doc->text = text;
    doc->len = len;
    doc->meta.units = UNITS_US;
    doc->meta.paper = PAPER_LETTER;
    doc->meta.digits = 4;
    DiagList diags = {0};
    if (source_check_text(text, len, doc->file, &diags)) {
        size_t body = frontmatter_read(doc, &diags);
        if (body > len)
            abort(); /* the block cannot span more than the text */
    }
    diag_free(&diags);
    doc_free(doc);
    return 0;
}
