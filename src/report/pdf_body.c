/* pdf_body.c — the body of the report: prose and calc rows.
 *
 * Markdown blocks become items: a heading (kept with what follows), a
 * paragraph, one list item, a quote, a table, a code block, a rule. Prose is
 * set ragged-right from runs of words in the serif faces, with inline values
 * typeset as quantities. Each calc statement is one item, never split: its
 * description, then the row of math (symbol = formula = substituted =
 * result, broken before a relation when too wide and set smaller when a
 * single piece cannot fit), the published method it used, and in the right
 * margin its source keys (linked to the references), its source line and,
 * for a check, the verdict. Path and cases blocks hand over to pdf_flow.c,
 * figure statements to pdf_figure.c. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"

static double text_width_of(const Pdf *P)
{
    return P->sheet.body_r - P->sheet.body_l - P->sheet.margin_w;
}

/* ---- rich text ------------------------------------------------------------- */

typedef struct Atom {
    const char *text;        /* NULL for a box */
    MathBox *box;
    FontRole font;
    double size, w;
    const char *url;
    bool strike;
    Rgb color;
} Atom;

typedef struct Word {
    size_t first, n;
    double w;
    bool space_before;       /* separated from the previous word */
    bool break_before;       /* a hard line break */
} Word;

typedef struct Runs {
    Atom *a;
    size_t na, capa;
    Word *w;
    size_t nw, capw;
    bool pending_space, pending_break;
} Runs;

static FontRole face(bool bold, bool italic)
{
    return bold ? (italic ? FONT_SERIF_BOLD_ITALIC : FONT_SERIF_BOLD)
                : (italic ? FONT_SERIF_ITALIC : FONT_SERIF);
}

static void runs_atom(Pdf *P, Runs *r, Atom at)
{
    if (r->na == r->capa) {
        r->capa = r->capa ? r->capa * 2 : 32;
        r->a = xrealloc(r->a, r->capa * sizeof *r->a);
    }
    if (r->nw == 0 || r->pending_space || r->pending_break) {
        if (r->nw == r->capw) {
            r->capw = r->capw ? r->capw * 2 : 16;
            r->w = xrealloc(r->w, r->capw * sizeof *r->w);
        }
        r->w[r->nw] = (Word){r->na, 0, 0, r->nw > 0 && r->pending_space, r->pending_break};
        r->nw++;
        r->pending_space = r->pending_break = false;
    }
    at.w = at.box ? at.box->w : pdf_width(P, at.font, at.size, at.text);
    r->a[r->na++] = at;
    r->w[r->nw - 1].n++;
    r->w[r->nw - 1].w += at.w;
}

typedef struct Style {
    bool bold, italic, code, strike;
    const char *url;
} Style;

static void runs_text(Pdf *P, Runs *r, const char *s, Style st, double size)
{
    const char *p = s;
    while (*p) {
        if (*p == ' ' || *p == '\n' || *p == '\t') {
            r->pending_space = true;
            p++;
            continue;
        }
        const char *e = p;
        while (*e && *e != ' ' && *e != '\n' && *e != '\t')
            e++;
        Atom a = {0};
        a.text = arena_strndup(&P->arena, p, (size_t)(e - p));
        a.font = st.code ? FONT_MONO : face(st.bold, st.italic);
        a.size = st.code ? size * 0.88 : size;
        a.url = st.url;
        a.strike = st.strike;
        a.color = st.url ? LINK : INK;
        runs_atom(P, r, a);
        p = e;
    }
}

