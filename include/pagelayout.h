/* pagelayout.h — assigning measured items to sheets.
 *
 * The report is laid out before anything is drawn, so every sheet can say
 * "Sheet N of M". The renderer measures each item (a heading, a paragraph, a
 * calc row, a table) and this pass, which knows nothing of fonts or PDF,
 * decides where each one goes: an item is never split, space above an item
 * is dropped at the top of a sheet, and a heading (keep_with_next) never
 * ends a sheet. The caller owns both arrays. */
#ifndef HEADROOM_PAGELAYOUT_H
#define HEADROOM_PAGELAYOUT_H

#include <stdbool.h>
#include <stddef.h>

typedef struct PageItem {
    double height;         /* the item itself, in points */
    double space_before;   /* blank space above it, dropped at the top of a sheet */
    bool keep_with_next;   /* must share a sheet with the item after it */
    bool break_before;     /* starts a new sheet */
} PageItem;

typedef struct PagePlace {
    int page;              /* 0-based sheet of the flow */
    double y;              /* top of the item, measured down from the top of the body area */
} PagePlace;

/* Place items[0..n) on sheets whose body area is `body_height` tall.
 * Returns the number of sheets used (at least 1). An item taller than a
 * sheet gets a sheet of its own. */
int pagelayout_assign(const PageItem *items, size_t n, double body_height, PagePlace *out);

#endif
