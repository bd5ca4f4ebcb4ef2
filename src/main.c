/* main.c — the command line: check, build, diff, convert.
 *
 * Each command chains the stages in one short function: load (source ->
 * document tree) -> evaluate -> render. Diagnostics collected by every stage
 * are printed here, and only here, with the source line and a caret. Reports
 * are written to a temporary file beside the target and renamed into place,
 * so a failed run never leaves a half-written report.
 *
 * Exit status: 0 done and every check holds; 1 a check fails (build: only
 * with --strict); 2 the input has errors; 3 an I/O or internal failure. */
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "diff.h"
#include "doc.h"
#include "eval.h"
#include "load.h"
#include "lsp.h"
#include "numfmt.h"
#include "outfile.h"
#include "package.h"
#include "parse.h"
#include "render.h"
#include "revision.h"
#include "uses.h"
#include "watch.h"

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

enum { EXIT_HOLDS = 0, EXIT_CHECK_FAILS = 1, EXIT_INPUT = 2, EXIT_IO = 3 };

static const char usage_text[] =
    "usage: headroom COMMAND [ARGS]\n"
    "\n"
    "  headroom check FILE... [--format text|json|junit|sarif|github] [--json]\n"
    "      evaluate; print diagnostics and a summary of the checks\n"
    "  headroom build FILE [-o OUT] [--format pdf|text|json] [--strict] [--since OLD]\n"
    "      write the report (default: FILE without .md/.calc, plus .pdf)\n"
    "  headroom new KIND [FILE]  |  headroom new package DIR\n"
    "      write a commented starter calc (riser, pump-line, pipe-rating) or package\n"
    "  headroom diff OLD NEW [--json] [--rel-tol X]\n"
    "      what changed in meaning between two revisions (a file or REV:path)\n"
    "  headroom watch FILE [-o OUT]\n"
    "      build the PDF report again whenever the file is saved\n"
    "  headroom lsp\n"
    "      a Language Server Protocol server on standard input and output\n"
    "  headroom convert \"VALUE UNIT\" UNIT\n"
    "      convert a value between units (10 significant digits)\n"
    "  headroom --help | --version\n"
    "\n"
    "Exit status: 0 every check holds; 1 a check fails (build: with --strict);\n"
    "2 the input has errors (nothing is written); 3 an I/O or internal failure.\n"
    "FILE may be '-' for standard input. NO_COLOR turns off colour.\n";

/* The first failure to write standard output, for main() to report once. */
static int stdout_errno;

/* Flush standard output; false (and the error kept) when a write failed. */
static bool stdout_ok(void)
{
    errno = 0;
    if (fflush(stdout) != 0 || ferror(stdout)) {
        if (!stdout_errno)
            stdout_errno = errno ? errno : EIO;
        return false;
    }
    return true;
}

/* A command-line word or file name as it may be echoed: control and
 * bidirectional-control characters escaped (diag_print_escaped), so a name
 * never drives the terminal. A ring of buffers, so one message can show
 * several; long words are cut at 255 bytes. */
static const char *shown(const char *s)
{
    static char ring[8][256];
    static unsigned next;
    char *buf = ring[next++ % 8];
    FILE *m = fmemopen(buf, sizeof ring[0], "w");
    if (!m)
        return "?";
    setvbuf(m, NULL, _IONBF, 0);
    diag_print_escaped(m, s);
    fclose(m);
    buf[sizeof ring[0] - 1] = '\0';
    return buf;
}

static bool use_color(void)
{
    const char *nc = getenv("NO_COLOR");
    return !(nc && nc[0]) && isatty(fileno(stderr));
}

/* Diagnostics of a calc and of the files it used (in `set`), each shown
 * with the line of its own file. */
static void print_diags_in(DiagList *dl, const Document *doc, const UseSet *set)
{
    diag_sort(dl);
    size_t n = 1 + (set ? set->nfiles : 0), k = 0;
    DiagSource *src = calloc(n, sizeof *src);
    if (!src)
        return;
    if (doc)
        src[k++] = (DiagSource){doc->file, doc->text, doc->len};
    for (size_t i = 0; set && i < set->nfiles; i++)
        if (set->files[i]->doc)
            src[k++] = (DiagSource){set->files[i]->file, set->files[i]->doc->text,
                                    set->files[i]->doc->len};
    diag_print_sources(stderr, dl, src, k, use_color());
    free(src);
}

static void print_diags(DiagList *dl, const Document *doc)
{
    print_diags_in(dl, doc, doc ? doc->own_uses : NULL);
}



/* Where `build` writes by default: riser.calc.md -> riser.pdf. */
static char *default_output(const char *in, const char *ext)
{
    size_t n = strlen(in);
    const char *suffixes[] = {".calc.md", ".md", ".calc"};
    for (size_t i = 0; i < 3; i++) {
        size_t k = strlen(suffixes[i]);
        if (n > k && strcmp(in + n - k, suffixes[i]) == 0) {
            n -= k;
            break;
        }
    }
    char *out = malloc(n + strlen(ext) + 1);
    if (!out)
        return NULL;
    memcpy(out, in, n);
    strcpy(out + n, ext);
    return out;
}

/* ---- check ---------------------------------------------------------------- */

typedef enum CheckFormat { CHK_TEXT, CHK_JSON, CHK_JUNIT, CHK_SARIF, CHK_GITHUB } CheckFormat;

static const char check_help[] =
    "usage: headroom check FILE... [--format text|json|junit|sarif|github] [--json]\n"
    "Evaluate each calc file, print diagnostics and the checks. A package\n"
    "index (front matter with parts:) checks every part, then prints the\n"
    "package's combined summary.\n"
    "--format picks what goes to standard output: text (the default: one line\n"
    "per check), json (the results; --json is the same), junit (JUnit XML, one\n"
    "test case per check), sarif (SARIF 2.1.0) or github (workflow annotations).\n"
    "Diagnostics with the source line and a caret always go to standard error.\n"
    "Exit 0 when every check holds, 1 when one fails, 2 on input errors.\n";

