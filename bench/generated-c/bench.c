/*
 * Times the emit-generated f32 scorer against the dense float loop an engineer writes by hand, in the same process,
 * on the same inputs (784 visible, 500 hidden, 13% of bits on). Prints ns per input for each and the ratio.
 * Build: see run.sh. Input: dense.bin from make_model.py (b, c, W transposed, float32 little-endian).
 */
#define _POSIX_C_SOURCE 199309L /* clock_gettime under -std=c99 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "bench784x500.h"

#define V BENCH784X500_VISIBLE
#define H BENCH784X500_HIDDEN
#define INPUTS 2000
#define ROUNDS 7

static float b[V], c[H], wt[H][V]; /* wt[j][i] = W_ij: the inner loop runs over contiguous memory */

/* The straightforward scorer: F(v) = -b.v - sum_j log(1 + exp(c_j + sum_i v_i W_ij)). */
static float dense_free_energy(const float v[V])
{
    float f = 0.0f;
    int i, j;
    for (i = 0; i < V; ++i) f -= b[i] * v[i];
    for (j = 0; j < H; ++j) {
        float x = c[j];
        for (i = 0; i < V; ++i) x += v[i] * wt[j][i];
        f -= log1pf(expf(x));
    }
    return f;
}

static double now_ns(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec * 1e9 + (double)t.tv_nsec;
}

static uint64_t rng_state = 0x243F6A8885A308D3u;
static double next_unit(void) /* xorshift64*, fixed seed */
{
    rng_state ^= rng_state >> 12;
    rng_state ^= rng_state << 25;
    rng_state ^= rng_state >> 27;
    return (double)((rng_state * 2685821657736338717u) >> 11) / 9007199254740992.0;
}

int main(int argc, char **argv)
{
    static float dense_in[INPUTS][V];
    static uint8_t packed_in[INPUTS][BENCH784X500_PACKED_BYTES];
    static float out_dense[INPUTS], out_gen[INPUTS];
    double best_dense = 1e300, best_gen = 1e300, max_rel = 0.0, active = 0.0;
    volatile float sink = 0.0f;
    FILE *fp;
    int k, r, i;

    if (argc < 2 || (fp = fopen(argv[1], "rb")) == NULL) { fprintf(stderr, "usage: bench dense.bin\n"); return 2; }
    if (fread(b, sizeof b, 1, fp) != 1 || fread(c, sizeof c, 1, fp) != 1 || fread(wt, sizeof wt, 1, fp) != 1) { fprintf(stderr, "short dense.bin\n"); return 2; }
    fclose(fp);

    for (k = 0; k < INPUTS; ++k)
        for (i = 0; i < V; ++i) {
            int on = next_unit() < 0.13;
            dense_in[k][i] = on ? 1.0f : 0.0f;
            if (on) { packed_in[k][i >> 3] = (uint8_t)(packed_in[k][i >> 3] | (1u << (i & 7))); active += 1.0; }
        }

    for (r = 0; r < ROUNDS; ++r) {
        double t0 = now_ns(), t1, t2;
        for (k = 0; k < INPUTS; ++k) out_dense[k] = dense_free_energy(dense_in[k]);
        t1 = now_ns();
        for (k = 0; k < INPUTS; ++k) out_gen[k] = bench784x500_free_energy(packed_in[k]);
        t2 = now_ns();
        if (t1 - t0 < best_dense) best_dense = t1 - t0;
        if (t2 - t1 < best_gen) best_gen = t2 - t1;
        for (k = 0; k < INPUTS; ++k) sink += out_dense[k] + out_gen[k];
    }
    for (k = 0; k < INPUTS; ++k) {
        double rel = fabs((double)out_gen[k] - (double)out_dense[k]) / fabs((double)out_dense[k]);
        if (rel > max_rel) max_rel = rel;
    }
    printf("inputs %d, active bits %.1f%%, best of %d rounds\n", INPUTS, 100.0 * active / ((double)INPUTS * V), ROUNDS);
    printf("dense loop      %10.0f ns/input\n", best_dense / INPUTS);
    printf("generated f32   %10.0f ns/input\n", best_gen / INPUTS);
    printf("ratio           %10.1fx\n", best_dense / best_gen);
    printf("max relative difference between the two: %.2e\n", max_rel);
    printf("selftest failures: %d\n", bench784x500_selftest());
    (void)sink;
    return 0;
}
