/* roughness.h — absolute wall roughness of common pipe materials.
 *
 * One table (src/methods/roughness.c), one source per row, values in metres.
 * Names match case-insensitively, with a few aliases ("steel" is commercial
 * steel; "galvanized" and "galvanised" are galvanised steel). Nothing here
 * allocates or prints; returned pointers are into the static table. */
#ifndef HEADROOM_METHODS_ROUGHNESS_H
#define HEADROOM_METHODS_ROUGHNESS_H

#include <stddef.h>

typedef struct RoughnessRow {
    const char *name;          /* canonical name: "commercial steel" */
    const char *aliases;       /* '|'-separated other spellings, or "" */
    double eps;                /* absolute roughness, m */
    const char *source;        /* the published source of the value */
} RoughnessRow;

typedef enum RoughnessStatus { ROUGHNESS_OK, ROUGHNESS_UNKNOWN } RoughnessStatus;

RoughnessStatus roughness_lookup(const char *material, const RoughnessRow **out);
size_t roughness_count(void);
const RoughnessRow *roughness_row(size_t i);
/* "drawn tubing, copper, PVC, ..." for an error message. */
void roughness_list(char *buf, size_t n);

#endif
