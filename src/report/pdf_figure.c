/* pdf_figure.c — the figures of the report, drawn as vectors.
 *
 * A `figure` statement becomes one item that never splits across sheets:
 * a framed plot as wide as the text column, light gridlines on the ticks of
 * ticks.c (the axis ends on ticks; log axes where the figure asks for
 * them), tick labels and axis titles with their units, the series in their
 * line styles, a shaded band, the marked points with their labels, a legend
 * under the plot and the numbered caption "Figure N — ...". The renderer
 * reads the FigureData the evaluator made and converts each value from SI to
 * the figure's display units; it computes nothing about the hydraulics. A
 * path's grade-line figure also names the path's segments along the
 * bottom of the plot, read from the path's own result. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"
#include "report/figlayout.h"
#include "ticks.h"

/* ---- geometry ---------------------------------------------------------- */

typedef struct Axis {
    TickSet ts;
    double p0, p1;           /* page coordinates of the axis ends */
    /* a grade-line figure's head axis without the pipe elevation, which
     * lies from below_lo to below_hi (display units) */
    bool pipe_off;
    double below_lo, below_hi;
} Axis;

static double axis_map(const Axis *a, double v)
{
    double lo = a->ts.lo, hi = a->ts.hi;
    double t = a->ts.log ? (log10(v) - log10(lo)) / (log10(hi) - log10(lo)) : (v - lo) / (hi - lo);
    return a->p0 + t * (a->p1 - a->p0);
}

/* The value in display units; NAN when a log axis cannot show it. */
static double shown(double si, const Unit *u, bool log)
{
    double v = unit_from_si(si, u, true);
    return !isfinite(v) || (log && v <= 0) ? NAN : v;
}

static bool has_unit(const Unit *u)
{
    return u->text[0] && strcmp(u->text, "1") != 0;
}

/* The data ranges, in display units, and the axes' ticks. */
static bool figure_axes(const FigureData *fd, Axis *ax, Axis *ay)
{
    double x0 = INFINITY, x1 = -INFINITY, y0 = INFINITY, y1 = -INFINITY;
    for (size_t s = 0; s < fd->nseries; s++)
        for (size_t i = 0; i < fd->series[s].n; i++) {
            double x = shown(fd->series[s].x[i], &fd->x_unit, fd->log_x);
            double y = shown(fd->series[s].y[i], &fd->y_unit, fd->log_y);
            if (isnan(x) || isnan(y))
                continue;
            x0 = fmin(x0, x), x1 = fmax(x1, x), y0 = fmin(y0, y), y1 = fmax(y1, y);
        }
    for (size_t m = 0; m < fd->nmarkers; m++) {
        double x = shown(fd->markers[m].x, &fd->x_unit, fd->log_x);
        double y = shown(fd->markers[m].y, &fd->y_unit, fd->log_y);
        if (isnan(x) || isnan(y))
            continue;
        x0 = fmin(x0, x), x1 = fmax(x1, x), y0 = fmin(y0, y), y1 = fmax(y1, y);
    }
    if (!(x0 <= x1) || !(y0 <= y1))
        return false;
    ay->pipe_off = false;
    bool grade = strcmp(fd->kind, "hgl") == 0;
    if (grade) {
        /* the head axis from the grade lines and markers, the pipe (the
         * thin series) only when the head loss stays readable beside it */
        double g0 = INFINITY, g1 = -INFINITY, z0 = INFINITY, z1 = -INFINITY;
        for (size_t s = 0; s < fd->nseries; s++)
            for (size_t i = 0; i < fd->series[s].n; i++) {
                double y = shown(fd->series[s].y[i], &fd->y_unit, false);
                if (isnan(y))
                    continue;
                if (fd->series[s].style == 3)
                    z0 = fmin(z0, y), z1 = fmax(z1, y);
                else
                    g0 = fmin(g0, y), g1 = fmax(g1, y);
            }
        for (size_t m = 0; m < fd->nmarkers; m++) {
            double y = shown(fd->markers[m].y, &fd->y_unit, false);
            if (!isnan(y))
                g0 = fmin(g0, y), g1 = fmax(g1, y);
        }
        if (g0 <= g1) {
            bool with_pipe = figlayout_grade_range(g0, g1, z0 <= z1 ? z0 : NAN, z0 <= z1 ? z1 : NAN, &y0, &y1);
            ay->pipe_off = !with_pipe && z0 <= z1;
            ay->below_lo = z0, ay->below_hi = z1;
        }
    }
    /* linear axes start at zero when the data come within half their top
     * of it (not the head axis of grade lines: its range is the data's) */
    if (!fd->log_x && x0 > 0 && x0 < 0.5 * x1)
        x0 = 0;
    if (!grade && !fd->log_y && y0 > 0 && y0 < 0.5 * y1)
        y0 = 0;
    bool okx = fd->log_x ? ticks_log(x0, x1, &ax->ts) : ticks_linear(x0, x1, &ax->ts);
    bool oky = fd->log_y ? ticks_log(y0, y1, &ay->ts) : ticks_linear(y0, y1, &ay->ts);
    return okx && oky;
}

