/* revision.c — reading a calc file from a git revision for `headroom diff`.
 *
 * `REV:path` runs `git cat-file blob REV:path` by fork and execvp with an
 * argv array: no shell ever sees the user's text, and the argument reaches
 * git as one word. cat-file (rather than `git show`) returns the stored bytes
 * of a file only: it fails on a directory or a commit instead of printing a
 * listing, and never applies a textconv driver (the diff driver of the
 * README would otherwise feed the text listing back in). Standard output and
 * standard error are drained together with poll(), so neither pipe can fill
 * and stall git. */
#include "revision.h"

#include <errno.h>
#include <poll.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include "load.h"
#include "source.h"

enum { ERR_KEEP = 2048 };

/* Run git; its standard output goes to *out (heap, NUL-terminated). Returns
 * false with a message in `why` when git fails or cannot run. */
static bool git_read_blob(const char *spec, char **out, size_t *len, char *why, size_t nwhy)
{
    int po[2], pe[2];
    if (pipe(po) != 0) {
        snprintf(why, nwhy, "cannot run git: %s", strerror(errno));
        return false;
    }
    if (pipe(pe) != 0) {
        snprintf(why, nwhy, "cannot run git: %s", strerror(errno));
        close(po[0]);
        close(po[1]);
        return false;
    }
    fflush(NULL);
    pid_t pid = fork();
    if (pid < 0) {
        snprintf(why, nwhy, "cannot run git: %s", strerror(errno));
        close(po[0]); close(po[1]); close(pe[0]); close(pe[1]);
        return false;
    }
    if (pid == 0) {
        dup2(po[1], STDOUT_FILENO);
        dup2(pe[1], STDERR_FILENO);
        close(po[0]); close(po[1]); close(pe[0]); close(pe[1]);
        char *argv[] = {"git", "cat-file", "blob", (char *)spec, NULL};
        execvp("git", argv);
        const char *msg = "cannot run git: ";
        const char *err = strerror(errno);
        if (write(STDERR_FILENO, msg, strlen(msg)) < 0 || write(STDERR_FILENO, err, strlen(err)) < 0)
            _exit(127);
        _exit(127);
    }
    close(po[1]);
    close(pe[1]);
    size_t cap = 64 * 1024, n = 0, en = 0;
    char *buf = xmalloc(cap + 1);
    char err[ERR_KEEP + 1];
    bool too_big = false;
    struct pollfd fds[2] = {{po[0], POLLIN, 0}, {pe[0], POLLIN, 0}};
    int open_fds = 2;
    while (open_fds > 0) {
        if (poll(fds, 2, -1) < 0) {
            if (errno == EINTR)
                continue;
            break;
        }
        for (int k = 0; k < 2; k++) {
            if (fds[k].fd < 0 || !(fds[k].revents & (POLLIN | POLLHUP | POLLERR)))
                continue;
            char chunk[16384];
            ssize_t got = read(fds[k].fd, chunk, sizeof chunk);
            if (got < 0 && errno == EINTR)
                continue;
            if (got <= 0) {
                close(fds[k].fd);
                fds[k].fd = -1;
                open_fds--;
                continue;
            }
            size_t g = (size_t)got;
            if (k == 1) {
                size_t keep = g < ERR_KEEP - en ? g : ERR_KEEP - en;
                memcpy(err + en, chunk, keep);
                en += keep;
            } else if (n + g > SOURCE_MAX_BYTES) {
                too_big = true; /* keep draining so git can finish */
            } else {
                while (n + g > cap) {
                    cap *= 2;
                    buf = xrealloc(buf, cap + 1);
                }
                memcpy(buf + n, chunk, g);
                n += g;
            }
        }
    }
    for (int k = 0; k < 2; k++)
        if (fds[k].fd >= 0)
            close(fds[k].fd);
    int status = 0;
    while (waitpid(pid, &status, 0) < 0 && errno == EINTR)
        ;
    err[en] = '\0';
    /* The first line of git's complaint says what was wrong. */
    char *nl = strchr(err, '\n');
    if (nl)
        *nl = '\0';
    if (!WIFEXITED(status) || WEXITSTATUS(status) != 0) {
        snprintf(why, nwhy, "%s", en ? err : "git failed");
        free(buf);
        return false;
    }
    if (too_big) {
        snprintf(why, nwhy, "file is larger than the limit of %d bytes", SOURCE_MAX_BYTES);
        free(buf);
        return false;
    }
    buf[n] = '\0';
    *out = buf;
    *len = n;
    return true;
}

Document *revision_load(const char *arg, DiagList *diags)
{
    struct stat st;
    bool is_file = strcmp(arg, "-") == 0 || stat(arg, &st) == 0;
    if (is_file || !strchr(arg, ':') || arg[0] == '-')
        return doc_load(arg, diags);
    char *text = NULL;
    size_t len = 0;
    char why[ERR_KEEP + 64];
    if (!git_read_blob(arg, &text, &len, why, sizeof why)) {
        Pos nowhere = {arg, 0, 0};
        diag_error(diags, nowhere, "cannot read from git: %s", why);
        return NULL;
    }
    Document *doc = doc_from_text(arg, text, len, diags);
    doc->from_git = true;
    free(text);
    return doc;
}
