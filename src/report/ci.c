/* ci.c — `check --format junit|github`: the results for CI services.
 *
 * Both formats read the same CheckRun list as the text summary: every check
 * of every file with its verdict, and every diagnostic. Text that reaches XML
 * is escaped character by character after strict UTF-8 decoding, so a
 * message or a label can never break the document: markup characters become
 * entities, characters XML 1.0 forbids (most C0 controls, U+FFFE, U+FFFF,
 * malformed bytes) become U+FFFD. Workflow commands escape `%`, CR and LF in
 * the message and also `:` and `,` in properties, as GitHub's toolkit does. */
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "numfmt.h"
#include "render.h"
#include "textpos.h"

const FindingRule finding_rules[FIND_KINDS] = {
    [FIND_INPUT_ERROR] = {"input-error", "The calc has an error; nothing can be issued until it is fixed"},
    [FIND_WARNING] = {"input-warning", "A value lies outside a method's validity or needs attention"},
    [FIND_NOTE] = {"input-note", "A remark on the calc"},
    [FIND_READ_FAILURE] = {"read-failure", "The file could not be read"},
    [FIND_CHECK_FAILS] = {"check-fails", "A check of the calc does not hold"},
};

FindingKind finding_of_diag(const Diag *d)
{
    if (d->severity == SEV_WARNING)
        return FIND_WARNING;
    if (d->severity == SEV_NOTE)
        return FIND_NOTE;
    return d->pos.line > 0 ? FIND_INPUT_ERROR : FIND_READ_FAILURE;
}

int render_utf16_col(const Document *doc, int line, int byte_col)
{
    size_t len;
    const char *p = doc ? doc_source_line(doc, line, &len) : NULL;
    if (!p || byte_col < 1)
        return byte_col < 1 ? 1 : byte_col;
    return (int)textpos_units(p, len, (size_t)byte_col - 1, COL_UTF16) + 1;
}

static void put_utilization(double u, StrBuf *out)
{
    char buf[32] = "n/a";
    if (isfinite(u))
        num_sig(u, 3, buf, sizeof buf);
    sb_printf(out, "utilisation %s", buf);
}

void render_check_verdict(const Evaluated *ev, size_t stmt, StrBuf *out, bool *fails)
{
    const Stmt *s = ev->doc->stmts[stmt];
    const StmtResult *r = &ev->results[stmt];
    const char *op = cmp_op_text(s->cmp, false);
    *fails = true;
    if (!s->lhs || !s->rhs) { /* the check did not parse */
        sb_puts(out, "not evaluated: the check has errors");
        return;
    }
    StrBuf l = {0}, rr = {0};
    render_expr_text(ev, s->lhs, false, &l);
    render_expr_text(ev, s->rhs, false, &rr);
    sb_printf(out, "%s %s %s", sb_str(&l), op, sb_str(&rr));
    sb_free(&l);
    sb_free(&rr);
    *fails = false;
    if (r->state != RES_OK) {
        sb_puts(out, ": not evaluated");
        *fails = true;
        return;
    }
    sb_puts(out, ": ");
    render_value_text(ev, &r->sides->lhs, &r->sides->lhs_shown, out);
    sb_printf(out, " %s ", op);
    render_value_text(ev, &r->sides->rhs, &r->sides->rhs_shown, out);
    if (s->finding) { /* an answer, never a failure */
        sb_printf(out, ": %s (finding)", r->holds ? "yes" : "no");
        return;
    }
    sb_printf(out, " %s, ", r->holds ? "holds" : "fails");
    put_utilization(r->utilization, out);
    *fails = !r->holds;
    /* The case rows in which this check fails or cannot be evaluated. */
    size_t nrows = 0;
    StrBuf lines = {0};
    for (size_t t = 0; t < ev->ncases; t++) {
        const CaseResult *cr = &ev->cases[t];
        for (size_t k = 0; cr->table && k < cr->nchecks; k++) {
            if ((size_t)cr->check_slots[k] != stmt)
                continue;
            for (size_t row = 0; row < cr->table->nrows; row++) {
                const CaseRow *cw = &cr->rows[row];
                if (!cw->holds || cw->holds[k])
                    continue;
                if (nrows < 10)
                    sb_printf(&lines, "%s%d", nrows ? ", " : "", cr->table->row_pos[row].line);
                nrows++;
            }
        }
    }
    if (nrows) {
        sb_printf(out, "; fails in %zu case row%s (line%s %s%s)", nrows, nrows == 1 ? "" : "s",
                  nrows == 1 ? "" : "s", sb_str(&lines), nrows > 10 ? ", ..." : "");
        *fails = true;
    }
    sb_free(&lines);
}

