/* pdf.c — the sealed-style PDF report: libharu behind one adapter.
 *
 * render_pdf() collects the report as a list of items (cover, body, end
 * matter), measures every item, lets pagelayout.c assign them to sheets,
 * creates all sheets at once (so "Sheet N of M" and links to any sheet are
 * known), then draws the frames and the items. Fonts are DejaVu TrueType
 * files embedded as subsets with UTF-8 encoding. Output is byte-identical
 * for identical input: no clock time enters the file (the info dates come
 * from the front matter or SOURCE_DATE_EPOCH), and libharu's file ID is a
 * hash of the document information, which carries the source digest. */
#include "report/pdf_internal.h"

#include <hpdf_catalog.h>
#include <hpdf_namedict.h>

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

const Rgb INK = {0.08, 0.08, 0.10};
const Rgb GREY = {0.40, 0.40, 0.43};
const Rgb RULE = {0.55, 0.55, 0.58};
const Rgb FAIL = {0.70, 0.05, 0.05};
const Rgb PASS = {0.05, 0.38, 0.15};
const Rgb SHADE = {0.93, 0.93, 0.90};
const Rgb LINK = {0.05, 0.20, 0.50};
const Rgb WARN = {0.62, 0.32, 0.00};

/* fonts/README.md names the same files. */
static const char *const FONT_FILE[FONT_ROLE_COUNT] = {
    [FONT_SERIF] = "DejaVuSerif.ttf",
    [FONT_SERIF_BOLD] = "DejaVuSerif-Bold.ttf",
    [FONT_SERIF_ITALIC] = "DejaVuSerif-Italic.ttf",
    [FONT_SERIF_BOLD_ITALIC] = "DejaVuSerif-BoldItalic.ttf",
    [FONT_MONO] = "DejaVuSansMono.ttf",
    [FONT_SANS] = "DejaVuSansCondensed.ttf",
    [FONT_SANS_BOLD] = "DejaVuSansCondensed-Bold.ttf",
};
static const char *const FONT_DIR = "/usr/share/fonts/truetype/dejavu";

static void on_error(HPDF_STATUS error, HPDF_STATUS detail, void *user)
{
    Pdf *P = user;
    if (!P->error) {
        P->error = error;
        P->error_detail = detail;
    }
}

/* ---- primitives ---------------------------------------------------------- */

double pdf_width(Pdf *P, FontRole f, double size, const char *s)
{
    if (!s || !*s)
        return 0;
    HPDF_TextWidth tw = HPDF_Font_TextWidth(P->font[f], (const HPDF_BYTE *)s, (HPDF_UINT)strlen(s));
    return (double)tw.width * size / 1000.0;
}

static double metric_width(void *ctx, FontRole f, double size, const char *s)
{
    return pdf_width(ctx, f, size, s);
}

void pdf_text_color(Pdf *P, FontRole f, double size, double x, double y, const char *s, Rgb c)
{
    if (!P->page || !s || !*s)
        return;
    HPDF_Page pg = P->page;
    HPDF_Page_SetRGBFill(pg, (HPDF_REAL)c.r, (HPDF_REAL)c.g, (HPDF_REAL)c.b);
    HPDF_Page_BeginText(pg);
    HPDF_Page_SetFontAndSize(pg, P->font[f], (HPDF_REAL)size);
    HPDF_Page_TextOut(pg, (HPDF_REAL)x, (HPDF_REAL)y, s);
    HPDF_Page_EndText(pg);
}

void pdf_text(Pdf *P, FontRole f, double size, double x, double y, const char *s)
{
    pdf_text_color(P, f, size, x, y, s, INK);
}

void pdf_line(Pdf *P, double x0, double y0, double x1, double y1, double w)
{
    if (!P->page)
        return;
    HPDF_Page pg = P->page;
    HPDF_Page_SetLineWidth(pg, (HPDF_REAL)w);
    HPDF_Page_MoveTo(pg, (HPDF_REAL)x0, (HPDF_REAL)y0);
    HPDF_Page_LineTo(pg, (HPDF_REAL)x1, (HPDF_REAL)y1);
    HPDF_Page_Stroke(pg);
}

