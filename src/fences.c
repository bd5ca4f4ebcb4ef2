/* fences.c — the fences stage: what the fenced blocks say.
 *
 * markdown.c leaves every ```calc, ```sources, ```path NAME, ```curve NAME,
 * ```network NAME and ```cases fence as a raw block (its lines as cmark
 * gave them, its first file line). This stage, in document order, hands
 * each calc line to the statement parser (parse.c) and each table to its
 * reader (tables.c), reads the sources lines, and fills the document's
 * statements, sources and case tables. Positions: lines are parsed from
 * the original source lines (found by the fence's first line), so every
 * column a diagnostic names is the column in the file, whatever container
 * the fence sits in. A table fence whose name or table is refused leaves no
 * block behind. */
#include "fences.h"

#include <stdlib.h>
#include <string.h>

#include "markdown.h"
#include "parse.h"
#include "source.h"
#include "strmap.h"
#include "tables.h"

enum { ESCAPED_BRACE = MARKDOWN_ESCAPED_BRACE };

typedef struct Fences {
    Document *doc;
    DiagList *diags;
    Vec stmts;
    Vec sources;
    StrMap source_keys;      /* key -> index in sources */
    Vec cases;
    bool too_many;           /* DOC_MAX_STATEMENTS was reported */
} Fences;

static Pos at(const Fences *m, int line, int col)
{
    Pos p = {m->doc->file, line, col};
    return p;
}

/* Lines of a fenced block, each with its file line and the column of its
 * first byte (the original line minus whatever prefix cmark removed from
 * the raw lines markdown.c kept). */
static void each_fence_line(Fences *m, const Block *b, void (*fn)(Fences *, const char *, size_t, Pos, void *), void *ctx)
{
    const char *lit = b->raw;
    if (!lit)
        return;
    int line = b->raw_line;
    const char *end = lit + b->raw_len;
    for (const char *p = lit; p < end; line++) {
        const char *nl = memchr(p, '\n', (size_t)(end - p));
        size_t len = (size_t)((nl ? nl : end) - p);
        size_t olen = 0;
        const char *orig = source_line(m->doc->text, m->doc->len, m->doc->line_start, m->doc->nlines, line, &olen);
        int col = 1;
        if (orig && olen >= len)
            col = (int)(olen - len) + 1;
        if (orig && olen >= len && len > 0 && memcmp(orig + olen - len, p, len) == 0) {
            /* use the original bytes: same text, exact position */
            fn(m, orig + olen - len, len, at(m, line, col), ctx);
        } else {
            fn(m, p, len, at(m, line, col), ctx);
        }
        if (!nl)
            break;
        p = nl + 1;
    }
}


/* Room for one more statement? Reported once, at the first one over. */
static bool stmt_room(Fences *m, Pos pos)
{
    if (m->stmts.len < DOC_MAX_STATEMENTS)
        return true;
    if (!m->too_many)
        diag_error(m->diags, pos, "too many statements: the limit is %d in a file", DOC_MAX_STATEMENTS);
    m->too_many = true;
    return false;
}


static void calc_line(Fences *m, const char *s, size_t len, Pos pos, void *ctx)
{
    (void)ctx;
    if (len > SOURCE_MAX_LINE) {
        diag_error(m->diags, pos, "line is %zu bytes long; the limit inside a calc block is %d", len, SOURCE_MAX_LINE);
        return;
    }
    /* Restore escape markers that the pre-pass put into the copy cmark saw
     * (original bytes never contain them; this is for the fallback path). */
    char *copy = NULL;
    if (memchr(s, ESCAPED_BRACE, len)) {
        copy = arena_strndup(&m->doc->arena, s, len);
        for (size_t i = 0; i < len; i++)
            if (copy[i] == ESCAPED_BRACE)
                copy[i] = '\\';
        s = copy;
    }
    if (m->stmts.len >= DOC_MAX_STATEMENTS) {
        /* Over the limit: not parsed at all, so a file of millions of
         * statements is refused in memory proportional to the limit. */
        size_t i = 0;
        while (i < len && (s[i] == ' ' || s[i] == '\t' || s[i] == '\r'))
            i++;
        if (i < len && s[i] != '#') {
            Pos at_stmt = pos;
            at_stmt.col += (int)i;
            stmt_room(m, at_stmt);
        }
        return;
    }
    Stmt *st = parse_statement(&m->doc->arena, s, len, pos, m->diags);
    if (st && stmt_room(m, st->pos))
        vec_push(&m->stmts, st);
}


