/* Demo model (56 x 16): instructions per input of the generated f32 scorer (soft float: the M3 has no FPU) and the
 * fixed-point scorers with int16 and int8 weights, over the first 200 normal and 50 faulty demo rows. */
#include <stdio.h>
#include "count.h"
#include "demo_f32.h"
#include "demo_i16.h"
#include "demo_i8.h"
#include "inputs.h" /* INPUTS, inputs[INPUTS][DEMO_F32_PACKED_BYTES] */

int main(void)
{
    unsigned long ticks[3] = { 0, 0, 0 };
    volatile float sink_f = 0.0f;
    volatile long sink_i = 0;
    uint32_t t0, t1;
    int k;
    systick_start();
    for (k = 0; k < INPUTS; ++k) {
        t0 = SYST_CVR; sink_f += demo_f32_free_energy(inputs[k]); t1 = SYST_CVR; ticks[0] += ticks_between(t0, t1);
        t0 = SYST_CVR; sink_i += demo_i16_free_energy(inputs[k]); t1 = SYST_CVR; ticks[1] += ticks_between(t0, t1);
        t0 = SYST_CVR; sink_i += demo_i8_free_energy(inputs[k]); t1 = SYST_CVR; ticks[2] += ticks_between(t0, t1);
    }
    printf("demo 56x16, %d inputs, instructions per input (resolution 40 / %d):\n", INPUTS, INPUTS);
    printf("f32 %lu\nint16 %lu\nint8 %lu\n", ticks[0] * INSTRUCTIONS_PER_TICK / INPUTS,
           ticks[1] * INSTRUCTIONS_PER_TICK / INPUTS, ticks[2] * INSTRUCTIONS_PER_TICK / INPUTS);
    printf("selftest failures: %d %d %d\n", demo_f32_selftest(), demo_i16_selftest(), demo_i8_selftest());
    return 0;
}
