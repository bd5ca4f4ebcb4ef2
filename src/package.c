/* package.c — loading a calc package: the index, then every part.
 *
 * The parts are evaluated in the order the index lists them, all with one
 * UseSet, so a file used by several parts (the basis of design) is read and
 * evaluated once, and a part that another part uses is the same evaluation
 * in both places. Totals for the combined summary count each part's checks
 * and those of every file a part uses that is not a part itself (counted
 * once), since a part's verdicts rest on what it uses. */
#include "package.h"

#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "revision.h"

bool package_is_index(const Document *doc)
{
    return doc && doc->meta.has_parts;
}

static bool same_file(const char *a, const char *b)
{
    struct stat sa, sb;
    if (stat(a, &sa) != 0 || stat(b, &sb) != 0)
        return strcmp(a, b) == 0;
    return sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino;
}

int package_part_of(const Package *pkg, const Document *doc)
{
    for (size_t i = 0; i < pkg->nparts; i++)
        if (pkg->parts[i].doc == doc)
            return (int)i;
    return -1;
}

int package_find_part(const Package *pkg, const char *entry)
{
    for (size_t i = 0; i < pkg->nparts; i++)
        if (strcmp(pkg->index->meta.parts[i].file, entry) == 0)
            return (int)i;
    return -1;
}

/* Open one part through the set; false (with the error at its entry of
 * `parts:`) when it cannot be a part. */
static bool load_part(Package *pkg, PackagePart *pp, const Part *entry, DiagList *index_diags)
{
    char *path = use_path_resolve(pkg->index, entry->file);
    bool self = !pkg->index->from_git && same_file(path, pkg->index->file);
    free(path);
    if (self) {
        diag_error(index_diags, entry->pos, "'%s' is the index itself; a part is another calc file",
                   entry->file);
        return false;
    }
    UsedFile *u = use_set_open(pkg->uses, pkg->index, entry->file, entry->pos, index_diags);
    if (!u)
        return false;
    for (PackagePart *q = pkg->parts; q < pp; q++)
        if (q->doc == u->doc) {
            diag_error(index_diags, entry->pos, "'%s' is listed twice in 'parts'", entry->file);
            return false;
        }
    u->reported = true; /* printed as the part's own */
    pp->doc = u->doc;
    pp->ev = u->ev;
    pp->file = u->file;
    pp->diags = &u->diags;
    if (package_is_index(pp->doc)) {
        diag_error(index_diags, entry->pos, "part '%s' is itself a package index; list its parts here "
                                            "instead", entry->file);
        return false;
    }
    return true;
}

/* A diagnostic a file holds as a copy of one in a file it used (it is
 * counted and printed with that file). */
static bool diag_is_copy(const Package *pkg, const UsedFile *u, const Diag *d)
{
    (void)pkg;
    return u->doc && d->pos.file && strcmp(d->pos.file, u->doc->file) != 0;
}

static void count_checks(Package *pkg, const Evaluated *ev)
{
    pkg->nchecks += ev->nchecks;
    pkg->nfailed += ev->nfailed;
    pkg->case_rows_failing += ev->case_rows_failing;
}

/* Files the parts use that are not parts: their checks count once. */
static void collect_extra(Package *pkg)
{
    pkg->extra = xcalloc(pkg->uses->nfiles + 1, sizeof *pkg->extra);
    for (size_t i = 0; i < pkg->uses->nfiles; i++) {
        const UsedFile *u = pkg->uses->files[i];
        if (!u->doc || !u->ev)
            continue;
        bool is_part = false;
        for (size_t k = 0; k < pkg->nparts && !is_part; k++)
            is_part = pkg->parts[k].doc == u->doc;
        if (!is_part) {
            pkg->extra[pkg->nextra++] = u;
            count_checks(pkg, u->ev);
        }
    }
}

Package *package_load(Document *index, DiagList *index_diags)
{
    Package *pkg = xcalloc(1, sizeof *pkg);
    pkg->index = index;
    pkg->uses = use_set_new();
    pkg->index_ev = eval_document_in(index, pkg->uses, index_diags);
    if (index->nstmts > 0)
        diag_error(index_diags, index->stmts[0]->pos,
                   "a package index lists parts and carries no calc statements of its own; move "
                   "them into a part");
    pkg->parts = xcalloc(index->meta.nparts + 1, sizeof *pkg->parts);
    pkg->nparts = index->meta.nparts;
    if (index->meta.nparts == 0 && index_diags->errors == 0)
        diag_error(index_diags, ((Pos){index->file, 1, 1}), "the package index lists no parts");
    /* The index stays on the chain while the parts are evaluated, so a part
     * that uses the index is a named cycle. */
    use_set_enter(pkg->uses, index);
    for (size_t i = 0; i < pkg->nparts; i++) {
        PackagePart *pp = &pkg->parts[i];
        if (load_part(pkg, pp, &index->meta.parts[i], index_diags))
            count_checks(pkg, pp->ev);
        else
            pp->doc = NULL, pp->ev = NULL, pp->diags = NULL;
    }
    use_set_leave(pkg->uses);
    collect_extra(pkg);
    /* every error once: the index's and every file's of the set */
    pkg->errors = index_diags->errors;
    for (size_t i = 0; i < pkg->uses->nfiles; i++)
        for (size_t k = 0; k < pkg->uses->files[i]->diags.len; k++)
            pkg->errors += pkg->uses->files[i]->diags.items[k].severity == SEV_ERROR &&
                           !diag_is_copy(pkg, pkg->uses->files[i], &pkg->uses->files[i]->diags.items[k]);
    return pkg;
}

void package_diags(const Package *pkg, const DiagList *index_diags, DiagList *out)
{
    for (size_t i = 0; i < index_diags->len; i++)
        diag_add(out, index_diags->items[i].severity, index_diags->items[i].pos, "%s",
                 index_diags->items[i].message);
    for (size_t i = 0; i < pkg->uses->nfiles; i++) {
        const UsedFile *u = pkg->uses->files[i];
        for (size_t k = 0; k < u->diags.len; k++)
            if (!diag_is_copy(pkg, u, &u->diags.items[k]))
                diag_add(out, u->diags.items[k].severity, u->diags.items[k].pos, "%s",
                         u->diags.items[k].message);
    }
}

void package_free(Package *pkg)
{
    if (!pkg)
        return;
    free(pkg->parts);
    free(pkg->extra);
    use_set_free(pkg->uses);
    free(pkg);
}
