/* units.c — dimension algebra, the unit registry and the unit-expression
 * parser.
 *
 * A dimension is a vector of seven exponents; a unit is a factor to coherent
 * SI (plus an offset for degC and degF) and a dimension. All units live in
 * one table, unittab.def, with the source of its factors on top; everything
 * else here is derived from it: SI prefixes, compound expressions such as
 * `lbf*s/ft^2`, suggestions for misspelt names and the default display units.
 * The key choice is that a unit expression resolves once to a single factor,
 * so a value converts with one multiplication and carries no unit tree.
 *
 * Spelling kept for display (Unit.text): what the user wrote, except that
 * `°` becomes `deg` (`°C` -> `degC`), `·` becomes `*` and the superscripts
 * `²` `³` become `^2` `^3`, so every shown spelling is plain ASCII apart from
 * a micro sign. `gpm` stays `gpm`: the user chose it.
 *
 * Names never accepted: `lb` (pound mass or pound force? write lbm or lbf)
 * and `as` (attosecond would shadow the calc keyword `as`); see `refused`. */
#include "units.h"

#include <math.h>
#include <stdint.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>

#include "arena.h"
#include "strmap.h"
#include "suggest.h"

/* ---- dimensions ------------------------------------------------------- */

/* Exponent vectors in the enum order L M T I Theta N J. */
#define D_NONE   {{0}}
#define D_LEN    {{[DIM_LENGTH] = 1}}
#define D_MASS   {{[DIM_MASS] = 1}}
#define D_TIME   {{[DIM_TIME] = 1}}
#define D_CURR   {{[DIM_CURRENT] = 1}}
#define D_TEMP   {{[DIM_TEMPERATURE] = 1}}
#define D_AMT    {{[DIM_AMOUNT] = 1}}
#define D_LUM    {{[DIM_LUMINOUS] = 1}}
#define D_FREQ   {{[DIM_TIME] = -1}}
#define D_AREA   {{[DIM_LENGTH] = 2}}
#define D_VOL    {{[DIM_LENGTH] = 3}}
#define D_VEL    {{[DIM_LENGTH] = 1, [DIM_TIME] = -1}}
#define D_ACCEL  {{[DIM_LENGTH] = 1, [DIM_TIME] = -2}}
#define D_FLOW   {{[DIM_LENGTH] = 3, [DIM_TIME] = -1}}
#define D_FORCE  {{[DIM_LENGTH] = 1, [DIM_MASS] = 1, [DIM_TIME] = -2}}
#define D_PRES   {{[DIM_LENGTH] = -1, [DIM_MASS] = 1, [DIM_TIME] = -2}}
#define D_DENS   {{[DIM_LENGTH] = -3, [DIM_MASS] = 1}}
#define D_SPWT   {{[DIM_LENGTH] = -2, [DIM_MASS] = 1, [DIM_TIME] = -2}}
#define D_DVISC  {{[DIM_LENGTH] = -1, [DIM_MASS] = 1, [DIM_TIME] = -1}}
#define D_KVISC  {{[DIM_LENGTH] = 2, [DIM_TIME] = -1}}
#define D_ENERGY {{[DIM_LENGTH] = 2, [DIM_MASS] = 1, [DIM_TIME] = -2}}
#define D_POWER  {{[DIM_LENGTH] = 2, [DIM_MASS] = 1, [DIM_TIME] = -3}}
#define D_MFLOW  {{[DIM_MASS] = 1, [DIM_TIME] = -1}}
#define D_SPHEAT {{[DIM_LENGTH] = 2, [DIM_TIME] = -2, [DIM_TEMPERATURE] = -1}}
#define D_TCOND  {{[DIM_LENGTH] = 1, [DIM_MASS] = 1, [DIM_TIME] = -3, [DIM_TEMPERATURE] = -1}}

const Dim DIM_NONE = D_NONE, DIM_L = D_LEN, DIM_M = D_MASS, DIM_T = D_TIME,
          DIM_THETA = D_TEMP, DIM_AREA = D_AREA, DIM_VOLUME = D_VOL, DIM_VELOCITY = D_VEL,
          DIM_ACCEL = D_ACCEL, DIM_FLOW = D_FLOW, DIM_FORCE = D_FORCE, DIM_PRESSURE = D_PRES,
          DIM_DENSITY = D_DENS, DIM_SPECIFIC_WEIGHT = D_SPWT, DIM_DYN_VISC = D_DVISC,
          DIM_KIN_VISC = D_KVISC, DIM_ENERGY = D_ENERGY, DIM_POWER = D_POWER;

static const Dim dim_freq = D_FREQ, dim_mflow = D_MFLOW, dim_spheat = D_SPHEAT,
                 dim_tcond = D_TCOND, dim_current = D_CURR, dim_amount = D_AMT,
                 dim_luminous = D_LUM;

uint64_t dim_key_hash(const Dim *d, int temp, int sys)
{
    uint64_t h = (uint64_t)temp * 31u + (uint64_t)sys; /* FNV-1a over the exponents' bits */
    for (int i = 0; i < DIM_COUNT; i++) {
        uint64_t bits;
        memcpy(&bits, &d->e[i], sizeof bits);
        h = (h ^ bits) * 1099511628211u;
    }
    return h;
}

Dim dim_none(void)
{
    return DIM_NONE;
}

Dim dim_base(int which)
{
    Dim d = DIM_NONE;
    if (which >= 0 && which < DIM_COUNT)
        d.e[which] = 1;
    return d;
}

Dim dim_pow(Dim a, double p)
{
    for (int i = 0; i < DIM_COUNT; i++)
        a.e[i] = dim_exp_round(a.e[i] * p);
    return a;
}

/* Plain words for the dimensions a piping calc meets. Where two quantities
 * share a dimension the one this trade means is named (N/m^3 is specific
 * weight here, not a pressure gradient). */
