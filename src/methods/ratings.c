/* ratings.c — thermoplastic and metallic pressure ratings.
 *
 * The thermoplastic rule and the metallic pressure-design equation are
 * published relations; the data they need (hydrostatic design stresses and
 * temperature derating factors) are tabulated below, each table with the
 * published copy it was checked against row by row (tests/unit/
 * test_ratings.c holds every row to it). Manufacturer data govern and must
 * be verified for the product installed. */
#include "methods/ratings.h"

#include <ctype.h>
#include <stdbool.h>
#include <math.h>
#include <string.h>

#define DEG_F_TO_K(f) (((f) - 32.0) * 5.0 / 9.0 + 273.15)

/* The plastics' rating temperature, 73.4 degF (23 degC), where every factor
 * is exactly 1.00. Manufacturers' tables head that row "73 degF"; it is the
 * same temperature rounded. */
#define T_RATING_F 73.4

/* PVC 1120 (cell class 12454), Schedule 40/80 and SDR pressure pipe: GF
 * Harvel, "Temperature Derating - Schedule 40 & 80 Pipe - PVC Industrial",
 * operating temperature (degF) and de-rating factor: 73 1.00, 80 0.88,
 * 90 0.75, 100 0.62, 110 0.51, 120 0.40, 130 0.31, 140 0.22 (140 degF is
 * the maximum service temperature). */
static const double PVC_DERATE[][2] = {
    {T_RATING_F, 1.00}, {80.0, 0.88}, {90.0, 0.75}, {100.0, 0.62},
    {110.0, 0.51}, {120.0, 0.40}, {130.0, 0.31}, {140.0, 0.22},
};

/* CPVC 4120 (cell class 23447), ASTM F441 pipe: GF Harvel, "CPVC Industrial
 * Pipe Temperature Derating": 73-80 1.00, 90 0.91, 100 0.82, 110 0.72,
 * 120 0.65, 130 0.57, 140 0.50, 150 0.42, 160 0.40, 170 0.29, 180 0.25,
 * 200 0.20. */
static const double CPVC_DERATE[][2] = {
    {T_RATING_F, 1.00}, {80.0, 1.00}, {90.0, 0.91}, {100.0, 0.82}, {110.0, 0.72},
    {120.0, 0.65}, {130.0, 0.57}, {140.0, 0.50}, {150.0, 0.42}, {160.0, 0.40},
    {170.0, 0.29}, {180.0, 0.25}, {200.0, 0.20},
};

/* PEX, ASTM F876/F877 SDR 9 tubing: 160 psi at 73.4 degF (HDS 630 psi) and
 * 100 psi at 180 degF, as published ("PEX tubing has a standard
 * hydrostatic pressure rating of 160 psi at 73 degF ... At 180 degF, 100
 * psi", Village Plumbing, "Common PEX Pressure Ratings"; "160 psi when the
 * water temperature is 73.4 degF ... 630 ... 100 psi ... 180 degF",
 * EngineerFix, "How Much Pressure Can PEX Pipe Hold?"). 100 psi on SDR 9 is
 * HDS = 100*(9 - 1)/2 = 400 psi; the factor is the ratio 400/630. A 200 degF
 * rating could not be read in a published copy, so the table ends at
 * 180 degF. */
static const double PEX_DERATE[][2] = {
    {T_RATING_F, 1.00}, {180.0, 400.0 / 630.0},
};

#define COUNT(t) (sizeof(t) / sizeof((t)[0]))

static const PlasticRating PLASTICS[] = {
    {"PVC", "PVC 1120", 2000.0 * RATING_PSI, DEG_F_TO_K(T_RATING_F),
     "HDS 2000 psi for PVC 1120 at 73.4 °F: HDB 4000 psi times the service factor 0.5 of "
     "the ASTM D2241 appendix (Moser, A. P., Buried Pipe Design, chapter 4, pressure-rated "
     "PVC pipe)",
     "GF Harvel, Temperature Derating, Schedule 40 & 80 PVC Industrial pipe (73-140 °F)",
     COUNT(PVC_DERATE), PVC_DERATE},
    {"CPVC", "CPVC 4120", 2000.0 * RATING_PSI, DEG_F_TO_K(T_RATING_F),
     "HDS 2000 psi for CPVC 4120 at 73.4 °F (\"the design stress of CPVC is also 2,000 psi "
     "at 73 °F\", U.S. Plastic Corp., CPVC Schedule 40 pipe physical properties)",
     "GF Harvel, CPVC Industrial Pipe Temperature Derating (73-200 °F)",
     COUNT(CPVC_DERATE), CPVC_DERATE},
    {"PEX", "PEX (ASTM F876 SDR 9)", 630.0 * RATING_PSI, DEG_F_TO_K(T_RATING_F),
     "HDS 630 psi at 73.4 °F: ASTM F876/F877 SDR 9 rating 160 psi at 73.4 °F "
     "(EngineerFix, How Much Pressure Can PEX Pipe Hold?)",
     "ASTM F876/F877 SDR 9 ratings 160 psi at 73.4 °F and 100 psi at 180 °F (Village "
     "Plumbing, Common PEX Pressure Ratings), linear between",
     COUNT(PEX_DERATE), PEX_DERATE},
};

