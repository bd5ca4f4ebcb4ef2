/* hydraulics_lib.c — the calc functions for water, friction, Hazen-Williams,
 * pressure ratings, surge and pumps.
 *
 * Glue between the evaluator and the numeric cores in src/methods/: each
 * function checks its arguments' dimensions with the arg_* helpers, turns
 * a core status into an error at the offending argument, names the
 * published method it applied (call_use_method) so the report can show the
 * formula, validity range and reference, and warns at the call when an
 * input lies outside the method's validity range. Bad input is an error;
 * a valid input outside a correlation's fitted range is a warning. */
#include "library.h"

#include "methods/devices_lib.h"
#include "methods/friction.h"
#include "methods/pumps.h"
#include "methods/ratings.h"
#include "methods/surge.h"
#include "methods/water.h"
#include "numfmt.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"

/* ---- the published methods ------------------------------------------- */

static const Method METHOD_IF97 = {
    "iapws_if97_region1",
    "IAPWS-IF97 region 1 (density; isentropic bulk modulus K = ρw²)",
    "rho = p_star/(R*T*gamma_pi)",
    "273.15 K ≤ T ≤ 423.15 K (0–150 °C) as served here; p_sat(T) ≤ p ≤ 100 MPa",
    "IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the "
    "Thermodynamic Properties of Water and Steam, region 1 (eq. 7) and speed of sound "
    "(Table 3). K is the isentropic bulk modulus ρw² from the IF97 speed of sound w.",
};

static const Method METHOD_IF97_PSAT = {
    "iapws_if97_region4",
    "IAPWS-IF97 saturation-pressure equation (region 4)",
    "p_vap = p_1*(2*C/(-B + sqrt(B^2 - 4*A*C)))^4",
    "273.15 K ≤ T ≤ 647.096 K",
    "IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997, "
    "region 4, eq. 30.",
};

static const Method METHOD_VISC = {
    "iapws_2008_viscosity",
    "IAPWS 2008 viscosity of ordinary water (critical enhancement neglected)",
    "mu = mu_star*mu_0*mu_1",
    "liquid water 0–150 °C, p ≤ 100 MPa (the release covers far more); the critical "
    "enhancement mu_2 is taken as 1, which is exact outside about 645.91..650.77 K",
    "IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary "
    "Water Substance, eqs. 10-12; evaluated with the IAPWS-IF97 density.",
};

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
    "Chem. Eng. 84(24), 91-92. A = (2.457·ln(1/((7/Re)^0.9 + 0.27·ε/D)))^16, "
    "B = (37530/Re)^16.",
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
    "V = 0.849·C·R^0.63·S^0.54 with R = D/4; 10.67 is the rounded constant of SI texts.",
};

static const Method METHOD_RATING_PVC = {
    "rating_pvc",
    "Thermoplastic pressure rating, PVC 1120, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 140 °F (F_T = 1.00 at and below 73.4 °F); water",
    "ISO 161-1 / ASTM D2837 pressure rating relation as used by ASTM D1785 and D2241; "
    "HDS 2000 psi for PVC 1120 at 73.4 °F (HDB 4000 psi, service factor 0.5, ASTM D2241 "
    "appendix, as given in Moser, Buried Pipe Design, ch. 4); ASTM D2241 pressure classes "
    "from the Hydraulic Institute Engineering Data Book, Table 4.E.2; derating factors F_T "
    "from GF Harvel, Temperature Derating, Schedule 40 & 80 PVC pipe, linear between rows. "
    "Verify against the manufacturer's current data.",
};

static const Method METHOD_RATING_CPVC = {
    "rating_cpvc",
    "Thermoplastic pressure rating, CPVC 4120, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 200 °F (F_T = 1.00 at and below 80 °F); water",
    "ISO 161-1 / ASTM D2837 pressure rating relation as used by ASTM F441; HDS 2000 psi for "
    "CPVC 4120 at 73.4 °F (U.S. Plastic Corp., CPVC pipe physical properties); derating "
    "factors F_T from GF Harvel, CPVC Industrial Pipe Temperature Derating, linear between "
    "rows. Verify against the manufacturer's current data.",
};

static const Method METHOD_RATING_PEX = {
    "rating_pex",
    "Thermoplastic pressure rating, PEX, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 180 °F (F_T = 1.00 at and below 73.4 °F); water",
    "ISO 161-1 / ASTM D2837 pressure rating relation as used by ASTM F876/F877; HDS 630 psi "
    "at 73.4 °F and 400 psi at 180 °F, from the published SDR 9 ratings 160 psi at "
    "73.4 °F and 100 psi at 180 °F (EngineerFix, How Much Pressure Can PEX Pipe Hold?; "
    "Village Plumbing, Common PEX Pressure Ratings), linear between. Verify against the "
    "manufacturer's current data.",
};

