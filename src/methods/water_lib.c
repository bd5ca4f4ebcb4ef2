/* water_lib.c — water(T[, p]) and npsh_available(): the calc functions of
 * the IAPWS water properties (water.c).
 *
 * Glue between the evaluator and the numeric core: each function checks its
 * arguments' dimensions, turns a core status into an error at the offending
 * argument, names the published method it applied (call_use_method) so the
 * report can show its formula, validity range and reference, and warns at
 * the call when an input lies outside the method's validity range. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/glue.h"
#include "methods/water.h"
#include "numfmt.h"

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
    if (!glue_arg_temperature(cx, a, 0, &T))
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
                   a->name, glue_show_temp(cx, T, b1, sizeof b1),
                   cx->units == UNITS_US ? "32 degF to 302 degF" : "0 degC to 150 degC");
        return false;
    case WATER_P_TOO_HIGH:
        diag_error(cx->diags, arg_at(a, 1),
                   "%s: pressure %s is above 100 MPa, the upper bound of IAPWS-IF97 region 1",
                   a->name, glue_show(cx, p, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    case WATER_P_BELOW_SATURATION:
        diag_error(cx->diags, a->n > 1 ? arg_at(a, 1) : arg_at(a, 0),
                   "%s: at %s (absolute) water at %s is steam: the saturation pressure is %s; "
                   "%s an absolute pressure of at least %s",
                   a->name, glue_show(cx, p, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1),
                   glue_show_temp(cx, T, b2, sizeof b2),
                   glue_show(cx, water_psat(T), DIM_PRESSURE, TEMP_NONE, b3, sizeof b3),
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
    if (!glue_field_number(cx, a, 1, w, "rho", DIM_DENSITY, &rho) ||
        !glue_field_number(cx, a, 1, w, "p_vap", DIM_PRESSURE, &p_vap))
        return false;
    if (!(p_abs > 0)) {
        char b1[64];
        diag_error(cx->diags, arg_at(a, 0), "%s: the absolute pressure on the surface is %s; it must be above zero",
                   a->name, glue_show(cx, p_abs, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (h_f < 0) {
        diag_error(cx->diags, arg_at(a, 3), "%s: the suction head loss must not be negative", a->name);
        return false;
    }
    MethodUse *u = call_begin_use(cx, &METHOD_NPSHA);
    Value pa = value_hinted(qty(p_abs, DIM_PRESSURE), "psi", "kPa");
    Value pv = value_hinted(qty(p_vap, DIM_PRESSURE), "psi", "kPa");
    pa.q.pref = pv.q.pref = PRES_ABSOLUTE;
    use_input_value(u, "p_abs", pa);
    use_input_value(u, "p_vap", pv);
    use_input(u, "rho", rho, DIM_DENSITY);
    use_input_value(u, "z_s", value_hinted(qty(z, DIM_L), "ft", "m"));
    use_input_value(u, "h_f", value_hinted(qty(h_f, DIM_L), "ft", "m"));
    double npsha = (p_abs - p_vap) / (rho * WATER_G) + z - h_f;
    use_result(u, npsha, DIM_L);
    if (npsha <= 0) {
        char b1[64];
        diag_warning(cx->diags, a->pos,
                     "%s: NPSHa is %s: the liquid flashes before it reaches the pump", a->name,
                     glue_show(cx, npsha, DIM_L, TEMP_NONE, b1, sizeof b1));
    }
    *out = value_hinted(qty(npsha, DIM_L), "ft", "m");
    return true;
}
