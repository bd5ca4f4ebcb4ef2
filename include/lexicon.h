/* lexicon.h — the words of the calc language, each listed once.
 *
 * Its keywords, with what each may not be (a unit after a number, a value,
 * a defined name) and whether the editor offers it; and its named
 * constants, pi and g. The lexer, the parser, the resolver, the evaluator
 * and the language server read these two tables and keep no list of their
 * own. */
#ifndef HEADROOM_LEXICON_H
#define HEADROOM_LEXICON_H

#include <stddef.h>

#include "units.h"

typedef enum KeywordRole {
    KW_ENDS_UNIT = 1,   /* after a number it is a word, not the number's unit: `2 m as ft` */
    KW_NOT_VALUE = 2,   /* cannot stand where a value is expected */
    KW_NOT_DEFINED = 4, /* cannot be the name a line defines */
    KW_OFFERED = 8      /* the language server offers it as a completion */
} KeywordRole;

typedef struct Keyword {
    const char *word;
    unsigned roles;     /* KeywordRole bits */
} Keyword;

/* Every keyword, ended by {NULL, 0}. */
extern const Keyword lexicon_keywords[];

/* The keyword spelled by the `len` bytes at `s` if it has any of `roles`,
 * else NULL. */
const Keyword *lexicon_keyword(const char *s, size_t len, unsigned roles);

/* A named constant of the language: a value no line may redefine. */
typedef struct NamedConstant {
    const char *name;
    int slot;           /* its slot in expressions (SLOT_PI, SLOT_G: doc.h) */
    double si;
    const Dim *dim;
    const char *unit;   /* as the language server shows it: "m/s^2", "" */
    const char *what;   /* "standard gravity", or NULL */
    const char *source; /* where the value is defined, or NULL */
} NamedConstant;

/* Every named constant, ended by {NULL}. */
extern const NamedConstant lexicon_constants[];

/* The constant spelled by the `len` bytes at `s`, or NULL. */
const NamedConstant *lexicon_constant(const char *s, size_t len);
/* The constant of an expression slot, or NULL. */
const NamedConstant *lexicon_constant_at(int slot);

#endif
