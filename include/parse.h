/* parse.h — calc statements and expressions from lines of text.
 *
 * A recursive-descent parser over the tokens of one line. Each grammar rule
 * is a function with the rule written above it. The parser resolves units
 * of number literals (an unknown unit is an error at the unit, with a
 * suggestion) but not names: name resolution needs the whole document and
 * happens in doc.c. Nodes are allocated in the document's Arena. Nesting is
 * limited (PARSE_MAX_DEPTH) so hostile input cannot exhaust the stack. */
#ifndef HEADROOM_PARSE_H
#define HEADROOM_PARSE_H

#include "doc.h"

#include "bounds.h" /* PARSE_MAX_DEPTH */

/* Parse one line of a calc block. Returns NULL for a blank line; a whole-line
 * comment gives a STMT_NOTE. On a syntax error the statement is returned with
 * parse_failed set (so its name, if any, is still known) after reporting. */
Stmt *parse_statement(Arena *a, const char *line, size_t len, Pos start, DiagList *diags);

/* A zeroed statement in `a` with its optional parts at the shared empty ones
 * (stmt_no_solve, stmt_no_as, stmt_no_figure) and no slot for a solve. */
Stmt *stmt_new(Arena *a);

/* Parse an expression that is all of text[0..len) (a table cell), with
 * positions counted from `start`; NULL after reporting on error. */
Expr *parse_expression_at(Arena *a, const char *text, size_t len, Pos start, DiagList *diags);

/* Parse "A = B" (or just "A"; then *rhs is NULL), as library formulas are
 * written. Returns 0 after reporting on error. */
int parse_equation_text(Arena *a, const char *text, DiagList *diags, Expr **lhs, Expr **rhs);

/* Resolve a unit written after a number or `as`; reports unknown units with
 * "did you mean ...?". */
int parse_unit(const char *text, size_t len, Pos pos, Unit *out, DiagList *diags);

#endif
