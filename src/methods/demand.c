/* demand.c — fixture loads, the demand table and the peak demand model.
 *
 * The fixture loads are the code's own table (wsfu_*.def, one file per code
 * edition, its code, edition and table number in its header). A code's
 * demand table is shipped only when every row of it has been verified
 * against a published copy; where none could be, the code says why and
 * hunter() refuses with that reason rather than print a number typed from
 * memory. The probability model is the binomial model of the peak water
 * demand study: the total flow of independent fixtures, each busy with its
 * own probability, at a high percentile — exact by enumeration, or by the
 * normal approximation when the system is large. */
#include "methods/demand.h"

#include "arena.h"
#include "suggest.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* ---- the codes ---------------------------------------------------------- */

static const FixtureLoadRow IPC2018_LOADS[] = {
#define LOAD(kind, aliases, use, occ, ctl, c, h, t) {kind, aliases, use, occ, ctl, c, h, t},
#include "wsfu_ipc2018.def"
#undef LOAD
};

static const DemandRow IL2014_DEMAND[] = {
#define DEMAND(load, gpm) {load, gpm, NAN},
#include "demand_il2014.def"
#undef DEMAND
};

static const PlumbingCode CODES[] = {
    {"IPC 2018", "IPC-2018|2018 IPC|IPC2018|International Plumbing Code 2018",
     "International Plumbing Code, 2018 edition (International Code Council)",
     "Appendix E, Table E103.3(2), Load values assigned to fixtures", IPC2018_LOADS,
     sizeof IPC2018_LOADS / sizeof IPC2018_LOADS[0], NULL,
     "Appendix E, Table E103.3(3), Table for estimating demand", NULL, 0,
     "no published copy of its rows could be read and verified row by row", NULL},
    {"Illinois 2014", "Illinois Plumbing Code|Illinois Plumbing Code 2014|IL 2014|77 Ill. Adm. Code 890",
     "Illinois Plumbing Code, 77 Ill. Adm. Code 890, as amended at 38 Ill. Reg. 9940, effective "
     "April 24, 2014 (Illinois Department of Public Health)",
     "its fixture load table", NULL, 0,
     "no published copy of its rows could be read and verified row by row",
     "Appendix A, Table N, Water Supply Fixture Units (WSFU) for a Supply System with Flush Tanks "
     "Water Closets",
     IL2014_DEMAND, sizeof IL2014_DEMAND / sizeof IL2014_DEMAND[0], NULL,
     "the code's table for flush valve water closets could not be read and verified row by row; "
     "Table N is for flush tank water closets only"},
};

enum { NCODES = sizeof CODES / sizeof CODES[0] };

/* Kinds of IPC 2018's load table whose rows could not be verified: named so
 * that wsfu() says the row is missing on purpose, not that the kind is
 * unknown. The words only; no values. */
static const char *const NOT_SHIPPED[] = {
    "shower", "shower head", "shower mixing valve", "urinal", "urinal flush valve",
    "urinal flush tank", "washing machine", "clothes washer", "water closet",
    "water closet tank", "water closet flush tank", "water closet flush valve",
    "water closet flushometer valve", "water closet flushometer tank", "hose bibb", "sillcock",
    NULL};

/* Compare ignoring case and treating runs of spaces, '-' and '_' alike. */
static bool same_words(const char *a, size_t alen, const char *b, size_t blen)
{
    size_t i = 0, j = 0;
    for (;;) {
        while (i < alen && (a[i] == ' ' || a[i] == '-' || a[i] == '_'))
            i++;
        while (j < blen && (b[j] == ' ' || b[j] == '-' || b[j] == '_'))
            j++;
        if (i == alen || j == blen)
            return i == alen && j == blen;
        if (tolower((unsigned char)a[i]) != tolower((unsigned char)b[j]))
            return false;
        i++, j++;
    }
}

/* Does `s` name `name` or one of the '|'-separated aliases? */
static bool names(const char *s, const char *name, const char *aliases)
{
    size_t slen = strlen(s);
    if (same_words(s, slen, name, strlen(name)))
        return true;
    for (const char *p = aliases; *p;) {
        const char *bar = strchr(p, '|');
        size_t len = bar ? (size_t)(bar - p) : strlen(p);
        if (same_words(s, slen, p, len))
            return true;
        p += len + (bar ? 1 : 0);
    }
    return false;
}

const PlumbingCode *plumbing_code_default(void) { return &CODES[0]; }

const PlumbingCode *plumbing_code_find(const char *key)
{
    for (size_t i = 0; i < NCODES; i++)
        if (names(key, CODES[i].key, CODES[i].aliases))
            return &CODES[i];
    return NULL;
}