void pdf_rect(Pdf *P, double x, double y, double w, double h, double lw)
{
    if (!P->page)
        return;
    HPDF_Page_SetLineWidth(P->page, (HPDF_REAL)lw);
    HPDF_Page_Rectangle(P->page, (HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)w, (HPDF_REAL)h);
    HPDF_Page_Stroke(P->page);
}

void pdf_fill(Pdf *P, double x, double y, double w, double h, Rgb c)
{
    if (!P->page)
        return;
    HPDF_Page_SetRGBFill(P->page, (HPDF_REAL)c.r, (HPDF_REAL)c.g, (HPDF_REAL)c.b);
    HPDF_Page_Rectangle(P->page, (HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)w, (HPDF_REAL)h);
    HPDF_Page_Fill(P->page);
    HPDF_Page_SetRGBFill(P->page, (HPDF_REAL)INK.r, (HPDF_REAL)INK.g, (HPDF_REAL)INK.b);
}

/* Links print (PDF/A: the Print flag, 4, set and no hiding flag). */
static void print_flag(HPDF_Annotation a)
{
    if (a)
        HPDF_Dict_AddNumber((HPDF_Dict)a, "F", 4);
}

static void no_border(HPDF_Annotation a)
{
    HPDF_LinkAnnot_SetBorderStyle(a, 0, 0, 0);
    HPDF_LinkAnnot_SetHighlightMode(a, HPDF_ANNOT_INVERT_BOX);
    print_flag(a);
}

/* A link to reference number `ref`, whose sheet and height are known from
 * the layout. */
void pdf_link(Pdf *P, double x, double y, double w, double h, int ref)
{
    if (!P->page || ref < 1 || ref > P->nrefs || P->ref_page[ref] < 0)
        return;
    HPDF_Destination dst = HPDF_Page_CreateDestination(P->pages[P->ref_page[ref]]);
    HPDF_Destination_SetFitH(dst, (HPDF_REAL)P->ref_y[ref]);
    HPDF_Rect r = {(HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)(x + w), (HPDF_REAL)(y + h)};
    no_border(HPDF_Page_CreateLinkAnnot(P->page, r, dst));
}

void pdf_uri(Pdf *P, double x, double y, double w, double h, const char *url)
{
    if (!P->page || !url || !*url)
        return;
    HPDF_Rect r = {(HPDF_REAL)x, (HPDF_REAL)y, (HPDF_REAL)(x + w), (HPDF_REAL)(y + h)};
    HPDF_Annotation a = HPDF_Page_CreateURILinkAnnot(P->page, r, url);
    HPDF_LinkAnnot_SetBorderStyle(a, 0, 0, 0);
    print_flag(a);
}

double pdf_warnings(Pdf *P, const StmtResult *r, double x, double top, double width)
{
    double y = top;
    for (size_t i = 0; i < r->nwarnings; i++) {
        char *t = arena_printf(&P->arena, "Warning: %s", r->warnings[i]);
        y -= pdf_wrap_color(P, FONT_SANS, 8, 10, x, y, width, t, WARN) + 1;
    }
    return top - y;
}

/* Plain text wrapped at spaces (a word longer than the line is cut); a
 * blank line in the text adds half a line. Returns the height used. */
double pdf_wrap(Pdf *P, FontRole f, double size, double lead, double x, double top, double width,
                const char *s)
{
    return pdf_wrap_color(P, f, size, lead, x, top, width, s, INK);
}

double pdf_wrap_color(Pdf *P, FontRole f, double size, double lead, double x, double top,
                      double width, const char *s, Rgb color)
{
    double y = top - size * 0.85, used = 0;
    const char *p = s ? s : "";
    char buf[1024];
    while (*p) {
        size_t best = 0, i = 0, len = strlen(p);
        while (i < len) {
            size_t j = i;
            while (j < len && p[j] != ' ' && p[j] != '\n')
                j++;
            if (j >= sizeof buf)
                j = sizeof buf - 1;
            memcpy(buf, p, j);
            buf[j] = '\0';
            if (best > 0 && pdf_width(P, f, size, buf) > width)
                break;
            best = j;
            if (j >= len || p[j] == '\n')
                break;
            i = j + 1;
        }
        if (best == 0)
            best = len < 60 ? len : 60;
        while (best < len && ((unsigned char)p[best] & 0xC0) == 0x80)
            best++;
        memcpy(buf, p, best);
        buf[best] = '\0';
        pdf_text_color(P, f, size, x, y, buf, color);
        p += best;
        y -= lead;
        used += lead;
        if (*p == '\n' && p[1] == '\n')
            used += lead * 0.5, y -= lead * 0.5;
        while (*p == ' ' || *p == '\n')
            p++;
    }
    return used;
}

