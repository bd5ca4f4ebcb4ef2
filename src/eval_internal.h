/* eval_internal.h — what the evaluator's files share, and nothing else
 * includes.
 *
 * The evaluator is one module in seven files:
 *   eval.c          expressions (operators, names, fields, calls), the
 *                   statement loop, eval_recompute and the document
 *   eval_display.c  display units, `as UNIT`, inline values in the prose
 *   eval_solve.c    `solve`
 *   eval_check.c    `check`
 *   eval_tables.c   the table statements: path, curve, network
 *   figures.c       `figure`
 *   cases.c         parametric cases
 * They share the statement's context and the expression evaluator. */
#ifndef HEADROOM_EVAL_INTERNAL_H
#define HEADROOM_EVAL_INTERNAL_H

#include "eval.h"

/* The context of one statement's evaluation. */
typedef struct EvalCtx {
    Evaluated *ev;
    Document *doc;
    DiagList *diags;
    CallCtx *call;           /* the statement's method list */
    int upstream;            /* an input failed earlier: say nothing more */
} EvalCtx;

/* ---- eval.c -------------------------------------------------------------- */

/* Evaluate an expression; false after an error (or, with c->upstream set,
 * when an input had failed and nothing more is said). */
bool eval_expr(EvalCtx *c, const Expr *e, Value *out);
/* "pressure (psi)": an operand's dimension and the unit it is written or
 * shown in, for messages. */
void eval_describe_operand(EvalCtx *c, const Expr *e, const Value *v, char *buf, size_t n);
/* `made` copied into the document's arena, for StmtResult.made. */
const StmtMade *eval_made(Evaluated *ev, StmtMade made);
/* A number, or an error at `e` naming its `role`. */
bool eval_need_number(EvalCtx *c, const Expr *e, const Value *v, const char *role);
/* The unit that states `ref` in the calc's system: "psia", "kPag". */
const char *eval_ref_unit(const EvalCtx *c, PressureRef ref);

/* ---- eval_display.c ------------------------------------------------------ */

/* A statement's `as UNIT` fits its value (eval_unit_fits), or an error. */
bool eval_as_fits(EvalCtx *c, const Stmt *s, const Value *v);
/* The value restated to the pressure reference of `as UNIT`. */
Value eval_as_restate(Evaluated *ev, Value v, const Unit *u);
/* Check the inline values of every block of the prose. */
void eval_check_inlines(Evaluated *ev, const Block *b, DiagList *diags);

/* ---- the statement kinds ------------------------------------------------- */

void eval_solve(Evaluated *ev, const Stmt *s, StmtResult *res, CallCtx *cc, DiagList *diags);
void eval_check(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c);
/* The unit an expression states for itself (a literal's, a plain name's),
 * NULL for anything computed. */
const Unit *eval_written_unit(const Evaluated *ev, const Expr *e);
void eval_path(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c);
void eval_curve(const Stmt *s, StmtResult *res, EvalCtx *c);
void eval_network(Evaluated *ev, const Stmt *s, StmtResult *res, EvalCtx *c);
void eval_figure(const Stmt *s, StmtResult *res, EvalCtx *c);
/* One `cases` table, after every statement has been evaluated. */
void eval_cases(Evaluated *ev, const CaseTable *ct, CaseResult *cr, DiagList *diags);

#endif
