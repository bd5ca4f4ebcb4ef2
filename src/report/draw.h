/* draw.h — the drawing layer: the one door to libharu.
 *
 * The PDF report draws through these functions only; draw.c and
 * draw_archive.c are the only files that call libharu (through
 * hpdf_load.h, which loads it at the first build). A document
 * (Draw) owns its fonts, its pages and the first library error; a page
 * (DrawPage) takes text runs, paths, links. Every drawing call is a no-op
 * on a NULL page, so a renderer's measuring pass (no page) and its drawing
 * pass (a page) run the same code. Fonts are named by a small index (the
 * report's FontRole); the file behind each is given once and loaded at its
 * first use. Numbers are points, y upwards from the bottom-left corner.
 *
 * The PDF report's files, each calling only files on rows below its own
 * (tests/layers checks this against the code, and that no other file
 * includes libharu):
 *
 *   pdf.c                        collect, measure, place, draw, save
 *     pdf_package.c              a package: cover, contents, parts
 *       pdf_sheet.c              sheet frame, cover, end matter
 *       pdf_body.c               the document's blocks and statement rows
 *         pdf_figure.c           figures
 *           pdf_network.c        network tables, figure, cover line
 *           pdf_flow.c           path and case tables
 *           pdf_table.c          laid-out tables, curve blocks
 *             pdf_row.c          a row's margin column, method lines
 *             pdf_revision.c     revision marks and appendix
 *             pdf_state.c        a package part's scope, figure numbers
 *               pdf_prim.c       text, wrapping, rules, links, sections, attachments,
 *                                column headers and widths
 *                 draw.c         the drawing layer (libharu)
 *                 draw_archive.c PDF/A-3b objects, attachments (libharu)
 */
#ifndef HEADROOM_DRAW_H
#define HEADROOM_DRAW_H

#include <stdbool.h>
#include <stddef.h>

#include "diag.h"

typedef struct Draw Draw;
typedef struct DrawPage DrawPage;
typedef struct DrawOutline DrawOutline;   /* an outline (bookmark) entry */
typedef struct DrawFile DrawFile;         /* an attached file's specification */

typedef struct Rgb {
    double r, g, b;
} Rgb;

enum { DRAW_FONTS = 8 };
typedef enum { DRAW_CAP_BUTT, DRAW_CAP_ROUND } DrawCap;
typedef enum { DRAW_JOIN_MITER, DRAW_JOIN_ROUND } DrawJoin;

/* ---- the document ---------------------------------------------------------- */
/* A new compressed document with UTF-8 text; errors are reported to `diags`
 * when the caller asks (draw_report_error). NULL when the library fails. */
Draw *draw_new(DiagList *diags);
void draw_free(Draw *D);
/* The first library error (0: none) and its detail. */
unsigned draw_error(const Draw *D);
unsigned draw_error_detail(const Draw *D);
/* Font `index` is the TrueType file at `path`, embedded as a subset with
 * UTF-8 encoding; it is opened now (false and a diagnostic when it cannot
 * be) and loaded into the document at its first use (measuring or
 * drawing), so a font the report never uses is never loaded: libharu
 * builds a 65,536-entry glyph map for each. A font that then fails to load
 * is reported once, and draw_save_file writes nothing. */
bool draw_font_file(Draw *D, int index, const char *path);
/* Load every font now, in index order. */
bool draw_fonts_load(Draw *D);
/* The width of `s` in font `index` at `size`. */
double draw_width(Draw *D, int index, double size, const char *s);
/* A new page, A4 or US Letter portrait; NULL on failure. */
DrawPage *draw_page_add(Draw *D, bool a4);

