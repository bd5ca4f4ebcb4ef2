/* pipes.c — pipe dimension lookup over the published tables.
 *
 * The rows are data in pipetab.def, one X-macro list per standard laid out
 * as the standard prints its table (a size per line, a column per class);
 * this file expands them into one flat row array, converts inches to metres
 * and adds what a table implies: bore id = od - 2*wall, flow area
 * pi/4*id^2, the material's roughness and elastic modulus. The choice of
 * wall (nominal for steel and copper, minimum for plastics) is explained on
 * top of pipetab.def. */
#include "methods/pipes.h"

#include "constants.h"
#include "methods/roughness.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define PSI 6894.757293168361   /* Pa per lbf/in^2 (NIST SP 811) */
#define PI CONST_PI

/* Elastic moduli, room temperature, each with its source. B31.9 is ASME
 * B31.9, Building Services Piping, Table 919.3.1 "Moduli of Elasticity and
 * Thermal Expansion Coefficients" (psi x 10^-6): copper C12200 17.0, PVC
 * 1120 0.42, CPVC 4120 0.42. Steel is ASME B31.1 Power Piping, Appendix C,
 * Table C-1, carbon steel C <= 0.30 % at 70 degF, 29.5e6 psi (as reproduced
 * by The Engineering ToolBox, "Young Modulus of Elasticity for Metals and
 * Alloys"). No published PEX modulus could be read, so PEX has none
 * (E = 0): pipe() leaves the field out and wave_speed() says so. */
#define B31_9 "ASME B31.9, Building Services Piping, Table 919.3.1 (moduli of elasticity)"
static const PipeStandard STANDARDS[PIPE_STANDARD_COUNT] = {
    {PIPE_ASME_B36_10M, "ASME B36.10M", "Welded and Seamless Wrought Steel Pipe", "steel",
     "nominal wall", "commercial steel", 29.5e6 * PSI,
     "carbon steel (C ≤ 0.30 %) at 70 °F: 29.5×10⁶ psi (203 GPa), ASME B31.1 Power Piping, "
     "Appendix C, Table C-1"},
    {PIPE_ASTM_D1785, "ASTM D1785", "Poly(Vinyl Chloride) (PVC) Plastic Pipe, Schedules 40, 80, and 120",
     "PVC", "minimum wall", "plastic", 420000.0 * PSI,
     "PVC 1120: 420,000 psi (2.90 GPa), " B31_9 "; GF Harvel PVC pipe physical properties "
     "give the same tensile modulus at 73 °F (ASTM D638)"},
    {PIPE_ASTM_F441, "ASTM F441", "Chlorinated Poly(Vinyl Chloride) (CPVC) Plastic Pipe, Schedules 40 and 80",
     "CPVC", "minimum wall", "plastic", 420000.0 * PSI,
     "CPVC 4120: 420,000 psi (2.90 GPa), " B31_9},
    {PIPE_ASTM_D2241, "ASTM D2241", "Poly(Vinyl Chloride) (PVC) Pressure-Rated Pipe (SDR Series)", "PVC",
     "minimum wall", "plastic", 420000.0 * PSI,
     "PVC 1120: 420,000 psi (2.90 GPa), " B31_9 "; GF Harvel PVC pipe physical properties "
     "give the same tensile modulus at 73 °F (ASTM D638)"},
    {PIPE_ASTM_B88, "ASTM B88", "Seamless Copper Water Tube", "copper", "nominal wall", "copper",
     17.0e6 * PSI, "copper C12200 (99.9 % Cu): 17.0×10⁶ psi (117 GPa), " B31_9},
    {PIPE_ASTM_F876, "ASTM F876", "Crosslinked Polyethylene (PEX) Tubing", "PEX", "minimum wall",
     "plastic", 0.0, NULL},
};

