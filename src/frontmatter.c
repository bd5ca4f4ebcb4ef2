/* frontmatter.c — the YAML front matter, read with libyaml.
 *
 * The block is loaded as a YAML document (libyaml's node API keeps the line
 * of every node), then walked against the list of known keys. Scalars are
 * copied into the document's Arena. Defaults: US units, letter paper, four
 * significant digits. */
#include "frontmatter.h"
#include "methods/demand.h"

#include "bounds.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <yaml.h>

#include "bounds.h"
#include "strmap.h"
#include "suggest.h"
#include "numfmt.h"
#include "parse.h"

typedef struct FmCtx {
    Document *doc;
    DiagList *diags;
    yaml_document_t *y;
    int line0;           /* file line of the YAML text's first line, minus 1 */
    Pos status_pos, date_pos, revision_pos; /* where those values stand (line 0: absent) */
    Pos *rev_date_pos;   /* per `revisions` row: where its date stands */
} FmCtx;

/* The accepted `status` words (DESIGN 2.1), compared without regard to case.
 * The issued ones are the statuses a calc is sealed under: they need the
 * seal data and are never marked preliminary. "issued for review" is a set
 * sent out for comment, not sealed, so it is marked but needs no seal. */
static const struct { const char *word; bool issued; } STATUSES[] = {
    {"preliminary", false},          {"draft", false},
    {"issued for review", false},    {"issued for bid", true},
    {"issued for tender", true},     {"issued for permit", true},
    {"issued for construction", true}, {"approved for construction", true},
    {"issued for record", true},     {"final", true},
    {"superseded", false},
};

static int status_index(const char *status)
{
    if (!status)
        return -1;
    for (size_t i = 0; i < sizeof STATUSES / sizeof STATUSES[0]; i++) {
        const char *a = status, *b = STATUSES[i].word;
        while (*a && *b && tolower((unsigned char)*a) == *b)
            a++, b++;
        if (!*a && !*b)
            return (int)i;
    }
    return -1;
}

bool frontmatter_status_issued(const char *status)
{
    int i = status_index(status);
    return i >= 0 && STATUSES[i].issued;
}

void frontmatter_statuses_list(char *buf, size_t size)
{
    size_t used = 0;
    buf[0] = '\0';
    for (size_t i = 0; i < sizeof STATUSES / sizeof STATUSES[0] && used + 1 < size; i++) {
        int n = snprintf(buf + used, size - used, "%s%s", i ? ", " : "", STATUSES[i].word);
        if (n < 0)
            break;
        used += (size_t)n < size - used ? (size_t)n : size - used - 1;
    }
}

static Pos node_pos(const FmCtx *c, const yaml_node_t *n)
{
    Pos p = {c->doc->file, (int)n->start_mark.line + 1 + c->line0, (int)n->start_mark.column + 1};
    return p;
}

static const char *scalar(FmCtx *c, yaml_node_t *n, const char *key)
{
    if (!n || n->type != YAML_SCALAR_NODE) {
        if (n)
            diag_error(c->diags, node_pos(c, n), "front matter: '%s' must be a single value (text), not a list or mapping", key);
        return NULL;
    }
    if (n->data.scalar.length > FRONTMATTER_MAX_VALUE) {
        /* check and build agree: a value the report cannot hold is an error
         * here, not a failure of the PDF library later */
        diag_error(c->diags, node_pos(c, n), "front matter: '%s' is %zu bytes long; the limit is %d bytes a value",
                   key, n->data.scalar.length, FRONTMATTER_MAX_VALUE);
        return NULL;
    }
    return arena_strndup(&c->doc->arena, (const char *)n->data.scalar.value, n->data.scalar.length);
}

