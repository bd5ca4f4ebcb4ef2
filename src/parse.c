/* parse.c — statements and expressions of the calc language.
 *
 * Recursive descent over the tokens of one line (lex.c), one function per
 * grammar rule with the rule above it. Precedence, loosest first:
 *   + -   then   * / ·   then   unary -   then   ^ (right-associative)
 * so -x^2 is -(x^2) and 2^-1 is allowed. Records are read with `.field`;
 * calls take positional then keyword arguments. Units of number literals are
 * resolved here; names are resolved later against the whole document. */
#include "parse.h"

#include <stdbool.h>
#include <stdlib.h>
#include <string.h>

#include "lex.h"
#include "lexicon.h"

typedef struct Parser {
    Lexer lx;
    Token tok;
    Arena *arena;
    DiagList *diags;
    int depth;
    int failed;
    const char *unit_end;    /* just past the last literal's unit, for hints */
    const char *unit_text;
    size_t unit_len;
} Parser;

static void advance(Parser *p) { lex_scan(&p->lx, &p->tok); }

static void fail(Parser *p, Pos pos, const char *fmt, const char *arg)
{
    if (!p->failed)
        diag_add(p->diags, SEV_ERROR, pos, fmt, arg);
    p->failed = 1;
}

static void expected(Parser *p, const char *what)
{
    if (p->tok.kind == TOK_ERROR) { /* already reported by the lexer */
        p->failed = 1;
        return;
    }
    char msg[160];
    snprintf(msg, sizeof msg, "expected %s, found %s", what, tok_describe(p->tok.kind));
    if (p->tok.kind == TOK_NAME || p->tok.kind == TOK_NUMBER) {
        size_t n = p->tok.len < 40 ? p->tok.len : 40;
        snprintf(msg + strlen(msg), sizeof msg - strlen(msg), " '%.*s'", (int)n, p->tok.text);
    }
    fail(p, p->tok.pos, "%s", msg);
}

const ExprCall expr_no_call = {.callee_slot = -1};
const StmtSolve stmt_no_solve;
const StmtAs stmt_no_as;        /* all zero: what the fields held when they were the statement's */
const StmtFigure stmt_no_figure;

Stmt *stmt_new(Arena *a)
{
    Stmt *st = arena_alloc(a, sizeof *st);
    st->var_slot = SLOT_UNRESOLVED;
    st->as = &stmt_no_as;
    st->solve = &stmt_no_solve;
    st->fig = &stmt_no_figure;
    return st;
}

static Expr *new_expr(Parser *p, ExprKind kind, Pos pos)
{
    Expr *e = arena_alloc(p->arena, sizeof *e);
    e->kind = kind;
    e->pos = pos;
    e->slot = SLOT_UNRESOLVED;
    e->height = 1;
    e->call = &expr_no_call;
    return e;
}

/* The height of a node over its children. Every operator, sign, parenthesis,
 * field and call is a level of the tree, and every walker (evaluation,
 * layout, listings, diff) recurses once per level, so a tree taller than
 * PARSE_MAX_DEPTH is refused here, at the node that goes over (a 6,000-term
 * sum once overflowed the stack). false after reporting it. */
static bool tree_grow(Parser *p, Expr *e)
{
    int h = 0;
    if (e->lhs && e->lhs->height > h)
        h = e->lhs->height;
    if (expr_rhs(e) && e->rhs->height > h)
        h = e->rhs->height;
    for (size_t i = 0; i < e->call->nargs; i++)
        if (e->call->args[i]->height > h)
            h = e->call->args[i]->height;
    for (size_t i = 0; i < e->call->nkw; i++)
        if (e->call->kw[i]->height > h)
            h = e->call->kw[i]->height;
    if (h + 1 > PARSE_MAX_DEPTH) {
        char lim[16];
        snprintf(lim, sizeof lim, "%d", PARSE_MAX_DEPTH);
        fail(p, e->pos, "expression nested too deeply (more than %s levels): every operator, sign, "
                        "parenthesis, field and call is a level; split it into named steps", lim);
        return false;
    }
    e->height = (uint8_t)(h + 1);
    return true;
}

/* `number` (may be NULL) is the literal the unit follows, for the hint
 * that `2 ft/D` reads ft/D as one unit. */
