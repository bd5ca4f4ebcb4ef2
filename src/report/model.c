/* model.c — the report model (report_model.h): every row's texts and
 * decisions, taken once from the evaluated document.
 *
 * The plain texts (formula, substituted formula, values) come from the one
 * linear expression printer (render_expr_text_at, text.c); the PDF sets the
 * same expressions as boxes, showing exactly the lines this model says a row
 * has. */
#include <math.h>
#include <string.h>

#include "numfmt.h"
#include "parse.h"
#include "render.h"
#include "report_model.h"

const char REPORT_NODE_DEMAND_NOTE[] =
    "Each node's demand is the demand of the load of the fixtures it serves, converted node by node; a "
    "link that serves several nodes carries the sum of their demands, which overstates its peak (loads "
    "add, demands do not) and so errs on the safe side.";

static const char *expr_text(const ReportModel *m, const StmtResult *row, const Expr *e, bool sub, Arena *a)
{
    return render_expr_string(m->ev, row, e, sub, m->value_texts, a);
}

ModelValue report_model_value(const Evaluated *ev, const Value *v, const Unit *unit, Arena *a)
{
    ModelValue m = {0};
    if (v->kind == VAL_NUMBER) {
        m.number = true;
        m.si = v->q.si;
        m.unit = unit && unit->text[0] ? *unit : eval_display_unit(ev, v, NULL);
        m.shown = unit_from_si(v->q.si, &m.unit, v->q.temp == TEMP_NONE);
        m.text = render_value_string(ev, v, &m.unit, a);
    } else {
        m.si = NAN;
        m.shown = NAN;
        m.text = render_value_string(ev, v, NULL, a);
    }
    return m;
}

static const Expr *bare(const Expr *e)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    return e;
}

/* An input: a literal (a number, a string, a negated number) whose value is
 * shown in the unit it is written in needs no separate result. */
static bool is_input(const Stmt *s, const StmtResult *r)
{
    const Expr *e = bare(s->expr);
    if (e && e->kind == EXPR_NEG)
        e = bare(e->lhs);
    if (!e)
        return false;
    if (e->kind == EXPR_STRING)
        return true;
    if (e->kind != EXPR_NUMBER || s->has_as)
        return false;
    bool unitless = r->shown->text[0] == '\0' || strcmp(r->shown->text, "1") == 0;
    return e->has_unit ? strcmp(e->unit->text, r->shown->text) == 0 : unitless;
}

static void row_def(const ReportModel *m, const Stmt *s, const StmtResult *r, ModelRow *row, Arena *a)
{
    const Evaluated *ev = m->ev;
    row->symbol = s->name;
    row->formula = expr_text(m, NULL, s->expr, false, a);
    if (!row->evaluated)
        return;
    const Expr *e = bare(s->expr);
    bool reference = e->kind == EXPR_NAME || e->kind == EXPR_FIELD;
    if (!reference && expr_reads_names(s->expr)) {
        const char *sub = expr_text(m, NULL, s->expr, true, a);
        /* a substitution that changes nothing (pump(0 gal/min)) is not repeated */
        if (strcmp(sub, row->formula) != 0) {
            row->substituted = sub;
            row->show_substituted = true;
        }
    }
    row->result = report_model_value(ev, &r->value, r->shown, a);
    row->show_result = r->value.kind != VAL_RECORD && !is_input(s, r);
    /* an input is printed as written: that is its text */
    if (!row->show_result && row->result.number)
        row->result.text = row->formula;
}