static void runs_inlines(Pdf *P, Runs *r, const Inline *in, Style st, double size)
{
    for (; in; in = in->next) {
        Style s2 = st;
        switch (in->kind) {
        case INL_TEXT:
            runs_text(P, r, in->text ? in->text : "", st, size);
            break;
        case INL_CODE:
            s2.code = true;
            runs_text(P, r, in->text ? in->text : "", s2, size);
            break;
        case INL_EMPH:
            s2.italic = !st.italic;
            runs_inlines(P, r, in->children, s2, size);
            break;
        case INL_STRONG:
            s2.bold = true;
            runs_inlines(P, r, in->children, s2, size);
            break;
        case INL_STRIKE:
            s2.strike = true;
            runs_inlines(P, r, in->children, s2, size);
            break;
        case INL_LINK:
            s2.url = in->url;
            runs_inlines(P, r, in->children, s2, size);
            break;
        case INL_SOFTBREAK:
            r->pending_space = true;
            break;
        case INL_LINEBREAK:
            r->pending_break = true;
            break;
        case INL_VALUE: {
            const Evaluated *ev = P->ev;
            const Value *v = NULL;
            Unit u = {0};
            if (in->slot >= 0 && (size_t)in->slot < ev->doc->nstmts &&
                ev->results[in->slot].state == RES_OK) {
                const StmtResult *res = &ev->results[in->slot];
                v = &res->value;
                if (in->field && v->kind == VAL_RECORD && v->rec)
                    v = record_get(v->rec, in->field);
                if (v)
                    u = in->has_as ? in->as_unit
                        : in->field ? eval_display_unit(ev, v, NULL)
                                    : *res->shown;
            }
            Atom a = {0};
            a.box = v ? mbox_quantity(&P->env, v, &u, size, st.bold)
                      : mbox_text(&P->env, FONT_SERIF, size, "—");
            a.size = size;
            a.color = INK;
            runs_atom(P, r, a);
            break;
        }
        }
    }
}

static void runs_free(Runs *r)
{
    free(r->a);
    free(r->w);
}

/* Set words on lines of `width` from `x`; returns the height. */
static double runs_set(Pdf *P, Runs *r, double size, double lead, double x, double top,
                       double width, double *natural)
{
    double space = pdf_width(P, FONT_SERIF, size, " ");
    double y = top, nat = 0;
    size_t i = 0;
    if (r->nw == 0) {
        if (natural)
            *natural = 0;
        return 0;
    }
    while (i < r->nw) {
        /* take words while they fit */
        size_t j = i;
        double w = 0, asc = size * 0.78, desc = size * 0.24;
        while (j < r->nw) {
            double add = (j > i && r->w[j].space_before ? space : 0) + r->w[j].w;
            if (j > i && (r->w[j].break_before || w + add > width))
                break;
            w += add;
            for (size_t k = 0; k < r->w[j].n; k++) {
                const Atom *a = &r->a[r->w[j].first + k];
                if (a->box) {
                    if (a->box->h > asc)
                        asc = a->box->h;
                    if (a->box->d > desc)
                        desc = a->box->d;
                }
            }
            j++;
        }
        if (w > nat)
            nat = w;
        double line = lead > asc + desc + 1.5 ? lead : asc + desc + 1.5;
        double base = y - (line - size * 1.02 - (asc - size * 0.78)) / 2 - asc;
        if (P->page) {
            double cx = x;
            for (size_t k = i; k < j; k++) {
                if (k > i && r->w[k].space_before)
                    cx += space;
                for (size_t m = 0; m < r->w[k].n; m++) {
                    const Atom *a = &r->a[r->w[k].first + m];
                    if (a->box)
                        mbox_draw(a->box, &P->painter, cx, base);
                    else
                        pdf_text_color(P, a->font, a->size, cx, base, a->text, a->color);
                    if (a->url) {
                        pdf_uri(P, cx, base - 2, a->w, a->size, a->url);
                        pdf_line(P, cx, base - 1.3, cx + a->w, base - 1.3, 0.35);
                    }
                    if (a->strike)
                        pdf_line(P, cx, base + a->size * 0.3, cx + a->w, base + a->size * 0.3,
                                 0.5);
                    cx += a->w;
                }
            }
        }
        y -= line;
        i = j;
    }
    if (natural)
        *natural = nat;
    return top - y;
}

