/* json_out.c — the streaming JSON writer (json_out.h). */
#include "json_out.h"
#include "numfmt.h"
#include "source.h"

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

void json_out_init(JsonOut *w, FILE *f)
{
    memset(w, 0, sizeof *w);
    w->f = f;
}

void json_out_init_compact(JsonOut *w, StrBuf *sb)
{
    memset(w, 0, sizeof *w);
    w->sb = sb;
    w->compact = true;
}

static void write_out(JsonOut *w, const char *s, size_t n)
{
    if (w->f)
        fwrite(s, 1, n, w->f);
    else
        sb_putn(w->sb, s, n);
}

static void flush(JsonOut *w)
{
    if (w->len)
        write_out(w, w->buf, w->len);
    w->len = 0;
}

static inline void put(JsonOut *w, const char *s, size_t n)
{
    if (w->len + n > sizeof w->buf) {
        flush(w);
        if (n > sizeof w->buf) {
            write_out(w, s, n);
            return;
        }
    }
    memcpy(w->buf + w->len, s, n);
    w->len += n;
}

static inline void put_str(JsonOut *w, const char *s) { put(w, s, strlen(s)); }

/* Room for n more bytes at the end of the buffer, written out first when
 * they do not fit; n is at most the buffer's size. The caller adds what it
 * writes there to w->len. */
static inline char *room(JsonOut *w, size_t n)
{
    if (w->len + n > sizeof w->buf)
        flush(w);
    return w->buf + w->len;
}

static inline void put_char(JsonOut *w, char c)
{
    if (w->len == sizeof w->buf)
        flush(w);
    w->buf[w->len++] = c;
}

/* A new line and two spaces a level of nesting. */
static void put_indent(JsonOut *w, int depth)
{
    static const char spaces[] = "\n                                                                ";
    size_t n = 1 + 2 * (size_t)depth;
    if (n <= sizeof spaces - 1) {
        put(w, spaces, n);
        return;
    }
    put_char(w, '\n');
    for (int i = 0; i < depth; i++)
        put(w, "  ", 2);
}

bool json_out_finish(JsonOut *w)
{
    flush(w);
    return !w->f || !ferror(w->f);
}

bool json_out_utf8_ok(const char *s)
{
    const unsigned char *p = (const unsigned char *)s;
    const unsigned char *end = NULL; /* found at the first byte past ASCII */
    while (*p) {
        if (*p < 0x80) {
            p++;
            continue;
        }
        if (!end)
            end = p + strlen((const char *)p);
        size_t n = source_utf8_len(p, (size_t)(end - p));
        if (n == 0)
            return false;
        p += n;
    }
    return true;
}

static void put_quoted(JsonOut *w, const char *s)
{
    put_char(w, '"');
    const char *run = s;
    for (const char *p = s;; p++) {
        unsigned char c = (unsigned char)*p;
        if (c >= 0x20 && c != '"' && c != '\\')
            continue;
        put(w, run, (size_t)(p - run));
        if (c == '\0')
            break;
        switch (c) {
        case '"': put_str(w, "\\\""); break;
        case '\\': put_str(w, "\\\\"); break;
        case '\b': put_str(w, "\\b"); break;
        case '\f': put_str(w, "\\f"); break;
        case '\n': put_str(w, "\\n"); break;
        case '\r': put_str(w, "\\r"); break;
        case '\t': put_str(w, "\\t"); break;
        default: {
            char esc[8];
            snprintf(esc, sizeof esc, "\\u%04X", (unsigned)c);
            put_str(w, esc);
            break;
        }
        }
        run = p + 1;
    }
    put_char(w, '"');
}

/* 1: a byte written between quotes as it is (ASCII from the space up but
 * '"' and '\\'; DEL is written as it is by put_quoted too) */
static const unsigned char PLAIN[256] = {
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    1, 1, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1,
    1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 0, 1, 1, 1,
    1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
};

