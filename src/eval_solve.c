/* eval_solve.c — `solve NAME so that LEFT = RIGHT [between LO and HI]`.
 *
 * Varies an earlier name, re-evaluating exactly the statements that depend
 * on it (eval_recompute), until the two sides agree (solve.c: Brent's
 * method, or expanding from the trial value to a bracket first). Records the
 * values read at the root for the report, puts the varied name back, and
 * says in the calc's units why a root was not found. */
#include "eval_internal.h"

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"

typedef struct SolveCtx {
    Evaluated *ev;
    const Stmt *s;
    DiagList *diags;
    Dim dim;                 /* dimension of the equation's sides */
} SolveCtx;

static void set_var(Evaluated *ev, const Stmt *s, double x, DiagList *diags)
{
    StmtResult *v = &ev->results[s->var_slot];
    v->value.q.si = x;
    int changed = s->var_slot;
    eval_recompute(ev, &changed, 1, (size_t)s->index, diags);
}

/* Evaluate both sides of the equation as they stand. */
static bool equation_sides(Evaluated *ev, const Stmt *s, DiagList *diags, Value *l, Value *r)
{
    CallCtx cc;
    call_ctx_init(&cc, &ev->doc->arena, diags, ev->units, ev->doc->meta.code, ev->atmosphere);
    EvalCtx c = {ev, ev->doc, diags, &cc, 0};
    bool ok = eval_expr(&c, s->lhs, l);
    ok = eval_expr(&c, s->rhs, r) && ok;
    return ok && l->kind == VAL_NUMBER && r->kind == VAL_NUMBER;
}

static bool residual_at(double x, void *vctx, double *fx)
{
    SolveCtx *sc = vctx;
    sc->diags->muted++;
    set_var(sc->ev, sc->s, x, sc->diags);
    Value l, r;
    bool ok = equation_sides(sc->ev, sc->s, sc->diags, &l, &r);
    sc->diags->muted--;
    if (!ok)
        return false;
    *fx = l.q.si - r.q.si;
    return isfinite(*fx);
}

static void format_si(const Evaluated *ev, double si, Dim d, char *buf, size_t n)
{
    Unit u = unit_default(d, TEMP_NONE, ev->units);
    char num[48];
    num_sig(unit_from_si(si, &u, true), 4, num, sizeof num);
    if (dim_is_none(d) || strcmp(u.text, "1") == 0)
        snprintf(buf, n, "%s", num);
    else
        snprintf(buf, n, "%s %s", num, u.text);
}

/* Push the slots an expression reads (names, and records called as f(x)). */
static void expr_push_slots(const Expr *e, Vec *stack)
{
    if (!e)
        return;
    if (e->kind == EXPR_NAME && e->slot >= 0)
        vec_push(stack, (void *)(intptr_t)(e->slot + 1));
    if (e->kind == EXPR_CALL) {
        if (e->call->callee_slot >= 0)
            vec_push(stack, (void *)(intptr_t)(e->call->callee_slot + 1));
        for (size_t i = 0; i < e->call->nargs; i++)
            expr_push_slots(e->call->args[i], stack);
        for (size_t i = 0; i < e->call->nkw; i++)
            expr_push_slots(e->call->kw[i], stack);
    }
    expr_push_slots(e->lhs, stack);
    expr_push_slots(expr_rhs(e), stack);
}

/* Does the equation read `var` directly or through the statements it reads?
 * Iterative, over each statement once: a chain of 100,000 statements is no
 * deeper than one. A statement reads only statements above it, so only the
 * slots between `var` and the solve can lead to `var`: the marks cover
 * those, not the whole calc (a calc of many solves was quadratic). */
static bool equation_reads(const Document *doc, const Stmt *s, int var)
{
    Vec stack = {0};
    expr_push_slots(s->lhs, &stack);
    expr_push_slots(s->rhs, &stack);
    int hi = s->index < (int)doc->nstmts ? s->index : (int)doc->nstmts - 1;
    unsigned char *seen = xcalloc(hi > var ? (size_t)(hi - var) + 1 : 1, 1);
    bool found = false;
    while (stack.len > 0 && !found) {
        int slot = (int)(intptr_t)stack.items[--stack.len] - 1;
        if (slot == var) {
            found = true;
        } else if (slot > var && slot <= hi && !seen[slot - var]) {
            seen[slot - var] = 1;
            const Stmt *t = doc->stmts[slot];
            for (size_t k = 0; k < t->ndeps; k++)
                vec_push(&stack, (void *)(intptr_t)(t->deps[k] + 1));
        }
    }
    free(seen);
    vec_free(&stack);
    return found;
}

/* The slots an expression reads directly (names, the base of a field, a
 * record called as a function), each once, appended to *out. */
