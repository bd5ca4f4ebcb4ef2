/* render.h — the renderers: text listing, JSON results and the PDF report.
 *
 * Renderers read only the Document and its Evaluated results; they never
 * parse or evaluate. Each writes to a stream or a path the caller chose (main
 * writes reports to a temporary file and renames it into place). */
#ifndef HEADROOM_RENDER_H
#define HEADROOM_RENDER_H

#include <stdbool.h>
#include <stdio.h>

#include "diag.h"
#include "eval.h"

/* Plain, stable, diffable listing: every statement as
 * symbol = formula = substituted values = result, checks with verdicts. */
bool render_text(const Evaluated *ev, FILE *out);

/* The JSON results of DESIGN 2.5. `nfiles` > 1 writes an array. */
bool render_json(const Evaluated *const *evs, const DiagList *diags, size_t nfiles, FILE *out);

/* The sealed-style PDF report, written to `path`. */
bool render_pdf(const Evaluated *ev, const char *path, DiagList *diags);

/* The same report with revision marks (`build --since`): every statement,
 * check and prose block that `since` (the Diff of an earlier revision and
 * this one) marks changed or added gets a change bar and a revision triangle
 * with this revision's letter; the cover's revision table names the
 * revision; an appendix lists the changes since revision `since_label`. */
struct Diff;
bool render_pdf_since(const Evaluated *ev, const struct Diff *since, const char *since_label,
                      const char *path, DiagList *diags);

/* A package (package.h): the text listing of every part in order under the
 * package's heading, and the one PDF of DESIGN 2.13 — the package cover
 * (every check of every part, the governing one across the package, the
 * index's revision table, one seal box, the cautions), a contents table,
 * then each part's sheets with its own title block, references, design
 * criteria and source appendix, numbered "Sheet N of M" through the whole
 * package. `since` (may be NULL) holds one Diff per part, NULL for a part
 * new since revision `since_label`. */
struct Package;
bool render_package_text(const struct Package *pkg, FILE *out);
bool render_package_pdf(const struct Package *pkg, const struct Diff *const *since,
                        const char *since_label, const char *path, DiagList *diags);

/* How a name is shown: a leading Greek word becomes the letter and the part
 * after the first '_' a subscript: "rho_w" -> base "ρ", sub "w"; "h_f" ->
 * "h", "f". Delta is the difference operator, so "Delta_z" -> base "Δz" and
 * "Delta_p_f" -> base "Δp", sub "f". Greek words inside the subscript are
 * also replaced ("h_Delta" -> "h", "Δ"). */
typedef struct Symbol {
    char base[64];   /* UTF-8 */
    char sub[64];    /* UTF-8, "" when none */
} Symbol;

Symbol symbol_of(const char *name);

/* A value with its unit as text: "4.050 ft/s", "0.02 (dimensionless)" is
 * shown as just "0.02000". Uses num_sig with the document's digits. */
void render_quantity(const Evaluated *ev, const Value *v, const Unit *unit, char *buf, size_t n);

/* The calc's atmosphere and where it comes from (DESIGN 2.9), one phrase:
 * "12.23 psia, the standard atmosphere at elevation 1500 m". */
void render_atmosphere(const Evaluated *ev, char *buf, size_t n);

/* An expression in one line of plain text, as written (substitute = false)
 * or with every name replaced by its value and unit (substitute = true). */
void render_expr_text(const Evaluated *ev, const Expr *e, bool substitute, StrBuf *out);
/* The same as row `row` substitutes it (a solve row: at its root; NULL: the
 * statements' own values). pi stays the letter, as the PDF sets it. */
void render_expr_text_at(const Evaluated *ev, const StmtResult *row, const Expr *e, bool substitute,
                         StrBuf *out);
/* The texts of the statements' values as substituted formulas show them,
 * each made once while one document's report is made: texts[slot] is NULL
 * until a formula needs it, then a copy in `arena`, which outlives every
 * text made with the memo. One per document and per thread. */
