/* diff.c — the semantic diff of two evaluated revisions (`headroom diff`).
 *
 * The comparison is of meaning, not of text. Statements are matched by name
 * (checks by label), so moving a line changes nothing; literals and values
 * are compared in coherent SI within a relative tolerance, so writing
 * `2.397427463 L/s` for `38 gal/min` or adding `as psi` changes nothing. A
 * name present only in OLD and one present only in NEW whose formulas are
 * the same tree (names matched or renamed earlier taken as equal) are one
 * renamed statement; renames are decided in source order, so a rename of Q
 * lets `V = Q/A` and `V = Q_d/A` compare as equal. Which changed inputs a
 * result depends on is a bitset per statement, propagated once along
 * Stmt.deps in source order (every dependency precedes its reader), and a
 * rename's candidates are found by a key of the formula, so the whole diff
 * is linear in the size of the documents (n log n with the sorts). */
#include "diff.h"

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"
#include "uses.h"

DiffOptions diff_options_default(void)
{
    return (DiffOptions){.rel_tol = 1e-9, .abs_floor = 1e-15};
}

/* diff_numbers_differ, inline where the renames' candidates are sifted */
static inline bool numbers_differ(double a, double b, const DiffOptions *opt)
{
    if (isnan(a) || isnan(b))
        return isnan(a) != isnan(b);
    if (a == b)
        return false;
    if (isinf(a) || isinf(b))
        return true;
    double d = fabs(a - b);
    double fa = fabs(a), fb = fabs(b);
    double scale = fa > fb ? fa : fb; /* fmax: neither is NaN here */
    return d > opt->rel_tol * scale && d > opt->abs_floor;
}

bool diff_numbers_differ(double a, double b, const DiffOptions *opt)
{
    return numbers_differ(a, b, opt);
}

static bool str_same(const char *a, const char *b)
{
    return strcmp(a ? a : "", b ? b : "") == 0;
}

/* ---- growable arrays of change records --------------------------------- */

#define PUSH(arr, n, cap, item)                                             \
    do {                                                                    \
        if ((n) == (cap)) {                                                 \
            (cap) = (cap) ? 2 * (cap) : 8;                                  \
            (arr) = xrealloc((arr), (cap) * sizeof *(arr));                 \
        }                                                                   \
        (arr)[(n)++] = (item);                                              \
    } while (0)

typedef struct Builder {
    Diff *d;
    const Document *od, *nd;
    size_t cap_meta, cap_inputs, cap_results, cap_checks, cap_stmts, cap_cites, cap_prose, cap_findings;
    bool *formula_changed;   /* per NEW slot, matched statements only */
} Builder;

/* Move a heap array into the diff's arena so diff_free releases it all. */
static void *to_arena(Diff *d, void *heap, size_t n, size_t size)
{
    if (n == 0) {
        free(heap);
        return NULL;
    }
    void *p = arena_alloc(&d->arena, n * size);
    memcpy(p, heap, n * size);
    free(heap);
    return p;
}

/* ---- front matter ------------------------------------------------------- */

static void meta_text(Builder *b, const char *key, const char *o, const char *n, bool display_only)
{
    if (str_same(o, n))
        return;
    MetaChange m = {key, o ? o : "", n ? n : "", display_only};
    PUSH(b->d->meta, b->d->nmeta, b->cap_meta, m);
}

static const char *revision_text(Arena *a, const Meta *m)
{
    StrBuf sb = {0};
    for (size_t i = 0; i < m->nrevisions; i++) {
        const Revision *r = &m->revisions[i];
        sb_printf(&sb, "%s%s %s %s: %s", i ? "; " : "", r->rev ? r->rev : "-", r->date ? r->date : "-",
                  r->by ? r->by : "-", r->note ? r->note : "");
    }
    const char *s = arena_strdup(a, sb_str(&sb));
    sb_free(&sb);
    return s;
}

static void compare_meta(Builder *b)
{
    const Meta *o = &b->od->meta, *n = &b->nd->meta;
    Arena *a = &b->d->arena;
    meta_text(b, "title", o->title, n->title, false);
    meta_text(b, "project", o->project, n->project, false);
    meta_text(b, "client", o->client, n->client, false);
    meta_text(b, "number", o->number, n->number, false);
    meta_text(b, "subject", o->subject, n->subject, false);
    meta_text(b, "revision", o->revision, n->revision, false);
    meta_text(b, "date", o->date, n->date, false);
    meta_text(b, "status", o->status, n->status, false);
    meta_text(b, "prepared", o->prepared, n->prepared, false);
    meta_text(b, "prepared date", o->prepared_date, n->prepared_date, false);
    meta_text(b, "checked", o->checked, n->checked, false);
    meta_text(b, "checked date", o->checked_date, n->checked_date, false);
    meta_text(b, "approved", o->approved, n->approved, false);
    meta_text(b, "engineer", o->engineer, n->engineer, false);
    meta_text(b, "license", o->license, n->license, false);
    meta_text(b, "revisions", revision_text(a, o), revision_text(a, n), false);
    meta_text(b, "units", o->units == UNITS_SI ? "SI" : "US", n->units == UNITS_SI ? "SI" : "US", true);
    meta_text(b, "paper", o->paper == PAPER_A4 ? "a4" : "letter", n->paper == PAPER_A4 ? "a4" : "letter", true);
    meta_text(b, "digits", arena_printf(a, "%d", o->digits), arena_printf(a, "%d", n->digits), true);
    meta_text(b, "code", o->code ? o->code : "(default)", n->code ? n->code : "(default)", true);
    /* The atmosphere moves every gauge-absolute conversion: a change of meaning. */
    meta_text(b, "atmosphere", o->atmosphere_text, n->atmosphere_text, false);
    meta_text(b, "elevation", o->elevation_text, n->elevation_text, false);
}

/* ---- formulas as trees -------------------------------------------------- */

static const Expr *bare(const Expr *e)
{
    while (e && e->kind == EXPR_PAREN)
        e = e->lhs;
    return e;
}

static Quantity literal_qty(const Expr *e)
{
    return e->has_unit ? unit_to_qty(e->number, e->unit) : qty_number(e->number);
}

static bool slot_same(const Diff *d, int o, int n)
{
    if (o < 0 || n < 0)
        return o == n && o != SLOT_UNRESOLVED;
    return d->old_to_new[o] == n;
}

/* Same formula: the same tree, literals equal in SI within the tolerance,
 * names equal when matched (by name or by rename). Parentheses kept only for
 * display do not count. */
static bool expr_same(const Diff *d, const Expr *a, const Expr *b)
{
    a = bare(a);
    b = bare(b);
    if (!a || !b)
        return a == b;
    if (a->kind != b->kind)
        return false;
    switch (a->kind) {
    case EXPR_NUMBER: {
        Quantity qa = literal_qty(a), qb = literal_qty(b);
        return dim_eq(qa.dim, qb.dim) && qa.temp == qb.temp && qa.pref == qb.pref && !diff_numbers_differ(qa.si, qb.si, &d->opt);
    }
    case EXPR_STRING:
        return str_same(a->text, b->text);
    case EXPR_NAME:
        return slot_same(d, a->slot, b->slot);
    case EXPR_NEG:
    case EXPR_PAREN:
        return expr_same(d, a->lhs, b->lhs);
    case EXPR_BINARY:
        return a->op == b->op && expr_same(d, a->lhs, b->lhs) && expr_same(d, a->rhs, b->rhs);
    case EXPR_FIELD:
        return str_same(a->text, b->text) && expr_same(d, a->lhs, b->lhs);
    case EXPR_CALL:
        if (a->call->callee_slot >= 0 || b->call->callee_slot >= 0) {
            if (!slot_same(d, a->call->callee_slot, b->call->callee_slot))
                return false;
        } else if (!str_same(a->text, b->text)) {
            return false;
        }
        if (a->call->nargs != b->call->nargs || a->call->nkw != b->call->nkw)
            return false;
        for (size_t i = 0; i < a->call->nargs; i++)
            if (!expr_same(d, a->call->args[i], b->call->args[i]))
                return false;
        for (size_t i = 0; i < a->call->nkw; i++)
            if (!str_same(a->call->kw_names[i], b->call->kw_names[i]) || !expr_same(d, a->call->kw[i], b->call->kw[i]))
                return false;
        return true;
    }
    return false;
}