static double inlines_ex(Pdf *P, const Inline *in, FontRole base, double size, double lead,
                         double x, double top, double width, double *natural)
{
    Runs r = {0};
    Style st = {base == FONT_SERIF_BOLD || base == FONT_SERIF_BOLD_ITALIC,
                base == FONT_SERIF_ITALIC || base == FONT_SERIF_BOLD_ITALIC, false, false, NULL};
    runs_inlines(P, &r, in, st, size);
    double h = runs_set(P, &r, size, lead, x, top, width, natural);
    runs_free(&r);
    return h;
}

double pdf_inlines(Pdf *P, const Inline *in, FontRole base, double size, double lead, double x,
                   double top, double width)
{
    return inlines_ex(P, in, base, size, lead, x, top, width, NULL);
}

static void plain_text(const Inline *in, StrBuf *sb)
{
    for (; in; in = in->next) {
        if (in->kind == INL_TEXT || in->kind == INL_CODE)
            sb_puts(sb, in->text ? in->text : "");
        else if (in->kind == INL_SOFTBREAK || in->kind == INL_LINEBREAK)
            sb_putc(sb, ' ');
        else if (in->kind == INL_VALUE)
            sb_puts(sb, in->text ? in->text : "");
        else
            plain_text(in->children, sb);
    }
}

/* ---- blocks ------------------------------------------------------------------ */

enum { BODY_SIZE = 10 };
#define BODY_LEAD 13.4

static double render_block(Pdf *P, const Block *b, double x, double top, double width);

static double measure_block(Pdf *P, const Block *b, double width)
{
    DrawPage *keep = P->page;
    P->page = NULL;
    double h = render_block(P, b, 0, 0, width);
    P->page = keep;
    return h;
}

static double render_children(Pdf *P, const Block *b, double x, double top, double width)
{
    double y = top;
    for (const Block *c = b; c; c = c->next) {
        if (c != b)
            y -= 5;
        y -= render_block(P, c, x, y, width);
    }
    return top - y;
}

static double render_item(Pdf *P, const Block *item, bool ordered, int number, double x,
                          double top, double width)
{
    char mark[16];
    if (ordered)
        snprintf(mark, sizeof mark, "%d.", number);
    else
        snprintf(mark, sizeof mark, "•");
    double ind = ordered ? 20 : 14;
    double mw = pdf_width(P, FONT_SERIF, BODY_SIZE, mark);
    pdf_text(P, FONT_SERIF, BODY_SIZE, x + ind - 5 - mw, top - BODY_SIZE * 1.0, mark);
    return render_children(P, item->children, x + ind, top, width - ind);
}

