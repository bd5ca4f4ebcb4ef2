/* test_arena.c — cmocka tests of the document arena: every allocation is
 * zeroed and aligned to 8, across blocks of every size (a block is zeroed
 * once, when it is made, so this checks that nothing is handed out twice),
 * and again after arena_reset; blocks of a huge page and more (mmap) too. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include <cmocka.h>

#include "arena.h"

static int all_zero(const unsigned char *p, size_t n)
{
    for (size_t i = 0; i < n; i++)
        if (p[i])
            return 0;
    return 1;
}

static void fill_and_check(Arena *a, unsigned seed)
{
    unsigned x = seed;
    for (int i = 0; i < 20000; i++) {
        x = x * 1103515245u + 12345u;
        size_t n = (x >> 8) % 300;
        if (i % 997 == 0)
            n = 200000 + (x >> 4) % 100000; /* now and then a block of its own */
        unsigned char *p = arena_alloc(a, n);
        assert_int_equal((uintptr_t)p % 8, 0);
        assert_true(all_zero(p, n));
        memset(p, 0xA5, n); /* dirty it: a second handout would show */
    }
}

static void test_zeroed_and_aligned(void **state)
{
    (void)state;
    Arena a;
    arena_init(&a);
    fill_and_check(&a, 1);
    arena_free(&a);
}

static void test_zeroed_after_reset(void **state)
{
    (void)state;
    Arena a;
    arena_init(&a);
    fill_and_check(&a, 2);
    arena_reset(&a);
    assert_int_equal(a.used_total, 0);
    fill_and_check(&a, 3);
    arena_free(&a);
}

/* A first block of the expected size (here 40 MiB, from mmap in huge-page
 * units), a request larger than any block (20 MiB) and a reset that keeps a
 * mapped block: zeroed, aligned, no byte handed out twice. */
static void test_sized_and_large(void **state)
{
    (void)state;
    Arena a;
    arena_init_sized(&a, 40u * 1024 * 1024);
    fill_and_check(&a, 4);
    size_t big = 20u * 1024 * 1024;
    unsigned char *p = arena_alloc(&a, big);
    assert_int_equal((uintptr_t)p % 8, 0);
    assert_true(all_zero(p, big));
    memset(p, 0x5A, big);
    fill_and_check(&a, 5);
    arena_reset(&a);
    fill_and_check(&a, 6);
    arena_free(&a);
    /* freed, the arena starts over like a new one */
    assert_int_equal(a.used_total, 0);
    assert_int_equal(a.next_block, 0);
    fill_and_check(&a, 7);
    arena_free(&a);
}

static void test_strings(void **state)
{
    (void)state;
    Arena a;
    arena_init(&a);
    char *s = arena_strndup(&a, "flow rate", 4);
    assert_string_equal(s, "flow");
    assert_string_equal(arena_printf(&a, "%d %s", 42, "psi"), "42 psi");
    arena_free(&a);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_zeroed_and_aligned),
        cmocka_unit_test(test_zeroed_after_reset),
        cmocka_unit_test(test_sized_and_large),
        cmocka_unit_test(test_strings),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
