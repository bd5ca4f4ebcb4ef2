/* pdf_flow.c — path segment tables and case tables in the report.
 *
 * A path block becomes a heading row (what the path is, the methods' keys
 * in the margin), its segment table in chunks that each fit a sheet and
 * repeat the header (a row of quantities in words, their symbols and their
 * display units), and a summary (end and lowest pressure, highest velocity,
 * total loss, the segments as written, the figures drawn from it and the
 * published methods with their reference numbers). A cases block becomes a
 * table with one row per case: the inputs as written, the results shown and
 * each check's verdict, with failing rows tinted and marked. The cover lists
 * every case table's outcome under the check summary. Everything shown is
 * read from the evaluated PathResult and CaseResult; nothing is computed
 * here but unit conversion for display. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"

static const Rgb FAIL_TINT = {0.985, 0.925, 0.915};

static double full_width(const Pdf *P)
{
    return P->sheet.body_r - P->sheet.body_l;
}

static double text_width(const Pdf *P)
{
    return full_width(P) - P->sheet.margin_w;
}

static void stroke(Pdf *P, Rgb c)
{
    if (P->page)
        draw_stroke_rgb(P->page, c);
}

/* ---- the segment table ---------------------------------------------------- */

enum { PATH_COLS = 15, PATH_CHUNK = 28 };

/* The columns shown: every quantity of a segment, the fixture load only when
 * the path has a fixtures column, the device loss only when it has a device.
 * map[i] is the quantity column i shows. */
/* The segment table's columns are the report model's (report_model.h). */
typedef PathColumns PathCols;

enum { PC_SEGMENT = PCOL_SEGMENT, PC_LOAD = PCOL_LOAD, PC_V = PCOL_V, PC_PIN = PCOL_PIN, PC_DPDEV = PCOL_DPDEV, PC_POUT = PCOL_POUT };

static PathCols path_cols(const Pdf *P, const PathResult *pr)
{
    return report_path_columns(P->ev, pr);
}

/* The cell text of segment g, column i. */
static void path_cell(const Pdf *P, const PathCols *c, const SegmentResult *g, int i, char *buf, size_t n)
{
    int q = c->map[i];
    if (q == PC_SEGMENT) {
        snprintf(buf, n, "%s", g->id ? g->id : "");
        return;
    }
    double x = report_path_cell(g, q);
    if (!isfinite(x)) {
        snprintf(buf, n, "—");
        return;
    }
    double v = c->has_unit[i] ? unit_from_si(x, &c->unit[i], true) : x;
    num_typeset(v, P->env.digits, buf, n);
}

#define PT_SIZE 7.8
#define PT_WORD 5.6

typedef struct PathLayout {
    double x[PATH_COLS + 1];   /* column edges */
    double size;
} PathLayout;

static PathLayout path_layout(Pdf *P, const PathCols *c, const PathResult *pr)
{
    if (P->path_layout_key == pr)
        return *(const PathLayout *)P->path_layout;
    PathLayout L;
    double nat[PATH_COLS], W = full_width(P);
    for (int i = 0; i < c->n; i++) {
        char ut[48] = "";
        if (c->has_unit[i])
            mbox_unit_text(c->unit[i].text, ut, sizeof ut);
        double w = fmax(pdf_width(P, FONT_SANS, 6.4, ut), 18);
        for (size_t k = 0; k < pr->nsegs; k++) {
            char buf[64];
            path_cell(P, c, &pr->segs[k], i, buf, sizeof buf);
            w = fmax(w, pdf_width(P, i == 0 ? FONT_SANS_BOLD : FONT_SERIF, PT_SIZE, buf));
        }
        nat[i] = w + 8;
    }
    L.size = pdf_columns_spread(nat, c->n, P->sheet.body_l, W, PT_SIZE, L.x);
    if (!P->path_layout)
        P->path_layout = arena_alloc(&P->arena, sizeof L);
    *(PathLayout *)P->path_layout = L;
    P->path_layout_key = pr;
    return L;
}