static const struct {
    const Dim *dim;
    const char *name;
} dim_names[] = {
    {&DIM_NONE, "dimensionless"},
    {&DIM_L, "length"},
    {&DIM_M, "mass"},
    {&DIM_T, "time"},
    {&DIM_THETA, "temperature"},
    {&dim_current, "electric current"},
    {&dim_amount, "amount of substance"},
    {&dim_luminous, "luminous intensity"},
    {&DIM_AREA, "area"},
    {&DIM_VOLUME, "volume"},
    {&DIM_VELOCITY, "velocity"},
    {&DIM_ACCEL, "acceleration"},
    {&DIM_FLOW, "flow rate"},
    {&DIM_FORCE, "force"},
    {&DIM_PRESSURE, "pressure"},
    {&DIM_DENSITY, "density"},
    {&DIM_SPECIFIC_WEIGHT, "specific weight"},
    {&DIM_DYN_VISC, "dynamic viscosity"},
    {&DIM_KIN_VISC, "kinematic viscosity"},
    {&DIM_ENERGY, "energy"},
    {&DIM_POWER, "power"},
    {&dim_freq, "frequency"},
    {&dim_mflow, "mass flow rate"},
    {&dim_spheat, "specific heat capacity"},
    {&dim_tcond, "thermal conductivity"},
};

const char *dim_name(Dim d)
{
    for (size_t i = 0; i < sizeof dim_names / sizeof dim_names[0]; i++)
        if (dim_eq(d, *dim_names[i].dim))
            return dim_names[i].name;
    return NULL;
}

/* A bounded string builder: appends while there is room, always leaves the
 * buffer NUL-terminated, and remembers whether anything was cut. */
typedef struct Buf {
    char *p;
    size_t cap, len;
    bool cut;
} Buf;

static void buf_putn(Buf *b, const char *s, size_t n)
{
    for (size_t i = 0; i < n; i++) {
        if (b->len + 1 < b->cap)
            b->p[b->len++] = s[i];
        else
            b->cut = true;
    }
    if (b->cap > 0)
        b->p[b->len] = '\0';
}

static void buf_puts(Buf *b, const char *s)
{
    buf_putn(b, s, strlen(s));
}

/* Write |x| (on the 1e-9 grid) without printf, so no locale can turn the
 * point into a comma: "2", "0.5", "1.333333333". */
static void buf_put_abs_number(Buf *b, double x)
{
    double ax = fabs(x);
    if (!(ax < 1e9)) {
        /* Beyond the 1e-9 grid: the whole number when it is one, else the
         * double's shortest exact spelling; never a rounded stand-in. */
        char big[40];
        if (ax < 1e18 && ax == floor(ax)) {
            unsigned long long w = (unsigned long long)ax;
            size_t k = sizeof big - 1;
            big[k] = '\0';
            do {
                big[--k] = (char)('0' + (int)(w % 10));
                w /= 10;
            } while (w > 0);
            buf_puts(b, big + k);
        } else {
            snprintf(big, sizeof big, "%.17g", ax);
            for (char *c = big; *c; c++)
                if (*c == ',')
                    *c = '.'; /* whatever the locale */
            buf_puts(b, big);
        }
        return;
    }
    unsigned long long n = (unsigned long long)llround(ax * 1e9);
    unsigned long long whole = n / 1000000000ULL, frac = n % 1000000000ULL;
    char tmp[32];
    size_t k = 0;
    do {
        tmp[k++] = (char)('0' + (int)(whole % 10));
        whole /= 10;
    } while (whole > 0);
    while (k > 0)
        buf_putn(b, &tmp[--k], 1);
    if (frac > 0) {
        char digits[9];
        for (int i = 8; i >= 0; i--) {
            digits[i] = (char)('0' + (int)(frac % 10));
            frac /= 10;
        }
        size_t nd = 9;
        while (nd > 0 && digits[nd - 1] == '0')
            nd--;
        buf_putn(b, ".", 1);
        buf_putn(b, digits, nd);
    }
}

/* `sym` raised to |e|, as "sym" or "sym^e". */
static void buf_put_power(Buf *b, const char *sym, double e)
{
    buf_puts(b, sym);
    if (fabs(fabs(e) - 1) > 5e-10) {
        buf_puts(b, "^");
        buf_put_abs_number(b, e);
    }
}

/* Coherent SI names for whole dimensions, tried before base units. */
static const struct {
    const Dim *dim;
    const char *sym;
} si_named[] = {
    {&DIM_FORCE, "N"},     {&DIM_PRESSURE, "Pa"},  {&DIM_ENERGY, "J"},
    {&DIM_POWER, "W"},     {&DIM_DYN_VISC, "Pa*s"}, {&DIM_SPECIFIC_WEIGHT, "N/m^3"},
};

/* Base symbols in the order the header promises: kg m s A K mol cd. */
static const struct {
    int which;
    const char *sym;
} si_base_order[] = {
    {DIM_MASS, "kg"},        {DIM_LENGTH, "m"}, {DIM_TIME, "s"},     {DIM_CURRENT, "A"},
    {DIM_TEMPERATURE, "K"},  {DIM_AMOUNT, "mol"}, {DIM_LUMINOUS, "cd"},
};

/* Numerator factors joined by `*`; one denominator factor after `/`, two or
 * more in parentheses: "kg/m^3", "m^2/(s^2*K)", "1/s". */
void dim_format_si(Dim d, char *buf, size_t n)
{
    Buf b = {buf, n, 0, false};
    if (n > 0)
        buf[0] = '\0';
    for (size_t i = 0; i < sizeof si_named / sizeof si_named[0]; i++) {
        if (dim_eq(d, *si_named[i].dim)) {
            buf_puts(&b, si_named[i].sym);
            return;
        }
    }
    int nnum = 0, nden = 0;
    for (size_t i = 0; i < DIM_COUNT; i++) {
        double e = d.e[si_base_order[i].which];
        if (e > 5e-10) {
            if (nnum++ > 0)
                buf_puts(&b, "*");
            buf_put_power(&b, si_base_order[i].sym, e);
        } else if (e < -5e-10) {
            nden++;
        }
    }
    if (nnum == 0)
        buf_puts(&b, "1");
    if (nden == 0)
        return;
    buf_puts(&b, nden > 1 ? "/(" : "/");
    int k = 0;
    for (size_t i = 0; i < DIM_COUNT; i++) {
        double e = d.e[si_base_order[i].which];
        if (e < -5e-10) {
            if (k++ > 0)
                buf_puts(&b, "*");
            buf_put_power(&b, si_base_order[i].sym, e);
        }
    }
    if (nden > 1)
        buf_puts(&b, ")");
}

