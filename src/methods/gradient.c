/* gradient.c — the global gradient algorithm (Todini and Pilati 1988).
 *
 * Unknowns: the flow Q of every link and the head H of every junction.
 * Equations, with A12 the link-node incidence (-1 at a link's from node,
 * +1 at its to node) and A21 its transpose:
 *   energy,     per link:     h(Q) + A12 H = 0        (H_from - H_to = h(Q))
 *   continuity, per junction: A21 Q = q              (inflow - outflow = demand)
 * Newton's method on both at once, with D = diag(dh/dQ), gives per step
 *   D dQ + A12 dH = -r1,   A21 dQ = -r2
 * and eliminating dQ leaves one system in the junction heads alone,
 *   (A21 D^-1 A12) dH = r2 - A21 D^-1 r1,   dQ = -D^-1 (r1 + A12 dH),
 * whose matrix is a weighted graph Laplacian of the junctions: symmetric,
 * and positive definite when every junction is joined to a supply. Because
 * the continuity equations are linear, every step leaves continuity exactly
 * met; the energy equations converge quadratically.
 *
 * The head system is solved by SuiteSparse's CHOLMOD: a sparse Cholesky
 * factorisation (supernodal or simplicial, chosen by CHOLMOD from the
 * matrix) after a fill-reducing ordering (AMD or METIS). A network's
 * matrix has the pattern of its junction graph, about three entries a row,
 * so a dense solve would waste n^2 memory and n^3 time; the pattern never
 * changes between steps (a closed link keeps its entries, as zeros), so the
 * ordering and symbolic analysis are done once and only the numeric
 * factorisation is repeated each step.
 *
 * Devices change state with the solution, checked after each step:
 * a one-way link (check valve, pump) closes when its flow reverses and
 * reopens when the heads would drive it forward; a pressure-reducing link
 * regulating its outlet takes that node's head as known (H = set_head) and
 * its own flow from the outlet's continuity, goes wide open (only its least
 * drop) when the inlet cannot reach the setting, and closes against
 * reverse flow. A junction that no open link joins to a supply takes no
 * step (its head stays put); if it has demand, continuity fails there and
 * the solve reports no convergence at that node. */
#include "methods/gradient.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cholmod_load.h"   /* CHOLMOD, loaded at the first solve */

/* The smallest dh/dQ a link may have in the Jacobian (s/m^2): a pump on
 * the rising part of its curve would otherwise give zero or less. */
static const double MIN_SLOPE = 1e-6;

typedef struct Work {
    const GradientNetwork *net;
    size_t nj;                /* junctions (rows of the head system) */
    long *row;                /* per node: its row, or -1 for a fixed node */
    size_t *diag_at;          /* per junction: index of its diagonal entry in x */
    long *off_at;             /* per link: index of its off-diagonal entry, -1 if none */
    double *d, *r1, *b;       /* per link; per junction */
    double *prescribed;       /* per junction: NAN, or the step an identity row takes */
    unsigned char *reached;   /* per node: joined to a supply through open links */
    size_t *queue;
    size_t *adj_start, *adj;  /* node -> incident links */
    cholmod_common cm;
    cholmod_sparse *A;
    cholmod_factor *L;
} Work;

static int cmp_long(const void *a, const void *b)
{
    long x = *(const long *)a, y = *(const long *)b;
    return (x > y) - (x < y);
}

/* The head system's pattern: the upper triangle (row <= column), one
 * diagonal per junction and one entry per pair of junctions a link joins. */
