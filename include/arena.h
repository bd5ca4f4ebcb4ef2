/* arena.h — memory for one document.
 *
 * Everything a document owns (tokens, nodes, strings, values) is carved out of
 * one Arena and released with arena_free(); nothing inside is freed on its own.
 * The xmalloc family aborts on exhaustion so call sites never test for NULL.
 * Vec is a growable array of pointers or small structs kept on the heap (not
 * in the arena), owned by whoever declared it and released with vec_free(). */
#ifndef HEADROOM_ARENA_H
#define HEADROOM_ARENA_H

#include <stdarg.h>
#include <stddef.h>

void *xmalloc(size_t n);
void *xcalloc(size_t count, size_t size);
void *xrealloc(void *p, size_t n);
char *xstrdup(const char *s);
char *xstrndup(const char *s, size_t n);

typedef struct ArenaBlock ArenaBlock;
typedef struct Arena {
    ArenaBlock *head;
    size_t used_total;
    size_t next_block;       /* size of the next block; 0 until the first */
    char *cur;               /* the newest block's first unused byte (NULL before any) */
    size_t left;             /* bytes unused from cur to the block's end */
} Arena;

void arena_init(Arena *a);
/* The same, for an arena expected to grow to about `expect` bytes: its first
 * block is that large (up to 64 MiB), so a large document is carved from a
 * few huge pages instead of a chain of small blocks. */
void arena_init_sized(Arena *a, size_t expect);
void arena_free(Arena *a);
/* Empty the arena for reuse: everything in it is released but its newest
 * block, which is kept (cleared) for what comes next, so a scratch arena
 * used over and over costs no allocation. */
void arena_reset(Arena *a);

enum { ARENA_ALIGN = 8 };
/* n bytes (n rounded up to ARENA_ALIGN) in a new block: arena_alloc's slow way. */
void *arena_alloc_block(Arena *a, size_t n);

/* Zeroed, aligned to 8 (any type but long double). Inline: a calc makes a
 * few hundred thousand of these, and the usual case is a pointer bump. */
static inline void *arena_alloc(Arena *a, size_t n)
{
    if (n > a->left) /* also every n too large to round: the block's calloc refuses it */
        return arena_alloc_block(a, n);
    n = n ? (n + ARENA_ALIGN - 1) & ~(size_t)(ARENA_ALIGN - 1) : ARENA_ALIGN;
    if (n > a->left)
        return arena_alloc_block(a, n);
    void *p = a->cur;
    a->cur += n;
    a->left -= n;
    a->used_total += n;
    return p;
}

char *arena_strdup(Arena *a, const char *s);
char *arena_strndup(Arena *a, const char *s, size_t n);
char *arena_printf(Arena *a, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));
char *arena_vprintf(Arena *a, const char *fmt, va_list ap);

/* A growable byte string on the heap. */
typedef struct StrBuf {
    char *data;     /* always NUL-terminated once anything is appended */
    size_t len;
    size_t cap;
} StrBuf;

void sb_putc(StrBuf *sb, char c);
void sb_puts(StrBuf *sb, const char *s);
void sb_putn(StrBuf *sb, const char *s, size_t n);
void sb_printf(StrBuf *sb, const char *fmt, ...) __attribute__((format(printf, 2, 3)));
void sb_clear(StrBuf *sb);
void sb_free(StrBuf *sb);
const char *sb_str(const StrBuf *sb); /* "" when empty */

/* A growable array of pointers. */
typedef struct Vec {
    void **items;
    size_t len;
    size_t cap;
} Vec;

void vec_push(Vec *v, void *item);
void vec_free(Vec *v);

#endif
