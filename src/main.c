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
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "diff.h"
#include "doc.h"
#include "eval.h"
#include "lsp.h"
#include "numfmt.h"
#include "outfile.h"
#include "parse.h"
#include "render.h"
#include "revision.h"
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
    "  headroom new KIND [FILE]\n"
    "      write a commented starter calc (riser, pump-line, pipe-rating)\n"
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

static void print_diags(DiagList *dl, const Document *doc)
{
    diag_sort(dl);
    diag_print(stderr, dl, doc ? doc->text : NULL, doc ? doc->len : 0, use_color());
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
    "Evaluate each calc file, print diagnostics and the checks.\n"
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
        if (s->kind == STMT_CHECK && r->state == RES_OK) {
            char u[32] = "n/a";
            if (isfinite(r->utilization))
                num_sig(r->utilization, 3, u, sizeof u);
            printf("  %-5s %s (utilisation %s)\n", r->holds ? "holds" : "FAILS", s->label, u);
        }
    }
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
    Evaluated **evs = calloc(nfiles, sizeof *evs);
    DiagList *dls = calloc(nfiles, sizeof *dls);
    CheckRun *runs = calloc(nfiles, sizeof *runs);
    size_t nev = 0;
    for (size_t f = 0; f < nfiles; f++) {
        DiagList *dl = &dls[f];
        Document *doc = doc_load(files[f], dl);
        docs[f] = doc;
        runs[f] = (CheckRun){files[f], NULL, dl};
        if (!doc) {
            print_diags(dl, NULL);
            status = EXIT_IO;
            continue;
        }
        Evaluated *ev = eval_document(doc, dl);
        evs[nev++] = ev;
        runs[f].ev = ev;
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
    if (fmt == CHK_JSON && nev > 0 && !ferror(stdout))
        ok = render_json((const Evaluated *const *)evs, &all, nev, stdout);
    else if (fmt == CHK_JUNIT)
        ok = render_junit(runs, nfiles, stdout);
    else if (fmt == CHK_SARIF)
        ok = render_sarif(runs, nfiles, stdout);
    else if (fmt == CHK_GITHUB)
        ok = render_github(runs, nfiles, stdout);
    if ((!ok || !stdout_ok()) && status < EXIT_IO)
        status = EXIT_IO;
    diag_free(&all);
    for (size_t f = 0; f < nfiles; f++) {
        diag_free(&dls[f]);
        doc_free(docs[f]);
    }
    free(runs);
    free(dls);
    free(docs);
    free(evs);
    free(files);
    return status;
}

/* ---- build ---------------------------------------------------------------- */

typedef enum Format { FMT_PDF, FMT_TEXT, FMT_JSON } Format;

/* Render into a temporary file, then move it into place: renamed over a
 * regular (or absent) OUT, copied into one that is not a regular file (a
 * device, a FIFO) or into standard output ("-"), which are never replaced.
 * `inputs`: the calc and every file it reads, which OUT must not be.
 * `since` (PDF only): the changes to mark, since revision `since_label`. */
static int write_report(const Evaluated *ev, Format fmt, const char *out, DiagList *dl,
                        const Diff *since, const char *since_label, const char *const *inputs,
                        size_t ninputs)
{
    OutKind kind;
    char why[512];
    if (!outfile_classify(out, inputs, ninputs, &kind, why, sizeof why)) {
        fprintf(stderr, "headroom: will not write the report: ");
        diag_print_escaped(stderr, why);
        fputc('\n', stderr);
        return EXIT_INPUT;
    }
    if (fmt != FMT_PDF && kind == OUT_STDOUT) {
        bool ok = fmt == FMT_TEXT ? render_text(ev, stdout) : render_json(&ev, dl, 1, stdout);
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
        ok = render_pdf_since(ev, since, since_label, tmp, dl);
    } else {
        FILE *f = fdopen(fd, "wb");
        if (!f) {
            err = errno;
            close(fd);
            ok = false;
        } else {
            ok = fmt == FMT_TEXT ? render_text(ev, f) : render_json(&ev, dl, 1, f);
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
            print_diags(dl, ev->doc);
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
        const char *inputs[] = {file, since};
        status = out ? write_report(ev, fmt, out, &wl, diff, label, inputs, 2) : EXIT_IO;
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
#include "starters.inc"
#undef STARTER
};

static int cmd_new(int argc, char **argv)
{
    size_t n = sizeof starters / sizeof starters[0];
    if (argc == 0 || strcmp(argv[0], "--help") == 0 || argc > 2) {
        FILE *out = argc == 0 || argc > 2 ? stderr : stdout;
        fputs("usage: headroom new KIND [FILE]\n"
              "Write a commented starter calc of KIND to FILE (default KIND.calc.md).\n"
              "An existing file is never overwritten. Kinds:",
              out);
        for (size_t i = 0; i < n; i++)
            fprintf(out, " %s", starters[i].kind);
        fputc('\n', out);
        return out == stdout ? 0 : EXIT_INPUT;
    }
    const char *text = NULL;
    for (size_t i = 0; i < n; i++)
        if (strcmp(starters[i].kind, argv[0]) == 0)
            text = starters[i].text;
    if (!text) {
        fprintf(stderr, "headroom new: unknown kind '%s' (kinds:", shown(argv[0]));
        for (size_t i = 0; i < n; i++)
            fprintf(stderr, " %s", starters[i].kind);
        fputs(")\n", stderr);
        return EXIT_INPUT;
    }
    char def[256];
    snprintf(def, sizeof def, "%s.calc.md", argv[0]);
    const char *path = argc == 2 ? argv[1] : def;
    if (strcmp(path, "-") == 0) {
        fputs(text, stdout);
        return stdout_ok() ? 0 : EXIT_IO;
    }
    /* O_EXCL: never overwrite somebody's calc. */
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
    for (int k = 0; k < 2; k++)
        if (!(ev[k] = load_revision(side[k], &dl[k], &doc[k])))
            status = EXIT_INPUT;
    if (status == 0) {
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
    } else {
        Evaluated *ev = eval_document(doc, &dl);
        print_diags(&dl, doc);
        print_check_text(ev, &dl);
        if (dl.errors) {
            printf("%s: not written: the input has errors\n", w->out);
        } else {
            DiagList wl = {0};
            const char *ins[] = {w->file};
            if (write_report(ev, FMT_PDF, w->out, &wl, NULL, NULL, ins, 1) == 0)
                printf("wrote %s\n", w->out);
            diag_free(&wl);
        }
        /* Files the calc uses are watched too, once the Document lists them
         * (use("file"), DESIGN 2.13): push each of their paths here. */
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
