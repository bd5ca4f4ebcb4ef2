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
#include "suggest.h"

typedef struct Cell {
    const char *text;
    size_t len;
    Pos pos;
} Cell;

enum { MAX_COLUMNS = 32 };

/* The methods a `friction:` or `fittings:` option may name, as the method
 * modules list them: "colebrook, swamee_jain, haaland or churchill". */
static const char *friction_choices(char *buf, size_t n)
{
    const char *w[FRICTION_METHOD_COUNT];
    return suggest_choices(buf, n, w, friction_method_choices(w, FRICTION_METHOD_COUNT), "", " or ");
}

static const char *fittings_choices(char *buf, size_t n)
{
    const char *w[FIT_METHOD_COUNT];
    for (int m = 0; m < FIT_METHOD_COUNT; m++)
        w[m] = fitting_method_name((FittingMethod)m);
    return suggest_choices(buf, n, w, FIT_METHOD_COUNT, "", " or ");
}

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

/* The fixtures cell: "12 lavatory private, 2 bidet": items separated by
 * commas, each a whole count from 1 to 9999 and the fixture's words (the
 * kind and an optional use, read by wsfu's table at evaluation). */
static bool parse_fixtures(Arena *a, const Cell *c, FittingItem **items, size_t *nitems, DiagList *diags)
{
    if (cell_empty(c) || cell_is(c, "none"))
        return true;
    size_t cap = 1;
    for (size_t i = 0; i < c->len; i++)
        cap += c->text[i] == ',';
    *items = arena_alloc(a, cap * sizeof **items);
    bool ok = true;
    for (size_t i = 0; i <= c->len; i++) {
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
            diag_error(diags, p, "empty item in the fixtures list (write '12 lavatory private, 2 bidet')");
            ok = false;
            continue;
        }
        size_t k = s;
        long count = 0;
        while (k < e && isdigit((unsigned char)c->text[k]) && count < 100000)
            count = count * 10 + (c->text[k++] - '0');
        if (k == s || (k < e && c->text[k] != ' ') || count < 1 || count > 9999) {
            diag_error(diags, p, "a fixtures item is a whole count from 1 to 9999 and the fixture, as in '12 lavatory'");
            ok = false;
            continue;
        }
        while (k < e && c->text[k] == ' ')
            k++;
        if (k == e) {
            diag_error(diags, p, "a fixture count needs the fixture it counts");
            ok = false;
            continue;
        }
        FittingItem *it = &(*items)[(*nitems)++];
        it->count = (int)count;
        it->pos = p;
        it->pos.col += (int)(k - s);
        it->kind = arena_strndup(a, c->text + k, e - k);
    }
    return ok;
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

enum { COL_SEGMENT, COL_FLOW, COL_PIPE, COL_LENGTH, COL_RISE, COL_FITTINGS, COL_K, COL_C, COL_DEVICE, COL_FIXTURES, NCOLS };
static const char *const column_names[NCOLS] = {"segment", "flow", "pipe", "length", "rise", "fittings", "K", "C", "device", "fixtures"};
/* flow is required unless the `demand:` option makes it from the fixtures */
static const bool column_required[NCOLS] = {true, true, true, true, true, false, false, false, false, false};

/* `demand: hunter("flush tank")`, `hunter("flush valve")`, `hunter` (flush
 * tank), `peak_demand`, or the name of a ```curve block giving the demand
 * (a flow) against the load in water supply fixture units — the demand table
 * of the code adopted for the project, typed by the engineer and cited in
 * the calc, where the program ships none. */
