/* devices_lib.c — the calc functions prv, cv, kv, check_valve and bore, the
 * record a ```curve block binds, and devices as values of paths and
 * networks.
 *
 * Glue between the evaluator and methods/devices.c and methods/curves.c:
 * arguments are checked with the arg_* helpers, a device record carries its
 * Device as native data, and device_step applies one with the method named
 * for the report and a warning beside the line wherever a result rests on
 * an extrapolation or a valve is out of its working range. */
#include "methods/devices_lib.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "numfmt.h"
#include "solve.h"

/* ---- the published methods ------------------------------------------- */

static const Method METHOD_PRV = {
    "prv",
    "Pressure-reducing valve: outlet held at the set pressure less its fall-off",
    "p_out = min(p_set - p_falloff, p_in - Delta_p_min)",
    "an inlet pressure, less the least drop, at or above the set pressure less the fall-off "
    "(regulating); fall-off and least drop at the flow from the manufacturer's data",
    "Direct-acting water pressure-reducing valve as rated under ASSE 1003/CSA B356, Water "
    "Pressure Reducing Valves for Potable Water Distribution Systems (reduced-pressure deviation "
    "under flow); the manufacturer's flow chart governs the fall-off.",
};

static const Method METHOD_CV = {
    "valve_cv",
    "Valve or meter by its flow coefficient Cv (non-choked turbulent liquid flow)",
    "Delta_p = SG*(Q/C_v)^2",
    "turbulent, non-choked flow of a liquid (no cavitation or flashing); Q in gal/min, Δp "
    "in psi, SG = ρ/ρ₀ with ρ₀ of water at 60 °F",
    "ANSI/ISA-75.01.01-2007 (IEC 60534-2-1 Mod), Flow Equations for Sizing Control Valves, "
    "eq. 1, Q = N₁·C·√(Δp/(ρ₁/ρ₀)) with N₁ = 1 for gal/min and psi.",
};

static const Method METHOD_KV = {
    "valve_kv",
    "Valve or meter by its flow coefficient Kv (non-choked turbulent liquid flow)",
    "Delta_p = SG*(Q/K_v)^2",
    "turbulent, non-choked flow of a liquid (no cavitation or flashing); Q in m³/h, Δp in "
    "bar, SG = ρ/ρ₀ with ρ₀ of water at 15 °C",
    "IEC 60534-2-1:2011 and ANSI/ISA-75.01.01-2007, Flow Equations for Sizing Control Valves, "
    "eq. 1, Q = N₁·C·√(Δp/(ρ₁/ρ₀)) with N₁ = 1 for m³/h and bar.",
};

static const Method METHOD_CHECK = {
    "check_valve",
    "Check valve: cracking pressure plus the loss of its flow coefficient, closed to reverse flow",
    "Delta_p = Delta_p_crack + SG*(Q/C_v)^2",
    "forward flow with the valve fully open; cracking pressure and Cv from the manufacturer",
    "Flow-coefficient relation of ANSI/ISA-75.01.01-2007, eq. 1, added to the cracking pressure "
    "the manufacturer states.",
};

static const Method METHOD_CURVE_LINEAR = {
    "curve_linear",
    "Tabulated curve, linear interpolation",
    "y = y_1 + (x - x_1)*(y_2 - y_1)/(x_2 - x_1)",
    "between the table's first and last points (beyond them: the end interval extrapolated)",
    "Linear interpolation between the two table points that bracket x; the table is the calc's "
    "own (manufacturer's data as entered).",
};

static const Method METHOD_CURVE_LOGLOG = {
    "curve_loglog",
    "Tabulated curve, log-log interpolation (a power law between points)",
    "y = y_1*(x/x_1)^(ln(y_2/y_1)/ln(x_2/x_1))",
    "x and y above zero; between the table's first and last points (beyond them: the end "
    "interval extrapolated)",
    "Straight-line interpolation on logarithmic axes between the two table points that bracket "
    "x; the table is the calc's own (manufacturer's data as entered).",
};

const Method *curve_method(CurveInterp interp)
{
    return interp == CURVE_LOGLOG ? &METHOD_CURVE_LOGLOG : &METHOD_CURVE_LINEAR;
}

/* ---- helpers ----------------------------------------------------------- */