/* YYYY-MM-DD with a real calendar day. */
static int valid_date(const char *s)
{
    if (strlen(s) != 10 || s[4] != '-' || s[7] != '-')
        return 0;
    for (int i = 0; i < 10; i++)
        if (i != 4 && i != 7 && !isdigit((unsigned char)s[i]))
            return 0;
    int y = atoi(s), m = atoi(s + 5), d = atoi(s + 8);
    static const int days[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
    if (m < 1 || m > 12 || d < 1)
        return 0;
    int leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    return d <= days[m - 1] + (m == 2 && leap);
}

static const char *date_value(FmCtx *c, yaml_node_t *n, const char *key)
{
    const char *s = scalar(c, n, key);
    if (s && !valid_date(s)) {
        diag_error(c->diags, node_pos(c, n), "front matter: '%s' must be a date written YYYY-MM-DD, found '%s'", key, s);
        return NULL;
    }
    return s;
}

/* `prepared: Name` or `prepared: {name: Name, date: 2026-11-20}` */
static void person(FmCtx *c, yaml_node_t *n, const char *key, const char **name, const char **date)
{
    if (n->type == YAML_SCALAR_NODE) {
        *name = scalar(c, n, key);
        return;
    }
    if (n->type != YAML_MAPPING_NODE) {
        diag_error(c->diags, node_pos(c, n), "front matter: '%s' must be a name or {name: ..., date: YYYY-MM-DD}", key);
        return;
    }
    for (yaml_node_pair_t *pr = n->data.mapping.pairs.start; pr < n->data.mapping.pairs.top; pr++) {
        yaml_node_t *k = yaml_document_get_node(c->y, pr->key);
        yaml_node_t *v = yaml_document_get_node(c->y, pr->value);
        const char *ks = k && k->type == YAML_SCALAR_NODE ? (const char *)k->data.scalar.value : "";
        if (strcmp(ks, "name") == 0)
            *name = scalar(c, v, key);
        else if (strcmp(ks, "date") == 0)
            *date = date_value(c, v, key);
        else
            diag_error(c->diags, node_pos(c, k), "front matter: unknown key '%s' in '%s' (expected name, date)", ks, key);
    }
}

static void revisions(FmCtx *c, yaml_node_t *n)
{
    if (n->type != YAML_SEQUENCE_NODE) {
        diag_error(c->diags, node_pos(c, n), "front matter: 'revisions' must be a list of {rev, date, by, note}");
        return;
    }
    size_t count = (size_t)(n->data.sequence.items.top - n->data.sequence.items.start);
    Meta *m = &c->doc->meta;
    m->revisions = arena_alloc(&c->doc->arena, (count + 1) * sizeof *m->revisions);
    c->rev_date_pos = arena_alloc(&c->doc->arena, (count + 1) * sizeof *c->rev_date_pos);
    for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++) {
        yaml_node_t *r = yaml_document_get_node(c->y, *it);
        if (!r || r->type != YAML_MAPPING_NODE) {
            if (r)
                diag_error(c->diags, node_pos(c, r), "front matter: each revision must be {rev, date, by, note}");
            continue;
        }
        Revision *rv = &m->revisions[m->nrevisions++];
        for (yaml_node_pair_t *pr = r->data.mapping.pairs.start; pr < r->data.mapping.pairs.top; pr++) {
            yaml_node_t *k = yaml_document_get_node(c->y, pr->key);
            yaml_node_t *v = yaml_document_get_node(c->y, pr->value);
            const char *ks = k && k->type == YAML_SCALAR_NODE ? (const char *)k->data.scalar.value : "";
            if (strcmp(ks, "rev") == 0)
                rv->rev = scalar(c, v, "rev");
            else if (strcmp(ks, "date") == 0) {
                rv->date = date_value(c, v, "date");
                c->rev_date_pos[rv - m->revisions] = node_pos(c, v);
            } else if (strcmp(ks, "by") == 0)
                rv->by = scalar(c, v, "by");
            else if (strcmp(ks, "note") == 0)
                rv->note = scalar(c, v, "note");
            else
                diag_error(c->diags, node_pos(c, k), "front matter: unknown key '%s' in a revision (expected rev, date, by, note)", ks);
        }
        if (!rv->rev)
            diag_error(c->diags, node_pos(c, r), "front matter: a revision needs 'rev'");
    }
}