/* ---- drawing helpers (all no-ops while measuring) ----------------------- */

static void stroke_rgb(Pdf *P, Rgb c)
{
    if (P->page)
        draw_stroke_rgb(P->page, c);
}

static void fill_rgb(Pdf *P, Rgb c)
{
    if (P->page)
        draw_fill_rgb(P->page, c);
}

static const Rgb GRID_MAJOR = {0.80, 0.80, 0.80};
static const Rgb GRID_MINOR = {0.90, 0.90, 0.90};
static const Rgb BAND = {0.92, 0.92, 0.88};
static const Rgb THIN = {0.45, 0.45, 0.48};
static const Rgb MARK = {0.62, 0.10, 0.08};
static const Rgb ENERGY = {0.10, 0.34, 0.72};

/* A series style: 0 solid, 1 dashed, 2 dotted, 3 thin, 4 dashed in blue
 * (an energy grade line, drawn over its hydraulic grade line). */
static void set_style(Pdf *P, int style, double heavy)
{
    if (!P->page)
        return;
    static const unsigned short DASH[2] = {5, 3}, DOT[2] = {1, 2};
    DrawPage *pg = P->page;
    draw_line_join(pg, DRAW_JOIN_ROUND);
    switch (style) {
    case 1:
        draw_dash(pg, DASH, 2, 0);
        draw_line_cap(pg, DRAW_CAP_BUTT);
        draw_line_width(pg, (heavy * 0.85));
        stroke_rgb(P, INK);
        break;
    case 2:
        draw_dash(pg, DOT, 2, 0);
        draw_line_cap(pg, DRAW_CAP_ROUND);
        draw_line_width(pg, (heavy * 0.9));
        stroke_rgb(P, INK);
        break;
    case 4:
        draw_dash(pg, DASH, 2, 0);
        draw_line_cap(pg, DRAW_CAP_BUTT);
        draw_line_width(pg, (heavy * 0.95));
        stroke_rgb(P, ENERGY);
        break;
    case 3:
        draw_dash(pg, NULL, 0, 0);
        draw_line_cap(pg, DRAW_CAP_BUTT);
        draw_line_width(pg, 0.6);
        stroke_rgb(P, THIN);
        break;
    default:
        draw_dash(pg, NULL, 0, 0);
        draw_line_cap(pg, DRAW_CAP_BUTT);
        draw_line_width(pg, heavy);
        stroke_rgb(P, INK);
        break;
    }
}

static void plain_style(Pdf *P)
{
    if (!P->page)
        return;
    draw_dash(P->page, NULL, 0, 0);
    draw_line_cap(P->page, DRAW_CAP_BUTT);
    draw_line_join(P->page, DRAW_JOIN_MITER);
    stroke_rgb(P, INK);
    fill_rgb(P, INK);
}

static void dot(Pdf *P, double x, double y, double r)
{
    if (!P->page)
        return;
    fill_rgb(P, (Rgb){1, 1, 1});
    draw_circle_path(P->page, x, y, (r + 1.1));
    draw_fill(P->page);
    fill_rgb(P, MARK);
    draw_circle_path(P->page, x, y, r);
    draw_fill(P->page);
    fill_rgb(P, INK);
}

/* Text turned a quarter to the left, its baseline centre at (x, y). */
static void text_up(Pdf *P, FontRole f, double size, double x, double y, const char *s)
{
    if (!P->page)
        return;
    double w = pdf_width(P, f, size, s);
    fill_rgb(P, INK);
    draw_text_matrix(P->page, (int)f, size, 0, 1, -1, 0, x, y - w / 2, s);
}

#define TICK_FONT FONT_SANS
#define TICK_SIZE 7.2

/* A tick label: a plain number, or m×10ⁿ / 10ⁿ with a raised exponent.
 * Returns its width; draws with its left end at x when `draw`. */
