/* text.c — the plain text listing (`build --format text`).
 *
 * One line per statement, stable and diffable, so `git diff` of the listing
 * shows what changed in meaning:
 *   V = Q/A = (96 gal/min)/(0.05130 ft^2) = 4.160 ft/s   # velocity [key]
 * Headings give the structure; prose paragraphs are left to the PDF. The
 * linear expression printer here is shared with the other renderers' plain
 * texts (check summaries, diagnostics of the diff). */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"
#include "render.h"
#include "report_model.h"
#include "package.h"
#include "uses.h"

void render_quantity(const Evaluated *ev, const Value *v, const Unit *unit, char *buf, size_t n)
{
    char num[64];
    bool diff = v->q.temp == TEMP_NONE;
    double x = unit_from_si(v->q.si, unit, diff);
    num_sig(x, ev->digits, num, sizeof num);
    if (!n)
        return;
    /* "number unit", or the number alone; cut to fit as snprintf would */
    size_t at = strlen(num);
    if (at >= n)
        at = n - 1;
    memcpy(buf, num, at);
    if (strcmp(unit->text, "1") != 0 && unit->text[0] != '\0' && at + 1 < n) {
        buf[at++] = ' ';
        size_t u = strlen(unit->text);
        if (u > n - 1 - at)
            u = n - 1 - at;
        memcpy(buf + at, unit->text, u);
        at += u;
    }
    buf[at] = '\0';
}

void render_atmosphere(const Evaluated *ev, char *buf, size_t n)
{
    const Meta *m = &ev->doc->meta;
    Value v = value_number(qty(ev->atmosphere, DIM_PRESSURE));
    v.q.pref = PRES_ABSOLUTE;
    Unit u = eval_display_unit(ev, &v, NULL);
    char val[80];
    render_quantity(ev, &v, &u, val, sizeof val);
    switch (m->atm_source) {
    case ATM_GIVEN:
        snprintf(buf, n, "%s, as given in the front matter (%s)", val, m->atmosphere_text ? m->atmosphere_text : "");
        break;
    case ATM_ELEVATION:
        snprintf(buf, n, "%s, the standard atmosphere at elevation %s", val, m->elevation_text ? m->elevation_text : "");
        break;
    case ATM_STANDARD:
        snprintf(buf, n, "%s, the standard atmosphere (101.325 kPa)", val);
        break;
    }
}

/* ---- the linear printer ------------------------------------------------
 *
 * Expressions and values are written into a TextOut: a buffer on the stack
 * while the text fits, grown on the heap when it does not, with the
 * printer's state beside it (the statement being listed, the call whose
 * values a method's formula shows), so two threads can print at once. The
 * public functions hand the finished text on in one piece, to a StrBuf or
 * as a copy in an arena. */

typedef struct TextOut {
    char *data;                       /* local, or the heap once grown */
    size_t len, cap;
    const StmtResult *row;            /* a solve row substitutes its root values; NULL */
    const MethodUse *method_values;   /* printing a method's formula with one call's values */
    ValueTexts *memo;                 /* the statements' value texts, or NULL */
    char local[256];
} TextOut;

static void text_init(TextOut *t, const StmtResult *row, const MethodUse *use)
{
    t->data = t->local;
    t->len = 0;
    t->cap = sizeof t->local;
    t->row = row;
    t->method_values = use;
    t->memo = NULL;
}

static void text_grow(TextOut *t, size_t n)
{
    size_t cap = 2 * t->cap;
    while (cap < t->len + n)
        cap *= 2;
    if (t->data == t->local) {
        t->data = xmalloc(cap);
        memcpy(t->data, t->local, t->len);
    } else {
        t->data = xrealloc(t->data, cap);
    }
    t->cap = cap;
}

static inline void text_put(TextOut *t, const char *s, size_t n)
{
    if (t->len + n > t->cap)
        text_grow(t, n);
    memcpy(t->data + t->len, s, n);
    t->len += n;
}

/* NULL as printf's %s writes it, as this printer once did */
static inline void text_puts(TextOut *t, const char *s)
{
    if (!s)
        s = "(null)";
    text_put(t, s, strlen(s));
}
static inline void text_putc(TextOut *t, char c) { text_put(t, &c, 1); }

static void text_free(TextOut *t)
{
    if (t->data != t->local)
        free(t->data);
}

static void text_to_sb(TextOut *t, StrBuf *out)
{
    sb_putn(out, t->data, t->len);
    text_free(t);
}

static const char *text_to_arena(TextOut *t, Arena *a)
{
    char *s = arena_strndup(a, t->data, t->len);
    text_free(t);
    return s;
}

static void value_text(const Evaluated *ev, const Value *v, const Unit *shown, TextOut *out)
{
    char buf[128];
    switch (v->kind) {
    case VAL_NUMBER: {
        /* render_quantity's text, never cut in 128 bytes (a number of at
         * most 63, a unit of at most 47) */
        Unit made;
        const Unit *u = shown;
        if (!u || !u->text[0]) {
            made = eval_display_unit(ev, v, NULL);
            u = &made;
        }
        render_quantity(ev, v, u, buf, sizeof buf);
        text_puts(out, buf);
        break;
    }
    case VAL_STRING:
        text_putc(out, '"');
        text_puts(out, v->str);
        text_putc(out, '"');
        break;
    case VAL_RECORD:
        text_putc(out, '(');
        text_puts(out, v->rec->type);
        text_puts(out, " record)");
        break;
    default:
        text_putc(out, '?');
        break;
    }
}

