/* eval_tables.c — statements written as tables: paths, curves and networks.
 *
 * Every cell is an expression, evaluated here and reported at its cell;
 * the hydraulics are elsewhere (flow.c for a path, network.c for a network,
 * methods/devices_lib.c for the record a curve binds). */
#include "eval_internal.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "flow.h"
#include "network.h"
#include "methods/devices_lib.h"
#include "numfmt.h"

/* The loads of a fixtures cell's items (each[k] of one fixture, total[k] of
 * the item's count of them, arrays made in the document's arena) and their
 * sum in *load. False after an item's error (reported at the item). */
static bool fixture_schedule(EvalCtx *c, const FittingItem *items, size_t n, double **each, double **total,
                             double *load)
{
    bool ok = true;
    *each = arena_alloc(&c->doc->arena, (n + 1) * sizeof(double));
    *total = arena_alloc(&c->doc->arena, (n + 1) * sizeof(double));
    *load = 0;
    for (size_t k = 0; k < n; k++) {
        double one;
        if (demand_item_load(c->call, items[k].kind, items[k].pos, &one)) {
            (*each)[k] = one;
            (*total)[k] = items[k].count * one;
            *load += (*total)[k];
        } else {
            ok = false;
        }
    }
    return ok;
}

/* The fixture load of every segment of a path with a fixtures column: the
 * fixtures taken off at a segment's outlet and at every outlet after it are
 * downstream of its inlet, so a segment's load is the sum of its own and
 * all later outlets' loads (a path is a single run). */
static bool path_loads(EvalCtx *c, const PathSpec *ps, SegmentInput *in)
{
    bool ok = true;
    double below = 0;
    for (size_t i = ps->nsegs; i-- > 0;) {
        const PathSegment *g = &ps->segs[i];
        double outlet;
        ok = fixture_schedule(c, g->fixtures, g->nfixtures, &in[i].fixture_each, &in[i].fixture_total, &outlet) && ok;
        below += outlet;
        in[i].has_load = true;
        in[i].load = below;
    }
    return ok;
}

/* A path: evaluate every cell, then the hydraulics (flow.c). */
void eval_path(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c)
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
    /* demand: NAME — the curve of demand against load the calc gives */
    Value dcurve;
    if (ps->demand == PATH_DEMAND_CURVE && !eval_expr(c, ps->demand_curve, &dcurve)) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    /* demand: each segment's flow is the demand of its summed load — loads
     * add, demands do not */
    for (size_t i = 0; i < ps->nsegs && ps->demand != PATH_DEMAND_NONE; i++) {
        double Q = 0;
        bool got = ps->demand == PATH_DEMAND_HUNTER
                       ? demand_hunter_flow(c->call, ps->demand_system, in[i].load, ps->demand_pos, &Q)
                   : ps->demand == PATH_DEMAND_CURVE
                       ? demand_curve_flow(c->call, &dcurve, in[i].load, ps->demand_pos, false, ps->segs[i].id, &Q)
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
    res->made = eval_made(c->ev, (StmtMade){.path = pr});
    res->state = RES_OK;
}

/* A curve: every cell a number, each column of one dimension, the argument
 * strictly increasing (and for log-log both above zero); the record it
 * binds reads the table (methods/devices_lib.c). Each problem is reported
 * at its cell. */
void eval_curve(const Stmt *s, StmtResult *res, EvalCtx *c)
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
            if (!eval_need_number(c, e, cv, "a curve's cell")) {
                ok = false;
                break;
            }
            if (!dim_eq(cv->q.dim, first->q.dim) || (cv->q.temp == TEMP_NONE) != (first->q.temp == TEMP_NONE)) {
                char d1[128], d2[128];
                eval_describe_operand(c, k ? cs->y[0] : cs->x[0], first, d1, sizeof d1);
                eval_describe_operand(c, e, cv, d2, sizeof d2);
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
        Unit u = eval_display_unit(c->ev, &v[0], eval_written_unit(c->ev, cs->x[0]));
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
        t->units[k] = eval_display_unit(c->ev, &v[k], eval_written_unit(c->ev, k ? cs->y[0] : cs->x[0]));
    t->cells = v;
    res->made = eval_made(c->ev, (StmtMade){.table = t});
    res->value = (Value){.kind = VAL_RECORD, .rec = curve_record_new(a, cd)};
    call_use_method(c->call, curve_method(cd->curve.interp));
    res->state = RES_OK;
}

/* `demand:` in a network: each junction's demand is the demand of the load
 * of the fixtures it serves (its fixtures cell), by the code's demand table,
 * the calc's curve or the peak demand model. In a network there is no one
 * "downstream", so the load is converted node by node and the links carry
 * the sum of those demands: where a link serves several nodes that sum
 * overstates the peak (demands do not add), which errs on the safe side;
 * the report says so beside the node table. A node whose cell is empty has
 * no demand. */
static bool network_demands(EvalCtx *c, const NetworkSpec *ns, const Value *dcurve, NetNodeInput *ni)
{
    bool ok = true;
    for (size_t i = 0; i < ns->nnodes; i++) {
        const NetNode *nd = &ns->nodes[i];
        if (nd->nfixtures == 0)
            continue;
        double load;
        if (!fixture_schedule(c, nd->fixtures, nd->nfixtures, &ni[i].fixture_each, &ni[i].fixture_total, &load)) {
            ok = false;
            continue;
        }
        double Q = 0;
        bool got = ns->demand == PATH_DEMAND_HUNTER
                       ? demand_hunter_flow(c->call, ns->demand_system, load, ns->demand_pos, &Q)
                   : ns->demand == PATH_DEMAND_CURVE
                       ? demand_curve_flow(c->call, dcurve, load, ns->demand_pos, true, nd->id, &Q)
                       : demand_peak_flow(c->call, ns->demand_pos);
        if (!got) {
            /* as in a path, the first refusal ends it: a table that is not
             * shipped would refuse every node alike */
            ok = false;
            break;
        }
        ni[i].has_load = true;
        ni[i].load = load;
        ni[i].demand = value_hinted(qty(Q, DIM_FLOW), "gal/min", "L/s");
    }
    return ok;
}

/* A network: evaluate every cell, then solve it (network.c). */
void eval_network(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c)
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
    /* demand: NAME — the curve of demand against load the calc gives */
    Value dcurve = {0};
    if (ns->demand == PATH_DEMAND_CURVE && !eval_expr(c, ns->demand_curve, &dcurve)) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    if (ns->has_fixtures && !network_demands(c, ns, &dcurve, ni)) {
        res->state = RES_FAILED;
        return;
    }
    const NetworkResult *nr = NULL;
    if (!network_solve(c->call, s, &fluid, &tol, ni, li, &res->value, &nr)) {
        res->state = RES_FAILED;
        return;
    }
    res->made = eval_made(c->ev, (StmtMade){.network = nr});
    res->state = RES_OK;
}
