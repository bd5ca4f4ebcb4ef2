/* diff_json.c — `headroom diff --json`, written by the streaming writer
 * json_out.h.
 *
 * The shape (also in the README, "Reviewing revisions"):
 *   { "old": {"file", "digest", "revision"}, "new": {...},
 *     "rel_tol": 1e-9, "changed": true,
 *     "front_matter": [{"key", "old", "new", "display_only"}],
 *     "inputs":  [{"name", "line", "old_line", "old", "new", "relative_change"}],
 *     "results": [{"name", "line", "old_line", "old", "new", "relative_change",
 *                  "formula_changed", "inputs": ["Q", ...]}],
 *     "checks":  [{"label", "line", "old_line", "change", "old_holds", "new_holds",
 *                  "old_utilization", "new_utilization", "condition_changed"}],
 *     "statements": [{"change", "kind", "name", "old_name", "line", "old_line"}],
 *     "citations":  [{"change", "key", "old", "new", "name", "line"}],
 *     "prose": [{"section", "number", "change", "line", "old_section" (a reworded
 *                heading), "paragraphs_changed",
 *                "paragraphs_added", "paragraphs_removed"}] }
 * A value ("old", "new") is {"si", "si_unit", "text"} for a number (text in
 * the unit the document shows it in), {"text"} for a string and null when
 * absent; "relative_change" is (new - old)/|old| or null. Checks come in the
 * order now fails, now holds, then the rest ("change": "now_fails",
 * "now_holds", "utilization", "condition"). */
#include <string.h>

#include "diff.h"
#include "json_out.h"
#include "render.h"

/* null without a text; a text that is not UTF-8 leaves the member out */
static void text_or_null(JsonOut *w, const char *key, const char *s)
{
    if (s)
        json_out_string(w, key, s);
    else
        json_out_null(w, key);
}

static void value_write(JsonOut *w, const char *key, const Evaluated *ev, const Value *v, const Unit *u)
{
    switch (v->kind) {
    case VAL_NUMBER: {
        char si_unit[64];
        StrBuf sb = {0};
        dim_format_si(v->q.dim, si_unit, sizeof si_unit);
        json_out_begin_object(w, key);
        json_out_real(w, "si", v->q.si);
        json_out_string(w, "si_unit", si_unit);
        render_value_text(ev, v, u, &sb);
        json_out_string(w, "text", sb_str(&sb));
        json_out_end_object(w);
        sb_free(&sb);
        break;
    }
    case VAL_STRING:
        json_out_begin_object(w, key);
        json_out_string(w, "text", v->str);
        json_out_end_object(w);
        break;
    case VAL_RECORD:
        json_out_begin_object(w, key);
        json_out_string(w, "record", v->rec->type);
        json_out_end_object(w);
        break;
    default:
        json_out_null(w, key);
        break;
    }
}

static void lines_write(JsonOut *w, const Diff *d, int new_slot, int old_slot)
{
    if (new_slot >= 0)
        json_out_int(w, "line", d->new_ev->doc->stmts[new_slot]->pos.line);
    else
        json_out_null(w, "line");
    if (old_slot >= 0)
        json_out_int(w, "old_line", d->old_ev->doc->stmts[old_slot]->pos.line);
    else
        json_out_null(w, "old_line");
}

static void side_write(JsonOut *w, const char *key, const Document *doc)
{
    json_out_begin_object(w, key);
    json_out_string(w, "file", doc->file);
    json_out_string(w, "digest", doc->digest);
    text_or_null(w, "revision", doc->meta.revision);
    json_out_end_object(w);
}

static void value_change_write(JsonOut *w, const Diff *d, const ValueChange *c, bool result)
{
    json_out_begin_object(w, NULL);
    json_out_string(w, "name", c->name);
    lines_write(w, d, c->new_slot, c->old_slot);
    value_write(w, "old", d->old_ev, &c->old_value, &c->old_unit);
    value_write(w, "new", d->new_ev, &c->new_value, &c->new_unit);
    json_out_real(w, "relative_change", c->rel);
    json_out_bool(w, "dimension_changed", c->dim_changed);
    if (result) {
        json_out_bool(w, "formula_changed", c->formula_changed);
        json_out_begin_array(w, "inputs");
        for (size_t k = 0; k < c->ninputs; k++)
            json_out_string(w, NULL, d->inputs[c->inputs[k]].name);
        json_out_end_array(w);
    }
    json_out_end_object(w);
}

static const char *stmt_kind(const Stmt *s)
{
    switch (s->kind) {
    case STMT_CHECK: return s->finding ? "finding" : "check";
    case STMT_SOLVE: return "solve";
    case STMT_PATH: return "path";
    case STMT_NETWORK: return "network";
    case STMT_CURVE: return "curve";
    default: return "value";
    }
}

