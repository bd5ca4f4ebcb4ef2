/* piping_lib.c — the calc functions pipe(), roughness() and k_fitting().
 *
 * Glue between the evaluator and the numeric cores in pipes.c,
 * roughness.c and fittings.c: check each argument's kind and dimension,
 * call the core, turn its status into a diagnostic at the argument that is
 * wrong (listing what would have been accepted), name the published method
 * used so the report can cite it, and warn when a value leaves the method's
 * validity range. Results are SI quantities with display hints. */
#include "library.h"

#include "methods/fittings.h"
#include "methods/pipes.h"
#include "methods/roughness.h"
#include "suggest.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

bool fn_pipe(CallCtx *cx, const CallArgs *a, Value *out);
bool fn_roughness(CallCtx *cx, const CallArgs *a, Value *out);
bool fn_k_fitting(CallCtx *cx, const CallArgs *a, Value *out);

#define INCH 0.0254

/* ---- methods, as the report cites them ---------------------------------- */

#define DIM_FORMULA "id = od - 2*wall"

static const Method METHOD_PIPE[PIPE_STANDARD_COUNT] = {
    [PIPE_ASME_B36_10M] = {"asme_b36_10m", "ASME B36.10M steel pipe dimensions", DIM_FORMULA,
                           "NPS 1/8 to 24; schedules 10, 40, 80, 160, STD, XS; nominal wall",
                           "ASME B36.10M, Welded and Seamless Wrought Steel Pipe, dimension table "
                           "(inch columns). ASME, New York. Every row checked against the table as "
                           "reproduced in python3-fluids 1.0.22 (fluids.piping)."},
    [PIPE_ASTM_D1785] = {"astm_d1785", "ASTM D1785 PVC schedule pipe dimensions", DIM_FORMULA,
                         "NPS 1/8 to 12; schedules 40, 80; average od, minimum wall",
                         "ASTM D1785, Standard Specification for Poly(Vinyl Chloride) (PVC) Plastic "
                         "Pipe, Schedules 40, 80, and 120, outside-diameter and wall-thickness "
                         "tables. ASTM International. Every row checked against python3-fluids "
                         "1.0.22 (fluids.piping) and SD-W, PVC Pipe Data, Schedule 40 and 80 "
                         "tables."},
    [PIPE_ASTM_F441] = {"astm_f441", "ASTM F441 CPVC schedule pipe dimensions", DIM_FORMULA,
                        "NPS 1/4 to 12; schedules 40, 80; average od, minimum wall",
                        "ASTM F441/F441M-09, Standard Specification for Chlorinated Poly(Vinyl "
                        "Chloride) (CPVC) Plastic Pipe, Schedules 40 and 80, inch-pound dimension "
                        "tables. ASTM International. Every row checked against python3-fluids "
                        "1.0.22 (fluids.piping) and Professional Plastics, CPVC Pipe - Sizes, "
                        "Specifications & Applications."},
    [PIPE_ASTM_D2241] = {"astm_d2241", "ASTM D2241 PVC pressure-rated (SDR) pipe dimensions",
                         DIM_FORMULA, "NPS 3/4 to 12; SDR 21, 26, 32.5; average od, minimum wall",
                         "ASTM D2241, Standard Specification for Poly(Vinyl Chloride) (PVC) "
                         "Pressure-Rated Pipe (SDR Series), outside-diameter and wall-thickness "
                         "tables. ASTM International. Every row checked against python3-fluids "
                         "1.0.22 (fluids.piping); 3 to 12 in also against the Hydraulic Institute "
                         "Engineering Data Book, Section IV, Table 4.E.2."},
    [PIPE_ASTM_B88] = {"astm_b88", "ASTM B88 copper water tube dimensions", DIM_FORMULA,
                       "nominal 1/4 to 6; types K, L, M; od = nominal + 1/8 in; nominal wall",
                       "ASTM B88, Standard Specification for Seamless Copper Water Tube, inch-pound "
                       "dimension table. ASTM International. Every row checked against the "
                       "Hydraulic Institute Engineering Data Book, Section IV, ASTM B88 table, "
                       "and (K, L) the Copper Development Association's Copper Tube Handbook, "
                       "Table 14.2f."},
    [PIPE_ASTM_F876] = {"astm_f876", "ASTM F876 PEX tubing dimensions", DIM_FORMULA,
                        "nominal 3/8 to 1, copper tube size od; SDR 9; average od, minimum wall",
                        "ASTM F876-24, Standard Specification for Crosslinked Polyethylene (PEX) "
                        "Tubing, dimension table. ASTM International. Every row checked against "
                        "the Pipe Fitter's Calculator PEX Tubing Chart and PEX Supply's PEX "
                        "Tubing Technical Specifications."},
};

