/* diag.c — collecting and printing diagnostics.
 *
 * Diagnostics are gathered as the stages run and printed once at the end, in
 * source order, in the compiler convention: `file:line:col: error: message`,
 * then the source line and a caret under the column. */
#include "diag.h"

#include <stdlib.h>
#include <string.h>

#include "arena.h"

void diag_vadd(DiagList *dl, Severity sev, Pos pos, const char *fmt, va_list ap)
{
    if (dl->muted > 0)
        return;
    if (dl->len == dl->cap) {
        dl->cap = dl->cap ? dl->cap * 2 : 16;
        dl->items = xrealloc(dl->items, dl->cap * sizeof *dl->items);
    }
    va_list copy;
    va_copy(copy, ap);
    int n = vsnprintf(NULL, 0, fmt, copy);
    va_end(copy);
    char *msg = xmalloc(n > 0 ? (size_t)n + 1 : 1);
    vsnprintf(msg, n > 0 ? (size_t)n + 1 : 1, fmt, ap);
    dl->items[dl->len++] = (Diag){sev, pos, msg};
    if (sev == SEV_ERROR)
        dl->errors++;
    else if (sev == SEV_WARNING)
        dl->warnings++;
}

void diag_add(DiagList *dl, Severity sev, Pos pos, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    diag_vadd(dl, sev, pos, fmt, ap);
    va_end(ap);
}

void diag_free(DiagList *dl)
{
    for (size_t i = 0; i < dl->len; i++)
        free(dl->items[i].message);
    free(dl->items);
    memset(dl, 0, sizeof *dl);
}

static int pos_cmp(const Diag *a, const Diag *b)
{
    const char *fa = a->pos.file ? a->pos.file : "";
    const char *fb = b->pos.file ? b->pos.file : "";
    int c = strcmp(fa, fb);
    if (c)
        return c;
    if (a->pos.line != b->pos.line)
        return a->pos.line < b->pos.line ? -1 : 1;
    if (a->pos.col != b->pos.col)
        return a->pos.col < b->pos.col ? -1 : 1;
    return 0;
}

/* A stable merge sort: diagnostics come in runs that are each in order (the
 * parse, then resolution, then evaluation), and a file may have 100,000 of
 * them, so an insertion sort's quadratic worst case is not an option. */
void diag_sort(DiagList *dl)
{
    size_t n = dl->len;
    if (n < 2)
        return;
    Diag *tmp = xmalloc(n * sizeof *tmp);
    Diag *a = dl->items, *b = tmp;
    for (size_t width = 1; width < n; width *= 2) {
        for (size_t lo = 0; lo < n; lo += 2 * width) {
            size_t mid = lo + width < n ? lo + width : n;
            size_t hi = lo + 2 * width < n ? lo + 2 * width : n;
            size_t i = lo, j = mid, k = lo;
            while (i < mid && j < hi)
                b[k++] = pos_cmp(&a[j], &a[i]) < 0 ? a[j++] : a[i++]; /* ties keep a[i] first */
            while (i < mid)
                b[k++] = a[i++];
            while (j < hi)
                b[k++] = a[j++];
        }
        Diag *t = a;
        a = b;
        b = t;
    }
    if (a != dl->items)
        memcpy(dl->items, a, n * sizeof *a);
    free(tmp);
}

/* Find line `line` (1-based) in text; returns its start and sets *len.
 * The cursor (*at, *at_line) remembers the last line found, so printing a
 * sorted list walks the text once instead of once per diagnostic. */
static const char *find_line(const char *text, size_t text_len, int line, size_t *len,
                             const char **at, int *at_line)
{
    if (!text || line < 1)
        return NULL;
    const char *p = text, *end = text + text_len;
    int l = 1;
    if (*at && *at_line <= line) {
        p = *at;
        l = *at_line;
    }
    for (; l < line; l++) {
        const char *nl = memchr(p, '\n', (size_t)(end - p));
        if (!nl)
            return NULL;
        p = nl + 1;
    }
    *at = p;
    *at_line = line;
    const char *nl = memchr(p, '\n', (size_t)(end - p));
    *len = (size_t)((nl ? nl : end) - p);
    if (*len && p[*len - 1] == '\r')
        (*len)--;
    return p;
}

/* How many bytes of `s` (at most `n`) form one character that must not reach
 * a terminal raw: C0 controls but tab, DEL, C1 controls (U+0080-U+009F) and
 * the bidirectional controls that reorder what is shown (U+061C, U+200E,
 * U+200F, U+202A-U+202E, U+2066-U+2069) and the zero-width characters that
 * draw nothing (U+200B-U+200D, U+2060-U+2064, U+FEFF). 0 for anything else. */
static size_t unsafe_char_len(const unsigned char *s, size_t n)
{
    if ((s[0] < 0x20 && s[0] != '\t') || s[0] == 0x7F)
        return 1;
    if (s[0] == 0xC2 && n >= 2 && s[1] >= 0x80 && s[1] <= 0x9F)
        return 2;
    if (s[0] == 0xD8 && n >= 2 && s[1] == 0x9C)
        return 2;
    if (s[0] == 0xEF && n >= 3 && s[1] == 0xBB && s[2] == 0xBF)
        return 3; /* U+FEFF, the zero-width no-break space */
    if (s[0] == 0xE2 && n >= 3) {
        unsigned c = ((unsigned)(s[1] & 0x3F) << 6) | (s[2] & 0x3F);
        c |= 0x2000;
        if (s[1] == 0x80 && ((c >= 0x200B && c <= 0x200F) || (c >= 0x202A && c <= 0x202E)))
            return 3;
        if (s[1] == 0x81 && c >= 0x2060 && c <= 0x2064)
            return 3;
        if (s[1] == 0x81 && c >= 0x2066 && c <= 0x2069)
            return 3;
    }
    return 0;
}