static bool path_same(const Diff *d, const PathSpec *a, const PathSpec *b)
{
    if (!a || !b)
        return a == b;
    if (a->loss != b->loss || !str_same(a->friction, b->friction) || !str_same(a->fittings, b->fittings) ||
        a->demand != b->demand || !str_same(a->demand_system, b->demand_system) ||
        !expr_same(d, a->demand_curve, b->demand_curve) ||
        a->nsegs != b->nsegs || !expr_same(d, a->fluid, b->fluid) || !expr_same(d, a->start, b->start))
        return false;
    for (size_t i = 0; i < a->nsegs; i++) {
        const PathSegment *x = &a->segs[i], *y = &b->segs[i];
        if (!str_same(x->id, y->id) || x->nfittings != y->nfittings || !expr_same(d, x->flow, y->flow) ||
            !expr_same(d, x->pipe, y->pipe) || !expr_same(d, x->length, y->length) ||
            !expr_same(d, x->rise, y->rise) || !expr_same(d, x->K, y->K) || !expr_same(d, x->C, y->C) ||
            !expr_same(d, x->device, y->device))
            return false;
        for (size_t k = 0; k < x->nfittings; k++)
            if (x->fittings[k].count != y->fittings[k].count || !str_same(x->fittings[k].kind, y->fittings[k].kind))
                return false;
        /* a changed fixture count changes the path's input */
        if (x->nfixtures != y->nfixtures)
            return false;
        for (size_t k = 0; k < x->nfixtures; k++)
            if (x->fixtures[k].count != y->fixtures[k].count || !str_same(x->fixtures[k].kind, y->fixtures[k].kind))
                return false;
    }
    return true;
}

static bool network_same(const Diff *d, const NetworkSpec *a, const NetworkSpec *b)
{
    if (!a || !b)
        return a == b;
    if (a->loss != b->loss || !str_same(a->friction, b->friction) || !str_same(a->fittings, b->fittings) ||
        a->nnodes != b->nnodes || a->nlinks != b->nlinks || !expr_same(d, a->fluid, b->fluid) ||
        !expr_same(d, a->tolerance, b->tolerance) || a->demand != b->demand ||
        !str_same(a->demand_system, b->demand_system) || !expr_same(d, a->demand_curve, b->demand_curve))
        return false;
    for (size_t i = 0; i < a->nnodes; i++) {
        const NetNode *x = &a->nodes[i], *y = &b->nodes[i];
        if (!str_same(x->id, y->id) || !expr_same(d, x->elevation, y->elevation) || !expr_same(d, x->demand, y->demand) ||
            !expr_same(d, x->head, y->head) || !expr_same(d, x->pressure, y->pressure) || !expr_same(d, x->x, y->x) ||
            !expr_same(d, x->y, y->y) || x->nfixtures != y->nfixtures)
            return false;
        /* a changed fixture count changes the network's input */
        for (size_t k = 0; k < x->nfixtures; k++)
            if (x->fixtures[k].count != y->fixtures[k].count || !str_same(x->fixtures[k].kind, y->fixtures[k].kind))
                return false;
    }
    for (size_t i = 0; i < a->nlinks; i++) {
        const NetLink *x = &a->links[i], *y = &b->links[i];
        if (!str_same(x->id, y->id) || !str_same(x->from, y->from) || !str_same(x->to, y->to) ||
            x->nfittings != y->nfittings || !expr_same(d, x->pipe, y->pipe) || !expr_same(d, x->length, y->length) ||
            !expr_same(d, x->K, y->K) || !expr_same(d, x->C, y->C) || !expr_same(d, x->device, y->device))
            return false;
        for (size_t k = 0; k < x->nfittings; k++)
            if (x->fittings[k].count != y->fittings[k].count || !str_same(x->fittings[k].kind, y->fittings[k].kind))
                return false;
    }
    return true;
}

/* The formula of a statement (not its name, display unit or comment). */
static bool stmt_same(const Diff *d, const Stmt *a, const Stmt *b)
{
    if (a->kind != b->kind)
        return false;
    switch (a->kind) {
    case STMT_DEF:
        return expr_same(d, a->expr, b->expr);
    case STMT_SOLVE:
        return slot_same(d, a->var_slot, b->var_slot) && expr_same(d, a->lhs, b->lhs) && expr_same(d, a->rhs, b->rhs);
    case STMT_CHECK:
        return a->cmp == b->cmp && expr_same(d, a->lhs, b->lhs) && expr_same(d, a->rhs, b->rhs);
    case STMT_PATH:
        return path_same(d, a->path, b->path);
    case STMT_NETWORK:
        return network_same(d, a->network, b->network);
    case STMT_CURVE:
        if (a->curve->loglog != b->curve->loglog || a->curve->npoints != b->curve->npoints)
            return false;
        for (size_t i = 0; i < a->curve->npoints; i++)
            if (!expr_same(d, a->curve->x[i], b->curve->x[i]) || !expr_same(d, a->curve->y[i], b->curve->y[i]))
                return false;
        return true;
    default:
        return true;
    }
}

static bool is_named(const Stmt *s)
{
    return (s->kind == STMT_DEF || s->kind == STMT_SOLVE || s->kind == STMT_PATH || s->kind == STMT_NETWORK ||
            s->kind == STMT_CURVE) && s->name &&
           !s->parse_failed;
}

static bool is_check(const Stmt *s)
{
    return s->kind == STMT_CHECK && s->label && !s->parse_failed;
}

/* A `finding`: matched by label like a check, compared apart. */
static bool is_finding(const Stmt *s)
{
    return is_check(s) && s->finding;
}

/* An input: a definition that reads no names (a literal, maybe negated). */
static bool is_input(const Stmt *s)
{
    if (s->kind != STMT_DEF || !s->expr)
        return false;
    const Expr *e = bare(s->expr);
    while (e && e->kind == EXPR_NEG)
        e = bare(e->lhs);
    return e && (e->kind == EXPR_NUMBER || e->kind == EXPR_STRING);
}

/* ---- matching ----------------------------------------------------------- */

/* Checks are matched by label through a sorted index. */
typedef struct LabelSlot {
    const char *label;
    int slot;
} LabelSlot;

static int cmp_label(const void *a, const void *b)
{
    const LabelSlot *x = a, *y = b;
    int c = strcmp(x->label, y->label);
    return c ? c : (x->slot > y->slot) - (x->slot < y->slot);
}

static LabelSlot *label_index(const Document *doc, size_t *n)
{
    LabelSlot *ix = xmalloc((doc->nstmts + 1) * sizeof *ix);
    *n = 0;
    for (size_t i = 0; i < doc->nstmts; i++)
        if (is_check(doc->stmts[i]))
            ix[(*n)++] = (LabelSlot){doc->stmts[i]->label, (int)i};
    qsort(ix, *n, sizeof *ix, cmp_label);
    return ix;
}