static double tick_label(Pdf *P, const Tick *t, double x, double y, bool draw)
{
    char m[64] = "", e[24] = "";
    /* a typographic minus */
    size_t k = 0;
    for (const char *c = t->mantissa; *c && k + 4 < sizeof m; c++) {
        if (*c == '-')
            memcpy(m + k, "−", 3), k += 3;
        else
            m[k++] = *c;
    }
    m[k] = '\0';
    if (t->exp10 || !t->mantissa[0]) {
        if (m[0])
            strncat(m, "×", sizeof m - strlen(m) - 1);
        strncat(m, "10", sizeof m - strlen(m) - 1);
        if (t->exp10 < 0)
            snprintf(e, sizeof e, "−%d", -t->exp10);
        else
            snprintf(e, sizeof e, "%d", t->exp10);
    }
    double es = TICK_SIZE * 0.72;
    double w = pdf_width(P, TICK_FONT, TICK_SIZE, m) + (e[0] ? pdf_width(P, TICK_FONT, es, e) + 0.5 : 0);
    if (draw) {
        pdf_text(P, TICK_FONT, TICK_SIZE, x, y, m);
        if (e[0])
            pdf_text(P, TICK_FONT, es, x + pdf_width(P, TICK_FONT, TICK_SIZE, m) + 0.5,
                     y + TICK_SIZE * 0.42, e);
    }
    return w;
}

/* ---- legend -------------------------------------------------------------- */

typedef struct LegendEntry {
    int kind;                /* 0 a line style, 1 a marker, 2 the band */
    int style;
    const char *text;
} LegendEntry;

/* Series sharing a style with two or more others and running to the right
 * end of the x axis are labelled there instead of in the legend (the
 * roughness curves of a friction chart). */
static bool end_labelled(const FigureData *fd, size_t s, const Axis *ax)
{
    const Series *se = &fd->series[s];
    size_t same = 0;
    for (size_t k = 0; k < fd->nseries; k++)
        same += fd->series[k].style == se->style;
    if (same < 3 || se->n == 0)
        return false;
    double xe = shown(se->x[se->n - 1], &fd->x_unit, fd->log_x);
    return !isnan(xe) && fabs(axis_map(ax, xe) - ax->p1) < 1;
}

static size_t legend_entries(Pdf *P, const FigureData *fd, const Axis *ax, const Axis *ay,
                             LegendEntry *out, size_t cap)
{
    size_t n = 0;
    bool group = false;
    int group_style = 0;
    for (size_t s = 0; s < fd->nseries && n < cap; s++) {
        if (end_labelled(fd, s, ax)) {
            group = true;
            group_style = fd->series[s].style;
            continue;
        }
        const char *name = fd->series[s].name;
        if (ay->pipe_off && fd->series[s].style == 3) {
            char lo[40], hi[40], u[48];
            num_typeset(ay->below_lo, P->env.digits, lo, sizeof lo);
            num_typeset(ay->below_hi, P->env.digits, hi, sizeof hi);
            mbox_unit_text(fd->y_unit.text, u, sizeof u);
            const char *where = ay->below_hi < ay->ts.lo ? "below the axis" : "off the axis";
            name = strcmp(lo, hi) == 0
                       ? arena_printf(&P->arena, "%s %s %s, %s (not drawn)", name, lo, u, where)
                       : arena_printf(&P->arena, "%s %s to %s %s, %s (not drawn)", name, lo, hi, u,
                                      where);
        }
        out[n++] = (LegendEntry){0, fd->series[s].style, name};
    }
    if (group && n < cap)
        out[n++] = (LegendEntry){0, group_style,
                                 strcmp(fd->kind, "moody") == 0
                                     ? "Colebrook-White, labelled by relative roughness ε/D"
                                     : "curves labelled at their right-hand end"};
    if (isfinite(fd->band_lo) && isfinite(fd->band_hi) && n < cap) {
        char lo[40], hi[40];
        num_typeset(unit_from_si(fd->band_lo, &fd->x_unit, true), 2, lo, sizeof lo);
        num_typeset(unit_from_si(fd->band_hi, &fd->x_unit, true), 2, hi, sizeof hi);
        out[n++] = (LegendEntry){2, 0,
                                 strcmp(fd->kind, "moody") == 0
                                     ? arena_printf(&P->arena, "transition zone, %s < Re < %s", lo, hi)
                                     : arena_printf(&P->arena, "band %s to %s", lo, hi)};
    }
    if (fd->nmarkers && n < cap)
        out[n++] = (LegendEntry){1, 0,
                                 strcmp(fd->kind, "moody") == 0 ? "operating points of the calc"
                                 : fd->nmarkers == 1            ? fd->markers[0].label
                                 : strcmp(fd->kind, "hgl") == 0 ? "minimum pressure; devices in the path"
                                 : strcmp(fd->kind, "curve") == 0 ? "points of the table"
                                                                : "marked points"};
    return n;
}