/* ---- quantities ------------------------------------------------------- */

/* ---- the registry ------------------------------------------------------ */

enum {
    U_PFX = 1, /* takes SI prefixes */
    U_ABS = 2, /* absolute temperature from absolute zero (K, degR) */
    U_OFS = 4, /* absolute temperature with an offset (degC, degF) */
    U_GAUGE = 8, /* a pressure stated above the atmosphere (psig, ...) */
    U_ABSP = 16  /* a pressure stated above vacuum (psia, ...) */
};

typedef struct UnitDef {
    const char *name;
    double factor;
    Dim dim;
    double offset;
    unsigned flags;
} UnitDef;

static const UnitDef registry[] = {
#define UNIT(name, factor, dim, offset, flags) {name, factor, D_##dim, offset, flags},
#include "unittab.def"
#undef UNIT
};
enum { REGISTRY_LEN = sizeof registry / sizeof registry[0] };

/* SI prefixes (SP 811 Table 5), longest spelling first so "da" is tried
 * before "d". Both the micro sign U+00B5 and Greek mu U+03BC are accepted,
 * and `u` for those who cannot type either. yocto and zepto are left out:
 * `y` and `z` prefixes are never meant in a piping calc, and `yd` must stay
 * the yard. */
static const struct {
    const char *sym;
    double factor;
} prefixes[] = {
    {"da", 1e1},           {"\xc2\xb5", 1e-6}, {"\xce\xbc", 1e-6}, {"Y", 1e24},
    {"Z", 1e21},           {"E", 1e18},        {"P", 1e15},        {"T", 1e12},
    {"G", 1e9},            {"M", 1e6},         {"k", 1e3},         {"h", 1e2},
    {"d", 1e-1},           {"c", 1e-2},        {"m", 1e-3},        {"u", 1e-6},
    {"n", 1e-9},           {"p", 1e-12},       {"f", 1e-15},       {"a", 1e-18},
};

/* Names that are never units, with the hint to give instead (NULL: none).
 * `lb` is refused because in this trade it may be mass or force; `as`
 * because the attosecond would shadow the calc keyword `as`; the others are
 * common spellings that edit distance alone would send elsewhere. */
static const struct {
    const char *name;
    const char *suggest;
} refused[] = {
    {"lb", "lbm"},   {"lbs", "lbm"}, {"as", NULL},     {"hr", "h"},
    {"hrs", "h"},    {"sec", "s"},   {"secs", "s"},    {"mins", "min"},
    {"gallon", "gal"}, {"gallons", "gal"}, {"F", "degF"}, {"C", "degC"},
    {"lps", "L/s"},  {"gph", "gal/h"}, {"cfm", "ft^3/min"},
};

/* The registry's names in a hash map, built once (on any thread) at the
 * first lookup; a name listed twice keeps its first row. */
static StrMap registry_index;
static pthread_once_t registry_index_once = PTHREAD_ONCE_INIT;

static void registry_index_build(void)
{
    for (size_t i = 0; i < REGISTRY_LEN; i++)
        strmap_add(&registry_index, registry[i].name, i, NULL);
}

static const UnitDef *find_exact(const char *key, size_t n)
{
    pthread_once(&registry_index_once, registry_index_build);
    size_t i;
    return strmap_get_n(&registry_index, key, n, &i) ? &registry[i] : NULL;
}

static bool is_refused(const char *key, size_t n)
{
    for (size_t i = 0; i < sizeof refused / sizeof refused[0]; i++)
        if (strlen(refused[i].name) == n && memcmp(refused[i].name, key, n) == 0)
            return true;
    return false;
}

/* Resolve one name: an exact row wins over a prefix reading, so "min" is the
 * minute, "mm" the millimetre, "cd" the candela and "Pa" the pascal. A
 * prefix attaches only to a U_PFX row and never stacks ("mkm" is unknown). */
static const UnitDef *resolve_name(const char *key, size_t n, double *scale)
{
    *scale = 1;
    if (is_refused(key, n))
        return NULL;
    const UnitDef *def = find_exact(key, n);
    if (def)
        return def;
    for (size_t i = 0; i < sizeof prefixes / sizeof prefixes[0]; i++) {
        size_t pl = strlen(prefixes[i].sym);
        if (pl >= n || memcmp(key, prefixes[i].sym, pl) != 0)
            continue;
        def = find_exact(key + pl, n - pl);
        if (def && (def->flags & U_PFX)) {
            *scale = prefixes[i].factor;
            return def;
        }
    }
    return NULL;
}

/* ---- lexing unit expressions ------------------------------------------ */

/* The multi-byte characters the unit language knows, all UTF-8. */
#define UTF8_DEGREE "\xc2\xb0" /* ° */
#define UTF8_MIDDOT "\xc2\xb7" /* · */
#define UTF8_SUP2   "\xc2\xb2" /* ² */
#define UTF8_SUP3   "\xc2\xb3" /* ³ */
#define UTF8_MICRO  "\xc2\xb5" /* µ */
#define UTF8_MU     "\xce\xbc" /* μ */

static bool at(const char *s, size_t len, size_t i, const char *lit)
{
    size_t n = strlen(lit);
    return i + n <= len && memcmp(s + i, lit, n) == 0;
}

static bool is_alpha(char c)
{
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_';
}

static bool is_digit(char c)
{
    return c >= '0' && c <= '9';
}

/* Bytes of the name character at s[i], or 0: letters, `_`, digits after the
 * first, and the degree, micro and mu signs. */