/* ASTM D2241 pressure classes by SDR, psi at 73.4 degF, as the Hydraulic
 * Institute Engineering Data Book, Section IV, Table 4.E.2 prints them
 * beside each DR: DR 13.5 315, DR 17 250, DR 21 200, DR 26 160, DR 32.5 125,
 * DR 41 100. They are 2*2000/(SDR - 1) rounded to the ANSI preferred
 * number series (320 -> 315, 126.98 -> 125). */
static const double D2241_CLASS[][2] = {
    {13.5, 315.0}, {17.0, 250.0}, {21.0, 200.0}, {26.0, 160.0}, {32.5, 125.0}, {41.0, 100.0},
};

double rating_d2241_class(double sdr)
{
    for (size_t i = 0; i < COUNT(D2241_CLASS); i++)
        if (fabs(sdr - D2241_CLASS[i][0]) < 1e-9)
            return D2241_CLASS[i][1] * RATING_PSI;
    return 0.0;
}

static bool same_word(const char *a, const char *b)
{
    for (; *a && *b; a++, b++)
        if (tolower((unsigned char)*a) != tolower((unsigned char)*b))
            return false;
    return *a == *b;
}

static bool contains_word(const char *s, const char *w)
{
    size_t n = strlen(w);
    for (; *s; s++) {
        size_t i = 0;
        while (i < n && s[i] && tolower((unsigned char)s[i]) == tolower((unsigned char)w[i]))
            i++;
        if (i == n)
            return true;
    }
    return false;
}

const PlasticRating *rating_plastic_lookup(const char *material)
{
    if (!material)
        return NULL;
    for (size_t i = 0; i < COUNT(PLASTICS); i++)
        if (same_word(material, PLASTICS[i].material))
            return &PLASTICS[i];
    return NULL;
}

RatingKind rating_kind(const char *material)
{
    if (!material)
        return RATING_UNKNOWN;
    if (rating_plastic_lookup(material))
        return RATING_THERMOPLASTIC;
    if (contains_word(material, "steel") || contains_word(material, "copper"))
        return RATING_METALLIC;
    return RATING_UNKNOWN;
}

RatingStatus rating_plastic_derate(const PlasticRating *m, double T, double *factor)
{
    double tf = (T - 273.15) * 9.0 / 5.0 + 32.0;
    const double (*t)[2] = m->table;
    /* Tables end at the material's maximum service temperature; allow the
     * rounding of a unit conversion (1e-9 degF) at that end. */
    if (tf > t[m->n - 1][0] + 1e-9)
        return RATING_T_ABOVE_MAX;
    /* At and below the rating temperature (allowing the rounding of a unit
     * conversion) the factor is exactly the first row's, 1.00. */
    if (tf <= t[0][0] + 1e-9) {
        *factor = t[0][1];
        return RATING_OK;
    }
    for (size_t i = 1; i < m->n; i++) {
        if (tf <= t[i][0]) {
            double s = (tf - t[i - 1][0]) / (t[i][0] - t[i - 1][0]);
            *factor = t[i - 1][1] + s * (t[i][1] - t[i - 1][1]);
            return RATING_OK;
        }
    }
    *factor = t[m->n - 1][1];
    return RATING_OK;
}

/* ISO 161-1 and ASTM D2837 (the ISO equation as used by ASTM D1785, D2241,
 * F441 and F876): P = 2*HDS/(SDR - 1), with SDR = od/wall and HDS = HDB*DF,
 * the design factor DF being 0.5 for water at 73.4 degF. */
RatingStatus rating_plastic(const PlasticRating *m, double sdr, double T, double hds,
                            RatingResult *out)
{
    if (!(sdr > 1.0) || !isfinite(sdr))
        return RATING_BAD_SDR;
    double factor;
    RatingStatus s = rating_plastic_derate(m, T, &factor);
    if (s != RATING_OK)
        return s;
    double S = hds > 0.0 ? hds : m->hds;
    out->rated = 2.0 * S / (sdr - 1.0);
    out->derate = factor;
    out->p = out->rated * factor;
    out->sdr = sdr;
    out->t_max = DEG_F_TO_K(m->table[m->n - 1][0]);
    out->thick_wall = 0;
    return RATING_OK;
}

/* ASME B31.3-2020 Process Piping, 304.1.2, eq. (3a)
 *   t = P*D / (2*(S*E*W + P*Y))
 * solved for P with t replaced by the wall left after allowances (t - c):
 *   P = 2*S*E*W*(t - c) / (D - 2*Y*(t - c)).
 * ASME B31.1 104.1.2 has the same form. The equation applies for t < D/6;
 * thicker walls need 304.1.2(b), which is flagged, not computed. */
RatingStatus rating_metallic(double D, double t, double S, double E, double W, double Y,
                             double c, RatingResult *out)
{
    if (!(S > 0.0) || !(E > 0.0 && E <= 1.0) || !(W > 0.0 && W <= 1.0) || !(Y >= 0.0 && Y < 1.0))
        return RATING_BAD_STRESS;
    if (!(D > 0.0) || !isfinite(D) || !isfinite(t) || !isfinite(c))
        return RATING_BAD_GEOMETRY;
    double tm = t - c;
    if (!(tm > 0.0))
        return RATING_WALL_CONSUMED;
    double den = D - 2.0 * Y * tm;
    if (!(den > 0.0))
        return RATING_BAD_GEOMETRY;
    out->rated = 2.0 * S * E * W * tm / den;
    out->derate = 1.0;
    out->p = out->rated;
    out->sdr = D / t;
    out->t_max = INFINITY;
    out->thick_wall = t >= D / 6.0;
    return RATING_OK;
}
