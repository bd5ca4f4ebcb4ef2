/* lsp.c — `headroom lsp`: the Language Server Protocol over standard I/O.
 *
 * Messages are JSON-RPC 2.0 bodies behind a `Content-Length` header. They
 * are parsed with jansson, which this file alone uses, for the tree a request
 * is read from; every answer and notification is written by the one JSON
 * writer (json_out.h) in its compact form, as it is produced. The
 * server is a loop: read one framed message, answer it, repeat. Every open
 * calc keeps the text the client sent; each change re-reads and
 * re-evaluates it whole (a calc evaluates in milliseconds), publishes its
 * diagnostics, and the requests — hover, inlay hints, definition,
 * completion — are answered from that evaluated Document.
 *
 * Input is untrusted: a header line, a body and the open text are bounded
 * (bounds.h); a body that is not JSON, not an object or lacks what a method
 * needs gets a JSON-RPC error, never a crash; an oversized body is skipped
 * without being stored. Positions are UTF-16 code units unless the client
 * offers "utf-8" in general.positionEncodings (or, before LSP 3.17, in the
 * offsetEncoding extension). */
#include <errno.h>
#include <jansson.h>

#include "json_out.h"
#include <math.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <unistd.h>

#include "bounds.h"
#include "eval.h"
#include "lexicon.h"
#include "library.h"
#include "load.h"
#include "lsp.h"
#include "methods/fittings.h"
#include "methods/pipes.h"
#include "numfmt.h"
#include "render.h"
#include "textpos.h"

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

/* JSON-RPC and LSP error codes. */
enum {
    RPC_PARSE_ERROR = -32700,
    RPC_INVALID_REQUEST = -32600,
    RPC_METHOD_NOT_FOUND = -32601,
    RPC_INVALID_PARAMS = -32602,
    RPC_SERVER_NOT_INITIALIZED = -32002
};

/* LSP enumerations used here. */
enum { SEVERITY_ERROR = 1, SEVERITY_WARNING = 2, SEVERITY_INFORMATION = 3 };
enum {
    ITEM_FUNCTION = 3,
    ITEM_VARIABLE = 6,
    ITEM_FIELD = 5,
    ITEM_UNIT = 11,
    ITEM_VALUE = 12,
    ITEM_KEYWORD = 14,
    ITEM_ENUM_MEMBER = 20,
    ITEM_CONSTANT = 21
};

typedef struct OpenDoc {
    char *uri;
    char *name;              /* the path of a file: URI, else the URI */
    char *text;
    size_t len;
    Document *doc;           /* NULL when the text is over the size limit */
    Evaluated *ev;
    DiagList dl;
} OpenDoc;

typedef struct Reader {
    int fd;
    char buf[65536];
    size_t at, end;
    bool eof;
} Reader;

typedef struct Server {
    Reader in;
    FILE *out;
    ColumnUnit enc;
    bool initialized, shutdown;
    OpenDoc *docs;
    size_t ndocs;
    size_t open_bytes;
} Server;

/* ---- reading framed messages ------------------------------------------ */

static int rd_byte(Reader *r)
{
    if (r->at == r->end) {
        if (r->eof)
            return -1;
        ssize_t n;
        do
            n = read(r->fd, r->buf, sizeof r->buf);
        while (n < 0 && errno == EINTR);
        if (n <= 0) {
            r->eof = true;
            return -1;
        }
        r->at = 0;
        r->end = (size_t)n;
    }
    return (unsigned char)r->buf[r->at++];
}

/* One header line without its CR LF. A longer line than `cap` is read to
 * its end and flagged. False at the end of input. */
static bool rd_line(Reader *r, char *line, size_t cap, size_t *len, bool *too_long)
{
    *len = 0;
    *too_long = false;
    for (;;) {
        int c = rd_byte(r);
        if (c < 0)
            return false;
        if (c == '\n')
            break;
        if (*len + 1 < cap)
            line[(*len)++] = (char)c;
        else
            *too_long = true;
    }
    if (*len && line[*len - 1] == '\r')
        (*len)--;
    line[*len] = '\0';
    return true;
}

/* Read n bytes into dst, or skip them when dst is NULL. */
static bool rd_bytes(Reader *r, char *dst, size_t n)
{
    while (n) {
        if (r->at == r->end) {
            if (rd_byte(r) < 0)
                return false;
            r->at--;
        }
        size_t k = r->end - r->at < n ? r->end - r->at : n;
        if (dst) {
            memcpy(dst, r->buf + r->at, k);
            dst += k;
        }
        r->at += k;
        n -= k;
    }
    return true;
}

/* ---- writing ------------------------------------------------------------ */

/* One outgoing message: its members are written between msg_begin and
 * msg_send, which adds "jsonrpc" last and frames the compact body with its
 * exact length in bytes. */
typedef struct Msg {
    JsonOut w;
    StrBuf body;
} Msg;

static JsonOut *msg_begin(Msg *m)
{
    m->body = (StrBuf){0};
    json_out_init_compact(&m->w, &m->body);
    json_out_begin_object(&m->w, NULL);
    return &m->w;
}

static void msg_send(Server *S, Msg *m)
{
    json_out_string(&m->w, "jsonrpc", "2.0");
    json_out_end_object(&m->w);
    json_out_finish(&m->w);
    fprintf(S->out, "Content-Length: %zu\r\n\r\n", m->body.len);
    fwrite(sb_str(&m->body), 1, m->body.len, S->out);
    fflush(S->out);
    sb_free(&m->body);
}

/* A request's id as it came: a string, an integer, or null (absent too). */
static void id_write(JsonOut *w, json_t *id)
{
    if (json_is_integer(id))
        json_out_int(w, "id", json_integer_value(id));
    else if (json_is_string(id))
        json_out_string(w, "id", json_string_value(id));
    else
        json_out_null(w, "id");
}

static void reply_null(Server *S, json_t *id)
{
    Msg m;
    JsonOut *w = msg_begin(&m);
    id_write(w, id);
    json_out_null(w, "result");
    msg_send(S, &m);
}

static void reply_error(Server *S, json_t *id, int code, const char *fmt, ...)
    __attribute__((format(printf, 4, 5)));
static void reply_error(Server *S, json_t *id, int code, const char *fmt, ...)
{
    char text[512];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(text, sizeof text, fmt, ap);
    va_end(ap);
    Msg m;
    JsonOut *w = msg_begin(&m);
    id_write(w, id);
    json_out_begin_object(w, "error");
    json_out_int(w, "code", code);
    json_out_text(w, "message", text);
    json_out_end_object(w);
    msg_send(S, &m);
}

/* ---- documents ---------------------------------------------------------- */

