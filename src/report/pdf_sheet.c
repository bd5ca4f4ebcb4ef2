/* pdf_sheet.c — what every sheet carries, the cover and the end matter.
 *
 * Every sheet is framed, with a title block across the top (project, calc
 * number, revision, subject, prepared and checked with dates, "Sheet N of
 * M") and a trace line across the bottom (source file, digest prefix, tool
 * version). The cover states what the package is and whether it may be
 * relied on (a banner when it is preliminary or a check fails), keeps a
 * framed blank area for the seal, and summarises every check with the
 * governing one shaded. The end matter lists references, the design
 * criteria behind each check, the cautions and the numbered source. The
 * fixed wording lives in templates/ (compiled in as pdf_texts.inc). */
#include "report/pdf_internal.h"
#include "frontmatter.h"

#include "uses.h"

#include <math.h>
#include <stdio.h>
#include <string.h>


#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

/* The file's own name: the sheets must not depend on where it was built. */
static const char *base_of(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

static const char *or_blank(const char *s)
{
    return s && *s ? s : "";
}

/* ---- geometry and the frame ---------------------------------------------- */

enum { TB_H = 50, FOOT_H = 15 };

void pdf_sheet_geometry(Pdf *P)
{
    Sheet *s = &P->sheet;
    if (P->d->meta.paper == PAPER_A4) {
        s->w = 595.276;
        s->h = 841.89;
    } else {
        s->w = 612;
        s->h = 792;
    }
    s->frame_l = 50;
    s->frame_r = s->w - 32;
    s->frame_b = 30;
    s->frame_t = s->h - 30;
    s->body_l = s->frame_l + 16;
    s->body_r = s->frame_r - 12;
    s->body_top = s->frame_t - TB_H - 18;
    s->body_bottom = s->frame_b + FOOT_H + 12;
    s->margin_w = 74;
}

/* A title-block cell: a small label over a value. */
static void cell(Pdf *P, double x, double y, double w, double h, const char *label,
                 const char *value, FontRole vf, double vsize)
{
    pdf_rect(P, x, y, w, h, 0.5);
    if (label && *label)
        pdf_text_color(P, FONT_SANS, 5.6, x + 3, y + h - 7, label, GREY);
    /* shrink a long value to fit its cell; below 6.5 pt, set it on two
     * lines instead, broken at the space nearest the middle */
    double size = vsize, room = w - 6;
    while (size > 6.5 && pdf_width(P, vf, size, value) > room)
        size -= 0.25;
    if (pdf_width(P, vf, size, value) <= room) {
        pdf_text(P, vf, size, x + 3, y + 4.5, value);
        return;
    }
    size_t n = strlen(value), best = 0;
    for (size_t i = 1; i < n; i++)
        if (value[i] == ' ' && (best == 0 || (i > n / 2 ? i - n / 2 : n / 2 - i) < (best > n / 2 ? best - n / 2 : n / 2 - best)))
            best = i;
    if (best == 0) { /* one long word: smallest size, clipped by the cell */
        pdf_text(P, vf, 5, x + 3, y + 4.5, value);
        return;
    }
    char first[256];
    snprintf(first, sizeof first, "%.*s", (int)(best < sizeof first ? best : sizeof first - 1), value);
    const char *second = value + best + 1;
    size = 6.5;
    while (size > 4.5 && (pdf_width(P, vf, size, first) > room || pdf_width(P, vf, size, second) > room))
        size -= 0.25;
    pdf_text(P, vf, size, x + 3, y + 2.6 + size + 0.4, first);
    pdf_text(P, vf, size, x + 3, y + 2.6, second);
}

static void dated(char *buf, size_t n, const char *who, const char *date)
{
    snprintf(buf, n, "%s%s%s", or_blank(who), date && *date ? "  " : "", or_blank(date));
}

static void draw_watermark(Pdf *P, const char *text)
{
    double size = 44;
    double w = pdf_width(P, FONT_SANS_BOLD, size, text);
    while (w > (P->sheet.h * 0.85) && size > 16) {
        size -= 2;
        w = pdf_width(P, FONT_SANS_BOLD, size, text);
    }
    double a = atan2(P->sheet.h - 240, P->sheet.w - 120);
    double c = cos(a), s = sin(a);
    double cx = P->sheet.w / 2, cy = P->sheet.h / 2 - 40;
    draw_fill_rgb(P->page, (Rgb){0.93, 0.88, 0.88});
    draw_text_matrix(P->page, FONT_SANS_BOLD, size, c, s, -s, c, cx - c * w / 2 + s * size / 3,
                     cy - s * w / 2 - c * size / 3, text);
}

/* A check fails in the calc itself or in one of its cases. */
static bool any_failed(const Pdf *P)
{
    if (P->pkg)
        return P->pkg_failed > 0;
    return P->ev->nfailed > 0 || pdf_case_rows_failing(P) > 0;
}

static const char *marking(const Pdf *P)
{
    if (P->pkg)
        return any_failed(P) ? "CHECKS NOT SATISFIED"
               : P->preliminary ? "PRELIMINARY — NOT FOR CONSTRUCTION"
                                : NULL;
    size_t cases = pdf_case_rows_failing(P);
    if (P->ev->nfailed == 0 && cases > 0)
        return cases == 1 ? "CHECKS NOT SATISFIED IN ONE CASE" : "CHECKS NOT SATISFIED IN SOME CASES";
    if (any_failed(P))
        return "CHECKS NOT SATISFIED";
    if (P->preliminary)
        return "PRELIMINARY — NOT FOR CONSTRUCTION";
    return NULL;
}

void pdf_sheet_frame(Pdf *P, int sheet)
{
    const Sheet *s = &P->sheet;
    const Meta *m = &P->d->meta;
    char buf[256];
    if (sheet == 0 && marking(P))
        draw_watermark(P, P->preliminary && !any_failed(P) ? "PRELIMINARY" : "NOT SATISFIED");
    draw_stroke_rgb(P->page, INK);
    pdf_rect(P, s->frame_l, s->frame_b, s->frame_r - s->frame_l, s->frame_t - s->frame_b, 1.1);

    /* title block: two rows of cells across the top of the frame */
    double x0 = s->frame_l, W = s->frame_r - s->frame_l;
    double top = s->frame_t, r1 = 27, r2 = TB_H - r1;
    double y1 = top - r1, y2 = y1 - r2;
    double wp = W * 0.56, wn = W * 0.30, wr = W - wp - wn;
    cell(P, x0, y1, wp, r1, "PROJECT", or_blank(m->project), FONT_SERIF_BOLD, 9.5);
    cell(P, x0 + wp, y1, wn, r1, "CALCULATION NO.", or_blank(m->number), FONT_SERIF_BOLD, 9.5);
    cell(P, x0 + wp + wn, y1, wr, r1, "REVISION", or_blank(m->revision), FONT_SERIF_BOLD, 9.5);
    double ws = W * 0.34, wpr = W * 0.22, wc = W * 0.22, wsh = W - ws - wpr - wc;
    cell(P, x0, y2, ws, r2, "SUBJECT", or_blank(m->subject ? m->subject : m->title), FONT_SERIF,
         8.5);
    dated(buf, sizeof buf, m->prepared, m->prepared_date ? m->prepared_date : P->date);
    cell(P, x0 + ws, y2, wpr, r2, "PREPARED · DATE", buf, FONT_SERIF, 8.5);
    dated(buf, sizeof buf, m->checked, m->checked_date);
    cell(P, x0 + ws + wpr, y2, wc, r2, "CHECKED · DATE", buf, FONT_SERIF, 8.5);
    snprintf(buf, sizeof buf, "Sheet %d of %d", sheet + 1, P->npages);
    cell(P, x0 + ws + wpr + wc, y2, wsh, r2, "", buf, FONT_SANS_BOLD, 10);
    pdf_line(P, x0, y1, x0 + W, y1, 0.9);
    pdf_line(P, x0, y2, x0 + W, y2, 1.1);

    /* trace line */
    double fy = s->frame_b + FOOT_H;
    pdf_line(P, x0, fy, x0 + W, fy, 0.5);
    const char *file = P->d->file;
    const char *slash = strrchr(file, '/');
    char dig[13];
    memcpy(dig, P->d->digest, 12);
    dig[12] = '\0';
    snprintf(buf, sizeof buf, "Source %s", slash ? slash + 1 : file);
    pdf_text_color(P, FONT_SANS, 6.8, x0 + 4, s->frame_b + 4.8, buf, GREY);
    double fx = x0 + 8 + pdf_width(P, FONT_SANS, 6.8, buf) + 10;
    pdf_text_color(P, FONT_SANS, 6.8, fx, s->frame_b + 4.8, "SHA-256", GREY);
    fx += pdf_width(P, FONT_SANS, 6.8, "SHA-256") + 4;
    pdf_text_color(P, FONT_MONO, 6.8, fx, s->frame_b + 4.8, dig, INK);
    fx += pdf_width(P, FONT_MONO, 6.8, dig) + 10;
    snprintf(buf, sizeof buf, "headroom %s", HEADROOM_VERSION);
    double vw = pdf_width(P, FONT_SANS, 6.8, buf);
    /* every used file's digest beside the source's, as far as the line holds
     * them; the rest are counted (the cover's contents lists them all) */
    double room = x0 + W - vw - 14;
    for (size_t i = 0; i < P->ev->nused; i++) {
        const UsedFile *u = P->ev->used[i];
        const char *us = strrchr(u->file, '/');
        char ub[160], ud[13];
        snprintf(ub, sizeof ub, "uses %s", us ? us + 1 : u->file);
        memcpy(ud, u->doc->digest, 12);
        ud[12] = '\0';
        double need = pdf_width(P, FONT_SANS, 6.8, ub) + 4 + pdf_width(P, FONT_MONO, 6.8, ud);
        char more[32];
        snprintf(more, sizeof more, "+%zu used", P->ev->nused - i);
        if (fx + need + (i + 1 < P->ev->nused ? pdf_width(P, FONT_SANS, 6.8, more) + 10 : 0) > room) {
            pdf_text_color(P, FONT_SANS, 6.8, fx, s->frame_b + 4.8, more, GREY);
            break;
        }
        pdf_text_color(P, FONT_SANS, 6.8, fx, s->frame_b + 4.8, ub, GREY);
        fx += pdf_width(P, FONT_SANS, 6.8, ub) + 4;
        pdf_text_color(P, FONT_MONO, 6.8, fx, s->frame_b + 4.8, ud, INK);
        fx += pdf_width(P, FONT_MONO, 6.8, ud) + 10;
    }
    pdf_text_color(P, FONT_SANS, 6.8, x0 + W - vw - 4, s->frame_b + 4.8, buf, GREY);
}

/* ---- issued or not -------------------------------------------------------- */

/* Statuses under which a package may be built from; anything else (draft,
 * preliminary, issued for review, no status) is marked on the cover. The
 * vocabulary is the front matter's. */
bool pdf_status_issued(const char *status)
{
    return frontmatter_status_issued(status);
}

/* ---- shared item pieces ----------------------------------------------------- */

static double fn_gap(Pdf *P, const Item *it, double top)
{
    (void)P;
    (void)top;
    return (double)it->aux;
}

/* ---- the cover ------------------------------------------------------------- */

static double kv(Pdf *P, double x, double y, double lw, const char *k, const char *v)
{
    pdf_text_color(P, FONT_SANS, 7.5, x, y, k, GREY);
    pdf_text(P, FONT_SERIF, 10, x + lw, y, v);
    return 14;
}

static double rev_table(Pdf *P, double x, double top, double w)
{
    const Meta *m = &P->d->meta;
    double cw[4] = {34, 62, 52, w - 148};
    double y = top, rh = 14;
    const char *head[4] = {"REV", "DATE", "BY", "DESCRIPTION"};
    pdf_text(P, FONT_SANS_BOLD, 8.5, x, y - 9, "Revision history");
    y -= 14;
    double cx = x;
    if (P->page)
        pdf_fill(P, x, y - rh, w, rh, SHADE);
    for (int c = 0; c < 4; c++) {
        pdf_text_color(P, FONT_SANS_BOLD, 6.5, cx + 3, y - 9.5, head[c], GREY);
        cx += cw[c];
    }
    pdf_line(P, x, y, x + w, y, 0.6);
    y -= rh;
    pdf_line(P, x, y, x + w, y, 0.4);
    size_t n = m->nrevisions;
    size_t rows = (n ? n : 1) + pdf_revision_row_missing(P);
    for (size_t i = 0; i < rows; i++) {
        const Revision *r = i < n ? &m->revisions[i] : NULL;
        const char *cells[4] = {r ? or_blank(r->rev) : or_blank(m->revision),
                                r ? or_blank(r->date) : or_blank(m->date),
                                r ? or_blank(r->by) : or_blank(m->prepared),
                                r ? or_blank(r->note)
                                  : P->since ? pdf_revision_row_note(P)
                                             : "(no revision history in the front matter)"};
        double h = pdf_wrap(P, FONT_SERIF, 8, 10, x + cw[0] + cw[1] + cw[2] + 3, y - 3,
                            cw[3] - 6, cells[3]);
        double row = h + 6 > rh ? h + 6 : rh;
        cx = x;
        for (int c = 0; c < 3; c++) {
            if (c == 0 && pdf_revision_is_current(P, cells[0]))
                pdf_revision_triangle(P, cx + 10, y - 10, cells[0]);
            else
                pdf_text(P, FONT_SERIF, 8, cx + 3, y - 9.6, cells[c]);
            cx += cw[c];
        }
        y -= row;
        pdf_line(P, x, y, x + w, y, 0.3);
    }
    return top - y;
}

/* The blank area a seal and signature go in, with the lines to sign on. */
static double seal_box(Pdf *P, double x, double top, double w)
{
    const Meta *m = &P->d->meta;
    double h = 200;
    pdf_rect(P, x, top - h, w, h, 0.8);
    pdf_text_color(P, FONT_SANS, 6.5, x + 5, top - 10, "ENGINEER'S SEAL AND SIGNATURE", GREY);
    double ly = top - h + 62;
    struct {
        const char *k, *v;
    } lines[4] = {{"Engineer", or_blank(m->engineer)},
                  {"License no.", or_blank(m->license)},
                  {"Signature", ""},
                  {"Date", ""}};
    for (int i = 0; i < 4; i++) {
        double yy = ly - 15.0 * i;
        pdf_text_color(P, FONT_SANS, 7, x + 6, yy + 2, lines[i].k, GREY);
        pdf_line(P, x + 52, yy, x + w - 8, yy, 0.4);
        pdf_text(P, FONT_SERIF, 8.5, x + 55, yy + 2, lines[i].v);
    }
    return h;
}

static double fn_cover(Pdf *P, const Item *it, double top)
{
    (void)it;
    const Sheet *s = &P->sheet;
    const Meta *m = &P->d->meta;
    double x = s->body_l, W = s->body_r - s->body_l, y = top;
    pdf_text_color(P, FONT_SANS_BOLD, 8, x, y - 8, "CALCULATION PACKAGE", GREY);
    y -= 14;
    const char *title = m->title ? m->title : base_of(P->d->file);
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 19, 23, x, y, W, title) + 8;
    double lw = 64;
    y -= kv(P, x, y - 10, lw, "Project", or_blank(m->project));
    y -= kv(P, x, y - 10, lw, "Client", or_blank(m->client));
    y -= kv(P, x, y - 10, lw, "Calc no.", or_blank(m->number));
    char buf[256];
    snprintf(buf, sizeof buf, "%s%s%s", or_blank(m->revision), m->date ? ", " : "",
             or_blank(m->date));
    y -= kv(P, x, y - 10, lw, "Revision", buf);
    y -= kv(P, x, y - 10, lw, "Status", m->status ? m->status : "(not stated)");
    if (P->ev->atmosphere_used) {
        char atm[256];
        render_atmosphere(P->ev, atm, sizeof atm);
        y -= kv(P, x, y - 10, lw, "Atmosphere", atm);
    }
    y -= 6;

    const char *mark = marking(P);
    if (mark) {
        double bh = 30;
        if (P->page) {
            pdf_fill(P, x, y - bh, W, bh, (Rgb){0.98, 0.93, 0.92});
            draw_stroke_rgb(P->page, FAIL);
            pdf_rect(P, x, y - bh, W, bh, 1.4);
            draw_stroke_rgb(P->page, INK);
        }
        double tw = pdf_width(P, FONT_SANS_BOLD, 13, mark);
        pdf_text_color(P, FONT_SANS_BOLD, 13, x + (W - tw) / 2, y - 19.5, mark, FAIL);
        y -= bh + 4;
        if (any_failed(P) && P->preliminary) {
            const char *also = "PRELIMINARY — NOT FOR CONSTRUCTION";
            double aw = pdf_width(P, FONT_SANS_BOLD, 9, also);
            pdf_text_color(P, FONT_SANS_BOLD, 9, x + (W - aw) / 2, y - 9, also, FAIL);
            y -= 14;
        }
        y -= 6;
    }
    y -= 8;

    /* revision history on the left, the seal on the right */
    double sw = 190, gap = 16;
    double rh = rev_table(P, x, y, W - sw - gap);
    double sh = seal_box(P, x + W - sw, y, sw);
    y -= (rh > sh ? rh : sh) + 10;

    StrBuf tr = {0};
    if (P->pkg)
        sb_printf(&tr,
                  "Computed and typeset by headroom %s from the package index %s and the %d "
                  "calcs it lists; every source file is attached to this PDF and listed in its "
                  "part's appendix, with its SHA-256 in the contents. SHA-256 of the index: %s.",
                  HEADROOM_VERSION, base_of(P->d->file), P->nscopes > 0 ? P->nscopes - 1 : 0,
                  P->d->digest);
    else
        sb_printf(&tr,
                  "Computed and typeset by headroom %s from %s; the source file is attached "
                  "to this PDF and listed in the appendix. SHA-256 of the source: %s.",
                  HEADROOM_VERSION, base_of(P->d->file), P->d->digest);
    for (size_t i = 0; i < P->ev->nused; i++)
        sb_printf(&tr, "%s %s, SHA-256 %s%s", i ? ";" : " It uses", base_of(P->ev->used[i]->file),
                  P->ev->used[i]->doc->digest, i + 1 == P->ev->nused ? "." : "");
    y -= pdf_wrap(P, FONT_SERIF_ITALIC, 7.5, 9.5, x, y, W - sw - gap, sb_str(&tr));
    sb_free(&tr);
    return top - y;
}

