/* eval.c — evaluating the statements of a document: expressions and the
 * statement loop.
 *
 * Sequential and dimension-checked: every operation checks its operands'
 * dimensions and temperature kinds and says, in the document's units, what
 * it found. A statement whose inputs failed is marked not evaluated and not
 * reported again. `solve` (eval_solve.c) varies an earlier name and
 * re-evaluates exactly the statements that depend on it (eval_recompute),
 * which parametric cases (cases.c) use too. The other statement kinds have
 * their own files (eval_internal.h lists them). The evaluator never formats
 * numbers for display: it picks display units (eval_display.c) and leaves
 * the digits to the renderers. */
#include "eval_internal.h"

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "lexicon.h"
#include "numfmt.h"
#include "uses.h"

/* ---- describing operands in messages ----------------------------------- */

/* "pressure (psi)": the dimension's word and the unit the operand was
 * written or is shown in. */
void eval_describe_operand(EvalCtx *c, const Expr *e, const Value *v, char *buf, size_t n)
{
    if (v->kind != VAL_NUMBER) {
        value_describe(v, c->ev->units, buf, n);
        return;
    }
    const char *unit = NULL;
    const Expr *inner = e;
    while (inner && inner->kind == EXPR_PAREN)
        inner = inner->lhs;
    Unit shown;
    if (inner && inner->kind == EXPR_NUMBER && inner->has_unit) {
        unit = inner->unit->text;
    } else if (inner && inner->kind == EXPR_NAME && inner->slot >= 0) {
        shown = *c->ev->results[inner->slot].shown;
        unit = shown.text[0] ? shown.text : NULL;
    }
    if (dim_is_none(v->q.dim)) {
        snprintf(buf, n, "a pure number");
        return;
    }
    const char *word = dim_name(v->q.dim);
    if (!unit) {
        shown = unit_default_ref(v->q.dim, v->q.temp, v->q.pref, c->ev->units);
        unit = shown.text;
    }
    if (v->q.temp != TEMP_NONE)
        snprintf(buf, n, "an absolute temperature (%s)", unit);
    else if (v->q.pref != PRES_PLAIN)
        snprintf(buf, n, "%s pressure (%s)", v->q.pref == PRES_GAUGE ? "a gauge" : "an absolute", unit);
    else if (word)
        snprintf(buf, n, "%s (%s)", word, unit);
    else
        snprintf(buf, n, "a quantity in %s", unit);
}

static bool fail_upstream(EvalCtx *c)
{
    c->upstream = 1;
    return false;
}

static bool finite_or_error(EvalCtx *c, Pos pos, double x, const char *what)
{
    if (isfinite(x))
        return true;
    diag_error(c->diags, pos, "%s: %s", what, isnan(x) ? "the result is not a number" : "the result overflows");
    return false;
}

bool eval_need_number(EvalCtx *c, const Expr *e, const Value *v, const char *role)
{
    if (v->kind == VAL_NUMBER)
        return true;
    char got[96];
    value_describe(v, c->ev->units, got, sizeof got);
    diag_error(c->diags, e->pos, "%s must be a number, found %s", role, got);
    return false;
}

static const char *op_verb(BinOp op)
{
    switch (op) {
    case OP_ADD: return "add";
    case OP_SUB: return "subtract";
    case OP_MUL: return "multiply";
    case OP_DIV: return "divide";
    case OP_POW: return "raise";
    }
    return "combine";
}

/* The unit that states `ref` in this calc's system, for the hints of the
 * messages below: "psia", "kPag". */
const char *eval_ref_unit(const EvalCtx *c, PressureRef ref)
{
    bool us = c->ev->units == UNITS_US;
    if (ref == PRES_ABSOLUTE)
        return us ? "psia" : "kPaa";
    return us ? "psig" : "kPag";
}

/* Addition and subtraction of pressures with a stated reference (DESIGN
 * 2.9): point - point of one reference is a plain pressure; point ± plain is
 * a point of that reference; a plain pressure minus a gauge point is plain
 * (a plain pressure is read as gauge). Two points added, a gauge and an
 * absolute point combined, and plain - absolute are errors that say how to
 * restate one side. */
