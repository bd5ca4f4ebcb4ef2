/* json_out.c — the streaming JSON writer (json_out.h). */
#include "json_out.h"

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

void json_out_init(JsonOut *w, FILE *f)
{
    memset(w, 0, sizeof *w);
    w->f = f;
}

/* The length of the well-formed UTF-8 sequence at s, or 0. */
static size_t utf8_sequence(const unsigned char *s)
{
    unsigned char c = s[0];
    if (c < 0x80)
        return 1;
    size_t n;
    uint32_t cp;
    if (c >= 0xC2 && c <= 0xDF) {
        n = 2;
        cp = c & 0x1Fu;
    } else if (c >= 0xE0 && c <= 0xEF) {
        n = 3;
        cp = c & 0x0Fu;
    } else if (c >= 0xF0 && c <= 0xF4) {
        n = 4;
        cp = c & 0x07u;
    } else {
        return 0;   /* a continuation byte, C0/C1 or above F4 */
    }
    for (size_t k = 1; k < n; k++) {
        if ((s[k] & 0xC0u) != 0x80u)
            return 0;
        cp = (cp << 6) | (s[k] & 0x3Fu);
    }
    if ((n == 3 && cp < 0x800) || (n == 4 && cp < 0x10000) || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF))
        return 0;
    return n;
}

bool json_out_utf8_ok(const char *s)
{
    const unsigned char *p = (const unsigned char *)s;
    while (*p) {
        size_t n = utf8_sequence(p);
        if (n == 0)
            return false;
        p += n;
    }
    return true;
}

static void put_quoted(FILE *f, const char *s)
{
    putc('"', f);
    const char *run = s;
    for (const char *p = s;; p++) {
        unsigned char c = (unsigned char)*p;
        if (c >= 0x20 && c != '"' && c != '\\')
            continue;
        fwrite(run, 1, (size_t)(p - run), f);
        if (c == '\0')
            break;
        switch (c) {
        case '"': fputs("\\\"", f); break;
        case '\\': fputs("\\\\", f); break;
        case '\b': fputs("\\b", f); break;
        case '\f': fputs("\\f", f); break;
        case '\n': fputs("\\n", f); break;
        case '\r': fputs("\\r", f); break;
        case '\t': fputs("\\t", f); break;
        default: fprintf(f, "\\u%04X", (unsigned)c); break;
        }
        run = p + 1;
    }
    putc('"', f);
}

/* Start a member: false (write nothing) when it is left out. */
static bool member(JsonOut *w, const char *key)
{
    if (w->skip)
        return false;
    if (w->depth > 0 && w->is_object[w->depth] && (!key || !json_out_utf8_ok(key)))
        return false;
    if (w->depth > 0) {
        fputs(w->has_items[w->depth] ? ",\n" : "\n", w->f);
        w->has_items[w->depth] = true;
        for (int i = 0; i < w->depth; i++)
            fputs("  ", w->f);
        if (w->is_object[w->depth]) {
            put_quoted(w->f, key);
            fputs(": ", w->f);
        }
    }
    return true;
}

static void begin(JsonOut *w, const char *key, bool object)
{
    if (!member(w, key) || w->depth >= JSON_OUT_DEPTH) {
        w->skip++;
        return;
    }
    putc(object ? '{' : '[', w->f);
    w->depth++;
    w->has_items[w->depth] = false;
    w->is_object[w->depth] = object;
}

static void end(JsonOut *w, bool object)
{
    if (w->skip) {
        w->skip--;
        return;
    }
    if (w->depth == 0)
        return;
    bool items = w->has_items[w->depth];
    w->depth--;
    if (items) {
        putc('\n', w->f);
        for (int i = 0; i < w->depth; i++)
            fputs("  ", w->f);
    }
    putc(object ? '}' : ']', w->f);
}

void json_out_begin_object(JsonOut *w, const char *key) { begin(w, key, true); }
void json_out_end_object(JsonOut *w) { end(w, true); }
void json_out_begin_array(JsonOut *w, const char *key) { begin(w, key, false); }
void json_out_end_array(JsonOut *w) { end(w, false); }

void json_out_string(JsonOut *w, const char *key, const char *s)
{
    if (s && json_out_utf8_ok(s) && member(w, key))
        put_quoted(w->f, s);
}

void json_out_text(JsonOut *w, const char *key, const char *s)
{
    if (!s)
        s = "";
    if (json_out_utf8_ok(s)) {
        json_out_string(w, key, s);
        return;
    }
    if (!member(w, key))
        return;
    size_t n = strlen(s);
    char buf[256];
    char *copy = n < sizeof buf ? buf : malloc(n + 1);
    if (!copy)
        return;
    for (size_t i = 0; i <= n; i++)
        copy[i] = (unsigned char)s[i] >= 0x80 ? '?' : s[i];
    put_quoted(w->f, copy);
    if (copy != buf)
        free(copy);
}

void json_out_real(JsonOut *w, const char *key, double x)
{
    if (!member(w, key))
        return;
    if (!isfinite(x)) {
        fputs("null", w->f);
        return;
    }
    char buf[40];
    int n = snprintf(buf, sizeof buf, "%.17g", x);
    if (n < 0 || (size_t)n >= sizeof buf - 3)
        n = 0;
    buf[n] = '\0';
    char *e = strchr(buf, 'e');
    if (!e && !strchr(buf, '.')) {
        memcpy(buf + n, ".0", 3);
    } else if (e) {
        /* 1e+20 -> 1e20, 1.5e-07 -> 1.5e-7 */
        char *to = e + 1, *from = e + 1;
        if (*from == '+')
            from++;
        else if (*from == '-')
            to = ++from;
        while (*from == '0' && from[1])
            from++;
        memmove(to, from, strlen(from) + 1);
    }
    fputs(buf, w->f);
}

void json_out_int(JsonOut *w, const char *key, long long v)
{
    if (member(w, key))
        fprintf(w->f, "%lld", v);
}

void json_out_bool(JsonOut *w, const char *key, bool b)
{
    if (member(w, key))
        fputs(b ? "true" : "false", w->f);
}

void json_out_null(JsonOut *w, const char *key)
{
    if (member(w, key))
        fputs("null", w->f);
}
