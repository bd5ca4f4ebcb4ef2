/* diff_text.c — `headroom diff` as grouped plain text.
 *
 * The groups come in the order a reviewer reads them: front matter, inputs,
 * results (each with the changed inputs it depends on), checks (now failing
 * first), statements added, removed or renamed, citations, prose sections,
 * then a one-line summary. Values are printed with the document's
 * significant digits, and with more when the rounded old and new texts
 * would otherwise look the same, so every line shows its change. Nothing is
 * computed here: the Diff holds the classification, the Evaluated documents
 * the values. */
#include <math.h>
#include <string.h>

#include "diff.h"
#include "numfmt.h"
#include "render.h"

/* Old and new values as text, with digits added until they differ. */
static void value_pair(const Diff *d, const Value *ov, const Unit *ou, const Value *nv, const Unit *nu,
                       StrBuf *a, StrBuf *b)
{
    Evaluated oe = *d->old_ev, ne = *d->new_ev;
    for (int digits = d->new_ev->digits; digits <= 17; digits += 2) {
        sb_clear(a);
        sb_clear(b);
        oe.digits = ne.digits = digits;
        if (ov->kind == VAL_NONE)
            sb_puts(a, "(none)");
        else
            render_value_text(&oe, ov, ou, a);
        if (nv->kind == VAL_NONE)
            sb_puts(b, "(none)");
        else
            render_value_text(&ne, nv, nu, b);
        if (strcmp(sb_str(a), sb_str(b)) != 0 || ov->kind != VAL_NUMBER || nv->kind != VAL_NUMBER)
            break;
    }
}

static void put_rel(const ValueChange *c, StrBuf *out)
{
    if (c->dim_changed) {
        sb_puts(out, " (a different kind of value)");
    } else if (c->old_value.kind == VAL_NUMBER && !isnan(c->rel)) {
        char buf[48];
        num_sig(fabs(c->rel) * 100, 3, buf, sizeof buf);
        sb_puts(out, c->rel < 0 ? " (-" : " (+");
        sb_puts(out, buf);
        sb_puts(out, " %)");
    } else if (c->old_value.kind == VAL_NUMBER && c->old_value.q.si == 0) {
        sb_puts(out, " (from zero)");
    }
}

/* A text as printf's %s writes it (NULL too), without printf: these run
 * for every statement of a diff. */
static void put_text(StrBuf *out, const char *s)
{
    sb_puts(out, s ? s : "(null)");
}

static void put_int(StrBuf *out, int v)
{
    char buf[16];
    char *o = buf + sizeof buf;
    unsigned u = v < 0 ? 0u - (unsigned)v : (unsigned)v;
    do {
        *--o = (char)('0' + u % 10);
        u /= 10;
    } while (u);
    if (v < 0)
        *--o = '-';
    sb_putn(out, o, (size_t)(buf + sizeof buf - o));
}

static void put_line(const Diff *d, int new_slot, int old_slot, StrBuf *out)
{
    if (new_slot >= 0) {
        sb_puts(out, "  [line ");
        put_int(out, d->new_ev->doc->stmts[new_slot]->pos.line);
        sb_putc(out, ']');
    } else if (old_slot >= 0) {
        sb_puts(out, "  [old line ");
        put_int(out, d->old_ev->doc->stmts[old_slot]->pos.line);
        sb_putc(out, ']');
    }
}

static void put_inputs(const Diff *d, StrBuf *out)
{
    sb_printf(out, "\ninputs (%zu):\n", d->ninputs);
    for (size_t i = 0; i < d->ninputs; i++) {
        const ValueChange *c = &d->inputs[i];
        const Stmt *os = d->old_ev->doc->stmts[c->old_slot], *ns = d->new_ev->doc->stmts[c->new_slot];
        StrBuf a = {0}, b = {0};
        if (os->expr && ns->expr) {
            render_expr_text(d->old_ev, os->expr, false, &a);
            render_expr_text(d->new_ev, ns->expr, false, &b);
        } else {
            /* a cell of a path table (its fixtures), as written */
            sb_printf(&a, "\"%s\"", c->old_value.kind == VAL_STRING ? c->old_value.str : "");
            sb_printf(&b, "\"%s\"", c->new_value.kind == VAL_STRING ? c->new_value.str : "");
        }
        sb_printf(out, "  %s = %s → %s", c->name, sb_str(&a), sb_str(&b));
        put_rel(c, out);
        put_line(d, c->new_slot, c->old_slot, out);
        sb_putc(out, '\n');
        sb_free(&a);
        sb_free(&b);
    }
}