static bool add_sub_pressure(EvalCtx *c, const Expr *e, const Value *a, const Value *b, Value *out)
{
    PressureRef ra = a->q.pref, rb = b->q.pref, kind = PRES_PLAIN;
    bool add = e->op == OP_ADD;
    char da[128], db[128];
    eval_describe_operand(c, e->lhs, a, da, sizeof da);
    eval_describe_operand(c, e->rhs, b, db, sizeof db);
    if (ra != PRES_PLAIN && rb != PRES_PLAIN && ra != rb) {
        if (add)
            diag_error(c->diags, e->pos,
                       "cannot add %s to %s: state both on one reference first (write `as %s` "
                       "on the line that defines the gauge one)", db, da, eval_ref_unit(c, PRES_ABSOLUTE));
        else
            diag_error(c->diags, e->pos,
                       "cannot subtract %s from %s: state both on one reference first (write "
                       "`as %s` on the line that defines the gauge one)", db, da, eval_ref_unit(c, PRES_ABSOLUTE));
        return false;
    }
    if (ra != PRES_PLAIN && rb != PRES_PLAIN) {
        if (add) {
            diag_error(c->diags, e->pos,
                       "cannot add two %s pressures (points on a scale); add a plain pressure "
                       "(psi, kPa, bar) to a point, or subtract two points", pressure_ref_name(ra));
            return false;
        }
        kind = PRES_PLAIN; /* a difference */
    } else if (ra != PRES_PLAIN) {
        kind = ra;
    } else if (rb == PRES_ABSOLUTE || (add && rb != PRES_PLAIN)) {
        if (!add) {
            diag_error(c->diags, e->pos,
                       "cannot subtract %s from %s, which states no reference (write `as %s` "
                       "on the line that defines it, or write it in %s)", db, da,
                       eval_ref_unit(c, PRES_ABSOLUTE), eval_ref_unit(c, PRES_ABSOLUTE));
            return false;
        }
        kind = rb;
    } else {
        kind = PRES_PLAIN; /* plain - gauge: both read as gauge */
    }
    double x = add ? a->q.si + b->q.si : a->q.si - b->q.si;
    if (!finite_or_error(c, e->pos, x, add ? "addition" : "subtraction"))
        return false;
    *out = value_number(qty(x, a->q.dim));
    out->q.pref = kind;
    return true;
}

/* A heat rate written in Btu/h stays in Btu/h (it is not shaft power, which
 * the US default shows in hp), through sums and scaling by pure numbers. */
static const char *const HEAT_RATE_HINT[2] = {"Btu/h", "kW"};

static bool heat_rate(const Value *v)
{
    return v->hint[UNITS_US] == HEAT_RATE_HINT[UNITS_US];
}

static void keep_heat_rate(const Value *a, const Value *b, Value *out)
{
    if (((heat_rate(a) && dim_eq(a->q.dim, DIM_POWER)) || (heat_rate(b) && dim_eq(b->q.dim, DIM_POWER))) &&
        dim_eq(out->q.dim, DIM_POWER)) {
        out->hint[UNITS_US] = HEAT_RATE_HINT[UNITS_US];
        out->hint[UNITS_SI] = HEAT_RATE_HINT[UNITS_SI];
    }
}

/* Addition and subtraction with the temperature rules of DESIGN 2.3:
 * absolute - absolute = difference; absolute ± difference = absolute;
 * absolute + absolute and difference - absolute are errors. */
