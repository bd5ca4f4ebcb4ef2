/* draw_lib.h — the drawing layer's own state, shared by draw.c and
 * draw_archive.c only (the two files that include <hpdf.h>). */
#ifndef HEADROOM_DRAW_LIB_H
#define HEADROOM_DRAW_LIB_H

#include <hpdf.h>

#include "report/draw.h"

struct Draw {
    HPDF_Doc doc;
    DiagList *diags;
    HPDF_Font font[DRAW_FONTS];
    char *font_path[DRAW_FONTS];
    DrawPage **pages;
    int npages, cap;
    bool font_failed;        /* a font could not be loaded (reported) */
    HPDF_STATUS error;       /* the first libharu error */
    HPDF_STATUS error_detail;
};

struct DrawPage {
    HPDF_Page pg;
    Draw *D;
};

#endif