static size_t name_char(const char *s, size_t len, size_t i, bool first)
{
    if (is_alpha(s[i]) || (!first && is_digit(s[i])))
        return 1;
    if (at(s, len, i, UTF8_DEGREE) || at(s, len, i, UTF8_MICRO) || at(s, len, i, UTF8_MU))
        return 2;
    return 0;
}

/* The lookup key of a name: `°` spelled `deg`, everything else as is. */
static size_t name_key(const char *s, size_t n, char *key, size_t cap)
{
    size_t k = 0;
    for (size_t i = 0; i < n;) {
        const char *piece = s + i;
        size_t pn = 1;
        if (at(s, n, i, UTF8_DEGREE)) {
            piece = "deg";
            pn = 3;
            i += 2;
        } else {
            i += 1;
        }
        if (k + pn >= cap)
            return 0;
        memcpy(key + k, piece, pn);
        k += pn;
    }
    key[k] = '\0';
    return k;
}

/* ---- parsing unit expressions ----------------------------------------- */

typedef struct Parser {
    const char *s;
    size_t len, pos;
    UnitStatus status;
    size_t bad_off, bad_len;
    int names, ops, powers, ones; /* what the expression holds, for "lone" */
    const UnitDef *last;          /* the last name resolved */
    double last_scale;
} Parser;

typedef struct Term {
    double factor;
    Dim dim;
} Term;

static void fail(Parser *p, UnitStatus st, size_t off, size_t n)
{
    if (p->status != UNIT_OK)
        return;
    p->status = st;
    p->bad_off = off;
    p->bad_len = n;
}

/* Length of the token at p->pos, for error locations. */
static size_t token_len(const Parser *p)
{
    if (p->pos >= p->len)
        return 0;
    size_t n = name_char(p->s, p->len, p->pos, true);
    if (n == 0) {
        unsigned char c = (unsigned char)p->s[p->pos];
        n = c < 0x80 ? 1 : (c >= 0xf0 ? 4 : c >= 0xe0 ? 3 : 2);
        if (p->pos + n > p->len)
            n = p->len - p->pos;
    }
    return n;
}

static Term parse_expr(Parser *p, int depth);

/* number := digits ['.' digits]   (no sign, no exponent) */
static bool parse_number(Parser *p, double *out)
{
    size_t start = p->pos;
    double v = 0;
    while (p->pos < p->len && is_digit(p->s[p->pos]))
        v = v * 10 + (p->s[p->pos++] - '0');
    if (p->pos == start)
        return false;
    if (p->pos < p->len && p->s[p->pos] == '.') {
        p->pos++;
        double scale = 0.1;
        size_t fstart = p->pos;
        while (p->pos < p->len && is_digit(p->s[p->pos])) {
            v += (p->s[p->pos++] - '0') * scale;
            scale /= 10;
        }
        if (p->pos == fstart)
            return false;
    }
    *out = v;
    return true;
}

/* exponent := ['+'|'-'] number | '(' ['+'|'-'] number ['/' number] ')' */
static bool parse_exponent(Parser *p, double *out)
{
    bool paren = p->pos < p->len && p->s[p->pos] == '(';
    if (paren)
        p->pos++;
    double sign = 1;
    if (p->pos < p->len && (p->s[p->pos] == '-' || p->s[p->pos] == '+'))
        sign = p->s[p->pos++] == '-' ? -1 : 1;
    double v;
    if (!parse_number(p, &v))
        return false;
    if (paren && p->pos < p->len && p->s[p->pos] == '/') {
        p->pos++;
        double den;
        if (!parse_number(p, &den) || den == 0)
            return false;
        v /= den;
    }
    if (paren) {
        if (p->pos >= p->len || p->s[p->pos] != ')')
            return false;
        p->pos++;
    }
    *out = sign * v;
    return true;
}

/* primary := NAME | '100' NAME | '%' | '1' | '(' expr ')' */
static Term parse_primary(Parser *p, int depth)
{
    Term t = {1, DIM_NONE};
    size_t start = p->pos;
    if (p->pos >= p->len) {
        fail(p, UNIT_SYNTAX, p->pos, 0);
        return t;
    }
    char c = p->s[p->pos];
    if (c == '(') {
        if (depth > 16) {
            fail(p, UNIT_SYNTAX, p->pos, 1);
            return t;
        }
        p->pos++;
        t = parse_expr(p, depth + 1);
        if (p->status != UNIT_OK)
            return t;
        if (p->pos >= p->len || p->s[p->pos] != ')') {
            fail(p, UNIT_SYNTAX, start, 1); /* the '(' left open */
            return t;
        }
        p->pos++;
        return t;
    }
    if (c == '%') { /* percent, the one unit that is not a name */
        p->pos++;
        p->names++;
        p->last = find_exact("%", 1);
        p->last_scale = 1;
        t.factor = p->last->factor;
        return t;
    }
    /* "100ft" is one factor, a hundred feet, for gradients per hundred
     * lengths (psi/100ft, m/100m); no other number is glued to a name. */
    double times = 1;
    if (p->len - p->pos > 3 && memcmp(p->s + p->pos, "100", 3) == 0 &&
        name_char(p->s, p->len, p->pos + 3, true) > 0) {
        p->pos += 3;
        start = p->pos;
        times = 100;
        p->ones++; /* not a lone name: never a point */
    } else if (c == '1' && !(p->pos + 1 < p->len && (is_digit(p->s[p->pos + 1]) || p->s[p->pos + 1] == '.'))) {
        p->pos++;
        p->ones++;
        return t; /* "1/s" */
    }
    size_t n;
    for (n = 0; p->pos < p->len && (n = name_char(p->s, p->len, p->pos, p->pos == start)) > 0;)
        p->pos += n;
    if (p->pos == start) {
        fail(p, UNIT_SYNTAX, start, token_len(p));
        return t;
    }
    char key[96];
    size_t klen = name_key(p->s + start, p->pos - start, key, sizeof key);
    double scale;
    const UnitDef *def = klen ? resolve_name(key, klen, &scale) : NULL;
    if (!def) {
        fail(p, UNIT_UNKNOWN, start, p->pos - start);
        return t;
    }
    p->names++;
    p->last = def;
    p->last_scale = scale;
    t.factor = def->factor * scale * times;
    t.dim = def->dim;
    return t;
}