static bool add_sub(EvalCtx *c, const Expr *e, const Value *a, const Value *b, Value *out)
{
    if (!dim_eq(a->q.dim, b->q.dim)) {
        char da[128], db[128];
        eval_describe_operand(c, e->lhs, a, da, sizeof da);
        eval_describe_operand(c, e->rhs, b, db, sizeof db);
        if (e->op == OP_ADD)
            diag_error(c->diags, e->pos, "cannot add %s to %s", db, da);
        else
            diag_error(c->diags, e->pos, "cannot subtract %s from %s", db, da);
        return false;
    }
    if (a->q.pref != PRES_PLAIN || b->q.pref != PRES_PLAIN)
        return add_sub_pressure(c, e, a, b, out);
    bool abs_a = a->q.temp != TEMP_NONE, abs_b = b->q.temp != TEMP_NONE;
    TempKind kind = TEMP_NONE;
    if (abs_a && abs_b) {
        if (e->op == OP_ADD) {
            diag_error(c->diags, e->pos,
                       "cannot add two absolute temperatures; add a temperature difference "
                       "(delta_degC, delta_degF) instead");
            return false;
        }
        kind = TEMP_NONE; /* a difference */
    } else if (abs_a) {
        kind = a->q.temp;
    } else if (abs_b) {
        if (e->op == OP_SUB) {
            diag_error(c->diags, e->pos, "cannot subtract an absolute temperature from a temperature difference");
            return false;
        }
        kind = b->q.temp;
    }
    double x = e->op == OP_ADD ? a->q.si + b->q.si : a->q.si - b->q.si;
    if (!finite_or_error(c, e->pos, x, e->op == OP_ADD ? "addition" : "subtraction"))
        return false;
    *out = value_number(qty(x, a->q.dim));
    out->q.temp = kind;
    return true;
}

static bool scalable(EvalCtx *c, const Expr *at, const Value *v, BinOp op)
{
    if (v->q.pref != PRES_PLAIN) {
        diag_error(c->diags, at->pos,
                   "cannot %s %s pressure (a point on a scale); subtract a point of the same "
                   "reference first, as in (p - 0 %s), to get a plain pressure",
                   op_verb(op), v->q.pref == PRES_GAUGE ? "a gauge" : "an absolute",
                   eval_ref_unit(c, v->q.pref));
        return false;
    }
    if (v->q.temp != TEMP_ABSOLUTE_OFFSET)
        return true;
    diag_error(c->diags, at->pos,
               "cannot %s an absolute temperature on the Celsius or Fahrenheit scale; use a "
               "difference (delta_degC, delta_degF) or kelvin", op_verb(op));
    return false;
}

/* A number, TEMP_NONE and PRES_PLAIN, dimension left to the caller: what
 * value_number(qty(si, d)) makes, field by field. */
static void put_number(Value *out, double si)
{
    memset(out, 0, sizeof *out);
    out->kind = VAL_NUMBER;
    out->q.si = si;
    out->q.temp = TEMP_NONE;
    out->q.pref = PRES_PLAIN;
}

static bool eval_binary(EvalCtx *c, const Expr *e, Value *out)
{
    Value a, b;
    bool ok_a = eval_expr(c, e->lhs, &a);
    bool ok_b = eval_expr(c, e->rhs, &b);
    if (!ok_a || !ok_b)
        return false;
    if (!eval_need_number(c, e->lhs, &a, "the left operand") || !eval_need_number(c, e->rhs, &b, "the right operand"))
        return false;
    switch (e->op) {
    case OP_ADD:
    case OP_SUB:
        if (!add_sub(c, e, &a, &b, out))
            return false;
        keep_heat_rate(&a, &b, out);
        return true;
    case OP_MUL:
    case OP_DIV: {
        if (!scalable(c, e->lhs, &a, e->op) || !scalable(c, e->rhs, &b, e->op))
            return false;
        if (e->op == OP_DIV && b.q.si == 0) {
            diag_error(c->diags, e->pos, "division by zero");
            return false;
        }
        double x = e->op == OP_MUL ? a.q.si * b.q.si : a.q.si / b.q.si;
        if (!finite_or_error(c, e->pos, x, e->op == OP_MUL ? "multiplication" : "division"))
            return false;
        /* written into *out a field at a time: built in a temporary and
         * copied, its 8-byte stores were read back in 16-byte pieces */
        put_number(out, x);
        for (int i = 0; i < DIM_COUNT; i++)
            out->q.dim.e[i] = dim_exp_round(e->op == OP_MUL ? a.q.dim.e[i] + b.q.dim.e[i] : a.q.dim.e[i] - b.q.dim.e[i]);
        if (dim_is_none(a.q.dim) || dim_is_none(b.q.dim))
            keep_heat_rate(&a, &b, out);
        return true;
    }
    case OP_POW: {
        if (!dim_is_none(b.q.dim)) {
            char db[128];
            eval_describe_operand(c, e->rhs, &b, db, sizeof db);
            diag_error(c->diags, e->rhs->pos, "an exponent must be a pure number, found %s", db);
            return false;
        }
        if (!scalable(c, e->lhs, &a, e->op))
            return false;
        double p = b.q.si;
        if (a.q.si < 0 && p != floor(p)) {
            diag_error(c->diags, e->pos, "cannot raise a negative number to the fractional power %g", p);
            return false;
        }
        if (a.q.si == 0 && p < 0) {
            diag_error(c->diags, e->pos, "division by zero: zero raised to a negative power");
            return false;
        }
        double x = pow(a.q.si, p);
        if (!finite_or_error(c, e->pos, x, "power"))
            return false;
        *out = value_number(qty(x, dim_pow(a.q.dim, p)));
        return true;
    }
    }
    return false;
}