static void row_solve(const ReportModel *m, const Stmt *s, const StmtResult *r, ModelRow *row, Arena *a)
{
    const Evaluated *ev = m->ev;
    row->symbol = s->name;
    row->lhs_formula = expr_text(m, NULL, s->lhs, false, a);
    row->rhs_formula = expr_text(m, NULL, s->rhs, false, a);
    row->formula = arena_printf(a, "%s = %s", row->lhs_formula, row->rhs_formula);
    if (s->solve->lo && s->solve->hi) {
        row->lo_text = expr_text(m, NULL, s->solve->lo, false, a);
        row->hi_text = expr_text(m, NULL, s->solve->hi, false, a);
    }
    if (!row->evaluated)
        return;
    row->result = report_model_value(ev, &r->value, r->shown, a);
    row->show_result = true;
    if (!(expr_is_simple(s->lhs) && expr_is_simple(s->rhs))) {
        row->lhs_substituted = expr_text(m, r, s->lhs, true, a);
        row->rhs_substituted = expr_text(m, r, s->rhs, true, a);
        row->substituted = arena_printf(a, "%s = %s", row->lhs_substituted, row->rhs_substituted);
        row->show_substituted = true;
    }
    row->lhs_at_root = report_model_value(ev, &r->sides->lhs, &r->sides->lhs_shown, a);
    row->rhs_at_root = report_model_value(ev, &r->sides->rhs, &r->sides->lhs_shown, a);
    /* the residual as a number in the left side's unit; render_quantity's
     * form, so a pure number carries no unit word */
    Value resid = value_number(qty(r->sides->solve.residual, r->sides->lhs.q.dim));
    char res[96];
    render_quantity(ev, &resid, &r->sides->lhs_shown, res, sizeof res);
    row->residual = report_model_value(ev, &resid, &r->sides->lhs_shown, a);
    row->residual.text = arena_strdup(a, res);
    row->iterations = r->sides->solve.iterations;
}

static void row_check(const ReportModel *m, const Stmt *s, const StmtResult *r, ModelRow *row, Arena *a)
{
    const Evaluated *ev = m->ev;
    ModelCheck *c = &row->check;
    row->lhs_formula = expr_text(m, NULL, s->lhs, false, a);
    row->rhs_formula = expr_text(m, NULL, s->rhs, false, a);
    row->formula = arena_printf(a, "%s %s %s", row->lhs_formula, cmp_op_text(s->cmp, false),
                                row->rhs_formula);
    c->finding = s->finding;
    c->evaluated = row->evaluated;
    c->utilization = NAN;
    if (!row->evaluated)
        return;
    if ((expr_reads_names(s->lhs) || expr_reads_names(s->rhs)) &&
        !(expr_is_simple(s->lhs) && expr_is_simple(s->rhs))) {
        row->lhs_substituted = expr_text(m, NULL, s->lhs, true, a);
        row->rhs_substituted = expr_text(m, NULL, s->rhs, true, a);
        row->substituted = arena_printf(a, "%s %s %s", row->lhs_substituted,
                                        cmp_op_text(s->cmp, false), row->rhs_substituted);
        row->show_substituted = true;
    }
    c->holds = r->holds;
    c->lhs = report_model_value(ev, &r->sides->lhs, &r->sides->lhs_shown, a);
    c->rhs = report_model_value(ev, &r->sides->rhs, &r->sides->rhs_shown, a);
    if (s->finding) {
        c->verdict = r->holds ? "yes" : "no";
        return;
    }
    c->utilization = r->utilization;
    char u[32];
    if (isfinite(r->utilization))
        num_sig(r->utilization, 3, u, sizeof u);
    else
        snprintf(u, sizeof u, "n/a");
    c->utilization_text = arena_strdup(a, u);
    c->verdict = r->holds ? "HOLDS" : "FAILS";
}

/* Does every name of `e` have a value in `u` (or is it g, pi or a
 * function's name)? */
static bool use_covers(const MethodUse *u, const Expr *e)
{
    if (!e)
        return true;
    switch (e->kind) {
    case EXPR_NAME:
        if (strcmp(e->text, "g") == 0 || strcmp(e->text, "pi") == 0)
            return true;
        for (size_t i = 0; i < u->ninputs; i++)
            if (strcmp(u->inputs[i].name, e->text) == 0)
                return true;
        return false;
    case EXPR_CALL:
        for (size_t i = 0; i < e->call->nargs; i++)
            if (!use_covers(u, e->call->args[i]))
                return false;
        for (size_t i = 0; i < e->call->nkw; i++)
            if (!use_covers(u, e->call->kw[i]))
                return false;
        return true;
    case EXPR_FIELD:
        return false;
    default:
        return use_covers(u, e->lhs) && use_covers(u, expr_rhs(e));
    }
}