static double render_table(Pdf *P, const Block *t, double x, double top, double width)
{
    int nc = t->ncols > 0 ? t->ncols : 1;
    double size = 8.8, lead = 11, pad = 4;
    double *nat = xcalloc((size_t)nc, sizeof *nat);
    double *cw = xcalloc((size_t)nc, sizeof *cw);
    DrawPage *keep = P->page;
    P->page = NULL;
    for (const Block *row = t->children; row; row = row->next) {
        int c = 0;
        for (const Block *cell = row->children; cell && c < nc; cell = cell->next, c++) {
            double n;
            inlines_ex(P, cell->inlines, row->header_row ? FONT_SERIF_BOLD : FONT_SERIF, size, lead,
                       0, 0, 1e6, &n);
            if (n + 2 * pad > nat[c])
                nat[c] = n + 2 * pad;
        }
    }
    P->page = keep;
    double sum = 0;
    for (int c = 0; c < nc; c++)
        sum += nat[c] < 24 ? (nat[c] = 24) : nat[c];
    for (int c = 0; c < nc; c++)
        cw[c] = sum > width ? nat[c] * width / sum : nat[c];
    double tw = 0;
    for (int c = 0; c < nc; c++)
        tw += cw[c];
    double y = top;
    for (const Block *row = t->children; row; row = row->next) {
        FontRole f = row->header_row ? FONT_SERIF_BOLD : FONT_SERIF;
        double rh = 0;
        int c = 0;
        P->page = NULL;
        for (const Block *cell = row->children; cell && c < nc; cell = cell->next, c++) {
            double h = inlines_ex(P, cell->inlines, f, size, lead, 0, 0, cw[c] - 2 * pad, NULL);
            if (h > rh)
                rh = h;
        }
        P->page = keep;
        rh += 2 * 3.2;
        if (P->page) {
            if (row->header_row)
                pdf_fill(P, x, y - rh, tw, rh, SHADE);
            double cx = x;
            c = 0;
            for (const Block *cell = row->children; cell && c < nc; cell = cell->next, c++) {
                double n = 0, off = pad;
                P->page = NULL;
                inlines_ex(P, cell->inlines, f, size, lead, 0, 0, cw[c] - 2 * pad, &n);
                P->page = keep;
                Align al = t->align ? t->align[c] : ALIGN_NONE;
                if (al == ALIGN_RIGHT)
                    off = cw[c] - pad - n;
                else if (al == ALIGN_CENTER)
                    off = (cw[c] - n) / 2;
                if (off < pad)
                    off = pad;
                inlines_ex(P, cell->inlines, f, size, lead, cx + off, y - 3.2, cw[c] - 2 * pad,
                           NULL);
                if (c > 0)
                    pdf_line(P, cx, y, cx, y - rh, 0.3);
                cx += cw[c];
            }
            pdf_line(P, x, y, x + tw, y, row == t->children ? 0.8 : 0.3);
        }
        y -= rh;
    }
    pdf_line(P, x, y, x + tw, y, 0.8);
    free(nat);
    free(cw);
    return top - y;
}

static double render_code(Pdf *P, const Block *b, double x, double top, double width)
{
    double size = 8, lead = 9.8;
    const char *t = b->text ? b->text : "";
    int lines = 0;
    for (const char *p = t; *p;) {
        const char *e = strchr(p, '\n');
        lines++;
        p = e ? e + 1 : p + strlen(p);
    }
    double h = lines * lead + 8;
    if (P->page) {
        pdf_fill(P, x, top - h, width, h, (Rgb){0.955, 0.955, 0.945});
        double y = top - 4 - size * 0.85;
        for (const char *p = t; *p;) {
            const char *e = strchr(p, '\n');
            size_t n = e ? (size_t)(e - p) : strlen(p);
            pdf_text(P, FONT_MONO, size, x + 5, y, arena_strndup(&P->arena, p, n));
            y -= lead;
            p += n + (e ? 1 : 0);
        }
    }
    return h;
}

static double render_block(Pdf *P, const Block *b, double x, double top, double width)
{
    switch (b->kind) {
    case BLK_PARAGRAPH:
        return pdf_inlines(P, b->inlines, FONT_SERIF, BODY_SIZE, BODY_LEAD, x, top, width);
    case BLK_HEADING:
        return pdf_inlines(P, b->inlines, FONT_SERIF_BOLD, BODY_SIZE, BODY_LEAD, x, top, width);
    case BLK_LIST: {
        double y = top;
        int n = b->start;
        for (const Block *it = b->children; it; it = it->next, n++) {
            if (it != b->children)
                y -= 3;
            y -= render_item(P, it, b->ordered, n, x, y, width);
        }
        return top - y;
    }
    case BLK_ITEM:
        return render_item(P, b, false, 0, x, top, width);
    case BLK_QUOTE: {
        double h = render_children(P, b->children, x + 12, top - 2, width - 12) + 4;
        if (P->page) {
            pdf_fill(P, x + 2, top - h, 2.2, h, (Rgb){0.70, 0.70, 0.72});
        }
        return h;
    }
    case BLK_CODE:
        return render_code(P, b, x, top, width);
    case BLK_TABLE:
        return render_table(P, b, x, top, width);
    case BLK_RULE:
        pdf_line(P, x + width * 0.3, top - 6, x + width * 0.7, top - 6, 0.6);
        return 12;
    case BLK_HTML:
    case BLK_TABLE_ROW:
    case BLK_TABLE_CELL:
    case BLK_CALC:
    case BLK_SOURCES:
    case BLK_PATH:
    case BLK_NETWORK:
    case BLK_CURVE:
    case BLK_CASES:
        return 0;
    }
    return 0;
}