/* parts: a list of calc files, relative to the index (DESIGN 2.13). */
static void parts(FmCtx *c, yaml_node_t *n)
{
    Meta *m = &c->doc->meta;
    m->has_parts = true;
    if (n->type != YAML_SEQUENCE_NODE) {
        diag_error(c->diags, node_pos(c, n), "front matter: 'parts' must be a list of calc files "
                                             "(- riser.calc.md), relative to this index");
        return;
    }
    size_t count = (size_t)(n->data.sequence.items.top - n->data.sequence.items.start);
    if (count > PACKAGE_MAX_PARTS) {
        diag_error(c->diags, node_pos(c, n), "front matter: 'parts' lists %zu files; the limit is %d",
                   count, PACKAGE_MAX_PARTS);
        return;
    }
    m->parts = arena_alloc(&c->doc->arena, (count + 1) * sizeof *m->parts);
    for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++) {
        yaml_node_t *v = yaml_document_get_node(c->y, *it);
        if (!v)
            continue;
        const char *f = v->type == YAML_SCALAR_NODE ? scalar(c, v, "parts") : NULL;
        if (!f || !*f) {
            diag_error(c->diags, node_pos(c, v), "front matter: each entry of 'parts' is a calc "
                                                 "file name");
            continue;
        }
        m->parts[m->nparts++] = (Part){f, node_pos(c, v)}; /* repeats: package_load */
    }
}

static int ieq(const char *a, const char *b)
{
    for (; *a && *b; a++, b++)
        if (tolower((unsigned char)*a) != tolower((unsigned char)*b))
            return 0;
    return *a == *b;
}

/* A quantity written "VALUE UNIT" ("12.1 psia", "1500 ft"), of dimension
 * `want`. False (reported) when it is not one. */
static bool quantity_value(FmCtx *c, yaml_node_t *v, const char *key, Dim want, const char *want_text,
                           Quantity *q, Unit *unit)
{
    const char *s = scalar(c, v, key);
    if (!s)
        return false;
    Pos at = node_pos(c, v);
    size_t len = strlen(s), i = 0;
    bool neg = len > 0 && s[0] == '-';
    if (neg || (len > 0 && s[0] == '+'))
        i++;
    double x;
    size_t used = num_parse(s + i, len - i, &x);
    size_t u0 = i + used;
    while (u0 < len && s[u0] == ' ')
        u0++;
    if (used == 0 || u0 == len || u0 == i + used) {
        diag_error(c->diags, at, "front matter: '%s' must be %s with its unit, as in %s; found '%s'", key,
                   dim_eq(want, DIM_PRESSURE) ? "a pressure" : "a length", want_text, s);
        return false;
    }
    Pos upos = at;
    upos.col += (int)u0;
    if (!parse_unit(s + u0, len - u0, upos, unit, c->diags))
        return false;
    if (!dim_eq(unit->dim, want)) {
        diag_error(c->diags, upos, "front matter: '%s' must be %s, as in %s; found a unit of %s", key,
                   dim_eq(want, DIM_PRESSURE) ? "a pressure" : "a length", want_text,
                   dim_name(unit->dim) ? dim_name(unit->dim) : unit->text);
        return false;
    }
    *q = unit_to_qty(neg ? -x : x, unit);
    return true;
}

/* atmosphere: an absolute pressure (a plain unit is read as absolute here:
 * an atmosphere has no other reference). elevation: the site above sea
 * level, turned into an atmosphere by the troposphere law of the U.S.
 * Standard Atmosphere, 1976 (NOAA/NASA/USAF):
 *   p = 101.325 kPa * (1 - 2.25577e-5 * z/m)^5.25588
 * with 2.25577e-5 /m = L/T0 = 0.0065 K/m / 288.15 K and 5.25588 =
 * g0*M/(R*L). The law holds in the troposphere, below 11 000 m. */
