/* ratings_lib.c — pressure_rating(pipe, T, ...): the calc function of the
 * pressure ratings (ratings.c), thermoplastic pipe derated for temperature
 * and metallic pipe by the pressure design equation, with their Method
 * descriptors. */
#include "library.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "builtin_fns.h"
#include "constants.h"
#include "methods/glue.h"
#include "methods/ratings.h"
#include "numfmt.h"

static const Method METHOD_RATING_PVC = {
    "rating_pvc",
    "Thermoplastic pressure rating, PVC 1120, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 140 °F (F_T = 1.00 at and below 73.4 °F); water",
    "ISO 161-1 / ASTM D2837 pressure rating relation as used by ASTM D1785 and D2241; "
    "HDS 2000 psi for PVC 1120 at 73.4 °F (HDB 4000 psi, service factor 0.5, ASTM D2241 "
    "appendix, as given in Moser, Buried Pipe Design, ch. 4); ASTM D2241 pressure classes "
    "from the Hydraulic Institute Engineering Data Book, Table 4.E.2; derating factors "
    "from GF Harvel, Temperature Derating, Schedule 40 & 80 PVC pipe, linear between rows. "
    "Verify against the manufacturer's current data.",
};

static const Method METHOD_RATING_CPVC = {
    "rating_cpvc",
    "Thermoplastic pressure rating, CPVC 4120, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 200 °F (derating factor 1.00 at and below 80 °F); water",
    "ISO 161-1 / ASTM D2837 pressure rating relation as used by ASTM F441; HDS 2000 psi for "
    "CPVC 4120 at 73.4 °F (U.S. Plastic Corp., CPVC pipe physical properties); derating "
    "factors from GF Harvel, CPVC Industrial Pipe Temperature Derating, linear between "
    "rows. Verify against the manufacturer's current data.",
};

