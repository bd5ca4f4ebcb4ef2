/* figlayout.h — the geometry of a figure's axes and labels, apart from
 * drawing (pdf_figure.c draws; tests/unit/test_figlayout.c tests these). */
#ifndef HEADROOM_FIGLAYOUT_H
#define HEADROOM_FIGLAYOUT_H

#include <stdbool.h>

/* The least share of a grade-line figure's head axis the grade lines fill
 * when the pipe elevation is drawn with them. */
#define FIGLAYOUT_GRADE_SHARE 0.3

/* The value range of a grade-line figure's head axis from the grade lines'
 * [g_lo, g_hi] and the pipe's elevations [z_lo, z_hi] (NaN: no pipe): the
 * data's own range, never forced to zero; the pipe is on the axis only
 * when the grade lines still fill FIGLAYOUT_GRADE_SHARE of it, so a small
 * head loss far above the pipe is not drawn flat. Returns whether the pipe
 * is on the axis; [*lo, *hi] is the range. */
bool figlayout_grade_range(double g_lo, double g_hi, double z_lo, double z_hi, double *lo, double *hi);

/* Whether the segment (ax, ay)-(bx, by) meets the box [x0, x1] x [y0, y1]
 * (its edges included). */
bool figlayout_segment_hits(double ax, double ay, double bx, double by, double x0, double y0,
                            double x1, double y1);

#endif
