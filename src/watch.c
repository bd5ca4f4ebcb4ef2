/* watch.c — the loop of `headroom watch`: inotify, debounce, signalfd.
 *
 * After each build the watched set is rebuilt from the files that build
 * read (a calc may start or stop using a file): one inotify watch per
 * directory, and a name list per watch. An event whose name is one of the
 * inputs of that directory starts (or restarts) the debounce timer; when it
 * runs out, the next build runs. SIGINT and SIGTERM are blocked and read
 * from a signalfd, so they are seen only between builds and the report being
 * written is always finished (or its temporary removed) first. */
#include <errno.h>
#include <poll.h>
#include <signal.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/inotify.h>
#include <sys/signalfd.h>
#include <time.h>
#include <unistd.h>

#include "watch.h"

typedef struct Watched {
    int wd;
    char *dir;
    Vec names;               /* base names in dir (heap) */
} Watched;

typedef struct WatchSet {
    int fd;                  /* inotify */
    Watched *w;
    size_t n;
} WatchSet;

static void set_free(WatchSet *ws)
{
    for (size_t i = 0; i < ws->n; i++) {
        free(ws->w[i].dir);
        for (size_t k = 0; k < ws->w[i].names.len; k++)
            free(ws->w[i].names.items[k]);
        vec_free(&ws->w[i].names);
    }
    free(ws->w);
    if (ws->fd >= 0)
        close(ws->fd);
    ws->w = NULL;
    ws->n = 0;
    ws->fd = -1;
}

/* Watch the directories of `inputs`. False when none can be watched. */
static bool set_build(WatchSet *ws, const Vec *inputs)
{
    set_free(ws);
    ws->fd = inotify_init1(IN_NONBLOCK | IN_CLOEXEC);
    if (ws->fd < 0) {
        fprintf(stderr, "headroom watch: inotify: %s\n", strerror(errno));
        return false;
    }
    for (size_t i = 0; i < inputs->len; i++) {
        const char *path = inputs->items[i];
        const char *slash = strrchr(path, '/');
        char *dir = slash ? xstrndup(path, slash == path ? 1 : (size_t)(slash - path)) : xstrdup(".");
        const char *base = slash ? slash + 1 : path;
        int wd = inotify_add_watch(ws->fd, dir, IN_CLOSE_WRITE | IN_MOVED_TO | IN_CREATE);
        if (wd < 0) {
            fprintf(stderr, "headroom watch: cannot watch '%s': %s\n", dir, strerror(errno));
            free(dir);
            continue;
        }
        Watched *w = NULL;
        for (size_t k = 0; k < ws->n; k++)
            if (ws->w[k].wd == wd)
                w = &ws->w[k];
        if (!w) {
            ws->w = xrealloc(ws->w, (ws->n + 1) * sizeof *ws->w);
            w = &ws->w[ws->n++];
            *w = (Watched){wd, dir, {0}};
        } else {
            free(dir);
        }
        vec_push(&w->names, xstrdup(base));
    }
    return ws->n > 0;
}

/* Read the pending events; true when one names a watched input. */
static bool set_read(WatchSet *ws)
{
    char buf[16384] __attribute__((aligned(__alignof__(struct inotify_event))));
    bool hit = false;
    for (;;) {
        ssize_t n = read(ws->fd, buf, sizeof buf);
        if (n <= 0)
            return hit;
        for (char *p = buf; p < buf + n;) {
            const struct inotify_event *ev = (const struct inotify_event *)p;
            for (size_t i = 0; i < ws->n && ev->len; i++) {
                if (ws->w[i].wd != ev->wd)
                    continue;
                for (size_t k = 0; k < ws->w[i].names.len; k++)
                    if (strcmp(ws->w[i].names.items[k], ev->name) == 0)
                        hit = true;
            }
            p += sizeof *ev + ev->len;
        }
    }
}

static long long now_ms(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (long long)t.tv_sec * 1000 + t.tv_nsec / 1000000;
}

static void inputs_free(Vec *v)
{
    for (size_t i = 0; i < v->len; i++)
        free(v->items[i]);
    vec_free(v);
}

int watch_loop(WatchBuild build, void *ctx)
{
    sigset_t mask, old;
    sigemptyset(&mask);
    sigaddset(&mask, SIGINT);
    sigaddset(&mask, SIGTERM);
    if (sigprocmask(SIG_BLOCK, &mask, &old) != 0)
        return 3;
    int sfd = signalfd(-1, &mask, SFD_CLOEXEC);
    if (sfd < 0) {
        fprintf(stderr, "headroom watch: signalfd: %s\n", strerror(errno));
        sigprocmask(SIG_SETMASK, &old, NULL);
        return 3;
    }
    WatchSet ws = {-1, NULL, 0};
    int status = 0;
    long long due = -1; /* when the debounced build runs; -1: none pending */
    bool first = true;
    for (;;) {
        if (first || (due >= 0 && now_ms() >= due)) {
            Vec inputs = {0};
            build(ctx, &inputs);
            fflush(stdout);
            bool ok = set_build(&ws, &inputs);
            inputs_free(&inputs);
            if (!ok) {
                status = 3;
                break;
            }
            if (first)
                fprintf(stderr, "headroom watch: watching; stop with Ctrl-C\n");
            first = false;
            due = -1;
        }
        struct pollfd pf[2] = {{sfd, POLLIN, 0}, {ws.fd, POLLIN, 0}};
        int timeout = -1;
        if (due >= 0) {
            long long left = due - now_ms();
            timeout = left < 0 ? 0 : (int)left;
        }
        int r = poll(pf, 2, timeout);
        if (r < 0 && errno != EINTR) {
            status = 3;
            break;
        }
        if (r > 0 && (pf[0].revents & POLLIN)) {
            struct signalfd_siginfo si;
            if (read(sfd, &si, sizeof si) == (ssize_t)sizeof si) {
                fprintf(stderr, "headroom watch: stopped by %s\n", si.ssi_signo == SIGINT ? "SIGINT" : "SIGTERM");
                status = 0;
                break;
            }
        }
        if (r > 0 && (pf[1].revents & POLLIN) && set_read(&ws))
            due = now_ms() + WATCH_DEBOUNCE_MS;
    }
    set_free(&ws);
    close(sfd);
    sigprocmask(SIG_SETMASK, &old, NULL);
    return status;
}
