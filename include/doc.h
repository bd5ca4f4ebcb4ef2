/* doc.h — the document tree: what the reading stages produce.
 *
 * source -> front matter -> markdown (blocks of prose, raw fences) ->
 * fences (lex, parse, tables: statements with expression trees, sources,
 * case tables) -> resolve (names to slots), chained by load.c (doc_load,
 * doc_from_text in load.h); doc.c holds the tree's small accessors and
 * resolve.c doc_lookup's name table. Everything hangs off one
 * Document and lives in its Arena; doc_free() releases it all. The evaluator
 * adds results in a separate Evaluated (eval.h) so this tree stays what the
 * author wrote, and renderers read both without re-parsing anything. */
#ifndef HEADROOM_DOC_H
#define HEADROOM_DOC_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>

#include "arena.h"
#include "diag.h"
#include "units.h"

/* ---- expressions ------------------------------------------------------ */

typedef enum __attribute__((packed)) ExprKind {
    EXPR_NUMBER,  /* 38 gal/min                      */
    EXPR_STRING,  /* "1-1/2"                         */
    EXPR_NAME,    /* Q, rho_w, pi                    */
    EXPR_NEG,     /* -x                              */
    EXPR_BINARY,  /* a + b, a * b, a ^ b, ...        */
    EXPR_CALL,    /* f(a, b, method="x")             */
    EXPR_FIELD,   /* tube.id                         */
    EXPR_PAREN    /* (a + b): kept for display       */
} ExprKind;

typedef enum __attribute__((packed)) BinOp { OP_ADD, OP_SUB, OP_MUL, OP_DIV, OP_POW } BinOp;

/* Where a name refers to. Statement slots are >= 0. */
enum { SLOT_UNRESOLVED = -1, SLOT_PI = -2, SLOT_G = -3 };

typedef struct Expr Expr;
typedef struct ExprCall ExprCall;
struct Expr {
    /* fields ordered and packed so the node takes 64 bytes: a calc holds a
     * few of these per statement (issue 17) */
    ExprKind kind;           /* one byte (a packed enum) */
    BinOp op;                /* EXPR_BINARY; one byte */
    bool has_unit : 1;       /* EXPR_NUMBER */
    bool middle_dot : 1;     /* EXPR_BINARY written with · */
    uint8_t height;          /* levels of the tree from here down (a leaf is 1);
                                at most PARSE_MAX_DEPTH (200), so no walker recurses deeper */
    int slot;                /* EXPR_NAME */
    Pos pos;
    const char *text;        /* the literal as written: number, string or name;
                                EXPR_CALL: the function; EXPR_FIELD: the field */
    /* One or the other, by kind: a number has no right operand. A walker
     * reads rhs of an EXPR_BINARY only (expr_rhs() is NULL for the rest). */
    union {
        double number;       /* EXPR_NUMBER: as written, in `unit` */
        Expr *rhs;           /* EXPR_BINARY */
    };
    const Unit *unit;        /* EXPR_NUMBER: resolved unit when has_unit (shared, see unit_shared) */
    Expr *lhs;               /* EXPR_NEG, EXPR_PAREN (inner), EXPR_FIELD (base), EXPR_BINARY */
    const ExprCall *call;    /* EXPR_CALL: its arguments, its own; &expr_no_call on every other node */
};

/* The right operand of a binary node; NULL for every other kind. */
static inline const Expr *expr_rhs(const Expr *e) { return e->kind == EXPR_BINARY ? e->rhs : NULL; }

/* A call's arguments, kept apart from the node: calls are a few of the
 * nodes of a calc, and every node would otherwise carry room for them. */
struct ExprCall {
    int callee_slot;         /* a record defined in the calc called as f(x), else -1 */
    Expr **args;
    size_t nargs;
    const char **kw_names;   /* keyword arguments: name, value, where */
    Expr **kw;
    Pos *kw_pos;
    size_t nkw;
};

extern const ExprCall expr_no_call;

/* ---- statements -------------------------------------------------------- */

typedef enum StmtKind {
    STMT_DEF,    /* NAME = EXPR [as UNIT]                          */
    STMT_SOLVE,  /* NAME = solve VAR where A = B [between LO and HI] */
    STMT_CHECK,  /* check LABEL: A OP B                            */
    STMT_NOTE,   /* a whole-line comment                           */
    STMT_PATH,   /* a ```path NAME block: binds the record NAME    */
    STMT_NETWORK,/* a ```network NAME block: binds the record NAME */
    STMT_FIGURE, /* figure KIND(args)  # caption                   */
    STMT_CURVE   /* a ```curve NAME block: binds the curve NAME    */
} StmtKind;

