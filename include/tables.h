/* tables.h — the fenced blocks that hold tables: ```path NAME and
 * ```cases (DESIGN 2.2a), ```curve NAME (DESIGN 2.10).
 *
 * Their contents are `key: value` option lines and a pipe table whose cells
 * are calc expressions. The markdown stage hands over the fence's lines with
 * their file positions; these functions build the document nodes, reporting
 * every problem at its cell. Nodes live in the document's Arena. */
#ifndef HEADROOM_TABLES_H
#define HEADROOM_TABLES_H

#include "doc.h"

typedef struct FenceLine {
    const char *text;
    size_t len;
    Pos pos;
} FenceLine;

/* A path block named `name`; returns a STMT_PATH (parse_failed set after
 * errors, so the name is still known). */
Stmt *tables_parse_path(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags);

/* A network block named `name` (DESIGN 2.12): options, a node table and a
 * link table; topology errors (duplicate or unknown ids, a link to itself,
 * no supply, a node no supply reaches) are found here, at their cells.
 * Returns a STMT_NETWORK (parse_failed set after errors). */
Stmt *tables_parse_network(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags);
/* A curve block named `name`; returns a STMT_CURVE (parse_failed set after
 * errors, so the name is still known). */
Stmt *tables_parse_curve(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags);

/* A cases block; NULL after reporting when it is unusable. */
CaseTable *tables_parse_cases(Arena *a, Pos at, const FenceLine *lines, size_t n, DiagList *diags);

#endif
