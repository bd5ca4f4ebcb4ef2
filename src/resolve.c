/* resolve.c — name resolution: names -> slots, dependencies, citations.
 *
 * Where the language's two rules are enforced: a name is defined once, and
 * only used after its definition. It also records, for each statement, the
 * slots it reads, which the evaluator follows to re-evaluate dependents
 * during `solve` and parametric cases; checks that check labels are unique
 * and that cited sources exist; resolves the inline values of the prose and
 * the inputs of `cases` tables; and warns of names that look alike. An
 * unknown name gets the nearest defined one as a suggestion (suggest.c). */
#include "resolve.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "lexicon.h"
#include "library.h"
#include "lookalike.h"
#include "strmap.h"
#include "suggest.h"
#include "uses.h"

/* ---- name table: open addressing, names -> slots ---------------------- */

/* A name and its slot side by side: a look-up reads one entry (at 100,000
 * names the table is megabytes, and two arrays were two cache misses). */
typedef struct NameEntry {
    const char *key;
    int slot;
} NameEntry;

struct NameTable {
    NameEntry *at;
    size_t cap;
    size_t len;
};

static uint64_t hash_name(const char *s)
{
    uint64_t h = 1469598103934665603u; /* FNV-1a */
    for (; *s; s++) {
        h ^= (unsigned char)*s;
        h *= 1099511628211u;
    }
    return h;
}

static NameTable *names_new(Arena *a, size_t expected)
{
    NameTable *t = arena_alloc(a, sizeof *t);
    size_t cap = 16;
    while (cap < expected * 2 + 1)
        cap *= 2;
    t->cap = cap;
    t->at = arena_alloc(a, cap * sizeof *t->at);
    return t;
}

static size_t names_find(const NameTable *t, const char *name)
{
    size_t i = (size_t)hash_name(name) & (t->cap - 1);
    while (t->at[i].key && strcmp(t->at[i].key, name) != 0)
        i = (i + 1) & (t->cap - 1);
    return i;
}

int doc_lookup(const Document *doc, const char *name)
{
    if (!doc->names)
        return -1;
    size_t i = names_find(doc->names, name);
    return doc->names->at[i].key ? doc->names->at[i].slot : -1;
}

/* ---- resolution --------------------------------------------------------- */

typedef struct Resolver {
    Document *doc;
    DiagList *diags;
    int current;             /* statement being resolved */
    Vec deps;                /* slots read, as (void *)(intptr_t)(slot + 1) */
    const Expr *use_top;     /* the whole right-hand side of a definition: where use() may stand */
} Resolver;

typedef struct NearFn {
    const char *name, *best;
    size_t best_d;
} NearFn;

static void near_builtin(const Builtin *b, void *vctx)
{
    NearFn *n = vctx;
    size_t d = suggest_distance_str(n->name, b->name);
    if (d < n->best_d) {
        n->best_d = d;
        n->best = b->name;
    }
}

/* The closest library function to a called unknown name, for "did you
 * mean" (`friction_factr(...)`), or NULL. */
static const char *closest_function(const char *name)
{
    NearFn n = {name, NULL, (strlen(name) <= 3 ? 1 : 2) + 1};
    builtin_each(near_builtin, &n);
    return n.best;
}

/* The closest name defined before `before`, for "did you mean". */
static const char *closest_name(const Document *doc, const char *name, int before, const DiagList *diags)
{
    if (diags->errors >= SUGGEST_MAX_ERRORS)
        return NULL; /* a file of nothing but unknown names: stop searching */
    const char *best = NULL;
    size_t best_d = strlen(name) <= 3 ? 1 : 2;
    best_d++;
    /* The nearest SUGGEST_MAX_NAMES names only, so a file of many unknown
     * names among many defined ones stays linear. */
    int first = before > SUGGEST_MAX_NAMES ? before - SUGGEST_MAX_NAMES : 0;
    for (int i = first; i < before && i < (int)doc->nstmts; i++) {
        const Stmt *s = doc->stmts[i];
        if (!s->name || s->kind == STMT_CHECK)
            continue;
        size_t d = suggest_distance_str(name, s->name);
        if (d < best_d) {
            best_d = d;
            best = s->name;
        }
    }
    return best;
}

static void note_dep(Resolver *r, int slot)
{
    if (slot >= 0)
        vec_push(&r->deps, (void *)(intptr_t)(slot + 1));
}

