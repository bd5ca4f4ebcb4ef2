/* lex.c — the tokens of one calc line.
 *
 * Key choice: units are lexical. A unit is only ever written directly after
 * a number (after optional spaces) or after the keyword `as`, so the lexer
 * attaches the unit text to the number token and the parser never has to
 * guess whether `L` is a variable or a litre: `2*L` is twice L, `2 L` is two
 * litres. Keywords (and, as, where, between) are never units. */
#include "lex.h"

#include <stdbool.h>
#include <string.h>

#include "lexicon.h"
#include "lookalike.h"
#include "numfmt.h"


static Pos pos_at(const Lexer *lx, size_t off)
{
    Pos p = lx->start;
    p.col += (int)off;
    return p;
}

void lex_init(Lexer *lx, const char *line, size_t len, Pos start, DiagList *diags)
{
    lx->line = line;
    lx->len = len;
    lx->at = 0;
    lx->start = start;
    lx->diags = diags;
    lx->comment_at = len;
    /* the comment starts at the first '#' outside a string: with no quote
     * before the first '#' (most lines), memchr finds it */
    const char *hash = memchr(line, '#', len);
    size_t upto = hash ? (size_t)(hash - line) : len;
    const char *quote = memchr(line, '"', upto);
    if (!quote)
        lx->comment_at = upto;
    int in_string = 0;
    for (size_t i = quote ? (size_t)(quote - line) : len; i < len; i++) {
        if (in_string) {
            if (line[i] == '\\' && i + 1 < len)
                i++;
            else if (line[i] == '"')
                in_string = 0;
        } else if (line[i] == '"') {
            in_string = 1;
        } else if (line[i] == '#') {
            lx->comment_at = i;
            break;
        }
    }
    /* Names, strings and comments alike: nothing that hides itself or
     * reorders the line on screen (UTS #39, UAX #9). */
    unsigned cp;
    size_t at = lookalike_find_hidden(line, len, &cp);
    if (at < len)
        diag_error(diags, pos_at(lx, at),
                   "%s character U+%04X in a calc line: it makes the line read other than it is; "
                   "delete it", (cp >= 0x202A && cp <= 0x202E) || (cp >= 0x2066 && cp <= 0x2069) ||
                                        cp == 0x061C || cp == 0x200E || cp == 0x200F
                                    ? "bidirectional-control"
                                    : "invisible",
                   cp);
}


static int is_name_start(unsigned char c)
{
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_' || c >= 0x80;
}

static int is_digit(unsigned char c) { return c >= '0' && c <= '9'; }

/* UTF-8 sequences the language treats as operators, not letters. */
static int is_middle_dot(const char *s, size_t left)
{
    return left >= 2 && (unsigned char)s[0] == 0xC2 && (unsigned char)s[1] == 0xB7;
}

static size_t cmp_symbol(const char *s, size_t left, TokKind *k)
{
    /* ≤ E2 89 A4, ≥ E2 89 A5 */
    if (left >= 3 && (unsigned char)s[0] == 0xE2 && (unsigned char)s[1] == 0x89) {
        if ((unsigned char)s[2] == 0xA4) {
            *k = TOK_LE;
            return 3;
        }
        if ((unsigned char)s[2] == 0xA5) {
            *k = TOK_GE;
            return 3;
        }
    }
    return 0;
}

/* 1: an ASCII byte a name may hold (letter, digit, '_'). */
static const unsigned char NAME_ASCII[128] = {
    ['0'] = 1, ['1'] = 1, ['2'] = 1, ['3'] = 1, ['4'] = 1, ['5'] = 1, ['6'] = 1, ['7'] = 1, ['8'] = 1, ['9'] = 1,
    ['A'] = 1, ['B'] = 1, ['C'] = 1, ['D'] = 1, ['E'] = 1, ['F'] = 1, ['G'] = 1, ['H'] = 1, ['I'] = 1, ['J'] = 1,
    ['K'] = 1, ['L'] = 1, ['M'] = 1, ['N'] = 1, ['O'] = 1, ['P'] = 1, ['Q'] = 1, ['R'] = 1, ['S'] = 1, ['T'] = 1,
    ['U'] = 1, ['V'] = 1, ['W'] = 1, ['X'] = 1, ['Y'] = 1, ['Z'] = 1, ['_'] = 1,
    ['a'] = 1, ['b'] = 1, ['c'] = 1, ['d'] = 1, ['e'] = 1, ['f'] = 1, ['g'] = 1, ['h'] = 1, ['i'] = 1, ['j'] = 1,
    ['k'] = 1, ['l'] = 1, ['m'] = 1, ['n'] = 1, ['o'] = 1, ['p'] = 1, ['q'] = 1, ['r'] = 1, ['s'] = 1, ['t'] = 1,
    ['u'] = 1, ['v'] = 1, ['w'] = 1, ['x'] = 1, ['y'] = 1, ['z'] = 1,
};