static const Method METHOD_CRANE_K = {
    "crane_tp410_k", "Crane TP-410 resistance coefficient (equivalent length)", "K = f_T*L_e/D",
    "fully turbulent flow (Re ≥ 4000); 0.5 in ≤ D ≤ 24 in; valves fully open; butterfly "
    "valve L/D 45, 35, 25 for nominal sizes 2–8, 10–14, 16–24 in (the pipe record's nominal "
    "size, or one taken from the bore by the ASME B36.10M schedule 40 table)",
    "Crane Co. (2009). Flow of Fluids Through Valves, Fittings, and Pipe. Technical Paper "
    "No. 410, Stamford, CT, table \"Representative resistance coefficients (K) for valves and "
    "fittings\" (L/D). Each L/D checked against python3-fluids 1.0.22 (fluids.fittings, the "
    "Crane K functions)."};

static const Method METHOD_CRANE_FT = {
    "crane_ft", "Fully turbulent friction factor of clean commercial steel (fully rough Colebrook)",
    "f_T = 1/(2*log10(3.7*D/epsilon))^2",
    "zone of complete turbulence; ε = 0.0018 in (clean commercial steel)",
    "Crane Co. (2009). Flow of Fluids Through Valves, Fittings, and Pipe, TP-410, friction "
    "factors for clean commercial steel pipe in the zone of complete turbulence, here from "
    "the fully rough Colebrook limit (checked against python3-fluids 1.0.22 ft_Crane); "
    "Colebrook, C. F. (1939). J. Inst. Civil Eng. 11(4), 133-156."};

static const Method METHOD_CRANE_ENDS = {
    "crane_tp410_ends", "Crane TP-410 entrance and exit coefficients", NULL,
    "flush sharp-edged entrance K = 0.5; inward projecting K = 0.78; rounded K = 0.28 to 0.04 "
    "for r/d = 0.02 to 0.15 and above; exit K = 1.0",
    "Crane Co. (2009). Flow of Fluids Through Valves, Fittings, and Pipe. Technical Paper "
    "No. 410, Stamford, CT, pipe entrance and exit coefficients. Each checked against "
    "python3-fluids 1.0.22 (entrance_sharp, entrance_distance and entrance_rounded with "
    "method=\"Crane\", exit_normal)."};

static const Method METHOD_EXPANSION = {
    "borda_carnot", "Sudden enlargement (Borda-Carnot), referred to the small bore",
    "K = (1 - (D/D_2)^2)^2", "D ≤ D₂; turbulent flow",
    "Crane Co. (2009). Flow of Fluids Through Valves, Fittings, and Pipe, TP-410 (sudden "
    "enlargement, from the Borda-Carnot momentum balance)."};

static const Method METHOD_CONTRACTION = {
    "crane_contraction", "Sudden contraction, referred to the small bore",
    "K = 0.5*(1 - (D/D_2)^2)", "D ≤ D₂; turbulent flow",
    "Crane Co. (2009). Flow of Fluids Through Valves, Fittings, and Pipe, TP-410 (sudden "
    "contraction)."};