/* One entry of a path's fittings cell: "2 elbow 90 std". */
typedef struct FittingItem {
    int count;
    const char *kind;        /* the words as written */
    Pos pos;
} FittingItem;

/* One row of a path table. Optional cells are NULL. */
typedef struct PathSegment {
    const char *id;          /* as written ("S-1") */
    const char *field;       /* its record field name ("S_1") */
    Pos pos;
    Expr *flow, *pipe, *length, *rise, *K, *C;
    Expr *device;            /* a device at the segment's outlet (DESIGN 2.10) */
    const char *device_text; /* its cell as written */
    FittingItem *fittings;
    size_t nfittings;
    FittingItem *fixtures;   /* the fixtures cell (DESIGN 2.11): "12 lavatory private, 2 bidet",
                                each a count and the fixture's words, taken off at the outlet */
    size_t nfixtures;
} PathSegment;

/* The `demand:` option of a path: how a segment's fixture load becomes its flow. */
typedef enum PathDemand { PATH_DEMAND_NONE, PATH_DEMAND_HUNTER, PATH_DEMAND_PEAK, PATH_DEMAND_CURVE } PathDemand;

typedef enum PathLoss { LOSS_DARCY, LOSS_HAZEN_WILLIAMS } PathLoss;

/* A ```path NAME block (DESIGN 2.2a): options, then a pipe table. */
typedef struct PathSpec {
    Expr *fluid;             /* a water record */
    Expr *start;             /* static pressure at the first inlet */
    PathLoss loss;
    const char *friction;    /* friction_factor method, NULL: default */
    const char *fittings;    /* k_fitting method, NULL: default */
    PathDemand demand;       /* `demand:` hunter("flush tank"|"flush valve"), peak_demand or a curve */
    const char *demand_system; /* hunter's system, "flush tank" or "flush valve" */
    Expr *demand_curve;      /* `demand: NAME`: a curve of demand (a flow) against load (wsfu) */
    Pos demand_pos;
    bool has_fixtures;       /* the table has a fixtures column */
    PathSegment *segs;
    size_t nsegs;
} PathSpec;

/* A ```network NAME block (DESIGN 2.12): options, a node table and a link
 * table. Ids are text as written; every other cell an expression (optional
 * cells NULL). */
typedef struct NetNode {
    const char *id;          /* as written ("J-1") */
    const char *field;       /* its record field name ("J_1") */
    Pos pos;
    Expr *elevation, *demand, *head, *pressure, *x, *y;
    FittingItem *fixtures;   /* the fixtures cell (DESIGN 2.11, 2.12): the fixtures served at the node */
    size_t nfixtures;
} NetNode;

typedef struct NetLink {
    const char *id, *field;
    Pos pos;
    const char *from, *to;   /* node ids as written */
    Pos from_pos, to_pos;
    int from_node, to_node;  /* indices into NetworkSpec.nodes */
    Expr *pipe, *length, *K, *C, *device;
    FittingItem *fittings;
    size_t nfittings;
    Pos fittings_pos;
} NetLink;

typedef struct NetworkSpec {
    Expr *fluid;             /* a water record */
    PathLoss loss;
    const char *friction;    /* friction_factor method, NULL: default */
    const char *fittings;    /* k_fitting method, NULL: default */
    Expr *tolerance;         /* a flow; NULL: 1e-9 m^3/s */
    PathDemand demand;       /* `demand:` as a path's: how a node's fixture load becomes its demand */
    const char *demand_system;
    Expr *demand_curve;
    Pos demand_pos;
    bool has_fixtures;       /* the node table has a fixtures column */
    NetNode *nodes;
    size_t nnodes;
    NetLink *links;
    size_t nlinks;
    bool has_xy;             /* the node table has x and y columns */
} NetworkSpec;
/* A ```curve NAME block (DESIGN 2.10): an interpolate: line and a
 * two-column table, the argument and the value, one point a row. */
typedef struct CurveSpec {
    bool loglog;             /* interpolate: loglog (default linear) */
    const char *x_head, *y_head;   /* the column headings as written */
    Expr **x, **y;           /* npoints cells each */
    Pos *row_pos;
    size_t npoints;
} CurveSpec;

typedef enum CmpOp { CMP_LE, CMP_LT, CMP_GE, CMP_GT } CmpOp;

typedef struct Cite {
    const char *key;
    Pos pos;
    int source;              /* index into Document.sources, -1 if unknown */
} Cite;

/* The parts of a statement few statements have, kept apart from it so every
 * statement does not carry room for them (issue 17). A statement without
 * them points at the shared empty one (stmt_no_solve, ...), never NULL. */
