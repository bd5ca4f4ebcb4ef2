/* flow.c — the hydraulics of a path and the data of figures.
 *
 * A path (DESIGN 2.2a) is computed segment by segment with the energy
 * equation between the inlet and outlet of each segment:
 *   p_out = p_in - rho*g*(h_f + h_m) - rho*g*rise
 * and, at each junction, a continuous energy grade line: where the bore or
 * the flow changes, the static pressure changes by the difference of the
 * velocity heads, p_in(i) = p_out(i-1) + rho*(V(i-1)^2 - V(i)^2)/2.
 * Energy is lost only to pipe friction (Darcy-Weisbach with the chosen
 * friction method, or Hazen-Williams), to the K of fittings, and across a
 * device at a segment's outlet (DESIGN 2.10: a PRV, a valve or meter by Cv
 * or Kv, a loss curve, or a pump that adds head), which changes the static
 * pressure there and steps the energy grade line by the same amount. Every
 * correlation is reached through the library functions of builtins.def, so
 * a path uses exactly the methods, warnings and references a calc line
 * would. */
#include "flow.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/devices_lib.h"
#include "methods/fittings.h"
#include "methods/friction.h"
#include "methods/pumps.h"

static const double G = CONST_STANDARD_GRAVITY;
static const double PI = CONST_PI;

static bool need(CallCtx *cx, const Value *v, Dim d, Pos at, const char *what)
{
    if (v->kind == VAL_NUMBER && dim_eq(v->q.dim, d) && v->q.temp == TEMP_NONE && v->q.pref != PRES_ABSOLUTE)
        return true;
    char want[96], got[96];
    dim_describe(d, TEMP_NONE, cx->units, want, sizeof want);
    value_describe(v, cx->units, got, sizeof got);
    if (v->kind == VAL_NUMBER && v->q.pref == PRES_ABSOLUTE)
        diag_error(cx->diags, at,
                   "%s must be %s above the atmosphere, found %s; write `as %s` on the line that "
                   "defines it", what, want, got, cx->units == UNITS_US ? "psig" : "kPag");
    else
        diag_error(cx->diags, at, "%s must be %s, found %s", what, want, got);
    return false;
}

static bool field_number(CallCtx *cx, const Record *r, const char *name, Dim d, Pos at, const char *what, double *x)
{
    const Value *v = record_get(r, name);
    if (!v || v->kind != VAL_NUMBER || !dim_eq(v->q.dim, d)) {
        diag_error(cx->diags, at, "%s: the %s record has no usable '%s'", what, r->type, name);
        return false;
    }
    *x = v->q.si;
    return true;
}

static Value hinted(double si, Dim d, const char *us, const char *si_unit)
{
    return us ? value_hinted(qty(si, d), us, si_unit) : value_number(qty(si, d));
}

static Record *segment_record(CallCtx *cx, const SegmentResult *g, const PathSegment *sp)
{
    Record *r = record_new(cx->arena, "segment", (g->has_device ? 15 : 13) + (g->has_load ? 1 : 0));
    size_t k = 0;
    if (g->has_load)
        record_set(r, k++, "load", value_number(qty_number(g->load)));
    record_set(r, k++, "Q", value_number(qty(g->Q, DIM_FLOW)));
    record_set(r, k++, "D", hinted(g->D, DIM_L, "in", "mm"));
    record_set(r, k++, "L", value_number(qty(g->L, DIM_L)));
    record_set(r, k++, "rise", value_number(qty(g->rise, DIM_L)));
    record_set(r, k++, "V", value_number(qty(g->V, DIM_VELOCITY)));
    record_set(r, k++, "Re", value_number(qty_number(g->Re)));
    record_set(r, k++, "f", value_number(qty_number(g->f)));
    record_set(r, k++, "K", value_number(qty_number(g->K)));
    record_set(r, k++, "h_f", value_number(qty(g->h_f, DIM_L)));
    record_set(r, k++, "h_m", value_number(qty(g->h_m, DIM_L)));
    record_set(r, k++, "p_in", value_number(qty(g->p_in, DIM_PRESSURE)));
    record_set(r, k++, "p_out", value_number(qty(g->p_out, DIM_PRESSURE)));
    record_set(r, k++, "dp_device", value_number(qty(g->dp_device, DIM_PRESSURE)));
    if (g->has_device) {
        record_set(r, k++, "p_device_in", value_number(qty(g->p_device_in, DIM_PRESSURE)));
        record_set(r, k++, "device", value_string(sp->device_text));
    }
    return r;
}

