/* json.c — the JSON results of DESIGN 2.5, written by the streaming writer
 * json_out.h as the document is walked (no tree in memory).
 *
 * Other tools and the tests read this, so its shape is fixed: file, digest,
 * meta, values (by name), checks (in source order), diagnostics. `si` holds
 * the value in coherent SI base units at full precision (17 significant
 * digits, which round-trips); `shown` is the value
 * in its display unit rounded to the document's significant digits, as the
 * report prints it. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "json_out.h"
#include "numfmt.h"
#include "strmap.h"
#include "render.h"
#include "report_model.h"
#include "uses.h"


/* An object keeps one member per key, as the tree writer this replaced
 * did: where a key repeats, the first one's place and the last one's value.
 * pick[i] is the index whose value goes at i, or -1 when i is a repeat (or
 * has no key). The caller frees it. */
static long *unique_keys(const char *const *keys, size_t n)
{
    long *pick = xmalloc((n + 1) * sizeof *pick);
    StrMap first = {0};
    for (size_t i = 0; i < n; i++) {
        size_t at = 0;
        pick[i] = -1;
        if (!keys[i])
            continue;
        if (strmap_add(&first, keys[i], i, &at))
            pick[i] = (long)i;
        else
            pick[at] = (long)i; /* a repeat: its value goes at the first place */
    }
    strmap_free(&first);
    return pick;
}

/* A row as the sheets show it: the formula, the substituted formula and
 * how its calls applied their methods (the report model's texts). */
static void row_texts_write(JsonOut *w, const ModelRow *mr)
{
    if (mr->formula)
        json_out_text(w, "formula", mr->formula);
    if (mr->show_substituted && mr->substituted)
        json_out_text(w, "substituted", mr->substituted);
    if (!mr->nuses)
        return;
    json_out_begin_array(w, "method_uses");
    for (size_t k = 0; k < mr->nuses; k++) {
        const ModelUse *u = &mr->uses[k];
        json_out_begin_object(w, NULL);
        json_out_text(w, "method", u->use->method->key);
        if (u->substituted) {
            json_out_text(w, "lhs", u->lhs);
            json_out_text(w, "formula", u->formula);
            json_out_text(w, "substituted", u->substituted);
        }
        if (u->result.number)
            json_out_text(w, "text", u->result.text);
        if (u->branch)
            json_out_text(w, "branch", u->branch);
        json_out_end_object(w);
    }
    json_out_end_array(w);
}

/* The SI unit of a dimension as text, for the last few dimensions written
 * (a calc's values share a handful): kept with the writer's scratch. */
enum { SI_UNITS_KEPT = 8 };
typedef struct SiUnitCache {
    Dim dim[SI_UNITS_KEPT];
    char text[SI_UNITS_KEPT][64];
    size_t n;                /* entries made; the next goes at n % SI_UNITS_KEPT */
} SiUnitCache;

/* Scratch space of one document's writing: an arena reset after each
 * value, and the SI units. */
typedef struct Scratch {
    Arena arena;
    SiUnitCache si;
} Scratch;

/* dim_format_si(d), from the cache when d is bit for bit one seen lately. */
static const char *si_unit_text(SiUnitCache *c, Dim d)
{
    size_t kept = c->n < SI_UNITS_KEPT ? c->n : SI_UNITS_KEPT;
    for (size_t i = 0; i < kept; i++)
        if (memcmp(&c->dim[i], &d, sizeof d) == 0)
            return c->text[i];
    size_t at = c->n++ % SI_UNITS_KEPT;
    c->dim[at] = d;
    dim_format_si(d, c->text[at], sizeof c->text[at]);
    return c->text[at];
}

/* `shown` at full precision in the display unit and `text` exactly as the
 * report prints it, from the report model's value (DESIGN 2.5). */
static void number_members(JsonOut *w, const Value *v, const ModelValue *mv, bool with_kind, Scratch *tmp)
{
    const char *si_unit = si_unit_text(&tmp->si, v->q.dim);
    if (with_kind)
        json_out_string(w, "kind", "number");
    json_out_real(w, "si", v->q.si);
    json_out_string(w, "si_unit", si_unit);
    json_out_real(w, "shown", mv->shown);
    json_out_string(w, "unit", strcmp(mv->unit.text, "1") == 0 ? "" : mv->unit.text);
    json_out_text(w, "text", mv->text);
    if (v->q.temp != TEMP_NONE)
        json_out_string(w, "temperature", "absolute");
    if (v->q.pref != PRES_PLAIN)
        json_out_string(w, "pressure", pressure_ref_name(v->q.pref));
}