static int hexval(char c)
{
    return c >= '0' && c <= '9' ? c - '0' : c >= 'a' && c <= 'f' ? c - 'a' + 10 : c >= 'A' && c <= 'F' ? c - 'A' + 10 : -1;
}

/* file:///a/b%20c.calc.md -> /a/b c.calc.md; anything else stays the URI. */
static char *uri_to_name(const char *uri)
{
    if (strncmp(uri, "file://", 7) != 0)
        return xstrdup(uri);
    const char *p = uri + 7;
    if (*p != '/') /* file://host/path: keep the path */
        p = strchr(p, '/') ? strchr(p, '/') : p + strlen(p);
    char *out = xmalloc(strlen(p) + 1), *o = out;
    for (; *p; p++) {
        int hi, lo;
        if (*p == '%' && (hi = hexval(p[1])) >= 0 && (lo = hexval(p[2])) >= 0 && (hi || lo)) {
            *o++ = (char)(hi * 16 + lo);
            p += 2;
        } else {
            *o++ = *p;
        }
    }
    *o = '\0';
    return out;
}

static OpenDoc *doc_find(Server *S, const char *uri)
{
    for (size_t i = 0; i < S->ndocs; i++)
        if (strcmp(S->docs[i].uri, uri) == 0)
            return &S->docs[i];
    return NULL;
}

static void doc_clear(OpenDoc *od)
{
    doc_free(od->doc);
    od->doc = NULL;
    od->ev = NULL;
    diag_free(&od->dl);
}

/* Read and evaluate the text again. */
static void doc_analyse(OpenDoc *od)
{
    doc_clear(od);
    if (od->len > SOURCE_MAX_BYTES) {
        diag_error(&od->dl, ((Pos){od->name, 1, 1}), "file is larger than the limit of %d bytes", SOURCE_MAX_BYTES);
        return;
    }
    od->doc = doc_from_text(od->name, od->text, od->len, &od->dl);
    od->ev = eval_document(od->doc, &od->dl);
    diag_sort(&od->dl);
}

/* The byte length of the identifier-like token starting at p[0]. */
static size_t token_len(const char *p, size_t n)
{
    size_t k = 0;
    while (k < n && (p[k] == '_' || p[k] == '.' || (p[k] >= '0' && p[k] <= '9') || (p[k] >= 'A' && p[k] <= 'Z') ||
                     (p[k] >= 'a' && p[k] <= 'z') || (unsigned char)p[k] >= 0x80))
        k++;
    return k;
}

/* An LSP position for a 1-based line and a byte offset in it. */
static void position_write(JsonOut *w, const char *key, const Server *S, const OpenDoc *od, int line, size_t byte)
{
    size_t len = 0;
    const char *p = od->doc ? doc_source_line(od->doc, line, &len) : NULL;
    size_t ch = p ? textpos_units(p, len, byte, S->enc) : 0;
    json_out_begin_object(w, key);
    json_out_int(w, "line", line > 0 ? line - 1 : 0);
    json_out_int(w, "character", (long long)ch);
    json_out_end_object(w);
}

static void range_write(JsonOut *w, const char *key, const Server *S, const OpenDoc *od, int line, size_t from,
                        size_t to)
{
    json_out_begin_object(w, key);
    position_write(w, "start", S, od, line, from);
    position_write(w, "end", S, od, line, to);
    json_out_end_object(w);
}

/* The range of the token a diagnostic points at (one character at least). */
static void diag_range_write(JsonOut *w, const Server *S, const OpenDoc *od, const Diag *d)
{
    size_t len = 0;
    const char *p = od->doc ? doc_source_line(od->doc, d->pos.line, &len) : NULL;
    if (!p) {
        range_write(w, "range", S, od, 1, 0, 0);
        return;
    }
    size_t at = d->pos.col > 1 ? (size_t)d->pos.col - 1 : 0;
    if (at > len)
        at = len;
    size_t n = token_len(p + at, len - at);
    if (n == 0 && at < len)
        n = textpos_bytes(p + at, len - at, 1, COL_CODEPOINT);
    range_write(w, "range", S, od, d->pos.line, at, at + n);
}

static void publish(Server *S, const OpenDoc *od, bool empty)
{
    Msg m;
    JsonOut *w = msg_begin(&m);
    json_out_string(w, "method", "textDocument/publishDiagnostics");
    json_out_begin_object(w, "params");
    json_out_string(w, "uri", od->uri);
    json_out_begin_array(w, "diagnostics");
    for (size_t i = 0; !empty && i < od->dl.len; i++) {
        const Diag *d = &od->dl.items[i];
        json_out_begin_object(w, NULL);
        bool here = !d->pos.file || strcmp(d->pos.file, od->name) == 0;
        if (here) {
            diag_range_write(w, S, od, d);
            json_out_text(w, "message", d->message);
        } else {
            /* A used file's diagnostic: shown at the top, naming its place. */
            char *text = xmalloc(strlen(d->message) + strlen(d->pos.file) + 48);
            sprintf(text, "%s:%d:%d: %s", d->pos.file, d->pos.line, d->pos.col, d->message);
            range_write(w, "range", S, od, 1, 0, 0);
            json_out_text(w, "message", text);
            free(text);
        }
        json_out_int(w, "severity", d->severity == SEV_ERROR     ? SEVERITY_ERROR
                                    : d->severity == SEV_WARNING ? SEVERITY_WARNING
                                                                 : SEVERITY_INFORMATION);
        json_out_string(w, "source", "headroom");
        json_out_string(w, "code", finding_rules[finding_of_diag(d)].id);
        json_out_end_object(w);
    }
    json_out_end_array(w);
    json_out_end_object(w);
    msg_send(S, &m);
}

/* ---- request helpers ---------------------------------------------------- */

/* params.textDocument.uri, or NULL. */
static const char *param_uri(json_t *params)
{
    json_t *td = json_object_get(params, "textDocument");
    json_t *uri = json_object_get(td, "uri");
    return json_is_string(uri) ? json_string_value(uri) : NULL;
}

/* An LSP position -> 1-based line and byte offset within it. */
static bool param_position(const Server *S, const OpenDoc *od, json_t *pos, int *line, size_t *byte, const char **text,
                           size_t *len)
{
    json_t *l = json_object_get(pos, "line"), *c = json_object_get(pos, "character");
    if (!json_is_integer(l) || !json_is_integer(c) || json_integer_value(l) < 0 || json_integer_value(c) < 0)
        return false;
    if (!od->doc || json_integer_value(l) >= (json_int_t)od->doc->nlines)
        return false;
    *line = (int)json_integer_value(l) + 1;
    *text = doc_source_line(od->doc, *line, len);
    if (!*text)
        return false;
    *byte = textpos_bytes(*text, *len, (size_t)json_integer_value(c), S->enc);
    return true;
}

