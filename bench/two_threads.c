/* two_threads.c — bench floor: what two threads can give on this machine.
 *
 * `two_threads 1` runs a fixed piece of arithmetic (about as long as one
 * check of the 5,000-statement calc) on the main thread; `two_threads 2`
 * runs the same piece on the main thread and on a second thread started
 * with it, as `headroom diff` does with its two revisions. On a machine
 * with two free cores the ratio of the two is 1; where the second
 * processor has to be woken (a virtual machine's idle processor) or shares
 * a core, it is more, and `diff` cannot do better than it. */
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>

#define STEPS 7000000L

static volatile double sink;

static void *work(void *arg)
{
    (void)arg;
    double x = 0.0;
    for (long i = 0; i < STEPS; i++)
        x += (double)i * 1e-9;
    sink = x;
    return NULL;
}

int main(int argc, char **argv)
{
    int threads = argc > 1 ? atoi(argv[1]) : 1;
    pthread_t t;
    int started = threads > 1 && pthread_create(&t, NULL, work, NULL) == 0;
    work(NULL);
    if (started)
        pthread_join(t, NULL);
    if (threads > 1 && !started) {
        fputs("two_threads: no second thread\n", stderr);
        return 2;
    }
    return 0;
}