/* ---- the check summary ------------------------------------------------------ */

static const double SUMMARY_COL[] = {0.05, 0.31, 0.38, 0.15, 0.11}; /* no, label, sides, util, verdict */

static double fn_summary_head(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l, h = 14;
    static const char *const checks[5] = {"NO.", "CHECK", "DEMAND AND LIMIT", "UTILISATION", "VERDICT"};
    static const char *const findings[5] = {"NO.", "FINDING", "VALUES COMPARED", "", "ANSWER"};
    const char *const *head = it->aux ? findings : checks;
    pdf_fill(P, x, top - h, W, h, SHADE);
    for (int c = 0; c < 5; c++) {
        pdf_text_color(P, FONT_SANS_BOLD, 6.5, x + 3, top - 9.5, head[c], GREY);
        x += SUMMARY_COL[c] * W;
    }
    pdf_line(P, s->body_l, top, s->body_r, top, 0.7);
    pdf_line(P, s->body_l, top - h, s->body_r, top - h, 0.4);
    return h;
}

static double fn_summary_row(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l;
    double cx[5];
    cx[0] = x;
    for (int c = 1; c < 5; c++)
        cx[c] = cx[c - 1] + SUMMARY_COL[c - 1] * W;
    bool ok = r->state == RES_OK;
    bool gov = st->index == P->governing && !st->finding;
    double size = 8.5;
    MathBox *sides;
    if (ok) {
        MathBox *k[3] = {mbox_quantity(&P->env, &r->sides->lhs, &r->sides->lhs_shown, size, false),
                         mbox_text(&P->env, FONT_SERIF, size,
                                   arena_printf(&P->arena, "  %s  ", cmp_op_text(st->cmp, true))),
                         mbox_quantity(&P->env, &r->sides->rhs, &r->sides->rhs_shown, size, false)};
        sides = mbox_hlist(&P->env, k, 3);
    } else {
        sides = mbox_text(&P->env, FONT_SERIF_ITALIC, size, "not evaluated");
    }
    double lh = 0;
    /* measure the label's wrapped height without drawing */
    DrawPage *keep = P->page;
    P->page = NULL;
    lh = pdf_wrap(P, gov ? FONT_SERIF_BOLD : FONT_SERIF, size, 10.5, 0, 0,
                  SUMMARY_COL[1] * W - 6, st->label);
    P->page = keep;
    double h = lh + 7;
    if (sides->h + sides->d + 7 > h)
        h = sides->h + sides->d + 7;
    if (h < 15)
        h = 15;
    if (P->page) {
        if (gov)
            pdf_fill(P, x, top - h, W, h, (Rgb){0.90, 0.90, 0.84});
        char no[16];
        snprintf(no, sizeof no, "%d", it->aux);
        pdf_text(P, FONT_SERIF, size, cx[0] + 3, top - 10.5, no);
        pdf_wrap(P, gov ? FONT_SERIF_BOLD : FONT_SERIF, size, 10.5, cx[1] + 3, top - 3,
                 SUMMARY_COL[1] * W - 6, st->label);
        mbox_draw(sides, &P->painter, cx[2] + 3, top - 3.5 - sides->h);
        if (st->finding) {
            /* an answer, not a verdict: no utilisation, no pass or fail colour */
            const char *answer = !ok ? "NOT EVALUATED" : r->holds ? "YES" : "NO";
            pdf_text_color(P, FONT_SANS_BOLD, 8.5, cx[4] + 3, top - 10.5, answer, !ok ? FAIL : INK);
            pdf_line(P, x, top - h, x + W, top - h, 0.3);
            return h;
        }
        char u[32] = "—";
        if (ok && isfinite(r->utilization))
            snprintf(u, sizeof u, "%.0f %%", r->utilization * 100);
        pdf_text(P, gov ? FONT_SERIF_BOLD : FONT_SERIF, size, cx[3] + 3, top - 10.5, u);
        if (gov) {
            pdf_text_color(P, FONT_SANS, 6, cx[3] + 3 + pdf_width(P, FONT_SERIF_BOLD, size, u) + 4,
                           top - 10.5, "governing", GREY);
        }
        const char *verdict = !ok ? "NOT EVALUATED" : r->holds ? "HOLDS" : "FAILS";
        pdf_text_color(P, FONT_SANS_BOLD, 8.5, cx[4] + 3, top - 10.5, verdict,
                       !ok || !r->holds ? FAIL : PASS);
        pdf_line(P, x, top - h, x + W, top - h, 0.3);
    }
    return h;
}

