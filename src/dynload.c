/* dynload.c — load a shared library at its first use (see dynload.h). */
#include "dynload.h"

#include <dlfcn.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>

static pthread_mutex_t load_lock = PTHREAD_MUTEX_INITIALIZER;

static bool load_locked(DynLib *lib)
{
    void *h = NULL;
    const char *err = "no library name";
    for (const char *const *n = lib->sonames; *n && !h; n++) {
        h = dlopen(*n, RTLD_NOW | RTLD_LOCAL);
        if (!h)
            err = dlerror();
    }
    if (!h) {
        snprintf(lib->why, sizeof lib->why, "cannot load %s (%s): %s", lib->what, lib->sonames[0],
                 err ? err : "unknown error");
        return false;
    }
    for (size_t i = 0; i < lib->nsyms; i++) {
        void *p = dlsym(h, lib->syms[i].name);
        if (!p) {
            snprintf(lib->why, sizeof lib->why, "%s (%s) has no symbol %s", lib->what, lib->sonames[0],
                     lib->syms[i].name);
            dlclose(h);
            return false;
        }
        /* POSIX guarantees a data pointer from dlsym converts to a function
         * pointer; copy the bytes rather than cast between the two kinds. */
        memcpy(lib->syms[i].slot, &p, sizeof p);
    }
    return true;
}

bool dynload_open(DynLib *lib)
{
    pthread_mutex_lock(&load_lock);
    if (lib->state == 0)
        lib->state = load_locked(lib) ? 1 : -1;
    bool ok = lib->state == 1;
    pthread_mutex_unlock(&load_lock);
    return ok;
}
