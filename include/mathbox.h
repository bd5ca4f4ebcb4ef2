/* mathbox.h — equations as format-neutral boxes.
 *
 * An expression tree (doc.h) becomes a tree of boxes once: runs of text,
 * horizontal lists, stacked fractions, sub/superscripts, radicals with a
 * vinculum and parentheses sized to their content. Every box is measured when
 * it is built (width, height above the baseline, depth below) through a
 * font-metrics callback, so this module knows no PDF library; a renderer
 * draws the finished boxes through a painter callback. Boxes live in the
 * caller's Arena and are never freed on their own. */
#ifndef HEADROOM_MATHBOX_H
#define HEADROOM_MATHBOX_H

#include <stdbool.h>
#include <stddef.h>

#include "arena.h"
#include "doc.h"
#include "eval.h"

struct ModelRow;   /* report_model.h */

/* The faces of the report (fonts/README.md says which file serves each). */
typedef enum FontRole {
    FONT_SERIF,          /* prose, upright math: numbers, units, operators */
    FONT_SERIF_BOLD,     /* results, headings */
    FONT_SERIF_ITALIC,   /* math symbols, emphasis */
    FONT_SERIF_BOLD_ITALIC,
    FONT_MONO,           /* code, the source listing */
    FONT_SANS,           /* title block and table labels */
    FONT_SANS_BOLD,
    FONT_ROLE_COUNT
} FontRole;

/* How text is measured. `width` returns the advance of a UTF-8 string in
 * points at `size`; ascent and descent are fractions of the size used for
 * the height and depth of every text run; `axis` is the height of the
 * fraction bar above the baseline, also a fraction of the size. */
typedef struct MathMetrics {
    double (*width)(void *ctx, FontRole font, double size, const char *utf8);
    void *ctx;
    double ascent, descent, axis;
} MathMetrics;

/* How boxes are drawn; y grows upwards (PDF convention). */
typedef struct MathPainter {
    void (*text)(void *ctx, FontRole font, double size, double x, double y, const char *utf8);
    void (*line)(void *ctx, double x0, double y0, double x1, double y1, double width);
    void (*curve)(void *ctx, double x0, double y0, double x1, double y1, double x2, double y2,
                  double x3, double y3, double width);
    void *ctx;
} MathPainter;

typedef enum BoxKind {
    BOX_TEXT,   /* a run in one face and size */
    BOX_HLIST,  /* children side by side on one baseline */
    BOX_FRAC,   /* a over b with a bar on the math axis */
    BOX_SCRIPT, /* a with superscript b and/or subscript c */
    BOX_ROOT,   /* radical sign over a, with a vinculum */
    BOX_FENCE,  /* parentheses (or bars) around a, grown to its height */
    BOX_SPACE   /* blank width */
} BoxKind;

typedef struct MathBox MathBox;
struct MathBox {
    BoxKind kind;
    double w, h, d;          /* width; height above and depth below the baseline */
    double size;             /* the size it was built at */
    /* TEXT */
    const char *text;
    FontRole font;
    /* HLIST */
    MathBox **kids;
    size_t nkids;
    /* FRAC (a over b), SCRIPT (base a, sup b, sub c), ROOT and FENCE (inner a) */
    MathBox *a, *b, *c;
    double rule;             /* bar, vinculum or fence stroke thickness */
    const char *open, *close;   /* FENCE: "(" ")" or "|" "|" */
    bool drawn_fence;        /* FENCE: strokes rather than glyphs */
    /* where this box's origin sits inside its parent (set by the parent) */
    double x, y;
};

/* Everything the builders need. `ev` may be NULL when only symbolic forms
 * are built (published method formulas). */
typedef struct MathEnv {
    Arena *arena;
    const MathMetrics *m;
    const Evaluated *ev;
    int digits;
    const StmtResult *row;   /* the row being set: a solve substitutes its root values (eval_read) */
    const MethodUse *use;    /* a method's formula set with one call's values (library.h) */
} MathEnv;

/* ---- primitives: each measures itself and places its children ---------- */
MathBox *mbox_text(const MathEnv *env, FontRole font, double size, const char *utf8);
MathBox *mbox_space(const MathEnv *env, double width);
MathBox *mbox_hlist(const MathEnv *env, MathBox *const *kids, size_t n);
MathBox *mbox_frac(const MathEnv *env, MathBox *num, MathBox *den, double size);
MathBox *mbox_script(const MathEnv *env, MathBox *base, MathBox *sup, MathBox *sub, double size);
MathBox *mbox_root(const MathEnv *env, MathBox *inner, double size);
MathBox *mbox_fence(const MathEnv *env, MathBox *inner, double size, const char *open,
                    const char *close);

/* Size of scripts relative to their base. */
#define MATH_SCRIPT_SCALE 0.7

/* ---- typesetting pieces of a calc ---------------------------------------- */
/* A name as its symbol: italic base, upright multi-letter subscript. */
MathBox *mbox_symbol(const MathEnv *env, const char *name, double size);
/* A number with significant figures, "×10ⁿ" when num_parts asks for it. */
MathBox *mbox_number(const MathEnv *env, double x, double size, FontRole font);
/* A unit spelled for print: "lbf*s/ft^2" -> "lbf·s/ft²", "degF" -> "°F". */
void mbox_unit_text(const char *unit, char *buf, size_t n);
/* A value in a unit: number then upright unit; records as "(record)". */
MathBox *mbox_quantity(const MathEnv *env, const Value *v, const Unit *unit, double size,
                       bool bold);
/* The expression as written (substitute false) or with every name replaced
 * by its value in its display unit (substitute true; needs env->ev). */
MathBox *mbox_expr(const MathEnv *env, const Expr *e, double size, bool substitute);

/* Draw `b` with its origin (left end of the baseline) at (x, y). */
void mbox_draw(const MathBox *b, const MathPainter *p, double x, double y);

/* ---- a calc statement as a row ------------------------------------------ */
/* A row is chains of pieces. Each chain starts a new line (the formula, the
 * substituted form, the values); every later piece of a chain begins with
 * its relation ("= ...", "≤ ..."), so a row breaks only before a relation. */
enum { MATHROW_MAX = 48 };
typedef struct MathRow {
    MathBox *piece[MATHROW_MAX];
    bool chain_start[MATHROW_MAX];
    size_t n;
} MathRow;

/* DEF: symbol = formula = substituted = result (an input: symbol = value as
 * written; a record: its fields); SOLVE: the equation, the equation with the
 * solution substituted, symbol = root; CHECK: both sides as formulas,
 * substituted and as values. NOTE rows are empty. Which lines a row has
 * (the substituted form, the result) is the report model's decision `mr`. */
void mbox_stmt_row(const MathEnv *env, const Stmt *st, const struct ModelRow *mr, double size,
                   MathRow *row);

/* Pieces of widths w[0..n) are set on lines of `avail` points: the first
 * line starts at 0, continuation lines at `indent`. Greedy: a piece goes on
 * the current line when it fits and newline[i] (may be NULL) is false, else
 * it starts a new one; a piece wider than a line sits alone on its line.
 * Fills line_of[i] and returns the number of lines. */
size_t mbox_break(const double *w, const bool *newline, size_t n, double avail, double indent,
                  size_t *line_of);

#endif
