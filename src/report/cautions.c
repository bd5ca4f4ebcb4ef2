/* cautions.c — which cautions of templates/cautions.md a report carries.
 *
 * Chosen once here from the methods the calc used, so the text listing and
 * the PDF print the same list: a caution that does not apply is noise on a
 * sealed sheet, one that applies is never left out. */
#include "render.h"

#include <string.h>

#include "report/pdf_texts.inc"

enum { USE_ALWAYS, USE_SURGE, USE_DEMAND, USE_NETWORK };

/* The cautions that apply only to some calcs, by their topic. */
static const struct { const char *topic; int use; } CONDITIONAL[] = {
    {"- **Surge.**", USE_SURGE},
    {"- **Demand.**", USE_DEMAND},
    {"- **Fixture demand.**", USE_DEMAND},
    {"- **Networks.**", USE_NETWORK},
};

static bool uses(const Evaluated *ev, int use)
{
    if (use == USE_NETWORK) {
        for (size_t i = 0; i < ev->doc->nstmts; i++)
            if (ev->doc->stmts[i]->kind == STMT_NETWORK)
                return true;
        return false;
    }
    for (size_t i = 0; i < ev->nmethods; i++) {
        const char *k = ev->methods[i]->key;
        if (use == USE_SURGE && (strcmp(k, "joukowsky") == 0 || strncmp(k, "korteweg", 8) == 0))
            return true;
        if (use == USE_DEMAND && (strncmp(k, "wsfu:", 5) == 0 || strncmp(k, "hunter:", 7) == 0))
            return true;
    }
    return false;
}

size_t report_cautions(const Evaluated *ev, ReportCaution *out, size_t max)
{
    size_t n = 0;
    for (const char *t = TEXT_CAUTIONS; *t && n < max;) {
        const char *e = strchr(t, '\n');
        size_t len = e ? (size_t)(e - t) : strlen(t);
        if (len > 2 && t[0] == '-' && t[1] == ' ') {
            int use = USE_ALWAYS;
            for (size_t k = 0; k < sizeof CONDITIONAL / sizeof CONDITIONAL[0]; k++)
                if (strncmp(t, CONDITIONAL[k].topic, strlen(CONDITIONAL[k].topic)) == 0)
                    use = CONDITIONAL[k].use;
            if (use == USE_ALWAYS || uses(ev, use))
                out[n++] = (ReportCaution){t + 2, len - 2};
        }
        t += len + (e ? 1 : 0);
    }
    return n;
}
