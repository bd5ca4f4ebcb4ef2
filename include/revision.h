/* revision.h — one side of a diff: a file, or a file at a git revision.
 *
 * `REV:path` is read from git's object store (git runs from an argv array,
 * never through a shell). A name that exists as a file is always the file,
 * so `a:b.calc.md` on disk is read from disk; write `./a:b.calc.md` to make
 * that plain. The Document is the caller's, freed with doc_free(). */
#ifndef HEADROOM_REVISION_H
#define HEADROOM_REVISION_H

#include "doc.h"

/* NULL when the file or the revision cannot be read (reported in diags as
 * an error without a line). */
Document *revision_load(const char *arg, DiagList *diags);

#endif
