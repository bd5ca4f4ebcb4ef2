/* pdf_package.c — one PDF for a calc package (DESIGN 2.13).
 *
 * The package report is the single-calc report's machinery run over several
 * calcs: every item carries the scope of the calc it shows (scope 0 is the
 * package's own, from the index; scope k the k-th part), and the renderer
 * loads that scope before it measures or draws the item, so the item
 * functions of the body, the references and the appendix work unchanged.
 * One layout places every item, so sheets are numbered through the whole
 * package and the contents table knows each part's sheets before the first
 * sheet is drawn. */
#include "report/pdf_internal.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "package.h"
#include "source.h"

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

/* ---- the contents table ------------------------------------------------------ */

static const double CONTENTS_COL[] = {0.07, 0.43, 0.14, 0.24, 0.12}; /* part, subject, calc no., file, sheets */

static double fn_contents_head(Pdf *P, const Item *it, double top)
{
    (void)it;
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l, h = 14;
    const char *head[5] = {"PART", "SUBJECT", "CALC NO.", "SOURCE AND SHA-256", "SHEETS"};
    pdf_fill(P, x, top - h, W, h, SHADE);
    for (int c = 0; c < 5; c++) {
        pdf_text_color(P, FONT_SANS_BOLD, 6.5, x + 3, top - 9.5, head[c], GREY);
        x += CONTENTS_COL[c] * W;
    }
    pdf_line(P, s->body_l, top, s->body_r, top, 0.7);
    pdf_line(P, s->body_l, top - h, s->body_r, top - h, 0.4);
    return h;
}

static const char *file_base(const char *path)
{
    const char *s = strrchr(path, '/');
    const char *c = strrchr(path, ':');
    if (c && (!s || c > s))
        s = c;
    return s ? s + 1 : path;
}

/* A row of the contents: it->aux is the part's scope (1..), or, below zero,
 * -(1 + k) for the k-th used file that is not a part. */
static double fn_contents_row(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    double W = s->body_r - s->body_l, x = s->body_l, size = 8.5, lead = 10.5;
    double cx[5];
    cx[0] = x;
    for (int c = 1; c < 5; c++)
        cx[c] = cx[c - 1] + CONTENTS_COL[c - 1] * W;
    const Document *d;
    char no[16] = "", sheets[32] = "—";
    int first = -1;
    if (it->aux > 0) {
        const PdfScope *sc = &P->scopes[it->aux];
        d = sc->d;
        snprintf(no, sizeof no, "%d", it->aux);
        first = sc->first_sheet;
        if (sc->first_sheet >= 0 && sc->last_sheet > sc->first_sheet)
            snprintf(sheets, sizeof sheets, "%d–%d", sc->first_sheet + 1, sc->last_sheet + 1);
        else if (sc->first_sheet >= 0)
            snprintf(sheets, sizeof sheets, "%d", sc->first_sheet + 1);
    } else {
        d = P->pkg->extra[-it->aux - 1]->doc;
        snprintf(sheets, sizeof sheets, "used");
    }
    const Meta *m = &d->meta;
    const char *subject = m->subject ? m->subject : m->title ? m->title : file_base(d->file);
    double h1 = pdf_wrap(P, FONT_SERIF, size, lead, cx[1] + 3, top - 3, CONTENTS_COL[1] * W - 6, subject);
    double h2 = pdf_wrap(P, FONT_SERIF, size, lead, cx[2] + 3, top - 3, CONTENTS_COL[2] * W - 6,
                         m->number ? m->number : "");
    char dig[13];
    memcpy(dig, d->digest, 12);
    dig[12] = '\0';
    double h = h1 > h2 ? h1 : h2;
    if (h < 2 * lead)
        h = 2 * lead;
    h += 6;
    if (P->page) {
        pdf_text(P, FONT_SERIF_BOLD, size, cx[0] + 3, top - 10.5, no);
        pdf_text(P, FONT_SERIF, size, cx[3] + 3, top - 10.5, file_base(d->file));
        pdf_text_color(P, FONT_MONO, 7, cx[3] + 3, top - 10.5 - lead, dig, GREY);
        pdf_text(P, FONT_SERIF, size, cx[4] + 3, top - 10.5, sheets);
        if (first >= 0 && first < P->npages) {
            draw_link(P->page, x, top - h, x + W, top, P->pages[first], NAN, DRAW_LINK_PRINTED);
        }
        pdf_line(P, x, top - h, x + W, top - h, 0.3);
    }
    return h;
}