void render_value_text(const Evaluated *ev, const Value *v, const Unit *shown, StrBuf *out)
{
    TextOut t;
    text_init(&t, NULL, NULL);
    value_text(ev, v, shown, &t);
    text_to_sb(&t, out);
}

const char *render_value_string(const Evaluated *ev, const Value *v, const Unit *shown, Arena *a)
{
    TextOut t;
    text_init(&t, NULL, NULL);
    value_text(ev, v, shown, &t);
    return text_to_arena(&t, a);
}

/* Binding strengths, spaced so the right operand of '-' and '/' can bind a
 * little tighter than the left (a - (b - c), a/(b*c)). */
enum { PREC_TOP = 0, PREC_ADD = 10, PREC_MUL = 20, PREC_NEG = 30, PREC_POW = 40, PREC_ATOM = 50 };

static int precedence(const Expr *e)
{
    switch (e->kind) {
    case EXPR_BINARY:
        return e->op == OP_ADD || e->op == OP_SUB ? PREC_ADD : e->op == OP_POW ? PREC_POW : PREC_MUL;
    case EXPR_NEG:
        return PREC_NEG;
    default:
        return PREC_ATOM;
    }
}

/* Does a substituted value need parentheses where it stands? A value with a
 * unit does inside a product or power (so the unit is not read as part of
 * the next factor); a negative value does anywhere but at the top. */
static bool value_needs_parens(const Value *v, const Unit *u, int parent_prec)
{
    if (v->kind != VAL_NUMBER || parent_prec == PREC_TOP)
        return false;
    if (v->q.si < 0)
        return true;
    bool has_unit = u && u->text[0] && strcmp(u->text, "1") != 0;
    return has_unit && parent_prec >= PREC_MUL;
}

static void put_value(const Evaluated *ev, const Value *v, const Unit *u, int parent_prec, TextOut *out)
{
    bool paren = value_needs_parens(v, u, parent_prec);
    if (paren)
        text_putc(out, '(');
    value_text(ev, v, u, out);
    if (paren)
        text_putc(out, ')');
}

/* Statement `slot`'s own value (v, shown in u) where a formula names it:
 * its text from the memo, made there the first time. */
static void put_slot_value(const Evaluated *ev, int slot, const Value *v, const Unit *u, int parent_prec,
                           TextOut *out)
{
    const char **text = &out->memo->texts[slot];
    if (!*text) {
        TextOut t;
        text_init(&t, NULL, NULL);
        value_text(ev, v, u, &t);
        *text = text_to_arena(&t, out->memo->arena);
    }
    bool paren = value_needs_parens(v, u, parent_prec);
    if (paren)
        text_putc(out, '(');
    text_puts(out, *text);
    if (paren)
        text_putc(out, ')');
}

/* A symbol of a method's formula as the call's value (render_method_text). */
static const Value *method_value(const MethodUse *use, const char *name)
{
    for (size_t i = 0; use && i < use->ninputs; i++)
        if (strcmp(use->inputs[i].name, name) == 0)
            return &use->inputs[i].value;
    return NULL;
}