/* The three header rows; returns their height. */
static double path_header(Pdf *P, const PathCols *c, const PathLayout *L, double top)
{
    const char *unit[PATH_COLUMNS_MAX];
    char ut[PATH_COLUMNS_MAX][48];
    for (int i = 0; i < c->n; i++) {
        unit[i] = NULL;
        if (c->has_unit[i]) {
            mbox_unit_text(c->unit[i].text, ut[i], sizeof ut[i]);
            unit[i] = ut[i];
        } else if (c->map[i] == PC_LOAD) {
            unit[i] = "wsfu";
        }
    }
    return pdf_column_header(P, c->n, L->x, c->word, c->symbol, unit, PT_WORD, top);
}

/* A chunk of segment rows: it->aux is the first row, it->depth the count. */
static double fn_path_table(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const PathResult *pr = P->ev->results[st->index].made->path;
    PathCols c = path_cols(P, pr);
    PathLayout L = path_layout(P, &c, pr);
    double y = top - path_header(P, &c, &L, top);
    double rh = L.size + 5;
    size_t first = (size_t)it->aux, last = first + (size_t)it->depth;
    for (size_t k = first; k < last && k < pr->nsegs; k++) {
        const SegmentResult *g = &pr->segs[k];
        for (int i = 0; i < c.n; i++) {
            char buf[64];
            path_cell(P, &c, g, i, buf, sizeof buf);
            /* the lowest pressure and the highest velocity in bold */
            int q = c.map[i];
            bool strong = (q == PC_POUT && k == pr->p_min_seg && !pr->p_min_at_inlet && !pr->p_min_before_device) ||
                          (q == PC_PIN && k == pr->p_min_seg && pr->p_min_at_inlet) ||
                          (q == PC_V && g->V == pr->V_max);
            FontRole f = i == 0 ? FONT_SANS_BOLD : strong ? FONT_SERIF_BOLD : FONT_SERIF;
            double w = pdf_width(P, f, L.size, buf);
            double x = i == 0 ? L.x[0] + 4 : L.x[i + 1] - 4 - w;
            pdf_text(P, f, L.size, x, y - rh + 3.2, buf);
            if (i > 0)
                pdf_line(P, L.x[i], y, L.x[i], y - rh, 0.3);
        }
        y -= rh;
        stroke(P, (Rgb){0.72, 0.72, 0.72});
        if (k + 1 < last && k + 1 < pr->nsegs)
            pdf_line(P, L.x[0], y, L.x[c.n], y, 0.25);
        stroke(P, INK);
    }
    pdf_line(P, L.x[0], y, L.x[c.n], y, 0.9);
    return top - y;
}

static const char *loss_name(const Stmt *st)
{
    return st->path->loss == LOSS_HAZEN_WILLIAMS ? "Hazen-Williams" : "Darcy-Weisbach";
}

static double fn_path_head(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const PathResult *pr = r->made->path;
    double x = P->sheet.body_l, w = text_width(P) - 6, y = top - 1;
    char *t = arena_printf(&P->arena, "Path: %s", st->name ? st->name : "");
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 9.6, 12, x, y, w, t);
    StrBuf sb = {0};
    if (st->description && *st->description)
        sb_printf(&sb, "%s. ", st->description);
    if (pr) {
        sb_printf(&sb, "%zu segment%s, %s head loss", pr->nsegs, pr->nsegs == 1 ? "" : "s", loss_name(st));
        if (st->path->friction)
            sb_printf(&sb, ", friction factor by the %s method", st->path->friction);
        if (st->path->fittings)
            sb_printf(&sb, ", fitting K by the %s method", st->path->fittings);
        sb_puts(&sb, ". ");
    }
    sb_puts(&sb, "Starting pressure ");
    render_expr_text(P->ev, st->path->start, false, &sb);
    if (pr && pr->nsegs) {
        Unit uP = unit_default(DIM_PRESSURE, TEMP_NONE, P->ev->units);
        char v[48];
        num_typeset(unit_from_si(pr->segs[0].p_in, &uP, true), P->env.digits, v, sizeof v);
        char ut[32];
        mbox_unit_text(uP.text, ut, sizeof ut);
        sb_printf(&sb, " = %s %s", v, ut);
    }
    sb_puts(&sb, " (static) at the inlet of the first segment; fluid ");
    render_expr_text(P->ev, st->path->fluid, false, &sb);
    sb_puts(&sb, ". Pressures are static; rise is the gain in elevation along the flow.");
    if (pr && pr->ndevices)
        sb_puts(&sb, " A device at a segment's outlet changes the static pressure after the segment's pipe and "
                     "fitting losses; its loss is the drop across it (negative where a pump adds head), and the "
                     "outlet pressure is the pressure after it.");
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x, y, w, sb_str(&sb)) + 3;
    sb_free(&sb);
    if (!pr)
        y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, 9, 11.5, x, y, w, "(not evaluated)", FAIL);
    double mh = pdf_row_margin(P, st, top - 1);
    return fmax(top - y, mh + 2);
}

