/* pdf_network.c — a network block in the report (DESIGN 2.12).
 *
 * A heading (what the network is, its fluid, loss law and solver), the
 * node table and the link table in chunks that fit a sheet and repeat
 * their header (quantities in words, symbols, display units), and a
 * summary: the lowest junction pressure and where, the highest velocity
 * and where, the convergence record (iterations, largest continuity error
 * against the tolerance, largest energy residual) and the published
 * methods. Everything is read from the evaluated NetworkResult. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"

enum { NET_CHUNK = 30, MAX_NET_COLS = NET_COLUMNS_MAX };
#define NT_SIZE 7.6
#define NT_WORD 5.6

/* The columns are the report model's (report_node_columns,
 * report_link_columns), as the listing's tables have them. */
typedef NetColumns NetCols;

static double full_width(const Pdf *P)
{
    return P->sheet.body_r - P->sheet.body_l;
}

static void number_cell(const Pdf *P, double si, const NetCols *c, int i, char *buf, size_t n)
{
    if (!isfinite(si)) {
        snprintf(buf, n, "—");
        return;
    }
    double v = c->has_unit[i] ? unit_from_si(si, &c->unit[i], true) : si;
    num_typeset(v, P->env.digits, buf, n);
}

static void node_cell(const Pdf *P, const NetworkResult *nr, const NetCols *c, size_t k, int i, char *buf,
                      size_t n)
{
    const NodeResult *g = &nr->nodes[k];
    if (c->map[i] == NCOL_NODE)
        snprintf(buf, n, "%s", g->id);
    else
        number_cell(P, report_node_cell(g, c->map[i]), c, i, buf, n);
}

static const char *device_word(const LinkResult *g)
{
    static const char *const states[] = {"", " (closed)", " (regulating)", " (wide open)"};
    const char *d = g->device == NET_DEVICE_CHECK ? "check valve"
                    : g->device == NET_DEVICE_PUMP ? "pump"
                    : g->device == NET_DEVICE_PRV  ? "PRV"
                          : g->device == NET_DEVICE_LOSS ? "valve"
                                                   : NULL;
    if (!d)
        return "";
    static char buf[64];
    snprintf(buf, sizeof buf, "%s%s", d, states[g->state]);
    return buf;
}

static void link_cell(const Pdf *P, const NetworkResult *nr, const NetCols *c, size_t k, int i, char *buf,
                      size_t n)
{
    const LinkResult *g = &nr->links[k];
    switch (c->map[i]) {
    case LCOL_LINK: snprintf(buf, n, "%s", g->id); return;
    case LCOL_FROM: snprintf(buf, n, "%s", nr->nodes[g->from].id); return;
    case LCOL_TO: snprintf(buf, n, "%s", nr->nodes[g->to].id); return;
    case LCOL_DEVICE: snprintf(buf, n, "%s", device_word(g)); return;
    case LCOL_DPDEV:
        if (g->device == NET_DEVICE_NONE) {
            snprintf(buf, n, "—");
            return;
        }
        break;
    default: break;
    }
    number_cell(P, report_link_cell(g, c->map[i]), c, i, buf, n);
}

typedef struct NetLayout {
    double x[MAX_NET_COLS + 1];
    double size;
} NetLayout;

typedef void (*CellFn)(const Pdf *P, const NetworkResult *nr, const NetCols *c, size_t k, int i, char *buf, size_t n);

static NetLayout net_layout(Pdf *P, const NetCols *c, const NetworkResult *nr, size_t rows, CellFn cell, double W)
{
    NetLayout L;
    double nat[MAX_NET_COLS];
    for (int i = 0; i < c->n; i++) {
        char ut[48] = "";
        if (c->has_unit[i])
            mbox_unit_text(c->unit[i].text, ut, sizeof ut);
        double w = fmax(pdf_width(P, FONT_SANS, 6.4, ut), 18);
        for (size_t k = 0; k < rows; k++) {
            char buf[96];
            cell(P, nr, c, k, i, buf, sizeof buf);
            w = fmax(w, pdf_width(P, i == 0 ? FONT_SANS_BOLD : FONT_SERIF, NT_SIZE, buf));
        }
        nat[i] = w + 8;
    }
    L.size = pdf_columns_spread(nat, c->n, P->sheet.body_l, W, NT_SIZE, L.x);
    return L;
}