/* The first OLD check with this label not yet matched. */
static int label_find(const LabelSlot *ix, size_t n, const char *label, const int *old_to_new)
{
    size_t lo = 0, hi = n;
    while (lo < hi) {
        size_t mid = (lo + hi) / 2;
        if (strcmp(ix[mid].label, label) < 0)
            lo = mid + 1;
        else
            hi = mid;
    }
    for (; lo < n && strcmp(ix[lo].label, label) == 0; lo++)
        if (old_to_new[ix[lo].slot] < 0)
            return ix[lo].slot;
    return -1;
}

/* ---- rename candidates --------------------------------------------------
 *
 * A key of a statement's formula such that stmt_same(old, new) implies equal
 * keys: the tree's shape, operators, strings, field and function names, and
 * for a name the OLD statement it stands for (an OLD formula's own slot; in
 * NEW, the OLD statement its slot was matched to, which every earlier NEW
 * statement has by the time a later one is looked at). Literals and
 * statement kinds the key leaves out (paths, networks, curves) only put more
 * candidates under one key, each still tested with stmt_same. Orphans sorted
 * by key make finding a rename's candidates a lookup, not a scan of every
 * orphan (quadratic in a calc whose names all changed). */

static uint64_t mix(uint64_t h, uint64_t v)
{
    h ^= v + 0x9e3779b97f4a7c15ULL + (h << 6) + (h >> 2);
    return h * 0x100000001b3ULL;
}

static uint64_t mix_str(uint64_t h, const char *s)
{
    for (const unsigned char *p = (const unsigned char *)(s ? s : ""); *p; p++)
        h = (h ^ *p) * 0x100000001b3ULL;
    return mix(h, 0xff);
}

/* A slot as the OLD statement it stands for (new: through new_to_old). */
static uint64_t slot_key(const Diff *d, int slot, bool new_side)
{
    if (slot < 0)
        return slot == SLOT_UNRESOLVED ? 0x5eedULL : (uint64_t)(-(int64_t)slot);
    if (!new_side)
        return (uint64_t)slot + 1000;
    int o = d->new_to_old[slot];
    return o >= 0 ? (uint64_t)o + 1000 : 0xdeadULL; /* unmatched: equal to no OLD slot */
}

static uint64_t expr_key(const Diff *d, const Expr *e, bool new_side, uint64_t h)
{
    e = bare(e);
    if (!e)
        return mix(h, 1);
    h = mix(h, (uint64_t)e->kind + 16);
    switch (e->kind) {
    case EXPR_NUMBER:
        return h;
    case EXPR_STRING:
        return mix_str(h, e->text);
    case EXPR_NAME:
        return mix(h, slot_key(d, e->slot, new_side));
    case EXPR_NEG:
    case EXPR_PAREN:
        return expr_key(d, e->lhs, new_side, h);
    case EXPR_BINARY:
        h = mix(h, (uint64_t)e->op);
        return expr_key(d, e->rhs, new_side, expr_key(d, e->lhs, new_side, h));
    case EXPR_FIELD:
        return expr_key(d, e->lhs, new_side, mix_str(h, e->text));
    case EXPR_CALL:
        h = e->call->callee_slot >= 0 ? mix(h, slot_key(d, e->call->callee_slot, new_side)) : mix_str(h, e->text);
        h = mix(mix(h, e->call->nargs), e->call->nkw);
        for (size_t i = 0; i < e->call->nargs; i++)
            h = expr_key(d, e->call->args[i], new_side, h);
        for (size_t i = 0; i < e->call->nkw; i++)
            h = expr_key(d, e->call->kw[i], new_side, mix_str(h, e->call->kw_names[i]));
        return h;
    }
    return h;
}

static uint64_t stmt_key(const Diff *d, const Stmt *s, bool new_side)
{
    uint64_t h = mix(mix(0xcbf29ce484222325ULL, (uint64_t)s->kind), is_check(s));
    switch (s->kind) {
    case STMT_DEF:
        return expr_key(d, s->expr, new_side, h);
    case STMT_SOLVE:
        h = mix(h, slot_key(d, s->var_slot, new_side));
        return expr_key(d, s->rhs, new_side, expr_key(d, s->lhs, new_side, h));
    case STMT_CHECK:
        h = mix(h, (uint64_t)s->cmp);
        return expr_key(d, s->rhs, new_side, expr_key(d, s->lhs, new_side, h));
    default:
        return h;
    }
}

/* The first and the last literal of a statement's formula (in the order
 * expr_same walks it), in SI, to pass over most candidates under one key
 * without walking their trees: under equal keys the trees have one shape,
 * so stmt_same holds only where both pairs are the same within the
 * tolerance. `has` is false for a formula without literals and for the
 * kinds the key leaves out. */
typedef struct Literals {
    bool has;
    double first, last;
} Literals;

static void expr_literals(const Expr *e, Literals *l)
{
    e = bare(e);
    if (!e)
        return;
    switch (e->kind) {
    case EXPR_NUMBER: {
        double si = literal_qty(e).si;
        if (!l->has)
            l->first = si;
        l->last = si;
        l->has = true;
        return;
    }
    case EXPR_STRING:
    case EXPR_NAME:
        return;
    case EXPR_NEG:
    case EXPR_PAREN:
    case EXPR_FIELD:
        expr_literals(e->lhs, l);
        return;
    case EXPR_BINARY:
        expr_literals(e->lhs, l);
        expr_literals(e->rhs, l);
        return;
    case EXPR_CALL:
        for (size_t i = 0; i < e->call->nargs; i++)
            expr_literals(e->call->args[i], l);
        for (size_t i = 0; i < e->call->nkw; i++)
            expr_literals(e->call->kw[i], l);
        return;
    }
}

static Literals stmt_literals(const Stmt *s)
{
    Literals l = {false, 0, 0};
    switch (s->kind) {
    case STMT_DEF:
        expr_literals(s->expr, &l);
        break;
    case STMT_SOLVE:
    case STMT_CHECK:
        expr_literals(s->lhs, &l);
        expr_literals(s->rhs, &l);
        break;
    default:
        break;
    }
    return l;
}

/* False only where stmt_same cannot hold: both formulas have literals and
 * the first or the last differ. */
static bool literals_may_match(const Diff *d, const Literals *a, const Literals *b)
{
    if (!a->has || !b->has)
        return true;
    return !numbers_differ(a->first, b->first, &d->opt) && !numbers_differ(a->last, b->last, &d->opt);
}

typedef struct Candidate {
    uint64_t key;
    size_t k; /* the orphan's place in source order */
    Literals lit;
} Candidate;

/* Under one key, candidates come in three runs: formulas without literals,
 * those whose first literal is finite (in the order of that literal) and
 * the rest (infinite or NaN); each run in source order where it has no
 * order of its own. A formula can only match a candidate of its own run. */
enum { LIT_NONE, LIT_FINITE, LIT_OTHER };

static int literal_run(const Literals *l)
{
    return !l->has ? LIT_NONE : isfinite(l->first) ? LIT_FINITE : LIT_OTHER;
}

static int cmp_candidate(const void *a, const void *b)
{
    const Candidate *x = a, *y = b;
    if (x->key != y->key)
        return x->key < y->key ? -1 : 1;
    int rx = literal_run(&x->lit), ry = literal_run(&y->lit);
    if (rx != ry)
        return rx - ry;
    if (rx == LIT_FINITE && x->lit.first != y->lit.first)
        return x->lit.first < y->lit.first ? -1 : 1;
    return (x->k > y->k) - (x->k < y->k);
}

/* The first index in [lo, hi) whose candidate is not before (key, run,
 * first): candidates sorted by cmp_candidate. */
