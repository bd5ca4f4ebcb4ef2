/* figures.c — `figure KIND(ARGS)`: evaluates the arguments and hands them
 * to flow_figure (flow.c), which draws nothing: it gathers the series the
 * renderers plot. */
#include "eval_internal.h"

#include "flow.h"

void eval_figure(const Stmt *s, StmtResult *res, EvalCtx *c)
{
    Value *args = arena_alloc(&c->doc->arena, (s->fig->nargs + 1) * sizeof *args);
    bool ok = true;
    for (size_t i = 0; i < s->fig->nargs; i++)
        ok = eval_expr(c, s->fig->args[i], &args[i]) && ok;
    if (!ok) {
        res->state = c->upstream ? RES_NOT_EVALUATED : RES_FAILED;
        return;
    }
    FigureData *fd = NULL;
    if (!flow_figure(c->call, s, args, &fd)) {
        res->state = RES_FAILED;
        return;
    }
    res->made = eval_made(c->ev, (StmtMade){.figure = fd});
    res->state = RES_OK;
}