static bool word_byte(char c)
{
    return c == '_' || (c >= '0' && c <= '9') || (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') ||
           (unsigned char)c >= 0x80;
}

/* The name under (or just before) byte `at`: [*from, *to). */
static bool word_at(const char *p, size_t len, size_t at, size_t *from, size_t *to)
{
    size_t a = at, b = at;
    if ((a >= len || !word_byte(p[a])) && a > 0 && word_byte(p[a - 1]))
        a = b = a - 1;
    if (a >= len || !word_byte(p[a]))
        return false;
    while (a > 0 && word_byte(p[a - 1]))
        a--;
    while (b < len && word_byte(p[b]))
        b++;
    if (p[a] >= '0' && p[a] <= '9')
        return false; /* a number, not a name */
    *from = a;
    *to = b;
    return true;
}

static const Stmt *stmt_on_line(const Document *doc, int line)
{
    for (size_t i = 0; i < doc->nstmts; i++)
        if (doc->stmts[i]->pos.line == line)
            return doc->stmts[i];
    return NULL;
}

static const Source *source_of(const Document *doc, const char *key)
{
    for (size_t i = 0; i < doc->nsources; i++)
        if (strcmp(doc->sources[i].key, key) == 0)
            return &doc->sources[i];
    return NULL;
}

/* "k_fitting(3 arguments; method=, D2=, r=)": what builtins.def says. */
static void put_signature(const Builtin *b, StrBuf *out)
{
    sb_printf(out, "%s(", b->name);
    if (b->max_args < 0)
        sb_printf(out, "%d or more arguments", b->min_args);
    else if (b->min_args == b->max_args)
        sb_printf(out, "%d argument%s", b->min_args, b->min_args == 1 ? "" : "s");
    else
        sb_printf(out, "%d to %d arguments", b->min_args, b->max_args);
    const char *k = b->keywords;
    bool first = true;
    while (k && *k) {
        while (*k == ' ')
            k++;
        size_t n = strcspn(k, " ");
        if (n) {
            sb_printf(out, "%s%.*s=", first ? "; " : ", ", (int)n, k);
            first = false;
        }
        k += n;
    }
    sb_putc(out, ')');
}

/* ---- hover -------------------------------------------------------------- */

static void put_cites(const Document *doc, const Stmt *s, StrBuf *out)
{
    for (size_t i = 0; i < s->ncites; i++) {
        const Source *src = source_of(doc, s->cites[i].key);
        sb_printf(out, "\n\nSource [%s]: %s", s->cites[i].key, src ? src->text : "(not in the sources block)");
    }
}

static void put_methods(const StmtResult *r, StrBuf *out)
{
    for (size_t k = 0; k < r->nmethods; k++) {
        const Method *m = r->methods[k];
        sb_printf(out, "\n\nMethod: %s", m->title);
        if (m->formula)
            sb_printf(out, ", %s", m->formula);
        if (m->validity)
            sb_printf(out, " (valid for %s)", m->validity);
        if (m->reference)
            sb_printf(out, ". %s", m->reference);
    }
}

static void put_si(const Value *v, StrBuf *out)
{
    if (v->kind != VAL_NUMBER || !isfinite(v->q.si) || dim_is_none(v->q.dim))
        return;
    char num[48], unit[64];
    num_sig(v->q.si, 6, num, sizeof num);
    dim_format_si(v->q.dim, unit, sizeof unit);
    sb_printf(out, "\n\nIn SI: %s %s", num, unit);
}

/* What a defined name is: value, unit, formula, substituted formula,
 * sources, methods and the line. */
static void hover_name(const Evaluated *ev, const Stmt *s, StrBuf *out)
{
    const StmtResult *r = &ev->results[s->index];
    StrBuf f = {0}, v = {0}, val = {0};
    if (r->state == RES_OK)
        render_value_text(ev, &r->value, r->shown, &val);
    sb_printf(out, "%s = %s", s->name, r->state == RES_OK ? sb_str(&val) : "(not evaluated)");
    if (s->description)
        sb_printf(out, "\n\n%s", s->description);
    sb_puts(out, "\n\n```calc\n");
    if (s->kind == STMT_DEF && s->expr) {
        render_expr_text(ev, s->expr, false, &f);
        sb_printf(out, "%s = %s%s%s\n", s->name, sb_str(&f), s->has_as ? " as " : "", s->has_as ? s->as->text : "");
        if (r->state == RES_OK && expr_reads_names(s->expr)) {
            render_expr_text(ev, s->expr, true, &v);
            sb_printf(out, "  = %s\n", sb_str(&v));
        }
        if (r->state == RES_OK && r->value.kind == VAL_NUMBER)
            sb_printf(out, "  = %s\n", sb_str(&val));
    } else if (s->kind == STMT_SOLVE && s->lhs && s->rhs) {
        StrBuf l = {0}, rr = {0};
        render_expr_text(ev, s->lhs, false, &l);
        render_expr_text(ev, s->rhs, false, &rr);
        sb_printf(out, "%s = solve %s where %s = %s\n", s->name, s->solve->var, sb_str(&l), sb_str(&rr));
        if (r->state == RES_OK) {
            char res[64];
            Value resid = value_number(qty(r->sides->solve.residual, r->sides->lhs.q.dim));
            render_quantity(ev, &resid, &r->sides->lhs_shown, res, sizeof res);
            sb_printf(out, "  at %s = %s: residual %s after %d iterations\n", s->solve->var, sb_str(&val), res,
                      r->sides->solve.iterations);
        }
        sb_free(&l);
        sb_free(&rr);
    } else if (s->kind == STMT_PATH) {
        sb_printf(out, "path %s\n", s->name);
    } else if (s->kind == STMT_NETWORK) {
        sb_printf(out, "network %s\n", s->name);
    }
    sb_puts(out, "```");
    if (r->state == RES_OK && r->value.kind == VAL_RECORD) {
        const Record *rec = r->value.rec;
        size_t shown = rec->nfields < 24 ? rec->nfields : 24;
        sb_printf(out, "\n\n%s record:\n", rec->type ? rec->type : "a");
        for (size_t i = 0; i < shown; i++) {
            const Value *fv = &rec->fields[i].value;
            Unit u = fv->kind == VAL_NUMBER ? eval_display_unit(ev, fv, NULL) : (Unit){0};
            sb_printf(out, "\n- %s.%s = ", s->name, rec->fields[i].name);
            render_value_text(ev, fv, &u, out);
        }
        if (shown < rec->nfields)
            sb_printf(out, "\n- ... %zu more fields", rec->nfields - shown);
    }
    if (r->state == RES_OK)
        put_si(&r->value, out);
    put_cites(ev->doc, s, out);
    if (r->state == RES_OK)
        put_methods(r, out);
    sb_printf(out, "\n\nDefined at line %d.", s->pos.line);
    sb_free(&f);
    sb_free(&v);
    sb_free(&val);
}

static void hover_check(const Evaluated *ev, const Stmt *s, StrBuf *out)
{
    StrBuf v = {0};
    bool fails;
    render_check_verdict(ev, (size_t)s->index, &v, &fails);
    sb_printf(out, "%s %s: %s", s->finding ? "finding" : "check", s->label ? s->label : "", sb_str(&v));
    if (s->description)
        sb_printf(out, "\n\n%s", s->description);
    put_cites(ev->doc, s, out);
    sb_free(&v);
}

static bool hover_field(const Evaluated *ev, int slot, const char *field, StrBuf *out)
{
    const StmtResult *r = &ev->results[slot];
    if (r->state != RES_OK || r->value.kind != VAL_RECORD)
        return false;
    const Record *rec = r->value.rec;
    for (size_t i = 0; i < rec->nfields; i++) {
        if (strcmp(rec->fields[i].name, field) != 0)
            continue;
        const Value *fv = &rec->fields[i].value;
        Unit u = fv->kind == VAL_NUMBER ? eval_display_unit(ev, fv, NULL) : (Unit){0};
        sb_printf(out, "%s.%s = ", ev->doc->stmts[slot]->name, field);
        render_value_text(ev, fv, &u, out);
        put_si(fv, out);
        sb_printf(out, "\n\nA field of %s (line %d).", ev->doc->stmts[slot]->name, ev->doc->stmts[slot]->pos.line);
        put_methods(r, out);
        return true;
    }
    return false;
}

/* A named constant as the editor shows it: its value to ten significant
 * figures, its unit and what it is. */
static void constant_detail(const NamedConstant *k, char *buf, size_t n)
{
    snprintf(buf, n, "%.10g%s%s%s%s", k->si, k->unit[0] ? " " : "", k->unit, k->what ? ", " : "",
             k->what ? k->what : "");
}

/* Each request writes its answer as the message's "result" member. */
static const char RESULT[] = "result";

static void hover_write(JsonOut *w, const char *text, const Server *S, const OpenDoc *od, int line, size_t a,
                        size_t b, bool range)
{
    json_out_begin_object(w, RESULT);
    json_out_begin_object(w, "contents");
    json_out_string(w, "kind", "markdown");
    json_out_text(w, "value", text);
    json_out_end_object(w);
    if (range)
        range_write(w, "range", S, od, line, a, b);
    json_out_end_object(w);
}

static void do_hover(Server *S, OpenDoc *od, json_t *params, JsonOut *w)
{
    int line;
    size_t at, len, a, b;
    const char *p;
    if (!param_position(S, od, json_object_get(params, "position"), &line, &at, &p, &len)) {
        json_out_null(w, RESULT);
        return;
    }
    const Evaluated *ev = od->ev;
    StrBuf out = {0};
    const Stmt *here = stmt_on_line(od->doc, line);
    /* On a check's label: the verdict. */
    if (here && here->kind == STMT_CHECK) {
        const char *colon = memchr(p, ':', len);
        if (colon && at <= (size_t)(colon - p))
            hover_check(ev, here, &out);
    }
    if (!out.len && word_at(p, len, at, &a, &b)) {
        char *word = xstrndup(p + a, b - a);
        int slot = doc_lookup(od->doc, word);
        size_t c, d;
        if (a > 1 && p[a - 1] == '.' && word_at(p, len, a - 2, &c, &d)) {
            char *base = xstrndup(p + c, d - c);
            int bs = doc_lookup(od->doc, base);
            if (bs >= 0)
                hover_field(ev, bs, word, &out);
            free(base);
        } else if (slot >= 0) {
            hover_name(ev, od->doc->stmts[slot], &out);
        } else if (builtin_lookup(word)) {
            const Builtin *fn = builtin_lookup(word);
            put_signature(fn, &out);
            sb_printf(&out, "\n\n%s", fn->summary);
        } else if (lexicon_constant(word, strlen(word))) {
            const NamedConstant *k = lexicon_constant(word, strlen(word));
            char detail[96];
            constant_detail(k, detail, sizeof detail);
            sb_printf(&out, "%s = %s", k->name, detail);
            if (k->source)
                sb_printf(&out, " (%s)", k->source);
        } else if (here && here->kind == STMT_CHECK) {
            hover_check(ev, here, &out);
        }
        free(word);
        if (out.len) {
            hover_write(w, sb_str(&out), S, od, line, a, b, true);
            sb_free(&out);
            return;
        }
    }
    if (!out.len) {
        json_out_null(w, RESULT);
        return;
    }
    hover_write(w, sb_str(&out), S, od, line, 0, 0, false);
    sb_free(&out);
}

/* ---- inlay hints -------------------------------------------------------- */

static void do_inlay_hints(Server *S, OpenDoc *od, json_t *params, JsonOut *w)
{
    json_t *range = json_object_get(params, "range");
    json_t *st = json_object_get(json_object_get(range, "start"), "line");
    json_t *en = json_object_get(json_object_get(range, "end"), "line");
    json_int_t from = json_is_integer(st) ? json_integer_value(st) + 1 : 1;
    json_int_t to = json_is_integer(en) ? json_integer_value(en) + 1 : (json_int_t)od->doc->nlines;
    json_out_begin_array(w, RESULT);
    const Evaluated *ev = od->ev;
    for (size_t i = 0; i < od->doc->nstmts; i++) {
        const Stmt *s = od->doc->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (s->pos.line < from || s->pos.line > to || r->state != RES_OK)
            continue;
        StrBuf label = {0};
        if (s->kind == STMT_DEF || s->kind == STMT_SOLVE) {
            sb_puts(&label, "= ");
            render_value_text(ev, &r->value, r->shown, &label);
        } else if (s->kind == STMT_CHECK && s->finding) {
            sb_puts(&label, r->holds ? "yes" : "no"); /* a finding's answer */
        } else if (s->kind == STMT_CHECK) {
            bool fails;
            StrBuf v = {0};
            render_check_verdict(ev, i, &v, &fails);
            char u[32] = "n/a";
            if (isfinite(r->utilization))
                num_sig(r->utilization, 3, u, sizeof u);
            sb_printf(&label, "%s, utilisation %s", fails ? "FAILS" : "holds", u);
            sb_free(&v);
        } else if ((s->kind == STMT_PATH || s->kind == STMT_NETWORK) && r->value.kind == VAL_RECORD) {
            /* a path's outlet pressure, a network's lowest junction
             * pressure, as their records carry them */
            const Record *rec = r->value.rec;
            const char *key = s->kind == STMT_PATH ? "p_end" : "p_min";
            for (size_t f = 0; f < rec->nfields; f++)
                if (strcmp(rec->fields[f].name, key) == 0) {
                    const Value *fv = &rec->fields[f].value;
                    Unit u = eval_display_unit(ev, fv, NULL);
                    sb_printf(&label, "%s = ", key);
                    render_value_text(ev, fv, &u, &label);
                }
            if (!label.len)
                continue;
        } else {
            continue;
        }
        size_t len = 0;
        const char *p = doc_source_line(od->doc, s->pos.line, &len);
        if (p) {
            json_out_begin_object(w, NULL);
            position_write(w, "position", S, od, s->pos.line, len);
            json_out_text(w, "label", sb_str(&label));
            json_out_bool(w, "paddingLeft", true);
            json_out_end_object(w);
        }
        sb_free(&label);
    }
    json_out_end_array(w);
}

/* ---- definition --------------------------------------------------------- */

static void location_write(JsonOut *w, Server *S, OpenDoc *od, Pos pos, size_t n)
{
    size_t len = 0;
    const char *p = doc_source_line(od->doc, pos.line, &len);
    size_t at = pos.col > 1 ? (size_t)pos.col - 1 : 0;
    if (!p || at > len)
        at = 0;
    if (p && at + n > len)
        n = len - at;
    json_out_begin_object(w, RESULT);
    json_out_string(w, "uri", od->uri);
    range_write(w, "range", S, od, pos.line, at, at + n);
    json_out_end_object(w);
}

static void do_definition(Server *S, OpenDoc *od, json_t *params, JsonOut *w)
{
    int line;
    size_t at, len, a, b;
    const char *p;
    if (!param_position(S, od, json_object_get(params, "position"), &line, &at, &p, &len) ||
        !word_at(p, len, at, &a, &b)) {
        json_out_null(w, RESULT);
        return;
    }
    char *word = xstrndup(p + a, b - a);
    bool cite = a > 0 && p[a - 1] == '[' && b < len && p[b] == ']';
    const Source *src = cite ? source_of(od->doc, word) : NULL;
    int slot = doc_lookup(od->doc, word);
    if (src) {
        location_write(w, S, od, src->pos, strlen(src->key));
    } else if (slot >= 0 && !(a > 0 && p[a - 1] == '.')) {
        const Stmt *s = od->doc->stmts[slot];
        Pos at_name = s->name_pos.line > 0 ? s->name_pos : s->pos;
        location_write(w, S, od, at_name, strlen(s->name));
    } else {
        json_out_null(w, RESULT);
    }
    free(word);
}

/* ---- completion --------------------------------------------------------- */

typedef struct Items {
    JsonOut *w;              /* the open "result" array */
    const char *prefix;      /* what is typed of the word so far */
    size_t nprefix;
    bool fold;               /* compare the prefix ignoring case */
    Arena arena;             /* strings the items need while they are built */
} Items;

static bool prefix_ok(const Items *it, const char *label)
{
    if (strlen(label) < it->nprefix)
        return false;
    return it->fold ? strncasecmp(label, it->prefix, it->nprefix) == 0 : strncmp(label, it->prefix, it->nprefix) == 0;
}

static void item_add(Items *it, const char *label, int kind, const char *detail, const char *doc)
{
    if (!prefix_ok(it, label))
        return;
    json_out_begin_object(it->w, NULL);
    json_out_text(it->w, "label", label);
    json_out_int(it->w, "kind", kind);
    if (detail)
        json_out_text(it->w, "detail", detail);
    if (doc)
        json_out_text(it->w, "documentation", doc);
    json_out_end_object(it->w);
}

static void add_builtin(const Builtin *b, void *ctx)
{
    StrBuf sig = {0};
    put_signature(b, &sig);
    item_add(ctx, b->name, ITEM_FUNCTION, sb_str(&sig), b->summary);
    sb_free(&sig);
}

static void add_unit(const char *name, const Unit *u, void *ctx)
{
    char dim[64];
    dim_format_si(u->dim, dim, sizeof dim);
    const char *word = dim_name(u->dim);
    char detail[128];
    snprintf(detail, sizeof detail, "%s%s(SI: %s)", word ? word : "", word ? " " : "", dim);
    item_add(ctx, name, ITEM_UNIT, detail, NULL);
}

/* The units a dimension is shown in by default (gal/min, ft/s, kPa, ...):
 * compound spellings the registry of single names does not list. */
static void add_default_units(Items *it)
{
    const Dim *dims[] = {&DIM_L, &DIM_AREA, &DIM_VOLUME, &DIM_VELOCITY, &DIM_ACCEL, &DIM_FLOW, &DIM_FORCE,
                         &DIM_PRESSURE, &DIM_DENSITY, &DIM_SPECIFIC_WEIGHT, &DIM_DYN_VISC, &DIM_KIN_VISC,
                         &DIM_ENERGY, &DIM_POWER};
    const char *seen[64];
    size_t nseen = 0;
    for (size_t k = 0; k < sizeof dims / sizeof dims[0]; k++)
        for (int sys = 0; sys < 2; sys++) {
            Unit u = unit_default(*dims[k], TEMP_NONE, sys == 0 ? UNITS_US : UNITS_SI);
            Unit single;
            if (unit_parse(u.text, strlen(u.text), &single, NULL, NULL) != UNIT_OK || !strpbrk(u.text, "/*^"))
                continue; /* single names come from the registry */
            bool dup = false;
            for (size_t i = 0; i < nseen && !dup; i++)
                dup = strcmp(seen[i], u.text) == 0;
            if (dup || nseen == 64)
                continue;
            seen[nseen] = arena_strdup(&it->arena, u.text);
            add_unit(seen[nseen++], &u, it);
        }
}

static void add_fitting_kinds(Items *it)
{
    for (int k = 0; k < FIT_KIND_COUNT; k++)
        item_add(it, fitting_kind_name((FittingKind)k), ITEM_ENUM_MEMBER, "fitting kind", NULL);
}

/* Sizes (which = 1) or classes (which = 2) of a standard, each once. */
static void add_pipe_column(Items *it, const PipeStandard *std, int which)
{
    const char *seen[512];
    size_t nseen = 0;
    for (size_t i = 0; i < pipe_row_count(); i++) {
        const PipeRow *row = pipe_row(i);
        if (row->standard != std->id)
            continue;
        const char *v = which == 1 ? row->nps : row->cls;
        bool dup = false;
        for (size_t k = 0; k < nseen && !dup; k++)
            dup = strcmp(seen[k], v) == 0;
        if (dup)
            continue;
        if (nseen < 512)
            seen[nseen++] = v;
        char detail[128];
        snprintf(detail, sizeof detail, "%s %s", std->name, which == 1 ? "nominal size" : "class");
        item_add(it, v, ITEM_VALUE, detail, std->title);
    }
}

static void add_names(Items *it, const OpenDoc *od)
{
    for (size_t i = 0; i < od->doc->nstmts; i++) {
        const Stmt *s = od->doc->stmts[i];
        if (!s->name)
            continue;
        StrBuf v = {0};
        const StmtResult *r = &od->ev->results[i];
        if (r->state == RES_OK)
            render_value_text(od->ev, &r->value, r->shown, &v);
        item_add(it, s->name, ITEM_VARIABLE, r->state == RES_OK ? sb_str(&v) : "not evaluated", s->description);
        sb_free(&v);
    }
    for (const NamedConstant *k = lexicon_constants; k->name; k++) {
        char detail[96];
        constant_detail(k, detail, sizeof detail);
        item_add(it, k->name, ITEM_CONSTANT, detail, NULL);
    }
}

/* Inside a string argument: the call it belongs to and the argument's
 * index; the text of the first argument when it is a string too. */
static bool string_context(const char *p, size_t quote, char *fn, size_t nfn, int *arg, char *first, size_t nfirst)
{
    int depth = 0, commas = 0;
    bool in_str = false;
    first[0] = '\0';
    for (size_t i = quote; i-- > 0;) {
        char c = p[i];
        if (c == '"')
            in_str = !in_str;
        if (in_str)
            continue;
        if (c == ')')
            depth++;
        else if (c == '(' && depth > 0)
            depth--;
        else if (c == ',' && depth == 0)
            commas++;
        else if (c == '(' && depth == 0) {
            size_t e = i, s = i;
            while (s > 0 && word_byte(p[s - 1]))
                s--;
            if (s == e || e - s >= nfn)
                return false;
            memcpy(fn, p + s, e - s);
            fn[e - s] = '\0';
            *arg = commas;
            /* the first argument, when it is "..." */
            const char *q = p + i + 1;
            while (*q == ' ')
                q++;
            if (*q == '"') {
                const char *end = memchr(q + 1, '"', (size_t)(p + quote - q));
                if (end && (size_t)(end - q - 1) < nfirst) {
                    memcpy(first, q + 1, (size_t)(end - q - 1));
                    first[end - q - 1] = '\0';
                }
            }
            return true;
        }
    }
    return false;
}

/* The items, written into the open array as they are found. */
static void completion_items(Server *S, OpenDoc *od, json_t *params, Items *it)
{
    int line;
    size_t at, len;
    const char *p;
    if (!param_position(S, od, json_object_get(params, "position"), &line, &at, &p, &len))
        return;
    /* An open string before the cursor? */
    size_t quote = len;
    bool open = false;
    for (size_t i = 0; i < at; i++)
        if (p[i] == '"') {
            open = !open;
            quote = i;
        }
    if (open) {
        it->prefix = p + quote + 1;
        it->nprefix = at - quote - 1;
        it->fold = true;
        char fn[64], first[64];
        int arg = 0;
        if (string_context(p, quote, fn, sizeof fn, &arg, first, sizeof first) && strcmp(fn, "pipe") == 0) {
            const PipeStandard *std = pipe_standard_find(first);
            if (arg == 0) {
                for (int k = 0; k < PIPE_STANDARD_COUNT; k++)
                    item_add(it, pipe_standard((PipeStandardId)k)->name, ITEM_VALUE, pipe_standard((PipeStandardId)k)->material,
                             pipe_standard((PipeStandardId)k)->title);
            } else if (std && (arg == 1 || arg == 2)) {
                add_pipe_column(it, std, arg);
            }
        } else {
            add_fitting_kinds(it);
        }
        return;
    }
    /* The word being typed (a unit may hold / ^ * and digits). */
    size_t a = at;
    while (a > 0 && (word_byte(p[a - 1]) || p[a - 1] == '/' || p[a - 1] == '^' || p[a - 1] == '*'))
        a--;
    size_t b = a;
    while (b < at && !word_byte(p[b]))
        b++;
    /* A record's fields after "name." */
    if (a > 0 && p[a - 1] == '.') {
        size_t c, d;
        if (a > 1 && word_at(p, len, a - 2, &c, &d)) {
            char *base = xstrndup(p + c, d - c);
            int slot = doc_lookup(od->doc, base);
            free(base);
            const StmtResult *r = slot >= 0 ? &od->ev->results[slot] : NULL;
            it->prefix = p + a;
            it->nprefix = at - a;
            if (r && r->state == RES_OK && r->value.kind == VAL_RECORD) {
                for (size_t i = 0; i < r->value.rec->nfields; i++) {
                    const Value *fv = &r->value.rec->fields[i].value;
                    Unit u = fv->kind == VAL_NUMBER ? eval_display_unit(od->ev, fv, NULL) : (Unit){0};
                    StrBuf v = {0};
                    render_value_text(od->ev, fv, &u, &v);
                    item_add(it, r->value.rec->fields[i].name, ITEM_FIELD, sb_str(&v), NULL);
                    sb_free(&v);
                }
            }
        }
        return;
    }
    /* A unit: the word follows a number and a space, or "as ". */
    size_t k = a;
    while (k > 0 && p[k - 1] == ' ')
        k--;
    bool after_number = k < a && k > 0 && ((p[k - 1] >= '0' && p[k - 1] <= '9') || p[k - 1] == '.');
    bool after_as = k < a && k >= 2 && strncmp(p + k - 2, "as", 2) == 0 && (k == 2 || !word_byte(p[k - 3]));
    if (after_number || after_as) {
        it->prefix = p + a;
        it->nprefix = at - a;
        unit_each(add_unit, it);
        arena_init(&it->arena);
        add_default_units(it);
        arena_free(&it->arena);
        return;
    }
    size_t w = at;
    while (w > 0 && word_byte(p[w - 1]))
        w--;
    it->prefix = p + w;
    it->nprefix = at - w;
    /* In a table row: fitting kinds as well. */
    size_t lead = 0;
    while (lead < len && p[lead] == ' ')
        lead++;
    if (lead < len && p[lead] == '|')
        add_fitting_kinds(it);
    add_names(it, od);
    builtin_each(add_builtin, it);
    for (const Keyword *kw = lexicon_keywords; kw->word; kw++)
        if (kw->roles & KW_OFFERED)
            item_add(it, kw->word, ITEM_KEYWORD, NULL, NULL);
}

static void do_completion(Server *S, OpenDoc *od, json_t *params, JsonOut *w)
{
    Items it = {w, "", 0, false, {0}};
    json_out_begin_array(w, RESULT);
    completion_items(S, od, params, &it);
    json_out_end_array(w);
}

/* ---- lifecycle and text sync ------------------------------------------- */

static void do_initialize(Server *S, json_t *params, JsonOut *w)
{
    json_t *caps = json_object_get(params, "capabilities");
    json_t *encs = json_object_get(json_object_get(caps, "general"), "positionEncodings");
    json_t *old = json_object_get(caps, "offsetEncoding");
    S->enc = COL_UTF16;
    json_t *lists[2] = {encs, old};
    for (int l = 0; l < 2; l++) {
        size_t i;
        json_t *e;
        if (json_is_array(lists[l]))
            json_array_foreach(lists[l], i, e) if (json_is_string(e) && strcmp(json_string_value(e), "utf-8") == 0)
                S->enc = COL_UTF8;
    }
    const char *enc = S->enc == COL_UTF8 ? "utf-8" : "utf-16";
    json_out_begin_object(w, RESULT);
    json_out_begin_object(w, "capabilities");
    json_out_string(w, "positionEncoding", enc);
    json_out_begin_object(w, "textDocumentSync");
    json_out_bool(w, "openClose", true);
    json_out_int(w, "change", 1);
    json_out_end_object(w);
    json_out_bool(w, "hoverProvider", true);
    json_out_bool(w, "definitionProvider", true);
    json_out_bool(w, "inlayHintProvider", true);
    json_out_begin_object(w, "completionProvider");
    json_out_begin_array(w, "triggerCharacters");
    static const char *const triggers[] = {".", " ", "\"", "("};
    for (size_t i = 0; i < sizeof triggers / sizeof triggers[0]; i++)
        json_out_string(w, NULL, triggers[i]);
    json_out_end_array(w);
    json_out_end_object(w);
    json_out_end_object(w);
    json_out_begin_object(w, "serverInfo");
    json_out_string(w, "name", "headroom");
    json_out_string(w, "version", HEADROOM_VERSION);
    json_out_end_object(w);
    if (json_is_array(old))
        json_out_string(w, "offsetEncoding", enc);
    json_out_end_object(w);
    S->initialized = true;
}

static void set_text(Server *S, OpenDoc *od, const char *text, size_t len)
{
    S->open_bytes -= od->len;
    free(od->text);
    od->text = xmalloc(len + 1);
    memcpy(od->text, text, len);
    od->text[len] = '\0';
    od->len = len;
    S->open_bytes += len;
}

static void did_open(Server *S, json_t *params)
{
    const char *uri = param_uri(params);
    json_t *t = json_object_get(json_object_get(params, "textDocument"), "text");
    if (!uri || !json_is_string(t))
        return;
    size_t len = json_string_length(t);
    OpenDoc *od = doc_find(S, uri);
    if (!od) {
        if (S->ndocs >= LSP_MAX_DOCUMENTS || S->open_bytes + len > LSP_MAX_OPEN_BYTES) {
            char text[160];
            snprintf(text, sizeof text, "headroom lsp: not opened: the server keeps at most %d calcs and %d bytes open",
                     LSP_MAX_DOCUMENTS, LSP_MAX_OPEN_BYTES);
            Msg m;
            JsonOut *w = msg_begin(&m);
            json_out_string(w, "method", "window/showMessage");
            json_out_begin_object(w, "params");
            json_out_int(w, "type", 1);
            json_out_string(w, "message", text);
            json_out_end_object(w);
            msg_send(S, &m);
            return;
        }
        S->docs = xrealloc(S->docs, (S->ndocs + 1) * sizeof *S->docs);
        od = &S->docs[S->ndocs++];
        memset(od, 0, sizeof *od);
        od->uri = xstrdup(uri);
        od->name = uri_to_name(uri);
    }
    set_text(S, od, json_string_value(t), len);
    doc_analyse(od);
    publish(S, od, false);
}

/* One change: the whole text, or a range replaced (incremental sync). */
static bool apply_change(Server *S, OpenDoc *od, json_t *change)
{
    json_t *t = json_object_get(change, "text");
    if (!json_is_string(t))
        return false;
    const char *text = json_string_value(t);
    size_t tlen = json_string_length(t);
    json_t *range = json_object_get(change, "range");
    if (!range) {
        if (S->open_bytes - od->len + tlen > LSP_MAX_OPEN_BYTES)
            return false;
        set_text(S, od, text, tlen);
        return true;
    }
    /* Offsets of the range's ends in the current text. */
    size_t off[2];
    const char *ends[2] = {"start", "end"};
    for (int e = 0; e < 2; e++) {
        json_t *pos = json_object_get(range, ends[e]);
        json_t *l = json_object_get(pos, "line"), *c = json_object_get(pos, "character");
        if (!json_is_integer(l) || !json_is_integer(c) || json_integer_value(l) < 0 || json_integer_value(c) < 0)
            return false;
        json_int_t line = json_integer_value(l);
        size_t i = 0;
        for (json_int_t n = 0; n < line && i < od->len; i++)
            if (od->text[i] == '\n')
                n++;
        size_t eol = i;
        while (eol < od->len && od->text[eol] != '\n')
            eol++;
        off[e] = i + textpos_bytes(od->text + i, eol - i, (size_t)json_integer_value(c), S->enc);
    }
    if (off[1] < off[0])
        return false;
    size_t nlen = od->len - (off[1] - off[0]) + tlen;
    if (S->open_bytes - od->len + nlen > LSP_MAX_OPEN_BYTES)
        return false;
    char *n = xmalloc(nlen + 1);
    memcpy(n, od->text, off[0]);
    memcpy(n + off[0], text, tlen);
    memcpy(n + off[0] + tlen, od->text + off[1], od->len - off[1]);
    n[nlen] = '\0';
    S->open_bytes = S->open_bytes - od->len + nlen;
    free(od->text);
    od->text = n;
    od->len = nlen;
    return true;
}

static void did_change(Server *S, json_t *params)
{
    const char *uri = param_uri(params);
    OpenDoc *od = uri ? doc_find(S, uri) : NULL;
    json_t *changes = json_object_get(params, "contentChanges");
    if (!od || !json_is_array(changes))
        return;
    size_t i;
    json_t *ch;
    json_array_foreach(changes, i, ch) if (!apply_change(S, od, ch)) break;
    doc_analyse(od);
    publish(S, od, false);
}

static void did_close(Server *S, json_t *params)
{
    const char *uri = param_uri(params);
    OpenDoc *od = uri ? doc_find(S, uri) : NULL;
    if (!od)
        return;
    publish(S, od, true);
    doc_clear(od);
    S->open_bytes -= od->len;
    free(od->uri);
    free(od->name);
    free(od->text);
    *od = S->docs[--S->ndocs];
}

/* ---- dispatch ------------------------------------------------------------ */

/* A request on an open document: writes its RESULT member. */
typedef void (*DocRequest)(Server *S, OpenDoc *od, json_t *params, JsonOut *w);

static const struct {
    const char *method;
    DocRequest fn;
} doc_requests[] = {
    {"textDocument/hover", do_hover},
    {"textDocument/inlayHint", do_inlay_hints},
    {"textDocument/definition", do_definition},
    {"textDocument/completion", do_completion},
};

/* Returns false when the server should stop (exit). */
static bool handle(Server *S, const char *body, size_t n, int *status)
{
    json_error_t err;
    json_t *msg = json_loadb(body, n, 0, &err);
    if (!msg) {
        reply_error(S, NULL, RPC_PARSE_ERROR, "parse error: %s (line %d, column %d)", err.text, err.line, err.column);
        return true;
    }
    if (!json_is_object(msg)) {
        reply_error(S, NULL, RPC_INVALID_REQUEST, "a message must be a JSON object");
        json_decref(msg);
        return true;
    }
    json_t *id = json_object_get(msg, "id");
    json_t *method = json_object_get(msg, "method");
    json_t *params = json_object_get(msg, "params");
    bool is_request = id != NULL;
    if (id && !json_is_string(id) && !json_is_integer(id) && !json_is_null(id)) {
        reply_error(S, NULL, RPC_INVALID_REQUEST, "an id must be a string or an integer");
        json_decref(msg);
        return true;
    }
    if (!method) { /* a response to a request we never make */
        json_decref(msg);
        return true;
    }
    if (!json_is_string(method)) {
        if (is_request)
            reply_error(S, id, RPC_INVALID_REQUEST, "method must be a string");
        json_decref(msg);
        return true;
    }
    const char *m = json_string_value(method);
    bool go_on = true;
    if (strcmp(m, "exit") == 0) {
        *status = S->shutdown ? 0 : 1;
        go_on = false;
    } else if (strcmp(m, "initialize") == 0) {
        if (!is_request)
            ;
        else if (S->initialized)
            reply_error(S, id, RPC_INVALID_REQUEST, "initialize was already received");
        else {
            Msg r;
            JsonOut *w = msg_begin(&r);
            id_write(w, id);
            do_initialize(S, params, w);
            msg_send(S, &r);
        }
    } else if (!S->initialized) {
        if (is_request)
            reply_error(S, id, RPC_SERVER_NOT_INITIALIZED, "the server is not initialized");
    } else if (strcmp(m, "shutdown") == 0) {
        S->shutdown = true;
        if (is_request)
            reply_null(S, id);
    } else if (S->shutdown) {
        if (is_request)
            reply_error(S, id, RPC_INVALID_REQUEST, "the server is shutting down");
    } else if (strcmp(m, "textDocument/didOpen") == 0) {
        did_open(S, params);
    } else if (strcmp(m, "textDocument/didChange") == 0) {
        did_change(S, params);
    } else if (strcmp(m, "textDocument/didClose") == 0) {
        did_close(S, params);
    } else if (is_request) {
        size_t k = 0, nreq = sizeof doc_requests / sizeof doc_requests[0];
        while (k < nreq && strcmp(doc_requests[k].method, m) != 0)
            k++;
        if (k == nreq) {
            reply_error(S, id, RPC_METHOD_NOT_FOUND, "method not found: %.200s", m);
        } else {
            const char *uri = json_is_object(params) ? param_uri(params) : NULL;
            OpenDoc *od = uri ? doc_find(S, uri) : NULL;
            if (!uri)
                reply_error(S, id, RPC_INVALID_PARAMS, "%s needs params.textDocument.uri", m);
            else if (!od)
                reply_error(S, id, RPC_INVALID_PARAMS, "the document is not open: %.200s", uri);
            else if (!od->doc && (strcmp(m, "textDocument/hover") == 0 || strcmp(m, "textDocument/definition") == 0))
                reply_null(S, id);
            else {
                Msg r;
                JsonOut *w = msg_begin(&r);
                id_write(w, id);
                if (od->doc)
                    doc_requests[k].fn(S, od, params, w);
                else { /* no document to list from */
                    json_out_begin_array(w, RESULT);
                    json_out_end_array(w);
                }
                msg_send(S, &r);
            }
        }
    }
    /* Other notifications (initialized, $/cancelRequest, ...) need nothing. */
    json_decref(msg);
    return go_on;
}

int lsp_serve(int in_fd, FILE *out)
{
    Server *S = xcalloc(1, sizeof *S);
    S->in.fd = in_fd;
    S->out = out;
    S->enc = COL_UTF16;
    int status = 1;
    char line[LSP_MAX_HEADER_LINE + 1];
    for (;;) {
        /* Headers up to an empty line. */
        long long length = -1;
        bool bad_length = false, any = false, ended = false;
        for (;;) {
            size_t len;
            bool too_long;
            if (!rd_line(&S->in, line, sizeof line, &len, &too_long)) {
                ended = true;
                break;
            }
            if (len == 0 && !too_long) {
                if (any)
                    break;
                continue; /* stray blank lines between messages */
            }
            any = true;
            if (too_long)
                continue;
            if (strncasecmp(line, "Content-Length:", 15) == 0) {
                const char *v = line + 15;
                while (*v == ' ' || *v == '\t')
                    v++;
                long long x = 0;
                bool digits = *v != '\0';
                for (; *v >= '0' && *v <= '9'; v++) {
                    if (x > (long long)LSP_MAX_MESSAGE * 16)
                        continue; /* already far too large: stop growing */
                    x = x * 10 + (*v - '0');
                }
                while (*v == ' ' || *v == '\t')
                    v++;
                if (!digits || *v != '\0')
                    bad_length = true;
                else
                    length = x;
            }
        }
        if (ended) {
            status = S->shutdown ? 0 : 1;
            break;
        }
        if (bad_length || length < 0) {
            reply_error(S, NULL, RPC_PARSE_ERROR, "a message needs a header 'Content-Length: N' with N a number of bytes");
            continue;
        }
        if (length > LSP_MAX_MESSAGE) {
            reply_error(S, NULL, RPC_INVALID_REQUEST, "a message of %lld bytes or more is over the limit of %d bytes; skipped",
                        length, LSP_MAX_MESSAGE);
            if (!rd_bytes(&S->in, NULL, (size_t)length)) {
                status = S->shutdown ? 0 : 1;
                break;
            }
            continue;
        }
        char *body = xmalloc((size_t)length + 1);
        if (!rd_bytes(&S->in, body, (size_t)length)) {
            free(body);
            status = S->shutdown ? 0 : 1;
            break;
        }
        body[length] = '\0';
        bool go_on = handle(S, body, (size_t)length, &status);
        free(body);
        if (!go_on)
            break;
    }
    for (size_t i = 0; i < S->ndocs; i++) {
        doc_clear(&S->docs[i]);
        free(S->docs[i].uri);
        free(S->docs[i].name);
        free(S->docs[i].text);
    }
    free(S->docs);
    free(S);
    return status;
}
