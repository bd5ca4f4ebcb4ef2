/* draw.c — the drawing layer over libharu (see draw.h): the document, its
 * fonts and pages, paths, text, links and the outline. The archival parts
 * of the file (PDF/A metadata, attachments, the file ID) are in
 * draw_archive.c. libharu takes single-precision numbers; every value is
 * converted here, once. */
#include "report/draw_lib.h"

#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "arena.h"

static void on_error(HPDF_STATUS error, HPDF_STATUS detail, void *user)
{
    Draw *D = user;
    if (!D->error) {
        D->error = error;
        D->error_detail = detail;
    }
}

Draw *draw_new(DiagList *diags)
{
    const char *why = NULL;
    if (!hpdf_load(&why)) {
        diag_error(diags, ((Pos){NULL, 0, 0}), "cannot write a PDF: %s", why);
        return NULL;
    }
    Draw *D = xcalloc(1, sizeof *D);
    D->diags = diags;
    D->doc = HPDF_New(on_error, D);
    if (!D->doc) {
        free(D);
        return NULL;
    }
    HPDF_SetCompressionMode(D->doc, HPDF_COMP_ALL);
    HPDF_UseUTFEncodings(D->doc);
    return D;
}

void draw_free(Draw *D)
{
    if (!D)
        return;
    HPDF_Free(D->doc);
    for (int i = 0; i < D->npages; i++)
        free(D->pages[i]);
    free(D->pages);
    for (int i = 0; i < DRAW_FONTS; i++)
        free(D->font_path[i]);
    free(D);
}

unsigned draw_error(const Draw *D)
{
    return (unsigned)D->error;
}

unsigned draw_error_detail(const Draw *D)
{
    return (unsigned)D->error_detail;
}

/* ---- fonts ------------------------------------------------------------------ */

bool draw_font_file(Draw *D, int index, const char *path)
{
    if (index < 0 || index >= DRAW_FONTS)
        return false;
    Pos nowhere = {NULL, 0, 0};
    FILE *f = fopen(path, "rb");
    if (!f) {
        diag_error(D->diags, nowhere,
                   "cannot open font '%s': %s (install fonts-dejavu-core or set "
                   "HEADROOM_FONT_DIR)",
                   path, strerror(errno));
        return false;
    }
    fclose(f);
    free(D->font_path[index]);
    D->font_path[index] = xstrdup(path);
    return true;
}

static HPDF_Font font_of(Draw *D, int index)
{
    if (index < 0 || index >= DRAW_FONTS)
        return NULL;
    if (D->font[index] || !D->font_path[index])
        return D->font[index];
    const char *name = HPDF_LoadTTFontFromFile(D->doc, D->font_path[index], HPDF_TRUE);
    if (!name) {
        diag_error(D->diags, ((Pos){NULL, 0, 0}), "cannot load font '%s' (libharu error 0x%04X)",
                   D->font_path[index], (unsigned)D->error);
        free(D->font_path[index]);
        D->font_path[index] = NULL;   /* reported once */
        D->font_failed = true;
        return NULL;
    }
    D->font[index] = HPDF_GetFont(D->doc, name, "UTF-8");
    return D->font[index];
}

bool draw_fonts_load(Draw *D)
{
    for (int i = 0; i < DRAW_FONTS; i++)
        if (D->font_path[i] && !font_of(D, i))
            return false;
    return true;
}

double draw_width(Draw *D, int index, double size, const char *s)
{
    if (!s || !*s)
        return 0;
    HPDF_Font f = font_of(D, index);
    if (!f)
        return 0;
    HPDF_TextWidth tw = HPDF_Font_TextWidth(f, (const HPDF_BYTE *)s, (HPDF_UINT)strlen(s));
    return (double)tw.width * size / 1000.0;
}

/* ---- pages ------------------------------------------------------------------- */