/* The fields of a nested record (a path's segment) on one line, each with
 * its relative change. Returns the index after the group. */
static size_t put_record_group(const Diff *d, size_t i, StrBuf *out)
{
    const ValueChange *c0 = &d->results[i];
    sb_printf(out, "  %s:", c0->record);
    size_t j = i;
    for (; j < d->nresults && d->results[j].record && strcmp(d->results[j].record, c0->record) == 0; j++) {
        sb_printf(out, "%s %s", j > i ? "," : "", d->results[j].field);
        put_rel(&d->results[j], out);
    }
    for (size_t k = 0; k < c0->ninputs; k++)
        sb_printf(out, "%s%s", k ? ", " : "; from ", d->inputs[c0->inputs[k]].name);
    put_line(d, c0->new_slot, c0->old_slot, out);
    sb_putc(out, '\n');
    return j;
}

static void put_results(const Diff *d, StrBuf *out)
{
    sb_printf(out, "\nresults (%zu):\n", d->nresults);
    for (size_t i = 0; i < d->nresults; i++) {
        const ValueChange *c = &d->results[i];
        if (c->record) {
            i = put_record_group(d, i, out) - 1;
            continue;
        }
        StrBuf a = {0}, b = {0};
        value_pair(d, &c->old_value, &c->old_unit, &c->new_value, &c->new_unit, &a, &b);
        bool same = !c->dim_changed && strcmp(sb_str(&a), sb_str(&b)) == 0 &&
                    (c->new_value.kind == VAL_RECORD || !c->ninputs);
        bool curve = c->new_value.kind == VAL_RECORD && c->new_value.rec && strcmp(c->new_value.rec->type, "curve") == 0;
        if (c->formula_changed && curve)
            sb_printf(out, "  %s: curve table changed", c->name);
        else if (c->formula_changed && (same || c->new_value.kind == VAL_RECORD))
            sb_printf(out, "  %s: formula changed, value unchanged", c->name);
        else {
            sb_puts(out, "  ");
            put_text(out, c->name);
            sb_puts(out, " = ");
            sb_puts(out, sb_str(&a));
            sb_puts(out, " → ");
            sb_puts(out, sb_str(&b));
            put_rel(c, out);
            if (c->formula_changed)
                sb_puts(out, "; formula changed");
        }
        for (size_t k = 0; k < c->ninputs; k++) {
            sb_puts(out, k ? ", " : "; from ");
            put_text(out, d->inputs[c->inputs[k]].name);
        }
        put_line(d, c->new_slot, c->old_slot, out);
        sb_putc(out, '\n');
        sb_free(&a);
        sb_free(&b);
    }
}

static void util_text(double u, int digits, char *buf, size_t n)
{
    if (isfinite(u))
        num_sig(u, digits, buf, n);
    else
        snprintf(buf, n, "n/a");
}

static void put_findings(const Diff *d, StrBuf *out)
{
    sb_printf(out, "\nfindings (%zu changed):\n", d->nfindings);
    for (size_t i = 0; i < d->nfindings; i++) {
        const CheckChange *c = &d->findings[i];
        const char *label = d->new_ev->doc->stmts[c->new_slot]->label;
        bool now = d->new_ev->results[c->new_slot].holds;
        if (c->kind == CHECK_CONDITION)
            sb_printf(out, "  %-9s  %s: condition rewritten, answer unchanged", now ? "yes" : "no", label);
        else
            sb_printf(out, "  %-9s  %s", now ? "no → yes" : "yes → no", label);
        if (c->condition_changed && c->kind != CHECK_CONDITION)
            sb_puts(out, "; condition rewritten");
        put_line(d, c->new_slot, c->old_slot, out);
        sb_putc(out, '\n');
    }
}