static void collect_reads(const Expr *e, int **out, size_t *n, size_t *cap)
{
    if (!e)
        return;
    int slot = -1;
    if (e->kind == EXPR_NAME)
        slot = e->slot;
    else if (e->kind == EXPR_CALL)
        slot = e->call->callee_slot;
    if (slot >= 0) {
        bool seen = false;
        for (size_t i = 0; i < *n && !seen; i++)
            seen = (*out)[i] == slot;
        if (!seen) {
            if (*n == *cap) {
                *cap = *cap ? 2 * *cap : 8;
                *out = xrealloc(*out, *cap * sizeof **out);
            }
            (*out)[(*n)++] = slot;
        }
    }
    collect_reads(e->lhs, out, n, cap);
    collect_reads(expr_rhs(e), out, n, cap);
    for (size_t i = 0; i < e->call->nargs; i++)
        collect_reads(e->call->args[i], out, n, cap);
    for (size_t i = 0; i < e->call->nkw; i++)
        collect_reads(e->call->kw[i], out, n, cap);
}

/* Keep what the equation reads at the root (set there by the caller). */
static void record_root_reads(Evaluated *ev, const Stmt *s, StmtSides *sd)
{
    int *slots = NULL;
    size_t n = 0, cap = 0;
    collect_reads(s->lhs, &slots, &n, &cap);
    collect_reads(s->rhs, &slots, &n, &cap);
    ReadValue *rv = n ? arena_alloc(&ev->doc->arena, n * sizeof *rv) : NULL;
    size_t k = 0;
    for (size_t i = 0; i < n; i++) {
        const StmtResult *r = &ev->results[slots[i]];
        if (r->state != RES_OK)
            continue;
        rv[k++] = (ReadValue){slots[i], r->value, *r->shown};
    }
    free(slots);
    sd->at_root = rv;
    sd->nat_root = k;
}