bool flow_path(CallCtx *cx, const Stmt *s, const Value *fluid, const Value *start, const SegmentInput *in,
               Value *out, const PathResult **result)
{
    const PathSpec *ps = s->path;
    if (fluid->kind != VAL_RECORD || strcmp(fluid->rec->type, "water") != 0) {
        char got[96];
        value_describe(fluid, cx->units, got, sizeof got);
        diag_error(cx->diags, ps->fluid->pos, "fluid must be a water record (water(T)), found %s", got);
        return false;
    }
    if (!need(cx, start, DIM_PRESSURE, ps->start->pos, "start"))
        return false;
    double rho, mu;
    if (!field_number(cx, fluid->rec, "rho", DIM_DENSITY, ps->fluid->pos, "fluid", &rho) ||
        !field_number(cx, fluid->rec, "mu", DIM_DYN_VISC, ps->fluid->pos, "fluid", &mu))
        return false;

    PathResult *pr = arena_alloc(cx->arena, sizeof *pr);
    pr->segs = arena_alloc(cx->arena, (ps->nsegs + 1) * sizeof *pr->segs);
    pr->nsegs = ps->nsegs;
    pr->rho = rho;
    bool ok = true;
    double x = 0, z = 0;
    for (size_t i = 0; i < ps->nsegs; i++) {
        const PathSegment *sp = &ps->segs[i];
        const SegmentInput *si = &in[i];
        SegmentResult *g = &pr->segs[i];
        g->id = sp->id;
        g->has_load = si->has_load;
        g->load = si->load;
        g->fixture_each = si->fixture_each;
        g->fixture_total = si->fixture_total;
        /* a flow taken from the fixtures (demand:) has no cell: its errors go to the row */
        Pos flow_pos = sp->flow ? sp->flow->pos : sp->pos;
        bool seg_ok = need(cx, &si->flow, DIM_FLOW, flow_pos, "flow");
        seg_ok = need(cx, &si->length, DIM_L, sp->length->pos, "length") && seg_ok;
        seg_ok = need(cx, &si->rise, DIM_L, sp->rise->pos, "rise") && seg_ok;
        if (si->pipe.kind != VAL_RECORD || strcmp(si->pipe.rec->type, "pipe") != 0) {
            char got[96];
            value_describe(&si->pipe, cx->units, got, sizeof got);
            diag_error(cx->diags, sp->pipe->pos, "pipe must be a pipe record (pipe(STANDARD, SIZE, CLASS)), found %s", got);
            seg_ok = false;
        }
        if (si->has_K)
            seg_ok = need(cx, &si->K, DIM_NONE, sp->K->pos, "K") && seg_ok;
        if (si->has_C)
            seg_ok = need(cx, &si->C, DIM_NONE, sp->C->pos, "C") && seg_ok;
        double eps = 0;
        if (seg_ok) {
            seg_ok = field_number(cx, si->pipe.rec, "id", DIM_L, sp->pipe->pos, "pipe", &g->D) &&
                     field_number(cx, si->pipe.rec, "roughness", DIM_L, sp->pipe->pos, "pipe", &eps);
        }
        if (!seg_ok) {
            ok = false;
            continue;
        }
        g->Q = si->flow.q.si;
        if (g->Q <= 0) {
            diag_error(cx->diags, flow_pos, "flow must be positive in the direction of the path");
            ok = false;
            continue;
        }
        g->L = si->length.q.si;
        if (g->L < 0) {
            diag_error(cx->diags, sp->length->pos, "length cannot be negative");
            ok = false;
            continue;
        }
        g->rise = si->rise.q.si;
        g->A = PI * g->D * g->D / 4;
        g->V = g->Q / g->A;
        g->Re = rho * g->V * g->D / mu;
        double hv = g->V * g->V / (2 * G);

        /* Friction. */
        Value v_re = value_number(qty_number(g->Re)), v_out;
        if (ps->loss == LOSS_DARCY) {
            Value args[2] = {v_re, value_number(qty_number(eps / g->D))};
            Pos pos[2] = {flow_pos, sp->pipe->pos};
            Value kw = value_string(ps->friction ? ps->friction : "colebrook");
            if (!builtin_call(cx, fn_friction_factor, "friction_factor", sp->pos, args, pos, 2, "method", ps->friction ? &kw : NULL, &v_out)) {
                ok = false;
                continue;
            }
            g->f = v_out.q.si;
            g->h_f = g->f * g->L / g->D * hv;
        } else {
            Value args[4] = {si->flow, si->C, value_number(qty(g->D, DIM_L)), si->length};
            Pos pos[4] = {flow_pos, sp->C->pos, sp->pipe->pos, sp->length->pos};
            if (!builtin_call(cx, fn_hazen_williams, "hazen_williams", sp->pos, args, pos, 4, NULL, NULL, &v_out)) {
                ok = false;
                continue;
            }
            g->f = NAN;
            g->h_f = v_out.q.si;
        }

        /* Fittings, by the k_fitting method of the path. */
        double K = si->has_K ? si->K.q.si : 0;
        for (size_t k = 0; k < sp->nfittings; k++) {
            const FittingItem *it = &sp->fittings[k];
            FittingKind fk = fitting_kind_parse(it->kind);
            if (fk == FIT_EXPANSION || fk == FIT_CONTRACTION) {
                /* k_fitting needs the other bore as D2=, which a row has no
                 * place for; say what to do instead of asking for D2=. */
                diag_error(cx->diags, it->pos,
                           "fitting '%s' needs the other bore, which a path row cannot give; "
                           "put its loss coefficient in the K column (k_fitting(\"%s\", D, Re, D2=...))",
                           it->kind, fitting_kind_name(fk));
                ok = false;
                break;
            }
            Value args[3] = {value_string(it->kind), value_number(qty(g->D, DIM_L)), v_re};
            Pos pos[3] = {it->pos, sp->pipe->pos, flow_pos};
            Value kw = value_string(ps->fittings ? ps->fittings : "crane");
            if (!builtin_call(cx, fn_k_fitting, "k_fitting", it->pos, args, pos, 3, "method", ps->fittings ? &kw : NULL, &v_out)) {
                ok = false;
                break;
            }
            K += it->count * v_out.q.si;
        }
        g->K = K;
        g->h_m = K * hv;
        g->dp_static = rho * G * g->rise;

        /* Energy equation across the segment; continuity of the energy
         * grade line at the junction before it. */
        if (i == 0)
            g->p_in = start->q.si;
        else
            g->p_in = pr->segs[i - 1].p_out + rho * (pr->segs[i - 1].V * pr->segs[i - 1].V - g->V * g->V) / 2;
        g->p_out = g->p_in - rho * G * (g->h_f + g->h_m) - g->dp_static;
        g->p_device_in = g->p_out;

        /* A device at the outlet, after the pipe and fitting losses. */
        if (si->has_device) {
            Device dev;
            DeviceStatus st;
            double after;
            if (!device_from_value(cx, &si->device, sp->device->pos, "device", &dev) ||
                !device_step(cx, &dev, sp->device->pos, g->Q, g->p_out, rho, &after, &st)) {
                ok = false;
                continue;
            }
            g->has_device = true;
            g->device = sp->device_text;
            g->device_status = (int)st;
            g->dp_device = g->p_out - after;
            g->p_out = after;
            pr->ndevices++;
        }
        g->x_in = x;
        g->z_in = z;
        x += g->L;
        z += g->rise;
        g->x_out = x;
        g->z_out = z;
    }
    if (!ok)
        return false;

    pr->p_min = pr->segs[0].p_in;
    pr->p_min_seg = 0;
    pr->p_min_at_inlet = true;
    for (size_t i = 0; i < pr->nsegs; i++) {
        const SegmentResult *g = &pr->segs[i];
        if (g->p_in < pr->p_min) {
            pr->p_min = g->p_in;
            pr->p_min_seg = i;
            pr->p_min_at_inlet = true;
            pr->p_min_before_device = false;
        }
        if (g->has_device && g->p_device_in < pr->p_min) {
            pr->p_min = g->p_device_in;
            pr->p_min_seg = i;
            pr->p_min_at_inlet = false;
            pr->p_min_before_device = true;
        }
        if (g->p_out < pr->p_min) {
            pr->p_min = g->p_out;
            pr->p_min_seg = i;
            pr->p_min_at_inlet = false;
            pr->p_min_before_device = false;
        }
        if (g->V > pr->V_max)
            pr->V_max = g->V;
        pr->loss += g->h_f + g->h_m;
    }
    pr->p_end = pr->segs[pr->nsegs - 1].p_out;

    Record *r = record_new(cx->arena, "path", 6 + pr->nsegs);
    size_t k = 0;
    record_set(r, k++, "p_end", value_number(qty(pr->p_end, DIM_PRESSURE)));
    record_set(r, k++, "p_min", value_number(qty(pr->p_min, DIM_PRESSURE)));
    const SegmentResult *at = &pr->segs[pr->p_min_seg];
    record_set(r, k++, "p_min_at",
               value_string(arena_printf(cx->arena, "%s %s", at->id,
                                         pr->p_min_at_inlet ? "inlet" : pr->p_min_before_device ? "device inlet" : "outlet")));
    record_set(r, k++, "V_max", value_number(qty(pr->V_max, DIM_VELOCITY)));
    record_set(r, k++, "loss", value_number(qty(pr->loss, DIM_L)));
    record_set(r, k++, "length", value_number(qty(x, DIM_L)));
    for (size_t i = 0; i < pr->nsegs; i++) {
        Value sv = {0};
        sv.kind = VAL_RECORD;
        sv.rec = segment_record(cx, &pr->segs[i], &ps->segs[i]);
        record_set(r, k++, ps->segs[i].field, sv);
    }
    r->native = pr;
    out->kind = VAL_RECORD;
    out->rec = r;
    out->str = NULL;
    *result = pr;
    return true;
}

