/* units.h — dimensions, quantities and the unit registry.
 *
 * A quantity is a double in coherent SI base units plus a dimension vector of
 * seven exponents (doubles, so sqrt gives m^0.5); both are small value types
 * passed by value. Temperatures are stored in kelvin and carry whether they
 * are an absolute temperature (a point on a scale) or a difference. Units are
 * data: one table in units.c, with NIST SP 811 factors, and a parser for
 * compound unit expressions such as `lbf*s/ft^2` or `m^3/h`. Nothing here
 * allocates; returned strings point into static tables or caller buffers. */
#ifndef HEADROOM_UNITS_H
#define HEADROOM_UNITS_H

#include <math.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>

#include "constants.h"

enum {
    DIM_LENGTH,      /* m   */
    DIM_MASS,        /* kg  */
    DIM_TIME,        /* s   */
    DIM_CURRENT,     /* A   */
    DIM_TEMPERATURE, /* K   */
    DIM_AMOUNT,      /* mol */
    DIM_LUMINOUS,    /* cd  */
    DIM_COUNT
};

typedef struct Dim {
    double e[DIM_COUNT];
} Dim;

Dim dim_none(void);
Dim dim_base(int which);             /* one of DIM_LENGTH ... */
Dim dim_pow(Dim a, double p);        /* exponents rounded to 1e-9 */

/* Exponents are kept on a 1e-9 grid so that m^0.5 * m^0.5 is exactly m and
 * (m^3)^(1/3) is exactly m; the rounding also turns -0 into 0. An exponent
 * already whole (nearly every one: m, s^-2, kg*m^-3) is on the grid as it
 * is: x * 1e9 is then an exact integer below 2^53 and the rounding would
 * give x back; + 0.0 turns -0 into 0. The products and quotients below are
 * inline, like qty: every multiplication of quantities makes one, and out of
 * line each went through a 56-byte temporary (issue 17). */
static inline double dim_exp_round(double x)
{
    if (x > -1e6 && x < 1e6 && x == (double)(long)x)
        return x + 0.0;
    double r = round(x * 1e9) / 1e9;
    return r == 0 ? 0.0 : r;
}

static inline Dim dim_mul(Dim a, Dim b)
{
    for (int i = 0; i < DIM_COUNT; i++)
        a.e[i] = dim_exp_round(a.e[i] + b.e[i]);
    return a;
}

static inline Dim dim_div(Dim a, Dim b)
{
    for (int i = 0; i < DIM_COUNT; i++)
        a.e[i] = dim_exp_round(a.e[i] - b.e[i]);
    return a;
}

static inline bool dim_eq(Dim a, Dim b)
{
    for (int i = 0; i < DIM_COUNT; i++)
        if (!(fabs(a.e[i] - b.e[i]) < 5e-10))
            return false;
    return true;
}

static inline bool dim_is_none(Dim a)
{
    for (int i = 0; i < DIM_COUNT; i++)
        if (!(fabs(a.e[i]) < 5e-10)) /* dim_eq(a, DIM_NONE): every exponent 0 */
            return false;
    return true;
}

/* A hash of a dimension's exact bits, a temperature kind and a unit system,
 * for the small per-thread caches keyed by them (unit_default, the shown
 * unit of eval_display.c). */
uint64_t dim_key_hash(const Dim *d, int temp, int sys);

/* Named dimensions, built once. */
extern const Dim DIM_NONE, DIM_L, DIM_M, DIM_T, DIM_THETA, DIM_AREA, DIM_VOLUME,
    DIM_VELOCITY, DIM_ACCEL, DIM_FLOW, DIM_FORCE, DIM_PRESSURE, DIM_DENSITY,
    DIM_SPECIFIC_WEIGHT, DIM_DYN_VISC, DIM_KIN_VISC, DIM_ENERGY, DIM_POWER;

/* A plain word for the dimension ("pressure", "length", "flow rate", ...) or
 * NULL when it has no common name. */
const char *dim_name(Dim d);

/* Spell the dimension in coherent SI units with `*`, `/` and `^`:
 * "kg/m^3", "Pa*s", "m/s", "1" for none. Named coherent units (N, Pa, J, W,
 * Pa*s, N/m^3) are used where the whole dimension matches one; otherwise base
 * units in the order kg m s A K mol cd. Writes at most n bytes, NUL included. */
void dim_format_si(Dim d, char *buf, size_t n);

/* What kind of temperature a quantity is. Quantities without a temperature
 * dimension are TEMP_NONE. */
typedef enum TempKind {
    TEMP_NONE = 0,       /* not a temperature point (includes differences) */
    TEMP_ABSOLUTE,       /* a point on an absolute scale (K, degR): scalable */
    TEMP_ABSOLUTE_OFFSET /* a point entered on degC or degF: not scalable */
} TempKind;