static size_t candidate_find(const Candidate *cand, size_t lo, size_t hi, uint64_t key, int run, double first)
{
    while (lo < hi) {
        size_t mid = (lo + hi) / 2;
        const Candidate *c = &cand[mid];
        int r = literal_run(&c->lit);
        bool before = c->key != key ? c->key < key : r != run ? r < run : run == LIT_FINITE && c->lit.first < first;
        if (before)
            lo = mid + 1;
        else
            hi = mid;
    }
    return lo;
}

/* Where two first literals can be the same within the tolerance: every b
 * with numbers_differ(a, b) false lies within a +- w (rel_tol < 1/4 keeps
 * |b - a| <= 2 rel_tol |a|, doubled here, and one step of the doubles more).
 * False when the tolerance gives no such window. */
static bool literal_window(const DiffOptions *opt, double a, double *lo, double *hi)
{
    if (!(opt->rel_tol < 0.25) || !isfinite(opt->abs_floor) || !isfinite(a))
        return false;
    double rel = opt->rel_tol > 0 ? opt->rel_tol : 0;
    double w = 2 * (fabs(opt->abs_floor) + 2 * rel * fabs(a));
    if (!isfinite(w))
        return false;
    *lo = nextafter(a - w, -INFINITY);
    *hi = nextafter(a + w, INFINITY);
    return true;
}

static void match_statements(Builder *b)
{
    Diff *d = b->d;
    const Document *od = b->od, *nd = b->nd;
    size_t nlab;
    LabelSlot *labels = label_index(od, &nlab);
    for (size_t i = 0; i < nd->nstmts; i++) {
        const Stmt *s = nd->stmts[i];
        int o = -1;
        if (is_named(s)) {
            o = doc_lookup(od, s->name);
            if (o >= 0 && (!is_named(od->stmts[o]) || d->old_to_new[o] >= 0))
                o = -1;
        } else if (is_check(s)) {
            o = label_find(labels, nlab, s->label, d->old_to_new);
        }
        if (o >= 0) {
            d->old_to_new[o] = (int)i;
            d->new_to_old[i] = o;
        }
    }
    free(labels);

    /* Renames, in the source order of NEW: an unmatched statement takes the
     * first unmatched OLD statement of the same kind with the same formula. */
    int *orphans = xmalloc((od->nstmts + 1) * sizeof *orphans);
    size_t norphans = 0;
    for (size_t i = 0; i < od->nstmts; i++)
        if (d->old_to_new[i] < 0 && (is_named(od->stmts[i]) || is_check(od->stmts[i])))
            orphans[norphans++] = (int)i;
    Candidate *cand = xmalloc((norphans + 1) * sizeof *cand);
    size_t *open = xmalloc((norphans + 1) * sizeof *open); /* per run in source order: its first orphan not yet taken */
    for (size_t k = 0; k < norphans; k++)
        cand[k] = (Candidate){stmt_key(d, od->stmts[orphans[k]], false), k, stmt_literals(od->stmts[orphans[k]])};
    qsort(cand, norphans, sizeof *cand, cmp_candidate);
    for (size_t j = 0; j < norphans; j++)
        open[j] = j;
    for (size_t i = 0; i < nd->nstmts && norphans; i++) {
        const Stmt *s = nd->stmts[i];
        if (d->new_to_old[i] >= 0 || !(is_named(s) || is_check(s)))
            continue;
        uint64_t key = stmt_key(d, s, true);
        Literals lit = stmt_literals(s);
        int run = literal_run(&lit);
        size_t lo = candidate_find(cand, 0, norphans, key, run, -INFINITY);
        size_t end = candidate_find(cand, lo, norphans, key, run + 1, -INFINITY); /* the run ends */
        if (lo == end)
            continue;
        double wlo = 0, whi = 0;
        int taken = -1; /* the candidate that matches: the first in source order */
        if (run == LIT_FINITE) {
            /* in the order of the first literal: only the window around
             * this one's can hold a match (all of the run when the
             * tolerance gives no window) */
            size_t j = lo;
            bool windowed = literal_window(&d->opt, lit.first, &wlo, &whi);
            if (windowed)
                j = candidate_find(cand, lo, end, key, run, wlo);
            for (; j < end && (!windowed || cand[j].lit.first <= whi); j++) {
                int o = orphans[cand[j].k];
                const Stmt *os = od->stmts[o];
                if ((taken < 0 || cand[j].k < cand[taken].k) && d->old_to_new[o] < 0 &&
                    literals_may_match(d, &cand[j].lit, &lit) && is_check(os) == is_check(s) && stmt_same(d, os, s))
                    taken = (int)j;
            }
        } else {
            /* in source order: the first that matches */
            size_t j = open[lo];
            while (j < end && d->old_to_new[orphans[cand[j].k]] >= 0)
                j++;
            open[lo] = j;
            for (; j < end; j++) {
                int o = orphans[cand[j].k];
                const Stmt *os = od->stmts[o];
                if (d->old_to_new[o] < 0 && literals_may_match(d, &cand[j].lit, &lit) && is_check(os) == is_check(s) &&
                    stmt_same(d, os, s)) {
                    taken = (int)j;
                    break;
                }
            }
        }
        if (taken >= 0) {
            int o = orphans[cand[taken].k];
            d->old_to_new[o] = (int)i;
            d->new_to_old[i] = o;
            StmtChange c = {STMT_RENAMED, o, (int)i};
            PUSH(d->stmts, d->nstmts, b->cap_stmts, c);
        }
    }
    free(cand);
    free(open);
    for (size_t i = 0; i < nd->nstmts; i++) {
        const Stmt *s = nd->stmts[i];
        if (d->new_to_old[i] < 0 && (is_named(s) || is_check(s))) {
            StmtChange c = {STMT_ADDED, -1, (int)i};
            PUSH(d->stmts, d->nstmts, b->cap_stmts, c);
            d->stmt_marks[i] = MARK_ADDED;
        }
    }
    for (size_t k = 0; k < norphans; k++)
        if (d->old_to_new[orphans[k]] < 0) {
            StmtChange c = {STMT_REMOVED, orphans[k], -1};
            PUSH(d->stmts, d->nstmts, b->cap_stmts, c);
        }
    free(orphans);
    for (size_t i = 0; i < nd->nstmts; i++) {
        int o = d->new_to_old[i];
        if (o >= 0 && !stmt_same(d, od->stmts[o], nd->stmts[i])) {
            b->formula_changed[i] = true;
            d->stmt_marks[i] = MARK_CHANGED;
        }
    }
    for (size_t k = 0; k < d->nstmts; k++)
        if (d->stmts[k].kind == STMT_RENAMED)
            d->stmt_marks[d->stmts[k].new_slot] = MARK_CHANGED;
}

/* ---- values ------------------------------------------------------------- */

static bool values_differ(const Value *a, const Value *b, const DiffOptions *opt, bool *dim_changed)
{
    *dim_changed = false;
    if (a->kind != b->kind) {
        *dim_changed = true;
        return true;
    }
    switch (a->kind) {
    case VAL_NUMBER:
        if (!dim_eq(a->q.dim, b->q.dim) || a->q.temp != b->q.temp || a->q.pref != b->q.pref) {
            *dim_changed = true;
            return true;
        }
        return diff_numbers_differ(a->q.si, b->q.si, opt);
    case VAL_STRING:
        return !str_same(a->str, b->str);
    default:
        return false;
    }
}