static int resolve_unit(const char *text, size_t len, Pos pos, Unit *out, DiagList *diags, const char *number,
                        size_t number_len)
{
    size_t bad_off = 0, bad_len = 0;
    UnitStatus st = unit_parse(text, len, out, &bad_off, &bad_len);
    if (st == UNIT_OK)
        return 1;
    if (st == UNIT_UNKNOWN) {
        Pos at = pos;
        at.col += (int)bad_off;
        const char *hint = unit_suggest(text + bad_off, bad_len);
        bool compound = bad_off > 0 && (text[bad_off - 1] == '/' || text[bad_off - 1] == '*');
        if (hint)
            diag_error(diags, at, "unknown unit '%.*s'; did you mean %s?", (int)bad_len, text + bad_off, hint);
        else if (compound && number)
            diag_error(diags, at,
                       "unknown unit '%.*s'; '%.*s' reads as one unit, so to divide or multiply by "
                       "a name put the quantity in parentheses: (%.*s %.*s)%c%.*s",
                       (int)bad_len, text + bad_off, (int)len, text, (int)number_len, number,
                       (int)(bad_off - 1), text, text[bad_off - 1], (int)(len - bad_off), text + bad_off);
        else if (compound)
            diag_error(diags, at,
                       "unknown unit '%.*s'; to divide or multiply a quantity by a name, put the "
                       "quantity in parentheses, as in (2 ft)/D",
                       (int)bad_len, text + bad_off);
        else
            diag_error(diags, at, "unknown unit '%.*s'", (int)bad_len, text + bad_off);
    } else if (st == UNIT_TOO_LONG) {
        diag_error(diags, pos, "unit '%.*s' is too long", (int)(len < 60 ? len : 60), text);
    } else {
        diag_error(diags, pos, "malformed unit '%.*s'", (int)(len < 60 ? len : 60), text);
    }
    return 0;
}

int parse_unit(const char *text, size_t len, Pos pos, Unit *out, DiagList *diags)
{
    return resolve_unit(text, len, pos, out, diags, NULL, 0);
}

static Expr *parse_expr(Parser *p);

/* args := (arg (',' arg)*)?      arg := NAME '=' expr | expr
 * Positional arguments come before keyword arguments. */
static void parse_args(Parser *p, Expr *call, Pos open)
{
    Vec args = {0}, kws = {0}, names = {0};
    Vec kwpos = {0};
    if (p->tok.kind != TOK_RPAREN) {
        for (;;) {
            Token t = p->tok;
            Lexer save = p->lx;
            if (t.kind == TOK_NAME) {
                advance(p);
                if (p->tok.kind == TOK_ASSIGN) {
                    advance(p);
                    Expr *v = parse_expr(p);
                    if (!v)
                        break;
                    vec_push(&names, arena_strndup(p->arena, t.text, t.len));
                    vec_push(&kws, v);
                    Pos *kp = arena_alloc(p->arena, sizeof *kp);
                    *kp = t.pos;
                    vec_push(&kwpos, kp);
                    goto next;
                }
                p->lx = save; /* not a keyword: re-read as an expression */
                p->tok = t;
            }
            {
                Pos at = p->tok.pos;
                Expr *v = parse_expr(p);
                if (!v)
                    break;
                if (kws.len > 0) {
                    fail(p, at, "%s", "a positional argument cannot follow a keyword argument");
                    break;
                }
                vec_push(&args, v);
            }
        next:
            if (p->tok.kind == TOK_COMMA) {
                advance(p);
                continue;
            }
            break;
        }
    }
    if (!p->failed && p->tok.kind != TOK_RPAREN) {
        char what[96];
        snprintf(what, sizeof what, "',' or ')' to close '(' opened at %d:%d", open.line, open.col);
        expected(p, what);
    }
    if (!p->failed)
        advance(p);
    ExprCall *c = arena_alloc(p->arena, sizeof *c);
    call->call = c;
    c->callee_slot = -1;
    c->nargs = args.len;
    c->args = arena_alloc(p->arena, (args.len + 1) * sizeof *c->args);
    for (size_t i = 0; i < args.len; i++)
        c->args[i] = args.items[i];
    c->nkw = kws.len;
    c->kw = arena_alloc(p->arena, (kws.len + 1) * sizeof *c->kw);
    c->kw_names = arena_alloc(p->arena, (kws.len + 1) * sizeof *c->kw_names);
    c->kw_pos = arena_alloc(p->arena, (kws.len + 1) * sizeof *c->kw_pos);
    for (size_t i = 0; i < kws.len; i++) {
        c->kw[i] = kws.items[i];
        c->kw_names[i] = names.items[i];
        c->kw_pos[i] = *(Pos *)kwpos.items[i];
    }
    vec_free(&args);
    vec_free(&kws);
    vec_free(&names);
    vec_free(&kwpos);
}