static void put_expr(const Evaluated *ev, const Expr *e, bool sub, TextOut *out, int parent_prec)
{
    switch (e->kind) {
    case EXPR_NUMBER:
        if (e->has_unit && sub && parent_prec >= PREC_MUL) {
            text_putc(out, '(');
            text_puts(out, e->text);
            text_putc(out, ')');
        } else {
            text_puts(out, e->text);
        }
        break;
    case EXPR_STRING:
        text_putc(out, '"');
        text_puts(out, e->text);
        text_putc(out, '"');
        break;
    case EXPR_NAME: {
        Unit shown;
        Value cv;
        const Value *v = sub ? eval_read(ev, out->row, e->slot, &shown) : NULL;
        if (sub && out->method_values && e->slot == SLOT_UNRESOLVED) {
            /* a method's formula: its symbols are the call's values */
            v = method_value(out->method_values, e->text);
            if (v && v->kind == VAL_NUMBER)
                shown = eval_display_unit(ev, v, NULL);
            if (!v && strcmp(e->text, "g") == 0 && eval_constant(SLOT_G, &cv)) {
                v = &cv;
                shown = eval_display_unit(ev, v, NULL);
            }
        }
        if (v && v->kind == VAL_NUMBER && out->memo && !out->row && !out->method_values) {
            put_slot_value(ev, e->slot, v, &shown, parent_prec, out); /* eval_read: the slot's own value */
        } else if (v && v->kind == VAL_NUMBER) {
            put_value(ev, v, &shown, parent_prec, out);
        } else if (sub && e->slot != SLOT_PI && eval_constant(e->slot, &cv)) {
            Unit u = eval_display_unit(ev, &cv, NULL);
            put_value(ev, &cv, &u, parent_prec, out);
        } else {
            text_puts(out, e->text);
        }
        break;
    }
    case EXPR_PAREN:
        text_putc(out, '(');
        put_expr(ev, e->lhs, sub, out, PREC_TOP);
        text_putc(out, ')');
        break;
    case EXPR_NEG:
        text_putc(out, '-');
        put_expr(ev, e->lhs, sub, out, PREC_NEG);
        break;
    case EXPR_BINARY: {
        int p = precedence(e);
        bool wrap = p < parent_prec;
        if (wrap)
            text_putc(out, '(');
        put_expr(ev, e->lhs, sub, out, e->op == OP_POW ? PREC_ATOM : p);
        switch (e->op) {
        case OP_ADD: text_put(out, " + ", 3); break;
        case OP_SUB: text_put(out, " - ", 3); break;
        case OP_MUL:
            if (e->middle_dot)
                text_puts(out, "·");
            else
                text_putc(out, '*');
            break;
        case OP_DIV: text_putc(out, '/'); break;
        case OP_POW: text_putc(out, '^'); break;
        }
        put_expr(ev, e->rhs, sub, out, e->op == OP_POW ? PREC_NEG : p + (e->op == OP_SUB || e->op == OP_DIV));
        if (wrap)
            text_putc(out, ')');
        break;
    }
    case EXPR_FIELD:
        if (sub) {
            /* Substitute the field's value (basis.p_city, basis.w.rho); a
             * solve row reads its record at the root. */
            Unit u;
            const Value *f = eval_named_value_at(ev, out->row, e, &u);
            if (f && f->kind == VAL_NUMBER) {
                put_value(ev, f, &u, parent_prec, out);
                break;
            }
        }
        put_expr(ev, e->lhs, false, out, PREC_ATOM);
        text_putc(out, '.');
        text_puts(out, e->text);
        break;
    case EXPR_CALL:
        text_puts(out, e->text);
        text_putc(out, '(');
        for (size_t i = 0; i < e->call->nargs; i++) {
            if (i)
                text_put(out, ", ", 2);
            put_expr(ev, e->call->args[i], sub, out, PREC_TOP);
        }
        for (size_t i = 0; i < e->call->nkw; i++) {
            if (i || e->call->nargs)
                text_put(out, ", ", 2);
            text_puts(out, e->call->kw_names[i]);
            text_putc(out, '=');
            put_expr(ev, e->call->kw[i], sub, out, PREC_TOP);
        }
        text_putc(out, ')');
        break;
    }
}

void render_expr_text(const Evaluated *ev, const Expr *e, bool substitute, StrBuf *out)
{
    render_expr_text_at(ev, NULL, e, substitute, out);
}

void render_method_text(const Evaluated *ev, const MethodUse *use, const Expr *e, StrBuf *out)
{
    TextOut t;
    text_init(&t, NULL, use);
    put_expr(ev, e, true, &t, PREC_TOP);
    text_to_sb(&t, out);
}

const char *render_method_string(const Evaluated *ev, const MethodUse *use, const Expr *e, Arena *a)
{
    TextOut t;
    text_init(&t, NULL, use);
    put_expr(ev, e, true, &t, PREC_TOP);
    return text_to_arena(&t, a);
}

void render_expr_text_at(const Evaluated *ev, const StmtResult *row, const Expr *e, bool substitute,
                         StrBuf *out)
{
    TextOut t;
    text_init(&t, row, NULL);
    put_expr(ev, e, substitute, &t, PREC_TOP);
    text_to_sb(&t, out);
}

const char *render_expr_string(const Evaluated *ev, const StmtResult *row, const Expr *e, bool substitute,
                               ValueTexts *memo, Arena *a)
{
    TextOut t;
    text_init(&t, row, NULL);
    t.memo = memo;
    put_expr(ev, e, substitute, &t, PREC_TOP);
    return text_to_arena(&t, a);
}

static void put_comment(const Stmt *s, StrBuf *out)
{
    if (!s->description && !s->ncites)
        return;
    sb_puts(out, "   #");
    if (s->description)
        sb_printf(out, " %s", s->description);
    for (size_t i = 0; i < s->ncites; i++)
        sb_printf(out, " [%s]", s->cites[i].key);
}

static void put_methods(const StmtResult *r, StrBuf *out)
{
    for (size_t k = 0; k < r->nmethods; k++)
        sb_printf(out, "\n      method: %s%s%s", r->methods[k]->title,
                  r->methods[k]->formula ? ": " : "", r->methods[k]->formula ? r->methods[k]->formula : "");
}

/* How the row's calls applied their methods: the variant taken, and the
 * formula with the values used, "lhs = formula = values = result". */
static void put_uses(const ModelRow *mr, StrBuf *out)
{
    for (size_t k = 0; k < mr->nuses; k++) {
        const ModelUse *u = &mr->uses[k];
        if (u->branch)
            sb_printf(out, "\n      branch: %s", u->branch);
        if (u->substituted) {
            sb_printf(out, "\n      with the values used: %s = %s = %s", u->lhs, u->formula, u->substituted);
            if (u->result.number)
                sb_printf(out, " = %s", u->result.text);
        }
    }
}

/* A number in a unit, for table cells: just the digits. */
static void put_cell(const Evaluated *ev, double si, const Unit *u, bool difference, StrBuf *out)
{
    char num[48];
    num_sig(unit_from_si(si, u, difference), ev->digits, num, sizeof num);
    sb_printf(out, " %10s", num);
}

