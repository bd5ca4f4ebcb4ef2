/* lex.h — tokens of one calc line.
 *
 * The calc language is line-oriented: a statement is one line, so the lexer
 * turns one line into tokens and hands the trailing comment back separately.
 * A number swallows the unit written directly after it (`38 gal/min`); a bare
 * word anywhere else is a name. Tokens point into the line; nothing is
 * allocated. */
#ifndef HEADROOM_LEX_H
#define HEADROOM_LEX_H

#include <stddef.h>
#include <string.h>

#include "diag.h"

typedef enum TokKind {
    TOK_EOL,
    TOK_NUMBER,    /* number, with unit_len > 0 when a unit follows */
    TOK_STRING,    /* "..." (text excludes the quotes, escapes not yet undone) */
    TOK_NAME,      /* identifier or keyword */
    TOK_PLUS, TOK_MINUS, TOK_STAR, TOK_SLASH, TOK_CARET,
    TOK_LPAREN, TOK_RPAREN, TOK_COMMA, TOK_DOT, TOK_COLON,
    TOK_ASSIGN,    /* = */
    TOK_LE, TOK_LT, TOK_GE, TOK_GT,
    TOK_ERROR      /* reported already */
} TokKind;

typedef struct Token {
    TokKind kind;
    Pos pos;
    const char *text;
    size_t len;
    double number;
    const char *unit;  /* TOK_NUMBER: the unit text, or NULL */
    size_t unit_len;
    Pos unit_pos;
    int middle_dot;    /* TOK_STAR written as · */
} Token;

typedef struct Lexer {
    const char *line;  /* not NUL-terminated necessarily */
    size_t len;
    size_t at;
    Pos start;         /* position of line[0] */
    DiagList *diags;
    size_t comment_at; /* offset of '#', or len when none */
} Lexer;

/* Set up for one line; finds the comment start (a '#' outside strings). */
void lex_init(Lexer *lx, const char *line, size_t len, Pos start, DiagList *diags);
Token lex_next(Lexer *lx);
/* The same, written into *t (the parser's current token): no token is built
 * in a temporary and copied. */
void lex_scan(Lexer *lx, Token *t);
/* The rest of the line up to (not including) `stop`, trimmed; used for check
 * labels. Advances past `stop`. Returns false if `stop` is not found before
 * the comment. */
int lex_raw_until(Lexer *lx, char stop, const char **text, size_t *len, Pos *pos);
const char *tok_describe(TokKind k);
/* Is the token the name `word`? Inline, so a literal's length is known where
 * it is written (the parser asks this of every statement's first token). */
static inline int tok_is_word(const Token *t, const char *word)
{
    size_t n = strlen(word);
    return t->kind == TOK_NAME && t->len == n && memcmp(t->text, word, n) == 0;
}

#endif