static void row_uses(const ReportModel *m, const StmtResult *r, ModelRow *row, Arena *a)
{
    ModelUse *uses = arena_alloc(a, (r->nuses + 1) * sizeof *uses);
    for (size_t j = 0; j < r->nuses; j++) {
        const MethodUse *u = &r->uses[j];
        ModelUse *mu = &uses[row->nuses];
        size_t k = 0;
        while (k < m->nmethods && !method_same(m->methods[k].method, u->method))
            k++;
        if (k == m->nmethods)
            continue;
        const ModelMethod *mm = &m->methods[k];
        mu->use = u;
        mu->method = k;
        mu->branch = u->branch;
        if (mm->lhs && mm->rhs) {
            mu->lhs = expr_text(m, NULL, mm->lhs, false, a);
            mu->formula = expr_text(m, NULL, mm->rhs, false, a);
            if (u->ninputs && use_covers(u, mm->rhs))
                mu->substituted = render_method_string(m->ev, u, mm->rhs, a);
        }
        if (u->result.kind == VAL_NUMBER)
            mu->result = report_model_value(m->ev, &u->result, NULL, a);
        bool repeat = false;
        for (size_t i = 0; i < row->nuses && !repeat; i++)
            repeat = uses[i].method == mu->method &&
                     (uses[i].substituted ? mu->substituted && strcmp(uses[i].substituted, mu->substituted) == 0
                                          : !mu->substituted) &&
                     (uses[i].branch ? mu->branch && strcmp(uses[i].branch, mu->branch) == 0 : !mu->branch);
        if ((mu->substituted || mu->branch) && !repeat)
            row->nuses++;
    }
    row->uses = uses;
}

ReportModel *report_model_begin(const Evaluated *ev, Arena *a)
{
    const Document *d = ev->doc;
    ReportModel *m = arena_alloc(a, sizeof *m);
    m->ev = ev;
    m->governing = -1;
    m->nmethods = ev->nmethods;
    m->methods = arena_alloc(a, (ev->nmethods + 1) * sizeof *m->methods);
    for (size_t k = 0; k < ev->nmethods; k++) {
        ModelMethod *mm = &m->methods[k];
        mm->method = ev->methods[k];
        mm->first_use = -1;
        if (mm->method->formula) {
            DiagList quiet = {0};
            Expr *lhs = NULL, *rhs = NULL;
            if (parse_equation_text(a, mm->method->formula, &quiet, &lhs, &rhs) && lhs) {
                mm->lhs = lhs;
                mm->rhs = rhs;
            }
            diag_free(&quiet);
        }
    }
    /* the governing check: the highest finite utilization, the first of equals */
    double best = -1;
    for (size_t i = 0; i < d->nstmts; i++) {
        const Stmt *s = d->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (!s->parse_failed && s->kind == STMT_CHECK && !s->finding && r->state == RES_OK &&
            isfinite(r->utilization) && r->utilization > best) {
            best = r->utilization;
            m->governing = (int)i;
        }
    }
    m->nchecks = ev->nchecks;
    m->nfailed = ev->nfailed;
    m->case_rows_failing = ev->case_rows_failing;
    m->value_texts = arena_alloc(a, sizeof *m->value_texts);
    m->value_texts->texts = arena_alloc(a, (d->nstmts + 1) * sizeof *m->value_texts->texts);
    m->value_texts->arena = a;
    return m;
}

void report_model_row(const ReportModel *m, size_t i, ModelRow *row, Arena *a)
{
    const Evaluated *ev = m->ev;
    const Stmt *s = ev->doc->stmts[i];
    const StmtResult *r = &ev->results[i];
    memset(row, 0, sizeof *row);
    row->stmt = s;
    row->res = r;
    row->evaluated = r->state == RES_OK;
    row->description = s->description;
    row->cites = s->cites;
    row->ncites = s->ncites;
    row->warnings = r->warnings;
    row->nwarnings = r->nwarnings;
    size_t *idx = arena_alloc(a, (r->nmethods + 1) * sizeof *idx);
    for (size_t j = 0; j < r->nmethods; j++)
        for (size_t k = 0; k < ev->nmethods; k++)
            if (method_same(r->methods[j], ev->methods[k])) {
                idx[row->nmethods++] = k;
                break;
            }
    row->methods = idx;
    row_uses(m, r, row, a);
    if (s->parse_failed)
        return;
    switch (s->kind) {
    case STMT_DEF:
        row_def(m, s, r, row, a);
        break;
    case STMT_SOLVE:
        row_solve(m, s, r, row, a);
        break;
    case STMT_CHECK:
        row_check(m, s, r, row, a);
        row->check.governs = (int)i == m->governing;
        break;
    default:
        if (s->name && row->evaluated)
            row->result = report_model_value(ev, &r->value, r->shown, a);
        row->symbol = s->name;
        break;
    }
}