#define LEG_SIZE 7.4

/* The legend in rows under the plot, from x across w; returns its height. */
static double draw_legend(Pdf *P, const LegendEntry *e, size_t n, double x, double top, double w)
{
    double sample = 22, gap = 14, row = 11;
    double cx = x, y = top;
    for (size_t i = 0; i < n; i++) {
        double tw = pdf_width(P, FONT_SANS, LEG_SIZE, e[i].text);
        double ew = sample + 4 + tw;
        if (cx > x && cx + ew > x + w) {
            cx = x;
            y -= row;
        }
        double base = y - 8;
        if (P->page) {
            if (e[i].kind == 0) {
                set_style(P, e[i].style, 1.1);
                draw_move_to(P->page, cx, (base + 2.6));
                draw_line_to(P->page, (cx + sample), (base + 2.6));
                draw_stroke(P->page);
                plain_style(P);
            } else if (e[i].kind == 1) {
                dot(P, cx + sample / 2, base + 2.6, 2.3);
            } else {
                pdf_fill(P, cx + 3, base - 1, sample - 6, 7.5, BAND);
            }
        }
        pdf_text(P, FONT_SANS, LEG_SIZE, cx + sample + 4, base, e[i].text);
        cx += ew + gap;
    }
    return top - y + row;
}

/* ---- the figure item ------------------------------------------------------ */

typedef struct Box {
    double x0, y0, x1, y1;
} Box;

static bool overlaps(const Box *a, const Box *b)
{
    return a->x0 < b->x1 && b->x0 < a->x1 && a->y0 < b->y1 && b->y0 < a->y1;
}

/* Whether any drawn segment of a series meets box b. */
static bool hits_series(const FigureData *fd, const Axis *ax, const Axis *ay, const Box *b)
{
    for (size_t s = 0; s < fd->nseries; s++) {
        const Series *se = &fd->series[s];
        double qx = NAN, qy = NAN;
        for (size_t i = 0; i < se->n; i++) {
            double x = shown(se->x[i], &fd->x_unit, fd->log_x), y = shown(se->y[i], &fd->y_unit, fd->log_y);
            if (isnan(x) || isnan(y)) {
                qx = NAN;
                continue;
            }
            double px = axis_map(ax, x), py = axis_map(ay, y);
            if (!isnan(qx) && figlayout_segment_hits(qx, qy, px, py, b->x0, b->y0, b->x1, b->y1))
                return true;
            qx = px, qy = py;
        }
    }
    return false;
}

/* Marker labels: beside the point, trying the four corners and then
 * further up, so labels neither overlap each other nor leave the plot.
 * Markers at the same place share one label ("S-1, S-2"). */