static void print_check_text(const Evaluated *ev, const DiagList *dl)
{
    const Document *doc = ev->doc;
    if (ev->case_rows_failing)
        printf("%s: checks fail in %zu case row%s\n", shown(doc->file), ev->case_rows_failing,
               ev->case_rows_failing == 1 ? "" : "s");
    printf("%s: %zu check%s, %zu hold%s, %zu fail%s%s\n", shown(doc->file), ev->nchecks,
           ev->nchecks == 1 ? "" : "s", ev->nchecks - ev->nfailed,
           ev->nchecks - ev->nfailed == 1 ? "s" : "", ev->nfailed, ev->nfailed == 1 ? "s" : "",
           dl->errors ? " (input has errors)" : "");
    for (size_t i = 0; i < doc->nstmts; i++) {
        const Stmt *s = doc->stmts[i];
        const StmtResult *r = &ev->results[i];
        if (s->kind == STMT_CHECK && s->finding && r->state == RES_OK) {
            printf("  %-5s %s (finding)\n", r->holds ? "yes" : "no", s->label);
        } else if (s->kind == STMT_CHECK && r->state == RES_OK) {
            char u[32] = "n/a";
            if (isfinite(r->utilization))
                num_sig(r->utilization, 3, u, sizeof u);
            printf("  %-5s %s (utilisation %s)\n", r->holds ? "holds" : "FAILS", s->label, u);
        }
    }
}

static int worse(int a, int b)
{
    return a > b ? a : b;
}

/* Every diagnostic of a package once, each with its own file's lines. */
static void print_package_diags(const Package *pkg, const DiagList *index_dl)
{
    DiagList all = {0};
    package_diags(pkg, index_dl, &all);
    print_diags_in(&all, pkg->index, pkg->uses);
    diag_free(&all);
}

/* check INDEX: every part, then the package's combined summary. The parts
 * join `evs` (for JSON) and `runs` (for the CI formats); the package is
 * kept in `pkgs` until the output is written. */
static int check_package(Document *index, DiagList *dl, CheckFormat fmt, Vec *evs, Vec *runs,
                         Vec *pkgs)
{
    Package *pkg = package_load(index, dl);
    vec_push(pkgs, pkg);
    print_package_diags(pkg, dl);
    for (size_t i = 0; i < pkg->nparts; i++) {
        const PackagePart *pp = &pkg->parts[i];
        if (!pp->ev)
            continue;
        vec_push(evs, pp->ev);
        CheckRun *r = calloc(1, sizeof *r);
        if (r) {
            *r = (CheckRun){pp->file, pp->ev, pp->diags};
            vec_push(runs, r);
        }
        if (fmt == CHK_TEXT)
            print_check_text(pp->ev, pp->diags);
    }
    for (size_t i = 0; i < pkg->nextra && fmt == CHK_TEXT; i++) {
        printf("(used by a part) ");
        print_check_text(pkg->extra[i]->ev, &pkg->extra[i]->diags);
    }
    if (fmt == CHK_TEXT)
        printf("package %s: %zu part%s, %zu check%s, %zu hold%s, %zu fail%s%s\n", index->file,
               pkg->nparts, pkg->nparts == 1 ? "" : "s", pkg->nchecks, pkg->nchecks == 1 ? "" : "s",
               pkg->nchecks - pkg->nfailed, pkg->nchecks - pkg->nfailed == 1 ? "s" : "",
               pkg->nfailed, pkg->nfailed == 1 ? "s" : "", pkg->errors ? " (input has errors)" : "");
    if (pkg->errors)
        return EXIT_INPUT;
    return pkg->nfailed || pkg->case_rows_failing ? EXIT_CHECK_FAILS : EXIT_HOLDS;
}

static int cmd_check(int argc, char **argv)
{
    CheckFormat fmt = CHK_TEXT;
    size_t nfiles = 0;
    char **files = calloc((size_t)argc + 1, sizeof *files);
    for (int i = 0; i < argc; i++) {
        if (strcmp(argv[i], "--json") == 0) {
            fmt = CHK_JSON;
        } else if (strcmp(argv[i], "--format") == 0 || strncmp(argv[i], "--format=", 9) == 0) {
            const char *f = argv[i][8] == '=' ? argv[i] + 9 : i + 1 < argc ? argv[++i] : "";
            static const char *const names[] = {"text", "json", "junit", "sarif", "github"};
            size_t k = 0;
            while (k < 5 && strcmp(f, names[k]) != 0)
                k++;
            if (k == 5) {
                fprintf(stderr, "headroom check: unknown format '%s' (text, json, junit, sarif or github)\n", shown(f));
                free(files);
                return EXIT_INPUT;
            }
            fmt = (CheckFormat)k;
        } else if (strcmp(argv[i], "--help") == 0) {
            fputs(check_help, stdout);
            free(files);
            return 0;
        } else if (argv[i][0] == '-' && argv[i][1] != '\0') {
            fprintf(stderr, "headroom check: unknown option '%s'\n", shown(argv[i]));
            free(files);
            return EXIT_INPUT;
        } else
            files[nfiles++] = argv[i];
    }
    if (nfiles == 0) {
        fputs("headroom check: no FILE given\n", stderr);
        free(files);
        return EXIT_INPUT;
    }
    int status = EXIT_HOLDS;
    DiagList all = {0};
    Document **docs = calloc(nfiles, sizeof *docs);
    DiagList *dls = calloc(nfiles, sizeof *dls);
    Vec evs = {0}, runs = {0}, pkgs = {0};  /* runs: CheckRun *, owned here */
    for (size_t f = 0; f < nfiles; f++) {
        DiagList *dl = &dls[f];
        Document *doc = doc_load(files[f], dl);
        docs[f] = doc;
        CheckRun *run = calloc(1, sizeof *run);
        if (!run)
            break;
        *run = (CheckRun){files[f], NULL, dl};
        if (!doc) {
            vec_push(&runs, run);
            print_diags(dl, NULL);
            status = EXIT_IO;
            continue;
        }
        if (package_is_index(doc) && !dl->errors) {
            free(run);
            status = worse(status, check_package(doc, dl, fmt, &evs, &runs, &pkgs));
            for (size_t i = 0; i < dl->len; i++)
                diag_add(&all, dl->items[i].severity, dl->items[i].pos, "%s", dl->items[i].message);
            continue;
        }
        vec_push(&runs, run);
        Evaluated *ev = eval_document(doc, dl);
        vec_push(&evs, ev);
        run->ev = ev;
        print_diags(dl, doc);
        if (dl->errors) {
            if (status < EXIT_INPUT)
                status = EXIT_INPUT;
        } else if ((ev->nfailed || ev->case_rows_failing) && status == EXIT_HOLDS) {
            status = EXIT_CHECK_FAILS; /* a check failing in a case row fails too */
        }
        if (fmt == CHK_TEXT)
            print_check_text(ev, dl);
        /* Keep diagnostics for the JSON output. */
        for (size_t i = 0; i < dl->len; i++)
            diag_add(&all, dl->items[i].severity, dl->items[i].pos, "%s", dl->items[i].message);
    }
    bool ok = true;
    CheckRun *rv = calloc(runs.len + 1, sizeof *rv);
    for (size_t i = 0; rv && i < runs.len; i++)
        rv[i] = *(CheckRun *)runs.items[i];
    if (fmt == CHK_JSON && evs.len > 0 && !ferror(stdout))
        ok = render_json((const Evaluated *const *)evs.items, &all, evs.len, stdout);
    else if (fmt == CHK_JUNIT)
        ok = rv && render_junit(rv, runs.len, stdout);
    else if (fmt == CHK_SARIF)
        ok = rv && render_sarif(rv, runs.len, stdout);
    else if (fmt == CHK_GITHUB)
        ok = rv && render_github(rv, runs.len, stdout);
    if ((!ok || !stdout_ok()) && status < EXIT_IO)
        status = EXIT_IO;
    diag_free(&all);
    free(rv);
    for (size_t i = 0; i < runs.len; i++)
        free(runs.items[i]);
    vec_free(&runs);
    for (size_t i = 0; i < pkgs.len; i++)
        package_free(pkgs.items[i]);
    vec_free(&pkgs);
    for (size_t f = 0; f < nfiles; f++) {
        diag_free(&dls[f]);
        doc_free(docs[f]);
    }
    free(dls);
    free(docs);
    vec_free(&evs);
    free(files);
    return status;
}

