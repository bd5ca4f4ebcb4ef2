/* demand_lib.c — the calc functions wsfu(), hunter() and peak_demand().
 *
 * Glue between the evaluator and the tables and models of demand.c
 * (DESIGN 2.11): read the arguments, find the code the front matter's
 * `code:` names, look the fixture up in that code's load table, and cite
 * the very row used so the report can name code, edition, table and row.
 * A table or row that is not shipped — because no published copy of it
 * could be verified — is refused with a message that says so, never
 * replaced by an unverified number. */
#include "library.h"

#include "methods/demand.h"
#include "methods/devices_lib.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

bool fn_wsfu(CallCtx *cx, const CallArgs *a, Value *out);
bool fn_hunter(CallCtx *cx, const CallArgs *a, Value *out);
bool fn_peak_demand(CallCtx *cx, const CallArgs *a, Value *out);

#define GPM (0.003785411784 / 60.0) /* 1 gal/min in m^3/s: 231 in^3 per minute */

static const PlumbingCode *code_of(const CallCtx *cx)
{
    const PlumbingCode *c = cx->code ? plumbing_code_find(cx->code) : NULL;
    return c ? c : plumbing_code_default();
}

/* A keyword argument that must be one of a few strings; -1 when absent,
 * -2 after an error. */
static int kw_choice(CallCtx *cx, const CallArgs *a, const char *name, const char *const *choices)
{
    Pos at;
    const Value *v = kw_get(a, name, &at);
    if (!v)
        return -1;
    char list[160] = "";
    size_t len = 0;
    for (int i = 0; choices[i]; i++) {
        if (v->kind == VAL_STRING && strcmp(v->str, choices[i]) == 0)
            return i;
        int w = snprintf(list + len, sizeof list - len, "%s\"%s\"", i ? " or " : "", choices[i]);
        if (w > 0 && (size_t)w < sizeof list - len)
            len += (size_t)w;
    }
    if (v->kind == VAL_STRING) {
        diag_error(cx->diags, at, "%s: %s= must be %s, found \"%s\"", a->name, name, list, v->str);
    } else {
        char got[96];
        value_describe(v, cx->units, got, sizeof got);
        diag_error(cx->diags, at, "%s: %s= must be %s, found %s", a->name, name, list, got);
    }
    return -2;
}

static const char *const USES[] = {"private", "public", NULL};
static const char *const SIDES[] = {"cold", "hot", "total", NULL};
static const char *const SYSTEMS[] = {"flush tank", "flush valve", NULL};

/* The Method that cites one row of a load table, kept in the arena. */
static const Method *load_method(CallCtx *cx, const PlumbingCode *c, const FixtureLoadRow *r)
{
    Method *m = arena_alloc(cx->arena, sizeof *m);
    char cold[32], hot[32];
    snprintf(cold, sizeof cold, isnan(r->cold) ? "no cold" : "%g cold", r->cold);
    snprintf(hot, sizeof hot, isnan(r->hot) ? "no hot" : "%g hot", r->hot);
    m->key = arena_printf(cx->arena, "wsfu:%s:%s:%d", c->key, r->kind, (int)r->use);
    m->title = arena_printf(cx->arena, "Water supply fixture units of a %s (%s, %s): %s, %s, %g total",
                            r->kind, r->occupancy, r->control, cold, hot, r->total);
    m->formula = NULL;
    m->validity = "the load of one fixture; loads add, demands do not";
    m->reference = arena_printf(cx->arena,
                                "%s, %s, row \"%s\", %s, %s (checked row by row against a published "
                                "copy of that table)",
                                c->name, c->load_table, r->kind, r->occupancy, r->control);
    return m;
}