static void draw_markers(Pdf *P, const FigureData *fd, const Axis *ax, const Axis *ay, bool with_values,
                         const char *suffix)
{
    size_t n = fd->nmarkers;
    if (!n)
        return;
    Box *placed = arena_alloc(&P->arena, (2 * n + 2) * sizeof *placed);
    size_t np = 0;
    if (strcmp(fd->kind, "hgl") == 0)   /* the strip of segment names along the bottom */
        placed[np++] = (Box){ax->p0, ay->p0, ax->p1, ay->p0 + 14};
    bool *done = arena_alloc(&P->arena, (n + 1) * sizeof *done);
    double size = 7.2;
    for (size_t m = 0; m < n; m++) {
        double x = shown(fd->markers[m].x, &fd->x_unit, fd->log_x);
        double y = shown(fd->markers[m].y, &fd->y_unit, fd->log_y);
        if (isnan(x) || isnan(y) || done[m])
            continue;
        double px = axis_map(ax, x), py = axis_map(ay, y);
        placed[np++] = (Box){px - 3, py - 3, px + 3, py + 3};
    }
    for (size_t m = 0; m < n; m++) {
        double x = shown(fd->markers[m].x, &fd->x_unit, fd->log_x);
        double y = shown(fd->markers[m].y, &fd->y_unit, fd->log_y);
        if (isnan(x) || isnan(y) || done[m])
            continue;
        double px = axis_map(ax, x), py = axis_map(ay, y);
        StrBuf sb = {0};
        sb_puts(&sb, fd->markers[m].label ? fd->markers[m].label : "");
        for (size_t k = m + 1; k < n; k++) {
            double x2 = shown(fd->markers[k].x, &fd->x_unit, fd->log_x);
            double y2 = shown(fd->markers[k].y, &fd->y_unit, fd->log_y);
            if (!isnan(x2) && !isnan(y2) && fabs(axis_map(ax, x2) - px) < 1.5 &&
                fabs(axis_map(ay, y2) - py) < 1.5) {
                sb_printf(&sb, ", %s", fd->markers[k].label ? fd->markers[k].label : "");
                done[k] = true;
            }
        }
        if (with_values) {
            char xs[40], ys[40], xu[48], yu[48];
            num_typeset(x, P->env.digits, xs, sizeof xs);
            num_typeset(y, P->env.digits, ys, sizeof ys);
            mbox_unit_text(fd->x_unit.text, xu, sizeof xu);
            mbox_unit_text(fd->y_unit.text, yu, sizeof yu);
            sb_printf(&sb, " (%s %s, %s %s)", xs, has_unit(&fd->x_unit) ? xu : "", ys,
                      has_unit(&fd->y_unit) ? yu : "");
        }
        if (suffix && *suffix && m == 0)
            sb_puts(&sb, suffix);
        const char *label = arena_strdup(&P->arena, sb_str(&sb));
        sb_free(&sb);
        double w = pdf_width(P, FONT_SANS, size, label);
        dot(P, px, py, 2.3);
        /* candidate positions of the label's lower-left corner: beside the
         * point at the four corners, then rings further out (right, left
         * and centred, above and below) */
        enum { NCAND = 4 + 6 * 5 };
        double cand[NCAND][2] = {{px + 5, py + 3}, {px - 5 - w, py + 3}, {px + 5, py - 3 - size},
                                 {px - 5 - w, py - 3 - size}};
        static const double RING[5] = {12, 20, 30, 42, 56};
        for (int r = 0, c = 4; r < 5; r++) {
            double d = RING[r];
            double xs[3] = {px + 5, px - 5 - w, px - w / 2};
            for (int k = 0; k < 3; k++) {
                cand[c][0] = xs[k], cand[c++][1] = py + d;
                cand[c][0] = xs[k], cand[c++][1] = py - d - size;
            }
        }
        Box best = {cand[0][0] - 1, cand[0][1] - 2, cand[0][0] + w + 1, cand[0][1] + size};
        bool found = false, far = false;
        for (int pass = 0; pass < 2 && !found; pass++)
        for (size_t c = 0; c < NCAND; c++) {
            Box b = {cand[c][0] - 1, cand[c][1] - 2, cand[c][0] + w + 1, cand[c][1] + size};
            if (b.x0 < ax->p0 + 2 || b.x1 > ax->p1 - 2 || b.y0 < ay->p0 + 2 || b.y1 > ay->p1 - 2)
                continue;
            /* first pass: clear of curves and labels; second: of labels only */
            bool clash = pass == 0 && hits_series(fd, ax, ay, &b);
            for (size_t k = 0; k < np && !clash; k++)
                clash = overlaps(&b, &placed[k]);
            if (!clash) {
                best = b;
                found = true;
                far = c >= 4;
                break;
            }
        }
        placed[np++] = best;
        if (P->page && far) {
            /* a label set away from its point is tied to it by a leader */
            double lx = fmin(fmax(px, best.x0), best.x1), ly = py < best.y0 ? best.y0 : best.y1;
            stroke_rgb(P, MARK);
            pdf_line(P, px, py, lx, ly, 0.4);
            stroke_rgb(P, INK);
        }
        if (P->page) {
            /* a white backing keeps the label legible over gridlines and curves */
            pdf_fill(P, best.x0, best.y0 + 0.5, best.x1 - best.x0, best.y1 - best.y0, (Rgb){1, 1, 1});
            pdf_text_color(P, FONT_SANS, size, best.x0 + 1, best.y0 + 2, label, MARK);
        }
    }
}