/* ---- build ---------------------------------------------------------------- */

typedef enum Format { FMT_PDF, FMT_TEXT, FMT_JSON } Format;

/* What one `build` writes: a calc, or a package of calcs. */
typedef struct ReportJob {
    const Evaluated *ev;     /* a single calc, else NULL */
    const Package *pkg;      /* a package, else NULL */
    const Diff *since;       /* a calc's changes since an earlier revision (PDF) */
    const Diff *const *part_since;  /* a package's: one per part, NULL for a new part */
    const char *since_label;
    const char *const *inputs; /* the calc and the files it reads: never OUT */
    size_t ninputs;
} ReportJob;

static bool job_stream(const ReportJob *job, Format fmt, DiagList *dl, FILE *f)
{
    if (job->pkg) {
        if (fmt == FMT_TEXT)
            return render_package_text(job->pkg, f);
        Vec evs = {0};
        for (size_t i = 0; i < job->pkg->nparts; i++)
            vec_push(&evs, job->pkg->parts[i].ev);
        bool ok = render_json((const Evaluated *const *)evs.items, dl, evs.len, f);
        vec_free(&evs);
        return ok;
    }
    return fmt == FMT_TEXT ? render_text(job->ev, f) : render_json(&job->ev, dl, 1, f);
}

/* Render into a temporary file, then move it into place: renamed over a
 * regular (or absent) OUT, copied into one that is not a regular file (a
 * device, a FIFO) or into standard output ("-"), which are never replaced.
 * OUT is never one of job->inputs (device and inode). */
static int write_report(const ReportJob *job, Format fmt, const char *out, DiagList *dl)
{
    OutKind kind;
    char why[512];
    if (!outfile_classify(out, job->inputs, job->ninputs, &kind, why, sizeof why)) {
        fprintf(stderr, "headroom: will not write the report: ");
        diag_print_escaped(stderr, why);
        fputc('\n', stderr);
        return EXIT_INPUT;
    }
    if (fmt != FMT_PDF && kind == OUT_STDOUT) {
        bool ok = job_stream(job, fmt, dl, stdout);
        return stdout_ok() && ok ? 0 : EXIT_IO; /* main() names the failure */
    }
    if (fmt == FMT_PDF && kind == OUT_STDOUT && isatty(STDOUT_FILENO)) {
        fputs("headroom: will not write a PDF to a terminal; redirect standard output\n", stderr);
        return EXIT_IO;
    }
    char *tmp = NULL;
    int fd = outfile_temp_create(out, kind, &tmp);
    if (fd < 0) {
        fprintf(stderr, "headroom: cannot create a temporary file for '%s': %s\n", shown(out),
                strerror(errno));
        return EXIT_IO;
    }
    bool ok;
    const char *failed = "render the report";
    int err = 0;
    if (fmt == FMT_PDF) {
        close(fd);
        ok = job->pkg ? render_package_pdf(job->pkg, job->part_since, job->since_label, tmp, dl)
                      : render_pdf_since(job->ev, job->since, job->since_label, tmp, dl);
    } else {
        FILE *f = fdopen(fd, "wb");
        if (!f) {
            err = errno;
            close(fd);
            ok = false;
        } else {
            ok = job_stream(job, fmt, dl, f);
            if (!ok || ferror(f))
                err = errno, ok = false;
            if (fclose(f) != 0 && ok)
                err = errno, ok = false;
        }
        failed = "write";
    }
    if (ok && kind == OUT_REPLACE) {
        /* mkstemp creates 0600; a report gets the usual mode under the umask. */
        mode_t mask = umask(0);
        umask(mask);
        if (chmod(tmp, 0666 & ~mask) != 0 || rename(tmp, out) != 0)
            err = errno, ok = false, failed = "move the report into place as";
    } else if (ok) {
        int to = kind == OUT_STDOUT ? STDOUT_FILENO : open(out, O_WRONLY | O_NOCTTY);
        if (to < 0 || !outfile_copy(tmp, to))
            err = errno, ok = false, failed = "write";
        if (to >= 0 && to != STDOUT_FILENO && close(to) != 0 && ok)
            err = errno, ok = false, failed = "write";
    }
    if (!ok || kind != OUT_REPLACE)
        unlink(tmp);
    outfile_temp_release();
    if (!ok) {
        if (dl->len)
            print_diags(dl, job->ev ? job->ev->doc : job->pkg->index);
        fprintf(stderr, "headroom: failed to %s '%s'%s%s\n", failed,
                kind == OUT_STDOUT ? "standard output" : shown(out), err ? ": " : "",
                err ? strerror(err) : "");
    }
    free(tmp);
    return ok ? 0 : EXIT_IO;
}

/* One revision for diff and build --since: a file or REV:path, evaluated.
 * Its diagnostics are printed; NULL when it cannot be read or has errors. */