static const char *stmt_title(const Stmt *s)
{
    return s->kind == STMT_CHECK ? s->label : s->name;
}

static void cites_write(JsonOut *w, const char *key, const Stmt *s)
{
    json_out_begin_array(w, key);
    for (size_t k = 0; k < s->ncites; k++)
        json_out_string(w, NULL, s->cites[k].key);
    json_out_end_array(w);
}

static void citation_write(JsonOut *w, const Diff *d, const CiteChange *c)
{
    const Document *od = d->old_ev->doc, *nd = d->new_ev->doc;
    const Source *os = c->old_source >= 0 ? &od->sources[c->old_source] : NULL;
    const Source *ns = c->new_source >= 0 ? &nd->sources[c->new_source] : NULL;
    static const char *const names[] = {"source_changed", "source_added", "source_removed", "cites_changed"};
    json_out_begin_object(w, NULL);
    json_out_string(w, "change", names[c->kind]);
    if (c->kind == CITE_STMT_CITES) {
        const Stmt *a = od->stmts[c->old_slot], *b = nd->stmts[c->new_slot];
        json_out_string(w, "name", stmt_title(b));
        json_out_string(w, "kind", stmt_kind(b));
        cites_write(w, "old", a);
        cites_write(w, "new", b);
        lines_write(w, d, c->new_slot, c->old_slot);
    } else {
        json_out_string(w, "key", ns ? ns->key : os->key);
        text_or_null(w, "old", os ? os->text : NULL);
        text_or_null(w, "new", ns ? ns->text : NULL);
        if (ns)
            json_out_int(w, "line", ns->pos.line);
        else
            json_out_null(w, "line");
        if (os)
            json_out_int(w, "old_line", os->pos.line);
        else
            json_out_null(w, "old_line");
    }
    json_out_end_object(w);
}

/* A title, or null without the statement (a title that is missing or not
 * UTF-8 leaves the member out). */
static void title_or_null(JsonOut *w, const char *key, const Stmt *s)
{
    if (s)
        json_out_string(w, key, stmt_title(s));
    else
        json_out_null(w, key);
}

