/* selection_lib.c — select_pipe: the smallest standard size that meets a
 * velocity limit and a friction-gradient limit at a flow.
 *
 * Every size a standard lists in the class is tried from the smallest up:
 * its bore from the published table (pipes.h, as pipe() reads it), the
 * velocity V = Q/A, and the friction gradient S = h_f/L = f/D*V^2/(2*g) by
 * Darcy-Weisbach with the Colebrook-White friction factor (64/Re below Re
 * 2000), in the fluid given by fluid= or, without it, water at 60 degF
 * (15.56 degC) and one atmosphere from IAPWS-IF97 and IAPWS 2008. The first
 * size within every limit given is returned as a pipe record (with its V and
 * S), and the sizes tried, each with its V, S and verdict ("too fast", "too
 * steep", both, or "selected"), go to the report as a table. A limit is met
 * when the value is at most the limit. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "builtin_fns.h"
#include "methods/friction.h"
#include "methods/pipes.h"
#include "methods/water.h"
#include "numfmt.h"

static const Method METHOD_SELECT = {
    "select_pipe",
    "Pipe size selection: the smallest listed size within the velocity and friction-gradient limits",
    "S = f/D*V^2/(2*g)",
    "sizes as listed by the dimension standard in the class; friction by Darcy-Weisbach with the "
    "Colebrook-White factor (laminar 64/Re below Re 2000)",
    "Darcy-Weisbach head loss per length with the Colebrook-White friction factor (Colebrook 1939); "
    "velocity V = Q/A from the standard's bore; the limits are the calc's design criteria.",
};

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static const char *show(UnitSystem sys, double si, Dim d, char *buf, size_t n)
{
    Unit u = unit_default(d, TEMP_NONE, sys);
    char num[48];
    num_sig(unit_from_si(si, &u, true), 4, num, sizeof num);
    if (u.text[0] && strcmp(u.text, "1") != 0)
        snprintf(buf, n, "%s %s", num, u.text);
    else
        snprintf(buf, n, "%s", num);
    return buf;
}

/* The sizes a standard lists, ascending, each once. */
static size_t standard_sizes(const PipeStandard *s, double *out, size_t cap)
{
    size_t n = 0;
    for (size_t i = 0; i < pipe_row_count() && n < cap; i++) {
        const PipeRow *r = pipe_row(i);
        double x;
        if (r->standard != s->id || !pipe_size_parse(r->nps, &x))
            continue;
        bool seen = false;
        for (size_t k = 0; k < n && !seen; k++)
            seen = fabs(out[k] - x) < 1e-6;
        if (!seen)
            out[n++] = x;
    }
    qsort(out, n, sizeof *out, cmp_double);
    return n;
}

/* sizes="3/4, 1, 1-1/4": the listed sizes to consider. */
static bool sizes_given(CallCtx *cx, const Value *v, Pos at, const PipeStandard *s, const double *all, size_t nall,
                        bool *keep)
{
    if (v->kind != VAL_STRING) {
        diag_error(cx->diags, at, "select_pipe: sizes= is a string of sizes, as in sizes=\"3/4, 1, 1-1/4\"");
        return false;
    }
    const char *p = v->str;
    bool any = false;
    while (*p) {
        while (*p == ' ' || *p == ',')
            p++;
        const char *e = p;
        while (*e && *e != ',')
            e++;
        size_t len = (size_t)(e - p);
        while (len && p[len - 1] == ' ')
            len--;
        if (len) {
            char item[32];
            double x;
            snprintf(item, sizeof item, "%.*s", (int)(len < 31 ? len : 31), p);
            bool found = false;
            if (pipe_size_parse(item, &x))
                for (size_t k = 0; k < nall; k++)
                    if (fabs(all[k] - x) < 1e-6) {
                        keep[k] = true;
                        found = any = true;
                    }
            if (!found) {
                char list[512];
                pipe_sizes_list(s, NULL, list, sizeof list);
                diag_error(cx->diags, at, "select_pipe: sizes= names \"%s\", which %s does not list; its sizes are %s",
                           item, s->name, list);
                return false;
            }
        }
        p = e;
    }
    if (!any) {
        diag_error(cx->diags, at, "select_pipe: sizes= names no size");
        return false;
    }
    return true;
}

