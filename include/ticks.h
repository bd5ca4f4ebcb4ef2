/* ticks.h — where an axis of a figure puts its ticks, and what they say.
 *
 * Format-neutral: the PDF renderer asks for the ticks of a data range and
 * draws them; nothing here knows fonts or pages. The axis ends on ticks, so
 * a figure's frame starts and stops at labelled values.
 *
 * Linear axes: the step is the smallest of 1, 2, 2.5 and 5 × 10^n for which
 * the ticks from the last multiple of the step at or below the data minimum
 * to the first at or above the maximum number at most seven (so four to
 * seven ticks); every tick is labelled, with as many decimals as the step
 * needs ([0, 184.7] → 0, 50, 100, 150, 200; [-12, 3] → -15 … 5). A zero-width range is widened by ±10 % of its value (±1
 * at zero) first.
 *
 * Log axes (positive data only): when the data span more than 2.5 decades
 * the axis ends on whole decades ([600, 1e8] → 10^2 … 10^8); otherwise it
 * ends on the 1-2-5 values around the data ([0.006, 0.11] → 0.005 … 0.2).
 * Every decade is labelled; 2 and 5 × 10^n are labelled too when the axis
 * spans three decades or fewer; the other integer multiples are unlabelled
 * minor ticks. Decade labels of a whole-decade axis read 10^n; all other
 * labels are plain numbers from num_parts (numfmt.h).
 *
 * The caller owns the TickSet (a fixed array, no allocation). */
#ifndef HEADROOM_TICKS_H
#define HEADROOM_TICKS_H

#include <stdbool.h>
#include <stddef.h>

enum { TICKS_MAX = 96 };

typedef enum TickKind {
    TICK_MAJOR,     /* labelled: every linear tick, every decade */
    TICK_LABELLED,  /* labelled minor: 2 and 5 × 10^n on a short log axis */
    TICK_MINOR      /* unlabelled minor of a log axis */
} TickKind;

typedef struct Tick {
    double v;
    TickKind kind;
    char label[40];     /* UTF-8-free plain text: "150", "0.25", "10^6", "" for minor */
    char mantissa[40];  /* for drawing: the number, or "" when the label is 10^exp10 alone */
    int exp10;          /* × 10^exp10 when nonzero (or when mantissa is "") */
} Tick;

typedef struct TickSet {
    double lo, hi;      /* the axis ends: the first and last tick */
    bool log;
    Tick t[TICKS_MAX];
    size_t n;
} TickSet;

/* Ticks of a linear axis covering [dmin, dmax]; false when either is not finite. */
bool ticks_linear(double dmin, double dmax, TickSet *out);

/* Ticks of a log axis covering [dmin, dmax]; false unless 0 < dmin <= dmax, both finite. */
bool ticks_log(double dmin, double dmax, TickSet *out);

#endif