/* NAME = use("file.calc.md"): the used calc's values as a record. The
 * files it used are the user's too, so the list stays transitive. */
static bool eval_use(EvalCtx *c, const Expr *e, Value *out)
{
    Evaluated *ev = c->ev;
    const UsedFile *u = use_set_resolve(ev->uses, c->doc, e->call->args[0]->text, e->call->args[0]->pos, c->diags);
    if (!u)
        return false;
    size_t add = 1 + u->ev->nused;
    const UsedFile **list = arena_alloc(&c->doc->arena, (ev->nused + add) * sizeof *list);
    if (ev->nused)
        memcpy(list, ev->used, ev->nused * sizeof *list);
    size_t n = ev->nused;
    for (size_t i = 0; i < add; i++) {
        const UsedFile *f = i + 1 < add ? u->ev->used[i] : u;
        bool seen = false;
        for (size_t k = 0; k < n && !seen; k++)
            seen = list[k] == f;
        if (!seen)
            list[n++] = f;
    }
    ev->used = list;
    ev->nused = n;
    *out = u->record;
    return true;
}

static bool eval_call(EvalCtx *c, const Expr *e, Value *out)
{
    if (e->call->callee_slot < 0 && strcmp(e->text, "use") == 0 && e->call->nargs == 1 &&
        e->call->args[0]->kind == EXPR_STRING)
        return eval_use(c, e, out);
    size_t n = e->call->nargs, nk = e->call->nkw;
    Value *args = arena_alloc(&c->doc->arena, (n + 1) * sizeof *args);
    Pos *apos = arena_alloc(&c->doc->arena, (n + 1) * sizeof *apos);
    Value *kw = arena_alloc(&c->doc->arena, (nk + 1) * sizeof *kw);
    bool ok = true;
    for (size_t i = 0; i < n; i++) {
        ok = eval_expr(c, e->call->args[i], &args[i]) && ok;
        apos[i] = e->call->args[i]->pos;
    }
    for (size_t i = 0; i < nk; i++)
        ok = eval_expr(c, e->call->kw[i], &kw[i]) && ok;
    if (!ok)
        return false;
    CallArgs ca = {n, args, apos, nk, e->call->kw_names, kw, e->call->kw_pos, e->pos, e->text};

    if (e->call->callee_slot >= 0) {
        const StmtResult *r = &c->ev->results[e->call->callee_slot];
        if (r->state != RES_OK)
            return fail_upstream(c);
        if (r->value.kind != VAL_RECORD || !r->value.rec->call) {
            char got[96];
            value_describe(&r->value, c->ev->units, got, sizeof got);
            diag_error(c->diags, e->pos, "'%s' is %s and cannot be called", e->text, got);
            return false;
        }
        return r->value.rec->call(c->call, r->value.rec, &ca, out);
    }
    const Builtin *b = builtin_lookup(e->text);
    if (!b) {
        diag_error(c->diags, e->pos, "unknown function '%s'", e->text);
        return false;
    }
    if ((int)n < b->min_args || (b->max_args >= 0 && (int)n > b->max_args)) {
        if (b->min_args == b->max_args)
            diag_error(c->diags, e->pos, "%s takes %d argument%s, found %zu", b->name, b->min_args,
                       b->min_args == 1 ? "" : "s", n);
        else if (b->max_args < 0)
            diag_error(c->diags, e->pos, "%s takes at least %d argument%s, found %zu", b->name, b->min_args,
                       b->min_args == 1 ? "" : "s", n);
        else
            diag_error(c->diags, e->pos, "%s takes %d to %d arguments, found %zu", b->name, b->min_args,
                       b->max_args, n);
        return false;
    }
    /* Keywords are checked here, once for every function, against its
     * builtins.def entry, so a misspelt or unsupported keyword can never be
     * ignored silently. */
    if (!builtin_keywords_ok(c->call, b, &ca))
        return false;
    size_t before = c->diags->errors;
    if (!b->fn(c->call, &ca, out)) {
        if (c->diags->errors == before && c->diags->muted == 0)
            diag_error(c->diags, e->pos, "%s: cannot be evaluated with these arguments", b->name);
        return false;
    }
    if (out->kind == VAL_NUMBER && !finite_or_error(c, e->pos, out->q.si, b->name))
        return false;
    return true;
}