static Evaluated *load_revision(const char *arg, DiagList *dl, Document **doc)
{
    Evaluated *ev = NULL;
    *doc = revision_load(arg, dl);
    if (*doc)
        ev = eval_document(*doc, dl);
    print_diags(dl, *doc);
    return *doc && !dl->errors ? ev : NULL;
}

/* The earlier revision of a package for build --since: every part of NEW
 * gets the diff from the part of OLD listed under the same name (NULL: the
 * part is new). NULL with the reason printed when OLD cannot be used. */
static const Diff **package_since(const Package *pkg, const char *since, Package **old_pkg,
                                  Document **old_index, DiagList *old_dl)
{
    *old_index = revision_load(since, old_dl);
    if (*old_index && !old_dl->errors && !package_is_index(*old_index))
        diag_error(old_dl, ((Pos){(*old_index)->file, 1, 1}),
                   "--since of a package needs the earlier index (front matter with parts:)");
    if (!*old_index || old_dl->errors) {
        print_diags(old_dl, *old_index);
        return NULL;
    }
    *old_pkg = package_load(*old_index, old_dl);
    if ((*old_pkg)->errors) {
        print_package_diags(*old_pkg, old_dl);
        return NULL;
    }
    const Diff **d = calloc(pkg->nparts + 1, sizeof *d);
    DiffOptions opt = diff_options_default();
    for (size_t i = 0; d && i < pkg->nparts; i++) {
        int k = package_find_part(*old_pkg, pkg->index->meta.parts[i].file);
        if (k >= 0 && (*old_pkg)->parts[k].ev)
            d[i] = diff_compute((*old_pkg)->parts[k].ev, pkg->parts[i].ev, &opt);
    }
    return d;
}

/* build INDEX: one report of every part, behind the package's cover. */
static int build_package(Document *index, DiagList *dl, Format fmt, const char *file,
                         const char *out, bool strict, const char *since)
{
    Package *pkg = package_load(index, dl);
    Package *old_pkg = NULL;
    Document *old_index = NULL;
    DiagList old_dl = {0};
    const Diff **diffs = NULL;
    bool old_bad = false;
    if (!pkg->errors && since) {
        if (!index->meta.revision || !index->meta.revision[0]) {
            diag_error(dl, ((Pos){index->file, 1, 1}),
                       "--since needs a 'revision' in the front matter: the letter that marks "
                       "the changes");
            pkg->errors++;
        } else if (!(diffs = package_since(pkg, since, &old_pkg, &old_index, &old_dl))) {
            fprintf(stderr, "headroom build: the earlier revision '%s' cannot be used; nothing "
                            "written\n", since);
            old_bad = true;
        }
    }
    print_package_diags(pkg, dl);
    int status;
    if (pkg->errors || old_bad) {
        status = EXIT_INPUT;
    } else {
        char *def = !out && fmt == FMT_PDF ? default_output(file, ".pdf") : NULL;
        const char *label = !diffs ? NULL
                            : old_index->meta.revision && old_index->meta.revision[0]
                                ? old_index->meta.revision
                                : since;
        const char *inputs[] = {file, since};
        ReportJob job = {NULL, pkg, NULL, (const Diff *const *)diffs, label, inputs, 2};
        DiagList wl = {0};
        status = write_report(&job, fmt, out ? out : def ? def : "-", &wl);
        diag_free(&wl);
        free(def);
        if (status == 0 && strict && (pkg->nfailed || pkg->case_rows_failing))
            status = EXIT_CHECK_FAILS;
    }
    for (size_t i = 0; diffs && i < pkg->nparts; i++)
        if (diffs[i])
            diff_free((Diff *)diffs[i]);
    free(diffs);
    package_free(old_pkg);
    doc_free(old_index);
    diag_free(&old_dl);
    package_free(pkg);
    return status;
}