/* What a pressure states about its reference (DESIGN 2.9). A plain pressure
 * (psi, kPa, bar, ftH2O, ...) states none: it is a difference, or gauge by
 * the trade's convention. A gauge or an absolute pressure is a *point*, like
 * an absolute temperature: its SI value is Pa above the atmosphere (gauge)
 * or above vacuum (absolute). Quantities that are not pressures, and plain
 * pressures, are PRES_PLAIN. */
typedef enum PressureRef {
    PRES_PLAIN = 0,
    PRES_GAUGE,          /* psig, kPag, barg */
    PRES_ABSOLUTE        /* psia, kPaa, bara, MPaa */
} PressureRef;

typedef struct Quantity {
    double si;    /* value in coherent SI base units; temperatures in K */
    Dim dim;
    TempKind temp;
    PressureRef pref;
} Quantity;

/* A TEMP_NONE quantity; inline, like qty_number and value_number: every
 * step of an evaluation makes one, and out of line each was built in a
 * temporary and copied (issue 17). */
static inline Quantity qty(double si, Dim dim) { return (Quantity){si, dim, TEMP_NONE, PRES_PLAIN}; }
static inline Quantity qty_number(double x) { return qty(x, DIM_NONE); } /* dimensionless */

/* A resolved unit expression: si = value * factor + offset. `offset` is
 * non-zero only for a lone degC or degF; inside a compound (J/(kg*degC)) an
 * offset unit stands for its difference. */
typedef struct Unit {
    double factor;
    double offset;
    Dim dim;
    TempKind temp;       /* TEMP_ABSOLUTE(_OFFSET) for K, degR, degC, degF */
    PressureRef pref;    /* a lone psig, psia, ...: the reference it states */
    char text[48];       /* the spelling to display, e.g. "gal/min", "degF" */
} Unit;

typedef enum UnitStatus {
    UNIT_OK,
    UNIT_UNKNOWN,        /* a name is not in the registry; see `bad` */
    UNIT_SYNTAX,         /* malformed expression */
    UNIT_TOO_LONG
} UnitStatus;

/* Parse a unit expression: term (('*' | '/' | '·') term)*, where a term is a
 * unit name, optionally with a prefix, followed by an optional `^` and a
 * signed number; parentheses group. `°C`, `°F`, `gpm`, `cfs` are accepted.
 * On UNIT_UNKNOWN, *bad_off and *bad_len locate the unknown name in `s`. */
UnitStatus unit_parse(const char *s, size_t len, Unit *out, size_t *bad_off, size_t *bad_len);

/* The parsed unit for a spelling, shared for the life of the process (the
 * same pointer for the same spelling), or NULL when unit_parse would fail;
 * thread-safe. For the units a calc writes again and again. */
const Unit *unit_shared(const char *s, size_t len);

/* The same unit, shared for the life of the process (equal units give the
 * same pointer); thread-safe. unit_blank (all zero: no unit, text "") is
 * what a result that is not a number is shown in. */
const Unit *unit_intern(const Unit *u);
extern const Unit unit_blank;

/* The registered name closest to `name` (for "did you mean ...?"), or NULL
 * when nothing is close. */
const char *unit_suggest(const char *name, size_t len);

/* Value in the unit -> quantity, and back. unit_to_qty applies the offset for
 * a lone absolute temperature unit and sets the temperature kind. */
static inline Quantity unit_to_qty(double v, const Unit *u)
{
    return (Quantity){v * u->factor + u->offset, u->dim, u->temp, u->pref};
}
double unit_from_si(double si, const Unit *u, bool is_difference);

/* Display systems and the default display unit for a dimension. */
typedef enum UnitSystem { UNITS_US, UNITS_SI } UnitSystem;

/* The unit a quantity is shown in when nothing else says: by dimension and
 * system (US: ft, ft/s, gal/min, psi, lbf/ft^3, ...; SI: m, m/s, L/s, kPa,
 * kg/m^3, ...). Temperatures: degF/degC for points, delta_degF/delta_degC for
 * differences. Falls back to the SI spelling of the dimension. */
Unit unit_default(Dim d, TempKind temp, UnitSystem sys);
/* The same for a pressure point: psig/kPag for gauge, psia/kPaa for
 * absolute; anything else as unit_default. */
Unit unit_default_ref(Dim d, TempKind temp, PressureRef ref, UnitSystem sys);

/* The standard atmosphere, 101.325 kPa (ISO 2533; the definition of 1 atm). */
#define UNIT_STANDARD_ATMOSPHERE CONST_STANDARD_ATMOSPHERE

/* Re-state a pressure on another reference, `atm` the atmosphere in Pa:
 * plain or gauge -> absolute adds it, absolute -> gauge or plain subtracts
 * it, plain <-> gauge changes nothing. Anything else is returned as is. */
Quantity qty_to_ref(Quantity q, PressureRef to, double atm);

/* "gauge", "absolute" or NULL (plain). */
const char *pressure_ref_name(PressureRef r);

/* Visit every registered unit name (for tests and the manual). */
typedef void (*UnitVisit)(const char *name, const Unit *u, void *ctx);
void unit_each(UnitVisit fn, void *ctx);

#endif
