/* pumps_lib.c — pump_curve() and operating_point(): the calc functions of
 * pump curves (pumps.c), a pump record callable as H(Q), with their Method
 * descriptors. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/devices_lib.h"
#include "methods/glue.h"
#include "methods/pumps.h"
#include "numfmt.h"

static const Method METHOD_PUMP = {
    "pump_quadratic",
    "Pump head curve, quadratic through three points",
    "H = a + b*Q + c*Q^2",
    "between the smallest and largest of the three flows (outside: extrapolation)",
    "Interpolating polynomial through three catalogue points (Newton divided differences); "
    "the pump manufacturer's certified curve governs.",
};

static const Method METHOD_OPERATING = {
    "pump_operating_point",
    "Pump operating point on a quadratic system curve",
    "a + b*Q + c*Q^2 = H_static + k*Q^2",
    "Q ≥ 0; within the span of the pump curve's points",
    "Intersection of the pump curve with the system curve H = H_static + k·Q²; roots by "
    "the cancellation-free quadratic formula (Press et al., Numerical Recipes, 5.6).",
};

static Dim dim_flow2(void)
{
    return dim_mul(DIM_FLOW, DIM_FLOW);
}

/* ---- pumps --------------------------------------------------------------- */

static Value flow_value(double q)
{
    return value_hinted(qty(q, DIM_FLOW), "gal/min", "L/s");
}

static Value head_value(double h)
{
    return value_hinted(qty(h, DIM_L), "ft", "m");
}

static void warn_extrapolated(CallCtx *cx, const CallArgs *a, const PumpCurve *pc, double Q)
{
    double span = pc->q_max - pc->q_min;
    if (Q < pc->q_min - 1e-9 * span || Q > pc->q_max + 1e-9 * span) {
        char b1[128], b2[128], b3[128];
        diag_warning(cx->diags, a->pos,
                     "%s: Q = %s is outside the pump curve's points (%s to %s); the "
                     "quadratic is extrapolated there",
                     a->name, glue_show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1),
                     glue_show(cx, pc->q_min, DIM_FLOW, TEMP_NONE, b2, sizeof b2),
                     glue_show(cx, pc->q_max, DIM_FLOW, TEMP_NONE, b3, sizeof b3));
    }
}

/* The coefficients a pump record carries: its native PumpCurve. */
static const PumpCurve *pump_of(const Record *r)
{
    return (const PumpCurve *)r->native;
}

/* pump(Q): the head of a pump record's curve at a flow. */
static bool pump_record_call(CallCtx *cx, const Record *self, const CallArgs *a, Value *out)
{
    const PumpCurve *pc = pump_of(self);
    if (a->n != 1) {
        diag_error(cx->diags, a->pos, "%s: a pump curve takes one argument, a flow rate; found %zu",
                   a->name, a->n);
        return false;
    }
    double Q;
    if (!arg_number(cx, a, 0, DIM_FLOW, "flow rate", &Q))
        return false;
    if (!pc) {
        diag_error(cx->diags, a->pos, "%s: this record has no pump curve", a->name);
        return false;
    }
    MethodUse *u = call_begin_use(cx, &METHOD_PUMP);
    Dim db = dim_div(DIM_L, DIM_FLOW), dc = dim_div(DIM_L, dim_flow2());
    use_input_value(u, "a", head_value(pc->a));
    use_input_value(u, "b", value_hinted(qty(pc->b, db), "ft/gpm", "m/(L/s)"));
    use_input_value(u, "c", value_hinted(qty(pc->c, dc), "ft/gpm^2", "m/(L/s)^2"));
    use_input_value(u, "Q", flow_value(Q));
    warn_extrapolated(cx, a, pc, Q);
    *out = head_value(pump_head(pc, Q));
    use_result(u, out->q.si, DIM_L);
    return true;
}

