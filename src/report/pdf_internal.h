/* pdf_internal.h — what the PDF renderer's files share.
 *
 * The report is built in two passes over one list of items (cover blocks,
 * headings, paragraphs, calc rows, tables, path and case tables, figures,
 * reference entries, listing lines). Each item has one function that both measures and draws it: with
 * no current page it only returns its height; with a page it draws at the
 * given top and returns the same height. pagelayout.c assigns the measured
 * items to sheets, so the sheet count is known before the first sheet is
 * drawn. The files draw through draw.h (which shows how they include one
 * another); none of them includes libharu. The Pdf context owns an Arena
 * for boxes and items, freed when rendering ends. */
#ifndef HEADROOM_PDF_INTERNAL_H
#define HEADROOM_PDF_INTERNAL_H

#include "diff.h"
#include "mathbox.h"
#include "pagelayout.h"
#include "render.h"
#include "report/draw.h"
#include "report_model.h"

typedef struct Pdf Pdf;
typedef struct Item Item;

/* Measure (P->page == NULL) or draw an item with its top at y; returns its height. */
typedef double (*ItemFn)(Pdf *P, const Item *it, double top);

struct Item {
    ItemFn fn;
    const void *p;           /* the block, statement or text it shows */
    int aux;                 /* a number the item needs (list index, line, ...) */
    int depth;               /* list nesting */
    PageItem layout;
    /* an outline entry for the item (headings and sections) */
    const char *outline;
    int outline_level;       /* 1..6 */
    int ref;                 /* references: the entry's number, else 0 */
    int rev_mark;            /* revision marks: 0 none, 1 bar and triangle, 2 bar only */
    int scope;               /* a package report: whose item it is (PdfScope index) */
    int warnings;            /* how many warnings the item shows beside its row */
};

/* A package report draws items of several calcs. Each calc's state that
 * the item functions read through the Pdf (its document and results, math
 * environment, reference and figure numbers, revision diff) is one scope;
 * scope 0 is the package's own (the index), scope k the k-th part. Items
 * record their scope, and the renderer loads it before measuring or
 * drawing each item and each sheet's frame. */
typedef struct PdfScope {
    const Evaluated *ev;
    const Document *d;
    const ReportModel *model;
    MathEnv env;
    int governing;
    bool preliminary;
    int *source_ref, *method_ref, *method_first;
    int nrefs;
    int *ref_page;
    double *ref_y;
    int *figure_no;
    int nfigures;
    const Diff *since;
    size_t first_item;       /* a part: its title's index in the item list */
    int first_sheet, last_sheet;   /* the part's sheets, 0-based; -1 before layout */
} PdfScope;

/* The geometry of a sheet, in points, y upwards. */
typedef struct Sheet {
    double w, h;
    double frame_l, frame_r, frame_b, frame_t;   /* the drawn border */
    double body_l, body_r, body_top, body_bottom;
    double margin_w;         /* the right-hand column for keys and verdicts */
} Sheet;

struct Pdf {
    Draw *draw;              /* the document; fonts by FontRole */
    DrawPage *page;          /* NULL while measuring */
    DrawPage **pages;
    int npages;
    const Evaluated *ev;
    const Document *d;
    const ReportModel *model; /* the rows every sheet shows (report_model.h) */
    DiagList *diags;
    Arena arena;
    /* the math boxes and texts one item builds while it is measured or
     * drawn (MathEnv's arena): freed after each item and each sheet frame,
     * so a long report does not keep every box it ever laid out */
    Arena scratch;
    MathMetrics metrics;
    MathEnv env;
    MathPainter painter;
    Sheet sheet;
    char date[32];           /* the report date, "" when none */
    bool preliminary;        /* status not issued */
    int governing;           /* statement index of the governing check, -1 */
    size_t nwarnings;        /* warnings shown beside rows, over the whole report */
    int *warning_sheets;     /* the sheets (1-based) that show them, ascending */
    int nwarning_sheets;
    /* references: numbers per source and per used method, and where they sit */
    int *source_ref;
    int *method_ref;
    int *method_first;       /* by method: the statement that shows its formula (first use) */
    int nrefs;
    int *ref_page;           /* by reference number */
    double *ref_y;
    /* the outline: the latest entry per level */
    DrawOutline *outline[7];
    DrawOutline *root;
    /* figures: the number of each figure statement (by statement index), 0 for none */
    int *figure_no;
    int nfigures;
    /* revision marks (build --since): the diff from the earlier revision, its name */
    const Diff *since;
    const char *since_label;
    /* a package report (pdf_package.c); pkg is NULL for one calc */
    const struct Package *pkg;
    PdfScope *scopes;        /* 1 + number of parts */
    int nscopes;
    int scope;               /* loaded now */
    int *sheet_scope;        /* by sheet: whose title block and trace line it carries */
    size_t pkg_failed;       /* failing checks and case rows over the package */
    const Diff *const *pkg_since;  /* build --since: one Diff per part, NULL for a new part */
    char pkg_digest[65];     /* a package: SHA-256 of every source's digest, for the file ID */
    /* a path or cases table is split into chunks that share one column
     * layout, measured over every row once (pdf_flow.c), not once a chunk */
    const void *path_layout_key, *case_layout_key;
    void *path_layout, *case_layout;
};