/* The diagnostic for a kind that is not found. */
static void load_error(CallCtx *cx, const PlumbingCode *c, const char *fn, Pos at, const char *kind,
                       LoadStatus st, FixtureUse use)
{
    if (st == LOAD_NO_TABLE) {
        diag_error(cx->diags, at,
                   "%s: %s ships no fixture load table: %s; take each fixture's load from that code "
                   "and enter it as a number (hunter() reads a total load)",
                   fn, c->key, c->why_no_loads ? c->why_no_loads : "it has no rows");
    } else if (st == LOAD_NOT_SHIPPED) {
        diag_error(cx->diags, at,
                   "%s: the %s row for \"%s\" (%s) is not shipped: it could not be verified "
                   "against a published copy of the table; take that load from the code adopted "
                   "for the project and enter it as a number",
                   fn, c->key, kind, c->load_table);
    } else if (st == LOAD_NO_USE) {
        char uses[64];
        fixture_uses_list(c, kind, uses, sizeof uses);
        diag_error(cx->diags, at, "%s: %s (%s) lists \"%s\" for %s use only, not %s", fn, c->key,
                   c->load_table, kind, uses, use == FIXTURE_PUBLIC ? "public" : "private");
    } else {
        const char *near = fixture_kind_nearest(c, kind);
        if (near) {
            diag_error(cx->diags, at, "%s: unknown fixture kind \"%s\"; did you mean \"%s\"?", fn,
                       kind, near);
        } else {
            char list[1024];
            fixture_kinds_list(c, list, sizeof list);
            diag_error(cx->diags, at, "%s: unknown fixture kind \"%s\"; the shipped rows of %s %s are %s",
                       fn, kind, c->key, c->load_table, list);
        }
    }
}

/* ---- wsfu(KIND, water=, use=) ------------------------------------------- */

/* wsfu("lavatory", water="hot", use="public") -> the load in water supply
 * fixture units (a pure number), from the load table of the front matter's
 * code. water= defaults to "total"; without use= the private row is taken
 * where the table has one, else its only row. */
bool fn_wsfu(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *kind;
    if (!kw_check(cx, a) || !arg_string(cx, a, 0, "KIND", &kind))
        return false;
    int side = kw_choice(cx, a, "water", SIDES);
    int use = kw_choice(cx, a, "use", USES);
    if (side == -2 || use == -2)
        return false;
    const PlumbingCode *c = code_of(cx);
    FixtureUse fu = use < 0 ? FIXTURE_USE_ANY : (FixtureUse)use;
    const FixtureLoadRow *row = NULL;
    LoadStatus st = fixture_load_find(c, kind, fu, &row);
    if (st != LOAD_OK) {
        load_error(cx, c, "wsfu", arg_at(a, 0), kind, st, fu);
        return false;
    }
    call_use_method(cx, load_method(cx, c, row));
    WaterSide w = side < 0 ? WATER_TOTAL : (WaterSide)side;
    *out = value_number(qty_number(fixture_load_value(row, w)));
    return true;
}

/* ---- hunter(LOAD, system=) ------------------------------------------------ */