/* The segment table of a path, one row per segment, in display units. */
static void put_path(const Evaluated *ev, const Stmt *s, const StmtResult *r, StrBuf *out)
{
    sb_printf(out, "path %s", s->name);
    if (r->state != RES_OK || !r->made->path) {
        sb_puts(out, " = (not evaluated)\n");
        return;
    }
    const PathResult *pr = r->made->path;
    Unit one = unit_default(DIM_NONE, TEMP_NONE, ev->units);
    sb_printf(out, ": %zu segments, %s loss\n", pr->nsegs,
              s->path->loss == LOSS_DARCY ? "Darcy-Weisbach" : "Hazen-Williams");
    /* the columns are the report model's, as the PDF's segment table has them */
    PathColumns c = report_path_columns(ev, pr);
    bool dev = pr->ndevices > 0;
    bool load = pr->nsegs && pr->segs[0].has_load;
    sb_printf(out, "  %-10s", c.key[0]);
    for (int i = 1; i < c.n; i++)
        sb_printf(out, " %10s", c.key[i]);
    sb_puts(out, dev ? "  device\n" : "\n");
    sb_printf(out, "  %-10s", "");
    for (int i = 1; i < c.n; i++)
        sb_printf(out, " %10s", c.map[i] == PCOL_LOAD ? "wsfu" : c.has_unit[i] ? c.unit[i].text : "");
    sb_putc(out, '\n');
    for (size_t k = 0; k < pr->nsegs; k++) {
        const SegmentResult *g = &pr->segs[k];
        sb_printf(out, "  %-10s", g->id);
        for (int i = 1; i < c.n; i++) {
            double x = report_path_cell(g, c.map[i]);
            if (isfinite(x))
                put_cell(ev, x, &c.unit[i], true, out);
            else
                sb_printf(out, " %10s", "-");
        }
        if (g->has_device)
            sb_printf(out, "  %s", g->device);
        sb_putc(out, '\n');
    }
    if (load) {
        /* the fixture schedule behind the loads: kind, count, load each, total */
        sb_puts(out, "  fixtures taken off at each outlet (load each and total in wsfu):\n");
        for (size_t i = 0; i < pr->nsegs; i++) {
            const PathSegment *sp = &s->path->segs[i];
            for (size_t k = 0; k < sp->nfixtures; k++) {
                sb_printf(out, "    %-10s %5d %-32s x", pr->segs[i].id, sp->fixtures[k].count, sp->fixtures[k].kind);
                put_cell(ev, pr->segs[i].fixture_each[k], &one, true, out);
                sb_puts(out, " =");
                put_cell(ev, pr->segs[i].fixture_total[k], &one, true, out);
                sb_putc(out, '\n');
            }
        }
    }
    const Record *rec = r->value.rec;
    static const char *const summary[] = {"p_end", "p_min", "p_min_at", "V_max", "loss"};
    for (size_t k = 0; k < sizeof summary / sizeof summary[0]; k++) {
        const Value *v = record_get(rec, summary[k]);
        if (!v)
            continue;
        sb_printf(out, "  %s.%s = ", s->name, summary[k]);
        Unit u = v->kind == VAL_NUMBER ? eval_display_unit(ev, v, NULL) : (Unit){0};
        render_value_text(ev, v, &u, out);
        sb_putc(out, '\n');
    }
    for (size_t k = 0; k < r->nmethods; k++)
        sb_printf(out, "      method: %s\n", r->methods[k]->title);
}

/* A network: its node table, its link table and the convergence record,
 * in display units. */
