/* 784 x 500 benchmark model, 13% of bits on (the inputs of bench/generated-c/bench.c: same generator and seed):
 * instructions per input of the generated scorers, or (with -DDENSE, a separate image: the tables do not all fit
 * the board's 4 MiB) of the hand-written dense float loop. */
#include <stdio.h>
#include "count.h"
#define V 784
#define H 500
#define INPUTS 8

static uint64_t rng_state = 0x243F6A8885A308D3u;
static double next_unit(void) /* xorshift64*, as in bench.c */
{
    rng_state ^= rng_state >> 12;
    rng_state ^= rng_state << 25;
    rng_state ^= rng_state >> 27;
    return (double)((rng_state * 2685821657736338717u) >> 11) / 9007199254740992.0;
}

#ifdef DENSE
#include <math.h>
#include "dense_model.h" /* b[V], c[H], wt[H][V] as float */
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
#else
#include "bench784x500.h"
#include "bench_i16.h"
#include "bench_i8.h"
#endif

int main(void)
{
    static float dense_in[INPUTS][V];
    static uint8_t packed_in[INPUTS][(V + 7) / 8];
    unsigned long ticks[3] = { 0, 0, 0 };
    volatile float sink_f = 0.0f;
    volatile long sink_i = 0;
    uint32_t t0, t1;
    int k, i;
    for (k = 0; k < INPUTS; ++k)
        for (i = 0; i < V; ++i) {
            int on = next_unit() < 0.13;
            dense_in[k][i] = on ? 1.0f : 0.0f;
            if (on) packed_in[k][i >> 3] = (uint8_t)(packed_in[k][i >> 3] | (1u << (i & 7)));
        }
    systick_start();
    for (k = 0; k < INPUTS; ++k) {
#ifdef DENSE
        t0 = SYST_CVR; sink_f += dense_free_energy(dense_in[k]); t1 = SYST_CVR; ticks[0] += ticks_between(t0, t1);
#else
        t0 = SYST_CVR; sink_f += bench784x500_free_energy(packed_in[k]); t1 = SYST_CVR; ticks[0] += ticks_between(t0, t1);
        t0 = SYST_CVR; sink_i += bench_i16_free_energy(packed_in[k]); t1 = SYST_CVR; ticks[1] += ticks_between(t0, t1);
        t0 = SYST_CVR; sink_i += bench_i8_free_energy(packed_in[k]); t1 = SYST_CVR; ticks[2] += ticks_between(t0, t1);
#endif
    }
#ifdef DENSE
    printf("784x500, %d inputs, instructions per input: dense %lu\n", INPUTS, ticks[0] * INSTRUCTIONS_PER_TICK / INPUTS);
#else
    printf("784x500, %d inputs, instructions per input: f32 %lu\nint16 %lu\nint8 %lu\n", INPUTS,
           ticks[0] * INSTRUCTIONS_PER_TICK / INPUTS, ticks[1] * INSTRUCTIONS_PER_TICK / INPUTS, ticks[2] * INSTRUCTIONS_PER_TICK / INPUTS);
    printf("selftest failures: %d %d %d\n", bench784x500_selftest(), bench_i16_selftest(), bench_i8_selftest());
#endif
    (void)dense_in;
    (void)sink_i;
    return 0;
}
