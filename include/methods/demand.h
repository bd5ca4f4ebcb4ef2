/* demand.h — peak water demand from the fixtures served (DESIGN 2.11).
 *
 * Three parts, each plain C on numbers: the fixture load table of a model
 * plumbing code (water supply fixture units per fixture, cold, hot and
 * total), the code's demand table that turns a total load into a peak flow
 * (Hunter's curve, linear between rows), and the probability model of the
 * peak water demand study (the 99th-percentile flow of independent
 * binomially busy fixtures: exact by enumeration, or the normal
 * approximation). Tables are static data with their code, edition and table
 * named; nothing here prints or exits, and only peak_exact() allocates
 * (working memory, freed before it returns). Flows are in gal/min, as
 * the codes print them; the calc glue converts. */
#ifndef HEADROOM_METHODS_DEMAND_H
#define HEADROOM_METHODS_DEMAND_H

#include <stdbool.h>
#include <stddef.h>

typedef enum FixtureUse { FIXTURE_PRIVATE, FIXTURE_PUBLIC, FIXTURE_USE_ANY } FixtureUse;
typedef enum WaterSide { WATER_COLD, WATER_HOT, WATER_TOTAL } WaterSide;

typedef struct FixtureLoadRow {
    const char *kind;        /* in the trade's words: "lavatory" */
    const char *aliases;     /* '|'-separated other spellings, or "" */
    FixtureUse use;
    const char *occupancy;   /* as the table prints it: "Private", "Offices, etc." */
    const char *control;     /* as the table prints it: "Faucet", "Flush tank" */
    double cold, hot, total; /* wsfu; NAN where the table prints a dash */
} FixtureLoadRow;

/* One row of a demand table: load in wsfu, demand in gal/min for systems
 * predominantly for flush tanks and for flush valves (NAN: blank cell). */
typedef struct DemandRow {
    double load, q_tank, q_valve;
} DemandRow;

typedef enum DemandSystem { SYSTEM_FLUSH_TANK, SYSTEM_FLUSH_VALVE } DemandSystem;

/* A model plumbing code as the `code:` front matter key names it. */
typedef struct PlumbingCode {
    const char *key;           /* "IPC 2018" */
    const char *aliases;       /* '|'-separated: "IPC-2018|2018 IPC" */
    const char *name;          /* "International Plumbing Code, 2018 edition (ICC)" */
    const char *load_table;    /* "Appendix E, Table E103.3(2), Load values assigned to fixtures" */
    const FixtureLoadRow *loads; /* NULL when no verified copy is shipped */
    size_t nloads;
    const char *why_no_loads;  /* why the load table is not shipped, or NULL */
    const char *demand_table;  /* "Appendix E, Table E103.3(3), Table for estimating demand" */
    const DemandRow *demand;   /* NULL when no verified copy is shipped */
    size_t ndemand;
    const char *why_no_demand; /* why the demand table is not shipped, or NULL */
    const char *why_no_valve;  /* where the rows have no flush valve column: why, or NULL */
} PlumbingCode;

const PlumbingCode *plumbing_code_default(void);
/* The code named by a `code:` value, or NULL. */
const PlumbingCode *plumbing_code_find(const char *key);
/* "\"IPC 2018\"" — the accepted `code:` values, for messages. */
void plumbing_codes_list(char *buf, size_t n);

typedef enum LoadStatus {
    LOAD_OK,
    LOAD_UNKNOWN_KIND,   /* no such fixture in the shipped rows */
    LOAD_NOT_SHIPPED,    /* a fixture of the code's table whose row is not shipped */
    LOAD_NO_USE,         /* the kind is there, but not for that use */
    LOAD_NO_TABLE        /* the code's load table is not shipped at all */
} LoadStatus;

/* The row for a fixture kind and use (FIXTURE_USE_ANY: the private row when
 * there is one, else the only row). Kinds match ignoring case and runs of
 * spaces, '-' and '_'. */
LoadStatus fixture_load_find(const PlumbingCode *c, const char *kind, FixtureUse use,
                             const FixtureLoadRow **out);
/* The load on one side; a dash in the table reads as zero. */
double fixture_load_value(const FixtureLoadRow *r, WaterSide w);
/* The shipped kind nearest to `kind` (did you mean), or NULL. */
const char *fixture_kind_nearest(const PlumbingCode *c, const char *kind);
/* "bathroom group flush tank", "bathtub", ... — each shipped kind once. */
void fixture_kinds_list(const PlumbingCode *c, char *buf, size_t n);
/* The uses a kind is tabulated for: "private", "public" or "private, public". */
void fixture_uses_list(const PlumbingCode *c, const char *kind, char *buf, size_t n);

typedef enum DemandStatus {
    DEMAND_OK,
    DEMAND_NO_TABLE,     /* the code's demand table is not shipped */
    DEMAND_BELOW,        /* load below the first row of the column */
    DEMAND_ABOVE,        /* load above the last row */
    DEMAND_BAD_LOAD      /* not finite */
} DemandStatus;

/* Demand for a load by the table's column for `sys`, linear between the
 * two rows that bracket it; *lo and *hi are those rows' indices (equal on a
 * row). Rows must have strictly increasing loads; blank cells are skipped. */
DemandStatus demand_interpolate(const DemandRow *rows, size_t n, DemandSystem sys, double load,
                                double *gpm, size_t *lo, size_t *hi);
/* The first and last load of a column (for messages); false if it is empty. */
bool demand_column_range(const DemandRow *rows, size_t n, DemandSystem sys, double *first,
                         double *last);

/* ---- the probability model of the peak water demand study ---------------- */

/* n fixtures of one kind, each busy with probability p, drawing q when busy. */
typedef struct FixtureGroup {
    double n;   /* a whole number >= 0 */
    double p;   /* 0 <= p <= 1 */
    double q;   /* flow when busy, any unit (the result is in the same) */
} FixtureGroup;

typedef enum PeakStatus {
    PEAK_OK,
    PEAK_BAD_INPUT,      /* n not whole and >= 0, p outside [0, 1], q negative or not finite */
    PEAK_TOO_MANY_STATES /* the exact enumeration would exceed PEAK_MAX_STATES */
} PeakStatus;

enum { PEAK_MAX_STATES = 200000 };

/* The smallest flow y with P(total flow <= y) >= percentile (0 < pct < 1),
 * the total flow being the sum over groups of q times a binomial(n, p)
 * count, the groups independent. Exact by convolving the groups' binomial
 * distributions, states of equal flow merged. */
PeakStatus peak_exact(const FixtureGroup *g, size_t ng, double percentile, double *y);
/* The normal approximation: sum n*p*q + z*sqrt(sum n*p*(1-p)*q^2), z the
 * standard normal quantile of `percentile`. */
PeakStatus peak_normal(const FixtureGroup *g, size_t ng, double percentile, double *y);
/* The standard normal quantile: the z with Phi(z) = pct (0 < pct < 1). */
double normal_quantile(double pct);

#endif