static int resolve_name(Resolver *r, const char *name, Pos pos, bool called)
{
    const NamedConstant *k = lexicon_constant(name, strlen(name));
    if (k)
        return k->slot;
    int slot = doc_lookup(r->doc, name);
    if (slot >= 0 && slot < r->current) {
        note_dep(r, slot);
        return slot;
    }
    if (slot >= 0) {
        const Stmt *def = r->doc->stmts[slot];
        if (slot == r->current)
            diag_error(r->diags, pos, "'%s' is used in its own definition", name);
        else
            diag_error(r->diags, pos, "'%s' is used before its definition at %d:%d", name, def->name_pos.line,
                       def->name_pos.col);
        return SLOT_UNRESOLVED;
    }
    if (builtin_lookup(name)) {
        diag_error(r->diags, pos, "'%s' is a function; call it as %s(...)", name, name);
        return SLOT_UNRESOLVED;
    }
    const char *near = closest_name(r->doc, name, r->current, r->diags);
    const char *fn = called && r->diags->errors < SUGGEST_MAX_ERRORS ? closest_function(name) : NULL;
    if (fn)
        diag_error(r->diags, pos, "unknown function '%s'; did you mean %s?", name, fn);
    else if (near)
        diag_error(r->diags, pos, "unknown name '%s'; did you mean %s?", name, near);
    else
        diag_error(r->diags, pos, "unknown name '%s'", name);
    return SLOT_UNRESOLVED;
}

static int resolve_expr(Resolver *r, Expr *e)
{
    if (!e)
        return 0;
    int ok = 1;
    switch (e->kind) {
    case EXPR_NUMBER:
    case EXPR_STRING:
        break;
    case EXPR_NAME:
        e->slot = resolve_name(r, e->text, e->pos, false);
        ok = e->slot != SLOT_UNRESOLVED;
        break;
    case EXPR_NEG:
    case EXPR_PAREN:
    case EXPR_FIELD:
        ok = resolve_expr(r, e->lhs);
        break;
    case EXPR_BINARY:
        ok = resolve_expr(r, e->lhs);
        ok = resolve_expr(r, e->rhs) && ok;
        break;
    case EXPR_CALL:
        if (strcmp(e->text, "use") == 0 && doc_lookup(r->doc, e->text) < 0) {
            /* use() reads a file: a statement of its own, with the name in quotes */
            if (e != r->use_top)
                diag_error(r->diags, e->pos, "use(...) binds another calc file and stands alone: "
                                             "NAME = use(\"file.calc.md\")");
            else if (e->call->nargs != 1 || e->call->nkw != 0 || e->call->args[0]->kind != EXPR_STRING)
                diag_error(r->diags, e->pos, "use takes one file name in quotes: NAME = "
                                             "use(\"basis.calc.md\")");
            else if (!e->call->args[0]->text[0])
                diag_error(r->diags, e->call->args[0]->pos, "use: the file name is empty");
            else
                break;
            ok = 0;
            break;
        }
        if (!builtin_lookup(e->text) && e->call != &expr_no_call) {
            /* a call node's arguments are its own (parse_args), not the
             * shared empty ones: where it calls is written there */
            ExprCall *call = (ExprCall *)e->call;
            int slot = doc_lookup(r->doc, e->text);
            if (slot >= 0 && slot < r->current) {
                call->callee_slot = slot;
                note_dep(r, slot);
            } else {
                call->callee_slot = resolve_name(r, e->text, e->pos, true);
                if (call->callee_slot == SLOT_PI || call->callee_slot == SLOT_G)
                    diag_error(r->diags, e->pos, "'%s' is a constant (a number) and cannot be called", e->text);
                if (call->callee_slot < 0) {
                    call->callee_slot = -1;
                    ok = 0;
                }
            }
        }
        for (size_t i = 0; i < e->call->nargs; i++)
            ok = resolve_expr(r, e->call->args[i]) && ok;
        for (size_t i = 0; i < e->call->nkw; i++)
            ok = resolve_expr(r, e->call->kw[i]) && ok;
        break;
    }
    return ok;
}

static int cmp_int(const void *a, const void *b)
{
    int x = *(const int *)a, y = *(const int *)b;
    return (x > y) - (x < y);
}

static const char *script_name(unsigned cp)
{
    return cp >= 0x0400 && cp <= 0x052F ? "Cyrillic" : "Greek";
}

/* Names that print alike but are different names: one that mixes Latin and
 * Cyrillic letters, and two whose skeletons (look-alike letters replaced by
 * their Latin twins) are the same. Warnings at the later name. */
