/* markdown.c — from cmark-gfm's tree to the document model.
 *
 * Prose becomes Blocks and Inlines (with the inline {name}, {rec.field}
 * and {name as unit} values found); the fences the calc language owns are
 * checked closed and left raw for the fences stage (fences.c). Two details
 * carry the design. Positions: every position is the one in the file,
 * whatever container a block sits in (a table header cmark places on the
 * paragraph line above it is moved back). Escapes: cmark turns `\{` into a
 * plain `{`, which would make a literal brace look like an inline value;
 * before parsing, `\{` is replaced by the same number of bytes
 * (MARKDOWN_ESCAPED_BRACE then `{`), a byte that cannot occur in a checked
 * source, and restored afterwards. */
#include "markdown.h"

#include <cmark-gfm-core-extensions.h>
#include <cmark-gfm.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>
#include <malloc.h>

#include "parse.h"
#include "source.h"

enum { ESCAPED_BRACE = MARKDOWN_ESCAPED_BRACE };

typedef struct Md {
    Document *doc;
    DiagList *diags;
    int heading_count[6];
    int too_deep;
    /* A table header right after a paragraph line: cmark places it on the
     * paragraph's line, its columns shifted by the paragraph's length. While
     * that header is converted, positions on fix_line move to true_line and
     * fix_shift columns left. */
    int fix_line, true_line, fix_shift;
} Md;

/* A line of the source (source.c's line index), without its newline. */
static const char *md_line(const Md *m, int line, size_t *len)
{
    return source_line(m->doc->text, m->doc->len, m->doc->line_start, m->doc->nlines, line, len);
}

static Pos at(const Md *m, int line, int col)
{
    Pos p = {m->doc->file, line, col};
    return p;
}

/* Restore the escape marker inside literal text (code keeps `\{`). */
static char *literal_copy(Md *m, const char *s)
{
    size_t n = strlen(s);
    char *d = arena_alloc(&m->doc->arena, n + 1);
    for (size_t i = 0; i < n; i++)
        d[i] = s[i] == ESCAPED_BRACE ? '\\' : s[i];
    d[n] = '\0';
    return d;
}

static Inline *new_inline(Md *m, InlineKind kind)
{
    Inline *in = arena_alloc(&m->doc->arena, sizeof *in);
    in->kind = kind;
    in->slot = SLOT_UNRESOLVED;
    return in;
}

static void fix_pos(const Md *m, int *line, int *col)
{
    if (m->fix_line > 0 && *line == m->fix_line) {
        *line = m->true_line;
        *col = *col > m->fix_shift ? *col - m->fix_shift : 1;
    }
}

/* Split a text node into plain text and {value} pieces. `{name}`,
 * `{rec.field}` and `{name as unit}`; anything else in braces is an error. */
static Inline *split_text(Md *m, const char *s, int line, int col, Inline ***tail)
{
    Inline *first = NULL;
    Inline **link = &first;
    StrBuf plain = {0};
    const char *orig_line = NULL;
    size_t orig_len = 0;
    orig_line = md_line(m, line, &orig_len);
    size_t search_from = col > 0 ? (size_t)col - 1 : 0;
    for (const char *p = s; *p;) {
        if (*p == ESCAPED_BRACE && p[1] == '{') {
            sb_putc(&plain, '{');
            p += 2;
            continue;
        }
        if (*p != '{') {
            sb_putc(&plain, *p++);
            continue;
        }
        const char *close = strchr(p, '}');
        /* Locate the brace in the original line for an exact column. */
        int vcol = col;
        if (orig_line && search_from < orig_len) {
            const char *hit = memchr(orig_line + search_from, '{', orig_len - search_from);
            if (hit) {
                vcol = (int)(hit - orig_line) + 1;
                search_from = (size_t)(hit - orig_line) + 1;
            }
        }
        if (!close) {
            diag_error(m->diags, at(m, line, vcol), "'{' in prose opens an inline value but is never closed; write \\{ for a literal brace");
            sb_puts(&plain, p);
            break;
        }
        if (plain.len) {
            Inline *t = new_inline(m, INL_TEXT);
            t->text = arena_strdup(&m->doc->arena, sb_str(&plain));
            *link = t;
            link = &t->next;
            sb_clear(&plain);
        }
        /* Inside: name[.field] [as unit] */
        const char *q = p + 1;
        while (q < close && *q == ' ')
            q++;
        const char *ns = q;
        while (q < close && *q != ' ' && *q != '.')
            q++;
        Inline *v = new_inline(m, INL_VALUE);
        v->pos = at(m, line, vcol + 1 + (int)(ns - p - 1));
        v->text = arena_strndup(&m->doc->arena, ns, (size_t)(q - ns));
        if (q < close && *q == '.') {
            const char *fs = ++q;
            while (q < close && *q != ' ')
                q++;
            v->field = arena_strndup(&m->doc->arena, fs, (size_t)(q - fs));
        }
        while (q < close && *q == ' ')
            q++;
        int bad = v->text[0] == '\0';
        if (!bad && q < close) {
            if ((size_t)(close - q) > 3 && memcmp(q, "as ", 3) == 0) {
                const char *us = q + 3;
                while (us < close && *us == ' ')
                    us++;
                const char *ue = close;
                while (ue > us && ue[-1] == ' ')
                    ue--;
                Pos upos = at(m, line, vcol + 1 + (int)(us - p - 1));
                if (ue > us && parse_unit(us, (size_t)(ue - us), upos, &v->as_unit, m->diags))
                    v->has_as = 1;
                else if (ue == us)
                    bad = 1;
            } else {
                bad = 1;
            }
        }
        if (bad)
            diag_error(m->diags, at(m, line, vcol), "an inline value is written {name} or {name as unit}; write \\{ for a literal brace");
        *link = v;
        link = &v->next;
        p = close + 1;
    }
    if (plain.len) {
        Inline *t = new_inline(m, INL_TEXT);
        t->text = arena_strdup(&m->doc->arena, sb_str(&plain));
        *link = t;
        link = &t->next;
    }
    sb_free(&plain);
    *tail = link;
    return first;
}