static void diff_write(JsonOut *w, const char *key, const Diff *d)
{
    json_out_begin_object(w, key);
    side_write(w, "old", d->old_ev->doc);
    side_write(w, "new", d->new_ev->doc);
    json_out_real(w, "rel_tol", d->opt.rel_tol);
    json_out_bool(w, "changed", d->changed);

    json_out_begin_array(w, "front_matter");
    for (size_t i = 0; i < d->nmeta; i++) {
        json_out_begin_object(w, NULL);
        json_out_string(w, "key", d->meta[i].key);
        json_out_string(w, "old", d->meta[i].old_text);
        json_out_string(w, "new", d->meta[i].new_text);
        json_out_bool(w, "display_only", d->meta[i].display_only);
        json_out_end_object(w);
    }
    json_out_end_array(w);

    json_out_begin_array(w, "inputs");
    for (size_t i = 0; i < d->ninputs; i++)
        value_change_write(w, d, &d->inputs[i], false);
    json_out_end_array(w);
    json_out_begin_array(w, "results");
    for (size_t i = 0; i < d->nresults; i++)
        value_change_write(w, d, &d->results[i], true);
    json_out_end_array(w);

    static const char *const kinds[] = {"now_fails", "now_holds", "utilization", "condition"};
    json_out_begin_array(w, "checks");
    for (size_t i = 0; i < d->nchecks; i++) {
        const CheckChange *c = &d->checks[i];
        json_out_begin_object(w, NULL);
        json_out_string(w, "label", d->new_ev->doc->stmts[c->new_slot]->label);
        lines_write(w, d, c->new_slot, c->old_slot);
        json_out_string(w, "change", kinds[c->kind]);
        json_out_bool(w, "old_holds", d->old_ev->results[c->old_slot].holds);
        json_out_bool(w, "new_holds", d->new_ev->results[c->new_slot].holds);
        json_out_real(w, "old_utilization", c->old_util);
        json_out_real(w, "new_utilization", c->new_util);
        json_out_bool(w, "condition_changed", c->condition_changed);
        json_out_end_object(w);
    }
    json_out_end_array(w);
    if (d->nfindings) {
        static const char *const fkinds[] = {"now_no", "now_yes", "", "condition"};
        json_out_begin_array(w, "findings");
        for (size_t i = 0; i < d->nfindings; i++) {
            const CheckChange *c = &d->findings[i];
            json_out_begin_object(w, NULL);
            json_out_string(w, "label", d->new_ev->doc->stmts[c->new_slot]->label);
            lines_write(w, d, c->new_slot, c->old_slot);
            json_out_string(w, "change", fkinds[c->kind]);
            json_out_bool(w, "old_answer", d->old_ev->results[c->old_slot].holds);
            json_out_bool(w, "new_answer", d->new_ev->results[c->new_slot].holds);
            json_out_bool(w, "condition_changed", c->condition_changed);
            json_out_end_object(w);
        }
        json_out_end_array(w);
    }

    static const char *const changes[] = {"added", "removed", "renamed"};
    json_out_begin_array(w, "statements");
    for (size_t i = 0; i < d->nstmts; i++) {
        const StmtChange *c = &d->stmts[i];
        const Stmt *os = c->old_slot >= 0 ? d->old_ev->doc->stmts[c->old_slot] : NULL;
        const Stmt *ns = c->new_slot >= 0 ? d->new_ev->doc->stmts[c->new_slot] : NULL;
        json_out_begin_object(w, NULL);
        json_out_string(w, "change", changes[c->kind]);
        json_out_string(w, "kind", stmt_kind(ns ? ns : os));
        title_or_null(w, "name", ns);
        title_or_null(w, "old_name", os);
        lines_write(w, d, c->new_slot, c->old_slot);
        json_out_end_object(w);
    }
    json_out_end_array(w);

    json_out_begin_array(w, "citations");
    for (size_t i = 0; i < d->ncites; i++)
        citation_write(w, d, &d->cites[i]);
    json_out_end_array(w);

    static const char *const pk[] = {"changed", "added", "removed"};
    json_out_begin_array(w, "prose");
    for (size_t i = 0; i < d->nprose; i++) {
        const ProseChange *c = &d->prose[i];
        json_out_begin_object(w, NULL);
        text_or_null(w, "section", c->heading);
        json_out_string(w, "number", c->number);
        json_out_string(w, "change", pk[c->kind]);
        if (c->old_heading)
            json_out_string(w, "old_section", c->old_heading);
        json_out_int(w, c->kind == PROSE_REMOVED ? "old_line" : "line", c->line);
        json_out_int(w, "paragraphs_changed", (long long)c->changed);
        json_out_int(w, "paragraphs_added", (long long)c->added);
        json_out_int(w, "paragraphs_removed", (long long)c->removed);
        json_out_end_object(w);
    }
    json_out_end_array(w);

    if (d->nuses) {
        static const char *const uk[] = {"changed", "added", "removed"};
        json_out_begin_array(w, "uses");
        for (size_t i = 0; i < d->nuses; i++) {
            const UseChange *c = &d->uses[i];
            json_out_begin_object(w, NULL);
            json_out_string(w, "file", c->name);
            json_out_string(w, "change", uk[c->kind]);
            text_or_null(w, "old_digest", c->old_digest);
            text_or_null(w, "new_digest", c->new_digest);
            json_out_begin_array(w, "moved");
            for (size_t k = 0; k < c->nmoved; k++)
                json_out_string(w, NULL, d->results[c->moved[k]].name);
            json_out_end_array(w);
            json_out_end_object(w);
        }
        json_out_end_array(w);
    }
    json_out_end_object(w);
}

bool render_diff_json(const Diff *d, FILE *out)
{
    JsonOut w;
    json_out_init(&w, out);
    diff_write(&w, NULL, d);
    bool ok = json_out_finish(&w);
    fputc('\n', out);
    return ok && !ferror(out);
}

bool render_package_diff_json(const Diff *index, const PartDiff *parts, size_t n, FILE *out)
{
    static const char *const kind[] = {"same", "changed", "added", "removed"};
    bool changed = index->changed;
    for (size_t i = 0; i < n; i++) {
        const PartDiff *p = &parts[i];
        changed |= p->added || p->removed || (p->diff && p->diff->changed);
    }
    JsonOut w;
    json_out_init(&w, out);
    json_out_begin_object(&w, NULL);
    side_write(&w, "old", index->old_ev->doc);
    side_write(&w, "new", index->new_ev->doc);
    json_out_bool(&w, "changed", changed);
    diff_write(&w, "index", index);
    json_out_begin_array(&w, "parts");
    for (size_t i = 0; i < n; i++) {
        const PartDiff *p = &parts[i];
        int k = p->added ? 2 : p->removed ? 3 : p->diff && p->diff->changed ? 1 : 0;
        json_out_begin_object(&w, NULL);
        json_out_string(&w, "file", p->file);
        json_out_string(&w, "change", kind[k]);
        if (p->diff)
            diff_write(&w, "diff", p->diff);
        else
            json_out_null(&w, "diff");
        json_out_end_object(&w);
    }
    json_out_end_array(&w);
    json_out_end_object(&w);
    bool ok = json_out_finish(&w);
    fputc('\n', out);
    return ok && !ferror(out);
}
