/* frontmatter.h — the YAML block at the top of a calc file (DESIGN 2.1).
 *
 * Only the front matter stage includes libyaml. Unknown keys and malformed
 * values are errors at their line; nothing is silently ignored. */
#ifndef HEADROOM_FRONTMATTER_H
#define HEADROOM_FRONTMATTER_H

#include "doc.h"

/* If the text opens with a `---` line, parse up to the closing `---` (or
 * `...`) line into doc->meta and return the number of bytes the block spans
 * (through the closing line's newline); otherwise fill defaults, return 0. */
size_t frontmatter_read(Document *doc, DiagList *diags);

/* The standard atmosphere at elevation z (m above sea level), in Pa:
 * 101.325 kPa * (1 - 2.25577e-5*z/m)^5.25588 (DESIGN 2.9). */
double frontmatter_atmosphere_at(double z);

/* The `status` is one of the issued (sealed) words: issued for permit, for
 * construction, ... (compared without regard to case). */
bool frontmatter_status_issued(const char *status);

/* The accepted `status` words, comma-separated, into buf (for messages). */
void frontmatter_statuses_list(char *buf, size_t size);

#endif
