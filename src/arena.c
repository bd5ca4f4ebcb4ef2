/* arena.c — the xmalloc family, the document arena, string buffers and
 * pointer vectors. Exhaustion exits with status 3 and a message (never
 * abort()): a compiler that runs out of memory on one document has nothing
 * useful left to do, and exit() runs the handler that removes a report's
 * temporary file (outfile.c). */
#define _DEFAULT_SOURCE /* MAP_ANONYMOUS and MADV_HUGEPAGE: Linux mmap flags beyond POSIX */
#include "arena.h"

#include <stdio.h>
#include <stdlib.h>
#include <stdint.h>
#include <string.h>
#include <sys/mman.h>

static void out_of_memory(size_t n)
{
    fprintf(stderr, "headroom: out of memory (asked for %zu bytes)\n", n);
    exit(3);
}

void *xmalloc(size_t n)
{
    void *p = malloc(n ? n : 1);
    if (!p)
        out_of_memory(n);
    return p;
}

void *xcalloc(size_t count, size_t size)
{
    void *p = calloc(count ? count : 1, size ? size : 1);
    if (!p)
        out_of_memory(count * size);
    return p;
}

void *xrealloc(void *p, size_t n)
{
    void *q = realloc(p, n ? n : 1);
    if (!q)
        out_of_memory(n);
    return q;
}

char *xstrndup(const char *s, size_t n)
{
    char *d = xmalloc(n + 1);
    memcpy(d, s, n);
    d[n] = '\0';
    return d;
}

char *xstrdup(const char *s) { return xstrndup(s, strlen(s)); }

/* Blocks grow geometrically; a request larger than the usual block gets a
 * block of its own. */
struct ArenaBlock {
    ArenaBlock *next;
    size_t size;             /* bytes of data[]; the newest block's unused ones are Arena.left */
    size_t mapped;           /* bytes mapped for the block (block_huge), else 0 */
    max_align_t data[];
};

/* The first block of an arena with no size expected is small: a check of a
 * one-line calc makes a few arenas, and calloc clears a block below glibc's
 * mmap threshold page by page (64 KiB blocks were 14 of its 105 page faults). */
enum {
    ARENA_MIN_BLOCK = 8 * 1024,
    ARENA_MAX_BLOCK = 16 * 1024 * 1024,
    ARENA_FALLBACK_BLOCK = 1024 * 1024,
    HUGE_PAGE = 2 * 1024 * 1024
};

/* A block of at least a huge page comes straight from mmap, aligned to 2 MiB
 * and marked MADV_HUGEPAGE: where the kernel has transparent huge pages it
 * maps the block 2 MiB at a time, and a calloc'd block takes one page fault
 * per 4 KiB touched (at 100,000 statements 40,000 faults were a third of a
 * check's time, issue 17). Pages never touched cost nothing but address
 * space, so a block may be generous. NULL when the mapping fails: the
 * caller falls back to calloc. */