/* ---- figures -------------------------------------------------------------- */

static Series *add_series(CallCtx *cx, FigureData *fd, size_t cap, const char *name, size_t n, int style)
{
    Series *s = &fd->series[fd->nseries++];
    (void)cap;
    s->name = name;
    s->n = n;
    s->style = style;
    s->x = arena_alloc(cx->arena, (n + 1) * sizeof *s->x);
    s->y = arena_alloc(cx->arena, (n + 1) * sizeof *s->y);
    return s;
}

static const PathResult *path_of(CallCtx *cx, const Stmt *s, const Value *v, size_t i)
{
    if (v->kind == VAL_RECORD && strcmp(v->rec->type, "path") == 0 && v->rec->native)
        return v->rec->native;
    char got[96];
    value_describe(v, cx->units, got, sizeof got);
    diag_error(cx->diags, s->fig->args[i]->pos, "figure %s: argument %zu must be a path, found %s", s->fig->kind, i + 1, got);
    return NULL;
}

/* Hydraulic and energy grade lines and the pipe profile along the path. */
static bool figure_hgl(CallCtx *cx, const Stmt *s, const Value *args, FigureData *fd)
{
    if (s->fig->nargs != 1) {
        diag_error(cx->diags, s->name_pos, "figure hgl takes one path, found %zu arguments", s->fig->nargs);
        return false;
    }
    const PathResult *pr = path_of(cx, s, &args[0], 0);
    if (!pr)
        return false;
    fd->x_title = "Distance along the path";
    fd->y_title = "Elevation and head";
    fd->x_unit = unit_default(DIM_L, TEMP_NONE, cx->units);
    fd->y_unit = fd->x_unit;
    fd->series = arena_alloc(cx->arena, 3 * sizeof *fd->series);
    /* two points a segment, and a third where a device steps the lines */
    size_t n = 2 * pr->nsegs + pr->ndevices;
    Series *pipe = add_series(cx, fd, 3, "pipe elevation", n, 3);
    Series *hgl = add_series(cx, fd, 3, "hydraulic grade line", n, 0);
    Series *egl = add_series(cx, fd, 3, "energy grade line, HGL + V²/2g", n, 4);
    double rg = pr->rho * G;
    /* markers: the lowest pressure first, then each device */
    fd->markers = arena_alloc(cx->arena, (pr->ndevices + 1) * sizeof *fd->markers);
    fd->nmarkers = 1;
    size_t a = 0;
    for (size_t i = 0; i < pr->nsegs; i++) {
        const SegmentResult *g = &pr->segs[i];
        double hv = g->V * g->V / (2 * G);
        double xs[3] = {g->x_in, g->x_out, g->x_out}, zs[3] = {g->z_in, g->z_out, g->z_out};
        double ps[3] = {g->p_in, g->p_device_in, g->p_out};
        size_t np = g->has_device ? 3 : 2;
        if (!g->has_device)
            ps[1] = g->p_out;
        for (size_t k = 0; k < np; k++, a++) {
            pipe->x[a] = hgl->x[a] = egl->x[a] = xs[k];
            pipe->y[a] = zs[k];
            hgl->y[a] = zs[k] + ps[k] / rg;
            egl->y[a] = hgl->y[a] + hv;
        }
        if (g->has_device) {
            Marker *mk = &fd->markers[fd->nmarkers++];
            mk->x = g->x_out;
            mk->y = g->z_out + g->p_out / rg;
            mk->label = arena_printf(cx->arena, "%s at %s", g->device, g->id);
        }
    }
    const SegmentResult *m = &pr->segs[pr->p_min_seg];
    Marker *mk = &fd->markers[0];
    mk->x = pr->p_min_at_inlet ? m->x_in : m->x_out;
    mk->y = (pr->p_min_at_inlet ? m->z_in : m->z_out) + pr->p_min / rg;
    mk->label = "minimum pressure";
    return true;
}