static Inline *convert_inlines(Md *m, cmark_node *parent, int depth);

/* cmark-gfm's extension registry is process-wide and not locked: register
 * once, before any thread parses (diff reads two revisions at once). */
static pthread_once_t extensions_once = PTHREAD_ONCE_INIT;

static void extensions_register(void)
{
    cmark_gfm_core_extensions_ensure_registered();
}

static void convert_one_inline(Md *m, cmark_node *n, Inline ***link, int depth)
{
    Inline *in = NULL;
    switch (cmark_node_get_type(n)) {
    case CMARK_NODE_TEXT: {
        /* Text that cmark re-parsed (a paragraph cut short by a table) has
         * no position: take the nearest enclosing node's. */
        cmark_node *placed = n;
        while (cmark_node_get_start_line(placed) == 0 && cmark_node_parent(placed))
            placed = cmark_node_parent(placed);
        int line = cmark_node_get_start_line(placed) > 0 ? cmark_node_get_start_line(placed) : 1;
        int col = cmark_node_get_start_column(placed) > 0 ? cmark_node_get_start_column(placed) : 1;
        fix_pos(m, &line, &col);
        Inline **tail;
        Inline *first = split_text(m, cmark_node_get_literal(n), line, col, &tail);
        if (first) {
            **link = first;
            *link = tail;
        }
        return;
    }
    case CMARK_NODE_CODE:
        in = new_inline(m, INL_CODE);
        in->text = literal_copy(m, cmark_node_get_literal(n));
        break;
    case CMARK_NODE_EMPH:
        in = new_inline(m, INL_EMPH);
        break;
    case CMARK_NODE_STRONG:
        in = new_inline(m, INL_STRONG);
        break;
    case CMARK_NODE_LINK:
        in = new_inline(m, INL_LINK);
        in->url = arena_strdup(&m->doc->arena, cmark_node_get_url(n) ? cmark_node_get_url(n) : "");
        break;
    case CMARK_NODE_SOFTBREAK:
        in = new_inline(m, INL_SOFTBREAK);
        break;
    case CMARK_NODE_LINEBREAK:
        in = new_inline(m, INL_LINEBREAK);
        break;
    case CMARK_NODE_HTML_INLINE:
        in = new_inline(m, INL_CODE);
        in->text = literal_copy(m, cmark_node_get_literal(n));
        break;
    case CMARK_NODE_IMAGE:
        in = new_inline(m, INL_TEXT);
        in->text = "[image]";
        break;
    default:
        if (strcmp(cmark_node_get_type_string(n), "strikethrough") == 0)
            in = new_inline(m, INL_STRIKE);
        else {
            in = new_inline(m, INL_TEXT);
            in->text = literal_copy(m, cmark_node_get_literal(n) ? cmark_node_get_literal(n) : "");
        }
        break;
    }
    if (in->kind == INL_EMPH || in->kind == INL_STRONG || in->kind == INL_LINK || in->kind == INL_STRIKE)
        in->children = convert_inlines(m, n, depth + 1);
    **link = in;
    *link = &in->next;
}

