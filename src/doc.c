/* doc.c — the document tree's own small accessors: a source line, the
 * text of a comparison, what an expression reads, a `use("file")` line,
 * and releasing a document. Loading is load.c; resolution resolve.c. */
#include "doc.h"

#include <stdlib.h>
#include <string.h>

#include "source.h"
#include "uses.h"

const char *doc_source_line(const Document *doc, int line, size_t *len)
{
    return source_line(doc->text, doc->len, doc->line_start, doc->nlines, line, len);
}

const char *cmp_op_text(CmpOp op, bool typeset)
{
    switch (op) {
    case CMP_LE: return typeset ? "≤" : "<=";
    case CMP_LT: return "<";
    case CMP_GE: return typeset ? "≥" : ">=";
    case CMP_GT: return ">";
    }
    return "?";
}

bool expr_reads_names(const Expr *e)
{
    if (!e)
        return false;
    switch (e->kind) {
    case EXPR_NAME:
        return e->slot >= 0 || e->slot == SLOT_G;
    case EXPR_FIELD:
        return true;
    case EXPR_NUMBER:
    case EXPR_STRING:
        return false;
    case EXPR_CALL:
        for (size_t i = 0; i < e->call->nargs; i++)
            if (expr_reads_names(e->call->args[i]))
                return true;
        for (size_t i = 0; i < e->call->nkw; i++)
            if (expr_reads_names(e->call->kw[i]))
                return true;
        return e->call->callee_slot >= 0;
    default:
        return expr_reads_names(e->lhs) || expr_reads_names(expr_rhs(e));
    }
}

bool expr_is_simple(const Expr *e)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    if (e && e->kind == EXPR_NEG)
        e = e->lhs;
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    return e && (e->kind == EXPR_NAME || e->kind == EXPR_FIELD || e->kind == EXPR_NUMBER ||
                 e->kind == EXPR_STRING);
}

const char *doc_stmt_use(const Stmt *s)
{
    const Expr *e = s && s->kind == STMT_DEF && !s->parse_failed ? s->expr : NULL;
    if (!e || e->kind != EXPR_CALL || strcmp(e->text, "use") != 0 || e->call->callee_slot >= 0 ||
        e->call->nargs != 1 || e->call->nkw != 0 || e->call->args[0]->kind != EXPR_STRING)
        return NULL;
    return e->call->args[0]->text;
}

void doc_free(Document *doc)
{
    if (!doc)
        return;
    use_set_free(doc->own_uses);
    free(doc->own_text);
    arena_free(&doc->arena);
    free(doc);
}