void plumbing_codes_list(char *buf, size_t n)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < NCODES && len < n; i++) {
        int w = snprintf(buf + len, n - len, "%s\"%s\"", i ? ", " : "", CODES[i].key);
        if (w < 0)
            break;
        len += (size_t)w;
    }
}

/* ---- fixture loads -------------------------------------------------------- */

LoadStatus fixture_load_find(const PlumbingCode *c, const char *kind, FixtureUse use,
                             const FixtureLoadRow **out)
{
    if (!c->loads)
        return LOAD_NO_TABLE;
    const FixtureLoadRow *first = NULL;
    for (size_t i = 0; i < c->nloads; i++) {
        const FixtureLoadRow *r = &c->loads[i];
        if (!names(kind, r->kind, r->aliases))
            continue;
        if (use == FIXTURE_USE_ANY) {
            if (r->use == FIXTURE_PRIVATE) {
                *out = r;
                return LOAD_OK;
            }
            if (!first)
                first = r;
        } else if (r->use == use) {
            *out = r;
            return LOAD_OK;
        } else if (!first) {
            first = r;
        }
    }
    if (first) {
        *out = first;
        return use == FIXTURE_USE_ANY ? LOAD_OK : LOAD_NO_USE;
    }
    for (size_t i = 0; NOT_SHIPPED[i]; i++)
        if (names(kind, NOT_SHIPPED[i], ""))
            return LOAD_NOT_SHIPPED;
    return LOAD_UNKNOWN_KIND;
}

double fixture_load_value(const FixtureLoadRow *r, WaterSide w)
{
    double v = w == WATER_COLD ? r->cold : w == WATER_HOT ? r->hot : r->total;
    return isnan(v) ? 0.0 : v;
}

const char *fixture_kind_nearest(const PlumbingCode *c, const char *kind)
{
    const char *best = NULL;
    size_t bestd = (size_t)-1;
    for (size_t i = 0; i < c->nloads; i++) {
        size_t d = suggest_distance(kind, strlen(kind), c->loads[i].kind, strlen(c->loads[i].kind), true);
        if (d < bestd) {
            bestd = d;
            best = c->loads[i].kind;
        }
    }
    /* near enough to be a slip: a third of the name, at least two edits */
    size_t len = strlen(kind), limit = len / 3 > 2 ? len / 3 : 2;
    return best && bestd <= limit ? best : NULL;
}

void fixture_kinds_list(const PlumbingCode *c, char *buf, size_t n)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < c->nloads && len < n; i++) {
        if (i > 0 && strcmp(c->loads[i - 1].kind, c->loads[i].kind) == 0)
            continue;
        int w = snprintf(buf + len, n - len, "%s\"%s\"", len ? ", " : "", c->loads[i].kind);
        if (w < 0)
            break;
        len += (size_t)w;
    }
}

void fixture_uses_list(const PlumbingCode *c, const char *kind, char *buf, size_t n)
{
    bool priv = false, pub = false;
    for (size_t i = 0; i < c->nloads; i++) {
        if (!names(kind, c->loads[i].kind, c->loads[i].aliases))
            continue;
        if (c->loads[i].use == FIXTURE_PRIVATE)
            priv = true;
        else
            pub = true;
    }
    snprintf(buf, n, "%s%s%s", priv ? "private" : "", priv && pub ? ", " : "", pub ? "public" : "");
}

/* ---- the demand table ----------------------------------------------------- */

static double column(const DemandRow *r, DemandSystem sys)
{
    return sys == SYSTEM_FLUSH_VALVE ? r->q_valve : r->q_tank;
}

bool demand_column_range(const DemandRow *rows, size_t n, DemandSystem sys, double *first,
                         double *last)
{
    bool any = false;
    for (size_t i = 0; rows && i < n; i++) {
        if (isnan(column(&rows[i], sys)))
            continue;
        if (!any)
            *first = rows[i].load;
        *last = rows[i].load;
        any = true;
    }
    return any;
}

DemandStatus demand_interpolate(const DemandRow *rows, size_t n, DemandSystem sys, double load,
                                double *gpm, size_t *lo, size_t *hi)
{
    double first, last;
    if (!demand_column_range(rows, n, sys, &first, &last))
        return DEMAND_NO_TABLE;
    if (!isfinite(load))
        return DEMAND_BAD_LOAD;
    if (load < first)
        return DEMAND_BELOW;
    if (load > last)
        return DEMAND_ABOVE;
    size_t below = n;
    for (size_t i = 0; i < n; i++) {
        double q = column(&rows[i], sys);
        if (isnan(q))
            continue;
        if (rows[i].load == load) {
            *gpm = q;
            *lo = *hi = i;
            return DEMAND_OK;
        }
        if (rows[i].load < load) {
            below = i;
            continue;
        }
        /* rows[below].load < load < rows[i].load */
        double q0 = column(&rows[below], sys), x0 = rows[below].load, x1 = rows[i].load;
        *gpm = q0 + (q - q0) * (load - x0) / (x1 - x0);
        *lo = below;
        *hi = i;
        return DEMAND_OK;
    }
    return DEMAND_ABOVE; /* not reached: load <= last */
}