/* ---- a part's first item ---------------------------------------------------------- */

static double fn_part_title(Pdf *P, const Item *it, double top)
{
    const Sheet *s = &P->sheet;
    const Meta *m = &P->d->meta;
    double x = s->body_l, W = s->body_r - s->body_l;
    char *head = arena_printf(&P->arena, "PART %d OF %d  ·  %s", it->aux, P->nscopes - 1,
                              file_base(P->d->file));
    pdf_text_color(P, FONT_SANS_BOLD, 8, x, top - 8, head, GREY);
    const char *title = m->title ? m->title : file_base(P->d->file);
    double h = 14 + pdf_wrap(P, FONT_SERIF_BOLD, 14, 17, x, top - 14, W, title);
    pdf_line(P, x, top - h - 4, x + W, top - h - 4, 0.8);
    return h + 10;
}

/* ---- assembling ----------------------------------------------------------------------- */

void pdf_package_items(Pdf *P, Vec *items)
{
    const Package *pkg = P->pkg;
    int n = (int)pkg->nparts + 1;
    P->scopes = arena_alloc(&P->arena, (size_t)n * sizeof *P->scopes);
    P->nscopes = n;
    P->scope = 0;
    pdf_scope_save(P, &P->scopes[0]);
    /* every part's numbering, as its own report would have it */
    for (int k = 1; k < n; k++) {
        const PackagePart *pp = &pkg->parts[k - 1];
        P->ev = pp->ev;
        P->d = pp->doc;
        P->model = report_model_build(pp->ev, &P->arena);
        P->env = (MathEnv){&P->scratch, &P->metrics, pp->ev, pp->ev->digits > 0 ? pp->ev->digits : 4, NULL, NULL};
        P->governing = -1;
        P->preliminary = !pdf_status_issued(pp->doc->meta.status);
        P->since = P->pkg_since ? P->pkg_since[k - 1] : NULL;
        pdf_number_references(P);
        pdf_number_figures(P);
        P->scope = k;
        pdf_scope_save(P, &P->scopes[k]);
        P->scopes[k].first_sheet = P->scopes[k].last_sheet = -1;
    }
    P->scope = n - 1;
    pdf_scope_load(P, 0);
    P->scopes[0].first_sheet = P->scopes[0].last_sheet = -1;

    /* the governing check across the package: the highest utilisation */
    double best = -1;
    int gk = -1, gi = -1;
    P->pkg_failed = pkg->nfailed + pkg->case_rows_failing;
    for (int k = 1; k < n; k++) {
        const ReportModel *m = P->scopes[k].model;
        if (m->governing >= 0 && m->rows[m->governing].check.utilization > best) {
            best = m->rows[m->governing].check.utilization;
            gk = k;
            gi = m->governing;
        }
    }
    if (gk > 0)
        P->scopes[gk].governing = gi;

    pdf_package_cover_items(P, items);
    Item *sec = pdf_section(P, items, "Contents", true, true);
    (void)sec;
    item_add(items, P, fn_contents_head, NULL, 0, 0);
    ((Item *)items->items[items->len - 1])->layout.keep_with_next = true;
    for (int k = 1; k < n; k++)
        item_add(items, P, fn_contents_row, NULL, k, 0);
    for (size_t i = 0; i < pkg->nextra; i++)
        item_add(items, P, fn_contents_row, NULL, -1 - (int)i, 0);

    for (int k = 1; k < n; k++) {
        pdf_scope_load(P, k);
        size_t from = items->len;
        item_add(items, P, fn_part_title, NULL, k, 0);
        Item *t = items->items[items->len - 1];
        t->layout.break_before = true;
        t->layout.keep_with_next = true;
        t->outline = arena_printf(&P->arena, "Part %d — %s", k,
                                  P->d->meta.title ? P->d->meta.title : file_base(P->d->file));
        t->outline_level = 1;
        P->scopes[k].first_item = from;
        size_t body = items->len;
        pdf_body_items(P, items);
        if (items->len > body) /* the part's title opens its first sheet, not the body */
            ((Item *)items->items[body])->layout.break_before = false;
        pdf_end_items(P, items);
        pdf_revision_items(P, items);
        /* the part's outline sits under its title */
        for (size_t i = from + 1; i < items->len; i++) {
            Item *it = items->items[i];
            if (it->outline && it->outline_level < 6)
                it->outline_level++;
        }
    }
    pdf_scope_load(P, 0);
}

