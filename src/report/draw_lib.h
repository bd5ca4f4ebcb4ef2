/* draw_lib.h — the drawing layer's own state, shared by draw.c and
 * draw_archive.c only (the two files that call libharu, through
 * hpdf_load.h). */
#ifndef HEADROOM_DRAW_LIB_H
#define HEADROOM_DRAW_LIB_H

#include "hpdf_load.h"   /* libharu, loaded at the first build */

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

/* What a page's graphics state holds now, as written to its content
 * stream, so an operator that would set the same value again is left out.
 * A flag false: not known (a new page, or after a restore deeper than the
 * saved states). Values are kept as libharu writes them (single precision). */
typedef struct DrawState {
    bool fill_ok, stroke_ok, width_ok, cap_ok, join_ok, dash_ok, font_ok;
    HPDF_REAL fill[3], stroke[3], width, size;
    int cap, join;
    HPDF_UINT16 dash[8];
    int ndash;
    HPDF_UINT dash_phase;
    HPDF_Font font;
} DrawState;

enum { DRAW_SAVED = 8 };

struct DrawPage {
    HPDF_Page pg;
    Draw *D;
    DrawState st;
    DrawState saved[DRAW_SAVED];
    int depth;               /* graphics states saved (may exceed DRAW_SAVED) */
};

#endif