static int cmd_build(int argc, char **argv)
{
    const char *file = NULL, *out = NULL, *since = NULL;
    Format fmt = FMT_PDF;
    bool strict = false;
    for (int i = 0; i < argc; i++) {
        if (strcmp(argv[i], "-o") == 0 && i + 1 < argc) {
            out = argv[++i];
        } else if (strcmp(argv[i], "--format") == 0 && i + 1 < argc) {
            const char *f = argv[++i];
            if (strcmp(f, "pdf") == 0)
                fmt = FMT_PDF;
            else if (strcmp(f, "text") == 0)
                fmt = FMT_TEXT;
            else if (strcmp(f, "json") == 0)
                fmt = FMT_JSON;
            else {
                fprintf(stderr, "headroom build: unknown format '%s' (pdf, text or json)\n", shown(f));
                return EXIT_INPUT;
            }
        } else if (strcmp(argv[i], "--strict") == 0) {
            strict = true;
        } else if (strcmp(argv[i], "--since") == 0 && i + 1 < argc) {
            since = argv[++i];
        } else if (strcmp(argv[i], "--help") == 0) {
            fputs("usage: headroom build FILE [-o OUT] [--format pdf|text|json] [--strict]\n"
                  "                      [--since OLD]\n"
                  "Write the report. PDF goes to OUT or to FILE without .md/.calc plus .pdf;\n"
                  "text and JSON go to OUT or standard output. Nothing is written when the\n"
                  "input has errors (exit 2). A failing check is shown on the cover; the exit\n"
                  "status is 0 unless --strict, then 1.\n"
                  "--since OLD (a file or REV:path, as for diff; PDF only) marks every\n"
                  "statement, check and prose block that changed in meaning since OLD with a\n"
                  "change bar and a triangle holding FILE's revision, adds the revision to\n"
                  "the cover's table and lists the changes in an appendix. Errors in OLD, or\n"
                  "no revision in FILE's front matter, are exit 2 with nothing written.\n",
                  stdout);
            return 0;
        } else if (argv[i][0] == '-' && argv[i][1] != '\0') {
            fprintf(stderr, "headroom build: unknown or incomplete option '%s'\n", shown(argv[i]));
            return EXIT_INPUT;
        } else if (!file) {
            file = argv[i];
        } else {
            fprintf(stderr, "headroom build: one FILE at a time (found '%s' too)\n", shown(argv[i]));
            return EXIT_INPUT;
        }
    }
    if (!file) {
        fputs("headroom build: no FILE given\n", stderr);
        return EXIT_INPUT;
    }
    if (since && fmt != FMT_PDF) {
        fputs("headroom build: --since marks revisions in the PDF report; drop --format\n", stderr);
        return EXIT_INPUT;
    }
    DiagList dl = {0};
    Document *doc = doc_load(file, &dl);
    if (!doc) {
        print_diags(&dl, NULL);
        diag_free(&dl);
        return EXIT_IO;
    }
    if (package_is_index(doc) && !dl.errors) {
        int st = build_package(doc, &dl, fmt, file, out, strict, since);
        diag_free(&dl);
        doc_free(doc);
        return st;
    }
    Evaluated *ev = eval_document(doc, &dl);
    int status;
    DiagList old_dl = {0};
    Document *old_doc = NULL;
    Evaluated *old_ev = NULL;
    Diff *diff = NULL;
    bool old_bad = false;
    if (!dl.errors && since) {
        if (!doc->meta.revision || !doc->meta.revision[0]) {
            diag_error(&dl, ((Pos){doc->file, 1, 1}),
                       "--since needs a 'revision' in the front matter: the letter that marks "
                       "the changes");
        } else if ((old_ev = load_revision(since, &old_dl, &old_doc)) == NULL) {
            fprintf(stderr, "headroom build: the earlier revision '%s' cannot be used; nothing "
                            "written\n", shown(since));
            old_bad = true;
        } else {
            DiffOptions opt = diff_options_default();
            diff = diff_compute(old_ev, ev, &opt);
        }
    }
    if (dl.errors || old_bad) {
        print_diags(&dl, doc);
        status = EXIT_INPUT;
    } else {
        print_diags(&dl, doc); /* warnings */
        char *def = NULL;
        if (!out) {
            if (fmt == FMT_PDF) {
                def = default_output(strcmp(file, "-") == 0 ? "stdin" : file, ".pdf");
                out = def;
            } else {
                out = "-";
            }
        }
        DiagList wl = {0};
        const char *label = !diff ? NULL
                            : old_doc->meta.revision && old_doc->meta.revision[0] ? old_doc->meta.revision
                                                                                  : since;
        /* OUT is never the calc, the earlier revision or a file it uses. */
        size_t nused = doc->own_uses ? doc->own_uses->nfiles : 0;
        const char **inputs = xcalloc(nused + 2, sizeof *inputs);
        inputs[0] = file;
        inputs[1] = since;
        for (size_t u = 0; u < nused; u++)
            inputs[u + 2] = doc->own_uses->files[u]->file;
        ReportJob job = {ev, NULL, diff, NULL, label, inputs, nused + 2};
        status = out ? write_report(&job, fmt, out, &wl) : EXIT_IO;
        free(inputs);
        diag_free(&wl);
        free(def);
        if (status == 0 && strict && (ev->nfailed || ev->case_rows_failing))
            status = EXIT_CHECK_FAILS;
    }
    if (diff)
        diff_free(diff);
    diag_free(&old_dl);
    doc_free(old_doc);
    diag_free(&dl);
    doc_free(doc);
    return status;
}

/* ---- new ------------------------------------------------------------------ */

/* Starter calcs, generated from templates/starters/ (see gen-starters.sh). */
static const struct {
    const char *kind;
    const char *text;
} starters[] = {
#define STARTER(kind, text) {kind, text},
#define PACKAGE_FILE(kind, name, text)
#include "starters.inc"
#undef PACKAGE_FILE
#undef STARTER
};

/* The starter package: files written into a new directory. */
static const struct {
    const char *name;
    const char *text;
} package_files[] = {
#define STARTER(kind, text)
#define PACKAGE_FILE(kind, name, text) {name, text},
#include "starters.inc"
#undef PACKAGE_FILE
#undef STARTER
};

/* Write `text` to a new file (never over an existing one). */
static int write_new(const char *path, const char *text)
{
    int fd = open(path, O_WRONLY | O_CREAT | O_EXCL, 0666);
    if (fd < 0) {
        fprintf(stderr, "headroom new: cannot create '%s': %s\n", shown(path), strerror(errno));
        return errno == EEXIST ? EXIT_INPUT : EXIT_IO;
    }
    size_t len = strlen(text);
    bool ok = write(fd, text, len) == (ssize_t)len;
    ok = close(fd) == 0 && ok;
    if (!ok) {
        unlink(path);
        fprintf(stderr, "headroom new: failed to write '%s'\n", shown(path));
        return EXIT_IO;
    }
    return 0;
}

/* new package DIR: a basis, one part and the index, in a directory that
 * does not exist yet (or is empty), so nothing of anybody's is touched. */
static int new_package(const char *dir)
{
    if (mkdir(dir, 0777) != 0 && errno != EEXIST) {
        fprintf(stderr, "headroom new: cannot create '%s': %s\n", dir, strerror(errno));
        return EXIT_IO;
    }
    size_t n = sizeof package_files / sizeof package_files[0];
    char path[4096];
    for (size_t i = 0; i < n; i++) {
        snprintf(path, sizeof path, "%s/%s", dir, package_files[i].name);
        if (access(path, F_OK) == 0) {
            fprintf(stderr, "headroom new: '%s' exists; a starter package goes in a new directory\n", path);
            return EXIT_INPUT;
        }
    }
    for (size_t i = 0; i < n; i++) {
        snprintf(path, sizeof path, "%s/%s", dir, package_files[i].name);
        int st = write_new(path, package_files[i].text);
        if (st)
            return st;
    }
    printf("wrote %s/ (index.calc.md and its parts); build it with: headroom build %s/index.calc.md\n",
           dir, dir);
    return 0;
}

static int cmd_new(int argc, char **argv)
{
    size_t n = sizeof starters / sizeof starters[0];
    if (argc == 0 || strcmp(argv[0], "--help") == 0 || argc > 2) {
        FILE *out = argc == 0 || argc > 2 ? stderr : stdout;
        fputs("usage: headroom new KIND [FILE]\n"
              "Write a commented starter calc of KIND to FILE (default KIND.calc.md).\n"
              "'headroom new package DIR' writes a starter package (index.calc.md, a\n"
              "basis of design and one part) into DIR (default: package).\n"
              "An existing file is never overwritten. Kinds: package",
              out);
        for (size_t i = 0; i < n; i++)
            fprintf(out, " %s", starters[i].kind);
        fputc('\n', out);
        return out == stdout ? 0 : EXIT_INPUT;
    }
    if (strcmp(argv[0], "package") == 0)
        return new_package(argc == 2 ? argv[1] : "package");
    const char *text = NULL;
    for (size_t i = 0; i < n; i++)
        if (strcmp(starters[i].kind, argv[0]) == 0)
            text = starters[i].text;
    if (!text) {
        fprintf(stderr, "headroom new: unknown kind '%s' (kinds:", argv[0]);
        for (size_t i = 0; i < n; i++)
            fprintf(stderr, " %s", starters[i].kind);
        fputs(" package)\n", stderr);
        return EXIT_INPUT;
    }
    char def[256];
    snprintf(def, sizeof def, "%s.calc.md", argv[0]);
    const char *path = argc == 2 ? argv[1] : def;
    if (strcmp(path, "-") == 0) {
        fputs(text, stdout);
        return fflush(stdout) == 0 ? 0 : EXIT_IO;
    }
    /* O_EXCL: never overwrite somebody's calc. */
    int st = write_new(path, text);
    if (st)
        return st;
    printf("wrote %s; build it with: headroom build %s\n", path, path);
    return 0;
}