static void value_write(JsonOut *w, const char *key, const Evaluated *ev, const Value *v, const Unit *shown,
                        Scratch *tmp);

/* A value as an object left open for the caller's members (true), or null
 * (false: nothing to close). A number's display comes from the report
 * model: the row's own (mv) where the model has it, else made here. */
static bool value_open(JsonOut *w, const char *key, const Evaluated *ev, const Value *v, const Unit *shown,
                       const ModelValue *mv, Scratch *tmp)
{
    switch (v->kind) {
    case VAL_NUMBER: {
        json_out_begin_object(w, key);
        if (mv) {
            number_members(w, v, mv, true, tmp);
            return true;
        }
        ModelValue made = report_model_value(ev, v, shown, &tmp->arena);
        number_members(w, v, &made, true, tmp);
        arena_reset(&tmp->arena);
        return true;
    }
    case VAL_STRING:
        json_out_begin_object(w, key);
        json_out_string(w, "kind", "string");
        json_out_string(w, "text", v->str);
        return true;
    case VAL_RECORD: {
        json_out_begin_object(w, key);
        json_out_string(w, "kind", "record");
        json_out_string(w, "type", v->rec->type);
        const UsedFile *u = use_of_record(v->rec);
        if (u) {
            json_out_string(w, "file", u->file);
            json_out_string(w, "digest", u->doc->digest);
        }
        json_out_begin_object(w, "fields");
        size_t n = v->rec->nfields;
        const char **names = xmalloc((n + 1) * sizeof *names);
        for (size_t i = 0; i < n; i++)
            names[i] = v->rec->fields[i].name;
        long *pick = unique_keys(names, n);
        for (size_t i = 0; i < n; i++)
            if (pick[i] >= 0)
                value_write(w, names[i], ev, &v->rec->fields[pick[i]].value, NULL, tmp);
        free(pick);
        free(names);
        json_out_end_object(w);
        return true;
    }
    default:
        json_out_null(w, key);
        return false;
    }
}

static void value_write(JsonOut *w, const char *key, const Evaluated *ev, const Value *v, const Unit *shown,
                        Scratch *tmp)
{
    if (value_open(w, key, ev, v, shown, NULL, tmp))
        json_out_end_object(w);
}

static void meta_write(JsonOut *w, const Evaluated *ev)
{
    const Document *doc = ev->doc;
    const Meta *m = &doc->meta;
    json_out_begin_object(w, "meta");
    json_out_string(w, "title", m->title);
    json_out_string(w, "project", m->project);
    json_out_string(w, "client", m->client);
    json_out_string(w, "number", m->number);
    json_out_string(w, "subject", m->subject);
    json_out_string(w, "revision", m->revision);
    json_out_string(w, "date", m->date);
    json_out_string(w, "prepared", m->prepared);
    json_out_string(w, "checked", m->checked);
    json_out_string(w, "approved", m->approved);
    json_out_string(w, "engineer", m->engineer);
    json_out_string(w, "license", m->license);
    json_out_string(w, "status", m->status);
    json_out_string(w, "units", m->units == UNITS_SI ? "SI" : "US");
    json_out_string(w, "paper", m->paper == PAPER_A4 ? "a4" : "letter");
    json_out_int(w, "digits", m->digits);
    json_out_string(w, "code", m->code);
    if (m->nrevisions) {
        json_out_begin_array(w, "revisions");
        for (size_t i = 0; i < m->nrevisions; i++) {
            json_out_begin_object(w, NULL);
            json_out_string(w, "rev", m->revisions[i].rev);
            json_out_string(w, "date", m->revisions[i].date);
            json_out_string(w, "by", m->revisions[i].by);
            json_out_string(w, "note", m->revisions[i].note);
            json_out_end_object(w);
        }
        json_out_end_array(w);
    }
    if (m->has_parts) {
        json_out_begin_array(w, "parts");
        for (size_t i = 0; i < m->nparts; i++)
            json_out_string(w, NULL, m->parts[i].file);
        json_out_end_array(w);
    }
    if (ev->atmosphere_used) {
        /* The reference between gauge and absolute (DESIGN 2.9). */
        static const char *const source[] = {"standard", "front matter", "elevation"};
        char text[256];
        render_atmosphere(ev, text, sizeof text);
        json_out_begin_object(w, "atmosphere");
        json_out_real(w, "si", ev->atmosphere);
        json_out_string(w, "si_unit", "Pa");
        json_out_string(w, "source", source[doc->meta.atm_source]);
        if (doc->meta.atm_source == ATM_ELEVATION)
            json_out_real(w, "elevation_m", doc->meta.elevation);
        json_out_string(w, "text", text);
        json_out_end_object(w);
    }
    json_out_end_object(w);
}

