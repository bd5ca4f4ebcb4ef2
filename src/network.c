/* network.c — a pipe network's cells to link physics, the solve, and the
 * network record (DESIGN 2.12).
 *
 * Each link from node i to node j obeys H_i - H_j = h(Q), Q signed from i
 * to j, with
 *   h(Q) = (f*L/D + K) * Q*|Q| / (2*g*A^2)     Darcy-Weisbach, f = f(Re)
 *   h(Q) = 10.67*L*Q*|Q|^0.852 / (C^1.852*D^4.87) + K*Q*|Q|/(2*g*A^2)
 *                                              Hazen-Williams (SI form)
 * less the head of a pump on the link. Below Re 2000 the Darcy loss is
 * laminar, h = 128*nu*L*Q/(pi*g*D^4) (Hagen-Poiseuille), which is linear
 * in Q, so the slope dh/dQ stays finite and positive through zero flow.
 * Hazen-Williams has a zero slope at Q = 0; below QHW_LINEAR (1e-6 m^3/s)
 * its curve is replaced by the quadratic a*Q + b*Q*|Q| that matches the
 * value and slope at that flow, the usual remedy in gradient solvers (the
 * head differs by less than 1e-9 m there). K of fittings follows the
 * path's rules (k_fitting at each link's Reynolds number). Heads at nodes
 * are hydraulic grade, z + p/(rho*g); velocity heads are not added. */
#include "network.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/devices_lib.h"
#include "methods/fittings.h"
#include "methods/friction.h"
#include "methods/gradient.h"
#include "methods/pumps.h"
#include "numfmt.h"

static const double G = CONST_STANDARD_GRAVITY;
static const double PI = CONST_PI;
static const double QHW_LINEAR = 1e-6;  /* m^3/s */
static const double HW_EXP = 1.852;
static const int MAX_ITERATIONS = 200;
static const int MAX_FITTING_PASSES = 8;

typedef struct LinkPhys {
    double D, A, L, eps, K, C;
    bool has_device;
    Device device;           /* methods/devices.h; a PRV is handled by the solver */
} LinkPhys;

typedef struct Physics {
    LinkPhys *links;
    double nu, rho;
    bool darcy;
    FrictionMethod method;
} Physics;

/* The friction factor a link uses: 64/Re below Re 2000, the calc's method
 * from Re 4000, and between them a straight line in Re from the laminar
 * value at 2000 to the method's value at 4000. No correlation holds in the
 * transition zone; the line keeps h(Q) continuous, without which a link
 * whose flow sits near Re 2000 makes Newton's method cycle between the
 * laminar and the turbulent branch. Churchill (1977) spans all regimes
 * itself and is used as it is. */
static double darcy_f(const Physics *ph, double Re, double rr)
{
    double f, f4;
    FrictionMethod used;
    if (ph->method == FRICTION_CHURCHILL || Re < FRICTION_RE_LAMINAR || Re >= FRICTION_RE_TURBULENT)
        return friction_factor(ph->method, Re, rr, &f, &used) == FRICTION_OK ? f : NAN;
    if (friction_factor(ph->method, FRICTION_RE_TURBULENT, rr, &f4, &used) != FRICTION_OK)
        return NAN;
    double f2 = 64 / FRICTION_RE_LAMINAR;
    return f2 + (f4 - f2) * (Re - FRICTION_RE_LAMINAR) / (FRICTION_RE_TURBULENT - FRICTION_RE_LAMINAR);
}

static bool in_transition(const Physics *ph, double Re)
{
    return ph->method != FRICTION_CHURCHILL && Re >= FRICTION_RE_LAMINAR && Re < FRICTION_RE_TURBULENT;
}