bool eval_expr(EvalCtx *c, const Expr *e, Value *out)
{
    switch (e->kind) {
    case EXPR_NUMBER:
        if (!isfinite(e->number)) {
            diag_error(c->diags, e->pos, "number '%s' is out of range", e->text);
            return false;
        }
        put_number(out, e->has_unit ? e->number * e->unit->factor + e->unit->offset : e->number); /* unit_to_qty */
        out->q.dim = e->has_unit ? e->unit->dim : DIM_NONE;
        if (e->has_unit) {
            out->q.temp = e->unit->temp;
            out->q.pref = e->unit->pref;
        }
        if (out->q.pref == PRES_ABSOLUTE)
            c->ev->atmosphere_used = true;
        if (e->has_unit && dim_eq(out->q.dim, DIM_POWER) && strstr(e->unit->text, "Btu")) {
            out->hint[UNITS_US] = HEAT_RATE_HINT[UNITS_US];
            out->hint[UNITS_SI] = HEAT_RATE_HINT[UNITS_SI];
        }
        return finite_or_error(c, e->pos, out->q.si, "number");
    case EXPR_STRING:
        *out = value_string(e->text);
        return true;
    case EXPR_NAME:
        if (eval_constant(e->slot, out))
            return true;
        if (e->slot < 0 || c->ev->results[e->slot].state != RES_OK)
            return fail_upstream(c);
        *out = c->ev->results[e->slot].value;
        return true;
    case EXPR_PAREN:
        return eval_expr(c, e->lhs, out);
    case EXPR_NEG: {
        Value v;
        if (e->lhs->kind == EXPR_NUMBER && e->lhs->has_unit && e->lhs->unit->temp != TEMP_NONE) {
            /* -10 degC is a temperature written with a sign, a point below
             * zero on its scale: the literal -10 in degC, not a negation. */
            *out = value_number(unit_to_qty(-e->lhs->number, e->lhs->unit));
            return true;
        }
        if (!eval_expr(c, e->lhs, &v))
            return false;
        if (!eval_need_number(c, e->lhs, &v, "the operand of '-'"))
            return false;
        if (v.q.temp != TEMP_NONE) {
            diag_error(c->diags, e->pos, "cannot negate an absolute temperature");
            return false;
        }
        if (v.q.pref != PRES_PLAIN) {
            diag_error(c->diags, e->pos, "cannot negate %s pressure (a point on a scale)",
                       v.q.pref == PRES_GAUGE ? "a gauge" : "an absolute");
            return false;
        }
        v.q.si = -v.q.si;
        *out = v;
        return true;
    }
    case EXPR_BINARY:
        return eval_binary(c, e, out);
    case EXPR_FIELD: {
        Value base;
        if (!eval_expr(c, e->lhs, &base))
            return false;
        if (base.kind != VAL_RECORD) {
            char got[96];
            value_describe(&base, c->ev->units, got, sizeof got);
            diag_error(c->diags, e->pos, "'.%s' reads a field of a record, but this is %s", e->text, got);
            return false;
        }
        const Value *f = record_get(base.rec, e->text);
        if (!f) {
            char list[512] = "";
            size_t len = 0;
            for (size_t i = 0; i < base.rec->nfields && len < sizeof list - 40; i++)
                len += (size_t)snprintf(list + len, sizeof list - len, "%s%s", i ? ", " : "", base.rec->fields[i].name);
            diag_error(c->diags, e->pos, "a %s record has no field '%s' (it has: %s)", base.rec->type, e->text, list);
            return false;
        }
        *out = *f;
        return true;
    }
    case EXPR_CALL:
        return eval_call(c, e, out);
    }
    return false;
}