/* True when s[0..n) is ASCII from the space up without '"' or '\\': the common
 * text, valid and written between quotes as it is. Eight bytes a step: a
 * byte below 0x20, equal to '"' or '\\' or with its high bit set marks its
 * word (the borrow of a subtraction reaches the high bit of a byte only
 * from a byte that matches, so the test is exact for the word). */
static bool plain_bytes(const char *s, size_t n)
{
    const uint64_t ones = 0x0101010101010101ULL, high = 0x8080808080808080ULL;
    size_t i = 0;
    for (; i + 8 <= n; i += 8) {
        uint64_t v;
        memcpy(&v, s + i, sizeof v);
        uint64_t q = v ^ (ones * '"'), b = v ^ (ones * '\\');
        uint64_t hit = ((v - ones * 0x20) & ~v) | ((q - ones) & ~q) | ((b - ones) & ~b) | v;
        if (hit & high)
            return false;
    }
    for (; i < n; i++)
        if (!PLAIN[(unsigned char)s[i]])
            return false;
    return true;
}

/* True, with its length, when s is plain text (plain_bytes). */
static bool plain_text(const char *s, size_t *len)
{
    size_t n = strlen(s);
    if (!plain_bytes(s, n))
        return false;
    *len = n;
    return true;
}

/* A key longer than this is written by put_quoted. */
enum { KEY_FAST = 64 };

static void put_plain(JsonOut *w, const char *s, size_t n)
{
    if (n + 2 > sizeof w->buf) {
        put_char(w, '"');
        put(w, s, n);
        put_char(w, '"');
        return;
    }
    char *o = room(w, n + 2);
    o[0] = '"';
    memcpy(o + 1, s, n);
    o[n + 1] = '"';
    w->len += n + 2;
}

/* Start a member: false (write nothing) when it is left out. The comma, the
 * indent and the key are written in one piece, the key copied as it is
 * checked (a key is short), when it is plain and fits. */
static bool member(JsonOut *w, const char *key)
{
    if (w->skip)
        return false;
    if (w->depth == 0)
        return true;
    bool keyed = w->is_object[w->depth];
    if (keyed && !key)
        return false;
    bool comma = w->has_items[w->depth];
    size_t indent = w->compact ? 0 : 1 + 2 * (size_t)w->depth; /* at most 65 (JSON_OUT_DEPTH) */
    /* the prefix without the key, the key's quotes and ": " in 16 bytes more */
    char *o = room(w, comma + indent + 16 + KEY_FAST);
    char *start = o;
    if (comma)
        *o++ = ',';
    if (indent) {
        *o = '\n';
        for (size_t i = 1; i < indent; i += 8)
            memcpy(o + i, "        ", 8);
        o += indent;
    }
    if (keyed) {
        *o++ = '"';
        size_t i = 0;
        const unsigned char *k = (const unsigned char *)key;
        for (; i < KEY_FAST && PLAIN[k[i]]; i++)
            o[i] = (char)k[i];
        if (k[i] != '\0') {
            /* not plain, or long: the general way */
            size_t n;
            if (!plain_text(key, &n) && !json_out_utf8_ok(key))
                return false;
            w->len += (size_t)(o - 1 - start);
            w->has_items[w->depth] = true;
            put_quoted(w, key);
            put(w, ": ", w->compact ? 1 : 2);
            return true;
        }
        o += i;
        *o++ = '"';
        *o++ = ':';
        if (!w->compact)
            *o++ = ' ';
    }
    w->has_items[w->depth] = true;
    w->len += (size_t)(o - start);
    return true;
}

static void begin(JsonOut *w, const char *key, bool object)
{
    if (!member(w, key) || w->depth >= JSON_OUT_DEPTH) {
        w->skip++;
        return;
    }
    put_char(w, object ? '{' : '[');
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
    if (items && !w->compact)
        put_indent(w, w->depth);
    put_char(w, object ? '}' : ']');
}