static void put_network(const Evaluated *ev, const Stmt *s, const StmtResult *r, StrBuf *out)
{
    sb_printf(out, "network %s", s->name);
    if (r->state != RES_OK || !r->made->network) {
        sb_puts(out, " = (not evaluated)\n");
        return;
    }
    const NetworkResult *nr = r->made->network;
    Unit uL = unit_default(DIM_L, TEMP_NONE, ev->units), one = unit_default(DIM_NONE, TEMP_NONE, ev->units);
    sb_printf(out, ": %zu nodes, %zu links, %s loss, global gradient algorithm (Todini and Pilati 1988)\n",
              nr->nnodes, nr->nlinks, nr->darcy ? "Darcy-Weisbach" : "Hazen-Williams");
    /* the columns are the report model's, as the PDF's node and link tables
     * have them; a load column where the demands come from the nodes'
     * fixtures (demand:) */
    bool load = s->network->has_fixtures;
    NetColumns c = report_node_columns(ev, load);
    for (int row = 0; row < 2; row++) {
        sb_printf(out, "  %-10s", row ? "" : c.key[0]);
        for (int i = 1; i < c.n; i++)
            sb_printf(out, " %10s", !row ? c.key[i] : c.map[i] == NCOL_LOAD ? "wsfu" : c.has_unit[i] ? c.unit[i].text : "");
        sb_putc(out, '\n');
    }
    for (size_t k = 0; k < nr->nnodes; k++) {
        const NodeResult *n = &nr->nodes[k];
        sb_printf(out, "  %-10s", n->id);
        for (int i = 1; i < c.n; i++) {
            double x = report_node_cell(n, c.map[i]);
            if (isfinite(x))
                put_cell(ev, x, &c.unit[i], true, out);
            else
                sb_printf(out, " %10s", "-");
        }
        sb_puts(out, n->supply ? "  supply\n" : k == nr->p_min_node ? "  lowest pressure\n" : "\n");
    }
    if (load) {
        /* the fixture schedule behind the loads: kind, count, load each, total */
        sb_puts(out, "  fixtures served at each node (load each and total in wsfu):\n");
        bool any = false;
        for (size_t i = 0; i < nr->nnodes; i++) {
            const NetNode *nd = &s->network->nodes[i];
            for (size_t k = 0; k < nd->nfixtures && nr->nodes[i].has_load; k++) {
                sb_printf(out, "    %-10s %5d %-32s x", nr->nodes[i].id, nd->fixtures[k].count, nd->fixtures[k].kind);
                put_cell(ev, nr->nodes[i].fixture_each[k], &one, true, out);
                sb_puts(out, " =");
                put_cell(ev, nr->nodes[i].fixture_total[k], &one, true, out);
                sb_putc(out, '\n');
                any = true;
            }
        }
        if (!any)
            sb_puts(out, "    none\n");
        sb_printf(out, "  %s\n", REPORT_NODE_DEMAND_NOTE);
    }
    static const char *const states[] = {"", "closed", "regulating", "wide open"};
    NetColumns lc = report_link_columns(ev);
    for (int row = 0; row < 2; row++) {
        sb_printf(out, "  %-10s", row ? "" : lc.key[0]);
        for (int i = 1; i < lc.n; i++) {
            const char *h = !row ? lc.key[i] : lc.has_unit[i] ? lc.unit[i].text : "";
            if (lc.map[i] == LCOL_DEVICE)
                continue; /* the device is written after the numbers, where there is one */
            sb_printf(out, lc.text[i] ? " %-8s" : " %10s", h);
        }
        sb_putc(out, '\n');
    }
    for (size_t l = 0; l < nr->nlinks; l++) {
        const LinkResult *g = &nr->links[l];
        sb_printf(out, "  %-10s %-8s %-8s", g->id, nr->nodes[g->from].id, nr->nodes[g->to].id);
        for (int i = 3; i < lc.n; i++) {
            if (lc.map[i] == LCOL_DEVICE)
                continue;
            double x = report_link_cell(g, lc.map[i]);
            if (isfinite(x))
                put_cell(ev, x, &lc.unit[i], true, out);
            else
                sb_printf(out, " %10s", "-");
        }
        const char *dev = g->device == NET_DEVICE_CHECK ? "check valve"
                          : g->device == NET_DEVICE_PUMP ? "pump"
                          : g->device == NET_DEVICE_PRV  ? "PRV"
                          : g->device == NET_DEVICE_LOSS ? "valve"
                                                         : "";
        if (dev[0])
            sb_printf(out, "  %s%s%s", dev, states[g->state][0] ? " " : "", states[g->state]);
        sb_putc(out, '\n');
    }
    const Record *rec = r->value.rec;
    static const char *const summary[] = {"p_min", "p_min_at", "V_max", "V_max_at", "iterations", "imbalance", "tolerance"};
    for (size_t k = 0; k < sizeof summary / sizeof summary[0]; k++) {
        const Value *v = record_get(rec, summary[k]);
        if (!v)
            continue;
        sb_printf(out, "  %s.%s = ", s->name, summary[k]);
        if (strcmp(summary[k], "iterations") == 0) {
            sb_printf(out, "%d\n", nr->iterations); /* a count, not a measured number */
            continue;
        }
        Unit u = v->kind == VAL_NUMBER ? eval_display_unit(ev, v, NULL) : (Unit){0};
        render_value_text(ev, v, &u, out);
        sb_putc(out, '\n');
    }
    sb_printf(out, "  convergence: %d iterations, largest continuity error at node %s, largest energy residual ",
              nr->iterations, nr->nodes[nr->imbalance_node].id);
    Value er = value_number(qty(nr->energy_residual, DIM_L));
    render_value_text(ev, &er, &uL, out);
    sb_putc(out, '\n');
    for (size_t k = 0; k < r->nmethods; k++)
        sb_printf(out, "      method: %s\n", r->methods[k]->title);
}

/* A table a statement laid out (a curve's points, select_pipe's
 * candidates): a heading line, the column heads and units, a row a line. */
static void put_table(const Evaluated *ev, const ResultTable *t, StrBuf *out)
{
    sb_printf(out, "  %s\n ", t->title);
    int w[16];
    for (size_t k = 0; k < t->ncols && k < 16; k++) {
        size_t n = strlen(t->heads[k]);
        for (size_t r = 0; r < t->nrows; r++) {
            const Value *v = &t->cells[r * t->ncols + k];
            if (v->kind == VAL_STRING && strlen(v->str) > n)
                n = strlen(v->str);
        }
        w[k] = n > 12 ? (int)n : 12;
    }
    for (size_t k = 0; k < t->ncols && k < 16; k++)
        sb_printf(out, " %*s", w[k], t->heads[k]);
    sb_puts(out, "\n ");
    for (size_t k = 0; k < t->ncols && k < 16; k++)
        sb_printf(out, " %*s", w[k], strcmp(t->units[k].text, "1") == 0 ? "" : t->units[k].text);
    sb_putc(out, '\n');
    for (size_t r = 0; r < t->nrows; r++) {
        sb_putc(out, ' ');
        for (size_t k = 0; k < t->ncols && k < 16; k++) {
            const Value *v = &t->cells[r * t->ncols + k];
            char num[48] = "";
            if (v->kind == VAL_NUMBER)
                num_sig(unit_from_si(v->q.si, &t->units[k], v->q.temp == TEMP_NONE), ev->digits, num, sizeof num);
            sb_printf(out, " %*s", w[k], v->kind == VAL_STRING ? v->str : num);
        }
        sb_putc(out, '\n');
    }
}