static void diagnostics_write(JsonOut *w, const DiagList *diags, const char *file)
{
    json_out_begin_array(w, "diagnostics");
    for (size_t i = 0; diags && i < diags->len; i++) {
        const Diag *d = &diags->items[i];
        if (file && d->pos.file && strcmp(d->pos.file, file) != 0)
            continue;
        json_out_begin_object(w, NULL);
        json_out_string(w, "severity", d->severity == SEV_ERROR ? "error" : d->severity == SEV_WARNING ? "warning" : "note");
        json_out_string(w, "file", d->pos.file ? d->pos.file : "");
        json_out_int(w, "line", d->pos.line);
        json_out_int(w, "col", d->pos.col);
        json_out_string(w, "message", d->message);
        json_out_end_object(w);
    }
    json_out_end_array(w);
}

static void array_write(JsonOut *w, const char *key, const double *v, size_t n, const Unit *u, bool shown)
{
    json_out_begin_array(w, key);
    for (size_t i = 0; i < n; i++)
        json_out_real(w, NULL, shown ? unit_from_si(v[i], u, true) : v[i]);
    json_out_end_array(w);
}

/* A figure's data: each series in display units and in SI. */
static void figure_write(JsonOut *w, const Stmt *s, const FigureData *fd)
{
    json_out_begin_object(w, NULL);
    json_out_string(w, "kind", fd->kind);
    json_out_int(w, "line", s->pos.line);
    json_out_string(w, "caption", s->description);
    json_out_string(w, "x_title", fd->x_title);
    json_out_string(w, "y_title", fd->y_title);
    json_out_string(w, "x_unit", strcmp(fd->x_unit.text, "1") == 0 ? "" : fd->x_unit.text);
    json_out_string(w, "y_unit", strcmp(fd->y_unit.text, "1") == 0 ? "" : fd->y_unit.text);
    json_out_bool(w, "log_x", fd->log_x);
    json_out_bool(w, "log_y", fd->log_y);
    json_out_begin_array(w, "series");
    for (size_t k = 0; k < fd->nseries; k++) {
        const Series *se = &fd->series[k];
        json_out_begin_object(w, NULL);
        json_out_string(w, "name", se->name);
        array_write(w, "x", se->x, se->n, &fd->x_unit, true);
        array_write(w, "y", se->y, se->n, &fd->y_unit, true);
        array_write(w, "x_si", se->x, se->n, NULL, false);
        array_write(w, "y_si", se->y, se->n, NULL, false);
        json_out_end_object(w);
    }
    json_out_end_array(w);
    json_out_begin_array(w, "markers");
    for (size_t k = 0; k < fd->nmarkers; k++) {
        json_out_begin_object(w, NULL);
        json_out_string(w, "label", fd->markers[k].label);
        json_out_real(w, "x", unit_from_si(fd->markers[k].x, &fd->x_unit, true));
        json_out_real(w, "y", unit_from_si(fd->markers[k].y, &fd->y_unit, true));
        json_out_end_object(w);
    }
    json_out_end_array(w);
    json_out_end_object(w);
}

/* A table a statement laid out: title, heads, units and rows of values. */
static void table_write(JsonOut *w, const Evaluated *ev, const ResultTable *t, Scratch *tmp)
{
    json_out_begin_object(w, "table");
    json_out_string(w, "title", t->title);
    json_out_begin_array(w, "heads");
    for (size_t k = 0; k < t->ncols; k++)
        json_out_string(w, NULL, t->heads[k]);
    json_out_end_array(w);
    json_out_begin_array(w, "units");
    for (size_t k = 0; k < t->ncols; k++)
        json_out_string(w, NULL, strcmp(t->units[k].text, "1") == 0 ? "" : t->units[k].text);
    json_out_end_array(w);
    json_out_begin_array(w, "rows");
    for (size_t r = 0; r < t->nrows; r++) {
        json_out_begin_array(w, NULL);
        for (size_t k = 0; k < t->ncols; k++)
            value_write(w, NULL, ev, &t->cells[r * t->ncols + k], &t->units[k], tmp);
        json_out_end_array(w);
    }
    json_out_end_array(w);
    json_out_end_object(w);
}