/* Pipe friction plus minor loss at Q, and its slope. */
static void pipe_loss(const Physics *ph, const LinkPhys *lp, double Q, double *h, double *d)
{
    double q = fabs(Q), s = Q < 0 ? -1 : 1;
    double minor = lp->K / (2 * G * lp->A * lp->A);
    if (ph->darcy) {
        double Re = q * lp->D / (lp->A * ph->nu);
        double lam = 128 * ph->nu * lp->L / (PI * G * pow(lp->D, 4));
        if (Re < FRICTION_RE_LAMINAR && (ph->method != FRICTION_CHURCHILL || Re < 1e-6)) {
            *h = lam * Q + minor * Q * q;
            *d = lam + 2 * minor * q;
            return;
        }
        double rr = lp->eps / lp->D;
        double f = darcy_f(ph, Re, rr);
        double r = f * lp->L / (lp->D * 2 * G * lp->A * lp->A);
        /* d(f*Q^2)/dQ = 2*f*Q + Q^2 * df/dRe * Re/Q */
        double dRe = Re * 1e-6;
        double df = (darcy_f(ph, Re + dRe, rr) - darcy_f(ph, Re - dRe, rr)) / (2 * dRe);
        *h = s * (r + minor) * q * q;
        *d = 2 * (r + minor) * q + r / f * q * q * df * Re / q;
        return;
    }
    double r = HW_K_SI * lp->L / (pow(lp->C, HW_EXP) * pow(lp->D, 4.87));
    if (q < QHW_LINEAR) {
        double a = (2 - HW_EXP) * r * pow(QHW_LINEAR, HW_EXP - 1);
        double b = (HW_EXP - 1) * r * pow(QHW_LINEAR, HW_EXP - 2);
        *h = a * Q + b * Q * q + minor * Q * q;
        *d = a + 2 * b * q + 2 * minor * q;
        return;
    }
    *h = s * r * pow(q, HW_EXP) + minor * Q * q;
    *d = HW_EXP * r * pow(q, HW_EXP - 1) + 2 * minor * q;
}

/* The pressure drop of a link's device at Q, and its slope, in head: a
 * valve or meter by its flow coefficient, a loss curve, a check valve
 * (its cracking pressure when closed, so it reopens only past it), or a
 * pump (a negative drop, read at Q >= 0). A PRV is the solver's. */
static void device_head(const Physics *ph, const LinkPhys *lp, double Q, double *h, double *d)
{
    *h = *d = 0;
    const Device *dv = &lp->device;
    if (!lp->has_device || dv->kind == DEVICE_PRV)
        return;
    double rg = ph->rho * G, dp = 0, slope = 0;
    DeviceStatus st;
    bool one_way = dv->kind == DEVICE_PUMP || dv->kind == DEVICE_HEAD_CURVE || dv->kind == DEVICE_CHECK_VALVE;
    if (dv->kind == DEVICE_CHECK_VALVE && Q <= 0) {
        *h = dv->cracking / rg;
        return;
    }
    if (!device_loss(dv, one_way && Q < 0 ? 0 : Q, ph->rho, &dp, &slope, &st)) {
        *h = NAN;
        return;
    }
    *h = dp / rg;
    *d = slope / rg;
}

static bool link_loss(void *ctx, size_t l, double Q, double *h, double *d)
{
    const Physics *ph = ctx;
    const LinkPhys *lp = &ph->links[l];
    pipe_loss(ph, lp, Q, h, d);
    double hd, dd;
    device_head(ph, lp, Q, &hd, &dd);
    *h += hd;
    *d += dd;
    return isfinite(*h) && isfinite(*d);
}

static bool need_dim(CallCtx *cx, const Value *v, Dim d, Pos at, const char *what)
{
    if (v->kind == VAL_NUMBER && dim_eq(v->q.dim, d) && v->q.temp == TEMP_NONE)
        return true;
    char want[96], got[96];
    dim_describe(d, TEMP_NONE, cx->units, want, sizeof want);
    value_describe(v, cx->units, got, sizeof got);
    diag_error(cx->diags, at, "%s must be %s, found %s", what, want, got);
    return false;
}

static bool field_si(CallCtx *cx, const Record *r, const char *name, Dim d, Pos at, const char *what, double *x)
{
    const Value *v = record_get(r, name);
    if (!v || v->kind != VAL_NUMBER || !dim_eq(v->q.dim, d)) {
        diag_error(cx->diags, at, "%s: the %s record has no usable '%s'", what, r->type, name);
        return false;
    }
    *x = v->q.si;
    return true;
}