static void put_checks(const Diff *d, StrBuf *out)
{
    size_t flips = 0;
    for (size_t i = 0; i < d->nchecks; i++)
        flips += d->checks[i].kind == CHECK_NOW_FAILS || d->checks[i].kind == CHECK_NOW_HOLDS;
    sb_printf(out, "\nchecks (%zu flipped, %zu changed):\n", flips, d->nchecks - flips);
    for (size_t i = 0; i < d->nchecks; i++) {
        const CheckChange *c = &d->checks[i];
        const char *label = d->new_ev->doc->stmts[c->new_slot]->label;
        char u0[48] = "", u1[48] = "";
        for (int digits = 3; digits <= 17; digits += 2) {
            util_text(c->old_util, digits, u0, sizeof u0);
            util_text(c->new_util, digits, u1, sizeof u1);
            if (strcmp(u0, u1) != 0)
                break;
        }
        switch (c->kind) {
        case CHECK_NOW_FAILS:
            sb_printf(out, "  holds → FAILS  %s: utilisation %s → %s", label, u0, u1);
            break;
        case CHECK_NOW_HOLDS:
            sb_printf(out, "  FAILS → holds  %s: utilisation %s → %s", label, u0, u1);
            break;
        case CHECK_UTILISATION:
            sb_printf(out, "  %-13s  %s: utilisation %s → %s", d->new_ev->results[c->new_slot].holds ? "holds" : "FAILS",
                      label, u0, u1);
            break;
        case CHECK_CONDITION:
            sb_printf(out, "  %-13s  %s: condition rewritten, utilisation %s unchanged",
                      d->new_ev->results[c->new_slot].holds ? "holds" : "FAILS", label, u1);
            break;
        }
        if (c->condition_changed && c->kind != CHECK_CONDITION)
            sb_puts(out, "; condition rewritten");
        put_line(d, c->new_slot, c->old_slot, out);
        sb_putc(out, '\n');
    }
}

/* A statement in one line, as written: "V = Q/A", "check velocity: V <= 8 ft/s". */
static void stmt_text(const Evaluated *ev, const Stmt *s, StrBuf *out)
{
    switch (s->kind) {
    case STMT_DEF:
        put_text(out, s->name);
        sb_puts(out, " = ");
        render_expr_text(ev, s->expr, false, out);
        break;
    case STMT_SOLVE:
        put_text(out, s->name);
        sb_puts(out, " = solve ");
        put_text(out, s->solve->var);
        sb_puts(out, " where ");
        render_expr_text(ev, s->lhs, false, out);
        sb_puts(out, " = ");
        render_expr_text(ev, s->rhs, false, out);
        break;
    case STMT_CHECK:
        sb_puts(out, s->finding ? "finding " : "check ");
        put_text(out, s->label);
        sb_puts(out, ": ");
        render_expr_text(ev, s->lhs, false, out);
        sb_putc(out, ' ');
        put_text(out, cmp_op_text(s->cmp, false));
        sb_putc(out, ' ');
        render_expr_text(ev, s->rhs, false, out);
        break;
    case STMT_PATH:
        sb_printf(out, "path %s (%zu segments)", s->name, s->path ? s->path->nsegs : (size_t)0);
        break;
    case STMT_NETWORK:
        sb_printf(out, "network %s (%zu nodes, %zu links)", s->name, s->network ? s->network->nnodes : (size_t)0,
                  s->network ? s->network->nlinks : (size_t)0);
        break;
    case STMT_CURVE:
        sb_printf(out, "curve %s (%zu points)", s->name, s->curve ? s->curve->npoints : (size_t)0);
        break;
    default:
        break;
    }
}

static const char *stmt_title(const Stmt *s)
{
    return s->kind == STMT_CHECK ? s->label : s->name;
}

static void put_stmts(const Diff *d, StrBuf *out)
{
    sb_printf(out, "\nstatements (%zu):\n", d->nstmts);
    for (size_t i = 0; i < d->nstmts; i++) {
        const StmtChange *c = &d->stmts[i];
        const Stmt *os = c->old_slot >= 0 ? d->old_ev->doc->stmts[c->old_slot] : NULL;
        const Stmt *ns = c->new_slot >= 0 ? d->new_ev->doc->stmts[c->new_slot] : NULL;
        switch (c->kind) {
        case STMT_RENAMED:
            sb_puts(out, ns->kind == STMT_CHECK ? "  renamed  check " : "  renamed  ");
            put_text(out, stmt_title(os));
            sb_puts(out, " → ");
            put_text(out, stmt_title(ns));
            break;
        case STMT_ADDED:
            sb_puts(out, "  added    ");
            stmt_text(d->new_ev, ns, out);
            break;
        case STMT_REMOVED:
            sb_puts(out, "  removed  ");
            stmt_text(d->old_ev, os, out);
            break;
        }
        put_line(d, c->new_slot, c->old_slot, out);
        sb_putc(out, '\n');
    }
}

static void put_cites(const Stmt *s, StrBuf *out)
{
    if (!s->ncites)
        sb_puts(out, "(none)");
    for (size_t k = 0; k < s->ncites; k++)
        sb_printf(out, "%s[%s]", k ? " " : "", s->cites[k].key);
}

