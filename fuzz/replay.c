/* replay.c — run a fuzz target's LLVMFuzzerTestOneInput once on each input
 * given, without libFuzzer.
 *
 * `make check` links each fuzz/fuzz_NAME.c with this file and the gcc
 * sanitizer objects of build/san/ (as build/san/replay-NAME), so every seed
 * and regression input still goes through every harness under
 * AddressSanitizer and UBSan, without compiling the tree a third time with
 * clang; `make fuzz` keeps the libFuzzer build for time-boxed fuzzing.
 *
 *     replay-NAME [FILE | DIR]...
 *
 * A directory stands for the regular files in it, in name order. The empty
 * input runs first, as libFuzzer's does. Each input is read whole and gets
 * REPLAY_TIMEOUT_S of wall time (SIGALRM); after each, the peak resident
 * memory must stay under REPLAY_RSS_LIMIT_MB (the limits tests/fuzz/run
 * gives libFuzzer). A crash or a sanitizer report ends the process with its
 * own status; "replay: FILE" on standard error before each input names the
 * one it happened in. The last line is "replay: N inputs executed". */
#include <dirent.h>
#include <errno.h>
#include <signal.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <unistd.h>

enum { REPLAY_TIMEOUT_S = 10, REPLAY_RSS_LIMIT_MB = 2048 };

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static const char *current = "(empty input)";

/* Only async-signal-safe calls: write the input's name and leave. */
static void on_alarm(int sig)
{
    (void)sig;
    static const char msg[] = "replay: timeout: ran over the time limit: ";
    ssize_t w = write(STDERR_FILENO, msg, sizeof msg - 1);
    w = write(STDERR_FILENO, current, strlen(current));
    w = write(STDERR_FILENO, "\n", 1);
    (void)w; /* nothing more to do if standard error is gone */
    _exit(70);
}

/* The whole file in a buffer of exactly its size, so the sanitizer catches
 * a read past its end; NULL with errno set when it cannot be read. */
static uint8_t *read_file(const char *path, size_t *size)
{
    struct stat st;
    FILE *f = fopen(path, "rb");
    if (!f)
        return NULL;
    if (fstat(fileno(f), &st) != 0 || !S_ISREG(st.st_mode)) {
        fclose(f);
        errno = EINVAL;
        return NULL;
    }
    size_t n = (size_t)st.st_size;
    uint8_t *buf = malloc(n ? n : 1);
    if (!buf || fread(buf, 1, n, f) != n) {
        int err = buf ? EIO : ENOMEM;
        free(buf);
        fclose(f);
        errno = err;
        return NULL;
    }
    fclose(f);
    *size = n;
    return buf;
}

/* Run one input; false when it could not be read or went over the memory
 * limit (a crash or a sanitizer report does not return). */
static int run_one(const char *path, const uint8_t *data, size_t size)
{
    current = path;
    fprintf(stderr, "replay: %s\n", path);
    alarm(REPLAY_TIMEOUT_S);
    LLVMFuzzerTestOneInput(data, size);
    alarm(0);
    struct rusage ru;
    if (getrusage(RUSAGE_SELF, &ru) == 0 && ru.ru_maxrss / 1024 > REPLAY_RSS_LIMIT_MB) {
        fprintf(stderr, "replay: %s: peak resident memory %ld MB, over the limit of %d MB\n", path,
                ru.ru_maxrss / 1024, REPLAY_RSS_LIMIT_MB);
        return 0;
    }
    return 1;
}

static int run_file(const char *path, size_t *count)
{
    size_t size = 0;
    uint8_t *data = read_file(path, &size);
    if (!data) {
        fprintf(stderr, "replay: cannot read %s: %s\n", path, strerror(errno));
        return 0;
    }
    int ok = run_one(path, data, size);
    free(data);
    (*count)++;
    return ok;
}

static int visible(const struct dirent *e)
{
    return e->d_name[0] != '.';
}

static int run_dir(const char *dir, size_t *count)
{
    struct dirent **list;
    int n = scandir(dir, &list, visible, alphasort);
    if (n < 0) {
        fprintf(stderr, "replay: cannot open %s: %s\n", dir, strerror(errno));
        return 0;
    }
    int ok = 1;
    for (int i = 0; i < n; i++) {
        char path[4096];
        struct stat st;
        if (ok && snprintf(path, sizeof path, "%s/%s", dir, list[i]->d_name) < (int)sizeof path &&
            stat(path, &st) == 0 && S_ISREG(st.st_mode))
            ok = run_file(path, count);
        free(list[i]);
    }
    free(list);
    return ok;
}

int main(int argc, char **argv)
{
    if (argc < 2) {
        fprintf(stderr, "usage: %s FILE|DIR...\n", argv[0]);
        return 2;
    }
    signal(SIGALRM, on_alarm);
    size_t count = 0;
    static const uint8_t empty[1];
    int ok = run_one("(empty input)", empty, 0);
    count++;
    for (int i = 1; ok && i < argc; i++) {
        struct stat st;
        if (stat(argv[i], &st) != 0) {
            fprintf(stderr, "replay: cannot read %s: %s\n", argv[i], strerror(errno));
            ok = 0;
        } else if (S_ISDIR(st.st_mode)) {
            ok = run_dir(argv[i], &count);
        } else {
            ok = run_file(argv[i], &count);
        }
    }
    fprintf(stderr, "replay: %zu inputs executed\n", count);
    return ok ? 0 : 1;
}