static size_t name_length(const char *s, size_t left)
{
    /* The ASCII run first, a table look-up a byte: no operator spelled in
     * UTF-8 (the middle dot, <= and >= signs) starts below 0x80. */
    size_t i = 0;
    while (i < left && (unsigned char)s[i] < 0x80 && NAME_ASCII[(unsigned char)s[i]])
        i++;
    if (i == left || (unsigned char)s[i] < 0x80)
        return i;
    while (i < left) {
        unsigned char c = (unsigned char)s[i];
        TokKind k;
        if (is_middle_dot(s + i, left - i) || cmp_symbol(s + i, left - i, &k))
            break;
        if (is_name_start(c) || is_digit(c))
            i++;
        else
            break;
    }
    return i;
}

/* An exponent after a unit or a unit group: `^2`, `^-1`, `^0.5`; its
 * length, 0 when there is none. */
static size_t exponent_length(const char *s, size_t left)
{
    if (left == 0 || s[0] != '^')
        return 0;
    size_t j = 1;
    if (j < left && s[j] == '-')
        j++;
    size_t k = j;
    while (k < left && (is_digit((unsigned char)s[k]) || s[k] == '.'))
        k++;
    return k > j ? k : 0;
}

/* `100` glued to a name (`100ft` in psi/100ft): 3, else 0. */
static size_t hundred_length(const char *s, size_t left)
{
    return left > 3 && memcmp(s, "100", 3) == 0 && is_name_start((unsigned char)s[3]) ? 3 : 0;
}

/* The unit after a number: name[^exp] joined by * / · with balanced
 * parentheses, no spaces. Returns its length (0: no unit). */
static size_t unit_length(const char *s, size_t left)
{
    size_t i = 0;
    int depth = 0;
    int want_atom = 1;
    while (i < left) {
        if (want_atom) {
            if (s[i] == '(') {
                depth++;
                i++;
                continue;
            }
            if (s[i] == '%') { /* percent */
                i++;
                want_atom = 0;
                continue;
            }
            if (i > 0 && hundred_length(s + i, left - i) > 0)
                i += 3; /* psi/100ft: a hundred feet */
            size_t n = name_length(s + i, left - i);
            if (n == 0 || !is_name_start((unsigned char)s[i]))
                break;
            i += n;
            i += exponent_length(s + i, left - i);
            want_atom = 0;
            continue;
        }
        if (s[i] == ')' && depth > 0) {
            depth--;
            i++;
            /* A group may carry an exponent: ft/(gal/min)^2. */
            i += exponent_length(s + i, left - i);
            continue;
        }
        size_t op = 0;
        if (s[i] == '*' || s[i] == '/')
            op = 1;
        else if (is_middle_dot(s + i, left - i))
            op = 2;
        if (op && i + op < left &&
            (is_name_start((unsigned char)s[i + op]) || s[i + op] == '(' ||
             hundred_length(s + i + op, left - i - op) > 0) &&
            !is_middle_dot(s + i + op, left - i - op)) {
            i += op;
            want_atom = 1;
            continue;
        }
        break;
    }
    /* Drop a dangling operator or unbalanced tail. */
    while (i > 0 && (s[i - 1] == '*' || s[i - 1] == '/' || s[i - 1] == '('))
        i--;
    if (depth > 0) {
        /* unbalanced '(' : keep only up to the first '(' */
        const char *p = memchr(s, '(', i);
        if (p)
            i = (size_t)(p - s);
        while (i > 0 && (s[i - 1] == '*' || s[i - 1] == '/'))
            i--;
    }
    return i;
}

