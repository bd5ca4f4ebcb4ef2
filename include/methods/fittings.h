/* fittings.h — loss coefficients K of pipe fittings, valves, entrances,
 * exits and sudden changes of bore.
 *
 * Three published methods, each with its constants in one table in
 * fittings.c: Crane TP-410 (K = f_T * L/D with the fully turbulent friction
 * factor of clean commercial steel), Hooper's 2-K method (1981) and Darby's
 * 3-K method (2001). K is referred to the velocity in the bore D (for the
 * two changes of bore, the smaller of the two bores). Pure numerics in SI;
 * nothing here allocates or prints. */
#ifndef HEADROOM_METHODS_FITTINGS_H
#define HEADROOM_METHODS_FITTINGS_H

#include <stdbool.h>
#include <stddef.h>

/* The kinds, by the words a calc file uses for them (fitting_kind_name). */
typedef enum FittingKind {
    FIT_NONE = -1,
    FIT_ELBOW90_STD,           /* "elbow 90 std": standard (r/D = 1) threaded 90 deg elbow */
    FIT_ELBOW90_STD_FLANGED,   /* "elbow 90 std flanged": flanged or welded, r/D = 1 */
    FIT_ELBOW90_LONG,          /* "elbow 90 long": long radius, r/D = 1.5 */
    FIT_ELBOW45_STD,           /* "elbow 45 std" */
    FIT_ELBOW45_LONG,          /* "elbow 45 long": r/D = 1.5 */
    FIT_TEE_RUN,               /* "tee run": threaded tee, flow through the run */
    FIT_TEE_RUN_FLANGED,       /* "tee run flanged" */
    FIT_TEE_BRANCH,            /* "tee branch": threaded tee, flow through the branch */
    FIT_TEE_BRANCH_FLANGED,    /* "tee branch flanged" */
    FIT_GATE,                  /* "gate": full bore gate valve, open */
    FIT_GLOBE,                 /* "globe": standard globe valve, open */
    FIT_BALL,                  /* "ball": full port ball valve, open */
    FIT_BUTTERFLY,             /* "butterfly": centric butterfly valve, open */
    FIT_SWING_CHECK,           /* "swing check": conventional swing check valve */
    FIT_LIFT_CHECK,            /* "lift check" */
    FIT_ENTRANCE_SHARP,        /* "entrance sharp": flush, square-edged */
    FIT_ENTRANCE_PROJECTING,   /* "entrance projecting": inward projecting (Borda) */
    FIT_ENTRANCE_ROUNDED,      /* "entrance rounded": radius r, default well rounded */
    FIT_EXIT,                  /* "exit": into a large body of still water */
    FIT_EXPANSION,             /* "expansion": sudden, from D up to D2 */
    FIT_CONTRACTION,           /* "contraction": sudden, from D2 down to D */
    FIT_KIND_COUNT
} FittingKind;

typedef enum FittingMethod {
    FIT_CRANE,                 /* "crane" */
    FIT_HOOPER,                /* "hooper" */
    FIT_DARBY,                 /* "darby" */
    FIT_METHOD_COUNT
} FittingMethod;

typedef enum FittingStatus {
    FIT_OK,
    FIT_NOT_TABULATED,         /* the method has no constants for this kind */
    FIT_BAD_DIAMETER,          /* D not finite or <= 0 */
    FIT_BAD_RE,                /* Re not finite or <= 0 (2-K and 3-K need it) */
    FIT_NEEDS_D2,              /* expansion/contraction without the second bore */
    FIT_BAD_D2,                /* D2 not finite, or smaller than D */
    FIT_BAD_RADIUS             /* rounding radius negative or not finite */
} FittingStatus;

/* Inputs in SI. D2 <= 0 and r < 0 mean "not given". */
typedef struct FittingInput {
    FittingKind kind;
    double D;                  /* bore the K is referred to, m */
    double Re;                 /* Reynolds number in that bore */
    double D2;                 /* second (larger) bore for expansion/contraction, m */
    double r;                  /* entrance rounding radius, m (entrance rounded) */
    double nps;                /* nominal size, in, when known (a pipe record's nps);
                                * 0: taken from the bore by the schedule 40 table */
} FittingInput;

/* Words <-> kind. Matching ignores case and whitespace entirely, so
 * "Elbow 90 Std", "elbow  90 std" and "elbow90std" are one kind. The _n
 * form reads len bytes (for a cell of a path table). */
FittingKind fitting_kind_parse(const char *words);
FittingKind fitting_kind_parse_n(const char *words, size_t len);
const char *fitting_kind_name(FittingKind k);

/* "crane", "hooper", "darby" (case-insensitive) -> method; -1 if unknown. */
int fitting_method_parse(const char *name);
const char *fitting_method_name(FittingMethod m);

/* Whether a method tabulates a kind, and the list of its kinds for a
 * message ("elbow 90 std", "gate", ...). */
bool fitting_method_has(FittingMethod m, FittingKind k);
void fitting_method_kinds(FittingMethod m, char *buf, size_t n);

/* Crane's fully turbulent friction factor of clean commercial steel for a
 * bore D (m): the fully rough limit of Colebrook,
 * f_T = (2*log10(3.7*D/eps))^-2 with eps = 0.0018 in. */
#define FIT_CRANE_EPS (0.0018 * 0.0254)   /* m: 0.0018 in = 0.00015 ft */
double fitting_crane_ft(double D);

/* Crane's equivalent length L/D of a kind, or 0 when Crane gives a K
 * directly (entrances, exit, changes of bore) or has no value. For the
 * butterfly valve it depends on the NOMINAL size, NPS 2-8 45, 10-14 35,
 * 16-24 25: fitting_crane_LD_nps takes it (in inches; 0 or less: taken
 * from the bore D by the ASME B36.10M schedule 40 table, as
 * fitting_crane_LD always does). */
double fitting_crane_LD(FittingKind k, double D);
double fitting_crane_LD_nps(FittingKind k, double D, double nps);

/* The loss coefficient. *K is set only on FIT_OK. */
FittingStatus fitting_k(FittingMethod m, const FittingInput *in, double *K);

/* Published constants of the 2-K and 3-K methods for a kind (false when
 * not tabulated). Kd in inches^0.3, as published. */
bool fitting_hooper_constants(FittingKind k, double *K1, double *Kinf);
bool fitting_darby_constants(FittingKind k, double *K1, double *Ki, double *Kd);

#endif