static void put_curve(const Evaluated *ev, const Stmt *s, const StmtResult *r, StrBuf *out)
{
    sb_printf(out, "curve %s", s->name);
    if (r->state != RES_OK || !r->made->table) {
        sb_puts(out, " = (not evaluated)\n");
        return;
    }
    sb_printf(out, ": %zu points, %s interpolation\n", s->curve->npoints, s->curve->loglog ? "log-log" : "linear");
    put_table(ev, r->made->table, out);
    for (size_t k = 0; k < r->nmethods; k++)
        sb_printf(out, "      method: %s\n", r->methods[k]->title);
}

/* A figure in the listing is its data, a small table per series. */
static void put_figure(const Evaluated *ev, const Stmt *s, const StmtResult *r, StrBuf *out)
{
    sb_printf(out, "figure %s", s->fig->kind);
    if (s->description)
        sb_printf(out, ": %s", s->description);
    if (r->state != RES_OK || !r->made->figure) {
        sb_puts(out, " (not evaluated)\n");
        return;
    }
    const FigureData *fd = r->made->figure;
    bool xd = fd->x_unit.text[0] && strcmp(fd->x_unit.text, "1") != 0;
    bool yd = fd->y_unit.text[0] && strcmp(fd->y_unit.text, "1") != 0;
    sb_printf(out, "\n  x: %s%s%s%s, y: %s%s%s%s%s\n", fd->x_title, xd ? " (" : "", xd ? fd->x_unit.text : "", xd ? ")" : "",
              fd->y_title, yd ? " (" : "", yd ? fd->y_unit.text : "", yd ? ")" : "",
              fd->log_x ? ", log axes" : "");
    for (size_t k = 0; k < fd->nseries; k++) {
        const Series *se = &fd->series[k];
        sb_printf(out, "  series %s:", se->name);
        size_t step = se->n > 12 ? (se->n + 11) / 12 : 1; /* a sample, not every point */
        for (size_t i = 0; i < se->n; i += step) {
            char x[40], y[40];
            num_sig(unit_from_si(se->x[i], &fd->x_unit, true), 4, x, sizeof x);
            num_sig(unit_from_si(se->y[i], &fd->y_unit, true), 4, y, sizeof y);
            sb_printf(out, " (%s, %s)", x, y);
        }
        sb_putc(out, '\n');
    }
    for (size_t k = 0; k < fd->nmarkers; k++) {
        char x[40], y[40];
        num_sig(unit_from_si(fd->markers[k].x, &fd->x_unit, true), ev->digits, x, sizeof x);
        num_sig(unit_from_si(fd->markers[k].y, &fd->y_unit, true), ev->digits, y, sizeof y);
        const char *label = fd->markers[k].label ? fd->markers[k].label : "";
        sb_printf(out, "  point%s%s: (%s, %s)\n", label[0] ? " " : "", label, x, y);
    }
}

static void put_cases(const Evaluated *ev, size_t which, StrBuf *out)
{
    const CaseResult *cr = &ev->cases[which];
    const CaseTable *ct = ev->doc->cases[which];
    if (!cr->table) {
        sb_puts(out, "cases: (not evaluated)\n");
        return;
    }
    sb_printf(out, "cases: %zu rows, %zu with a failing check\n", ct->nrows, cr->rows_failing);
    for (size_t r = 0; r < ct->nrows; r++) {
        const CaseRow *row = &cr->rows[r];
        sb_printf(out, "  case %zu:", r + 1);
        for (size_t k = 0; k < ct->ninputs; k++) {
            sb_printf(out, " %s = ", ct->inputs[k]);
            render_expr_text(ev, ct->cells[r * ct->ninputs + k], false, out);
            sb_putc(out, ';');
        }
        for (size_t k = 0; k < ct->nshow; k++) {
            sb_printf(out, " %s = ", ct->show[k]);
            if (row->shown && row->shown_ok[k])
                render_value_text(ev, &row->shown[k], &row->shown_unit[k], out);
            else
                sb_puts(out, "(not evaluated)");
            sb_putc(out, ';');
        }
        if (!row->holds) {
            sb_puts(out, " (not evaluated)\n");
            continue;
        }
        if (row->nfailed == 0) {
            sb_puts(out, " all checks hold\n");
            continue;
        }
        sb_puts(out, " FAILS:");
        for (size_t k = 0; k < cr->nchecks; k++)
            if (!row->holds[k])
                sb_printf(out, " [%s]%s", ev->doc->stmts[cr->check_slots[k]]->label,
                          row->check_ok[k] ? "" : " (not evaluated)");
        sb_putc(out, '\n');
    }
}

