/* strmap.h — a map from strings to indexes, for finding repeats in linear time.
 *
 * Open addressing with FNV-1a hashing, grown at half full. Keys are not
 * copied: they must outlive the map (they live in the document's arena or
 * in a YAML document). Used wherever a file may repeat a key: front-matter
 * keys, source keys, citations, path segments. */
#ifndef HEADROOM_STRMAP_H
#define HEADROOM_STRMAP_H

#include <stdbool.h>
#include <stddef.h>

typedef struct StrMap {
    const char **keys; /* NULL: empty slot */
    size_t *vals;
    size_t cap;        /* a power of two, or 0 before the first insert */
    size_t len;
} StrMap;

/* Add key -> val unless key is present. true when added; false when present,
 * with the value it already has in *had (when had is not NULL). */
bool strmap_add(StrMap *m, const char *key, size_t val, size_t *had);

/* The value of key: true and *val when present. */
bool strmap_get(const StrMap *m, const char *key, size_t *val);

/* The same for the n bytes at key, which need not end in a NUL. */
bool strmap_get_n(const StrMap *m, const char *key, size_t n, size_t *val);

void strmap_free(StrMap *m);

#endif