static const Method METHOD_HOOPER = {
    "hooper_2k", "Hooper 2-K method", "K = K_1/Re + K_inf*(1 + (1 in)/D)",
    "all Reynolds numbers; D the bore; fittings of line size, valves fully open",
    "Hooper, W. B. (1981). The two-K method predicts head losses in pipe fittings. Chemical "
    "Engineering 88(17), 96-100, Table 1. Constants checked against python3-fluids 1.0.22 "
    "(fluids.fittings.Hooper)."};

static const Method METHOD_DARBY = {
    "darby_3k", "Darby 3-K method", "K = K_1/Re + K_i*(1 + K_d/(D_n/(1 in))^0.3)",
    "all Reynolds numbers; D_n the nominal size (the pipe record's, or taken from the bore by "
    "the ASME B36.10M schedule 40 table); valves fully open",
    "Darby, R. (2001). Chemical Engineering Fluid Mechanics, 2nd ed. Marcel Dekker, New York, "
    "Table 7-3; Darby, R. (1999). Correlate pressure drops through fittings. Chemical "
    "Engineering 106(7), 101-104. Constants checked against python3-fluids 1.0.22 "
    "(fluids.fittings.Darby)."};

/* ---- shared helpers ----------------------------------------------------- */

/* A Method citing one roughness row, kept in the document's arena. */
static const Method *roughness_method(CallCtx *cx, const RoughnessRow *row)
{
    Method *m = arena_alloc(cx->arena, sizeof *m);
    m->key = arena_printf(cx->arena, "roughness:%s", row->name);
    m->title = arena_printf(cx->arena, "Absolute roughness of %s (new, clean pipe)", row->name);
    m->formula = NULL;
    m->validity = "new, clean pipe; aged or scaled pipe is rougher";
    m->reference = row->source;
    return m;
}

static const Method *modulus_method(CallCtx *cx, const PipeStandard *s)
{
    Method *m = arena_alloc(cx->arena, sizeof *m);
    m->key = arena_printf(cx->arena, "modulus:%s", s->material);
    m->title = arena_printf(cx->arena, "Elastic modulus of %s", s->material);
    m->formula = NULL;
    m->validity = s->id == PIPE_ASME_B36_10M || s->id == PIPE_ASTM_B88
                      ? "room temperature (70 °F); the modulus of a metal falls slowly as "
                        "temperature rises"
                      : "73 °F; a thermoplastic softens as temperature rises: its modulus "
                        "falls markedly above room temperature";
    m->reference = s->E_source;
    return m;
}

/* A string argument, or a pure number written as text (%g). */
static bool string_or_number(CallCtx *cx, const CallArgs *a, size_t i, const char *what,
                             char *buf, size_t n, bool *was_number, double *x)
{
    const Value *v = &a->args[i];
    *was_number = false;
    if (v->kind == VAL_NUMBER && dim_is_none(v->q.dim)) {
        *was_number = true;
        *x = v->q.si;
        snprintf(buf, n, "%g", v->q.si);
        return true;
    }
    if (v->kind == VAL_STRING) {
        snprintf(buf, n, "%s", v->str);
        return true;
    }
    char got[96];
    value_describe(v, cx->units, got, sizeof got);
    diag_error(cx->diags, arg_at(a, i), "%s: argument %zu (%s) must be a string in \"...\" or a pure number, found %s",
               a->name, i + 1, what, got);
    return false;
}

/* ---- pipe(STANDARD, SIZE, CLASS) ---------------------------------------- */

static void classes_at_size(const PipeStandard *s, const char *nps, char *buf, size_t n)
{
    size_t len = 0;
    buf[0] = '\0';
    for (size_t i = 0; i < pipe_row_count() && len < n; i++) {
        const PipeRow *r = pipe_row(i);
        if (r->standard != s->id || r->wall_in <= 0 || strcmp(r->nps, nps) != 0)
            continue;
        int w = snprintf(buf + len, n - len, "%s\"%s\"", len ? ", " : "", r->cls);
        if (w > 0)
            len += (size_t)w;
    }
}