/* K of a link's fittings at Reynolds number Re, plus its K column; false
 * (with an error at the fitting) when a kind cannot be used. */
static bool fittings_K(CallCtx *cx, const NetworkSpec *ns, const NetLink *lk, double K0, double D, double Re,
                       bool report, double *K)
{
    *K = K0;
    int m = ns->fittings ? fitting_method_parse(ns->fittings) : FIT_CRANE;
    for (size_t k = 0; k < lk->nfittings; k++) {
        const FittingItem *it = &lk->fittings[k];
        FittingKind fk = fitting_kind_parse(it->kind);
        if (fk == FIT_EXPANSION || fk == FIT_CONTRACTION) {
            diag_error(cx->diags, it->pos,
                       "fitting '%s' needs the other bore, which a link row cannot give; put its loss "
                       "coefficient in the K column (k_fitting(\"%s\", D, Re, D2=...))",
                       it->kind, fitting_kind_name(fk));
            return false;
        }
        double Kf;
        if (report) {
            Value args[3] = {value_string(it->kind), value_number(qty(D, DIM_L)), value_number(qty_number(Re))};
            Pos pos[3] = {it->pos, lk->pipe->pos, lk->pos};
            Value kw = value_string(ns->fittings ? ns->fittings : "crane"), v;
            if (!builtin_call(cx, fn_k_fitting, "k_fitting", it->pos, args, pos, 3, "method", ns->fittings ? &kw : NULL, &v))
                return false;
            Kf = v.q.si;
        } else {
            FittingInput in = {fk, D, Re, 0, -1, 0};
            if (fk == FIT_NONE || fitting_k((FittingMethod)m, &in, &Kf) != FIT_OK) {
                /* The reporting pass names the problem; start from the K column. */
                Value args[3] = {value_string(it->kind), value_number(qty(D, DIM_L)), value_number(qty_number(Re))};
                Pos pos[3] = {it->pos, lk->pipe->pos, lk->pos};
                Value kw = value_string(ns->fittings ? ns->fittings : "crane"), v;
                if (!builtin_call(cx, fn_k_fitting, "k_fitting", it->pos, args, pos, 3, "method", ns->fittings ? &kw : NULL, &v))
                    return false;
                Kf = v.q.si;
            }
        }
        *K += it->count * Kf;
    }
    return true;
}

static Value hinted(double si, Dim d, const char *us, const char *si_unit)
{
    return value_hinted(qty(si, d), us, si_unit);
}

static Record *node_record(CallCtx *cx, const NodeResult *n)
{
    Record *r = record_new(cx->arena, "node", n->has_load ? 5 : 4);
    record_set(r, 0, "head", value_number(qty(n->head, DIM_L)));
    record_set(r, 1, "p", value_number(qty(n->p, DIM_PRESSURE)));
    record_set(r, 2, "demand", value_number(qty(n->demand, DIM_FLOW)));
    record_set(r, 3, "elevation", value_number(qty(n->z, DIM_L)));
    if (n->has_load)
        record_set(r, 4, "load", value_number(qty_number(n->load)));
    return r;
}

static Record *link_record(CallCtx *cx, const LinkResult *g)
{
    Record *r = record_new(cx->arena, "link", 11);
    size_t k = 0;
    record_set(r, k++, "Q", value_number(qty(g->Q, DIM_FLOW)));
    record_set(r, k++, "V", value_number(qty(g->V, DIM_VELOCITY)));
    record_set(r, k++, "Re", value_number(qty_number(g->Re)));
    record_set(r, k++, "f", value_number(qty_number(g->f)));
    record_set(r, k++, "h_f", value_number(qty(g->h_f, DIM_L)));
    record_set(r, k++, "h_m", value_number(qty(g->h_m, DIM_L)));
    record_set(r, k++, "dp_device", value_number(qty(g->dp_device, DIM_PRESSURE)));
    record_set(r, k++, "D", hinted(g->D, DIM_L, "in", "mm"));
    record_set(r, k++, "L", value_number(qty(g->L, DIM_L)));
    record_set(r, k++, "K", value_number(qty_number(g->K)));
    static const char *const states[] = {"open", "closed", "active", "wide open"};
    record_set(r, k++, "state", value_string(states[g->state]));
    return r;
}

