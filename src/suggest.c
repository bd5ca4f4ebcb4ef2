/* suggest.c — the optimal string alignment distance (suggest.h). */
#include "suggest.h"

#include <stdint.h>
#include <stdio.h>
#include <string.h>

static char fold_case(char c, bool fold)
{
    return fold && c >= 'A' && c <= 'Z' ? (char)(c - 'A' + 'a') : c;
}

size_t suggest_distance(const char *a, size_t na, const char *b, size_t nb, bool fold)
{
    if (na >= SUGGEST_MAX_WORD || nb >= SUGGEST_MAX_WORD)
        return SIZE_MAX;
    /* three rows: i-2, i-1 and i */
    size_t rows[3][SUGGEST_MAX_WORD + 1];
    size_t *back2 = rows[0], *back = rows[1], *cur = rows[2];
    for (size_t j = 0; j <= nb; j++)
        back[j] = j;
    for (size_t i = 1; i <= na; i++) {
        cur[0] = i;
        char ca = fold_case(a[i - 1], fold);
        for (size_t j = 1; j <= nb; j++) {
            char cb = fold_case(b[j - 1], fold);
            size_t best = back[j - 1] + (ca != cb);
            if (back[j] + 1 < best)
                best = back[j] + 1;
            if (cur[j - 1] + 1 < best)
                best = cur[j - 1] + 1;
            if (i > 1 && j > 1 && ca == fold_case(b[j - 2], fold) && fold_case(a[i - 2], fold) == cb &&
                back2[j - 2] + 1 < best)
                best = back2[j - 2] + 1;
            cur[j] = best;
        }
        size_t *t = back2;
        back2 = back;
        back = cur;
        cur = t;
    }
    return back[nb];
}

size_t suggest_distance_str(const char *a, const char *b)
{
    return suggest_distance(a, strlen(a), b, strlen(b), false);
}

const char *suggest_choices(char *buf, size_t n, const char *const *words, size_t count, const char *quote,
                            const char *last)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < count && len < n; i++) {
        const char *sep = i == 0 ? "" : i + 1 == count ? last : ", ";
        int w = snprintf(buf + len, n - len, "%s%s%s%s", sep, quote, words[i], quote);
        if (w < 0)
            break;
        len += (size_t)w;
    }
    return buf;
}