/* Darcy friction factor against Reynolds number: Colebrook curves for a set
 * of relative roughnesses, the laminar line, the transition band, and the
 * calc's operating points (a path's segments, or Re, f pairs). */
static bool figure_moody(CallCtx *cx, const Stmt *s, const Value *args, FigureData *fd)
{
    static const double rr[] = {0, 1e-5, 1e-4, 1e-3, 5e-3, 0.02, 0.05};
    static const char *const rr_name[] = {"smooth", "ε/D = 1×10⁻⁵", "ε/D = 1×10⁻⁴", "ε/D = 0.001", "ε/D = 0.005", "ε/D = 0.02", "ε/D = 0.05"};
    enum { NRR = sizeof rr / sizeof rr[0], NPTS = 48 };
    fd->x_title = "Reynolds number";
    fd->y_title = "Darcy friction factor";
    fd->x_unit = unit_default(DIM_NONE, TEMP_NONE, cx->units);
    fd->y_unit = fd->x_unit;
    fd->log_x = fd->log_y = true;
    fd->band_lo = 2000;
    fd->band_hi = 4000;
    fd->series = arena_alloc(cx->arena, (NRR + 1) * sizeof *fd->series);
    Series *lam = add_series(cx, fd, NRR + 1, "laminar, f = 64/Re", 2, 0);
    lam->x[0] = 600;
    lam->y[0] = 64.0 / 600;
    lam->x[1] = 4000;
    lam->y[1] = 64.0 / 4000;
    for (size_t k = 0; k < NRR; k++) {
        Series *c = add_series(cx, fd, NRR + 1, rr_name[k], NPTS, k == 0 ? 1 : 0);
        for (size_t i = 0; i < NPTS; i++) {
            double re = 2000 * pow(1e8 / 2000, (double)i / (NPTS - 1));
            double f = NAN;
            friction_colebrook(re, rr[k], &f);
            c->x[i] = re;
            c->y[i] = f;
        }
    }
    /* Operating points. */
    size_t cap = 0;
    for (size_t i = 0; i < s->fig->nargs; i++)
        cap += args[i].kind == VAL_RECORD && args[i].rec->native ? ((const PathResult *)args[i].rec->native)->nsegs : 1;
    fd->markers = arena_alloc(cx->arena, (cap + 1) * sizeof *fd->markers);
    for (size_t i = 0; i < s->fig->nargs; i++) {
        if (args[i].kind == VAL_RECORD) {
            const PathResult *pr = path_of(cx, s, &args[i], i);
            if (!pr)
                return false;
            for (size_t k = 0; k < pr->nsegs; k++) {
                if (isnan(pr->segs[k].f))
                    continue;
                Marker *mk = &fd->markers[fd->nmarkers++];
                mk->x = pr->segs[k].Re;
                mk->y = pr->segs[k].f;
                mk->label = pr->segs[k].id;
            }
            continue;
        }
        /* Re, f as two pure numbers. */
        if (i + 1 >= s->fig->nargs || args[i].kind != VAL_NUMBER || args[i + 1].kind != VAL_NUMBER ||
            !dim_is_none(args[i].q.dim) || !dim_is_none(args[i + 1].q.dim)) {
            diag_error(cx->diags, s->fig->args[i]->pos,
                       "figure moody takes paths, or pairs of pure numbers Re, f, as operating points");
            return false;
        }
        Marker *mk = &fd->markers[fd->nmarkers++];
        mk->x = args[i].q.si;
        mk->y = args[i + 1].q.si;
        const Expr *fe = s->fig->args[i + 1];
        mk->label = fe->kind == EXPR_NAME ? fe->text : "operating point";
        i++;
    }
    return true;
}