/* Undo the two escapes a string may hold: \" and \\. */
static const char *unescape(Arena *a, const char *s, size_t len)
{
    char *d = arena_alloc(a, len + 1);
    size_t j = 0;
    for (size_t i = 0; i < len; i++) {
        if (s[i] == '\\' && i + 1 < len && (s[i + 1] == '"' || s[i + 1] == '\\'))
            i++;
        d[j++] = s[i];
    }
    d[j] = '\0';
    return d;
}

/* primary := NUMBER [UNIT] | STRING | NAME ['(' args ')'] | '(' expr ')' */
static Expr *parse_primary(Parser *p)
{
    Token t = p->tok;
    switch (t.kind) {
    case TOK_NUMBER: {
        Expr *e = new_expr(p, EXPR_NUMBER, t.pos);
        e->number = t.number;
        if (t.unit) {
            e->text = arena_strndup(p->arena, t.text, (size_t)(t.unit + t.unit_len - t.text));
            e->has_unit = 1;
            e->unit = unit_shared(t.unit, t.unit_len);
            if (!e->unit) { /* report why, into a unit of its own */
                Unit *u = arena_alloc(p->arena, sizeof *u);
                e->unit = u;
                if (!resolve_unit(t.unit, t.unit_len, t.unit_pos, u, p->diags, t.text, t.len))
                    p->failed = 1;
            }
            p->unit_text = t.unit;
            p->unit_len = t.unit_len;
            p->unit_end = t.unit + t.unit_len;
        } else {
            e->text = arena_strndup(p->arena, t.text, t.len);
        }
        advance(p);
        return e;
    }
    case TOK_STRING: {
        Expr *e = new_expr(p, EXPR_STRING, t.pos);
        e->text = unescape(p->arena, t.text, t.len);
        advance(p);
        return e;
    }
    case TOK_NAME: {
        const Keyword *kw = lexicon_keyword(t.text, t.len, KW_NOT_VALUE);
        if (kw) {
            fail(p, t.pos, "'%s' is a keyword and cannot be used as a value here", kw->word);
            return NULL;
        }
        advance(p);
        if (p->tok.kind == TOK_LPAREN) {
            Expr *e = new_expr(p, EXPR_CALL, t.pos);
            e->text = arena_strndup(p->arena, t.text, t.len);
            Pos open = p->tok.pos;
            advance(p);
            parse_args(p, e, open);
            return p->failed || !tree_grow(p, e) ? NULL : e;
        }
        Expr *e = new_expr(p, EXPR_NAME, t.pos);
        e->text = arena_strndup(p->arena, t.text, t.len);
        return e;
    }
    case TOK_LPAREN: {
        Pos open = t.pos;
        advance(p);
        Expr *inner = parse_expr(p);
        if (!inner)
            return NULL;
        if (p->tok.kind != TOK_RPAREN) {
            char what[80];
            snprintf(what, sizeof what, "')' to close '(' opened at %d:%d", open.line, open.col);
            expected(p, what);
            return NULL;
        }
        advance(p);
        Expr *e = new_expr(p, EXPR_PAREN, open);
        e->lhs = inner;
        return tree_grow(p, e) ? e : NULL;
    }
    default:
        expected(p, "a number, a name, a string or '('");
        return NULL;
    }
}

/* postfix := primary ('.' NAME)* */
static Expr *parse_postfix(Parser *p)
{
    Expr *e = parse_primary(p);
    while (e && p->tok.kind == TOK_DOT) {
        advance(p);
        if (p->tok.kind != TOK_NAME) {
            expected(p, "a field name after '.'");
            return NULL;
        }
        Expr *f = new_expr(p, EXPR_FIELD, p->tok.pos);
        f->lhs = e;
        f->text = arena_strndup(p->arena, p->tok.text, p->tok.len);
        advance(p);
        e = tree_grow(p, f) ? f : NULL;
    }
    return e;
}

