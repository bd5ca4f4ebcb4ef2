/* bounds.h — every limit headroom puts on its input, in one place.
 *
 * A calc file is read from people and from other programs alike, so every
 * quantity that grows with the input is bounded: hostile or broken input gets
 * a clear `file:line:col: error:` at the first thing over a limit (exit 2),
 * never a crash, a hang or an exhausted stack. The limits are far above what
 * a real calculation package needs; DEVELOPERS.md lists them with their
 * messages and tests/limits/run has a pathological input for each.
 * (Named bounds.h, not limits.h, so it never shadows the C header.) */
#ifndef HEADROOM_BOUNDS_H
#define HEADROOM_BOUNDS_H

enum {
    SOURCE_MAX_BYTES = 8 * 1024 * 1024, /* largest calc file accepted */
    SOURCE_MAX_LINE = 64 * 1024,        /* longest line, in bytes, anywhere in the file */
    PARSE_MAX_DEPTH = 200,              /* levels of one expression tree: every operator, sign,
                                           parenthesis, field and call. Every walker (evaluation,
                                           layout, text, JSON, diff) recurses once per level, so
                                           this bounds the stack: tests/limits/run runs a tree at
                                           the limit through every command, and chains 100 times
                                           the length that once overflowed, under ulimit -s 1024 */
    FRONTMATTER_MAX_VALUE = 4096,       /* bytes of one front-matter value (title, a note, ...);
                                           the PDF holds at most 65,535 in one string */
    MARKDOWN_MAX_DEPTH = 64,            /* nested block quotes, lists and inline emphasis */
    DOC_MAX_STATEMENTS = 100000,        /* statements of a file, all calc blocks and paths */
    PATH_MAX_SEGMENTS = 10000,          /* rows of one path table */
    NETWORK_MAX_ROWS = 10000,           /* nodes, and links, of one network */
    CURVE_MAX_POINTS = 10000,           /* rows of one curve table */
    CASES_MAX_ROWS = 1000,              /* rows of one cases table */
    CASES_MAX_WORK = 2000000,           /* rows x statements over all cases tables */
    SOLVE_MAX_ITERATIONS = 1500,        /* Brent iterations of one solve: enough to bisect
                                           any bracket of doubles down to a root of zero */
    SUGGEST_MAX_NAMES = 5000,           /* earlier names searched for a "did you mean" */
    SUGGEST_MAX_ERRORS = 1000,          /* after this many errors, no more "did you mean" */
    LSP_MAX_MESSAGE = 32 * 1024 * 1024, /* bytes of one language-server message body */
    LSP_MAX_HEADER_LINE = 1024,         /* bytes of one header line of a message */
    LSP_MAX_DOCUMENTS = 64,             /* calcs open in one language server at once */
    LSP_MAX_OPEN_BYTES = 64 * 1024 * 1024, /* text of all the open calcs together */
    USE_MAX_DEPTH = 16,                 /* files in a chain of use("...") (a uses b uses c ...) */
    USE_MAX_FILES = 1000,               /* distinct files used in one run, over every part */
    USE_MAX_BYTES = 64 * 1024 * 1024,   /* source bytes of every used file of one run */
    PACKAGE_MAX_PARTS = 500             /* calc files in one package index's `parts:` list */
};

#endif