/* factor := primary ['^' exponent | '²' | '³'] */
static Term parse_factor(Parser *p, int depth)
{
    Term t = parse_primary(p, depth);
    if (p->status != UNIT_OK)
        return t;
    double e;
    size_t op = p->pos;
    if (p->pos < p->len && p->s[p->pos] == '^') {
        p->pos++;
        if (!parse_exponent(p, &e)) {
            fail(p, UNIT_SYNTAX, op, p->pos - op + token_len(p));
            return t;
        }
    } else if (at(p->s, p->len, p->pos, UTF8_SUP2)) {
        p->pos += 2;
        e = 2;
    } else if (at(p->s, p->len, p->pos, UTF8_SUP3)) {
        p->pos += 2;
        e = 3;
    } else {
        return t;
    }
    p->powers++;
    t.factor = pow(t.factor, e);
    t.dim = dim_pow(t.dim, e);
    if (!isfinite(t.factor) || t.factor == 0)
        fail(p, UNIT_SYNTAX, op, p->pos - op); /* exponent out of range */
    return t;
}

/* expr := factor (('*' | '·' | '/') factor)*, left-associative, so a/b*c is
 * (a/b)*c and a/b/c is a/(b*c). */
static Term parse_expr(Parser *p, int depth)
{
    Term t = parse_factor(p, depth);
    while (p->status == UNIT_OK && p->pos < p->len) {
        bool div;
        if (p->s[p->pos] == '*' || p->s[p->pos] == '/') {
            div = p->s[p->pos] == '/';
            p->pos++;
        } else if (at(p->s, p->len, p->pos, UTF8_MIDDOT)) {
            div = false;
            p->pos += 2;
        } else {
            break;
        }
        p->ops++;
        Term r = parse_factor(p, depth);
        t.factor = div ? t.factor / r.factor : t.factor * r.factor;
        t.dim = div ? dim_div(t.dim, r.dim) : dim_mul(t.dim, r.dim);
    }
    return t;
}

/* The display spelling: the input with `°` -> `deg`, `·` -> `*`, `²` -> `^2`
 * and `³` -> `^3`. False if it does not fit in Unit.text. */
static bool normalise_text(const char *s, size_t len, char *out, size_t cap)
{
    Buf b = {out, cap, 0, false};
    for (size_t i = 0; i < len;) {
        if (at(s, len, i, UTF8_DEGREE)) {
            buf_puts(&b, "deg");
            i += 2;
        } else if (at(s, len, i, UTF8_MIDDOT)) {
            buf_puts(&b, "*");
            i += 2;
        } else if (at(s, len, i, UTF8_SUP2)) {
            buf_puts(&b, "^2");
            i += 2;
        } else if (at(s, len, i, UTF8_SUP3)) {
            buf_puts(&b, "^3");
            i += 2;
        } else {
            buf_putn(&b, s + i, 1);
            i += 1;
        }
    }
    return !b.cut;
}

UnitStatus unit_parse(const char *s, size_t len, Unit *out, size_t *bad_off, size_t *bad_len)
{
    Parser p = {.s = s, .len = len, .status = UNIT_OK, .last_scale = 1};
    Unit u = {1, 0, DIM_NONE, TEMP_NONE, PRES_PLAIN, ""};
    if (len >= sizeof u.text) {
        fail(&p, UNIT_TOO_LONG, 0, len);
    } else {
        Term t = parse_expr(&p, 0);
        if (p.status == UNIT_OK && p.pos < len) /* a stray ')' or character */
            fail(&p, UNIT_SYNTAX, p.pos, token_len(&p));
        if (p.status == UNIT_OK && !normalise_text(s, len, u.text, sizeof u.text))
            fail(&p, UNIT_TOO_LONG, 0, len);
        u.factor = t.factor;
        u.dim = t.dim;
    }
    if (p.status != UNIT_OK) {
        if (bad_off)
            *bad_off = p.bad_off;
        if (bad_len)
            *bad_len = p.bad_len;
        return p.status;
    }
    /* A lone temperature-scale name is a point on that scale; anywhere else
     * (J/(kg*degC), degF^2, 1/K) it stands for a difference. */
    if (p.names == 1 && p.ops == 0 && p.powers == 0 && p.ones == 0) {
        if (p.last->flags & U_OFS) {
            u.offset = p.last->offset;
            u.temp = TEMP_ABSOLUTE_OFFSET;
        } else if (p.last->flags & U_ABS) {
            u.temp = TEMP_ABSOLUTE;
        } else if (p.last->flags & U_GAUGE) {
            u.pref = PRES_GAUGE;
        } else if (p.last->flags & U_ABSP) {
            u.pref = PRES_ABSOLUTE;
        }
    }
    *out = u;
    return UNIT_OK;
}

/* Units spelled in a calc are few and repeat on every line (`ft`, `psi`,
 * `gal/min`), so a parsed spelling is kept for the life of the process and
 * shared: a literal points at it instead of holding its own copy. The memo
 * grows with the distinct spellings of the input, never with its length.
 * A lock makes it safe for the two revisions `diff` evaluates at once. */
static pthread_mutex_t memo_lock = PTHREAD_MUTEX_INITIALIZER;
static StrMap memo_index;      /* spelling -> index into memo_units */
static Unit **memo_units;
static size_t memo_len, memo_cap;

/* Each thread keeps a small cache in front of the shared memo and the
 * interned units: the spellings of a calc are few, so nearly every lookup is
 * answered here without the lock, which the two threads of a `diff` would
 * otherwise take in turn on every literal (the lock's hand-overs cost that
 * diff more CPU than its second evaluation). A cached entry is one of the
 * memo's, never changed or freed once made. */
enum { UNIT_CACHE = 64 };
static _Thread_local struct {
    const char *key;
    size_t len;
    const Unit *u;
} shared_cache[UNIT_CACHE];
static _Thread_local const Unit *intern_cache[UNIT_CACHE];