static const char *capitalised(CallCtx *cx, const char *word)
{
    char *s = arena_strdup(cx->arena, word);
    if (s[0] >= 'a' && s[0] <= 'z')
        s[0] = (char)(s[0] - 'a' + 'A');
    return s;
}

/* A curve read between and beyond its points: the interpolated line from
 * its first to its last point (sampled, so a log-log curve shows its power
 * laws), on logarithmic axes for a log-log curve, and each table point. */
static bool figure_curve(CallCtx *cx, const Stmt *s, const Value *args, FigureData *fd)
{
    const CurveData *cd = s->fig->nargs == 1 ? curve_of(&args[0]) : NULL;
    if (!cd) {
        char got[96] = "nothing";
        if (s->fig->nargs == 1)
            value_describe(&args[0], cx->units, got, sizeof got);
        diag_error(cx->diags, s->fig->nargs ? s->fig->args[0]->pos : s->name_pos,
                   "figure curve takes one curve (a ```curve NAME block), found %s", s->fig->nargs == 1 ? got : "");
        return false;
    }
    const Curve *c = &cd->curve;
    fd->x_unit = unit_default(cd->x_dim, cd->x_temp, cx->units);
    fd->y_unit = unit_default(cd->y_dim, cd->y_temp, cx->units);
    fd->log_x = fd->log_y = c->interp == CURVE_LOGLOG;
    fd->x_title = capitalised(cx, dim_name(cd->x_dim) ? dim_name(cd->x_dim) : "argument");
    fd->y_title = capitalised(cx, dim_name(cd->y_dim) ? dim_name(cd->y_dim) : "value");
    enum { PER = 12 };
    size_t n = (c->n - 1) * PER + 1;
    fd->series = arena_alloc(cx->arena, sizeof *fd->series);
    Series *line = add_series(cx, fd, 1, arena_printf(cx->arena, "curve %s", cd->name), n, 0);
    for (size_t i = 0; i + 1 < c->n; i++)
        for (size_t k = 0; k < PER; k++) {
            double t = (double)k / PER;
            double x = c->interp == CURVE_LOGLOG ? c->x[i] * pow(c->x[i + 1] / c->x[i], t)
                                                 : c->x[i] + t * (c->x[i + 1] - c->x[i]);
            line->x[i * PER + k] = x;
            line->y[i * PER + k] = curve_eval(c, x, NULL);
        }
    line->x[n - 1] = c->x[c->n - 1];
    line->y[n - 1] = c->y[c->n - 1];
    fd->markers = arena_alloc(cx->arena, (c->n + 1) * sizeof *fd->markers);
    for (size_t i = 0; i < c->n; i++)
        fd->markers[fd->nmarkers++] = (Marker){c->x[i], c->y[i], ""};
    return true;
}

