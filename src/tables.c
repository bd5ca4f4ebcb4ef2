/* tables.c — ```path and ```cases blocks: option lines and pipe tables.
 *
 * A table row is split at '|' outside strings and parentheses, so a cell
 * may hold any expression (`pipe("ASTM B88", "2", "L")`). Each cell keeps
 * the file position of its first character, and every error names the cell
 * it is about: a missing column at the header, a short row at the row, a bad
 * expression at the character. */
#include "tables.h"

#include <ctype.h>
#include <stdio.h>
#include <string.h>

#include "methods/fittings.h"
#include "methods/friction.h"
#include "parse.h"
#include "strmap.h"

typedef struct Cell {
    const char *text;
    size_t len;
    Pos pos;
} Cell;

enum { MAX_COLUMNS = 32 };

static bool is_table_line(const FenceLine *l)
{
    size_t i = 0;
    while (i < l->len && (l->text[i] == ' ' || l->text[i] == '\t'))
        i++;
    return i < l->len && l->text[i] == '|';
}

static bool is_blank(const FenceLine *l)
{
    for (size_t i = 0; i < l->len; i++)
        if (l->text[i] != ' ' && l->text[i] != '\t' && l->text[i] != '\r')
            return false;
    return true;
}

/* Split a row into trimmed cells; returns the count (at most max). */
static size_t split_row(const FenceLine *l, Cell *cells, size_t max, bool *too_many)
{
    const char *s = l->text;
    size_t len = l->len, i = 0, n = 0;
    *too_many = false;
    while (i < len && (s[i] == ' ' || s[i] == '\t'))
        i++;
    if (i < len && s[i] == '|')
        i++;
    while (i < len) {
        size_t start = i;
        int depth = 0;
        bool in_string = false;
        while (i < len) {
            char c = s[i];
            if (in_string) {
                if (c == '\\' && i + 1 < len)
                    i++;
                else if (c == '"')
                    in_string = false;
            } else if (c == '"') {
                in_string = true;
            } else if (c == '(') {
                depth++;
            } else if (c == ')' && depth > 0) {
                depth--;
            } else if (c == '|' && depth == 0) {
                break;
            }
            i++;
        }
        size_t a = start, b = i;
        while (a < b && (s[a] == ' ' || s[a] == '\t'))
            a++;
        while (b > a && (s[b - 1] == ' ' || s[b - 1] == '\t' || s[b - 1] == '\r'))
            b--;
        bool last = i >= len;
        if (last && a == b)
            break; /* nothing after the closing '|' */
        if (n < max) {
            cells[n].text = s + a;
            cells[n].len = b - a;
            cells[n].pos = l->pos;
            cells[n].pos.col += (int)a;
            n++;
        } else {
            *too_many = true;
        }
        if (i < len)
            i++; /* past '|' */
    }
    return n;
}

static bool is_separator_row(const Cell *cells, size_t n)
{
    if (n == 0)
        return false;
    for (size_t k = 0; k < n; k++) {
        size_t dashes = 0;
        for (size_t i = 0; i < cells[k].len; i++) {
            char c = cells[k].text[i];
            if (c == '-')
                dashes++;
            else if (c != ':' && c != ' ')
                return false;
        }
        if (dashes == 0)
            return false;
    }
    return true;
}

/* A row with the wrong number of cells: a short row is reported where the
 * first missing cell would go (its closing '|'), naming that column; a long
 * row at its first cell beyond the header. */
static void report_row_width(DiagList *diags, const FenceLine *l, const Cell *cells, size_t nc,
                             const Cell *header, size_t ncols)
{
    if (nc > ncols) {
        diag_error(diags, cells[ncols].pos, "row has %zu cells, the header has %zu: this cell has no column", nc, ncols);
        return;
    }
    size_t e = l->len;
    while (e > 0 && (l->text[e - 1] == ' ' || l->text[e - 1] == '\t' || l->text[e - 1] == '\r'))
        e--;
    Pos p = l->pos;
    p.col += (int)(e > 0 && l->text[e - 1] == '|' ? e - 1 : e);
    diag_error(diags, p, "row has %zu cell%s, the header has %zu: the '%.*s' cell is missing", nc, nc == 1 ? "" : "s", ncols,
               (int)header[nc].len, header[nc].text);
}