static void atmosphere_key(FmCtx *c, const char *key, yaml_node_t *v)
{
    Meta *m = &c->doc->meta;
    Quantity q;
    Unit u;
    if (m->atm_source != ATM_STANDARD) {
        diag_error(c->diags, node_pos(c, v),
                   "front matter: give 'atmosphere' or 'elevation', not both (the atmosphere "
                   "follows from the elevation)");
        return;
    }
    if (strcmp(key, "atmosphere") == 0) {
        if (!quantity_value(c, v, key, DIM_PRESSURE, "'atmosphere: 12.2 psia'", &q, &u))
            return;
        if (u.pref == PRES_GAUGE) {
            diag_error(c->diags, node_pos(c, v),
                       "front matter: 'atmosphere' is an absolute pressure; write it in psia, kPaa, "
                       "bara or a plain unit, not %s", u.text);
            return;
        }
        if (!(q.si >= 20e3 && q.si <= 110e3)) {
            diag_error(c->diags, node_pos(c, v),
                       "front matter: 'atmosphere' of %s is not an atmosphere on Earth's surface "
                       "(expected 20 kPa to 110 kPa)", scalar(c, v, key));
            return;
        }
        m->atmosphere = q.si;
        m->atm_source = ATM_GIVEN;
        m->atmosphere_text = scalar(c, v, key);
        return;
    }
    if (!quantity_value(c, v, key, DIM_L, "'elevation: 1500 ft'", &q, &u))
        return;
    if (!(q.si >= -500.0 && q.si <= 11000.0)) {
        diag_error(c->diags, node_pos(c, v),
                   "front matter: 'elevation' of %s is outside -500 m to 11000 m, where the "
                   "standard-atmosphere relation holds", scalar(c, v, key));
        return;
    }
    m->elevation = q.si;
    m->atmosphere = frontmatter_atmosphere_at(q.si);
    m->atm_source = ATM_ELEVATION;
    m->elevation_text = scalar(c, v, key);
}

double frontmatter_atmosphere_at(double z)
{
    return CONST_STANDARD_ATMOSPHERE * pow(1.0 - 2.25577e-5 * z, 5.25588);
}

static void one_key(FmCtx *c, const char *key, yaml_node_t *k, yaml_node_t *v)
{
    Meta *m = &c->doc->meta;
    struct { const char *name; const char **slot; } texts[] = {
        {"title", &m->title},     {"project", &m->project}, {"client", &m->client},
        {"number", &m->number},   {"subject", &m->subject}, {"revision", &m->revision},
        {"approved", &m->approved}, {"engineer", &m->engineer}, {"license", &m->license},
    };
    for (size_t i = 0; i < sizeof texts / sizeof texts[0]; i++)
        if (strcmp(key, texts[i].name) == 0) {
            *texts[i].slot = scalar(c, v, key);
            return;
        }
    if (strcmp(key, "revision") == 0)
        c->revision_pos = node_pos(c, v);
    if (strcmp(key, "status") == 0) {
        m->status = scalar(c, v, key);
        c->status_pos = node_pos(c, v);
        if (m->status && status_index(m->status) < 0) {
            const char *near = NULL;
            size_t best = strlen(m->status) <= 6 ? 3 : 6;
            char low[64];
            size_t n = 0;
            for (; m->status[n] && n + 1 < sizeof low; n++)
                low[n] = (char)tolower((unsigned char)m->status[n]);
            low[n] = '\0';
            for (size_t i = 0; i < sizeof STATUSES / sizeof STATUSES[0]; i++) {
                size_t d = suggest_distance_str(low, STATUSES[i].word);
                if (d < best) {
                    best = d;
                    near = STATUSES[i].word;
                }
            }
            char list[256];
            frontmatter_statuses_list(list, sizeof list);
            if (near)
                diag_error(c->diags, c->status_pos, "front matter: unknown status '%s'; did you mean '%s'? "
                           "(accepted: %s)", m->status, near, list);
            else
                diag_error(c->diags, c->status_pos, "front matter: unknown status '%s' (accepted: %s)",
                           m->status, list);
        }
    } else if (strcmp(key, "date") == 0) {
        m->date = date_value(c, v, key);
        c->date_pos = node_pos(c, v);
    } else if (strcmp(key, "prepared") == 0) {
        person(c, v, key, &m->prepared, &m->prepared_date);
    } else if (strcmp(key, "checked") == 0) {
        person(c, v, key, &m->checked, &m->checked_date);
    } else if (strcmp(key, "units") == 0) {
        const char *s = scalar(c, v, key);
        if (s && ieq(s, "US"))
            m->units = UNITS_US;
        else if (s && ieq(s, "SI"))
            m->units = UNITS_SI;
        else if (s)
            diag_error(c->diags, node_pos(c, v), "front matter: 'units' must be US or SI, found '%s'", s);
    } else if (strcmp(key, "paper") == 0) {
        const char *s = scalar(c, v, key);
        if (s && ieq(s, "letter"))
            m->paper = PAPER_LETTER;
        else if (s && ieq(s, "a4"))
            m->paper = PAPER_A4;
        else if (s)
            diag_error(c->diags, node_pos(c, v), "front matter: 'paper' must be letter or a4, found '%s'", s);
    } else if (strcmp(key, "digits") == 0) {
        const char *s = scalar(c, v, key);
        char *end = NULL;
        long d = s ? strtol(s, &end, 10) : 0;
        if (s && (*s == '\0' || *end != '\0' || d < 2 || d > 10))
            diag_error(c->diags, node_pos(c, v), "front matter: 'digits' must be a whole number from 2 to 10, found '%s'", s);
        else if (s)
            m->digits = (int)d;
    } else if (strcmp(key, "code") == 0) {
        const char *s = scalar(c, v, key);
        const PlumbingCode *pc = s ? plumbing_code_find(s) : NULL;
        if (pc) {
            m->code = pc->key;
        } else if (s) {
            char list[256];
            plumbing_codes_list(list, sizeof list);
            diag_error(c->diags, node_pos(c, v),
                       "front matter: 'code' names the plumbing code whose fixture tables "
                       "wsfu() and hunter() read; known: %s; found '%s'", list, s);
        }
    } else if (strcmp(key, "revisions") == 0) {
        revisions(c, v);
    } else if (strcmp(key, "parts") == 0) {
        parts(c, v);
    } else if (strcmp(key, "atmosphere") == 0 || strcmp(key, "elevation") == 0) {
        atmosphere_key(c, key, v);
    } else {
        diag_error(c->diags, node_pos(c, k),
                   "front matter: unknown key '%s' (known: title, project, client, number, subject, "
                   "revision, date, prepared, checked, approved, engineer, license, status, units, "
                   "paper, digits, code, revisions, parts, atmosphere, elevation)", key);
    }
}

