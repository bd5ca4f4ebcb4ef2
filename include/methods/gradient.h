/* gradient.h — steady flows and heads of a pipe network by the global
 * gradient algorithm (Todini and Pilati 1988).
 *
 * Pure numerics in SI (m^3/s, m). The caller describes the topology (each
 * link runs from one node to another), which nodes have a known head (the
 * supplies), the flow each other node delivers (its demand), and the head
 * loss of each link as a function of its flow through a callback; the solver
 * finds the link flows and junction heads that satisfy continuity at every
 * junction and the energy equation H_from - H_to = h(Q) on every link.
 * Devices that change their state with the flow are link kinds: one-way
 * links (a check valve, a pump) close rather than run backwards; a
 * pressure-reducing link holds the head at its outlet node while it can.
 * The caller owns every array; the solver allocates only its work space
 * and frees it before returning. */
#ifndef HEADROOM_METHODS_GRADIENT_H
#define HEADROOM_METHODS_GRADIENT_H

#include <stdbool.h>
#include <stddef.h>

typedef enum GradientStatus {
    GRADIENT_OK,
    GRADIENT_NO_CONVERGENCE,  /* max_iter reached: *imbalance_node is the worst node */
    GRADIENT_SINGULAR,        /* a part of the network lost every supply (links closed) */
    GRADIENT_NOT_FINITE,      /* a loss callback returned NaN or infinity */
    GRADIENT_NO_MEMORY,
    GRADIENT_NO_LIBRARY       /* CHOLMOD could not be loaded: GradientResult.no_library says why */
} GradientStatus;

typedef enum GradientLinkKind {
    GRADIENT_LINK_OPEN,       /* flows either way */
    GRADIENT_LINK_ONE_WAY,    /* closes when the flow would reverse */
    GRADIENT_LINK_PRV         /* pressure-reducing: holds H(to) at set_head while it can */
} GradientLinkKind;

typedef enum GradientLinkState {
    GRADIENT_STATE_OPEN,
    GRADIENT_STATE_CLOSED,    /* one-way or PRV link with no flow */
    GRADIENT_STATE_ACTIVE,    /* PRV regulating its outlet head */
    GRADIENT_STATE_WIDE_OPEN  /* PRV unable to reach its setting: only its least drop */
} GradientLinkState;

/* The head loss h of link `link` at flow Q (signed, from -> to) and its
 * derivative dh/dQ (> 0 for a pipe). A pump link returns its pipe loss less
 * the pump head. Return false when the loss cannot be computed. */
typedef bool (*GradientLossFn)(void *ctx, size_t link, double Q, double *h, double *dhdQ);

typedef struct GradientNetwork {
    size_t nnodes, nlinks;
    const size_t *from, *to;         /* per link: node indices, from != to */
    const bool *fixed;               /* per node: head known (a supply) */
    const double *demand;            /* per node: flow leaving it (junctions) */
    const GradientLinkKind *kind;    /* per link */
    const double *set_head;          /* per link: PRV outlet head setting (PRV only) */
    const double *min_drop;          /* per link: PRV least head drop across it (PRV only) */
    GradientLossFn loss;
    void *ctx;
    double tolerance;                /* on flow, m^3/s */
    int max_iter;
} GradientNetwork;

typedef struct GradientResult {
    int iterations;
    double imbalance;                /* largest continuity error at any junction, m^3/s */
    size_t imbalance_node;
    double last_change;              /* largest flow change of the last iteration, m^3/s */
    double energy_residual;          /* largest |H_from - H_to - h(Q)| over open links, m */
    const char *no_library;          /* GRADIENT_NO_LIBRARY: why the sparse solver did not load */
} GradientResult;

/* Solve. H holds the fixed heads (and a starting guess at junctions) and
 * receives every head; Q holds starting flows and receives the flows;
 * state receives each link's final state; valve_drop the head a PRV
 * takes (0 for other links). Every node must be reachable from a fixed
 * node (the caller checks, so it can name the node). */
GradientStatus gradient_solve(const GradientNetwork *net, double *H, double *Q, GradientLinkState *state,
                              double *valve_drop, GradientResult *out);

#endif