static void paint_text(void *ctx, FontRole f, double size, double x, double y, const char *s)
{
    pdf_text(ctx, f, size, x, y, s);
}

static void paint_line(void *ctx, double x0, double y0, double x1, double y1, double w)
{
    Pdf *P = ctx;
    if (!P->page)
        return;
    HPDF_Page_SetLineCap(P->page, HPDF_ROUND_END);
    pdf_line(P, x0, y0, x1, y1, w);
    HPDF_Page_SetLineCap(P->page, HPDF_BUTT_END);
}

static void paint_curve(void *ctx, double x0, double y0, double x1, double y1, double x2, double y2,
                        double x3, double y3, double w)
{
    Pdf *P = ctx;
    if (!P->page)
        return;
    HPDF_Page pg = P->page;
    HPDF_Page_SetLineWidth(pg, (HPDF_REAL)w);
    HPDF_Page_MoveTo(pg, (HPDF_REAL)x0, (HPDF_REAL)y0);
    HPDF_Page_CurveTo(pg, (HPDF_REAL)x1, (HPDF_REAL)y1, (HPDF_REAL)x2, (HPDF_REAL)y2,
                      (HPDF_REAL)x3, (HPDF_REAL)y3);
    HPDF_Page_Stroke(pg);
}

void item_add(Vec *items, Pdf *P, ItemFn fn, const void *p, int aux, double space_before)
{
    Item *it = arena_alloc(&P->arena, sizeof *it);
    it->fn = fn;
    it->p = p;
    it->aux = aux;
    it->layout.space_before = space_before;
    it->scope = P->scope;
    vec_push(items, it);
}

/* ---- fonts, dates, information ------------------------------------------- */

static bool load_fonts(Pdf *P)
{
    const char *dir = getenv("HEADROOM_FONT_DIR");
    if (!dir || !*dir)
        dir = FONT_DIR;
    Pos nowhere = {NULL, 0, 0};
    for (int i = 0; i < FONT_ROLE_COUNT; i++) {
        char path[4096];
        snprintf(path, sizeof path, "%s/%s", dir, FONT_FILE[i]);
        FILE *f = fopen(path, "rb");
        if (!f) {
            diag_error(P->diags, nowhere,
                       "cannot open font '%s': %s (install fonts-dejavu-core or set "
                       "HEADROOM_FONT_DIR)",
                       path, strerror(errno));
            return false;
        }
        fclose(f);
        const char *name = HPDF_LoadTTFontFromFile(P->doc, path, HPDF_TRUE);
        if (!name) {
            diag_error(P->diags, nowhere, "cannot load font '%s' (libharu error 0x%04X)", path,
                       (unsigned)P->error);
            return false;
        }
        P->font[i] = HPDF_GetFont(P->doc, name, "UTF-8");
        if (!P->font[i])
            return false;
    }
    return true;
}

/* The report date: the front matter's, else SOURCE_DATE_EPOCH, else none. */
static void report_date(Pdf *P)
{
    const Meta *m = &P->d->meta;
    int y = 0, mo = 0, da = 0;
    bool has = false;
    P->date[0] = '\0';
    if (m->date && sscanf(m->date, "%4d-%2d-%2d", &y, &mo, &da) == 3) {
        has = true;
    } else {
        const char *sde = getenv("SOURCE_DATE_EPOCH");
        char *end = NULL;
        long long t = sde ? strtoll(sde, &end, 10) : 0;
        if (sde && *sde && end && !*end && t >= 0) {
            time_t tt = (time_t)t;
            struct tm tmv;
            if (gmtime_r(&tt, &tmv)) {
                y = tmv.tm_year + 1900;
                mo = tmv.tm_mon + 1;
                da = tmv.tm_mday;
                has = true;
            }
        }
    }
    if (!has || mo < 1 || mo > 12 || da < 1 || da > 31 || y < 1000 || y > 9999)
        return;
    snprintf(P->date, sizeof P->date, "%04d-%02d-%02d", y, mo, da);
}

