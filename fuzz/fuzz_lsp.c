/* fuzz_lsp.c — libFuzzer target for the language server (lsp_serve).
 *
 * The input is split at 0x01 bytes. The first part is a calc: the server is
 * initialized, the calc opened, and then hover, definition and completion
 * are asked at several places of each of its first lines and inlay hints
 * over the whole, so mutated calcs exercise every request on an evaluated
 * document. Each further part is sent as one more message body, framed with
 * its Content-Length (fuzzed requests and notifications). An input that
 * starts with 0x02 is instead fed to the server raw, to exercise the
 * framing itself. Answers go to /dev/null; a finding is a crash, a
 * sanitizer report, a timeout or running out of memory. */
#include <jansson.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "lsp.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static void frame(FILE *f, const char *body, size_t n)
{
    fprintf(f, "Content-Length: %zu\r\n\r\n", n);
    fwrite(body, 1, n, f);
}

static void frame_json(FILE *f, json_t *msg)
{
    char *s = json_dumps(msg, JSON_COMPACT);
    if (s)
        frame(f, s, strlen(s));
    free(s);
    json_decref(msg);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > (1u << 20))
        return 0;
    FILE *in = tmpfile();
    FILE *out = fopen("/dev/null", "w");
    if (!in || !out) {
        if (in)
            fclose(in);
        if (out)
            fclose(out);
        return 0;
    }
    const char *uri = "file:///fuzz/fuzz.calc.md";
    if (size > 0 && data[0] == 0x02) {
        fwrite(data + 1, 1, size - 1, in);
    } else {
        const char *p = (const char *)data, *end = p + size;
        const char *cut = memchr(p, 0x01, size);
        size_t calc_len = (size_t)((cut ? cut : end) - p);
        int id = 1;
        frame_json(in, json_pack("{s:s,s:i,s:s,s:{s:{s:{s:[s]}}}}", "jsonrpc", "2.0", "id", id++, "method",
                                 "initialize", "params", "capabilities", "general", "positionEncodings", "utf-16"));
        json_t *text = json_stringn(p, calc_len); /* NULL when not UTF-8 */
        frame_json(in, json_pack("{s:s,s:s,s:{s:{s:s,s:s,s:i,s:o}}}", "jsonrpc", "2.0", "method",
                                 "textDocument/didOpen", "params", "textDocument", "uri", uri, "languageId",
                                 "markdown", "version", 1, "text", text ? text : json_string("")));
        static const char *const asks[] = {"textDocument/hover", "textDocument/definition", "textDocument/completion"};
        static const int cols[] = {0, 4, 12, 30};
        for (int line = 0; line < 20; line++)
            for (size_t c = 0; c < sizeof cols / sizeof cols[0]; c++)
                for (size_t a = 0; a < 3; a++)
                    frame_json(in, json_pack("{s:s,s:i,s:s,s:{s:{s:s},s:{s:i,s:i}}}", "jsonrpc", "2.0", "id", id++,
                                             "method", asks[a], "params", "textDocument", "uri", uri, "position",
                                             "line", line, "character", cols[c]));
        frame_json(in, json_pack("{s:s,s:i,s:s,s:{s:{s:s},s:{s:{s:i,s:i},s:{s:i,s:i}}}}", "jsonrpc", "2.0", "id",
                                 id++, "method", "textDocument/inlayHint", "params", "textDocument", "uri", uri,
                                 "range", "start", "line", 0, "character", 0, "end", "line", 100000, "character", 0));
        while (cut) {
            const char *next = memchr(cut + 1, 0x01, (size_t)(end - cut - 1));
            frame(in, cut + 1, (size_t)((next ? next : end) - cut - 1));
            cut = next;
        }
    }
    fflush(in);
    rewind(in);
    lsp_serve(fileno(in), out);
    fclose(in);
    fclose(out);
    return 0;
}