/* ---- diff ----------------------------------------------------------------- */

static const char diff_help[] =
    "usage: headroom diff OLD NEW [--json] [--rel-tol X]\n"
    "Evaluate two revisions of a calc and print what changed in meaning: front\n"
    "matter, inputs, results (beyond the relative tolerance X, default 1e-9, with\n"
    "the changed inputs they depend on), check verdicts and utilisations,\n"
    "statements added, removed or renamed, citations and prose sections.\n"
    "OLD and NEW are files or REV:path (read from git; a path is relative to the\n"
    "repository root, REV:./path to the current directory). A name that exists\n"
    "as a file is read as the file.\n"
    "Exit 0 when nothing changed in meaning, 1 when something did, 2 on input\n"
    "errors in either side, 3 on an output failure.\n";

/* diff of two package indexes: the index, then part by part under each
 * part's name as the indexes list it. */
static int diff_packages(Evaluated *ev[2], DiagList dl[2], bool json, const DiffOptions *opt)
{
    if (!package_is_index(ev[0]->doc) || !package_is_index(ev[1]->doc)) {
        fprintf(stderr, "headroom diff: %s is a package index and %s is not; compare two indexes "
                        "or two calcs\n", package_is_index(ev[0]->doc) ? ev[0]->doc->file : ev[1]->doc->file,
                package_is_index(ev[0]->doc) ? ev[1]->doc->file : ev[0]->doc->file);
        return EXIT_INPUT;
    }
    Package *pkg[2];
    int status = 0;
    for (int k = 0; k < 2; k++) {
        pkg[k] = package_load(ev[k]->doc, &dl[k]);
        print_package_diags(pkg[k], &dl[k]);
        if (pkg[k]->errors)
            status = EXIT_INPUT;
    }
    if (status == 0) {
        const Package *o = pkg[0], *n = pkg[1];
        PartDiff *parts = calloc(o->nparts + n->nparts + 1, sizeof *parts);
        size_t np = 0;
        for (size_t i = 0; parts && i < n->nparts; i++) {
            int k = package_find_part(o, n->index->meta.parts[i].file);
            PartDiff *p = &parts[np++];
            p->file = n->index->meta.parts[i].file;
            if (k < 0)
                p->added = true;
            else
                p->diff = diff_compute(o->parts[k].ev, n->parts[i].ev, opt);
        }
        for (size_t i = 0; parts && i < o->nparts; i++)
            if (package_find_part(n, o->index->meta.parts[i].file) < 0)
                parts[np++] = (PartDiff){o->index->meta.parts[i].file, NULL, false, true};
        Diff *ix = diff_compute(o->index_ev, n->index_ev, opt);
        bool changed = ix->changed;
        for (size_t i = 0; i < np; i++)
            changed |= parts[i].added || parts[i].removed || parts[i].diff->changed;
        bool ok = parts && (json ? render_package_diff_json(ix, parts, np, stdout)
                                 : render_package_diff_text(ix, parts, np, stdout));
        status = ok && fflush(stdout) == 0 ? (changed ? 1 : 0) : EXIT_IO;
        for (size_t i = 0; i < np; i++)
            diff_free((Diff *)parts[i].diff);
        diff_free(ix);
        free(parts);
    }
    package_free(pkg[0]);
    package_free(pkg[1]);
    return status;
}

/* Read and evaluate one revision (what load_revision does, without
 * printing), on its own thread: documents share no mutable state, so the
 * two revisions of a diff are evaluated side by side. */
typedef struct RevisionJob {
    const char *arg;
    DiagList *dl;
    Document *doc;
    Evaluated *ev;
} RevisionJob;

static void *revision_job_run(void *p)
{
    RevisionJob *job = p;
    job->doc = revision_load(job->arg, job->dl);
    if (job->doc)
        job->ev = eval_document(job->doc, job->dl);
    return NULL;
}

/* Both revisions, the second on a thread of its own (in turn if no thread
 * can be started). */
static void revisions_load_two(RevisionJob job[2])
{
    pthread_t t;
    pthread_attr_t attr;
    bool threaded = false;
    if (pthread_attr_init(&attr) == 0) {
        /* the same stack as the main thread's usual 8 MiB: deep input is
         * refused by the limits long before that */
        pthread_attr_setstacksize(&attr, (size_t)8 << 20);
        threaded = pthread_create(&t, &attr, revision_job_run, &job[1]) == 0;
        pthread_attr_destroy(&attr);
    }
    revision_job_run(&job[0]);
    if (threaded)
        pthread_join(t, NULL);
    else
        revision_job_run(&job[1]);
}

