/* Instruction counting on qemu with -icount shift=0: every instruction takes 1 ns of virtual time and the SysTick
 * timer runs from the board's 25 MHz clock, so one tick is 40 instructions, the same on every run. */
#include <stdint.h>
#define SYST_CSR (*(volatile uint32_t *)0xE000E010u)
#define SYST_RVR (*(volatile uint32_t *)0xE000E014u)
#define SYST_CVR (*(volatile uint32_t *)0xE000E018u)
#define INSTRUCTIONS_PER_TICK 40ul
static void systick_start(void) { SYST_RVR = 0xFFFFFFu; SYST_CVR = 0u; SYST_CSR = 5u; /* processor clock, no interrupt */ }
/* Ticks between two readings of the down-counter (calls shorter than 2^24 ticks). */
static unsigned long ticks_between(uint32_t before, uint32_t after) { return (unsigned long)((before - after) & 0xFFFFFFu); }