/* The segment ids of a grade-line figure's path, between its junctions. */
static void draw_segments(Pdf *P, const Stmt *st, const Axis *ax, const Axis *ay, const Unit *xu)
{
    if (st->fig->nargs < 1 || !st->fig->args[0] || st->fig->args[0]->kind != EXPR_NAME || st->fig->args[0]->slot < 0 ||
        (size_t)st->fig->args[0]->slot >= P->d->nstmts)
        return;
    const PathResult *pr = P->ev->results[st->fig->args[0]->slot].made->path;
    if (!pr)
        return;
    for (size_t i = 0; i < pr->nsegs; i++) {
        const SegmentResult *g = &pr->segs[i];
        double a = axis_map(ax, shown(g->x_in, xu, false)), b = axis_map(ax, shown(g->x_out, xu, false));
        if (i > 0 && P->page) {
            static const unsigned short D[2] = {2, 2};
            draw_dash(P->page, D, 2, 0);
            stroke_rgb(P, THIN);
            pdf_line(P, a, ay->p0, a, ay->p0 + 14, 0.5);
            plain_style(P);
        }
        double w = pdf_width(P, FONT_SANS, 6.6, g->id);
        if (b - a > w + 2)
            pdf_text_color(P, FONT_SANS, 6.6, (a + b - w) / 2, ay->p0 + 4, g->id, THIN);
    }
}

/* The grade-line figure's first marker (the lowest point) also states the
 * lowest pressure; the others mark the path's devices. */
static const char *hgl_suffix(Pdf *P, const Stmt *st, const FigureData *fd)
{
    if (strcmp(fd->kind, "hgl") != 0 || fd->nmarkers < 1 || st->fig->nargs < 1 || !st->fig->args[0] ||
        st->fig->args[0]->kind != EXPR_NAME || st->fig->args[0]->slot < 0 || (size_t)st->fig->args[0]->slot >= P->d->nstmts)
        return NULL;
    const PathResult *pr = P->ev->results[st->fig->args[0]->slot].made->path;
    if (!pr)
        return NULL;
    Unit uP = unit_default(DIM_PRESSURE, TEMP_NONE, P->ev->units);
    char v[40], u[32];
    num_typeset(unit_from_si(pr->p_min, &uP, true), P->env.digits, v, sizeof v);
    mbox_unit_text(uP.text, u, sizeof u);
    return arena_printf(&P->arena, ", %s %s", v, u);
}

/* The right-hand margin: the figure number and the source line. */
static void figure_margin(Pdf *P, const Stmt *st, int number, double top)
{
    const Sheet *s = &P->sheet;
    double x = s->body_r - s->margin_w + 8;
    char buf[48];
    snprintf(buf, sizeof buf, "Figure %d", number);
    pdf_text_color(P, FONT_SANS_BOLD, 7, x, top - 8, buf, GREY);
    snprintf(buf, sizeof buf, "line %d", st->pos.line);
    pdf_text_color(P, FONT_SANS, 6.6, x, top - 17, buf, GREY);
}

static const char *default_caption(const Pdf *P, const Stmt *st)
{
    const char *arg = st->fig->nargs && st->fig->args[0] && st->fig->args[0]->kind == EXPR_NAME ? st->fig->args[0]->text : "";
    Arena *a = (Arena *)&P->arena;
    if (strcmp(st->fig->kind, "hgl") == 0)
        return arena_printf(a, "Hydraulic and energy grade lines along %s", arg);
    if (strcmp(st->fig->kind, "moody") == 0)
        return "Darcy friction factor against Reynolds number";
    if (strcmp(st->fig->kind, "pump") == 0)
        return arena_printf(a, "Pump curve of %s and system curve", arg);
    if (strcmp(st->fig->kind, "network") == 0)
        return arena_printf(a, "Network %s: links shaded by velocity, arrows in the direction of flow", arg);
    if (strcmp(st->fig->kind, "curve") == 0)
        return arena_printf(a, "Curve %s with its table points", arg);
    return st->fig->kind;
}

