/* library.c — the calc functions' table (library.h), argument and keyword
 * checking, and the math functions of DESIGN 2.3.
 *
 * The table is generated from builtins.def so a function is listed in one
 * place. Math functions check dimensions the way the language does: exp, ln,
 * log10 take pure numbers; sin, cos, tan take angles (rad and deg are
 * dimensionless in SI, so any pure number is accepted as radians); sqrt
 * halves the exponents; min and max want one dimension throughout. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <stdarg.h>
#include <string.h>

#include "builtin_fns.h"

static const Builtin builtins[] = {
#define BUILTIN(name, fn, mn, mx, kw, summary) {#name, fn, mn, mx, kw, summary},
#include "builtins.def"
#undef BUILTIN
};

enum { NBUILTINS = sizeof builtins / sizeof builtins[0] };

const Builtin *builtin_lookup(const char *name)
{
    for (size_t i = 0; i < NBUILTINS; i++)
        if (strcmp(builtins[i].name, name) == 0)
            return &builtins[i];
    return NULL;
}

void builtin_each(void (*fn)(const Builtin *b, void *ctx), void *ctx)
{
    for (size_t i = 0; i < NBUILTINS; i++)
        fn(&builtins[i], ctx);
}

static bool same_text(const char *a, const char *b)
{
    return a == b || (a && b && strcmp(a, b) == 0);
}

bool method_same(const Method *a, const Method *b)
{
    return a == b || (a && b && same_text(a->key, b->key) && same_text(a->title, b->title) &&
                      same_text(a->reference, b->reference));
}

void call_ctx_init(CallCtx *cx, Arena *arena, DiagList *diags, UnitSystem units, const char *code, double atmosphere)
{
    cx->arena = arena;
    cx->diags = diags;
    cx->units = units;
    cx->nmethods = 0;
    cx->code = code;
    cx->table = NULL;
    cx->atmosphere = atmosphere;
    cx->atmosphere_used = false;
    cx->nuses = 0;
}

void call_use_method(CallCtx *cx, const Method *m)
{
    for (size_t i = 0; i < cx->nmethods; i++)
        if (method_same(cx->methods[i], m))
            return;
    if (cx->nmethods < CALL_MAX_METHODS)
        cx->methods[cx->nmethods++] = m;
}

MethodUse *call_begin_use(CallCtx *cx, const Method *m)
{
    call_use_method(cx, m);
    if (cx->nuses >= CALL_MAX_USES)
        return NULL;
    MethodUse *u = &cx->uses[cx->nuses++];
    memset(u, 0, sizeof *u);
    u->method = m;
    return u;
}

void use_input_value(MethodUse *u, const char *name, Value v)
{
    if (!u || u->ninputs >= METHOD_MAX_INPUTS)
        return;
    u->inputs[u->ninputs].name = name;
    u->inputs[u->ninputs].value = v;
    u->ninputs++;
}

void use_input(MethodUse *u, const char *name, double si, Dim dim)
{
    use_input_value(u, name, value_number(qty(si, dim)));
}

void use_result(MethodUse *u, double si, Dim dim)
{
    if (u)
        u->result = value_number(qty(si, dim));
}

void use_branch(CallCtx *cx, MethodUse *u, const char *fmt, ...)
{
    if (!u)
        return;
    va_list ap;
    va_start(ap, fmt);
    u->branch = arena_vprintf(cx->arena, fmt, ap);
    va_end(ap);
}

double call_atmosphere(CallCtx *cx)
{
    cx->atmosphere_used = true;
    return cx->atmosphere > 0 ? cx->atmosphere : UNIT_STANDARD_ATMOSPHERE;
}

void dim_describe(Dim d, TempKind temp, UnitSystem sys, char *buf, size_t n)
{
    const char *word = dim_name(d);
    Unit u = unit_default(d, temp, sys);
    if (dim_is_none(d))
        snprintf(buf, n, "a pure number");
    else if (word)
        snprintf(buf, n, "%s (%s)", word, u.text);
    else
        snprintf(buf, n, "%s", u.text);
}

void value_describe(const Value *v, UnitSystem sys, char *buf, size_t n)
{
    switch (v->kind) {
    case VAL_NUMBER:
        if (v->q.pref != PRES_PLAIN) {
            Unit u = unit_default_ref(v->q.dim, v->q.temp, v->q.pref, sys);
            snprintf(buf, n, "%s pressure (%s)", v->q.pref == PRES_GAUGE ? "a gauge" : "an absolute", u.text);
            break;
        }
        dim_describe(v->q.dim, v->q.temp, sys, buf, n);
        break;
    case VAL_STRING:
        snprintf(buf, n, "a string");
        break;
    case VAL_RECORD:
        snprintf(buf, n, "a %s record", v->rec && v->rec->type ? v->rec->type : "");
        break;
    default:
        snprintf(buf, n, "nothing");
        break;
    }
}

Pos arg_at(const CallArgs *a, size_t i)
{
    return i < a->n && a->arg_pos ? a->arg_pos[i] : a->pos;
}

bool arg_number(CallCtx *cx, const CallArgs *a, size_t i, Dim want, const char *what, double *si)
{
    if (i >= a->n) {
        diag_error(cx->diags, a->pos, "%s: missing argument %zu (%s)", a->name, i + 1, what);
        return false;
    }
    const Value *v = &a->args[i];
    if (v->kind != VAL_NUMBER || !dim_eq(v->q.dim, want)) {
        char want_s[96], got_s[96];
        /* A wanted temperature is a point on a scale ("68 degF"). */
        dim_describe(want, dim_eq(want, DIM_THETA) ? TEMP_ABSOLUTE_OFFSET : TEMP_NONE, cx->units, want_s,
                     sizeof want_s);
        value_describe(v, cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, arg_at(a, i), "%s: argument %zu (%s) must be %s, found %s",
                   a->name, i + 1, what, want_s, got_s);
        return false;
    }
    /* A gauge pressure is what a plain pressure argument means; an absolute
     * one would be off by the atmosphere. */
    if (v->q.pref == PRES_ABSOLUTE) {
        diag_error(cx->diags, arg_at(a, i),
                   "%s: argument %zu (%s) is a pressure above the atmosphere, found an absolute "
                   "pressure; write it `as %s` first", a->name, i + 1, what,
                   cx->units == UNITS_US ? "psig" : "kPag");
        return false;
    }
    *si = v->q.si;
    return true;
}

