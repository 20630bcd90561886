/*
 * Times the emit-generated scorers (f32, and fixed point with int16 and int8 weights) against the dense float loop an
 * engineer writes by hand, in the same process, on the same inputs (784 visible, 500 hidden, 13% of bits on). Prints
 * ns per input for each and the ratios to the dense loop, and a limit for each generated scorer: the time of a probe
 * that only reads the input's active weight rows (random tables of the same element type and size, rows added in
 * the input's order eight at a time, 16 units to a block, as compilers vectorize it) plus the time the scorer itself takes on the
 * all-zero input (no rows: the 500 softplus evaluations and the fixed costs). The limit's ratio to the dense loop, and
 * the generated scorer's speed as a percentage of the limit, are printed too.
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
#include "bench_i16.h"
#include "bench_i8.h"

#define V BENCH784X500_VISIBLE
#define H BENCH784X500_HIDDEN
#define INPUTS 2000
#define ROUNDS 7

static float b[V], c[H], wt[H][V]; /* wt[j][i] = W_ij: the inner loop runs over contiguous memory */
/* (the generated scorers keep their own tables: each is a separate translation unit) */

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

#define SCORERS 4
static const char *const names[SCORERS] = { "dense", "f32", "int16", "int8" };

/* The limit probe's table: random bytes, read as V contiguous rows of the size of a row of each scorer's weights (4, 2,
 * 1 bytes a unit, as 32-bit words), so each probe reads memory laid out as its scorer's table is; and each input's
 * active rows, listed in advance (in increasing order). */
#define ROW_WORDS_F32 (H * 4 / 4)
#define ROW_WORDS_I16 ((H * 2 + 3) / 4)
#define ROW_WORDS_I8 ((H + 3) / 4)
static uint32_t probe_table[V * ROW_WORDS_F32];
static uint16_t active_rows[INPUTS][V];
static int active_count[INPUTS];

/* Reads the active rows of input k as words (the cheapest use of each word: a 32-bit addition, eight rows a pass as
 * the generated scorers add them, in blocks of 16 that compilers vectorize) and returns a checksum, so the reads are
 * not removed. */
static uint32_t probe_rows(int k, int words)
{
    uint32_t acc[ROW_WORDS_F32];
    int n, j, u;
    for (j = 0; j < words; ++j) acc[j] = 0u;
    for (n = 0; n + 8 <= active_count[k]; n += 8) {
        const uint32_t *r[8];
        for (u = 0; u < 8; ++u) r[u] = &probe_table[(size_t)active_rows[k][n + u] * (size_t)words];
        {
            const uint32_t *r0 = r[0], *r1 = r[1], *r2 = r[2], *r3 = r[3], *r4 = r[4], *r5 = r[5], *r6 = r[6],
                           *r7 = r[7];
            for (j = 0; j + 16 <= words; j += 16)
                for (u = 0; u < 16; ++u)
                    acc[j + u] += r0[j + u] + r1[j + u] + r2[j + u] + r3[j + u] + r4[j + u] + r5[j + u] + r6[j + u]
                                  + r7[j + u];
            for (; j < words; ++j) acc[j] += r0[j] + r1[j] + r2[j] + r3[j] + r4[j] + r5[j] + r6[j] + r7[j];
        }
    }
    for (; n < active_count[k]; ++n) {
        const uint32_t *row = &probe_table[(size_t)active_rows[k][n] * (size_t)words];
        for (j = 0; j + 16 <= words; j += 16)
            for (u = 0; u < 16; ++u) acc[j + u] += row[j + u];
        for (; j < words; ++j) acc[j] += row[j];
    }
    return acc[0] ^ acc[words - 1];
}

/* ns per input of the probe for scorer s (1..3) over all inputs, best of ROUNDS. */
static double probe_ns(int s)
{
    static const uint8_t zero[BENCH784X500_PACKED_BYTES];
    volatile double sink = 0.0;
    double best_rows = 1e300, best_zero = 1e300;
    int r, k;
    for (r = 0; r < ROUNDS; ++r) {
        double t0 = now_ns(), t1;
        for (k = 0; k < INPUTS; ++k)
            sink += (double)probe_rows(k, s == 1 ? ROW_WORDS_F32 : s == 2 ? ROW_WORDS_I16 : ROW_WORDS_I8);
        t1 = now_ns();
        if (t1 - t0 < best_rows) best_rows = t1 - t0;
        t0 = now_ns();
        for (k = 0; k < INPUTS; ++k)
            sink += s == 1 ? (double)bench784x500_free_energy(zero) : s == 2 ? (double)bench_i16_free_energy(zero) : (double)bench_i8_free_energy(zero);
        t1 = now_ns();
        if (t1 - t0 < best_zero) best_zero = t1 - t0;
    }
    (void)sink;
    return (best_rows + best_zero) / INPUTS;
}