static int cmd_diff(int argc, char **argv)
{
    const char *side[2] = {NULL, NULL};
    int nside = 0;
    bool json = false;
    DiffOptions opt = diff_options_default();
    for (int i = 0; i < argc; i++) {
        if (strcmp(argv[i], "--json") == 0) {
            json = true;
        } else if (strcmp(argv[i], "--rel-tol") == 0 && i + 1 < argc) {
            const char *t = argv[++i];
            double x;
            size_t n = strlen(t);
            if (n == 0 || num_parse(t, n, &x) != n || !(x >= 0 && x < 1)) {
                fprintf(stderr, "headroom diff: --rel-tol expects a number from 0 up to 1, found '%s'\n", shown(t));
                return EXIT_INPUT;
            }
            opt.rel_tol = x;
        } else if (strcmp(argv[i], "--help") == 0) {
            fputs(diff_help, stdout);
            return 0;
        } else if (argv[i][0] == '-' && argv[i][1] != '\0') {
            fprintf(stderr, "headroom diff: unknown or incomplete option '%s'\n", shown(argv[i]));
            return EXIT_INPUT;
        } else if (nside < 2) {
            side[nside++] = argv[i];
        } else {
            fprintf(stderr, "headroom diff: two revisions, OLD and NEW (found '%s' too)\n", shown(argv[i]));
            return EXIT_INPUT;
        }
    }
    if (nside != 2) {
        fputs("usage: headroom diff OLD NEW [--json] [--rel-tol X]\n", stderr);
        return EXIT_INPUT;
    }
    DiagList dl[2] = {{0}, {0}};
    Document *doc[2] = {NULL, NULL};
    Evaluated *ev[2] = {NULL, NULL};
    int status = 0;
    RevisionJob job[2] = {{side[0], &dl[0], NULL, NULL}, {side[1], &dl[1], NULL, NULL}};
    revisions_load_two(job);
    for (int k = 0; k < 2; k++) {
        doc[k] = job[k].doc;
        print_diags(&dl[k], doc[k]);
        if (!doc[k] || dl[k].errors)
            status = EXIT_INPUT;
        else
            ev[k] = job[k].ev;
    }
    if (status == 0 && (package_is_index(doc[0]) || package_is_index(doc[1]))) {
        status = diff_packages(ev, dl, json, &opt);
    } else if (status == 0) {
        Diff *d = diff_compute(ev[0], ev[1], &opt);
        bool ok = json ? render_diff_json(d, stdout) : render_diff_text(d, stdout);
        status = stdout_ok() && ok ? (d->changed ? 1 : 0) : EXIT_IO;
        diff_free(d);
    }
    for (int k = 0; k < 2; k++) {
        diag_free(&dl[k]);
        doc_free(doc[k]);
    }
    return status;
}

/* ---- convert -------------------------------------------------------------- */

/* VALUE UNIT is a number (with a sign) and a unit, as written after a number
 * in a calc; it is shown in UNIT by the rule of a calc's `as UNIT`
 * (eval_unit_fits): an absolute temperature is not shown in a difference
 * unit, and a value that overflows in UNIT is an error, not "inf". */
static int cmd_convert(int argc, char **argv)
{
    if (argc == 1 && strcmp(argv[0], "--help") == 0) {
        fputs("usage: headroom convert \"VALUE UNIT\" UNIT\n"
              "Print VALUE UNIT in UNIT with 10 significant digits, a space and the unit.\n"
              "The value is shown by the rule of a calc's 'as UNIT'.\n"
              "Example: headroom convert \"38 gal/min\" L/s\n",
              stdout);
        return 0;
    }
    if (argc != 2) {
        fputs("usage: headroom convert \"VALUE UNIT\" UNIT\n", stderr);
        return EXIT_INPUT;
    }
    DiagList dl = {0};
    Pos p1 = {"value", 1, 1}, p2 = {"unit", 1, 1};
    const char *s = argv[0];
    size_t len = strlen(s);
    size_t i = 0;
    bool neg = false;
    while (i < len && s[i] == ' ')
        i++;
    if (i < len && (s[i] == '-' || s[i] == '+')) {
        neg = s[i] == '-';
        i++;
    }
    double x;
    size_t used = num_parse(s + i, len - i, &x);
    int status = 0;
    Unit from, to;
    if (used == 0) {
        p1.col = (int)i + 1;
        diag_error(&dl, p1, "expected a number, found '%s'", s + i);
        status = EXIT_INPUT;
    } else {
        i += used;
        while (i < len && s[i] == ' ')
            i++;
        size_t end = len;
        while (end > i && s[end - 1] == ' ')
            end--;
        p1.col = (int)i + 1;
        if (end == i) {
            diag_error(&dl, p1, "expected a unit after the number");
            status = EXIT_INPUT;
        } else if (!parse_unit(s + i, end - i, p1, &from, &dl)) {
            status = EXIT_INPUT;
        }
        if (!parse_unit(argv[1], strlen(argv[1]), p2, &to, &dl))
            status = EXIT_INPUT;
    }
    if (status == 0) {
        /* The sign belongs to the number: -40 degF is a point below zero. */
        Value v = value_number(unit_to_qty(neg ? -x : x, &from));
        if (!isfinite(v.q.si)) {
            p1.col = 1;
            diag_error(&dl, p1, "the value overflows a double in SI units");
            status = EXIT_INPUT;
        } else if (!dim_eq(v.q.dim, to.dim)) {
            char a[96], b[96];
            dim_describe(from.dim, from.temp, UNITS_SI, a, sizeof a);
            dim_describe(to.dim, to.temp, UNITS_SI, b, sizeof b);
            diag_error(&dl, p2, "cannot convert %s to %s", a, b);
            status = EXIT_INPUT;
        } else if (!eval_unit_fits(&dl, UNITS_SI, p2, shown(argv[1]), &to, &v)) {
            status = EXIT_INPUT;
        } else {
            /* A point converts to a point with offsets; a difference as a
             * difference (eval_unit_fits refused the mixed cases). */
            /* Gauge and absolute differ by the standard atmosphere here (a
             * calc uses its own, DESIGN 2.9). */
            v.q = qty_to_ref(v.q, to.pref == PRES_PLAIN ? v.q.pref : to.pref, UNIT_STANDARD_ATMOSPHERE);
            bool difference = v.q.temp == TEMP_NONE || to.temp == TEMP_NONE;
            double y = unit_from_si(v.q.si, &to, difference);
            char buf[64];
            snprintf(buf, sizeof buf, "%.10g", y);
            printf("%s %s\n", buf, argv[1]);
        }
    }
    if (dl.len)
        diag_print(stderr, &dl, NULL, 0, use_color());
    diag_free(&dl);
    return status;
}

/* ---- watch ---------------------------------------------------------------- */

typedef struct WatchCtx {
    const char *file, *out;
    int builds;
} WatchCtx;

/* One build of `watch` for a package index: every part and every file the
 * parts use are watched. */
static void watch_package(Document *index, DiagList *dl, const char *out, Vec *inputs)
{
    Package *pkg = package_load(index, dl);
    print_package_diags(pkg, dl);
    for (size_t i = 0; i < pkg->nparts; i++)
        if (pkg->parts[i].ev)
            print_check_text(pkg->parts[i].ev, pkg->parts[i].diags);
    if (pkg->errors) {
        printf("%s: not written: the input has errors\n", out);
    } else {
        DiagList wl = {0};
        const char *ins[] = {index->file};
        ReportJob job = {NULL, pkg, NULL, NULL, NULL, ins, 1};
        if (write_report(&job, FMT_PDF, out, &wl) == 0)
            printf("wrote %s\n", out);
        diag_free(&wl);
    }
    for (size_t i = 0; i < pkg->uses->nfiles; i++) {
        const UsedFile *u = pkg->uses->files[i];
        if (u->file && !u->doc->from_git)
            vec_push(inputs, xstrdup(u->file));
    }
    package_free(pkg);
}

