/* colebrook.c — benchmark: one million Colebrook-White solves.
 *
 * Not a test: it times friction_colebrook() over a spread of Reynolds
 * numbers (4e3..1e8, log-spaced) and relative roughnesses (0..0.05) and
 * prints the mean time per solve and the mean number of correction steps. The
 * sum of the results is printed so the work cannot be optimised away.
 *
 * Build and run from the repository root:
 *   cc -std=c11 -O2 -D_POSIX_C_SOURCE=200809L -Iinclude bench/colebrook.c \
 *      src/methods/friction.c -lm -o build/bench-colebrook && build/bench-colebrook */
#include "methods/friction.h"

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

int main(void)
{
    enum { NRE = 1000, NRR = 1000 };
    static double re[NRE], rr[NRR];
    for (int i = 0; i < NRE; i++)
        re[i] = 4000.0 * pow(1e8 / 4000.0, (double)i / (NRE - 1));
    for (int j = 0; j < NRR; j++)
        rr[j] = 0.05 * (double)j / (NRR - 1);

    double sum = 0.0;
    long steps = 0;
    int failures = 0;
    double t0 = now_seconds();
    for (int k = 0; k < N_SOLVES; k++) {
        double f;
        int it = 0;
        if (friction_colebrook_iter(re[k % NRE], rr[(k / NRE) % NRR], &f, &it) != FRICTION_OK)
            failures++;
        sum += f;
        steps += it;
    }
    double t = now_seconds() - t0;
    printf("colebrook: %d solves in %.3f s, %.1f ns per solve, %.2f correction steps on average\n",
           N_SOLVES, t, 1e9 * t / N_SOLVES, (double)steps / N_SOLVES);
    printf("colebrook: checksum %.12g, %d failures\n", sum, failures);
    return failures ? 1 : 0;
}