static const Method METHOD_RATING_PEX = {
    "rating_pex",
    "Thermoplastic pressure rating, PEX, with temperature derating",
    "p = 2*HDS/(SDR - 1)*F_T",
    "73.4 °F ≤ T ≤ 180 °F (derating factor 1.00 at and below 73.4 °F); water",
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

/* ---- pressure_rating(pipe, T, ...) ------------------------------------ */

/* rated, derate, p; with a pressure class (p_class > 0, ASTM D2241 pipe at
 * the standard's HDS) also p_class = class*derate, placed before p, the
 * same figure unrounded. */
static bool rating_record(CallCtx *cx, const RatingResult *res, double p_class, Value *out)
{
    Record *r = record_new(cx->arena, "rating", p_class > 0.0 ? 4 : 3);
    size_t i = 0;
    record_set(r, i++, "rated", glue_pressure_value(res->rated));
    record_set(r, i++, "derate", value_number(qty_number(res->derate)));
    if (p_class > 0.0)
        record_set(r, i++, "p_class", glue_pressure_value(p_class * res->derate));
    record_set(r, i++, "p", glue_pressure_value(res->p));
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
    if (!glue_kw_number(cx, a, "HDS", DIM_PRESSURE, &hds, NULL, NULL))
        return false;
    double sdr = 0.0;
    const Value *sv = record_get(pipe, "sdr");
    if (sv && sv->kind == VAL_NUMBER && dim_is_none(sv->q.dim) && sv->q.si > 1.0) {
        sdr = sv->q.si;
    } else {
        double od, wall;
        if (!glue_field_number(cx, a, 0, pipe, "od", DIM_L, &od) ||
            !glue_field_number(cx, a, 0, pipe, "wall", DIM_L, &wall))
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
                   a->name, glue_show_temp(cx, T, b1, sizeof b1),
                   glue_show_temp(cx, (m->table[m->n - 1][0] - 32.0) * 5.0 / 9.0 + 273.15, b2,
                             sizeof b2),
                   m->designation, m->material);
        return false;
    default:
        diag_error(cx->diags, arg_at(a, 0),
                   "%s: the pipe's dimension ratio SDR = %s must be greater than 1", a->name,
                   glue_show_num(sdr, b1, sizeof b1));
        return false;
    }
    const Method *rm = strcmp(m->material, "PVC") == 0    ? &METHOD_RATING_PVC
                       : strcmp(m->material, "CPVC") == 0 ? &METHOD_RATING_CPVC
                                                          : &METHOD_RATING_PEX;
    MethodUse *u = call_begin_use(cx, rm);
    use_input_value(u, "HDS", value_hinted(qty(hds > 0.0 ? hds : m->hds, DIM_PRESSURE), "psi", "MPa"));
    use_input(u, "SDR", res.sdr, DIM_NONE);
    use_input(u, "F_T", res.derate, DIM_NONE);
    use_result(u, res.p, DIM_PRESSURE);
    {
        /* the temperature as printed: 35.00 °C, not the calc's spelling degC */
        char ft[48], tt[64];
        glue_show_temp(cx, T, tt, sizeof tt);
        char *deg = strstr(tt, " deg");
        if (deg && (deg[4] == 'C' || deg[4] == 'F') && deg[5] == '\0')
            snprintf(deg, sizeof tt - (size_t)(deg - tt), " °%c", deg[4] == 'C' ? 'C' : 'F');
        use_branch(cx, u,
                   "Derating factor %s read at %s from the %s derating table (linear between "
                   "rows); HDS %s; SDR = %s from the pipe's %s.",
                   glue_show_num(res.derate, ft, sizeof ft), tt, m->material,
                   hds > 0.0 ? "as given" : "of the material at 73.4 °F",
                   glue_show_num(res.sdr, b1, sizeof b1), sv && sv->kind == VAL_NUMBER ? "dimension ratio" : "od and wall");
    }
    const char *standard = glue_field_string(pipe, "standard");
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
    if (!glue_kw_number(cx, a, "S", DIM_PRESSURE, &S, &hasS, &sp) ||
        !glue_kw_number(cx, a, "E", DIM_NONE, &E, &hasE, &ep) ||
        !glue_kw_number(cx, a, "W", DIM_NONE, &W, NULL, &wp) ||
        !glue_kw_number(cx, a, "Y", DIM_NONE, &Y, &hasY, &yp) ||
        !glue_kw_number(cx, a, "c", DIM_L, &c, NULL, &cp) ||
        !glue_kw_number(cx, a, "mill", DIM_NONE, &mill, NULL, &mp))
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
                   glue_show(cx, S, DIM_PRESSURE, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(E > 0.0 && E <= 1.0)) {
        diag_error(cx->diags, ep, "%s: E= must be above 0 and at most 1, found %s", a->name,
                   glue_show_num(E, b1, sizeof b1));
        return false;
    }
    if (!(W > 0.0 && W <= 1.0)) {
        diag_error(cx->diags, wp, "%s: W= must be above 0 and at most 1, found %s", a->name,
                   glue_show_num(W, b1, sizeof b1));
        return false;
    }
    if (!(Y >= 0.0 && Y < 1.0)) {
        diag_error(cx->diags, yp, "%s: Y= must be at least 0 and below 1, found %s", a->name,
                   glue_show_num(Y, b1, sizeof b1));
        return false;
    }
    if (!(c >= 0.0)) {
        diag_error(cx->diags, cp, "%s: c= (allowances) must be zero or positive, found %s",
                   a->name, glue_show(cx, c, DIM_L, TEMP_NONE, b1, sizeof b1));
        return false;
    }
    if (!(mill >= 0.0 && mill < 1.0)) {
        diag_error(cx->diags, mp,
                   "%s: mill= (under-tolerance as a fraction of the wall) must be at least 0 "
                   "and below 1, found %s",
                   a->name, glue_show_num(mill, b1, sizeof b1));
        return false;
    }
    double od, wall;
    if (!glue_field_number(cx, a, 0, pipe, "od", DIM_L, &od) ||
        !glue_field_number(cx, a, 0, pipe, "wall", DIM_L, &wall))
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
    MethodUse *u = call_begin_use(cx, &METHOD_RATING_B31);
    use_input_value(u, "S", value_hinted(qty(S, DIM_PRESSURE), "psi", "MPa"));
    use_input(u, "E", E, DIM_NONE);
    use_input(u, "W", W, DIM_NONE);
    use_input_value(u, "t", value_hinted(qty(wall * (1.0 - mill), DIM_L), "in", "mm"));
    use_input_value(u, "c", value_hinted(qty(c, DIM_L), "in", "mm"));
    use_input_value(u, "D", value_hinted(qty(od, DIM_L), "in", "mm"));
    use_input(u, "Y", Y, DIM_NONE);
    use_result(u, res.p, DIM_PRESSURE);
    if (mill > 0.0) {
        char m1[48];
        use_branch(cx, u, "t is the nominal wall less the mill under-tolerance of %s%%; D is the outside diameter.",
                   glue_show_num(mill * 100.0, m1, sizeof m1));
    }
    if (res.thick_wall)
        diag_warning(cx->diags, a->pos,
                     "%s: wall t ≥ D/6, outside the validity of ASME B31.3 304.1.2(a) "
                     "(t < D/6); thick-wall design per 304.1.2(b) is required",
                     a->name);
    if (!hasY && T > (900.0 - 32.0) * 5.0 / 9.0 + 273.15)
        diag_warning(cx->diags, a->pos,
                     "%s: Y = 0.4 holds below 900 °F (ASME B31.3 Table 304.1.1); give Y= "
                     "for %s",
                     a->name, glue_show_temp(cx, T, b1, sizeof b1));
    return rating_record(cx, &res, 0.0, out);
}

bool fn_pressure_rating(CallCtx *cx, const CallArgs *a, Value *out)
{
    if (!kw_check(cx, a))
        return false;
    const Record *pipe;
    double T;
    if (!arg_record(cx, a, 0, "pipe", "pipe", &pipe) || !glue_arg_temperature(cx, a, 1, &T))
        return false;
    const char *material = glue_field_string(pipe, "material");
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