static bool cell_is(const Cell *c, const char *word)
{
    size_t n = strlen(word);
    if (c->len != n)
        return false;
    for (size_t i = 0; i < n; i++)
        if (tolower((unsigned char)c->text[i]) != tolower((unsigned char)word[i]))
            return false;
    return true;
}

static bool cell_empty(const Cell *c)
{
    return c->len == 0 || (c->len == 1 && c->text[0] == '-');
}

/* "key: value" with the value's position. */
static bool split_option(const FenceLine *l, Cell *key, Cell *value)
{
    const char *colon = memchr(l->text, ':', l->len);
    if (!colon)
        return false;
    FenceLine k = {l->text, (size_t)(colon - l->text), l->pos};
    FenceLine v = {colon + 1, l->len - (size_t)(colon + 1 - l->text), l->pos};
    v.pos.col += (int)(colon + 1 - l->text);
    bool dummy;
    Cell kc[1], vc[1];
    /* Reuse the trimming of split_row by treating each part as one cell. */
    if (split_row(&k, kc, 1, &dummy) != 1)
        return false;
    *key = kc[0];
    if (split_row(&v, vc, 1, &dummy) != 1) {
        value->text = v.text + v.len;
        value->len = 0;
        value->pos = v.pos;
    } else {
        *value = vc[0];
    }
    return true;
}

/* A bare word or a string: `darcy`, "colebrook". */
static const char *word_value(Arena *a, const Cell *c)
{
    const char *s = c->text;
    size_t n = c->len;
    if (n >= 2 && s[0] == '"' && s[n - 1] == '"') {
        s++;
        n -= 2;
    }
    return arena_strndup(a, s, n);
}

/* "2 elbow 90 std, 1 gate": items separated by commas, each an optional
 * whole count and the fitting's words. */
static bool parse_fittings(Arena *a, const Cell *c, PathSegment *seg, DiagList *diags)
{
    if (cell_empty(c) || cell_is(c, "none"))
        return true;
    size_t cap = 1;
    for (size_t i = 0; i < c->len; i++)
        cap += c->text[i] == ',';
    seg->fittings = arena_alloc(a, cap * sizeof *seg->fittings);
    size_t i = 0;
    bool ok = true;
    while (i <= c->len) {
        size_t start = i;
        while (i < c->len && c->text[i] != ',')
            i++;
        size_t s = start, e = i;
        while (s < e && c->text[s] == ' ')
            s++;
        while (e > s && c->text[e - 1] == ' ')
            e--;
        Pos p = c->pos;
        p.col += (int)s;
        if (s == e) {
            diag_error(diags, p, "empty item in the fittings list (write '2 elbow 90 std, 1 gate')");
            ok = false;
        } else {
            FittingItem *it = &seg->fittings[seg->nfittings++];
            it->count = 1;
            it->pos = p;
            size_t k = s;
            if (isdigit((unsigned char)c->text[k])) {
                long count = 0;
                while (k < e && isdigit((unsigned char)c->text[k]) && count < 100000)
                    count = count * 10 + (c->text[k++] - '0');
                if (k < e && c->text[k] != ' ') {
                    diag_error(diags, p, "a fitting count is a whole number followed by the fitting, as in '2 elbow 90 std'");
                    ok = false;
                }
                if (count < 1 || count > 9999) {
                    diag_error(diags, p, "a fitting count must be from 1 to 9999");
                    ok = false;
                }
                it->count = (int)count;
                while (k < e && c->text[k] == ' ')
                    k++;
                it->pos.col += (int)(k - s);
            }
            if (k == e) {
                diag_error(diags, p, "a fitting count needs the fitting it counts");
                ok = false;
            }
            it->kind = arena_strndup(a, c->text + k, e - k);
        }
        i++;
    }
    return ok;
}