/* Write n bytes with every unsafe character escaped: `\x1b` for a single
 * byte, `\u202e` for a longer one. When `cols` is not NULL, cols[i] is
 * set to the terminal columns byte i took, to line a caret up. */
static void put_escaped(FILE *out, const char *s, size_t n, unsigned char *cols)
{
    const unsigned char *u = (const unsigned char *)s;
    size_t run = 0; /* start of the pending run of bytes written as they are */
    for (size_t i = 0; i < n;) {
        size_t k = unsafe_char_len(u + i, n - i);
        if (k == 0) {
            if (cols)
                cols[i] = 1;
            i++;
            continue;
        }
        fwrite(s + run, 1, i - run, out);
        unsigned c = u[i];
        if (k == 2)
            c = ((unsigned)(u[i] & 0x1F) << 6) | (u[i + 1] & 0x3F);
        else if (k == 3)
            c = ((unsigned)(u[i] & 0x0F) << 12) | ((unsigned)(u[i + 1] & 0x3F) << 6) |
                (u[i + 2] & 0x3F);
        int w = c < 0x100 ? fprintf(out, "\\x%02x", c) : fprintf(out, "\\u%04x", c);
        if (cols) {
            cols[i] = (unsigned char)(w > 0 ? w : 0);
            for (size_t j = 1; j < k; j++)
                cols[i + j] = 0;
        }
        i += k;
        run = i;
    }
    fwrite(s + run, 1, n - run, out);
}

void diag_print_escaped(FILE *out, const char *s)
{
    put_escaped(out, s, strlen(s), NULL);
}
static void print_one(FILE *out, const Diag *d, const char *text, size_t text_len, bool color,
                      const char **at, int *at_line);

void diag_print(FILE *out, const DiagList *dl, const char *text, size_t text_len, bool color)
{
    const char *at = NULL;
    int at_line = 0;
    for (size_t i = 0; i < dl->len; i++)
        print_one(out, &dl->items[i], text, text_len, color, &at, &at_line);
}

void diag_print_sources(FILE *out, const DiagList *dl, const DiagSource *src, size_t nsrc, bool color)
{
    const char *at = NULL, *cur = NULL;
    int at_line = 0;
    for (size_t i = 0; i < dl->len; i++) {
        const Diag *d = &dl->items[i];
        const DiagSource *s = NULL;
        for (size_t k = 0; k < nsrc && !s; k++)
            if (d->pos.file && src[k].file && strcmp(d->pos.file, src[k].file) == 0)
                s = &src[k];
        if (!s || s->text != cur) {
            at = NULL; /* another file: the line cursor starts over */
            at_line = 0;
            cur = s ? s->text : NULL;
        }
        print_one(out, d, s ? s->text : NULL, s ? s->len : 0, color, &at, &at_line);
    }
}

static void print_one(FILE *out, const Diag *d, const char *text, size_t text_len, bool color,
                      const char **at, int *at_line)
{
    static const char *const word[] = {"error", "warning", "note"};
    static const char *const hue[] = {"\033[1;31m", "\033[1;35m", "\033[1;36m"};
    {
        const char *file = d->pos.file ? d->pos.file : "headroom";
        fputs(color ? "\033[1m" : "", out);
        diag_print_escaped(out, file);
        if (d->pos.line > 0)
            fprintf(out, ":%d:%d:%s ", d->pos.line, d->pos.col > 0 ? d->pos.col : 1,
                    color ? "\033[0m" : "");
        else
            fprintf(out, ":%s ", color ? "\033[0m" : "");
        fprintf(out, "%s%s:%s ", color ? hue[d->severity] : "", word[d->severity],
                color ? "\033[0m" : "");
        diag_print_escaped(out, d->message);
        fputc('\n', out);
        size_t len = 0;
        const char *line = find_line(text, text_len, d->pos.line, &len, at, at_line);
        if (!line)
            return;
        /* Long lines are shown around the column so a 1 MB line stays readable. */
        size_t col = d->pos.col > 0 ? (size_t)d->pos.col - 1 : 0;
        size_t from = 0;
        if (len > 160 && col > 80)
            from = col - 60;
        size_t shown = len - from < 160 ? len - from : 160;
        unsigned char cols[160];
        fprintf(out, "%5d | %s", d->pos.line, from ? "..." : "");
        put_escaped(out, line + from, shown, cols);
        fprintf(out, "%s\n      | %s", from + shown < len ? "..." : "", from ? "   " : "");
        /* The caret sits under the column; tabs are kept so it lines up, an
         * escaped character takes the width of its escape. */
        for (size_t c = from; c < col && c < from + shown; c++) {
            if (line[c] == '\t') {
                fputc('\t', out);
                continue;
            }
            size_t w = cols[c - from];
            if (w == 1 && ((unsigned char)line[c] & 0xC0) == 0x80)
                continue; /* one caret column per UTF-8 character */
            for (size_t k = 0; k < w; k++)
                fputc(' ', out);
        }
        fprintf(out, "%s^%s\n", color ? hue[d->severity] : "", color ? "\033[0m" : "");
    }
}
