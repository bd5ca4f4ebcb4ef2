/* diff_json.c — `headroom diff --json`, written with jansson.
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
 * "now_holds", "utilization", "condition"). Only the JSON writers include
 * jansson. */
#include <jansson.h>
#include <math.h>
#include <string.h>

#include "diff.h"
#include "render.h"

static json_t *real_or_null(double x)
{
    return isfinite(x) ? json_real(x) : json_null();
}

static json_t *text_or_null(const char *s)
{
    return s ? json_string(s) : json_null();
}

static json_t *value_json(const Evaluated *ev, const Value *v, const Unit *u)
{
    json_t *o = json_object();
    StrBuf sb = {0};
    switch (v->kind) {
    case VAL_NUMBER: {
        char si_unit[64];
        dim_format_si(v->q.dim, si_unit, sizeof si_unit);
        json_object_set_new(o, "si", real_or_null(v->q.si));
        json_object_set_new(o, "si_unit", json_string(si_unit));
        render_value_text(ev, v, u, &sb);
        json_object_set_new(o, "text", json_string(sb_str(&sb)));
        break;
    }
    case VAL_STRING:
        json_object_set_new(o, "text", json_string(v->str));
        break;
    case VAL_RECORD:
        json_object_set_new(o, "record", json_string(v->rec->type));
        break;
    default:
        json_decref(o);
        o = json_null();
        break;
    }
    sb_free(&sb);
    return o;
}

static void set_lines(json_t *o, const Diff *d, int new_slot, int old_slot)
{
    json_object_set_new(o, "line", new_slot >= 0 ? json_integer(d->new_ev->doc->stmts[new_slot]->pos.line) : json_null());
    json_object_set_new(o, "old_line", old_slot >= 0 ? json_integer(d->old_ev->doc->stmts[old_slot]->pos.line) : json_null());
}

static json_t *side_json(const Document *doc)
{
    json_t *o = json_object();
    json_object_set_new(o, "file", json_string(doc->file));
    json_object_set_new(o, "digest", json_string(doc->digest));
    json_object_set_new(o, "revision", text_or_null(doc->meta.revision));
    return o;
}