/* ---- JUnit XML ---------------------------------------------------------- */

/* Decode one UTF-8 character at s[*i]; strict (no overlongs, surrogates or
 * values past U+10FFFF). A malformed byte gives U+FFFD and advances by one. */
static uint32_t utf8_next(const unsigned char *s, size_t len, size_t *i)
{
    unsigned char c = s[*i];
    size_t n;
    uint32_t cp, min;
    if (c < 0x80) {
        (*i)++;
        return c;
    } else if ((c & 0xE0) == 0xC0) {
        n = 2, cp = c & 0x1Fu, min = 0x80;
    } else if ((c & 0xF0) == 0xE0) {
        n = 3, cp = c & 0x0Fu, min = 0x800;
    } else if ((c & 0xF8) == 0xF0) {
        n = 4, cp = c & 0x07u, min = 0x10000;
    } else {
        (*i)++;
        return 0xFFFD;
    }
    if (*i + n > len) {
        (*i)++;
        return 0xFFFD;
    }
    for (size_t k = 1; k < n; k++) {
        if ((s[*i + k] & 0xC0) != 0x80) {
            (*i)++;
            return 0xFFFD;
        }
        cp = (cp << 6) | (s[*i + k] & 0x3Fu);
    }
    if (cp < min || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF)) {
        (*i)++;
        return 0xFFFD;
    }
    *i += n;
    return cp;
}

static bool xml_char_ok(uint32_t c)
{
    return c == 0x9 || c == 0xA || c == 0xD || (c >= 0x20 && c <= 0xD7FF) ||
           (c >= 0xE000 && c <= 0xFFFD) || (c >= 0x10000 && c <= 0x10FFFF);
}

static void put_utf8(uint32_t c, FILE *out)
{
    if (c < 0x80) {
        fputc((int)c, out);
    } else if (c < 0x800) {
        fputc((int)(0xC0 | (c >> 6)), out);
        fputc((int)(0x80 | (c & 0x3F)), out);
    } else if (c < 0x10000) {
        fputc((int)(0xE0 | (c >> 12)), out);
        fputc((int)(0x80 | ((c >> 6) & 0x3F)), out);
        fputc((int)(0x80 | (c & 0x3F)), out);
    } else {
        fputc((int)(0xF0 | (c >> 18)), out);
        fputc((int)(0x80 | ((c >> 12) & 0x3F)), out);
        fputc((int)(0x80 | ((c >> 6) & 0x3F)), out);
        fputc((int)(0x80 | (c & 0x3F)), out);
    }
}

/* Text for XML character data, or (attr) for a double-quoted attribute,
 * where tab, CR and LF are written as references so they survive
 * attribute-value normalisation. */
static void xml_put(const char *text, bool attr, FILE *out)
{
    const unsigned char *s = (const unsigned char *)(text ? text : "");
    size_t len = strlen((const char *)s);
    for (size_t i = 0; i < len;) {
        uint32_t c = utf8_next(s, len, &i);
        if (!xml_char_ok(c))
            c = 0xFFFD;
        switch (c) {
        case '&': fputs("&amp;", out); break;
        case '<': fputs("&lt;", out); break;
        case '>': fputs("&gt;", out); break;
        case '"': fputs(attr ? "&quot;" : "\"", out); break;
        case '\'': fputs(attr ? "&apos;" : "'", out); break;
        case '\t': fputs(attr ? "&#9;" : "\t", out); break;
        case '\n': fputs(attr ? "&#10;" : "\n", out); break;
        case '\r': fputs("&#13;", out); break;
        default: put_utf8(c, out);
        }
    }
}

static void xml_attr(const char *name, const char *value, FILE *out)
{
    fprintf(out, " %s=\"", name);
    xml_put(value, true, out);
    fputc('"', out);
}

static const char *severity_word(Severity s)
{
    return s == SEV_ERROR ? "error" : s == SEV_WARNING ? "warning" : "note";
}

static void diag_line(const Diag *d, StrBuf *out)
{
    const char *file = d->pos.file ? d->pos.file : "headroom";
    if (d->pos.line > 0)
        sb_printf(out, "%s:%d:%d: %s: %s", file, d->pos.line, d->pos.col > 0 ? d->pos.col : 1,
                  severity_word(d->severity), d->message);
    else
        sb_printf(out, "%s: %s: %s", file, severity_word(d->severity), d->message);
}

typedef struct SuiteCounts {
    size_t tests, failures, errors;
} SuiteCounts;

