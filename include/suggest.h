/* suggest.h — "did you mean": how far one word is from another.
 *
 * The one edit distance of the program, for every suggestion it makes
 * (names, functions, units, fixture kinds, front-matter words): the
 * optimal string alignment distance, Levenshtein's insertions, deletions
 * and substitutions plus the transposition of two adjacent bytes, each
 * one edit. Words are short; a word of SUGGEST_MAX_WORD bytes or more is
 * never near anything. */
#ifndef HEADROOM_SUGGEST_H
#define HEADROOM_SUGGEST_H

#include <stdbool.h>
#include <stddef.h>

#define SUGGEST_MAX_WORD 64

/* The distance between a[0..na) and b[0..nb), ignoring ASCII case when
 * `fold`; SIZE_MAX when either is too long. */
size_t suggest_distance(const char *a, size_t na, const char *b, size_t nb, bool fold);
/* The same for two NUL-terminated words, case counting. */
size_t suggest_distance_str(const char *a, const char *b);

/* The choices a message offers, into buf: each word inside `quote`, joined
 * by ", " and by `last` before the final one ("crane, hooper or darby"). */
const char *suggest_choices(char *buf, size_t n, const char *const *words, size_t count, const char *quote,
                            const char *last);

#endif
