/* network.h — pipe networks solved for flows and heads (DESIGN 2.12).
 *
 * The evaluator evaluates a network's cells to values and hands them here.
 * Each link's head loss is Darcy-Weisbach with the calc's friction method
 * (laminar below Re 2000) or Hazen-Williams, plus its fittings and K, plus
 * its device; the flows and heads come from the global gradient algorithm
 * (methods/gradient.c). Once solved, each link is computed again through
 * the library functions a calc line would call, so methods, validity
 * warnings and references come out the same as in a path. */
#ifndef HEADROOM_NETWORK_H
#define HEADROOM_NETWORK_H

#include "eval.h"

/* The evaluated cells; VAL_NONE where a cell is absent. */
typedef struct NetNodeInput {
    Value elevation, demand, head, pressure, x, y;
    bool has_load;           /* demand made from the node's fixtures: their load and each item's */
    double load;
    double *fixture_each, *fixture_total;
} NetNodeInput;

typedef struct NetLinkInput {
    Value pipe, length, K, C, device;
} NetLinkInput;

/* Solve the network; on success *out is the network record (native data
 * the NetworkResult) and true is returned. */
bool network_solve(CallCtx *cx, const Stmt *s, const Value *fluid, const Value *tolerance, const NetNodeInput *nodes,
                   const NetLinkInput *links, Value *out, const NetworkResult **result);

#endif