bool eval_constant(int slot, Value *out)
{
    const NamedConstant *k = lexicon_constant_at(slot);
    if (!k)
        return false;
    *out = value_number(qty(k->si, *k->dim));
    return true;
}

const Value *eval_read(const Evaluated *ev, const StmtResult *row, int slot, Unit *shown)
{
    if (!ev || slot < 0 || (size_t)slot >= ev->doc->nstmts)
        return NULL;
    if (row)
        for (size_t i = 0; i < row->sides->nat_root; i++)
            if (row->sides->at_root[i].slot == slot) {
                *shown = row->sides->at_root[i].shown;
                return &row->sides->at_root[i].value;
            }
    const StmtResult *r = &ev->results[slot];
    if (r->state != RES_OK)
        return NULL;
    *shown = *r->shown;
    return &r->value;
}

/* ---- statements --------------------------------------------------------- */

const StmtSides eval_no_sides;
const StmtMade eval_made_none;

const StmtMade *eval_made(Evaluated *ev, StmtMade made)
{
    StmtMade *m = arena_alloc(&ev->doc->arena, sizeof *m);
    *m = made;
    return m;
}

static void eval_statement(Evaluated *ev, size_t i, DiagList *diags)
{
    const Stmt *s = ev->doc->stmts[i];
    StmtResult *res = &ev->results[i];
    /* a re-evaluation (solve trials, case rows) keeps the warnings of the
     * evaluation the report shows */
    const char *const *warnings = res->warnings;
    size_t nwarnings = res->nwarnings;
    const Method *const *methods = res->methods;
    size_t nmethods = res->nmethods;
    memset(res, 0, sizeof *res);
    res->sides = &eval_no_sides;
    res->made = &eval_made_none;
    res->shown = &unit_blank;
    res->warnings = warnings;
    res->nwarnings = (uint32_t)nwarnings;
    if (s->parse_failed || s->kind == STMT_NOTE)
        return;
    for (size_t k = 0; k < s->ndeps; k++)
        if (ev->results[s->deps[k]].state != RES_OK)
            return; /* not evaluated: an input failed */
    CallCtx cc;
    call_ctx_init(&cc, &ev->doc->arena, diags, ev->units, ev->doc->meta.code, ev->atmosphere);
    EvalCtx c = {ev, ev->doc, diags, &cc, 0};
    switch (s->kind) {
    case STMT_DEF: {
        Value v;
        if (!eval_expr(&c, s->expr, &v)) {
            res->state = c.upstream ? RES_NOT_EVALUATED : RES_FAILED;
            break;
        }
        if (!eval_as_fits(&c, s, &v)) {
            res->state = RES_FAILED;
            break;
        }
        if (s->has_as)
            v = eval_as_restate(ev, v, s->as->unit);
        res->value = v;
        if (v.kind == VAL_NUMBER) {
            /* A plain reference to another name keeps that name's unit. */
            const Expr *e = s->expr;
            while (e->kind == EXPR_PAREN)
                e = e->lhs;
            if (!s->has_as && e->kind == EXPR_NAME && e->slot >= 0)
                res->shown = ev->results[e->slot].shown;
            else
                res->shown = s->has_as ? s->as->unit : eval_shown_unit(ev, &v);
        }
        res->state = RES_OK;
        break;
    }
    case STMT_SOLVE:
        eval_solve(ev, s, res, &cc, diags);
        break;
    case STMT_CHECK:
        eval_check(ev, s, res, &c);
        break;
    case STMT_PATH:
        eval_path(ev, s, res, &c);
        break;
    case STMT_NETWORK:
        eval_network(ev, s, res, &c);
        break;
    case STMT_FIGURE:
        eval_figure(s, res, &c);
        break;
    case STMT_CURVE:
        eval_curve(s, res, &c);
        break;
    case STMT_NOTE:
        break;
    }
    /* the methods the line used, kept in the arena only when they change
     * (a re-evaluation almost always uses the same ones) */
    if (cc.nmethods && nmethods == cc.nmethods && memcmp(methods, cc.methods, nmethods * sizeof *methods) == 0) {
        res->methods = methods;
    } else if (cc.nmethods) {
        const Method **m = arena_alloc(&ev->doc->arena, cc.nmethods * sizeof *m);
        memcpy(m, cc.methods, cc.nmethods * sizeof *m);
        res->methods = m;
    }
    res->nmethods = (uint32_t)cc.nmethods;
    res->uses = NULL;
    res->nuses = 0;
    if (cc.nuses && res->state == RES_OK) {
        MethodUse *u = arena_alloc(&ev->doc->arena, cc.nuses * sizeof *u);
        memcpy(u, cc.uses, cc.nuses * sizeof *u);
        res->uses = u;
        res->nuses = (uint32_t)cc.nuses;
    }
    if (!res->made->table && res->state == RES_OK && cc.table)
        res->made = eval_made(ev, (StmtMade){.table = cc.table});
    if (cc.atmosphere_used)
        ev->atmosphere_used = true;
}