/* Past the nesting limit: report it once, at the node that went too deep. */
static bool too_deep(Md *m, cmark_node *parent, int depth)
{
    if (depth <= MARKDOWN_MAX_DEPTH)
        return false;
    /* Text the table extension re-parses has no position of its own (line
     * 0): report at the nearest enclosing node that has one. */
    cmark_node *where = parent;
    while (where && cmark_node_get_start_line(where) <= 0 && cmark_node_parent(where))
        where = cmark_node_parent(where);
    int line = cmark_node_get_start_line(where), col = cmark_node_get_start_column(where);
    fix_pos(m, &line, &col);
    if (!m->too_deep)
        diag_error(m->diags, at(m, line > 0 ? line : 1, line > 0 && col > 0 ? col : 1),
                   "Markdown nested too deeply (more than %d levels)", MARKDOWN_MAX_DEPTH);
    m->too_deep = 1;
    return true;
}

static Inline *convert_inlines(Md *m, cmark_node *parent, int depth)
{
    if (too_deep(m, parent, depth))
        return NULL;
    Inline *first = NULL;
    Inline **link = &first;
    for (cmark_node *c = cmark_node_first_child(parent); c; c = cmark_node_next(c))
        convert_one_inline(m, c, &link, depth);
    return first;
}

/* A fenced block must be closed: cmark closes an open fence at the end of
 * its container, so look at the block's last line for a closing fence. */
static int fence_closed(Md *m, cmark_node *n)
{
    int end_line = cmark_node_get_end_line(n);
    int start_line = cmark_node_get_start_line(n);
    if (end_line <= start_line)
        return 0;
    size_t len = 0;
    const char *s = md_line(m, end_line, &len);
    if (!s)
        return 0;
    int fence_len = 0, fence_off = 0;
    char fence_char = 0;
    cmark_node_get_fenced(n, &fence_len, &fence_off, &fence_char);
    size_t i = 0;
    while (i < len && (s[i] == ' ' || s[i] == '\t' || s[i] == '>'))
        i++;
    size_t run = 0;
    char c = i < len ? s[i] : 0;
    while (i + run < len && s[i + run] == c && c == fence_char)
        run++;
    if (run < 3 || run < (size_t)fence_len)
        return 0;
    for (size_t k = i + run; k < len; k++)
        if (s[k] != ' ' && s[k] != '\t' && s[k] != '\r')
            return 0;
    return 1;
}

static Block *new_block(Md *m, BlockKind kind, cmark_node *n)
{
    Block *b = arena_alloc(&m->doc->arena, sizeof *b);
    b->kind = kind;
    b->pos = at(m, cmark_node_get_start_line(n), cmark_node_get_start_column(n));
    return b;
}

static Block *convert_blocks(Md *m, cmark_node *parent, int depth);

/* Where a table header really is: the line before the separator row, which
 * is the line before the first body row (or the table's last line). When
 * cmark placed it elsewhere (on the paragraph line above it), set the fix. */
static void header_position(Md *m, cmark_node *header)
{
    m->fix_line = 0;
    cmark_node *table = cmark_node_parent(header);
    cmark_node *row = cmark_node_next(header);
    int sep = row ? cmark_node_get_start_line(row) - 1 : cmark_node_get_end_line(table);
    int line = sep - 1, reported = cmark_node_get_start_line(header);
    size_t len;
    if (line < 1 || line == reported || !md_line(m, line, &len))
        return;
    int shift = cmark_node_get_end_column(header) - (int)len;
    m->fix_line = reported;
    m->true_line = line;
    m->fix_shift = shift > 0 ? shift : 0;
}

/* The kind of block a fence's info string opens: ```calc, ```sources,
 * ```cases, ```path NAME, ```curve NAME, ```network NAME; BLK_CODE for any
 * other. */
static bool info_word(const char *info, const char *word)
{
    size_t n = strlen(word);
    return strncmp(info, word, n) == 0 && (info[n] == ' ' || info[n] == '\t' || info[n] == '\0');
}

static BlockKind fence_kind(const char *info)
{
    if (strcmp(info, "calc") == 0)
        return BLK_CALC;
    if (strcmp(info, "sources") == 0)
        return BLK_SOURCES;
    if (strcmp(info, "cases") == 0)
        return BLK_CASES;
    if (info_word(info, "path"))
        return BLK_PATH;
    if (info_word(info, "curve"))
        return BLK_CURVE;
    if (info_word(info, "network"))
        return BLK_NETWORK;
    return BLK_CODE;
}

