/*
 * Exhaustive check of the f32 softplus polynomial of emit's generated C (see src/Emit/Quantize/SoftplusF32.cs): for
 * every non-negative binary32 d (0 to +infinity; with a stride > 1, every stride-th bit pattern plus the last), the
 * absolute difference between G_f32(d) = softplus_under_test(-d) and G(d) = log1p(exp(-d)) evaluated in double
 * precision by the C library (relative error near 1e-16, far below the 1e-7 measured). Prints the largest difference.
 *
 * softplus_under_test.c holds the function copied from a generated scorer and renamed (run.sh does that; so do the
 * tests in tests/Emit.Tests/Emission/SoftplusF32Tests.cs). Build: cc -std=c99 -O2 check.c -lm (-std=c99 keeps
 * floating-point contraction off, as the generated code's strict builds have it).
 * Usage: check [stride [part parts]]   (part/parts: share the range between processes by bit pattern)
 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "softplus_under_test.c"

static double worst = 0.0, worst_d = 0.0;
static uint64_t checked = 0;

static void check_one(uint32_t bits)
{
    float d;
    double g, err;
    memcpy(&d, &bits, sizeof d);
    g = log1p(exp(-(double)d));
    err = fabs((double)softplus_under_test(-d) - g);
    ++checked;
    if (!(err <= worst)) { /* a NaN result counts as the worst */
        worst = err;
        worst_d = (double)d;
    }
}

int main(int argc, char **argv)
{
    const uint32_t last = 0x7F800000u; /* +infinity */
    uint64_t stride = argc > 1 ? strtoull(argv[1], NULL, 10) : 1u;
    uint64_t part = argc > 3 ? strtoull(argv[2], NULL, 10) : 0u;
    uint64_t parts = argc > 3 ? strtoull(argv[3], NULL, 10) : 1u;
    uint64_t b, first, end;
    if (stride == 0u || parts == 0u || part >= parts) {
        fprintf(stderr, "usage: check [stride [part parts]]\n");
        return 2;
    }
    first = last * part / parts;
    end = last * (part + 1u) / parts;
    for (b = first; b < end; b += stride) check_one((uint32_t)b);
    if (part + 1u == parts) check_one(last);
    printf("checked %llu values, max abs error %.9e at d = %.9g\n", (unsigned long long)checked, worst, worst_d);
    return 0;
}