/* Pump curve, system curve H = H_static + k*Q^2, and where they cross. */
static bool figure_pump(CallCtx *cx, const Stmt *s, const Value *args, FigureData *fd)
{
    if (s->fig->nargs != 3) {
        diag_error(cx->diags, s->name_pos, "figure pump takes a pump, H_static and k, found %zu arguments", s->fig->nargs);
        return false;
    }
    const CurveData *cd = curve_of(&args[0]);
    if (cd && !(dim_eq(cd->x_dim, DIM_FLOW) && dim_eq(cd->y_dim, DIM_L))) {
        diag_error(cx->diags, s->fig->args[0]->pos, "figure pump: curve '%s' must give head (a length) against flow",
                   cd->name);
        return false;
    }
    if (!cd && (args[0].kind != VAL_RECORD || strcmp(args[0].rec->type, "pump") != 0 || !args[0].rec->native)) {
        char got[96];
        value_describe(&args[0], cx->units, got, sizeof got);
        diag_error(cx->diags, s->fig->args[0]->pos,
                   "figure pump: argument 1 must be a pump (pump_curve(...)) or a curve of head against flow, found %s", got);
        return false;
    }
    Dim k_dim = dim_div(DIM_L, dim_mul(DIM_FLOW, DIM_FLOW));
    if (!need(cx, &args[1], DIM_L, s->fig->args[1]->pos, "figure pump: H_static") ||
        !need(cx, &args[2], k_dim, s->fig->args[2]->pos, "figure pump: k"))
        return false;
    const PumpCurve *pc = cd ? NULL : args[0].rec->native;
    double hs = args[1].q.si, k = args[2].q.si;
    double q_end = (cd ? cd->curve.x[cd->curve.n - 1] : pc->q_max) * 1.15;
    enum { NPTS = 41 };
    fd->x_title = "Flow rate";
    fd->y_title = "Head";
    fd->x_unit = unit_default(DIM_FLOW, TEMP_NONE, cx->units);
    fd->y_unit = unit_default(DIM_L, TEMP_NONE, cx->units);
    /* the pump curve to its last catalogue point, then dotted and named as
     * an extrapolation out to the end of the axis */
    double q_last = cd ? cd->curve.x[cd->curve.n - 1] : pc->q_max;
    enum { NEXT = 8 };
    fd->series = arena_alloc(cx->arena, 3 * sizeof *fd->series);
    Series *pump = add_series(cx, fd, 3, "pump curve", NPTS, 0);
    Series *sys = add_series(cx, fd, 3, "system curve", NPTS, 1);
    Series *beyond = add_series(cx, fd, 3, "pump curve extrapolated beyond the last catalogue point", NEXT, 2);
    for (size_t i = 0; i < NPTS; i++) {
        double q = q_end * (double)i / (NPTS - 1);
        double qp = q_last * (double)i / (NPTS - 1);
        pump->x[i] = qp;
        pump->y[i] = cd ? curve_eval(&cd->curve, qp, NULL) : pump_head(pc, qp);
        sys->x[i] = q;
        sys->y[i] = hs + k * q * q;
    }
    for (size_t i = 0; i < NEXT; i++) {
        double q = q_last + (q_end - q_last) * (double)i / (NEXT - 1);
        beyond->x[i] = q;
        beyond->y[i] = cd ? curve_eval(&cd->curve, q, NULL) : pump_head(pc, q);
    }
    double Q = NAN, H;
    int count = 0;
    bool met = cd ? curve_pump_crossing(&cd->curve, hs, k, &Q) > 0 : pump_operating_point(pc, hs, k, &Q, &H, &count) == PUMP_OK;
    H = hs + k * Q * Q;
    if (met) {
        fd->markers = arena_alloc(cx->arena, sizeof *fd->markers);
        fd->markers[0] = (Marker){Q, H, "operating point"};
        fd->nmarkers = 1;
    }
    return true;
}