static json_t *value_change_json(const Diff *d, const ValueChange *c, bool result)
{
    json_t *o = json_object();
    json_object_set_new(o, "name", json_string(c->name));
    set_lines(o, d, c->new_slot, c->old_slot);
    json_object_set_new(o, "old", value_json(d->old_ev, &c->old_value, &c->old_unit));
    json_object_set_new(o, "new", value_json(d->new_ev, &c->new_value, &c->new_unit));
    json_object_set_new(o, "relative_change", real_or_null(c->rel));
    json_object_set_new(o, "dimension_changed", json_boolean(c->dim_changed));
    if (result) {
        json_object_set_new(o, "formula_changed", json_boolean(c->formula_changed));
        json_t *in = json_array();
        for (size_t k = 0; k < c->ninputs; k++)
            json_array_append_new(in, json_string(d->inputs[c->inputs[k]].name));
        json_object_set_new(o, "inputs", in);
    }
    return o;
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

static json_t *cites_json(const Stmt *s)
{
    json_t *a = json_array();
    for (size_t k = 0; k < s->ncites; k++)
        json_array_append_new(a, json_string(s->cites[k].key));
    return a;
}

static json_t *citation_json(const Diff *d, const CiteChange *c)
{
    const Document *od = d->old_ev->doc, *nd = d->new_ev->doc;
    const Source *os = c->old_source >= 0 ? &od->sources[c->old_source] : NULL;
    const Source *ns = c->new_source >= 0 ? &nd->sources[c->new_source] : NULL;
    json_t *o = json_object();
    static const char *const names[] = {"source_changed", "source_added", "source_removed", "cites_changed"};
    json_object_set_new(o, "change", json_string(names[c->kind]));
    if (c->kind == CITE_STMT_CITES) {
        const Stmt *a = od->stmts[c->old_slot], *b = nd->stmts[c->new_slot];
        json_object_set_new(o, "name", json_string(stmt_title(b)));
        json_object_set_new(o, "kind", json_string(stmt_kind(b)));
        json_object_set_new(o, "old", cites_json(a));
        json_object_set_new(o, "new", cites_json(b));
        set_lines(o, d, c->new_slot, c->old_slot);
    } else {
        json_object_set_new(o, "key", json_string(ns ? ns->key : os->key));
        json_object_set_new(o, "old", text_or_null(os ? os->text : NULL));
        json_object_set_new(o, "new", text_or_null(ns ? ns->text : NULL));
        json_object_set_new(o, "line", ns ? json_integer(ns->pos.line) : json_null());
        json_object_set_new(o, "old_line", os ? json_integer(os->pos.line) : json_null());
    }
    return o;
}

static json_t *diff_json(const Diff *d)
{
    json_t *root = json_object();
    json_object_set_new(root, "old", side_json(d->old_ev->doc));
    json_object_set_new(root, "new", side_json(d->new_ev->doc));
    json_object_set_new(root, "rel_tol", json_real(d->opt.rel_tol));
    json_object_set_new(root, "changed", json_boolean(d->changed));

    json_t *meta = json_array();
    for (size_t i = 0; i < d->nmeta; i++) {
        json_t *m = json_object();
        json_object_set_new(m, "key", json_string(d->meta[i].key));
        json_object_set_new(m, "old", json_string(d->meta[i].old_text));
        json_object_set_new(m, "new", json_string(d->meta[i].new_text));
        json_object_set_new(m, "display_only", json_boolean(d->meta[i].display_only));
        json_array_append_new(meta, m);
    }
    json_object_set_new(root, "front_matter", meta);

    json_t *inputs = json_array(), *results = json_array();
    for (size_t i = 0; i < d->ninputs; i++)
        json_array_append_new(inputs, value_change_json(d, &d->inputs[i], false));
    for (size_t i = 0; i < d->nresults; i++)
        json_array_append_new(results, value_change_json(d, &d->results[i], true));
    json_object_set_new(root, "inputs", inputs);
    json_object_set_new(root, "results", results);

    json_t *checks = json_array();
    static const char *const kinds[] = {"now_fails", "now_holds", "utilization", "condition"};
    for (size_t i = 0; i < d->nchecks; i++) {
        const CheckChange *c = &d->checks[i];
        json_t *o = json_object();
        json_object_set_new(o, "label", json_string(d->new_ev->doc->stmts[c->new_slot]->label));
        set_lines(o, d, c->new_slot, c->old_slot);
        json_object_set_new(o, "change", json_string(kinds[c->kind]));
        json_object_set_new(o, "old_holds", json_boolean(d->old_ev->results[c->old_slot].holds));
        json_object_set_new(o, "new_holds", json_boolean(d->new_ev->results[c->new_slot].holds));
        json_object_set_new(o, "old_utilization", real_or_null(c->old_util));
        json_object_set_new(o, "new_utilization", real_or_null(c->new_util));
        json_object_set_new(o, "condition_changed", json_boolean(c->condition_changed));
        json_array_append_new(checks, o);
    }
    json_object_set_new(root, "checks", checks);
    if (d->nfindings) {
        json_t *findings = json_array();
        static const char *const fkinds[] = {"now_no", "now_yes", "", "condition"};
        for (size_t i = 0; i < d->nfindings; i++) {
            const CheckChange *c = &d->findings[i];
            json_t *o = json_object();
            json_object_set_new(o, "label", json_string(d->new_ev->doc->stmts[c->new_slot]->label));
            set_lines(o, d, c->new_slot, c->old_slot);
            json_object_set_new(o, "change", json_string(fkinds[c->kind]));
            json_object_set_new(o, "old_answer", json_boolean(d->old_ev->results[c->old_slot].holds));
            json_object_set_new(o, "new_answer", json_boolean(d->new_ev->results[c->new_slot].holds));
            json_object_set_new(o, "condition_changed", json_boolean(c->condition_changed));
            json_array_append_new(findings, o);
        }
        json_object_set_new(root, "findings", findings);
    }

    json_t *stmts = json_array();
    static const char *const changes[] = {"added", "removed", "renamed"};
    for (size_t i = 0; i < d->nstmts; i++) {
        const StmtChange *c = &d->stmts[i];
        const Stmt *os = c->old_slot >= 0 ? d->old_ev->doc->stmts[c->old_slot] : NULL;
        const Stmt *ns = c->new_slot >= 0 ? d->new_ev->doc->stmts[c->new_slot] : NULL;
        json_t *o = json_object();
        json_object_set_new(o, "change", json_string(changes[c->kind]));
        json_object_set_new(o, "kind", json_string(stmt_kind(ns ? ns : os)));
        json_object_set_new(o, "name", ns ? json_string(stmt_title(ns)) : json_null());
        json_object_set_new(o, "old_name", os ? json_string(stmt_title(os)) : json_null());
        set_lines(o, d, c->new_slot, c->old_slot);
        json_array_append_new(stmts, o);
    }
    json_object_set_new(root, "statements", stmts);

    json_t *cites = json_array();
    for (size_t i = 0; i < d->ncites; i++)
        json_array_append_new(cites, citation_json(d, &d->cites[i]));
    json_object_set_new(root, "citations", cites);

    json_t *prose = json_array();
    static const char *const pk[] = {"changed", "added", "removed"};
    for (size_t i = 0; i < d->nprose; i++) {
        const ProseChange *c = &d->prose[i];
        json_t *o = json_object();
        json_object_set_new(o, "section", text_or_null(c->heading));
        json_object_set_new(o, "number", json_string(c->number));
        json_object_set_new(o, "change", json_string(pk[c->kind]));
        if (c->old_heading)
            json_object_set_new(o, "old_section", json_string(c->old_heading));
        json_object_set_new(o, c->kind == PROSE_REMOVED ? "old_line" : "line", json_integer(c->line));
        json_object_set_new(o, "paragraphs_changed", json_integer((json_int_t)c->changed));
        json_object_set_new(o, "paragraphs_added", json_integer((json_int_t)c->added));
        json_object_set_new(o, "paragraphs_removed", json_integer((json_int_t)c->removed));
        json_array_append_new(prose, o);
    }
    json_object_set_new(root, "prose", prose);

    if (d->nuses) {
        static const char *const uk[] = {"changed", "added", "removed"};
        json_t *uses = json_array();
        for (size_t i = 0; i < d->nuses; i++) {
            const UseChange *c = &d->uses[i];
            json_t *o = json_object();
            json_object_set_new(o, "file", json_string(c->name));
            json_object_set_new(o, "change", json_string(uk[c->kind]));
            json_object_set_new(o, "old_digest", text_or_null(c->old_digest));
            json_object_set_new(o, "new_digest", text_or_null(c->new_digest));
            json_t *moved = json_array();
            for (size_t k = 0; k < c->nmoved; k++) {
                const ValueChange *v = &d->results[c->moved[k]];
                json_array_append_new(moved, json_string(v->name));
            }
            json_object_set_new(o, "moved", moved);
            json_array_append_new(uses, o);
        }
        json_object_set_new(root, "uses", uses);
    }

    return root;
}

static bool dump(json_t *root, FILE *out)
{
    int rc = json_dumpf(root, out, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17));
    fputc('\n', out);
    json_decref(root);
    return rc == 0;
}

bool render_diff_json(const Diff *d, FILE *out)
{
    return dump(diff_json(d), out);
}

bool render_package_diff_json(const Diff *index, const PartDiff *parts, size_t n, FILE *out)
{
    json_t *root = json_object();
    json_object_set_new(root, "old", side_json(index->old_ev->doc));
    json_object_set_new(root, "new", side_json(index->new_ev->doc));
    bool changed = index->changed;
    json_t *arr = json_array();
    static const char *const kind[] = {"same", "changed", "added", "removed"};
    for (size_t i = 0; i < n; i++) {
        const PartDiff *p = &parts[i];
        int k = p->added ? 2 : p->removed ? 3 : p->diff && p->diff->changed ? 1 : 0;
        changed |= k != 0;
        json_t *o = json_object();
        json_object_set_new(o, "file", json_string(p->file));
        json_object_set_new(o, "change", json_string(kind[k]));
        json_object_set_new(o, "diff", p->diff ? diff_json(p->diff) : json_null());
        json_array_append_new(arr, o);
    }
    json_object_set_new(root, "changed", json_boolean(changed));
    json_object_set_new(root, "index", diff_json(index));
    json_object_set_new(root, "parts", arr);
    return dump(root, out);
}