/* Read every cell into SI, reporting each bad one at its cell. */
static bool read_inputs(CallCtx *cx, const NetworkSpec *ns, const NetNodeInput *ni, const NetLinkInput *li,
                        NetworkResult *nr, Physics *ph, GradientLinkKind *kind, double *H, bool *fixed,
                        double *demand)
{
    bool ok = true;
    for (size_t i = 0; i < ns->nnodes; i++) {
        const NetNode *nd = &ns->nodes[i];
        NodeResult *o = &nr->nodes[i];
        o->id = nd->id;
        bool good = need_dim(cx, &ni[i].elevation, DIM_L, nd->elevation->pos, "elevation");
        if (nd->demand)
            good = need_dim(cx, &ni[i].demand, DIM_FLOW, nd->demand->pos, "demand") && good;
        if (nd->head)
            good = need_dim(cx, &ni[i].head, DIM_L, nd->head->pos, "head (the hydraulic grade, a length)") && good;
        if (nd->pressure)
            good = need_dim(cx, &ni[i].pressure, DIM_PRESSURE, nd->pressure->pos, "pressure") && good;
        if (ns->has_xy) {
            good = need_dim(cx, &ni[i].x, DIM_L, nd->x->pos, "x") && good;
            good = need_dim(cx, &ni[i].y, DIM_L, nd->y->pos, "y") && good;
        }
        if (!good) {
            ok = false;
            continue;
        }
        o->z = ni[i].elevation.q.si;
        o->supply = fixed[i] = nd->head || nd->pressure;
        if (nd->head)
            H[i] = ni[i].head.q.si;
        else if (nd->pressure)
            H[i] = o->z + ni[i].pressure.q.si / (nr->rho * G);
        demand[i] = nd->demand || ni[i].has_load ? ni[i].demand.q.si : 0;
        o->has_load = ni[i].has_load;
        o->load = ni[i].has_load ? ni[i].load : NAN;
        o->fixture_each = ni[i].fixture_each;
        o->fixture_total = ni[i].fixture_total;
        if (ns->has_xy) {
            o->x = ni[i].x.q.si;
            o->y = ni[i].y.q.si;
        }
    }
    for (size_t l = 0; l < ns->nlinks; l++) {
        const NetLink *lk = &ns->links[l];
        LinkPhys *lp = &ph->links[l];
        LinkResult *o = &nr->links[l];
        o->id = lk->id;
        o->from = (size_t)lk->from_node;
        o->to = (size_t)lk->to_node;
        kind[l] = GRADIENT_LINK_OPEN;
        bool good = need_dim(cx, &li[l].length, DIM_L, lk->length->pos, "length");
        if (li[l].pipe.kind != VAL_RECORD || strcmp(li[l].pipe.rec->type, "pipe") != 0) {
            char got[96];
            value_describe(&li[l].pipe, cx->units, got, sizeof got);
            diag_error(cx->diags, lk->pipe->pos, "pipe must be a pipe record (pipe(STANDARD, SIZE, CLASS) or bore(D, roughness)), found %s",
                       got);
            good = false;
        } else {
            good = field_si(cx, li[l].pipe.rec, "id", DIM_L, lk->pipe->pos, "pipe", &lp->D) && good;
            good = field_si(cx, li[l].pipe.rec, "roughness", DIM_L, lk->pipe->pos, "pipe", &lp->eps) && good;
        }
        if (lk->K)
            good = need_dim(cx, &li[l].K, DIM_NONE, lk->K->pos, "K") && good;
        if (lk->C)
            good = need_dim(cx, &li[l].C, DIM_NONE, lk->C->pos, "C") && good;
        if (!good) {
            ok = false;
            continue;
        }
        lp->L = li[l].length.q.si;
        if (!(lp->L > 0)) {
            diag_error(cx->diags, lk->length->pos, "length must be positive, found %s", lp->L == 0 ? "zero" : "a negative length");
            ok = false;
        }
        if (!(lp->D > 0) || !isfinite(lp->D)) {
            diag_error(cx->diags, lk->pipe->pos, "the pipe's bore must be positive");
            ok = false;
        }
        lp->K = lk->K ? li[l].K.q.si : 0;
        if (lk->K && !(lp->K >= 0)) {
            diag_error(cx->diags, lk->K->pos, "K cannot be negative");
            ok = false;
        }
        lp->C = lk->C ? li[l].C.q.si : NAN;
        if (!ph->darcy && !(lp->C > 0)) {
            diag_error(cx->diags, lk->C ? lk->C->pos : lk->pos, "the Hazen-Williams C must be positive");
            ok = false;
        }
        lp->A = PI * lp->D * lp->D / 4;
        o->D = lp->D;
        o->A = lp->A;
        o->L = lp->L;
        o->C = lp->C;
        if (lk->device) {
            /* prv(), cv(), kv(), check_valve(), a curve or a pump record */
            if (!device_from_value(cx, &li[l].device, lk->device->pos, "device", &lp->device)) {
                ok = false;
                continue;
            }
            lp->has_device = true;
            switch (lp->device.kind) {
            case DEVICE_PRV:
                kind[l] = GRADIENT_LINK_PRV;
                o->device = NET_DEVICE_PRV;
                break;
            case DEVICE_CHECK_VALVE:
                kind[l] = GRADIENT_LINK_ONE_WAY;
                o->device = NET_DEVICE_CHECK;
                break;
            case DEVICE_PUMP:
            case DEVICE_HEAD_CURVE:
                kind[l] = GRADIENT_LINK_ONE_WAY;
                o->device = NET_DEVICE_PUMP;
                break;
            case DEVICE_FLOW_COEFF:
            case DEVICE_LOSS_CURVE:
                o->device = NET_DEVICE_LOSS;
                break;
            }
        }
    }
    return ok;
}