void lex_scan(Lexer *lx, Token *t)
{
    const char *s = lx->line;
    size_t end = lx->comment_at;
    while (lx->at < end && (s[lx->at] == ' ' || s[lx->at] == '\t' || s[lx->at] == '\r'))
        lx->at++;
    memset(t, 0, sizeof *t);
    t->pos = pos_at(lx, lx->at);
    t->text = s + lx->at;
    if (lx->at >= end) {
        t->kind = TOK_EOL;
        return;
    }
    unsigned char c = (unsigned char)s[lx->at];
    size_t left = end - lx->at;
    TokKind ck;
    size_t cn;

    if (is_digit(c) || (c == '.' && left > 1 && is_digit((unsigned char)s[lx->at + 1]))) {
        size_t n = num_parse(s + lx->at, left, &t->number);
        t->kind = TOK_NUMBER;
        t->len = n;
        lx->at += n;
        /* A digit or letter glued to the number that is not an exponent. */
        size_t save = lx->at;
        while (lx->at < end && (s[lx->at] == ' ' || s[lx->at] == '\t'))
            lx->at++;
        size_t ul = lx->at < end ? unit_length(s + lx->at, end - lx->at) : 0;
        if (ul > 0 && !lexicon_keyword(s + lx->at, ul, KW_ENDS_UNIT)) {
            t->unit = s + lx->at;
            t->unit_len = ul;
            t->unit_pos = pos_at(lx, lx->at);
            lx->at += ul;
        } else {
            lx->at = save;
        }
        return;
    }
    if (is_middle_dot(s + lx->at, left)) {
        t->kind = TOK_STAR;
        t->middle_dot = 1;
        t->len = 2;
        lx->at += 2;
        return;
    }
    if ((cn = cmp_symbol(s + lx->at, left, &ck)) > 0) {
        t->kind = ck;
        t->len = cn;
        lx->at += cn;
        return;
    }
    if (is_name_start(c)) {
        size_t n = name_length(s + lx->at, left);
        if (n == 0)
            n = 1;
        t->kind = TOK_NAME;
        t->len = n;
        lx->at += n;
        return;
    }
    if (c == '"') {
        size_t i = lx->at + 1;
        while (i < lx->len && s[i] != '"') {
            if (s[i] == '\\' && i + 1 < lx->len)
                i++;
            i++;
        }
        if (i >= lx->len) {
            diag_error(lx->diags, t->pos, "unterminated string: expected '\"' before the end of the line");
            t->kind = TOK_ERROR;
            lx->at = end;
            return;
        }
        t->kind = TOK_STRING;
        t->text = s + lx->at + 1;
        t->len = i - lx->at - 1;
        lx->at = i + 1;
        /* A '#' inside the string was skipped by lex_init already. */
        return;
    }
    lx->at++;
    t->len = 1;
    switch (c) {
    case '+': t->kind = TOK_PLUS; break;
    case '-': t->kind = TOK_MINUS; break;
    case '*': t->kind = TOK_STAR; break;
    case '/': t->kind = TOK_SLASH; break;
    case '^': t->kind = TOK_CARET; break;
    case '(': t->kind = TOK_LPAREN; break;
    case ')': t->kind = TOK_RPAREN; break;
    case ',': t->kind = TOK_COMMA; break;
    case '.': t->kind = TOK_DOT; break;
    case ':': t->kind = TOK_COLON; break;
    case '=':
        if (lx->at < end && s[lx->at] == '=') {
            diag_error(lx->diags, t->pos, "'==' is not an operator: a definition uses '=', a check uses <=, <, >= or >");
            lx->at++;
            t->kind = TOK_ERROR;
        } else {
            t->kind = TOK_ASSIGN;
        }
        break;
    case '<':
    case '>': {
        bool or_equal = lx->at < end && s[lx->at] == '=';
        if (or_equal) {
            lx->at++;
            t->len = 2;
        }
        t->kind = c == '<' ? (or_equal ? TOK_LE : TOK_LT) : (or_equal ? TOK_GE : TOK_GT);
        break;
    }
    default:
        if (c < 0x20 || c == 0x7F)
            diag_error(lx->diags, t->pos, "unexpected control character (byte 0x%02X)", c);
        else
            diag_error(lx->diags, t->pos, "unexpected character '%c'", c);
        t->kind = TOK_ERROR;
        break;
    }
    return;
}

Token lex_next(Lexer *lx)
{
    Token t;
    lex_scan(lx, &t);
    return t;
}

int lex_raw_until(Lexer *lx, char stop, const char **text, size_t *len, Pos *pos)
{
    const char *s = lx->line;
    size_t end = lx->comment_at;
    while (lx->at < end && (s[lx->at] == ' ' || s[lx->at] == '\t'))
        lx->at++;
    size_t from = lx->at;
    const char *p = memchr(s + from, stop, end - from);
    if (!p)
        return 0;
    size_t to = (size_t)(p - s);
    size_t e = to;
    while (e > from && (s[e - 1] == ' ' || s[e - 1] == '\t'))
        e--;
    *text = s + from;
    *len = e - from;
    *pos = pos_at(lx, from);
    lx->at = to + 1;
    return 1;
}

const char *tok_describe(TokKind k)
{
    switch (k) {
    case TOK_EOL: return "the end of the line";
    case TOK_NUMBER: return "a number";
    case TOK_STRING: return "a string";
    case TOK_NAME: return "a name";
    case TOK_PLUS: return "'+'";
    case TOK_MINUS: return "'-'";
    case TOK_STAR: return "'*'";
    case TOK_SLASH: return "'/'";
    case TOK_CARET: return "'^'";
    case TOK_LPAREN: return "'('";
    case TOK_RPAREN: return "')'";
    case TOK_COMMA: return "','";
    case TOK_DOT: return "'.'";
    case TOK_COLON: return "':'";
    case TOK_ASSIGN: return "'='";
    case TOK_LE: return "'<='";
    case TOK_LT: return "'<'";
    case TOK_GE: return "'>='";
    case TOK_GT: return "'>'";
    case TOK_ERROR: return "an invalid token";
    }
    return "a token";
}