static const PipeRow ROWS[] = {
#define STEEL(nps, od, s10, s40, s80, s160, std, xs)                                   \
    {PIPE_ASME_B36_10M, nps, od, "10", s10}, {PIPE_ASME_B36_10M, nps, od, "40", s40},  \
    {PIPE_ASME_B36_10M, nps, od, "80", s80}, {PIPE_ASME_B36_10M, nps, od, "160", s160}, \
    {PIPE_ASME_B36_10M, nps, od, "STD", std}, {PIPE_ASME_B36_10M, nps, od, "XS", xs},
#include "methods/pipetab.def"
#undef STEEL
#define PVC_SCH(nps, od, s40, s80) \
    {PIPE_ASTM_D1785, nps, od, "40", s40}, {PIPE_ASTM_D1785, nps, od, "80", s80},
#include "methods/pipetab.def"
#undef PVC_SCH
#define CPVC_SCH(nps, od, s40, s80) \
    {PIPE_ASTM_F441, nps, od, "40", s40}, {PIPE_ASTM_F441, nps, od, "80", s80},
#include "methods/pipetab.def"
#undef CPVC_SCH
#define PVC_SDR(nps, od, d21, d26, d325)                                          \
    {PIPE_ASTM_D2241, nps, od, "SDR 21", d21}, {PIPE_ASTM_D2241, nps, od, "SDR 26", d26}, \
    {PIPE_ASTM_D2241, nps, od, "SDR 32.5", d325},
#include "methods/pipetab.def"
#undef PVC_SDR
#define COPPER(nps, od, k, l, m) \
    {PIPE_ASTM_B88, nps, od, "K", k}, {PIPE_ASTM_B88, nps, od, "L", l}, {PIPE_ASTM_B88, nps, od, "M", m},
#include "methods/pipetab.def"
#undef COPPER
#define PEX(nps, od, d9) {PIPE_ASTM_F876, nps, od, "SDR 9", d9},
#include "methods/pipetab.def"
#undef PEX
};

enum { NROWS = sizeof ROWS / sizeof ROWS[0] };

/* Classes of each standard, in the order messages list them. */
static const char *const CLASSES[PIPE_STANDARD_COUNT][7] = {
    [PIPE_ASME_B36_10M] = {"10", "40", "80", "160", "STD", "XS", NULL},
    [PIPE_ASTM_D1785] = {"40", "80", NULL},
    [PIPE_ASTM_F441] = {"40", "80", NULL},
    [PIPE_ASTM_D2241] = {"SDR 21", "SDR 26", "SDR 32.5", NULL},
    [PIPE_ASTM_B88] = {"K", "L", "M", NULL},
    [PIPE_ASTM_F876] = {"SDR 9", NULL},
};

const PipeStandard *pipe_standard(PipeStandardId id)
{
    return (unsigned)id < PIPE_STANDARD_COUNT ? &STANDARDS[id] : NULL;
}

size_t pipe_row_count(void) { return NROWS; }
const PipeRow *pipe_row(size_t i) { return i < NROWS ? &ROWS[i] : NULL; }

/* Upper-case copy of `s` without spaces, '-' or '_'. */
static void squeeze(const char *s, char *buf, size_t n)
{
    size_t j = 0;
    for (; *s && j + 1 < n; s++)
        if (*s != ' ' && *s != '\t' && *s != '-' && *s != '_')
            buf[j++] = (char)toupper((unsigned char)*s);
    if (n)
        buf[j] = '\0';
}

static bool starts_with(const char *s, const char *prefix)
{
    return strncmp(s, prefix, strlen(prefix)) == 0;
}

/* Accepted: the canonical name, and without its "ASME"/"ASTM" prefix; for
 * B36.10M also "B36.10". Case, spaces and '-' are ignored. */
const PipeStandard *pipe_standard_find(const char *name)
{
    char want[64], have[64];
    if (strlen(name) >= sizeof want)
        return NULL;
    squeeze(name, want, sizeof want);
    const char *w = want;
    if (starts_with(w, "ASME") || starts_with(w, "ASTM"))
        w += 4;
    for (int i = 0; i < PIPE_STANDARD_COUNT; i++) {
        squeeze(STANDARDS[i].name + 5, have, sizeof have);
        if (strcmp(w, have) == 0)
            return &STANDARDS[i];
        if (i == PIPE_ASME_B36_10M && strcmp(w, "B36.10") == 0)
            return &STANDARDS[i];
    }
    return NULL;
}