/* One summary entry: words, symbol = value, a remark. */
static MathBox *summary_entry(Pdf *P, const char *words, const char *sym, const Value *v,
                              const char *remark, double size)
{
    MathBox *k[6];
    size_t n = 0;
    k[n++] = mbox_text(&P->env, FONT_SERIF, size, arena_printf(&P->arena, "%s  ", words));
    k[n++] = mbox_symbol(&P->env, sym, size);
    k[n++] = mbox_text(&P->env, FONT_SERIF, size, " = ");
    Unit u = eval_display_unit(P->ev, v, NULL);
    k[n++] = mbox_quantity(&P->env, v, &u, size, true);
    if (remark && *remark)
        k[n++] = mbox_text(&P->env, FONT_SERIF, size, arena_printf(&P->arena, "  (%s)", remark));
    return mbox_hlist(&P->env, k, n);
}

static double fn_path_summary(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const Record *rec = r->value.kind == VAL_RECORD ? r->value.rec : NULL;
    double x = P->sheet.body_l, W = full_width(P), y = top - 2, size = 9;
    if (rec) {
        const Value *at = record_get(rec, "p_min_at");
        const char *where = at && at->kind == VAL_STRING ? at->str : NULL;
        struct {
            const char *words, *field, *sym, *remark;
        } e[4] = {{"Pressure at the end", "p_end", "p_end", NULL},
                  {"Lowest pressure", "p_min", "p_min", where},
                  {"Highest velocity", "V_max", "V_max", NULL},
                  {"Total head loss", "loss", "h_L", "friction and fittings"}};
        /* two entries a line, in two columns; one a line when an entry is
         * wider than its column (a long segment id in a remark) */
        MathBox *box[4] = {0};
        bool wide = false;
        for (int j = 0; j < 4; j++) {
            const Value *v = record_get(rec, e[j].field);
            if (v)
                box[j] = summary_entry(P, e[j].words, e[j].sym, v, e[j].remark, size);
            wide = wide || (box[j] && box[j]->w > W / 2 - 8);
        }
        int per = wide ? 1 : 2;
        for (int i = 0; i < 4; i += per) {
            double h = 0;
            for (int j = i; j < i + per; j++) {
                MathBox *b = box[j];
                if (!b)
                    continue;
                if (P->page)
                    mbox_draw(b, &P->painter, x + 4 + (j - i) * W / 2, y - b->h - 1);
                h = fmax(h, b->h + b->d + 3);
            }
            y -= h;
        }
    }
    /* the segments as written */
    StrBuf sb = {0};
    sb_puts(&sb, "Segments as written: ");
    for (size_t k = 0; k < st->path->nsegs; k++) {
        const PathSegment *sg = &st->path->segs[k];
        sb_printf(&sb, "%s%s pipe ", k ? "; " : "", sg->id);
        render_expr_text(P->ev, sg->pipe, false, &sb);
        if (sg->nfittings) {
            sb_puts(&sb, ", fittings ");
            for (size_t f = 0; f < sg->nfittings; f++)
                sb_printf(&sb, "%s%d %s", f ? ", " : "", sg->fittings[f].count, sg->fittings[f].kind);
        }
        if (sg->nfixtures && r->made->path) {
            const SegmentResult *g = &r->made->path->segs[k];
            sb_puts(&sb, ", fixtures at the outlet ");
            for (size_t f = 0; f < sg->nfixtures; f++) {
                char each[48], total[48];
                num_typeset(g->fixture_each[f], P->env.digits, each, sizeof each);
                num_typeset(g->fixture_total[f], P->env.digits, total, sizeof total);
                sb_printf(&sb, "%s%d %s × %s = %s wsfu", f ? ", " : "", sg->fixtures[f].count,
                          sg->fixtures[f].kind, each, total);
            }
        }
        if (sg->K) {
            sb_puts(&sb, ", extra K ");
            render_expr_text(P->ev, sg->K, false, &sb);
        }
        if (sg->C) {
            sb_puts(&sb, ", C ");
            render_expr_text(P->ev, sg->C, false, &sb);
        }
        if (sg->device) {
            sb_puts(&sb, ", device at the outlet ");
            render_expr_text(P->ev, sg->device, false, &sb);
        }
    }
    sb_puts(&sb, ". Bold in the table: the lowest pressure and the highest velocity.");
    if (r->made->path && r->made->path->nsegs && r->made->path->segs[0].has_load)
        sb_puts(&sb, " The fixture load of a segment is the sum of the loads of every fixture downstream "
                     "of its inlet (loads add; demands do not).");
    char figs[96];
    pdf_figures_of(P, st->index, figs, sizeof figs);
    if (figs[0])
        sb_printf(&sb, " Drawn in %s.", figs);
    y -= pdf_wrap_color(P, FONT_SERIF, 8, 10, x, y - 1, W, sb_str(&sb), GREY) + 3;
    sb_free(&sb);
    y -= pdf_warnings(P, r, x, y, W);
    /* the methods */
    for (size_t m = 0; m < r->nmethods; m++)
        for (size_t j = 0; j < P->ev->nmethods; j++)
            if (method_same(P->ev->methods[j], r->methods[m]) && P->method_first[j] == st->index)
                y -= pdf_method_line(P, r->methods[m], P->method_ref[j], x + 4, y, W - 4);
    double h = top - y + 3;
    if (P->page) {
        stroke(P, (Rgb){0.80, 0.80, 0.80});
        pdf_line(P, x, top - h + 1.5, P->sheet.body_r, top - h + 1.5, 0.25);
        stroke(P, INK);
    }
    return h;
}