bool arg_dimensionless(CallCtx *cx, const CallArgs *a, size_t i, const char *what, double *x)
{
    return arg_number(cx, a, i, DIM_NONE, what, x);
}

bool arg_string(CallCtx *cx, const CallArgs *a, size_t i, const char *what, const char **s)
{
    if (i >= a->n) {
        diag_error(cx->diags, a->pos, "%s: missing argument %zu (%s)", a->name, i + 1, what);
        return false;
    }
    const Value *v = &a->args[i];
    if (v->kind != VAL_STRING) {
        char got_s[96];
        value_describe(v, cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, arg_at(a, i), "%s: argument %zu (%s) must be a string in \"...\", found %s",
                   a->name, i + 1, what, got_s);
        return false;
    }
    *s = v->str;
    return true;
}

bool arg_record(CallCtx *cx, const CallArgs *a, size_t i, const char *type, const char *what,
                const Record **r)
{
    if (i >= a->n) {
        diag_error(cx->diags, a->pos, "%s: missing argument %zu (%s)", a->name, i + 1, what);
        return false;
    }
    const Value *v = &a->args[i];
    if (v->kind != VAL_RECORD || (type && strcmp(v->rec->type, type) != 0)) {
        char got_s[96];
        value_describe(v, cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, arg_at(a, i), "%s: argument %zu (%s) must be a %s record, found %s",
                   a->name, i + 1, what, type ? type : "", got_s);
        return false;
    }
    *r = v->rec;
    return true;
}

const Value *kw_get(const CallArgs *a, const char *name, Pos *pos)
{
    for (size_t i = 0; i < a->nkw; i++)
        if (strcmp(a->kw_names[i], name) == 0) {
            if (pos)
                *pos = a->kw_pos ? a->kw_pos[i] : a->pos;
            return &a->kw[i];
        }
    return NULL;
}

bool builtin_keywords_ok(CallCtx *cx, const Builtin *b, const CallArgs *a)
{
    const char *list = b ? b->keywords : "";
    const char *name = b ? b->name : a->name;
    for (size_t i = 0; i < a->nkw; i++) {
        const char *k = a->kw_names[i];
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
            Pos at = a->kw_pos ? a->kw_pos[i] : a->pos;
            if (*list)
                diag_error(cx->diags, at, "%s: unknown keyword '%s' (it takes: %s)", name, k, list);
            else
                diag_error(cx->diags, at, "%s takes no keyword arguments, found '%s'", name, k);
            return false;
        }
    }
    return true;
}