static void put_statement(const Evaluated *ev, const ReportModel *model, const Stmt *s, StrBuf *out)
{
    const StmtResult *r = &ev->results[s->index];
    switch (s->kind) {
    case STMT_PATH:
        put_path(ev, s, r, out);
        return;
    case STMT_NETWORK:
        put_network(ev, s, r, out);
        return;
    case STMT_CURVE:
        put_curve(ev, s, r, out);
        return;
    case STMT_FIGURE:
        put_figure(ev, s, r, out);
        return;
    case STMT_NOTE:
        sb_printf(out, "  note: %s\n", s->description ? s->description : "");
        return;
    case STMT_DEF: {
        const ModelRow *mr = &model->rows[s->index];
        sb_printf(out, "%s = %s", mr->symbol, mr->formula);
        if (mr->evaluated) {
            if (mr->show_substituted)
                sb_printf(out, " = %s", mr->substituted);
            if (mr->show_result)
                sb_printf(out, " = %s", mr->result.text);
        } else {
            sb_puts(out, " = (not evaluated)");
        }
        put_comment(s, out);
        const UsedFile *used = r->state == RES_OK && r->value.kind == VAL_RECORD
                                   ? use_of_record(r->value.rec)
                                   : NULL;
        if (used) {
            /* a used calc: its file and digest; its values are listed in its own report */
            sb_printf(out, "\n      the values of %s (sha256 %.12s), %zu names",
                      doc_stmt_use(s) ? doc_stmt_use(s) : used->file, used->doc->digest,
                      r->value.rec->nfields);
        } else if (r->state == RES_OK && r->value.kind == VAL_RECORD) {
            const Record *rec = r->value.rec;
            for (size_t i = 0; i < rec->nfields; i++) {
                sb_printf(out, "\n      %s.%s = ", s->name, rec->fields[i].name);
                const Value *fv = &rec->fields[i].value;
                Unit u = fv->kind == VAL_NUMBER ? eval_display_unit(ev, fv, NULL) : (Unit){0};
                render_value_text(ev, fv, &u, out);
            }
        }
        if (r->state == RES_OK) {
            put_methods(r, out);
            put_uses(mr, out);
        }
        sb_putc(out, '\n');
        if (r->state == RES_OK && r->made->table)
            put_table(ev, r->made->table, out);
        return;
    }
    case STMT_SOLVE: {
        const ModelRow *mr = &model->rows[s->index];
        sb_printf(out, "%s = solve %s where %s", mr->symbol, s->solve->var, mr->formula);
        if (mr->lo_text)
            sb_printf(out, " between %s and %s", mr->lo_text, mr->hi_text);
        if (mr->evaluated) {
            sb_printf(out, " = %s", mr->result.text);
            put_comment(s, out);
            sb_printf(out, "\n      at %s = %s: ", s->solve->var, mr->result.text);
            if (mr->show_substituted)
                sb_printf(out, "%s = ", mr->substituted);
            sb_printf(out, "%s = %s; residual %s after %d iterations", mr->lhs_at_root.text,
                      mr->rhs_at_root.text, mr->residual.text, mr->iterations);
            put_uses(mr, out);
        } else {
            sb_puts(out, " = (not evaluated)");
            put_comment(s, out);
        }
        sb_putc(out, '\n');
        return;
    }
    case STMT_CHECK: {
        const ModelRow *mr = &model->rows[s->index];
        const ModelCheck *c = &mr->check;
        sb_printf(out, "%s %s: %s", s->finding ? "finding" : "check", s->label, mr->formula);
        if (c->evaluated) {
            const char *op = cmp_op_text(s->cmp, false);
            /* the sides substituted, as the sheets show them */
            if (mr->show_substituted)
                sb_printf(out, " : %s", mr->substituted);
            sb_printf(out, " : %s %s %s : ", c->lhs.text, op, c->rhs.text);
            if (c->finding)
                sb_puts(out, c->verdict);
            else
                sb_printf(out, "%s (utilisation %s)", c->verdict, c->utilization_text);
        } else {
            sb_puts(out, " : (not evaluated)");
        }
        put_comment(s, out);
        sb_putc(out, '\n');
        return;
    }
    }
}

static void put_inlines_plain(const Evaluated *ev, const Inline *in, StrBuf *out)
{
    for (; in; in = in->next) {
        switch (in->kind) {
        case INL_TEXT:
        case INL_CODE:
            sb_puts(out, in->text);
            break;
        case INL_SOFTBREAK:
        case INL_LINEBREAK:
            sb_putc(out, ' ');
            break;
        case INL_VALUE:
            if (in->slot >= 0 && ev->results[in->slot].state == RES_OK) {
                const Value *v = &ev->results[in->slot].value;
                if (in->field && v->kind == VAL_RECORD)
                    v = record_get(v->rec, in->field);
                if (v) {
                    Unit u = in->has_as ? in->as_unit : (in->field ? eval_display_unit(ev, v, NULL) : *ev->results[in->slot].shown);
                    render_value_text(ev, v, &u, out);
                    break;
                }
            }
            sb_printf(out, "{%s}", in->text);
            break;
        default:
            put_inlines_plain(ev, in->children, out);
            break;
        }
    }
}