static bool work_pattern(Work *w)
{
    const GradientNetwork *n = w->net;
    size_t nj = w->nj;
    /* entries per column: diagonal + links whose larger row is this column */
    size_t *count = calloc(nj + 1, sizeof *count);
    if (!count)
        return false;
    for (size_t j = 0; j < nj; j++)
        count[j] = 1;
    for (size_t l = 0; l < n->nlinks; l++) {
        long a = w->row[n->from[l]], c = w->row[n->to[l]];
        if (a >= 0 && c >= 0)
            count[a > c ? a : c]++;
    }
    size_t nnz = 0;
    for (size_t j = 0; j < nj; j++)
        nnz += count[j];
    w->A = cholmod_l_allocate_sparse(nj, nj, nnz, 1, 1, 1, CHOLMOD_REAL, &w->cm);
    if (!w->A) {
        free(count);
        return false;
    }
    long *Ap = w->A->p, *Ai = w->A->i;
    /* (row, link) pairs per column, sorted by row, duplicates of one pair of
     * junctions (parallel links) share an entry. */
    long *key = malloc((nnz + 1) * 2 * sizeof *key);
    if (!key) {
        free(count);
        return false;
    }
    size_t *fill = calloc(nj + 1, sizeof *fill);
    size_t *start = calloc(nj + 1, sizeof *start);
    if (!fill || !start) {
        free(count);
        free(key);
        free(fill);
        free(start);
        return false;
    }
    for (size_t j = 1; j <= nj; j++)
        start[j] = start[j - 1] + count[j - 1];
    /* key pairs: (row, id) where id = -1 for the diagonal, else the link */
    for (size_t j = 0; j < nj; j++) {
        size_t k = start[j] + fill[j]++;
        key[2 * k] = (long)j;
        key[2 * k + 1] = -1;
    }
    for (size_t l = 0; l < n->nlinks; l++) {
        long a = w->row[n->from[l]], c = w->row[n->to[l]];
        if (a < 0 || c < 0)
            continue;
        long lo = a < c ? a : c, hi = a < c ? c : a;
        size_t k = start[hi] + fill[hi]++;
        key[2 * k] = lo;
        key[2 * k + 1] = (long)l;
    }
    size_t out = 0;
    for (size_t j = 0; j < nj; j++) {
        qsort(key + 2 * start[j], count[j], 2 * sizeof *key, cmp_long);
        Ap[j] = (long)out;
        long last = -1;
        for (size_t k = start[j]; k < start[j] + count[j]; k++) {
            long r = key[2 * k], id = key[2 * k + 1];
            if (r != last) {
                Ai[out++] = r;
                last = r;
            }
            if (id < 0)
                w->diag_at[j] = out - 1;
            else
                w->off_at[id] = (long)(out - 1);
        }
    }
    Ap[nj] = (long)out;
    free(count);
    free(key);
    free(fill);
    free(start);
    return true;
}

static void work_free(Work *w)
{
    if (w->L)
        cholmod_l_free_factor(&w->L, &w->cm);
    if (w->A)
        cholmod_l_free_sparse(&w->A, &w->cm);
    cholmod_l_finish(&w->cm);
    free(w->row);
    free(w->diag_at);
    free(w->off_at);
    free(w->d);
    free(w->r1);
    free(w->b);
    free(w->prescribed);
    free(w->reached);
    free(w->queue);
    free(w->adj_start);
    free(w->adj);
}

static bool link_open(GradientLinkState s)
{
    return s == GRADIENT_STATE_OPEN || s == GRADIENT_STATE_WIDE_OPEN;
}

/* Which nodes reach a supply (or an active PRV's outlet, whose head is
 * held) through open links. */
static void work_reach(Work *w, const GradientLinkState *state)
{
    const GradientNetwork *n = w->net;
    size_t head = 0, tail = 0;
    memset(w->reached, 0, n->nnodes);
    for (size_t i = 0; i < n->nnodes; i++)
        if (n->fixed[i]) {
            w->reached[i] = 1;
            w->queue[tail++] = i;
        }
    for (size_t l = 0; l < n->nlinks; l++)
        if (state[l] == GRADIENT_STATE_ACTIVE && !w->reached[n->to[l]]) {
            w->reached[n->to[l]] = 1;
            w->queue[tail++] = n->to[l];
        }
    while (head < tail) {
        size_t i = w->queue[head++];
        for (size_t k = w->adj_start[i]; k < w->adj_start[i + 1]; k++) {
            size_t l = w->adj[k];
            if (!link_open(state[l]))
                continue;
            size_t o = n->from[l] == i ? n->to[l] : n->from[l];
            if (!w->reached[o]) {
                w->reached[o] = 1;
                w->queue[tail++] = o;
            }
        }
    }
}