void json_out_begin_object(JsonOut *w, const char *key) { begin(w, key, true); }
void json_out_end_object(JsonOut *w) { end(w, true); }
void json_out_begin_array(JsonOut *w, const char *key) { begin(w, key, false); }
void json_out_end_array(JsonOut *w) { end(w, false); }

void json_out_string(JsonOut *w, const char *key, const char *s)
{
    size_t n;
    if (!s)
        return;
    if (plain_text(s, &n)) {
        if (member(w, key))
            put_plain(w, s, n);
        return;
    }
    if (json_out_utf8_ok(s) && member(w, key))
        put_quoted(w, s);
}

void json_out_text(JsonOut *w, const char *key, const char *s)
{
    if (!s)
        s = "";
    size_t n;
    if (plain_text(s, &n)) {
        if (member(w, key))
            put_plain(w, s, n);
        return;
    }
    if (json_out_utf8_ok(s)) {
        if (member(w, key))
            put_quoted(w, s);
        return;
    }
    if (!member(w, key))
        return;
    n = strlen(s);
    char buf[256];
    char *copy = n < sizeof buf ? buf : malloc(n + 1);
    if (!copy)
        return;
    for (size_t i = 0; i <= n; i++)
        copy[i] = (unsigned char)s[i] >= 0x80 ? '?' : s[i];
    put_quoted(w, copy);
    if (copy != buf)
        free(copy);
}

/* What %.17g prints for x (with num_round's digits d and power ex), in the
 * JSON form below: exponent without '+' or leading zeros, ".0" on a whole
 * number. Written at o, which has room for 32 bytes; returns the end. */
static char *real_text(double x, uint64_t d, int ex, char *o)
{
    char dig[20];
    num_digit_text(d, 17, dig);
    int n = 17; /* %g drops trailing zeros */
    while (n > 1 && dig[n - 1] == '0')
        n--;
    if (x < 0)
        *o++ = '-';
    if (ex < -4 || ex >= 17) {
        *o++ = dig[0];
        if (n > 1) {
            *o++ = '.';
            memcpy(o, dig + 1, (size_t)n - 1);
            o += n - 1;
        }
        o += sprintf(o, "e%d", ex);
    } else if (ex < 0) {
        *o++ = '0';
        *o++ = '.';
        for (int i = 0; i < -ex - 1; i++)
            *o++ = '0';
        memcpy(o, dig, (size_t)n);
        o += n;
    } else {
        memcpy(o, dig, (size_t)ex + 1);
        o += ex + 1;
        *o++ = '.';
        if (n > ex + 1) {
            memcpy(o, dig + ex + 1, (size_t)(n - ex - 1));
            o += n - ex - 1;
        } else {
            *o++ = '0';
        }
    }
    return o;
}

void json_out_real(JsonOut *w, const char *key, double x)
{
    if (!member(w, key))
        return;
    if (!isfinite(x)) {
        put_str(w, "null");
        return;
    }
    char buf[40];
    uint64_t d;
    int ex;
    if (num_round(x, 17, &d, &ex)) {
        char *o = room(w, 32);
        w->len += (size_t)(real_text(x, d, ex, o) - o);
        return;
    }
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
    put_str(w, buf);
}

void json_out_int(JsonOut *w, const char *key, long long v)
{
    if (member(w, key)) {
        char buf[24];
        char *o = buf + sizeof buf;
        unsigned long long u = v < 0 ? 0ULL - (unsigned long long)v : (unsigned long long)v;
        do {
            *--o = (char)('0' + u % 10);
            u /= 10;
        } while (u);
        if (v < 0)
            *--o = '-';
        put(w, o, (size_t)(buf + sizeof buf - o));
    }
}

void json_out_bool(JsonOut *w, const char *key, bool b)
{
    if (member(w, key))
        put_str(w, b ? "true" : "false");
}

void json_out_null(JsonOut *w, const char *key)
{
    if (member(w, key))
        put_str(w, "null");
}