typedef struct LineList {
    FenceLine *items;
    size_t len, cap;
} LineList;

static void collect_line(Fences *m, const char *s, size_t len, Pos pos, void *ctx)
{
    (void)m;
    LineList *ll = ctx;
    if (ll->len == ll->cap) {
        ll->cap = ll->cap ? ll->cap * 2 : 16;
        ll->items = xrealloc(ll->items, ll->cap * sizeof *ll->items);
    }
    ll->items[ll->len++] = (FenceLine){s, len, pos};
}


/* "path NAME", "curve NAME", "network NAME": the name is an identifier,
 * like any defined name; `keyword` is the length of the block's word. */
static const char *block_name(Fences *m, const char *info, size_t keyword, Pos at)
{
    const char *p = info + keyword;
    while (*p == ' ' || *p == '\t')
        p++;
    size_t n = strlen(p);
    while (n && (p[n - 1] == ' ' || p[n - 1] == '\t'))
        n--;
    bool ok = n > 0 && !(p[0] >= '0' && p[0] <= '9');
    for (size_t i = 0; i < n && ok; i++) {
        unsigned char c = (unsigned char)p[i];
        ok = c == '_' || c >= 0x80 || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9');
    }
    if (!ok) {
        if (keyword == 4)
            diag_error(m->diags, at, "a path block is opened with ```path NAME, NAME a plain name such as riser_cw2");
        else if (keyword == 5)
            diag_error(m->diags, at, "a curve block is opened with ```curve NAME, NAME a plain name such as meter_dp");
        else
            diag_error(m->diags, at, "a network block is opened with ```network NAME, NAME a plain name such as cw_main");
        return NULL;
    }
    return arena_strndup(&m->doc->arena, p, n);
}