void pdf_package_placed(Pdf *P, Vec *items, const PagePlace *place)
{
    P->sheet_scope = arena_alloc(&P->arena, (size_t)(P->npages + 1) * sizeof *P->sheet_scope);
    for (int s = 0; s < P->npages; s++)
        P->sheet_scope[s] = -1;
    for (size_t i = 0; i < items->len; i++) {
        const Item *it = items->items[i];
        int pg = place[i].page;
        /* a part's rows in the cover's summary sit on the package's sheets */
        int owner = it->scope > 0 && i < P->scopes[it->scope].first_item ? 0 : it->scope;
        if (P->sheet_scope[pg] < 0)
            P->sheet_scope[pg] = owner;
        PdfScope *sc = &P->scopes[owner];
        if (sc->first_sheet < 0 || pg < sc->first_sheet)
            sc->first_sheet = pg;
        if (pg > sc->last_sheet)
            sc->last_sheet = pg;
    }
    for (int s = 0; s < P->npages; s++)
        if (P->sheet_scope[s] < 0)
            P->sheet_scope[s] = s > 0 ? P->sheet_scope[s - 1] : 0;
    /* the scope in force is P's, whatever was loaded last: keep arrays in step */
    pdf_scope_save(P, &P->scopes[P->scope]);
}

typedef struct Attachment {
    const Document *d;
    char name[96];
} Attachment;

static int by_name(const void *a, const void *b)
{
    return strcmp(((const Attachment *)a)->name, ((const Attachment *)b)->name);
}

size_t pdf_attach_sources(Pdf *P, DrawFile ***specs)
{
    /* the index, every part and every file the parts use that is not a
     * part; names made distinct ("2-basis.calc.md" for a second basis) and
     * added in sorted order, as the name tree keeps them */
    size_t n = (size_t)P->nscopes + P->pkg->nextra;
    Attachment *a = xcalloc(n + 1, sizeof *a);
    for (size_t i = 0; i < n; i++) {
        a[i].d = i < (size_t)P->nscopes ? P->scopes[i].d : P->pkg->extra[i - (size_t)P->nscopes]->doc;
        snprintf(a[i].name, sizeof a[i].name, "%s", file_base(a[i].d->file));
    }
    for (size_t i = 0; i < n; i++) {
        size_t dup = 1;
        bool taken = true;
        while (taken) {
            taken = false;
            for (size_t k = 0; k < i && !taken; k++)
                taken = strcmp(a[k].name, a[i].name) == 0;
            if (taken)
                snprintf(a[i].name, sizeof a[i].name, "%zu-%.80s", ++dup, file_base(a[i].d->file));
        }
    }
    qsort(a, n, sizeof *a, by_name);
    *specs = arena_alloc(&P->arena, (n + 1) * sizeof **specs);
    for (size_t i = 0; i < n; i++)
        (*specs)[i] = pdf_attach_named(P, a[i].d, a[i].name);
    /* the package's identity: every source's digest, in that order */
    StrBuf all = {0};
    for (size_t i = 0; i < n; i++)
        sb_puts(&all, a[i].d->digest);
    source_digest(sb_str(&all), all.len, P->pkg_digest);
    sb_free(&all);
    free(a);
    return n;
}