static const char *show(UnitSystem sys, double si, Dim d, TempKind temp, char *buf, size_t n)
{
    Unit u = unit_default(d, temp, sys);
    char num[48];
    num_sig(unit_from_si(si, &u, temp == TEMP_NONE), 4, num, sizeof num);
    if (u.text[0] && strcmp(u.text, "1") != 0)
        snprintf(buf, n, "%s %s", num, u.text);
    else
        snprintf(buf, n, "%s", num);
    return buf;
}

/* An optional keyword number of one dimension; *si keeps its default. */
static bool kw_quantity(CallCtx *cx, const CallArgs *a, const char *name, Dim want, double *si, bool *given,
                        Pos *where)
{
    Pos p = a->pos;
    const Value *v = kw_get(a, name, &p);
    if (given)
        *given = v != NULL;
    if (where)
        *where = p;
    if (!v)
        return true;
    if (v->kind != VAL_NUMBER || !dim_eq(v->q.dim, want) || v->q.temp != TEMP_NONE) {
        char want_s[96], got_s[96];
        dim_describe(want, TEMP_NONE, cx->units, want_s, sizeof want_s);
        value_describe(v, cx->units, got_s, sizeof got_s);
        diag_error(cx->diags, p, "%s: %s= must be %s, found %s", a->name, name, want_s, got_s);
        return false;
    }
    *si = v->q.si;
    return true;
}

static Value pressure(double p)
{
    return value_hinted(qty(p, DIM_PRESSURE), "psi", "kPa");
}

static Value device_value(CallCtx *cx, Device *d, const char *kind, size_t nfields, Record **rec)
{
    Record *r = record_new(cx->arena, "device", nfields + 1);
    record_set(r, 0, "kind", value_string(kind));
    r->native = d;
    *rec = r;
    return (Value){.kind = VAL_RECORD, .rec = r};
}

/* ---- prv(SET [, falloff=P] [, dp_min=P]) ------------------------------ */

bool fn_prv(CallCtx *cx, const CallArgs *a, Value *out)
{
    Device *d = arena_alloc(cx->arena, sizeof *d);
    d->kind = DEVICE_PRV;
    Pos fp, mp;
    char b[96];
    if (!arg_number(cx, a, 0, DIM_PRESSURE, "set pressure", &d->set) ||
        !kw_quantity(cx, a, "falloff", DIM_PRESSURE, &d->falloff, NULL, &fp) ||
        !kw_quantity(cx, a, "dp_min", DIM_PRESSURE, &d->dp_min, NULL, &mp))
        return false;
    if (!(d->set > 0)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: the set pressure must be above zero (gauge), found %s", a->name,
                   show(cx->units, d->set, DIM_PRESSURE, TEMP_NONE, b, sizeof b));
        return false;
    }
    if (!(d->falloff >= 0) || !(d->falloff < d->set)) {
        diag_error(cx->diags, fp, "%s: falloff= must be zero or more and below the set pressure, found %s", a->name,
                   show(cx->units, d->falloff, DIM_PRESSURE, TEMP_NONE, b, sizeof b));
        return false;
    }
    if (!(d->dp_min >= 0)) {
        diag_error(cx->diags, mp, "%s: dp_min= must be zero or more, found %s", a->name,
                   show(cx->units, d->dp_min, DIM_PRESSURE, TEMP_NONE, b, sizeof b));
        return false;
    }
    call_use_method(cx, &METHOD_PRV);
    Record *r;
    *out = device_value(cx, d, "prv", 3, &r);
    record_set(r, 1, "set", pressure(d->set));
    record_set(r, 2, "falloff", pressure(d->falloff));
    record_set(r, 3, "dp_min", pressure(d->dp_min));
    return true;
}

/* ---- cv(CV), kv(KV) ----------------------------------------------------- */

static bool coefficient(CallCtx *cx, const CallArgs *a, size_t i, const char *what, double *c)
{
    char b[96];
    if (!arg_dimensionless(cx, a, i, what, c))
        return false;
    if (!(*c > 0) || !isfinite(*c)) {
        diag_error(cx->diags, arg_at(a, i), "%s: the flow coefficient must be above zero, found %s", a->name,
                   show(cx->units, *c, DIM_NONE, TEMP_NONE, b, sizeof b));
        return false;
    }
    return true;
}