static double net_header(Pdf *P, const NetCols *c, const NetLayout *L, double top)
{
    const char *unit[MAX_NET_COLS];
    char ut[MAX_NET_COLS][48];
    for (int i = 0; i < c->n; i++) {
        unit[i] = NULL;
        if (c->has_unit[i]) {
            mbox_unit_text(c->unit[i].text, ut[i], sizeof ut[i]);
            unit[i] = ut[i];
        }
    }
    return pdf_column_header(P, c->n, L->x, c->word, c->symbol, unit, NT_WORD, top);
}

/* A chunk of rows of the node table (it->depth > 0) or the link table
 * (it->depth < 0); it->aux is the first row. */
static double fn_net_table(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const NetworkResult *nr = P->ev->results[st->index].made->network;
    bool nodes = it->depth > 0;
    size_t count = (size_t)(nodes ? it->depth : -it->depth);
    NetCols c = nodes ? report_node_columns(P->ev, st->network->has_fixtures) : report_link_columns(P->ev);
    CellFn cell = nodes ? node_cell : link_cell;
    size_t rows = nodes ? nr->nnodes : nr->nlinks;
    double W = nodes ? fmin(full_width(P), 330) : full_width(P);
    NetLayout L = net_layout(P, &c, nr, rows, cell, W);
    double y = top - net_header(P, &c, &L, top);
    double rh = L.size + 5;
    size_t first = (size_t)it->aux;
    for (size_t k = first; k < first + count && k < rows; k++) {
        for (int i = 0; i < c.n; i++) {
            char buf[96];
            cell(P, nr, &c, k, i, buf, sizeof buf);
            bool strong = nodes ? (c.map[i] == NCOL_P && k == nr->p_min_node && !nr->nodes[k].supply)
                                : (c.map[i] == LCOL_V && k == nr->V_max_link);
            FontRole f = i == 0 ? FONT_SANS_BOLD : strong ? FONT_SERIF_BOLD : c.text[i] ? FONT_SANS : FONT_SERIF;
            double w = pdf_width(P, f, L.size, buf);
            double x = c.text[i] ? L.x[i] + 4 : L.x[i + 1] - 4 - w;
            pdf_text(P, f, L.size, x, y - rh + 3.2, buf);
            if (i > 0)
                pdf_line(P, L.x[i], y, L.x[i], y - rh, 0.3);
        }
        if (nodes && nr->nodes[k].supply) {
            /* supplies are marked in the margin of the row */
            pdf_text_color(P, FONT_SANS, 6.4, L.x[c.n] + 4, y - rh + 3.4, "supply", GREY);
        } else if (nodes && k == nr->p_min_node) {
            pdf_text_color(P, FONT_SANS, 6.4, L.x[c.n] + 4, y - rh + 3.4, "lowest pressure", GREY);
        }
        y -= rh;
        if (P->page)
            draw_stroke_rgb(P->page, (Rgb){0.72, 0.72, 0.72});
        if (k + 1 < first + count && k + 1 < rows)
            pdf_line(P, L.x[0], y, L.x[c.n], y, 0.25);
        if (P->page)
            draw_stroke_rgb(P->page, INK);
    }
    pdf_line(P, L.x[0], y, L.x[c.n], y, 0.9);
    return top - y;
}

