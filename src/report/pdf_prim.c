/* pdf_prim.c — the report's primitives over the drawing layer (draw.h):
 * text runs and wrapped text in the report's fonts and colours, rules,
 * boxes, links to references, the math painter, warnings under a row,
 * items, and the calc sources as attachments. Every drawing call is a
 * no-op while measuring (P->page NULL). */
#include "report/pdf_internal.h"

#include <stdio.h>
#include <string.h>

const Rgb INK = {0.08, 0.08, 0.10};
const Rgb GREY = {0.40, 0.40, 0.43};
const Rgb RULE = {0.55, 0.55, 0.58};
const Rgb FAIL = {0.70, 0.05, 0.05};
const Rgb PASS = {0.05, 0.38, 0.15};
const Rgb SHADE = {0.93, 0.93, 0.90};
const Rgb LINK = {0.05, 0.20, 0.50};
const Rgb WARN = {0.62, 0.32, 0.00};

/* ---- drawing ---------------------------------------------------------- */

double pdf_width(Pdf *P, FontRole f, double size, const char *s)
{
    return draw_width(P->draw, (int)f, size, s);
}

static double metric_width(void *ctx, FontRole f, double size, const char *s)
{
    return pdf_width(ctx, f, size, s);
}

void pdf_text_color(Pdf *P, FontRole f, double size, double x, double y, const char *s, Rgb c)
{
    draw_text(P->page, (int)f, size, x, y, s, c);
}

void pdf_text(Pdf *P, FontRole f, double size, double x, double y, const char *s)
{
    pdf_text_color(P, f, size, x, y, s, INK);
}

void pdf_line(Pdf *P, double x0, double y0, double x1, double y1, double w)
{
    DrawPage *pg = P->page;
    if (!pg)
        return;
    draw_line_width(pg, w);
    draw_move_to(pg, x0, y0);
    draw_line_to(pg, x1, y1);
    draw_stroke(pg);
}

void pdf_rect(Pdf *P, double x, double y, double w, double h, double lw)
{
    DrawPage *pg = P->page;
    if (!pg)
        return;
    draw_line_width(pg, lw);
    draw_rect_path(pg, x, y, w, h);
    draw_stroke(pg);
}

void pdf_fill(Pdf *P, double x, double y, double w, double h, Rgb c)
{
    DrawPage *pg = P->page;
    if (!pg)
        return;
    draw_fill_rgb(pg, c);
    draw_rect_path(pg, x, y, w, h);
    draw_fill(pg);
    draw_fill_rgb(pg, INK);
}

/* A link to reference number `ref`, whose sheet and height are known from
 * the layout. */
void pdf_link(Pdf *P, double x, double y, double w, double h, int ref)
{
    if (!P->page || ref < 1 || ref > P->nrefs || P->ref_page[ref] < 0)
        return;
    draw_link(P->page, x, y, x + w, y + h, P->pages[P->ref_page[ref]], P->ref_y[ref], DRAW_LINK_PRINTED);
}

void pdf_uri(Pdf *P, double x, double y, double w, double h, const char *url)
{
    draw_uri(P->page, x, y, x + w, y + h, url);
}

double pdf_warnings(Pdf *P, const StmtResult *r, double x, double top, double width)
{
    double y = top;
    for (size_t i = 0; i < r->nwarnings; i++) {
        char *t = arena_printf(&P->arena, "Warning: %s", r->warnings[i]);
        y -= pdf_wrap_color(P, FONT_SANS, 8, 10, x, y, width, t, WARN) + 1;
    }
    return top - y;
}

/* Plain text wrapped at spaces (a word longer than the line is cut); a
 * blank line in the text adds half a line. Returns the height used. */
double pdf_wrap(Pdf *P, FontRole f, double size, double lead, double x, double top, double width,
                const char *s)
{
    return pdf_wrap_color(P, f, size, lead, x, top, width, s, INK);
}

double pdf_wrap_color(Pdf *P, FontRole f, double size, double lead, double x, double top,
                      double width, const char *s, Rgb color)
{
    double y = top - size * 0.85, used = 0;
    const char *p = s ? s : "";
    char buf[1024];
    while (*p) {
        size_t best = 0, i = 0, len = strlen(p);
        while (i < len) {
            size_t j = i;
            while (j < len && p[j] != ' ' && p[j] != '\n')
                j++;
            if (j >= sizeof buf)
                j = sizeof buf - 1;
            memcpy(buf, p, j);
            buf[j] = '\0';
            if (best > 0 && pdf_width(P, f, size, buf) > width)
                break;
            best = j;
            if (j >= len || p[j] == '\n')
                break;
            i = j + 1;
        }
        if (best == 0)
            best = len < 60 ? len : 60;
        while (best < len && ((unsigned char)p[best] & 0xC0) == 0x80)
            best++;
        memcpy(buf, p, best);
        buf[best] = '\0';
        pdf_text_color(P, f, size, x, y, buf, color);
        p += best;
        y -= lead;
        used += lead;
        if (*p == '\n' && p[1] == '\n')
            used += lead * 0.5, y -= lead * 0.5;
        while (*p == ' ' || *p == '\n')
            p++;
    }
    return used;
}

static void paint_text(void *ctx, FontRole f, double size, double x, double y, const char *s)
{
    pdf_text(ctx, f, size, x, y, s);
}

static void paint_line(void *ctx, double x0, double y0, double x1, double y1, double w)
{
    Pdf *P = ctx;
    if (!P->page)
        return;
    draw_line_cap(P->page, DRAW_CAP_ROUND);
    pdf_line(P, x0, y0, x1, y1, w);
    draw_line_cap(P->page, DRAW_CAP_BUTT);
}