bool fn_cv(CallCtx *cx, const CallArgs *a, Value *out)
{
    double c;
    if (!coefficient(cx, a, 0, "flow coefficient Cv in gal/min per psi^0.5", &c))
        return false;
    Device *d = arena_alloc(cx->arena, sizeof *d);
    d->kind = DEVICE_FLOW_COEFF;
    d->coeff = device_coeff_from_cv(c);
    d->rho_ref = device_rho_ref_cv();
    call_use_method(cx, &METHOD_CV);
    Record *r;
    *out = device_value(cx, d, "cv", 2, &r);
    record_set(r, 1, "Cv", value_number(qty_number(c)));
    record_set(r, 2, "Kv", value_number(qty_number(d->coeff / device_coeff_from_kv(1.0))));
    return true;
}

bool fn_kv(CallCtx *cx, const CallArgs *a, Value *out)
{
    double c;
    if (!coefficient(cx, a, 0, "flow coefficient Kv in m^3/h per bar^0.5", &c))
        return false;
    Device *d = arena_alloc(cx->arena, sizeof *d);
    d->kind = DEVICE_FLOW_COEFF;
    d->coeff = device_coeff_from_kv(c);
    d->rho_ref = device_rho_ref_kv();
    d->by_kv = true;
    call_use_method(cx, &METHOD_KV);
    Record *r;
    *out = device_value(cx, d, "kv", 2, &r);
    record_set(r, 1, "Kv", value_number(qty_number(c)));
    record_set(r, 2, "Cv", value_number(qty_number(d->coeff / device_coeff_from_cv(1.0))));
    return true;
}

/* ---- check_valve([cracking=P] [, cv=CV | kv=KV]) ----------------------- */

bool fn_check_valve(CallCtx *cx, const CallArgs *a, Value *out)
{
    Device *d = arena_alloc(cx->arena, sizeof *d);
    d->kind = DEVICE_CHECK_VALVE;
    Pos cp, vp, kp;
    bool has_cv, has_kv;
    double cv = 0, kv = 0;
    char b[96];
    if (!kw_quantity(cx, a, "cracking", DIM_PRESSURE, &d->cracking, NULL, &cp) ||
        !kw_quantity(cx, a, "cv", DIM_NONE, &cv, &has_cv, &vp) ||
        !kw_quantity(cx, a, "kv", DIM_NONE, &kv, &has_kv, &kp))
        return false;
    if (!(d->cracking >= 0)) {
        diag_error(cx->diags, cp, "%s: cracking= must be zero or more, found %s", a->name,
                   show(cx->units, d->cracking, DIM_PRESSURE, TEMP_NONE, b, sizeof b));
        return false;
    }
    if (has_cv && has_kv) {
        diag_error(cx->diags, kp, "%s: give the flow coefficient once, as cv= or as kv=, not both", a->name);
        return false;
    }
    if ((has_cv && !(cv > 0)) || (has_kv && !(kv > 0))) {
        diag_error(cx->diags, has_cv ? vp : kp, "%s: the flow coefficient must be above zero, found %s", a->name,
                   show(cx->units, has_cv ? cv : kv, DIM_NONE, TEMP_NONE, b, sizeof b));
        return false;
    }
    if (has_cv) {
        d->coeff = device_coeff_from_cv(cv);
        d->rho_ref = device_rho_ref_cv();
    } else if (has_kv) {
        d->coeff = device_coeff_from_kv(kv);
        d->rho_ref = device_rho_ref_kv();
        d->by_kv = true;
    }
    call_use_method(cx, &METHOD_CHECK);
    Record *r;
    *out = device_value(cx, d, "check_valve", 2, &r);
    record_set(r, 1, "cracking", pressure(d->cracking));
    record_set(r, 2, "Cv", value_number(qty_number(d->coeff > 0 ? d->coeff / device_coeff_from_cv(1.0) : 0.0)));
    return true;
}

/* ---- bore(D, roughness [, od=, wall=, E=]) ------------------------------ */

/* A pipe record from a plain inside diameter, for tube no built-in table
 * covers. od and wall follow from each other (od = D + 2*wall); E is the
 * pipe material's elastic modulus (for wave_speed). Fields it cannot know
 * are left out, so a function that needs them says so. */
