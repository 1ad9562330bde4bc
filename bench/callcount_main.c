/* Driver for counting the instructions of one generated table function.
 *
 * Build with -DFN=<function> -DLO=<min> -DHI=<max> and link with the generated source.
 * Usage: drv N [mode]
 *   mode 1 (default): call FN on N seeded inputs spread uniformly over [LO, HI]
 *   mode 0: the same loop with the call replaced by a plain add (loop overhead only)
 * The inputs are made before the loop; the sum goes to a volatile so nothing is dropped.
 */
#include <stdint.h>
#include <stdlib.h>

#ifndef FN
#error "define FN"
#endif
#ifndef LO
#error "define LO"
#endif
#ifndef HI
#error "define HI"
#endif

float FN(float x);

volatile float sink;

int main(int argc, char **argv)
{
    long n = argc > 1 ? atol(argv[1]) : 1000;
    int mode = argc > 2 ? atoi(argv[2]) : 1;
    float *xs;
    uint64_t s = 0x243F6A8885A308D3u;
    float acc = 0.0f;
    long i;

    if (n < 1) {
        return 2;
    }
    xs = malloc((size_t)n * sizeof *xs);
    if (xs == NULL) {
        return 3;
    }
    for (i = 0; i < n; i++) {
        double u;
        s = s * 6364136223846793005u + 1442695040888963407u;
        u = (double)(s >> 11) * 0x1p-53;
        xs[i] = (float)(LO + (HI - LO) * u);
    }
    if (mode) {
        for (i = 0; i < n; i++) {
            acc += FN(xs[i]);
        }
    } else {
        for (i = 0; i < n; i++) {
            acc += xs[i];
        }
    }
    sink = acc;
    free(xs);
    return 0;
}