/* An issued status names the sealing engineer and what is sealed; the cover
 * date is the date of the current revision's row. */
static void seal_data_check(FmCtx *c)
{
    const Meta *m = &c->doc->meta;
    if (frontmatter_status_issued(m->status)) {
        const char *missing[5];
        size_t n = 0;
        if (!m->engineer || !*m->engineer)
            missing[n++] = "engineer";
        if (!m->license || !*m->license)
            missing[n++] = "license";
        if (!m->revision || !*m->revision)
            missing[n++] = "revision";
        if (!m->date)
            missing[n++] = "date";
        if (!m->checked || !*m->checked)
            missing[n++] = "checked";
        if (n) {
            char list[80] = "";
            for (size_t i = 0; i < n; i++) {
                strcat(list, i == 0 ? "" : i + 1 == n ? " and " : ", ");
                strcat(list, missing[i]);
            }
            diag_error(c->diags, c->status_pos,
                       "front matter: status '%s' is an issued status and needs %s (the seal "
                       "block and the revision it seals)", m->status, list);
        }
    }
    if (!m->revision || !m->date)
        return;
    for (size_t i = 0; i < m->nrevisions; i++) {
        const Revision *rv = &m->revisions[i];
        if (!rv->rev || strcmp(rv->rev, m->revision) != 0 || !rv->date)
            continue;
        if (strcmp(rv->date, m->date) != 0)
            diag_error(c->diags, c->rev_date_pos[i],
                       "front matter: the row of revision %s is dated %s but 'date' (line %d) is "
                       "%s; the cover date is the date of the current revision",
                       rv->rev, rv->date, c->date_pos.line, m->date);
    }
}

/* The line at `p` (without its newline) is exactly `mark` plus optional
 * trailing spaces. */
static int is_marker_line(const char *p, const char *end, const char *mark)
{
    size_t n = strlen(mark);
    if ((size_t)(end - p) < n || memcmp(p, mark, n) != 0)
        return 0;
    p += n;
    while (p < end && (*p == ' ' || *p == '\t' || *p == '\r'))
        p++;
    return p == end || *p == '\n';
}