/* ---- body items ------------------------------------------------------------------ */

static double fn_block(Pdf *P, const Item *it, double top)
{
    const Block *b = it->p;
    double w = text_width_of(P);
    if (b->kind == BLK_ITEM)
        return render_item(P, b, it->depth != 0, it->aux, P->sheet.body_l, top, w);
    return render_block(P, b, P->sheet.body_l, top, w);
}

static double fn_heading(Pdf *P, const Item *it, double top)
{
    const Block *b = it->p;
    const Sheet *s = &P->sheet;
    int lv = b->level;
    double size = lv <= 1 ? 13 : lv == 2 ? 11.2 : 10.2;
    FontRole f = lv <= 2 ? FONT_SERIF_BOLD : FONT_SERIF_BOLD_ITALIC;
    double nw = b->number[0] ? pdf_width(P, f, size, b->number) + size * 0.9 : 0;
    if (nw > 0 && nw < 28)
        nw = 28;
    double x = s->body_l;
    pdf_text(P, f, size, x, top - size * 0.95, b->number);
    double h = inlines_ex(P, b->inlines, f, size, size * 1.3, x + nw, top, text_width_of(P) - nw,
                          NULL);
    if (lv <= 1) {
        pdf_line(P, s->body_l, top - h - 2, s->body_r, top - h - 2, 0.5);
        h += 4;
    }
    return h + 2;
}

static double fn_note(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    double x = P->sheet.body_l + 14;
    double h = pdf_wrap(P, FONT_SERIF_ITALIC, 8.4, 10.4, x, top, text_width_of(P) - 14,
                        st->description ? st->description : "");
    if (P->page)
        pdf_fill(P, P->sheet.body_l + 6, top - h + 1, 1.2, h - 1, (Rgb){0.75, 0.75, 0.75});
    return h;
}

/* How a row's calls applied their methods (the report model's uses): the
 * variant taken in words, then "lhs = formula = the formula with the call's
 * values = result", broken before a relation where a line is full. */
static double pdf_method_uses(Pdf *P, const ModelRow *mr, double x, double top, double width)
{
    double y = top;
    double size = 9.4;
    for (size_t k = 0; k < mr->nuses; k++) {
        const ModelUse *u = &mr->uses[k];
        const ModelMethod *mm = &P->model->methods[u->method];
        if (u->branch)
            y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, 8.2, 10.2, x, y, width, u->branch, GREY) + 1;
        if (!u->substituted)
            continue;
        MathEnv env = P->env;
        env.use = u->use;
        MathBox *piece[3];
        size_t n = 0;
        MathBox *head[3] = {mbox_expr(&env, mm->lhs, size, false),
                            mbox_text(&env, FONT_SERIF, size, "  =  "),
                            mbox_expr(&env, mm->rhs, size, false)};
        piece[n++] = mbox_hlist(&env, head, 3);
        MathBox *subst[2] = {mbox_text(&env, FONT_SERIF, size, "  =  "), mbox_expr(&env, mm->rhs, size, true)};
        piece[n++] = mbox_hlist(&env, subst, 2);
        if (u->result.number) {
            MathBox *res[2] = {mbox_text(&env, FONT_SERIF, size, "  =  "),
                               mbox_quantity(&env, &u->use->result, &u->result.unit, size, true)};
            piece[n++] = mbox_hlist(&env, res, 2);
        }
        /* pieces on lines: a piece that does not fit starts a new line, indented */
        double indent = 14, cx = 0, asc = 0, desc = 0;
        size_t first = 0;
        for (size_t i = 0; i <= n; i++) {
            bool flush = i == n || (i > first && cx + piece[i]->w > width);
            if (flush) {
                double base = y - asc - 1;
                double px = x + (first ? indent : 0);
                for (size_t j = first; j < i; j++) {
                    if (P->page)
                        mbox_draw(piece[j], &P->painter, px, base);
                    px += piece[j]->w;
                }
                y = base - desc - 2;
                if (i == n)
                    break;
                first = i;
                cx = indent;
                asc = desc = 0;
            }
            cx += piece[i]->w;
            if (piece[i]->h > asc)
                asc = piece[i]->h;
            if (piece[i]->d > desc)
                desc = piece[i]->d;
        }
    }
    return top - y;
}

