/* surge_lib.c — wave_speed(), surge() and closure_time(): the calc
 * functions of the pressure-surge methods (surge.c), with their Method
 * descriptors. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/glue.h"
#include "methods/surge.h"
#include "numfmt.h"

static const Method METHOD_KORTEWEG = {
    "korteweg",
    "Korteweg pressure-wave speed in a thin-walled elastic pipe",
    "a = sqrt((K/rho)/(1 + c_1*K*D/(E*e)))",
    "thin wall, D/e > 25; linear-elastic pipe; c₁ = 1 (expansion joints), 1 − ν/2 "
    "(anchored upstream), 1 − ν² (anchored throughout)",
    "Korteweg, D. J. (1878), Ann. Phys. 241(12), 525-542; in the form of Wylie, E. B. and "
    "Streeter, V. L. (1993), Fluid Transients in Systems, Prentice Hall, section 2.6.",
};

/* The thick-walled c1 of Wylie and Streeter, one descriptor per support
 * condition, so the formula a sheet shows is the one the calc used. */
#define THICK_TITLE "Pressure-wave speed in a thick-walled elastic pipe"
#define THICK_REFERENCE                                                                       \
    "Wylie, E. B. and Streeter, V. L. (1993), Fluid Transients in Systems, Prentice Hall, " \
    "section 2.6, thick-walled elastic conduits."