DrawPage *draw_page_add(Draw *D, bool a4)
{
    HPDF_Page p = HPDF_AddPage(D->doc);
    if (!p)
        return NULL;
    HPDF_Page_SetSize(p, a4 ? HPDF_PAGE_SIZE_A4 : HPDF_PAGE_SIZE_LETTER, HPDF_PAGE_PORTRAIT);
    if (D->npages == D->cap) {
        D->cap = D->cap ? 2 * D->cap : 16;
        D->pages = xrealloc(D->pages, (size_t)D->cap * sizeof *D->pages);
    }
    DrawPage *pg = xcalloc(1, sizeof *pg);
    pg->pg = p;
    pg->D = D;
    D->pages[D->npages++] = pg;
    return pg;
}

/* ---- colour, line style, paths --------------------------------------------------- */

/* ---- the graphics state: each operator only when its value changes --------------- */

static bool same_rgb(const HPDF_REAL have[3], const HPDF_REAL want[3])
{
    return have[0] == want[0] && have[1] == want[1] && have[2] == want[2];
}

void draw_stroke_rgb(DrawPage *pg, Rgb c)
{
    if (!pg)
        return;
    HPDF_REAL v[3] = {(HPDF_REAL)c.r, (HPDF_REAL)c.g, (HPDF_REAL)c.b};
    if (pg->st.stroke_ok && same_rgb(pg->st.stroke, v))
        return;
    HPDF_Page_SetRGBStroke(pg->pg, v[0], v[1], v[2]);
    memcpy(pg->st.stroke, v, sizeof v);
    pg->st.stroke_ok = true;
}

void draw_fill_rgb(DrawPage *pg, Rgb c)
{
    if (!pg)
        return;
    HPDF_REAL v[3] = {(HPDF_REAL)c.r, (HPDF_REAL)c.g, (HPDF_REAL)c.b};
    if (pg->st.fill_ok && same_rgb(pg->st.fill, v))
        return;
    HPDF_Page_SetRGBFill(pg->pg, v[0], v[1], v[2]);
    memcpy(pg->st.fill, v, sizeof v);
    pg->st.fill_ok = true;
}

void draw_line_width(DrawPage *pg, double w)
{
    if (!pg)
        return;
    HPDF_REAL v = (HPDF_REAL)w;
    if (pg->st.width_ok && pg->st.width == v)
        return;
    HPDF_Page_SetLineWidth(pg->pg, v);
    pg->st.width = v;
    pg->st.width_ok = true;
}

void draw_line_cap(DrawPage *pg, DrawCap cap)
{
    if (!pg || (pg->st.cap_ok && pg->st.cap == (int)cap))
        return;
    HPDF_Page_SetLineCap(pg->pg, cap == DRAW_CAP_ROUND ? HPDF_ROUND_END : HPDF_BUTT_END);
    pg->st.cap = (int)cap;
    pg->st.cap_ok = true;
}

void draw_line_join(DrawPage *pg, DrawJoin join)
{
    if (!pg || (pg->st.join_ok && pg->st.join == (int)join))
        return;
    HPDF_Page_SetLineJoin(pg->pg, join == DRAW_JOIN_ROUND ? HPDF_ROUND_JOIN : HPDF_MITER_JOIN);
    pg->st.join = (int)join;
    pg->st.join_ok = true;
}

void draw_dash(DrawPage *pg, const unsigned short *pattern, int n, double phase)
{
    if (!pg)
        return;
    HPDF_UINT16 p[8] = {0};
    if (n > 8)
        n = 8;
    if (n < 0 || !pattern)
        n = 0;
    for (int i = 0; i < n; i++)
        p[i] = (HPDF_UINT16)pattern[i];
    HPDF_UINT ph = n > 0 ? (HPDF_UINT)phase : 0;
    if (pg->st.dash_ok && pg->st.ndash == n && pg->st.dash_phase == ph &&
        memcmp(pg->st.dash, p, sizeof p) == 0)
        return;
    HPDF_Page_SetDash(pg->pg, n > 0 ? p : NULL, (HPDF_UINT)n, ph);
    memcpy(pg->st.dash, p, sizeof p);
    pg->st.ndash = n;
    pg->st.dash_phase = ph;
    pg->st.dash_ok = true;
}

/* The text font and size are part of the graphics state too: they hold
 * from one text object to the next. */
