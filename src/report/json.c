/* json.c — the JSON results of DESIGN 2.5, written with jansson.
 *
 * Other tools and the tests read this, so its shape is fixed: file, digest,
 * meta, values (by name), checks (in source order), diagnostics. `si` holds
 * the value in coherent SI base units at full precision (jansson prints
 * reals with 17 significant digits, which round-trips); `shown` is the value
 * in its display unit rounded to the document's significant digits, as the
 * report prints it. json_text() (json_text.h), the one encoder of a C string
 * that every jansson user shares, lives here too. */
#include <jansson.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "json_text.h"
#include "numfmt.h"
#include "render.h"
#include "uses.h"

static json_t *real_or_null(double x)
{
    return isfinite(x) ? json_real(x) : json_null();
}

static double rounded(double x, int digits)
{
    char buf[64];
    NumParts p = num_parts(x, digits);
    snprintf(buf, sizeof buf, "%se%d", p.mantissa, p.exp10);
    return strtod(buf, NULL);
}

static json_t *number_json(const Evaluated *ev, const Value *v, const Unit *shown)
{
    json_t *o = json_object();
    char si_unit[64];
    dim_format_si(v->q.dim, si_unit, sizeof si_unit);
    Unit u = shown && shown->text[0] ? *shown : eval_display_unit(ev, v, NULL);
    json_object_set_new(o, "kind", json_string("number"));
    json_object_set_new(o, "si", real_or_null(v->q.si));
    json_object_set_new(o, "si_unit", json_string(si_unit));
    json_object_set_new(o, "shown", real_or_null(rounded(unit_from_si(v->q.si, &u, v->q.temp == TEMP_NONE), ev->digits)));
    json_object_set_new(o, "unit", json_string(strcmp(u.text, "1") == 0 ? "" : u.text));
    if (v->q.temp != TEMP_NONE)
        json_object_set_new(o, "temperature", json_string("absolute"));
    if (v->q.pref != PRES_PLAIN)
        json_object_set_new(o, "pressure", json_string(pressure_ref_name(v->q.pref)));
    return o;
}

static json_t *value_json(const Evaluated *ev, const Value *v, const Unit *shown)
{
    switch (v->kind) {
    case VAL_NUMBER:
        return number_json(ev, v, shown);
    case VAL_STRING: {
        json_t *o = json_object();
        json_object_set_new(o, "kind", json_string("string"));
        json_object_set_new(o, "text", json_string(v->str));
        return o;
    }
    case VAL_RECORD: {
        json_t *o = json_object();
        json_object_set_new(o, "kind", json_string("record"));
        json_object_set_new(o, "type", json_string(v->rec->type));
        const UsedFile *u = use_of_record(v->rec);
        if (u) {
            json_object_set_new(o, "file", json_string(u->file));
            json_object_set_new(o, "digest", json_string(u->doc->digest));
        }
        json_t *fields = json_object();
        for (size_t i = 0; i < v->rec->nfields; i++)
            json_object_set_new(fields, v->rec->fields[i].name, value_json(ev, &v->rec->fields[i].value, NULL));
        json_object_set_new(o, "fields", fields);
        return o;
    }
    default:
        return json_null();
    }
}

static void set_text(json_t *o, const char *key, const char *s)
{
    if (s)
        json_object_set_new(o, key, json_string(s));
}

static json_t *meta_json(const Meta *m)
{
    json_t *o = json_object();
    set_text(o, "title", m->title);
    set_text(o, "project", m->project);
    set_text(o, "client", m->client);
    set_text(o, "number", m->number);
    set_text(o, "subject", m->subject);
    set_text(o, "revision", m->revision);
    set_text(o, "date", m->date);
    set_text(o, "prepared", m->prepared);
    set_text(o, "checked", m->checked);
    set_text(o, "approved", m->approved);
    set_text(o, "engineer", m->engineer);
    set_text(o, "license", m->license);
    set_text(o, "status", m->status);
    json_object_set_new(o, "units", json_string(m->units == UNITS_SI ? "SI" : "US"));
    json_object_set_new(o, "paper", json_string(m->paper == PAPER_A4 ? "a4" : "letter"));
    json_object_set_new(o, "digits", json_integer(m->digits));
    set_text(o, "code", m->code);
    if (m->nrevisions) {
        json_t *revs = json_array();
        for (size_t i = 0; i < m->nrevisions; i++) {
            json_t *r = json_object();
            set_text(r, "rev", m->revisions[i].rev);
            set_text(r, "date", m->revisions[i].date);
            set_text(r, "by", m->revisions[i].by);
            set_text(r, "note", m->revisions[i].note);
            json_array_append_new(revs, r);
        }
        json_object_set_new(o, "revisions", revs);
    }
    if (m->has_parts) {
        json_t *parts = json_array();
        for (size_t i = 0; i < m->nparts; i++)
            json_array_append_new(parts, json_string(m->parts[i].file));
        json_object_set_new(o, "parts", parts);
    }
    return o;
}

