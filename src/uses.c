/* uses.c — reading, evaluating and caching the calc files a calc uses.
 *
 * A used file is found relative to the file that uses it, read once per run
 * (keyed by device and inode, so two spellings of one file share an entry),
 * evaluated with the same set so its own uses are shared too, and bound as a
 * record of its defined names. Evaluation is recursive, so the set keeps the
 * chain of documents being evaluated: a file already on the chain closes a
 * cycle, reported with every file of the cycle in order, and the chain, the
 * number of files and their bytes are bounded by include/bounds.h. A calc
 * from a git revision (REV:path) uses files of the same revision, read from
 * git beside it. */
#include "uses.h"

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "load.h"
#include "revision.h"

UseSet *use_set_new(void)
{
    return xcalloc(1, sizeof(UseSet));
}

void use_set_free(UseSet *set)
{
    if (!set)
        return;
    for (size_t i = 0; i < set->nfiles; i++) {
        UsedFile *u = set->files[i];
        diag_free(&u->diags);
        doc_free(u->doc);
        free(u->key);
        free(u);
    }
    free(set->files);
    free(set);
}

/* The key of a file on disk; NULL when it cannot be stat'ed. */
static char *file_key(const char *path)
{
    struct stat st;
    if (stat(path, &st) != 0)
        return NULL;
    char buf[64];
    snprintf(buf, sizeof buf, "%llu:%llu", (unsigned long long)st.st_dev,
             (unsigned long long)st.st_ino);
    return xstrdup(buf);
}

static char *doc_key(const Document *doc)
{
    if (doc->from_git) {
        size_t n = strlen(doc->file) + 5;
        char *k = xmalloc(n);
        snprintf(k, n, "git:%s", doc->file);
        return k;
    }
    if (strcmp(doc->file, "<stdin>") == 0)
        return NULL;
    return file_key(doc->file);
}

void use_set_enter(UseSet *set, const Document *doc)
{
    if (set->depth < USE_MAX_DEPTH + 2) {
        set->chain_key[set->depth] = doc_key(doc);
        set->chain_file[set->depth] = doc->file;
    }
    set->depth++;
}

void use_set_leave(UseSet *set)
{
    if (set->depth == 0)
        return;
    set->depth--;
    if (set->depth < USE_MAX_DEPTH + 2) {
        free((char *)set->chain_key[set->depth]);
        set->chain_key[set->depth] = NULL;
    }
}

char *use_path_resolve(const Document *from, const char *arg)
{
    const char *base = from->file;
    const char *rev_end = NULL;
    if (from->from_git) {
        rev_end = strchr(base, ':');
        base = rev_end ? rev_end + 1 : base;
    }
    size_t rev_len = rev_end ? (size_t)(rev_end - from->file) + 1 : 0;
    const char *slash = strrchr(base, '/');
    size_t dir_len = (arg[0] == '/' || strcmp(from->file, "<stdin>") == 0 || !slash)
                         ? 0
                         : (size_t)(slash - base) + 1;
    while (strncmp(arg, "./", 2) == 0)
        arg += 2;
    size_t n = rev_len + dir_len + strlen(arg) + 1;
    char *out = xmalloc(n);
    memcpy(out, from->file, rev_len);
    memcpy(out + rev_len, base, dir_len);
    strcpy(out + rev_len + dir_len, arg);
    return out;
}

/* "a.calc.md → b.calc.md → a.calc.md": the chain from the entry at `from`. */
static void describe_cycle(const UseSet *set, size_t from, const char *closing, char *buf, size_t n)
{
    size_t len = 0;
    buf[0] = '\0';
    for (size_t i = from; i < set->depth && i < USE_MAX_DEPTH + 2 && len + 1 < n; i++)
        len += (size_t)snprintf(buf + len, n - len, "%s → ", set->chain_file[i]);
    if (len + 1 < n)
        snprintf(buf + len, n - len, "%s", closing);
}

static UsedFile *find(const UseSet *set, const char *key)
{
    for (size_t i = 0; i < set->nfiles; i++)
        if (strcmp(set->files[i]->key, key) == 0)
            return set->files[i];
    return NULL;
}

/* The record of a used calc: every name it defines, in order, each number
 * keeping the unit the used calc shows it in. */
static void bind_record(UsedFile *u)
{
    const Document *d = u->doc;
    size_t n = 0;
    for (size_t i = 0; i < d->nstmts; i++)
        n += d->stmts[i]->name && u->ev->results[i].state == RES_OK;
    Record *rec = record_new(&u->doc->arena, "calc", n);
    size_t k = 0;
    for (size_t i = 0; i < d->nstmts; i++) {
        const Stmt *s = d->stmts[i];
        const StmtResult *r = &u->ev->results[i];
        if (!s->name || r->state != RES_OK)
            continue;
        Value v = r->value;
        if (v.kind == VAL_NUMBER && r->shown->text[0]) {
            v.hint[UNITS_US] = r->shown->text;
            v.hint[UNITS_SI] = r->shown->text;
        }
        record_set(rec, k++, s->name, v);
    }
    rec->native = u;
    u->record = (Value){.kind = VAL_RECORD, .rec = rec};
}