void pdf_path_items(Pdf *P, Vec *items, const Stmt *st)
{
    const StmtResult *r = &P->ev->results[st->index];
    item_add(items, P, fn_path_head, st, 0, 8);
    Item *head = items->items[items->len - 1];
    if (r->state != RES_OK || !r->made->path)
        return;
    head->layout.keep_with_next = true;
    const PathResult *pr = r->made->path;
    for (size_t k = 0; k < pr->nsegs; k += PATH_CHUNK) {
        item_add(items, P, fn_path_table, st, (int)k, k ? 6 : 3);
        Item *it = items->items[items->len - 1];
        it->depth = (int)(pr->nsegs - k < PATH_CHUNK ? pr->nsegs - k : PATH_CHUNK);
        /* the last chunk keeps the summary's first lines with it */
        it->layout.keep_with_next = k + PATH_CHUNK >= pr->nsegs;
    }
    item_add(items, P, fn_path_summary, st, 0, 3);
    ((Item *)items->items[items->len - 1])->warnings = (int)P->ev->results[st->index].nwarnings;
}

/* ---- case tables -------------------------------------------------------------- */

enum { CASE_CHUNK = 30 };
#define CT_SIZE 8.4

typedef struct CaseLayout {
    size_t ncols;              /* case no., inputs, shown, checks (or one) */
    bool per_check;            /* a verdict column per check */
    double *x;                 /* ncols + 1 edges */
    double head_h;
} CaseLayout;

