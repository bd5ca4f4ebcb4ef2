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

/* Insertion sort: stable, and lists are short and nearly sorted. */
void diag_sort(DiagList *dl)
{
    for (size_t i = 1; i < dl->len; i++) {
        Diag d = dl->items[i];
        size_t j = i;
        while (j > 0 && pos_cmp(&dl->items[j - 1], &d) > 0) {
            dl->items[j] = dl->items[j - 1];
            j--;
        }
        dl->items[j] = d;
    }
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
        if (d->pos.line > 0)
            fprintf(out, "%s%s:%d:%d:%s ", color ? "\033[1m" : "", file, d->pos.line,
                    d->pos.col > 0 ? d->pos.col : 1, color ? "\033[0m" : "");
        else
            fprintf(out, "%s%s:%s ", color ? "\033[1m" : "", file, color ? "\033[0m" : "");
        fprintf(out, "%s%s:%s %s\n", color ? hue[d->severity] : "", word[d->severity],
                color ? "\033[0m" : "", d->message);
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
        fprintf(out, "%5d | %s", d->pos.line, from ? "..." : "");
        fwrite(line + from, 1, shown, out);
        fprintf(out, "%s\n      | %s", from + shown < len ? "..." : "", from ? "   " : "");
        /* The caret sits under the column; tabs are kept so it lines up. */
        for (size_t c = from; c < col && c < from + shown; c++) {
            if (((unsigned char)line[c] & 0xC0) == 0x80)
                continue; /* one caret column per UTF-8 character */
            fputc(line[c] == '\t' ? '\t' : ' ', out);
        }
        fprintf(out, "%s^%s\n", color ? hue[d->severity] : "", color ? "\033[0m" : "");
    }
}