static const Method METHOD_KORTEWEG_THICK[] = {
    [SURGE_SUPPORT_JOINTS] = {"korteweg_thick", THICK_TITLE, "c_1 = 2*e/D*(1 + nu) + D/(D + e)",
                              "D/e below 25; linear-elastic pipe with expansion joints throughout",
                              THICK_REFERENCE},
    [SURGE_SUPPORT_UPSTREAM] = {"korteweg_thick", THICK_TITLE,
                                "c_1 = 2*e/D*(1 + nu) + D*(1 - nu/2)/(D + e)",
                                "D/e below 25; linear-elastic pipe anchored at its upstream end only",
                                THICK_REFERENCE},
    [SURGE_SUPPORT_ANCHORED] = {"korteweg_thick", THICK_TITLE,
                                "c_1 = 2*e/D*(1 + nu) + D*(1 - nu^2)/(D + e)",
                                "D/e below 25; linear-elastic pipe anchored throughout against "
                                "axial movement",
                                THICK_REFERENCE},
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
    const char *material = glue_field_string(pipe, "material");
    if (material && strcmp(material, "bore") == 0 && (!record_get(pipe, "wall") || !record_get(pipe, "E"))) {
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: a bore needs its wall and the pipe material's elastic modulus for the wave speed; give "
                   "bore(D, roughness, wall=..., E=...)",
                   a->name);
        return false;
    }
    if (!record_get(pipe, "E") && glue_field_string(pipe, "standard")) {
        const char *mat = glue_field_string(pipe, "material");
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: no verified data for the elastic modulus of %s (%s pipe): no published "
                   "value could be checked, so headroom ships none; take E from the "
                   "manufacturer's data",
                   a->name, mat ? mat : "this material", glue_field_string(pipe, "standard"));
        return false;
    }
    if (!glue_field_number(cx, a, 0, pipe, "E", DIM_PRESSURE, &E) ||
        !glue_field_number(cx, a, 0, pipe, "id", DIM_L, &D) ||
        !glue_field_number(cx, a, 0, pipe, "wall", DIM_L, &e) ||
        !glue_field_number(cx, a, 1, fluid, "K", DIM_PRESSURE, &K) ||
        !glue_field_number(cx, a, 1, fluid, "rho", DIM_DENSITY, &rho))
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
    double nu = surge_poisson(glue_field_string(pipe, "material"));
    bool has_nu;
    Pos np;
    if (!glue_kw_number(cx, a, "poisson", DIM_NONE, &nu, &has_nu, &np))
        return false;
    char b1[128];
    if (has_nu && !(nu >= 0.0 && nu < 0.5)) {
        diag_error(cx->diags, np, "%s: poisson= must be at least 0 and below 0.5, found %s",
                   a->name, glue_show_num(nu, b1, sizeof b1));
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
    MethodUse *u = call_begin_use(cx, &METHOD_KORTEWEG);
    use_input_value(u, "K", value_hinted(qty(K, DIM_PRESSURE), "psi", "MPa"));
    use_input(u, "rho", rho, DIM_DENSITY);
    use_input(u, "c_1", c1, DIM_NONE);
    use_input_value(u, "D", value_hinted(qty(D, DIM_L), "in", "mm"));
    use_input_value(u, "E", value_hinted(qty(E, DIM_PRESSURE), "psi", "MPa"));
    use_input_value(u, "e", value_hinted(qty(e, DIM_L), "in", "mm"));
    use_result(u, speed, DIM_VELOCITY);
    /* the support condition and the c1 it gives, with Poisson's ratio where used */
    static const char *const support_words[] = {
        [SURGE_SUPPORT_JOINTS] = "with expansion joints throughout",
        [SURGE_SUPPORT_UPSTREAM] = "anchored at its upstream end only",
        [SURGE_SUPPORT_ANCHORED] = "anchored throughout against axial movement",
    };
    static const char *const c1_thin[] = {
        [SURGE_SUPPORT_JOINTS] = "c₁ = 1",
        [SURGE_SUPPORT_UPSTREAM] = "c₁ = 1 − ν/2",
        [SURGE_SUPPORT_ANCHORED] = "c₁ = 1 − ν²",
    };
    char nu_text[128] = "", c1_text[64];
    glue_show_num(c1, c1_text, sizeof c1_text);
    if (thick || support != SURGE_SUPPORT_JOINTS) {
        char b[48];
        snprintf(nu_text, sizeof nu_text, " with Poisson's ratio ν = %s%s", glue_show_num(nu, b, sizeof b),
                 has_nu ? " (as given)" : "");
    }
    if (thick)
        use_branch(cx, u,
                   "Pipe %s, thick wall (D/e = %.1f, below 25): c₁ = 2·e/D·(1 + ν) + %s/(D + e) = %s%s.",
                   support_words[support], D / e,
                   support == SURGE_SUPPORT_JOINTS    ? "D"
                   : support == SURGE_SUPPORT_UPSTREAM ? "D·(1 − ν/2)"
                                                      : "D·(1 − ν²)",
                   c1_text, nu_text);
    else
        use_branch(cx, u, "Pipe %s: %s%s%s%s.", support_words[support], c1_thin[support],
                   support == SURGE_SUPPORT_JOINTS ? "" : " = ", support == SURGE_SUPPORT_JOINTS ? "" : c1_text,
                   nu_text);
    if (thick) {
        /* the thick-walled formula of the support used, its values substituted */
        MethodUse *t = call_begin_use(cx, &METHOD_KORTEWEG_THICK[support]);
        use_input_value(t, "e", value_hinted(qty(e, DIM_L), "in", "mm"));
        use_input_value(t, "D", value_hinted(qty(D, DIM_L), "in", "mm"));
        use_input(t, "nu", nu, DIM_NONE);
        use_result(t, c1, DIM_NONE);
    } else if (D / e < SURGE_THIN_WALL_RATIO)
        diag_warning(cx->diags, a->pos,
                     "%s: D/e = %s is below 25 and no verified Poisson's ratio is tabulated "
                     "for this material, so the thin-wall factor was used; give poisson=... "
                     "for the thick-walled form",
                     a->name, glue_show_num(D / e, b1, sizeof b1));
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
                   glue_show(cx, rho, DIM_DENSITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(c > 0.0) || !isfinite(c)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: wave speed must be positive, found %s",
                   a->name, glue_show(cx, c, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!isfinite(dV)) {
        diag_error(cx->diags, arg_at(a, 2), "%s: velocity change must be finite", a->name);
        return false;
    }
    MethodUse *u = call_begin_use(cx, &METHOD_JOUKOWSKY);
    use_input(u, "rho", rho, DIM_DENSITY);
    use_input_value(u, "a", value_hinted(qty(c, DIM_VELOCITY), "ft/s", "m/s"));
    use_input_value(u, "Delta_V", value_hinted(qty(dV, DIM_VELOCITY), "ft/s", "m/s"));
    *out = glue_pressure_value(surge_joukowsky(rho, c, dV));
    use_result(u, out->q.si, DIM_PRESSURE);
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
                   a->name, glue_show(cx, L, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(c > 0.0) || !isfinite(c)) {
        diag_error(cx->diags, arg_at(a, 1), "%s: wave speed must be positive, found %s",
                   a->name, glue_show(cx, c, DIM_VELOCITY, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    MethodUse *u = call_begin_use(cx, &METHOD_CLOSURE);
    use_input_value(u, "L", value_hinted(qty(L, DIM_L), "ft", "m"));
    use_input_value(u, "a", value_hinted(qty(c, DIM_VELOCITY), "ft/s", "m/s"));
    *out = value_hinted(qty(surge_closure_time(L, c), DIM_T), "s", "s");
    use_result(u, out->q.si, DIM_T);
    return true;
}