/* Info strings: with UTF-8 as the document's current encoder libharu
 * writes text strings as UTF-16BE with a byte order mark, so Greek and
 * dashes survive in the document information. */
static void set_info(Pdf *P, HPDF_InfoType type, const char *s)
{
    if (s && *s)
        HPDF_SetInfoAttr(P->doc, type, s);
}

static const char *base_name(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

/* The source file as an attachment, under its own name. libharu's
 * HPDF_AttachFile reads a file and files it under the path it was given
 * (without /Type /Filespec), so the embedded-file stream, its file
 * specification and the name-tree entry are made here from libharu's
 * object layer, straight from the source bytes in memory. */
HPDF_Dict pdf_attach_source(Pdf *P)
{
    const char *base = strcmp(P->d->file, "-") == 0 ? "stdin.calc.md" : base_name(P->d->file);
    return pdf_attach_named(P, P->d, base);
}

/* `name` is the attachment's file name; a package attaches its files in
 * the name tree's sorted order, each under a distinct name. Returns the
 * file specification (NULL on failure). */
HPDF_Dict pdf_attach_named(Pdf *P, const Document *d, const char *base)
{
    HPDF_Doc pdf = P->doc;
    HPDF_MMgr mm = pdf->mmgr;
    HPDF_Xref xref = pdf->xref;
    HPDF_NameDict names = HPDF_Catalog_GetNames(pdf->catalog);
    if (!names) {
        names = HPDF_NameDict_New(mm, xref);
        if (!names || HPDF_Catalog_SetNames(pdf->catalog, names) != HPDF_OK)
            return NULL;
    }
    HPDF_NameTree tree = HPDF_NameDict_GetNameTree(names, HPDF_NAME_EMBEDDED_FILES);
    if (!tree) {
        tree = HPDF_NameTree_New(mm, xref);
        if (!tree || HPDF_NameDict_SetNameTree(names, HPDF_NAME_EMBEDDED_FILES, tree) != HPDF_OK)
            return NULL;
    }
    HPDF_Dict file = HPDF_DictStream_New(mm, xref);
    HPDF_Dict params = HPDF_Dict_New(mm);
    HPDF_Dict spec = HPDF_Dict_New(mm);
    HPDF_Dict ef = HPDF_Dict_New(mm);
    if (!file || !params || !spec || !ef || HPDF_Xref_Add(xref, spec) != HPDF_OK)
        return NULL;
    file->filter = HPDF_STREAM_FILTER_FLATE_DECODE;
    HPDF_Dict_AddName(file, "Type", "EmbeddedFile");
    HPDF_Dict_AddName(file, "Subtype", "text/markdown");
    HPDF_Dict_AddNumber(params, "Size", (HPDF_INT32)d->len);
    HPDF_Dict_Add(file, "Params", params);
    HPDF_Stream_Write(file->stream, (const HPDF_BYTE *)d->text, (HPDF_UINT)d->len);

    /* an ASCII file name: the source's, with anything else replaced */
    char name[256];
    size_t n = 0;
    for (const char *c = base; *c && n + 1 < sizeof name; c++)
        name[n++] = ((unsigned char)*c < 0x80 && (unsigned char)*c >= 0x20) ? *c : '_';
    name[n] = '\0';
    char desc[160];
    snprintf(desc, sizeof desc, "calc source, SHA-256 %s", d->digest);
    HPDF_Dict_AddName(spec, "Type", "Filespec");
    HPDF_Dict_Add(spec, "F", HPDF_String_New(mm, name, NULL));
    HPDF_Dict_Add(spec, "UF", HPDF_String_New(mm, name, NULL));
    HPDF_Dict_Add(spec, "Desc", HPDF_String_New(mm, desc, NULL));
    HPDF_Dict_Add(ef, "F", file);
    HPDF_Dict_Add(spec, "EF", ef);
    if (!P->pkg) {
        HPDF_NameTree_Add(tree, HPDF_String_New(mm, name, NULL), spec);
        return spec;
    }
    /* a package adds its files in sorted order, so each entry is appended to
     * the tree's Names array directly, key then value */
    HPDF_Array items = HPDF_Dict_GetItem(tree, "Names", HPDF_OCLASS_ARRAY);
    if (items) {
        HPDF_Array_Add(items, HPDF_String_New(mm, name, NULL));
        HPDF_Array_Add(items, spec);
    }
    return spec;
}

/* ---- outline ------------------------------------------------------------- */

static void outline_add(Pdf *P, const Item *it, int sheet, double top)
{
    int lv = it->outline_level < 1 ? 1 : it->outline_level > 6 ? 6 : it->outline_level;
    HPDF_Outline parent = P->root;
    for (int l = lv - 1; l >= 1; l--)
        if (P->outline[l]) {
            parent = P->outline[l];
            break;
        }
    HPDF_Outline o = HPDF_CreateOutline(P->doc, parent, it->outline,
                                        HPDF_GetEncoder(P->doc, "UTF-8"));
    if (!o)
        return;
    HPDF_Destination dst = HPDF_Page_CreateDestination(P->pages[sheet]);
    HPDF_Destination_SetFitH(dst, (HPDF_REAL)(top + 12));
    HPDF_Outline_SetDestination(o, dst);
    HPDF_Outline_SetOpened(o, lv < 2);
    P->outline[lv] = o;
    for (int l = lv + 1; l <= 6; l++)
        P->outline[l] = NULL;
}

/* ---- the report ----------------------------------------------------------- */

static bool build(Pdf *P, const char *path)
{
    const Document *d = P->d;
    report_date(P); /* before drawing: the title block falls back to it */
    if (!load_fonts(P))
        return false;
    pdf_sheet_geometry(P);
    pdf_revision_geometry(P);
    P->metrics = (MathMetrics){metric_width, P, 0.72, 0.22, 0.26};
    P->env = (MathEnv){&P->arena, &P->metrics, P->ev, P->ev->digits > 0 ? P->ev->digits : 4, NULL};
    P->painter = (MathPainter){paint_text, paint_line, paint_curve, P};
    pdf_number_references(P);
    pdf_number_figures(P);

    /* collect and measure */
    Vec items = {0};
    if (P->pkg) {
        pdf_package_items(P, &items);
    } else {
        pdf_cover_items(P, &items);
        pdf_body_items(P, &items);
        pdf_end_items(P, &items);
        pdf_revision_items(P, &items);
    }
    size_t n = items.len;
    for (size_t i = 0; i < n; i++)
        P->nwarnings += (size_t)((Item *)items.items[i])->warnings;
    PageItem *pi = xcalloc(n ? n : 1, sizeof *pi);
    PagePlace *place = xcalloc(n ? n : 1, sizeof *place);
    P->page = NULL;
    for (size_t i = 0; i < n; i++) {
        Item *it = items.items[i];
        pdf_scope_load(P, it->scope);
        it->layout.height = it->fn(P, it, 0);
        pi[i] = it->layout;
    }
    double body_h = P->sheet.body_top - P->sheet.body_bottom;
    P->npages = pagelayout_assign(pi, n, body_h, place);
    if (P->pkg)
        pdf_package_placed(P, &items, place);
    /* the sheets that show a warning, for the cover */
    P->warning_sheets = xcalloc(n ? n : 1, sizeof *P->warning_sheets);
    for (size_t i = 0; i < n; i++) {
        int sheet = place[i].page + 1;
        if (((Item *)items.items[i])->warnings > 0 &&
            (P->nwarning_sheets == 0 || P->warning_sheets[P->nwarning_sheets - 1] != sheet))
            P->warning_sheets[P->nwarning_sheets++] = sheet;
    }
    for (size_t i = 0; i < n; i++) {
        Item *it = items.items[i];
        pdf_scope_load(P, it->scope);
        if (it->ref > 0 && it->ref <= P->nrefs) {
            P->ref_page[it->ref] = place[i].page;
            P->ref_y[it->ref] = P->sheet.body_top - place[i].y + 12;
        }
    }

    /* create every sheet, then draw */
    P->pages = xcalloc((size_t)P->npages, sizeof *P->pages);
    HPDF_PageSizes size = d->meta.paper == PAPER_A4 ? HPDF_PAGE_SIZE_A4 : HPDF_PAGE_SIZE_LETTER;
    for (int s = 0; s < P->npages; s++) {
        P->pages[s] = HPDF_AddPage(P->doc);
        if (!P->pages[s])
            break;
        HPDF_Page_SetSize(P->pages[s], size, HPDF_PAGE_PORTRAIT);
    }
    if (!P->error) {
        for (int s = 0; s < P->npages; s++) {
            P->page = P->pages[s];
            pdf_scope_load(P, P->sheet_scope ? P->sheet_scope[s] : 0);
            pdf_sheet_frame(P, s);
        }
        P->root = NULL;
        for (size_t i = 0; i < n; i++) {
            Item *it = items.items[i];
            pdf_scope_load(P, it->scope);
            P->page = P->pages[place[i].page];
            double top = P->sheet.body_top - place[i].y;
            if (it->outline)
                outline_add(P, it, place[i].page, top);
            it->fn(P, it, top);
            pdf_revision_mark(P, it, top);
        }
        P->page = NULL;
    }
    free(pi);
    free(place);
    vec_free(&items);

    pdf_scope_load(P, 0);
    /* labels, information, attachment */
    HPDF_AddPageLabel(P->doc, 0, HPDF_PAGE_NUM_STYLE_DECIMAL, 1, "Sheet ");
    HPDF_SetPageMode(P->doc, HPDF_PAGE_MODE_USE_OUTLINE);
    const Meta *m = &d->meta;
    HPDF_SetCurrentEncoder(P->doc, "UTF-8");
    char kw[512];
    snprintf(kw, sizeof kw, "calculation %s; revision %s; %s; sha256 %s", m->number ? m->number : "",
             m->revision ? m->revision : "", m->status ? m->status : "", d->digest);
    PdfInfo info = {m->title ? m->title : base_name(d->file), m->prepared,
                    m->subject ? m->subject : m->project, kw, "headroom " HEADROOM_VERSION};
    set_info(P, HPDF_INFO_TITLE, info.title);
    set_info(P, HPDF_INFO_AUTHOR, info.author);
    set_info(P, HPDF_INFO_SUBJECT, info.subject);
    set_info(P, HPDF_INFO_KEYWORDS, info.keywords);
    set_info(P, HPDF_INFO_CREATOR, info.creator);
    HPDF_Dict one = NULL, *specs = &one;
    size_t nspecs = 0;
    if (P->pkg) {
        nspecs = pdf_attach_sources(P, &specs);
    } else {
        one = pdf_attach_source(P);
        nspecs = one != NULL;
    }
    if (P->error || !pdf_archive_prepare(P, &info, specs, nspecs))
        return false;
    if (HPDF_SaveToFile(P->doc, path) != HPDF_OK || P->error) {
        diag_error(P->diags, ((Pos){NULL, 0, 0}), "cannot write '%s' (libharu error 0x%04X)",
                   path, (unsigned)P->error);
        return false;
    }
    return true;
}

bool render_pdf(const Evaluated *ev, const char *path, DiagList *diags)
{
    return render_pdf_since(ev, NULL, NULL, path, diags);
}

bool render_pdf_since(const Evaluated *ev, const Diff *since, const char *since_label,
                      const char *path, DiagList *diags)
{
    return pdf_render(ev, NULL, NULL, since, since_label, path, diags);
}

bool pdf_render(const Evaluated *ev, const struct Package *pkg, const Diff *const *pkg_since,
                const Diff *since, const char *since_label, const char *path, DiagList *diags)
{
    Pdf *P = xcalloc(1, sizeof *P);
    P->pkg = pkg;
    P->pkg_since = pkg_since;
    P->ev = ev;
    P->since = since;
    P->since_label = since_label;
    P->d = ev->doc;
    P->diags = diags;
    P->governing = -1;
    arena_init(&P->arena);
    P->doc = HPDF_New(on_error, P);
    bool ok = false;
    if (!P->doc) {
        diag_error(diags, ((Pos){NULL, 0, 0}), "cannot start the PDF library");
    } else {
        HPDF_SetCompressionMode(P->doc, HPDF_COMP_ALL);
        HPDF_UseUTFEncodings(P->doc);
        ok = build(P, path);
        if (!ok && P->error && diags->errors == 0)
            diag_error(diags, ((Pos){NULL, 0, 0}), "PDF library error 0x%04X (detail %u)",
                       (unsigned)P->error, (unsigned)P->error_detail);
        HPDF_Free(P->doc);
    }
    free(P->pages);
    free(P->warning_sheets);
    arena_free(&P->arena);
    free(P);
    return ok;
}