static void paint_curve(void *ctx, double x0, double y0, double x1, double y1, double x2, double y2,
                        double x3, double y3, double w)
{
    DrawPage *pg = ((Pdf *)ctx)->page;
    if (!pg)
        return;
    draw_line_width(pg, w);
    draw_move_to(pg, x0, y0);
    draw_curve_to(pg, x1, y1, x2, y2, x3, y3);
    draw_stroke(pg);
}

void item_add(Vec *items, Pdf *P, ItemFn fn, const void *p, int aux, double space_before)
{
    Item *it = arena_alloc(&P->arena, sizeof *it);
    it->fn = fn;
    it->p = p;
    it->aux = aux;
    it->layout.space_before = space_before;
    it->scope = P->scope;
    vec_push(items, it);
}

/* The math layout's metrics and painter draw through the primitives. */
void pdf_math_setup(Pdf *P)
{
    P->metrics = (MathMetrics){metric_width, P, 0.72, 0.22, 0.26};
    P->env = (MathEnv){&P->scratch, &P->metrics, P->ev, P->ev->digits > 0 ? P->ev->digits : 4, NULL, NULL};
    P->painter = (MathPainter){paint_text, paint_line, paint_curve, P};
}

/* ---- shared items ---------------------------------------------------------- */

/* A section title in the end matter and on the cover: small caps-like sans
 * with a rule below. */
static double fn_section(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    const char *t = it->p;
    pdf_text(P, FONT_SANS_BOLD, 11, s->body_l, top - 11, t);
    pdf_line(P, s->body_l, top - 15, s->body_r, top - 15, 0.6);
    return 22;
}

Item *pdf_section(Pdf *P, Vec *items, const char *title, bool new_sheet, bool outline)
{
    item_add(items, P, fn_section, title, 0, 16);
    Item *it = items->items[items->len - 1];
    it->layout.keep_with_next = true;
    it->layout.break_before = new_sheet;
    if (outline) {
        it->outline = title;
        it->outline_level = 1;
    }
    return it;
}

/* ---- attachments ----------------------------------------------------------- */

static const char *base_name(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

/* The source file as an attachment, under its own name. */
DrawFile *pdf_attach_source(Pdf *P)
{
    const char *base = strcmp(P->d->file, "-") == 0 ? "stdin.calc.md" : base_name(P->d->file);
    return pdf_attach_named(P, P->d, base);
}

/* `name` is the attachment's file name; a package attaches its files in
 * the name tree's sorted order, each under a distinct name. Returns the
 * file specification (NULL on failure). */
DrawFile *pdf_attach_named(Pdf *P, const Document *d, const char *base)
{
    char desc[160];
    snprintf(desc, sizeof desc, "calc source, SHA-256 %s", d->digest);
    return draw_attach(P->draw, base, desc, d->text, d->len, P->pkg != NULL);
}

double pdf_column_header(Pdf *P, int n, const double *x, const char *const *word, const char *const *symbol,
                         const char *const *unit, double word_pt, double top)
{
    double h_word = 15, h_sym = 13, h_unit = 10, h = h_word + h_sym + h_unit;
    double x0 = x[0], x1 = x[n];
    if (P->page)
        pdf_fill(P, x0, top - h, x1 - x0, h, SHADE);
    for (int i = 0; i < n; i++) {
        double a = x[i], w = x[i + 1] - a;
        /* the word, one or two centred lines */
        const char *sp = strchr(word[i], ' ');
        char l1[40], l2[40] = "";
        if (sp && pdf_width(P, FONT_SANS, word_pt, word[i]) > w - 3) {
            snprintf(l1, sizeof l1, "%.*s", (int)(sp - word[i]), word[i]);
            snprintf(l2, sizeof l2, "%s", sp + 1);
        } else {
            snprintf(l1, sizeof l1, "%s", word[i]);
        }
        double w1 = pdf_width(P, FONT_SANS, word_pt, l1), w2 = pdf_width(P, FONT_SANS, word_pt, l2);
        pdf_text_color(P, FONT_SANS, word_pt, a + (w - w1) / 2, top - (l2[0] ? 6.2 : 9.5), l1, GREY);
        if (l2[0])
            pdf_text_color(P, FONT_SANS, word_pt, a + (w - w2) / 2, top - 12.6, l2, GREY);
        if (symbol[i][0]) {
            MathBox *b = mbox_symbol(&P->env, symbol[i], 8.6);
            if (P->page)
                mbox_draw(b, &P->painter, a + (w - b->w) / 2, top - h_word - 9.2);
        }
        if (unit[i]) {
            double uw = pdf_width(P, FONT_SANS, 6.4, unit[i]);
            pdf_text_color(P, FONT_SANS, 6.4, a + (w - uw) / 2, top - h + 3, unit[i], GREY);
        }
        if (i > 0)
            pdf_line(P, a, top, a, top - h, 0.3);
    }
    pdf_line(P, x0, top, x1, top, 0.9);
    pdf_line(P, x0, top - h, x1, top - h, 0.5);
    return h;
}

double pdf_columns_spread(const double *nat, int n, double left, double width, double pt, double *x)
{
    double sum = 0;
    for (int i = 0; i < n; i++)
        sum += nat[i];
    /* spread the spare width evenly, or shrink everything to fit */
    double extra = (width - sum) / n;
    x[0] = left;
    for (int i = 0; i < n; i++)
        x[i + 1] = x[i] + (sum > width ? nat[i] * width / sum : nat[i] + extra);
    return sum > width ? pt * width / sum : pt;
}