static int enter(Parser *p)
{
    if (++p->depth > PARSE_MAX_DEPTH) {
        char lim[16];
        snprintf(lim, sizeof lim, "%d", PARSE_MAX_DEPTH);
        fail(p, p->tok.pos, "expression nested too deeply (more than %s levels)", lim);
        return 0;
    }
    return 1;
}

static Expr *parse_unary(Parser *p);

/* power := postfix ['^' unary] */
static Expr *parse_power(Parser *p)
{
    Expr *base = parse_postfix(p);
    if (!base || p->tok.kind != TOK_CARET)
        return base;
    Pos at = p->tok.pos;
    advance(p);
    Expr *ex = parse_unary(p);
    if (!ex)
        return NULL;
    Expr *e = new_expr(p, EXPR_BINARY, at);
    e->op = OP_POW;
    e->lhs = base;
    e->rhs = ex;
    return tree_grow(p, e) ? e : NULL;
}

/* unary := '-' unary | '+' unary | power */
static Expr *parse_unary(Parser *p)
{
    if (!enter(p))
        return NULL;
    Expr *r;
    if (p->tok.kind == TOK_MINUS || p->tok.kind == TOK_PLUS) {
        Token t = p->tok;
        advance(p);
        Expr *operand = parse_unary(p);
        if (!operand || t.kind == TOK_PLUS) {
            r = operand;
        } else if (operand->kind == EXPR_NUMBER && operand->has_unit &&
                   (operand->unit->temp != TEMP_NONE || operand->unit->pref != PRES_PLAIN)) {
            /* `-10 degC`, `-5 psig`: a negative value on a scale, not the
             * negation of a point (which is an error). */
            operand->number = -operand->number;
            operand->text = arena_printf(p->arena, "-%s", operand->text);
            operand->pos = t.pos;
            r = operand;
        } else {
            r = new_expr(p, EXPR_NEG, t.pos);
            r->lhs = operand;
            if (!tree_grow(p, r))
                r = NULL;
        }
    } else {
        r = parse_power(p);
    }
    p->depth--;
    return r;
}

/* term := unary (('*' | '/' | '·') unary)* */
static Expr *parse_term(Parser *p)
{
    Expr *lhs = parse_unary(p);
    while (lhs && (p->tok.kind == TOK_STAR || p->tok.kind == TOK_SLASH)) {
        Token t = p->tok;
        advance(p);
        Expr *rhs = parse_unary(p);
        if (!rhs)
            return NULL;
        Expr *e = new_expr(p, EXPR_BINARY, t.pos);
        e->op = t.kind == TOK_STAR ? OP_MUL : OP_DIV;
        e->middle_dot = t.middle_dot != 0;
        e->lhs = lhs;
        e->rhs = rhs;
        lhs = tree_grow(p, e) ? e : NULL;
    }
    return lhs;
}

/* expr := term (('+' | '-') term)* */
static Expr *parse_expr(Parser *p)
{
    Expr *lhs = parse_term(p);
    while (lhs && (p->tok.kind == TOK_PLUS || p->tok.kind == TOK_MINUS)) {
        Token t = p->tok;
        advance(p);
        Expr *rhs = parse_term(p);
        if (!rhs) {
            lhs = NULL;
            break;
        }
        Expr *e = new_expr(p, EXPR_BINARY, t.pos);
        e->op = t.kind == TOK_PLUS ? OP_ADD : OP_SUB;
        e->lhs = lhs;
        e->rhs = rhs;
        lhs = tree_grow(p, e) ? e : NULL;
    }
    return lhs;
}

/* True when the description of comment c[0..len) is c itself: no citation
 * bracket, tab or NUL, and no blank at either end or next to another (the
 * common comment, copied as it is). */
static bool comment_is_plain(const char *c, size_t len)
{
    if (len == 0 || c[0] == ' ' || c[len - 1] == ' ')
        return false;
    for (size_t i = 0; i < len; i++) {
        char ch = c[i];
        if (ch == '[' || ch == '\t' || ch == '\0' || (ch == ' ' && c[i + 1] == ' '))
            return false;
    }
    return true;
}

/* Citations `[key]` are lifted out of a trailing comment; the rest is the
 * description. */