/* A case table: per row, the inputs, the shown results and every check. */
static void cases_write(JsonOut *w, const Evaluated *ev, size_t which, Scratch *tmp)
{
    const CaseTable *ct = ev->doc->cases[which];
    const CaseResult *cr = &ev->cases[which];
    json_out_begin_object(w, NULL);
    json_out_int(w, "line", ct->pos.line);
    json_out_begin_array(w, "inputs");
    for (size_t k = 0; k < ct->ninputs; k++)
        json_out_string(w, NULL, ct->inputs[k]);
    json_out_end_array(w);
    json_out_begin_array(w, "show");
    for (size_t k = 0; k < ct->nshow; k++)
        json_out_string(w, NULL, ct->show[k]);
    json_out_end_array(w);
    long *in_pick = unique_keys((const char *const *)ct->inputs, ct->ninputs);
    long *show_pick = unique_keys((const char *const *)ct->show, ct->nshow);
    json_out_begin_array(w, "rows");
    for (size_t r = 0; cr->table && r < ct->nrows; r++) {
        const CaseRow *row = &cr->rows[r];
        json_out_begin_object(w, NULL);
        json_out_int(w, "line", ct->row_pos[r].line);
        json_out_begin_object(w, "inputs");
        for (size_t k = 0; row->inputs && k < ct->ninputs; k++)
            if (in_pick[k] >= 0)
                value_write(w, ct->inputs[k], ev, &row->inputs[in_pick[k]], NULL, tmp);
        json_out_end_object(w);
        json_out_begin_object(w, "shown");
        for (size_t k = 0; k < ct->nshow; k++) {
            long j = show_pick[k];
            if (j < 0)
                continue;
            if (row->shown && row->shown_ok[j])
                value_write(w, ct->show[k], ev, &row->shown[j], &row->shown_unit[j], tmp);
            else
                json_out_null(w, ct->show[k]);
        }
        json_out_end_object(w);
        json_out_begin_array(w, "checks");
        for (size_t k = 0; row->holds && k < cr->nchecks; k++) {
            json_out_begin_object(w, NULL);
            json_out_string(w, "label", ev->doc->stmts[cr->check_slots[k]]->label);
            if (row->check_ok[k])
                json_out_bool(w, "holds", row->holds[k]);
            else
                json_out_null(w, "holds");
            json_out_real(w, "utilization", row->utilization[k]);
            json_out_end_object(w);
        }
        json_out_end_array(w);
        json_out_int(w, "failing", (long long)row->nfailed);
        json_out_end_object(w);
    }
    json_out_end_array(w);
    free(in_pick);
    free(show_pick);
    json_out_int(w, "rows_failing", (long long)cr->rows_failing);
    json_out_end_object(w);
}

/* A row's warnings, as the sheets show them beside it. */
static void warnings_write(JsonOut *w, const StmtResult *r)
{
    json_out_begin_array(w, "warnings");
    for (size_t i = 0; i < r->nwarnings; i++)
        json_out_string(w, NULL, r->warnings[i]);
    json_out_end_array(w);
}

static bool is_value_stmt(const Stmt *s)
{
    return (s->kind == STMT_DEF || s->kind == STMT_SOLVE || s->kind == STMT_PATH || s->kind == STMT_NETWORK ||
            s->kind == STMT_CURVE) &&
           s->name;
}

