/* cholmod_load.h — SuiteSparse CHOLMOD, loaded at the first network solve
 * (see dynload.h). gradient.c includes this after <suitesparse/cholmod.h>:
 * each CHOLMOD function it calls is listed in cholmod_fns.def and a macro
 * below turns the call into one through the table cholmod_fns, which
 * cholmod_load() fills. A function missing from the list fails to link. */
#ifndef HEADROOM_CHOLMOD_LOAD_H
#define HEADROOM_CHOLMOD_LOAD_H

#include <stdbool.h>
#include <suitesparse/cholmod.h>

typedef struct CholmodFns {
#define CHOLMOD_FN(name) __typeof__(name) *name;
#include "cholmod_fns.def"
#undef CHOLMOD_FN
} CholmodFns;

extern CholmodFns cholmod_fns;

/* Load CHOLMOD once; false with the reason in why (one line). */
bool cholmod_load(const char **why);

/* The calls, redirected (hpdf_load.c / cholmod_load.c, which fill the table, go without). */
#ifndef CHOLMOD_LOAD_NO_REDIRECT
#define cholmod_l_allocate_dense (*cholmod_fns.cholmod_l_allocate_dense)
#define cholmod_l_allocate_sparse (*cholmod_fns.cholmod_l_allocate_sparse)
#define cholmod_l_analyze (*cholmod_fns.cholmod_l_analyze)
#define cholmod_l_factorize (*cholmod_fns.cholmod_l_factorize)
#define cholmod_l_finish (*cholmod_fns.cholmod_l_finish)
#define cholmod_l_free_dense (*cholmod_fns.cholmod_l_free_dense)
#define cholmod_l_free_factor (*cholmod_fns.cholmod_l_free_factor)
#define cholmod_l_free_sparse (*cholmod_fns.cholmod_l_free_sparse)
#define cholmod_l_solve (*cholmod_fns.cholmod_l_solve)
#define cholmod_l_start (*cholmod_fns.cholmod_l_start)
#endif

#endif
