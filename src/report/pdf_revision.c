/* pdf_revision.c — revision marks: what changed since an earlier revision.
 *
 * With `build NEW --since OLD`, main compares the two evaluated revisions
 * (diff.c) and hands the Diff to the renderer; nothing here compares or
 * evaluates. Each body item whose statement, check or prose block the Diff
 * marks changed or added (prose also when a value it shows, {name}, belongs
 * to a marked statement) carries a change bar in the outer margin along its
 * height and, level with its first line, a revision triangle holding NEW's
 * revision letter, the way revised content is marked on issued sheets. The
 * triangle is a drawn path with the letter set inside it, so the letter can
 * be found in the text of the page. The sheets give up a narrow column on the
 * right for the marks, so nothing collides with the keys and verdicts.
 *
 * The appendix "Changes since revision X" takes its lines from the text
 * renderer of the same Diff (render_diff_text), so the report and
 * `headroom diff` group and word every change alike; here the lines are only
 * set: group titles as subheads, entries as rows with their source line in
 * the margin column. The items join the measure pass like any other, so
 * "Sheet N of M" counts the appendix. */
#include "report/pdf_internal.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"

/* The column the marks live in, between the body and the frame. */
enum { REV_COLUMN = 16 };
#define BAR_WIDTH 1.6
#define TRI_W 14.0
#define TRI_H 12.2
/* The letter's baseline below an item's top: level with a first line of
 * 9.6 to 10 pt text, so the letter and the item share a text line. */
#define LETTER_DROP 9.2

void pdf_revision_geometry(Pdf *P)
{
    if (P->since)
        P->sheet.body_r -= REV_COLUMN;
}

static const char *letter_of(const Pdf *P)
{
    const char *r = P->d->meta.revision;
    return r && *r ? r : "?";
}

/* ---- marks in the body ---------------------------------------------------------- */

/* Prose that shows a value ({name}) of a statement the Diff marks: its
 * words are the same, but what the sheet says has changed. */
static bool inlines_show_changed(const Diff *d, const Inline *in)
{
    for (; in; in = in->next) {
        if (in->kind == INL_VALUE && in->slot >= 0 && diff_stmt_mark(d, (size_t)in->slot) != MARK_SAME)
            return true;
        if (inlines_show_changed(d, in->children))
            return true;
    }
    return false;
}

static bool block_shows_changed(const Diff *d, const Block *b)
{
    if (inlines_show_changed(d, b->inlines))
        return true;
    for (const Block *c = b->children; c; c = c->next)
        if (block_shows_changed(d, c))
            return true;
    return false;
}

void pdf_revision_tag(Pdf *P, Vec *items, size_t from, const Block *b)
{
    const Diff *d = P->since;
    if (!d)
        return;
    DiffMark whole = MARK_SAME;
    if (b->kind == BLK_PATH || b->kind == BLK_CURVE) {
        if (b->first_stmt < P->d->nstmts)
            whole = diff_stmt_mark(d, b->first_stmt);
    } else if (b->kind != BLK_CALC) {
        whole = diff_block_mark(d, b);
    }
    /* A calc block's items are its statements, each marked on its own; the
     * items of one prose block or path share one triangle. */
    bool first = true;
    for (size_t i = from; i < items->len; i++) {
        Item *it = items->items[i];
        DiffMark m = b->kind == BLK_CALC ? diff_stmt_mark(d, ((const Stmt *)it->p)->index) : whole;
        if (m == MARK_SAME && b->kind != BLK_CALC && b->kind != BLK_PATH && b->kind != BLK_CURVE && b->kind != BLK_CASES &&
            block_shows_changed(d, it->p))
            m = MARK_CHANGED;
        if (m == MARK_SAME)
            continue;
        it->rev_mark = (b->kind == BLK_CALC || first) ? 1 : 2;
        first = false;
    }
}

