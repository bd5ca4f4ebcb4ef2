/* pdf_state.c — what the report's items read through the Pdf besides the
 * page: the scope of a package's part (loaded before each item) and the
 * numbers of the figures. Below every item file (see draw.h). */
#include "report/pdf_internal.h"

#include <stdio.h>

/* ---- scopes --------------------------------------------------------------- */

void pdf_scope_save(const Pdf *P, PdfScope *s)
{
    s->ev = P->ev;
    s->d = P->d;
    s->model = P->model;
    s->env = P->env;
    s->governing = P->governing;
    s->preliminary = P->preliminary;
    s->source_ref = P->source_ref;
    s->method_ref = P->method_ref;
    s->method_first = P->method_first;
    s->nrefs = P->nrefs;
    s->ref_page = P->ref_page;
    s->ref_y = P->ref_y;
    s->figure_no = P->figure_no;
    s->nfigures = P->nfigures;
    s->since = P->since;
}

void pdf_scope_load(Pdf *P, int k)
{
    if (!P->scopes || k == P->scope || k < 0 || k >= P->nscopes)
        return;
    pdf_scope_save(P, &P->scopes[P->scope]);
    const PdfScope *s = &P->scopes[k];
    P->ev = s->ev;
    P->d = s->d;
    P->model = s->model;
    P->env = s->env;
    P->governing = s->governing;
    P->preliminary = s->preliminary;
    P->source_ref = s->source_ref;
    P->method_ref = s->method_ref;
    P->method_first = s->method_first;
    P->nrefs = s->nrefs;
    P->ref_page = s->ref_page;
    P->ref_y = s->ref_y;
    P->figure_no = s->figure_no;
    P->nfigures = s->nfigures;
    P->since = s->since;
    P->scope = k;
}

/* ---- figure numbers ----------------------------------------------------- */

/* ---- numbering --------------------------------------------------------- */

void pdf_number_figures(Pdf *P)
{
    const Document *d = P->d;
    P->figure_no = arena_alloc(&P->arena, (d->nstmts + 1) * sizeof(int));
    int n = 0;
    for (const Block *b = d->blocks; b; b = b->next) {
        if (b->kind != BLK_CALC)
            continue;
        for (size_t i = 0; i < b->nstmts; i++) {
            const Stmt *st = d->stmts[b->first_stmt + i];
            if (st->kind == STMT_FIGURE && !st->parse_failed)
                P->figure_no[st->index] = ++n;
        }
    }
    P->nfigures = n;
}

/* "Figure 1", "Figures 1 and 2", "Figures 1, 2 and 3" for the figures
 * whose first argument is the statement `slot` (a path); "" when none. */
void pdf_figures_of(const Pdf *P, int slot, char *buf, size_t n)
{
    int nums[16];
    size_t k = 0;
    for (size_t i = 0; i < P->d->nstmts && k < 16; i++) {
        const Stmt *st = P->d->stmts[i];
        if (st->kind != STMT_FIGURE || !P->figure_no[i])
            continue;
        for (size_t a = 0; a < st->fig->nargs; a++)
            if (st->fig->args[a] && st->fig->args[a]->kind == EXPR_NAME && st->fig->args[a]->slot == slot) {
                nums[k++] = P->figure_no[i];
                break;
            }
    }
    buf[0] = '\0';
    if (!k)
        return;
    size_t at = (size_t)snprintf(buf, n, "Figure%s ", k > 1 ? "s" : "");
    for (size_t i = 0; i < k && at < n; i++)
        at += (size_t)snprintf(buf + at, n - at, "%s%d", i == 0 ? "" : i + 1 == k ? " and " : ", ",
                               nums[i]);
}
