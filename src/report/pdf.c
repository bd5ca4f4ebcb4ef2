/* pdf.c — the PDF report's orchestrator, drawing through draw.h.
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

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "package.h"

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

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

/* ---- fonts, dates, information ------------------------------------------- */

static bool load_fonts(Pdf *P)
{
    const char *dir = getenv("HEADROOM_FONT_DIR");
    if (!dir || !*dir)
        dir = FONT_DIR;
    for (int i = 0; i < FONT_ROLE_COUNT; i++) {
        char path[4096];
        snprintf(path, sizeof path, "%s/%s", dir, FONT_FILE[i]);
        if (!draw_font_file(P->draw, i, path))
            return false;
    }
    return true;   /* each is loaded at its first use */
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

static const char *base_name(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

/* ---- outline ------------------------------------------------------------- */

static void outline_add(Pdf *P, const Item *it, int sheet, double top)
{
    int lv = it->outline_level < 1 ? 1 : it->outline_level > 6 ? 6 : it->outline_level;
    DrawOutline *parent = P->root;
    for (int l = lv - 1; l >= 1; l--)
        if (P->outline[l]) {
            parent = P->outline[l];
            break;
        }
    DrawOutline *o = draw_outline_add(P->draw, parent, it->outline, P->pages[sheet], top + 12, lv < 2);
    if (!o)
        return;
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
    pdf_math_setup(P);
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
        arena_free(&P->scratch);
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
    for (int s = 0; s < P->npages; s++) {
        P->pages[s] = draw_page_add(P->draw, d->meta.paper == PAPER_A4);
        if (!P->pages[s])
            break;
    }
    if (!draw_error(P->draw)) {
        for (int s = 0; s < P->npages; s++) {
            P->page = P->pages[s];
            pdf_scope_load(P, P->sheet_scope ? P->sheet_scope[s] : 0);
            pdf_sheet_frame(P, s);
            arena_free(&P->scratch);
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
            arena_free(&P->scratch);
        }
        P->page = NULL;
    }
    free(pi);
    free(place);
    vec_free(&items);

    pdf_scope_load(P, 0);
    /* labels, information, attachment */
    draw_page_labels(P->draw, "Sheet ");
    const Meta *m = &d->meta;
    char kw[512];
    snprintf(kw, sizeof kw, "calculation %s; revision %s; %s; sha256 %s", m->number ? m->number : "",
             m->revision ? m->revision : "", m->status ? m->status : "", d->digest);
    DrawInfo info = {m->title ? m->title : base_name(d->file), m->prepared,
                    m->subject ? m->subject : m->project, kw, "headroom " HEADROOM_VERSION};
    draw_info(P->draw, &info);
    DrawFile *one = NULL, **specs = &one;
    size_t nspecs = 0;
    if (P->pkg) {
        nspecs = pdf_attach_sources(P, &specs);
    } else {
        one = pdf_attach_source(P);
        nspecs = one != NULL;
    }
    const char *digest = P->pkg_digest[0] ? P->pkg_digest : d->digest;
    if (draw_error(P->draw) || !draw_archive_prepare(P->draw, &info, P->date, digest, specs, nspecs))
        return false;
    return draw_save_file(P->draw, path);
}

static bool pdf_render(const Evaluated *ev, const struct Package *pkg, const Diff *const *pkg_since,
                       const Diff *since, const char *since_label, const char *path,
                       DiagList *diags);

bool render_pdf(const Evaluated *ev, const char *path, DiagList *diags)
{
    return render_pdf_since(ev, NULL, NULL, path, diags);
}

bool render_pdf_since(const Evaluated *ev, const Diff *since, const char *since_label,
                      const char *path, DiagList *diags)
{
    return pdf_render(ev, NULL, NULL, since, since_label, path, diags);
}

static bool pdf_render(const Evaluated *ev, const struct Package *pkg, const Diff *const *pkg_since,
                       const Diff *since, const char *since_label, const char *path,
                       DiagList *diags)
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
    arena_init(&P->scratch);
    P->model = report_model_build(ev, &P->arena);
    size_t errors_before = diags->errors;
    P->draw = draw_new(diags);
    bool ok = false;
    if (!P->draw) {
        if (diags->errors == errors_before) /* not already told why */
            diag_error(diags, ((Pos){NULL, 0, 0}), "cannot start the PDF library");
    } else {
        ok = build(P, path);
        if (!ok && draw_error(P->draw) && diags->errors == 0)
            diag_error(diags, ((Pos){NULL, 0, 0}), "PDF library error 0x%04X (detail %u)",
                       draw_error(P->draw), draw_error_detail(P->draw));
        draw_free(P->draw);
    }
    free(P->pages);
    free(P->warning_sheets);
    arena_free(&P->scratch);
    arena_free(&P->arena);
    free(P);
    return ok;
}

bool render_package_pdf(const Package *pkg, const Diff *const *since, const char *since_label,
                        const char *path, DiagList *diags)
{
    const Diff *any = NULL;
    for (size_t i = 0; since && i < pkg->nparts && !any; i++)
        any = since[i];
    if (since && !any) {
        /* every part is new since OLD: nothing to compare, still a revision */
        any = NULL;
    }
    return pdf_render(pkg->index_ev, pkg, since, any, since_label, path, diags);
}