bool kw_check(CallCtx *cx, const CallArgs *a)
{
    return builtin_keywords_ok(cx, builtin_lookup(a->name), a);
}

bool builtin_call(CallCtx *cx, BuiltinFn fn, const char *name, Pos at, const Value *args, const Pos *pos,
                  size_t n, const char *kw_name, const Value *kw, Value *out)
{
    const char *names[1] = {kw_name};
    Pos kwp[1] = {at};
    CallArgs ca = {n, args, pos, kw ? 1u : 0u, names, kw, kwp, at, name};
    return fn(cx, &ca, out) && out->kind == VAL_NUMBER;
}

/* ---- math ------------------------------------------------------------- */

static bool finite_result(CallCtx *cx, const CallArgs *a, double y, Value *out, Dim d)
{
    if (!isfinite(y)) {
        diag_error(cx->diags, a->pos, "%s: the result is not a finite number", a->name);
        return false;
    }
    *out = value_number(qty(y, d));
    return true;
}

static bool any_number(CallCtx *cx, const CallArgs *a, size_t i, const Value **v)
{
    if (i >= a->n || a->args[i].kind != VAL_NUMBER) {
        char got_s[96] = "nothing";
        if (i < a->n)
            value_describe(&a->args[i], cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, arg_at(a, i), "%s: argument %zu must be a number, found %s", a->name,
                   i + 1, got_s);
        return false;
    }
    *v = &a->args[i];
    return true;
}

static bool not_offset_temperature(CallCtx *cx, const CallArgs *a, size_t i, const Value *v)
{
    if (v->q.pref != PRES_PLAIN) {
        diag_error(cx->diags, arg_at(a, i),
                   "%s: cannot apply to %s pressure (a point on a scale); subtract a point of the "
                   "same reference first, as in (p - 0 %s)", a->name,
                   v->q.pref == PRES_GAUGE ? "a gauge" : "an absolute",
                   v->q.pref == PRES_GAUGE ? (cx->units == UNITS_US ? "psig" : "kPag")
                                           : (cx->units == UNITS_US ? "psia" : "kPaa"));
        return false;
    }
    if (v->q.temp == TEMP_ABSOLUTE_OFFSET) {
        diag_error(cx->diags, arg_at(a, i),
                   "%s: cannot apply to an absolute temperature on the Celsius or Fahrenheit "
                   "scale; subtract a reference temperature first, or use K",
                   a->name);
        return false;
    }
    return true;
}

bool fn_sqrt(CallCtx *cx, const CallArgs *a, Value *out)
{
    const Value *v;
    if (!any_number(cx, a, 0, &v) || !not_offset_temperature(cx, a, 0, v))
        return false;
    if (v->q.si < 0) {
        diag_error(cx->diags, arg_at(a, 0), "sqrt: argument is negative (%g)", v->q.si);
        return false;
    }
    return finite_result(cx, a, sqrt(v->q.si), out, dim_pow(v->q.dim, 0.5));
}

bool fn_abs(CallCtx *cx, const CallArgs *a, Value *out)
{
    const Value *v;
    if (!any_number(cx, a, 0, &v))
        return false;
    *out = *v;
    if (v->q.temp == TEMP_NONE && v->q.pref == PRES_PLAIN)
        out->q.si = fabs(v->q.si);
    return true;
}

typedef double (*Unary)(double);

static bool pure_unary(CallCtx *cx, const CallArgs *a, Value *out, Unary f, bool positive)
{
    double x;
    if (!arg_dimensionless(cx, a, 0, "a pure number", &x))
        return false;
    if (positive && x <= 0) {
        diag_error(cx->diags, arg_at(a, 0), "%s: argument must be positive, found %g", a->name, x);
        return false;
    }
    return finite_result(cx, a, f(x), out, DIM_NONE);
}

bool fn_exp(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, exp, false); }
bool fn_ln(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, log, true); }
bool fn_log10(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, log10, true); }
bool fn_sin(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, sin, false); }
bool fn_cos(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, cos, false); }
bool fn_tan(CallCtx *cx, const CallArgs *a, Value *out) { return pure_unary(cx, a, out, tan, false); }

bool fn_atan(CallCtx *cx, const CallArgs *a, Value *out)
{
    if (!pure_unary(cx, a, out, atan, false))
        return false;
    out->hint[UNITS_US] = out->hint[UNITS_SI] = "rad";
    return true;
}