static double relative(const Value *a, const Value *b, bool dim_changed)
{
    if (dim_changed || a->kind != VAL_NUMBER || a->q.si == 0 || !isfinite(a->q.si) || !isfinite(b->q.si))
        return NAN;
    return (b->q.si - a->q.si) / fabs(a->q.si);
}

static Unit shown_unit(const Evaluated *ev, const Value *v, const Unit *shown)
{
    if (v->kind != VAL_NUMBER)
        return (Unit){0};
    return shown && shown->text[0] ? *shown : eval_display_unit(ev, v, NULL);
}

static void add_value_change(Builder *b, bool input, const char *name, int o, int n, const Value *ov,
                             const Value *nv, const Unit *ou, const Unit *nu, bool dim_changed)
{
    Diff *d = b->d;
    ValueChange c = {0};
    c.name = name;
    c.old_slot = o;
    c.new_slot = n;
    c.old_value = *ov;
    c.new_value = *nv;
    c.old_unit = shown_unit(d->old_ev, ov, ou);
    c.new_unit = shown_unit(d->new_ev, nv, nu);
    c.dim_changed = dim_changed;
    c.rel = relative(ov, nv, dim_changed);
    c.formula_changed = !input && n >= 0 && b->formula_changed[n];
    if (input)
        PUSH(d->inputs, d->ninputs, b->cap_inputs, c);
    else
        PUSH(d->results, d->nresults, b->cap_results, c);
    if (n >= 0)
        d->stmt_marks[n] = MARK_CHANGED;
}

/* A fixtures cell as one line: "2 lavatory, 1 bidet". */
static const char *fixtures_text(Arena *a, const FittingItem *items, size_t n)
{
    StrBuf sb = {0};
    for (size_t k = 0; k < n; k++)
        sb_printf(&sb, "%s%d %s", k ? ", " : "", items[k].count, items[k].kind);
    const char *s = arena_printf(a, "%s", n ? sb_str(&sb) : "none");
    sb_free(&sb);
    return s;
}

/* One fixtures cell as an input: listed as "STMT.FIELD.fixtures" when its
 * text differs from the old revision's (an empty cell, or a row that is new,
 * reads "none"). */
static void fixture_input(Builder *b, int o, int n, const Stmt *ns, const char *field, const FittingItem *old_items,
                          size_t old_n, const FittingItem *new_items, size_t new_n)
{
    Arena *a = &b->d->arena;
    const char *tb = fixtures_text(a, new_items, new_n);
    const char *ta = fixtures_text(a, old_items, old_n);
    if (strcmp(ta, tb) == 0)
        return;
    Value ov = value_string(ta), nv = value_string(tb);
    add_value_change(b, true, arena_printf(a, "%s.%s.fixtures", ns->name, field ? field : ""), o, n, &ov, &nv, NULL,
                     NULL, false);
}

/* A path's fixtures cells are inputs (DESIGN 2.11): a changed count or kind
 * at a segment is listed as an input change "PATH.SEGMENT.fixtures". */
static void path_fixture_inputs(Builder *b, int o, int n, const Stmt *os, const Stmt *ns)
{
    const PathSpec *pa = os->path, *pb = ns->path;
    if (!pa || !pb || (!pa->has_fixtures && !pb->has_fixtures))
        return;
    for (size_t i = 0; i < pb->nsegs; i++) {
        const PathSegment *y = &pb->segs[i], *x = NULL;
        for (size_t k = 0; k < pa->nsegs && !x; k++)
            if (str_same(pa->segs[k].id, y->id))
                x = &pa->segs[k];
        fixture_input(b, o, n, ns, y->field, x ? x->fixtures : NULL, x ? x->nfixtures : 0, y->fixtures, y->nfixtures);
    }
}

/* A network's fixtures cells are inputs too: "NETWORK.NODE.fixtures". */
static void network_fixture_inputs(Builder *b, int o, int n, const Stmt *os, const Stmt *ns)
{
    const NetworkSpec *na = os->network, *nb = ns->network;
    if (!na || !nb || (!na->has_fixtures && !nb->has_fixtures))
        return;
    for (size_t i = 0; i < nb->nnodes; i++) {
        const NetNode *y = &nb->nodes[i], *x = NULL;
        for (size_t k = 0; k < na->nnodes && !x; k++)
            if (str_same(na->nodes[k].id, y->id))
                x = &na->nodes[k];
        fixture_input(b, o, n, ns, y->field, x ? x->fixtures : NULL, x ? x->nfixtures : 0, y->fixtures, y->nfixtures);
    }
}

/* Records (water properties, pipes, paths and their segments) are compared
 * field by field, each field a result named base.field. */
static size_t compare_record(Builder *b, const char *name, int o, int n, const Record *ra, const Record *rb,
                             bool nested)
{
    size_t first = b->d->nresults;
    size_t found = 0;
    Arena *a = &b->d->arena;
    static const Value none = {0};
    for (size_t i = 0; i < rb->nfields; i++) {
        const RecordField *f = &rb->fields[i];
        const Value *ov = record_get(ra, f->name);
        /* the field's full name is made only for a change or a nested record */
        if (!ov) {
            add_value_change(b, false, arena_printf(a, "%s.%s", name, f->name), o, n, &none, &f->value, NULL, NULL,
                             true);
            found++;
            continue;
        }
        if (ov->kind == VAL_RECORD && f->value.kind == VAL_RECORD) {
            found += compare_record(b, arena_printf(a, "%s.%s", name, f->name), o, n, ov->rec, f->value.rec, true);
            continue;
        }
        bool dim_changed;
        if (values_differ(ov, &f->value, &b->d->opt, &dim_changed)) {
            add_value_change(b, false, arena_printf(a, "%s.%s", name, f->name), o, n, ov, &f->value, NULL, NULL,
                             dim_changed);
            found++;
        }
    }
    for (size_t i = 0; i < ra->nfields; i++)
        if (!record_get(rb, ra->fields[i].name)) {
            const char *fname = arena_printf(a, "%s.%s", name, ra->fields[i].name);
            add_value_change(b, false, fname, o, n, &ra->fields[i].value, &none, NULL, NULL, true);
            found++;
        }
    if (nested)
        for (size_t i = first; i < b->d->nresults; i++)
            if (!b->d->results[i].record) {
                b->d->results[i].record = name;
                b->d->results[i].field = b->d->results[i].name + strlen(name) + 1;
            }
    return found;
}

static void compare_values(Builder *b)
{
    Diff *d = b->d;
    const Document *od = b->od, *nd = b->nd;
    for (size_t i = 0; i < nd->nstmts; i++) {
        int o = d->new_to_old[i];
        const Stmt *ns = nd->stmts[i];
        if (o < 0 || !is_named(ns) || !is_named(od->stmts[o]))
            continue;
        const StmtResult *ro = &d->old_ev->results[o], *rn = &d->new_ev->results[i];
        if (ro->state != RES_OK || rn->state != RES_OK)
            continue;
        bool input = is_input(ns) && is_input(od->stmts[o]);
        if (ns->kind == STMT_PATH && od->stmts[o]->kind == STMT_PATH)
            path_fixture_inputs(b, o, (int)i, od->stmts[o], ns);
        if (ns->kind == STMT_NETWORK && od->stmts[o]->kind == STMT_NETWORK)
            network_fixture_inputs(b, o, (int)i, od->stmts[o], ns);
        const Value *ov = &ro->value, *nv = &rn->value;
        size_t found = 0;
        bool dim_changed = false;
        if (ov->kind == VAL_RECORD && nv->kind == VAL_RECORD) {
            found = compare_record(b, ns->name, o, (int)i, ov->rec, nv->rec, false);
        } else if (values_differ(ov, nv, &d->opt, &dim_changed)) {
            add_value_change(b, input, ns->name, o, (int)i, ov, nv, ro->shown, rn->shown, dim_changed);
            found = 1;
        }
        if (!found && b->formula_changed[i])
            add_value_change(b, false, ns->name, o, (int)i, ov, nv, ro->shown, rn->shown, false);
    }
}

