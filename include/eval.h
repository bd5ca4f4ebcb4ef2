/* eval.h — the evaluated document.
 *
 * The evaluator walks the statements in order, checks dimensions on every
 * operation, calls library functions, solves `solve` lines by Brent's method
 * (re-evaluating every name that depends on the varied one) and decides
 * checks. Results sit in an Evaluated beside the Document, one StmtResult per
 * statement, so renderers read the tree and the numbers and never compute.
 * The Evaluated borrows the Document and allocates in its Arena. */
#ifndef HEADROOM_EVAL_H
#define HEADROOM_EVAL_H

#include "doc.h"
#include "library.h"
#include "solve.h"
#include "value.h"

typedef enum ResultState {
    RES_NOT_EVALUATED = 0,   /* a parse error, or it depends on a failed name */
    RES_FAILED,              /* evaluating it reported an error */
    RES_OK
} ResultState;

typedef struct StmtResult {
    ResultState state;
    Value value;             /* DEF, SOLVE: the bound value */
    Unit shown;              /* DEF, SOLVE: the unit the value is shown in (numbers) */
    /* CHECK: both sides; SOLVE: both sides of the equation at the root */
    Value lhs, rhs;
    Unit lhs_shown, rhs_shown;
    bool holds;              /* CHECK */
    double utilization;      /* CHECK: lhs/rhs for <, <=; rhs/lhs for >, >= */
    SolveReport solve;       /* SOLVE */
    const Method *methods[CALL_MAX_METHODS];  /* published methods the line used */
    size_t nmethods;
} StmtResult;

typedef struct Evaluated {
    Document *doc;
    StmtResult *results;     /* doc->nstmts of them */
    UnitSystem units;
    int digits;
    const Method **methods;  /* every method used, in order of first use */
    size_t nmethods;
    size_t nchecks, nfailed; /* checks evaluated, checks that fail */
} Evaluated;

/* Evaluate every statement. Errors and validity warnings go to `diags`. */
Evaluated *eval_document(Document *doc, DiagList *diags);

/* Re-evaluate, in order, the statements that depend (directly or through
 * others) on any slot in `changed`, stopping before statement `upto`. The
 * caller has already stored the new values of the changed slots. Used by
 * `solve` and by parametric cases. */
void eval_recompute(Evaluated *ev, const int *changed, size_t nchanged, size_t upto, DiagList *diags);

/* The unit a number is shown in: `as` wins, then the value's hint for the
 * document's unit system, then the system's default for the dimension. */
Unit eval_display_unit(const Evaluated *ev, const Value *v, const Unit *as_unit);

#endif
