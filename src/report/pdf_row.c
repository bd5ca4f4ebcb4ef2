/* pdf_row.c — what a statement row shows besides its equation, shared by
 * the body and the path, case, network and laid-out tables: the right-hand
 * column (a check's verdict and utilisation, the reference keys, the source
 * line) and a published method's line under its row. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>


/* The right-margin column of a row: keys, line, verdict. */
double pdf_row_margin(Pdf *P, const Stmt *st, double top)
{
    const Sheet *s = &P->sheet;
    const StmtResult *r = &P->ev->results[st->index];
    double x = s->body_r - s->margin_w + 8, y = top;
    if (st->kind == STMT_CHECK && st->finding && r->state == RES_OK) {
        /* a finding's answer: boxed in ink, neither pass nor fail */
        const char *v = r->holds ? "YES" : "NO";
        double bw = s->margin_w - 10, bh = 14;
        pdf_rect(P, x, y - bh, bw, bh, 0.7);
        double vw = pdf_width(P, FONT_SANS_BOLD, 8.5, v);
        pdf_text(P, FONT_SANS_BOLD, 8.5, x + (bw - vw) / 2, y - 10.2, v);
        y -= bh + 2;
        pdf_text_color(P, FONT_SANS, 6.6, x, y - 6.5, "finding", GREY);
        y -= 9;
    } else if (st->kind == STMT_CHECK && r->state == RES_OK) {
        const char *v = r->holds ? "HOLDS" : "FAILS";
        Rgb c = r->holds ? PASS : FAIL;
        double bw = s->margin_w - 10, bh = 14;
        if (P->page) {
            draw_stroke_rgb(P->page, c);
            pdf_rect(P, x, y - bh, bw, bh, r->holds ? 0.7 : 1.4);
            draw_stroke_rgb(P->page, INK);
        }
        double vw = pdf_width(P, FONT_SANS_BOLD, 8.5, v);
        pdf_text_color(P, FONT_SANS_BOLD, 8.5, x + (bw - vw) / 2, y - 10.2, v, c);
        y -= bh + 2;
        char u[48];
        if (isfinite(r->utilization))
            snprintf(u, sizeof u, "utilisation %.0f %%", r->utilization * 100);
        else
            snprintf(u, sizeof u, "utilisation —");
        pdf_text_color(P, FONT_SANS, 6.6, x, y - 6.5, u, GREY);
        y -= 9;
    }
    /* the references the row cites, by their numbers in the reference list */
    for (size_t i = 0; i < st->ncites; i++) {
        int si = st->cites[i].source;
        bool known = si >= 0 && (size_t)si < P->d->nsources;
        char *k = known ? arena_printf(&P->arena, "[%d]", P->source_ref[si])
                        : arena_printf(&P->arena, "[%s]", st->cites[i].key);
        double kw = pdf_width(P, FONT_MONO, 6.8, k);
        pdf_text_color(P, FONT_MONO, 6.8, x, y - 7, k, LINK);
        if (known)
            pdf_link(P, x, y - 9, kw, 9, P->source_ref[si]);
        y -= 9;
    }
    for (size_t m = 0; m < r->nmethods; m++) {
        for (size_t j = 0; j < P->ev->nmethods; j++)
            if (method_same(P->ev->methods[j], r->methods[m])) {
                char *k = arena_printf(&P->arena, "[%d]", P->method_ref[j]);
                pdf_text_color(P, FONT_MONO, 6.8, x, y - 7, k, LINK);
                pdf_link(P, x, y - 9, pdf_width(P, FONT_MONO, 6.8, k), 9, P->method_ref[j]);
                y -= 9;
            }
    }
    char line[32];
    snprintf(line, sizeof line, "line %d", st->pos.line);
    pdf_text_color(P, FONT_SANS, 6.6, x, y - 6.5, line, GREY);
    y -= 9;
    return top - y;
}

/* A published method under its row: name, number, formula. */
double pdf_method_line(Pdf *P, const Method *m, int ref, double x, double top, double width)
{
    char *head = arena_printf(&P->arena, "%s [%d]%s", m->title ? m->title : m->key, ref,
                              m->formula ? ":" : "");
    double size = 8.2;
    double hw = pdf_width(P, FONT_SERIF_ITALIC, size, head);
    MathBox *f = NULL;
    /* the formula as the report model parsed it, once */
    const ModelMethod *mm = m->formula ? report_model_method(P->model, m) : NULL;
    if (mm && mm->lhs) {
        MathBox *l = mbox_expr(&P->env, mm->lhs, size + 0.6, false);
        if (mm->rhs) {
            MathBox *k[3] = {l, mbox_text(&P->env, FONT_SERIF, size + 0.6, "  =  "),
                             mbox_expr(&P->env, mm->rhs, size + 0.6, false)};
            f = mbox_hlist(&P->env, k, 3);
        } else {
            f = l;
        }
    }
    double y = top;
    if (!f) {
        double h = pdf_wrap_color(P, FONT_SERIF_ITALIC, size, size * 1.25, x, top, width,
                                  m->formula ? arena_printf(&P->arena, "%s %s", head, m->formula)
                                             : head,
                                  GREY);
        return h + 1;
    }
    bool same_line = hw + 8 + f->w <= width;
    double asc = f->h > size * 0.8 ? f->h : size * 0.8;
    double base = y - asc - 1;
    if (same_line) {
        pdf_text_color(P, FONT_SERIF_ITALIC, size, x, base, head, GREY);
        mbox_draw(f, &P->painter, x + hw + 8, base);
        y = base - f->d - 2;
    } else {
        /* the name on its own lines (wrapped where it is wider than the
         * column), the formula under it */
        y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, size, size * 1.25, x, y, width, head, GREY);
        mbox_draw(f, &P->painter, x + 14, y - f->h);
        y -= f->h + f->d + 2;
    }
    return top - y;
}