/* Runs scorer s over all inputs; fixed-point results are converted to nats after the timed loop. */
static void run(int s, const float (*dense_in)[V], const uint8_t (*packed_in)[BENCH784X500_PACKED_BYTES], double *out)
{
    static bench_i16_energy_t q16[INPUTS];
    static bench_i8_energy_t q8[INPUTS];
    int k;
    switch (s) {
    case 0: for (k = 0; k < INPUTS; ++k) out[k] = (double)dense_free_energy(dense_in[k]); break;
    case 1: for (k = 0; k < INPUTS; ++k) out[k] = (double)bench784x500_free_energy(packed_in[k]); break;
    case 2: for (k = 0; k < INPUTS; ++k) q16[k] = bench_i16_free_energy(packed_in[k]); break;
    default: for (k = 0; k < INPUTS; ++k) q8[k] = bench_i8_free_energy(packed_in[k]); break;
    }
    if (s == 2) for (k = 0; k < INPUTS; ++k) out[k] = (double)q16[k] / BENCH_I16_ENERGY_SCALE;
    if (s == 3) for (k = 0; k < INPUTS; ++k) out[k] = (double)q8[k] / BENCH_I8_ENERGY_SCALE;
}

int main(int argc, char **argv)
{
    static float dense_in[INPUTS][V];
    static uint8_t packed_in[INPUTS][BENCH784X500_PACKED_BYTES];
    static double out[SCORERS][INPUTS];
    double best[SCORERS], max_diff[SCORERS], active = 0.0;
    volatile double sink = 0.0;
    FILE *fp;
    int k, r, i, s;

    if (argc < 2 || (fp = fopen(argv[1], "rb")) == NULL) { fprintf(stderr, "usage: bench dense.bin\n"); return 2; }
    if (fread(b, sizeof b, 1, fp) != 1 || fread(c, sizeof c, 1, fp) != 1 || fread(wt, sizeof wt, 1, fp) != 1) { fprintf(stderr, "short dense.bin\n"); return 2; }
    fclose(fp);

    for (k = 0; k < INPUTS; ++k)
        for (i = 0; i < V; ++i) {
            int on = next_unit() < 0.13;
            dense_in[k][i] = on ? 1.0f : 0.0f;
            if (on) {
                packed_in[k][i >> 3] = (uint8_t)(packed_in[k][i >> 3] | (1u << (i & 7)));
                active += 1.0;
                active_rows[k][active_count[k]++] = (uint16_t)i;
            }
        }
    for (i = 0; i < V * ROW_WORDS_F32; ++i) probe_table[i] = (uint32_t)(next_unit() * 4294967295.0);

    for (s = 0; s < SCORERS; ++s) best[s] = 1e300;
    for (r = 0; r < ROUNDS; ++r)
        for (s = 0; s < SCORERS; ++s) {
            double t0 = now_ns(), t1;
            run(s, (const float (*)[V])dense_in, (const uint8_t (*)[BENCH784X500_PACKED_BYTES])packed_in, out[s]);
            t1 = now_ns();
            if (t1 - t0 < best[s]) best[s] = t1 - t0;
            for (k = 0; k < INPUTS; ++k) sink += out[s][k];
        }
    for (s = 1; s < SCORERS; ++s) {
        max_diff[s] = 0.0;
        for (k = 0; k < INPUTS; ++k) {
            double d = fabs(out[s][k] - out[0][k]);
            if (d > max_diff[s]) max_diff[s] = d;
        }
    }
    printf("inputs %d, active bits %.1f%%, best of %d rounds\n", INPUTS, 100.0 * active / ((double)INPUTS * V), ROUNDS);
    printf("dense %.0f ns/input\n", best[0] / INPUTS);
    for (s = 1; s < SCORERS; ++s)
        printf("%s %.0f ns/input ratio %.1fx max_abs_diff_vs_dense %.2e nats\n", names[s], best[s] / INPUTS, best[0] / best[s], max_diff[s]);
    for (s = 1; s < SCORERS; ++s) {
        double limit = probe_ns(s);
        printf("limit %s %.0f ns/input ratio %.1fx; generated at %.0f%% of the limit\n", names[s], limit, best[0] / INPUTS / limit,
               100.0 * limit / (best[s] / INPUTS));
    }
    printf("stated error bounds (nats): f32 %.3g, int16 %.3g, int8 %.3g\n", (double)BENCH784X500_ERROR_BOUND, (double)BENCH_I16_ERROR_BOUND, (double)BENCH_I8_ERROR_BOUND);
    printf("selftest failures: f32 %d, int16 %d, int8 %d\n", bench784x500_selftest(), bench_i16_selftest(), bench_i8_selftest());
    (void)sink;
    return 0;
}