static json_t *diagnostics_json(const DiagList *diags, const char *file)
{
    json_t *a = json_array();
    for (size_t i = 0; diags && i < diags->len; i++) {
        const Diag *d = &diags->items[i];
        if (file && d->pos.file && strcmp(d->pos.file, file) != 0)
            continue;
        json_t *o = json_object();
        json_object_set_new(o, "severity", json_string(d->severity == SEV_ERROR ? "error" : d->severity == SEV_WARNING ? "warning" : "note"));
        json_object_set_new(o, "file", json_string(d->pos.file ? d->pos.file : ""));
        json_object_set_new(o, "line", json_integer(d->pos.line));
        json_object_set_new(o, "col", json_integer(d->pos.col));
        json_object_set_new(o, "message", json_string(d->message));
        json_array_append_new(a, o);
    }
    return a;
}

static json_t *array_of(const double *v, size_t n, const Unit *u, bool shown)
{
    json_t *a = json_array();
    for (size_t i = 0; i < n; i++)
        json_array_append_new(a, real_or_null(shown ? unit_from_si(v[i], u, true) : v[i]));
    return a;
}

/* A figure's data: each series in display units and in SI. */
static json_t *figure_json(const Stmt *s, const FigureData *fd)
{
    json_t *o = json_object();
    json_object_set_new(o, "kind", json_string(fd->kind));
    json_object_set_new(o, "line", json_integer(s->pos.line));
    set_text(o, "caption", s->description);
    json_object_set_new(o, "x_title", json_string(fd->x_title));
    json_object_set_new(o, "y_title", json_string(fd->y_title));
    json_object_set_new(o, "x_unit", json_string(strcmp(fd->x_unit.text, "1") == 0 ? "" : fd->x_unit.text));
    json_object_set_new(o, "y_unit", json_string(strcmp(fd->y_unit.text, "1") == 0 ? "" : fd->y_unit.text));
    json_object_set_new(o, "log_x", json_boolean(fd->log_x));
    json_object_set_new(o, "log_y", json_boolean(fd->log_y));
    json_t *series = json_array();
    for (size_t k = 0; k < fd->nseries; k++) {
        const Series *se = &fd->series[k];
        json_t *so = json_object();
        json_object_set_new(so, "name", json_string(se->name));
        json_object_set_new(so, "x", array_of(se->x, se->n, &fd->x_unit, true));
        json_object_set_new(so, "y", array_of(se->y, se->n, &fd->y_unit, true));
        json_object_set_new(so, "x_si", array_of(se->x, se->n, NULL, false));
        json_object_set_new(so, "y_si", array_of(se->y, se->n, NULL, false));
        json_array_append_new(series, so);
    }
    json_object_set_new(o, "series", series);
    json_t *markers = json_array();
    for (size_t k = 0; k < fd->nmarkers; k++) {
        json_t *m = json_object();
        json_object_set_new(m, "label", json_string(fd->markers[k].label));
        json_object_set_new(m, "x", real_or_null(unit_from_si(fd->markers[k].x, &fd->x_unit, true)));
        json_object_set_new(m, "y", real_or_null(unit_from_si(fd->markers[k].y, &fd->y_unit, true)));
        json_array_append_new(markers, m);
    }
    json_object_set_new(o, "markers", markers);
    return o;
}

