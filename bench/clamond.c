/* clamond.c — bench floor: one million Colebrook-White solves by the
 * explicit two-iteration scheme of Clamond, D. (2009). Efficient resolution
 * of the Colebrook equation. Ind. Eng. Chem. Res. 48(7), 3665-3671, written
 * out inline with no input checks, over the same Reynolds numbers and
 * roughnesses as colebrook.c. The Colebrook row of `make bench` is a ratio
 * to this program's time per solve. */
#include <math.h>
#include <stdio.h>
#include <time.h>

#define N_SOLVES 1000000

static double now_seconds(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static double clamond(double Re, double rr)
{
    double x1 = rr * Re * 0.123968186335417556;  /* rr*Re*ln(10)/18.574 */
    double x2 = log(Re) - 0.779397488455682028;  /* ln(Re*ln(10)/5.02) */
    double F = x2 - 0.2;
    double e = (log(x1 + F) - 0.2) / (1.0 + x1 + F);
    F -= (1.0 + x1 + F + 0.5 * e) * e * (x1 + F) / (1.0 + x1 + F + e * (1.0 + e / 3.0));
    e = (log(x1 + F) + F - x2) / (1.0 + x1 + F);
    F -= (1.0 + x1 + F + 0.5 * e) * e * (x1 + F) / (1.0 + x1 + F + e * (1.0 + e / 3.0));
    F = 1.151292546497022842 / F;                /* ln(10)/2 / F */
    return F * F;
}

int main(void)
{
    enum { NRE = 1000, NRR = 1000 };
    static double re[NRE], rr[NRR];
    for (int i = 0; i < NRE; i++)
        re[i] = 4000.0 * pow(1e8 / 4000.0, (double)i / (NRE - 1));
    for (int j = 0; j < NRR; j++)
        rr[j] = 0.05 * (double)j / (NRR - 1);
    double sum = 0.0;
    double t0 = now_seconds();
    for (int k = 0; k < N_SOLVES; k++)
        sum += clamond(re[k % NRE], rr[(k / NRE) % NRR]);
    double t = now_seconds() - t0;
    printf("clamond: %d solves in %.3f s, %.1f ns per solve\n", N_SOLVES, t, 1e9 * t / N_SOLVES);
    printf("clamond: checksum %.12g\n", sum);
    return 0;
}