static SuiteCounts suite_counts(const CheckRun *run)
{
    SuiteCounts c = {0, 0, 0};
    for (size_t i = 0; run->diags && i < run->diags->len; i++)
        if (run->diags->items[i].severity == SEV_ERROR) {
            c.tests++;
            c.errors++;
        }
    const Evaluated *ev = run->ev;
    for (size_t i = 0; ev && i < ev->doc->nstmts; i++) {
        if (ev->doc->stmts[i]->kind != STMT_CHECK || ev->doc->stmts[i]->finding)
            continue;
        StrBuf v = {0};
        bool fails;
        render_check_verdict(ev, i, &v, &fails);
        sb_free(&v);
        c.tests++;
        if (ev->results[i].state != RES_OK)
            c.errors++;
        else if (fails)
            c.failures++;
    }
    return c;
}

static void junit_suite(const CheckRun *run, const SuiteCounts *c, FILE *out)
{
    const Evaluated *ev = run->ev;
    char num[32];
    fputs("  <testsuite", out);
    xml_attr("name", run->file, out);
    snprintf(num, sizeof num, "%zu", c->tests);
    xml_attr("tests", num, out);
    snprintf(num, sizeof num, "%zu", c->failures);
    xml_attr("failures", num, out);
    snprintf(num, sizeof num, "%zu", c->errors);
    xml_attr("errors", num, out);
    xml_attr("skipped", "0", out);
    xml_attr("file", run->file, out);
    fputs(">\n", out);
    if (ev) {
        fputs("    <properties>\n      <property name=\"sha256\"", out);
        xml_attr("value", ev->doc->digest, out);
        fputs("/>\n    </properties>\n", out);
    }
    /* Input errors first: they are why checks are not evaluated. */
    for (size_t i = 0; run->diags && i < run->diags->len; i++) {
        const Diag *d = &run->diags->items[i];
        if (d->severity != SEV_ERROR)
            continue;
        FindingKind k = finding_of_diag(d);
        StrBuf name = {0}, full = {0};
        if (d->pos.line > 0)
            sb_printf(&name, "input error at line %d, column %d", d->pos.line, d->pos.col);
        else
            sb_puts(&name, "read the file");
        diag_line(d, &full);
        fputs("    <testcase", out);
        xml_attr("name", sb_str(&name), out);
        xml_attr("classname", run->file, out);
        xml_attr("file", run->file, out);
        if (d->pos.line > 0) {
            snprintf(num, sizeof num, "%d", d->pos.line);
            xml_attr("line", num, out);
        }
        fputs(">\n      <error", out);
        xml_attr("message", d->message, out);
        xml_attr("type", finding_rules[k].id, out);
        fputc('>', out);
        xml_put(sb_str(&full), false, out);
        fputs("</error>\n    </testcase>\n", out);
        sb_free(&name);
        sb_free(&full);
    }
    for (size_t i = 0; ev && i < ev->doc->nstmts; i++) {
        const Stmt *s = ev->doc->stmts[i];
        if (s->kind != STMT_CHECK || s->finding)
            continue;
        StrBuf v = {0};
        bool fails;
        render_check_verdict(ev, i, &v, &fails);
        fputs("    <testcase", out);
        xml_attr("name", s->label ? s->label : "", out);
        xml_attr("classname", run->file, out);
        xml_attr("file", run->file, out);
        snprintf(num, sizeof num, "%d", s->pos.line);
        xml_attr("line", num, out);
        if (ev->results[i].state != RES_OK) {
            fputs(">\n      <error", out);
            xml_attr("message", "not evaluated: the input has errors", out);
            xml_attr("type", finding_rules[FIND_INPUT_ERROR].id, out);
            fputc('>', out);
            xml_put(sb_str(&v), false, out);
            fputs("</error>\n    </testcase>\n", out);
        } else if (fails) {
            fputs(">\n      <failure", out);
            xml_attr("message", sb_str(&v), out);
            xml_attr("type", finding_rules[FIND_CHECK_FAILS].id, out);
            fputc('>', out);
            StrBuf body = {0};
            sb_printf(&body, "%s:%d: check %s: %s", run->file, s->pos.line, s->label ? s->label : "",
                      sb_str(&v));
            xml_put(sb_str(&body), false, out);
            sb_free(&body);
            fputs("</failure>\n    </testcase>\n", out);
        } else {
            fputs(">\n      <system-out>", out);
            xml_put(sb_str(&v), false, out);
            fputs("</system-out>\n    </testcase>\n", out);
        }
        sb_free(&v);
    }
    /* Warnings and notes do not fail a test; they are kept in the log. */
    bool any = false;
    for (size_t i = 0; run->diags && i < run->diags->len; i++) {
        const Diag *d = &run->diags->items[i];
        if (d->severity == SEV_ERROR)
            continue;
        if (!any)
            fputs("    <system-err>", out);
        any = true;
        StrBuf line = {0};
        diag_line(d, &line);
        sb_putc(&line, '\n');
        xml_put(sb_str(&line), false, out);
        sb_free(&line);
    }
    if (any)
        fputs("</system-err>\n", out);
    fputs("  </testsuite>\n", out);
}