static void parse_comment(Parser *p, Stmt *st, const char *c, size_t len, Pos pos)
{
    if (comment_is_plain(c, len)) {
        st->description = arena_strndup(p->arena, c, len);
        st->ncites = 0;
        st->cites = NULL;
        return;
    }
    Vec cites = {0};
    /* One pass: the description is the comment without its citations, with
     * leading and trailing blanks dropped and every run of blanks inside
     * squeezed to one space; it never grows, so len + 1 bytes hold it. */
    char *out = arena_alloc(p->arena, len + 1);
    size_t n = 0;
    bool space = false, ended = false;
    size_t i = 0;
    while (i < len) {
        if (c[i] == '[') {
            size_t j = i + 1;
            while (j < len && c[j] != ']' && c[j] != '[' && c[j] != ' ')
                j++;
            if (j < len && c[j] == ']' && j > i + 1) {
                Cite *ct = arena_alloc(p->arena, sizeof *ct);
                ct->key = arena_strndup(p->arena, c + i + 1, j - i - 1);
                ct->pos = pos;
                ct->pos.col += (int)i + 1;
                ct->source = -1;
                vec_push(&cites, ct);
                i = j + 1;
                continue;
            }
        }
        char ch = c[i++];
        if (ended || ch == '\0') {
            ended = true;    /* the description ends at a NUL byte */
            continue;
        }
        if (ch == ' ' || ch == '\t') {
            space = n > 0;
            continue;
        }
        if (space)
            out[n++] = ' ';
        space = false;
        out[n++] = ch;
    }
    st->description = n ? out : NULL;
    st->ncites = cites.len;
    st->cites = cites.len ? arena_alloc(p->arena, cites.len * sizeof *st->cites) : NULL;
    for (size_t k = 0; k < cites.len; k++)
        st->cites[k] = *(Cite *)cites.items[k];
    vec_free(&cites);
}

static int parse_as(Parser *p, Stmt *st)
{
    if (!tok_is_word(&p->tok, "as"))
        return 1;
    Pos at = p->tok.pos;
    /* The unit runs to the end of the statement, spaces not allowed inside. */
    const char *s = p->lx.line;
    size_t i = p->lx.at, end = p->lx.comment_at;
    while (i < end && (s[i] == ' ' || s[i] == '\t'))
        i++;
    size_t j = end;
    while (j > i && (s[j - 1] == ' ' || s[j - 1] == '\t' || s[j - 1] == '\r'))
        j--;
    if (j == i) {
        fail(p, at, "%s", "expected a unit after 'as'");
        return 0;
    }
    Pos upos = p->lx.start;
    upos.col += (int)i;
    for (size_t k = i; k < j; k++)
        if (s[k] == ' ' || s[k] == '\t') {
            Pos sp = p->lx.start;
            sp.col += (int)k;
            fail(p, sp, "%s", "a unit is written without spaces (write lbf*s/ft^2, not lbf * s / ft^2)");
            return 0;
        }
    StmtAs *as = arena_alloc(p->arena, sizeof *as);
    as->text = arena_strndup(p->arena, s + i, j - i);
    as->pos = upos;
    as->unit = unit_shared(s + i, j - i);
    st->has_as = 1;
    st->as = as;
    if (!as->unit) { /* say why */
        Unit bad;
        parse_unit(s + i, j - i, upos, &bad, p->diags);
        p->failed = 1;
        return 0;
    }
    p->lx.at = end;
    advance(p);
    return 1;
}

/* A name where the statement should end may be a unit in the wrong place:
 * `3 ft H2O` (a space inside a unit) or `V = Q/A ft/s` (a unit after a
 * computed value, which only `as` can give). Say so when the words parse as
 * a unit; false when they do not. */
static int unit_misplaced(Parser *p)
{
    if (p->tok.kind != TOK_NAME)
        return 0;
    const char *s = p->tok.text, *end = p->lx.line + p->lx.comment_at;
    while (end > s && (end[-1] == ' ' || end[-1] == '\t' || end[-1] == '\r'))
        end--;
    size_t n = (size_t)(end - s);
    Unit u;
    char joined[96];
    bool glued = p->unit_end && p->unit_end <= s;
    for (const char *q = p->unit_end; glued && q < s; q++)
        glued = *q == ' ' || *q == '\t';
    if (glued && p->unit_len + p->tok.len < sizeof joined) {
        memcpy(joined, p->unit_text, p->unit_len);
        memcpy(joined + p->unit_len, s, p->tok.len);
        if (unit_parse(joined, p->unit_len + p->tok.len, &u, NULL, NULL) == UNIT_OK) {
            char msg[200];
            snprintf(msg, sizeof msg, "a unit is written without spaces: did you mean %.*s?",
                     (int)(p->unit_len + p->tok.len), joined);
            fail(p, p->tok.pos, "%s", msg);
            return 1;
        }
    }
    if (n > 0 && n < 48 && unit_parse(s, n, &u, NULL, NULL) == UNIT_OK) {
        char msg[200];
        snprintf(msg, sizeof msg,
                 "expected the end of the statement, found '%.*s'; a unit follows only a number: "
                 "did you mean 'as %.*s'?", (int)n, s, (int)n, s);
        fail(p, p->tok.pos, "%s", msg);
        return 1;
    }
    return 0;
}

