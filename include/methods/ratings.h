/* ratings.h — internal pressure ratings of thermoplastic and metallic pipe.
 *
 * Pure numerics in SI (Pa, m, K). Thermoplastic pipe is rated by the ISO
 * 161-1 / ASTM D2837 relation P = 2*HDS/(SDR - 1) with a tabulated
 * temperature derating factor; metallic pipe by the pressure-design
 * equation of ASME B31.3 304.1.2 with the allowable stress supplied by the
 * caller (no stress is ever assumed). Tables are static; nothing allocates. */
#ifndef HEADROOM_METHODS_RATINGS_H
#define HEADROOM_METHODS_RATINGS_H

#include <stddef.h>

#define RATING_PSI 6894.757293168361   /* Pa per psi (NIST SP 811) */

typedef enum RatingStatus {
    RATING_OK,
    RATING_T_ABOVE_MAX,      /* thermoplastic above its table's last temperature */
    RATING_BAD_SDR,          /* SDR <= 1 or not finite */
    RATING_BAD_STRESS,       /* S <= 0, E or W outside (0, 1], Y outside [0, 1) */
    RATING_WALL_CONSUMED,    /* allowances leave no wall: t - c <= 0 */
    RATING_BAD_GEOMETRY      /* D <= 0 or D - 2*Y*(t - c) <= 0 */
} RatingStatus;

typedef enum RatingKind {
    RATING_UNKNOWN,
    RATING_THERMOPLASTIC,
    RATING_METALLIC
} RatingKind;

/* One thermoplastic: its hydrostatic design stress at the reference
 * temperature and a derating table (temperature in degF, factor). */
typedef struct PlasticRating {
    const char *material;     /* as in pipe records: "PVC", "CPVC", "PEX" */
    const char *designation;  /* "PVC 1120", ... */
    double hds;               /* Pa, at t_ref */
    double t_ref;             /* K */
    const char *hds_source;
    const char *derate_source;
    size_t n;
    const double (*table)[2]; /* {degF, factor}, increasing temperature */
} PlasticRating;

typedef struct RatingResult {
    double rated;    /* Pa, at the reference temperature (metallic: at S) */
    double derate;   /* factor applied for temperature (metallic: 1) */
    double p;        /* Pa, allowable internal pressure = rated * derate */
    double sdr;      /* thermoplastic: the SDR used */
    double t_max;    /* K, thermoplastic: the table's highest temperature */
    int thick_wall;  /* metallic: t >= D/6, outside 304.1.2(a) */
} RatingResult;

/* Which rule applies to a pipe record's material string (case-insensitive;
 * "steel", "carbon steel", "stainless steel", "copper" are metallic). */
RatingKind rating_kind(const char *material);
const PlasticRating *rating_plastic_lookup(const char *material);

/* Derating factor at T (K), linear in the table; 1 below the first row.
 * RATING_T_ABOVE_MAX above the last row. */
RatingStatus rating_plastic_derate(const PlasticRating *m, double T, double *factor);

/* ASTM D2241 pressure class (Pa, at 73.4 degF) of an SDR the standard
 * lists (13.5, 17, 21, 26, 32.5, 41), 0 for any other. */
double rating_d2241_class(double sdr);

/* P = 2*HDS/(SDR - 1), then derated. hds <= 0 takes the table's HDS. */
RatingStatus rating_plastic(const PlasticRating *m, double sdr, double T, double hds,
                            RatingResult *out);

/* ASME B31.3 (304.1.2, eq. 3a solved for P):
 *   P = 2*S*E*W*(t - c) / (D - 2*Y*(t - c))
 * D outside diameter, t wall thickness (after any mill tolerance the caller
 * deducts), c sum of allowances, S allowable stress at temperature, E
 * quality (joint) factor, W weld strength reduction factor, Y coefficient of
 * Table 304.1.1. */
RatingStatus rating_metallic(double D, double t, double S, double E, double W, double Y,
                             double c, RatingResult *out);

#endif