bool fn_bore(CallCtx *cx, const CallArgs *a, Value *out)
{
    double D, eps, od = 0, wall = 0, E = 0;
    bool has_od, has_wall, has_E;
    Pos op, wp, ep;
    char b1[96], b2[96];
    if (!arg_number(cx, a, 0, DIM_L, "inside diameter", &D) || !arg_number(cx, a, 1, DIM_L, "roughness", &eps) ||
        !kw_quantity(cx, a, "od", DIM_L, &od, &has_od, &op) || !kw_quantity(cx, a, "wall", DIM_L, &wall, &has_wall, &wp) ||
        !kw_quantity(cx, a, "E", DIM_PRESSURE, &E, &has_E, &ep))
        return false;
    if (!(D > 0) || !isfinite(D)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: the inside diameter must be above zero, found %s", a->name,
                   show(cx->units, D, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(eps >= 0) || !(eps < D / 2)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: the roughness must be zero or more and below the radius, found %s",
                   a->name, show(cx->units, eps, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (has_wall && !(wall > 0)) {
        diag_error(cx->diags, wp, "%s: wall= must be above zero, found %s", a->name,
                   show(cx->units, wall, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (has_od && !(od > D)) {
        diag_error(cx->diags, op, "%s: od= must be larger than the inside diameter %s, found %s", a->name,
                   show(cx->units, D, DIM_L, TEMP_NONE, b1, sizeof b1), show(cx->units, od, DIM_L, TEMP_NONE, b2, sizeof b2));
        return false;
    }
    if (has_od && has_wall && fabs(od - D - 2 * wall) > 1e-9 * od) {
        diag_error(cx->diags, wp, "%s: od= and wall= disagree with the inside diameter: od - 2*wall = %s, D = %s",
                   a->name, show(cx->units, od - 2 * wall, DIM_L, TEMP_NONE, b1, sizeof b1),
                   show(cx->units, D, DIM_L, TEMP_NONE, b2, sizeof b2));
        return false;
    }
    if (has_E && !(E > 0)) {
        diag_error(cx->diags, ep, "%s: E= (the elastic modulus) must be above zero, found %s", a->name,
                   show(cx->units, E, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (has_od && !has_wall)
        wall = (od - D) / 2;
    if (has_wall && !has_od)
        od = D + 2 * wall;
    bool geometry = has_od || has_wall;
    Record *r = record_new(cx->arena, "pipe", 5 + (geometry ? 3 : 0) + (has_E ? 1 : 0));
    size_t i = 0;
    if (geometry)
        record_set(r, i++, "od", value_hinted(qty(od, DIM_L), "in", "mm"));
    record_set(r, i++, "id", value_hinted(qty(D, DIM_L), "in", "mm"));
    if (geometry)
        record_set(r, i++, "wall", value_hinted(qty(wall, DIM_L), "in", "mm"));
    record_set(r, i++, "area", value_hinted(qty(CONST_PI * D * D / 4, DIM_AREA), "in^2", "mm^2"));
    record_set(r, i++, "roughness", value_hinted(qty(eps, DIM_L), "in", "mm"));
    if (has_E)
        record_set(r, i++, "E", value_hinted(qty(E, DIM_PRESSURE), "psi", "MPa"));
    if (geometry)
        record_set(r, i++, "sdr", value_number(qty_number(od / wall)));
    record_set(r, i++, "material", value_string("bore"));
    record_set(r, i++, "standard", value_string("bore"));
    r->nfields = i;
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

/* ---- curves ------------------------------------------------------------- */

static bool curve_call(CallCtx *cx, const Record *self, const CallArgs *a, Value *out)
{
    const CurveData *cd = self->native;
    if (a->n != 1 || a->nkw) {
        diag_error(cx->diags, a->pos, "%s: a curve takes one argument, found %zu", a->name, a->n + a->nkw);
        return false;
    }
    const Value *v = &a->args[0];
    if (v->kind != VAL_NUMBER || !dim_eq(v->q.dim, cd->x_dim) || (v->q.temp == TEMP_NONE) != (cd->x_temp == TEMP_NONE)) {
        char want[96], got[96];
        dim_describe(cd->x_dim, cd->x_temp, cx->units, want, sizeof want);
        value_describe(v, cx->units, got, sizeof got);
        diag_error(cx->diags, arg_at(a, 0), "%s: the curve's argument must be %s, found %s", a->name, want, got);
        return false;
    }
    double x = v->q.si;
    char b1[96], b2[96], b3[96];
    if (cd->curve.interp == CURVE_LOGLOG && !(x > 0)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: a log-log curve is read at arguments above zero, found %s", a->name,
                   show(cx->units, x, cd->x_dim, cd->x_temp, b1, sizeof b1));
        return false;
    }
    call_use_method(cx, curve_method(cd->curve.interp));
    int side = curve_side(&cd->curve, x);
    if (side)
        diag_warning(cx->diags, a->pos, "%s: %s is %s the curve's table (%s to %s); the end interval is extrapolated",
                     a->name, show(cx->units, x, cd->x_dim, cd->x_temp, b1, sizeof b1), side < 0 ? "below" : "above",
                     show(cx->units, cd->curve.x[0], cd->x_dim, cd->x_temp, b2, sizeof b2),
                     show(cx->units, cd->curve.x[cd->curve.n - 1], cd->x_dim, cd->x_temp, b3, sizeof b3));
    double y = curve_eval(&cd->curve, x, NULL);
    if (!isfinite(y)) {
        diag_error(cx->diags, a->pos, "%s: the curve's value at %s is not finite", a->name,
                   show(cx->units, x, cd->x_dim, cd->x_temp, b1, sizeof b1));
        return false;
    }
    Quantity q = qty(y, cd->y_dim);
    q.temp = cd->y_temp;
    *out = value_number(q);
    return true;
}

Record *curve_record_new(Arena *arena, const CurveData *cd)
{
    Record *r = record_new(arena, "curve", 3);
    Quantity lo = qty(cd->curve.x[0], cd->x_dim), hi = qty(cd->curve.x[cd->curve.n - 1], cd->x_dim);
    lo.temp = hi.temp = cd->x_temp;
    record_set(r, 0, "x_min", value_number(lo));
    record_set(r, 1, "x_max", value_number(hi));
    record_set(r, 2, "points", value_number(qty_number((double)cd->curve.n)));
    r->native = cd;
    r->call = curve_call;
    return r;
}

const CurveData *curve_of(const Value *v)
{
    if (v->kind == VAL_RECORD && v->rec && strcmp(v->rec->type, "curve") == 0)
        return v->rec->native;
    return NULL;
}

/* ---- devices as values --------------------------------------------------- */

bool device_from_value(CallCtx *cx, const Value *v, Pos at, const char *what, Device *d)
{
    memset(d, 0, sizeof *d);
    if (v->kind == VAL_RECORD && strcmp(v->rec->type, "device") == 0 && v->rec->native) {
        *d = *(const Device *)v->rec->native;
        return true;
    }
    if (v->kind == VAL_RECORD && strcmp(v->rec->type, "pump") == 0 && v->rec->native) {
        d->kind = DEVICE_PUMP;
        d->pump = v->rec->native;
        return true;
    }
    const CurveData *cd = curve_of(v);
    if (cd) {
        bool flow = dim_eq(cd->x_dim, DIM_FLOW) && cd->x_temp == TEMP_NONE;
        if (flow && dim_eq(cd->y_dim, DIM_PRESSURE) && cd->y_temp == TEMP_NONE) {
            d->kind = DEVICE_LOSS_CURVE;
            d->curve = &cd->curve;
            return true;
        }
        if (flow && dim_eq(cd->y_dim, DIM_L)) {
            d->kind = DEVICE_HEAD_CURVE;
            d->curve = &cd->curve;
            return true;
        }
        char xs[96], ys[96];
        dim_describe(cd->x_dim, cd->x_temp, cx->units, xs, sizeof xs);
        dim_describe(cd->y_dim, cd->y_temp, cx->units, ys, sizeof ys);
        diag_error(cx->diags, at,
                   "%s: curve '%s' gives %s against %s; a device curve gives a pressure drop (a loss) or a head "
                   "(a pump) against flow",
                   what, cd->name, ys, xs);
        return false;
    }
    char got[96];
    value_describe(v, cx->units, got, sizeof got);
    diag_error(cx->diags, at,
               "%s must be a device (prv(...), cv(...), kv(...), check_valve(...)), a curve of pressure drop or "
               "head against flow, or a pump (pump_curve(...)), found %s",
               what, got);
    return false;
}

static const Method *device_method(const Device *d)
{
    switch (d->kind) {
    case DEVICE_PRV: return &METHOD_PRV;
    case DEVICE_FLOW_COEFF: return d->by_kv ? &METHOD_KV : &METHOD_CV;
    case DEVICE_CHECK_VALVE: return &METHOD_CHECK;
    case DEVICE_LOSS_CURVE:
    case DEVICE_HEAD_CURVE: return curve_method(d->curve->interp);
    case DEVICE_PUMP: return NULL; /* named by the pump record's own method */
    }
    return NULL;
}

bool device_step(CallCtx *cx, const Device *d, Pos at, double Q, double p_in, double rho, double *p_out,
                 DeviceStatus *status)
{
    char b1[96], b2[96], b3[96];
    const Method *m = device_method(d);
    if (m)
        call_use_method(cx, m);
    if (d->kind == DEVICE_PUMP && d->pump) {
        double span = d->pump->q_max - d->pump->q_min;
        if (Q < d->pump->q_min - 1e-9 * span || Q > d->pump->q_max + 1e-9 * span)
            diag_warning(cx->diags, at, "pump: Q = %s is outside the pump curve's points (%s to %s); the quadratic is "
                         "extrapolated there",
                         show(cx->units, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1),
                         show(cx->units, d->pump->q_min, DIM_FLOW, TEMP_NONE, b2, sizeof b2),
                         show(cx->units, d->pump->q_max, DIM_FLOW, TEMP_NONE, b3, sizeof b3));
    }
    if ((d->kind == DEVICE_LOSS_CURVE || d->kind == DEVICE_HEAD_CURVE) && curve_side(d->curve, Q)) {
        diag_warning(cx->diags, at, "device curve: Q = %s is %s the curve's table (%s to %s); the end interval is "
                     "extrapolated",
                     show(cx->units, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1), curve_side(d->curve, Q) < 0 ? "below" : "above",
                     show(cx->units, d->curve->x[0], DIM_FLOW, TEMP_NONE, b2, sizeof b2),
                     show(cx->units, d->curve->x[d->curve->n - 1], DIM_FLOW, TEMP_NONE, b3, sizeof b3));
    }
    DeviceStatus st = device_apply(d, Q, p_in, rho, p_out);
    *status = st;
    switch (st) {
    case DEVICE_OK:
        return true;
    case DEVICE_NOT_REGULATING:
        diag_warning(cx->diags, at,
                     "prv: not regulating: the inlet pressure %s less the least drop %s is below the set pressure less "
                     "fall-off %s; the valve stands wide open",
                     show(cx->units, p_in, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1),
                     show(cx->units, d->dp_min, DIM_PRESSURE, TEMP_NONE, b2, sizeof b2),
                     show(cx->units, d->set - d->falloff, DIM_PRESSURE, TEMP_NONE, b3, sizeof b3));
        return true;
    case DEVICE_CLOSED:
        diag_warning(cx->diags, at, "check_valve: the flow %s is not forward; the valve is closed",
                     show(cx->units, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
        return true;
    case DEVICE_NOT_FINITE:
        break;
    }
    diag_error(cx->diags, at, "the pressure after the device is not finite (flow %s)",
               show(cx->units, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
    return false;
}

/* ---- operating point on a tabulated pump curve ---------------------------- */

static const Method METHOD_OPERATING_CURVE = {
    "pump_operating_point_table",
    "Pump operating point on a tabulated pump curve",
    "H_pump = H_static + k*Q^2",
    "Q ≥ 0; within the curve's table (beyond it: the end interval extrapolated)",
    "Intersection of the tabulated pump curve with the system curve H = H_static + k·Q², found by "
    "Brent's method (Brent 1973, ch. 4) in each table interval where the two cross.",
};

typedef struct Crossing {
    const Curve *c;
    double hs, k;
} Crossing;

static bool crossing_fn(double q, void *ctx, double *f)
{
    const Crossing *x = ctx;
    *f = curve_eval(x->c, q, NULL) - x->hs - x->k * q * q;
    return isfinite(*f);
}

/* The largest Q >= 0 where the pump curve c meets H = hs + k*Q^2, scanning
 * the table's intervals from Q = 0 (or its first point) and one interval as
 * long again as the table beyond its last point; returns how many
 * crossings were found (0: none). */
int curve_pump_crossing(const Curve *c, double hs, double k, double *q_out)
{
    Crossing x = {c, hs, k};
    double lo0 = fmax(0.0, c->x[0]), span = c->x[c->n - 1] - lo0;
    size_t nb = c->n + 2;
    double best = NAN;
    int found = 0;
    double prev_q = lo0, prev_f;
    if (!crossing_fn(prev_q, &x, &prev_f))
        prev_f = NAN;
    if (prev_f == 0.0) {
        best = prev_q;
        found = 1;
    }
    for (size_t i = 0; i < nb; i++) {
        double q = i < c->n ? c->x[i] : c->x[c->n - 1] + span * (double)(i - c->n + 1);
        if (!(q > prev_q))
            continue;
        double f;
        if (!crossing_fn(q, &x, &f))
            break;
        if (f == 0.0) {
            best = q;
            found++;
        } else if (isfinite(prev_f) && prev_f != 0.0 && (f < 0) != (prev_f < 0)) {
            SolveReport rep = solve_brent(crossing_fn, &x, prev_q, q, 1e-15 * fmax(q, 1e-12));
            if (rep.status == SOLVE_OK) {
                best = rep.root;
                found++;
            }
        }
        prev_q = q;
        prev_f = f;
    }
    *q_out = best;
    return found;
}

bool curve_operating_point(CallCtx *cx, const CallArgs *a, const CurveData *cd, double hs, double k, Value *out)
{
    char b1[96], b2[96], b3[96];
    if (!dim_eq(cd->x_dim, DIM_FLOW) || !dim_eq(cd->y_dim, DIM_L)) {
        char xs[96], ys[96];
        dim_describe(cd->x_dim, cd->x_temp, cx->units, xs, sizeof xs);
        dim_describe(cd->y_dim, cd->y_temp, cx->units, ys, sizeof ys);
        diag_error(cx->diags, arg_at(a, 0), "%s: a pump curve gives head (a length) against flow; curve '%s' gives %s against %s",
                   a->name, cd->name, ys, xs);
        return false;
    }
    const Curve *c = &cd->curve;
    double best = NAN;
    int found = curve_pump_crossing(c, hs, k, &best);
    if (!found) {
        diag_error(cx->diags, a->pos,
                   "%s: the pump curve '%s' and the system curve H = H_static + k*Q^2 do not meet at Q >= 0 "
                   "(pump head %s at the first point, static head %s)",
                   a->name, cd->name, show(cx->units, c->y[0], DIM_L, TEMP_NONE, b1, sizeof b1),
                   show(cx->units, hs, DIM_L, TEMP_NONE, b2, sizeof b2));
        return false;
    }
    call_use_method(cx, curve_method(c->interp));
    call_use_method(cx, &METHOD_OPERATING_CURVE);
    if (found > 1)
        diag_warning(cx->diags, a->pos, "%s: the curves meet %d times at Q >= 0; the largest flow %s is taken", a->name,
                     found, show(cx->units, best, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
    if (curve_side(c, best))
        diag_warning(cx->diags, a->pos,
                     "%s: the operating point Q = %s is outside the pump curve's table (%s to %s); the end interval is "
                     "extrapolated",
                     a->name, show(cx->units, best, DIM_FLOW, TEMP_NONE, b1, sizeof b1),
                     show(cx->units, c->x[0], DIM_FLOW, TEMP_NONE, b2, sizeof b2),
                     show(cx->units, c->x[c->n - 1], DIM_FLOW, TEMP_NONE, b3, sizeof b3));
    Record *r = record_new(cx->arena, "operating_point", 2);
    record_set(r, 0, "Q", value_hinted(qty(best, DIM_FLOW), "gal/min", "L/s"));
    record_set(r, 1, "H", value_hinted(qty(hs + k * best * best, DIM_L), "ft", "m"));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

