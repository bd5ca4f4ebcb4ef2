/* friction_lib.c — friction_factor(), colebrook(), swamee_jain(),
 * haaland(), churchill() and hazen_williams(): the calc functions of the
 * friction correlations (friction.c), with their Method descriptors.
 *
 * Bad input is an error; a valid input outside a correlation's fitted
 * range is a warning at the call. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/friction.h"
#include "methods/glue.h"
#include "numfmt.h"
#include "suggest.h"

static const Method METHOD_COLEBROOK = {
    "colebrook",
    "Colebrook-White equation",
    "1/sqrt(f) = -2*log10(epsilon/(3.7*D) + 2.51/(Re*sqrt(f)))",
    "4000 ≤ Re ≤ 10⁸, 0 ≤ ε/D ≤ 0.05",
    "Colebrook, C. F. (1939). Turbulent flow in pipes, with particular reference to the "
    "transition region between the smooth and rough pipe laws. J. Inst. Civil Eng. 11(4), "
    "133-156. Solved to machine precision by Halley's method.",
};

static const Method METHOD_SWAMEE_JAIN = {
    "swamee_jain",
    "Swamee-Jain explicit friction factor",
    "f = 0.25/log10(epsilon/(3.7*D) + 5.74/Re^0.9)^2",
    "5000 ≤ Re ≤ 10⁸, 10⁻⁶ ≤ ε/D ≤ 0.05",
    "Swamee, P. K. and Jain, A. K. (1976). Explicit equations for pipe-flow problems. "
    "J. Hydraulics Div. ASCE 102(5), 657-664. Range as listed by Winning, H. K. and "
    "Coole, T. (2013), Flow Turbulence Combust. 90, 1-27.",
};

static const Method METHOD_HAALAND = {
    "haaland",
    "Haaland explicit friction factor",
    "1/sqrt(f) = -1.8*log10((epsilon/(3.7*D))^1.11 + 6.9/Re)",
    "4000 ≤ Re ≤ 10⁸, 10⁻⁶ ≤ ε/D ≤ 0.05",
    "Haaland, S. E. (1983). Simple and explicit formulas for the friction factor in "
    "turbulent pipe flow. J. Fluids Eng. 105(1), 89-90. Range as listed by Winning and "
    "Coole (2013).",
};

static const Method METHOD_CHURCHILL = {
    "churchill",
    "Churchill (1977) friction factor, all flow regimes",
    "f = 8*((8/Re)^12 + 1/(A + B)^1.5)^(1/12)",
    "all Re; ε/D ≤ 0.05 (common practice, no source); 2000 < Re < 4000 is uncertain",
    "Churchill, S. W. (1977). Friction-factor equation spans all fluid-flow regimes. "
    "Chem. Eng. 84(24), 91-92. A = [2.457·ln(1/((7/Re)⁰˙⁹ + 0.27·ε/D))]¹⁶, "
    "B = (37530/Re)¹⁶.",
};

static const Method METHOD_LAMINAR = {
    "laminar",
    "Hagen-Poiseuille laminar friction factor",
    "f = 64/Re",
    "Re < 2000 (fully developed laminar flow)",
    "Hagen-Poiseuille law for fully developed laminar flow in a circular pipe; any fluid "
    "mechanics text, e.g. White, F. M., Fluid Mechanics, section 6.4.",
};

static const Method METHOD_HAZEN_WILLIAMS = {
    "hazen_williams",
    "Hazen-Williams head loss (SI form)",
    "h_f = 10.67*L*Q^1.852/(C^1.852*D^4.8704)",
    "water at ordinary temperatures in turbulent flow; 0.3 m/s ≤ V ≤ 3 m/s "
    "(common practice, no source)",
    "Williams, G. S. and Hazen, A. (1920). Hydraulic Tables, 3rd ed. Wiley. SI form from "
    "V = 0.849·C·R⁰˙⁶³·S⁰˙⁵⁴ with R = D/4; 10.67 is the rounded constant of SI texts.",
};

/* ---- friction ------------------------------------------------------------ */

static const Method *friction_method_of(FrictionMethod m)
{
    switch (m) {
    case FRICTION_COLEBROOK: return &METHOD_COLEBROOK;
    case FRICTION_SWAMEE_JAIN: return &METHOD_SWAMEE_JAIN;
    case FRICTION_HAALAND: return &METHOD_HAALAND;
    case FRICTION_CHURCHILL: return &METHOD_CHURCHILL;
    case FRICTION_LAMINAR:
    case FRICTION_METHOD_COUNT: break;
    }
    return &METHOD_LAMINAR;
}

/* Shared body of friction_factor() and the per-method names. `regime`:
 * apply the laminar/transition rules of friction_factor(). */