static const Method METHOD_RATING_B31 = {
    "rating_b31",
    "Metallic pipe pressure design (ASME B31.3 304.1.2)",
    "p = 2*S*E*W*(t - c)/(D - 2*Y*(t - c))",
    "t < D/6; Y = 0.4 for ferrous and nonferrous metals below 900 °F (Table 304.1.1)",
    "ASME B31.3, Process Piping, para. 304.1.2 eq. (3a) solved for p (B31.1 104.1.2 has the "
    "same form). S, E and W come from the code's tables for the material and temperature.",
};

static const Method METHOD_KORTEWEG = {
    "korteweg",
    "Korteweg pressure-wave speed in a thin-walled elastic pipe",
    "a = sqrt((K/rho)/(1 + c_1*K*D/(E*e)))",
    "thin wall, D/e > 25; linear-elastic pipe; c₁ = 1 (expansion joints), 1 − ν/2 "
    "(anchored upstream), 1 − ν² (anchored throughout)",
    "Korteweg, D. J. (1878), Ann. Phys. 241(12), 525-542; in the form of Wylie, E. B. and "
    "Streeter, V. L. (1993), Fluid Transients in Systems, Prentice Hall, section 2.6.",
};

static const Method METHOD_KORTEWEG_THICK = {
    "korteweg_thick",
    "Pressure-wave speed in a thick-walled elastic pipe",
    "c_1 = 2*e/D*(1 + nu) + D*(1 - nu/2)/(D + e)",
    "D/e below 25; linear-elastic pipe; shown for a pipe anchored upstream: with expansion "
    "joints the last term is D/(D + e), anchored throughout D·(1 − ν²)/(D + e)",
    "Wylie, E. B. and Streeter, V. L. (1993), Fluid Transients in Systems, Prentice Hall, "
    "section 2.6, thick-walled elastic conduits.",
};

static const Method METHOD_JOUKOWSKY = {
    "joukowsky",
    "Joukowsky pressure rise",
    "Delta_p = rho*a*Delta_V",
    "velocity change completed within 2L/a; friction and cavitation neglected",
    "Joukowsky, N. (1900). Ueber den hydraulischen Stoss in Wasserleitungsroehren. "
    "Mem. Acad. Imp. Sci. St.-Petersbourg 9(5); see Wylie and Streeter (1993), section 1.2.",
};

static const Method METHOD_CLOSURE = {
    "wave_round_trip",
    "Pressure-wave round-trip time",
    "t_c = 2*L/a",
    "a valve closed faster than t_c gives the full Joukowsky rise",
    "Wylie, E. B. and Streeter, V. L. (1993). Fluid Transients in Systems, section 1.2.",
};

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

/* ---- helpers ----------------------------------------------------------- */

static Pos arg_at(const CallArgs *a, size_t i)
{
    return i < a->n && a->arg_pos ? a->arg_pos[i] : a->pos;
}

/* A quantity as messages show it: 4 significant figures in the document's
 * unit system ("101.3 kPa", "68.00 degF"). */
static const char *show(CallCtx *cx, double si, Dim d, TempKind temp, char *buf, size_t n)
{
    Unit u = unit_default(d, temp, cx->units);
    double x = unit_from_si(si, &u, false);
    char num[48];
    num_sig(x, 4, num, sizeof num);
    snprintf(buf, n, "%s %s", num, u.text);
    return buf;
}

static const char *show_temp(CallCtx *cx, double K, char *buf, size_t n)
{
    return show(cx, K, DIM_THETA, TEMP_ABSOLUTE_OFFSET, buf, n);
}

static const char *show_num(double x, char *buf, size_t n)
{
    num_sig(x, 4, buf, n);
    return buf;
}

