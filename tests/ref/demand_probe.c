/* demand_probe.c — a line-driven probe of the peak demand model in
 * src/methods/demand.c, for tests/ref/demand-scipy.sh. The calc function
 * peak_demand() cannot be driven from a calc file while no fixture
 * probability table is shipped, so the model is reached directly. One
 * request a line:
 *     e PCT n p q [n p q ...]     exact 100*PCT-th percentile flow
 *     n PCT n p q [n p q ...]     normal approximation
 * prints the flow (%.17g) or "error N". */
#include "methods/demand.h"

#include <stdio.h>
#include <stdlib.h>

int main(void)
{
    char line[4096];
    while (fgets(line, sizeof line, stdin)) {
        char *p = line + 1, *end;
        double pct = strtod(p, &end);
        FixtureGroup g[32];
        size_t ng = 0;
        for (p = end; ng < 32; ng++) {
            g[ng].n = strtod(p, &end);
            if (end == p)
                break;
            g[ng].p = strtod(end, &p);
            g[ng].q = strtod(p, &end);
            p = end;
        }
        double y = 0;
        PeakStatus s = line[0] == 'e' ? peak_exact(g, ng, pct, &y) : peak_normal(g, ng, pct, &y);
        if (s == PEAK_OK)
            printf("%.17g\n", y);
        else
            printf("error %d\n", (int)s);
    }
    return 0;
}