void eval_recompute(Evaluated *ev, const int *changed, size_t nchanged, size_t upto, DiagList *diags)
{
    size_t n = ev->doc->nstmts;
    if (upto > n)
        upto = n;
    if (nchanged == 0)
        return;
    int first = changed[0];
    for (size_t k = 1; k < nchanged; k++)
        if (changed[k] < first)
            first = changed[k];
    if (first < 0 || (size_t)first >= upto)
        return;
    /* Dirty marks for statements first..upto-1 only (nothing before the
     * first change can be dirty), so a solver iteration costs what it scans,
     * not the length of the calc. */
    size_t m = upto - (size_t)first;
    unsigned char stack_marks[256];
    unsigned char *dirty = m <= sizeof stack_marks ? stack_marks : xcalloc(m, 1);
    if (dirty == stack_marks)
        memset(dirty, 0, m);
    for (size_t k = 0; k < nchanged; k++)
        if (changed[k] >= first && (size_t)changed[k] < upto)
            dirty[(size_t)changed[k] - (size_t)first] = 1;
    for (size_t i = (size_t)first + 1; i < upto; i++) {
        const Stmt *s = ev->doc->stmts[i];
        bool hit = false;
        for (size_t k = 0; k < s->ndeps && !hit; k++)
            hit = s->deps[k] >= first && (size_t)s->deps[k] < upto && dirty[(size_t)s->deps[k] - (size_t)first] != 0;
        if (s->kind == STMT_SOLVE && s->var_slot >= first && (size_t)s->var_slot < upto &&
            dirty[(size_t)s->var_slot - (size_t)first])
            hit = true;
        if (!hit)
            continue;
        eval_statement(ev, i, diags);
        dirty[i - (size_t)first] = 1;
    }
    if (dirty != stack_marks)
        free(dirty);
}

static void note_methods(Evaluated *ev, const StmtResult *r, Vec *all)
{
    for (size_t k = 0; k < r->nmethods; k++) {
        bool seen = false;
        for (size_t j = 0; j < all->len && !seen; j++)
            seen = method_same(all->items[j], r->methods[k]);
        if (!seen)
            vec_push(all, (void *)r->methods[k]);
    }
    (void)ev;
}