static double fn_net_head(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const NetworkSpec *ns = st->network;
    const StmtResult *r = &P->ev->results[st->index];
    const NetworkResult *nr = r->made->network;
    double x = P->sheet.body_l, w = full_width(P) - P->sheet.margin_w - 6, y = top - 1;
    y -= pdf_wrap(P, FONT_SERIF_BOLD, 9.6, 12, x, y, w, arena_printf(&P->arena, "Network: %s", st->name));
    StrBuf sb = {0};
    if (nr) {
        size_t supplies = 0;
        for (size_t i = 0; i < nr->nnodes; i++)
            supplies += nr->nodes[i].supply;
        sb_printf(&sb, "%zu nodes (%zu suppl%s), %zu links, %s head loss", nr->nnodes, supplies,
                  supplies == 1 ? "y" : "ies", nr->nlinks, nr->darcy ? "Darcy-Weisbach" : "Hazen-Williams");
        if (ns->friction)
            sb_printf(&sb, ", friction factor by the %s method", ns->friction);
        if (ns->fittings)
            sb_printf(&sb, ", fitting K by the %s method", ns->fittings);
        sb_puts(&sb, ". ");
    }
    sb_puts(&sb, "Fluid ");
    render_expr_text(P->ev, ns->fluid, false, &sb);
    sb_puts(&sb, ". Flows and heads solved together by the global gradient algorithm (Todini and Pilati 1988): "
                 "on every link the fall in head from its 'from' node to its 'to' node equals its friction and "
                 "fitting loss less any pump head, and at every junction inflow equals outflow plus demand. Heads are hydraulic grade z + p/(ρg); a "
                 "negative flow runs from the link's 'to' node to its 'from' node; a supply's demand is what it "
                 "delivers, shown negative.");
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x, y, w, sb_str(&sb)) + 3;
    sb_free(&sb);
    if (!nr)
        y -= pdf_wrap_color(P, FONT_SERIF_ITALIC, 9, 11.5, x, y, w, "(not evaluated)", FAIL);
    double mh = pdf_row_margin(P, st, top - 1);
    return fmax(top - y, mh + 2);
}