static void put_citations(const Diff *d, StrBuf *out)
{
    const Document *od = d->old_ev->doc, *nd = d->new_ev->doc;
    sb_printf(out, "\ncitations (%zu):\n", d->ncites);
    for (size_t i = 0; i < d->ncites; i++) {
        const CiteChange *c = &d->cites[i];
        switch (c->kind) {
        case CITE_SOURCE_CHANGED:
            sb_printf(out, "  source [%s]: \"%s\" → \"%s\"  [line %d]\n", nd->sources[c->new_source].key,
                      od->sources[c->old_source].text, nd->sources[c->new_source].text,
                      nd->sources[c->new_source].pos.line);
            break;
        case CITE_SOURCE_ADDED:
            sb_printf(out, "  source added [%s]: \"%s\"  [line %d]\n", nd->sources[c->new_source].key,
                      nd->sources[c->new_source].text, nd->sources[c->new_source].pos.line);
            break;
        case CITE_SOURCE_REMOVED:
            sb_printf(out, "  source removed [%s]: \"%s\"  [old line %d]\n", od->sources[c->old_source].key,
                      od->sources[c->old_source].text, od->sources[c->old_source].pos.line);
            break;
        case CITE_STMT_CITES: {
            const Stmt *os = od->stmts[c->old_slot], *ns = nd->stmts[c->new_slot];
            sb_printf(out, "  %s%s cites ", ns->kind == STMT_CHECK ? "check " : "", stmt_title(ns));
            put_cites(os, out);
            sb_puts(out, " → ");
            put_cites(ns, out);
            put_line(d, c->new_slot, c->old_slot, out);
            sb_putc(out, '\n');
            break;
        }
        }
    }
}

static const char *plural(size_t n, const char *one, const char *many)
{
    return n == 1 ? one : many;
}

static void put_prose(const Diff *d, StrBuf *out)
{
    sb_printf(out, "\nprose (%zu %s):\n", d->nprose, plural(d->nprose, "section", "sections"));
    for (size_t i = 0; i < d->nprose; i++) {
        const ProseChange *c = &d->prose[i];
        if (c->heading)
            sb_printf(out, "  section %s%s%s: ", c->number, c->number[0] ? " " : "", c->heading);
        else
            sb_puts(out, "  before the first heading: ");
        switch (c->kind) {
        case PROSE_ADDED:
            sb_printf(out, "section added (%zu %s)", c->added, plural(c->added, "paragraph", "paragraphs"));
            break;
        case PROSE_REMOVED:
            sb_printf(out, "section removed (%zu %s)", c->removed, plural(c->removed, "paragraph", "paragraphs"));
            break;
        case PROSE_CHANGED: {
            if (c->old_heading) {
                sb_printf(out, "heading reworded from \"%s\"", c->old_heading);
                if (!c->changed && !c->added && !c->removed)
                    break;
                sb_puts(out, ", ");
            }
            sb_puts(out, "prose changed (");
            const char *sep = "";
            if (c->changed) {
                sb_printf(out, "%zu %s changed", c->changed, plural(c->changed, "paragraph", "paragraphs"));
                sep = ", ";
            }
            if (c->added) {
                sb_printf(out, "%s%zu %s", sep, c->added, c->changed ? "added" : plural(c->added, "paragraph added", "paragraphs added"));
                sep = ", ";
            }
            if (c->removed)
                sb_printf(out, "%s%zu %s", sep, c->removed,
                          (c->changed || c->added) ? "removed" : plural(c->removed, "paragraph removed", "paragraphs removed"));
            sb_putc(out, ')');
            break;
        }
        }
        sb_printf(out, "  [%sline %d]\n", c->kind == PROSE_REMOVED ? "old " : "", c->line);
    }
}

static void put_side(const char *which, const Document *doc, StrBuf *out)
{
    sb_printf(out, "%s: %s", which, doc->file);
    if (doc->meta.revision)
        sb_printf(out, "  revision %s", doc->meta.revision);
    sb_printf(out, "  sha256 %.12s\n", doc->digest);
}

