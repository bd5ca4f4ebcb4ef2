/* sarif.c — `check --format sarif`: SARIF 2.1.0 (OASIS), written with jansson.
 *
 * One run for the whole command: the tool's driver lists one rule per kind
 * of finding (finding_rules), every diagnostic and every failing check is a
 * result with its rule, level, message and location. Columns are UTF-16
 * code units, the SARIF default, stated in the run's columnKind. A file name
 * becomes a URI reference: relative paths stay relative, absolute ones get
 * the file scheme, and every byte outside the unreserved set and '/' is
 * percent-encoded. The JSON adapter for this format; json.c has the other. */
#include <jansson.h>

#include "json_text.h"
#include <stdlib.h>
#include <string.h>

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

static json_t *text_object(const char *s)
{
    return json_pack("{s:o}", "text", json_text(s));
}

static json_t *location(const char *file, size_t artifact, int line, int col)
{
    char *uri = file_uri(file);
    json_t *phys = json_object();
    json_object_set_new(phys, "artifactLocation", json_pack("{s:s,s:I}", "uri", uri, "index", (json_int_t)artifact));
    if (line > 0)
        json_object_set_new(phys, "region", json_pack("{s:i,s:i}", "startLine", line, "startColumn", col > 0 ? col : 1));
    free(uri);
    return json_pack("{s:o}", "physicalLocation", phys);
}

static json_t *result(FindingKind kind, const char *level, const char *message, json_t *loc)
{
    json_t *r = json_object();
    json_object_set_new(r, "ruleId", json_string(finding_rules[kind].id));
    json_object_set_new(r, "ruleIndex", json_integer(kind));
    json_object_set_new(r, "level", json_string(level));
    json_object_set_new(r, "message", text_object(message));
    json_object_set_new(r, "locations", json_pack("[o]", loc));
    return r;
}

static json_t *rules_json(void)
{
    json_t *rules = json_array();
    for (int k = 0; k < FIND_KINDS; k++) {
        const char *level = k == FIND_WARNING ? "warning" : k == FIND_NOTE ? "note" : "error";
        json_array_append_new(rules, json_pack("{s:s,s:o,s:{s:s}}", "id", finding_rules[k].id, "shortDescription",
                                               text_object(finding_rules[k].title), "defaultConfiguration",
                                               "level", level));
    }
    return rules;
}

bool render_sarif(const CheckRun *runs, size_t n, FILE *out)
{
    json_t *results = json_array(), *artifacts = json_array();
    for (size_t f = 0; f < n; f++) {
        const CheckRun *run = &runs[f];
        const Evaluated *ev = run->ev;
        char *uri = file_uri(run->file);
        json_t *art = json_pack("{s:{s:s}}", "location", "uri", uri);
        free(uri);
        if (ev)
            json_object_set_new(art, "hashes", json_pack("{s:s}", "sha-256", ev->doc->digest));
        json_array_append_new(artifacts, art);
        for (size_t i = 0; run->diags && i < run->diags->len; i++) {
            const Diag *d = &run->diags->items[i];
            FindingKind k = finding_of_diag(d);
            const char *level = d->severity == SEV_ERROR ? "error" : d->severity == SEV_WARNING ? "warning" : "note";
            bool here = !d->pos.file || (ev && strcmp(d->pos.file, ev->doc->file) == 0) ||
                        strcmp(d->pos.file, run->file) == 0;
            int col = render_utf16_col(here && ev ? ev->doc : NULL, d->pos.line, d->pos.col);
            json_t *loc = location(here || !d->pos.file ? run->file : d->pos.file, f, d->pos.line, col);
            if (!here) /* a used file: not one of the run's artifacts */
                json_object_del(json_object_get(json_object_get(loc, "physicalLocation"), "artifactLocation"),
                                "index");
            json_array_append_new(results, result(k, level, d->message, loc));
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
                json_array_append_new(results, result(FIND_CHECK_FAILS, "error", sb_str(&msg),
                                                      location(run->file, f, s->pos.line,
                                                               render_utf16_col(ev->doc, s->pos.line, s->pos.col))));
            }
            sb_free(&v);
            sb_free(&msg);
        }
    }
    json_t *driver = json_pack("{s:s,s:s,s:o}", "name", "headroom", "version", HEADROOM_VERSION, "rules", rules_json());
    json_t *run = json_object();
    json_object_set_new(run, "tool", json_pack("{s:o}", "driver", driver));
    json_object_set_new(run, "columnKind", json_string("utf16CodeUnits"));
    json_object_set_new(run, "artifacts", artifacts);
    json_object_set_new(run, "results", results);
    json_t *root = json_object();
    json_object_set_new(root, "$schema", json_string(sarif_schema));
    json_object_set_new(root, "version", json_string("2.1.0"));
    json_object_set_new(root, "runs", json_pack("[o]", run));
    int rc = json_dumpf(root, out, JSON_INDENT(2) | JSON_PRESERVE_ORDER);
    fputc('\n', out);
    json_decref(root);
    return rc == 0 && !ferror(out);
}
