/* lexicon.c — the keywords and named constants of the calc language. */
#include "lexicon.h"

#include <pthread.h>
#include <stdint.h>

#include "doc.h"

/* The order is the order the language server offers them in. `finding`
 * and `figure` begin a statement only where the parser sees one (`figure`
 * followed by a name); elsewhere they are names. */
const Keyword lexicon_keywords[] = {
    {"check", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"solve", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"where", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"between", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"and", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"as", KW_ENDS_UNIT | KW_NOT_VALUE | KW_NOT_DEFINED | KW_OFFERED},
    {"figure", KW_OFFERED},
    {"finding", KW_NOT_DEFINED},
    {NULL, 0},
};

/* keyword_start below keeps a bit a keyword */
_Static_assert(sizeof lexicon_keywords / sizeof lexicon_keywords[0] <= 33, "at most 32 keywords");

const NamedConstant lexicon_constants[] = {
    {"pi", SLOT_PI, CONST_PI, &DIM_NONE, "", NULL, NULL},
    {"g", SLOT_G, CONST_STANDARD_GRAVITY, &DIM_ACCEL, "m/s^2", "standard gravity", "NIST SP 811"},
    {NULL, 0, 0, NULL, NULL, NULL, NULL},
};

/* word is s[0..len): compared in place, stopping at the first difference
 * (the lexer asks this of every name it reads) */
static bool spelled(const char *word, const char *s, size_t len)
{
    if (len == 0)
        return false;
    /* a byte at a time: the words are short and most differ at once, where
     * a call of strncmp cost more than the comparison */
    for (size_t i = 0; i < len; i++)
        if (word[i] != s[i] || word[i] == '\0') /* also where word ends before s does */
            return false;
    return word[len] == '\0';
}

/* For each byte, the keywords that start with it (bit k: lexicon_keywords[k]),
 * made once from the table: most names the lexer asks about start with none
 * of them, and `ft` is compared with the two words that start with f only. */
static uint32_t keyword_start[256];
static pthread_once_t keyword_start_once = PTHREAD_ONCE_INIT;

static void keyword_start_make(void)
{
    for (unsigned k = 0; lexicon_keywords[k].word; k++)
        keyword_start[(unsigned char)lexicon_keywords[k].word[0]] |= 1u << k;
}

const Keyword *lexicon_keyword(const char *s, size_t len, unsigned roles)
{
    pthread_once(&keyword_start_once, keyword_start_make);
    if (len == 0)
        return NULL;
    for (uint32_t m = keyword_start[(unsigned char)s[0]]; m; m &= m - 1) {
        const Keyword *k = &lexicon_keywords[__builtin_ctz(m)];
        if ((k->roles & roles) && spelled(k->word, s, len))
            return k;
    }
    return NULL;
}

const NamedConstant *lexicon_constant(const char *s, size_t len)
{
    for (const NamedConstant *c = lexicon_constants; c->name; c++)
        if (spelled(c->name, s, len))
            return c;
    return NULL;
}

const NamedConstant *lexicon_constant_at(int slot)
{
    for (const NamedConstant *c = lexicon_constants; c->name; c++)
        if (c->slot == slot)
            return c;
    return NULL;
}