/* Each result lists the changed inputs it depends on: a bitset per NEW
 * statement over the changed inputs, ORed along Stmt.deps in slot order. */
static void trace_inputs(Builder *b)
{
    Diff *d = b->d;
    const Document *nd = b->nd;
    size_t k = d->ninputs;
    if (k == 0 || d->nresults == 0)
        return;
    size_t words = (k + 63) / 64;
    uint64_t *bits = xcalloc(nd->nstmts * words, sizeof *bits);
    for (size_t j = 0; j < k; j++) {
        int n = d->inputs[j].new_slot;
        bits[(size_t)n * words + j / 64] |= (uint64_t)1 << (j % 64);
    }
    for (size_t i = 0; i < nd->nstmts; i++) {
        const Stmt *s = nd->stmts[i];
        uint64_t *mine = bits + i * words;
        for (size_t q = 0; q < s->ndeps; q++) {
            int dep = s->deps[q];
            if (dep < 0 || (size_t)dep >= i)
                continue;
            const uint64_t *theirs = bits + (size_t)dep * words;
            for (size_t w = 0; w < words; w++)
                mine[w] |= theirs[w];
        }
    }
    for (size_t r = 0; r < d->nresults; r++) {
        ValueChange *c = &d->results[r];
        if (c->new_slot < 0)
            continue;
        const uint64_t *mine = bits + (size_t)c->new_slot * words;
        size_t count = 0;
        for (size_t j = 0; j < k; j++)
            count += (mine[j / 64] >> (j % 64)) & 1;
        if (!count)
            continue;
        size_t *list = arena_alloc(&d->arena, count * sizeof *list);
        size_t m = 0;
        for (size_t j = 0; j < k; j++)
            if ((mine[j / 64] >> (j % 64)) & 1)
                list[m++] = j;
        c->inputs = list;
        c->ninputs = count;
    }
    free(bits);
}

/* ---- checks ------------------------------------------------------------- */

static void compare_checks(Builder *b)
{
    Diff *d = b->d;
    const Document *nd = b->nd;
    /* Three passes keep the order: now fails, now holds, then the rest. */
    for (int pass = 0; pass < 3; pass++) {
        for (size_t i = 0; i < nd->nstmts; i++) {
            int o = d->new_to_old[i];
            if (o < 0 || !is_check(nd->stmts[i]) || nd->stmts[i]->finding || b->od->stmts[o]->finding)
                continue;
            const StmtResult *ro = &d->old_ev->results[o], *rn = &d->new_ev->results[i];
            if (ro->state != RES_OK || rn->state != RES_OK)
                continue;
            CheckChange c = {0};
            c.old_slot = o;
            c.new_slot = (int)i;
            c.old_util = ro->utilization;
            c.new_util = rn->utilization;
            c.condition_changed = b->formula_changed[i];
            if (ro->holds && !rn->holds)
                c.kind = CHECK_NOW_FAILS;
            else if (!ro->holds && rn->holds)
                c.kind = CHECK_NOW_HOLDS;
            else if (diff_numbers_differ(ro->utilization, rn->utilization, &d->opt))
                c.kind = CHECK_UTILISATION;
            else if (c.condition_changed)
                c.kind = CHECK_CONDITION;
            else
                continue;
            int want = c.kind == CHECK_NOW_FAILS ? 0 : c.kind == CHECK_NOW_HOLDS ? 1 : 2;
            if (want != pass)
                continue;
            PUSH(d->checks, d->nchecks, b->cap_checks, c);
            d->stmt_marks[i] = MARK_CHANGED;
        }
    }
}

/* A finding changes when its answer flips or its condition is rewritten;
 * it has no utilisation to move. */
static void compare_findings(Builder *b)
{
    Diff *d = b->d;
    const Document *nd = b->nd;
    for (size_t i = 0; i < nd->nstmts; i++) {
        int o = d->new_to_old[i];
        if (o < 0 || !is_finding(nd->stmts[i]) || !is_finding(b->od->stmts[o]))
            continue;
        const StmtResult *ro = &d->old_ev->results[o], *rn = &d->new_ev->results[i];
        if (ro->state != RES_OK || rn->state != RES_OK)
            continue;
        CheckChange c = {0};
        c.old_slot = o;
        c.new_slot = (int)i;
        c.old_util = c.new_util = NAN;
        c.condition_changed = b->formula_changed[i];
        if (ro->holds != rn->holds)
            c.kind = ro->holds ? CHECK_NOW_FAILS : CHECK_NOW_HOLDS;
        else if (c.condition_changed)
            c.kind = CHECK_CONDITION;
        else
            continue;
        PUSH(d->findings, d->nfindings, b->cap_findings, c);
        d->stmt_marks[i] = MARK_CHANGED;
    }
}

/* ---- citations ---------------------------------------------------------- */

static int source_find(const Document *doc, const char *key)
{
    for (size_t i = 0; i < doc->nsources; i++)
        if (str_same(doc->sources[i].key, key))
            return (int)i;
    return -1;
}

static bool cites_contain(const Stmt *s, const char *key)
{
    for (size_t i = 0; i < s->ncites; i++)
        if (str_same(s->cites[i].key, key))
            return true;
    return false;
}

static void compare_citations(Builder *b)
{
    Diff *d = b->d;
    const Document *od = b->od, *nd = b->nd;
    for (size_t i = 0; i < nd->nsources; i++) {
        int o = source_find(od, nd->sources[i].key);
        if (o >= 0 && str_same(od->sources[o].text, nd->sources[i].text))
            continue;
        CiteChange c = {o >= 0 ? CITE_SOURCE_CHANGED : CITE_SOURCE_ADDED, o, (int)i, -1, -1};
        PUSH(d->cites, d->ncites, b->cap_cites, c);
    }
    for (size_t i = 0; i < od->nsources; i++)
        if (source_find(nd, od->sources[i].key) < 0) {
            CiteChange c = {CITE_SOURCE_REMOVED, (int)i, -1, -1, -1};
            PUSH(d->cites, d->ncites, b->cap_cites, c);
        }
    for (size_t i = 0; i < nd->nstmts; i++) {
        int o = d->new_to_old[i];
        if (o < 0)
            continue;
        const Stmt *os = od->stmts[o], *ns = nd->stmts[i];
        bool same = os->ncites == ns->ncites;
        for (size_t k = 0; same && k < ns->ncites; k++)
            same = cites_contain(os, ns->cites[k].key) && cites_contain(ns, os->cites[k].key);
        if (same)
            continue;
        CiteChange c = {CITE_STMT_CITES, -1, -1, o, (int)i};
        PUSH(d->cites, d->ncites, b->cap_cites, c);
        d->stmt_marks[i] = MARK_CHANGED;
    }
}

/* ---- prose -------------------------------------------------------------- */

static void inline_text(const Inline *in, StrBuf *out)
{
    for (; in; in = in->next) {
        switch (in->kind) {
        case INL_TEXT:
        case INL_CODE:
            sb_puts(out, in->text ? in->text : "");
            break;
        case INL_SOFTBREAK:
        case INL_LINEBREAK:
            sb_putc(out, ' ');
            break;
        case INL_VALUE:
            sb_printf(out, "{%s%s%s%s%s}", in->text ? in->text : "", in->field ? "." : "", in->field ? in->field : "",
                      in->has_as ? " as " : "", in->has_as ? in->as_unit.text : "");
            break;
        case INL_LINK:
            inline_text(in->children, out);
            sb_printf(out, " <%s>", in->url ? in->url : "");
            break;
        default:
            inline_text(in->children, out);
            break;
        }
    }
}

