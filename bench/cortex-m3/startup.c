/* Vector table and reset handler for the emulated Cortex-M3: the reset handler enters newlib's semihosting start-up
 * (_start from rdimon.specs), which zeroes .bss, calls main and passes its return value to the host. A fault ends
 * qemu with status 99 instead of hanging. */
#include <stdint.h>
extern void _start(void);
extern uint32_t __stack_top;
void reset_handler(void);
void reset_handler(void) { _start(); for (;;) {} }
static void fault(void)
{
    /* semihosting SYS_EXIT_EXTENDED (0x20) with { ADP_Stopped_ApplicationExit, 99 } */
    static const uint32_t block[2] = { 0x20026u, 99u };
    __asm__ volatile("mov r0, #0x20\n mov r1, %0\n bkpt 0xAB" : : "r"(block) : "r0", "r1", "memory");
    for (;;) {}
}
__attribute__((section(".vectors"), used)) static const void *const vectors[16] = {
    &__stack_top, (const void *)reset_handler, (const void *)fault, (const void *)fault, (const void *)fault,
    (const void *)fault, (const void *)fault };