static void set_font(DrawPage *pg, HPDF_Font f, double size)
{
    HPDF_REAL v = (HPDF_REAL)size;
    if (pg->st.font_ok && pg->st.font == f && pg->st.size == v)
        return;
    HPDF_Page_SetFontAndSize(pg->pg, f, v);
    pg->st.font = f;
    pg->st.size = v;
    pg->st.font_ok = true;
}

void draw_move_to(DrawPage *pg, double x, double y)
{
    if (pg)
        HPDF_Page_MoveTo(pg->pg, (HPDF_REAL)x, (HPDF_REAL)y);
}

void draw_line_to(DrawPage *pg, double x, double y)
{
    if (pg)
        HPDF_Page_LineTo(pg->pg, (HPDF_REAL)x, (HPDF_REAL)y);
}

void draw_curve_to(DrawPage *pg, double x1, double y1, double x2, double y2, double x3, double y3)
{
    if (pg)
        HPDF_Page_CurveTo(pg->pg, (HPDF_REAL)x1, (HPDF_REAL)y1, (HPDF_REAL)x2, (HPDF_REAL)y2,
                          (HPDF_REAL)x3, (HPDF_REAL)y3);
}

void draw_rect_path(DrawPage *pg, double x, double y, double w, double h)
{
    if (pg)
        HPDF_Page_Rectangle(pg->pg, (HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)w, (HPDF_REAL)h);
}

void draw_circle_path(DrawPage *pg, double x, double y, double r)
{
    if (pg)
        HPDF_Page_Circle(pg->pg, (HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)r);
}

void draw_close(DrawPage *pg)
{
    if (pg)
        HPDF_Page_ClosePath(pg->pg);
}

void draw_stroke(DrawPage *pg)
{
    if (pg)
        HPDF_Page_Stroke(pg->pg);
}

void draw_close_stroke(DrawPage *pg)
{
    if (pg)
        HPDF_Page_ClosePathStroke(pg->pg);
}

void draw_fill(DrawPage *pg)
{
    if (pg)
        HPDF_Page_Fill(pg->pg);
}

void draw_fill_stroke(DrawPage *pg)
{
    if (pg)
        HPDF_Page_FillStroke(pg->pg);
}

void draw_save(DrawPage *pg)
{
    if (!pg)
        return;
    HPDF_Page_GSave(pg->pg);
    if (pg->depth < DRAW_SAVED)
        pg->saved[pg->depth] = pg->st;
    pg->depth++;
}

void draw_clip(DrawPage *pg)
{
    if (!pg)
        return;
    HPDF_Page_Clip(pg->pg);
    HPDF_Page_EndPath(pg->pg);
}

void draw_restore(DrawPage *pg)
{
    if (!pg || pg->depth == 0)
        return;
    HPDF_Page_GRestore(pg->pg);
    pg->depth--;
    if (pg->depth < DRAW_SAVED)
        pg->st = pg->saved[pg->depth];
    else
        pg->st = (DrawState){0};   /* not known: every value is set again */
}

/* ---- text ------------------------------------------------------------------------- */

void draw_text(DrawPage *pg, int font, double size, double x, double y, const char *s, Rgb c)
{
    if (!pg || !s || !*s)
        return;
    HPDF_Font f = font_of(pg->D, font);
    if (!f)
        return;
    HPDF_Page p = pg->pg;
    draw_fill_rgb(pg, c);
    HPDF_Page_BeginText(p);
    set_font(pg, f, size);
    HPDF_Page_TextOut(p, (HPDF_REAL)x, (HPDF_REAL)y, s);
    HPDF_Page_EndText(p);
}

void draw_text_matrix(DrawPage *pg, int font, double size, double a, double b, double c, double d,
                      double x, double y, const char *s)
{
    if (!pg || !s)
        return;
    HPDF_Font f = font_of(pg->D, font);
    if (!f)
        return;
    HPDF_Page p = pg->pg;
    HPDF_Page_BeginText(p);
    set_font(pg, f, size);
    HPDF_Page_SetTextMatrix(p, (HPDF_REAL)a, (HPDF_REAL)b, (HPDF_REAL)c, (HPDF_REAL)d,
                            (HPDF_REAL)x, (HPDF_REAL)y);
    HPDF_Page_ShowText(p, s);
    HPDF_Page_EndText(p);
}