const Value *eval_named_value_at(const Evaluated *ev, const StmtResult *row, const Expr *e,
                                 Unit *shown)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    if (!e)
        return NULL;
    if (e->kind == EXPR_NAME)
        return eval_read(ev, row, e->slot, shown);
    if (e->kind != EXPR_FIELD)
        return NULL;
    Unit ignored;
    const Value *base = eval_named_value_at(ev, row, e->lhs, &ignored);
    if (!base || base->kind != VAL_RECORD || !base->rec)
        return NULL;
    const Value *f = record_get(base->rec, e->text);
    if (f)
        *shown = eval_display_unit(ev, f, NULL);
    return f;
}

const Value *eval_named_value(const Evaluated *ev, const Expr *e, Unit *shown)
{
    return eval_named_value_at(ev, NULL, e, shown);
}

/* The warnings statement i's evaluation added (diagnostics from `before`
 * on), kept with its result so every report shows them beside the row. */
static void keep_warnings(Evaluated *ev, size_t i, const DiagList *diags, size_t before)
{
    size_t n = 0;
    for (size_t k = before; k < diags->len; k++)
        n += diags->items[k].severity == SEV_WARNING;
    if (!n)
        return;
    const char **w = arena_alloc(&ev->doc->arena, n * sizeof *w);
    size_t j = 0;
    for (size_t k = before; k < diags->len; k++)
        if (diags->items[k].severity == SEV_WARNING)
            w[j++] = arena_strdup(&ev->doc->arena, diags->items[k].message);
    ev->results[i].warnings = w;
    ev->results[i].nwarnings = (uint32_t)n;
    ev->nwarnings += n;
}

Evaluated *eval_document(Document *doc, DiagList *diags)
{
    if (!doc->own_uses)
        doc->own_uses = use_set_new();
    return eval_document_in(doc, doc->own_uses, diags);
}

Evaluated *eval_document_in(Document *doc, UseSet *uses, DiagList *diags)
{
    Evaluated *ev = arena_alloc(&doc->arena, sizeof *ev);
    ev->doc = doc;
    ev->uses = uses;
    use_set_enter(uses, doc);
    ev->units = doc->meta.units;
    ev->digits = doc->meta.digits;
    ev->atmosphere = doc->meta.atmosphere > 0 ? doc->meta.atmosphere : UNIT_STANDARD_ATMOSPHERE;
    ev->atmosphere_used = doc->meta.atm_source != ATM_STANDARD;
    ev->results = arena_alloc(&doc->arena, (doc->nstmts + 1) * sizeof *ev->results);
    Vec all = {0};
    for (size_t i = 0; i < doc->nstmts; i++) {
        size_t before = diags->len;
        eval_statement(ev, i, diags);
        keep_warnings(ev, i, diags, before);
        const StmtResult *r = &ev->results[i];
        note_methods(ev, r, &all);
        if (doc->stmts[i]->kind == STMT_CHECK && doc->stmts[i]->finding && r->state == RES_OK) {
            ev->nfindings++;
            ev->nfindings_yes += r->holds;
        } else if (doc->stmts[i]->kind == STMT_CHECK && r->state == RES_OK) {
            ev->nchecks++;
            if (!r->holds)
                ev->nfailed++;
        }
    }
    eval_check_inlines(ev, doc->blocks, diags);
    ev->ncases = doc->ncases;
    ev->cases = arena_alloc(&doc->arena, (doc->ncases + 1) * sizeof *ev->cases);
    for (size_t i = 0; i < doc->ncases; i++) {
        eval_cases(ev, doc->cases[i], &ev->cases[i], diags);
        ev->case_rows_failing += ev->cases[i].rows_failing;
    }
    ev->nmethods = all.len;
    ev->methods = arena_alloc(&doc->arena, (all.len + 1) * sizeof *ev->methods);
    for (size_t i = 0; i < all.len; i++)
        ev->methods[i] = all.items[i];
    vec_free(&all);
    use_set_leave(uses);
    return ev;
}