const ReportModel *report_model_build(const Evaluated *ev, Arena *a)
{
    ReportModel *m = report_model_begin(ev, a);
    m->nrows = ev->doc->nstmts;
    m->rows = arena_alloc(a, (m->nrows + 1) * sizeof *m->rows);
    for (size_t i = 0; i < m->nrows; i++) {
        ModelRow *row = &m->rows[i];
        report_model_row(m, i, row, a);
        m->nwarnings += row->nwarnings;
        for (size_t j = 0; j < row->nmethods; j++)
            if (m->methods[row->methods[j]].first_use < 0)
                m->methods[row->methods[j]].first_use = (int)i;
    }
    return m;
}

/* The display units a path's and a network's columns are shown in (a bore
 * in inches or millimetres). */
static void table_units(const Evaluated *ev, Unit *uQ, Unit *uL, Unit *uV, Unit *uP, Unit *uD, Unit *one)
{
    UnitSystem us = ev->units;
    *uQ = unit_default(DIM_FLOW, TEMP_NONE, us);
    *uL = unit_default(DIM_L, TEMP_NONE, us);
    *uV = unit_default(DIM_VELOCITY, TEMP_NONE, us);
    *uP = unit_default(DIM_PRESSURE, TEMP_NONE, us);
    *one = unit_default(DIM_NONE, TEMP_NONE, us);
    *uD = *uL;
    size_t bo, bl;
    unit_parse(us == UNITS_US ? "in" : "mm", 2, uD, &bo, &bl);
}

PathColumns report_path_columns(const Evaluated *ev, const PathResult *pr)
{
    static const char *const KEY[PATH_COLUMNS_MAX] = {
        "segment", "load", "Q", "D", "L", "rise", "V", "Re", "f", "K", "h_f", "h_m", "p_in", "dp_device", "p_out"};
    static const char *const WORD[PATH_COLUMNS_MAX] = {
        "segment",         "fixture load", "flow",       "bore",          "length",       "rise",
        "velocity",        "Reynolds number", "friction factor", "fittings K", "friction loss",
        "fitting loss",    "inlet pressure",  "device loss",    "outlet pressure"};
    static const char *const SYMBOL[PATH_COLUMNS_MAX] = {"",  "",  "Q",   "D",   "L",   "Delta_z", "V",    "Re",
                                                         "f", "K",   "h_f", "h_m", "p_in",    "Delta_p_dev", "p_out"};
    PathColumns c;
    memset(&c, 0, sizeof c);
    Unit uQ, uL, uV, uP, uD, one;
    table_units(ev, &uQ, &uL, &uV, &uP, &uD, &one);
    bool load = pr && pr->nsegs && pr->segs[0].has_load;
    for (int q = 0; q < PATH_COLUMNS_MAX; q++) {
        if ((q == PCOL_DPDEV && (!pr || pr->ndevices == 0)) || (q == PCOL_LOAD && !load))
            continue;
        int i = c.n++;
        c.map[i] = q;
        c.key[i] = KEY[q];
        c.word[i] = WORD[q];
        c.symbol[i] = SYMBOL[q];
        c.has_unit[i] = q != PCOL_SEGMENT && q != PCOL_LOAD && q != PCOL_RE && q != PCOL_F && q != PCOL_K;
        switch (q) {
        case PCOL_Q: c.unit[i] = uQ; break;
        case PCOL_D: c.unit[i] = uD; break;
        case PCOL_L: case PCOL_RISE: case PCOL_HF: case PCOL_HM: c.unit[i] = uL; break;
        case PCOL_V: c.unit[i] = uV; break;
        case PCOL_PIN: case PCOL_DPDEV: case PCOL_POUT: c.unit[i] = uP; break;
        default: c.unit[i] = one; break;
        }
    }
    return c;
}

