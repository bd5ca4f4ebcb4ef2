/* lookalike.h — characters that hide or disguise what a calc says.
 *
 * Unicode Technical Standard #39 (Unicode Security Mechanisms) and #9 (the
 * bidirectional algorithm) describe the two dangers: invisible characters
 * (U+200B ZERO WIDTH SPACE and its kin) make two names that print alike,
 * and bidirectional controls (U+202E RIGHT-TO-LEFT OVERRIDE, ...) reorder
 * what an editor shows. A calc line may hold neither. Letters of another
 * script that look like Latin ones (Cyrillic а, Greek capital Α) are legal
 * in names, but a name mixing Latin with Cyrillic, or two names that differ
 * only by such letters, deserve a warning: their skeleton, each look-alike
 * replaced by its Latin twin (a small table after UTS #39's confusables for
 * the Latin, Greek and Cyrillic letters), is the same. */
#ifndef HEADROOM_LOOKALIKE_H
#define HEADROOM_LOOKALIKE_H

#include <stdbool.h>
#include <stddef.h>

/* The first invisible or bidirectional-control character in s[0..len): its
 * byte offset (or len when there is none), the code point in *cp. */
size_t lookalike_find_hidden(const char *s, size_t len, unsigned *cp);

/* A name's skeleton into out (NUL-terminated; false if it does not fit).
 * *scripts gets LOOK_LATIN | LOOK_CYRILLIC | LOOK_GREEK for the letters seen,
 * *twin the first look-alike letter (0 when none). */
enum { LOOK_LATIN = 1, LOOK_CYRILLIC = 2, LOOK_GREEK = 4 };
bool lookalike_skeleton(const char *name, char *out, size_t cap, int *scripts, unsigned *twin);

#endif