static size_t cache_slot(const char *s, size_t len)
{
    uint32_t h = 2166136261u;
    for (size_t i = 0; i < len; i++)
        h = (h ^ (unsigned char)s[i]) * 16777619u;
    return h & (UNIT_CACHE - 1);
}

const Unit *unit_shared(const char *s, size_t len)
{
    size_t slot = cache_slot(s, len);
    if (shared_cache[slot].u && shared_cache[slot].len == len && memcmp(shared_cache[slot].key, s, len) == 0)
        return shared_cache[slot].u;
    const Unit *found = NULL;
    const char *found_key = NULL;
    pthread_mutex_lock(&memo_lock);
    size_t k;
    if (strmap_get_n(&memo_index, s, len, &k)) {
        found = memo_units[k];
        found_key = (const char *)(memo_units[k] + 1);
    } else {
        Unit u;
        if (unit_parse(s, len, &u, NULL, NULL) == UNIT_OK) {
            if (memo_len == memo_cap) {
                memo_cap = memo_cap ? memo_cap * 2 : 64;
                memo_units = xrealloc(memo_units, memo_cap * sizeof *memo_units);
            }
            /* the entry holds its key: one allocation, never freed */
            Unit *e = xmalloc(sizeof *e + len + 1);
            *e = u;
            char *key = (char *)(e + 1);
            memcpy(key, s, len);
            key[len] = '\0';
            memo_units[memo_len] = e;
            strmap_add(&memo_index, key, memo_len, NULL);
            memo_len++;
            found = e;
            found_key = key;
        }
    }
    pthread_mutex_unlock(&memo_lock);
    if (found) {
        shared_cache[slot].key = found_key;
        shared_cache[slot].len = len;
        shared_cache[slot].u = found;
    }
    return found;
}

/* The units results are shown in are fewer still (one per dimension and
 * spelling), so a result points at one shared copy instead of holding its
 * own 128 bytes. Interned by the whole unit, not only its spelling: the
 * same text could in principle stand for two units. */
static StrMap intern_index;    /* text -> first index into intern_units */
static struct Interned {
    Unit u;
    size_t next;               /* next entry with the same text, or SIZE_MAX */
} **intern_units;
static size_t intern_len, intern_cap;

static bool unit_same(const Unit *a, const Unit *b)
{
    if (a->factor != b->factor || a->offset != b->offset || a->temp != b->temp || a->pref != b->pref)
        return false;
    for (int i = 0; i < DIM_COUNT; i++)
        if (a->dim.e[i] != b->dim.e[i])
            return false;
    return strcmp(a->text, b->text) == 0;
}

const Unit unit_blank = {0};

const Unit *unit_intern(const Unit *u)
{
    if (unit_same(u, &unit_blank))
        return &unit_blank;
    size_t slot = cache_slot(u->text, strnlen(u->text, sizeof u->text));
    if (intern_cache[slot] && unit_same(intern_cache[slot], u))
        return intern_cache[slot];
    const Unit *found = NULL;
    pthread_mutex_lock(&memo_lock);
    size_t k, last = SIZE_MAX;
    if (strmap_get(&intern_index, u->text, &k))
        for (; k != SIZE_MAX; last = k, k = intern_units[k]->next)
            if (unit_same(&intern_units[k]->u, u)) {
                found = &intern_units[k]->u;
                break;
            }
    if (!found) {
        if (intern_len == intern_cap) {
            intern_cap = intern_cap ? intern_cap * 2 : 64;
            intern_units = xrealloc(intern_units, intern_cap * sizeof *intern_units);
        }
        struct Interned *e = xmalloc(sizeof *e);
        e->u = *u;
        memset(e->u.text, 0, sizeof e->u.text);
        memcpy(e->u.text, u->text, strnlen(u->text, sizeof u->text - 1));
        e->next = SIZE_MAX;
        intern_units[intern_len] = e;
        if (last != SIZE_MAX)
            intern_units[last]->next = intern_len;
        else
            strmap_add(&intern_index, e->u.text, intern_len, NULL);
        intern_len++;
        found = &e->u;
    }
    pthread_mutex_unlock(&memo_lock);
    intern_cache[slot] = found;
    return found;
}

/* ---- converting -------------------------------------------------------- */

double unit_from_si(double si, const Unit *u, bool is_difference)
{
    return is_difference ? si / u->factor : (si - u->offset) / u->factor;
}

/* ---- default display units -------------------------------------------- */

/* What a practising engineer expects to read in each system (DESIGN 2.2).
 * Temperatures are handled apart, by kind. */
static const struct {
    const Dim *dim;
    const char *us, *si;
} defaults[] = {
    {&DIM_L, "ft", "m"},
    {&DIM_AREA, "ft^2", "m^2"},
    {&DIM_VOLUME, "gal", "m^3"},
    {&DIM_T, "s", "s"},
    {&DIM_M, "lbm", "kg"},
    {&DIM_VELOCITY, "ft/s", "m/s"},
    {&DIM_ACCEL, "ft/s^2", "m/s^2"},
    {&DIM_FLOW, "gal/min", "L/s"},
    {&DIM_PRESSURE, "psi", "kPa"},
    {&DIM_FORCE, "lbf", "N"},
    {&DIM_DENSITY, "lbm/ft^3", "kg/m^3"},
    {&DIM_SPECIFIC_WEIGHT, "lbf/ft^3", "N/m^3"},
    {&DIM_DYN_VISC, "cP", "Pa*s"},
    {&DIM_KIN_VISC, "ft^2/s", "m^2/s"},
    {&DIM_ENERGY, "Btu", "J"},
    {&DIM_POWER, "hp", "kW"},
    {&dim_mflow, "lbm/s", "kg/s"},
    {&dim_spheat, "Btu/(lbm*degF)", "J/(kg*K)"},
};