const UsedFile *use_of_record(const Record *r)
{
    return r && r->type && strcmp(r->type, "calc") == 0 ? r->native : NULL;
}

/* Pass the used file's diagnostics to the first document that uses it. */
static void report_once(UsedFile *u, DiagList *diags)
{
    if (u->reported)
        return;
    u->reported = true;
    for (size_t i = 0; i < u->diags.len; i++)
        diag_add(diags, u->diags.items[i].severity, u->diags.items[i].pos, "%s",
                 u->diags.items[i].message);
}

/* Read and evaluate a new entry. */
static void load(UseSet *set, UsedFile *u, const char *path)
{
    u->doc = u->key[0] == 'g' ? revision_load(path, &u->diags) : doc_load(path, &u->diags);
    if (!u->doc)
        return;
    u->file = u->doc->file;
    set->bytes += u->doc->len;
    u->busy = true;
    u->ev = eval_document_in(u->doc, set, &u->diags);
    u->busy = false;
    if (u->diags.errors == 0)
        bind_record(u);
}

UsedFile *use_set_open(UseSet *set, const Document *from, const char *arg, Pos at, DiagList *diags)
{
    char *path = use_path_resolve(from, arg);
    char *key = NULL;
    if (from->from_git) {
        size_t n = strlen(path) + 5;
        key = xmalloc(n);
        snprintf(key, n, "git:%s", path);
    } else {
        key = file_key(path);
    }
    UsedFile *u = NULL;
    char cyc[1024];
    if (!key) {
        if (strcmp(path, arg) == 0)
            diag_error(diags, at, "cannot use '%s': %s", arg, strerror(errno));
        else
            diag_error(diags, at, "cannot use '%s': %s (looked for %s)", arg, strerror(errno), path);
        goto done;
    }
    for (size_t i = 0; i < set->depth && i < USE_MAX_DEPTH + 2; i++)
        if (set->chain_key[i] && strcmp(set->chain_key[i], key) == 0) {
            describe_cycle(set, i, set->chain_file[i], cyc, sizeof cyc);
            diag_error(diags, at, "a cycle of uses: %s", cyc);
            goto done;
        }
    u = find(set, key);
    if (!u) {
        if (set->depth > USE_MAX_DEPTH) {
            diag_error(diags, at, "uses nest deeper than the limit of %d files", USE_MAX_DEPTH);
            goto done;
        }
        if (set->nfiles >= USE_MAX_FILES) {
            diag_error(diags, at, "more than the limit of %d used files in one run", USE_MAX_FILES);
            goto done;
        }
        if (set->bytes > USE_MAX_BYTES) {
            diag_error(diags, at, "used files total more than the limit of %d bytes", USE_MAX_BYTES);
            goto done;
        }
        u = xcalloc(1, sizeof *u);
        u->key = key;
        key = NULL;
        if (set->nfiles == set->cap) {
            set->cap = set->cap ? set->cap * 2 : 8;
            set->files = xrealloc(set->files, set->cap * sizeof *set->files);
        }
        set->files[set->nfiles++] = u;
        load(set, u, path);
    }
    if (!u->doc) {
        /* unreadable: say why at the string, at every use */
        diag_error(diags, at, "cannot use '%s': %s", arg,
                   u->diags.len ? u->diags.items[0].message : "cannot be read");
        u = NULL;
    }
done:
    free(key);
    free(path);
    return u;
}

const UsedFile *use_set_resolve(UseSet *set, const Document *from, const char *arg, Pos at,
                                DiagList *diags)
{
    UsedFile *u = use_set_open(set, from, arg, at, diags);
    if (!u)
        return NULL;
    report_once(u, diags);
    if (u->diags.errors) {
        /* Name a cycle the used file closes, so the using line names it too. */
        const char *cycle = NULL;
        for (size_t i = 0; i < u->diags.len && !cycle; i++)
            if (strncmp(u->diags.items[i].message, "a cycle of uses: ", 17) == 0)
                cycle = u->diags.items[i].message;
        if (cycle)
            diag_error(diags, at, "cannot use '%s': %s", u->file, cycle);
        else
            diag_error(diags, at, "cannot use '%s': it has %zu error%s (reported at its lines)",
                       u->file, u->diags.errors, u->diags.errors == 1 ? "" : "s");
        return NULL;
    }
    return u;
}
