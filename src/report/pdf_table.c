/* pdf_table.c — tables a statement lays out, and curve blocks, in the
 * report.
 *
 * A ResultTable (a curve's points, select_pipe's candidate sizes) becomes a
 * ruled table under its statement: a shaded header with each column's
 * heading and unit, then one row a line, numbers right-aligned in their
 * column's unit, words left-aligned, in chunks that each fit a sheet and
 * repeat the header. A ```curve block becomes a heading row (its name, how
 * it is read, the methods' keys in the margin), its table and its method.
 * Everything is read from the evaluated results. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"

enum { TABLE_CHUNK = 30 };
#define TB_SIZE 8.2

static bool unit_shown(const Unit *u)
{
    return u->text[0] && strcmp(u->text, "1") != 0;
}

static void cell_text(const Pdf *P, const ResultTable *t, size_t r, size_t k, char *buf, size_t n)
{
    const Value *v = &t->cells[r * t->ncols + k];
    if (v->kind == VAL_STRING) {
        snprintf(buf, n, "%s", v->str);
        return;
    }
    if (v->kind != VAL_NUMBER || !isfinite(v->q.si)) {
        snprintf(buf, n, "—");
        return;
    }
    num_typeset(unit_from_si(v->q.si, &t->units[k], v->q.temp == TEMP_NONE), P->env.digits, buf, n);
}

/* Column edges: each column as wide as its widest entry, the table as wide
 * as it needs up to the text width (then scaled down to fit). */
static double *table_edges(Pdf *P, const ResultTable *t, double *size)
{
    double *x = arena_alloc(&P->arena, (t->ncols + 1) * sizeof *x);
    double *w = arena_alloc(&P->arena, (t->ncols + 1) * sizeof *w);
    double sum = 0, W = P->sheet.body_r - P->sheet.margin_w - P->sheet.body_l;
    for (size_t k = 0; k < t->ncols; k++) {
        char ut[48] = "";
        if (unit_shown(&t->units[k]))
            mbox_unit_text(t->units[k].text, ut, sizeof ut);
        w[k] = fmax(pdf_width(P, FONT_SANS, 6.6, t->heads[k]), pdf_width(P, FONT_SANS, 6.4, ut));
        for (size_t r = 0; r < t->nrows; r++) {
            char buf[96];
            cell_text(P, t, r, k, buf, sizeof buf);
            w[k] = fmax(w[k], pdf_width(P, FONT_SERIF, TB_SIZE, buf));
        }
        w[k] = fmax(w[k], 24) + 14;
        sum += w[k];
    }
    double scale = sum > W ? W / sum : 1;
    *size = TB_SIZE * scale;
    x[0] = P->sheet.body_l + 4;
    for (size_t k = 0; k < t->ncols; k++)
        x[k + 1] = x[k] + w[k] * scale;
    return x;
}

/* A chunk of rows: it->aux is the first row, it->depth the count; the
 * title above the first chunk. */