static Unit unit_of(const char *text, Dim d)
{
    const Unit *parsed = unit_shared(text, strlen(text)); /* parsed once, not per value shown */
    if (parsed && dim_eq(parsed->dim, d))
        return *parsed;
    Unit u;
    /* Unreachable with the tables above (the tests parse every entry), but
     * never return garbage: fall back to coherent SI. */
    u = (Unit){1, 0, d, TEMP_NONE, PRES_PLAIN, ""};
    dim_format_si(d, u.text, sizeof u.text);
    return u;
}

static Unit default_for(Dim d, TempKind temp, UnitSystem sys)
{
    bool us = sys == UNITS_US;
    if (dim_eq(d, DIM_THETA)) {
        if (temp != TEMP_NONE)
            return unit_of(us ? "degF" : "degC", d);
        return unit_of(us ? "delta_degF" : "delta_degC", d);
    }
    for (size_t i = 0; i < sizeof defaults / sizeof defaults[0]; i++)
        if (dim_eq(d, *defaults[i].dim))
            return unit_of(us ? defaults[i].us : defaults[i].si, d);
    Unit u = {1, 0, d, TEMP_NONE, PRES_PLAIN, ""};
    /* A pure number is shown bare: "Re = 45000", not "45000 1". */
    if (!dim_is_none(d))
        dim_format_si(d, u.text, sizeof u.text);
    return u;
}

/* Every value shown asks for its dimension's unit, and a calc has a few
 * dimensions: each thread keeps its last answers, keyed by the dimension's
 * exact bits (a near-equal dimension is simply asked again), so the answer
 * is the one default_for gives. */
enum { DEFAULT_CACHE = 32 };
static _Thread_local struct {
    bool used;
    Dim d;
    TempKind temp;
    UnitSystem sys;
    Unit u;
} default_cache[DEFAULT_CACHE];

Unit unit_default(Dim d, TempKind temp, UnitSystem sys)
{
    size_t k = (size_t)(dim_key_hash(&d, (int)temp, (int)sys) >> 40) % DEFAULT_CACHE;
    if (default_cache[k].used && default_cache[k].temp == temp && default_cache[k].sys == sys &&
        memcmp(&default_cache[k].d, &d, sizeof d) == 0)
        return default_cache[k].u;
    Unit u = default_for(d, temp, sys);
    default_cache[k].used = true;
    default_cache[k].d = d;
    default_cache[k].temp = temp;
    default_cache[k].sys = sys;
    default_cache[k].u = u;
    return u;
}

Unit unit_default_ref(Dim d, TempKind temp, PressureRef ref, UnitSystem sys)
{
    if (ref == PRES_GAUGE && dim_eq(d, DIM_PRESSURE))
        return unit_of(sys == UNITS_US ? "psig" : "kPag", d);
    if (ref == PRES_ABSOLUTE && dim_eq(d, DIM_PRESSURE))
        return unit_of(sys == UNITS_US ? "psia" : "kPaa", d);
    return unit_default(d, temp, sys);
}

Quantity qty_to_ref(Quantity q, PressureRef to, double atm)
{
    if (!dim_eq(q.dim, DIM_PRESSURE) || q.pref == to)
        return q;
    if (to == PRES_ABSOLUTE)
        q.si += atm;
    else if (q.pref == PRES_ABSOLUTE)
        q.si -= atm;
    q.pref = to;
    return q;
}

const char *pressure_ref_name(PressureRef r)
{
    switch (r) {
    case PRES_GAUGE: return "gauge";
    case PRES_ABSOLUTE: return "absolute";
    case PRES_PLAIN: break;
    }
    return NULL;
}

void unit_each(UnitVisit fn, void *ctx)
{
    for (size_t i = 0; i < REGISTRY_LEN; i++) {
        Unit u;
        if (unit_parse(registry[i].name, strlen(registry[i].name), &u, NULL, NULL) == UNIT_OK)
            fn(registry[i].name, &u, ctx);
    }
}

/* ---- suggestions -------------------------------------------------------- */

static char lower(char c)
{
    return (c >= 'A' && c <= 'Z') ? (char)(c - 'A' + 'a') : c;
}

/* Suggestions built from pieces live here; a table name is returned as is. */
static _Thread_local char suggest_buf[sizeof(((Unit *)0)->text)];

/* The reference a name seems to state: a plain pressure unit, in any case,
 * with `a` or `g` after it ("MPag", "PSIA", "kpaa"). PRES_PLAIN for any
 * other name. */
static PressureRef typed_reference(const char *key, size_t n, double *factor)
{
    if (n < 3 || n >= 32)
        return PRES_PLAIN;
    char last = lower(key[n - 1]);
    if (last != 'a' && last != 'g')
        return PRES_PLAIN;
    PressureRef ref = last == 'a' ? PRES_ABSOLUTE : PRES_GAUGE;
    double scale;
    const UnitDef *def = resolve_name(key, n - 1, &scale);
    if (def && dim_eq(def->dim, DIM_PRESSURE) && !(def->flags & (U_GAUGE | U_ABSP))) {
        *factor = def->factor * scale;
        return ref;
    }
    for (size_t i = 0; i < REGISTRY_LEN; i++)
        if (dim_eq(registry[i].dim, DIM_PRESSURE) && !(registry[i].flags & (U_GAUGE | U_ABSP)) &&
            strlen(registry[i].name) == n - 1 && suggest_distance(key, n - 1, registry[i].name, n - 1, true) == 0) {
            *factor = registry[i].factor;
            return ref;
        }
    return PRES_PLAIN;
}

static const char *suggest_any(const char *name, size_t len);

/* The nearest spelling for one name (no operators), or NULL. A suggestion
 * never changes the meaning: a name that reads as a gauge or absolute
 * pressure ("kpag") is offered only the same unit stating the same
 * reference, or nothing ("MPag" gets no kPag): never the plain unit, as
 * "psia" once drew "psi", another quantity. */
static const char *suggest_name(const char *name, size_t len)
{
    const char *sug = suggest_any(name, len);
    if (!sug)
        return NULL;
    char key[96];
    size_t n = name_key(name, len, key, sizeof key);
    Unit u;
    double factor = 0;
    PressureRef want = n ? typed_reference(key, n, &factor) : PRES_PLAIN;
    if (want != PRES_PLAIN &&
        (unit_parse(sug, strlen(sug), &u, NULL, NULL) != UNIT_OK || u.pref != want ||
         fabs(u.factor - factor) > 1e-12 * factor))
        return NULL;
    return sug;
}