static bool parse_demand_option(Arena *a, const Cell *v, PathDemand *demand, const char **system, Expr **curve,
                                Pos *pos, DiagList *diags)
{
    static const char *const forms[][2] = {
        {"hunter", "flush tank"},
        {"hunter(\"flush tank\")", "flush tank"},
        {"hunter(\"flush valve\")", "flush valve"},
    };
    *pos = v->pos;
    for (size_t k = 0; k < sizeof forms / sizeof forms[0]; k++)
        if (v->len == strlen(forms[k][0]) && memcmp(v->text, forms[k][0], v->len) == 0) {
            *demand = PATH_DEMAND_HUNTER;
            *system = forms[k][1];
            return true;
        }
    if (v->len == strlen("peak_demand") && memcmp(v->text, "peak_demand", v->len) == 0) {
        *demand = PATH_DEMAND_PEAK;
        return true;
    }
    bool name = v->len > 0 && (isalpha((unsigned char)v->text[0]) || v->text[0] == '_');
    for (size_t i = 0; i < v->len && name; i++)
        name = isalnum((unsigned char)v->text[i]) || v->text[i] == '_';
    if (name) {
        *curve = parse_expression_at(a, v->text, v->len, v->pos, diags);
        if (!*curve)
            return false;
        *demand = PATH_DEMAND_CURVE;
        return true;
    }
    diag_error(diags, v->pos,
               "demand must be hunter(\"flush tank\"), hunter(\"flush valve\"), peak_demand or the name of a "
               "curve of demand against load, found '%.*s'",
               (int)v->len, v->text);
    return false;
}

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

/* A fenced block's statement: its kind and name. */
static Stmt *fence_stmt_new(Arena *a, StmtKind kind, const char *name, Pos at)
{
    Stmt *st = stmt_new(a);
    st->kind = kind;
    st->pos = at;
    st->name = name;
    st->name_pos = at;
    return st;
}

/* One option line above a block's table. Returns false for a blank or
 * comment line (nothing to read) and for a line that is not 'key: value'
 * (reported with `expected` at its first character, *ok cleared); true with
 * the key and value otherwise. */
static bool fence_option_read(const FenceLine *l, Cell *key, Cell *value, const char *expected, bool *ok,
                              DiagList *diags)
{
    if (is_blank(l))
        return false;
    size_t lead = 0;
    while (lead < l->len && (l->text[lead] == ' ' || l->text[lead] == '\t'))
        lead++;
    if (lead < l->len && l->text[lead] == '#')
        return false;
    if (!split_option(l, key, value)) {
        Pos p = l->pos;
        p.col += (int)lead;
        diag_error(diags, p, "%s", expected);
        *ok = false;
        return false;
    }
    return true;
}