static double fn_stmt(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const Sheet *s = &P->sheet;
    double x = s->body_l, w = text_width_of(P) - 6;
    double y = top - 1;

    /* the heading of the row: a check's label, then the description */
    if (st->kind == STMT_CHECK) {
        char *t = arena_printf(&P->arena, "%s: %s", st->finding ? "Finding" : "Check", st->label ? st->label : "");
        y -= pdf_wrap(P, FONT_SERIF_BOLD, 9.6, 12, x, y, w, t);
    }
    if (st->description && *st->description)
        y -= pdf_wrap(P, FONT_SERIF, 9.6, 12, x, y, w, st->description);
    y -= 2;

    /* the math, smaller when a single piece does not fit */
    double indent0 = 12, indent = 36, avail = w - indent0;
    MathRow row;
    double size = 10.5;
    for (int attempt = 0; attempt < 4; attempt++) {
        mbox_stmt_row(&P->env, st, &P->model->rows[st->index], size, &row);
        bool fits = true;
        for (size_t i = 0; i < row.n; i++)
            if (row.piece[i]->w > avail - (row.chain_start[i] ? 0 : indent))
                fits = false;
        if (fits)
            break;
        size *= 0.86;
    }
    double wid[MATHROW_MAX];
    size_t line_of[MATHROW_MAX];
    for (size_t i = 0; i < row.n; i++)
        wid[i] = row.piece[i]->w;
    size_t nl = mbox_break(wid, row.chain_start, row.n, avail, indent, line_of);
    for (size_t l = 0; l < nl; l++) {
        double h = size * 0.75, d = size * 0.25, cx = 0;
        bool first = true;
        for (size_t i = 0; i < row.n; i++) {
            if (line_of[i] != l)
                continue;
            if (row.piece[i]->h > h)
                h = row.piece[i]->h;
            if (row.piece[i]->d > d)
                d = row.piece[i]->d;
            if (first)
                cx = row.chain_start[i] ? 0 : indent;
            first = false;
        }
        double base = y - h - 2;
        for (size_t i = 0; i < row.n; i++) {
            if (line_of[i] != l)
                continue;
            if (P->page)
                mbox_draw(row.piece[i], &P->painter, x + indent0 + cx, base);
            cx += row.piece[i]->w;
        }
        y = base - d - 2;
    }

    /* how a solve converged */
    if (st->kind == STMT_SOLVE && r->state == RES_OK) {
        const SolveReport *sr = &r->sides->solve;
        char res[48], lo[48], hi[48];
        Unit vu = *r->shown;
        num_typeset(unit_from_si(sr->residual, &r->sides->lhs_shown, true), 3, res, sizeof res);
        num_typeset(unit_from_si(sr->start_lo, &vu, false), 4, lo, sizeof lo);
        num_typeset(unit_from_si(sr->start_hi, &vu, false), 4, hi, sizeof hi);
        char ut[64];
        mbox_unit_text(r->sides->lhs_shown.text, ut, sizeof ut);
        char vt[64];
        mbox_unit_text(vu.text, vt, sizeof vt);
        char *t = arena_printf(&P->arena,
                               "Root found by Brent's method in %d iterations within the bracket "
                               "%s to %s %s; residual of the equation %s %s.",
                               sr->iterations, lo, hi, vt, res, ut);
        y -= pdf_wrap(P, FONT_SERIF_ITALIC, 8, 10, x + indent0, y, w - indent0, t) + 1;
    }
    y -= pdf_warnings(P, r, x + indent0, y, w - indent0);
    /* the published methods the line used: the formula at first use, the
     * reference number in the margin every time */
    for (size_t m = 0; m < r->nmethods; m++)
        for (size_t j = 0; j < P->ev->nmethods; j++)
            if (method_same(P->ev->methods[j], r->methods[m]) && P->method_first[j] == st->index)
                y -= pdf_method_line(P, r->methods[m], P->method_ref[j], x + indent0, y,
                                 w - indent0);
    y -= pdf_method_uses(P, &P->model->rows[st->index], x + indent0, y, w - indent0);

    double mh = pdf_row_margin(P, st, top - 1);
    double h = top - y;
    if (mh + 1 > h)
        h = mh + 1;
    h += 3;
    if (P->page) {
        draw_stroke_rgb(P->page, (Rgb){0.80, 0.80, 0.80});
        pdf_line(P, s->body_l, top - h + 1.5, s->body_r, top - h + 1.5, 0.25);
        draw_stroke_rgb(P->page, INK);
    }
    return h;
}

