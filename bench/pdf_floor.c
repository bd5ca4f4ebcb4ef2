/* pdf_floor.c — the floor of `headroom build`'s cost: a bare libharu
 * program writing the same pages, fonts and text as a report.
 *
 *     pdf_floor RUNS OUT.pdf
 *
 * RUNS is what bench/pdf_runs.py reads out of a report: its fonts (the
 * DejaVu files it embeds), its pages and every text run with its font,
 * size and start point. The program loads each font as headroom does (a
 * TrueType file embedded as a subset, UTF-8 text), adds the pages, shows
 * every run with the fewest operators (one text object per page, a font
 * change only when the font or size changes) and saves the file
 * compressed. Rules, boxes, figures, links and metadata are left out: what
 * is measured is the cost of the pages, fonts and text alone. */
#include <hpdf.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

enum { MAX_FONTS = 16 };

static void on_error(HPDF_STATUS error, HPDF_STATUS detail, void *user)
{
    (void)user;
    fprintf(stderr, "pdf_floor: libharu error 0x%04X (detail %u)\n", (unsigned)error,
            (unsigned)detail);
    exit(2);
}

int main(int argc, char **argv)
{
    if (argc != 3) {
        fprintf(stderr, "usage: pdf_floor RUNS OUT.pdf\n");
        return 2;
    }
    FILE *in = fopen(argv[1], "r");
    if (!in) {
        perror(argv[1]);
        return 2;
    }
    HPDF_Doc doc = HPDF_New(on_error, NULL);
    HPDF_SetCompressionMode(doc, HPDF_COMP_ALL);
    HPDF_UseUTFEncodings(doc);
    HPDF_Font font[MAX_FONTS] = {0};
    HPDF_Page page = NULL;
    HPDF_Font cur = NULL;
    double cur_size = 0;
    char *line = NULL;
    size_t cap = 0;
    ssize_t len;
    while ((len = getline(&line, &cap, in)) > 0) {
        if (line[len - 1] == '\n')
            line[--len] = '\0';
        int n = 0, used = 0;
        double a = 0, b = 0, c = 0;
        if (line[0] == 'F' && sscanf(line, "F %d %n", &n, &used) == 1 && n >= 0 && n < MAX_FONTS) {
            const char *name = HPDF_LoadTTFontFromFile(doc, line + used, HPDF_TRUE);
            font[n] = HPDF_GetFont(doc, name, "UTF-8");
        } else if (line[0] == 'P' && sscanf(line, "P %lf %lf", &a, &b) == 2) {
            if (page)
                HPDF_Page_EndText(page);
            page = HPDF_AddPage(doc);
            HPDF_Page_SetWidth(page, (HPDF_REAL)a);
            HPDF_Page_SetHeight(page, (HPDF_REAL)b);
            HPDF_Page_BeginText(page);
            cur = NULL;
        } else if (line[0] == 'T' && page &&
                   sscanf(line, "T %d %lf %lf %lf %n", &n, &a, &b, &c, &used) == 4 && n >= 0 &&
                   n < MAX_FONTS && font[n]) {
            if (font[n] != cur || a != cur_size) {
                HPDF_Page_SetFontAndSize(page, font[n], (HPDF_REAL)a);
                cur = font[n];
                cur_size = a;
            }
            HPDF_Page_SetTextMatrix(page, 1, 0, 0, 1, (HPDF_REAL)b, (HPDF_REAL)c);
            HPDF_Page_ShowText(page, line + used);
        }
    }
    free(line);
    fclose(in);
    if (page)
        HPDF_Page_EndText(page);
    HPDF_STATUS st = HPDF_SaveToFile(doc, argv[2]);
    HPDF_Free(doc);
    return st == HPDF_OK ? 0 : 2;
}
