/* outfile.c — classifying OUT, temporaries that clean up after themselves,
 * and copying a finished report into something that is not a regular file. */
#include "outfile.h"

#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

bool outfile_classify(const char *out, const char *const *inputs, size_t n, OutKind *kind,
                      char *why, size_t why_size)
{
    if (strcmp(out, "-") == 0) {
        *kind = OUT_STDOUT;
        return true;
    }
    struct stat so;
    if (stat(out, &so) != 0) {
        *kind = OUT_REPLACE; /* absent (or unreadable: the rename will say) */
        return true;
    }
    if (S_ISDIR(so.st_mode)) {
        snprintf(why, why_size, "'%s' is a directory", out);
        return false;
    }
    for (size_t i = 0; i < n; i++) {
        struct stat si;
        if (!inputs[i] || strcmp(inputs[i], "-") == 0 || stat(inputs[i], &si) != 0)
            continue;
        if (si.st_dev == so.st_dev && si.st_ino == so.st_ino) {
            snprintf(why, why_size, "'%s' is the calc file '%s'; the report would replace it",
                     out, inputs[i]);
            return false;
        }
    }
    *kind = S_ISREG(so.st_mode) ? OUT_REPLACE : OUT_INTO;
    return true;
}

/* ---- temporaries ----------------------------------------------------------- */

/* The one armed temporary, for the signal handler: a static buffer and a
 * sig_atomic_t flag, so the handler calls only unlink, signal and raise. */
static char armed_path[4096];
static volatile sig_atomic_t armed;
static bool handlers_installed;

static void on_fatal_signal(int sig)
{
    if (armed)
        unlink(armed_path);
    signal(sig, SIG_DFL);
    raise(sig);
}

/* exit() on the way out of a failure (out of memory) removes it too. */
static void remove_at_exit(void)
{
    if (armed)
        unlink(armed_path);
    armed = 0;
}

static void install_handlers(void)
{
    if (handlers_installed)
        return;
    handlers_installed = true;
    atexit(remove_at_exit);
    static const int sigs[] = {SIGINT, SIGTERM, SIGHUP, SIGPIPE};
    for (size_t i = 0; i < sizeof sigs / sizeof sigs[0]; i++) {
        struct sigaction old;
        if (sigaction(sigs[i], NULL, &old) == 0 && old.sa_handler == SIG_IGN)
            continue; /* ignored by the parent (nohup): keep it ignored */
        struct sigaction sa;
        memset(&sa, 0, sizeof sa);
        sa.sa_handler = on_fatal_signal;
        sigemptyset(&sa.sa_mask);
        sigaction(sigs[i], &sa, NULL);
    }
}

/* Remove DIR/PREFIX<pid>.XXXXXX left by a process that no longer exists: a
 * regular file we own, whose pid is not ours and does not answer kill(0).
 * A live pid (even a reused one) keeps its file. */
static void sweep_stale(const char *dir, const char *prefix)
{
    DIR *d = opendir(dir);
    if (!d)
        return;
    size_t plen = strlen(prefix);
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        const char *name = e->d_name;
        if (strncmp(name, prefix, plen) != 0)
            continue;
        const char *p = name + plen;
        char *end;
        errno = 0;
        long pid = strtol(p, &end, 10);
        if (errno || end == p || pid <= 0 || *end != '.' || strlen(end + 1) != 6)
            continue;
        if ((pid_t)pid == getpid() || kill((pid_t)pid, 0) == 0 || errno != ESRCH)
            continue;
        size_t need = strlen(dir) + 1 + strlen(name) + 1;
        char *full = malloc(need);
        if (!full)
            break;
        snprintf(full, need, "%s/%s", dir, name);
        struct stat st;
        if (lstat(full, &st) == 0 && S_ISREG(st.st_mode) && st.st_uid == geteuid())
            unlink(full);
        free(full);
    }
    closedir(d);
}

int outfile_temp_create(const char *out, OutKind kind, char **path)
{
    char *dir, *prefix;
    if (kind == OUT_REPLACE) {
        const char *slash = strrchr(out, '/');
        size_t dlen = slash ? (size_t)(slash - out) : 0;
        dir = slash ? strndup(out, dlen ? dlen : 1) : strdup(".");
        const char *base = slash ? slash + 1 : out;
        size_t n = strlen(base) + 8;
        prefix = malloc(n);
        if (prefix)
            snprintf(prefix, n, "%s.tmp.", base);
    } else {
        const char *t = getenv("TMPDIR");
        dir = strdup(t && t[0] ? t : "/tmp");
        prefix = strdup("headroom.tmp.");
    }
    if (!dir || !prefix) {
        free(dir);
        free(prefix);
        errno = ENOMEM;
        return -1;
    }
    sweep_stale(dir, prefix);
    size_t n = strlen(dir) + strlen(prefix) + 40;
    char *tmp = malloc(n + strlen(out));
    if (!tmp) {
        free(dir);
        free(prefix);
        errno = ENOMEM;
        return -1;
    }
    /* OUT.tmp.PID.XXXXXX beside OUT (kept in OUT's own spelling of its
     * directory), or DIR/headroom.tmp.PID.XXXXXX. */
    if (kind == OUT_REPLACE)
        snprintf(tmp, n + strlen(out), "%s.tmp.%ld.XXXXXX", out, (long)getpid());
    else
        snprintf(tmp, n, "%s/%s%ld.XXXXXX", dir, prefix, (long)getpid());
    free(dir);
    free(prefix);
    if (strlen(tmp) >= sizeof armed_path) {
        free(tmp);
        errno = ENAMETOOLONG;
        return -1;
    }
    install_handlers();
    /* Block the signals while the name is created and armed, so an
     * interrupt cannot fall between the two. */
    sigset_t block, old;
    sigemptyset(&block);
    sigaddset(&block, SIGINT);
    sigaddset(&block, SIGTERM);
    sigaddset(&block, SIGHUP);
    sigaddset(&block, SIGPIPE);
    sigprocmask(SIG_BLOCK, &block, &old);
    int fd = mkstemp(tmp);
    int saved = errno;
    if (fd >= 0) {
        memcpy(armed_path, tmp, strlen(tmp) + 1);
        armed = 1;
    }
    sigprocmask(SIG_SETMASK, &old, NULL);
    if (fd < 0) {
        free(tmp);
        errno = saved;
        return -1;
    }
    *path = tmp;
    return fd;
}

void outfile_temp_release(void)
{
    armed = 0;
}

bool outfile_copy(const char *from, int to)
{
    int fd = open(from, O_RDONLY);
    if (fd < 0)
        return false;
    char buf[65536];
    bool ok = true;
    for (;;) {
        ssize_t r = read(fd, buf, sizeof buf);
        if (r < 0 && errno == EINTR)
            continue;
        if (r <= 0) {
            ok = r == 0;
            break;
        }
        for (ssize_t done = 0; done < r;) {
            ssize_t w = write(to, buf + done, (size_t)(r - done));
            if (w < 0 && errno == EINTR)
                continue;
            if (w <= 0) {
                if (w == 0)
                    errno = EIO;
                ok = false;
                break;
            }
            done += w;
        }
        if (!ok)
            break;
    }
    int saved = errno;
    close(fd);
    errno = saved;
    return ok;
}
