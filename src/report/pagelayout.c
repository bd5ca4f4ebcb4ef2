/* pagelayout.c — the page layout pass: measured items to sheets.
 *
 * A greedy fill, one item at a time, with one look-ahead rule: an item that
 * must stay with its successor (a heading, a description above its row)
 * starts a new sheet unless the whole chain up to and including the first
 * item that does not keep with its next fits on the current one. Chains
 * longer than a sheet are let go rather than pushed forever. */
#include "pagelayout.h"

/* Height of the keep-with-next chain starting at i, as placed from the
 * current position (space before each item but the first included). */
static double chain_height(const PageItem *items, size_t n, size_t i)
{
    double h = items[i].height;
    while (i + 1 < n && items[i].keep_with_next && !items[i + 1].break_before) {
        i++;
        h += items[i].space_before + items[i].height;
    }
    return h;
}

int pagelayout_assign(const PageItem *items, size_t n, double body_height, PagePlace *out)
{
    int page = 0;
    double y = 0; /* used height on the current sheet */
    bool empty = true;
    for (size_t i = 0; i < n; i++) {
        const PageItem *it = &items[i];
        if (it->break_before && !empty) {
            page++;
            y = 0;
            empty = true;
        }
        double before = empty ? 0 : it->space_before;
        double need = it->keep_with_next ? chain_height(items, n, i) : it->height;
        if (!empty && y + before + need > body_height + 1e-6) {
            /* a chain that would not fit even on a fresh sheet is not pushed */
            if (!(it->keep_with_next && need > body_height && y + before + it->height <= body_height)) {
                page++;
                y = 0;
                empty = true;
                before = 0;
            }
        }
        out[i].page = page;
        out[i].y = y + before;
        y += before + it->height;
        empty = false;
    }
    return page + 1;
}