static const Stmt *case_check(const Pdf *P, const CaseResult *cr, size_t k)
{
    return P->d->stmts[cr->check_slots[k]];
}

static const char *verdict_text(const Pdf *P, const CaseRow *row, size_t k)
{
    if (!row->check_ok[k])
        return "NOT EVALUATED";
    if (isfinite(row->utilization[k]))
        return arena_printf((Arena *)&P->arena, "%s  %.0f %%", row->holds[k] ? "HOLDS" : "FAILS",
                            row->utilization[k] * 100);
    return row->holds[k] ? "HOLDS" : "FAILS";
}

/* The cell box of row r, column c (inputs as written, results as values). */
static MathBox *case_cell(Pdf *P, const CaseTable *ct, const CaseRow *row, size_t r, size_t c)
{
    if (c == 0)
        return mbox_text(&P->env, FONT_SANS_BOLD, CT_SIZE, arena_printf(&P->arena, "%zu", r + 1));
    c--;
    if (c < ct->ninputs)
        return mbox_expr(&P->env, ct->cells[r * ct->ninputs + c], CT_SIZE, false);
    c -= ct->ninputs;
    if (c < ct->nshow) {
        if (row->shown && row->shown_ok[c])
            return mbox_quantity(&P->env, &row->shown[c], &row->shown_unit[c], CT_SIZE, true);
        return mbox_text(&P->env, FONT_SERIF_ITALIC, CT_SIZE, "not evaluated");
    }
    return NULL; /* verdicts are drawn as text */
}

static CaseLayout case_layout(Pdf *P, const CaseTable *ct, const CaseResult *cr)
{
    if (P->case_layout_key == cr)
        return *(const CaseLayout *)P->case_layout;
    CaseLayout L = {0};
    double W = full_width(P);
    size_t fixed = 1 + ct->ninputs + ct->nshow;
    double *nat = arena_alloc(&P->arena, (fixed + cr->nchecks + 2) * sizeof *nat);
    nat[0] = pdf_width(P, FONT_SANS_BOLD, 6.4, "CASE") + 8;
    double sum = nat[0];
    for (size_t c = 1; c < fixed; c++) {
        double w = 0;
        size_t ci = c - 1;
        MathBox *h = ci < ct->ninputs ? mbox_symbol(&P->env, ct->inputs[ci], CT_SIZE + 0.6)
                                      : mbox_expr(&P->env, ct->show_exprs[ci - ct->ninputs], CT_SIZE + 0.6, false);
        w = h->w;
        for (size_t r = 0; r < ct->nrows; r++)
            w = fmax(w, case_cell(P, ct, &cr->rows[r], r, c)->w);
        nat[c] = w + 12;
        sum += nat[c];
    }
    double verdict_w = pdf_width(P, FONT_SANS_BOLD, 7.4, "FAILS  100 %") + 10;
    L.per_check = cr->nchecks > 0 && sum + (double)cr->nchecks * verdict_w <= W;
    L.ncols = fixed + (L.per_check ? cr->nchecks : 1);
    L.x = arena_alloc(&P->arena, (L.ncols + 1) * sizeof *L.x);
    /* the inputs and results at their natural widths, verdicts share the rest */
    double rest = W - sum;
    size_t nv = L.ncols - fixed;
    double scale = rest < 60 * (double)nv ? W / (sum + 60 * (double)nv) : 1;
    L.x[0] = P->sheet.body_l;
    for (size_t c = 0; c < L.ncols; c++) {
        double w = c < fixed ? nat[c] * scale : (W - sum * scale) / (double)nv;
        L.x[c + 1] = L.x[c] + w;
    }
    /* header height: symbols, and check labels wrapped */
    L.head_h = 16;
    if (L.per_check)
        for (size_t k = 0; k < cr->nchecks; k++) {
            DrawPage *keep = P->page;
            P->page = NULL;
            double h = pdf_wrap(P, FONT_SANS_BOLD, 6.4, 7.6, 0, 0, L.x[fixed + k + 1] - L.x[fixed + k] - 6,
                                case_check(P, cr, k)->label);
            P->page = keep;
            L.head_h = fmax(L.head_h, h + 12);
        }
    if (!P->case_layout)
        P->case_layout = arena_alloc(&P->arena, sizeof L);
    *(CaseLayout *)P->case_layout = L; /* L.x lives in the arena too */
    P->case_layout_key = cr;
    return L;
}