bool network_solve(CallCtx *cx, const Stmt *s, const Value *fluid, const Value *tolerance, const NetNodeInput *ni,
                   const NetLinkInput *li, Value *out, const NetworkResult **result)
{
    const NetworkSpec *ns = s->network;
    Arena *a = cx->arena;
    if (fluid->kind != VAL_RECORD || strcmp(fluid->rec->type, "water") != 0) {
        char got[96];
        value_describe(fluid, cx->units, got, sizeof got);
        diag_error(cx->diags, ns->fluid->pos, "fluid must be a water record (water(T)), found %s", got);
        return false;
    }
    double rho, mu, tol = 1e-9;
    if (!field_si(cx, fluid->rec, "rho", DIM_DENSITY, ns->fluid->pos, "fluid", &rho) ||
        !field_si(cx, fluid->rec, "mu", DIM_DYN_VISC, ns->fluid->pos, "fluid", &mu))
        return false;
    if (ns->tolerance) {
        if (!need_dim(cx, tolerance, DIM_FLOW, ns->tolerance->pos, "tolerance"))
            return false;
        tol = tolerance->q.si;
        if (!(tol > 0) || !isfinite(tol)) {
            diag_error(cx->diags, ns->tolerance->pos, "tolerance must be a positive flow");
            return false;
        }
    }
    size_t nn = ns->nnodes, nl = ns->nlinks;
    NetworkResult *nr = arena_alloc(a, sizeof *nr);
    nr->nodes = arena_alloc(a, (nn + 1) * sizeof *nr->nodes);
    nr->links = arena_alloc(a, (nl + 1) * sizeof *nr->links);
    nr->nnodes = nn;
    nr->nlinks = nl;
    nr->rho = rho;
    nr->darcy = ns->loss == LOSS_DARCY;
    nr->has_xy = ns->has_xy;
    nr->tolerance = tol;

    Physics ph = {arena_alloc(a, (nl + 1) * sizeof *ph.links), mu / rho, rho, nr->darcy, FRICTION_COLEBROOK};
    if (ns->friction)
        ph.method = (FrictionMethod)friction_method_lookup(ns->friction);
    GradientLinkKind *kind = arena_alloc(a, (nl + 1) * sizeof *kind);
    double *H = arena_alloc(a, (nn + 1) * sizeof *H);
    bool *fixed = arena_alloc(a, (nn + 1) * sizeof *fixed);
    double *demand = arena_alloc(a, (nn + 1) * sizeof *demand);
    if (!read_inputs(cx, ns, ni, li, nr, &ph, kind, H, fixed, demand))
        return false;

    /* Start: every junction at the highest supply head, every link at
     * 0.3 m/s forward (about 1 ft/s), the usual starting point. */
    double Hmax = -INFINITY;
    for (size_t i = 0; i < nn; i++)
        if (fixed[i] && H[i] > Hmax)
            Hmax = H[i];
    for (size_t i = 0; i < nn; i++)
        if (!fixed[i])
            H[i] = Hmax;
    double *Q = arena_alloc(a, (nl + 1) * sizeof *Q);
    double *drop = arena_alloc(a, (nl + 1) * sizeof *drop);
    /* A PRV holds its outlet node at z + (set - falloff)/(rho*g) and takes
     * at least dp_min (methods/devices.h), both as heads. */
    double *set_head = arena_alloc(a, (nl + 1) * sizeof *set_head);
    double *min_drop = arena_alloc(a, (nl + 1) * sizeof *min_drop);
    for (size_t l = 0; l < nl; l++)
        if (kind[l] == GRADIENT_LINK_PRV) {
            const Device *dv = &ph.links[l].device;
            set_head[l] = nr->nodes[nr->links[l].to].z + (dv->set - dv->falloff) / (rho * G);
            min_drop[l] = dv->dp_min / (rho * G);
        }
    GradientLinkState *state = arena_alloc(a, (nl + 1) * sizeof *state);
    for (size_t l = 0; l < nl; l++)
        Q[l] = 0.3 * ph.links[l].A;
    double *K0 = arena_alloc(a, (nl + 1) * sizeof *K0);
    for (size_t l = 0; l < nl; l++) {
        K0[l] = ph.links[l].K;
        double Re = 0.3 * ph.links[l].D / ph.nu;
        if (!fittings_K(cx, ns, &ns->links[l], K0[l], ph.links[l].D, Re, false, &ph.links[l].K))
            return false;
    }

    GradientNetwork net = {nn, nl, NULL, NULL, fixed, demand, kind, set_head, min_drop, link_loss, &ph, tol, MAX_ITERATIONS};
    size_t *from = arena_alloc(a, (nl + 1) * sizeof *from), *to = arena_alloc(a, (nl + 1) * sizeof *to);
    for (size_t l = 0; l < nl; l++) {
        from[l] = nr->links[l].from;
        to[l] = nr->links[l].to;
    }
    net.from = from;
    net.to = to;
    GradientResult gr;
    GradientStatus st = GRADIENT_OK;
    int total = 0;
    /* Fittings whose K depends on Re (2-K, 3-K) are re-evaluated at the
     * solved flows until they settle. */
    for (int pass = 0; pass < MAX_FITTING_PASSES; pass++) {
        st = gradient_solve(&net, H, Q, state, drop, &gr);
        total += gr.iterations;
        if (st != GRADIENT_OK)
            break;
        bool settled = true;
        for (size_t l = 0; l < nl; l++) {
            if (ns->links[l].nfittings == 0)
                continue;
            double Re = fabs(Q[l]) * ph.links[l].D / (ph.links[l].A * ph.nu);
            double K;
            if (!fittings_K(cx, ns, &ns->links[l], K0[l], ph.links[l].D, Re > 1 ? Re : 1, false, &K))
                return false;
            if (fabs(K - ph.links[l].K) > 1e-12 * (1 + K))
                settled = false;
            ph.links[l].K = K;
        }
        if (settled)
            break;
    }
    gr.iterations = total;
    switch (st) {
    case GRADIENT_OK:
        break;
    case GRADIENT_NO_CONVERGENCE: {
        const NetNode *w = &ns->nodes[gr.imbalance_node];
        Unit u = unit_default(DIM_FLOW, TEMP_NONE, cx->units);
        char b1[48], b2[48];
        num_sig(unit_from_si(gr.imbalance, &u, true), 4, b1, sizeof b1);
        num_sig(unit_from_si(tol, &u, true), 4, b2, sizeof b2);
        diag_error(cx->diags, w->pos,
                   "network '%s' did not converge in %d iterations: the largest imbalance is %s %s at node '%s' "
                   "(tolerance %s %s)",
                   s->name, gr.iterations, b1, u.text, w->id, b2, u.text);
        return false;
    }
    case GRADIENT_SINGULAR:
        diag_error(cx->diags, s->pos,
                   "network '%s': part of the network has no open path to a supply (closed check valves or pumps)",
                   s->name);
        return false;
    case GRADIENT_NOT_FINITE:
        diag_error(cx->diags, s->pos, "network '%s': a link's head loss is not finite during the solve", s->name);
        return false;
    case GRADIENT_NO_MEMORY:
        diag_error(cx->diags, s->pos, "network '%s': out of memory in the sparse solve", s->name);
        return false;
    case GRADIENT_NO_LIBRARY:
        diag_error(cx->diags, s->pos, "network '%s' cannot be solved: %s", s->name, gr.no_library);
        return false;
    }
    nr->iterations = gr.iterations;
    nr->imbalance = gr.imbalance;
    nr->imbalance_node = gr.imbalance_node;
    nr->last_change = gr.last_change;
    nr->energy_residual = gr.energy_residual;

    /* Final pass: each link through the library, as a path row would be. */
    bool ok = true;
    for (size_t l = 0; l < nl; l++) {
        const NetLink *lk = &ns->links[l];
        const LinkPhys *lp = &ph.links[l];
        LinkResult *o = &nr->links[l];
        o->Q = state[l] == GRADIENT_STATE_CLOSED ? 0 : Q[l];
        o->state = (int)state[l];
        double q = fabs(o->Q);
        o->V = o->Q / lp->A;
        o->Re = q * lp->D / (lp->A * ph.nu);
        double hv = o->V * o->V / (2 * G);
        Value v;
        if (nr->darcy) {
            if (o->Re > 0) {
                /* Through the library, for the method, its reference and
                 * its validity warnings; in the transition zone at both
                 * ends of the line the link's f is taken from. */
                bool tr = in_transition(&ph, o->Re);
                double at[2] = {tr ? FRICTION_RE_LAMINAR * (1 - 1e-9) : o->Re, FRICTION_RE_TURBULENT};
                for (int e = 0; e < (tr ? 2 : 1) && ok; e++) {
                    Value args[2] = {value_number(qty_number(at[e])), value_number(qty_number(lp->eps / lp->D))};
                    Pos pos[2] = {lk->pos, lk->pipe->pos};
                    Value kw = value_string(ns->friction ? ns->friction : "colebrook");
                    if (!builtin_call(cx, fn_friction_factor, "friction_factor", lk->pos, args, pos, 2, "method", ns->friction ? &kw : NULL,
                                      &v))
                        ok = false;
                }
                if (!ok)
                    continue;
                o->f = tr ? darcy_f(&ph, o->Re, lp->eps / lp->D) : v.q.si;
                if (tr) {
                    char b1[48];
                    num_sig(o->Re, 4, b1, sizeof b1);
                    diag_warning(cx->diags, lk->pos,
                                 "link '%s': Re = %s is in the transition zone 2000 ≤ Re < 4000, where no correlation is "
                                 "reliable; f is taken on a straight line in Re from 64/Re at 2000 to %s at 4000",
                                 lk->id, b1, friction_method_name(ph.method));
                }
            } else {
                o->f = NAN;
            }
            o->h_f = o->Re > 0 ? o->f * lp->L / lp->D * hv : 0;
        } else {
            o->f = NAN;
            if (q > 0) {
                Value args[4] = {value_number(qty(q, DIM_FLOW)), value_number(qty_number(lp->C)),
                                 value_number(qty(lp->D, DIM_L)), value_number(qty(lp->L, DIM_L))};
                Pos pos[4] = {lk->pos, lk->C->pos, lk->pipe->pos, lk->length->pos};
                if (!builtin_call(cx, fn_hazen_williams, "hazen_williams", lk->pos, args, pos, 4, NULL, NULL, &v)) {
                    ok = false;
                    continue;
                }
            }
            double h, d;
            LinkPhys bare = *lp;
            bare.K = 0;
            pipe_loss(&ph, &bare, q, &h, &d);
            o->h_f = h;
        }
        if (lk->nfittings && !fittings_K(cx, ns, lk, K0[l], lp->D, o->Re > 1 ? o->Re : 1, true, &o->K)) {
            ok = false;
            continue;
        }
        if (!lk->nfittings)
            o->K = lp->K;
        o->h_m = o->K * hv;
        if (lp->has_device) {
            /* Through the library, for its method and its warnings (a pump
             * read outside its points, a PRV that cannot reach its
             * setting); the valve sits at the link's outlet. */
            double p_in = rho * G * (H[o->from] - o->h_f - o->h_m - nr->nodes[o->to].z), p_out;
            DeviceStatus dst;
            if (state[l] != GRADIENT_STATE_CLOSED &&
                !device_step(cx, &lp->device, lk->device->pos, o->Q, p_in, rho, &p_out, &dst)) {
                ok = false;
                continue;
            }
            if (lp->device.kind == DEVICE_PRV) {
                o->dp_device = rho * G * drop[l];
            } else if (state[l] == GRADIENT_STATE_CLOSED) {
                o->dp_device = 0;
            } else {
                double hd, dd;
                device_head(&ph, lp, o->Q, &hd, &dd);
                o->dp_device = rho * G * hd;
            }
        }
    }
    if (!ok)
        return false;
    for (size_t i = 0; i < nn; i++) {
        NodeResult *o = &nr->nodes[i];
        o->head = H[i];
        o->p = rho * G * (H[i] - o->z);
        o->demand = demand[i];
    }
    /* A supply's demand is what it delivers, as a negative demand. */
    for (size_t l = 0; l < nl; l++) {
        const LinkResult *g = &nr->links[l];
        if (nr->nodes[g->from].supply)
            nr->nodes[g->from].demand -= g->Q;
        if (nr->nodes[g->to].supply)
            nr->nodes[g->to].demand += g->Q;
    }
    bool any = false;
    for (size_t i = 0; i < nn; i++)
        if (!nr->nodes[i].supply && (!any || nr->nodes[i].p < nr->p_min)) {
            nr->p_min = nr->nodes[i].p;
            nr->p_min_node = i;
            any = true;
        }
    if (!any) {
        nr->p_min = NAN;
    }
    for (size_t l = 0; l < nl; l++)
        if (l == 0 || fabs(nr->links[l].V) > nr->V_max) {
            nr->V_max = fabs(nr->links[l].V);
            nr->V_max_link = l;
        }

    Record *r = record_new(a, "network", 7 + nn + nl);
    size_t k = 0;
    record_set(r, k++, "p_min", value_number(qty(nr->p_min, DIM_PRESSURE)));
    record_set(r, k++, "p_min_at", value_string(any ? nr->nodes[nr->p_min_node].id : ""));
    record_set(r, k++, "V_max", value_number(qty(nr->V_max, DIM_VELOCITY)));
    record_set(r, k++, "V_max_at", value_string(nr->links[nr->V_max_link].id));
    record_set(r, k++, "iterations", value_number(qty_number(nr->iterations)));
    record_set(r, k++, "imbalance", value_number(qty(nr->imbalance, DIM_FLOW)));
    record_set(r, k++, "tolerance", value_number(qty(nr->tolerance, DIM_FLOW)));
    for (size_t i = 0; i < nn; i++) {
        Value nv = {0};
        nv.kind = VAL_RECORD;
        nv.rec = node_record(cx, &nr->nodes[i]);
        record_set(r, k++, ns->nodes[i].field, nv);
    }
    for (size_t l = 0; l < nl; l++) {
        Value lv = {0};
        lv.kind = VAL_RECORD;
        lv.rec = link_record(cx, &nr->links[l]);
        record_set(r, k++, ns->links[l].field, lv);
    }
    r->native = nr;
    out->kind = VAL_RECORD;
    out->rec = r;
    out->str = NULL;
    *result = nr;
    return true;
}