bool demand_hunter_flow(CallCtx *cx, const char *system, double load, Pos at, double *Q)
{
    DemandSystem ds = strcmp(system, "flush valve") == 0 ? SYSTEM_FLUSH_VALVE : SYSTEM_FLUSH_TANK;
    const PlumbingCode *c = code_of(cx);
    double gpm, first = 0, last = 0;
    size_t lo = 0, hi = 0;
    switch (demand_interpolate(c->demand, c->ndemand, ds, load, &gpm, &lo, &hi)) {
    case DEMAND_OK:
        break;
    case DEMAND_NO_TABLE:
        if (c->demand && c->why_no_valve) {
            diag_error(cx->diags, at,
                       "hunter: %s ships no demand table for flush valve systems: %s; enter the demand "
                       "as a flow taken from the code adopted for the project, or enter that table as a "
                       "```curve block of demand against load in wsfu and read it as NAME(load) (in a "
                       "path: demand: NAME)",
                       c->key, c->why_no_valve);
            return false;
        }
        diag_error(cx->diags, at,
                   "hunter: the %s demand table (%s) is not shipped: %s; enter the demand as a flow "
                   "taken from the code adopted for the project, or enter that code's demand table as a "
                   "```curve block of demand against load in wsfu and read it as NAME(load) (in a path: "
                   "demand: NAME)",
                   c->key, c->demand_table, c->why_no_demand ? c->why_no_demand : "it has no rows");
        return false;
    case DEMAND_BAD_LOAD:
        diag_error(cx->diags, at, "hunter: the load is not a finite number");
        return false;
    case DEMAND_BELOW:
    case DEMAND_ABOVE:
        demand_column_range(c->demand, c->ndemand, ds, &first, &last);
        diag_error(cx->diags, at,
                   "hunter: a load of %g wsfu is outside %s %s for %s systems, which runs from %g "
                   "to %g wsfu",
                   load, c->key, c->demand_table, SYSTEMS[ds], first, last);
        return false;
    }
    Method *m = arena_alloc(cx->arena, sizeof *m);
    m->key = arena_printf(cx->arena, "hunter:%s:%d:%zu:%zu", c->key, (int)ds, lo, hi);
    /* the rows read, with their demands, so the interpolation can be redone from the sheet */
    double q_lo = ds == SYSTEM_FLUSH_VALVE ? c->demand[lo].q_valve : c->demand[lo].q_tank;
    double q_hi = ds == SYSTEM_FLUSH_VALVE ? c->demand[hi].q_valve : c->demand[hi].q_tank;
    if (lo == hi)
        m->title = arena_printf(cx->arena,
                                "Peak demand by Hunter's curve, %s systems: the row %g wsfu, %g gal/min",
                                SYSTEMS[ds], c->demand[lo].load, q_lo);
    else
        m->title = arena_printf(cx->arena,
                                "Peak demand by Hunter's curve, %s systems: linear between the rows "
                                "L₁ = %g wsfu, Q₁ = %g gal/min and L₂ = %g wsfu, Q₂ = %g gal/min",
                                SYSTEMS[ds], c->demand[lo].load, q_lo, c->demand[hi].load, q_hi);
    m->formula = lo == hi ? NULL : "Q = Q_1 + (Q_2 - Q_1)*(L - L_1)/(L_2 - L_1)";
    m->validity = "total loads within the table; the demand of fixtures, not of continuous uses";
    m->reference = arena_printf(cx->arena, "%s, %s", c->name, c->demand_table);
    call_use_method(cx, m);
    *Q = gpm * GPM;
    return true;
}

/* `demand: NAME` in a path: the segment's demand read from the calc's own
 * curve of demand (a flow) against load (wsfu) — the table of the code
 * adopted for the project as the engineer enters and cites it. Read between
 * its rows by the curve's interpolation; a load outside its rows is refused
 * (a demand table is not extrapolated), as hunter() refuses one. */
bool demand_curve_flow(CallCtx *cx, const Value *curve, double load, Pos at, bool node, const char *id, double *Q)
{
    const CurveData *cd = curve_of(curve);
    if (!cd) {
        char got[96];
        value_describe(curve, cx->units, got, sizeof got);
        diag_error(cx->diags, at, "demand: expected the name of a ```curve block of demand against load, found %s", got);
        return false;
    }
    if (!dim_is_none(cd->x_dim) || cd->x_temp != TEMP_NONE || !dim_eq(cd->y_dim, DIM_FLOW)) {
        char x[96], y[96];
        dim_describe(cd->x_dim, cd->x_temp, cx->units, x, sizeof x);
        dim_describe(cd->y_dim, cd->y_temp, cx->units, y, sizeof y);
        diag_error(cx->diags, at,
                   "demand: curve '%s' must give a flow against a load in water supply fixture units (a pure "
                   "number), but it gives %s against %s",
                   cd->name, y, x);
        return false;
    }
    const Curve *c = &cd->curve;
    if (!isfinite(load) || curve_side(c, load) != 0) {
        diag_error(cx->diags, at,
                   "demand: %s %s carries %g wsfu, outside curve '%s', which runs from %g to %g wsfu; a "
                   "demand table is not extrapolated: extend the curve with rows of the adopted code's table",
                   node ? "node" : "segment", id, load, cd->name, c->x[0], c->x[c->n - 1]);
        return false;
    }
    double q = curve_eval(c, load, NULL);
    if (!isfinite(q) || q < 0) {
        diag_error(cx->diags, at, "demand: curve '%s' gives no finite demand at %g wsfu", cd->name, load);
        return false;
    }
    Method *m = arena_alloc(cx->arena, sizeof *m);
    bool loglog = c->interp == CURVE_LOGLOG;
    m->key = arena_printf(cx->arena, node ? "demand_curve_node:%s" : "demand_curve:%s", cd->name);
    m->title = arena_printf(cx->arena,
                            "Peak demand of each %s by the curve %s (demand against load), %s between its rows",
                            node ? "node's fixture load" : "segment's summed fixture load", cd->name,
                            loglog ? "log-log" : "linear");
    m->formula = loglog ? "Q = Q_1*(L/L_1)^(ln(Q_2/Q_1)/ln(L_2/L_1))" : "Q = Q_1 + (Q_2 - Q_1)*(L - L_1)/(L_2 - L_1)";
    m->validity = "loads within the curve's rows; the demand of fixtures, not of continuous uses";
    m->reference = arena_printf(cx->arena,
                                "The curve %s is the calc's own table: the demand table of the plumbing code "
                                "adopted for the project, as entered and cited in the calc%s",
                                cd->name, code_of(cx)->demand ? "" : "; the program ships no demand table for it");
    call_use_method(cx, m);
    *Q = q;
    return true;
}