/* Inflow less outflow less demand at each junction. */
static double imbalance(const GradientNetwork *n, const double *Q, size_t *where, double *net_in)
{
    memset(net_in, 0, n->nnodes * sizeof *net_in);
    for (size_t l = 0; l < n->nlinks; l++) {
        net_in[n->to[l]] += Q[l];
        net_in[n->from[l]] -= Q[l];
    }
    double worst = -1;
    *where = 0;
    for (size_t i = 0; i < n->nnodes; i++) {
        if (n->fixed[i])
            continue;
        double e = fabs(net_in[i] - n->demand[i]);
        if (e > worst) {
            worst = e;
            *where = i;
        }
    }
    return worst > 0 ? worst : 0;
}

GradientStatus gradient_solve(const GradientNetwork *n, double *H, double *Q, GradientLinkState *state,
                              double *valve_drop, GradientResult *out)
{
    Work w;
    memset(&w, 0, sizeof w);
    w.net = n;
    memset(out, 0, sizeof *out);
    if (!cholmod_load(&out->no_library))
        return GRADIENT_NO_LIBRARY;
    cholmod_l_start(&w.cm);
    w.cm.print = 0;
    size_t nn = n->nnodes, nl = n->nlinks;
    w.row = malloc((nn + 1) * sizeof *w.row);
    w.off_at = malloc((nl + 1) * sizeof *w.off_at);
    w.d = calloc(nl + 1, sizeof *w.d);
    w.r1 = calloc(nl + 1, sizeof *w.r1);
    w.reached = calloc(nn + 1, 1);
    w.queue = malloc((nn + 1) * sizeof *w.queue);
    w.adj_start = calloc(nn + 2, sizeof *w.adj_start);
    w.adj = malloc((2 * nl + 1) * sizeof *w.adj);
    double *net_in = calloc(nn + 1, sizeof *net_in);
    GradientStatus status = GRADIENT_NO_MEMORY;
    if (!w.row || !w.off_at || !w.d || !w.r1 || !w.reached || !w.queue || !w.adj_start || !w.adj || !net_in)
        goto done;
    for (size_t i = 0; i < nn; i++)
        w.row[i] = n->fixed[i] ? -1 : (long)w.nj++;
    for (size_t l = 0; l < nl; l++) {
        w.off_at[l] = -1;
        w.adj_start[n->from[l] + 1]++;
        w.adj_start[n->to[l] + 1]++;
    }
    for (size_t i = 0; i < nn; i++)
        w.adj_start[i + 1] += w.adj_start[i];
    {
        size_t *fill = calloc(nn + 1, sizeof *fill);
        if (!fill)
            goto done;
        for (size_t l = 0; l < nl; l++) {
            w.adj[w.adj_start[n->from[l]] + fill[n->from[l]]++] = l;
            w.adj[w.adj_start[n->to[l]] + fill[n->to[l]]++] = l;
        }
        free(fill);
    }
    w.diag_at = calloc(w.nj + 1, sizeof *w.diag_at);
    w.b = calloc(w.nj + 1, sizeof *w.b);
    w.prescribed = calloc(w.nj + 1, sizeof *w.prescribed);
    if (!w.diag_at || !w.b || !w.prescribed)
        goto done;
    for (size_t l = 0; l < nl; l++) {
        state[l] = n->kind[l] == GRADIENT_LINK_PRV ? GRADIENT_STATE_ACTIVE : GRADIENT_STATE_OPEN;
        valve_drop[l] = 0;
    }
    if (w.nj == 0) {
        /* Every node a supply: each link's flow from its own energy
         * equation would need a root-finder per link; the caller's network
         * always has a junction, but stay correct without one. */
        status = GRADIENT_SINGULAR;
        goto done;
    }
    if (!work_pattern(&w))
        goto done;
    w.L = cholmod_l_analyze(w.A, &w.cm);
    if (!w.L)
        goto done;

    cholmod_dense *bd = cholmod_l_allocate_dense(w.nj, 1, w.nj, CHOLMOD_REAL, &w.cm);
    if (!bd)
        goto done;
    status = GRADIENT_NO_CONVERGENCE;
    double *Ax = w.A->x;
    for (int it = 1; it <= n->max_iter; it++) {
        out->iterations = it;
        work_reach(&w, state);
        memset(Ax, 0, ((long *)w.A->p)[w.nj] * sizeof *Ax);
        memset(w.b, 0, w.nj * sizeof *w.b);
        /* Rows with a known step: an active PRV's outlet, and junctions cut
         * off from every supply. */
        for (size_t i = 0; i < nn; i++)
            if (w.row[i] >= 0)
                w.prescribed[w.row[i]] = w.reached[i] ? NAN : 0;
        for (size_t l = 0; l < nl; l++)
            if (state[l] == GRADIENT_STATE_ACTIVE && w.row[n->to[l]] >= 0)
                w.prescribed[w.row[n->to[l]]] = n->set_head[l] - H[n->to[l]];
        /* Energy residuals and slopes. */
        bool finite = true;
        for (size_t l = 0; l < nl; l++) {
            if (!link_open(state[l]))
                continue;
            double h, d;
            if (!n->loss(n->ctx, l, Q[l], &h, &d) || !isfinite(h) || !isfinite(d)) {
                finite = false;
                break;
            }
            if (state[l] == GRADIENT_STATE_WIDE_OPEN)
                h += n->min_drop[l];
            w.d[l] = d > MIN_SLOPE ? d : MIN_SLOPE;
            w.r1[l] = h - (H[n->from[l]] - H[n->to[l]]);
        }
        if (!finite) {
            status = GRADIENT_NOT_FINITE;
            break;
        }
        /* Continuity residuals r2 = A21 Q - q. */
        size_t where;
        imbalance(n, Q, &where, net_in);
        for (size_t i = 0; i < nn; i++)
            if (w.row[i] >= 0)
                w.b[w.row[i]] = net_in[i] - n->demand[i];
        /* Assemble A21 D^-1 A12 and the right side. */
        for (size_t l = 0; l < nl; l++) {
            if (!link_open(state[l]))
                continue;
            double inv = 1 / w.d[l], g = w.r1[l] * inv;
            long a = w.row[n->from[l]], c = w.row[n->to[l]];
            bool a_free = a >= 0 && isnan(w.prescribed[a]);
            bool c_free = c >= 0 && isnan(w.prescribed[c]);
            if (a_free) {
                Ax[w.diag_at[a]] += inv;
                w.b[a] += g;
                if (c >= 0 && !c_free)
                    w.b[a] += inv * w.prescribed[c];
            }
            if (c_free) {
                Ax[w.diag_at[c]] += inv;
                w.b[c] -= g;
                if (a >= 0 && !a_free)
                    w.b[c] += inv * w.prescribed[a];
            }
            if (a_free && c_free)
                Ax[w.off_at[l]] -= inv;
        }
        for (size_t j = 0; j < w.nj; j++)
            if (!isnan(w.prescribed[j])) {
                Ax[w.diag_at[j]] = 1;
                w.b[j] = w.prescribed[j];
            }
        if (!cholmod_l_factorize(w.A, w.L, &w.cm) || w.cm.status == CHOLMOD_NOT_POSDEF) {
            status = GRADIENT_SINGULAR;
            break;
        }
        memcpy(bd->x, w.b, w.nj * sizeof *w.b);
        cholmod_dense *x = cholmod_l_solve(CHOLMOD_A, w.L, bd, &w.cm);
        if (!x) {
            status = GRADIENT_NO_MEMORY;
            break;
        }
        const double *dH = x->x;
        double change = 0;
        for (size_t l = 0; l < nl; l++) {
            if (!link_open(state[l]))
                continue;
            long a = w.row[n->from[l]], c = w.row[n->to[l]];
            double dha = a >= 0 ? dH[a] : 0, dhc = c >= 0 ? dH[c] : 0;
            double dq = -(w.r1[l] + dhc - dha) / w.d[l];
            Q[l] += dq;
            if (fabs(dq) > change)
                change = fabs(dq);
        }
        for (size_t i = 0; i < nn; i++)
            if (w.row[i] >= 0)
                H[i] += dH[w.row[i]];
        cholmod_l_free_dense(&x, &w.cm);
        /* Device states: one-way links first, so a PRV's flow is taken
         * from its outlet's continuity with the check valves already shut. */
        bool changed = false;
        for (size_t l = 0; l < nl; l++) {
            if (n->kind[l] != GRADIENT_LINK_ONE_WAY)
                continue;
            double dh = H[n->from[l]] - H[n->to[l]], h0, d0;
            GradientLinkState was = state[l];
            if (state[l] == GRADIENT_STATE_OPEN && Q[l] < 0) {
                state[l] = GRADIENT_STATE_CLOSED;
                Q[l] = 0;
            } else if (state[l] == GRADIENT_STATE_CLOSED && n->loss(n->ctx, l, 0, &h0, &d0) && dh > h0) {
                state[l] = GRADIENT_STATE_OPEN;
            }
            changed = changed || state[l] != was;
        }
        /* An active PRV passes what its outlet needs. */
        for (size_t l = 0; l < nl; l++) {
            if (state[l] != GRADIENT_STATE_ACTIVE)
                continue;
            size_t j = n->to[l];
            double others = 0;
            for (size_t k = w.adj_start[j]; k < w.adj_start[j + 1]; k++) {
                size_t m = w.adj[k];
                if (m != l)
                    others += n->to[m] == j ? Q[m] : -Q[m];
            }
            double q = n->demand[j] - others;
            if (fabs(q - Q[l]) > change)
                change = fabs(q - Q[l]);
            Q[l] = q;
        }
        for (size_t l = 0; l < nl; l++) {
            if (n->kind[l] != GRADIENT_LINK_PRV)
                continue;
            double dh = H[n->from[l]] - H[n->to[l]];
            GradientLinkState was = state[l];
            double hp = 0, dp = 0;
            if (!n->loss(n->ctx, l, Q[l] > 0 ? Q[l] : 0, &hp, &dp))
                hp = 0;
            double slack = 1e-9 * (1 + fabs(n->set_head[l]));
            if (state[l] == GRADIENT_STATE_ACTIVE) {
                if (Q[l] < 0) {
                    state[l] = GRADIENT_STATE_CLOSED;
                    Q[l] = 0;
                } else if (H[n->from[l]] - hp - H[n->to[l]] < n->min_drop[l]) {
                    state[l] = GRADIENT_STATE_WIDE_OPEN;
                }
            } else if (state[l] == GRADIENT_STATE_WIDE_OPEN) {
                if (Q[l] < 0) {
                    state[l] = GRADIENT_STATE_CLOSED;
                    Q[l] = 0;
                } else if (H[n->to[l]] > n->set_head[l] + slack) {
                    state[l] = GRADIENT_STATE_ACTIVE;
                }
            } else if (dh > n->min_drop[l] && H[n->to[l]] <= n->set_head[l] + slack) {
                state[l] = GRADIENT_STATE_ACTIVE;
            }
            changed = changed || state[l] != was;
        }
        out->last_change = change;
        out->imbalance = imbalance(n, Q, &out->imbalance_node, net_in);
        if (!changed && change <= n->tolerance && out->imbalance <= n->tolerance) {
            status = GRADIENT_OK;
            break;
        }
    }
    cholmod_l_free_dense(&bd, &w.cm);

    /* The final record: valve drops and the energy residual. */
    out->imbalance = imbalance(n, Q, &out->imbalance_node, net_in);
    out->energy_residual = 0;
    for (size_t l = 0; l < nl; l++) {
        double h, d;
        if (!link_open(state[l]) && state[l] != GRADIENT_STATE_ACTIVE)
            continue;
        if (!n->loss(n->ctx, l, Q[l], &h, &d))
            continue;
        double dh = H[n->from[l]] - H[n->to[l]];
        if (state[l] == GRADIENT_STATE_ACTIVE) {
            valve_drop[l] = dh - h;
            continue;
        }
        if (state[l] == GRADIENT_STATE_WIDE_OPEN) {
            valve_drop[l] = n->min_drop[l];
            h += n->min_drop[l];
        }
        if (fabs(dh - h) > out->energy_residual)
            out->energy_residual = fabs(dh - h);
    }
done:
    free(net_in);
    work_free(&w);
    return status;
}
