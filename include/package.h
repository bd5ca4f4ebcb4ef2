/* package.h — a calc package: an index calc and the parts it lists.
 *
 * An index is a calc file whose front matter has `parts:` (DESIGN 2.13): a
 * list of calc files relative to the index. Loading a package reads and
 * evaluates every part with one shared UseSet, so a basis of design used by
 * every part is read and evaluated once, and collects the package's totals
 * for the combined summary and exit status. A calc that a part uses shares
 * the part's fate: its failing checks count for the package, since a part's
 * result rests on it. Parts are opened through the set, so a part that
 * another part uses is one evaluation. The Package owns the set (and with it
 * the parts); the index Document stays the caller's. */
#ifndef HEADROOM_PACKAGE_H
#define HEADROOM_PACKAGE_H

#include <stdbool.h>
#include <stddef.h>

#include "doc.h"
#include "eval.h"
#include "uses.h"

typedef struct PackagePart {
    const char *file;        /* the part's path as opened (relative to the run's directory) */
    Document *doc;           /* NULL when it cannot be read; owned by the set */
    Evaluated *ev;
    const DiagList *diags;   /* its diagnostics (and those of files it used first) */
} PackagePart;

typedef struct Package {
    Document *index;
    Evaluated *index_ev;
    UseSet *uses;
    PackagePart *parts;
    size_t nparts;
    const UsedFile **extra;  /* files used by parts that are not parts themselves */
    size_t nextra;
    size_t errors;           /* input errors over the index, the parts and what they use */
    bool io_error;           /* a part could not be read */
    size_t nchecks, nfailed; /* over the parts and the extra used files */
    size_t case_rows_failing;
} Package;

/* Does the document name parts (a package index)? */
bool package_is_index(const Document *doc);

/* Evaluate the index (its own diagnostics go to `index_diags`) and every
 * part in order. A part that is missing, repeated, the index itself or
 * another index is an error at its entry of `parts:`. */
Package *package_load(Document *index, DiagList *index_diags);
void package_free(Package *pkg);

/* The part whose document is `doc`, or -1. */
int package_part_of(const Package *pkg, const Document *doc);

/* The part listed in `parts:` as `entry` (as written), or -1. */
int package_find_part(const Package *pkg, const char *entry);

/* Every diagnostic of the index, the parts and what they use, each once. */
void package_diags(const Package *pkg, const DiagList *index_diags, DiagList *out);

#endif