static ArenaBlock *block_huge(size_t size)
{
    size_t want = (sizeof(ArenaBlock) + size + HUGE_PAGE - 1) / HUGE_PAGE * HUGE_PAGE;
    char *raw = mmap(NULL, want + HUGE_PAGE, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
    if (raw == MAP_FAILED)
        return NULL;
    uintptr_t at = ((uintptr_t)raw + HUGE_PAGE - 1) / HUGE_PAGE * HUGE_PAGE;
    char *base = (char *)at;
    if (base > raw)
        munmap(raw, (size_t)(base - raw));
    size_t tail = (size_t)(raw + want + HUGE_PAGE - (base + want));
    if (tail)
        munmap(base + want, tail);
#ifdef MADV_HUGEPAGE
    madvise(base, want, MADV_HUGEPAGE);
#endif
    ArenaBlock *b = (ArenaBlock *)base;
    b->size = want - sizeof *b;
    b->mapped = want;
    return b;
}

static void block_free(ArenaBlock *b)
{
    if (b->mapped)
        munmap(b, b->mapped);
    else
        free(b);
}

void arena_init(Arena *a)
{
    a->head = NULL;
    a->used_total = 0;
    a->next_block = 0;
    a->cur = NULL;
    a->left = 0;
}

void arena_init_sized(Arena *a, size_t expect)
{
    arena_init(a);
    if (expect > ARENA_MIN_BLOCK)
        a->next_block = expect < 4 * (size_t)ARENA_MAX_BLOCK ? expect : 4 * (size_t)ARENA_MAX_BLOCK;
}

void arena_free(Arena *a)
{
    ArenaBlock *b = a->head;
    while (b) {
        ArenaBlock *next = b->next;
        block_free(b);
        b = next;
    }
    arena_init(a);
}

void arena_reset(Arena *a)
{
    ArenaBlock *keep = a->head;
    if (!keep)
        return;
    for (ArenaBlock *b = keep->next, *next; b; b = next) {
        next = b->next;
        block_free(b);
    }
    memset(keep->data, 0, keep->size - a->left); /* handed out again: zeroed again */
    keep->next = NULL;
    a->cur = (char *)keep->data;
    a->left = keep->size;
    a->used_total = 0;
}

/* Eight bytes: the alignment of a double, a pointer and a size_t, the
 * strictest of anything kept in an arena (no long double is). Rounding every
 * node and string up to max_align_t's 16 cost a calc tenths of its memory
 * (issue 17). arena_alloc (arena.h) rounds to it. */
_Static_assert(ARENA_ALIGN == 8 && _Alignof(double) <= ARENA_ALIGN && _Alignof(void *) <= ARENA_ALIGN &&
                   _Alignof(size_t) <= ARENA_ALIGN && _Alignof(long long) <= ARENA_ALIGN,
               "arena alignment");

void *arena_alloc_block(Arena *a, size_t n)
{
    if (n > SIZE_MAX / 2)
        xcalloc(1, n); /* no such block: out of memory, exit 3 */
    n = n ? (n + ARENA_ALIGN - 1) & ~(size_t)(ARENA_ALIGN - 1) : ARENA_ALIGN;
    /* blocks double up to ARENA_MAX_BLOCK, then stay there */
    size_t size = a->next_block ? a->next_block : ARENA_MIN_BLOCK;
    a->next_block = size < ARENA_MAX_BLOCK ? size * 2 : ARENA_MAX_BLOCK;
    if (size < n)
        size = n;
    /* zeroed once, here: every byte of a block is handed out once and never
     * reused, so arena_alloc need not clear it again (a block this large
     * comes from the kernel already zero) */
    ArenaBlock *b = size >= HUGE_PAGE ? block_huge(size) : NULL;
    if (!b && size >= HUGE_PAGE) {
        /* no room for the mapping (an address-space limit, say): go on in
         * the usual blocks, so a generous hint never turns into an
         * out-of-memory exit that the document itself would not cause */
        size = ARENA_FALLBACK_BLOCK > n ? ARENA_FALLBACK_BLOCK : n;
        a->next_block = size * 2;
    }
    if (!b) {
        b = xcalloc(1, sizeof *b + size);
        b->size = size;
    }
    b->next = a->head;
    a->head = b;
    a->cur = (char *)b->data + n;
    a->left = b->size - n;
    a->used_total += n;
    return b->data;
}

char *arena_strndup(Arena *a, const char *s, size_t n)
{
    char *d = arena_alloc(a, n + 1);
    memcpy(d, s, n);
    d[n] = '\0';
    return d;
}

char *arena_strdup(Arena *a, const char *s) { return arena_strndup(a, s, strlen(s)); }

char *arena_vprintf(Arena *a, const char *fmt, va_list ap)
{
    va_list copy;
    va_copy(copy, ap);
    int n = vsnprintf(NULL, 0, fmt, copy);
    va_end(copy);
    if (n < 0)
        n = 0;
    char *d = arena_alloc(a, (size_t)n + 1);
    vsnprintf(d, (size_t)n + 1, fmt, ap);
    return d;
}

char *arena_printf(Arena *a, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    char *d = arena_vprintf(a, fmt, ap);
    va_end(ap);
    return d;
}

static void sb_reserve(StrBuf *sb, size_t extra)
{
    if (sb->len + extra + 1 <= sb->cap)
        return;
    size_t cap = sb->cap ? sb->cap : 64;
    while (cap < sb->len + extra + 1)
        cap *= 2;
    sb->data = xrealloc(sb->data, cap);
    sb->cap = cap;
}

void sb_putn(StrBuf *sb, const char *s, size_t n)
{
    sb_reserve(sb, n);
    memcpy(sb->data + sb->len, s, n);
    sb->len += n;
    sb->data[sb->len] = '\0';
}

void sb_putc(StrBuf *sb, char c) { sb_putn(sb, &c, 1); }
void sb_puts(StrBuf *sb, const char *s) { sb_putn(sb, s, strlen(s)); }

void sb_printf(StrBuf *sb, const char *fmt, ...)
{
    va_list ap, copy;
    va_start(ap, fmt);
    va_copy(copy, ap);
    int n = vsnprintf(NULL, 0, fmt, copy);
    va_end(copy);
    if (n > 0) {
        sb_reserve(sb, (size_t)n);
        vsnprintf(sb->data + sb->len, (size_t)n + 1, fmt, ap);
        sb->len += (size_t)n;
    }
    va_end(ap);
}

void sb_clear(StrBuf *sb)
{
    sb->len = 0;
    if (sb->data)
        sb->data[0] = '\0';
}

void sb_free(StrBuf *sb)
{
    free(sb->data);
    sb->data = NULL;
    sb->len = sb->cap = 0;
}

const char *sb_str(const StrBuf *sb) { return sb->data ? sb->data : ""; }

void vec_push(Vec *v, void *item)
{
    if (v->len == v->cap) {
        v->cap = v->cap ? v->cap * 2 : 8;
        v->items = xrealloc(v->items, v->cap * sizeof *v->items);
    }
    v->items[v->len++] = item;
}

void vec_free(Vec *v)
{
    free(v->items);
    v->items = NULL;
    v->len = v->cap = 0;
}