/* The cover's count of warnings and the sheets that show them (known once
 * the layout is done: measured as two lines, drawn in at most two). */
static double fn_cover_warnings(Pdf *P, const Item *it, double top)
{
    (void)it;
    if (P->nwarnings == 0)
        return 0;
    double lead = 11, W = P->sheet.body_r - P->sheet.body_l;
    if (!P->page)
        return 2 * lead + 6;
    StrBuf sb = {0};
    sb_printf(&sb, "%zu warning%s, each printed beside its line", P->nwarnings,
              P->nwarnings == 1 ? "" : "s");
    enum { LISTED = 16 }; /* two lines hold this many sheet numbers and the rest's count */
    int listed = P->nwarning_sheets < LISTED ? P->nwarning_sheets : LISTED;
    for (int i = 0; i < listed; i++)
        sb_printf(&sb, "%s%d", i == 0 ? (P->nwarning_sheets == 1 ? " — see sheet " : " — see sheets ")
                                      : ", ", P->warning_sheets[i]);
    if (P->nwarning_sheets > listed)
        sb_printf(&sb, " and %d more", P->nwarning_sheets - listed);
    sb_puts(&sb, ".");
    pdf_wrap_color(P, FONT_SANS_BOLD, 9, lead, P->sheet.body_l, top - 4, W, sb_str(&sb), WARN);
    sb_free(&sb);
    return 2 * lead + 6;
}