size_t frontmatter_read(Document *doc, DiagList *diags)
{
    Meta *m = &doc->meta;
    m->units = UNITS_US;
    m->paper = PAPER_LETTER;
    m->digits = 4;
    m->atmosphere = UNIT_STANDARD_ATMOSPHERE;
    m->atm_source = ATM_STANDARD;
    const char *text = doc->text, *end = text + doc->len;
    if (end - text >= 3 && memcmp(text, "\xEF\xBB\xBF", 3) == 0)
        text += 3;
    if (!is_marker_line(text, end, "---"))
        return 0;
    const char *body = memchr(text, '\n', (size_t)(end - text));
    if (!body) {
        Pos p = {doc->file, 1, 1};
        diag_error(diags, p, "front matter opened with '---' is never closed (expected a closing '---' line)");
        return doc->len;
    }
    body++;
    const char *line = body, *close = NULL;
    int closing_line = 2;
    while (line < end) {
        if (is_marker_line(line, end, "---") || is_marker_line(line, end, "...")) {
            close = line;
            break;
        }
        const char *nl = memchr(line, '\n', (size_t)(end - line));
        if (!nl)
            break;
        line = nl + 1;
        closing_line++;
    }
    if (!close) {
        Pos p = {doc->file, 1, 1};
        diag_error(diags, p, "front matter opened with '---' is never closed (expected a closing '---' line)");
        return doc->len;
    }
    m->present = true;
    const char *after = memchr(close, '\n', (size_t)(end - close));
    size_t consumed = after ? (size_t)(after + 1 - doc->text) : doc->len;

    yaml_parser_t parser;
    yaml_document_t ydoc;
    FmCtx c = {.doc = doc, .diags = diags, .y = &ydoc, .line0 = 1};
    if (!yaml_parser_initialize(&parser)) {
        Pos p = {doc->file, 1, 1};
        diag_error(diags, p, "front matter: cannot start the YAML reader");
        return consumed;
    }
    yaml_parser_set_input_string(&parser, (const unsigned char *)body, (size_t)(close - body));
    if (!yaml_parser_load(&parser, &ydoc)) {
        /* An unclosed construct is found at the end of the block; report it
         * where it opened (the context mark), as an editor would show it. */
        yaml_mark_t mk = parser.context ? parser.context_mark : parser.problem_mark;
        Pos p = {doc->file, (int)mk.line + 2, (int)mk.column + 1};
        diag_error(diags, p, "front matter: %s%s%s", parser.problem ? parser.problem : "malformed YAML",
                   parser.context ? " " : "", parser.context ? parser.context : "");
        yaml_parser_delete(&parser);
        return consumed;
    }
    yaml_node_t *root = yaml_document_get_root_node(&ydoc);
    if (root && root->type == YAML_MAPPING_NODE) {
        StrMap seen = {0};
        for (yaml_node_pair_t *pr = root->data.mapping.pairs.start; pr < root->data.mapping.pairs.top; pr++) {
            yaml_node_t *k = yaml_document_get_node(&ydoc, pr->key);
            yaml_node_t *v = yaml_document_get_node(&ydoc, pr->value);
            if (!k || !v)
                continue;
            if (k->type != YAML_SCALAR_NODE) {
                diag_error(diags, node_pos(&c, k), "front matter: keys must be plain words");
                continue;
            }
            const char *key = (const char *)k->data.scalar.value;
            /* A repeated key is an error too: YAML readers differ on which wins. */
            if (!strmap_add(&seen, key, 0, NULL)) {
                diag_error(diags, node_pos(&c, k), "front matter: key '%s' is given twice", key);
                key = NULL;
            }
            if (key)
                one_key(&c, key, k, v);
        }
        strmap_free(&seen);
    } else if (root && !(root->type == YAML_SCALAR_NODE && root->data.scalar.length == 0)) {
        diag_error(diags, node_pos(&c, root), "front matter must be 'key: value' lines");
    }
    (void)closing_line;
    seal_data_check(&c);
    yaml_document_delete(&ydoc);
    yaml_parser_delete(&parser);
    return consumed;
}
