/* dynload.h — load a shared library at its first use.
 *
 * headroom links the PDF library (libharu) and the sparse solver (SuiteSparse
 * CHOLMOD, which pulls in BLAS, LAPACK and the Fortran run-time) only when a
 * run builds a PDF or solves a network: loading them at every start-up costs
 * far more than a `check` of a small calc. A module that needs one keeps a
 * table of typed function pointers, lists its symbols in a DynSym array and
 * calls dynload_open() before the first call; the first caller loads, later
 * callers (on any thread) see the filled table. */
#ifndef HEADROOM_DYNLOAD_H
#define HEADROOM_DYNLOAD_H

#include <stdbool.h>
#include <stddef.h>

typedef struct DynSym {
    const char *name;        /* the symbol, as the library exports it */
    void *slot;              /* the address of a function pointer to fill */
} DynSym;

typedef struct DynLib {
    const char *const *sonames; /* tried in order, NULL-terminated */
    const char *what;        /* "the PDF library libharu", for the message */
    const DynSym *syms;
    size_t nsyms;
    /* state, zero-initialised; guarded by a lock inside dynload.c */
    int state;               /* 0 not tried, 1 loaded, -1 failed */
    char why[256];           /* the failure, once state is -1 */
} DynLib;

/* Load lib and resolve every symbol, once. Returns true when loaded; false
 * with a one-line reason in lib->why (the library and what dlopen or dlsym
 * said). Safe to call from several threads. */
bool dynload_open(DynLib *lib);

#endif