void pdf_revision_triangle(Pdf *P, double cx, double base, const char *letter)
{
    double y0 = base - 2.0;
    if (P->page) {
        DrawPage *pg = P->page;
        draw_line_width(pg, 0.8);
        draw_line_join(pg, DRAW_JOIN_MITER);
        draw_move_to(pg, cx - TRI_W / 2, y0);
        draw_line_to(pg, cx + TRI_W / 2, y0);
        draw_line_to(pg, cx, y0 + TRI_H);
        draw_close_stroke(pg);
    }
    /* the letter in the lower part of the triangle, smaller when it is long */
    double size = 6.8;
    while (size > 4 && pdf_width(P, FONT_SANS_BOLD, size, letter) > TRI_W * 0.48)
        size -= 0.2;
    double lw = pdf_width(P, FONT_SANS_BOLD, size, letter);
    pdf_text(P, FONT_SANS_BOLD, size, cx - lw / 2, base, letter);
}

void pdf_revision_mark(Pdf *P, const Item *it, double top)
{
    if (!it->rev_mark || !P->page)
        return;
    const Sheet *s = &P->sheet;
    double bx = s->frame_r - 5;
    draw_stroke_rgb(P->page, INK);
    pdf_line(P, bx, top, bx, top - it->layout.height, BAR_WIDTH);
    if (it->rev_mark == 1)
        pdf_revision_triangle(P, s->body_r + 12, top - LETTER_DROP, letter_of(P));
}

/* ---- the cover's revision table ------------------------------------------------- */

bool pdf_revision_is_current(const Pdf *P, const char *rev)
{
    const char *cur = P->d->meta.revision;
    return P->since && rev && cur && *cur && strcmp(rev, cur) == 0;
}

bool pdf_revision_row_missing(const Pdf *P)
{
    const Meta *m = &P->d->meta;
    if (!P->since || m->nrevisions == 0)
        return false;
    for (size_t i = 0; i < m->nrevisions; i++)
        if (pdf_revision_is_current(P, m->revisions[i].rev))
            return false;
    return true;
}

const char *pdf_revision_row_note(Pdf *P)
{
    return arena_printf(&P->arena, "Revised since %s; changes marked in the margin",
                        P->since_label);
}

/* ---- the appendix --------------------------------------------------------------- */

static double text_width_of(const Pdf *P)
{
    return P->sheet.body_r - P->sheet.body_l - P->sheet.margin_w;
}