static bool friction_call(CallCtx *cx, const CallArgs *a, FrictionMethod m, bool regime,
                          Value *out)
{
    double Re, rr;
    if (!arg_dimensionless(cx, a, 0, "Reynolds number", &Re) ||
        !arg_dimensionless(cx, a, 1, "relative roughness", &rr))
        return false;
    char b1[128], b2[128];
    if (!(Re > 0.0) || !isfinite(Re)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: Reynolds number must be positive, found %s",
                   a->name, glue_show_num(Re, b1, sizeof b1));
        return false;
    }
    if (!(rr >= 0.0) || !(rr < 1.0)) {
        diag_error(cx->diags, arg_at(a, 1),
                   "%s: relative roughness (roughness/diameter) must be at least 0 and below 1, "
                   "found %s",
                   a->name, glue_show_num(rr, b1, sizeof b1));
        return false;
    }
    FrictionMethod used = m;
    double f;
    FrictionStatus st = regime ? friction_factor(m, Re, rr, &f, &used) : friction_eval(m, Re, rr, &f);
    if (st != FRICTION_OK) {
        diag_error(cx->diags, a->pos, "%s: the %s iteration did not converge at Re = %s, ε/D = %s",
                   a->name, friction_method_name(used), glue_show_num(Re, b1, sizeof b1),
                   glue_show_num(rr, b2, sizeof b2));
        return false;
    }
    const Method *meth = friction_method_of(used);
    call_use_method(cx, meth);
    const FrictionRange *rg = friction_range(used);
    bool transition = regime && Re >= FRICTION_RE_LAMINAR && Re < FRICTION_RE_TURBULENT;
    if (transition)
        diag_warning(cx->diags, a->pos,
                     "%s: Re = %s is in the transition zone 2000 ≤ Re < 4000, where no "
                     "correlation is reliable; the %s value is given",
                     a->name, glue_show_num(Re, b1, sizeof b1), friction_method_name(used));
    bool re_out = !transition && (Re < rg->re_min || Re > rg->re_max);
    bool rr_out = rr < rg->rr_min || rr > rg->rr_max;
    if (re_out || rr_out)
        diag_warning(cx->diags, a->pos,
                     "%s: %s = %s is outside the validity range of the %s (%s)", a->name,
                     re_out ? "Re" : "ε/D",
                     re_out ? glue_show_num(Re, b1, sizeof b1) : glue_show_num(rr, b1, sizeof b1),
                     meth->title, meth->validity);
    *out = value_number(qty_number(f));
    return true;
}

bool fn_friction_factor(CallCtx *cx, const CallArgs *a, Value *out)
{
    if (!kw_check(cx, a))
        return false;
    FrictionMethod m = FRICTION_COLEBROOK;
    Pos mp;
    const Value *mv = kw_get(a, "method", &mp);
    if (mv) {
        int k = mv->kind == VAL_STRING ? friction_method_lookup(mv->str) : -1;
        if (k < 0 || k == FRICTION_LAMINAR) {
            const char *w[FRICTION_METHOD_COUNT];
            char choices[128];
            suggest_choices(choices, sizeof choices, w, friction_method_choices(w, FRICTION_METHOD_COUNT), "\"", ", ");
            diag_error(cx->diags, mp, "%s: method= must be one of %s%s%s%s", a->name, choices, mv->kind == VAL_STRING ? ", found \"" : "",
                       mv->kind == VAL_STRING ? mv->str : "", mv->kind == VAL_STRING ? "\"" : "");
            return false;
        }
        m = (FrictionMethod)k;
    }
    return friction_call(cx, a, m, true, out);
}

bool fn_colebrook(CallCtx *cx, const CallArgs *a, Value *out)
{
    return friction_call(cx, a, FRICTION_COLEBROOK, false, out);
}

bool fn_swamee_jain(CallCtx *cx, const CallArgs *a, Value *out)
{
    return friction_call(cx, a, FRICTION_SWAMEE_JAIN, false, out);
}

bool fn_haaland(CallCtx *cx, const CallArgs *a, Value *out)
{
    return friction_call(cx, a, FRICTION_HAALAND, false, out);
}

bool fn_churchill(CallCtx *cx, const CallArgs *a, Value *out)
{
    return friction_call(cx, a, FRICTION_CHURCHILL, false, out);
}

/* ---- hazen_williams(Q, C, D, L) -------------------------------------- */

bool fn_hazen_williams(CallCtx *cx, const CallArgs *a, Value *out)
{
    double Q, C, D, L;
    if (!arg_number(cx, a, 0, DIM_FLOW, "flow rate", &Q) ||
        !arg_dimensionless(cx, a, 1, "Hazen-Williams C", &C) ||
        !arg_number(cx, a, 2, DIM_L, "inside diameter", &D) ||
        !arg_number(cx, a, 3, DIM_L, "length", &L))
        return false;
    char b1[128], b2[128], b3[128];
    if (!(Q >= 0.0) || !isfinite(Q)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: flow rate must be zero or positive, found %s",
                   a->name, glue_show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(C > 0.0) || !isfinite(C)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: C must be positive, found %s", a->name,
                   glue_show_num(C, b1, sizeof b1));
        return false;
    }
    if (!(D > 0.0) || !isfinite(D)) {
        diag_error(cx->diags, arg_at(a, 2), "%s: diameter must be positive, found %s", a->name,
                   glue_show(cx, D, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(L >= 0.0) || !isfinite(L)) {
        diag_error(cx->diags, arg_at(a, 3), "%s: length must be zero or positive, found %s",
                   a->name, glue_show(cx, L, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    call_use_method(cx, &METHOD_HAZEN_WILLIAMS);
    double V = 4.0 * Q / (CONST_PI * D * D);
    if (V < HW_V_MIN || V > HW_V_MAX)
        diag_warning(cx->diags, a->pos,
                     "%s: velocity %s is outside %s to %s, the range where Hazen-Williams is "
                     "usually trusted (common practice, no source)",
                     a->name, glue_show(cx, V, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1),
                     glue_show(cx, HW_V_MIN, DIM_VELOCITY, TEMP_NONE, b2, sizeof b2),
                     glue_show(cx, HW_V_MAX, DIM_VELOCITY, TEMP_NONE, b3, sizeof b3));
    *out = value_hinted(qty(friction_hazen_williams(Q, C, D, L), DIM_L), "ft", "m");
    return true;
}
