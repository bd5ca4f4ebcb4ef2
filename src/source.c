/* source.c — reading, checking and hashing the bytes of a calc file.
 *
 * The checks happen before any parsing so later stages can assume clean
 * UTF-8 text with a bounded size. SHA-256 comes from nettle. */
#include "source.h"

#include <errno.h>
#include <stdbool.h>
#include <nettle/sha2.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "arena.h"

char *source_read(const char *path, const char *display, size_t *len, DiagList *diags)
{
    Pos nowhere = {display, 0, 0};
    FILE *f = strcmp(path, "-") == 0 ? stdin : fopen(path, "rb");
    if (!f) {
        diag_error(diags, nowhere, "cannot open: %s", strerror(errno));
        return NULL;
    }
    struct stat st;
    bool sized = f != stdin && fstat(fileno(f), &st) == 0;
    if (sized && S_ISDIR(st.st_mode)) {
        diag_error(diags, nowhere, "is a directory, not a calc file");
        fclose(f);
        return NULL;
    }
    /* a regular file's size is known: one buffer of that size plus the byte
     * that shows end of file (a file that grows meanwhile still doubles) */
    size_t cap = 64 * 1024, n = 0;
    if (sized && S_ISREG(st.st_mode) && st.st_size >= 0 && st.st_size <= SOURCE_MAX_BYTES)
        cap = (size_t)st.st_size + 1;
    char *buf = xmalloc(cap + 1);
    errno = 0;
    for (;;) {
        if (n == cap) {
            if (cap > SOURCE_MAX_BYTES) {
                Pos start = {display, 1, 1};
                diag_error(diags, start, "file is larger than the limit of %d bytes", SOURCE_MAX_BYTES);
                *len = n; /* > SOURCE_MAX_BYTES: tells an oversize file from an I/O error */
                free(buf);
                if (f != stdin)
                    fclose(f);
                return NULL;
            }
            cap *= 2;
            buf = xrealloc(buf, cap + 1);
        }
        size_t got = fread(buf + n, 1, cap - n, f);
        n += got;
        if (got == 0)
            break;
    }
    int err = ferror(f) ? (errno ? errno : EIO) : 0;
    if (f != stdin)
        fclose(f);
    if (err) {
        diag_error(diags, nowhere, "cannot read: %s", strerror(err));
        free(buf);
        return NULL;
    }
    if (n > SOURCE_MAX_BYTES) {
        Pos start = {display, 1, 1};
        diag_error(diags, start, "file is larger than the limit of %d bytes", SOURCE_MAX_BYTES);
        *len = n;
        free(buf);
        return NULL;
    }
    buf[n] = '\0';
    *len = n;
    return buf;
}

size_t source_utf8_len(const unsigned char *s, size_t left)
{
    unsigned char c = s[0];
    if (c < 0x80)
        return 1;
    size_t n;
    unsigned cp;
    if (c >= 0xC2 && c <= 0xDF) {
        n = 2;
        cp = c & 0x1Fu;
    } else if (c >= 0xE0 && c <= 0xEF) {
        n = 3;
        cp = c & 0x0Fu;
    } else if (c >= 0xF0 && c <= 0xF4) {
        n = 4;
        cp = c & 0x07u;
    } else {
        return 0;
    }
    if (left < n)
        return 0;
    for (size_t i = 1; i < n; i++) {
        if ((s[i] & 0xC0) != 0x80)
            return 0;
        cp = (cp << 6) | (s[i] & 0x3Fu);
    }
    if ((n == 3 && cp < 0x800) || (n == 4 && (cp < 0x10000 || cp > 0x10FFFF)) ||
        (cp >= 0xD800 && cp <= 0xDFFF))
        return 0;
    return n;
}