/* Read an unsigned integer; false when no digit. */
static bool read_uint(const char **p, double *v)
{
    const char *s = *p;
    if (!isdigit((unsigned char)*s))
        return false;
    double x = 0;
    while (isdigit((unsigned char)*s) && x < 1e6)
        x = 10 * x + (*s++ - '0');
    if (isdigit((unsigned char)*s))
        return false;
    *v = x;
    *p = s;
    return true;
}

/* size := int | decimal | int '/' int | int ('-' | ' '+) int '/' int,
 * with spaces allowed around the whole. */
bool pipe_size_parse(const char *text, double *nps)
{
    const char *p = text;
    double whole, num, den;
    while (*p == ' ')
        p++;
    if (*p == '.' || (isdigit((unsigned char)*p) && strpbrk(p, ".") && !strchr(p, '/'))) {
        char *end;
        double x = strtod(p, &end);
        if (end == p)
            return false;
        while (*end == ' ')
            end++;
        if (*end || !(x > 0) || x > 1e6)
            return false;
        *nps = x;
        return true;
    }
    if (!read_uint(&p, &whole))
        return false;
    if (*p == '/') {                      /* "3/4" */
        p++;
        num = whole, whole = 0;
    } else {
        const char *q = p;
        if (*q == '-')
            q++;
        else
            while (*q == ' ')
                q++;
        if (q == p || !read_uint(&q, &num) || *q != '/') {   /* "2" */
            while (*p == ' ')
                p++;
            if (*p || !(whole > 0))
                return false;
            *nps = whole;
            return true;
        }
        p = q + 1;
    }
    if (!read_uint(&p, &den) || den == 0 || num >= den || num == 0)
        return false;
    while (*p == ' ')
        p++;
    if (*p)
        return false;
    *nps = whole + num / den;
    return true;
}

bool pipe_class_normalize(const PipeStandard *s, const char *text, char *buf, size_t n)
{
    char sq[32];
    if (!*text || strlen(text) >= sizeof sq || n < 8)
        return false;
    squeeze(text, sq, sizeof sq);
    const char *c = sq;
    if (starts_with(c, "SCHEDULE"))
        c += 8;
    else if (starts_with(c, "SCH."))
        c += 4;
    else if (starts_with(c, "SCH"))
        c += 3;
    else if (starts_with(c, "TYPE"))
        c += 4;
    if (strcmp(c, "STANDARD") == 0)
        c = "STD";
    else if (strcmp(c, "EXTRASTRONG") == 0 || strcmp(c, "XSTRONG") == 0)
        c = "XS";
    bool sdr_std = s && (s->id == PIPE_ASTM_D2241 || s->id == PIPE_ASTM_F876);
    if (starts_with(c, "SDR"))
        snprintf(buf, n, "SDR %s", c + 3);
    else if (starts_with(c, "DR"))
        snprintf(buf, n, "SDR %s", c + 2);
    else if (sdr_std && (isdigit((unsigned char)*c) || *c == '.'))
        snprintf(buf, n, "SDR %s", c);
    else
        snprintf(buf, n, "%s", c);
    return true;
}

static double row_nps(const PipeRow *r)
{
    double x = 0;
    pipe_size_parse(r->nps, &x);
    return x;
}

static bool same_size(double a, double b) { return fabs(a - b) < 1e-6; }

static const char *class_canonical(const PipeStandard *s, const char *cls)
{
    char norm[32];
    if (!pipe_class_normalize(s, cls, norm, sizeof norm))
        return NULL;
    for (int i = 0; CLASSES[s->id][i]; i++)
        if (strcmp(norm, CLASSES[s->id][i]) == 0)
            return CLASSES[s->id][i];
    return NULL;
}