/* Every warning of a row, beside it. */
static void put_warnings(const StmtResult *r, StrBuf *out)
{
    for (size_t i = 0; i < r->nwarnings; i++)
        sb_printf(out, "      warning: %s\n", r->warnings[i]);
}

static void put_blocks(const Evaluated *ev, const ReportModel *model, const Block *b, StrBuf *out)
{
    for (; b; b = b->next) {
        switch (b->kind) {
        case BLK_HEADING:
            sb_printf(out, "\n%s ", b->number);
            put_inlines_plain(ev, b->inlines, out);
            sb_puts(out, "\n\n");
            break;
        case BLK_CALC:
        case BLK_PATH:
        case BLK_NETWORK:
        case BLK_CURVE:
            for (size_t i = 0; i < b->nstmts; i++) {
                const Stmt *st = ev->doc->stmts[b->first_stmt + i];
                put_statement(ev, model, st, out);
                put_warnings(&ev->results[st->index], out);
            }
            break;
        case BLK_CASES:
            put_cases(ev, b->first_stmt, out);
            break;
        case BLK_LIST:
        case BLK_ITEM:
        case BLK_QUOTE:
            put_blocks(ev, model, b->children, out);
            break;
        default:
            break;
        }
    }
}

bool render_text(const Evaluated *ev, FILE *out)
{
    const Document *doc = ev->doc;
    const Meta *m = &doc->meta;
    StrBuf sb = {0};
    sb_printf(&sb, "%s\n", m->title ? m->title : doc->file);
    if (m->project)
        sb_printf(&sb, "project: %s\n", m->project);
    if (m->number || m->revision)
        sb_printf(&sb, "calc: %s  revision: %s\n", m->number ? m->number : "-", m->revision ? m->revision : "-");
    sb_printf(&sb, "source: %s  sha256: %s\n", doc->file, doc->digest);
    for (size_t i = 0; i < ev->nused; i++)
        sb_printf(&sb, "uses: %s  sha256: %s\n", ev->used[i]->file, ev->used[i]->doc->digest);
    if (ev->atmosphere_used) {
        char atm[256];
        render_atmosphere(ev, atm, sizeof atm);
        sb_printf(&sb, "atmosphere: %s\n", atm);
    }
    Arena arena;
    arena_init(&arena);
    const ReportModel *model = report_model_build(ev, &arena);
    put_blocks(ev, model, doc->blocks, &sb);
    ReportCaution c[32];
    size_t nc = report_cautions(ev, c, sizeof c / sizeof c[0]);
    sb_puts(&sb, "\nCautions\n\n");
    for (size_t i = 0; i < nc; i++) {
        /* "**Topic.** text" printed as "- Topic. text" */
        StrBuf line = {0};
        sb_printf(&line, "%.*s", (int)c[i].len, c[i].text);
        sb_puts(&sb, "- ");
        for (size_t k = 0; k < line.len; k++)
            if (!(line.data[k] == '*' && k + 1 < line.len && line.data[k + 1] == '*') &&
                !(line.data[k] == '*' && k > 0 && line.data[k - 1] == '*'))
                sb_printf(&sb, "%c", line.data[k]);
        sb_puts(&sb, "\n");
        sb_free(&line);
    }
    size_t holds = ev->nchecks - ev->nfailed;
    sb_printf(&sb, "\nchecks: %zu hold, %zu fail\n", holds, ev->nfailed);
    if (ev->nfindings)
        sb_printf(&sb, "findings: %zu yes, %zu no\n", ev->nfindings_yes, ev->nfindings - ev->nfindings_yes);
    if (ev->nwarnings)
        sb_printf(&sb, "warnings: %zu, each beside its line\n", ev->nwarnings);
    bool ok = fwrite(sb.data ? sb.data : "", 1, sb.len, out) == sb.len;
    sb_free(&sb);
    arena_free(&arena);
    return ok;
}

bool render_package_text(const Package *pkg, FILE *out)
{
    const Document *ix = pkg->index;
    const Meta *m = &ix->meta;
    bool ok = fprintf(out, "%s\npackage: %s  sha256: %s\n", m->title ? m->title : ix->file, ix->file,
                      ix->digest) > 0;
    if (m->project)
        ok = fprintf(out, "project: %s\n", m->project) > 0 && ok;
    if (m->number || m->revision)
        ok = fprintf(out, "calc: %s  revision: %s\n", m->number ? m->number : "-",
                     m->revision ? m->revision : "-") > 0 && ok;
    for (size_t i = 0; i < pkg->nparts; i++) {
        ok = fprintf(out, "\n==== part %zu of %zu: %s\n", i + 1, pkg->nparts, pkg->parts[i].file) > 0 && ok;
        ok = render_text(pkg->parts[i].ev, out) && ok;
    }
    for (size_t i = 0; i < pkg->nextra; i++)
        ok = fprintf(out, "\nused by a part, not a part: %s  sha256: %s  (%zu checks, %zu fail)\n",
                     pkg->extra[i]->file, pkg->extra[i]->doc->digest, pkg->extra[i]->ev->nchecks,
                     pkg->extra[i]->ev->nfailed) > 0 && ok;
    ok = fprintf(out, "\npackage checks: %zu hold, %zu fail\n", pkg->nchecks - pkg->nfailed,
                 pkg->nfailed) > 0 && ok;
    return ok;
}