static bool name_is_ascii(const char *s)
{
    for (; *s; s++)
        if ((unsigned char)*s >= 0x80)
            return false;
    return true;
}

/* `any`: some statement's name is not all ASCII. Two different all-ASCII
 * names never share a skeleton: only such a calc has anything to compare. */
static void warn_lookalikes(Document *doc, DiagList *diags, bool any)
{
    if (!any)
        return;
    StrMap skeletons = {0}; /* skeleton -> first statement with it */
    char **skel = xcalloc(doc->nstmts + 1, sizeof *skel);
    for (size_t i = 0; i < doc->nstmts; i++) {
        const Stmt *s = doc->stmts[i];
        if ((s->kind != STMT_DEF && s->kind != STMT_SOLVE && s->kind != STMT_PATH) || !s->name ||
            s->parse_failed)
            continue;
        char buf[256];
        int scripts;
        unsigned twin;
        if (!lookalike_skeleton(s->name, buf, sizeof buf, &scripts, &twin))
            continue;
        if ((scripts & LOOK_LATIN) && (scripts & LOOK_CYRILLIC))
            diag_warning(diags, s->name_pos, "name '%s' mixes Latin and Cyrillic letters; it prints like "
                                             "'%s' but is another name", s->name, buf);
        skel[i] = arena_strdup(&doc->arena, buf);
        size_t first;
        if (!strmap_add(&skeletons, skel[i], i, &first) && strcmp(doc->stmts[first]->name, s->name) != 0) {
            const Stmt *f = doc->stmts[first];
            unsigned t2;
            int sc2;
            char b2[256];
            lookalike_skeleton(f->name, b2, sizeof b2, &sc2, &t2);
            unsigned cp = twin ? twin : t2;
            diag_warning(diags, s->name_pos, "name '%s' looks like '%s' (defined at %d:%d) but is another "
                                             "name: U+%04X is a %s letter, not a Latin one",
                         s->name, f->name, f->name_pos.line, f->name_pos.col, cp, script_name(cp));
        }
    }
    strmap_free(&skeletons);
    free(skel);
}