bool fn_select_pipe(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *std_text, *cls_text;
    double Q;
    if (!arg_string(cx, a, 0, "STANDARD", &std_text) || !arg_string(cx, a, 1, "CLASS", &cls_text) ||
        !arg_number(cx, a, 2, DIM_FLOW, "flow", &Q))
        return false;
    char b1[96], b2[96];
    if (!(Q > 0) || !isfinite(Q)) {
        diag_error(cx->diags, arg_at(a, 2), "select_pipe: the flow must be above zero, found %s",
                   show(cx->units, Q, DIM_FLOW, b1, sizeof b1));
        return false;
    }
    const PipeStandard *s = pipe_standard_find(std_text);
    if (!s) {
        char list[256];
        pipe_standards_list(list, sizeof list);
        diag_error(cx->diags, arg_at(a, 0), "select_pipe: unknown standard \"%s\"; known standards: %s", std_text, list);
        return false;
    }

    /* the fluid: fluid= or water at 60 degF */
    double rho, mu;
    Pos fp;
    const Value *fv = kw_get(a, "fluid", &fp);
    const char *fluid_text = "water at 60 degF (15.56 degC), 101.325 kPa";
    if (fv) {
        const Value *r = fv->kind == VAL_RECORD && strcmp(fv->rec->type, "water") == 0 ? record_get(fv->rec, "rho") : NULL;
        const Value *m = r ? record_get(fv->rec, "mu") : NULL;
        if (!r || !m) {
            diag_error(cx->diags, fp, "select_pipe: fluid= must be a water record (water(T))");
            return false;
        }
        rho = r->q.si;
        mu = m->q.si;
        fluid_text = "the water given";
    } else {
        WaterProps w;
        if (water_props((60.0 - 32.0) * 5.0 / 9.0 + 273.15, WATER_P_DEFAULT, &w) != WATER_OK)
            return false;
        rho = w.rho;
        mu = w.mu;
    }

    /* the limits: V_max a velocity; S_max a head per length (pure) or a
     * pressure per length (read as head through rho*g) */
    Pos vp, sp, zp;
    const Value *vv = kw_get(a, "V_max", &vp), *sv = kw_get(a, "S_max", &sp), *zv = kw_get(a, "sizes", &zp);
    double V_max = INFINITY, S_max = INFINITY;
    Unit S_unit = unit_default(DIM_NONE, TEMP_NONE, cx->units);
    Dim grad_p = dim_div(DIM_PRESSURE, DIM_L);
    bool S_as_pressure = false;
    if (!vv && !sv) {
        diag_error(cx->diags, a->pos, "select_pipe needs a limit: V_max= (a velocity), S_max= (a friction gradient, "
                                      "head or pressure per length), or both");
        return false;
    }
    if (vv) {
        if (vv->kind != VAL_NUMBER || !dim_eq(vv->q.dim, DIM_VELOCITY) || !(vv->q.si > 0)) {
            char got[96];
            value_describe(vv, cx->units, got, sizeof got);
            diag_error(cx->diags, vp, "select_pipe: V_max= must be a velocity above zero, found %s", got);
            return false;
        }
        V_max = vv->q.si;
    }
    if (sv) {
        bool pure = sv->kind == VAL_NUMBER && dim_is_none(sv->q.dim);
        bool press = sv->kind == VAL_NUMBER && dim_eq(sv->q.dim, grad_p);
        if ((!pure && !press) || !(sv->q.si > 0)) {
            char got[96];
            value_describe(sv, cx->units, got, sizeof got);
            diag_error(cx->diags, sp,
                       "select_pipe: S_max= must be a friction gradient above zero, a head per length (4 ft/100ft, "
                       "0.04 m/m) or a pressure per length (psi/100ft, kPa/100m); found %s",
                       got);
            return false;
        }
        S_as_pressure = press;
        S_max = press ? sv->q.si / (rho * WATER_G) : sv->q.si;
        S_unit = unit_default(sv->q.dim, TEMP_NONE, cx->units);
    }

    double all[256];
    size_t nall = standard_sizes(s, all, sizeof all / sizeof all[0]);
    bool keep[256];
    for (size_t k = 0; k < nall; k++)
        keep[k] = zv == NULL;
    if (zv && !sizes_given(cx, zv, zp, s, all, nall, keep))
        return false;

    /* the candidates, smallest first, up to the first that passes */
    size_t cap = nall + 1, nrows = 0;
    Value *cells = arena_alloc(cx->arena, cap * 5 * sizeof *cells);
    int chosen = -1;
    bool in_class = false;
    PipeDims pick = {0};
    double V_pick = 0, S_pick = 0;
    for (size_t k = 0; k < nall && chosen < 0; k++) {
        if (!keep[k])
            continue;
        PipeDims d;
        PipeStatus st = pipe_lookup(s, all[k], cls_text, &d);
        if (st == PIPE_UNKNOWN_CLASS) {
            char list[256];
            pipe_classes_list(s, list, sizeof list);
            diag_error(cx->diags, arg_at(a, 1), "select_pipe: %s has no class \"%s\"; its classes are %s", s->name,
                       cls_text, list);
            return false;
        }
        if (st != PIPE_OK)
            continue; /* not made in this class */
        in_class = true;
        double V = Q / d.area, Re = rho * V * d.id / mu, f;
        if (Re < 2000)
            f = 64 / Re;
        else if (friction_colebrook(Re, d.roughness / d.id, &f) != FRICTION_OK)
            return false;
        double S = f / d.id * V * V / (2 * WATER_G);
        bool v_ok = V <= V_max, s_ok = S <= S_max;
        const char *verdict = v_ok && s_ok ? "selected"
                              : !v_ok && !s_ok ? "too fast and too steep"
                              : !v_ok          ? "too fast"
                                               : "too steep";
        Value *row = &cells[nrows * 5];
        row[0] = value_string(d.row->nps);
        row[1] = value_number(qty(d.id, DIM_L));
        row[2] = value_number(qty(V, DIM_VELOCITY));
        row[3] = value_number(qty(S_as_pressure ? S * rho * WATER_G : S, S_as_pressure ? grad_p : DIM_NONE));
        row[4] = value_string(verdict);
        nrows++;
        if (v_ok && s_ok) {
            chosen = (int)k;
            pick = d;
            V_pick = V;
            S_pick = S;
        }
    }
    if (!in_class) {
        char canon[32];
        pipe_class_normalize(s, cls_text, canon, sizeof canon);
        diag_error(cx->diags, arg_at(a, 1), "select_pipe: %s lists no size in class \"%s\"%s", s->name, canon,
                   zv ? " among sizes=" : "");
        return false;
    }
    if (chosen < 0) {
        const Value *last = &cells[(nrows - 1) * 5];
        diag_error(cx->diags, a->pos,
                   "select_pipe: no size of %s class \"%s\" meets the limits at %s; the largest tried, %s, has V = %s "
                   "and S = %.4g",
                   s->name, cls_text, show(cx->units, Q, DIM_FLOW, b1, sizeof b1), last[0].str,
                   show(cx->units, last[2].q.si, DIM_VELOCITY, b2, sizeof b2), last[3].q.si);
        return false;
    }

    /* the pipe record, as pipe() makes it, with V and S */
    Value args[3] = {value_string(s->name), value_string(pick.row->nps), value_string(cls_text)};
    Pos pos[3] = {arg_at(a, 0), arg_at(a, 0), arg_at(a, 1)};
    CallArgs pa = {3, args, pos, 0, NULL, NULL, NULL, a->pos, "select_pipe"};
    Value pv;
    if (!fn_pipe(cx, &pa, &pv))
        return false;
    /* the friction factor of the size chosen, through friction_factor, so
     * its method and any validity warning stand beside the line */
    Value fa[2] = {value_number(qty_number(rho * V_pick * pick.id / mu)), value_number(qty_number(pick.roughness / pick.id))};
    CallArgs ca = {2, fa, pos, 0, NULL, NULL, NULL, a->pos, "select_pipe"};
    Value fout;
    if (!fn_friction_factor(cx, &ca, &fout))
        return false;
    Record *r = record_new(cx->arena, "pipe", pv.rec->nfields + 2);
    for (size_t i = 0; i < pv.rec->nfields; i++)
        record_set(r, i, pv.rec->fields[i].name, pv.rec->fields[i].value);
    record_set(r, pv.rec->nfields, "V", value_number(qty(V_pick, DIM_VELOCITY)));
    record_set(r, pv.rec->nfields + 1, "S", value_number(qty(S_pick, DIM_NONE)));
    call_use_method(cx, &METHOD_SELECT);

    ResultTable *t = arena_alloc(cx->arena, sizeof *t);
    char lim[200] = "";
    size_t len = 0;
    if (vv)
        len += (size_t)snprintf(lim + len, sizeof lim - len, "velocity at most %s",
                                show(cx->units, V_max, DIM_VELOCITY, b1, sizeof b1));
    if (sv) {
        Unit u = S_unit;
        char num[48];
        num_sig(unit_from_si(sv->q.si, &u, true), 4, num, sizeof num);
        bool unitless = !u.text[0] || strcmp(u.text, "1") == 0;
        snprintf(lim + len, sizeof lim - len, "%sfriction gradient at most %s%s%s", vv ? ", " : "", num,
                 unitless ? "" : " ", unitless ? "" : u.text);
    }
    t->title = arena_printf(cx->arena, "Sizes tried, %s %s at %s (%s; friction for %s)", s->name,
                            pick.row->cls, show(cx->units, Q, DIM_FLOW, b2, sizeof b2), lim, fluid_text);
    t->ncols = 5;
    t->nrows = nrows;
    t->heads = arena_alloc(cx->arena, 5 * sizeof *t->heads);
    t->heads[0] = "size";
    t->heads[1] = "bore";
    t->heads[2] = "velocity";
    t->heads[3] = "friction gradient";
    t->heads[4] = "verdict";
    t->units = arena_alloc(cx->arena, 5 * sizeof *t->units);
    size_t bo, bl;
    unit_parse(cx->units == UNITS_US ? "in" : "mm", 2, &t->units[1], &bo, &bl);
    t->units[2] = unit_default(DIM_VELOCITY, TEMP_NONE, cx->units);
    t->units[3] = S_unit;
    t->cells = cells;
    cx->table = t;
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}
