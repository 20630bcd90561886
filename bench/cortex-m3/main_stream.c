/* Streamed scoring on the emulated Cortex-M3: instructions per full score, per NAME_stream_reset, per
 * NAME_stream_flip and per NAME_stream_free_energy (read), over pseudo-random inputs and walks of random flips.
 * Built once per scorer: -DSCORER=name -DUPPER=NAME (the macro prefix) -DHEADER='"name.h"' -DINPUTS=n -DDENSITY=p. */
#include <stdio.h>
#include "count.h"
#include HEADER

#define CAT2(a, b) a##b
#define CAT(a, b) CAT2(a, b)
#define FN(x) CAT(SCORER, x)
#define MACRO(x) CAT(UPPER, x)
#define FLIPS 256

static uint32_t rng = 0x9E3779B9u;
static uint32_t next(void) /* xorshift32 (13, 17, 5) */
{
    rng ^= rng << 13;
    rng ^= rng >> 17;
    rng ^= rng << 5;
    return rng;
}

static FN(_stream_t) stream;

int main(void)
{
    static uint8_t packed[MACRO(_PACKED_BYTES)];
    unsigned long full = 0, reset = 0, flip = 0, read = 0;
    volatile double sink = 0.0;
    uint32_t t0, t1;
    int k, n, i;
    systick_start();
    for (k = 0; k < INPUTS; ++k) {
        for (i = 0; i < MACRO(_PACKED_BYTES); ++i) packed[i] = 0u;
        for (i = 0; i < MACRO(_VISIBLE); ++i)
            if ((next() % 1000u) < (uint32_t)(DENSITY * 1000.0)) packed[i >> 3] = (uint8_t)(packed[i >> 3] | (1u << (i & 7)));
        t0 = SYST_CVR; sink += (double)FN(_free_energy)(packed); t1 = SYST_CVR; full += ticks_between(t0, t1);
        t0 = SYST_CVR; FN(_stream_reset)(&stream, packed); t1 = SYST_CVR; reset += ticks_between(t0, t1);
        for (n = 0; n < FLIPS; ++n) {
            uint16_t unit = (uint16_t)(next() % (uint32_t)MACRO(_VISIBLE));
            t0 = SYST_CVR; FN(_stream_flip)(&stream, unit); t1 = SYST_CVR; flip += ticks_between(t0, t1);
            t0 = SYST_CVR; sink += (double)FN(_stream_free_energy)(&stream); t1 = SYST_CVR; read += ticks_between(t0, t1);
        }
    }
    printf("%s: %d inputs x %d flips, instructions per full score %lu, reset %lu, flip %lu, read %lu\n",
           HEADER, INPUTS, FLIPS, full * INSTRUCTIONS_PER_TICK / INPUTS, reset * INSTRUCTIONS_PER_TICK / INPUTS,
           flip * INSTRUCTIONS_PER_TICK / (INPUTS * FLIPS), read * INSTRUCTIONS_PER_TICK / (INPUTS * FLIPS));
    return 0;
}