static double fn_case_head(Pdf *P, const Item *it, double top)
{
    size_t which = (size_t)it->aux;
    const CaseTable *ct = P->d->cases[which];
    const CaseResult *cr = &P->ev->cases[which];
    double x = P->sheet.body_l, w = text_width(P) - 6, y = top - 1;
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 9.6, 12, x, y, w, "Cases");
    StrBuf sb = {0};
    sb_printf(&sb, "The whole calculation is evaluated again for each of %zu case%s, with ", ct->nrows,
              ct->nrows == 1 ? "" : "s");
    for (size_t k = 0; k < ct->ninputs; k++)
        sb_printf(&sb, "%s%s", k == 0 ? "" : k + 1 == ct->ninputs ? " and " : ", ", ct->inputs[k]);
    sb_puts(&sb, " as given in each row; every other input keeps its value above. Each check's verdict "
                 "is shown with its utilisation.");
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x, y, w, sb_str(&sb)) + 2;
    sb_free(&sb);
    if (cr->table) {
        const char *t = cr->rows_failing
                            ? arena_printf(&P->arena, "A check fails in %zu of the %zu cases (tinted rows).",
                                           cr->rows_failing, ct->nrows)
                            : arena_printf(&P->arena, "Every check holds in all %zu cases.", ct->nrows);
        y -= pdf_wrap_color(P, FONT_SERIF_BOLD, 9, 11.5, x, y, w, t, cr->rows_failing ? FAIL : PASS) + 2;
    } else {
        y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, 9, 11.5, x, y, w, "(not evaluated)", FAIL) + 2;
    }
    char line[32];
    snprintf(line, sizeof line, "line %d", ct->pos.line);
    pdf_text_color(P, FONT_SANS, 6.6, P->sheet.body_r - P->sheet.margin_w + 8, top - 7.5, line, GREY);
    return top - y;
}

