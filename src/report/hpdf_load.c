/* hpdf_load.c — the table of libharu functions, filled at the first build. */
#define HPDF_LOAD_NO_REDIRECT
#include "hpdf_load.h"

#include "dynload.h"

#ifndef HPDF_SONAME
#define HPDF_SONAME "libhpdf-2.3.0.so"
#endif

HpdfFns hpdf_fns;

static const DynSym HPDF_SYMS[] = {
#define HPDF_FN(name) {#name, &hpdf_fns.name},
#include "hpdf_fns.def"
#undef HPDF_FN
};

static const char *const HPDF_NAMES[] = {HPDF_SONAME, "libhpdf.so", NULL};

static DynLib hpdf_lib = {HPDF_NAMES, "the PDF library libharu", HPDF_SYMS,
                          sizeof HPDF_SYMS / sizeof HPDF_SYMS[0], 0, {0}};

bool hpdf_load(const char **why)
{
    bool ok = dynload_open(&hpdf_lib);
    if (!ok && why)
        *why = hpdf_lib.why;
    return ok;
}