double report_path_cell(const SegmentResult *g, int kind)
{
    double si[PATH_COLUMNS_MAX] = {NAN,    g->load, g->Q, g->D, g->L,   g->rise, g->V,    g->Re,
                                   g->f,   g->K, g->h_f, g->h_m, g->p_in, g->has_device ? g->dp_device : NAN, g->p_out};
    return kind >= 0 && kind < PATH_COLUMNS_MAX ? si[kind] : NAN;
}

/* Column q of a network table, added at the end. */
static void net_column(NetColumns *c, int q, const char *key, const char *word, const char *symbol, Unit unit,
                       bool has_unit, bool text)
{
    int i = c->n++;
    c->map[i] = q;
    c->key[i] = key;
    c->word[i] = word;
    c->symbol[i] = symbol;
    c->unit[i] = unit;
    c->has_unit[i] = has_unit;
    c->text[i] = text;
}

NetColumns report_node_columns(const Evaluated *ev, bool load)
{
    static const char *const KEY[] = {"node", "elevation", "load", "demand", "head", "p"};
    static const char *const WORD[] = {"node", "elevation", "fixture load, wsfu", "demand", "head", "pressure"};
    static const char *const SYMBOL[] = {"", "z", "L", "q", "H", "p"};
    Unit uQ, uL, uV, uP, uD, one;
    table_units(ev, &uQ, &uL, &uV, &uP, &uD, &one);
    const Unit unit[] = {one, uL, one, uQ, uL, uP};
    NetColumns c;
    memset(&c, 0, sizeof c);
    for (int q = NCOL_NODE; q <= NCOL_P; q++)
        if (q != NCOL_LOAD || load)
            net_column(&c, q, KEY[q], WORD[q], SYMBOL[q], unit[q], q != NCOL_NODE && q != NCOL_LOAD, q == NCOL_NODE);
    return c;
}

NetColumns report_link_columns(const Evaluated *ev)
{
    static const char *const KEY[] = {"link", "from", "to", "Q", "D", "L", "V", "Re", "f", "K", "h_f", "h_m",
                                      "dp_device", "device"};
    static const char *const WORD[] = {"link",          "from",          "to",           "flow",
                                       "bore",          "length",        "velocity",     "Reynolds number",
                                       "friction factor", "fittings K",  "friction loss", "fitting loss",
                                       "device drop",   "device"};
    static const char *const SYMBOL[] = {"", "", "", "Q", "D", "L", "V", "Re", "f", "K", "h_f", "h_m", "Delta_p", ""};
    Unit uQ, uL, uV, uP, uD, one;
    table_units(ev, &uQ, &uL, &uV, &uP, &uD, &one);
    const Unit unit[] = {one, one, one, uQ, uD, uL, uV, one, one, one, uL, uL, uP, one};
    NetColumns c;
    memset(&c, 0, sizeof c);
    for (int q = LCOL_LINK; q <= LCOL_DEVICE; q++)
        net_column(&c, q, KEY[q], WORD[q], SYMBOL[q], unit[q],
                   q == LCOL_Q || q == LCOL_D || q == LCOL_L || q == LCOL_V || q == LCOL_HF || q == LCOL_HM ||
                       q == LCOL_DPDEV,
                   q == LCOL_LINK || q == LCOL_FROM || q == LCOL_TO || q == LCOL_DEVICE);
    return c;
}

double report_node_cell(const NodeResult *g, int kind)
{
    double si[] = {NAN, g->z, g->has_load ? g->load : NAN, g->demand, g->head, g->p};
    return kind >= 0 && kind <= NCOL_P ? si[kind] : NAN;
}

double report_link_cell(const LinkResult *g, int kind)
{
    double si[] = {NAN, NAN, NAN, g->Q, g->D, g->L, g->V, g->Re, g->f, g->K, g->h_f, g->h_m, g->dp_device, NAN};
    return kind >= 0 && kind <= LCOL_DEVICE ? si[kind] : NAN;
}

const ModelMethod *report_model_method(const ReportModel *model, const Method *m)
{
    for (size_t k = 0; k < model->nmethods; k++)
        if (method_same(model->methods[k].method, m))
            return &model->methods[k];
    return NULL;
}