/* ---- the probability model ------------------------------------------------ */

static bool group_ok(const FixtureGroup *g)
{
    return isfinite(g->n) && g->n >= 0 && g->n == floor(g->n) && g->n <= 1e6 && isfinite(g->p) &&
           g->p >= 0 && g->p <= 1 && isfinite(g->q) && g->q >= 0;
}

/* Binomial probability of k busy among n, each busy with probability p. */
static double binom_pmf(double n, double k, double p)
{
    if (p <= 0)
        return k == 0 ? 1.0 : 0.0;
    if (p >= 1)
        return k == n ? 1.0 : 0.0;
    double lc = lgamma(n + 1) - lgamma(k + 1) - lgamma(n - k + 1);
    return exp(lc + k * log(p) + (n - k) * log1p(-p));
}

typedef struct State {
    double y, prob;
} State;

static int by_flow(const void *a, const void *b)
{
    double x = ((const State *)a)->y, y = ((const State *)b)->y;
    return x < y ? -1 : x > y;
}

/* Sort and merge states whose flows agree to rounding. Returns the count. */
static size_t merge(State *s, size_t n)
{
    qsort(s, n, sizeof *s, by_flow);
    size_t m = 0;
    for (size_t i = 0; i < n; i++) {
        if (m > 0 && fabs(s[i].y - s[m - 1].y) <= 1e-12 * fmax(1.0, fabs(s[i].y)))
            s[m - 1].prob += s[i].prob;
        else
            s[m++] = s[i];
    }
    return m;
}

PeakStatus peak_exact(const FixtureGroup *g, size_t ng, double percentile, double *y)
{
    if (!(percentile > 0 && percentile < 1))
        return PEAK_BAD_INPUT;
    double bound = 1;
    for (size_t i = 0; i < ng; i++) {
        if (!group_ok(&g[i]))
            return PEAK_BAD_INPUT;
        bound *= g[i].n + 1;
    }
    if (bound > PEAK_MAX_STATES)
        return PEAK_TOO_MANY_STATES;
    size_t cap = (size_t)bound;
    State *cur = xmalloc(cap * sizeof *cur), *next = xmalloc(cap * sizeof *next);
    size_t ncur = 1;
    cur[0] = (State){0, 1};
    for (size_t i = 0; i < ng; i++) {
        size_t nn = 0;
        for (double k = 0; k <= g[i].n; k++) {
            double pk = binom_pmf(g[i].n, k, g[i].p);
            if (pk == 0)
                continue;
            for (size_t j = 0; j < ncur; j++)
                next[nn++] = (State){cur[j].y + k * g[i].q, cur[j].prob * pk};
        }
        ncur = merge(next, nn);
        State *t = cur;
        cur = next;
        next = t;
    }
    /* the smallest flow whose cumulative probability reaches the percentile;
     * a relative slack of 1e-12 keeps rounding in the sum from stepping over
     * a state whose cumulative probability is the percentile exactly */
    double cum = 0;
    *y = cur[ncur - 1].y;
    for (size_t j = 0; j < ncur; j++) {
        cum += cur[j].prob;
        if (cum >= percentile * (1 - 1e-12)) {
            *y = cur[j].y;
            break;
        }
    }
    free(cur);
    free(next);
    return PEAK_OK;
}

double normal_quantile(double pct)
{
    /* bisection on Phi(z) = erfc(-z/sqrt 2)/2, to the last bit of z */
    double lo = -40, hi = 40;
    for (int i = 0; i < 200 && hi - lo > 0; i++) {
        double mid = 0.5 * (lo + hi);
        if (mid == lo || mid == hi)
            break;
        if (0.5 * erfc(-mid / sqrt(2.0)) < pct)
            lo = mid;
        else
            hi = mid;
    }
    return 0.5 * (lo + hi);
}

PeakStatus peak_normal(const FixtureGroup *g, size_t ng, double percentile, double *y)
{
    if (!(percentile > 0 && percentile < 1))
        return PEAK_BAD_INPUT;
    double mean = 0, var = 0;
    for (size_t i = 0; i < ng; i++) {
        if (!group_ok(&g[i]))
            return PEAK_BAD_INPUT;
        mean += g[i].n * g[i].p * g[i].q;
        var += g[i].n * g[i].p * (1 - g[i].p) * g[i].q * g[i].q;
    }
    *y = mean + normal_quantile(percentile) * sqrt(var);
    return PEAK_OK;
}
