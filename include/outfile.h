/* outfile.h — where a report goes, and getting it there without harm.
 *
 * A report is rendered into a temporary file and renamed over OUT, so a
 * failed run never leaves a half-written report. What is not a report is
 * never replaced: OUT that exists and is not a regular file (/dev/null, a
 * FIFO, a terminal, /dev/stdout) is written into, OUT "-" is standard output,
 * and OUT that is the same file (device and inode) as the calc or a file it
 * reads is refused. A temporary is named OUT.tmp.PID.XXXXXX: it is removed on
 * SIGINT, SIGTERM, SIGHUP and SIGPIPE, and a later run sweeps one whose
 * process no longer exists (after SIGKILL or a power cut). */
#ifndef HEADROOM_OUTFILE_H
#define HEADROOM_OUTFILE_H

#include <stdbool.h>
#include <stddef.h>

/* How OUT is to be written. */
typedef enum OutKind {
    OUT_REPLACE, /* absent or a regular file: temporary, then rename */
    OUT_STDOUT,  /* "-" */
    OUT_INTO,    /* exists and is not a regular file: written into, never replaced */
} OutKind;

/* Classify `out`. Refuses (false, with a message in `why`) a directory and an
 * OUT that is the same file as one of `inputs` (n of them; NULL entries and
 * "-" are skipped). */
bool outfile_classify(const char *out, const char *const *inputs, size_t n, OutKind *kind,
                      char *why, size_t why_size);

/* Create a temporary file for `out` and arm its removal on a signal: beside
 * `out` (OUT_REPLACE) or in $TMPDIR or /tmp (otherwise). Stale temporaries
 * of dead processes are swept first. Returns an open descriptor and the path
 * (heap, caller frees) or -1 with errno set. One temporary at a time. */
int outfile_temp_create(const char *out, OutKind kind, char **path);

/* The temporary is gone (renamed or unlinked): disarm its removal. */
void outfile_temp_release(void);

/* Copy the file at `from` to descriptor `to`; false with errno set. */
bool outfile_copy(const char *from, int to);

#endif
