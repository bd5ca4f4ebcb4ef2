/* report_model.h — the rows every report shows, built once.
 *
 * The text listing, the JSON results and the PDF report are renderings of
 * one model (DESIGN 2.15): for every statement its description, symbol,
 * formula, substituted formula and result as text, with the value in the
 * unit it is shown in, its warnings, citations and the published methods it
 * used; for every check both sides, the verdict, the utilisation and
 * whether it governs. Every decision a renderer would otherwise take on its
 * own — is the substituted form worth a line, is an input its own result,
 * which check governs, how a published method's formula reads — is taken
 * here, so the renderers lay the model out and never parse a formula,
 * compute a value, re-derive a verdict or pick a unit.
 *
 * The model borrows the Evaluated and allocates in the caller's Arena. */
#ifndef HEADROOM_REPORT_MODEL_H
#define HEADROOM_REPORT_MODEL_H

#include <stdbool.h>
#include <stddef.h>

#include "arena.h"
#include "eval.h"
#include "render.h"

/* A value as every renderer shows it. */
typedef struct ModelValue {
    bool number;             /* a number (else a string, a record or nothing) */
    double si;               /* coherent SI (temperatures in K) */
    double shown;            /* in `unit`, at full precision */
    Unit unit;               /* the unit it is shown in ("1" or "" for a pure number) */
    const char *text;        /* exactly what the report prints: "4.050 ft/s" */
} ModelValue;

/* A check (or a finding) as the cover and the sheets show it. */
typedef struct ModelCheck {
    bool evaluated;
    bool finding;            /* a yes/no answer, never a verdict */
    bool holds;              /* a finding: the answer */
    ModelValue lhs, rhs;     /* both sides, each in its own display unit */
    double utilization;      /* lhs/rhs for <, <=; rhs/lhs for >, >=; NAN when none */
    const char *utilization_text; /* three figures, "n/a" when not finite */
    const char *verdict;     /* "HOLDS", "FAILS"; a finding: "yes", "no" */
    bool governs;            /* the check with the highest utilisation */
} ModelCheck;

/* A published method as the report sets it out: its formula parsed once. */
typedef struct ModelMethod {
    const Method *method;
    Expr *lhs, *rhs;         /* the formula as an equation (rhs NULL: an expression); both
                                NULL when the method has no formula or it does not parse */
    int first_use;           /* the statement that shows the formula (first use), -1 */
} ModelMethod;

/* How one call applied a published method (MethodUse, library.h), as the
 * sheets set it out: the formula's left side, then its right side with the
 * call's values substituted, then the value it gave. */
typedef struct ModelUse {
    const MethodUse *use;
    size_t method;           /* index into ReportModel.methods */
    const char *lhs;         /* the formula's left side as written ("Delta_p") */
    const char *formula;     /* its right side as written */
    /* the right side with every symbol replaced by the call's value; NULL
     * unless every symbol has one (a formula never half substituted) */
    const char *substituted;
    ModelValue result;       /* the left side's value (number false: none) */
    const char *branch;      /* the variant taken, in words, or NULL */
} ModelUse;

/* One statement, in document order. */
typedef struct ModelRow {
    const Stmt *stmt;
    const StmtResult *res;
    bool evaluated;
    const char *description; /* the trailing comment, NULL when none */
    const char *symbol;      /* DEF, SOLVE: the name */
    const char *formula;     /* DEF: as written; SOLVE: "lhs = rhs"; CHECK: "lhs OP rhs" */
    /* DEF and SOLVE and CHECK: the formula with every name replaced by its
     * value in its display unit (a solve: at its root), NULL when it would
     * only repeat the formula or a value the row shows anyway */
    const char *substituted;
    bool show_substituted;
    ModelValue result;       /* DEF, SOLVE: the bound value */
    bool show_result;        /* false: an input shown as written is its own result */
    /* SOLVE */
    const char *lhs_formula, *rhs_formula;   /* the equation's sides as written */
    const char *lhs_substituted, *rhs_substituted; /* at the root, NULL when simple */
    ModelValue lhs_at_root, rhs_at_root;     /* both in the left side's unit */
    ModelValue residual;
    int iterations;
    const char *lo_text, *hi_text;           /* the bracket, NULL when none */
    /* CHECK */
    ModelCheck check;
    const char *const *warnings;
    size_t nwarnings;
    const Cite *cites;
    size_t ncites;
    const size_t *methods;   /* indices into ReportModel.methods */
    size_t nmethods;
    const ModelUse *uses;    /* how the row's calls applied their methods */
    size_t nuses;
} ModelRow;

typedef struct ReportModel {
    const Evaluated *ev;
    ModelRow *rows;          /* one per statement (doc->nstmts) */
    size_t nrows;
    ModelMethod *methods;    /* ev->methods, in order of first use */
    size_t nmethods;
    int governing;           /* statement index of the governing check, -1 */
    size_t nchecks, nfailed; /* the evaluator's counts: checks evaluated, checks that fail */
    size_t nwarnings;        /* warnings over every row */
    size_t case_rows_failing;/* the evaluator's count over every case table */
    ValueTexts *value_texts; /* the statements' values as formulas substitute them, made once */
} ReportModel;