/* A table a statement laid out: title, heads, units and rows of values. */
static json_t *table_json(const Evaluated *ev, const ResultTable *t)
{
    json_t *o = json_object();
    json_object_set_new(o, "title", json_string(t->title));
    json_t *heads = json_array(), *units = json_array(), *rows = json_array();
    for (size_t k = 0; k < t->ncols; k++) {
        json_array_append_new(heads, json_string(t->heads[k]));
        json_array_append_new(units, json_string(strcmp(t->units[k].text, "1") == 0 ? "" : t->units[k].text));
    }
    for (size_t r = 0; r < t->nrows; r++) {
        json_t *row = json_array();
        for (size_t k = 0; k < t->ncols; k++)
            json_array_append_new(row, value_json(ev, &t->cells[r * t->ncols + k], &t->units[k]));
        json_array_append_new(rows, row);
    }
    json_object_set_new(o, "heads", heads);
    json_object_set_new(o, "units", units);
    json_object_set_new(o, "rows", rows);
    return o;
}

/* A case table: per row, the inputs, the shown results and every check. */
static json_t *cases_json(const Evaluated *ev, size_t which)
{
    const CaseTable *ct = ev->doc->cases[which];
    const CaseResult *cr = &ev->cases[which];
    json_t *o = json_object();
    json_object_set_new(o, "line", json_integer(ct->pos.line));
    json_t *inputs = json_array(), *show = json_array(), *rows = json_array();
    for (size_t k = 0; k < ct->ninputs; k++)
        json_array_append_new(inputs, json_string(ct->inputs[k]));
    for (size_t k = 0; k < ct->nshow; k++)
        json_array_append_new(show, json_string(ct->show[k]));
    for (size_t r = 0; cr->table && r < ct->nrows; r++) {
        const CaseRow *row = &cr->rows[r];
        json_t *ro = json_object();
        json_object_set_new(ro, "line", json_integer(ct->row_pos[r].line));
        json_t *iv = json_object();
        for (size_t k = 0; row->inputs && k < ct->ninputs; k++)
            json_object_set_new(iv, ct->inputs[k], value_json(ev, &row->inputs[k], NULL));
        json_object_set_new(ro, "inputs", iv);
        json_t *sv = json_object();
        for (size_t k = 0; k < ct->nshow; k++) {
            if (row->shown && row->shown_ok[k])
                json_object_set_new(sv, ct->show[k], value_json(ev, &row->shown[k], &row->shown_unit[k]));
            else
                json_object_set_new(sv, ct->show[k], json_null());
        }
        json_object_set_new(ro, "shown", sv);
        json_t *checks = json_array();
        for (size_t k = 0; row->holds && k < cr->nchecks; k++) {
            json_t *c = json_object();
            json_object_set_new(c, "label", json_string(ev->doc->stmts[cr->check_slots[k]]->label));
            json_object_set_new(c, "holds", row->check_ok[k] ? json_boolean(row->holds[k]) : json_null());
            json_object_set_new(c, "utilization", real_or_null(row->utilization[k]));
            json_array_append_new(checks, c);
        }
        json_object_set_new(ro, "checks", checks);
        json_object_set_new(ro, "failing", json_integer((json_int_t)row->nfailed));
        json_array_append_new(rows, ro);
    }
    json_object_set_new(o, "inputs", inputs);
    json_object_set_new(o, "show", show);
    json_object_set_new(o, "rows", rows);
    json_object_set_new(o, "rows_failing", json_integer((json_int_t)cr->rows_failing));
    return o;
}

/* A row's warnings, as the sheets show them beside it. */
static json_t *warnings_json(const StmtResult *r)
{
    json_t *a = json_array();
    for (size_t i = 0; i < r->nwarnings; i++)
        json_array_append_new(a, json_string(r->warnings[i]));
    return a;
}