bool fn_pump_curve(CallCtx *cx, const CallArgs *a, Value *out)
{
    double Q[3], H[3];
    static const char *const qname[3] = {"flow Q1", "flow Q2", "flow Q3"};
    static const char *const hname[3] = {"head H1", "head H2", "head H3"};
    for (size_t i = 0; i < 3; i++)
        if (!arg_number(cx, a, 2 * i, DIM_FLOW, qname[i], &Q[i]) ||
            !arg_number(cx, a, 2 * i + 1, DIM_L, hname[i], &H[i]))
            return false;
    char b1[128];
    for (size_t i = 0; i < 3; i++) {
        if (!(Q[i] >= 0.0) || !isfinite(Q[i])) {
            diag_error(cx->diags, arg_at(a, 2 * i), "%s: Q%zu must be zero or positive, found %s",
                       a->name, i + 1, glue_show(cx, Q[i], DIM_FLOW, TEMP_NONE, b1, sizeof b1));
            return false;
        }
        if (!isfinite(H[i])) {
            diag_error(cx->diags, arg_at(a, 2 * i + 1), "%s: H%zu must be finite", a->name, i + 1);
            return false;
        }
    }
    PumpCurve *pc = arena_alloc(cx->arena, sizeof *pc);
    int dup = 0;
    if (pump_fit(Q, H, pc, &dup) != PUMP_OK) {
        diag_error(cx->diags, arg_at(a, 2 * (size_t)dup),
                   "%s: Q%d repeats the flow of an earlier point; three different flows are "
                   "needed for a quadratic",
                   a->name, dup + 1);
        return false;
    }
    call_use_method(cx, &METHOD_PUMP);
    Dim db = dim_div(DIM_L, DIM_FLOW), dc = dim_div(DIM_L, dim_flow2());
    Record *r = record_new(cx->arena, "pump", 9);
    record_set(r, 0, "a", head_value(pc->a));
    record_set(r, 1, "b", value_hinted(qty(pc->b, db), "ft/gpm", "m/(L/s)"));
    record_set(r, 2, "c", value_hinted(qty(pc->c, dc), "ft/gpm^2", "m/(L/s)^2"));
    static const char *const qf[3] = {"Q1", "Q2", "Q3"}, *const hf[3] = {"H1", "H2", "H3"};
    for (size_t i = 0; i < 3; i++) {
        record_set(r, 3 + 2 * i, qf[i], flow_value(Q[i]));
        record_set(r, 4 + 2 * i, hf[i], head_value(H[i]));
    }
    r->native = pc;
    r->call = pump_record_call;
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

bool fn_operating_point(CallCtx *cx, const CallArgs *a, Value *out)
{
    const Record *pump;
    double Hs, k;
    const CurveData *cd = a->n > 0 ? curve_of(&a->args[0]) : NULL;
    if (cd) {
        /* a tabulated pump curve (```curve NAME) */
        if (!arg_number(cx, a, 1, DIM_L, "static head", &Hs) ||
            !arg_number(cx, a, 2, dim_div(DIM_L, dim_flow2()), "system coefficient k", &k))
            return false;
        if (!(k >= 0.0) || !isfinite(k)) {
            char b1[64];
            diag_error(cx->diags, arg_at(a, 2),
                       "%s: k must be zero or positive (system head rises with flow), found %s", a->name,
                       glue_show_num(k, b1, sizeof b1));
            return false;
        }
        return curve_operating_point(cx, a, cd, Hs, k, out);
    }
    if (!arg_record(cx, a, 0, "pump", "pump curve", &pump) ||
        !arg_number(cx, a, 1, DIM_L, "static head", &Hs) ||
        !arg_number(cx, a, 2, dim_div(DIM_L, dim_flow2()), "system coefficient k", &k))
        return false;
    const PumpCurve *pc = pump_of(pump);
    if (!pc) {
        diag_error(cx->diags, arg_at(a, 0), "%s: this pump record has no curve", a->name);
        return false;
    }
    char b1[128], b2[128];
    if (!(k >= 0.0) || !isfinite(k)) {
        diag_error(cx->diags, arg_at(a, 2),
                   "%s: k must be zero or positive (system head rises with flow), found %s",
                   a->name, glue_show_num(k, b1, sizeof b1));
        return false;
    }
    double Q, H;
    int count = 0;
    if (pump_operating_point(pc, Hs, k, &Q, &H, &count) != PUMP_OK) {
        diag_error(cx->diags, a->pos,
                   "%s: the pump curve and the system curve H = H_static + k*Q^2 do not meet "
                   "at Q >= 0 (pump shutoff head %s, static head %s)",
                   a->name, glue_show(cx, pc->a, DIM_L, TEMP_NONE, b1, sizeof b1),
                   glue_show(cx, Hs, DIM_L, TEMP_NONE, b2, sizeof b2));
        return false;
    }
    call_use_method(cx, &METHOD_PUMP);
    call_use_method(cx, &METHOD_OPERATING);
    if (count > 1)
        diag_warning(cx->diags, a->pos,
                     "%s: the curves meet twice at Q ≥ 0; the larger flow %s is taken",
                     a->name, glue_show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
    warn_extrapolated(cx, a, pc, Q);
    Record *r = record_new(cx->arena, "operating_point", 2);
    record_set(r, 0, "Q", flow_value(Q));
    record_set(r, 1, "H", head_value(H));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}