typedef struct StmtSolve {
    const char *var;         /* the varied name */
    Pos var_pos;
    Expr *lo, *hi;           /* optional bracket */
} StmtSolve;

typedef struct StmtAs {
    const char *text;        /* the unit as written after `as` */
    const Unit *unit;        /* shared, see unit_shared */
    Pos pos;
} StmtAs;

typedef struct StmtFigure {
    const char *kind;        /* hgl, moody or pump */
    Expr **args;             /* its arguments */
    size_t nargs;
} StmtFigure;

extern const StmtSolve stmt_no_solve;
extern const StmtAs stmt_no_as;
extern const StmtFigure stmt_no_figure;

typedef struct Stmt {
    StmtKind kind;
    int index;               /* position in Document.stmts: the name's slot */
    Pos pos;                 /* first character of the statement */
    const char *name;        /* DEF, SOLVE */
    Pos name_pos;
    Expr *expr;              /* DEF */
    const StmtAs *as;        /* DEF, SOLVE when has_as */
    const StmtSolve *solve;  /* SOLVE */
    Expr *lhs, *rhs;         /* SOLVE: the equation; CHECK: the two sides */
    const char *label;       /* CHECK */
    int var_slot;            /* SOLVE: the varied name's slot */
    CmpOp cmp;
    bool has_as;             /* DEF, SOLVE */
    bool finding;            /* CHECK written `finding LABEL: A OP B`: a yes/no
                                answer recorded, never counted as a check */
    bool parse_failed;       /* nothing to evaluate: errors were reported */
    const char *description; /* trailing comment, citations removed; NOTE: its text */
    Cite *cites;             /* ncites of them; NULL when none */
    size_t ncites;
    PathSpec *path;          /* PATH */
    NetworkSpec *network;    /* NETWORK */
    CurveSpec *curve;        /* CURVE */
    const StmtFigure *fig;   /* FIGURE */
    int *deps;               /* slots this statement reads directly, ascending */
    size_t ndeps;
} Stmt;

/* ---- prose ------------------------------------------------------------- */

typedef enum InlineKind {
    INL_TEXT,
    INL_CODE,
    INL_EMPH,
    INL_STRONG,
    INL_STRIKE,
    INL_LINK,
    INL_SOFTBREAK,
    INL_LINEBREAK,
    INL_VALUE                /* {name} or {name as unit} */
} InlineKind;

typedef struct Inline Inline;
struct Inline {
    InlineKind kind;
    const char *text;        /* TEXT, CODE; VALUE: the name */
    const char *url;         /* LINK */
    Inline *children;        /* EMPH, STRONG, STRIKE, LINK */
    Inline *next;
    Pos pos;                 /* VALUE */
    int slot;                /* VALUE */
    const char *field;       /* VALUE: {tube.id} reads a record field */
    bool has_as;             /* VALUE */
    Unit as_unit;
};

typedef enum BlockKind {
    BLK_HEADING,
    BLK_PARAGRAPH,
    BLK_LIST,
    BLK_ITEM,
    BLK_QUOTE,
    BLK_CODE,                /* any other fenced or indented code */
    BLK_TABLE,
    BLK_TABLE_ROW,
    BLK_TABLE_CELL,
    BLK_RULE,
    BLK_HTML,
    BLK_CALC,                /* ```calc: statements [first_stmt, first_stmt + nstmts) */
    BLK_PATH,                /* ```path NAME: one statement, first_stmt */
    BLK_NETWORK,             /* ```network NAME: one statement, first_stmt */
    BLK_CURVE,               /* ```curve NAME: one statement, first_stmt */
    BLK_CASES,               /* ```cases: Document.cases[first_stmt] */
    BLK_SOURCES              /* ```sources */
} BlockKind;

typedef enum Align { ALIGN_NONE, ALIGN_LEFT, ALIGN_CENTER, ALIGN_RIGHT } Align;

typedef struct Block Block;
struct Block {
    BlockKind kind;
    Pos pos;
    int level;               /* HEADING: 1..6 */
    char number[32];         /* HEADING: "2.1" */
    bool ordered;            /* LIST */
    int start;               /* LIST: first number */
    bool header_row;         /* TABLE_ROW */
    Align *align;            /* TABLE: per column */
    int ncols;               /* TABLE */
    Inline *inlines;         /* HEADING, PARAGRAPH, TABLE_CELL */
    const char *text;        /* CODE, HTML: literal */
    const char *info;        /* CODE and the fences below: info string */
    const char *raw;         /* CALC, SOURCES, PATH, CURVE, NETWORK, CASES: the fence's lines as
                                cmark gave them, for the fences stage; raw_len bytes, not
                                NUL-terminated (most often they are the source's own bytes) */
    size_t raw_len;
    int raw_line;            /* the file line of raw's first line */
    size_t first_stmt, nstmts;  /* CALC */
    Block *children;         /* LIST, ITEM, QUOTE, TABLE, TABLE_ROW */
    Block *next;
};