static const char *size_text_of(const PipeStandard *s, double nps)
{
    for (size_t i = 0; i < pipe_row_count(); i++) {
        const PipeRow *r = pipe_row(i);
        double x;
        if (r->standard == s->id && pipe_size_parse(r->nps, &x) && fabs(x - nps) < 1e-6)
            return r->nps;
    }
    return NULL;
}

/* pipe("ASME B36.10M", "1-1/2", "40") -> record "pipe" with od, id, wall,
 * area (pi/4 id^2), roughness, E, sdr (plastics only: the nominal SDR of
 * D2241 and F876; od/minimum wall, as computed, for schedule plastic pipe),
 * material, standard, nps, class. SIZE and CLASS may be strings or pure
 * numbers (1.5, 40; 21 means SDR 21 for an SDR standard). */
bool fn_pipe(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *std_text;
    if (!kw_check(cx, a) || !arg_string(cx, a, 0, "STANDARD", &std_text))
        return false;
    const PipeStandard *s = pipe_standard_find(std_text);
    if (!s) {
        char list[256];
        pipe_standards_list(list, sizeof list);
        diag_error(cx->diags, arg_at(a, 0), "pipe: unknown standard \"%s\"; known standards: %s",
                   std_text, list);
        return false;
    }

    char size_text[64], cls_text[64], list[512];
    bool num;
    double nps = 0, cls_num = 0;
    if (!string_or_number(cx, a, 1, "SIZE", size_text, sizeof size_text, &num, &nps))
        return false;
    if (!num && !pipe_size_parse(size_text, &nps)) {
        diag_error(cx->diags, arg_at(a, 1),
                   "pipe: cannot read the size \"%s\"; write it as \"1-1/2\", \"1 1/2\", \"3/4\" or 1.5",
                   size_text);
        return false;
    }
    if (!string_or_number(cx, a, 2, "CLASS", cls_text, sizeof cls_text, &num, &cls_num))
        return false;

    PipeDims d;
    switch (pipe_lookup(s, nps, cls_text, &d)) {
    case PIPE_OK:
        break;
    case PIPE_UNKNOWN_STANDARD: /* cannot happen: s was found above */
        return false;
    case PIPE_BAD_SIZE:
    case PIPE_UNKNOWN_SIZE:
        pipe_sizes_list(s, NULL, list, sizeof list);
        diag_error(cx->diags, arg_at(a, 1), "pipe: %s has no size %s; its sizes are %s", s->name,
                   size_text, list);
        return false;
    case PIPE_UNKNOWN_CLASS:
        pipe_classes_list(s, list, sizeof list);
        diag_error(cx->diags, arg_at(a, 2), "pipe: %s has no class \"%s\"; its classes are %s",
                   s->name, cls_text, list);
        return false;
    case PIPE_NOT_IN_CLASS: {
        char sizes[512], canon[32];
        const char *nps_text = size_text_of(s, nps);
        classes_at_size(s, nps_text ? nps_text : "", list, sizeof list);
        pipe_sizes_list(s, cls_text, sizes, sizeof sizes);
        pipe_class_normalize(s, cls_text, canon, sizeof canon);
        diag_error(cx->diags, arg_at(a, 2),
                   "pipe: %s lists no \"%s\" at size %s; that size comes in %s, and \"%s\" in sizes %s",
                   s->name, canon, nps_text ? nps_text : size_text, list, canon, sizes);
        return false;
    }
    }

    const RoughnessRow *rough = NULL;
    roughness_lookup(s->roughness_of, &rough);
    call_use_method(cx, &METHOD_PIPE[s->id]);
    if (rough)
        call_use_method(cx, roughness_method(cx, rough));
    bool has_E = s->E > 0.0;
    if (has_E)
        call_use_method(cx, modulus_method(cx, s));

    bool has_sdr = s->id != PIPE_ASME_B36_10M && s->id != PIPE_ASTM_B88;
    Record *r = record_new(cx->arena, "pipe", 9 + (has_sdr ? 1 : 0) + (has_E ? 1 : 0));
    size_t i = 0;
    record_set(r, i++, "od", value_hinted(qty(d.od, DIM_L), "in", "mm"));
    record_set(r, i++, "id", value_hinted(qty(d.id, DIM_L), "in", "mm"));
    record_set(r, i++, "wall", value_hinted(qty(d.wall, DIM_L), "in", "mm"));
    record_set(r, i++, "area", value_hinted(qty(d.area, DIM_AREA), "in^2", "mm^2"));
    record_set(r, i++, "roughness", value_hinted(qty(d.roughness, DIM_L), "in", "mm"));
    if (has_E)
        record_set(r, i++, "E", value_hinted(qty(d.E, DIM_PRESSURE), "psi", "MPa"));
    if (has_sdr)
        record_set(r, i++, "sdr", value_number(qty_number(d.sdr)));
    record_set(r, i++, "material", value_string(s->material));
    record_set(r, i++, "standard", value_string(s->name));
    record_set(r, i++, "nps", value_string(d.row->nps));
    record_set(r, i++, "class", value_string(d.row->cls));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

/* ---- roughness(MATERIAL) ----------------------------------------------- */

bool fn_roughness(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *name;
    if (!kw_check(cx, a) || !arg_string(cx, a, 0, "MATERIAL", &name))
        return false;
    const RoughnessRow *row;
    if (roughness_lookup(name, &row) != ROUGHNESS_OK) {
        char list[512];
        roughness_list(list, sizeof list);
        diag_error(cx->diags, arg_at(a, 0), "roughness: unknown material \"%s\"; known materials: %s",
                   name, list);
        return false;
    }
    call_use_method(cx, roughness_method(cx, row));
    *out = value_hinted(qty(row->eps, DIM_L), "in", "mm");
    return true;
}

/* ---- k_fitting(KIND, D, Re, method=, D2=, r=) ----------------------------- */

static bool kw_length(CallCtx *cx, const CallArgs *a, const char *name, double *x, Pos *pos)
{
    const Value *v = kw_get(a, name, pos);
    if (!v)
        return true;
    if (v->kind != VAL_NUMBER || !dim_eq(v->q.dim, DIM_L)) {
        char got[96];
        value_describe(v, cx->units, got, sizeof got);
        diag_error(cx->diags, *pos, "%s: %s= must be a length, found %s", a->name, name, got);
        return false;
    }
    *x = v->q.si;
    return true;
}

/* k_fitting(KIND, D, Re, method="crane"|"hooper"|"darby", D2=, r=) -> K,
 * referred to the velocity in D. D2 is the larger bore of "expansion" (D
 * upstream) and "contraction" (D downstream); r the rounding radius of
 * "entrance rounded" (without it, a well rounded entrance, r/d >= 0.15). */
bool fn_k_fitting(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *kind_text;
    double D, Re;
    if (!kw_check(cx, a))
        return false;
    bool ok = arg_string(cx, a, 0, "KIND", &kind_text);
    /* D is a bore, or a pipe record: its id is the bore and its nominal
     * size chooses Crane's butterfly band and Darby's D_n. */
    double nps = 0.0;
    const Value *dv = a->n > 1 ? &a->args[1] : NULL;
    if (dv && dv->kind == VAL_RECORD && dv->rec && dv->rec->type &&
        strcmp(dv->rec->type, "pipe") == 0) {
        const Value *id = record_get(dv->rec, "id");
        const Value *nv = record_get(dv->rec, "nps");
        if (!id || id->kind != VAL_NUMBER || !dim_eq(id->q.dim, DIM_L)) {
            diag_error(cx->diags, arg_at(a, 1), "k_fitting: the pipe record has no bore 'id'");
            return false;
        }
        D = id->q.si;
        if (nv && nv->kind == VAL_STRING && !pipe_size_parse(nv->str, &nps))
            nps = 0.0;
    } else {
        ok = arg_number(cx, a, 1, DIM_L, "D, the bore (or a pipe record)", &D) && ok;
    }
    ok = arg_dimensionless(cx, a, 2, "Re, the Reynolds number", &Re) && ok;
    if (!ok)
        return false;

    FittingMethod m = FIT_CRANE;
    Pos mpos = a->pos;
    const Value *mv = kw_get(a, "method", &mpos);
    if (mv) {
        int mi = mv->kind == VAL_STRING ? fitting_method_parse(mv->str) : -1;
        if (mi < 0) {
            const char *w[FIT_METHOD_COUNT];
            for (int k = 0; k < FIT_METHOD_COUNT; k++)
                w[k] = fitting_method_name((FittingMethod)k);
            char choices[96];
            suggest_choices(choices, sizeof choices, w, FIT_METHOD_COUNT, "\"", " or ");
            diag_error(cx->diags, mpos, "k_fitting: method= must be %s%s%s%s", choices,
                       mv->kind == VAL_STRING ? ", found \"" : "", mv->kind == VAL_STRING ? mv->str : "",
                       mv->kind == VAL_STRING ? "\"" : "");
            return false;
        }
        m = (FittingMethod)mi;
    }

    char list[1024];
    FittingInput in = {fitting_kind_parse(kind_text), D, Re, 0.0, -1.0, nps};
    if (in.kind == FIT_NONE || !fitting_method_has(m, in.kind)) {
        fitting_method_kinds(m, list, sizeof list);
        diag_error(cx->diags, arg_at(a, 0), "k_fitting: the %s method has no fitting \"%s\"; its kinds are %s",
                   m == FIT_CRANE ? "Crane TP-410" : m == FIT_HOOPER ? "Hooper 2-K" : "Darby 3-K",
                   kind_text, list);
        return false;
    }

    Pos d2pos = a->pos, rpos = a->pos;
    if (!kw_length(cx, a, "D2", &in.D2, &d2pos) || !kw_length(cx, a, "r", &in.r, &rpos))
        return false;
    bool change = in.kind == FIT_EXPANSION || in.kind == FIT_CONTRACTION;
    if (kw_get(a, "D2", NULL) && !change) {
        diag_error(cx->diags, d2pos, "k_fitting: D2= applies only to \"expansion\" and \"contraction\"");
        return false;
    }
    if (kw_get(a, "r", NULL) && in.kind != FIT_ENTRANCE_ROUNDED) {
        diag_error(cx->diags, rpos, "k_fitting: r= applies only to \"entrance rounded\"");
        return false;
    }

    if (in.r < 0 && kw_get(a, "r", NULL)) {
        diag_error(cx->diags, rpos, "k_fitting: r= must not be negative");
        return false;
    }

    double K = 0;
    switch (fitting_k(m, &in, &K)) {
    case FIT_OK:
        break;
    case FIT_BAD_DIAMETER:
        diag_error(cx->diags, arg_at(a, 1), "k_fitting: the bore D must be positive, found %g m", D);
        return false;
    case FIT_BAD_RE:
        diag_error(cx->diags, arg_at(a, 2), "k_fitting: the Reynolds number must be positive, found %g", Re);
        return false;
    case FIT_NEEDS_D2:
        diag_error(cx->diags, a->pos,
                   "k_fitting: \"%s\" needs the larger bore as D2=...; D is the smaller bore, "
                   "whose velocity K is referred to",
                   fitting_kind_name(in.kind));
        return false;
    case FIT_BAD_D2:
        diag_error(cx->diags, d2pos,
                   "k_fitting: D2 (%g m) must be at least D (%g m): D is the smaller bore, D2 the larger",
                   in.D2, D);
        return false;
    case FIT_BAD_RADIUS:
        diag_error(cx->diags, rpos, "k_fitting: r= must be a finite length of 0 or more");
        return false;
    case FIT_NOT_TABULATED:
        return false;   /* reported above */
    }

    switch (m) {
    case FIT_CRANE:
        switch (in.kind) {
        case FIT_ENTRANCE_SHARP:
        case FIT_ENTRANCE_PROJECTING:
        case FIT_ENTRANCE_ROUNDED:
        case FIT_EXIT:
            call_use_method(cx, &METHOD_CRANE_ENDS);
            break;
        case FIT_EXPANSION: call_use_method(cx, &METHOD_EXPANSION); break;
        case FIT_CONTRACTION: call_use_method(cx, &METHOD_CONTRACTION); break;
        default: {
            double ft = fitting_crane_ft(D), ld = fitting_crane_LD_nps(in.kind, D, nps);
            MethodUse *u = call_begin_use(cx, &METHOD_CRANE_K);
            use_input(u, "f_T", ft, DIM_NONE);
            use_input_value(u, "L_e", value_hinted(qty(ld * D, DIM_L), "ft", "m"));
            use_input_value(u, "D", value_hinted(qty(D, DIM_L), "in", "mm"));
            use_result(u, K, DIM_NONE);
            char b1[48];
            snprintf(b1, sizeof b1, "%.4g", ld);
            use_branch(cx, u, "%s: L/D = %s (Crane), so Lₑ = %s·D.", fitting_kind_name(in.kind), b1, b1);
            MethodUse *t = call_begin_use(cx, &METHOD_CRANE_FT);
            use_input_value(t, "D", value_hinted(qty(D, DIM_L), "in", "mm"));
            use_input_value(t, "epsilon", value_hinted(qty(FIT_CRANE_EPS, DIM_L), "in", "mm"));
            use_result(t, ft, DIM_NONE);
            if (D < 0.5 * INCH || D > 24.0 * INCH)
                diag_warning(cx->diags, arg_at(a, 1),
                             "k_fitting: Crane's equivalent lengths and f_T cover bores of 1/2 to 24 in; "
                             "D = %.4g in is outside",
                             D / INCH);
            break;
        }
        }
        if (Re < 4000)
            diag_warning(cx->diags, arg_at(a, 2),
                         "k_fitting: Crane's K is for fully turbulent flow; at Re = %.4g the loss is "
                         "larger (method=\"darby\" or \"hooper\" follows Re)",
                         Re);
        break;
    case FIT_HOOPER: {
        double K1, Kinf;
        MethodUse *u = call_begin_use(cx, &METHOD_HOOPER);
        if (fitting_hooper_constants(in.kind, &K1, &Kinf)) {
            use_input(u, "K_1", K1, DIM_NONE);
            use_input(u, "Re", Re, DIM_NONE);
            use_input(u, "K_inf", Kinf, DIM_NONE);
            use_input_value(u, "D", value_hinted(qty(D, DIM_L), "in", "mm"));
            use_result(u, K, DIM_NONE);
            use_branch(cx, u, "%s: Hooper's constants K₁ = %.4g, K∞ = %.4g.", fitting_kind_name(in.kind), K1, Kinf);
        }
        break;
    }
    case FIT_DARBY: {
        double K1, Ki, Kd;
        MethodUse *u = call_begin_use(cx, &METHOD_DARBY);
        if (fitting_darby_constants(in.kind, &K1, &Ki, &Kd))
            use_branch(cx, u, "%s: Darby's constants K₁ = %.4g, Kᵢ = %.4g, Kd = %.4g in⁰˙³.",
                       fitting_kind_name(in.kind), K1, Ki, Kd);
        break;
    }
    default: break;
    }
    if (!isfinite(K)) {
        diag_error(cx->diags, a->pos, "k_fitting: the result is not a finite number");
        return false;
    }
    *out = value_number(qty_number(K));
    return true;
}