static bool extremum(CallCtx *cx, const CallArgs *a, Value *out, int sign)
{
    const Value *best;
    if (!any_number(cx, a, 0, &best))
        return false;
    for (size_t i = 1; i < a->n; i++) {
        const Value *v;
        if (!any_number(cx, a, i, &v))
            return false;
        if (!dim_eq(v->q.dim, best->q.dim) || (v->q.temp == TEMP_NONE) != (best->q.temp == TEMP_NONE) ||
            (v->q.pref == PRES_ABSOLUTE) != (best->q.pref == PRES_ABSOLUTE)) {
            char d0[96], di[96];
            value_describe(&a->args[0], cx->units, d0, sizeof d0);
            value_describe(v, cx->units, di, sizeof di);
            diag_error(cx->diags, arg_at(a, i),
                       "%s: arguments must have one dimension; argument 1 is %s, argument %zu is %s",
                       a->name, d0, i + 1, di);
            return false;
        }
        if ((sign > 0 && v->q.si > best->q.si) || (sign < 0 && v->q.si < best->q.si))
            best = v;
    }
    *out = *best;
    return true;
}

/* Arguments alike enough to average: one dimension, and each a point or
 * each a difference, on one pressure reference (a plain pressure goes with
 * a gauge one, as in a check). */
static bool alike(CallCtx *cx, const CallArgs *a, size_t i, const Value *first, const Value **v)
{
    if (!any_number(cx, a, i, v))
        return false;
    const Value *w = *v;
    if (dim_eq(w->q.dim, first->q.dim) && (w->q.temp == TEMP_NONE) == (first->q.temp == TEMP_NONE) &&
        (w->q.pref == PRES_ABSOLUTE) == (first->q.pref == PRES_ABSOLUTE))
        return true;
    char d0[96], di[96];
    value_describe(first, cx->units, d0, sizeof d0);
    value_describe(w, cx->units, di, sizeof di);
    diag_error(cx->diags, arg_at(a, i), "%s: arguments must be of one kind; argument 1 is %s, argument %zu is %s",
               a->name, d0, i + 1, di);
    return false;
}

/* The arithmetic mean. Of points (68 degF and 50 degF, 30 psia and 20 psia)
 * it is the point midway, computed on the absolute scale, so it is a point
 * of the same kind: no scaled point is ever formed. */
bool fn_mean(CallCtx *cx, const CallArgs *a, Value *out)
{
    const Value *first, *v;
    if (!any_number(cx, a, 0, &first))
        return false;
    double sum = first->q.si;
    PressureRef ref = first->q.pref;
    for (size_t i = 1; i < a->n; i++) {
        if (!alike(cx, a, i, first, &v))
            return false;
        sum += v->q.si;
        if (v->q.pref == PRES_GAUGE)
            ref = PRES_GAUGE;
    }
    if (!finite_result(cx, a, sum / (double)a->n, out, first->q.dim))
        return false;
    out->q.temp = first->q.temp;
    out->q.pref = ref;
    return true;
}

/* lerp(a, b, t) = a + (b - a)*t: the value a fraction t of the way from a to
 * b (t = 0 gives a, t = 1 gives b); a weighted mean of two points that is
 * again a point. t outside 0..1 extrapolates, with a warning. */
bool fn_lerp(CallCtx *cx, const CallArgs *a, Value *out)
{
    const Value *va, *vb;
    double t;
    if (!any_number(cx, a, 0, &va) || !alike(cx, a, 1, va, &vb) ||
        !arg_dimensionless(cx, a, 2, "the fraction of the way from a to b", &t))
        return false;
    if (t < 0 || t > 1)
        diag_warning(cx->diags, arg_at(a, 2), "lerp: t = %g lies outside 0 to 1: this extrapolates beyond a and b", t);
    if (!finite_result(cx, a, va->q.si + (vb->q.si - va->q.si) * t, out, va->q.dim))
        return false;
    out->q.temp = va->q.temp;
    out->q.pref = va->q.pref == PRES_GAUGE || vb->q.pref == PRES_GAUGE ? PRES_GAUGE : va->q.pref;
    return true;
}

bool fn_max(CallCtx *cx, const CallArgs *a, Value *out) { return extremum(cx, a, out, +1); }
bool fn_min(CallCtx *cx, const CallArgs *a, Value *out) { return extremum(cx, a, out, -1); }