/* One named result under "values", with its row of the report model. */
static void named_value_write(JsonOut *w, const Evaluated *ev, const Stmt *s, const StmtResult *r,
                              const ModelRow *row, Scratch *tmp)
{
    bool open;
    if (r->state == RES_OK) {
        open = value_open(w, s->name, ev, &r->value, r->shown, row->result.number ? &row->result : NULL, tmp);
    } else {
        json_out_begin_object(w, s->name);
        json_out_string(w, "kind", "not evaluated");
        open = true;
    }
    if (!open)
        return;
    json_out_int(w, "line", s->pos.line);
    if (s->kind == STMT_PATH && r->state == RES_OK && r->made->path) {
        json_out_begin_array(w, "segments");
        for (size_t k = 0; k < s->path->nsegs; k++)
            json_out_string(w, NULL, s->path->segs[k].field);
        json_out_end_array(w);
    }
    if (s->kind == STMT_NETWORK && r->state == RES_OK && r->made->network) {
        const NetworkResult *nr = r->made->network;
        json_out_begin_array(w, "nodes");
        for (size_t k = 0; k < s->network->nnodes; k++)
            json_out_string(w, NULL, s->network->nodes[k].field);
        json_out_end_array(w);
        json_out_begin_array(w, "links");
        for (size_t k = 0; k < s->network->nlinks; k++) {
            const LinkResult *g = &nr->links[k];
            json_out_begin_object(w, NULL);
            json_out_string(w, "field", s->network->links[k].field);
            json_out_string(w, "from", nr->nodes[g->from].id);
            json_out_string(w, "to", nr->nodes[g->to].id);
            json_out_end_object(w);
        }
        json_out_end_array(w);
        json_out_begin_object(w, "convergence");
        json_out_string(w, "method", "global gradient algorithm (Todini and Pilati 1988)");
        json_out_int(w, "iterations", nr->iterations);
        json_out_real(w, "imbalance_m3_s", nr->imbalance);
        json_out_string(w, "imbalance_at", nr->nodes[nr->imbalance_node].id);
        json_out_real(w, "tolerance_m3_s", nr->tolerance);
        json_out_real(w, "last_change_m3_s", nr->last_change);
        json_out_real(w, "energy_residual_m", nr->energy_residual);
        json_out_end_object(w);
    }
    if (r->state == RES_OK && r->made->table)
        table_write(w, ev, r->made->table, tmp);
    if (s->kind == STMT_SOLVE && r->state == RES_OK) {
        json_out_real(w, "residual", r->sides->solve.residual);
        json_out_int(w, "iterations", r->sides->solve.iterations);
    }
    if (s->kind == STMT_DEF || s->kind == STMT_SOLVE)
        row_texts_write(w, row);
    if (r->nwarnings)
        warnings_write(w, r);
    json_out_end_object(w);
}

/* Both sides of a check or finding, without their "kind", as the report
 * model shows them. */
static void sides_write(JsonOut *w, const StmtResult *r, const ModelCheck *c, Scratch *tmp)
{
    json_out_begin_object(w, "lhs");
    number_members(w, &r->sides->lhs, &c->lhs, false, tmp);
    json_out_end_object(w);
    json_out_begin_object(w, "rhs");
    number_members(w, &r->sides->rhs, &c->rhs, false, tmp);
    json_out_end_object(w);
}

