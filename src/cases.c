/* cases.c — parametric cases: a `cases` table re-evaluates the calc once per
 * row with the row's inputs and records the shown values and every check. */
#include "eval_internal.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Evaluate one table: per row, give the inputs the row's values, re-evaluate
 * what depends on them (eval_recompute, as solve does), record the shown
 * values and every check, then put the calc's own results back. Diagnostics
 * inside a case are muted: a failure shows as "not evaluated" in that row.
 *
 * The calc's results are kept once before the first row and copied back
 * after each, so a row costs one re-evaluation, not two. While a row is
 * evaluated the document allocates in a scratch arena, freed at the end of
 * the row, so memory does not grow with the number of rows: what a row keeps
 * (its inputs, shown numbers and verdicts) is stored in the document's
 * arena before and after. That needs every shown value to be a number (a
 * record or text could point into the scratch); a table that shows
 * anything else keeps each row's work in the document's arena instead. */
void eval_cases(Evaluated *ev, const CaseTable *ct, CaseResult *cr, DiagList *diags)
{
    Document *doc = ev->doc;
    Arena *a = &doc->arena;
    cr->table = ct;
    for (size_t i = 0; i < doc->nstmts; i++)
        cr->nchecks += doc->stmts[i]->kind == STMT_CHECK && !doc->stmts[i]->finding;
    cr->check_slots = arena_alloc(a, (cr->nchecks + 1) * sizeof *cr->check_slots);
    for (size_t i = 0, k = 0; i < doc->nstmts; i++)
        if (doc->stmts[i]->kind == STMT_CHECK && !doc->stmts[i]->finding)
            cr->check_slots[k++] = (int)i;
    cr->rows = arena_alloc(a, (ct->nrows + 1) * sizeof *cr->rows);

    size_t ni = ct->ninputs;
    Value *base = arena_alloc(a, (ni + 1) * sizeof *base);
    int *slots = arena_alloc(a, (ni + 1) * sizeof *slots);
    for (size_t k = 0; k < ni; k++) {
        slots[k] = ct->input_slots[k];
        if (slots[k] < 0 || ev->results[slots[k]].state != RES_OK)
            return; /* reported already, or the input itself failed */
        base[k] = ev->results[slots[k]].value;
    }
    CallCtx cc;
    call_ctx_init(&cc, a, diags, ev->units, ev->doc->meta.code, ev->atmosphere);
    EvalCtx c = {ev, doc, diags, &cc, 0};
    /* The shown expressions are checked once, with the calc's own values and
     * errors reported, so a bad field or dimension is an error, not a
     * silent "not evaluated" in every row. */
    bool shown_ok = true, scratch = true;
    for (size_t k = 0; k < ct->nshow; k++) {
        Value v;
        c.upstream = 0;
        if (ct->show_exprs[k] && !eval_expr(&c, ct->show_exprs[k], &v) && !c.upstream)
            shown_ok = false;
        else if (ct->show_exprs[k] && v.kind != VAL_NUMBER)
            scratch = false;
    }
    if (!shown_ok)
        return;
    size_t nres = doc->nstmts;
    StmtResult *kept = xmalloc((nres + 1) * sizeof *kept);
    memcpy(kept, ev->results, nres * sizeof *kept);
    for (size_t r = 0; r < ct->nrows; r++) {
        CaseRow *row = &cr->rows[r];
        row->inputs = arena_alloc(a, (ni + 1) * sizeof *row->inputs);
        bool ok = true;
        for (size_t k = 0; k < ni; k++) {
            const Expr *e = ct->cells[r * ni + k];
            Value v;
            if (!e || !eval_expr(&c, e, &v)) {
                ok = false;
                continue;
            }
            const Value *b = &base[k];
            if (v.kind != b->kind || (v.kind == VAL_NUMBER && (!dim_eq(v.q.dim, b->q.dim) || (v.q.temp == TEMP_NONE) != (b->q.temp == TEMP_NONE) || v.q.pref != b->q.pref))) {
                char dv[128], db[128];
                eval_describe_operand(&c, e, &v, dv, sizeof dv);
                value_describe(b, ev->units, db, sizeof db);
                diag_error(diags, e->pos, "case value for '%s' must be %s like the input, found %s", ct->inputs[k], db, dv);
                ok = false;
                continue;
            }
            ev->results[slots[k]].value = v;
            row->inputs[k] = v;
        }
        if (!ok) {
            for (size_t k = 0; k < ni; k++)
                ev->results[slots[k]].value = base[k];
            free(kept);
            return; /* errors reported; the table is not evaluated */
        }
        row->shown = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown);
        row->shown_unit = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown_unit);
        row->shown_ok = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown_ok);
        row->holds = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->holds);
        row->utilization = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->utilization);
        row->check_ok = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->check_ok);
        Arena doc_arena = doc->arena;
        if (scratch)
            arena_init(&doc->arena);
        diags->muted++;
        eval_recompute(ev, slots, ni, doc->nstmts, diags);
        for (size_t k = 0; k < ct->nshow; k++) {
            const Expr *e = ct->show_exprs[k];
            Value v;
            c.upstream = 0;
            if (e && eval_expr(&c, e, &v) && (!scratch || v.kind == VAL_NUMBER)) {
                row->shown[k] = v;
                /* a plain name keeps its display unit */
                if (e->kind == EXPR_NAME && e->slot >= 0)
                    row->shown_unit[k] = *ev->results[e->slot].shown;
                else if (v.kind == VAL_NUMBER)
                    row->shown_unit[k] = eval_display_unit(ev, &v, NULL);
                row->shown_ok[k] = true;
            }
        }
        for (size_t k = 0; k < cr->nchecks; k++) {
            const StmtResult *res = &ev->results[cr->check_slots[k]];
            row->check_ok[k] = res->state == RES_OK;
            row->holds[k] = res->state == RES_OK && res->holds;
            row->utilization[k] = res->state == RES_OK ? res->utilization : NAN;
            if (!row->holds[k])
                row->nfailed++;
        }
        if (row->nfailed)
            cr->rows_failing++;
        memcpy(ev->results, kept, nres * sizeof *kept);
        if (scratch) {
            arena_free(&doc->arena);
            doc->arena = doc_arena;
        }
        diags->muted--;
    }
    free(kept);
}