/* hunter(L, system="flush tank"|"flush valve") -> the peak demand of a total
 * load of L wsfu by the code's demand table, linear between its rows;
 * refused outside the table. system= defaults to "flush tank". */
bool fn_hunter(CallCtx *cx, const CallArgs *a, Value *out)
{
    double load, Q;
    if (!kw_check(cx, a) || !arg_dimensionless(cx, a, 0, "LOAD, in water supply fixture units", &load))
        return false;
    int sys = kw_choice(cx, a, "system", SYSTEMS);
    if (sys == -2)
        return false;
    /* a table that is not shipped is the call's fault, a load outside it the argument's */
    const PlumbingCode *c = code_of(cx);
    Pos at = c->demand && (sys != 1 || !c->why_no_valve) ? arg_at(a, 0) : a->pos;
    if (!demand_hunter_flow(cx, SYSTEMS[sys == 1 ? 1 : 0], load, at, &Q))
        return false;
    *out = value_hinted(qty(Q, DIM_FLOW), "gal/min", "L/s");
    return true;
}

/* ---- peak_demand(FIXTURES, percentile=) ------------------------------------ */

typedef struct FixtureItem {
    double count;
    char kind[96];
    FixtureUse use;
    Pos pos;
} FixtureItem;

/* Read "12 lavatory private, 8 shower, 10 water closet tank": each item a
 * whole count, a fixture kind and an optional use word. Positions point
 * into the string (its opening quote is at `at`). Returns the item count,
 * or -1 after an error. */
static long fixtures_parse(CallCtx *cx, const char *fn, const char *s, Pos at, FixtureItem *items,
                           size_t max)
{
    size_t n = 0;
    const char *p = s;
    for (;;) {
        while (*p == ' ' || *p == '\t')
            p++;
        const char *start = p, *comma = strchr(p, ',');
        const char *end = comma ? comma : p + strlen(p);
        Pos ip = at;
        ip.col += (int)(start - s) + 1;
        while (end > start && (end[-1] == ' ' || end[-1] == '\t'))
            end--;
        if (end == start) {
            diag_error(cx->diags, ip, "%s: expected a count and a fixture kind, like \"12 lavatory\"", fn);
            return -1;
        }
        if (n == max) {
            diag_error(cx->diags, ip, "%s: more than %zu fixture items in one list", fn, max);
            return -1;
        }
        char *num_end;
        double count = strtod(start, &num_end);
        if (num_end == start || num_end > end || !isfinite(count) || count < 0 ||
            count != floor(count) || count > 1e6) {
            diag_error(cx->diags, ip, "%s: each fixture item starts with a whole count from 0 to 1000000, found \"%.*s\"",
                       fn, (int)(end - start), start);
            return -1;
        }
        const char *k = num_end;
        while (k < end && (*k == ' ' || *k == '\t'))
            k++;
        const char *kend = end;
        FixtureUse use = FIXTURE_USE_ANY;
        /* a trailing "private" or "public" is the use */
        const char *last = kend;
        while (last > k && last[-1] != ' ')
            last--;
        if (last > k && (size_t)(kend - last) == 7 && strncmp(last, "private", 7) == 0)
            use = FIXTURE_PRIVATE, kend = last;
        else if (last > k && (size_t)(kend - last) == 6 && strncmp(last, "public", 6) == 0)
            use = FIXTURE_PUBLIC, kend = last;
        while (kend > k && kend[-1] == ' ')
            kend--;
        if (kend == k || (size_t)(kend - k) >= sizeof items[n].kind) {
            Pos kp = at;
            kp.col += (int)(k - s) + 1;
            diag_error(cx->diags, kp, "%s: expected a fixture kind after the count %g", fn, count);
            return -1;
        }
        items[n].count = count;
        memcpy(items[n].kind, k, (size_t)(kend - k));
        items[n].kind[kend - k] = '\0';
        items[n].use = use;
        items[n].pos = at;
        items[n].pos.col += (int)(k - s) + 1;
        n++;
        if (!comma)
            break;
        p = comma + 1;
    }
    return (long)n;
}