static void sources_line(Fences *m, const char *s, size_t len, Pos pos, void *ctx)
{
    (void)ctx;
    size_t i = 0;
    while (i < len && (s[i] == ' ' || s[i] == '\t'))
        i++;
    if (i == len || s[i] == '#')
        return;
    const char *colon = memchr(s + i, ':', len - i);
    Pos kp = pos;
    kp.col += (int)i;
    if (!colon) {
        diag_error(m->diags, kp, "a sources line is 'key: citation text'");
        return;
    }
    size_t ke = (size_t)(colon - s);
    while (ke > i && (s[ke - 1] == ' ' || s[ke - 1] == '\t'))
        ke--;
    for (size_t k = i; k < ke; k++) {
        char c = s[k];
        if (!((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' ||
              c == '-' || c == '.')) {
            diag_error(m->diags, kp, "a source key is letters, digits, '_', '-' or '.', found '%.*s'", (int)(ke - i), s + i);
            return;
        }
    }
    if (ke == i) {
        diag_error(m->diags, kp, "a sources line is 'key: citation text'");
        return;
    }
    size_t ts = (size_t)(colon - s) + 1;
    while (ts < len && (s[ts] == ' ' || s[ts] == '\t'))
        ts++;
    size_t te = len;
    while (te > ts && (s[te - 1] == ' ' || s[te - 1] == '\t' || s[te - 1] == '\r'))
        te--;
    if (te == ts) {
        diag_error(m->diags, kp, "source '%.*s' has no citation text", (int)(ke - i), s + i);
        return;
    }
    Source *src = arena_alloc(&m->doc->arena, sizeof *src);
    src->key = arena_strndup(&m->doc->arena, s + i, ke - i);
    src->text = arena_strndup(&m->doc->arena, s + ts, te - ts);
    src->pos = kp;
    size_t had;
    if (!strmap_add(&m->source_keys, src->key, m->sources.len, &had)) {
        const Source *o = m->sources.items[had];
        diag_error(m->diags, kp, "source key '%s' is already defined at %d:%d", src->key, o->pos.line, o->pos.col);
        return;
    }
    vec_push(&m->sources, src);
}

/* One fence block; false when it leaves no block (its name or its table
 * was refused, or there is no room for its statement). */
static bool read_fence(Fences *m, Block *b)
{
    Arena *ar = &m->doc->arena;
    switch (b->kind) {
    case BLK_CALC:
        b->first_stmt = m->stmts.len;
        each_fence_line(m, b, calc_line, NULL);
        b->nstmts = m->stmts.len - b->first_stmt;
        return true;
    case BLK_SOURCES:
        each_fence_line(m, b, sources_line, NULL);
        return true;
    case BLK_PATH:
    case BLK_CURVE:
    case BLK_NETWORK:
    case BLK_CASES: {
        LineList ll = {0};
        each_fence_line(m, b, collect_line, &ll);
        bool kept = false;
        if (b->kind == BLK_CASES) {
            CaseTable *ct = tables_parse_cases(ar, b->pos, ll.items, ll.len, m->diags);
            if (ct) {
                b->first_stmt = m->cases.len;
                vec_push(&m->cases, ct);
                kept = true;
            }
        } else {
            size_t word = b->kind == BLK_PATH ? 4 : b->kind == BLK_CURVE ? 5 : 7;
            const char *name = block_name(m, b->info, word, b->pos);
            if (name && stmt_room(m, b->pos)) {
                b->first_stmt = m->stmts.len;
                b->nstmts = 1;
                vec_push(&m->stmts, b->kind == BLK_PATH    ? tables_parse_path(ar, name, b->pos, ll.items, ll.len, m->diags)
                                    : b->kind == BLK_CURVE ? tables_parse_curve(ar, name, b->pos, ll.items, ll.len, m->diags)
                                                           : tables_parse_network(ar, name, b->pos, ll.items, ll.len, m->diags));
                kept = true;
            }
        }
        free(ll.items);
        return kept;
    }
    default:
        return true;
    }
}

/* Every block in document order (a block, then its children, then the
 * blocks after it), dropping the fences that leave nothing. */
static void read_blocks(Fences *m, Block **link)
{
    while (*link) {
        Block *b = *link;
        if (!read_fence(m, b)) {
            *link = b->next;
            continue;
        }
        read_blocks(m, &b->children);
        link = &b->next;
    }
}

void fences_read(Document *doc, DiagList *diags)
{
    Fences m = {0};
    m.doc = doc;
    m.diags = diags;
    read_blocks(&m, &doc->blocks);
    doc->nstmts = m.stmts.len;
    doc->stmts = arena_alloc(&doc->arena, (m.stmts.len + 1) * sizeof *doc->stmts);
    for (size_t i = 0; i < m.stmts.len; i++) {
        doc->stmts[i] = m.stmts.items[i];
        doc->stmts[i]->index = (int)i;
    }
    doc->nsources = m.sources.len;
    doc->sources = arena_alloc(&doc->arena, (m.sources.len + 1) * sizeof *doc->sources);
    for (size_t i = 0; i < m.sources.len; i++)
        doc->sources[i] = *(Source *)m.sources.items[i];
    doc->ncases = m.cases.len;
    doc->cases = arena_alloc(&doc->arena, (m.cases.len + 1) * sizeof *doc->cases);
    for (size_t i = 0; i < m.cases.len; i++)
        doc->cases[i] = m.cases.items[i];
    vec_free(&m.stmts);
    vec_free(&m.sources);
    strmap_free(&m.source_keys);
    vec_free(&m.cases);
}