bool source_check_text(const char *text, size_t len, const char *display, DiagList *diags)
{
    const unsigned char *s = (const unsigned char *)text;
    int line = 1, col = 1;
    size_t i = 0;
    /* A byte-order mark at the start is allowed and ignored by later stages. */
    while (i < len) {
        /* eight bytes at a time while all are printable ASCII (no high bit,
         * none below 0x20, none 0x7F: the classic test for a zero byte, on
         * x - 0x20.. and on x ^ 0x7F..) */
        while (i + 8 <= len && col + 8 <= SOURCE_MAX_LINE + 1) {
            uint64_t x;
            memcpy(&x, s + i, 8);
            const uint64_t ones = 0x0101010101010101u, highs = 0x8080808080808080u;
            uint64_t d = x ^ (0x7Fu * ones);
            if ((x & highs) || ((x - 0x20u * ones) & ~x & highs) || ((d - ones) & ~d & highs))
                break;
            i += 8;
            col += 8;
        }
        if (i >= len)
            break;
        unsigned char c = s[i];
        if (c >= 0x20 && c < 0x7F && col <= SOURCE_MAX_LINE) { /* printable ASCII: most of a calc */
            i++;
            col++;
            continue;
        }
        if (c == '\n') {
            line++;
            col = 1;
            i++;
            continue;
        }
        if (c == '\r' && (i + 1 >= len || s[i + 1] != '\n')) {
            /* Markdown ends a line at a lone CR; the rest of the tool counts
             * lines by LF, so positions would disagree. */
            Pos p = {display, line, col};
            diag_error(diags, p, "carriage return without a line feed; save the file with LF or CRLF line endings");
            return false;
        }
        if ((c < 0x20 && c != '\t' && c != '\r' && c != '\f') || c == 0x7F) {
            Pos p = {display, line, col};
            diag_error(diags, p, "control character (byte 0x%02X) in the source", c);
            return false;
        }
        if (col > SOURCE_MAX_LINE) {
            size_t start = i - (size_t)(col - 1);
            const unsigned char *nl = memchr(s + i, '\n', len - i);
            size_t n = (size_t)((nl ? nl : s + len) - (s + start));
            Pos p = {display, line, 1};
            diag_error(diags, p, "line is %zu bytes long; the limit is %d bytes a line", n, SOURCE_MAX_LINE);
            return false;
        }
        size_t n = source_utf8_len(s + i, len - i);
        if (n == 0) {
            Pos p = {display, line, col};
            diag_error(diags, p, "invalid UTF-8 (byte 0x%02X); save the file as UTF-8", c);
            return false;
        }
        i += n;
        col += (int)n;
    }
    return true;
}

void source_digest(const char *text, size_t len, char out[65])
{
    struct sha256_ctx ctx;
    uint8_t d[SHA256_DIGEST_SIZE];
    sha256_init(&ctx);
    sha256_update(&ctx, len, (const uint8_t *)text);
    sha256_digest(&ctx, sizeof d, d);
    static const char hex[] = "0123456789abcdef";
    for (size_t i = 0; i < sizeof d; i++) {
        out[2 * i] = hex[d[i] >> 4];
        out[2 * i + 1] = hex[d[i] & 15];
    }
    out[64] = '\0';
}

size_t *source_line_index(Arena *a, const char *text, size_t len, size_t *nlines)
{
    size_t n = 1;
    for (const char *p = text, *end = text + len; len && (p = memchr(p, '\n', (size_t)(end - p))) != NULL; p++)
        n++;
    size_t *start = arena_alloc(a, n * sizeof *start);
    size_t k = 0;
    start[k++] = 0;
    for (const char *p = text, *end = text + len; len && (p = memchr(p, '\n', (size_t)(end - p))) != NULL; p++)
        start[k++] = (size_t)(p - text) + 1;
    *nlines = k;
    return start;
}

const char *source_line(const char *text, size_t len, const size_t *line_start, size_t nlines, int line,
                        size_t *n)
{
    if (line < 1 || (size_t)line > nlines)
        return NULL;
    const char *p = text + line_start[line - 1], *end = text + len;
    const char *nl = memchr(p, '\n', (size_t)(end - p));
    size_t k = (size_t)((nl ? nl : end) - p);
    if (k && p[k - 1] == '\r')
        k--;
    *n = k;
    return p;
}
