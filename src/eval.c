/* eval.c — evaluating the statements of a document.
 *
 * Sequential and dimension-checked: every operation checks its operands'
 * dimensions and temperature kinds and says, in the document's units, what
 * it found. A statement whose inputs failed is marked not evaluated and not
 * reported again. `solve` varies an earlier name and re-evaluates exactly the
 * statements that depend on it (eval_recompute), which parametric cases use
 * too. The evaluator never formats numbers for display: it picks display
 * units and leaves the digits to the renderers. */
#include "eval.h"

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "flow.h"
#include "network.h"
#include "methods/devices_lib.h"
#include "numfmt.h"
#include "uses.h"

typedef struct Ctx {
    Evaluated *ev;
    Document *doc;
    DiagList *diags;
    CallCtx *call;           /* the statement's method list */
    int upstream;            /* an input failed earlier: say nothing more */
} Ctx;

static const double STANDARD_GRAVITY = 9.80665; /* m/s^2, exact (CGPM 1901) */

/* ---- describing operands in messages ----------------------------------- */

/* "pressure (psi)": the dimension's word and the unit the operand was
 * written or is shown in. */
static void describe_operand(Ctx *c, const Expr *e, const Value *v, char *buf, size_t n)
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
        unit = inner->unit.text;
    } else if (inner && inner->kind == EXPR_NAME && inner->slot >= 0) {
        shown = c->ev->results[inner->slot].shown;
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

static bool fail_upstream(Ctx *c)
{
    c->upstream = 1;
    return false;
}

static bool finite_or_error(Ctx *c, Pos pos, double x, const char *what)
{
    if (isfinite(x))
        return true;
    diag_error(c->diags, pos, "%s: %s", what, isnan(x) ? "the result is not a number" : "the result overflows");
    return false;
}

static bool eval_expr(Ctx *c, const Expr *e, Value *out);

static bool need_number(Ctx *c, const Expr *e, const Value *v, const char *role)
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
static const char *ref_unit(const Ctx *c, PressureRef ref)
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
static bool add_sub_pressure(Ctx *c, const Expr *e, const Value *a, const Value *b, Value *out)
{
    PressureRef ra = a->q.pref, rb = b->q.pref, kind = PRES_PLAIN;
    bool add = e->op == OP_ADD;
    char da[128], db[128];
    describe_operand(c, e->lhs, a, da, sizeof da);
    describe_operand(c, e->rhs, b, db, sizeof db);
    if (ra != PRES_PLAIN && rb != PRES_PLAIN && ra != rb) {
        if (add)
            diag_error(c->diags, e->pos,
                       "cannot add %s to %s: state both on one reference first (write `as %s` "
                       "on the line that defines the gauge one)", db, da, ref_unit(c, PRES_ABSOLUTE));
        else
            diag_error(c->diags, e->pos,
                       "cannot subtract %s from %s: state both on one reference first (write "
                       "`as %s` on the line that defines the gauge one)", db, da, ref_unit(c, PRES_ABSOLUTE));
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
                       ref_unit(c, PRES_ABSOLUTE), ref_unit(c, PRES_ABSOLUTE));
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
    if (dim_eq(out->q.dim, DIM_POWER) && ((heat_rate(a) && dim_eq(a->q.dim, DIM_POWER)) ||
                                          (heat_rate(b) && dim_eq(b->q.dim, DIM_POWER)))) {
        out->hint[UNITS_US] = HEAT_RATE_HINT[UNITS_US];
        out->hint[UNITS_SI] = HEAT_RATE_HINT[UNITS_SI];
    }
}

/* Addition and subtraction with the temperature rules of DESIGN 2.3:
 * absolute - absolute = difference; absolute ± difference = absolute;
 * absolute + absolute and difference - absolute are errors. */
static bool add_sub(Ctx *c, const Expr *e, const Value *a, const Value *b, Value *out)
{
    if (!dim_eq(a->q.dim, b->q.dim)) {
        char da[128], db[128];
        describe_operand(c, e->lhs, a, da, sizeof da);
        describe_operand(c, e->rhs, b, db, sizeof db);
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

static bool scalable(Ctx *c, const Expr *at, const Value *v, BinOp op)
{
    if (v->q.pref != PRES_PLAIN) {
        diag_error(c->diags, at->pos,
                   "cannot %s %s pressure (a point on a scale); subtract a point of the same "
                   "reference first, as in (p - 0 %s), to get a plain pressure",
                   op_verb(op), v->q.pref == PRES_GAUGE ? "a gauge" : "an absolute",
                   ref_unit(c, v->q.pref));
        return false;
    }
    if (v->q.temp != TEMP_ABSOLUTE_OFFSET)
        return true;
    diag_error(c->diags, at->pos,
               "cannot %s an absolute temperature on the Celsius or Fahrenheit scale; use a "
               "difference (delta_degC, delta_degF) or kelvin", op_verb(op));
    return false;
}

static bool eval_binary(Ctx *c, const Expr *e, Value *out)
{
    Value a, b;
    bool ok_a = eval_expr(c, e->lhs, &a);
    bool ok_b = eval_expr(c, e->rhs, &b);
    if (!ok_a || !ok_b)
        return false;
    if (!need_number(c, e->lhs, &a, "the left operand") || !need_number(c, e->rhs, &b, "the right operand"))
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
        Dim d = e->op == OP_MUL ? dim_mul(a.q.dim, b.q.dim) : dim_div(a.q.dim, b.q.dim);
        *out = value_number(qty(x, d));
        if (dim_is_none(a.q.dim) || dim_is_none(b.q.dim))
            keep_heat_rate(&a, &b, out);
        return true;
    }
    case OP_POW: {
        if (!dim_is_none(b.q.dim)) {
            char db[128];
            describe_operand(c, e->rhs, &b, db, sizeof db);
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
static bool eval_use(Ctx *c, const Expr *e, Value *out)
{
    Evaluated *ev = c->ev;
    const UsedFile *u = use_set_resolve(ev->uses, c->doc, e->args[0]->text, e->args[0]->pos, c->diags);
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

static bool eval_call(Ctx *c, const Expr *e, Value *out)
{
    if (e->callee_slot < 0 && strcmp(e->text, "use") == 0 && e->nargs == 1 &&
        e->args[0]->kind == EXPR_STRING)
        return eval_use(c, e, out);
    size_t n = e->nargs, nk = e->nkw;
    Value *args = arena_alloc(&c->doc->arena, (n + 1) * sizeof *args);
    Pos *apos = arena_alloc(&c->doc->arena, (n + 1) * sizeof *apos);
    Value *kw = arena_alloc(&c->doc->arena, (nk + 1) * sizeof *kw);
    bool ok = true;
    for (size_t i = 0; i < n; i++) {
        ok = eval_expr(c, e->args[i], &args[i]) && ok;
        apos[i] = e->args[i]->pos;
    }
    for (size_t i = 0; i < nk; i++)
        ok = eval_expr(c, e->kw[i], &kw[i]) && ok;
    if (!ok)
        return false;
    CallArgs ca = {n, args, apos, nk, e->kw_names, kw, e->kw_pos, e->pos, e->text};

    if (e->callee_slot >= 0) {
        const StmtResult *r = &c->ev->results[e->callee_slot];
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
    /* Keywords are checked here, once for every function, so a misspelt or
     * unsupported keyword can never be ignored silently. */
    for (size_t i = 0; i < nk; i++) {
        const char *k = e->kw_names[i], *list = b->keywords;
        size_t kl = strlen(k);
        bool known = false;
        for (const char *p = list; *p && !known;) {
            const char *end = strchr(p, ' ');
            size_t wl = end ? (size_t)(end - p) : strlen(p);
            known = wl == kl && memcmp(p, k, wl) == 0;
            p += wl;
            while (*p == ' ')
                p++;
        }
        if (!known) {
            if (*list)
                diag_error(c->diags, e->kw_pos[i], "%s: unknown keyword '%s' (it takes: %s)", b->name, k, list);
            else
                diag_error(c->diags, e->kw_pos[i], "%s takes no keyword arguments, found '%s'", b->name, k);
            return false;
        }
    }
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

static bool eval_expr(Ctx *c, const Expr *e, Value *out)
{
    switch (e->kind) {
    case EXPR_NUMBER:
        if (!isfinite(e->number)) {
            diag_error(c->diags, e->pos, "number '%s' is out of range", e->text);
            return false;
        }
        *out = e->has_unit ? value_number(unit_to_qty(e->number, &e->unit)) : value_number(qty_number(e->number));
        if (out->q.pref == PRES_ABSOLUTE)
            c->ev->atmosphere_used = true;
        if (e->has_unit && dim_eq(out->q.dim, DIM_POWER) && strstr(e->unit.text, "Btu")) {
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
        if (e->lhs->kind == EXPR_NUMBER && e->lhs->has_unit && e->lhs->unit.temp != TEMP_NONE) {
            /* -10 degC is a temperature written with a sign, a point below
             * zero on its scale: the literal -10 in degC, not a negation. */
            *out = value_number(unit_to_qty(-e->lhs->number, &e->lhs->unit));
            return true;
        }
        if (!eval_expr(c, e->lhs, &v))
            return false;
        if (!need_number(c, e->lhs, &v, "the operand of '-'"))
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

/* ---- display units ------------------------------------------------------ */

static Unit display_default(const Value *v, UnitSystem sys)
{
    Unit u = unit_default(v->q.dim, v->q.temp, sys);
    bool difference = v->q.temp == TEMP_NONE || u.temp == TEMP_NONE;
    if (sys != UNITS_SI && isfinite(v->q.si) && !isfinite(unit_from_si(v->q.si, &u, difference)))
        return unit_default(v->q.dim, v->q.temp, UNITS_SI); /* too large for the customary unit */
    return u;
}

Unit eval_display_unit(const Evaluated *ev, const Value *v, const Unit *as_unit)
{
    if (as_unit)
        return *as_unit;
    if (v->q.pref != PRES_PLAIN)
        return unit_default_ref(v->q.dim, v->q.temp, v->q.pref, ev->units);
    const char *hint = v->hint[ev->units];
    if (hint) {
        Unit u;
        size_t bo, bl;
        if (unit_parse(hint, strlen(hint), &u, &bo, &bl) == UNIT_OK && dim_eq(u.dim, v->q.dim)) {
            bool difference = v->q.temp == TEMP_NONE || u.temp == TEMP_NONE;
            if (v->q.temp == TEMP_NONE && u.temp != TEMP_NONE)
                return display_default(v, ev->units);
            if (!isfinite(v->q.si) || isfinite(unit_from_si(v->q.si, &u, difference)))
                return u;
        }
    }
    return display_default(v, ev->units);
}

/* `as UNIT` must fit the value: same dimension, and a point shown in a
 * point unit, a difference in a difference unit. Shared by statements and
 * inline {name as unit} values. */
bool eval_unit_fits(DiagList *diags, UnitSystem sys, Pos at, const char *as_text, const Unit *u, const Value *v)
{
    if (v->kind != VAL_NUMBER) {
        diag_error(diags, at, "'as %s' needs a number, but the value is %s", as_text,
                   v->kind == VAL_STRING ? "a string" : "a record");
        return false;
    }
    if (!dim_eq(v->q.dim, u->dim)) {
        char dv[128], du[128];
        dim_describe(v->q.dim, v->q.temp, sys, dv, sizeof dv);
        dim_describe(u->dim, u->temp, sys, du, sizeof du);
        diag_error(diags, at, "cannot show %s in %s, which is %s", dv, as_text, du);
        return false;
    }
    if (v->q.temp != TEMP_NONE && u->temp == TEMP_NONE && u->offset == 0 &&
        strncmp(u->text, "delta_", 6) == 0) {
        diag_error(diags, at, "an absolute temperature is shown in degC, degF, K or degR, not %s", as_text);
        return false;
    }
    if (v->q.temp == TEMP_NONE && u->temp == TEMP_ABSOLUTE_OFFSET) {
        diag_error(diags, at, "this is a temperature difference; show it in delta_%s, not %s", as_text, as_text);
        return false;
    }
    if (v->q.pref == PRES_ABSOLUTE && u->pref == PRES_PLAIN) {
        diag_error(diags, at,
                   "an absolute pressure is shown in psia, kPaa, bara or MPaa, not %s; write "
                   "`as %s` for the pressure above the atmosphere",
                   as_text, sys == UNITS_US ? "psig" : "kPag");
        return false;
    }
    /* A point shown in a point unit converts with its offset; anything else
     * as a difference. The number shown must be a number. */
    bool difference = v->q.temp == TEMP_NONE || u->temp == TEMP_NONE;
    if (isfinite(v->q.si) && !isfinite(unit_from_si(v->q.si, u, difference))) {
        diag_error(diags, at, "the value is too large to show in %s (it overflows a double there)", as_text);
        return false;
    }
    return true;
}

/* `as UNIT` of a pressure restates its reference (DESIGN 2.9): `as psia` of
 * a plain or gauge pressure adds the atmosphere, `as psig` of an absolute
 * one takes it away, a gauge pressure shown in a plain unit becomes plain. */
static Value as_restate(Evaluated *ev, Value v, const Unit *u)
{
    if (v.kind != VAL_NUMBER || !dim_eq(v.q.dim, DIM_PRESSURE) || v.q.pref == u->pref)
        return v;
    if ((v.q.pref == PRES_ABSOLUTE) != (u->pref == PRES_ABSOLUTE))
        ev->atmosphere_used = true;
    v.q = qty_to_ref(v.q, u->pref, ev->atmosphere);
    return v;
}

static bool as_fits(Ctx *c, const Stmt *s, const Value *v)
{
    if (!s->has_as)
        return true;
    return eval_unit_fits(c->diags, c->ev->units, s->as_pos, s->as_text, &s->as_unit, v);
}

/* Inline {name}, {name.field} and {name as unit} in prose: the field must
 * exist and the unit must fit, or the prose would show a wrong number. */
static void check_inlines(Evaluated *ev, const Inline *in, DiagList *diags)
{
    for (; in; in = in->next) {
        if (in->children)
            check_inlines(ev, in->children, diags);
        if (in->kind != INL_VALUE || in->slot < 0 || ev->results[in->slot].state != RES_OK)
            continue;
        const Value *v = &ev->results[in->slot].value;
        if (in->field) {
            Pos fp = in->pos;
            fp.col += (int)strlen(in->text) + 1;
            if (v->kind != VAL_RECORD) {
                char got[96];
                value_describe(v, ev->units, got, sizeof got);
                diag_error(diags, fp, "'.%s' reads a field of a record, but '%s' is %s", in->field, in->text, got);
                continue;
            }
            const Value *f = record_get(v->rec, in->field);
            if (!f) {
                diag_error(diags, fp, "a %s record has no field '%s'", v->rec->type, in->field);
                continue;
            }
            v = f;
        }
        if (in->has_as)
            if (eval_unit_fits(diags, ev->units, in->pos, in->as_unit.text, &in->as_unit, v) &&
                (v->q.pref == PRES_ABSOLUTE) != (in->as_unit.pref == PRES_ABSOLUTE))
                diag_error(diags, in->pos,
                           "showing this pressure in %s adds or takes away the atmosphere; do it on a "
                           "calc line (NAME = ... as %s) and show that name", in->as_unit.text, in->as_unit.text);

    }
}

static void check_block_inlines(Evaluated *ev, const Block *b, DiagList *diags)
{
    for (; b; b = b->next) {
        check_inlines(ev, b->inlines, diags);
        check_block_inlines(ev, b->children, diags);
    }
}

/* ---- statements --------------------------------------------------------- */

static void eval_statement(Evaluated *ev, size_t i, DiagList *diags);

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
    CallCtx cc = {&ev->doc->arena, diags, ev->units, {0}, 0, ev->doc->meta.code, NULL, ev->atmosphere, false};
    Ctx c = {ev, ev->doc, diags, &cc, 0};
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
        if (e->callee_slot >= 0)
            vec_push(stack, (void *)(intptr_t)(e->callee_slot + 1));
        for (size_t i = 0; i < e->nargs; i++)
            expr_push_slots(e->args[i], stack);
        for (size_t i = 0; i < e->nkw; i++)
            expr_push_slots(e->kw[i], stack);
    }
    expr_push_slots(e->lhs, stack);
    expr_push_slots(e->rhs, stack);
}

/* Does the equation read `var` directly or through the statements it reads?
 * Iterative, over each statement once: a chain of 100,000 statements is no
 * deeper than one. */
static bool equation_reads(const Document *doc, const Stmt *s, int var)
{
    Vec stack = {0};
    expr_push_slots(s->lhs, &stack);
    expr_push_slots(s->rhs, &stack);
    unsigned char *seen = xcalloc(doc->nstmts + 1, 1);
    bool found = false;
    while (stack.len > 0 && !found) {
        int slot = (int)(intptr_t)stack.items[--stack.len] - 1;
        if (slot == var) {
            found = true;
        } else if (slot >= 0 && (size_t)slot < doc->nstmts && !seen[slot]) {
            seen[slot] = 1;
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
        slot = e->callee_slot;
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
    collect_reads(e->rhs, out, n, cap);
    for (size_t i = 0; i < e->nargs; i++)
        collect_reads(e->args[i], out, n, cap);
    for (size_t i = 0; i < e->nkw; i++)
        collect_reads(e->kw[i], out, n, cap);
}

/* Keep what the equation reads at the root (set there by the caller). */
static void record_root_reads(Evaluated *ev, const Stmt *s, StmtResult *res)
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
        rv[k++] = (ReadValue){slots[i], r->value, r->shown};
    }
    free(slots);
    res->at_root = rv;
    res->nat_root = k;
}

bool eval_constant(int slot, Value *out)
{
    if (slot == SLOT_PI)
        *out = value_number(qty_number(3.14159265358979323846));
    else if (slot == SLOT_G)
        *out = value_number(qty(STANDARD_GRAVITY, DIM_ACCEL));
    else
        return false;
    return true;
}

const Value *eval_read(const Evaluated *ev, const StmtResult *row, int slot, Unit *shown)
{
    if (!ev || slot < 0 || (size_t)slot >= ev->doc->nstmts)
        return NULL;
    if (row)
        for (size_t i = 0; i < row->nat_root; i++)
            if (row->at_root[i].slot == slot) {
                *shown = row->at_root[i].shown;
                return &row->at_root[i].value;
            }
    const StmtResult *r = &ev->results[slot];
    if (r->state != RES_OK)
        return NULL;
    *shown = r->shown;
    return &r->value;
}

static void eval_solve(Evaluated *ev, const Stmt *s, StmtResult *res, CallCtx *cc, DiagList *diags)
{
    Ctx c = {ev, ev->doc, diags, cc, 0};
    StmtResult *var = &ev->results[s->var_slot];
    if (var->state != RES_OK)
        return;
    if (var->value.kind != VAL_NUMBER) {
        diag_error(diags, s->var_pos, "'%s' must be a number to be solved for", s->var);
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
    if (!need_number(&c, s->lhs, &l, "the left side of the equation") ||
        !need_number(&c, s->rhs, &r, "the right side of the equation")) {
        res->state = RES_FAILED;
        return;
    }
    if (!dim_eq(l.q.dim, r.q.dim)) {
        char dl[128], dr[128];
        describe_operand(&c, s->lhs, &l, dl, sizeof dl);
        describe_operand(&c, s->rhs, &r, dr, sizeof dr);
        diag_error(diags, s->lhs->pos, "the two sides of the equation differ: %s on the left, %s on the right", dl, dr);
        res->state = RES_FAILED;
        return;
    }
    if (!equation_reads(ev->doc, s, s->var_slot)) {
        /* an identity (5 = 5) holds for every value and a contradiction for
         * none: either way there is nothing to solve for */
        diag_error(diags, s->lhs->pos, "the equation does not depend on %s: no statement it reads "
                                       "uses %s, so solving cannot choose a value", s->var, s->var);
        res->state = RES_FAILED;
        return;
    }
    Value lo, hi;
    bool bracket = s->lo && s->hi;
    if (bracket) {
        bool okb = eval_expr(&c, s->lo, &lo);
        okb = eval_expr(&c, s->hi, &hi) && okb;
        if (!okb) {
            res->state = RES_FAILED;
            return;
        }
        const Value *ends[2] = {&lo, &hi};
        const Expr *ex[2] = {s->lo, s->hi};
        for (int k = 0; k < 2; k++) {
            if (ends[k]->kind != VAL_NUMBER || !dim_eq(ends[k]->q.dim, trial.q.dim)) {
                char de[128], dv[128];
                describe_operand(&c, ex[k], ends[k], de, sizeof de);
                dim_describe(trial.q.dim, trial.q.temp, ev->units, dv, sizeof dv);
                diag_error(diags, ex[k]->pos, "the bracket must have the dimension of '%s', %s; found %s", s->var, dv, de);
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
    if (rep.status == SOLVE_OK) {
        diags->muted++;
        set_var(ev, s, rep.root, diags);
        Value lr, rr;
        bool okr = equation_sides(ev, s, diags, &lr, &rr);
        diags->muted--;
        if (okr) {
            record_root_reads(ev, s, res);
            res->lhs = lr;
            res->rhs = rr;
            res->lhs_shown = eval_display_unit(ev, &lr, NULL);
            res->rhs_shown = eval_display_unit(ev, &rr, NULL);
            double size = fmax(fabs(lr.q.si), fabs(rr.q.si));
            sign_change_only = fabs(lr.q.si - rr.q.si) > 1e-6 * size;
        }
    }
    diags->muted++;
    var->value = trial;
    set_var(ev, s, trial.q.si, diags);
    diags->muted--;
    res->solve = rep;
    if (rep.status == SOLVE_OK && sign_change_only) {
        char num[64], where[128], lv[96], rv[96];
        num_sig(unit_from_si(rep.root, &var->shown, trial.q.temp == TEMP_NONE), 4, num, sizeof num);
        bool plain = var->shown.text[0] == '\0' || strcmp(var->shown.text, "1") == 0;
        snprintf(where, sizeof where, "%s%s%s", num, plain ? "" : " ", plain ? "" : var->shown.text);
        format_si(ev, res->lhs.q.si, l.q.dim, lv, sizeof lv);
        format_si(ev, res->rhs.q.si, l.q.dim, rv, sizeof rv);
        diag_error(diags, s->lo ? s->lo->pos : s->var_pos,
                   "the equation changes sign near %s = %s but has no root there (left %s, right "
                   "%s): a pole or a jump in the bracket",
                   s->var, where, lv, rv);
        res->state = RES_FAILED;
        return;
    }
    if (rep.status != SOLVE_OK) {
        char a[128], b[128], fa[96], fb[96];
        Unit vu = var->shown;
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
        Pos at = s->lo ? s->lo->pos : s->var_pos;
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
                                      "(reached %s to %s); give a bracket with 'between LO and HI'", s->var, a, b);
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
    if (!as_fits(&c, s, &v)) {
        res->state = RES_FAILED;
        return;
    }
    if (s->has_as)
        v = as_restate(ev, v, &s->as_unit);
    res->value = v;
    res->shown = s->has_as ? s->as_unit : var->shown;
    res->state = RES_OK;
}

/* The unit an expression states for itself: a literal's unit, or the
 * display unit of a plain name; NULL for anything computed. */
static const Unit *written_unit(const Evaluated *ev, const Expr *e)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    if (!e)
        return NULL;
    if (e->kind == EXPR_NUMBER && e->has_unit)
        return &e->unit;
    if (e->kind == EXPR_NAME && e->slot >= 0 && ev->results[e->slot].shown.text[0])
        return &ev->results[e->slot].shown;
    return NULL;
}

static void eval_check(Evaluated *ev, const Stmt *s, StmtResult *res, Ctx *c)
{
    Value l, r;
    bool ok = eval_expr(c, s->lhs, &l);
    ok = eval_expr(c, s->rhs, &r) && ok;
    if (!ok) {
        res->state = c->upstream && !ok ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    if (!need_number(c, s->lhs, &l, "the left side of a check") ||
        !need_number(c, s->rhs, &r, "the right side of a check")) {
        res->state = RES_FAILED;
        return;
    }
    if (!dim_eq(l.q.dim, r.q.dim) || (l.q.temp == TEMP_NONE) != (r.q.temp == TEMP_NONE)) {
        char dl[128], dr[128];
        describe_operand(c, s->lhs, &l, dl, sizeof dl);
        describe_operand(c, s->rhs, &r, dr, sizeof dr);
        diag_error(c->diags, s->lhs->pos, "cannot compare %s with %s", dl, dr);
        res->state = RES_FAILED;
        return;
    }
    /* A plain pressure compares with a gauge point (it is read as gauge),
     * never with an absolute one. */
    if ((l.q.pref == PRES_ABSOLUTE) != (r.q.pref == PRES_ABSOLUTE)) {
        char dl[128], dr[128];
        describe_operand(c, s->lhs, &l, dl, sizeof dl);
        describe_operand(c, s->rhs, &r, dr, sizeof dr);
        bool left_abs = l.q.pref == PRES_ABSOLUTE;
        PressureRef other = left_abs ? r.q.pref : l.q.pref;
        diag_error(c->diags, s->lhs->pos,
                   "cannot compare %s with %s: state both on one reference first (write `as %s` "
                   "on the line that defines the %s one)", dl, dr, ref_unit(c, PRES_ABSOLUTE),
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
    res->lhs = l;
    res->rhs = r;
    /* Both sides in one unit, so a reviewer compares like with like: the
     * unit the limit was written in (a literal's, or a name's display
     * unit), else the left side's, else the system's default. */
    const Unit *written = written_unit(ev, s->rhs);
    if (!written)
        written = written_unit(ev, s->lhs);
    res->lhs_shown = res->rhs_shown = written ? *written : eval_display_unit(ev, &l, NULL);
    res->state = RES_OK;
}

/* A path: evaluate every cell, then the hydraulics (flow.c). */
/* The fixture load of every segment of a path with a fixtures column: the
 * fixtures taken off at a segment's outlet and at every outlet after it are
 * downstream of its inlet, so a segment's load is the sum of its own and
 * all later outlets' loads (a path is a single run). */
static bool path_loads(Ctx *c, const PathSpec *ps, SegmentInput *in)
{
    bool ok = true;
    double below = 0;
    for (size_t i = ps->nsegs; i-- > 0;) {
        const PathSegment *g = &ps->segs[i];
        double outlet = 0;
        in[i].fixture_each = arena_alloc(&c->doc->arena, (g->nfixtures + 1) * sizeof(double));
        in[i].fixture_total = arena_alloc(&c->doc->arena, (g->nfixtures + 1) * sizeof(double));
        for (size_t k = 0; k < g->nfixtures; k++) {
            double each;
            if (demand_item_load(c->call, g->fixtures[k].kind, g->fixtures[k].pos, &each)) {
                in[i].fixture_each[k] = each;
                in[i].fixture_total[k] = g->fixtures[k].count * each;
                outlet += in[i].fixture_total[k];
            } else {
                ok = false;
            }
        }
        below += outlet;
        in[i].has_load = true;
        in[i].load = below;
    }
    return ok;
}

static void eval_path(Evaluated *ev, const Stmt *s, StmtResult *res, Ctx *c)
{
    const PathSpec *ps = s->path;
    Value fluid, start;
    bool ok = eval_expr(c, ps->fluid, &fluid);
    ok = eval_expr(c, ps->start, &start) && ok;
    SegmentInput *in = arena_alloc(&ev->doc->arena, (ps->nsegs + 1) * sizeof *in);
    bool fixtures_ok = !ps->has_fixtures || path_loads(c, ps, in);
    for (size_t i = 0; i < ps->nsegs; i++) {
        const PathSegment *g = &ps->segs[i];
        if (g->flow)
            ok = eval_expr(c, g->flow, &in[i].flow) && ok;
        ok = eval_expr(c, g->pipe, &in[i].pipe) && ok;
        ok = eval_expr(c, g->length, &in[i].length) && ok;
        ok = eval_expr(c, g->rise, &in[i].rise) && ok;
        if (g->K) {
            in[i].has_K = true;
            ok = eval_expr(c, g->K, &in[i].K) && ok;
        }
        if (g->C) {
            in[i].has_C = true;
            ok = eval_expr(c, g->C, &in[i].C) && ok;
        }
        if (g->device) {
            in[i].has_device = true;
            ok = eval_expr(c, g->device, &in[i].device) && ok;
        }
    }
    if (!ok || !fixtures_ok) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    /* demand: each segment's flow is the demand of its summed load — loads
     * add, demands do not */
    for (size_t i = 0; i < ps->nsegs && ps->demand != PATH_DEMAND_NONE; i++) {
        double Q = 0;
        bool got = ps->demand == PATH_DEMAND_HUNTER
                       ? demand_hunter_flow(c->call, ps->demand_system, in[i].load, ps->demand_pos, &Q)
                       : demand_peak_flow(c->call, ps->demand_pos);
        if (!got) {
            res->state = RES_FAILED;
            return;
        }
        in[i].flow = value_hinted(qty(Q, DIM_FLOW), "gal/min", "L/s");
    }
    const PathResult *pr = NULL;
    if (!flow_path(c->call, s, &fluid, &start, in, &res->value, &pr)) {
        res->state = RES_FAILED;
        return;
    }
    res->path = pr;
    res->state = RES_OK;
}

/* A curve: every cell a number, each column of one dimension, the argument
 * strictly increasing (and for log-log both above zero); the record it
 * binds reads the table (methods/devices_lib.c). Each problem is reported
 * at its cell. */
static void eval_curve(const Stmt *s, StmtResult *res, Ctx *c)
{
    const CurveSpec *cs = s->curve;
    Arena *a = &c->doc->arena;
    size_t n = cs->npoints;
    Value *v = arena_alloc(a, (2 * n + 1) * sizeof *v);
    bool ok = true;
    for (size_t i = 0; i < n; i++) {
        ok = eval_expr(c, cs->x[i], &v[2 * i]) && ok;
        ok = eval_expr(c, cs->y[i], &v[2 * i + 1]) && ok;
    }
    if (!ok) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    CurveData *cd = arena_alloc(a, sizeof *cd);
    double *x = arena_alloc(a, (n + 1) * sizeof *x), *y = arena_alloc(a, (n + 1) * sizeof *y);
    const char *head[2] = {cs->x_head, cs->y_head};
    for (size_t i = 0; i < n && ok; i++) {
        for (size_t k = 0; k < 2; k++) {
            const Expr *e = k ? cs->y[i] : cs->x[i];
            const Value *cv = &v[2 * i + k], *first = &v[k];
            if (!need_number(c, e, cv, "a curve's cell")) {
                ok = false;
                break;
            }
            if (!dim_eq(cv->q.dim, first->q.dim) || (cv->q.temp == TEMP_NONE) != (first->q.temp == TEMP_NONE)) {
                char d1[128], d2[128];
                describe_operand(c, k ? cs->y[0] : cs->x[0], first, d1, sizeof d1);
                describe_operand(c, e, cv, d2, sizeof d2);
                diag_error(c->diags, e->pos, "column '%s' mixes dimensions: the first row is %s, this cell is %s", head[k],
                           d1, d2);
                ok = false;
                break;
            }
            (k ? y : x)[i] = cv->q.si;
        }
    }
    if (!ok) {
        res->state = RES_FAILED;
        return;
    }
    cd->name = s->name;
    cd->curve = (Curve){x, y, n, cs->loglog ? CURVE_LOGLOG : CURVE_LINEAR};
    cd->x_dim = v[0].q.dim;
    cd->x_temp = v[0].q.temp;
    cd->y_dim = v[1].q.dim;
    cd->y_temp = v[1].q.temp;
    size_t bad = 0;
    char b1[112], b2[112];
    switch (curve_check(&cd->curve, &bad)) {
    case CURVE_OK:
        break;
    case CURVE_NOT_INCREASING: {
        Unit u = eval_display_unit(c->ev, &v[0], written_unit(c->ev, cs->x[0]));
        bool diff = v[0].q.temp == TEMP_NONE, unitless = !u.text[0] || strcmp(u.text, "1") == 0;
        char n1[48], n2[48];
        num_sig(unit_from_si(v[2 * bad].q.si, &u, diff), 4, n1, sizeof n1);
        num_sig(unit_from_si(v[2 * (bad - 1)].q.si, &u, diff), 4, n2, sizeof n2);
        snprintf(b1, sizeof b1, "%s%s%s", n1, unitless ? "" : " ", unitless ? "" : u.text);
        snprintf(b2, sizeof b2, "%s%s%s", n2, unitless ? "" : " ", unitless ? "" : u.text);
        diag_error(c->diags, cs->x[bad]->pos,
                   "the argument column '%s' must increase strictly: %s here is not above %s in the row before",
                   cs->x_head, b1, b2);
        res->state = RES_FAILED;
        return;
    }
    case CURVE_NOT_POSITIVE: {
        bool xs = !(x[bad] > 0);
        diag_error(c->diags, xs ? cs->x[bad]->pos : cs->y[bad]->pos,
                   "interpolate: loglog needs values above zero in both columns; this '%s' cell is not",
                   xs ? cs->x_head : cs->y_head);
        res->state = RES_FAILED;
        return;
    }
    case CURVE_NOT_FINITE:
    case CURVE_TOO_FEW:
        diag_error(c->diags, cs->x[bad]->pos, "this point of curve '%s' is not a finite number", s->name);
        res->state = RES_FAILED;
        return;
    }
    /* the table for the report, in the units the first row was written in */
    ResultTable *t = arena_alloc(a, sizeof *t);
    t->title = arena_printf(a, "Curve %s, %s interpolation", s->name, cs->loglog ? "log-log" : "linear");
    t->ncols = 2;
    t->nrows = n;
    t->heads = arena_alloc(a, 2 * sizeof *t->heads);
    t->heads[0] = cs->x_head;
    t->heads[1] = cs->y_head;
    t->units = arena_alloc(a, 2 * sizeof *t->units);
    for (size_t k = 0; k < 2; k++)
        t->units[k] = eval_display_unit(c->ev, &v[k], written_unit(c->ev, k ? cs->y[0] : cs->x[0]));
    t->cells = v;
    res->table = t;
    res->value = (Value){.kind = VAL_RECORD, .rec = curve_record_new(a, cd)};
    call_use_method(c->call, curve_method(cd->curve.interp));
    res->state = RES_OK;
}

/* A network: evaluate every cell, then solve it (network.c). */
static void eval_network(Evaluated *ev, const Stmt *s, StmtResult *res, Ctx *c)
{
    const NetworkSpec *ns = s->network;
    Arena *a = &ev->doc->arena;
    Value fluid, tol = {0};
    bool ok = eval_expr(c, ns->fluid, &fluid);
    if (ns->tolerance)
        ok = eval_expr(c, ns->tolerance, &tol) && ok;
    NetNodeInput *ni = arena_alloc(a, (ns->nnodes + 1) * sizeof *ni);
    NetLinkInput *li = arena_alloc(a, (ns->nlinks + 1) * sizeof *li);
    for (size_t i = 0; i < ns->nnodes; i++) {
        const NetNode *nd = &ns->nodes[i];
        Expr *cells[] = {nd->elevation, nd->demand, nd->head, nd->pressure, nd->x, nd->y};
        Value *vals[] = {&ni[i].elevation, &ni[i].demand, &ni[i].head, &ni[i].pressure, &ni[i].x, &ni[i].y};
        for (size_t k = 0; k < sizeof cells / sizeof cells[0]; k++)
            if (cells[k])
                ok = eval_expr(c, cells[k], vals[k]) && ok;
    }
    for (size_t l = 0; l < ns->nlinks; l++) {
        const NetLink *lk = &ns->links[l];
        Expr *cells[] = {lk->pipe, lk->length, lk->K, lk->C, lk->device};
        Value *vals[] = {&li[l].pipe, &li[l].length, &li[l].K, &li[l].C, &li[l].device};
        for (size_t k = 0; k < sizeof cells / sizeof cells[0]; k++)
            if (cells[k])
                ok = eval_expr(c, cells[k], vals[k]) && ok;
    }
    if (!ok) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    const NetworkResult *nr = NULL;
    if (!network_solve(c->call, s, &fluid, &tol, ni, li, &res->value, &nr)) {
        res->state = RES_FAILED;
        return;
    }
    res->network = nr;
    res->state = RES_OK;
}

static void eval_figure(const Stmt *s, StmtResult *res, Ctx *c)
{
    Value *args = arena_alloc(&c->doc->arena, (s->nargs + 1) * sizeof *args);
    bool ok = true;
    for (size_t i = 0; i < s->nargs; i++)
        ok = eval_expr(c, s->args[i], &args[i]) && ok;
    if (!ok) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    FigureData *fd = NULL;
    if (!flow_figure(c->call, s, args, &fd)) {
        res->state = RES_FAILED;
        return;
    }
    res->figure = fd;
    res->state = RES_OK;
}

static void eval_statement(Evaluated *ev, size_t i, DiagList *diags)
{
    const Stmt *s = ev->doc->stmts[i];
    StmtResult *res = &ev->results[i];
    /* a re-evaluation (solve trials, case rows) keeps the warnings of the
     * evaluation the report shows */
    const char *const *warnings = res->warnings;
    size_t nwarnings = res->nwarnings;
    memset(res, 0, sizeof *res);
    res->warnings = warnings;
    res->nwarnings = nwarnings;
    if (s->parse_failed || s->kind == STMT_NOTE)
        return;
    for (size_t k = 0; k < s->ndeps; k++)
        if (ev->results[s->deps[k]].state != RES_OK)
            return; /* not evaluated: an input failed */
    CallCtx cc = {&ev->doc->arena, diags, ev->units, {0}, 0, ev->doc->meta.code, NULL, ev->atmosphere, false};
    Ctx c = {ev, ev->doc, diags, &cc, 0};
    switch (s->kind) {
    case STMT_DEF: {
        Value v;
        if (!eval_expr(&c, s->expr, &v)) {
            res->state = c.upstream ? RES_NOT_EVALUATED : RES_FAILED;
            break;
        }
        if (!as_fits(&c, s, &v)) {
            res->state = RES_FAILED;
            break;
        }
        if (s->has_as)
            v = as_restate(ev, v, &s->as_unit);
        res->value = v;
        if (v.kind == VAL_NUMBER) {
            /* A plain reference to another name keeps that name's unit. */
            const Expr *e = s->expr;
            while (e->kind == EXPR_PAREN)
                e = e->lhs;
            if (!s->has_as && e->kind == EXPR_NAME && e->slot >= 0)
                res->shown = ev->results[e->slot].shown;
            else
                res->shown = eval_display_unit(ev, &v, s->has_as ? &s->as_unit : NULL);
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
    memcpy(res->methods, cc.methods, sizeof res->methods);
    res->nmethods = cc.nmethods;
    if (!res->table)
        res->table = res->state == RES_OK ? cc.table : NULL;
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
    /* dirty marks live for this call only */
    unsigned char stack_marks[256];
    unsigned char *dirty = n <= sizeof stack_marks ? stack_marks : xcalloc(n, 1);
    memset(dirty, 0, n <= sizeof stack_marks ? n : 0);
    for (size_t k = 0; k < nchanged; k++)
        if (changed[k] >= 0 && (size_t)changed[k] < n)
            dirty[changed[k]] = 1;
    for (size_t i = (size_t)first + 1; i < upto; i++) {
        const Stmt *s = ev->doc->stmts[i];
        bool hit = false;
        for (size_t k = 0; k < s->ndeps && !hit; k++)
            hit = dirty[s->deps[k]] != 0;
        if (s->kind == STMT_SOLVE && s->var_slot >= 0 && dirty[s->var_slot])
            hit = true;
        if (!hit)
            continue;
        eval_statement(ev, i, diags);
        dirty[i] = 1;
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

/* ---- parametric cases ---------------------------------------------------- */

/* Evaluate one table: per row, give the inputs the row's values, re-evaluate
 * what depends on them (eval_recompute, as solve does), record the shown
 * values and every check, then put the inputs back. Diagnostics inside a
 * case are muted: a failure shows as "not evaluated" in that row. */
static void eval_cases(Evaluated *ev, const CaseTable *ct, CaseResult *cr, DiagList *diags)
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
    CallCtx cc = {a, diags, ev->units, {0}, 0, ev->doc->meta.code, NULL, ev->atmosphere, false};
    Ctx c = {ev, doc, diags, &cc, 0};
    /* The shown expressions are checked once, with the calc's own values and
     * errors reported, so a bad field or dimension is an error, not a
     * silent "not evaluated" in every row. */
    bool shown_ok = true;
    for (size_t k = 0; k < ct->nshow; k++) {
        Value v;
        c.upstream = 0;
        if (ct->show_exprs[k] && !eval_expr(&c, ct->show_exprs[k], &v) && !c.upstream)
            shown_ok = false;
    }
    if (!shown_ok)
        return;
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
                describe_operand(&c, e, &v, dv, sizeof dv);
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
            return; /* errors reported; the table is not evaluated */
        }
        diags->muted++;
        eval_recompute(ev, slots, ni, doc->nstmts, diags);
        row->shown = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown);
        row->shown_unit = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown_unit);
        row->shown_ok = arena_alloc(a, (ct->nshow + 1) * sizeof *row->shown_ok);
        for (size_t k = 0; k < ct->nshow; k++) {
            const Expr *e = ct->show_exprs[k];
            Value v;
            c.upstream = 0;
            if (e && eval_expr(&c, e, &v)) {
                row->shown[k] = v;
                /* a plain name keeps its display unit */
                if (e->kind == EXPR_NAME && e->slot >= 0)
                    row->shown_unit[k] = ev->results[e->slot].shown;
                else if (v.kind == VAL_NUMBER)
                    row->shown_unit[k] = eval_display_unit(ev, &v, NULL);
                row->shown_ok[k] = true;
            }
        }
        row->holds = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->holds);
        row->utilization = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->utilization);
        row->check_ok = arena_alloc(a, (cr->nchecks + 1) * sizeof *row->check_ok);
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
        for (size_t k = 0; k < ni; k++)
            ev->results[slots[k]].value = base[k];
        eval_recompute(ev, slots, ni, doc->nstmts, diags);
        diags->muted--;
    }
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
    ev->results[i].nwarnings = n;
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
    check_block_inlines(ev, doc->blocks, diags);
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