/* ---- primitives (pdf_prim.c) --------------------------------------------- */

/* The three header rows of a table of columns (the path and
 * network tables): each column's word (one or two centred lines at
 * word_pt), its symbol and its unit (NULL: none), between the column edges
 * x[0..n]; returns their height. */
double pdf_column_header(Pdf *P, int n, const double *x, const char *const *word, const char *const *symbol,
                         const char *const *unit, double word_pt, double top);
/* Column edges x[0..n] from the columns' natural widths: the spare width
 * of `width` spread evenly, or every column shrunk to fit; returns the text
 * size, pt or less in proportion. */
double pdf_columns_spread(const double *nat, int n, double left, double width, double pt, double *x);
double pdf_width(Pdf *P, FontRole f, double size, const char *s);
void pdf_text(Pdf *P, FontRole f, double size, double x, double y, const char *s);
void pdf_text_color(Pdf *P, FontRole f, double size, double x, double y, const char *s, Rgb c);
void pdf_line(Pdf *P, double x0, double y0, double x1, double y1, double w);
void pdf_rect(Pdf *P, double x, double y, double w, double h, double lw);
void pdf_fill(Pdf *P, double x, double y, double w, double h, Rgb c);
void pdf_link(Pdf *P, double x, double y, double w, double h, int ref);
void pdf_uri(Pdf *P, double x, double y, double w, double h, const char *url);
/* Text wrapped to `width`; returns the height used. */
double pdf_wrap(Pdf *P, FontRole f, double size, double lead, double x, double top, double width,
                const char *s);
double pdf_wrap_color(Pdf *P, FontRole f, double size, double lead, double x, double top,
                      double width, const char *s, Rgb color);
void item_add(Vec *items, Pdf *P, ItemFn fn, const void *p, int aux, double space_before);
/* The math layout's environment, metrics and painter (P->env, ...). */
void pdf_math_setup(Pdf *P);
/* A section title of the end matter and the cover (kept with what follows). */
Item *pdf_section(Pdf *P, Vec *items, const char *title, bool new_sheet, bool outline);

extern const Rgb INK, GREY, RULE, FAIL, PASS, SHADE, LINK, WARN;

/* Every warning of a row, each on its own lines under it, from `top`;
 * returns the height used (0 when there are none). */
double pdf_warnings(Pdf *P, const StmtResult *r, double x, double top, double width);

/* ---- the body (pdf_body.c) ----------------------------------------------- */
/* Add the items of the document's blocks. */
void pdf_body_items(Pdf *P, Vec *items);
/* Rich text: inline nodes wrapped at `width`; draws when P->page. */
double pdf_inlines(Pdf *P, const Inline *in, FontRole base, double size, double lead, double x,
                   double top, double width);

/* ---- statement rows (pdf_row.c) ------------------------------------------ */
/* The right-margin column of a statement row (checks' verdict, source keys,
 * method references, the line); returns its height. */
double pdf_row_margin(Pdf *P, const Stmt *st, double top);
/* A published method under its row: title, reference number, formula. */
double pdf_method_line(Pdf *P, const Method *m, int ref, double x, double top, double width);

/* ---- scopes and figure numbers (pdf_state.c) ------------------------------- */
/* Load scope `k` (no-op for a single calc's report); save the state now
 * loaded into `s`. */