static double fn_summary_none(Pdf *P, const Item *it, double top)
{
    (void)it;
    pdf_text(P, FONT_SERIF_ITALIC, 9, P->sheet.body_l, top - 10,
             "This calculation states no checks.");
    return 14;
}

/* ---- cautions ----------------------------------------------------------------- */

/* One bullet of templates/cautions.md: "- **Topic.** text". */
static double fn_caution(Pdf *P, const Item *it, double top)
{
    const char *line = it->p;
    const Sheet *s = &P->sheet;
    double size = it->aux ? 7.8 : 8.8, lead = size * 1.3;
    double x = s->body_l + 12, w = s->body_r - x;
    const char *topic = "", *text = line;
    char tbuf[128];
    if (strncmp(line, "**", 2) == 0) {
        const char *e = strstr(line + 2, "**");
        if (e && (size_t)(e - line - 2) < sizeof tbuf) {
            memcpy(tbuf, line + 2, (size_t)(e - line - 2));
            tbuf[e - line - 2] = '\0';
            topic = tbuf;
            text = e + 2;
            while (*text == ' ')
                text++;
        }
    }
    pdf_text(P, FONT_SERIF, size, s->body_l + 2, top - size * 0.8, "•");
    /* the topic in bold, then the text wrapped after it on the first line */
    double tw = pdf_width(P, FONT_SERIF_BOLD, size, topic);
    pdf_text(P, FONT_SERIF_BOLD, size, x, top - size * 0.8, topic);
    char *joined = arena_printf(&P->arena, "%s", text);
    /* the first line is shorter by the topic */
    const char *p = joined;
    char first[1024];
    size_t best = 0;
    for (size_t i = 0; p[i];) {
        size_t j = i;
        while (p[j] && p[j] != ' ')
            j++;
        if (j >= sizeof first)
            break;
        memcpy(first, p, j);
        first[j] = '\0';
        if (pdf_width(P, FONT_SERIF, size, first) > w - tw - 4)
            break;
        best = j;
        if (!p[j])
            break;
        i = j + 1;
    }
    memcpy(first, p, best);
    first[best] = '\0';
    pdf_text(P, FONT_SERIF, size, x + tw + 4, top - size * 0.8, first);
    const char *rest = p + best;
    while (*rest == ' ')
        rest++;
    double h = lead;
    if (*rest)
        h += pdf_wrap(P, FONT_SERIF, size, lead, x, top - lead, w, rest) + (lead - size * 1.1);
    return h;
}