static void resolve_statements(Document *doc, DiagList *diags)
{
    doc->names = names_new(&doc->arena, doc->nstmts);
    /* First pass: every definition, so "used before its definition" can name
     * the later line. A name defined twice keeps its first definition. The
     * same pass counts the check labels and notes a name outside ASCII. */
    size_t nlabels = 0;
    bool non_ascii = false;
    for (size_t i = 0; i < doc->nstmts; i++) {
        Stmt *s = doc->stmts[i];
        nlabels += s->kind == STMT_CHECK && s->label;
        if (s->name && !non_ascii)
            non_ascii = !name_is_ascii(s->name);
        if ((s->kind != STMT_DEF && s->kind != STMT_SOLVE && s->kind != STMT_PATH && s->kind != STMT_NETWORK &&
             s->kind != STMT_CURVE) ||
            !s->name)
            continue;
        size_t k = names_find(doc->names, s->name);
        if (doc->names->at[k].key) {
            const Stmt *first = doc->stmts[doc->names->at[k].slot];
            diag_error(diags, s->name_pos, "'%s' is already defined at %d:%d; names are assigned once", s->name,
                       first->name_pos.line, first->name_pos.col);
            s->parse_failed = 1;
            continue;
        }
        doc->names->at[k] = (NameEntry){s->name, (int)i};
        doc->names->len++;
    }
    warn_lookalikes(doc, diags, non_ascii);
    /* Check labels are unique: reviewers and diffs refer to them. The
     * table is sized for the labels, not for every statement. */
    NameTable *labels = names_new(&doc->arena, nlabels);
    for (size_t i = 0; i < doc->nstmts; i++) {
        Stmt *s = doc->stmts[i];
        if (s->kind != STMT_CHECK || !s->label)
            continue;
        size_t k = names_find(labels, s->label);
        if (labels->at[k].key) {
            const Stmt *first = doc->stmts[labels->at[k].slot];
            diag_error(diags, s->name_pos, "%s '%s' is already defined at %d:%d", first->finding ? "finding" : "check",
                       s->label, first->pos.line,
                       first->pos.col);
            continue;
        }
        labels->at[k] = (NameEntry){s->label, (int)i};
    }

    StrMap source_keys = {0};
    for (size_t k = 0; k < doc->nsources; k++)
        strmap_add(&source_keys, doc->sources[k].key, k, NULL);
    Resolver r = {doc, diags, 0, {0}, NULL};
    for (size_t i = 0; i < doc->nstmts; i++) {
        Stmt *s = doc->stmts[i];
        r.current = (int)i;
        r.deps.len = 0;
        for (size_t c = 0; c < s->ncites; c++) {
            Cite *ct = &s->cites[c];
            size_t k;
            if (strmap_get(&source_keys, ct->key, &k)) {
                ct->source = (int)k;
                doc->sources[k].cited = true;
            }
            if (ct->source < 0) {
                if (doc->nsources)
                    diag_error(diags, ct->pos, "unknown source key '%s' (define it in a ```sources block)", ct->key);
                else
                    diag_error(diags, ct->pos, "unknown source key '%s': the file has no ```sources block", ct->key);
            }
        }
        if (s->parse_failed || s->kind == STMT_NOTE)
            continue;
        int ok = 1;
        if (s->kind == STMT_DEF) {
            r.use_top = s->expr;
            ok = resolve_expr(&r, s->expr);
            r.use_top = NULL;
        } else if (s->kind == STMT_CHECK) {
            ok = resolve_expr(&r, s->lhs);
            ok = resolve_expr(&r, s->rhs) && ok;
        } else if (s->kind == STMT_PATH) {
            PathSpec *ps = s->path;
            ok = resolve_expr(&r, ps->fluid);
            ok = resolve_expr(&r, ps->start) && ok;
            if (ps->demand_curve)
                ok = resolve_expr(&r, ps->demand_curve) && ok;
            for (size_t k = 0; k < ps->nsegs; k++) {
                PathSegment *g = &ps->segs[k];
                Expr *cells[] = {g->flow, g->pipe, g->length, g->rise, g->K, g->C, g->device};
                for (size_t c = 0; c < sizeof cells / sizeof cells[0]; c++)
                    if (cells[c])
                        ok = resolve_expr(&r, cells[c]) && ok;
            }
        } else if (s->kind == STMT_CURVE) {
            CurveSpec *cs = s->curve;
            for (size_t k = 0; k < cs->npoints; k++) {
                ok = resolve_expr(&r, cs->x[k]) && ok;
                ok = resolve_expr(&r, cs->y[k]) && ok;
            }
        } else if (s->kind == STMT_NETWORK) {
            NetworkSpec *ns = s->network;
            ok = resolve_expr(&r, ns->fluid);
            if (ns->tolerance)
                ok = resolve_expr(&r, ns->tolerance) && ok;
            if (ns->demand_curve)
                ok = resolve_expr(&r, ns->demand_curve) && ok;
            for (size_t k = 0; k < ns->nnodes; k++) {
                NetNode *nd = &ns->nodes[k];
                Expr *cells[] = {nd->elevation, nd->demand, nd->head, nd->pressure, nd->x, nd->y};
                for (size_t c = 0; c < sizeof cells / sizeof cells[0]; c++)
                    if (cells[c])
                        ok = resolve_expr(&r, cells[c]) && ok;
            }
            for (size_t k = 0; k < ns->nlinks; k++) {
                NetLink *lk = &ns->links[k];
                Expr *cells[] = {lk->pipe, lk->length, lk->K, lk->C, lk->device};
                for (size_t c = 0; c < sizeof cells / sizeof cells[0]; c++)
                    if (cells[c])
                        ok = resolve_expr(&r, cells[c]) && ok;
            }
        } else if (s->kind == STMT_FIGURE) {
            for (size_t k = 0; k < s->fig->nargs; k++)
                ok = resolve_expr(&r, s->fig->args[k]) && ok;
        } else if (s->kind == STMT_SOLVE) {
            s->var_slot = resolve_name(&r, s->solve->var, s->solve->var_pos, false);
            ok = s->var_slot >= 0;
            if (s->var_slot >= 0 && doc->stmts[s->var_slot]->kind == STMT_CHECK)
                ok = 0;
            ok = resolve_expr(&r, s->lhs) && ok;
            ok = resolve_expr(&r, s->rhs) && ok;
            if (s->solve->lo)
                ok = resolve_expr(&r, s->solve->lo) && ok;
            if (s->solve->hi)
                ok = resolve_expr(&r, s->solve->hi) && ok;
        }
        if (!ok)
            s->parse_failed = 1;
        /* Sorted, unique slots. */
        size_t n = r.deps.len;
        int *deps = arena_alloc(&doc->arena, (n + 1) * sizeof *deps);
        for (size_t k = 0; k < n; k++)
            deps[k] = (int)(intptr_t)r.deps.items[k] - 1;
        qsort(deps, n, sizeof *deps, cmp_int);
        size_t u = 0;
        for (size_t k = 0; k < n; k++)
            if (u == 0 || deps[u - 1] != deps[k])
                deps[u++] = deps[k];
        s->deps = deps;
        s->ndeps = u;
    }
    vec_free(&r.deps);
    strmap_free(&source_keys);
}

