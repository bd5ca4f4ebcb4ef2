/* strmap.c — string-to-index map (open addressing, linear probing). */
#include "strmap.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "arena.h"

static uint64_t strmap_hash(const char *s, size_t n)
{
    uint64_t h = 1469598103934665603u; /* FNV-1a */
    for (size_t k = 0; k < n; k++) {
        h ^= (unsigned char)s[k];
        h *= 1099511628211u;
    }
    return h;
}

/* The slot of the n bytes at key (no NUL among them), or the empty slot
 * where they would go. */
static size_t strmap_slot_n(const char *const *keys, size_t cap, const char *key, size_t n)
{
    size_t i = (size_t)strmap_hash(key, n) & (cap - 1);
    while (keys[i] && (strncmp(keys[i], key, n) != 0 || keys[i][n] != '\0'))
        i = (i + 1) & (cap - 1);
    return i;
}

static uint64_t strmap_hash_z(const char *s)
{
    uint64_t h = 1469598103934665603u; /* FNV-1a, the same as strmap_hash */
    for (; *s; s++) {
        h ^= (unsigned char)*s;
        h *= 1099511628211u;
    }
    return h;
}

static size_t strmap_slot(const char *const *keys, size_t cap, const char *key)
{
    size_t i = (size_t)strmap_hash_z(key) & (cap - 1);
    while (keys[i] && strcmp(keys[i], key) != 0)
        i = (i + 1) & (cap - 1);
    return i;
}

static void strmap_grow(StrMap *m)
{
    size_t cap = m->cap ? m->cap * 2 : 16;
    const char **keys = xcalloc(cap, sizeof *keys);
    size_t *vals = xcalloc(cap, sizeof *vals);
    for (size_t i = 0; i < m->cap; i++)
        if (m->keys[i]) {
            size_t j = strmap_slot(keys, cap, m->keys[i]);
            keys[j] = m->keys[i];
            vals[j] = m->vals[i];
        }
    free(m->keys);
    free(m->vals);
    m->keys = keys;
    m->vals = vals;
    m->cap = cap;
}

bool strmap_add(StrMap *m, const char *key, size_t val, size_t *had)
{
    if ((m->len + 1) * 2 > m->cap)
        strmap_grow(m);
    size_t i = strmap_slot(m->keys, m->cap, key);
    if (m->keys[i]) {
        if (had)
            *had = m->vals[i];
        return false;
    }
    m->keys[i] = key;
    m->vals[i] = val;
    m->len++;
    return true;
}

bool strmap_get(const StrMap *m, const char *key, size_t *val)
{
    if (m->cap == 0)
        return false;
    size_t i = strmap_slot(m->keys, m->cap, key);
    if (!m->keys[i])
        return false;
    *val = m->vals[i];
    return true;
}

bool strmap_get_n(const StrMap *m, const char *key, size_t n, size_t *val)
{
    if (m->cap == 0 || memchr(key, '\0', n))
        return false;
    size_t i = strmap_slot_n(m->keys, m->cap, key, n);
    if (!m->keys[i])
        return false;
    *val = m->vals[i];
    return true;
}

void strmap_free(StrMap *m)
{
    free(m->keys);
    free(m->vals);
    memset(m, 0, sizeof *m);
}
