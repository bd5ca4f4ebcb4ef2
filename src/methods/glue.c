/* glue.c — the shared pieces of the methods' calc functions (glue.h). */
#include "methods/glue.h"

#include <stdio.h>

#include "numfmt.h"

/* A quantity as messages show it: 4 significant figures in the document's
 * unit system ("101.3 kPa", "68.00 degF"). */
const char *glue_show(CallCtx *cx, double si, Dim d, TempKind temp, char *buf, size_t n)
{
    Unit u = unit_default(d, temp, cx->units);
    double x = unit_from_si(si, &u, false);
    char num[48];
    num_sig(x, 4, num, sizeof num);
    snprintf(buf, n, "%s %s", num, u.text);
    return buf;
}

const char *glue_show_temp(CallCtx *cx, double K, char *buf, size_t n)
{
    return glue_show(cx, K, DIM_THETA, TEMP_ABSOLUTE_OFFSET, buf, n);
}

const char *glue_show_num(double x, char *buf, size_t n)
{
    num_sig(x, 4, buf, n);
    return buf;
}

/* An absolute temperature argument (a difference is refused). */
bool glue_arg_temperature(CallCtx *cx, const CallArgs *a, size_t i, double *T)
{
    if (!arg_number(cx, a, i, DIM_THETA, "temperature", T))
        return false;
    if (a->args[i].q.temp == TEMP_NONE) {
        diag_error(cx->diags, arg_at(a, i),
                   "%s: argument %zu must be a temperature such as 68 degF or 20 degC, "
                   "found a temperature difference",
                   a->name, i + 1);
        return false;
    }
    return true;
}

/* A number field of a record with the expected dimension; reports at the
 * argument that passed the record. */
bool glue_field_number(CallCtx *cx, const CallArgs *a, size_t i, const Record *r,
                         const char *field, Dim want, double *si)
{
    const Value *v = record_get(r, field);
    if (!v || v->kind != VAL_NUMBER || !dim_eq(v->q.dim, want)) {
        char want_s[96];
        dim_describe(want, TEMP_NONE, cx->units, want_s, sizeof want_s);
        diag_error(cx->diags, arg_at(a, i), "%s: the %s record has no field '%s' (%s)",
                   a->name, r->type ? r->type : "", field, want_s);
        return false;
    }
    *si = v->q.si;
    return true;
}

const char *glue_field_string(const Record *r, const char *field)
{
    const Value *v = record_get(r, field);
    return v && v->kind == VAL_STRING ? v->str : NULL;
}

/* An optional keyword number of a given dimension; *si keeps its default
 * when the keyword is absent. */
bool glue_kw_number(CallCtx *cx, const CallArgs *a, const char *name, Dim want, double *si,
                      bool *given, Pos *where)
{
    Pos p = a->pos;
    const Value *v = kw_get(a, name, &p);
    if (given)
        *given = v != NULL;
    if (where)
        *where = p;
    if (!v)
        return true;
    if (v->kind != VAL_NUMBER || !dim_eq(v->q.dim, want)) {
        char want_s[96], got_s[96];
        dim_describe(want, TEMP_NONE, cx->units, want_s, sizeof want_s);
        value_describe(v, cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, p, "%s: %s= must be %s, found %s", a->name, name, want_s, got_s);
        return false;
    }
    *si = v->q.si;
    return true;
}

Value glue_pressure_value(double p)
{
    return value_hinted(qty(p, DIM_PRESSURE), "psi", "kPa");
}