static json_t *document_json(const Evaluated *ev, const DiagList *diags)
{
    const Document *doc = ev->doc;
    json_t *o = json_object();
    json_object_set_new(o, "file", json_string(doc->file));
    json_object_set_new(o, "digest", json_string(doc->digest));
    json_t *uses = json_array();
    for (size_t i = 0; i < ev->nused; i++) {
        json_t *u = json_object();
        json_object_set_new(u, "file", json_string(ev->used[i]->file));
        json_object_set_new(u, "digest", json_string(ev->used[i]->doc->digest));
        json_array_append_new(uses, u);
    }
    if (ev->nused)
        json_object_set_new(o, "uses", uses);
    else
        json_decref(uses);
    json_t *meta = meta_json(&doc->meta);
    if (ev->atmosphere_used) {
        /* The reference between gauge and absolute (DESIGN 2.9). */
        static const char *const source[] = {"standard", "front matter", "elevation"};
        json_t *atm = json_object();
        char text[256];
        render_atmosphere(ev, text, sizeof text);
        json_object_set_new(atm, "si", real_or_null(ev->atmosphere));
        json_object_set_new(atm, "si_unit", json_string("Pa"));
        json_object_set_new(atm, "source", json_string(source[doc->meta.atm_source]));
        if (doc->meta.atm_source == ATM_ELEVATION)
            json_object_set_new(atm, "elevation_m", real_or_null(doc->meta.elevation));
        json_object_set_new(atm, "text", json_string(text));
        json_object_set_new(meta, "atmosphere", atm);
    }
    json_object_set_new(o, "meta", meta);
    json_t *values = json_object();
    json_t *checks = json_array();
    json_t *methods = json_array();
    json_t *figures = json_array();
    json_t *findings = NULL; /* only a calc with findings has the key */
    for (size_t i = 0; i < doc->nstmts; i++) {
        const Stmt *s = doc->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (s->kind == STMT_FIGURE) {
            if (r->state == RES_OK && r->figure)
                json_array_append_new(figures, figure_json(s, r->figure));
            continue;
        }
        if ((s->kind == STMT_DEF || s->kind == STMT_SOLVE || s->kind == STMT_PATH || s->kind == STMT_NETWORK ||
             s->kind == STMT_CURVE) &&
            s->name) {
            json_t *v;
            if (r->state == RES_OK) {
                v = value_json(ev, &r->value, &r->shown);
            } else {
                v = json_object();
                json_object_set_new(v, "kind", json_string("not evaluated"));
            }
            json_object_set_new(v, "line", json_integer(s->pos.line));
            if (s->kind == STMT_PATH && r->state == RES_OK && r->path) {
                json_t *order = json_array();
                for (size_t k = 0; k < s->path->nsegs; k++)
                    json_array_append_new(order, json_string(s->path->segs[k].field));
                json_object_set_new(v, "segments", order);
            }
            if (s->kind == STMT_NETWORK && r->state == RES_OK && r->network) {
                const NetworkResult *nr = r->network;
                json_t *nodes = json_array(), *links = json_array();
                for (size_t k = 0; k < s->network->nnodes; k++)
                    json_array_append_new(nodes, json_string(s->network->nodes[k].field));
                for (size_t k = 0; k < s->network->nlinks; k++) {
                    json_t *lk = json_object();
                    const LinkResult *g = &nr->links[k];
                    json_object_set_new(lk, "field", json_string(s->network->links[k].field));
                    json_object_set_new(lk, "from", json_string(nr->nodes[g->from].id));
                    json_object_set_new(lk, "to", json_string(nr->nodes[g->to].id));
                    json_array_append_new(links, lk);
                }
                json_object_set_new(v, "nodes", nodes);
                json_object_set_new(v, "links", links);
                json_t *conv = json_object();
                json_object_set_new(conv, "method", json_string("global gradient algorithm (Todini and Pilati 1988)"));
                json_object_set_new(conv, "iterations", json_integer(nr->iterations));
                json_object_set_new(conv, "imbalance_m3_s", real_or_null(nr->imbalance));
                json_object_set_new(conv, "imbalance_at", json_string(nr->nodes[nr->imbalance_node].id));
                json_object_set_new(conv, "tolerance_m3_s", real_or_null(nr->tolerance));
                json_object_set_new(conv, "last_change_m3_s", real_or_null(nr->last_change));
                json_object_set_new(conv, "energy_residual_m", real_or_null(nr->energy_residual));
                json_object_set_new(v, "convergence", conv);
            }
            if (r->state == RES_OK && r->table)
                json_object_set_new(v, "table", table_json(ev, r->table));
            if (s->kind == STMT_SOLVE && r->state == RES_OK) {
                json_object_set_new(v, "residual", real_or_null(r->solve.residual));
                json_object_set_new(v, "iterations", json_integer(r->solve.iterations));
            }
            if (r->nwarnings)
                json_object_set_new(v, "warnings", warnings_json(r));
            json_object_set_new(values, s->name, v);
        } else if (s->kind == STMT_CHECK && s->label && s->finding) {
            /* a finding: the answer, with both sides, never a verdict */
            json_t *f = json_object();
            json_object_set_new(f, "label", json_string(s->label));
            json_object_set_new(f, "line", json_integer(s->pos.line));
            json_object_set_new(f, "op", json_string(cmp_op_text(s->cmp, false)));
            if (r->state == RES_OK) {
                json_object_set_new(f, "answer", json_boolean(r->holds));
                json_t *l = number_json(ev, &r->lhs, &r->lhs_shown);
                json_t *rr = number_json(ev, &r->rhs, &r->rhs_shown);
                json_object_del(l, "kind");
                json_object_del(rr, "kind");
                json_object_set_new(f, "lhs", l);
                json_object_set_new(f, "rhs", rr);
            } else {
                json_object_set_new(f, "answer", json_null());
            }
            if (!findings)
                findings = json_array();
            json_array_append_new(findings, f);
        } else if (s->kind == STMT_CHECK && s->label) {
            json_t *c = json_object();
            json_object_set_new(c, "label", json_string(s->label));
            json_object_set_new(c, "line", json_integer(s->pos.line));
            json_object_set_new(c, "op", json_string(cmp_op_text(s->cmp, false)));
            if (r->state == RES_OK) {
                json_object_set_new(c, "holds", json_boolean(r->holds));
                json_t *l = number_json(ev, &r->lhs, &r->lhs_shown);
                json_t *rr = number_json(ev, &r->rhs, &r->rhs_shown);
                json_object_del(l, "kind");
                json_object_del(rr, "kind");
                json_object_set_new(c, "lhs", l);
                json_object_set_new(c, "rhs", rr);
                json_object_set_new(c, "utilization", real_or_null(r->utilization));
            } else {
                json_object_set_new(c, "holds", json_null());
            }
            if (r->nwarnings)
                json_object_set_new(c, "warnings", warnings_json(r));
            json_array_append_new(checks, c);
        }
    }
    for (size_t k = 0; k < ev->nmethods; k++) {
        json_t *m = json_object();
        set_text(m, "key", ev->methods[k]->key);
        set_text(m, "title", ev->methods[k]->title);
        set_text(m, "reference", ev->methods[k]->reference);
        /* every statement that cites it, as the PDF's references list them */
        json_t *used = json_array();
        for (size_t i = 0; i < doc->nstmts; i++)
            for (size_t j = 0; j < ev->results[i].nmethods; j++)
                if (method_same(ev->results[i].methods[j], ev->methods[k])) {
                    json_t *u = json_object();
                    set_text(u, "name", doc->stmts[i]->name);
                    json_object_set_new(u, "line", json_integer(doc->stmts[i]->pos.line));
                    json_array_append_new(used, u);
                    break;
                }
        json_object_set_new(m, "used_by", used);
        json_array_append_new(methods, m);
    }
    json_object_set_new(o, "values", values);
    json_object_set_new(o, "checks", checks);
    if (findings)
        json_object_set_new(o, "findings", findings);
    json_object_set_new(o, "methods", methods);
    json_object_set_new(o, "figures", figures);
    json_t *cases = json_array();
    for (size_t k = 0; k < ev->ncases; k++)
        json_array_append_new(cases, cases_json(ev, k));
    json_object_set_new(o, "cases", cases);
    json_object_set_new(o, "diagnostics", diagnostics_json(diags, doc->file));
    return o;
}

bool render_json(const Evaluated *const *evs, const DiagList *diags, size_t nfiles, FILE *out)
{
    json_t *root;
    if (nfiles == 1) {
        root = document_json(evs[0], diags);
    } else {
        root = json_array();
        for (size_t i = 0; i < nfiles; i++)
            json_array_append_new(root, document_json(evs[i], diags));
    }
    int rc = json_dumpf(root, out, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17));
    fputc('\n', out);
    json_decref(root);
    return rc == 0;
}

json_t *json_text(const char *s)
{
    json_t *j = json_string(s ? s : "");
    if (j)
        return j;
    char *copy = xstrdup(s);
    for (char *p = copy; *p; p++)
        if ((unsigned char)*p >= 0x80)
            *p = '?';
    j = json_string(copy);
    free(copy);
    return j;
}