static void block_text(const Block *b, StrBuf *out)
{
    for (; b; b = b->next) {
        switch (b->kind) {
        case BLK_PARAGRAPH:
        case BLK_HEADING:
        case BLK_TABLE_CELL:
            inline_text(b->inlines, out);
            sb_putc(out, b->kind == BLK_TABLE_CELL ? '|' : '\n');
            break;
        case BLK_CODE:
        case BLK_HTML:
            sb_puts(out, b->text ? b->text : "");
            sb_putc(out, '\n');
            break;
        case BLK_ITEM:
            sb_puts(out, "- ");
            block_text(b->children, out);
            break;
        case BLK_TABLE_ROW:
            block_text(b->children, out);
            sb_putc(out, '\n');
            break;
        case BLK_LIST:
        case BLK_QUOTE:
        case BLK_TABLE:
            block_text(b->children, out);
            break;
        default:
            break;
        }
    }
}

/* One paragraph of a section: a prose block or a calc note. */
typedef struct Para {
    const char *text;
    const Block *block;      /* NULL for a note */
    int note_slot;
    bool matched;
} Para;

typedef struct Section {
    const Block *heading;    /* NULL: before the first heading */
    const char *title;       /* plain heading text */
    int line;
    Para *paras;
    size_t npara, cap;
    int other;               /* the matching section on the other side, -1 */
} Section;

static Section *sections_of(Arena *a, const Document *doc, size_t *count)
{
    size_t n = 1, cap = 8;
    Section *secs = xcalloc(cap, sizeof *secs);
    secs[0].other = -1;
    secs[0].title = "";
    StrBuf sb = {0};
    for (const Block *b = doc->blocks; b; b = b->next) {
        if (b->kind == BLK_HEADING) {
            sb_clear(&sb);
            inline_text(b->inlines, &sb);
            Section s = {b, arena_strdup(a, sb_str(&sb)), b->pos.line, NULL, 0, 0, -1};
            PUSH(secs, n, cap, s);
            continue;
        }
        Section *cur = &secs[n - 1];
        if (b->kind == BLK_CALC) {
            for (size_t i = 0; i < b->nstmts; i++) {
                const Stmt *s = doc->stmts[b->first_stmt + i];
                if (s->kind != STMT_NOTE)
                    continue;
                Para p = {arena_printf(a, "note: %s", s->description ? s->description : ""), NULL, s->index, false};
                PUSH(cur->paras, cur->npara, cur->cap, p);
            }
            continue;
        }
        if (b->kind == BLK_PATH || b->kind == BLK_NETWORK || b->kind == BLK_CURVE || b->kind == BLK_CASES ||
            b->kind == BLK_SOURCES || b->kind == BLK_RULE)
            continue;
        sb_clear(&sb);
        const Block one = {.kind = b->kind, .inlines = b->inlines, .text = b->text, .children = b->children};
        block_text(&one, &sb);
        Para p = {arena_strdup(a, sb_str(&sb)), b, -1, false};
        PUSH(cur->paras, cur->npara, cur->cap, p);
    }
    sb_free(&sb);
    *count = n;
    return secs;
}

static void free_sections(Section *secs, size_t n)
{
    for (size_t i = 0; i < n; i++)
        free(secs[i].paras);
    free(secs);
}

static void mark_para(Builder *b, const Para *p, DiffMark m, BlockMark *marks, size_t *nmarks)
{
    if (p->block)
        marks[(*nmarks)++] = (BlockMark){p->block, m};
    else if (p->note_slot >= 0 && b->d->stmt_marks[p->note_slot] == MARK_SAME)
        b->d->stmt_marks[p->note_slot] = m;
}

static int cmp_block_mark(const void *a, const void *b)
{
    uintptr_t x = (uintptr_t)((const BlockMark *)a)->block, y = (uintptr_t)((const BlockMark *)b)->block;
    return (x > y) - (x < y);
}

static void compare_prose(Builder *b)
{
    Diff *d = b->d;
    size_t no, nn;
    Section *os = sections_of(&d->arena, b->od, &no);
    Section *ns = sections_of(&d->arena, b->nd, &nn);
    size_t total = 0;
    for (size_t i = 0; i < nn; i++)
        total += ns[i].npara + 1;
    BlockMark *marks = xmalloc((total + 1) * sizeof *marks);
    size_t nmarks = 0;

    /* Sections match by heading text, in order among equal headings; the
     * part before the first heading matches its counterpart. */
    os[0].other = 0;
    ns[0].other = 0;
    for (size_t i = 1; i < nn; i++)
        for (size_t k = 1; k < no; k++)
            if (os[k].other < 0 && strcmp(os[k].title, ns[i].title) == 0) {
                os[k].other = (int)i;
                ns[i].other = (int)k;
                break;
            }
    /* A reworded heading: the unmatched sections of the same number. */
    for (size_t i = 1; i < nn; i++)
        for (size_t k = 1; k < no && ns[i].other < 0; k++)
            if (os[k].other < 0 && strcmp(os[k].heading->number, ns[i].heading->number) == 0) {
                os[k].other = (int)i;
                ns[i].other = (int)k;
            }
    for (size_t i = 0; i < nn; i++) {
        Section *s = &ns[i];
        ProseChange c = {PROSE_CHANGED, s->heading ? s->heading->number : "", s->heading ? s->title : NULL,
                         NULL, s->line, 0, 0, 0};
        if (s->other < 0) {
            c.kind = PROSE_ADDED;
            c.added = s->npara;
            marks[nmarks++] = (BlockMark){s->heading, MARK_ADDED};
            for (size_t p = 0; p < s->npara; p++)
                mark_para(b, &s->paras[p], MARK_ADDED, marks, &nmarks);
            PUSH(d->prose, d->nprose, b->cap_prose, c);
            continue;
        }
        Section *o = &os[s->other];
        bool reworded = strcmp(o->title, s->title) != 0;
        if (reworded) {
            c.old_heading = o->title;
            marks[nmarks++] = (BlockMark){s->heading, MARK_CHANGED};
        }
        for (size_t p = 0; p < s->npara; p++)
            for (size_t q = 0; q < o->npara; q++)
                if (!o->paras[q].matched && strcmp(o->paras[q].text, s->paras[p].text) == 0) {
                    o->paras[q].matched = s->paras[p].matched = true;
                    break;
                }
        size_t un = 0, uo = 0;
        for (size_t p = 0; p < s->npara; p++)
            un += !s->paras[p].matched;
        for (size_t q = 0; q < o->npara; q++)
            uo += !o->paras[q].matched;
        if (!un && !uo && !reworded)
            continue;
        c.changed = un < uo ? un : uo;
        c.added = un - c.changed;
        c.removed = uo - c.changed;
        size_t seen = 0;
        for (size_t p = 0; p < s->npara; p++)
            if (!s->paras[p].matched)
                mark_para(b, &s->paras[p], seen++ < c.changed ? MARK_CHANGED : MARK_ADDED, marks, &nmarks);
        PUSH(d->prose, d->nprose, b->cap_prose, c);
    }
    for (size_t k = 1; k < no; k++)
        if (os[k].other < 0) {
            ProseChange c = {PROSE_REMOVED, os[k].heading->number, os[k].title, NULL, os[k].line, 0, 0, os[k].npara};
            PUSH(d->prose, d->nprose, b->cap_prose, c);
        }
    qsort(marks, nmarks, sizeof *marks, cmp_block_mark);
    d->block_marks = to_arena(d, marks, nmarks, sizeof *marks);
    d->nblock_marks = nmarks;
    free_sections(os, no);
    free_sections(ns, nn);
}

