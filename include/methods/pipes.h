/* pipes.h — published pipe and tube dimensions by standard, size and class.
 *
 * Pure numerics in SI: a lookup turns (standard, nominal size, class) into
 * outside diameter, bore, wall and flow area in metres, plus the material's
 * absolute roughness and elastic modulus. The tables themselves are data in
 * src/methods/pipetab.def, with the source standard on top of each. Nothing
 * here allocates or prints; returned strings point into static tables. */
#ifndef HEADROOM_METHODS_PIPES_H
#define HEADROOM_METHODS_PIPES_H

#include <stdbool.h>
#include <stddef.h>

#define PIPE_INCH 0.0254   /* m, exact (NIST SP 811) */

typedef enum PipeStandardId {
    PIPE_ASME_B36_10M,
    PIPE_ASTM_D1785,
    PIPE_ASTM_F441,
    PIPE_ASTM_D2241,
    PIPE_ASTM_B88,
    PIPE_ASTM_F876,
    PIPE_STANDARD_COUNT
} PipeStandardId;

typedef enum PipeStatus {
    PIPE_OK,
    PIPE_UNKNOWN_STANDARD,   /* no such standard (pipe_standards_list) */
    PIPE_BAD_SIZE,           /* the size text is not a number or fraction */
    PIPE_UNKNOWN_SIZE,       /* the standard has no such size (pipe_sizes_list) */
    PIPE_UNKNOWN_CLASS,      /* the standard has no such class (pipe_classes_list) */
    PIPE_NOT_IN_CLASS        /* the size exists, but not in that class */
} PipeStatus;

/* One standard: its canonical name, the material it makes, and how its
 * table is to be read. */
typedef struct PipeStandard {
    PipeStandardId id;
    const char *name;          /* "ASME B36.10M" */
    const char *title;         /* the standard's title */
    const char *material;      /* "steel", "PVC", "CPVC", "copper", "PEX" */
    const char *wall_basis;    /* "nominal wall" or "minimum wall" */
    const char *roughness_of;  /* material name in the roughness table */
    double E;                  /* elastic modulus, Pa */
    const char *E_source;      /* where E comes from */
} PipeStandard;

/* One row of a dimension table, in inches as the standard prints it. */
typedef struct PipeRow {
    PipeStandardId standard;
    const char *nps;           /* canonical size text: "1-1/2" */
    double od_in;
    const char *cls;           /* canonical class: "40", "STD", "K", "SDR 21" */
    double wall_in;            /* 0: not listed in this class */
} PipeRow;

/* The result of a lookup, in SI. */
typedef struct PipeDims {
    const PipeStandard *std;
    const PipeRow *row;
    double od, id, wall;       /* m */
    double area;               /* flow area pi/4 id^2, m^2 */
    double sdr;                /* the nominal SDR of an SDR class; otherwise od/wall
                                * computed from the listed wall (minimum wall for
                                * plastics, nominal for steel and copper) */
    bool sdr_nominal;          /* true when the class is an SDR */
    double roughness;          /* m, from the roughness table */
    double E;                  /* Pa */
} PipeDims;

/* The standards and the table rows, for the library glue and tests. */
const PipeStandard *pipe_standard(PipeStandardId id);
size_t pipe_row_count(void);
const PipeRow *pipe_row(size_t i);

/* Match a standard's name: case-insensitive, spaces and the "ASME "/"ASTM "
 * prefix optional ("B36.10M", "asme b36.10", "D1785", "ASTM F876"). */
const PipeStandard *pipe_standard_find(const char *name);

/* Parse a nominal size: "1-1/2", "1 1/2", "3/4", "2", "1.5". Returns false
 * on malformed text. */
bool pipe_size_parse(const char *text, double *nps);
/* Canonicalise a class for a standard: "sch 40" / "40" -> "40", "std" ->
 * "STD", "type l" -> "L", "SDR21" / "21" (SDR standards) -> "SDR 21".
 * Writes into buf; returns false if the text is empty or too long. */
bool pipe_class_normalize(const PipeStandard *s, const char *text, char *buf, size_t n);

/* Look up a pipe. `nps` is the parsed size; `cls` the class text as given. */
PipeStatus pipe_lookup(const PipeStandard *s, double nps, const char *cls, PipeDims *out);

/* Comma-separated lists for messages: every standard; a standard's sizes
 * (in one class, or in any class when cls is NULL); a standard's classes. */
void pipe_standards_list(char *buf, size_t n);
void pipe_sizes_list(const PipeStandard *s, const char *cls, char *buf, size_t n);
void pipe_classes_list(const PipeStandard *s, char *buf, size_t n);

/* Nominal size from a bore by linear interpolation in the ASME B36.10M
 * schedule 40 bores, in inches: linear extrapolation above NPS 24,
 * proportional to the bore below NPS 1/8 (so it stays positive).
 * Used where a method is published against nominal size (Darby 3-K). */
double pipe_nps_from_sch40_bore(double bore_m);

#endif
