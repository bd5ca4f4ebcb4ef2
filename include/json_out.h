/* json_out.h — the one JSON writer: build and diff JSON, SARIF and the
 * language server's messages.
 *
 * Members are written as they are produced, straight to a FILE or into a
 * StrBuf, with no tree in memory: the output is the indented form other
 * tools and the tests read (two spaces a level, `"key": value`, `{}` and
 * `[]` when empty), or with json_out_init_compact() the compact form of a
 * JSON-RPC body (no space or line break anywhere), and
 * reals print with 17 significant digits (`%.17g`, always with a '.' or an
 * exponent, the exponent without '+' or leading zeros), which round-trips.
 *
 * Every call takes the member's key: a string inside an object, NULL inside
 * an array or at the top. A member whose key or text is not UTF-8 (or text
 * that is NULL) is left out, with everything inside it; json_out_text()
 * writes such bytes as '?' instead. Nesting is limited to JSON_OUT_DEPTH. */
#ifndef HEADROOM_JSON_OUT_H
#define HEADROOM_JSON_OUT_H

#include <stdbool.h>
#include <stdio.h>

#include "arena.h"

enum { JSON_OUT_DEPTH = 32 };

typedef struct JsonOut {
    FILE *f;                      /* NULL: into sb */
    StrBuf *sb;
    bool compact;
    char buf[16384];              /* written to f when full and at the end */
    size_t len;
    int depth;                    /* open containers */
    int skip;                     /* > 0: inside a member being left out */
    bool has_items[JSON_OUT_DEPTH + 1];
    bool is_object[JSON_OUT_DEPTH + 1];
} JsonOut;

void json_out_init(JsonOut *w, FILE *f);
/* The compact form, appended to sb (the caller's, which it frees). */
void json_out_init_compact(JsonOut *w, StrBuf *sb);
/* Write out what is buffered; false on a write error. */
bool json_out_finish(JsonOut *w);
void json_out_begin_object(JsonOut *w, const char *key);
void json_out_end_object(JsonOut *w);
void json_out_begin_array(JsonOut *w, const char *key);
void json_out_end_array(JsonOut *w);
void json_out_string(JsonOut *w, const char *key, const char *s);
void json_out_text(JsonOut *w, const char *key, const char *s);
void json_out_real(JsonOut *w, const char *key, double x);   /* not finite: null */
void json_out_int(JsonOut *w, const char *key, long long v);
void json_out_bool(JsonOut *w, const char *key, bool b);
void json_out_null(JsonOut *w, const char *key);

/* True when the text is well-formed UTF-8 (no overlong forms, surrogates or
 * code points above U+10FFFF). */
bool json_out_utf8_ok(const char *s);

#endif