PipeStatus pipe_lookup(const PipeStandard *s, double nps, const char *cls, PipeDims *out)
{
    if (!s)
        return PIPE_UNKNOWN_STANDARD;
    if (!(nps > 0) || !isfinite(nps))
        return PIPE_BAD_SIZE;
    bool size_found = false;
    for (size_t i = 0; i < NROWS; i++)
        if (ROWS[i].standard == s->id && same_size(row_nps(&ROWS[i]), nps))
            size_found = true;
    if (!size_found)
        return PIPE_UNKNOWN_SIZE;
    const char *canon = class_canonical(s, cls);
    if (!canon)
        return PIPE_UNKNOWN_CLASS;
    for (size_t i = 0; i < NROWS; i++) {
        const PipeRow *r = &ROWS[i];
        if (r->standard != s->id || strcmp(r->cls, canon) != 0 || !same_size(row_nps(r), nps))
            continue;
        if (r->wall_in <= 0)
            return PIPE_NOT_IN_CLASS;
        const RoughnessRow *rough = NULL;
        roughness_lookup(s->roughness_of, &rough);
        out->std = s;
        out->row = r;
        out->od = r->od_in * PIPE_INCH;
        out->wall = r->wall_in * PIPE_INCH;
        out->id = (r->od_in - 2.0 * r->wall_in) * PIPE_INCH;
        out->area = PI / 4.0 * out->id * out->id;
        out->sdr_nominal = starts_with(r->cls, "SDR ");
        out->sdr = out->sdr_nominal ? strtod(r->cls + 4, NULL) : r->od_in / r->wall_in;
        out->roughness = rough ? rough->eps : 0.0;
        out->E = s->E;
        return PIPE_OK;
    }
    return PIPE_NOT_IN_CLASS;
}

static void list_add(char *buf, size_t n, size_t *len, const char *item)
{
    if (*len >= n)
        return;
    int w = snprintf(buf + *len, n - *len, "%s%s", *len ? ", " : "", item);
    if (w > 0)
        *len += (size_t)w;
}

void pipe_standards_list(char *buf, size_t n)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (int i = 0; i < PIPE_STANDARD_COUNT; i++) {
        char item[48];
        snprintf(item, sizeof item, "\"%s\"", STANDARDS[i].name);
        list_add(buf, n, &len, item);
    }
}

void pipe_sizes_list(const PipeStandard *s, const char *cls, char *buf, size_t n)
{
    size_t len = 0;
    const char *canon = cls ? class_canonical(s, cls) : NULL;
    const char *last = NULL;
    if (n)
        buf[0] = '\0';
    for (size_t i = 0; i < NROWS; i++) {
        const PipeRow *r = &ROWS[i];
        if (r->standard != s->id || r->wall_in <= 0 || (canon && strcmp(r->cls, canon) != 0))
            continue;
        if (last && strcmp(last, r->nps) == 0)
            continue;
        last = r->nps;
        list_add(buf, n, &len, r->nps);
    }
}

void pipe_classes_list(const PipeStandard *s, char *buf, size_t n)
{
    size_t len = 0;
    if (n)
        buf[0] = '\0';
    for (int i = 0; CLASSES[s->id][i]; i++) {
        char item[24];
        snprintf(item, sizeof item, "\"%s\"", CLASSES[s->id][i]);
        list_add(buf, n, &len, item);
    }
}

double pipe_nps_from_sch40_bore(double bore_m)
{
    double b_in = bore_m / PIPE_INCH;
    double xs[32], ys[32];
    size_t k = 0;
    for (size_t i = 0; i < NROWS && k < 32; i++) {
        const PipeRow *r = &ROWS[i];
        if (r->standard == PIPE_ASME_B36_10M && strcmp(r->cls, "40") == 0) {
            xs[k] = r->od_in - 2.0 * r->wall_in;
            ys[k] = row_nps(r);
            k++;
        }
    }
    if (b_in < xs[0])                  /* below 1/8: proportional, stays positive */
        return ys[0] * b_in / xs[0];
    size_t j = 1;
    while (j + 1 < k && b_in > xs[j])
        j++;
    return ys[j - 1] + (ys[j] - ys[j - 1]) * (b_in - xs[j - 1]) / (xs[j] - xs[j - 1]);
}