void pdf_body_items(Pdf *P, Vec *items)
{
    const Document *d = P->d;
    bool first = true;
    for (const Block *b = d->blocks; b; b = b->next) {
        size_t before = items->len;
        switch (b->kind) {
        case BLK_HEADING: {
            item_add(items, P, fn_heading, b, 0, b->level <= 1 ? 14 : 10);
            Item *it = items->items[items->len - 1];
            it->layout.keep_with_next = true;
            StrBuf sb = {0};
            if (b->number[0])
                sb_printf(&sb, "%s  ", b->number);
            plain_text(b->inlines, &sb);
            it->outline = arena_strdup(&P->arena, sb_str(&sb));
            it->outline_level = b->level;
            sb_free(&sb);
            break;
        }
        case BLK_LIST: {
            int n = b->start;
            for (const Block *c = b->children; c; c = c->next, n++) {
                item_add(items, P, fn_block, c, n, c == b->children ? 6 : 3);
                ((Item *)items->items[items->len - 1])->depth = b->ordered;
            }
            break;
        }
        case BLK_CALC:
            for (size_t i = 0; i < b->nstmts; i++) {
                const Stmt *st = d->stmts[b->first_stmt + i];
                if (st->kind == STMT_NOTE)
                    item_add(items, P, fn_note, st, 0, 4);
                else if (st->kind == STMT_FIGURE && !st->parse_failed)
                    item_add(items, P, pdf_fn_figure, st, P->figure_no[st->index], 10);
                else if (!st->parse_failed) {
                    item_add(items, P, fn_stmt, st, 0, i == 0 ? 8 : 2);
                    ((Item *)items->items[items->len - 1])->warnings =
                        (int)P->ev->results[st->index].nwarnings;
                    if (P->ev->results[st->index].made->table)
                        pdf_table_items(P, items, st);
                }
            }
            break;
        case BLK_PATH:
            if (b->first_stmt < d->nstmts && !d->stmts[b->first_stmt]->parse_failed)
                pdf_path_items(P, items, d->stmts[b->first_stmt]);
            break;
        case BLK_NETWORK:
            if (b->first_stmt < d->nstmts && !d->stmts[b->first_stmt]->parse_failed)
                pdf_network_items(P, items, d->stmts[b->first_stmt]);
            break;
        case BLK_CURVE:
            if (b->first_stmt < d->nstmts && !d->stmts[b->first_stmt]->parse_failed)
                pdf_curve_items(P, items, d->stmts[b->first_stmt]);
            break;
        case BLK_CASES:
            if (b->first_stmt < d->ncases)
                pdf_cases_items(P, items, b->first_stmt);
            break;
        case BLK_SOURCES:
        case BLK_HTML:
            break;
        default:
            item_add(items, P, fn_block, b, 0, 7);
            break;
        }
        pdf_revision_tag(P, items, before, b);
        if (first && items->len > before) {
            ((Item *)items->items[before])->layout.break_before = true;
            first = false;
        }
    }
    (void)measure_block;
}