/* A chunk of case rows: it->aux the table, it->depth the first row. */
static double fn_case_table(Pdf *P, const Item *it, double top)
{
    size_t which = (size_t)it->aux;
    const CaseTable *ct = P->d->cases[which];
    const CaseResult *cr = &P->ev->cases[which];
    CaseLayout L = case_layout(P, ct, cr);
    size_t fixed = 1 + ct->ninputs + ct->nshow;
    double x0 = L.x[0], x1 = L.x[L.ncols], y = top;

    /* header */
    double hh = L.head_h;
    if (P->page)
        pdf_fill(P, x0, y - hh, x1 - x0, hh, SHADE);
    pdf_text_color(P, FONT_SANS_BOLD, 6.4, x0 + 4, y - hh + 5, "CASE", GREY);
    for (size_t c = 1; c < L.ncols; c++) {
        double a = L.x[c], w = L.x[c + 1] - a;
        if (c < fixed) {
            size_t ci = c - 1;
            MathBox *b = ci < ct->ninputs ? mbox_symbol(&P->env, ct->inputs[ci], CT_SIZE + 0.6)
                                          : mbox_expr(&P->env, ct->show_exprs[ci - ct->ninputs], CT_SIZE + 0.6, false);
            if (P->page)
                mbox_draw(b, &P->painter, a + 6, y - hh + 5);
            if (ci == ct->ninputs - 1 || ci + 1 == fixed - 1) { /* rule after inputs and results */ }
        } else if (L.per_check) {
            pdf_wrap_color(P, FONT_SANS_BOLD, 6.4, 7.6, a + 4, y - 3, w - 6, case_check(P, cr, c - fixed)->label, GREY);
            pdf_text_color(P, FONT_SANS, 5.6, a + 4, y - hh + 3.5, "verdict, utilisation", GREY);
        } else {
            pdf_text_color(P, FONT_SANS_BOLD, 6.4, a + 4, y - hh + 5, "CHECKS", GREY);
        }
        pdf_line(P, a, y, a, y - hh, c == 1 + ct->ninputs || c == fixed ? 0.6 : 0.3);
    }
    pdf_line(P, x0, y, x1, y, 0.9);
    y -= hh;
    pdf_line(P, x0, y, x1, y, 0.5);

    size_t first = (size_t)it->depth, last = first + CASE_CHUNK;
    for (size_t r = first; r < last && r < ct->nrows; r++) {
        const CaseRow *row = &cr->rows[r];
        bool failing = row->holds && row->nfailed > 0;
        /* row height from its tallest cell */
        double asc = CT_SIZE * 0.8, desc = CT_SIZE * 0.25;
        MathBox **cells = arena_alloc(&P->arena, (fixed + 1) * sizeof *cells);
        for (size_t c = 0; c < fixed; c++) {
            cells[c] = case_cell(P, ct, row, r, c);
            asc = fmax(asc, cells[c]->h);
            desc = fmax(desc, cells[c]->d);
        }
        double verdict_h = 0;
        char *list = NULL;
        if (!L.per_check && row->holds) {
            StrBuf sb = {0};
            if (row->nfailed == 0)
                sb_puts(&sb, "all checks hold");
            else {
                sb_puts(&sb, "FAILS:");
                bool lead = true;
                for (size_t k = 0; k < cr->nchecks; k++)
                    if (!row->holds[k]) {
                        sb_printf(&sb, "%s %s%s", lead ? "" : ",", case_check(P, cr, k)->label,
                                  row->check_ok[k] ? "" : " (not evaluated)");
                        lead = false;
                    }
            }
            list = arena_strdup(&P->arena, sb_str(&sb));
            sb_free(&sb);
            DrawPage *keep = P->page;
            P->page = NULL;
            verdict_h = pdf_wrap(P, FONT_SANS_BOLD, 7.2, 9, 0, 0, L.x[fixed + 1] - L.x[fixed] - 8, list);
            P->page = keep;
        }
        double rh = fmax(asc + desc + 6, verdict_h + 6);
        double base = y - 3 - asc;
        if (P->page && failing)
            pdf_fill(P, x0, y - rh, x1 - x0, rh, FAIL_TINT);
        for (size_t c = 0; c < fixed; c++) {
            if (P->page) {
                if (c == 0 && failing)
                    pdf_text_color(P, FONT_SANS_BOLD, CT_SIZE, x0 + 4, base,
                                   arena_printf(&P->arena, "%zu ▸", r + 1), FAIL);
                else
                    mbox_draw(cells[c], &P->painter, c == 0 ? x0 + 4 : L.x[c] + 6, base);
            }
        }
        if (!row->holds) {
            pdf_text_color(P, FONT_SANS_BOLD, 7.2, L.x[fixed] + 4, base, "NOT EVALUATED", FAIL);
        } else if (L.per_check) {
            for (size_t k = 0; k < cr->nchecks; k++) {
                bool ok = row->check_ok[k] && row->holds[k];
                pdf_text_color(P, FONT_SANS_BOLD, 7.2, L.x[fixed + k] + 4, base, verdict_text(P, row, k),
                               ok ? PASS : FAIL);
            }
        } else {
            pdf_wrap_color(P, FONT_SANS_BOLD, 7.2, 9, L.x[fixed] + 4, y - 3, L.x[fixed + 1] - L.x[fixed] - 8,
                           list, row->nfailed ? FAIL : PASS);
        }
        for (size_t c = 1; c < L.ncols; c++)
            pdf_line(P, L.x[c], y, L.x[c], y - rh, c == 1 + ct->ninputs || c == fixed ? 0.6 : 0.3);
        y -= rh;
        stroke(P, (Rgb){0.72, 0.72, 0.72});
        if (r + 1 < last && r + 1 < ct->nrows)
            pdf_line(P, x0, y, x1, y, 0.25);
        stroke(P, INK);
    }
    pdf_line(P, x0, y, x1, y, 0.9);
    return top - y + 4;
}

