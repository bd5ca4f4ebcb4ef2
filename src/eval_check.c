/* eval_check.c — `check LEFT OP RIGHT`: both sides a number of one
 * dimension and pressure reference, whether it holds, and its utilization. */
#include "eval_internal.h"

#include <math.h>
#include <string.h>

/* The unit an expression states for itself: a literal's unit, or the
 * display unit of a plain name; NULL for anything computed. */
const Unit *eval_written_unit(const Evaluated *ev, const Expr *e)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    if (!e)
        return NULL;
    if (e->kind == EXPR_NUMBER && e->has_unit)
        return e->unit;
    if (e->kind == EXPR_NAME && e->slot >= 0 && ev->results[e->slot].shown->text[0])
        return ev->results[e->slot].shown;
    return NULL;
}

void eval_check(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c)
{
    Value l, r;
    bool ok = eval_expr(c, s->lhs, &l);
    ok = eval_expr(c, s->rhs, &r) && ok;
    if (!ok) {
        res->state = c->upstream && !ok ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    if (!eval_need_number(c, s->lhs, &l, "the left side of a check") ||
        !eval_need_number(c, s->rhs, &r, "the right side of a check")) {
        res->state = RES_FAILED;
        return;
    }
    if (!dim_eq(l.q.dim, r.q.dim) || (l.q.temp == TEMP_NONE) != (r.q.temp == TEMP_NONE)) {
        char dl[128], dr[128];
        eval_describe_operand(c, s->lhs, &l, dl, sizeof dl);
        eval_describe_operand(c, s->rhs, &r, dr, sizeof dr);
        diag_error(c->diags, s->lhs->pos, "cannot compare %s with %s", dl, dr);
        res->state = RES_FAILED;
        return;
    }
    /* A plain pressure compares with a gauge point (it is read as gauge),
     * never with an absolute one. */
    if ((l.q.pref == PRES_ABSOLUTE) != (r.q.pref == PRES_ABSOLUTE)) {
        char dl[128], dr[128];
        eval_describe_operand(c, s->lhs, &l, dl, sizeof dl);
        eval_describe_operand(c, s->rhs, &r, dr, sizeof dr);
        bool left_abs = l.q.pref == PRES_ABSOLUTE;
        PressureRef other = left_abs ? r.q.pref : l.q.pref;
        diag_error(c->diags, s->lhs->pos,
                   "cannot compare %s with %s: state both on one reference first (write `as %s` "
                   "on the line that defines the %s one)", dl, dr, eval_ref_unit(c, PRES_ABSOLUTE),
                   other == PRES_GAUGE ? "gauge" : "plain");
        res->state = RES_FAILED;
        return;
    }
    double a = l.q.si, b = r.q.si;
    switch (s->cmp) {
    case CMP_LE: res->holds = a <= b; break;
    case CMP_LT: res->holds = a < b; break;
    case CMP_GE: res->holds = a >= b; break;
    case CMP_GT: res->holds = a > b; break;
    }
    double num = (s->cmp == CMP_LE || s->cmp == CMP_LT) ? a : b;
    double den = (s->cmp == CMP_LE || s->cmp == CMP_LT) ? b : a;
    /* A ratio of demand to limit means something only when both are
     * positive (a limit of zero or below, a gauge pressure below
     * atmospheric): otherwise there is no utilisation to report. */
    res->utilization = den > 0 && num >= 0 ? num / den : NAN;
    StmtSides *sd = arena_alloc(&ev->doc->arena, sizeof *sd);
    res->sides = sd;
    sd->lhs = l;
    sd->rhs = r;
    /* Both sides in one unit, so a reviewer compares like with like: the
     * unit the limit was written in (a literal's, or a name's display
     * unit), else the left side's, else the system's default. */
    const Unit *written = eval_written_unit(ev, s->rhs);
    if (!written)
        written = eval_written_unit(ev, s->lhs);
    sd->lhs_shown = sd->rhs_shown = written ? *written : eval_display_unit(ev, &l, NULL);
    res->state = RES_OK;
}