/* A fence's lines: where cmark's literal is the very bytes of the source
 * from the line after the opening fence (a fence outside any list or quote,
 * with no `\{` marked) the block points at them; otherwise, a copy. At
 * 100,000 statements the copies were 4.5 MB, the size of the file. */
static void raw_lines(Md *m, Block *b, const char *lit)
{
    size_t n = strlen(lit);
    const Document *doc = m->doc;
    if (b->raw_line >= 1 && (size_t)b->raw_line <= doc->nlines) {
        size_t off = doc->line_start[b->raw_line - 1];
        if (n <= doc->len - off && memcmp(doc->text + off, lit, n) == 0) {
            b->raw = doc->text + off;
            b->raw_len = n;
            return;
        }
    }
    b->raw = arena_strndup(&m->doc->arena, lit, n);
    b->raw_len = n;
}

static Block *convert_block(Md *m, cmark_node *n, int depth)
{
    Block *b = NULL;
    const char *type = cmark_node_get_type_string(n);
    switch (cmark_node_get_type(n)) {
    case CMARK_NODE_HEADING: {
        b = new_block(m, BLK_HEADING, n);
        int level = cmark_node_get_heading_level(n);
        b->level = level;
        m->heading_count[level - 1]++;
        for (int i = level; i < 6; i++)
            m->heading_count[i] = 0;
        /* Numbered from the first level used: "2", "2.1", "2.1.3". */
        size_t len = 0;
        for (int i = 0; i < level; i++) {
            if (m->heading_count[i] == 0 && len == 0)
                continue;
            len += (size_t)snprintf(b->number + len, sizeof b->number - len, "%s%d", len ? "." : "",
                                    m->heading_count[i] ? m->heading_count[i] : 1);
            if (len >= sizeof b->number)
                break;
        }
        b->inlines = convert_inlines(m, n, 0);
        break;
    }
    case CMARK_NODE_PARAGRAPH:
        b = new_block(m, BLK_PARAGRAPH, n);
        b->inlines = convert_inlines(m, n, 0);
        break;
    case CMARK_NODE_LIST:
        b = new_block(m, BLK_LIST, n);
        b->ordered = cmark_node_get_list_type(n) == CMARK_ORDERED_LIST;
        b->start = cmark_node_get_list_start(n);
        b->children = convert_blocks(m, n, depth + 1);
        break;
    case CMARK_NODE_ITEM:
        b = new_block(m, BLK_ITEM, n);
        b->children = convert_blocks(m, n, depth + 1);
        break;
    case CMARK_NODE_BLOCK_QUOTE:
        b = new_block(m, BLK_QUOTE, n);
        b->children = convert_blocks(m, n, depth + 1);
        break;
    case CMARK_NODE_THEMATIC_BREAK:
        b = new_block(m, BLK_RULE, n);
        break;
    case CMARK_NODE_HTML_BLOCK:
        b = new_block(m, BLK_HTML, n);
        b->text = literal_copy(m, cmark_node_get_literal(n));
        break;
    case CMARK_NODE_CODE_BLOCK: {
        const char *info = cmark_node_get_fence_info(n);
        info = info ? info : "";
        int fence_len = 0, fence_off = 0;
        char fence_char = 0;
        int fenced = cmark_node_get_fenced(n, &fence_len, &fence_off, &fence_char);
        BlockKind kind = fence_kind(info);
        if (fenced && kind != BLK_CODE) {
            if (!fence_closed(m, n)) {
                diag_error(m->diags, at(m, cmark_node_get_start_line(n), cmark_node_get_start_column(n)),
                           "unterminated ```%s fence: expected a closing ``` line", info);
                return NULL;
            }
            /* Raw: the fences stage (fences.c) parses its lines. */
            b = new_block(m, kind, n);
            b->info = arena_strdup(&m->doc->arena, info);
            const char *lit = cmark_node_get_literal(n);
            b->raw_line = cmark_node_get_start_line(n) + 1;
            raw_lines(m, b, lit ? lit : "");
            break;
        }
        b = new_block(m, BLK_CODE, n);
        b->text = literal_copy(m, cmark_node_get_literal(n));
        b->info = arena_strdup(&m->doc->arena, info);
        break;
    }
    default:
        if (strcmp(type, "table") == 0) {
            b = new_block(m, BLK_TABLE, n);
            b->ncols = cmark_gfm_extensions_get_table_columns(n);
            uint8_t *al = cmark_gfm_extensions_get_table_alignments(n);
            b->align = arena_alloc(&m->doc->arena, ((size_t)b->ncols + 1) * sizeof *b->align);
            for (int i = 0; i < b->ncols && al; i++)
                b->align[i] = al[i] == 'l' ? ALIGN_LEFT : al[i] == 'c' ? ALIGN_CENTER : al[i] == 'r' ? ALIGN_RIGHT : ALIGN_NONE;
            b->children = convert_blocks(m, n, depth + 1);
        } else if (strcmp(type, "table_row") == 0 || strcmp(type, "table_header") == 0) {
            b = new_block(m, BLK_TABLE_ROW, n);
            b->header_row = strcmp(type, "table_header") == 0;
            if (b->header_row)
                header_position(m, n);
            b->children = convert_blocks(m, n, depth + 1);
            m->fix_line = 0;
        } else if (strcmp(type, "table_cell") == 0) {
            b = new_block(m, BLK_TABLE_CELL, n);
            b->inlines = convert_inlines(m, n, 0);
        } else {
            return NULL; /* footnotes and other extensions are not enabled */
        }
        break;
    }
    return b;
}

