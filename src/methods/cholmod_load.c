/* cholmod_load.c — the table of CHOLMOD functions, filled at the first network solve. */
#define CHOLMOD_LOAD_NO_REDIRECT
#include "cholmod_load.h"

#include "dynload.h"

#ifndef CHOLMOD_SONAME
#define CHOLMOD_SONAME "libcholmod.so.3"
#endif

CholmodFns cholmod_fns;

static const DynSym CHOLMOD_SYMS[] = {
#define CHOLMOD_FN(name) {#name, &cholmod_fns.name},
#include "cholmod_fns.def"
#undef CHOLMOD_FN
};

static const char *const CHOLMOD_NAMES[] = {CHOLMOD_SONAME, "libcholmod.so", NULL};

static DynLib cholmod_lib = {CHOLMOD_NAMES, "the sparse solver SuiteSparse CHOLMOD", CHOLMOD_SYMS,
                          sizeof CHOLMOD_SYMS / sizeof CHOLMOD_SYMS[0], 0, {0}};

bool cholmod_load(const char **why)
{
    bool ok = dynload_open(&cholmod_lib);
    if (!ok && why)
        *why = cholmod_lib.why;
    return ok;
}