double pdf_fn_figure(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const FigureData *fd = r->state == RES_OK ? r->made->figure : NULL;
    const Sheet *s = &P->sheet;
    double x0 = s->body_l, W = s->body_r - s->body_l - s->margin_w;
    figure_margin(P, st, it->aux, top);
    if (fd && strcmp(fd->kind, "network") == 0 && st->fig->nargs == 1 && st->fig->args[0]->kind == EXPR_NAME &&
        st->fig->args[0]->slot >= 0 && P->ev->results[st->fig->args[0]->slot].made->network)
        return pdf_network_figure(P, st, P->ev->results[st->fig->args[0]->slot].made->network, it->aux,
                                  default_caption(P, st), top);
    Axis ax = {0}, ay = {0};
    if (!fd || !figure_axes(fd, &ax, &ay)) {
        char *t = arena_printf(&P->arena, "Figure %d — %s: no data to draw.", it->aux,
                               st->description && *st->description ? st->description : st->fig->kind);
        return pdf_wrap_color(P, FONT_SERIF_ITALIC, 9, 11, x0, top, W, t, FAIL) + 4;
    }

    /* room for the y labels and the y title on the left */
    double lw = 0;
    for (size_t i = 0; i < ay.ts.n; i++)
        if (ay.ts.t[i].kind != TICK_MINOR)
            lw = fmax(lw, tick_label(P, &ay.ts.t[i], 0, 0, false));
    double plot_l = x0 + 14 + lw + 5, plot_r = x0 + W - 8;
    double plot_t = top - 8, plot_h = fmin(0.58 * (plot_r - plot_l), 250);
    double plot_b = plot_t - plot_h;
    ax.p0 = plot_l, ax.p1 = plot_r;
    ay.p0 = plot_b, ay.p1 = plot_t;

    DrawPage *pg = P->page;
    if (pg) {
        /* the band, then the grid */
        if (isfinite(fd->band_lo) && isfinite(fd->band_hi)) {
            double a = shown(fd->band_lo, &fd->x_unit, fd->log_x), b = shown(fd->band_hi, &fd->x_unit, fd->log_x);
            if (!isnan(a) && !isnan(b)) {
                double pa = fmax(plot_l, axis_map(&ax, a)), pb = fmin(plot_r, axis_map(&ax, b));
                if (pb > pa)
                    pdf_fill(P, pa, plot_b, pb - pa, plot_h, BAND);
            }
        }
        for (int pass = 0; pass < 2; pass++) {
            stroke_rgb(P, pass ? GRID_MAJOR : GRID_MINOR);
            for (size_t i = 0; i < ax.ts.n; i++)
                if ((ax.ts.t[i].kind == TICK_MINOR) == !pass) {
                    double px = axis_map(&ax, ax.ts.t[i].v);
                    pdf_line(P, px, plot_b, px, plot_t, pass ? 0.4 : 0.3);
                }
            for (size_t i = 0; i < ay.ts.n; i++)
                if ((ay.ts.t[i].kind == TICK_MINOR) == !pass) {
                    double py = axis_map(&ay, ay.ts.t[i].v);
                    pdf_line(P, plot_l, py, plot_r, py, pass ? 0.4 : 0.3);
                }
        }
        stroke_rgb(P, INK);
        /* the friction chart names its band, over the grid */
        if (strcmp(fd->kind, "moody") == 0 && isfinite(fd->band_lo) && isfinite(fd->band_hi)) {
            double pa = axis_map(&ax, shown(fd->band_lo, &fd->x_unit, fd->log_x));
            double pb = axis_map(&ax, shown(fd->band_hi, &fd->x_unit, fd->log_x));
            double tw = pdf_width(P, FONT_SANS, 6.6, "transition");
            if (pb - pa > 9 && pa >= plot_l && pb <= plot_r) {
                pdf_fill(P, (pa + pb) / 2 - 4, plot_b + plot_h * 0.16 - tw / 2 - 2, 8, tw + 4, BAND);
                text_up(P, FONT_SANS, 6.6, (pa + pb) / 2 + 2.3, plot_b + plot_h * 0.16, "transition");
            }
        }
        if (strcmp(fd->kind, "hgl") == 0)
            draw_segments(P, st, &ax, &ay, &fd->x_unit);

        /* the series, clipped to the plot */
        draw_save(pg);
        draw_rect_path(pg, plot_l, plot_b, (plot_r - plot_l),
                            plot_h);
        draw_clip(pg);
        double heavy = fd->nseries > 4 ? 0.75 : 1.15;
        for (size_t k = 0; k < fd->nseries; k++) {
            const Series *se = &fd->series[k];
            set_style(P, se->style, heavy);
            bool pen = false;
            for (size_t i = 0; i < se->n; i++) {
                double x = shown(se->x[i], &fd->x_unit, fd->log_x);
                double y = shown(se->y[i], &fd->y_unit, fd->log_y);
                if (isnan(x) || isnan(y)) {
                    pen = false;
                    continue;
                }
                double px = axis_map(&ax, x), py = axis_map(&ay, y);
                if (pen)
                    draw_line_to(pg, px, py);
                else
                    draw_move_to(pg, px, py);
                pen = true;
            }
            if (se->n)
                draw_stroke(pg);
        }
        draw_restore(pg);
        plain_style(P);

        /* labels at the right-hand end of grouped curves */
        for (size_t k = 0; k < fd->nseries; k++) {
            const Series *se = &fd->series[k];
            if (!end_labelled(fd, k, &ax))
                continue;
            double y = shown(se->y[se->n - 1], &fd->y_unit, fd->log_y);
            if (isnan(y))
                continue;
            double py = axis_map(&ay, y);
            double w = pdf_width(P, FONT_SANS, 6.4, se->name);
            pdf_fill(P, plot_r - w - 4, py + 1.2, w + 2, 7, (Rgb){1, 1, 1});
            pdf_text_color(P, FONT_SANS, 6.4, plot_r - w - 3, py + 2.4, se->name, INK);
        }

        /* the frame and the ticks on it */
        pdf_rect(P, plot_l, plot_b, plot_r - plot_l, plot_h, 0.8);
        for (size_t i = 0; i < ax.ts.n; i++) {
            double px = axis_map(&ax, ax.ts.t[i].v), len = ax.ts.t[i].kind == TICK_MINOR ? 2 : 3.5;
            pdf_line(P, px, plot_b, px, plot_b + len, 0.5);
            pdf_line(P, px, plot_t, px, plot_t - len, 0.5);
        }
        for (size_t i = 0; i < ay.ts.n; i++) {
            double py = axis_map(&ay, ay.ts.t[i].v), len = ay.ts.t[i].kind == TICK_MINOR ? 2 : 3.5;
            pdf_line(P, plot_l, py, plot_l + len, py, 0.5);
            pdf_line(P, plot_r, py, plot_r - len, py, 0.5);
        }
    }
    /* tick labels: x centred under each tick, y right-aligned beside it */
    double last_right = -INFINITY;
    for (size_t i = 0; i < ax.ts.n; i++) {
        const Tick *t = &ax.ts.t[i];
        if (t->kind == TICK_MINOR)
            continue;
        double w = tick_label(P, t, 0, 0, false), px = axis_map(&ax, t->v);
        double lx = fmin(fmax(px - w / 2, plot_l - w / 2), plot_r - w / 2);
        if (lx < last_right + 3)
            continue; /* crowded: skip rather than overprint */
        tick_label(P, t, lx, plot_b - 10, pg != NULL);
        last_right = lx + w;
    }
    for (size_t i = 0; i < ay.ts.n; i++) {
        const Tick *t = &ay.ts.t[i];
        if (t->kind == TICK_MINOR)
            continue;
        double w = tick_label(P, t, 0, 0, false), py = axis_map(&ay, t->v);
        tick_label(P, t, plot_l - 4 - w, py - TICK_SIZE * 0.35, pg != NULL);
    }
    /* axis titles with units */
    char xu[64], yu[64];
    mbox_unit_text(fd->x_unit.text, xu, sizeof xu);
    mbox_unit_text(fd->y_unit.text, yu, sizeof yu);
    char *xt = has_unit(&fd->x_unit) ? arena_printf(&P->arena, "%s (%s)", fd->x_title, xu)
                                     : arena_printf(&P->arena, "%s", fd->x_title);
    char *yt = has_unit(&fd->y_unit) ? arena_printf(&P->arena, "%s (%s)", fd->y_title, yu)
                                     : arena_printf(&P->arena, "%s", fd->y_title);
    double xtw = pdf_width(P, FONT_SANS, 8, xt);
    pdf_text(P, FONT_SANS, 8, (plot_l + plot_r - xtw) / 2, plot_b - 22, xt);
    text_up(P, FONT_SANS, 8, x0 + 8, (plot_b + plot_t) / 2, yt);
    if (pg)
        draw_markers(P, fd, &ax, &ay, strcmp(fd->kind, "pump") == 0, hgl_suffix(P, st, fd));

    /* legend and caption */
    double y = plot_b - 30;
    LegendEntry le[24];
    size_t nle = legend_entries(P, fd, &ax, &ay, le, 24);
    y -= draw_legend(P, le, nle, plot_l, y, plot_r - plot_l) + 4;
    char *num = arena_printf(&P->arena, "Figure %d", it->aux);
    const char *cap = st->description && *st->description ? st->description : default_caption(P, st);
    double nw = pdf_width(P, FONT_SERIF_BOLD, 9, num);
    char *rest = arena_printf(&P->arena, " — %s", cap);
    double rw = pdf_width(P, FONT_SERIF, 9, rest);
    if (nw + rw <= W) {
        double cx = x0 + (W - nw - rw) / 2;
        pdf_text(P, FONT_SERIF_BOLD, 9, cx, y - 9, num);
        pdf_text(P, FONT_SERIF, 9, cx + nw, y - 9, rest);
        y -= 13;
    } else {
        pdf_text(P, FONT_SERIF_BOLD, 9, x0, y - 9, num);
        y -= 11.5;
        y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x0 + 12, y, W - 12, cap);
    }
    return top - y + 4;
}