enum { COL_SEGMENT, COL_FLOW, COL_PIPE, COL_LENGTH, COL_RISE, COL_FITTINGS, COL_K, COL_C, COL_DEVICE, NCOLS };
static const char *const column_names[NCOLS] = {"segment", "flow", "pipe", "length", "rise", "fittings", "K", "C", "device"};
static const bool column_required[NCOLS] = {true, true, true, true, true, false, false, false, false};

/* A segment id as a record field: letters, digits and '_' kept, anything
 * else becomes '_' ("S-1" -> "S_1"); a leading digit gets "s_" ("3" -> "s_3"). */
static const char *field_name(Arena *a, const char *id)
{
    size_t n = strlen(id);
    bool digit = n && isdigit((unsigned char)id[0]);
    char *f = arena_alloc(a, n + 3);
    size_t k = 0;
    if (digit) {
        f[k++] = 's';
        f[k++] = '_';
    }
    for (size_t i = 0; i < n; i++)
        f[k++] = (isalnum((unsigned char)id[i]) || id[i] == '_') ? id[i] : '_';
    f[k] = '\0';
    return f;
}

Stmt *tables_parse_path(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags)
{
    Stmt *st = arena_alloc(a, sizeof *st);
    st->kind = STMT_PATH;
    st->pos = at;
    st->name = name;
    st->name_pos = at;
    st->var_slot = SLOT_UNRESOLVED;
    st->line = arena_printf(a, "path %s", name);
    PathSpec *ps = arena_alloc(a, sizeof *ps);
    st->path = ps;
    bool ok = true;
    size_t i = 0;

    /* Options, up to the table. */
    for (; i < n && !is_table_line(&lines[i]); i++) {
        const FenceLine *l = &lines[i];
        if (is_blank(l))
            continue;
        size_t lead = 0;
        while (lead < l->len && (l->text[lead] == ' ' || l->text[lead] == '\t'))
            lead++;
        if (lead < l->len && l->text[lead] == '#')
            continue;
        Cell key, value;
        if (!split_option(l, &key, &value)) {
            Pos p = l->pos;
            p.col += (int)lead;
            diag_error(diags, p, "expected an option 'key: value' (fluid, start, loss, friction, fittings) or the segment table");
            ok = false;
            continue;
        }
        if (value.len == 0) {
            diag_error(diags, value.pos, "option '%.*s' needs a value", (int)key.len, key.text);
            ok = false;
        } else if (cell_is(&key, "fluid")) {
            ps->fluid = parse_expression_at(a, value.text, value.len, value.pos, diags);
            ok = ps->fluid && ok;
        } else if (cell_is(&key, "start")) {
            ps->start = parse_expression_at(a, value.text, value.len, value.pos, diags);
            ok = ps->start && ok;
        } else if (cell_is(&key, "loss")) {
            const char *w = word_value(a, &value);
            if (strcmp(w, "darcy") == 0)
                ps->loss = LOSS_DARCY;
            else if (strcmp(w, "hazen_williams") == 0)
                ps->loss = LOSS_HAZEN_WILLIAMS;
            else {
                diag_error(diags, value.pos, "loss must be darcy or hazen_williams, found '%s'", w);
                ok = false;
            }
        } else if (cell_is(&key, "friction")) {
            /* Checked here, at the option, rather than once per segment
             * when the friction factor is called. */
            ps->friction = word_value(a, &value);
            int m = friction_method_lookup(ps->friction);
            if (m < 0 || m == FRICTION_LAMINAR) {
                diag_error(diags, value.pos,
                           "friction must be colebrook, swamee_jain, haaland or churchill, found '%s'", ps->friction);
                ok = false;
            }
        } else if (cell_is(&key, "fittings")) {
            ps->fittings = word_value(a, &value);
            if (fitting_method_parse(ps->fittings) < 0) {
                diag_error(diags, value.pos, "fittings must be crane, hooper or darby, found '%s'", ps->fittings);
                ok = false;
            }
        } else {
            diag_error(diags, key.pos, "unknown path option '%.*s' (fluid, start, loss, friction, fittings)",
                       (int)key.len, key.text);
            ok = false;
        }
    }
    if (!ps->fluid && ok) {
        diag_error(diags, at, "path '%s' needs 'fluid: ...' (a water record, e.g. water(60 degF))", name);
        ok = false;
    }
    if (!ps->start && ok) {
        diag_error(diags, at, "path '%s' needs 'start: ...' (the static pressure at the first inlet)", name);
        ok = false;
    }
    if (i >= n) {
        diag_error(diags, at, "path '%s' has no segment table (| segment | flow | pipe | length | rise | fittings |)", name);
        st->parse_failed = true;
        return st;
    }

    /* Header, separator, rows. */
    Cell cells[MAX_COLUMNS];
    bool too_many;
    int col_of[NCOLS];
    for (int k = 0; k < NCOLS; k++)
        col_of[k] = -1;
    size_t ncols = split_row(&lines[i], cells, MAX_COLUMNS, &too_many);
    Pos header_pos = lines[i].pos;
    Cell header[MAX_COLUMNS];
    memcpy(header, cells, ncols * sizeof *cells);
    for (size_t k = 0; k < ncols; k++) {
        int which = -1;
        for (int c = 0; c < NCOLS; c++)
            if (cell_is(&cells[k], column_names[c]))
                which = c;
        if (which < 0) {
            diag_error(diags, cells[k].pos, "unknown path column '%.*s' (segment, flow, pipe, length, rise, fittings, K, C, device)",
                       (int)cells[k].len, cells[k].text);
            ok = false;
        } else if (col_of[which] >= 0) {
            diag_error(diags, cells[k].pos, "column '%s' appears twice", column_names[which]);
            ok = false;
        } else {
            col_of[which] = (int)k;
        }
    }
    for (int c = 0; c < NCOLS; c++)
        if (column_required[c] && col_of[c] < 0) {
            diag_error(diags, header_pos, "path table is missing the '%s' column", column_names[c]);
            ok = false;
        }
    if (ps->loss == LOSS_HAZEN_WILLIAMS && col_of[COL_C] < 0 && ok) {
        diag_error(diags, header_pos, "loss: hazen_williams needs a 'C' column (the Hazen-Williams coefficient)");
        ok = false;
    }
    i++;
    if (i < n) {
        Cell sep[MAX_COLUMNS];
        size_t ns = split_row(&lines[i], sep, MAX_COLUMNS, &too_many);
        if (is_table_line(&lines[i]) && is_separator_row(sep, ns))
            i++;
        else {
            diag_error(diags, lines[i].pos, "expected the table's separator row (|---|---|...) under the header");
            ok = false;
        }
    }
    size_t cap = n - i + 1;
    ps->segs = arena_alloc(a, cap * sizeof *ps->segs);
    StrMap seg_fields = {0}; /* segment field name -> its row */
    for (; i < n; i++) {
        const FenceLine *l = &lines[i];
        if (is_blank(l))
            continue;
        if (!is_table_line(l)) {
            diag_error(diags, l->pos, "expected a table row starting with '|'");
            ok = false;
            continue;
        }
        if (ps->nsegs == PATH_MAX_SEGMENTS) {
            diag_error(diags, l->pos, "too many segments: the limit is %d in a path", PATH_MAX_SEGMENTS);
            ok = false;
            break;
        }
        size_t nc = split_row(l, cells, MAX_COLUMNS, &too_many);
        if (nc != ncols) {
            report_row_width(diags, l, cells, nc, header, ncols);
            ok = false;
            continue;
        }
        PathSegment *seg = &ps->segs[ps->nsegs];
        seg->pos = l->pos;
        bool row_ok = ok;
        for (int c = 0; c < NCOLS; c++) {
            if (col_of[c] < 0)
                continue;
            const Cell *cell = &cells[col_of[c]];
            if (c == COL_SEGMENT) {
                if (cell_empty(cell)) {
                    diag_error(diags, cell->pos, "a segment needs an id (S-1, A, riser-3 ...)");
                    row_ok = false;
                    continue;
                }
                seg->id = arena_strndup(a, cell->text, cell->len);
                seg->field = field_name(a, seg->id);
                seg->pos = cell->pos;
                continue;
            }
            if (c == COL_FITTINGS) {
                row_ok = parse_fittings(a, cell, seg, diags) && row_ok;
                continue;
            }
            if (cell_empty(cell)) {
                if (column_required[c] || (c == COL_C && ps->loss == LOSS_HAZEN_WILLIAMS)) {
                    diag_error(diags, cell->pos, "the '%s' cell is empty", column_names[c]);
                    row_ok = false;
                }
                continue;
            }
            Expr *e = parse_expression_at(a, cell->text, cell->len, cell->pos, diags);
            if (!e)
                row_ok = false;
            switch (c) {
            case COL_FLOW: seg->flow = e; break;
            case COL_PIPE: seg->pipe = e; break;
            case COL_LENGTH: seg->length = e; break;
            case COL_RISE: seg->rise = e; break;
            case COL_K: seg->K = e; break;
            case COL_C: seg->C = e; break;
            case COL_DEVICE:
                seg->device = e;
                seg->device_text = arena_strndup(a, cell->text, cell->len);
                break;
            default: break;
            }
        }
        size_t k;
        if (seg->field && !strmap_add(&seg_fields, seg->field, ps->nsegs, &k)) {
            diag_error(diags, seg->pos, "segment '%s' is already in this path at line %d", seg->id, ps->segs[k].pos.line);
            row_ok = false;
        }
        ok = row_ok;
        ps->nsegs++;
    }
    strmap_free(&seg_fields);
    if (ps->nsegs == 0 && ok) {
        diag_error(diags, header_pos, "path '%s' has a table with no segments", name);
        ok = false;
    }
    st->parse_failed = !ok;
    return st;
}