static const char *suggest_any(const char *name, size_t len)
{
    char key[96];
    size_t n = name_key(name, len, key, sizeof key);
    if (n == 0)
        return NULL;
    for (size_t i = 0; i < sizeof refused / sizeof refused[0]; i++)
        if (strlen(refused[i].name) == n && memcmp(refused[i].name, key, n) == 0)
            return refused[i].suggest;
    double scale;
    const UnitDef *def = resolve_name(key, n, &scale);
    if (def && scale == 1)
        return def->name;
    if (def && n < sizeof suggest_buf) {
        memcpy(suggest_buf, key, n + 1);
        return suggest_buf;
    }
    /* "m3" or "ft2": an exponent written without its caret. */
    size_t nd = 0;
    while (nd < n && is_digit(key[n - 1 - nd]))
        nd++;
    if (nd > 0 && nd < n && resolve_name(key, n - nd, &scale) && n + 2 < sizeof suggest_buf) {
        memcpy(suggest_buf, key, n - nd);
        suggest_buf[n - nd] = '^';
        memcpy(suggest_buf + n - nd + 1, key + n - nd, nd);
        suggest_buf[n + 1] = '\0';
        return suggest_buf;
    }
    /* The same letters in another case: a row first, then a prefixed form. */
    for (size_t i = 0; i < REGISTRY_LEN; i++)
        if (strlen(registry[i].name) == n && suggest_distance(key, n, registry[i].name, n, true) == 0)
            return registry[i].name;
    /* (Only onto names of two letters or more: "mn" is a slip for "min",
     * not the millinewton.) */
    for (size_t j = 0; j < sizeof prefixes / sizeof prefixes[0]; j++) {
        size_t pl = strlen(prefixes[j].sym);
        for (size_t i = 0; i < REGISTRY_LEN; i++) {
            size_t rl = strlen(registry[i].name);
            if (!(registry[i].flags & U_PFX) || rl < 2 || pl + rl != n ||
                n >= sizeof suggest_buf)
                continue;
            if (suggest_distance(key, pl, prefixes[j].sym, pl, true) == 0 &&
                suggest_distance(key + pl, rl, registry[i].name, rl, true) == 0) {
                memcpy(suggest_buf, prefixes[j].sym, pl);
                memcpy(suggest_buf + pl, registry[i].name, rl + 1);
                return suggest_buf;
            }
        }
    }
    /* Then the closest row by edits: none for a single letter, at most one
     * for names of up to three letters (two would reach almost any short
     * name), two beyond. Ties go to the closer case, then to the longer
     * name (a dropped letter is the commonest slip: "mn" is "min"), then to
     * the earlier row. */
    size_t limit = n == 1 ? 0 : n <= 3 ? 1 : 2, best_ci = limit + 1, best_cs = 0, best_len = 0;
    const char *best = NULL;
    for (size_t i = 0; i < REGISTRY_LEN; i++) {
        const char *r = registry[i].name;
        size_t rl = strlen(r);
        size_t ci = suggest_distance(key, n, r, rl, true);
        size_t cs = suggest_distance(key, n, r, rl, false);
        if (ci < best_ci ||
            (ci == best_ci && best && (cs < best_cs || (cs == best_cs && rl > best_len)))) {
            best_ci = ci;
            best_cs = cs;
            best_len = rl;
            best = r;
        }
    }
    return best_ci <= limit ? best : NULL;
}

/* For an expression, each name that does not resolve is replaced by its
 * suggestion ("Gal/min" -> "gal/min"); a space between two names is read as
 * `*` and any other space dropped. NULL if some name has no suggestion. */
static const char *suggest_expr(const char *s, size_t len)
{
    char out[sizeof suggest_buf];
    Buf b = {out, sizeof out, 0, false};
    bool prev_name = false, space = false;
    for (size_t i = 0; i < len;) {
        size_t w = name_char(s, len, i, true);
        if (w > 0) {
            size_t start = i;
            while (i < len && (w = name_char(s, len, i, i == start)) > 0)
                i += w;
            if (prev_name && space)
                buf_puts(&b, "*");
            const char *sug = suggest_name(s + start, i - start);
            if (!sug)
                return NULL;
            buf_puts(&b, sug); /* may be suggest_buf: copied before reuse */
            prev_name = true;
            space = false;
        } else if (s[i] == ' ' || s[i] == '\t') {
            space = true;
            i++;
        } else {
            if (s[i] == '(' && prev_name && space)
                buf_puts(&b, "*");
            prev_name = s[i] == ')';
            space = false;
            buf_putn(&b, s + i, 1);
            i++;
        }
    }
    Unit u;
    if (b.cut || unit_parse(out, b.len, &u, NULL, NULL) != UNIT_OK)
        return NULL;
    memcpy(suggest_buf, u.text, strlen(u.text) + 1);
    return suggest_buf;
}

/* A table name, or a spelling in a thread-local buffer that the next call
 * overwrites. */
const char *unit_suggest(const char *name, size_t len)
{
    while (len > 0 && (name[0] == ' ' || name[0] == '\t')) {
        name++;
        len--;
    }
    while (len > 0 && (name[len - 1] == ' ' || name[len - 1] == '\t'))
        len--;
    if (len == 0 || len >= 96)
        return NULL;
    /* Anything but name characters makes it an expression. */
    size_t i = 0, w;
    while (i < len && (w = name_char(name, len, i, i == 0)) > 0)
        i += w;
    const char *sug = i < len ? suggest_expr(name, len) : suggest_name(name, len);
    /* Never suggest what would not parse ("deg2212" -> "deg^2212" underflows). */
    Unit u;
    if (sug && unit_parse(sug, strlen(sug), &u, NULL, NULL) != UNIT_OK)
        return NULL;
    return sug;
}