/* One build of `watch`: diagnostics, the check summary, the PDF replaced
 * atomically (write_report: a temporary beside it, then rename). */
static void watch_build(void *vctx, Vec *inputs)
{
    WatchCtx *w = vctx;
    vec_push(inputs, xstrdup(w->file));
    printf("-- build %d of %s\n", ++w->builds, w->file);
    DiagList dl = {0};
    Document *doc = doc_load(w->file, &dl);
    if (!doc) {
        print_diags(&dl, NULL);
        printf("%s: cannot be read; waiting for it to be saved\n", w->file);
    } else if (package_is_index(doc) && !dl.errors) {
        watch_package(doc, &dl, w->out, inputs);
    } else {
        Evaluated *ev = eval_document(doc, &dl);
        print_diags(&dl, doc);
        print_check_text(ev, &dl);
        if (dl.errors) {
            printf("%s: not written: the input has errors\n", w->out);
        } else {
            DiagList wl = {0};
            const char *ins[] = {w->file};
            ReportJob job = {ev, NULL, NULL, NULL, NULL, ins, 1};
            if (write_report(&job, FMT_PDF, w->out, &wl) == 0)
                printf("wrote %s\n", w->out);
            diag_free(&wl);
        }
        /* The files the calc uses (use("file"), DESIGN 2.13), directly or
         * through another, are watched too. */
        for (size_t i = 0; doc->own_uses && i < doc->own_uses->nfiles; i++) {
            const UsedFile *u = doc->own_uses->files[i];
            if (u->file && !u->doc->from_git)
                vec_push(inputs, xstrdup(u->file));
        }
    }
    fflush(stderr);
    diag_free(&dl);
    doc_free(doc);
}

static int cmd_watch(int argc, char **argv)
{
    const char *file = NULL, *out = NULL;
    for (int i = 0; i < argc; i++) {
        if (strcmp(argv[i], "-o") == 0 && i + 1 < argc) {
            out = argv[++i];
        } else if (strcmp(argv[i], "--help") == 0) {
            fputs("usage: headroom watch FILE [-o OUT]\n"
                  "Build the PDF report (to OUT, default FILE without .md/.calc plus .pdf),\n"
                  "then again whenever FILE is saved, printing the diagnostics and the\n"
                  "checks each time. The report is replaced atomically, so a viewer reloads\n"
                  "a whole file; with input errors the last good report stays. Stop with\n"
                  "SIGINT (Ctrl-C) or SIGTERM: exit status 0.\n",
                  stdout);
            return 0;
        } else if ((argv[i][0] == '-' && argv[i][1] != '\0') || strcmp(argv[i], "-") == 0) {
            fprintf(stderr, "headroom watch: unknown or incomplete option '%s'\n", argv[i]);
            return EXIT_INPUT;
        } else if (!file) {
            file = argv[i];
        } else {
            fprintf(stderr, "headroom watch: one FILE at a time (found '%s' too)\n", argv[i]);
            return EXIT_INPUT;
        }
    }
    if (!file) {
        fputs("usage: headroom watch FILE [-o OUT]\n", stderr);
        return EXIT_INPUT;
    }
    char *def = out ? NULL : default_output(file, ".pdf");
    WatchCtx w = {file, out ? out : def, 0};
    int status = w.out ? watch_loop(watch_build, &w) : EXIT_IO;
    free(def);
    return status;
}

/* ---- lsp ------------------------------------------------------------------ */

static int cmd_lsp(int argc, char **argv)
{
    if (argc == 1 && strcmp(argv[0], "--help") == 0) {
        fputs("usage: headroom lsp\n"
              "Serve the Language Server Protocol on standard input and output:\n"
              "diagnostics on open and change, hover, inlay hints with each statement's\n"
              "value, go to definition and completion of names, units, functions,\n"
              "fitting kinds and pipe sizes. An editor starts it; see the manual.\n",
              stdout);
        return 0;
    }
    if (argc != 0) {
        fputs("usage: headroom lsp\n", stderr);
        return EXIT_INPUT;
    }
    return lsp_serve(STDIN_FILENO, stdout);
}

static int run_command(int argc, char **argv)
{
    if (argc < 2 || strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0 ||
        strcmp(argv[1], "help") == 0) {
        fputs(usage_text, argc < 2 ? stderr : stdout);
        return argc < 2 ? EXIT_INPUT : 0;
    }
    if (strcmp(argv[1], "--version") == 0) {
        printf("headroom %s\n", HEADROOM_VERSION);
        return 0;
    }
    const char *cmd = argv[1];
    if (strcmp(cmd, "check") == 0)
        return cmd_check(argc - 2, argv + 2);
    if (strcmp(cmd, "build") == 0)
        return cmd_build(argc - 2, argv + 2);
    if (strcmp(cmd, "diff") == 0)
        return cmd_diff(argc - 2, argv + 2);
    if (strcmp(cmd, "convert") == 0)
        return cmd_convert(argc - 2, argv + 2);
    if (strcmp(cmd, "new") == 0)
        return cmd_new(argc - 2, argv + 2);
    if (strcmp(cmd, "watch") == 0)
        return cmd_watch(argc - 2, argv + 2);
    if (strcmp(cmd, "lsp") == 0)
        return cmd_lsp(argc - 2, argv + 2);
    fprintf(stderr, "headroom: unknown command '%s'\n%s", shown(cmd), usage_text);
    return EXIT_INPUT;
}

/* Every command's standard output is checked once here: a write that failed
 * (a full disk, a closed pipe) is exit 3 with what failed, whatever the
 * command printed before. */
int main(int argc, char **argv)
{
    int status = run_command(argc, argv);
    stdout_ok();
    if (fclose(stdout) != 0 && !stdout_errno)
        stdout_errno = errno ? errno : EIO;
    if (stdout_errno) {
        fprintf(stderr, "headroom: cannot write to standard output: %s\n", strerror(stdout_errno));
        return EXIT_IO;
    }
    return status;
}