Stmt *tables_parse_path(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags)
{
    Stmt *st = fence_stmt_new(a, STMT_PATH, name, at);
    PathSpec *ps = arena_alloc(a, sizeof *ps);
    st->path = ps;
    bool ok = true;
    size_t i = 0;

    /* Options, up to the table. */
    for (; i < n && !is_table_line(&lines[i]); i++) {
        Cell key, value;
        if (!fence_option_read(&lines[i], &key, &value,
                               "expected an option 'key: value' (fluid, start, loss, friction, fittings) or the segment table",
                               &ok, diags))
            continue;
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
                char choices[128];
                diag_error(diags, value.pos, "friction must be %s, found '%s'", friction_choices(choices, sizeof choices),
                           ps->friction);
                ok = false;
            }
        } else if (cell_is(&key, "demand")) {
            ok = parse_demand_option(a, &value, &ps->demand, &ps->demand_system, &ps->demand_curve, &ps->demand_pos,
                                     diags) && ok;
        } else if (cell_is(&key, "fittings")) {
            ps->fittings = word_value(a, &value);
            if (fitting_method_parse(ps->fittings) < 0) {
                char choices[128];
                diag_error(diags, value.pos, "fittings must be %s, found '%s'", fittings_choices(choices, sizeof choices),
                           ps->fittings);
                ok = false;
            }
        } else {
            diag_error(diags, key.pos, "unknown path option '%.*s' (fluid, start, loss, friction, fittings, demand)",
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
            diag_error(diags, cells[k].pos, "unknown path column '%.*s' (segment, flow, pipe, length, rise, fittings, K, C, device, fixtures)",
                       (int)cells[k].len, cells[k].text);
            ok = false;
        } else if (col_of[which] >= 0) {
            diag_error(diags, cells[k].pos, "column '%s' appears twice", column_names[which]);
            ok = false;
        } else {
            col_of[which] = (int)k;
        }
    }
    ps->has_fixtures = col_of[COL_FIXTURES] >= 0;
    bool demand = ps->demand != PATH_DEMAND_NONE;
    for (int c = 0; c < NCOLS; c++)
        if (column_required[c] && col_of[c] < 0 && !(c == COL_FLOW && demand)) {
            if (c == COL_FLOW && ps->has_fixtures)
                diag_error(diags, header_pos,
                           "path table is missing the 'flow' column (or give 'demand: NAME', a curve of demand against load, to take each segment's flow from its fixtures)");
            else
                diag_error(diags, header_pos, "path table is missing the '%s' column", column_names[c]);
            ok = false;
        }
    if (demand && !ps->has_fixtures) {
        diag_error(diags, ps->demand_pos, "'demand:' takes each segment's flow from its fixtures, but the table has no 'fixtures' column");
        ok = false;
    } else if (demand && col_of[COL_FLOW] >= 0) {
        diag_error(diags, cells[col_of[COL_FLOW]].pos,
                   "a 'flow' column and 'demand:' both give the flow; keep one (the demand is taken from the fixtures)");
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
            if (c == COL_FIXTURES) {
                row_ok = parse_fixtures(a, cell, &seg->fixtures, &seg->nfixtures, diags) && row_ok;
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
    Stmt *st = fence_stmt_new(a, STMT_CURVE, name, at);
    CurveSpec *cs = arena_alloc(a, sizeof *cs);
    st->curve = cs;
    bool ok = true;
    size_t i = 0;
    for (; i < n && !is_table_line(&lines[i]); i++) {
        Cell key, value;
        if (!fence_option_read(&lines[i], &key, &value,
                               "expected 'interpolate: linear' or 'interpolate: loglog', or the curve's table", &ok,
                               diags))
            continue;
        if (!cell_is(&key, "interpolate")) {
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

/* ---- network blocks (DESIGN 2.12) ---------------------------------------- */

enum { NC_NODE, NC_ELEVATION, NC_DEMAND, NC_HEAD, NC_PRESSURE, NC_X, NC_Y, NC_FIXTURES, NODE_NCOLS };
static const char *const node_columns[NODE_NCOLS] = {"node", "elevation", "demand", "head", "pressure", "x", "y",
                                                     "fixtures"};

enum { LC_LINK, LC_FROM, LC_TO, LC_PIPE, LC_LENGTH, LC_FITTINGS, LC_K, LC_C, LC_DEVICE, LINK_NCOLS };
static const char *const link_columns[LINK_NCOLS] = {"link", "from", "to", "pipe", "length", "fittings", "K", "C", "device"};
static const bool link_required[LINK_NCOLS] = {true, true, true, true, true, false, false, false, false};

/* One pipe table of a network: header, separator, rows up to a blank or
 * non-table line. Columns are matched against `names`; col_of receives the
 * cell index of each, or -1. Returns the rows (cells row-major, ncols a
 * row) and advances *i past the table. */
typedef struct NetTable {
    Pos header_pos;
    size_t ncols, nrows;
    Cell *cells;
    Pos *row_pos;
    int col_of[MAX_COLUMNS];
} NetTable;

static bool read_net_table(Arena *a, const FenceLine *lines, size_t n, size_t *i, const char *what,
                           const char *const *names, int nnames, NetTable *t, DiagList *diags)
{
    bool ok = true, too_many;
    Cell header[MAX_COLUMNS];
    t->header_pos = lines[*i].pos;
    t->ncols = split_row(&lines[*i], header, MAX_COLUMNS, &too_many);
    if (too_many) {
        diag_error(diags, t->header_pos, "a %s table has at most %d columns", what, MAX_COLUMNS);
        ok = false;
    }
    for (int c = 0; c < nnames; c++)
        t->col_of[c] = -1;
    for (size_t k = 0; k < t->ncols; k++) {
        int which = -1;
        for (int c = 0; c < nnames; c++)
            if (cell_is(&header[k], names[c]))
                which = c;
        if (which < 0) {
            char list[256] = "";
            for (int c = 0; c < nnames; c++)
                snprintf(list + strlen(list), sizeof list - strlen(list), "%s%s", c ? ", " : "", names[c]);
            diag_error(diags, header[k].pos, "unknown %s column '%.*s' (%s)", what, (int)header[k].len, header[k].text, list);
            ok = false;
        } else if (t->col_of[which] >= 0) {
            diag_error(diags, header[k].pos, "column '%s' appears twice", names[which]);
            ok = false;
        } else {
            t->col_of[which] = (int)k;
        }
    }
    (*i)++;
    if (*i < n && is_table_line(&lines[*i])) {
        Cell sep[MAX_COLUMNS];
        size_t ns = split_row(&lines[*i], sep, MAX_COLUMNS, &too_many);
        if (is_separator_row(sep, ns))
            (*i)++;
        else {
            diag_error(diags, lines[*i].pos, "expected the table's separator row (|---|---|...) under the header");
            ok = false;
        }
    } else {
        diag_error(diags, t->header_pos, "expected the table's separator row (|---|---|...) under the header");
        return false;
    }
    size_t start = *i, end = *i;
    while (end < n && is_table_line(&lines[end]))
        end++;
    size_t cap = end - start;
    if (cap > NETWORK_MAX_ROWS) {
        diag_error(diags, lines[start + NETWORK_MAX_ROWS].pos, "too many rows: the limit is %d in a %s table",
                   NETWORK_MAX_ROWS, what);
        ok = false;
        cap = NETWORK_MAX_ROWS;
    }
    t->cells = arena_alloc(a, (cap * (t->ncols ? t->ncols : 1) + 1) * sizeof *t->cells);
    t->row_pos = arena_alloc(a, (cap + 1) * sizeof *t->row_pos);
    Cell cells[MAX_COLUMNS];
    for (size_t r = start; r < start + cap; r++) {
        size_t nc = split_row(&lines[r], cells, MAX_COLUMNS, &too_many);
        if (nc != t->ncols) {
            report_row_width(diags, &lines[r], cells, nc, header, t->ncols);
            ok = false;
            continue;
        }
        memcpy(t->cells + t->nrows * t->ncols, cells, nc * sizeof *cells);
        t->row_pos[t->nrows++] = lines[r].pos;
    }
    *i = end;
    if (t->nrows == 0 && ok) {
        diag_error(diags, t->header_pos, "the %s table has no rows", what);
        ok = false;
    }
    return ok;
}

static const Cell *net_cell(const NetTable *t, size_t row, int col)
{
    return t->col_of[col] < 0 ? NULL : &t->cells[row * t->ncols + (size_t)t->col_of[col]];
}

/* An optional expression cell: NULL when absent or empty. */
static Expr *net_expr(Arena *a, const Cell *c, bool *ok, DiagList *diags)
{
    if (!c || cell_empty(c))
        return NULL;
    Expr *e = parse_expression_at(a, c->text, c->len, c->pos, diags);
    if (!e)
        *ok = false;
    return e;
}

/* An id cell: a node or link name as written, no spaces or '|'. */
static const char *net_id(Arena *a, const Cell *c, const char *what, bool *ok, DiagList *diags)
{
    if (cell_empty(c)) {
        diag_error(diags, c->pos, "a %s needs an id (J1, P-3, tank ...)", what);
        *ok = false;
        return NULL;
    }
    for (size_t k = 0; k < c->len; k++)
        if (c->text[k] == ' ' || c->text[k] == '\t' || c->text[k] == '"' || c->text[k] == '.') {
            diag_error(diags, c->pos, "a %s id is one word of letters, digits, '-' or '_', found '%.*s'", what,
                       (int)c->len, c->text);
            *ok = false;
            return NULL;
        }
    return arena_strndup(a, c->text, c->len);
}

static void parse_network_options(Arena *a, NetworkSpec *ns, const FenceLine *l, bool *ok, DiagList *diags)
{
    Cell key, value;
    if (!fence_option_read(l, &key, &value,
                           "expected an option 'key: value' (fluid, loss, friction, fittings, tolerance, demand) or the "
                           "node table",
                           ok, diags))
        return;
    if (value.len == 0) {
        diag_error(diags, value.pos, "option '%.*s' needs a value", (int)key.len, key.text);
        *ok = false;
    } else if (cell_is(&key, "fluid")) {
        ns->fluid = parse_expression_at(a, value.text, value.len, value.pos, diags);
        *ok = ns->fluid && *ok;
    } else if (cell_is(&key, "tolerance")) {
        ns->tolerance = parse_expression_at(a, value.text, value.len, value.pos, diags);
        *ok = ns->tolerance && *ok;
    } else if (cell_is(&key, "demand")) {
        *ok = parse_demand_option(a, &value, &ns->demand, &ns->demand_system, &ns->demand_curve, &ns->demand_pos,
                                  diags) && *ok;
    } else if (cell_is(&key, "loss")) {
        const char *w = word_value(a, &value);
        if (strcmp(w, "darcy") == 0)
            ns->loss = LOSS_DARCY;
        else if (strcmp(w, "hazen_williams") == 0)
            ns->loss = LOSS_HAZEN_WILLIAMS;
        else {
            diag_error(diags, value.pos, "loss must be darcy or hazen_williams, found '%s'", w);
            *ok = false;
        }
    } else if (cell_is(&key, "friction")) {
        ns->friction = word_value(a, &value);
        int m = friction_method_lookup(ns->friction);
        if (m < 0 || m == FRICTION_LAMINAR) {
            char choices[128];
            diag_error(diags, value.pos, "friction must be %s, found '%s'", friction_choices(choices, sizeof choices),
                       ns->friction);
            *ok = false;
        }
    } else if (cell_is(&key, "fittings")) {
        ns->fittings = word_value(a, &value);
        if (fitting_method_parse(ns->fittings) < 0) {
            char choices[128];
            diag_error(diags, value.pos, "fittings must be %s, found '%s'", fittings_choices(choices, sizeof choices),
                       ns->fittings);
            *ok = false;
        }
    } else {
        diag_error(diags, key.pos, "unknown network option '%.*s' (fluid, loss, friction, fittings, tolerance, demand)",
                   (int)key.len, key.text);
        *ok = false;
    }
}

static bool parse_network_nodes(Arena *a, NetworkSpec *ns, const NetTable *t, DiagList *diags)
{
    bool ok = true;
    if (t->col_of[NC_NODE] < 0 || t->col_of[NC_ELEVATION] < 0) {
        diag_error(diags, t->header_pos, "the node table needs the columns 'node' and 'elevation'");
        return false;
    }
    if (t->col_of[NC_HEAD] < 0 && t->col_of[NC_PRESSURE] < 0) {
        diag_error(diags, t->header_pos,
                   "the network has no supply: give a 'head' or 'pressure' column and a supply row (a reservoir, a main)");
        return false;
    }
    if ((t->col_of[NC_X] < 0) != (t->col_of[NC_Y] < 0)) {
        diag_error(diags, t->header_pos, "node coordinates need both an 'x' and a 'y' column");
        ok = false;
    }
    ns->has_xy = t->col_of[NC_X] >= 0 && t->col_of[NC_Y] >= 0;
    /* a fixtures column and demand: go together (DESIGN 2.11): each node's
     * demand is then the demand of the load of the fixtures it serves */
    ns->has_fixtures = t->col_of[NC_FIXTURES] >= 0;
    if (ns->has_fixtures && ns->demand == PATH_DEMAND_NONE) {
        diag_error(diags, t->header_pos,
                   "a 'fixtures' column needs the option 'demand:' (hunter(\"flush tank\"), hunter(\"flush valve\"), "
                   "peak_demand or the name of a curve of demand against load) to make each node's demand");
        ok = false;
    }
    if (!ns->has_fixtures && ns->demand != PATH_DEMAND_NONE) {
        diag_error(diags, ns->demand_pos, "'demand:' takes each node's demand from its fixtures, but the node table has no 'fixtures' column");
        ok = false;
    }
    ns->nodes = arena_alloc(a, (t->nrows + 1) * sizeof *ns->nodes);
    size_t supplies = 0;
    for (size_t r = 0; r < t->nrows; r++) {
        NetNode *nd = &ns->nodes[ns->nnodes];
        nd->pos = t->row_pos[r];
        const Cell *idc = net_cell(t, r, NC_NODE);
        nd->id = net_id(a, idc, "node", &ok, diags);
        if (nd->id) {
            nd->pos = idc->pos;
            nd->field = field_name(a, nd->id);
            for (size_t k = 0; k < ns->nnodes; k++)
                if (strcmp(ns->nodes[k].field, nd->field) == 0) {
                    diag_error(diags, idc->pos, "node '%s' is already in this network at line %d", nd->id,
                               ns->nodes[k].pos.line);
                    ok = false;
                    nd->id = NULL;
                    break;
                }
        }
        const Cell *el = net_cell(t, r, NC_ELEVATION);
        if (cell_empty(el)) {
            diag_error(diags, el->pos, "the 'elevation' cell is empty");
            ok = false;
        }
        nd->elevation = net_expr(a, el, &ok, diags);
        nd->demand = net_expr(a, net_cell(t, r, NC_DEMAND), &ok, diags);
        nd->head = net_expr(a, net_cell(t, r, NC_HEAD), &ok, diags);
        nd->pressure = net_expr(a, net_cell(t, r, NC_PRESSURE), &ok, diags);
        if (ns->has_xy) {
            const Cell *xc = net_cell(t, r, NC_X), *yc = net_cell(t, r, NC_Y);
            nd->x = net_expr(a, xc, &ok, diags);
            nd->y = net_expr(a, yc, &ok, diags);
            if (!nd->x || !nd->y) {
                diag_error(diags, (nd->x ? yc : xc)->pos, "every node needs both coordinates when the table has x and y");
                ok = false;
            }
        }
        if (ns->has_fixtures) {
            const Cell *fc = net_cell(t, r, NC_FIXTURES);
            ok = parse_fixtures(a, fc, &nd->fixtures, &nd->nfixtures, diags) && ok;
            if (nd->nfixtures && nd->demand) {
                diag_error(diags, fc->pos,
                           "node '%s' gives a 'demand' and 'fixtures': keep one (with demand: the fixtures make the demand)",
                           nd->id ? nd->id : "?");
                ok = false;
            }
            if (nd->nfixtures && (nd->head || nd->pressure)) {
                diag_error(diags, fc->pos, "node '%s' is a supply (it has a head or pressure): leave its 'fixtures' cell empty",
                           nd->id ? nd->id : "?");
                ok = false;
            }
        }
        if (nd->head && nd->pressure) {
            diag_error(diags, nd->pressure->pos, "a supply gives its 'head' or its 'pressure', not both");
            ok = false;
        }
        bool supply = nd->head || nd->pressure;
        if (supply && nd->demand) {
            diag_error(diags, nd->demand->pos,
                       "node '%s' is a supply (it has a head or pressure): leave its 'demand' cell empty",
                       nd->id ? nd->id : "?");
            ok = false;
        }
        supplies += supply;
        if (nd->id)
            ns->nnodes++;
    }
    if (supplies == 0 && ok) {
        diag_error(diags, t->header_pos, "the network has no supply: no node gives a 'head' or a 'pressure'");
        ok = false;
    }
    return ok;
}

static int find_node(const NetworkSpec *ns, const char *id)
{
    for (size_t k = 0; k < ns->nnodes; k++)
        if (strcmp(ns->nodes[k].id, id) == 0)
            return (int)k;
    return -1;
}

static bool parse_network_links(Arena *a, NetworkSpec *ns, const NetTable *t, DiagList *diags)
{
    bool ok = true;
    for (int c = 0; c < LINK_NCOLS; c++)
        if (link_required[c] && t->col_of[c] < 0) {
            diag_error(diags, t->header_pos, "the link table is missing the '%s' column", link_columns[c]);
            return false;
        }
    if (ns->loss == LOSS_HAZEN_WILLIAMS && t->col_of[LC_C] < 0) {
        diag_error(diags, t->header_pos, "loss: hazen_williams needs a 'C' column (the Hazen-Williams coefficient)");
        return false;
    }
    /* Node ids are found by a sorted index when the network is large. */
    ns->links = arena_alloc(a, (t->nrows + 1) * sizeof *ns->links);
    for (size_t r = 0; r < t->nrows; r++) {
        NetLink *lk = &ns->links[ns->nlinks];
        const Cell *idc = net_cell(t, r, LC_LINK);
        lk->pos = t->row_pos[r];
        lk->id = net_id(a, idc, "link", &ok, diags);
        bool row_ok = lk->id != NULL;
        if (lk->id) {
            lk->pos = idc->pos;
            lk->field = field_name(a, lk->id);
        }
        const Cell *fc = net_cell(t, r, LC_FROM), *tc = net_cell(t, r, LC_TO);
        lk->from = net_id(a, fc, "link's 'from' node", &row_ok, diags);
        lk->to = net_id(a, tc, "link's 'to' node", &row_ok, diags);
        lk->from_pos = fc->pos;
        lk->to_pos = tc->pos;
        lk->from_node = lk->from ? find_node(ns, lk->from) : -1;
        lk->to_node = lk->to ? find_node(ns, lk->to) : -1;
        if (lk->from && lk->from_node < 0) {
            diag_error(diags, fc->pos, "link '%s' starts at unknown node '%s' (not in the node table)",
                       lk->id ? lk->id : "?", lk->from);
            row_ok = false;
        }
        if (lk->to && lk->to_node < 0) {
            diag_error(diags, tc->pos, "link '%s' ends at unknown node '%s' (not in the node table)",
                       lk->id ? lk->id : "?", lk->to);
            row_ok = false;
        }
        if (lk->from_node >= 0 && lk->from_node == lk->to_node) {
            diag_error(diags, tc->pos, "link '%s' runs from node '%s' to itself", lk->id ? lk->id : "?", lk->to);
            row_ok = false;
        }
        const Cell *pc = net_cell(t, r, LC_PIPE), *lc = net_cell(t, r, LC_LENGTH);
        if (cell_empty(pc) || cell_empty(lc)) {
            diag_error(diags, (cell_empty(pc) ? pc : lc)->pos, "the '%s' cell is empty", cell_empty(pc) ? "pipe" : "length");
            row_ok = false;
        }
        lk->pipe = net_expr(a, pc, &row_ok, diags);
        lk->length = net_expr(a, lc, &row_ok, diags);
        lk->K = net_expr(a, net_cell(t, r, LC_K), &row_ok, diags);
        const Cell *cc = net_cell(t, r, LC_C);
        lk->C = net_expr(a, cc, &row_ok, diags);
        if (ns->loss == LOSS_HAZEN_WILLIAMS && cc && cell_empty(cc)) {
            diag_error(diags, cc->pos, "the 'C' cell is empty");
            row_ok = false;
        }
        lk->device = net_expr(a, net_cell(t, r, LC_DEVICE), &row_ok, diags);
        const Cell *fit = net_cell(t, r, LC_FITTINGS);
        if (fit) {
            PathSegment tmp = {0};
            row_ok = parse_fittings(a, fit, &tmp, diags) && row_ok;
            lk->fittings = tmp.fittings;
            lk->nfittings = tmp.nfittings;
            lk->fittings_pos = fit->pos;
        }
        if (lk->field)
            for (size_t k = 0; k < ns->nlinks; k++)
                if (strcmp(ns->links[k].field, lk->field) == 0) {
                    diag_error(diags, lk->pos, "link '%s' is already in this network at line %d", lk->id,
                               ns->links[k].pos.line);
                    row_ok = false;
                    break;
                }
        if (lk->field)
            for (size_t k = 0; k < ns->nnodes; k++)
                if (strcmp(ns->nodes[k].field, lk->field) == 0) {
                    diag_error(diags, lk->pos, "'%s' names both a node (line %d) and a link; ids are shared", lk->id,
                               ns->nodes[k].pos.line);
                    row_ok = false;
                    break;
                }
        ok = ok && row_ok;
        if (lk->id)
            ns->nlinks++;
    }
    return ok;
}

/* Every node must be joined to a supply: a breadth-first walk from the
 * supplies over the links (either direction); the first node left out is
 * reported at its row. */
static bool check_network_reach(Arena *a, const NetworkSpec *ns, DiagList *diags)
{
    size_t nn = ns->nnodes;
    size_t *start = arena_alloc(a, (nn + 2) * sizeof *start);
    size_t *adj = arena_alloc(a, (2 * ns->nlinks + 1) * sizeof *adj);
    size_t *fill = arena_alloc(a, (nn + 1) * sizeof *fill);
    size_t *queue = arena_alloc(a, (nn + 1) * sizeof *queue);
    bool *seen = arena_alloc(a, (nn + 1) * sizeof *seen);
    for (size_t l = 0; l < ns->nlinks; l++) {
        start[ns->links[l].from_node + 1]++;
        start[ns->links[l].to_node + 1]++;
    }
    for (size_t i = 0; i < nn; i++)
        start[i + 1] += start[i];
    for (size_t l = 0; l < ns->nlinks; l++) {
        size_t f = (size_t)ns->links[l].from_node, t = (size_t)ns->links[l].to_node;
        adj[start[f] + fill[f]++] = t;
        adj[start[t] + fill[t]++] = f;
    }
    size_t head = 0, tail = 0;
    for (size_t i = 0; i < nn; i++)
        if (ns->nodes[i].head || ns->nodes[i].pressure) {
            seen[i] = true;
            queue[tail++] = i;
        }
    while (head < tail) {
        size_t i = queue[head++];
        for (size_t k = start[i]; k < start[i + 1]; k++)
            if (!seen[adj[k]]) {
                seen[adj[k]] = true;
                queue[tail++] = adj[k];
            }
    }
    for (size_t i = 0; i < nn; i++)
        if (!seen[i]) {
            diag_error(diags, ns->nodes[i].pos, "no supply reaches node '%s': no chain of links joins it to a node with a head or pressure",
                       ns->nodes[i].id);
            return false;
        }
    return true;
}

Stmt *tables_parse_network(Arena *a, const char *name, Pos at, const FenceLine *lines, size_t n, DiagList *diags)
{
    Stmt *st = fence_stmt_new(a, STMT_NETWORK, name, at);
    NetworkSpec *ns = arena_alloc(a, sizeof *ns);
    st->network = ns;
    bool ok = true;
    size_t i = 0;
    for (; i < n && !is_table_line(&lines[i]); i++)
        parse_network_options(a, ns, &lines[i], &ok, diags);
    if (!ns->fluid && ok) {
        diag_error(diags, at, "network '%s' needs 'fluid: ...' (a water record, e.g. water(60 degF))", name);
        ok = false;
    }
    NetTable nodes = {0}, links = {0};
    bool have_nodes = false, have_links = false;
    while (i < n) {
        const FenceLine *l = &lines[i];
        if (is_blank(l)) {
            i++;
            continue;
        }
        if (!is_table_line(l)) {
            diag_error(diags, l->pos, "expected the node table, a blank line, then the link table");
            ok = false;
            i++;
            continue;
        }
        Cell first[MAX_COLUMNS];
        bool too_many;
        size_t nc = split_row(l, first, MAX_COLUMNS, &too_many);
        bool is_link = nc > 0 && cell_is(&first[0], "link");
        if (!have_nodes && !is_link) {
            ok = read_net_table(a, lines, n, &i, "node", node_columns, NODE_NCOLS, &nodes, diags) && ok;
            have_nodes = true;
        } else if (!have_links && is_link) {
            ok = read_net_table(a, lines, n, &i, "link", link_columns, LINK_NCOLS, &links, diags) && ok;
            have_links = true;
        } else {
            diag_error(diags, l->pos, "a network block holds one node table (| node | ...) and one link table (| link | ...)");
            ok = false;
            while (i < n && is_table_line(&lines[i]))
                i++;
        }
    }
    if (!have_nodes) {
        diag_error(diags, at, "network '%s' has no node table (| node | elevation | demand | head |)", name);
        st->parse_failed = true;
        return st;
    }
    if (!have_links) {
        diag_error(diags, at, "network '%s' has no link table (| link | from | to | pipe | length |), after a blank line", name);
        st->parse_failed = true;
        return st;
    }
    if (!ok) {
        st->parse_failed = true;
        return st;
    }
    ok = parse_network_nodes(a, ns, &nodes, diags);
    ok = ok && parse_network_links(a, ns, &links, diags);
    ok = ok && check_network_reach(a, ns, diags);
    st->parse_failed = !ok;
    return st;
}
