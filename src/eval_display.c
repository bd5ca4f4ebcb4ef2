/* eval_display.c — the unit a value is shown in.
 *
 * The default unit of a dimension in the calc's unit system or a value's
 * own hint, `as UNIT` on a statement (and the reference a pressure is
 * restated to), and the inline {name}, {name.field} and {name as unit}
 * values of the prose, checked so the prose never shows a wrong number. */
#include "eval_internal.h"

#include <math.h>
#include <stdint.h>
#include <string.h>

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
        const Unit *u = unit_shared(hint, strlen(hint)); /* parsed once, not per value shown */
        if (u && dim_eq(u->dim, v->q.dim)) {
            bool difference = v->q.temp == TEMP_NONE || u->temp == TEMP_NONE;
            if (v->q.temp == TEMP_NONE && u->temp != TEMP_NONE)
                return display_default(v, ev->units);
            if (!isfinite(v->q.si) || isfinite(unit_from_si(v->q.si, u, difference)))
                return *u;
        }
    }
    return display_default(v, ev->units);
}

/* Most results are plain numbers with no hint, shown in their dimension's
 * default unit: each thread remembers, per dimension (its exact bits),
 * temperature kind and unit system, that unit interned, and uses it where
 * display_default would (the value fits it); anything else is worked out
 * in full. */
enum { SHOWN_CACHE = 32 };
static _Thread_local struct {
    const Unit *unit;        /* NULL: empty */
    Dim d;
    TempKind temp;
    UnitSystem sys;
} shown_cache[SHOWN_CACHE];

static size_t shown_slot(const Value *v, UnitSystem sys)
{
    return (size_t)(dim_key_hash(&v->q.dim, (int)v->q.temp, (int)sys) >> 40) % SHOWN_CACHE;
}

const Unit *eval_shown_unit(const Evaluated *ev, const Value *v)
{
    bool plain = v->q.pref == PRES_PLAIN && !v->hint[ev->units];
    if (plain) {
        size_t k = shown_slot(v, ev->units);
        const Unit *u = shown_cache[k].unit;
        if (u && shown_cache[k].temp == v->q.temp && shown_cache[k].sys == ev->units &&
            memcmp(&shown_cache[k].d, &v->q.dim, sizeof v->q.dim) == 0) {
            bool difference = v->q.temp == TEMP_NONE || u->temp == TEMP_NONE;
            if (!(ev->units != UNITS_SI && isfinite(v->q.si) && !isfinite(unit_from_si(v->q.si, u, difference))))
                return u; /* what display_default gives: the default, which the value fits */
        }
    }
    Unit u = eval_display_unit(ev, v, NULL);
    const Unit *in = unit_intern(&u);
    if (plain) {
        Unit d = unit_default(v->q.dim, v->q.temp, ev->units);
        if (unit_intern(&d) == in) { /* remember the default only, never the fallback */
            size_t k = shown_slot(v, ev->units);
            shown_cache[k].unit = in;
            shown_cache[k].d = v->q.dim;
            shown_cache[k].temp = v->q.temp;
            shown_cache[k].sys = ev->units;
        }
    }
    return in;
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
Value eval_as_restate(Evaluated *ev, Value v, const Unit *u)
{
    if (v.kind != VAL_NUMBER || !dim_eq(v.q.dim, DIM_PRESSURE) || v.q.pref == u->pref)
        return v;
    if ((v.q.pref == PRES_ABSOLUTE) != (u->pref == PRES_ABSOLUTE))
        ev->atmosphere_used = true;
    v.q = qty_to_ref(v.q, u->pref, ev->atmosphere);
    return v;
}

bool eval_as_fits(EvalCtx *c, const Stmt *s, const Value *v)
{
    if (!s->has_as)
        return true;
    return eval_unit_fits(c->diags, c->ev->units, s->as->pos, s->as->text, s->as->unit, v);
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

void eval_check_inlines(Evaluated *ev, const Block *b, DiagList *diags)
{
    for (; b; b = b->next) {
        check_inlines(ev, b->inlines, diags);
        eval_check_inlines(ev, b->children, diags);
    }
}