/* ---- colour, line style, paths --------------------------------------------- */
void draw_stroke_rgb(DrawPage *pg, Rgb c);
void draw_fill_rgb(DrawPage *pg, Rgb c);
void draw_line_width(DrawPage *pg, double w);
void draw_line_cap(DrawPage *pg, DrawCap cap);
void draw_line_join(DrawPage *pg, DrawJoin join);
/* A dash pattern of `n` lengths (0: solid). */
void draw_dash(DrawPage *pg, const unsigned short *pattern, int n, double phase);
void draw_move_to(DrawPage *pg, double x, double y);
void draw_line_to(DrawPage *pg, double x, double y);
void draw_curve_to(DrawPage *pg, double x1, double y1, double x2, double y2, double x3, double y3);
void draw_rect_path(DrawPage *pg, double x, double y, double w, double h);
void draw_circle_path(DrawPage *pg, double x, double y, double r);
void draw_close(DrawPage *pg);
void draw_stroke(DrawPage *pg);
void draw_close_stroke(DrawPage *pg);
void draw_fill(DrawPage *pg);
void draw_fill_stroke(DrawPage *pg);
/* Save the graphics state, clip to the current path (which ends), restore. */
void draw_save(DrawPage *pg);
void draw_clip(DrawPage *pg);
void draw_restore(DrawPage *pg);

/* ---- text ------------------------------------------------------------------- */
/* One run of text with its baseline starting at (x, y), filled in `c`. */
void draw_text(DrawPage *pg, int font, double size, double x, double y, const char *s, Rgb c);
/* One run of text under the text matrix [a b c d x y], in the current fill. */
void draw_text_matrix(DrawPage *pg, int font, double size, double a, double b, double c, double d,
                      double x, double y, const char *s);

/* ---- links, outline, labels ----------------------------------------------------- */
typedef enum {
    DRAW_LINK_PRINTED,   /* no border, inverted box when pressed, printed (PDF/A) */
    DRAW_LINK_PLAIN,     /* no border */
} DrawLinkKind;
/* A link from the rectangle (x0, y0)-(x1, y1) to page `to`, its top at
 * `fit_y` (NaN: the page's default view). */
void draw_link(DrawPage *pg, double x0, double y0, double x1, double y1, DrawPage *to,
               double fit_y, DrawLinkKind kind);
void draw_uri(DrawPage *pg, double x0, double y0, double x1, double y1, const char *url);
/* An outline entry under `parent` (NULL: the top level) pointing at page
 * `to` at height `fit_y`, shown open or closed. */
DrawOutline *draw_outline_add(Draw *D, DrawOutline *parent, const char *title, DrawPage *to,
                              double fit_y, bool open);
/* Pages labelled "<prefix>1", "<prefix>2", ...; the outline shown on opening. */
void draw_page_labels(Draw *D, const char *prefix);

/* ---- the file (draw_archive.c) ---------------------------------------------------- */
/* The document information as both the Info dictionary and the XMP
 * metadata state it (NULL: absent). */
typedef struct DrawInfo {
    const char *title, *author, *subject, *keywords, *creator;
} DrawInfo;
/* The Info dictionary's entries (UTF-16 text strings). */
void draw_info(Draw *D, const DrawInfo *info);
/* `bytes` attached as a Markdown file named `name` (ASCII; anything else is
 * replaced) described by `desc`; `sorted`: the caller adds files in name
 * order and each is appended to the name tree directly. NULL on failure. */
DrawFile *draw_attach(Draw *D, const char *name, const char *desc, const char *bytes, size_t len,
                      bool sorted);
/* Make the file archival (PDF/A-3b) just before it is saved: the
 * information, XMP, the sRGB output intent, valid ToUnicode maps, the
 * attached files as associated files, the dates of `day` ("YYYY-MM-DD", ""
 * for none), and the file ID from the hex `digest`. */
bool draw_archive_prepare(Draw *D, const DrawInfo *info, const char *day, const char *digest,
                          DrawFile *const *files, size_t nfiles);
/* Write the file; false (and a diagnostic) on failure. */
bool draw_save_file(Draw *D, const char *path);
extern const char *const DRAW_ICC_PROFILE;

#endif