static double fn_table(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const ResultTable *t = P->ev->results[st->index].made->table;
    double size;
    double *x = table_edges(P, t, &size);
    double y = top;
    size_t first = (size_t)it->aux, last = first + (size_t)it->depth;
    if (first == 0) {
        /* wrapped to the text width (a long title ran past the sheet's
         * border); the first line's baseline 8 below the top, 12 to the
         * table, each further line 9 */
        double width = P->sheet.body_r - P->sheet.margin_w - x[0];
        y -= pdf_wrap_color(P, FONT_SANS_BOLD, 7.4, 9, x[0], y - 8 + 7.4 * 0.85, width, t->title, GREY) + 3;
    }
    double hh = 22, x0 = x[0], x1 = x[t->ncols];
    if (P->page)
        pdf_fill(P, x0, y - hh, x1 - x0, hh, SHADE);
    for (size_t k = 0; k < t->ncols; k++) {
        double a = x[k], w = x[k + 1] - a;
        double hw = pdf_width(P, FONT_SANS, 6.6, t->heads[k]);
        pdf_text_color(P, FONT_SANS, 6.6, a + (w - hw) / 2, y - 9, t->heads[k], GREY);
        if (unit_shown(&t->units[k])) {
            char ut[48];
            mbox_unit_text(t->units[k].text, ut, sizeof ut);
            double uw = pdf_width(P, FONT_SANS, 6.4, ut);
            pdf_text_color(P, FONT_SANS, 6.4, a + (w - uw) / 2, y - 18.5, ut, GREY);
        }
        if (k > 0)
            pdf_line(P, a, y, a, y - hh, 0.3);
    }
    pdf_line(P, x0, y, x1, y, 0.9);
    y -= hh;
    pdf_line(P, x0, y, x1, y, 0.5);
    double rh = size + 5;
    for (size_t r = first; r < last && r < t->nrows; r++) {
        for (size_t k = 0; k < t->ncols; k++) {
            char buf[96];
            cell_text(P, t, r, k, buf, sizeof buf);
            bool word = t->cells[r * t->ncols + k].kind == VAL_STRING;
            double w = pdf_width(P, FONT_SERIF, size, buf);
            pdf_text(P, FONT_SERIF, size, word ? x[k] + 5 : x[k + 1] - 5 - w, y - rh + 3.2, buf);
            if (k > 0)
                pdf_line(P, x[k], y, x[k], y - rh, 0.3);
        }
        y -= rh;
    }
    pdf_line(P, x0, y, x1, y, 0.9);
    return top - y + 4;
}

void pdf_table_items(Pdf *P, Vec *items, const Stmt *st)
{
    const ResultTable *t = P->ev->results[st->index].made->table;
    if (!t)
        return;
    for (size_t r = 0; r < t->nrows || r == 0; r += TABLE_CHUNK) {
        item_add(items, P, fn_table, st, (int)r, r ? 4 : 3);
        Item *it = items->items[items->len - 1];
        it->depth = (int)(t->nrows - r < TABLE_CHUNK ? t->nrows - r : TABLE_CHUNK);
        if (t->nrows == 0)
            break;
    }
}

/* ---- curve blocks ------------------------------------------------------------- */

static double fn_curve_head(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    double x = P->sheet.body_l, w = P->sheet.body_r - P->sheet.margin_w - x - 6, y = top - 1;
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 9.6, 12, x, y, w, arena_printf(&P->arena, "Curve: %s", st->name));
    const CurveSpec *cs = st->curve;
    char *t = arena_printf(&P->arena,
                           "%zu points of %s against %s, read %s between points; beyond the first or last "
                           "point the end interval is extrapolated, with a warning beside the line. Called as "
                           "%s(%s).",
                           cs->npoints, cs->y_head, cs->x_head,
                           cs->loglog ? "by straight lines on logarithmic axes (a power law)" : "by straight lines",
                           st->name, cs->x_head);
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x, y, w, t) + 2;
    if (r->state != RES_OK)
        y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, 9, 11.5, x, y, w, "(not evaluated)", FAIL);
    double mh = pdf_row_margin(P, st, top - 1);
    return fmax(top - y, mh + 2);
}

static double fn_curve_methods(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    double x = P->sheet.body_l, W = P->sheet.body_r - x, y = top - 2;
    for (size_t m = 0; m < r->nmethods; m++)
        for (size_t j = 0; j < P->ev->nmethods; j++)
            if (P->ev->methods[j] == r->methods[m] && P->method_first[j] == st->index)
                y -= pdf_method_line(P, r->methods[m], P->method_ref[j], x + 4, y, W - 4);
    return top - y + 2;
}

void pdf_curve_items(Pdf *P, Vec *items, const Stmt *st)
{
    item_add(items, P, fn_curve_head, st, 0, 8);
    const StmtResult *r = &P->ev->results[st->index];
    if (r->state != RES_OK || !r->made->table)
        return;
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    pdf_table_items(P, items, st);
    item_add(items, P, fn_curve_methods, st, 0, 2);
}
