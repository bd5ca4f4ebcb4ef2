/* library.h — the functions a calc can call.
 *
 * Built-in functions (math, and the published hydraulic methods in
 * src/methods/) are listed once in src/builtins.def. Each receives evaluated
 * arguments with their positions and returns a Value; it reports problems as
 * diagnostics at the argument's or the call's position and returns false on
 * error. A function that applies a published method names it with
 * call_use_method(), so the report can show the method's formula, validity
 * range and reference beside the statement and in the references section. */
#ifndef HEADROOM_LIBRARY_H
#define HEADROOM_LIBRARY_H

#include "arena.h"
#include "diag.h"
#include "value.h"

/* A published method: how the report shows and cites it. `formula` is written
 * in the calc language's expression syntax so the math layout can typeset it
 * (e.g. "1/sqrt(f) = -2*log10(rr/3.7 + 2.51/(Re*sqrt(f)))"). */
typedef struct Method {
    const char *key;        /* stable identifier, e.g. "colebrook" */
    const char *title;      /* "Colebrook-White equation" */
    const char *formula;    /* in calc syntax; may be NULL */
    const char *validity;   /* "4000 <= Re <= 1e8, 0 <= rr <= 0.05"; may be NULL */
    const char *reference;  /* "Colebrook, C. F. (1939). J. Inst. Civil Eng. 11(4), 133-156." */
} Method;

typedef struct CallArgs {
    size_t n;
    const Value *args;
    const Pos *arg_pos;
    size_t nkw;
    const char *const *kw_names;
    const Value *kw;
    const Pos *kw_pos;
    Pos pos;                /* the function name */
    const char *name;
} CallArgs;

/* Methods one statement can cite: a path cites its friction and fitting
 * methods and one load table row per fixture kind of its fixtures column. */
#define CALL_MAX_METHODS 24

/* A table a statement lays out for the report: a curve's points,
 * select_pipe's candidate sizes. Cells are numbers (shown in their column's
 * unit) or strings, row-major; the renderers print it as it is. */
typedef struct ResultTable {
    const char *title;
    size_t ncols, nrows;
    const char **heads;      /* column headings */
    Unit *units;             /* per column; text "" for strings and pure numbers */
    Value *cells;            /* nrows * ncols */
} ResultTable;

/* How one call applied a published method, for the report: the value of
 * each symbol of the method's formula that the call used (named as the
 * formula names it), the value the formula gave (its left side), and the
 * variant taken in words ("anchored throughout: c₁ = 1 − ν²"). The sheets
 * set the formula out with these values substituted, so a reviewer can
 * re-do the method's step from the numbers printed. */
#define METHOD_MAX_INPUTS 10
#define CALL_MAX_USES 12
typedef struct MethodInput {
    const char *name;       /* a name of the method's formula: "rho", "c_1" */
    Value value;
} MethodInput;

typedef struct MethodUse {
    const Method *method;
    MethodInput inputs[METHOD_MAX_INPUTS];
    size_t ninputs;
    Value result;           /* the formula's left side as computed; kind VAL_NONE: none */
    const char *branch;     /* the variant taken, or NULL */
} MethodUse;

typedef struct CallCtx {
    Arena *arena;
    DiagList *diags;
    UnitSystem units;
    const Method *methods[CALL_MAX_METHODS];   /* methods used by this statement */
    size_t nmethods;
    const char *code;       /* the front matter's `code:` key, or NULL for the default */
    const ResultTable *table;                  /* a table for the report, or NULL */
    double atmosphere;      /* Pa absolute (DESIGN 2.9); 0: the standard one */
    bool atmosphere_used;   /* a function read it: the report states it */
    MethodUse uses[CALL_MAX_USES];             /* how the calls applied their methods */
    size_t nuses;
} CallCtx;

/* A context for evaluating one statement: the scalars set and no method or
 * use recorded. The two arrays are left as they are (16 KB, written before
 * they are read, below nmethods and nuses): zeroing them for every statement
 * and every solver trial cost a check a tenth of its time (issue 17). */
void call_ctx_init(CallCtx *cx, Arena *arena, DiagList *diags, UnitSystem units, const char *code, double atmosphere);

/* The calc's atmosphere in Pa (the standard one when the context has none),
 * marking it used. */
double call_atmosphere(CallCtx *cx);

typedef bool (*BuiltinFn)(CallCtx *cx, const CallArgs *a, Value *out);