void eval_solve(Evaluated *ev, const Stmt *s, StmtResult *res, CallCtx *cc, DiagList *diags)
{
    EvalCtx c = {ev, ev->doc, diags, cc, 0};
    StmtResult *var = &ev->results[s->var_slot];
    if (var->state != RES_OK)
        return;
    if (var->value.kind != VAL_NUMBER) {
        diag_error(diags, s->solve->var_pos, "'%s' must be a number to be solved for", s->solve->var);
        res->state = RES_FAILED;
        return;
    }
    Value trial = var->value;
    /* Dimension check once, with errors shown, at the trial value. */
    Value l, r;
    bool ok = eval_expr(&c, s->lhs, &l);
    ok = eval_expr(&c, s->rhs, &r) && ok;
    if (!ok) {
        res->state = c.upstream && diags->errors == 0 ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    if (!eval_need_number(&c, s->lhs, &l, "the left side of the equation") ||
        !eval_need_number(&c, s->rhs, &r, "the right side of the equation")) {
        res->state = RES_FAILED;
        return;
    }
    if (!dim_eq(l.q.dim, r.q.dim)) {
        char dl[128], dr[128];
        eval_describe_operand(&c, s->lhs, &l, dl, sizeof dl);
        eval_describe_operand(&c, s->rhs, &r, dr, sizeof dr);
        diag_error(diags, s->lhs->pos, "the two sides of the equation differ: %s on the left, %s on the right", dl, dr);
        res->state = RES_FAILED;
        return;
    }
    if (!equation_reads(ev->doc, s, s->var_slot)) {
        /* an identity (5 = 5) holds for every value and a contradiction for
         * none: either way there is nothing to solve for */
        diag_error(diags, s->lhs->pos, "the equation does not depend on %s: no statement it reads "
                                       "uses %s, so solving cannot choose a value", s->solve->var, s->solve->var);
        res->state = RES_FAILED;
        return;
    }
    Value lo, hi;
    bool bracket = s->solve->lo && s->solve->hi;
    if (bracket) {
        bool okb = eval_expr(&c, s->solve->lo, &lo);
        okb = eval_expr(&c, s->solve->hi, &hi) && okb;
        if (!okb) {
            res->state = RES_FAILED;
            return;
        }
        const Value *ends[2] = {&lo, &hi};
        const Expr *ex[2] = {s->solve->lo, s->solve->hi};
        for (int k = 0; k < 2; k++) {
            if (ends[k]->kind != VAL_NUMBER || !dim_eq(ends[k]->q.dim, trial.q.dim)) {
                char de[128], dv[128];
                eval_describe_operand(&c, ex[k], ends[k], de, sizeof de);
                dim_describe(trial.q.dim, trial.q.temp, ev->units, dv, sizeof dv);
                diag_error(diags, ex[k]->pos, "the bracket must have the dimension of '%s', %s; found %s", s->solve->var, dv, de);
                res->state = RES_FAILED;
                return;
            }
        }
    }
    SolveCtx sc = {ev, s, diags, l.q.dim};
    /* Converge to the precision of the root itself (Brent's relative test,
     * 2*eps*|x|), not to a fraction of the trial value: a root far smaller
     * than the trial must still be resolved. The absolute floor only stops
     * the search at a root of exactly zero. */
    const double xtol = 1e-300;
    SolveReport rep = bracket ? solve_brent(residual_at, &sc, lo.q.si, hi.q.si, xtol)
                              : solve_expand(residual_at, &sc, trial.q.si, trial.q.si > 0, xtol);
    /* At the root: record both sides, then put the varied name back. A
     * bracketing method finds where the residual changes sign; if the sides
     * do not agree there (a pole or a jump, not a root), it is no root. */
    bool sign_change_only = false;
    StmtSides *sd = arena_alloc(&ev->doc->arena, sizeof *sd);
    res->sides = sd;
    /* the methods' values the row shows are those at the root, never at the
     * trial value the dimension check above used */
    cc->nuses = 0;
    if (rep.status == SOLVE_OK) {
        diags->muted++;
        set_var(ev, s, rep.root, diags);
        Value lr, rr;
        bool okr = equation_sides(ev, s, diags, &lr, &rr);
        if (okr) {
            Value lu, ru;   /* again through the row's own call context, for its method uses */
            if (!(eval_expr(&c, s->lhs, &lu) && eval_expr(&c, s->rhs, &ru)))
                cc->nuses = 0;
        }
        diags->muted--;
        if (okr) {
            record_root_reads(ev, s, sd);
            sd->lhs = lr;
            sd->rhs = rr;
            sd->lhs_shown = eval_display_unit(ev, &lr, NULL);
            sd->rhs_shown = eval_display_unit(ev, &rr, NULL);
            double size = fmax(fabs(lr.q.si), fabs(rr.q.si));
            sign_change_only = fabs(lr.q.si - rr.q.si) > 1e-6 * size;
        }
    }
    diags->muted++;
    var->value = trial;
    set_var(ev, s, trial.q.si, diags);
    diags->muted--;
    sd->solve = rep;
    if (rep.status == SOLVE_OK && sign_change_only) {
        char num[64], where[128], lv[96], rv[96];
        num_sig(unit_from_si(rep.root, var->shown, trial.q.temp == TEMP_NONE), 4, num, sizeof num);
        bool plain = var->shown->text[0] == '\0' || strcmp(var->shown->text, "1") == 0;
        snprintf(where, sizeof where, "%s%s%s", num, plain ? "" : " ", plain ? "" : var->shown->text);
        format_si(ev, sd->lhs.q.si, l.q.dim, lv, sizeof lv);
        format_si(ev, sd->rhs.q.si, l.q.dim, rv, sizeof rv);
        diag_error(diags, s->solve->lo ? s->solve->lo->pos : s->solve->var_pos,
                   "the equation changes sign near %s = %s but has no root there (left %s, right "
                   "%s): a pole or a jump in the bracket",
                   s->solve->var, where, lv, rv);
        res->state = RES_FAILED;
        return;
    }
    if (rep.status != SOLVE_OK) {
        char a[128], b[128], fa[96], fb[96];
        Unit vu = *var->shown;
        Value va = value_number(qty(rep.start_lo, trial.q.dim)), vb = value_number(qty(rep.start_hi, trial.q.dim));
        va.q.temp = vb.q.temp = trial.q.temp;
        va.q.pref = vb.q.pref = trial.q.pref;
        char na[40], nb[40];
        num_sig(unit_from_si(va.q.si, &vu, trial.q.temp == TEMP_NONE), 4, na, sizeof na);
        num_sig(unit_from_si(vb.q.si, &vu, trial.q.temp == TEMP_NONE), 4, nb, sizeof nb);
        bool plain = vu.text[0] == '\0' || strcmp(vu.text, "1") == 0;
        snprintf(a, sizeof a, "%s%s%s", na, plain ? "" : " ", plain ? "" : vu.text);
        snprintf(b, sizeof b, "%s%s%s", nb, plain ? "" : " ", plain ? "" : vu.text);
        format_si(ev, rep.f_lo, l.q.dim, fa, sizeof fa);
        format_si(ev, rep.f_hi, l.q.dim, fb, sizeof fb);
        Pos at = s->solve->lo ? s->solve->lo->pos : s->solve->var_pos;
        switch (rep.status) {
        case SOLVE_NO_BRACKET:
            diag_error(diags, at,
                       "no root of the equation between %s and %s: the residual (left - right) is %s "
                       "and %s there, of the same sign", a, b, fa, fb);
            break;
        case SOLVE_NOT_FINITE:
            if (bracket)
                diag_error(diags, at, "the equation cannot be evaluated everywhere between %s and %s "
                                      "(a value is not finite or a function fails there)", a, b);
            else
                diag_error(diags, at, "no root found by expanding around the trial value of '%s' "
                                      "(reached %s to %s); give a bracket with 'between LO and HI'", s->solve->var, a, b);
            break;
        case SOLVE_MAX_ITER:
            diag_error(diags, at, "the solver did not converge in %d iterations", SOLVE_MAX_ITERATIONS);
            break;
        default:
            break;
        }
        res->state = RES_FAILED;
        return;
    }
    Value v = value_number(qty(rep.root, trial.q.dim));
    v.q.temp = trial.q.temp;
    v.q.pref = trial.q.pref;
    if (!eval_as_fits(&c, s, &v)) {
        res->state = RES_FAILED;
        return;
    }
    if (s->has_as)
        v = eval_as_restate(ev, v, s->as->unit);
    res->value = v;
    res->shown = s->has_as ? s->as->unit : var->shown;
    res->state = RES_OK;
}