/* A network drawn from its node coordinates: one two-point series per link
 * (from -> to) and the critical node (lowest junction pressure) as the
 * marker. The PDF renderer shades and arrows the links from the network's
 * own result (pdf_network.c). */
static bool figure_network(CallCtx *cx, const Stmt *s, const Value *args, FigureData *fd)
{
    if (s->fig->nargs != 1) {
        diag_error(cx->diags, s->name_pos, "figure network takes one network, found %zu arguments", s->fig->nargs);
        return false;
    }
    if (args[0].kind != VAL_RECORD || strcmp(args[0].rec->type, "network") != 0 || !args[0].rec->native) {
        char got[96];
        value_describe(&args[0], cx->units, got, sizeof got);
        diag_error(cx->diags, s->fig->args[0]->pos, "figure network: the argument must be a network, found %s", got);
        return false;
    }
    const NetworkResult *nr = args[0].rec->native;
    if (!nr->has_xy) {
        diag_error(cx->diags, s->fig->args[0]->pos,
                   "figure network draws the nodes where they are: give the node table 'x' and 'y' columns");
        return false;
    }
    fd->x_title = "x";
    fd->y_title = "y";
    fd->x_unit = unit_default(DIM_L, TEMP_NONE, cx->units);
    fd->y_unit = fd->x_unit;
    fd->series = arena_alloc(cx->arena, (nr->nlinks + 1) * sizeof *fd->series);
    for (size_t l = 0; l < nr->nlinks; l++) {
        const LinkResult *g = &nr->links[l];
        Series *se = add_series(cx, fd, nr->nlinks, g->id, 2, 0);
        se->x[0] = nr->nodes[g->from].x;
        se->y[0] = nr->nodes[g->from].y;
        se->x[1] = nr->nodes[g->to].x;
        se->y[1] = nr->nodes[g->to].y;
    }
    fd->markers = arena_alloc(cx->arena, sizeof *fd->markers);
    const NodeResult *c = &nr->nodes[nr->p_min_node];
    fd->markers[0] = (Marker){c->x, c->y, arena_printf(cx->arena, "critical node %s", c->id)};
    fd->nmarkers = 1;
    return true;
}

bool flow_figure(CallCtx *cx, const Stmt *s, const Value *args, FigureData **out)
{
    FigureData *fd = arena_alloc(cx->arena, sizeof *fd);
    fd->kind = s->fig->kind;
    fd->band_lo = fd->band_hi = NAN;
    bool ok;
    if (strcmp(s->fig->kind, "hgl") == 0)
        ok = figure_hgl(cx, s, args, fd);
    else if (strcmp(s->fig->kind, "moody") == 0)
        ok = figure_moody(cx, s, args, fd);
    else if (strcmp(s->fig->kind, "pump") == 0)
        ok = figure_pump(cx, s, args, fd);
    else if (strcmp(s->fig->kind, "curve") == 0)
        ok = figure_curve(cx, s, args, fd);
    else if (strcmp(s->fig->kind, "network") == 0)
        ok = figure_network(cx, s, args, fd);
    else {
        diag_error(cx->diags, s->name_pos, "unknown figure '%s' (hgl, moody, pump, curve or network)", s->fig->kind);
        ok = false;
    }
    *out = ok ? fd : NULL;
    return ok;
}