static void document_write(JsonOut *w, const Evaluated *ev, const DiagList *diags)
{
    const Document *doc = ev->doc;
    /* The report model's rows, each made when it is written, in a scratch
     * arena of its own: memory does not grow with the calc. */
    Arena arena, scratch;
    Scratch values; /* a value's texts while it is written */
    arena_init(&arena);
    arena_init(&scratch);
    arena_init(&values.arena);
    values.si.n = 0;
    const ReportModel *model = report_model_begin(ev, &arena);
    ModelRow row;
    json_out_begin_object(w, NULL);
    json_out_string(w, "file", doc->file);
    json_out_string(w, "digest", doc->digest);
    if (ev->nused) {
        json_out_begin_array(w, "uses");
        for (size_t i = 0; i < ev->nused; i++) {
            json_out_begin_object(w, NULL);
            json_out_string(w, "file", ev->used[i]->file);
            json_out_string(w, "digest", ev->used[i]->doc->digest);
            json_out_end_object(w);
        }
        json_out_end_array(w);
    }
    meta_write(w, ev);

    /* values: a name defined twice keeps its first place and its last value.
     * The document's name table holds each name's first definition: when
     * every named statement is its name's first, no name repeats and the
     * statements are their own picks. */
    size_t n = doc->nstmts;
    const char **names = xmalloc((n + 1) * sizeof *names);
    long *pick = xmalloc((n + 1) * sizeof *pick);
    size_t nfindings = 0;
    bool repeats = false;
    for (size_t i = 0; i < n; i++) {
        const Stmt *s = doc->stmts[i];
        names[i] = is_value_stmt(s) ? s->name : NULL;
        pick[i] = names[i] ? (long)i : -1;
        repeats = repeats || (names[i] && doc_lookup(doc, names[i]) != (int)i);
        nfindings += s->kind == STMT_CHECK && s->label && s->finding;
    }
    if (repeats) {
        free(pick);
        pick = unique_keys(names, n);
    }
    json_out_begin_object(w, "values");
    for (size_t i = 0; i < n; i++)
        if (pick[i] >= 0) {
            report_model_row(model, (size_t)pick[i], &row, &scratch);
            named_value_write(w, ev, doc->stmts[pick[i]], &ev->results[pick[i]], &row, &values);
            arena_reset(&scratch);
        }
    json_out_end_object(w);
    free(pick);
    free(names);

    json_out_begin_array(w, "checks");
    for (size_t i = 0; i < n; i++) {
        const Stmt *s = doc->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (s->kind != STMT_CHECK || !s->label || s->finding)
            continue;
        json_out_begin_object(w, NULL);
        json_out_string(w, "label", s->label);
        json_out_int(w, "line", s->pos.line);
        json_out_string(w, "op", cmp_op_text(s->cmp, false));
        if (r->state == RES_OK) {
            report_model_row(model, i, &row, &scratch);
            json_out_bool(w, "holds", r->holds);
            sides_write(w, r, &row.check, &values);
            json_out_real(w, "utilization", r->utilization);
            json_out_bool(w, "governing", row.check.governs);
            row_texts_write(w, &row);
            arena_reset(&scratch);
        } else {
            json_out_null(w, "holds");
        }
        if (r->nwarnings)
            warnings_write(w, r);
        json_out_end_object(w);
    }
    json_out_end_array(w);

    if (nfindings) {
        /* a finding: the answer, with both sides, never a verdict */
        json_out_begin_array(w, "findings");
        for (size_t i = 0; i < n; i++) {
            const Stmt *s = doc->stmts[i];
            const StmtResult *r = &ev->results[i];
            if (s->kind != STMT_CHECK || !s->label || !s->finding)
                continue;
            json_out_begin_object(w, NULL);
            json_out_string(w, "label", s->label);
            json_out_int(w, "line", s->pos.line);
            json_out_string(w, "op", cmp_op_text(s->cmp, false));
            if (r->state == RES_OK) {
                    report_model_row(model, i, &row, &scratch);
                json_out_bool(w, "answer", r->holds);
                sides_write(w, r, &row.check, &values);
                arena_reset(&scratch);
            } else {
                json_out_null(w, "answer");
            }
            json_out_end_object(w);
        }
        json_out_end_array(w);
    }

    json_out_begin_array(w, "methods");
    for (size_t k = 0; k < ev->nmethods; k++) {
        json_out_begin_object(w, NULL);
        json_out_string(w, "key", ev->methods[k]->key);
        json_out_string(w, "title", ev->methods[k]->title);
        json_out_string(w, "reference", ev->methods[k]->reference);
        /* every statement that cites it, as the PDF's references list them */
        json_out_begin_array(w, "used_by");
        for (size_t i = 0; i < n; i++)
            for (size_t j = 0; j < ev->results[i].nmethods; j++)
                if (method_same(ev->results[i].methods[j], ev->methods[k])) {
                    json_out_begin_object(w, NULL);
                    json_out_string(w, "name", doc->stmts[i]->name);
                    json_out_int(w, "line", doc->stmts[i]->pos.line);
                    json_out_end_object(w);
                    break;
                }
        json_out_end_array(w);
        json_out_end_object(w);
    }
    json_out_end_array(w);

    json_out_begin_array(w, "figures");
    for (size_t i = 0; i < n; i++) {
        const Stmt *s = doc->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (s->kind == STMT_FIGURE && r->state == RES_OK && r->made->figure)
            figure_write(w, s, r->made->figure);
    }
    json_out_end_array(w);

    json_out_begin_array(w, "cases");
    for (size_t k = 0; k < ev->ncases; k++)
        cases_write(w, ev, k, &values);
    json_out_end_array(w);
    diagnostics_write(w, diags, doc->file);
    json_out_end_object(w);
    arena_free(&values.arena);
    arena_free(&scratch);
    arena_free(&arena);
}

bool render_json(const Evaluated *const *evs, const DiagList *diags, size_t nfiles, FILE *out)
{
    JsonOut w;
    json_out_init(&w, out);
    if (nfiles != 1)
        json_out_begin_array(&w, NULL);
    for (size_t i = 0; i < nfiles; i++)
        document_write(&w, evs[i], diags);
    if (nfiles != 1)
        json_out_end_array(&w);
    bool ok = json_out_finish(&w);
    fputc('\n', out);
    return ok && !ferror(out);
}