/* The cautions report_cautions() chooses, kept together on one sheet with
 * their heading so no sheet holds an orphan bullet. */
static void caution_items(Pdf *P, Vec *items, bool small)
{
    ReportCaution c[32];
    size_t n = report_cautions(P->ev, c, sizeof c / sizeof c[0]);
    if (items->len)
        ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    for (size_t i = 0; i < n; i++) {
        char *line = arena_strndup(&P->arena, c[i].text, c[i].len);
        item_add(items, P, fn_caution, line, small, 4);
        if (i + 1 < n)
            ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    }
}

/* The cover's pointer to the cautions, which are printed once, in full, at
 * the end of the calculation. */
static double fn_caution_pointer(Pdf *P, const Item *it, double top)
{
    (void)it;
    return pdf_wrap(P, FONT_SERIF_ITALIC, 8.8, 11.4, P->sheet.body_l, top - 9,
                    P->sheet.body_r - P->sheet.body_l,
                    "The cautions that apply to this calculation — review and seal by a "
                    "licensed professional, the adopted code and the authority having "
                    "jurisdiction, manufacturer data, and what the calculation does not cover "
                    "— are set out in full at the end, before the source listing. They are "
                    "part of this report.") + 4;
}

/* ---- cover items ---------------------------------------------------------------- */