typedef struct Builtin {
    const char *name;
    BuiltinFn fn;
    int min_args;
    int max_args;           /* -1: any number */
    const char *keywords;   /* the keyword arguments it takes, space separated */
    const char *summary;    /* one line for --help and the manual */
} Builtin;

const Builtin *builtin_lookup(const char *name);
void builtin_each(void (*fn)(const Builtin *b, void *ctx), void *ctx);

/* Record that the current call used a method (deduplicated). */
void call_use_method(CallCtx *cx, const Method *m);

/* Start the record of how this call applies `m` (also call_use_method):
 * NULL when the statement already holds CALL_MAX_USES of them; the use_*
 * helpers accept NULL. */
MethodUse *call_begin_use(CallCtx *cx, const Method *m);
/* A formula symbol's value: a number in SI with its dimension. */
void use_input(MethodUse *u, const char *name, double si, Dim dim);
void use_input_value(MethodUse *u, const char *name, Value v);
void use_result(MethodUse *u, double si, Dim dim);
/* The variant taken, in words (copied into the call's arena). */
void use_branch(CallCtx *cx, MethodUse *u, const char *fmt, ...) __attribute__((format(printf, 3, 4)));

/* One method, as the report cites it: the same object, or the same key,
 * title and reference (pipe() builds a material's roughness and modulus
 * entries afresh at every call; four calls on one material are one
 * entry). */
bool method_same(const Method *a, const Method *b);

/* Where argument i was written (the call's name when there is no such
 * argument), for messages about it. */
Pos arg_at(const CallArgs *a, size_t i);
/* Argument helpers: each reports a diagnostic naming the function, the
 * argument and the expected and found dimension, and returns false. */
bool arg_number(CallCtx *cx, const CallArgs *a, size_t i, Dim want, const char *what, double *si);
bool arg_dimensionless(CallCtx *cx, const CallArgs *a, size_t i, const char *what, double *x);
bool arg_string(CallCtx *cx, const CallArgs *a, size_t i, const char *what, const char **s);
bool arg_record(CallCtx *cx, const CallArgs *a, size_t i, const char *type, const char *what, const Record **r);
/* Keyword argument lookup: NULL when absent. Unknown keywords are reported
 * by kw_check(). */
const Value *kw_get(const CallArgs *a, const char *name, Pos *pos);
/* Every keyword of the call is one the function's builtins.def entry
 * lists (the only list of them); else an error at the first that is not.
 * The evaluator checks every call so; kw_check does it for a function
 * called by its C name. */
bool builtin_keywords_ok(CallCtx *cx, const Builtin *b, const CallArgs *a);
bool kw_check(CallCtx *cx, const CallArgs *a);

/* Call a library function through its C function (builtin_fns.h) from C
 * code, as path and network hydraulics do, with `n` positional values and
 * at most one keyword value (none when kw is NULL); true with a number in
 * *out. `name` is the function's name for its messages. */
bool builtin_call(CallCtx *cx, BuiltinFn fn, const char *name, Pos at, const Value *args, const Pos *pos,
                  size_t n, const char *kw_name, const Value *kw, Value *out);

/* "pressure (psi)", "length (ft)", "kg*m^-3" — a dimension as messages name
 * it: its plain word and the unit the document's system shows it in. */
void dim_describe(Dim d, TempKind temp, UnitSystem sys, char *buf, size_t n);
/* The same for a value: "a string", "a pipe record", or dim_describe. */
void value_describe(const Value *v, UnitSystem sys, char *buf, size_t n);

/* Fixture demand for path tables (src/methods/demand_lib.c, DESIGN 2.11).
 * The total load in wsfu of one fixture of a fixtures cell item ("lavatory
 * public": the kind, then an optional private or public), from the code's
 * table, the row cited; and the peak demand of a total load by the code's
 * demand table for `system` ("flush tank" or "flush valve"). Both report
 * their errors at `at` as wsfu() and hunter() do and return false. */
bool demand_item_load(CallCtx *cx, const char *words, Pos at, double *wsfu_each);
bool demand_hunter_flow(CallCtx *cx, const char *system, double load, Pos at, double *Q);
/* The demand of a load (wsfu) by the calc's curve of demand against load
 * (`demand: NAME`); refused outside its rows. `id` names the row: a path's
 * segment, or a network's node when `node`. */
bool demand_curve_flow(CallCtx *cx, const Value *curve, double load, Pos at, bool node, const char *id, double *Q);
/* peak_demand for a path: the fixture probability table is needed. */
bool demand_peak_flow(CallCtx *cx, Pos at);

#endif