/* ---- front matter and sources ------------------------------------------ */

typedef struct Revision {
    const char *rev, *date, *by, *note;
} Revision;

/* One entry of a package index's `parts:` list (DESIGN 2.13). */
typedef struct Part {
    const char *file;        /* as written, relative to the index */
    Pos pos;
} Part;

typedef enum Paper { PAPER_LETTER, PAPER_A4 } Paper;

/* Where the atmosphere of a calc comes from (DESIGN 2.9). */
typedef enum AtmosphereSource {
    ATM_STANDARD = 0,        /* 101.325 kPa, nothing said */
    ATM_GIVEN,               /* front matter `atmosphere:` */
    ATM_ELEVATION            /* front matter `elevation:`, standard-atmosphere relation */
} AtmosphereSource;

typedef struct Meta {
    const char *title, *project, *client, *number, *subject, *revision, *date;
    const char *prepared, *checked, *approved, *engineer, *license, *status;
    const char *prepared_date, *checked_date;
    UnitSystem units;
    Paper paper;
    int digits;
    const char *code;        /* `code:` the model plumbing code's key ("IPC 2018"); NULL: the default */
    Revision *revisions;
    size_t nrevisions;
    Part *parts;             /* a package index: its calc files, in order */
    size_t nparts;
    bool has_parts;          /* the key was given (an index, even with an empty list) */
    bool present;            /* the file had front matter */
    double atmosphere;       /* Pa, absolute: what separates gauge from absolute */
    AtmosphereSource atm_source;
    double elevation;        /* m above sea level (ATM_ELEVATION) */
    const char *atmosphere_text, *elevation_text; /* as written */
} Meta;

typedef struct Source {
    const char *key;
    const char *text;
    Pos pos;
    bool cited;
} Source;

/* ---- parametric cases -------------------------------------------------- */

/* A ```cases block: columns name inputs, rows give them other values, and
 * `show:` names the results to tabulate per row. */
typedef struct CaseTable {
    Pos pos;
    const char **inputs;     /* column names */
    Pos *input_pos;
    int *input_slots;        /* resolved: statements that define them */
    size_t ninputs;
    Expr **cells;            /* nrows * ninputs, row-major */
    Pos *row_pos;
    size_t nrows;
    const char **show;       /* as written */
    Pos *show_pos;
    Expr **show_exprs;       /* each a name or a field: V, riser.p_end */
    size_t nshow;
} CaseTable;

/* ---- the document ------------------------------------------------------ */

typedef struct NameTable NameTable;
struct UseSet;


typedef struct Document {
    Arena arena;
    const char *file;        /* display name */
    const char *text;        /* the source bytes, NUL-terminated */
    size_t len;
    char *own_text;          /* text, when it is a heap buffer the document owns (doc_load) */
    char digest[65];         /* SHA-256 of the source bytes, lower-case hex */
    Meta meta;
    Block *blocks;
    Stmt **stmts;
    size_t nstmts;
    Source *sources;
    size_t nsources;
    CaseTable **cases;
    size_t ncases;
    NameTable *names;        /* name -> statement slot */
    size_t *line_start;      /* byte offset of each line (index 0 = line 1) */
    size_t nlines;
    bool from_git;           /* read as REV:path: its uses are read from the same revision */
    struct UseSet *own_uses; /* the used files of eval_document() without a shared set */
} Document;

/* Release a document and everything in its arena (doc_load and
 * doc_from_text in load.h make one). */
void doc_free(Document *doc);

/* A comparison as text: "<=" (or "≤" when typeset). */
const char *cmp_op_text(CmpOp op, bool typeset);

/* Does the expression read a value of the calc (a defined name, a field, g,
 * a callable record)? Such an expression has a substituted form worth
 * showing; pi and literals alone do not. */
bool expr_reads_names(const Expr *e);

/* The file a `NAME = use("file.calc.md")` statement reads, as written; NULL
 * for any other statement. Lets tools list a document's uses without
 * evaluating it. */
const char *doc_stmt_use(const Stmt *s);

/* Does the expression substitute to nothing more than its own value (a name,
 * a field, a literal, perhaps negated or in parentheses)? A row whose sides
 * are all simple needs no line of substituted values. */
bool expr_is_simple(const Expr *e);

/* Name table: NULL/-1 when absent. */
int doc_lookup(const Document *doc, const char *name);
const char *doc_source_line(const Document *doc, int line, size_t *len);

#endif
