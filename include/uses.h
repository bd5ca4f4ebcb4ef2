/* uses.h — calc files read by other calc files: NAME = use("file.calc.md").
 *
 * A UseSet is one run's cache of used calcs (DESIGN 2.13). Each used file,
 * keyed by device and inode (or by REV:path when the using calc came from a
 * git revision), is read and evaluated once however many statements and
 * package parts use it. Its values are bound as a record of type "calc"
 * whose `native` is the UsedFile, so renderers can name the file and its
 * digest. The set owns every used Document and its diagnostics until
 * use_set_free(), and records that point into them must not outlive it. The
 * chain of files being evaluated is kept so a cycle is named, and the depth,
 * the number of files and their bytes are bounded (include/bounds.h). */
#ifndef HEADROOM_USES_H
#define HEADROOM_USES_H

#include <stdbool.h>
#include <stddef.h>

#include "bounds.h"
#include "doc.h"
#include "eval.h"

typedef struct UsedFile {
    char *key;               /* "dev:ino", or "git:REV:path" */
    const char *file;        /* display name: the path as opened (relative to the directory of the run) */
    Document *doc;
    Evaluated *ev;
    DiagList diags;          /* its own diagnostics, and those of files it uses */
    Value record;            /* the bound record (a "calc" record), when it has no errors */
    bool busy;               /* being evaluated: it is on the chain */
    bool reported;           /* its diagnostics were passed to a using document */
} UsedFile;

typedef struct UseSet {
    UsedFile **files;        /* in order of first use */
    size_t nfiles, cap;
    const char *chain_key[USE_MAX_DEPTH + 2];   /* the documents being evaluated, outermost first */
    const char *chain_file[USE_MAX_DEPTH + 2];
    size_t depth;
    size_t bytes;            /* source bytes of every used file read so far */
} UseSet;

UseSet *use_set_new(void);
void use_set_free(UseSet *set);

/* Push the document about to be evaluated on the chain (its key from its
 * file: device and inode, or git:REV:path); pop it after. */
void use_set_enter(UseSet *set, const Document *doc);
void use_set_leave(UseSet *set);

/* Resolve `arg` (as written in `from` at `at`) relative to `from`'s file,
 * read and evaluate it once, and return its entry; NULL after reporting why
 * (missing file at the string, a cycle naming it, a limit, errors in the
 * used file). The used file's own diagnostics go to `diags` the first time
 * it is used, at its own lines. */
const UsedFile *use_set_resolve(UseSet *set, const Document *from, const char *arg, Pos at,
                                DiagList *diags);

/* `arg` relative to the directory of `from`: "riser.calc.md" written in
 * examples/hotel/index.calc.md is examples/hotel/riser.calc.md; an absolute
 * path stays as it is; a document read as REV:path resolves inside the same
 * revision (REV:dir/arg). The caller frees the string. */
char *use_path_resolve(const Document *from, const char *arg);

/* The entry itself, read and evaluated once, even when it has errors (a
 * package's parts are opened this way, so a part another part uses is one
 * evaluation); NULL after reporting a missing file, a cycle or a limit at
 * `at`. Its diagnostics stay in the entry. */
UsedFile *use_set_open(UseSet *set, const Document *from, const char *arg, Pos at, DiagList *diags);

/* The UsedFile behind a "calc" record, or NULL. */
const UsedFile *use_of_record(const Record *r);

#endif