/* ---- links, outline, labels ----------------------------------------------------------- */

/* Links print (PDF/A: the Print flag, 4, set and no hiding flag). */
static void print_flag(HPDF_Annotation a)
{
    if (a)
        HPDF_Dict_AddNumber((HPDF_Dict)a, "F", 4);
}

void draw_link(DrawPage *pg, double x0, double y0, double x1, double y1, DrawPage *to,
               double fit_y, DrawLinkKind kind)
{
    if (!pg || !to)
        return;
    HPDF_Destination dst = HPDF_Page_CreateDestination(to->pg);
    if (!isnan(fit_y))
        HPDF_Destination_SetFitH(dst, (HPDF_REAL)fit_y);
    HPDF_Rect r = {(HPDF_REAL)x0, (HPDF_REAL)y0, (HPDF_REAL)x1, (HPDF_REAL)y1};
    HPDF_Annotation a = HPDF_Page_CreateLinkAnnot(pg->pg, r, dst);
    HPDF_LinkAnnot_SetBorderStyle(a, 0, 0, 0);
    if (kind == DRAW_LINK_PRINTED) {
        HPDF_LinkAnnot_SetHighlightMode(a, HPDF_ANNOT_INVERT_BOX);
        print_flag(a);
    }
}

void draw_uri(DrawPage *pg, double x0, double y0, double x1, double y1, const char *url)
{
    if (!pg || !url || !*url)
        return;
    HPDF_Rect r = {(HPDF_REAL)x0, (HPDF_REAL)y0, (HPDF_REAL)x1, (HPDF_REAL)y1};
    HPDF_Annotation a = HPDF_Page_CreateURILinkAnnot(pg->pg, r, url);
    HPDF_LinkAnnot_SetBorderStyle(a, 0, 0, 0);
    print_flag(a);
}

DrawOutline *draw_outline_add(Draw *D, DrawOutline *parent, const char *title, DrawPage *to,
                              double fit_y, bool open)
{
    HPDF_Outline o = HPDF_CreateOutline(D->doc, (HPDF_Outline)parent, title,
                                        HPDF_GetEncoder(D->doc, "UTF-8"));
    if (!o)
        return NULL;
    if (to) {
        HPDF_Destination dst = HPDF_Page_CreateDestination(to->pg);
        HPDF_Destination_SetFitH(dst, (HPDF_REAL)fit_y);
        HPDF_Outline_SetDestination(o, dst);
    }
    HPDF_Outline_SetOpened(o, open);
    return (DrawOutline *)o;
}

void draw_page_labels(Draw *D, const char *prefix)
{
    HPDF_AddPageLabel(D->doc, 0, HPDF_PAGE_NUM_STYLE_DECIMAL, 1, prefix);
    HPDF_SetPageMode(D->doc, HPDF_PAGE_MODE_USE_OUTLINE);
}

/* With UTF-8 as the document's current encoder libharu writes text strings
 * as UTF-16BE with a byte order mark, so Greek and dashes survive in the
 * document information. */
static void set_info(Draw *D, HPDF_InfoType type, const char *s)
{
    if (s && *s)
        HPDF_SetInfoAttr(D->doc, type, s);
}

void draw_info(Draw *D, const DrawInfo *info)
{
    HPDF_SetCurrentEncoder(D->doc, "UTF-8");
    set_info(D, HPDF_INFO_TITLE, info->title);
    set_info(D, HPDF_INFO_AUTHOR, info->author);
    set_info(D, HPDF_INFO_SUBJECT, info->subject);
    set_info(D, HPDF_INFO_KEYWORDS, info->keywords);
    set_info(D, HPDF_INFO_CREATOR, info->creator);
}

bool draw_save_file(Draw *D, const char *path)
{
    if (D->font_failed)
        return false;   /* reported when it failed; no file is written */
    if (HPDF_SaveToFile(D->doc, path) != HPDF_OK || D->error) {
        diag_error(D->diags, ((Pos){NULL, 0, 0}), "cannot write '%s' (libharu error 0x%04X)", path,
                   (unsigned)D->error);
        return false;
    }
    return true;
}