static double fn_net_summary(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const StmtResult *r = &P->ev->results[st->index];
    const NetworkResult *nr = r->made->network;
    double x = P->sheet.body_l, W = full_width(P), y = top - 2;
    Unit uQ = unit_default(DIM_FLOW, TEMP_NONE, P->ev->units), uP = unit_default(DIM_PRESSURE, TEMP_NONE, P->ev->units);
    Unit uV = unit_default(DIM_VELOCITY, TEMP_NONE, P->ev->units), uL = unit_default(DIM_L, TEMP_NONE, P->ev->units);
    char a[48], b[48], c[48], ut[4][32];
    mbox_unit_text(uP.text, ut[0], sizeof ut[0]);
    mbox_unit_text(uV.text, ut[1], sizeof ut[1]);
    mbox_unit_text(uQ.text, ut[2], sizeof ut[2]);
    mbox_unit_text(uL.text, ut[3], sizeof ut[3]);
    StrBuf sb = {0};
    num_typeset(unit_from_si(nr->p_min, &uP, true), P->env.digits, a, sizeof a);
    num_typeset(unit_from_si(nr->V_max, &uV, true), P->env.digits, b, sizeof b);
    sb_printf(&sb, "Lowest junction pressure %s %s at node %s (the critical node); highest velocity %s %s in link %s.",
              a, ut[0], nr->nodes[nr->p_min_node].id, b, ut[1], nr->links[nr->V_max_link].id);
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x + 4, y, W - 4, sb_str(&sb)) + 2;
    sb_free(&sb);
    num_typeset(unit_from_si(nr->imbalance, &uQ, true), 3, a, sizeof a);
    num_typeset(unit_from_si(nr->tolerance, &uQ, true), 3, b, sizeof b);
    num_typeset(unit_from_si(nr->energy_residual, &uL, true), 3, c, sizeof c);
    sb_printf(&sb, "Convergence: %d iterations; largest continuity error %s %s at node %s (tolerance %s %s); "
                   "largest energy residual on a link %s %s.",
              nr->iterations, a, ut[2], nr->nodes[nr->imbalance_node].id, b, ut[2], c, ut[3]);
    y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x + 4, y, W - 4, sb_str(&sb)) + 2;
    sb_free(&sb);
    /* the network's warnings (a link in the transition zone, a regulator not
     * regulating ...) beside its results, and counted on the cover */
    y -= pdf_warnings(P, r, x + 4, y, W - 4);
    if (st->network->has_fixtures) {
        /* the fixture schedule behind the node loads, and how they became demands */
        sb_puts(&sb, "Fixtures served at each node: ");
        bool any = false;
        for (size_t i = 0; i < nr->nnodes; i++) {
            const NetNode *nd = &st->network->nodes[i];
            const NodeResult *g = &nr->nodes[i];
            for (size_t f = 0; f < nd->nfixtures && g->has_load; f++) {
                char each[48], total[48];
                num_typeset(g->fixture_each[f], P->env.digits, each, sizeof each);
                num_typeset(g->fixture_total[f], P->env.digits, total, sizeof total);
                if (f == 0)
                    sb_printf(&sb, "%s%s: ", any ? "; " : "", g->id);
                else
                    sb_puts(&sb, ", ");
                sb_printf(&sb, "%d %s × %s = %s wsfu", nd->fixtures[f].count, nd->fixtures[f].kind, each, total);
                any = true;
            }
        }
        sb_printf(&sb, "%s. %s", any ? "" : "none", REPORT_NODE_DEMAND_NOTE);
        y -= pdf_wrap(P, FONT_SERIF, 9, 11.5, x + 4, y, W - 4, sb_str(&sb)) + 2;
        sb_free(&sb);
    }
    sb_puts(&sb, "Bold in the tables: the lowest junction pressure and the highest velocity.");
    char figs[96];
    pdf_figures_of(P, st->index, figs, sizeof figs);
    if (figs[0])
        sb_printf(&sb, " Drawn in %s.", figs);
    y -= pdf_wrap_color(P, FONT_SERIF, 8, 10, x, y - 1, W, sb_str(&sb), GREY) + 3;
    sb_free(&sb);
    for (size_t m = 0; m < r->nmethods; m++)
        for (size_t j = 0; j < P->ev->nmethods; j++)
            if (P->ev->methods[j] == r->methods[m] && P->method_first[j] == st->index)
                y -= pdf_method_line(P, r->methods[m], P->method_ref[j], x + 4, y, W - 4);
    return top - y + 3;
}

void pdf_network_items(Pdf *P, Vec *items, const Stmt *st)
{
    const StmtResult *r = &P->ev->results[st->index];
    item_add(items, P, fn_net_head, st, 0, 8);
    Item *head = items->items[items->len - 1];
    if (r->state != RES_OK || !r->made->network)
        return;
    head->layout.keep_with_next = true;
    const NetworkResult *nr = r->made->network;
    for (size_t k = 0; k < nr->nnodes; k += NET_CHUNK) {
        item_add(items, P, fn_net_table, st, (int)k, k ? 6 : 3);
        Item *it = items->items[items->len - 1];
        it->depth = (int)(nr->nnodes - k < NET_CHUNK ? nr->nnodes - k : NET_CHUNK);
    }
    for (size_t k = 0; k < nr->nlinks; k += NET_CHUNK) {
        item_add(items, P, fn_net_table, st, (int)k, 6);
        Item *it = items->items[items->len - 1];
        it->depth = -(int)(nr->nlinks - k < NET_CHUNK ? nr->nlinks - k : NET_CHUNK);
        it->layout.keep_with_next = k + NET_CHUNK >= nr->nlinks;
    }
    item_add(items, P, fn_net_summary, st, 0, 3);
    ((Item *)items->items[items->len - 1])->warnings = (int)r->nwarnings;
}