/* The columns of a path's segment table, defined once for the listing and
 * the PDF: which columns the path has (a fixture load column with a
 * fixtures column, a device column with devices), their heads and the unit
 * each is shown in. */
enum { PATH_COLUMNS_MAX = 15 };
typedef enum PathColumnKind {
    PCOL_SEGMENT, PCOL_LOAD, PCOL_Q, PCOL_D, PCOL_L, PCOL_RISE, PCOL_V, PCOL_RE, PCOL_F, PCOL_K,
    PCOL_HF, PCOL_HM, PCOL_PIN, PCOL_DPDEV, PCOL_POUT
} PathColumnKind;

typedef struct PathColumns {
    int n;
    int map[PATH_COLUMNS_MAX];           /* the PathColumnKind of column i */
    const char *key[PATH_COLUMNS_MAX];   /* the listing's head: "Q", "h_f", "dp_device" */
    const char *word[PATH_COLUMNS_MAX];  /* "flow", "friction loss" */
    const char *symbol[PATH_COLUMNS_MAX];/* as a symbol: "Q", "Delta_p_dev" */
    Unit unit[PATH_COLUMNS_MAX];         /* shown in; a pure number's unit where none */
    bool has_unit[PATH_COLUMNS_MAX];
} PathColumns;

PathColumns report_path_columns(const Evaluated *ev, const PathResult *pr);
/* A segment's value in a column, in SI; NAN where there is none (no friction
 * factor, no device). The segment column has no number. */
double report_path_cell(const SegmentResult *g, int kind);

/* The columns of a network's node and link tables, defined once for the
 * listing and the PDF, as a path's are: the listing's head (key), the
 * PDF's words and symbol, and the unit each is shown in. The node table has
 * a fixture load column when the demands come from the nodes' fixtures. */
enum { NET_COLUMNS_MAX = 14 };
typedef enum NodeColumnKind { NCOL_NODE, NCOL_Z, NCOL_LOAD, NCOL_DEMAND, NCOL_HEAD, NCOL_P } NodeColumnKind;
typedef enum LinkColumnKind {
    LCOL_LINK, LCOL_FROM, LCOL_TO, LCOL_Q, LCOL_D, LCOL_L, LCOL_V, LCOL_RE, LCOL_F, LCOL_K, LCOL_HF, LCOL_HM,
    LCOL_DPDEV, LCOL_DEVICE
} LinkColumnKind;

typedef struct NetColumns {
    int n;
    int map[NET_COLUMNS_MAX];            /* the NodeColumnKind or LinkColumnKind of column i */
    const char *key[NET_COLUMNS_MAX];    /* the listing's head: "p", "h_f" */
    const char *word[NET_COLUMNS_MAX];   /* "pressure", "friction loss" */
    const char *symbol[NET_COLUMNS_MAX]; /* "p", "Delta_p"; "" where none */
    Unit unit[NET_COLUMNS_MAX];          /* shown in; a pure number's unit where none */
    bool has_unit[NET_COLUMNS_MAX];
    bool text[NET_COLUMNS_MAX];          /* an id or a word, not a number */
} NetColumns;

NetColumns report_node_columns(const Evaluated *ev, bool load);
NetColumns report_link_columns(const Evaluated *ev);
/* A node's or link's value in a column, in SI; NAN where there is none (no
 * load, no friction factor). A link without a device has a device drop of 0.
 * Id and word columns have none. */
double report_node_cell(const NodeResult *g, int kind);
double report_link_cell(const LinkResult *g, int kind);

/* Under a network's node table whose demands come from the nodes' fixtures
 * (`demand:`): how those demands were made, and that summing them in a link
 * overstates its peak. Text and PDF print it; JSON carries each node's load. */
extern const char REPORT_NODE_DEMAND_NOTE[];

/* Build the model of `ev` in `a`. Never fails (an unevaluated row says so). */
const ReportModel *report_model_build(const Evaluated *ev, Arena *a);
/* The model without its rows (rows NULL, no method's first_use, no warning
 * count): its methods and the governing check. report_model_row then makes
 * any row on its own, as report_model_build does, into `row` and `a`: a
 * writer that needs each row once can make it in a scratch arena. */
ReportModel *report_model_begin(const Evaluated *ev, Arena *a);
void report_model_row(const ReportModel *m, size_t i, ModelRow *row, Arena *a);

/* The model's entry for method `m` (NULL when the calc did not use it). */
const ModelMethod *report_model_method(const ReportModel *model, const Method *m);

/* A number as the model shows it: value `v` in `unit` (NULL: its display unit). */
ModelValue report_model_value(const Evaluated *ev, const Value *v, const Unit *unit, Arena *a);

#endif