void pdf_cases_items(Pdf *P, Vec *items, size_t which)
{
    const CaseTable *ct = P->d->cases[which];
    const CaseResult *cr = which < P->ev->ncases ? &P->ev->cases[which] : NULL;
    item_add(items, P, fn_case_head, NULL, (int)which, 8);
    Item *head = items->items[items->len - 1];
    if (!ct || !cr || !cr->table)
        return;
    head->layout.keep_with_next = true;
    for (size_t r = 0; r < ct->nrows; r += CASE_CHUNK) {
        item_add(items, P, fn_case_table, NULL, (int)which, r ? 6 : 2);
        ((Item *)items->items[items->len - 1])->depth = (int)r;
    }
}

/* ---- the cover ------------------------------------------------------------------ */

size_t pdf_case_rows_failing(const Pdf *P)
{
    return P->model->case_rows_failing;   /* counted once, by the evaluator */
}

/* One case table's outcome: "Cases at line 39: checks fail in case 3 of 3
 * (end pressure, velocity S-2)." */
static double fn_case_cover(Pdf *P, const Item *it, double top)
{
    size_t which = (size_t)it->aux;
    const CaseTable *ct = P->d->cases[which];
    const CaseResult *cr = &P->ev->cases[which];
    double x = P->sheet.body_l, W = full_width(P);
    StrBuf sb = {0};
    sb_printf(&sb, "Cases at line %d (", ct->pos.line);
    for (size_t k = 0; k < ct->ninputs; k++)
        sb_printf(&sb, "%s%s", k ? ", " : "", ct->inputs[k]);
    sb_printf(&sb, "; %zu case%s): ", ct->nrows, ct->nrows == 1 ? "" : "s");
    if (!cr->rows_failing) {
        sb_puts(&sb, "every check holds in every case.");
    } else {
        bool first = true;
        for (size_t r = 0; r < ct->nrows; r++) {
            const CaseRow *row = &cr->rows[r];
            if (!row->nfailed && row->holds)
                continue;
            sb_printf(&sb, "%scase %zu FAILS", first ? "" : "; ", r + 1);
            first = false;
            if (!row->holds) {
                sb_puts(&sb, " (not evaluated)");
                continue;
            }
            sb_puts(&sb, " (");
            bool f2 = true;
            for (size_t k = 0; k < cr->nchecks; k++)
                if (!row->holds[k]) {
                    sb_printf(&sb, "%s%s", f2 ? "" : ", ", case_check(P, cr, k)->label);
                    f2 = false;
                }
            sb_puts(&sb, ")");
        }
        sb_puts(&sb, ".");
    }
    double size = 8.5;
    const char *tag = cr->rows_failing ? "FAILS" : "HOLDS";
    double tw = pdf_width(P, FONT_SANS_BOLD, 7.5, tag) + 10;
    double h = pdf_wrap_color(P, FONT_SERIF, size, 10.5, x + tw, top - 3, W - tw, sb_str(&sb),
                              cr->rows_failing ? FAIL : INK);
    pdf_text_color(P, FONT_SANS_BOLD, 7.5, x + 3, top - 3 - size * 0.85, tag, cr->rows_failing ? FAIL : PASS);
    sb_free(&sb);
    h += 6;
    pdf_line(P, x, top - h, x + W, top - h, 0.3);
    return h;
}

void pdf_cases_cover_items(Pdf *P, Vec *items)
{
    for (size_t i = 0; i < P->ev->ncases && i < P->d->ncases; i++)
        if (P->ev->cases[i].table)
            item_add(items, P, fn_case_cover, NULL, (int)i, 0);
}