/* ---- the network figure --------------------------------------------------- */

/* Velocity shading: pale blue for the slowest link through deep blue to
 * red for the fastest. */
static Rgb speed_colour(double t)
{
    static const Rgb stops[3] = {{0.62, 0.76, 0.92}, {0.16, 0.32, 0.72}, {0.80, 0.14, 0.10}};
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    int k = t < 0.5 ? 0 : 1;
    double u = t < 0.5 ? t / 0.5 : (t - 0.5) / 0.5;
    Rgb a = stops[k], b = stops[k + 1];
    return (Rgb){a.r + (b.r - a.r) * u, a.g + (b.g - a.g) * u, a.b + (b.b - a.b) * u};
}

static void set_stroke(Pdf *P, Rgb c)
{
    if (P->page)
        draw_stroke_rgb(P->page, c);
}

static void set_fill(Pdf *P, Rgb c)
{
    if (P->page)
        draw_fill_rgb(P->page, c);
}

double pdf_network_figure(Pdf *P, const Stmt *st, const NetworkResult *nr, int number, const char *default_caption,
                          double top)
{
    const Sheet *s = &P->sheet;
    double x0 = s->body_l, W = s->body_r - s->body_l - s->margin_w;
    double xmin = INFINITY, xmax = -INFINITY, ymin = INFINITY, ymax = -INFINITY;
    for (size_t i = 0; i < nr->nnodes; i++) {
        xmin = fmin(xmin, nr->nodes[i].x);
        xmax = fmax(xmax, nr->nodes[i].x);
        ymin = fmin(ymin, nr->nodes[i].y);
        ymax = fmax(ymax, nr->nodes[i].y);
    }
    double sx = xmax - xmin, sy = ymax - ymin;
    if (!(sx > 0))
        sx = 1;
    if (!(sy > 0))
        sy = 1;
    /* one scale for both axes, so the plan is not distorted */
    double pad = 18, avail_w = W - 2 * pad, avail_h = fmin(0.62 * W, 300) - 2 * pad;
    double scale = fmin(avail_w / sx, avail_h / sy);
    double plot_w = sx * scale + 2 * pad, plot_h = sy * scale + 2 * pad;
    double pl = x0 + (W - plot_w) / 2, pt = top - 6, pb = pt - plot_h;
    double vmax = 0, vmin = INFINITY;
    for (size_t l = 0; l < nr->nlinks; l++) {
        vmax = fmax(vmax, fabs(nr->links[l].V));
        vmin = fmin(vmin, fabs(nr->links[l].V));
    }
    if (!(vmax > vmin))
        vmax = vmin + 1e-12;
    DrawPage *pg = P->page;
#define PX(v) (pl + pad + ((v) - xmin) * scale)
#define PY(v) (pb + pad + ((v) - ymin) * scale)
    if (pg) {
        pdf_rect(P, pl, pb, plot_w, plot_h, 0.5);
        /* links, then arrows, then nodes on top */
        for (size_t l = 0; l < nr->nlinks; l++) {
            const LinkResult *g = &nr->links[l];
            const NodeResult *a = &nr->nodes[g->from], *b = &nr->nodes[g->to];
            double ax = PX(a->x), ay = PY(a->y), bx = PX(b->x), by = PY(b->y);
            bool closed = g->state == 1;
            Rgb c = closed ? GREY : speed_colour((fabs(g->V) - vmin) / (vmax - vmin));
            set_stroke(P, c);
            if (closed)
                draw_dash(pg, (const unsigned short[]){3, 2}, 2, 0);
            pdf_line(P, ax, ay, bx, by, closed ? 0.8 : 2.2);
            if (closed)
                draw_dash(pg, NULL, 0, 0);
            double dx = bx - ax, dy = by - ay, len = sqrt(dx * dx + dy * dy);
            if (len > 14 && !closed && g->Q != 0) {
                double ux = dx / len * (g->Q > 0 ? 1 : -1), uy = dy / len * (g->Q > 0 ? 1 : -1);
                double mx = (ax + bx) / 2, my = (ay + by) / 2, h = 4.2, w = 2.6;
                set_fill(P, c);
                draw_move_to(pg, (mx + ux * h), (my + uy * h));
                draw_line_to(pg, (mx - ux * h - uy * w), (my - uy * h + ux * w));
                draw_line_to(pg, (mx - ux * h + uy * w), (my - uy * h - ux * w));
                draw_close(pg);
                draw_fill(pg);
                /* the link's id beside its middle */
                double tw = pdf_width(P, FONT_SANS, 5.6, g->id);
                pdf_text_color(P, FONT_SANS, 5.6, mx - uy * 7 - tw / 2, my + ux * 7 - 2, g->id, GREY);
            }
        }
        set_stroke(P, INK);
        set_fill(P, INK);
        for (size_t i = 0; i < nr->nnodes; i++) {
            const NodeResult *n = &nr->nodes[i];
            double cx = PX(n->x), cy = PY(n->y);
            if (n->supply) {
                set_fill(P, INK);
                draw_rect_path(pg, (cx - 3.4), (cy - 3.4), 6.8, 6.8);
                draw_fill(pg);
            } else {
                set_fill(P, (Rgb){1, 1, 1});
                draw_line_width(pg, 0.7);
                draw_circle_path(pg, cx, cy, 2.6);
                draw_fill_stroke(pg);
            }
            set_fill(P, INK);
            pdf_text_color(P, FONT_SANS_BOLD, 6, cx + 4.5, cy + 3.5, n->id, INK);
        }
        /* the critical node */
        const NodeResult *c = &nr->nodes[nr->p_min_node];
        set_stroke(P, FAIL);
        draw_line_width(pg, 1.2);
        draw_circle_path(pg, PX(c->x), PY(c->y), 6.0);
        draw_stroke(pg);
        set_stroke(P, INK);
        set_fill(P, INK);
        draw_line_width(pg, 1);
    }
#undef PX
#undef PY
    /* legend: the velocity scale, the symbols */
    double y = pb - 8;
    Unit uV = unit_default(DIM_VELOCITY, TEMP_NONE, P->ev->units), uP = unit_default(DIM_PRESSURE, TEMP_NONE, P->ev->units);
    char a[48], b[48], ut[32], up[32];
    num_typeset(unit_from_si(vmin, &uV, true), 3, a, sizeof a);
    num_typeset(unit_from_si(vmax, &uV, true), 3, b, sizeof b);
    mbox_unit_text(uV.text, ut, sizeof ut);
    mbox_unit_text(uP.text, up, sizeof up);
    double lx = x0 + 4;
    char *lead = arena_printf(&P->arena, "velocity  %s %s", a, ut);
    pdf_text_color(P, FONT_SANS, 6.8, lx, y - 7, lead, INK);
    lx += pdf_width(P, FONT_SANS, 6.8, lead) + 4;
    for (int k = 0; k < 24 && pg; k++) {
        set_fill(P, speed_colour(k / 23.0));
        draw_rect_path(pg, (lx + k * 3), (y - 8), 3.1, 6);
        draw_fill(pg);
    }
    set_fill(P, INK);
    lx += 24 * 3 + 4;
    char *tail = arena_printf(&P->arena, "%s %s;  ■ supply,  ○ junction,  arrow: direction of flow", b, ut);
    pdf_text_color(P, FONT_SANS, 6.8, lx, y - 7, tail, INK);
    y -= 12;
    const NodeResult *c = &nr->nodes[nr->p_min_node];
    num_typeset(unit_from_si(c->p, &uP, true), P->env.digits, a, sizeof a);
    char *crit = arena_printf(&P->arena, "Red ring: the critical node %s, lowest junction pressure %s %s.", c->id, a, up);
    pdf_text_color(P, FONT_SANS, 6.8, x0 + 4, y - 7, crit, FAIL);
    y -= 14;
    char *num = arena_printf(&P->arena, "Figure %d", number);
    const char *cap = st->description && *st->description ? st->description : default_caption;
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

/* ---- the cover: each network's critical node --------------------------- */

/* Does the expression read NAME.p_min of the network? */
static bool reads_p_min(const Expr *e, const char *name)
{
    if (!e)
        return false;
    if (e->kind == EXPR_FIELD && e->text && strcmp(e->text, "p_min") == 0 && e->lhs && e->lhs->kind == EXPR_NAME &&
        strcmp(e->lhs->text, name) == 0)
        return true;
    if (reads_p_min(e->lhs, name) || reads_p_min(expr_rhs(e), name))
        return true;
    for (size_t i = 0; i < e->call->nargs; i++)
        if (reads_p_min(e->call->args[i], name))
            return true;
    return false;
}

static double fn_network_cover(Pdf *P, const Item *it, double top)
{
    const Stmt *st = it->p;
    const NetworkResult *nr = P->ev->results[st->index].made->network;
    const NodeResult *c = &nr->nodes[nr->p_min_node];
    double x = P->sheet.body_l, W = full_width(P);
    Unit uP = unit_default(DIM_PRESSURE, TEMP_NONE, P->ev->units);
    char v[48], ut[32];
    num_typeset(unit_from_si(c->p, &uP, true), P->env.digits, v, sizeof v);
    mbox_unit_text(uP.text, ut, sizeof ut);
    StrBuf sb = {0};
    sb_printf(&sb, "Network %s: the critical node is %s, lowest junction pressure %s %s", st->name, c->id, v, ut);
    bool any = false, fails = false;
    for (size_t i = 0; i < P->d->nstmts; i++) {
        const Stmt *k = P->d->stmts[i];
        if (k->kind != STMT_CHECK || k->parse_failed || !(reads_p_min(k->lhs, st->name) || reads_p_min(k->rhs, st->name)))
            continue;
        const StmtResult *r = &P->ev->results[i];
        if (r->state != RES_OK)
            continue;
        sb_printf(&sb, "%s check %s %s", any ? ";" : " —", k->label, r->holds ? "holds" : "FAILS");
        if (isfinite(r->utilization))
            sb_printf(&sb, " (utilisation %.0f %%)", r->utilization * 100);
        fails = fails || !r->holds;
        any = true;
    }
    if (!any)
        sb_puts(&sb, " — no check reads its p_min");
    sb_printf(&sb, ". Solved in %d iterations.", nr->iterations);
    const char *tag = fails ? "FAILS" : any ? "HOLDS" : "NOTE";
    double tw = pdf_width(P, FONT_SANS_BOLD, 7.5, "FAILS") + 10;
    double h = pdf_wrap_color(P, FONT_SERIF, 8.5, 10.5, x + tw, top - 3, W - tw, sb_str(&sb), fails ? FAIL : INK);
    pdf_text_color(P, FONT_SANS_BOLD, 7.5, x + 3, top - 3 - 8.5 * 0.85, tag, fails ? FAIL : any ? PASS : GREY);
    sb_free(&sb);
    h += 6;
    pdf_line(P, x, top - h, x + W, top - h, 0.3);
    return h;
}

void pdf_network_cover_items(Pdf *P, Vec *items)
{
    for (size_t i = 0; i < P->d->nstmts; i++) {
        const Stmt *st = P->d->stmts[i];
        if (st->kind == STMT_NETWORK && P->ev->results[i].state == RES_OK && P->ev->results[i].made->network &&
            P->ev->results[i].made->network->nnodes > 0)
            item_add(items, P, fn_network_cover, st, 0, 0);
    }
}