bool render_junit(const CheckRun *runs, size_t n, FILE *out)
{
    SuiteCounts total = {0, 0, 0};
    SuiteCounts *c = xcalloc(n + 1, sizeof *c);
    for (size_t i = 0; i < n; i++) {
        c[i] = suite_counts(&runs[i]);
        total.tests += c[i].tests;
        total.failures += c[i].failures;
        total.errors += c[i].errors;
    }
    fprintf(out, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
                 "<testsuites name=\"headroom check\" tests=\"%zu\" failures=\"%zu\" errors=\"%zu\">\n",
            total.tests, total.failures, total.errors);
    for (size_t i = 0; i < n; i++)
        junit_suite(&runs[i], &c[i], out);
    fputs("</testsuites>\n", out);
    free(c);
    return !ferror(out);
}

/* ---- GitHub workflow commands -------------------------------------------- */

/* `%`, CR and LF are escaped everywhere; in a property also `:` and `,`. */
static void gh_put(const char *s, bool property, FILE *out)
{
    for (; s && *s; s++) {
        switch (*s) {
        case '%': fputs("%25", out); break;
        case '\r': fputs("%0D", out); break;
        case '\n': fputs("%0A", out); break;
        case ':': fputs(property ? "%3A" : ":", out); break;
        case ',': fputs(property ? "%2C" : ",", out); break;
        default: fputc(*s, out);
        }
    }
}

static void gh_command(const char *cmd, const char *file, int line, int col, const char *title,
                       const char *message, FILE *out)
{
    fprintf(out, "::%s file=", cmd);
    gh_put(file, true, out);
    if (line > 0)
        fprintf(out, ",line=%d", line);
    if (line > 0 && col > 0)
        fprintf(out, ",col=%d", col);
    if (title) {
        fputs(",title=", out);
        gh_put(title, true, out);
    }
    fputs("::", out);
    gh_put(message, false, out);
    fputc('\n', out);
}

bool render_github(const CheckRun *runs, size_t n, FILE *out)
{
    for (size_t f = 0; f < n; f++) {
        const CheckRun *run = &runs[f];
        const Evaluated *ev = run->ev;
        for (size_t i = 0; run->diags && i < run->diags->len; i++) {
            const Diag *d = &run->diags->items[i];
            const char *cmd = d->severity == SEV_ERROR ? "error" : d->severity == SEV_WARNING ? "warning" : "notice";
            const char *file = d->pos.file ? d->pos.file : run->file;
            /* Columns count characters, as an editor shows them. */
            const Document *doc = ev && d->pos.file && strcmp(d->pos.file, ev->doc->file) == 0 ? ev->doc : NULL;
            int col = render_utf16_col(doc, d->pos.line, d->pos.col);
            gh_command(cmd, file, d->pos.line, col, NULL, d->message, out);
        }
        size_t nchecks = 0, nfail = 0, nnot = 0;
        for (size_t i = 0; ev && i < ev->doc->nstmts; i++) {
            const Stmt *s = ev->doc->stmts[i];
            if (s->kind != STMT_CHECK || s->finding)
                continue;
            nchecks++;
            StrBuf v = {0}, msg = {0};
            bool fails;
            render_check_verdict(ev, i, &v, &fails);
            if (ev->results[i].state != RES_OK) {
                nnot++;
            } else if (fails) {
                nfail++;
                sb_printf(&msg, "check %s: %s", s->label ? s->label : "", sb_str(&v));
                gh_command("error", run->file, s->pos.line, 1, "check fails", sb_str(&msg), out);
            }
            sb_free(&v);
            sb_free(&msg);
        }
        /* A plain line for the log; it never starts with "::". */
        fprintf(out, "headroom: %s", run->file);
        if (!ev)
            fputs(": not read\n", out);
        else
            fprintf(out, ": %zu check%s, %zu failing, %zu not evaluated\n", nchecks, nchecks == 1 ? "" : "s",
                    nfail, nnot);
    }
    return !ferror(out);
}