static Block *convert_blocks(Md *m, cmark_node *parent, int depth)
{
    if (too_deep(m, parent, depth))
        return NULL;
    Block *first = NULL;
    Block **link = &first;
    for (cmark_node *c = cmark_node_first_child(parent); c; c = cmark_node_next(c)) {
        Block *b = convert_block(m, c, depth);
        if (b) {
            *link = b;
            link = &b->next;
        }
    }
    return first;
}

/* cmark's tree (at 100,000 statements 5 MB of nodes and fence text) is freed
 * once converted, but glibc keeps what is freed for later mallocs, and what
 * comes later mostly comes from the document's arena (mmap): hand it back.
 * Not under AddressSanitizer, whose allocator is not glibc's (malloc_trim
 * would walk a heap glibc never set up). */
#if defined(__has_feature)
#if __has_feature(address_sanitizer)
#define HEADROOM_ASAN 1
#endif
#endif
#if defined(__SANITIZE_ADDRESS__)
#define HEADROOM_ASAN 1
#endif
static void release_heap(void)
{
#ifndef HEADROOM_ASAN
    malloc_trim(0);
#endif
}

/* Give cmark the text it should see without copying the file: front matter
 * blanked (spaces, its newlines kept, so line numbers hold) and each `\{`
 * marked with ESCAPED_BRACE, the body fed straight from the source between
 * the marks (cmark reads a text fed in pieces as one). */
static void feed_body(cmark_parser *parser, const char *text, size_t len, size_t body_start)
{
    char blank[512];
    size_t i = 0;
    while (i < body_start && i < len) {
        size_t k = 0;
        for (; k < sizeof blank && i < body_start && i < len; k++, i++)
            blank[k] = text[i] == '\n' ? '\n' : ' ';
        cmark_parser_feed(parser, blank, k);
    }
    const char marker = ESCAPED_BRACE;
    size_t from = i; /* the first byte not yet fed */
    for (size_t j = i; j + 1 < len; j++) {
        const char *q = memchr(text + j, '\\', len - 1 - j);
        if (!q)
            break;
        j = (size_t)(q - text);
        if (text[j + 1] == '{') {
            cmark_parser_feed(parser, text + from, j - from);
            cmark_parser_feed(parser, &marker, 1);
            from = j + 1;
        }
    }
    if (from < len)
        cmark_parser_feed(parser, text + from, len - from);
}

void markdown_read(Document *doc, size_t body_start, DiagList *diags)
{
    Md m = {0};
    m.doc = doc;
    m.diags = diags;

    pthread_once(&extensions_once, extensions_register);
    /* cmark's own allocator aborts when memory runs out; ours exits 3 with
     * a message like every other allocation. */
    static cmark_mem mem = {xcalloc, xrealloc, free};
    cmark_parser *parser = cmark_parser_new_with_mem(CMARK_OPT_SOURCEPOS, &mem);
    cmark_syntax_extension *table = cmark_find_syntax_extension("table");
    cmark_syntax_extension *strike = cmark_find_syntax_extension("strikethrough");
    if (table)
        cmark_parser_attach_syntax_extension(parser, table);
    if (strike)
        cmark_parser_attach_syntax_extension(parser, strike);
    feed_body(parser, doc->text, doc->len, body_start);
    cmark_node *root = cmark_parser_finish(parser);
    doc->blocks = convert_blocks(&m, root, 0);
    cmark_node_free(root);
    cmark_parser_free(parser);
    /* worth the system calls when the tree was large (its nodes and text
     * are a few times the file); a small one is left for glibc to reuse */
    if (doc->len >= (size_t)1 << 20)
        release_heap();

}