void pdf_cover_items(Pdf *P, Vec *items)
{
    const Document *d = P->d;
    P->preliminary = !pdf_status_issued(d->meta.status);
    P->governing = P->model->governing;
    item_add(items, P, fn_cover, NULL, 0, 0);
    Item *cov = items->items[items->len - 1];
    cov->outline = "Cover";
    cov->outline_level = 1;
    pdf_section(P, items, "Summary of checks", false, false);
    item_add(items, P, fn_summary_head, NULL, 0, 0);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    int no = 0, nfind = 0;
    for (size_t i = 0; i < d->nstmts; i++)
        if (d->stmts[i]->kind == STMT_CHECK && !d->stmts[i]->parse_failed && !d->stmts[i]->finding)
            item_add(items, P, fn_summary_row, d->stmts[i], ++no, 0);
        else if (d->stmts[i]->kind == STMT_CHECK && !d->stmts[i]->parse_failed)
            nfind++;
    if (no == 0)
        item_add(items, P, fn_summary_none, NULL, 0, 0);
    /* Findings apart from the checks: answers recorded, never verdicts. */
    if (nfind) {
        pdf_section(P, items, "Findings", false, false);
        item_add(items, P, fn_summary_head, NULL, 1, 0);
        ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
        no = 0;
        for (size_t i = 0; i < d->nstmts; i++)
            if (d->stmts[i]->kind == STMT_CHECK && !d->stmts[i]->parse_failed && d->stmts[i]->finding)
                item_add(items, P, fn_summary_row, d->stmts[i], ++no, 0);
    }
    item_add(items, P, fn_cover_warnings, NULL, 0, 0);
    pdf_network_cover_items(P, items);
    pdf_cases_cover_items(P, items);
    pdf_section(P, items, "Cautions", false, false);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    item_add(items, P, fn_caution_pointer, NULL, 0, 0);
}

/* A part's heading row in the package's summary of checks. */
static double fn_summary_part(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    const Document *d = P->scopes[it->aux].d;
    const char *slash = strrchr(d->file, '/');
    char *t = arena_printf(&P->arena, "Part %d · %s — %s", it->aux, slash ? slash + 1 : d->file,
                           d->meta.subject ? d->meta.subject : d->meta.title ? d->meta.title : "");
    double h = 14;
    if (P->page) {
        pdf_fill(P, s->body_l, top - h, s->body_r - s->body_l, h, (Rgb){0.96, 0.96, 0.94});
        pdf_text(P, FONT_SANS_BOLD, 7.5, s->body_l + 3, top - 9.8, t);
        pdf_line(P, s->body_l, top - h, s->body_r, top - h, 0.3);
    }
    return h;
}

void pdf_package_cover_items(Pdf *P, Vec *items)
{
    P->preliminary = !pdf_status_issued(P->d->meta.status);
    P->scopes[0].preliminary = P->preliminary;
    item_add(items, P, fn_cover, NULL, 0, 0);
    Item *cov = items->items[items->len - 1];
    cov->outline = "Cover";
    cov->outline_level = 1;
    pdf_section(P, items, "Summary of checks, every part", false, false);
    item_add(items, P, fn_summary_head, NULL, 0, 0);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    int no = 0;
    for (int k = 1; k < P->nscopes; k++) {
        item_add(items, P, fn_summary_part, NULL, k, 0);
        Item *head = items->items[items->len - 1];
        head->layout.keep_with_next = true;
        const Document *d = P->scopes[k].d;
        pdf_scope_load(P, k);
        int before = no;
        for (size_t i = 0; i < d->nstmts; i++)
            if (d->stmts[i]->kind == STMT_CHECK && !d->stmts[i]->parse_failed)
                item_add(items, P, fn_summary_row, d->stmts[i], ++no, 0);
        if (no == before)
            item_add(items, P, fn_summary_none, NULL, 0, 0);
        pdf_cases_cover_items(P, items);
        pdf_scope_load(P, 0);
    }
    pdf_section(P, items, "Cautions", false, true);
    caution_items(P, items, false);
}

/* ---- references ------------------------------------------------------------------- */

void pdf_number_references(Pdf *P)
{
    const Document *d = P->d;
    const Evaluated *ev = P->ev;
    P->source_ref = arena_alloc(&P->arena, (d->nsources + 1) * sizeof(int));
    P->method_ref = arena_alloc(&P->arena, (ev->nmethods + 1) * sizeof(int));
    int n = 0;
    for (size_t i = 0; i < d->nsources; i++)
        P->source_ref[i] = ++n;
    for (size_t i = 0; i < ev->nmethods; i++)
        P->method_ref[i] = ++n;
    /* A method's formula is set out under the first statement that uses it;
     * later statements cite it by number only. */
    P->method_first = arena_alloc(&P->arena, (ev->nmethods + 1) * sizeof(int));
    for (size_t i = 0; i < ev->nmethods; i++) {
        P->method_first[i] = -1;
        for (size_t k = 0; k < d->nstmts && P->method_first[i] < 0; k++)
            for (size_t m = 0; m < ev->results[k].nmethods; m++)
                if (method_same(ev->results[k].methods[m], ev->methods[i])) {
                    P->method_first[i] = (int)k;
                    break;
                }
    }
    P->nrefs = n;
    P->ref_page = arena_alloc(&P->arena, (size_t)(n + 1) * sizeof(int));
    P->ref_y = arena_alloc(&P->arena, (size_t)(n + 1) * sizeof(double));
    for (int i = 0; i <= n; i++)
        P->ref_page[i] = -1;
}

static double fn_ref_source(Pdf *P, const Item *it, double top)
{
    const Source *src = it->p;
    const Sheet *s = &P->sheet;
    char num[16];
    snprintf(num, sizeof num, "[%d]", it->ref);
    pdf_text(P, FONT_SERIF_BOLD, 9, s->body_l, top - 9, num);
    double x = s->body_l + 30;
    pdf_text_color(P, FONT_MONO, 7.5, x, top - 9, src->key, GREY);
    double kw = pdf_width(P, FONT_MONO, 7.5, src->key) + 8;
    if (kw < 70)
        kw = 70;
    double h = pdf_wrap(P, FONT_SERIF, 9, 11.5, x + kw, top - 1.8, s->body_r - x - kw, src->text);
    return h + 3 > 13 ? h + 3 : 13;
}