static int expect_eol(Parser *p)
{
    if (p->failed)
        return 0;
    if (p->tok.kind != TOK_EOL && unit_misplaced(p))
        return 0;
    if (p->tok.kind != TOK_EOL) {
        expected(p, "the end of the statement");
        return 0;
    }
    return 1;
}

/* statement := 'check' LABEL ':' expr CMP expr
 *            | NAME '=' 'solve' NAME 'where' expr '=' expr
 *                   ['between' expr 'and' expr] ['as' UNIT]
 *            | NAME '=' expr ['as' UNIT]                       */
Stmt *parse_statement(Arena *a, const char *line, size_t len, Pos start, DiagList *diags)
{
    Parser p = {0};
    p.arena = a;
    p.diags = diags;
    lex_init(&p.lx, line, len, start, diags);
    advance(&p);

    Stmt *st = stmt_new(a);
    st->pos = p.tok.pos;

    if (p.lx.comment_at < len) {
        size_t cs = p.lx.comment_at + 1;
        while (cs < len && (line[cs] == ' ' || line[cs] == '\t'))
            cs++;
        size_t ce = len;
        while (ce > cs && (line[ce - 1] == ' ' || line[ce - 1] == '\t' || line[ce - 1] == '\r'))
            ce--;
        Pos cpos = start;
        cpos.col += (int)cs;
        if (p.tok.kind == TOK_EOL) {
            st->kind = STMT_NOTE;
            st->pos = cpos;
            st->description = arena_strndup(a, line + cs, ce - cs);
            return st;
        }
        parse_comment(&p, st, line + cs, ce - cs, cpos);
    } else if (p.tok.kind == TOK_EOL) {
        return NULL; /* blank */
    }

    /* finding LABEL: A OP B reads like a check, but its answer is a fact of
     * the design (a pressure-reducing valve is required: yes), not a verdict. */
    if (tok_is_word(&p.tok, "check") || tok_is_word(&p.tok, "finding")) {
        st->kind = STMT_CHECK;
        st->finding = tok_is_word(&p.tok, "finding");
        const char *label;
        size_t llen;
        Pos lpos;
        if (!lex_raw_until(&p.lx, ':', &label, &llen, &lpos) || llen == 0) {
            fail(&p, p.tok.pos, "%s", st->finding ? "expected 'finding LABEL: A <= B' (a label, then ':')"
                                                  : "expected 'check LABEL: A <= B' (a label, then ':')");
            st->parse_failed = 1;
            return st;
        }
        st->label = arena_strndup(a, label, llen);
        st->name_pos = lpos;
        advance(&p);
        st->lhs = parse_expr(&p);
        if (st->lhs) {
            switch (p.tok.kind) {
            case TOK_LE: st->cmp = CMP_LE; break;
            case TOK_LT: st->cmp = CMP_LT; break;
            case TOK_GE: st->cmp = CMP_GE; break;
            case TOK_GT: st->cmp = CMP_GT; break;
            default:
                expected(&p, "a comparison (<=, <, >= or >)");
                break;
            }
            if (!p.failed) {
                advance(&p);
                st->rhs = parse_expr(&p);
            }
        }
        if (!st->lhs || !st->rhs || !expect_eol(&p))
            st->parse_failed = 1;
        return st;
    }

    /* figure KIND(args) */
    if (tok_is_word(&p.tok, "figure")) {
        Lexer save = p.lx;
        Token fig = p.tok;
        advance(&p);
        if (p.tok.kind == TOK_NAME) {
            st->kind = STMT_FIGURE;
            Expr *fe = parse_postfix(&p);
            if (fe && fe->kind == EXPR_CALL) {
                StmtFigure *f = arena_alloc(a, sizeof *f);
                f->kind = fe->text;
                f->args = fe->call->args;
                f->nargs = fe->call->nargs;
                st->fig = f;
                st->name_pos = fe->pos;
                if (fe->call->nkw) {
                    fail(&p, fe->call->kw_pos[0], "%s", "a figure takes no keyword arguments");
                }
            } else if (!p.failed) {
                fail(&p, fig.pos, "%s", "expected 'figure KIND(arguments)', e.g. figure hgl(riser)");
            }
            if (p.failed || !expect_eol(&p))
                st->parse_failed = 1;
            return st;
        }
        p.lx = save; /* a name called figure */
        p.tok = fig;
    }

    if (p.tok.kind != TOK_NAME) {
        expected(&p, "a definition 'NAME = ...' or 'check LABEL: ...'");
        st->parse_failed = 1;
        return st;
    }
    Token name = p.tok;
    st->name = arena_strndup(a, name.text, name.len);
    st->name_pos = name.pos;
    if (lexicon_keyword(name.text, name.len, KW_NOT_DEFINED) || lexicon_constant(name.text, name.len)) {
        fail(&p, name.pos, "'%s' is reserved and cannot be defined", st->name);
        st->parse_failed = 1;
        return st;
    }
    advance(&p);
    if (p.tok.kind != TOK_ASSIGN) {
        expected(&p, "'=' after the name");
        st->parse_failed = 1;
        return st;
    }
    advance(&p);

    if (tok_is_word(&p.tok, "solve")) {
        StmtSolve *sv = arena_alloc(a, sizeof *sv);
        st->kind = STMT_SOLVE;
        st->solve = sv;
        advance(&p);
        if (p.tok.kind != TOK_NAME) {
            expected(&p, "the name to vary after 'solve'");
        } else {
            sv->var = arena_strndup(a, p.tok.text, p.tok.len);
            sv->var_pos = p.tok.pos;
            advance(&p);
            if (!tok_is_word(&p.tok, "where"))
                expected(&p, "'where' after the varied name");
        }
        if (!p.failed) {
            advance(&p);
            st->lhs = parse_expr(&p);
            if (st->lhs && p.tok.kind != TOK_ASSIGN)
                expected(&p, "'=' in the equation to solve");
            if (!p.failed) {
                advance(&p);
                st->rhs = parse_expr(&p);
            }
            if (!p.failed && tok_is_word(&p.tok, "between")) {
                advance(&p);
                sv->lo = parse_expr(&p);
                if (sv->lo && !tok_is_word(&p.tok, "and"))
                    expected(&p, "'and' between the two ends of the bracket");
                if (!p.failed) {
                    advance(&p);
                    sv->hi = parse_expr(&p);
                }
            }
        }
        if (!p.failed)
            parse_as(&p, st);
        if (p.failed || !expect_eol(&p))
            st->parse_failed = 1;
        return st;
    }

    st->kind = STMT_DEF;
    st->expr = parse_expr(&p);
    if (st->expr && !p.failed)
        parse_as(&p, st);
    if (!st->expr || p.failed || !expect_eol(&p))
        st->parse_failed = 1;
    return st;
}

Expr *parse_expression_at(Arena *a, const char *text, size_t len, Pos start, DiagList *diags)
{
    Parser p = {0};
    p.arena = a;
    p.diags = diags;
    lex_init(&p.lx, text, len, start, diags);
    p.lx.comment_at = len; /* a '#' in a cell is not a comment */
    advance(&p);
    Expr *e = parse_expr(&p);
    if (!e || !expect_eol(&p))
        return NULL;
    return e;
}

int parse_equation_text(Arena *a, const char *text, DiagList *diags, Expr **lhs, Expr **rhs)
{
    Parser p = {0};
    p.arena = a;
    p.diags = diags;
    Pos start = {"(formula)", 1, 1};
    lex_init(&p.lx, text, strlen(text), start, diags);
    advance(&p);
    *lhs = parse_expr(&p);
    *rhs = NULL;
    if (!*lhs)
        return 0;
    if (p.tok.kind == TOK_ASSIGN) {
        advance(&p);
        *rhs = parse_expr(&p);
        if (!*rhs)
            return 0;
    }
    return expect_eol(&p);
}