CaseTable *tables_parse_cases(Arena *a, Pos at, const FenceLine *lines, size_t n, DiagList *diags)
{
    CaseTable *ct = arena_alloc(a, sizeof *ct);
    ct->pos = at;
    bool ok = true;
    const FenceLine *header = NULL;
    size_t i = 0, first_row = n;
    for (; i < n; i++) {
        const FenceLine *l = &lines[i];
        if (is_blank(l))
            continue;
        if (is_table_line(l)) {
            if (!header) {
                header = l;
                /* the separator follows */
                if (i + 1 < n) {
                    Cell sep[MAX_COLUMNS];
                    bool tm;
                    size_t ns = split_row(&lines[i + 1], sep, MAX_COLUMNS, &tm);
                    if (is_table_line(&lines[i + 1]) && is_separator_row(sep, ns)) {
                        first_row = i + 2;
                        i++;
                        continue;
                    }
                }
                diag_error(diags, l->pos, "expected the table's separator row (|---|---|...) under the header");
                return NULL;
            }
            continue;
        }
        Cell key, value;
        if (split_option(l, &key, &value) && cell_is(&key, "show")) {
            if (ct->nshow) {
                diag_error(diags, key.pos, "'show:' is given twice");
                ok = false;
                continue;
            }
            size_t cap = 1;
            for (size_t k = 0; k < value.len; k++)
                cap += value.text[k] == ',';
            ct->show = arena_alloc(a, cap * sizeof *ct->show);
            ct->show_pos = arena_alloc(a, cap * sizeof *ct->show_pos);
            ct->show_exprs = arena_alloc(a, cap * sizeof *ct->show_exprs);
            size_t k = 0;
            while (k <= value.len) {
                size_t s = k;
                while (k < value.len && value.text[k] != ',')
                    k++;
                size_t e = k;
                while (s < e && value.text[s] == ' ')
                    s++;
                while (e > s && value.text[e - 1] == ' ')
                    e--;
                if (e > s) {
                    ct->show[ct->nshow] = arena_strndup(a, value.text + s, e - s);
                    ct->show_pos[ct->nshow] = value.pos;
                    ct->show_pos[ct->nshow].col += (int)s;
                    ct->show_exprs[ct->nshow] = parse_expression_at(a, value.text + s, e - s, ct->show_pos[ct->nshow], diags);
                    if (!ct->show_exprs[ct->nshow])
                        ok = false;
                    ct->nshow++;
                }
                k++;
            }
            continue;
        }
        diag_error(diags, l->pos, "a cases block holds a 'show: name, name' line and a table whose columns name inputs");
        ok = false;
    }
    if (!header) {
        diag_error(diags, at, "cases block has no table (| input | input |, one row per case)");
        return NULL;
    }
    Cell cells[MAX_COLUMNS];
    bool too_many;
    size_t ncols = split_row(header, cells, MAX_COLUMNS, &too_many);
    if (too_many) {
        diag_error(diags, header->pos, "a cases table has at most %d columns", MAX_COLUMNS);
        return NULL;
    }
    ct->inputs = arena_alloc(a, (ncols + 1) * sizeof *ct->inputs);
    ct->input_pos = arena_alloc(a, (ncols + 1) * sizeof *ct->input_pos);
    ct->input_slots = arena_alloc(a, (ncols + 1) * sizeof *ct->input_slots);
    for (size_t k = 0; k < ncols; k++) {
        ct->inputs[k] = arena_strndup(a, cells[k].text, cells[k].len);
        ct->input_pos[k] = cells[k].pos;
        ct->input_slots[k] = SLOT_UNRESOLVED;
        if (cells[k].len == 0) {
            diag_error(diags, cells[k].pos, "a cases column needs the name of an input");
            ok = false;
        }
    }
    ct->ninputs = ncols;
    Cell header_cells[MAX_COLUMNS];
    memcpy(header_cells, cells, ncols * sizeof *cells);
    bool saw_row = false;
    size_t cap = n > first_row ? n - first_row : 0;
    ct->cells = arena_alloc(a, (cap * ncols + 1) * sizeof *ct->cells);
    ct->row_pos = arena_alloc(a, (cap + 1) * sizeof *ct->row_pos);
    for (i = first_row; i < n; i++) {
        const FenceLine *l = &lines[i];
        if (!is_table_line(l))
            continue;
        saw_row = true;
        if (ct->nrows == CASES_MAX_ROWS) {
            diag_error(diags, l->pos, "too many cases: the limit is %d rows in a cases table", CASES_MAX_ROWS);
            ok = false;
            break;
        }
        size_t nc = split_row(l, cells, MAX_COLUMNS, &too_many);
        if (nc != ncols) {
            report_row_width(diags, l, cells, nc, header_cells, ncols);
            ok = false;
            continue;
        }
        for (size_t k = 0; k < ncols; k++) {
            Expr *e = NULL;
            if (cell_empty(&cells[k])) {
                diag_error(diags, cells[k].pos, "empty cell: every case gives every input a value");
                ok = false;
            } else {
                e = parse_expression_at(a, cells[k].text, cells[k].len, cells[k].pos, diags);
                ok = e && ok;
            }
            ct->cells[ct->nrows * ncols + k] = e;
        }
        ct->row_pos[ct->nrows++] = l->pos;
    }
    if (ct->nrows == 0 && !saw_row) {
        diag_error(diags, header->pos, "cases table has no rows");
        ok = false;
    }
    if (ct->nshow == 0) {
        diag_error(diags, at, "cases block needs 'show: name, name' naming the results to tabulate");
        ok = false;
    }
    return ok ? ct : NULL;
}