typedef struct ValueTexts {
    const char **texts;      /* one per statement */
    Arena *arena;
} ValueTexts;

/* The same text as a copy in `a`; `memo` (or NULL) keeps the texts of the
 * values it substitutes for the next formula. */
const char *render_expr_string(const Evaluated *ev, const StmtResult *row, const Expr *e, bool substitute,
                               ValueTexts *memo, Arena *a);

/* A published method's formula `e` with the names it uses replaced by the
 * values one call used (MethodUse, library.h); g is its value, pi the letter. */
void render_method_text(const Evaluated *ev, const MethodUse *use, const Expr *e, StrBuf *out);
const char *render_method_string(const Evaluated *ev, const MethodUse *use, const Expr *e, Arena *a);

/* A value as plain text in the unit it is shown in ("4.160 ft/s", a string
 * in quotes, a record as "(pipe record)"). */
void render_value_text(const Evaluated *ev, const Value *v, const Unit *shown, StrBuf *out);
const char *render_value_string(const Evaluated *ev, const Value *v, const Unit *shown, Arena *a);

/* ---- the CI formats of `check --format` (DESIGN 2.14) ------------------ */

/* One file of a `check` run. */
typedef struct CheckRun {
    const char *file;         /* as named on the command line */
    const Evaluated *ev;      /* NULL: the file could not be read */
    const DiagList *diags;    /* this file's diagnostics, sorted */
} CheckRun;

/* JUnit XML: one testsuite per file, one testcase per check (a failing
 * check a <failure> with both sides and the utilisation, a check not
 * evaluated an <error>), one testcase per input error (an <error>). */
bool render_junit(const CheckRun *runs, size_t n, FILE *out);

/* SARIF 2.1.0: one run, a rule per kind of finding, a result per
 * diagnostic and per failing check, columns in UTF-16 code units. */
bool render_sarif(const CheckRun *runs, size_t n, FILE *out);

/* GitHub workflow commands: ::error / ::warning / ::notice lines with the
 * file, line and column, failing checks as errors, then a summary line. */
bool render_github(const CheckRun *runs, size_t n, FILE *out);

/* The kinds of finding the CI formats name (SARIF rule ids, JUnit types). */
typedef enum FindingKind {
    FIND_INPUT_ERROR,    /* an error in the calc: nothing can be issued */
    FIND_WARNING,        /* a value outside a method's validity, and the like */
    FIND_NOTE,
    FIND_READ_FAILURE,   /* the file could not be read */
    FIND_CHECK_FAILS,    /* a check that does not hold (also in a case row) */
    FIND_KINDS
} FindingKind;

typedef struct FindingRule {
    const char *id;      /* "input-error", ... */
    const char *title;   /* one line, for SARIF shortDescription */
} FindingRule;

extern const FindingRule finding_rules[FIND_KINDS];

/* The kind of a diagnostic: a read failure has no line. */
FindingKind finding_of_diag(const Diag *d);

/* A check's result in one line: "V <= 8 ft/s: 9.120 ft/s <= 8.000 ft/s,
 * utilisation 1.14", plus the case rows where it fails. `fails` is set
 * when it fails at the base values or in any case row. */
void render_check_verdict(const Evaluated *ev, size_t stmt, StrBuf *out, bool *fails);

/* A 1-based byte column of a line of `doc` as 1-based UTF-16 units. */
int render_utf16_col(const Document *doc, int line, int byte_col);

/* One caution of templates/cautions.md, "**Topic.** text" without the
 * bullet; `len` bytes (not NUL-terminated). */
typedef struct ReportCaution {
    const char *text;
    size_t len;
} ReportCaution;

/* The cautions that apply to `ev`, in the order of templates/cautions.md:
 * every general one always, the surge caution only where surge() or
 * wave_speed() is used, the demand cautions only where fixture loads or
 * demands are. The text listing and the PDF both print this one list.
 * Returns the count written to out (at most max). */
size_t report_cautions(const Evaluated *ev, ReportCaution *out, size_t max);

#endif
