/* sarif.c — `check --format sarif`: SARIF 2.1.0 (OASIS), written by the one
 * JSON writer (json_out.h) in its indented form.
 *
 * One run for the whole command: the tool's driver lists one rule per kind
 * of finding (finding_rules), every diagnostic and every failing check is a
 * result with its rule, level, message and location. Columns are UTF-16
 * code units, the SARIF default, stated in the run's columnKind. A file name
 * becomes a URI reference: relative paths stay relative, absolute ones get
 * the file scheme, and every byte outside the unreserved set and '/' is
 * percent-encoded. */
#include <stdlib.h>
#include <string.h>

#include "json_out.h"
#include "render.h"

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

static const char sarif_schema[] =
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

static char *file_uri(const char *path)
{
    StrBuf sb = {0};
    if (path[0] == '/')
        sb_puts(&sb, "file://");
    for (const unsigned char *p = (const unsigned char *)path; *p; p++) {
        unsigned char c = *p;
        if ((c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '-' ||
            c == '.' || c == '_' || c == '~' || c == '/')
            sb_putc(&sb, (char)c);
        else
            sb_printf(&sb, "%%%02X", c);
    }
    char *s = xstrdup(sb_str(&sb));
    sb_free(&sb);
    return s;
}

static void text_object(JsonOut *w, const char *key, const char *s)
{
    json_out_begin_object(w, key);
    json_out_text(w, "text", s);
    json_out_end_object(w);
}

/* artifact < 0: a used file, not one of the run's artifacts (no index). */
static void location_write(JsonOut *w, const char *file, long long artifact, int line, int col)
{
    char *uri = file_uri(file);
    json_out_begin_array(w, "locations");
    json_out_begin_object(w, NULL);
    json_out_begin_object(w, "physicalLocation");
    json_out_begin_object(w, "artifactLocation");
    json_out_string(w, "uri", uri);
    if (artifact >= 0)
        json_out_int(w, "index", artifact);
    json_out_end_object(w);
    if (line > 0) {
        json_out_begin_object(w, "region");
        json_out_int(w, "startLine", line);
        json_out_int(w, "startColumn", col > 0 ? col : 1);
        json_out_end_object(w);
    }
    json_out_end_object(w);
    json_out_end_object(w);
    json_out_end_array(w);
    free(uri);
}

static void result_open(JsonOut *w, FindingKind kind, const char *level, const char *message)
{
    json_out_begin_object(w, NULL);
    json_out_string(w, "ruleId", finding_rules[kind].id);
    json_out_int(w, "ruleIndex", kind);
    json_out_string(w, "level", level);
    text_object(w, "message", message);
}

static void rules_write(JsonOut *w)
{
    json_out_begin_array(w, "rules");
    for (int k = 0; k < FIND_KINDS; k++) {
        const char *level = k == FIND_WARNING ? "warning" : k == FIND_NOTE ? "note" : "error";
        json_out_begin_object(w, NULL);
        json_out_string(w, "id", finding_rules[k].id);
        text_object(w, "shortDescription", finding_rules[k].title);
        json_out_begin_object(w, "defaultConfiguration");
        json_out_string(w, "level", level);
        json_out_end_object(w);
        json_out_end_object(w);
    }
    json_out_end_array(w);
}

static void results_write(JsonOut *w, const CheckRun *runs, size_t n)
{
    json_out_begin_array(w, "results");
    for (size_t f = 0; f < n; f++) {
        const CheckRun *run = &runs[f];
        const Evaluated *ev = run->ev;
        for (size_t i = 0; run->diags && i < run->diags->len; i++) {
            const Diag *d = &run->diags->items[i];
            FindingKind k = finding_of_diag(d);
            const char *level = d->severity == SEV_ERROR ? "error" : d->severity == SEV_WARNING ? "warning" : "note";
            bool here = !d->pos.file || (ev && strcmp(d->pos.file, ev->doc->file) == 0) ||
                        strcmp(d->pos.file, run->file) == 0;
            int col = render_utf16_col(here && ev ? ev->doc : NULL, d->pos.line, d->pos.col);
            result_open(w, k, level, d->message);
            location_write(w, here || !d->pos.file ? run->file : d->pos.file, here ? (long long)f : -1, d->pos.line,
                           col);
            json_out_end_object(w);
        }
        for (size_t i = 0; ev && i < ev->doc->nstmts; i++) {
            const Stmt *s = ev->doc->stmts[i];
            if (s->kind != STMT_CHECK || s->finding || ev->results[i].state != RES_OK)
                continue;
            StrBuf v = {0}, msg = {0};
            bool fails;
            render_check_verdict(ev, i, &v, &fails);
            if (fails) {
                sb_printf(&msg, "check '%s' fails: %s", s->label ? s->label : "", sb_str(&v));
                result_open(w, FIND_CHECK_FAILS, "error", sb_str(&msg));
                location_write(w, run->file, (long long)f, s->pos.line,
                               render_utf16_col(ev->doc, s->pos.line, s->pos.col));
                json_out_end_object(w);
            }
            sb_free(&v);
            sb_free(&msg);
        }
    }
    json_out_end_array(w);
}

bool render_sarif(const CheckRun *runs, size_t n, FILE *out)
{
    JsonOut w;
    json_out_init(&w, out);
    json_out_begin_object(&w, NULL);
    json_out_string(&w, "$schema", sarif_schema);
    json_out_string(&w, "version", "2.1.0");
    json_out_begin_array(&w, "runs");
    json_out_begin_object(&w, NULL);
    json_out_begin_object(&w, "tool");
    json_out_begin_object(&w, "driver");
    json_out_string(&w, "name", "headroom");
    json_out_string(&w, "version", HEADROOM_VERSION);
    rules_write(&w);
    json_out_end_object(&w);
    json_out_end_object(&w);
    json_out_string(&w, "columnKind", "utf16CodeUnits");
    json_out_begin_array(&w, "artifacts");
    for (size_t f = 0; f < n; f++) {
        char *uri = file_uri(runs[f].file);
        json_out_begin_object(&w, NULL);
        json_out_begin_object(&w, "location");
        json_out_string(&w, "uri", uri);
        json_out_end_object(&w);
        if (runs[f].ev) {
            json_out_begin_object(&w, "hashes");
            json_out_string(&w, "sha-256", runs[f].ev->doc->digest);
            json_out_end_object(&w);
        }
        json_out_end_object(&w);
        free(uri);
    }
    json_out_end_array(&w);
    results_write(&w, runs, n);
    json_out_end_object(&w);
    json_out_end_array(&w);
    json_out_end_object(&w);
    bool ok = json_out_finish(&w);
    fputc('\n', out);
    return ok && !ferror(out);
}
