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
void SysTick_Handler(void);
/* Linked with -nostartfiles (this file is the startup code): newlib's __libc_init_array and
 * __libc_fini_array still call the crti/crtn hooks, which have nothing to do here. */
void _init(void);
void _fini(void);
void _init(void) {}
void _fini(void) {}
static void halfspin_fault_handler(void) { exit(70); }
/* The system timer's handler: an application defines SysTick_Handler to use it (the firmware
 * example's simulated IMU interrupt); without one, a SysTick exception is a fault. */
void SysTick_Handler(void) __attribute__((weak, alias("halfspin_fault_handler")));

/* One vector: the initial stack pointer (a data address) or a handler. A union keeps the table
 * free of function-to-object pointer casts, which ISO C does not allow (-Wpedantic), so that
 * this file builds without a warning under a consumer's strict C warning set. */
typedef union {
  void (*handler)(void);
  const uint32_t* stack_top;
} halfspin_vector;

__attribute__((section(".vectors"), used))
const halfspin_vector halfspin_vectors[16] = {{.stack_top = &__stack_top},
                                              {.handler = halfspin_reset_handler},
                                              {.handler = halfspin_fault_handler}, /* NMI */
                                              {.handler = halfspin_fault_handler}, /* HardFault */
                                              {.handler = halfspin_fault_handler}, /* MemManage */
                                              {.handler = halfspin_fault_handler}, /* BusFault */
                                              {.handler = halfspin_fault_handler}, /* UsageFault */
                                              {0},
                                              {0},
                                              {0},
                                              {0},
                                              {.handler = halfspin_fault_handler}, /* SVCall */
                                              {.handler = halfspin_fault_handler}, /* DebugMon */
                                              {0},
                                              {.handler = halfspin_fault_handler}, /* PendSV */
                                              {.handler = SysTick_Handler}};

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