/* "Used by h_f (line 12), K (line 14)": every statement whose result cites
 * the method, in document order; NULL when none does (a method met only in
 * a path or case table). */
static const char *ref_method_uses(Pdf *P, const Method *m)
{
    const Document *d = P->d;
    const Evaluated *ev = P->ev;
    char *out = NULL;
    for (size_t k = 0; k < d->nstmts; k++) {
        bool uses = false;
        for (size_t j = 0; j < ev->results[k].nmethods && !uses; j++)
            uses = method_same(ev->results[k].methods[j], m);
        if (!uses)
            continue;
        const Stmt *st = d->stmts[k];
        char *one = st->name ? arena_printf(&P->arena, "%s (line %d)", st->name, st->pos.line)
                             : arena_printf(&P->arena, "line %d", st->pos.line);
        out = out ? arena_printf(&P->arena, "%s, %s", out, one)
                  : arena_printf(&P->arena, "Used by %s", one);
    }
    return out ? arena_printf(&P->arena, "%s.", out) : NULL;
}

static double fn_ref_method(Pdf *P, const Item *it, double top)
{
    const Method *m = it->p;
    const Sheet *s = &P->sheet;
    char num[16];
    snprintf(num, sizeof num, "[%d]", it->ref);
    pdf_text(P, FONT_SERIF_BOLD, 9, s->body_l, top - 9, num);
    double x = s->body_l + 30, w = s->body_r - x;
    double y = top - 1.8;
    const char *title = m->title ? m->title : m->key;
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 9, 11.5, x, y, w, title) + 1;
    if (m->reference)
        y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x, y, w, m->reference) + 1;
    if (m->formula) {
        const ModelMethod *mm = report_model_method(P->model, m);
        MathBox *b = NULL;
        if (mm && mm->lhs) {
            MathBox *l = mbox_expr(&P->env, mm->lhs, 9, false);
            if (mm->rhs) {
                MathBox *k[3] = {l, mbox_text(&P->env, FONT_SERIF, 9, "  =  "),
                                 mbox_expr(&P->env, mm->rhs, 9, false)};
                b = mbox_hlist(&P->env, k, 3);
            } else {
                b = l;
            }
        }
        if (b) {
            y -= 3;
            mbox_draw(b, &P->painter, x + 10, y - b->h);
            y -= b->h + b->d + 3;
        } else {
            y -= pdf_wrap(P, FONT_MONO, 8, 10, x + 10, y, w - 10, m->formula);
        }
    }
    if (m->validity) {
        char *v = arena_printf(&P->arena, "Valid for %s.", m->validity);
        y -= pdf_wrap(P, FONT_SERIF_ITALIC, 8, 10, x, y, w, v);
    }
    const char *uses = ref_method_uses(P, m);
    if (uses)
        y -= pdf_wrap(P, FONT_SERIF, 8, 10, x, y, w, uses);
    return top - y + 2;
}

/* ---- design criteria --------------------------------------------------------------- */

static bool ends_with_period(const char *s)
{
    size_t n = strlen(s);
    return n && s[n - 1] == '.';
}

static const double CRIT_COL[] = {0.26, 0.30, 0.44};

static double fn_crit_head(Pdf *P, const Item *it, double top)
{
    (void)it;
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l, h = 14;
    const char *head[3] = {"CHECK", "LIMIT", "BASIS (SOURCE AND EDITION)"};
    pdf_fill(P, x, top - h, W, h, SHADE);
    for (int c = 0; c < 3; c++) {
        pdf_text_color(P, FONT_SANS_BOLD, 6.5, x + 3, top - 9.5, head[c], GREY);
        x += CRIT_COL[c] * W;
    }
    pdf_line(P, s->body_l, top, s->body_r, top, 0.7);
    pdf_line(P, s->body_l, top - h, s->body_r, top - h, 0.4);
    return h;
}

static double fn_crit_row(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const Document *d = P->d;
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l, size = 8.5, lead = 10.5;
    double c1 = x + CRIT_COL[0] * W, c2 = c1 + CRIT_COL[1] * W;
    double h1 = pdf_wrap(P, FONT_SERIF, size, lead, x + 3, top - 3, CRIT_COL[0] * W - 6, st->label);
    /* the limit: the right-hand side as written and its value */
    MathBox *k[3];
    size_t nk = 0;
    k[nk++] = mbox_text(&P->env, FONT_SERIF, size, arena_printf(&P->arena, "%s ", cmp_op_text(st->cmp, true)));
    k[nk++] = mbox_expr(&P->env, st->rhs, size, false);
    if (r->state == RES_OK && !(st->rhs->kind == EXPR_NUMBER)) {
        MathBox *v[2] = {mbox_text(&P->env, FONT_SERIF, size, "  =  "),
                         mbox_quantity(&P->env, &r->sides->rhs, &r->sides->rhs_shown, size, false)};
        k[nk++] = mbox_hlist(&P->env, v, 2);
    }
    MathBox *lim = mbox_hlist(&P->env, k, nk);
    mbox_draw(lim, &P->painter, c1 + 3, top - 3 - lim->h);
    double h2 = lim->h + lim->d;
    /* the basis: the description and the cited sources' text */
    StrBuf sb = {0};
    if (st->description && *st->description)
        sb_printf(&sb, "%s%s ", st->description, ends_with_period(st->description) ? "" : ".");
    for (size_t i = 0; i < st->ncites; i++) {
        int si = st->cites[i].source;
        if (si >= 0 && (size_t)si < d->nsources)
            sb_printf(&sb, "[%d] %s%s ", P->source_ref[si], d->sources[si].text, ends_with_period(d->sources[si].text) ? "" : ".");
    }
    if (st->ncites == 0)
        sb_puts(&sb, "No source cited: common practice or the author's criterion; confirm.");
    double h3 = pdf_wrap(P, FONT_SERIF, size, lead, c2 + 3, top - 3, CRIT_COL[2] * W - 6,
                         sb_str(&sb));
    if (P->page) {
        for (size_t i = 0; i < st->ncites; i++) {
            int si = st->cites[i].source;
            if (si >= 0 && (size_t)si < d->nsources) {
                pdf_link(P, c2, top - h3 - 3, CRIT_COL[2] * W, h3 + 3, P->source_ref[si]);
                break;
            }
        }
    }
    sb_free(&sb);
    double h = h1 > h2 ? h1 : h2;
    if (h3 > h)
        h = h3;
    h += 7;
    pdf_line(P, x, top - h, x + W, top - h, 0.3);
    return h;
}