void pdf_scope_load(Pdf *P, int k);
void pdf_scope_save(const Pdf *P, PdfScope *s);
/* Number the figure statements in document order (P->figure_no). */
void pdf_number_figures(Pdf *P);
/* "Figures 1 and 2": the figures drawn from the statement `slot`, "" if none. */
void pdf_figures_of(const Pdf *P, int slot, char *buf, size_t n);

/* ---- figures (pdf_figure.c) ----------------------------------------------- */
/* A figure statement as one unsplittable item; it->aux is its number. */
double pdf_fn_figure(Pdf *P, const Item *it, double top);

/* ---- path and case tables (pdf_flow.c) ------------------------------------ */
/* The items of a path block: its heading, the segment table, the summary. */
void pdf_path_items(Pdf *P, Vec *items, const Stmt *st);
/* The items of a network block (pdf_network.c): heading, node and link
 * tables, the convergence record and methods. */
void pdf_network_items(Pdf *P, Vec *items, const Stmt *st);
/* The figure of a network drawn from its node coordinates: links shaded by
 * velocity with arrows in the direction of flow, the critical node marked;
 * returns its height. */
double pdf_network_figure(Pdf *P, const Stmt *st, const NetworkResult *nr, int number, const char *default_caption,
                          double top);
/* Each network's critical node and the checks that read its p_min, for the
 * cover. */
void pdf_network_cover_items(Pdf *P, Vec *items);
/* The items of a cases block: a table of inputs, results and verdicts. */
void pdf_cases_items(Pdf *P, Vec *items, size_t which);
/* pdf_table.c: a statement's laid-out table (ResultTable), a curve block */
void pdf_table_items(Pdf *P, Vec *items, const Stmt *st);
void pdf_curve_items(Pdf *P, Vec *items, const Stmt *st);
/* Case tables with a failing row, for the cover: items after the check summary. */
void pdf_cases_cover_items(Pdf *P, Vec *items);
/* The number of case rows, over all case tables, in which a check fails. */
size_t pdf_case_rows_failing(const Pdf *P);

/* ---- sheets, cover and end matter (pdf_sheet.c) -------------------------- */
void pdf_sheet_geometry(Pdf *P);
void pdf_sheet_frame(Pdf *P, int sheet);
void pdf_cover_items(Pdf *P, Vec *items);
void pdf_end_items(Pdf *P, Vec *items);
void pdf_number_references(Pdf *P);
bool pdf_status_issued(const char *status);

/* ---- packages (pdf_package.c) ------------------------------------------ */
/* The items of a package report: cover, contents, then every part. */
void pdf_package_items(Pdf *P, Vec *items);
/* After layout: each sheet's scope and each part's sheets. */
void pdf_package_placed(Pdf *P, Vec *items, const PagePlace *place);
/* The package cover's items (pdf_sheet.c): cover, every check of every part
 * grouped by part, the cautions. */
void pdf_package_cover_items(Pdf *P, Vec *items);
/* Attach the source of every calc of the package; *specs gets their file
 * specifications (in the Pdf's arena), the count is returned. */
size_t pdf_attach_sources(Pdf *P, DrawFile ***specs);
/* One calc's source under its own name, or under `name` (pdf_prim.c); its
 * file specification, NULL on failure. */
DrawFile *pdf_attach_source(Pdf *P);
DrawFile *pdf_attach_named(Pdf *P, const Document *d, const char *name);

/* ---- revision marks (pdf_revision.c) ------------------------------------- */
/* With P->since: narrow the body for the column of marks. */
void pdf_revision_geometry(Pdf *P);
/* Tag the items [from, len) made from block `b` that changed since OLD. */
void pdf_revision_tag(Pdf *P, Vec *items, size_t from, const Block *b);
/* The change bar and triangle of a tagged item drawn with its top at `top`. */
void pdf_revision_mark(Pdf *P, const Item *it, double top);
/* The triangle with the revision letter, the letter's baseline at `base`. */
void pdf_revision_triangle(Pdf *P, double cx, double base, const char *letter);
/* The cover's revision table: is `rev` the revision being marked; does the
 * front matter's list lack it (then a row is added with `note`)? */
bool pdf_revision_is_current(const Pdf *P, const char *rev);
bool pdf_revision_row_missing(const Pdf *P);
const char *pdf_revision_row_note(Pdf *P);
/* The appendix "Changes since revision X". */
void pdf_revision_items(Pdf *P, Vec *items);

#endif