/* One fixtures-cell item's words: "lavatory public" -> one fixture's total load. */
bool demand_item_load(CallCtx *cx, const char *words, Pos at, double *wsfu_each)
{
    char kind[128];
    snprintf(kind, sizeof kind, "%s", words);
    FixtureUse use = FIXTURE_USE_ANY;
    size_t n = strlen(kind);
    if (n > 8 && strcmp(kind + n - 8, " private") == 0)
        use = FIXTURE_PRIVATE, kind[n - 8] = '\0';
    else if (n > 7 && strcmp(kind + n - 7, " public") == 0)
        use = FIXTURE_PUBLIC, kind[n - 7] = '\0';
    for (n = strlen(kind); n > 0 && kind[n - 1] == ' ';)
        kind[--n] = '\0';
    const PlumbingCode *c = code_of(cx);
    const FixtureLoadRow *row = NULL;
    LoadStatus st = fixture_load_find(c, kind, use, &row);
    if (st != LOAD_OK) {
        load_error(cx, c, "fixtures", at, kind, st, use);
        return false;
    }
    call_use_method(cx, load_method(cx, c, row));
    *wsfu_each = fixture_load_value(row, WATER_TOTAL);
    return true;
}

static const char PEAK_NOT_SHIPPED[] =
    "peak_demand: the fixture probabilities and flows of the water demand calculator "
    "(UPC Appendix M; IPC Appendix N) are not shipped: no published copy of that table "
    "could be verified, so no peak demand can be computed from it; enter the demand as a flow, "
    "or (in a path) give demand: NAME, a ```curve block of demand against load taken from the "
    "code adopted for the project";

bool demand_peak_flow(CallCtx *cx, Pos at)
{
    diag_error(cx->diags, at, "%s", PEAK_NOT_SHIPPED);
    return false;
}

/* peak_demand("12 lavatory private, 8 shower", percentile=99) -> record
 * `Q method`. The fixtures are read and checked against the code's load
 * table; the probability table of the water demand calculator is needed
 * for the number itself. */
bool fn_peak_demand(CallCtx *cx, const CallArgs *a, Value *out)
{
    const char *list;
    if (!kw_check(cx, a) || !arg_string(cx, a, 0, "FIXTURES", &list))
        return false;
    Pos pp;
    const Value *pv = kw_get(a, "percentile", &pp);
    if (pv && (pv->kind != VAL_NUMBER || !dim_is_none(pv->q.dim) || !(pv->q.si > 50 && pv->q.si < 100))) {
        diag_error(cx->diags, pp, "peak_demand: percentile= must be a pure number above 50 and below 100 (99 is the 99th percentile)");
        return false;
    }
    enum { MAX_ITEMS = 64 };
    FixtureItem items[MAX_ITEMS];
    long n = fixtures_parse(cx, "peak_demand", list, arg_at(a, 0), items, MAX_ITEMS);
    if (n < 0)
        return false;
    (void)out;
    return demand_peak_flow(cx, a->pos);
}