/* Used files whose bytes changed, and the results that read them. */
static void put_uses(const Diff *d, StrBuf *out)
{
    static const char *const kind[] = {"changed", "now used", "no longer used"};
    sb_puts(out, "\nused files:\n");
    for (size_t i = 0; i < d->nuses; i++) {
        const UseChange *c = &d->uses[i];
        sb_printf(out, "  %s  %s", c->name, kind[c->kind]);
        if (c->old_digest && c->new_digest)
            sb_printf(out, ": sha256 %.12s → %.12s", c->old_digest, c->new_digest);
        else
            sb_printf(out, ": sha256 %.12s", c->new_digest ? c->new_digest : c->old_digest);
        sb_putc(out, '\n');
        if (c->kind == USE_REMOVED)
            continue;
        if (c->nmoved == 0) {
            sb_puts(out, "    no result of this calc moved\n");
            continue;
        }
        sb_printf(out, "    %zu result%s moved because of it:", c->nmoved, c->nmoved == 1 ? "" : "s");
        const char *last = NULL;
        for (size_t k = 0; k < c->nmoved; k++) {
            const char *name = d->results[c->moved[k]].name;
            if (last && strcmp(last, name) == 0)
                continue; /* fields of one record: its name once */
            sb_printf(out, "%s %s", last ? "," : "", name);
            last = name;
        }
        sb_putc(out, '\n');
    }
}

static void count(StrBuf *out, const char **sep, size_t n, const char *one, const char *many)
{
    if (!n)
        return;
    sb_printf(out, "%s%zu %s", *sep, n, plural(n, one, many));
    *sep = ", ";
}

bool render_diff_text(const Diff *d, FILE *out)
{
    StrBuf sb = {0};
    put_side("old", d->old_ev->doc, &sb);
    put_side("new", d->new_ev->doc, &sb);
    if (d->nuses)
        put_uses(d, &sb);
    size_t nmeta = 0;
    if (d->nmeta) {
        sb_puts(&sb, "\nfront matter:\n");
        for (size_t i = 0; i < d->nmeta; i++) {
            const MetaChange *m = &d->meta[i];
            sb_printf(&sb, "  %s: \"%s\" → \"%s\"%s\n", m->key, m->old_text, m->new_text,
                      m->display_only ? " (display only)" : "");
            nmeta += !m->display_only;
        }
    }
    if (d->ninputs)
        put_inputs(d, &sb);
    if (d->nresults)
        put_results(d, &sb);
    if (d->nchecks)
        put_checks(d, &sb);
    if (d->nfindings)
        put_findings(d, &sb);
    if (d->nstmts)
        put_stmts(d, &sb);
    if (d->ncites)
        put_citations(d, &sb);
    if (d->nprose)
        put_prose(d, &sb);
    sb_puts(&sb, "\n");
    if (!d->changed) {
        sb_puts(&sb, "no change in meaning\n");
    } else {
        size_t flips = 0;
        for (size_t i = 0; i < d->nchecks; i++)
            flips += d->checks[i].kind == CHECK_NOW_FAILS || d->checks[i].kind == CHECK_NOW_HOLDS;
        const char *sep = "";
        sb_puts(&sb, "changed in meaning: ");
        count(&sb, &sep, nmeta, "front matter field", "front matter fields");
        count(&sb, &sep, d->ninputs, "input", "inputs");
        count(&sb, &sep, d->nresults, "result", "results");
        count(&sb, &sep, flips, "check flipped", "checks flipped");
        count(&sb, &sep, d->nchecks - flips, "check changed", "checks changed");
        count(&sb, &sep, d->nfindings, "finding changed", "findings changed");
        count(&sb, &sep, d->nstmts, "statement added, removed or renamed", "statements added, removed or renamed");
        count(&sb, &sep, d->ncites, "citation", "citations");
        count(&sb, &sep, d->nprose, "prose section", "prose sections");
        sb_putc(&sb, '\n');
    }
    bool ok = fwrite(sb.data ? sb.data : "", 1, sb.len, out) == sb.len;
    sb_free(&sb);
    return ok;
}

bool render_package_diff_text(const Diff *index, const PartDiff *parts, size_t n, FILE *out)
{
    bool ok = fprintf(out, "package: %s → %s\n", index->old_ev->doc->file, index->new_ev->doc->file) > 0;
    if (index->changed) {
        ok = fputs("\n== the index\n", out) >= 0 && ok;
        ok = render_diff_text(index, out) && ok;
    }
    size_t changed = 0;
    for (size_t i = 0; i < n; i++) {
        const PartDiff *p = &parts[i];
        if (p->added || p->removed) {
            ok = fprintf(out, "\n== %s  %s the package\n", p->file,
                         p->added ? "added to" : "removed from") > 0 && ok;
            changed++;
            continue;
        }
        ok = fprintf(out, "\n== %s\n", p->file) > 0 && ok;
        ok = render_diff_text(p->diff, out) && ok;
        changed += p->diff->changed;
    }
    ok = fprintf(out, "\npackage: %zu of %zu part%s changed in meaning%s\n", changed, n,
                 n == 1 ? "" : "s", index->changed ? ", and the index" : "") > 0 && ok;
    return ok;
}