/* Inline {values} in prose may name anything defined in the calc. */
static void resolve_inlines(Document *doc, Inline *in, DiagList *diags)
{
    for (; in; in = in->next) {
        if (in->kind == INL_VALUE) {
            in->slot = doc_lookup(doc, in->text);
            if (in->slot < 0) {
                const char *near = closest_name(doc, in->text, (int)doc->nstmts, diags);
                if (near)
                    diag_error(diags, in->pos, "unknown name '%s' in an inline value; did you mean %s?", in->text, near);
                else
                    diag_error(diags, in->pos, "unknown name '%s' in an inline value", in->text);
            }
        }
        if (in->children)
            resolve_inlines(doc, in->children, diags);
    }
}

/* Cases: the columns must name plain inputs (definitions, not solves or
 * paths), the shown names anything defined, and the cells may read any name
 * (they are evaluated after the whole calc). */
static void resolve_cases(Document *doc, DiagList *diags)
{
    Resolver r = {doc, diags, (int)doc->nstmts, {0}, NULL};
    size_t work = 0;
    for (size_t c = 0; c < doc->ncases; c++) {
        CaseTable *ct = doc->cases[c];
        /* Each row re-evaluates the calc: bound rows x statements so a file
         * cannot ask for hours of work. The table is then not evaluated. */
        work += ct->nrows * (doc->nstmts ? doc->nstmts : 1);
        if (work > CASES_MAX_WORK) {
            diag_error(diags, ct->pos,
                       "too much work in cases: %zu rows of %zu statements pass the limit of %d rows x statements in a file",
                       ct->nrows, doc->nstmts, CASES_MAX_WORK);
            ct->nrows = 0;
            work = CASES_MAX_WORK;
        }
        for (size_t k = 0; k < ct->ninputs; k++) {
            int slot = doc_lookup(doc, ct->inputs[k]);
            if (slot < 0) {
                const char *near = closest_name(doc, ct->inputs[k], (int)doc->nstmts, diags);
                if (near)
                    diag_error(diags, ct->input_pos[k], "cases column '%s' is not an input of the calc; did you mean %s?",
                               ct->inputs[k], near);
                else
                    diag_error(diags, ct->input_pos[k], "cases column '%s' is not an input of the calc", ct->inputs[k]);
            } else if (doc->stmts[slot]->kind != STMT_DEF) {
                diag_error(diags, ct->input_pos[k], "cases column '%s' must name a definition, not a %s", ct->inputs[k],
                           doc->stmts[slot]->kind == STMT_SOLVE     ? "solve"
                           : doc->stmts[slot]->kind == STMT_CURVE   ? "curve"
                           : doc->stmts[slot]->kind == STMT_NETWORK ? "network"
                                                                    : "path");
                slot = SLOT_UNRESOLVED;
            }
            for (size_t j = 0; j < k; j++)
                if (strcmp(ct->inputs[j], ct->inputs[k]) == 0) {
                    diag_error(diags, ct->input_pos[k], "cases column '%s' appears twice", ct->inputs[k]);
                    slot = SLOT_UNRESOLVED;
                }
            ct->input_slots[k] = slot < 0 ? SLOT_UNRESOLVED : slot;
        }
        for (size_t k = 0; k < ct->nshow; k++)
            if (ct->show_exprs[k])
                resolve_expr(&r, ct->show_exprs[k]);
        for (size_t k = 0; k < ct->nrows * ct->ninputs; k++)
            if (ct->cells[k])
                resolve_expr(&r, ct->cells[k]);
    }
    vec_free(&r.deps);
}

static void resolve_blocks(Document *doc, Block *b, DiagList *diags)
{
    for (; b; b = b->next) {
        resolve_inlines(doc, b->inlines, diags);
        resolve_blocks(doc, b->children, diags);
    }
}

void resolve_document(Document *doc, DiagList *diags)
{
    resolve_statements(doc, diags);
    resolve_cases(doc, diags);
    resolve_blocks(doc, doc->blocks, diags);
}
