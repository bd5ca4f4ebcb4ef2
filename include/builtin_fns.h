/* builtin_fns.h — prototypes of every function listed in src/builtins.def,
 * for the files that define them and the tests that call them directly. */
#ifndef HEADROOM_BUILTIN_FNS_H
#define HEADROOM_BUILTIN_FNS_H

#include "library.h"

#define BUILTIN(name, fn, mn, mx, kw, summary) bool fn(CallCtx *cx, const CallArgs *a, Value *out);
#include "builtins.def"
#undef BUILTIN

#endif
