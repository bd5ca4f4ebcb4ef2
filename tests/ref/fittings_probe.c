/* fittings_probe.c — a line-driven probe of the numeric cores in
 * src/methods (pipes.c, fittings.c, roughness.c) for the reference checks
 * tests/ref/fittings-fluids.sh and tests/ref/pipes-fluids.sh, used only when
 * the headroom program cannot run a calc file. Reads one request a line:
 *     k METHOD|KIND|D_m|Re|D2_m|r_m     (D2 0 and r -1 when not given)
 *     p STANDARD|SIZE|CLASS
 * and prints one line: the K, or "od id wall" in metres, or "error N". */
#include "methods/fittings.h"
#include "methods/pipes.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static char *field(char **p)
{
    char *s = *p, *bar = strchr(s, '|');
    if (bar) {
        *bar = '\0';
        *p = bar + 1;
    } else {
        *p = s + strlen(s);
    }
    return s;
}

int main(void)
{
    char line[512];
    while (fgets(line, sizeof line, stdin)) {
        line[strcspn(line, "\n")] = '\0';
        char *p = line + 2;
        if (line[0] == 'k') {
            char *m = field(&p), *k = field(&p);
            FittingInput in;
            in.kind = fitting_kind_parse(k);
            in.D = strtod(field(&p), NULL);
            in.Re = strtod(field(&p), NULL);
            in.D2 = strtod(field(&p), NULL);
            in.r = strtod(field(&p), NULL);
            int mi = fitting_method_parse(m);
            double K;
            FittingStatus s = mi < 0 ? FIT_NOT_TABULATED : fitting_k((FittingMethod)mi, &in, &K);
            if (s == FIT_OK)
                printf("%.17g\n", K);
            else
                printf("error %d\n", (int)s);
        } else if (line[0] == 'p') {
            char *s = field(&p), *size = field(&p), *cls = field(&p);
            double nps;
            PipeDims d;
            PipeStatus st = pipe_size_parse(size, &nps) ? pipe_lookup(pipe_standard_find(s), nps, cls, &d)
                                                      : PIPE_BAD_SIZE;
            if (st == PIPE_OK)
                printf("%.17g %.17g %.17g\n", d.od, d.id, d.wall);
            else
                printf("error %d\n", (int)st);
        } else {
            printf("error -1\n");
        }
        fflush(stdout);
    }
    return 0;
}
