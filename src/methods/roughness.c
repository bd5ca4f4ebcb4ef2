/* roughness.c — the absolute roughness table.
 *
 * Values are those of new, clean pipe. Moody's chart gives them in feet and
 * they are kept here as he printed them, converted with 1 ft = 0.3048 m
 * exactly. Every row was checked against two published copies of Moody's
 * table: eFunda, "Absolute Pipe Roughness" (from Binder 1973: drawn brass
 * and drawn copper 5e-6 ft, commercial steel and wrought iron 150e-6,
 * asphalted cast iron 400e-6, galvanized iron 500e-6, cast iron 850e-6,
 * concrete 1000e-6 to 10,000e-6 ft) and Piping Designer, "Absolute
 * Roughness" ("drawn tubing (glass, brass, plastic) 0.000005 ft", and the
 * same steel, iron and concrete figures); tests/unit/test_pipes.c holds
 * each row to them, tests/ref/pipes-fluids.sh to python3-fluids. Aged pipe
 * is rougher, often much rougher; the table says nothing about ageing. A
 * cement-mortar lining has no row: no published value for it could be
 * read. */
#include "methods/roughness.h"

#include <ctype.h>
#include <stdbool.h>
#include <stdio.h>
#include <string.h>

#define FT 0.3048
#define MOODY "Moody, L. F. (1944). Friction factors for pipe flow. Trans. ASME 66(8), 671-684, Fig. 2"

/* Source of every row is named beside it. Where Moody gives a range the
 * row says which end is used. */
static const RoughnessRow ROWS[] = {
    {"drawn tubing", "drawn", 0.000005 * FT, MOODY " (drawn tubing, 0.000005 ft)"},
    {"copper", "drawn copper|brass|copper tube", 0.000005 * FT,
     MOODY " (drawn tubing, 0.000005 ft; copper tube is drawn tubing)"},
    {"plastic", "PVC|plastics|CPVC|PEX|PE|HDPE|polyethylene", 0.000005 * FT,
     MOODY " (drawn tubing, 0.000005 ft; Piping Designer, Absolute Roughness, lists plastic "
     "with drawn tubing)"},
    {"commercial steel", "steel|wrought iron|carbon steel|black steel", 0.00015 * FT,
     MOODY " (commercial steel or wrought iron, 0.00015 ft)"},
    {"galvanised steel", "galvanized|galvanised|galvanized steel|galvanized iron|galvanised iron",
     0.0005 * FT, MOODY " (galvanised iron, 0.0005 ft)"},
    {"asphalted cast iron", "asphalt-dipped cast iron", 0.0004 * FT,
     MOODY " (asphalted cast iron, 0.0004 ft)"},
    {"cast iron", "grey iron|gray iron", 0.00085 * FT, MOODY " (cast iron, 0.00085 ft)"},
    {"concrete", "", 0.001 * FT, MOODY " (concrete 0.001-0.01 ft; the smooth end is used)"},
};

enum { NROWS = sizeof ROWS / sizeof ROWS[0] };

size_t roughness_count(void) { return NROWS; }
const RoughnessRow *roughness_row(size_t i) { return i < NROWS ? &ROWS[i] : NULL; }

/* Compare ignoring case and treating runs of spaces, '-' and '_' alike. */
static bool same_words(const char *a, size_t alen, const char *b, size_t blen)
{
    size_t i = 0, j = 0;
    for (;;) {
        while (i < alen && (a[i] == ' ' || a[i] == '-' || a[i] == '_'))
            i++;
        while (j < blen && (b[j] == ' ' || b[j] == '-' || b[j] == '_'))
            j++;
        if (i == alen || j == blen)
            return i == alen && j == blen;
        if (tolower((unsigned char)a[i]) != tolower((unsigned char)b[j]))
            return false;
        i++, j++;
    }
}

RoughnessStatus roughness_lookup(const char *material, const RoughnessRow **out)
{
    size_t mlen = strlen(material);
    for (size_t i = 0; i < NROWS; i++) {
        if (same_words(material, mlen, ROWS[i].name, strlen(ROWS[i].name))) {
            *out = &ROWS[i];
            return ROUGHNESS_OK;
        }
    }
    for (size_t i = 0; i < NROWS; i++) {
        const char *p = ROWS[i].aliases;
        while (*p) {
            const char *bar = strchr(p, '|');
            size_t len = bar ? (size_t)(bar - p) : strlen(p);
            if (same_words(material, mlen, p, len)) {
                *out = &ROWS[i];
                return ROUGHNESS_OK;
            }
            p += len + (bar ? 1 : 0);
        }
    }
    return ROUGHNESS_UNKNOWN;
}

void roughness_list(char *buf, size_t n)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < NROWS && len < n; i++) {
        int w = snprintf(buf + len, n - len, "%s\"%s\"", i ? ", " : "", ROWS[i].name);
        if (w < 0)
            break;
        len += (size_t)w;
    }
}
