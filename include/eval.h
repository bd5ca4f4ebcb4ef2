/* eval.h — the evaluated document.
 *
 * The evaluator walks the statements in order, checks dimensions on every
 * operation, calls library functions, solves `solve` lines by Brent's method
 * (re-evaluating every name that depends on the varied one) and decides
 * checks. Results sit in an Evaluated beside the Document, one StmtResult per
 * statement, so renderers read the tree and the numbers and never compute.
 * The Evaluated borrows the Document and allocates in its Arena. Implemented
 * by eval.c and the files src/eval_internal.h lists (one per statement
 * kind, display units, parametric cases). */
#ifndef HEADROOM_EVAL_H
#define HEADROOM_EVAL_H

#include <stdint.h>

#include "doc.h"
#include "library.h"
#include "solve.h"
#include "value.h"

typedef enum ResultState {
    RES_NOT_EVALUATED = 0,   /* a parse error, or it depends on a failed name */
    RES_FAILED,              /* evaluating it reported an error */
    RES_OK
} ResultState;

/* One segment of an evaluated path, in SI units. Elevations and distances
 * are measured from the first inlet. */
typedef struct SegmentResult {
    const char *id;
    double Q, D, A, L, rise;
    double V, Re, f, K;      /* K: fittings plus the K column */
    double h_f, h_m;         /* friction and fitting head loss */
    double dp_static;        /* rho*g*rise */
    bool has_device;         /* a device at the outlet (DESIGN 2.10) */
    const char *device;      /* its cell as written */
    int device_status;       /* its DeviceStatus (methods/devices.h) */
    double p_device_in;      /* static pressure just before the device */
    double dp_device;        /* static drop across it (negative: a pump's gain); 0 without */
    double p_in, p_out;      /* p_out: after the device, if any */
    double x_in, x_out;      /* distance along the path */
    double z_in, z_out;      /* elevation */
    bool has_load;           /* the path has a fixtures column: */
    double load;             /* wsfu of every fixture downstream of the inlet */
    const double *fixture_each; /* wsfu of one fixture per item of the fixtures cell */
    const double *fixture_total; /* and of the item's count of them */
} SegmentResult;

typedef struct PathResult {
    SegmentResult *segs;
    size_t nsegs;
    double rho;
    double p_end, p_min, V_max, loss;
    size_t p_min_seg;        /* the segment whose outlet (or first inlet) is lowest */
    bool p_min_at_inlet;
    bool p_min_before_device;/* the lowest is just before that segment's device */
    size_t ndevices;
} PathResult;

/* An evaluated network (DESIGN 2.12), in SI units. */
typedef enum NetDevice { NET_DEVICE_NONE, NET_DEVICE_CHECK, NET_DEVICE_PUMP, NET_DEVICE_PRV, NET_DEVICE_LOSS } NetDevice;

typedef struct NodeResult {
    const char *id;
    bool supply;
    double z, head, p, demand;   /* demand: the flow leaving (a supply: what it delivers, negative) */
    double x, y;                 /* when the table has coordinates */
    bool has_load;               /* the demand was made from the node's fixtures (demand:) */
    double load;                 /* their load, wsfu */
    const double *fixture_each;  /* wsfu of one fixture of each item of the fixtures cell */
    const double *fixture_total; /* and of the item's count of them */
} NodeResult;

typedef struct LinkResult {
    const char *id;
    size_t from, to;             /* node indices */
    double Q, D, A, L, V, Re, f, K, C;
    double h_f, h_m;             /* friction and fitting head loss (in the flow direction) */
    double dp_device;            /* pressure drop across the device (a pump's is negative) */
    NetDevice device;
    int state;                   /* GradientLinkState: open, closed, active, wide open */
} LinkResult;

typedef struct NetworkResult {
    NodeResult *nodes;
    size_t nnodes;
    LinkResult *links;
    size_t nlinks;
    double rho;
    bool darcy, has_xy;
    double p_min, V_max;
    size_t p_min_node, V_max_link;
    int iterations;
    double tolerance, imbalance, last_change, energy_residual;
    size_t imbalance_node;
} NetworkResult;

/* A figure's data, in SI; the renderers convert with x_unit / y_unit. */
typedef struct Series {
    const char *name;
    double *x, *y;
    size_t n;
    int style;               /* 0 solid, 1 dashed, 2 dotted, 3 thin, 4 dashed in blue */
} Series;

typedef struct Marker {
    double x, y;
    const char *label;
} Marker;

typedef struct FigureData {
    const char *kind;        /* "hgl", "moody", "pump" */
    const char *x_title, *y_title;
    Unit x_unit, y_unit;
    bool log_x, log_y;
    Series *series;
    size_t nseries;
    Marker *markers;
    size_t nmarkers;
    double band_lo, band_hi; /* a shaded band along x (NAN when none) */
} FigureData;

/* A value an equation read, as it stood where the row's result was found:
 * a solve records what its equation reads at the root, so the row can show
 * the equation substituted there (never at the trial value). */
typedef struct ReadValue {
    int slot;
    Value value;
    Unit shown;
} ReadValue;

/* What only a check or a solve has, kept out of line so the results of the
 * many plain definitions stay small (issue 17): a check's two sides, a
 * solve's equation at the root. */
typedef struct StmtSides {
    /* CHECK: both sides; SOLVE: both sides of the equation at the root */
    Value lhs, rhs;
    Unit lhs_shown, rhs_shown;
    SolveReport solve;       /* SOLVE */
    const ReadValue *at_root;/* SOLVE: every name the equation reads, at the root */
    size_t nat_root;
} StmtSides;