/* ---- the whole diff ----------------------------------------------------- */

/* A figure changes when anything it reads does. */
static void mark_readers(Diff *d, const Document *nd)
{
    for (size_t i = 0; i < nd->nstmts; i++) {
        const Stmt *s = nd->stmts[i];
        if (s->kind != STMT_FIGURE || d->stmt_marks[i] != MARK_SAME)
            continue;
        for (size_t q = 0; q < s->ndeps; q++)
            if (s->deps[q] >= 0 && (size_t)s->deps[q] < i && d->stmt_marks[s->deps[q]] != MARK_SAME)
                d->stmt_marks[i] = MARK_CHANGED;
    }
}

/* A used file's name relative to the directory of the calc that uses it,
 * so old/basis.calc.md and new/basis.calc.md (or two revisions) match. */
static const char *use_name(const Document *user, const UsedFile *u)
{
    const char *base = user->file, *slash = strrchr(base, '/');
    const char *colon = user->from_git ? strchr(base, ':') : NULL;
    const char *end = slash ? slash + 1 : colon ? colon + 1 : base;
    size_t n = (size_t)(end - base);
    if (strncmp(u->file, base, n) == 0)
        return u->file + n;
    return u->file;
}

static const UsedFile *use_find(const Evaluated *ev, const char *name)
{
    for (size_t i = 0; i < ev->nused; i++)
        if (strcmp(use_name(ev->doc, ev->used[i]), name) == 0)
            return ev->used[i];
    return NULL;
}

/* Does a use statement's file read `u` (it is u, or uses it)? */
static bool reads_file(const Record *rec, const UsedFile *u)
{
    const UsedFile *f = use_of_record(rec);
    if (!f)
        return false;
    if (f == u)
        return true;
    for (size_t i = 0; i < f->ev->nused; i++)
        if (f->ev->used[i] == u)
            return true;
    return false;
}

/* The results of NEW that depend on the used file `u`. */
static void moved_by(Diff *d, const Document *nd, const UsedFile *u, UseChange *c)
{
    bool *dep = xcalloc(nd->nstmts + 1, sizeof *dep);
    for (size_t i = 0; i < nd->nstmts; i++) {
        const StmtResult *r = &d->new_ev->results[i];
        dep[i] = doc_stmt_use(nd->stmts[i]) && r->state == RES_OK && r->value.kind == VAL_RECORD &&
                 reads_file(r->value.rec, u);
        for (size_t k = 0; k < nd->stmts[i]->ndeps && !dep[i]; k++)
            dep[i] = dep[nd->stmts[i]->deps[k]];
    }
    c->moved = arena_alloc(&d->arena, (d->nresults + 1) * sizeof *c->moved);
    for (size_t i = 0; i < d->nresults; i++)
        if (d->results[i].new_slot >= 0 && dep[d->results[i].new_slot])
            c->moved[c->nmoved++] = i;
    free(dep);
}

static void compare_uses(Diff *d)
{
    const Evaluated *o = d->old_ev, *n = d->new_ev;
    d->uses = arena_alloc(&d->arena, (o->nused + n->nused + 1) * sizeof *d->uses);
    for (size_t i = 0; i < n->nused; i++) {
        const UsedFile *nu = n->used[i];
        const char *name = use_name(n->doc, nu);
        const UsedFile *ou = use_find(o, name);
        if (ou && strcmp(ou->doc->digest, nu->doc->digest) == 0)
            continue;
        UseChange *c = &d->uses[d->nuses++];
        c->kind = ou ? USE_CHANGED : USE_ADDED;
        c->name = name;
        c->old_digest = ou ? ou->doc->digest : NULL;
        c->new_digest = nu->doc->digest;
        moved_by(d, n->doc, nu, c);
    }
    for (size_t i = 0; i < o->nused; i++) {
        const char *name = use_name(o->doc, o->used[i]);
        if (use_find(n, name))
            continue;
        UseChange *c = &d->uses[d->nuses++];
        c->kind = USE_REMOVED;
        c->name = name;
        c->old_digest = o->used[i]->doc->digest;
    }
}

Diff *diff_compute(const Evaluated *old_ev, const Evaluated *new_ev, const DiffOptions *opt)
{
    Diff *d = xcalloc(1, sizeof *d);
    arena_init(&d->arena);
    d->old_ev = old_ev;
    d->new_ev = new_ev;
    d->opt = opt ? *opt : diff_options_default();
    Builder b = {0};
    b.d = d;
    b.od = old_ev->doc;
    b.nd = new_ev->doc;
    d->old_to_new = arena_alloc(&d->arena, (b.od->nstmts + 1) * sizeof *d->old_to_new);
    d->new_to_old = arena_alloc(&d->arena, (b.nd->nstmts + 1) * sizeof *d->new_to_old);
    for (size_t i = 0; i < b.od->nstmts; i++)
        d->old_to_new[i] = -1;
    for (size_t i = 0; i < b.nd->nstmts; i++)
        d->new_to_old[i] = -1;
    d->stmt_marks = arena_alloc(&d->arena, (b.nd->nstmts + 1) * sizeof *d->stmt_marks);
    b.formula_changed = xcalloc(b.nd->nstmts + 1, sizeof *b.formula_changed);

    compare_meta(&b);
    match_statements(&b);
    compare_values(&b);
    trace_inputs(&b);
    compare_checks(&b);
    compare_findings(&b);
    compare_citations(&b);
    compare_prose(&b);
    mark_readers(d, b.nd);
    free(b.formula_changed);

    d->meta = to_arena(d, d->meta, d->nmeta, sizeof *d->meta);
    d->inputs = to_arena(d, d->inputs, d->ninputs, sizeof *d->inputs);
    d->results = to_arena(d, d->results, d->nresults, sizeof *d->results);
    d->checks = to_arena(d, d->checks, d->nchecks, sizeof *d->checks);
    d->findings = to_arena(d, d->findings, d->nfindings, sizeof *d->findings);
    d->stmts = to_arena(d, d->stmts, d->nstmts, sizeof *d->stmts);
    d->cites = to_arena(d, d->cites, d->ncites, sizeof *d->cites);
    d->prose = to_arena(d, d->prose, d->nprose, sizeof *d->prose);
    compare_uses(d);

    bool meta_changed = false;
    for (size_t i = 0; i < d->nmeta; i++)
        meta_changed |= !d->meta[i].display_only;
    d->changed = meta_changed || d->ninputs || d->nresults || d->nchecks || d->nfindings || d->nstmts ||
                 d->ncites || d->nprose;
    return d;
}

void diff_free(Diff *d)
{
    if (!d)
        return;
    arena_free(&d->arena);
    free(d);
}

DiffMark diff_stmt_mark(const Diff *d, size_t slot)
{
    return slot < d->new_ev->doc->nstmts ? d->stmt_marks[slot] : MARK_SAME;
}

DiffMark diff_block_mark(const Diff *d, const Block *b)
{
    size_t lo = 0, hi = d->nblock_marks;
    while (lo < hi) {
        size_t mid = (lo + hi) / 2;
        if ((uintptr_t)d->block_marks[mid].block < (uintptr_t)b)
            lo = mid + 1;
        else
            hi = mid;
    }
    return lo < d->nblock_marks && d->block_marks[lo].block == b ? d->block_marks[lo].mark : MARK_SAME;
}
