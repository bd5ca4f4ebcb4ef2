/* flow.h — paths of pipe segments and the data behind figures.
 *
 * The evaluator evaluates a path's cells to values and hands them here; the
 * hydraulics of each segment are computed by calling the same library
 * functions a calc can call (friction_factor, k_fitting, hazen_williams),
 * so methods, validity warnings and references come out the same. */
#ifndef HEADROOM_FLOW_H
#define HEADROOM_FLOW_H

#include "eval.h"

/* The evaluated cells of one segment; `have` says which optional ones. */
typedef struct SegmentInput {
    Value flow, pipe, length, rise, K, C, device;
    bool has_K, has_C, has_device;
    bool has_load;           /* the path has a fixtures column */
    double load;             /* wsfu of every fixture downstream of the inlet */
    double *fixture_each;    /* wsfu of one fixture of each item of the segment's fixtures cell */
    double *fixture_total;   /* and of the item's count of them */
} SegmentInput;

/* Compute the path; on success *out is the path record (its native data
 * the PathResult) and true is returned. */
bool flow_path(CallCtx *cx, const Stmt *s, const Value *fluid, const Value *start, const SegmentInput *in,
               Value *out, const PathResult **result);

/* The data of `figure KIND(args)`. */
bool flow_figure(CallCtx *cx, const Stmt *s, const Value *args, FigureData **out);

#endif