static const char *base_of(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

static double fn_intro(Pdf *P, const Item *it, double top)
{
    (void)it;
    const Diff *d = P->since;
    const Document *od = d->old_ev->doc, *nd = P->d;
    char tol[32];
    num_typeset(d->opt.rel_tol, 3, tol, sizeof tol);
    char *t = arena_printf(
        &P->arena,
        "Revision %s (%s, SHA-256 %.12s) compared in meaning with revision %s (%s, SHA-256 "
        "%.12s). Statements are matched by name and checks by label; values are compared in SI "
        "within a relative tolerance of %s, so a moved line or a new display unit is no change. "
        "Every statement, check and prose block of this revision that changed or was added is "
        "marked in the margin with a bar and the triangle %s; what was removed is listed here "
        "only.",
        letter_of(P), base_of(nd->file), nd->digest, P->since_label, base_of(od->file), od->digest,
        tol, letter_of(P));
    double h = pdf_wrap(P, FONT_SERIF, 8.8, 11, P->sheet.body_l, top, text_width_of(P), t);
    return h + 4;
}

/* "inputs (1):" set as "Inputs (1)". */
static double fn_group(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    pdf_text(P, FONT_SANS_BOLD, 9.5, s->body_l, top - 9.5, it->p);
    pdf_line(P, s->body_l, top - 12.5, s->body_r, top - 12.5, 0.4);
    return 15;
}

/* One change: the text wrapped in the body, its source line in the margin
 * column (that text follows the entry's own NUL, see entry_text). */
static double fn_entry(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    const char *text = it->p;
    const char *where = text + strlen(text) + 1;
    double x = s->body_l + 10;
    double h = pdf_wrap(P, FONT_SERIF, 9, 11.2, x, top - 1.5, text_width_of(P) - 16, text) + 3.5;
    pdf_text(P, FONT_SERIF, 9, s->body_l + 1, top - 1.5 - 9 * 0.85, "–");
    pdf_text_color(P, FONT_SANS, 6.6, s->body_r - s->margin_w + 8, top - 8.5, where, GREY);
    if (P->page) {
        draw_stroke_rgb(P->page, (Rgb){0.80, 0.80, 0.80});
        pdf_line(P, s->body_l, top - h + 1, s->body_r, top - h + 1, 0.25);
        draw_stroke_rgb(P->page, INK);
    }
    return h;
}

static double fn_closing(Pdf *P, const Item *it, double top)
{
    return pdf_wrap(P, FONT_SERIF_ITALIC, 8.8, 11, P->sheet.body_l, top, text_width_of(P), it->p);
}

/* An entry line of the text renderer: "  V = 1 → 2 (+100 %)  [line 26]".
 * The leading indent goes, runs of spaces (column padding) become a dash,
 * and the trailing "[line N]" or "[old line N]" moves to the margin. */
static char *entry_text(Pdf *P, const char *line, size_t n)
{
    while (n && *line == ' ')
        line++, n--;
    const char *where = "";
    size_t wn = 0;
    if (n && line[n - 1] == ']') {
        for (size_t k = n - 1; k-- > 0;)
            if (line[k] == '[') {
                if (k >= 2 && line[k - 1] == ' ' && line[k - 2] == ' ' &&
                    (strncmp(line + k, "[line ", 6) == 0 || strncmp(line + k, "[old line ", 10) == 0)) {
                    where = line + k + 1;
                    wn = n - k - 2;
                    n = k - 2;
                }
                break;
            }
    }
    StrBuf sb = {0};
    for (size_t i = 0; i < n; i++) {
        if (line[i] == ' ' && i + 1 < n && line[i + 1] == ' ') {
            while (i + 1 < n && line[i + 1] == ' ')
                i++;
            sb_puts(&sb, " — ");
            continue;
        }
        sb_putc(&sb, line[i]);
    }
    sb_putc(&sb, '\0');
    for (size_t i = 0; i < wn; i++)
        sb_putc(&sb, where[i]);
    char *r = arena_alloc(&P->arena, sb.len + 1);
    memcpy(r, sb_str(&sb), sb.len);
    r[sb.len] = '\0';
    sb_free(&sb);
    return r;
}

void pdf_revision_items(Pdf *P, Vec *items)
{
    if (!P->since)
        return;
    char *title = arena_printf(&P->arena, "Appendix B — Changes since revision %s", P->since_label);
    pdf_section(P, items, title, true, true);
    item_add(items, P, fn_intro, NULL, 0, 0);

    char *text = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&text, &len);
    if (!f) {
        diag_error(P->diags, ((Pos){NULL, 0, 0}), "cannot list the changes: out of memory");
        return;
    }
    bool ok = render_diff_text(P->since, f);
    ok = fclose(f) == 0 && ok;
    if (!ok) {
        free(text);
        return;
    }
    for (size_t at = 0; at < len;) {
        const char *line = text + at;
        const char *e = memchr(line, '\n', len - at);
        size_t n = e ? (size_t)(e - line) : len - at;
        at += n + 1;
        if (n == 0 || strncmp(line, "old: ", 5) == 0 || strncmp(line, "new: ", 5) == 0)
            continue;
        if (line[0] == ' ') {
            item_add(items, P, fn_entry, entry_text(P, line, n), 0, 0);
        } else if (line[n - 1] == ':') {
            char *g = arena_strndup(&P->arena, line, n - 1);
            if (g[0] >= 'a' && g[0] <= 'z')
                g[0] = (char)(g[0] - 'a' + 'A');
            item_add(items, P, fn_group, g, 0, 10);
            ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
        } else {
            item_add(items, P, fn_closing, arena_strndup(&P->arena, line, n), 0, 12);
        }
    }
    free(text);
}