/* The sides of a result that has none: all zero. */
extern const StmtSides eval_no_sides;

/* What a statement made besides its value, kept out of line like the sides:
 * most statements make none (issue 17). */
typedef struct StmtMade {
    const PathResult *path;  /* PATH */
    const NetworkResult *network; /* NETWORK */
    const ResultTable *table;/* CURVE: its points; DEF: a table a function laid out */
    const FigureData *figure;/* FIGURE */
} StmtMade;

/* What a result that made nothing points at: all NULL. */
extern const StmtMade eval_made_none;

typedef struct StmtResult {
    ResultState state;
    bool holds;              /* CHECK */
    Value value;             /* DEF, SOLVE: the bound value */
    const Unit *shown;       /* DEF, SOLVE: the unit the value is shown in (numbers; shared,
                                see unit_intern); never NULL (&unit_blank) */
    const StmtSides *sides;  /* CHECK, SOLVE: in the arena; never NULL (&eval_no_sides) */
    const StmtMade *made;    /* PATH, NETWORK, CURVE, FIGURE, a DEF that laid out a table;
                                never NULL (&eval_made_none) */
    double utilization;      /* CHECK: lhs/rhs for <, <=; rhs/lhs for >, >= */
    const char *const *warnings; /* what evaluating the row warned of, in order (nwarnings) */
    const Method *const *methods; /* published methods the line used (nmethods; in the arena) */
    const MethodUse *uses;   /* how its calls applied them, with the values used (nuses) */
    uint32_t nwarnings, nmethods, nuses;
} StmtResult;

/* A parametric case table, evaluated: per row, the shown values and every
 * check's verdict. */
typedef struct CaseRow {
    Value *inputs;           /* table->ninputs: the row's values of the inputs */
    Value *shown;            /* table->nshow */
    Unit *shown_unit;
    bool *shown_ok;
    bool *holds;             /* nchecks */
    double *utilization;
    bool *check_ok;          /* the check could be evaluated in this case */
    size_t nfailed;          /* checks that fail or cannot be evaluated */
} CaseRow;

typedef struct CaseResult {
    const CaseTable *table;
    int *check_slots;        /* every check of the calc, in order */
    size_t nchecks;
    CaseRow *rows;           /* table->nrows */
    size_t rows_failing;
} CaseResult;

typedef struct Evaluated {
    Document *doc;
    StmtResult *results;     /* doc->nstmts of them */
    UnitSystem units;
    int digits;
    const Method **methods;  /* every method used, in order of first use */
    size_t nmethods;
    size_t nchecks, nfailed; /* checks evaluated, checks that fail */
    size_t nwarnings;        /* warnings on statements, over all of them */
    CaseResult *cases;       /* doc->ncases */
    size_t ncases;
    size_t case_rows_failing;/* over every case table: rows where a check fails */
    struct UseSet *uses;     /* where used calcs are cached (uses.h) */
    const struct UsedFile **used; /* every file it used, directly or through another, in order */
    size_t nused;
    size_t nfindings, nfindings_yes; /* `finding` statements evaluated, answered yes */
    double atmosphere;       /* Pa absolute, from the front matter (DESIGN 2.9) */
    bool atmosphere_used;    /* a point, a conversion or a function needed it */
} Evaluated;

/* Evaluate every statement. Errors and validity warnings go to `diags`.
 * Used calcs are cached in a set the document owns. */
Evaluated *eval_document(Document *doc, DiagList *diags);
/* The same with a set shared by several documents (a package's parts), so
 * a file they all use is read and evaluated once. The set must outlive the
 * Evaluated. */
Evaluated *eval_document_in(Document *doc, struct UseSet *uses, DiagList *diags);

/* The value an expression that only names a value shows (a name, or fields
 * of a record read with '.', however deep: basis.w.rho); NULL otherwise.
 * `shown` gets the unit it is shown in. For renderers' substitutions. */
const Value *eval_named_value(const Evaluated *ev, const Expr *e, Unit *shown);
/* The same as row `row` substitutes it (a solve row: at its root; see eval_read). */
const Value *eval_named_value_at(const Evaluated *ev, const StmtResult *row, const Expr *e,
                                 Unit *shown);

/* Re-evaluate, in order, the statements that depend (directly or through
 * others) on any slot in `changed`, stopping before statement `upto`. The
 * caller has already stored the new values of the changed slots. Used by
 * `solve` and by parametric cases. */
void eval_recompute(Evaluated *ev, const int *changed, size_t nchanged, size_t upto, DiagList *diags);

/* The built-in constants pi and g (SLOT_PI, SLOT_G): true with the value. */
bool eval_constant(int slot, Value *out);

/* The value of statement `slot` as row `row` substitutes it: a solve row
 * reads the values at its root, any other row (or NULL) the statement's own
 * result. NULL when there is no value to show; *shown gets its unit. */
const Value *eval_read(const Evaluated *ev, const StmtResult *row, int slot, Unit *shown);

/* The unit a number is shown in: `as` wins, then the value's hint for the
 * document's unit system, then the system's default for the dimension. */
Unit eval_display_unit(const Evaluated *ev, const Value *v, const Unit *as_unit);
/* The same, shared (unit_intern): what a result keeps. */
const Unit *eval_shown_unit(const Evaluated *ev, const Value *v);

/* The rule of `as UNIT`, for statements, inline values and `convert`: a
 * number of the unit's dimension, a temperature point in a point unit and a
 * difference in a difference unit, and a number there that is finite. false
 * after an error at `at`. */
bool eval_unit_fits(DiagList *diags, UnitSystem sys, Pos at, const char *as_text, const Unit *u,
                    const Value *v);

#endif