/* An absolute temperature argument (a difference is refused). */
static bool arg_temperature(CallCtx *cx, const CallArgs *a, size_t i, double *T)
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
static bool field_number(CallCtx *cx, const CallArgs *a, size_t i, const Record *r,
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

static const char *field_string(const Record *r, const char *field)
{
    const Value *v = record_get(r, field);
    return v && v->kind == VAL_STRING ? v->str : NULL;
}

/* An optional keyword number of a given dimension; *si keeps its default
 * when the keyword is absent. */
static bool kw_number(CallCtx *cx, const CallArgs *a, const char *name, Dim want, double *si,
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

static Dim dim_flow2(void)
{
    return dim_mul(DIM_FLOW, DIM_FLOW);
}

/* ---- water(T) / water(T, p) ------------------------------------------- */

/* A pressure that states its reference (DESIGN 2.9), as an absolute
 * pressure in Pa: a gauge point has the atmosphere added. A plain pressure
 * is refused, naming both spellings, since it might be either. */
static bool arg_pressure_point(CallCtx *cx, const CallArgs *a, size_t i, const char *what, double *p_abs)
{
    double p;
    const Value *v = i < a->n ? &a->args[i] : NULL;
    if (v && v->kind == VAL_NUMBER && dim_eq(v->q.dim, DIM_PRESSURE) && v->q.pref == PRES_ABSOLUTE) {
        *p_abs = v->q.si;
        return true;
    }
    if (!arg_number(cx, a, i, DIM_PRESSURE, what, &p))
        return false;
    if (v->q.pref == PRES_PLAIN) {
        bool us = cx->units == UNITS_US;
        diag_error(cx->diags, arg_at(a, i),
                   "%s: argument %zu (%s) must say whether it is absolute or gauge: write it in "
                   "%s (absolute) or %s (gauge); a plain %s states no reference",
                   a->name, i + 1, what, us ? "psia" : "kPaa", us ? "psig" : "kPag", us ? "psi" : "kPa");
        return false;
    }
    *p_abs = p + call_atmosphere(cx);
    return true;
}

bool fn_water(CallCtx *cx, const CallArgs *a, Value *out)
{
    double T, p;
    if (!arg_temperature(cx, a, 0, &T))
        return false;
    if (a->n > 1) {
        if (!arg_pressure_point(cx, a, 1, "pressure", &p))
            return false;
    } else {
        /* at the calc's atmosphere; the standard one says nothing new */
        p = cx->atmosphere > 0 ? cx->atmosphere : WATER_P_DEFAULT;
        if (p != WATER_P_DEFAULT)
            (void)call_atmosphere(cx);
    }
    WaterProps w;
    WaterStatus st = water_props(T, p, &w);
    char b1[128], b2[128], b3[128];
    switch (st) {
    case WATER_OK:
        break;
    case WATER_NOT_FINITE:
        diag_error(cx->diags, a->pos, "%s: temperature and pressure must be finite numbers",
                   a->name);
        return false;
    case WATER_T_OUT_OF_RANGE:
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: temperature %s is outside the range served, %s "
                   "(IAPWS-IF97 region 1, liquid water)",
                   a->name, show_temp(cx, T, b1, sizeof b1),
                   cx->units == UNITS_US ? "32 degF to 302 degF" : "0 degC to 150 degC");
        return false;
    case WATER_P_TOO_HIGH:
        diag_error(cx->diags, arg_at(a, 1),
                   "%s: pressure %s is above 100 MPa, the upper bound of IAPWS-IF97 region 1",
                   a->name, show(cx, p, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    case WATER_P_BELOW_SATURATION:
        diag_error(cx->diags, a->n > 1 ? arg_at(a, 1) : arg_at(a, 0),
                   "%s: at %s (absolute) water at %s is steam: the saturation pressure is %s; "
                   "%s an absolute pressure of at least %s",
                   a->name, show(cx, p, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1),
                   show_temp(cx, T, b2, sizeof b2),
                   show(cx, water_psat(T), DIM_PRESSURE, TEMP_NONE, b3, sizeof b3),
                   a->n > 1 ? "give" : "give water(T, p) with",
                   b3);
        return false;
    }
    call_use_method(cx, &METHOD_IF97);
    call_use_method(cx, &METHOD_VISC);
    call_use_method(cx, &METHOD_IF97_PSAT);

    Record *r = record_new(cx->arena, "water", 8);
    record_set(r, 0, "rho", value_hinted(qty(w.rho, DIM_DENSITY), "lbm/ft^3", "kg/m^3"));
    record_set(r, 1, "mu", value_hinted(qty(w.mu, DIM_DYN_VISC), "cP", "Pa*s"));
    record_set(r, 2, "nu", value_hinted(qty(w.nu, DIM_KIN_VISC), "ft^2/s", "m^2/s"));
    record_set(r, 3, "gamma",
               value_hinted(qty(w.gamma, DIM_SPECIFIC_WEIGHT), "lbf/ft^3", "N/m^3"));
    record_set(r, 4, "p_vap", value_hinted(qty(w.p_vap, DIM_PRESSURE), "psi", "kPa"));
    record_set(r, 5, "K", value_hinted(qty(w.K, DIM_PRESSURE), "ksi", "MPa"));
    Value tv = value_number(a->args[0].q);
    record_set(r, 6, "T", tv);
    Value pv = value_number(qty(p, DIM_PRESSURE));
    pv.q.pref = PRES_ABSOLUTE;
    record_set(r, 7, "p", pv);
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

/* ---- npsh_available(p_surface, fluid, z_suction, h_loss) ------------------ */

static const Method METHOD_NPSHA = {
    "npsh_available",
    "Net positive suction head available",
    "NPSH_a = (p_abs - p_vap)/(rho*g) + z_s - h_f",
    "any absolute pressure on the liquid surface; the surface height is measured above the "
    "pump's reference plane (negative for a suction lift); the suction loss is not negative",
    "ANSI/HI 9.6.1, Rotodynamic Pumps — Guideline for NPSH Margin (Hydraulic Institute), "
    "definition of NPSHA: the absolute suction head above the liquid's vapour pressure, "
    "at the impeller's reference plane. Velocity head at the surface taken as zero.",
};

bool fn_npsh_available(CallCtx *cx, const CallArgs *a, Value *out)
{
    double p_abs, z, h_f, rho, p_vap;
    const Record *w;
    if (!arg_pressure_point(cx, a, 0, "pressure on the liquid surface", &p_abs) ||
        !arg_record(cx, a, 1, "water", "fluid", &w) ||
        !arg_number(cx, a, 2, DIM_L, "height of the surface above the pump", &z) ||
        !arg_number(cx, a, 3, DIM_L, "suction head loss", &h_f))
        return false;
    if (!field_number(cx, a, 1, w, "rho", DIM_DENSITY, &rho) ||
        !field_number(cx, a, 1, w, "p_vap", DIM_PRESSURE, &p_vap))
        return false;
    if (!(p_abs > 0)) {
        char b1[64];
        diag_error(cx->diags, arg_at(a, 0), "%s: the absolute pressure on the surface is %s; it must be above zero",
                   a->name, show(cx, p_abs, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (h_f < 0) {
        diag_error(cx->diags, arg_at(a, 3), "%s: the suction head loss must not be negative", a->name);
        return false;
    }
    call_use_method(cx, &METHOD_NPSHA);
    double npsha = (p_abs - p_vap) / (rho * WATER_G) + z - h_f;
    if (npsha <= 0) {
        char b1[64];
        diag_warning(cx->diags, a->pos,
                     "%s: NPSHa is %s: the liquid flashes before it reaches the pump", a->name,
                     show(cx, npsha, DIM_L, TEMP_NONE, b1, sizeof b1));
    }
    *out = value_hinted(qty(npsha, DIM_L), "ft", "m");
    return true;
}

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
                   a->name, show_num(Re, b1, sizeof b1));
        return false;
    }
    if (!(rr >= 0.0) || !(rr < 1.0)) {
        diag_error(cx->diags, arg_at(a, 1),
                   "%s: relative roughness (roughness/diameter) must be at least 0 and below 1, "
                   "found %s",
                   a->name, show_num(rr, b1, sizeof b1));
        return false;
    }
    FrictionMethod used = m;
    double f;
    FrictionStatus st = regime ? friction_factor(m, Re, rr, &f, &used) : friction_eval(m, Re, rr, &f);
    if (st != FRICTION_OK) {
        diag_error(cx->diags, a->pos, "%s: the %s iteration did not converge at Re = %s, rr = %s",
                   a->name, friction_method_name(used), show_num(Re, b1, sizeof b1),
                   show_num(rr, b2, sizeof b2));
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
                     a->name, show_num(Re, b1, sizeof b1), friction_method_name(used));
    bool re_out = !transition && (Re < rg->re_min || Re > rg->re_max);
    bool rr_out = rr < rg->rr_min || rr > rg->rr_max;
    if (re_out || rr_out)
        diag_warning(cx->diags, a->pos,
                     "%s: %s = %s is outside the validity range of the %s (%s)", a->name,
                     re_out ? "Re" : "rr",
                     re_out ? show_num(Re, b1, sizeof b1) : show_num(rr, b1, sizeof b1),
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
            diag_error(cx->diags, mp,
                       "%s: method= must be one of \"colebrook\", \"swamee_jain\", "
                       "\"haaland\", \"churchill\"%s%s%s",
                       a->name, mv->kind == VAL_STRING ? ", found \"" : "",
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
                   a->name, show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(C > 0.0) || !isfinite(C)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: C must be positive, found %s", a->name,
                   show_num(C, b1, sizeof b1));
        return false;
    }
    if (!(D > 0.0) || !isfinite(D)) {
        diag_error(cx->diags, arg_at(a, 2), "%s: diameter must be positive, found %s", a->name,
                   show(cx, D, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(L >= 0.0) || !isfinite(L)) {
        diag_error(cx->diags, arg_at(a, 3), "%s: length must be zero or positive, found %s",
                   a->name, show(cx, L, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    call_use_method(cx, &METHOD_HAZEN_WILLIAMS);
    double V = 4.0 * Q / (CONST_PI * D * D);
    if (V < HW_V_MIN || V > HW_V_MAX)
        diag_warning(cx->diags, a->pos,
                     "%s: velocity %s is outside %s to %s, the range where Hazen-Williams is "
                     "usually trusted (common practice, no source)",
                     a->name, show(cx, V, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1),
                     show(cx, HW_V_MIN, DIM_VELOCITY, TEMP_NONE, b2, sizeof b2),
                     show(cx, HW_V_MAX, DIM_VELOCITY, TEMP_NONE, b3, sizeof b3));
    *out = value_hinted(qty(friction_hazen_williams(Q, C, D, L), DIM_L), "ft", "m");
    return true;
}

/* ---- pressure_rating(pipe, T, ...) ------------------------------------ */

static Value pressure_value(double p)
{
    return value_hinted(qty(p, DIM_PRESSURE), "psi", "kPa");
}

/* rated, derate, p; with a pressure class (p_class > 0, ASTM D2241 pipe at
 * the standard's HDS) also p_class = class*derate, placed before p, the
 * same figure unrounded. */
static bool rating_record(CallCtx *cx, const RatingResult *res, double p_class, Value *out)
{
    Record *r = record_new(cx->arena, "rating", p_class > 0.0 ? 4 : 3);
    size_t i = 0;
    record_set(r, i++, "rated", pressure_value(res->rated));
    record_set(r, i++, "derate", value_number(qty_number(res->derate)));
    if (p_class > 0.0)
        record_set(r, i++, "p_class", pressure_value(p_class * res->derate));
    record_set(r, i++, "p", pressure_value(res->p));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

static bool rating_thermoplastic(CallCtx *cx, const CallArgs *a, const Record *pipe,
                                 const PlasticRating *m, double T, Value *out)
{
    static const char *const metallic_kw[] = {"S", "E", "W", "Y", "c", "mill"};
    for (size_t i = 0; i < sizeof metallic_kw / sizeof metallic_kw[0]; i++) {
        Pos p;
        if (kw_get(a, metallic_kw[i], &p)) {
            diag_error(cx->diags, p,
                       "%s: %s= applies to metallic pipe; this pipe is %s, rated by its "
                       "hydrostatic design stress (HDS=)",
                       a->name, metallic_kw[i], m->material);
            return false;
        }
    }
    double hds = 0.0;
    if (!kw_number(cx, a, "HDS", DIM_PRESSURE, &hds, NULL, NULL))
        return false;
    double sdr = 0.0;
    const Value *sv = record_get(pipe, "sdr");
    if (sv && sv->kind == VAL_NUMBER && dim_is_none(sv->q.dim) && sv->q.si > 1.0) {
        sdr = sv->q.si;
    } else {
        double od, wall;
        if (!field_number(cx, a, 0, pipe, "od", DIM_L, &od) ||
            !field_number(cx, a, 0, pipe, "wall", DIM_L, &wall))
            return false;
        sdr = wall > 0.0 ? od / wall : 0.0;
    }
    RatingResult res;
    char b1[128], b2[128];
    switch (rating_plastic(m, sdr, T, hds, &res)) {
    case RATING_OK:
        break;
    case RATING_T_ABOVE_MAX:
        diag_error(cx->diags, arg_at(a, 1),
                   "%s: %s is above %s, the highest temperature of the %s derating table; "
                   "%s pipe is not rated there",
                   a->name, show_temp(cx, T, b1, sizeof b1),
                   show_temp(cx, (m->table[m->n - 1][0] - 32.0) * 5.0 / 9.0 + 273.15, b2,
                             sizeof b2),
                   m->designation, m->material);
        return false;
    default:
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: the pipe's dimension ratio SDR = %s must be greater than 1", a->name,
                   show_num(sdr, b1, sizeof b1));
        return false;
    }
    if (strcmp(m->material, "PVC") == 0)
        call_use_method(cx, &METHOD_RATING_PVC);
    else if (strcmp(m->material, "CPVC") == 0)
        call_use_method(cx, &METHOD_RATING_CPVC);
    else
        call_use_method(cx, &METHOD_RATING_PEX);
    const char *standard = field_string(pipe, "standard");
    double p_class = 0.0;
    if (!(hds > 0.0) && standard && strcmp(standard, "ASTM D2241") == 0)
        p_class = rating_d2241_class(sdr);
    return rating_record(cx, &res, p_class, out);
}

static bool rating_metal(CallCtx *cx, const CallArgs *a, const Record *pipe,
                         const char *material, double T, Value *out)
{
    Pos hp;
    if (kw_get(a, "HDS", &hp)) {
        diag_error(cx->diags, hp,
                   "%s: HDS= applies to thermoplastic pipe; %s pipe is rated with S= and E=",
                   a->name, material);
        return false;
    }
    double S = 0, E = 0, W = 1.0, Y = 0.4, c = 0.0, mill = 0.0;
    bool hasS, hasE, hasY;
    Pos sp, ep, wp, yp, cp, mp;
    if (!kw_number(cx, a, "S", DIM_PRESSURE, &S, &hasS, &sp) ||
        !kw_number(cx, a, "E", DIM_NONE, &E, &hasE, &ep) ||
        !kw_number(cx, a, "W", DIM_NONE, &W, NULL, &wp) ||
        !kw_number(cx, a, "Y", DIM_NONE, &Y, &hasY, &yp) ||
        !kw_number(cx, a, "c", DIM_L, &c, NULL, &cp) ||
        !kw_number(cx, a, "mill", DIM_NONE, &mill, NULL, &mp))
        return false;
    if (!hasS) {
        diag_error(cx->diags, a->pos,
                   "%s: %s pipe needs its allowable stress at the design temperature, S=..., "
                   "from the governing code's stress table (ASME B31.1 or B31.3 Appendix A); "
                   "headroom does not assume one",
                   a->name, material);
        return false;
    }
    if (!hasE) {
        diag_error(cx->diags, a->pos,
                   "%s: %s pipe needs its longitudinal joint quality factor E=... (1 for "
                   "seamless pipe, less for welded; ASME B31.3 Table A-1B)",
                   a->name, material);
        return false;
    }
    char b1[128];
    if (!(S > 0.0)) {
        diag_error(cx->diags, sp, "%s: S= must be positive, found %s", a->name,
                   show(cx, S, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(E > 0.0 && E <= 1.0)) {
        diag_error(cx->diags, ep, "%s: E= must be above 0 and at most 1, found %s", a->name,
                   show_num(E, b1, sizeof b1));
        return false;
    }
    if (!(W > 0.0 && W <= 1.0)) {
        diag_error(cx->diags, wp, "%s: W= must be above 0 and at most 1, found %s", a->name,
                   show_num(W, b1, sizeof b1));
        return false;
    }
    if (!(Y >= 0.0 && Y < 1.0)) {
        diag_error(cx->diags, yp, "%s: Y= must be at least 0 and below 1, found %s", a->name,
                   show_num(Y, b1, sizeof b1));
        return false;
    }
    if (!(c >= 0.0)) {
        diag_error(cx->diags, cp, "%s: c= (allowances) must be zero or positive, found %s",
                   a->name, show(cx, c, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(mill >= 0.0 && mill < 1.0)) {
        diag_error(cx->diags, mp,
                   "%s: mill= (under-tolerance as a fraction of the wall) must be at least 0 "
                   "and below 1, found %s",
                   a->name, show_num(mill, b1, sizeof b1));
        return false;
    }
    double od, wall;
    if (!field_number(cx, a, 0, pipe, "od", DIM_L, &od) ||
        !field_number(cx, a, 0, pipe, "wall", DIM_L, &wall))
        return false;
    RatingResult res;
    RatingStatus st = rating_metallic(od, wall * (1.0 - mill), S, E, W, Y, c, &res);
    if (st == RATING_WALL_CONSUMED) {
        diag_error(cx->diags, cp,
                   "%s: the allowances leave no wall: t*(1 - mill) - c must be positive",
                   a->name);
        return false;
    }
    if (st != RATING_OK) {
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: the pipe's od and wall give no valid geometry (D - 2*Y*(t - c) <= 0)",
                   a->name);
        return false;
    }
    call_use_method(cx, &METHOD_RATING_B31);
    if (res.thick_wall)
        diag_warning(cx->diags, a->pos,
                     "%s: wall t >= D/6, outside the validity of ASME B31.3 304.1.2(a) "
                     "(t < D/6); thick-wall design per 304.1.2(b) is required",
                     a->name);
    if (!hasY && T > (900.0 - 32.0) * 5.0 / 9.0 + 273.15)
        diag_warning(cx->diags, a->pos,
                     "%s: Y = 0.4 holds below 900 degF (ASME B31.3 Table 304.1.1); give Y= "
                     "for %s",
                     a->name, show_temp(cx, T, b1, sizeof b1));
    return rating_record(cx, &res, 0.0, out);
}

bool fn_pressure_rating(CallCtx *cx, const CallArgs *a, Value *out)
{
    if (!kw_check(cx, a))
        return false;
    const Record *pipe;
    double T;
    if (!arg_record(cx, a, 0, "pipe", "pipe", &pipe) || !arg_temperature(cx, a, 1, &T))
        return false;
    const char *material = field_string(pipe, "material");
    if (material && strcmp(material, "bore") == 0) {
        /* A bore(...) names no material, so no derating table applies: it
         * is rated by the metallic pressure-design formula, which needs
         * only the geometry and the stress the engineer gives. */
        Pos hp;
        if (!record_get(pipe, "wall")) {
            diag_error(cx->diags, arg_at(a, 0),
                       "%s: this bore has no wall to rate; give bore(D, roughness, od=..., wall=...)", a->name);
            return false;
        }
        if (kw_get(a, "HDS", &hp)) {
            diag_error(cx->diags, hp,
                       "%s: a bore names no thermoplastic material with a derating table; rate it with S= and E= "
                       "(the pressure-design formula) or use the manufacturer's rating",
                       a->name);
            return false;
        }
        return rating_metal(cx, a, pipe, "bore", T, out);
    }
    switch (rating_kind(material)) {
    case RATING_THERMOPLASTIC:
        return rating_thermoplastic(cx, a, pipe, rating_plastic_lookup(material), T, out);
    case RATING_METALLIC:
        return rating_metal(cx, a, pipe, material, T, out);
    case RATING_UNKNOWN:
        break;
    }
    diag_error(cx->diags, arg_at(a, 0),
               "%s: no rating rule for material \"%s\" (known: PVC, CPVC, PEX; steel and "
               "copper with S= and E=)",
               a->name, material ? material : "");
    return false;
}

/* ---- wave_speed, surge, closure_time --------------------------------- */

bool fn_wave_speed(CallCtx *cx, const CallArgs *a, Value *out)
{
    if (!kw_check(cx, a))
        return false;
    const Record *pipe, *fluid;
    if (!arg_record(cx, a, 0, "pipe", "pipe", &pipe) ||
        !arg_record(cx, a, 1, "water", "fluid", &fluid))
        return false;
    double E, D, e, K, rho;
    const char *material = field_string(pipe, "material");
    if (material && strcmp(material, "bore") == 0 && (!record_get(pipe, "wall") || !record_get(pipe, "E"))) {
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: a bore needs its wall and the pipe material's elastic modulus for the wave speed; give "
                   "bore(D, roughness, wall=..., E=...)",
                   a->name);
        return false;
    }
    if (!record_get(pipe, "E") && field_string(pipe, "standard")) {
        const char *mat = field_string(pipe, "material");
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: no verified data for the elastic modulus of %s (%s pipe): no published "
                   "value could be checked, so headroom ships none; take E from the "
                   "manufacturer's data",
                   a->name, mat ? mat : "this material", field_string(pipe, "standard"));
        return false;
    }
    if (!field_number(cx, a, 0, pipe, "E", DIM_PRESSURE, &E) ||
        !field_number(cx, a, 0, pipe, "id", DIM_L, &D) ||
        !field_number(cx, a, 0, pipe, "wall", DIM_L, &e) ||
        !field_number(cx, a, 1, fluid, "K", DIM_PRESSURE, &K) ||
        !field_number(cx, a, 1, fluid, "rho", DIM_DENSITY, &rho))
        return false;

    SurgeSupport support = SURGE_SUPPORT_JOINTS;
    Pos sp;
    const Value *sv = kw_get(a, "support", &sp);
    if (sv) {
        const char *s = sv->kind == VAL_STRING ? sv->str : "";
        if (strcmp(s, "joints") == 0)
            support = SURGE_SUPPORT_JOINTS;
        else if (strcmp(s, "upstream") == 0)
            support = SURGE_SUPPORT_UPSTREAM;
        else if (strcmp(s, "anchored") == 0)
            support = SURGE_SUPPORT_ANCHORED;
        else {
            diag_error(cx->diags, sp,
                       "%s: support= must be \"joints\" (expansion joints throughout), "
                       "\"upstream\" (anchored at the upstream end) or \"anchored\" "
                       "(anchored throughout)",
                       a->name);
            return false;
        }
    }
    double nu = surge_poisson(field_string(pipe, "material"));
    bool has_nu;
    Pos np;
    if (!kw_number(cx, a, "poisson", DIM_NONE, &nu, &has_nu, &np))
        return false;
    char b1[128];
    if (has_nu && !(nu >= 0.0 && nu < 0.5)) {
        diag_error(cx->diags, np, "%s: poisson= must be at least 0 and below 0.5, found %s",
                   a->name, show_num(nu, b1, sizeof b1));
        return false;
    }
    if (support != SURGE_SUPPORT_JOINTS && nu < 0.0) {
        diag_error(cx->diags, sp,
                   "%s: no verified Poisson's ratio is tabulated for this pipe's material "
                   "(steel, PVC and CPVC are); give poisson=... from the manufacturer's data",
                   a->name);
        return false;
    }
    /* A thick wall (D/e below 25) needs the thick-walled c1, which needs
     * Poisson's ratio whatever the support. */
    bool thick = D / e < SURGE_THIN_WALL_RATIO && nu >= 0.0;
    double c1 = thick ? surge_support_c1_thick(support, nu, D, e) : surge_support_c1(support, nu);
    double speed;
    if (surge_wave_speed(K, rho, D, e, E, c1, &speed) != SURGE_OK) {
        diag_error(cx->diags, a->pos,
                   "%s: the pipe's E, id and wall and the fluid's K and rho must be positive",
                   a->name);
        return false;
    }
    call_use_method(cx, &METHOD_KORTEWEG);
    if (thick)
        call_use_method(cx, &METHOD_KORTEWEG_THICK);
    else if (D / e < SURGE_THIN_WALL_RATIO)
        diag_warning(cx->diags, a->pos,
                     "%s: D/e = %s is below 25 and no verified Poisson's ratio is tabulated "
                     "for this material, so the thin-wall factor was used; give poisson=... "
                     "for the thick-walled form",
                     a->name, show_num(D / e, b1, sizeof b1));
    *out = value_hinted(qty(speed, DIM_VELOCITY), "ft/s", "m/s");
    return true;
}

bool fn_surge(CallCtx *cx, const CallArgs *a, Value *out)
{
    double rho, c, dV;
    if (!arg_number(cx, a, 0, DIM_DENSITY, "density", &rho) ||
        !arg_number(cx, a, 1, DIM_VELOCITY, "wave speed", &c) ||
        !arg_number(cx, a, 2, DIM_VELOCITY, "velocity change", &dV))
        return false;
    char b1[128];
    if (!(rho > 0.0) || !isfinite(rho)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: density must be positive, found %s", a->name,
                   show(cx, rho, DIM_DENSITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(c > 0.0) || !isfinite(c)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: wave speed must be positive, found %s",
                   a->name, show(cx, c, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!isfinite(dV)) {
        diag_error(cx->diags, arg_at(a, 2), "%s: velocity change must be finite", a->name);
        return false;
    }
    call_use_method(cx, &METHOD_JOUKOWSKY);
    *out = pressure_value(surge_joukowsky(rho, c, dV));
    return true;
}

bool fn_closure_time(CallCtx *cx, const CallArgs *a, Value *out)
{
    double L, c;
    if (!arg_number(cx, a, 0, DIM_L, "pipe length", &L) ||
        !arg_number(cx, a, 1, DIM_VELOCITY, "wave speed", &c))
        return false;
    char b1[128];
    if (!(L >= 0.0) || !isfinite(L)) {
        diag_error(cx->diags, arg_at(a, 0), "%s: length must be zero or positive, found %s",
                   a->name, show(cx, L, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(c > 0.0) || !isfinite(c)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: wave speed must be positive, found %s",
                   a->name, show(cx, c, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    call_use_method(cx, &METHOD_CLOSURE);
    *out = value_hinted(qty(surge_closure_time(L, c), DIM_T), "s", "s");
    return true;
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
                     a->name, show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1),
                     show(cx, pc->q_min, DIM_FLOW, TEMP_NONE, b2, sizeof b2),
                     show(cx, pc->q_max, DIM_FLOW, TEMP_NONE, b3, sizeof b3));
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
    call_use_method(cx, &METHOD_PUMP);
    warn_extrapolated(cx, a, pc, Q);
    *out = head_value(pump_head(pc, Q));
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
                       a->name, i + 1, show(cx, Q[i], DIM_FLOW, TEMP_NONE, b1, sizeof b1));
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
                       show_num(k, b1, sizeof b1));
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
                   a->name, show_num(k, b1, sizeof b1));
        return false;
    }
    double Q, H;
    int count = 0;
    if (pump_operating_point(pc, Hs, k, &Q, &H, &count) != PUMP_OK) {
        diag_error(cx->diags, a->pos,
                   "%s: the pump curve and the system curve H = H_static + k*Q^2 do not meet "
                   "at Q >= 0 (pump shutoff head %s, static head %s)",
                   a->name, show(cx, pc->a, DIM_L, TEMP_NONE, b1, sizeof b1),
                   show(cx, Hs, DIM_L, TEMP_NONE, b2, sizeof b2));
        return false;
    }
    call_use_method(cx, &METHOD_PUMP);
    call_use_method(cx, &METHOD_OPERATING);
    if (count > 1)
        diag_warning(cx->diags, a->pos,
                     "%s: the curves meet twice at Q >= 0; the larger flow %s is taken",
                     a->name, show(cx, Q, DIM_FLOW, TEMP_NONE, b1, sizeof b1));
    warn_extrapolated(cx, a, pc, Q);
    Record *r = record_new(cx->arena, "operating_point", 2);
    record_set(r, 0, "Q", flow_value(Q));
    record_set(r, 1, "H", head_value(H));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}
