/* Reset and vector table for the qemu MPS2 boards. The reset handler enables the FPU (on the
 * Cortex-M4F build) before any floating-point instruction can run, zeroes .bss, runs static
 * constructors, opens the semihosting console, calls main and exits with its status through
 * semihosting, which qemu returns as its own exit code. */
#include <stdint.h>
#include <stdlib.h>

extern int main(void);
extern void initialise_monitor_handles(void);
extern void __libc_init_array(void);
extern uint32_t __bss_start__, __bss_end__, __stack_top;

void halfspin_reset_handler(void);
/* Linked with -nostartfiles (this file is the startup code): newlib's __libc_init_array and
 * __libc_fini_array still call the crti/crtn hooks, which have nothing to do here. */
void _init(void) {}
void _fini(void) {}
static void halfspin_fault_handler(void) { exit(70); }
/* The system timer's handler: an application defines SysTick_Handler to use it (the firmware
 * example's simulated IMU interrupt); without one, a SysTick exception is a fault. */
void SysTick_Handler(void) __attribute__((weak, alias("halfspin_fault_handler")));

__attribute__((section(".vectors"), used))
const void* const halfspin_vectors[16] = {&__stack_top,
                                          (const void*)halfspin_reset_handler,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)halfspin_fault_handler,
                                          0,
                                          0,
                                          0,
                                          0,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)halfspin_fault_handler,
                                          0,
                                          (const void*)halfspin_fault_handler,
                                          (const void*)SysTick_Handler};

void halfspin_reset_handler(void) {
#if defined(__ARM_FP)
  /* CPACR (0xE000ED88): full access to coprocessors 10 and 11 (bits 20–23). */
  *(volatile uint32_t*)0xE000ED88u |= 0xFu << 20;
  __asm volatile("dsb\n isb" ::: "memory");
#endif
  for (uint32_t* p = &__bss_start__; p < &__bss_end__; ++p) {
    *p = 0;
  }
  initialise_monitor_handles();
  __libc_init_array();
  exit(main());
}