/* ```curve NAME: an optional `interpolate: linear | loglog` line, then a
 * two-column table, the argument and the value. Each cell is an
 * expression; units and order are checked when the curve is evaluated,
 * where the values are known. */
Stmt *tables_parse_curve(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags)
{
    Stmt *st = arena_alloc(a, sizeof *st);
    st->kind = STMT_CURVE;
    st->pos = at;
    st->name = name;
    st->name_pos = at;
    st->var_slot = SLOT_UNRESOLVED;
    st->line = arena_printf(a, "curve %s", name);
    CurveSpec *cs = arena_alloc(a, sizeof *cs);
    st->curve = cs;
    bool ok = true;
    size_t i = 0;
    for (; i < n && !is_table_line(&lines[i]); i++) {
        const FenceLine *l = &lines[i];
        if (is_blank(l))
            continue;
        size_t lead = 0;
        while (lead < l->len && (l->text[lead] == ' ' || l->text[lead] == '\t'))
            lead++;
        if (lead < l->len && l->text[lead] == '#')
            continue;
        Cell key, value;
        if (!split_option(l, &key, &value)) {
            Pos p = l->pos;
            p.col += (int)lead;
            diag_error(diags, p, "expected 'interpolate: linear' or 'interpolate: loglog', or the curve's table");
            ok = false;
        } else if (!cell_is(&key, "interpolate")) {
            diag_error(diags, key.pos, "unknown curve option '%.*s' (interpolate)", (int)key.len, key.text);
            ok = false;
        } else if (cell_is(&value, "loglog")) {
            cs->loglog = true;
        } else if (!cell_is(&value, "linear")) {
            diag_error(diags, value.pos, "interpolate must be linear or loglog, found '%.*s'", (int)value.len,
                       value.text);
            ok = false;
        }
    }
    if (i >= n) {
        diag_error(diags, at, "curve '%s' has no table (| argument | value |, one point a row)", name);
        st->parse_failed = true;
        return st;
    }
    Cell cells[MAX_COLUMNS];
    bool too_many;
    size_t ncols = split_row(&lines[i], cells, MAX_COLUMNS, &too_many);
    Pos header_pos = lines[i].pos;
    if (ncols != 2) {
        diag_error(diags, header_pos, "a curve table has two columns, the argument and the value; this one has %zu",
                   ncols);
        st->parse_failed = true;
        return st;
    }
    Cell header[2] = {cells[0], cells[1]};
    cs->x_head = arena_strndup(a, cells[0].text, cells[0].len);
    cs->y_head = arena_strndup(a, cells[1].text, cells[1].len);
    i++;
    if (i < n) {
        Cell sep[MAX_COLUMNS];
        size_t ns = split_row(&lines[i], sep, MAX_COLUMNS, &too_many);
        if (is_table_line(&lines[i]) && is_separator_row(sep, ns))
            i++;
        else {
            diag_error(diags, lines[i].pos, "expected the table's separator row (|---|---|) under the header");
            ok = false;
        }
    }
    size_t cap = n - i + 1;
    cs->x = arena_alloc(a, cap * sizeof *cs->x);
    cs->y = arena_alloc(a, cap * sizeof *cs->y);
    cs->row_pos = arena_alloc(a, cap * sizeof *cs->row_pos);
    for (; i < n; i++) {
        const FenceLine *l = &lines[i];
        if (is_blank(l))
            continue;
        if (!is_table_line(l)) {
            diag_error(diags, l->pos, "expected a table row starting with '|'");
            ok = false;
            continue;
        }
        if (cs->npoints == CURVE_MAX_POINTS) {
            diag_error(diags, l->pos, "too many points: the limit is %d in a curve", CURVE_MAX_POINTS);
            ok = false;
            break;
        }
        size_t nc = split_row(l, cells, MAX_COLUMNS, &too_many);
        if (nc != 2) {
            report_row_width(diags, l, cells, nc, header, 2);
            ok = false;
            continue;
        }
        Expr *e[2] = {NULL, NULL};
        for (size_t k = 0; k < 2; k++) {
            if (cell_empty(&cells[k])) {
                diag_error(diags, cells[k].pos, "the '%s' cell is empty: every point needs both values",
                           k ? cs->y_head : cs->x_head);
                ok = false;
                continue;
            }
            e[k] = parse_expression_at(a, cells[k].text, cells[k].len, cells[k].pos, diags);
            ok = e[k] && ok;
        }
        cs->x[cs->npoints] = e[0];
        cs->y[cs->npoints] = e[1];
        cs->row_pos[cs->npoints] = l->pos;
        cs->npoints++;
    }
    if (ok && cs->npoints < 2) {
        diag_error(diags, header_pos, "curve '%s' needs at least two points, found %zu", name, cs->npoints);
        ok = false;
    }
    st->parse_failed = !ok;
    return st;
}