/* ---- the source listing ------------------------------------------------------------- */

static double fn_listing_intro(Pdf *P, const Item *it, double top)
{
    (void)it;
    const Sheet *s = &P->sheet;
    const Document *d = P->d;
    size_t lines = 0;
    for (size_t i = 0; i < d->len; i++)
        if (d->text[i] == '\n')
            lines++;
    if (d->len && d->text[d->len - 1] != '\n')
        lines++;
    char *t = arena_printf(&P->arena,
                           "The calc source %s, %zu lines, %zu bytes, SHA-256 %s. The same bytes "
                           "are attached to this PDF file; headroom %s rebuilds this report from "
                           "them.",
                           base_of(d->file), lines, d->len, d->digest, HEADROOM_VERSION);
    return pdf_wrap(P, FONT_SERIF, 8.5, 10.5, s->body_l, top, s->body_r - s->body_l, t) + 6;
}

static double fn_listing_line(Pdf *P, const Item *it, double top)
{
    const char *line = it->p;
    const Sheet *s = &P->sheet;
    double size = 7.2, lead = 8.6;
    char num[16];
    snprintf(num, sizeof num, "%d", it->aux);
    double nw = pdf_width(P, FONT_MONO, size, num);
    pdf_text_color(P, FONT_MONO, size, s->body_l + 22 - nw, top - size * 0.8 - 0.6, num, GREY);
    double x = s->body_l + 30, w = s->body_r - x;
    /* hard-wrap long lines by character count: the face is monospaced */
    double cw = pdf_width(P, FONT_MONO, size, "0");
    size_t per = cw > 0 ? (size_t)(w / cw) : 100;
    if (per < 10)
        per = 10;
    const char *p = line;
    double y = top - size * 0.8 - 0.6;
    int rows = 0;
    do {
        /* count UTF-8 characters */
        size_t bytes = 0, chars = 0;
        while (p[bytes] && chars < per) {
            bytes++;
            while (p[bytes] && ((unsigned char)p[bytes] & 0xC0) == 0x80)
                bytes++;
            chars++;
        }
        char *seg = arena_strndup(&P->arena, p, bytes);
        pdf_text(P, FONT_MONO, size, x + (rows ? 12 : 0), y, seg);
        p += bytes;
        y -= lead;
        rows++;
    } while (*p);
    return lead * rows;
}

/* Tabs become spaces so the listing lines up in any viewer. */
static char *expand_tabs(Pdf *P, const char *s, size_t n)
{
    StrBuf sb = {0};
    size_t col = 0;
    for (size_t i = 0; i < n; i++) {
        if (s[i] == '\t') {
            do
                sb_putc(&sb, ' ');
            while (++col % 4);
        } else if (s[i] != '\r') {
            sb_putc(&sb, s[i]);
            if (((unsigned char)s[i] & 0xC0) != 0x80)
                col++;
        }
    }
    char *r = arena_strdup(&P->arena, sb_str(&sb));
    sb_free(&sb);
    return r;
}

void pdf_end_items(Pdf *P, Vec *items)
{
    const Document *d = P->d;
    const Evaluated *ev = P->ev;

    pdf_section(P, items, "References", true, true);
    if (P->nrefs == 0)
        item_add(items, P, fn_summary_none, NULL, 0, 0);
    for (size_t i = 0; i < d->nsources; i++) {
        item_add(items, P, fn_ref_source, &d->sources[i], 0, 4);
        ((Item *)items->items[items->len - 1])->ref = P->source_ref[i];
    }
    for (size_t i = 0; i < ev->nmethods; i++) {
        item_add(items, P, fn_ref_method, ev->methods[i], 0, 6);
        ((Item *)items->items[items->len - 1])->ref = P->method_ref[i];
    }

    pdf_section(P, items, "Design criteria", false, true);
    item_add(items, P, fn_crit_head, NULL, 0, 0);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    size_t nchecks = 0;
    for (size_t i = 0; i < d->nstmts; i++)
        if (d->stmts[i]->kind == STMT_CHECK && !d->stmts[i]->parse_failed && !d->stmts[i]->finding) {
            item_add(items, P, fn_crit_row, d->stmts[i], 0, 0);
            nchecks++;
        }
    if (!nchecks)
        item_add(items, P, fn_summary_none, NULL, 0, 0);

    if (!P->pkg) { /* a package states its cautions once, on its cover */
        pdf_section(P, items, "Cautions", false, true);
        caution_items(P, items, false);
        item_add(items, P, fn_gap, NULL, 6, 0);
    }

    pdf_section(P, items, "Appendix A — Source listing", true, true);
    item_add(items, P, fn_listing_intro, NULL, 0, 0);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    const char *t = d->text;
    int line = 1;
    size_t at = 0;
    while (at < d->len) {
        const char *e = memchr(t + at, '\n', d->len - at);
        size_t len = e ? (size_t)(e - (t + at)) : d->len - at;
        item_add(items, P, fn_listing_line, expand_tabs(P, t + at, len), line++, 0);
        at += len + 1;
    }
}
