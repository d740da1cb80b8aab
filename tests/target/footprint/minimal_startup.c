/* A minimal reset for the footprint images on the qemu MPS2 boards. The board's startup file
 * (cmake/boards/mps2/startup.c) opens the semihosting console and leaves through newlib's exit(),
 * which links newlib's stdio and with it malloc/free (measured: _malloc_r, _free_r and the
 * 1 KB malloc arena state in every image that uses it). A footprint image must show what the
 * halfspin code needs and nothing else, and the heap check must be meaningful on it, so this
 * reset does only what a firmware reset does: FPU on, .bss zeroed, constructors run, main
 * called. The exit status goes straight to the debugger with the semihosting
 * SYS_EXIT_EXTENDED call (no newlib), which qemu returns as its exit code. */
#include <stdint.h>

extern int main(void);
extern uint32_t __bss_start__, __bss_end__, __stack_top;
typedef void (*halfspin_init_function)(void);
extern halfspin_init_function __init_array_start[], __init_array_end[];

void halfspin_reset_handler(void);

/* Semihosting SYS_EXIT_EXTENDED (0x20): {ADP_Stopped_ApplicationExit, status}. */
__attribute__((noreturn)) static void halfspin_semihosting_exit(int status) {
  volatile uint32_t block[2] = {0x20026u, (uint32_t)status};
  register uint32_t r0 __asm__("r0") = 0x20u;
  register volatile uint32_t* r1 __asm__("r1") = block;
  __asm__ volatile("bkpt 0xab" : : "r"(r0), "r"(r1) : "memory");
  for (;;) {
  }
}

static void halfspin_fault_handler(void) { halfspin_semihosting_exit(70); }

typedef void (*halfspin_vector)(void);
__attribute__((section(".vectors"), used))
const halfspin_vector halfspin_vectors[16] = {(halfspin_vector)(uintptr_t)&__stack_top,
                                              halfspin_reset_handler,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler,
                                              0,
                                              0,
                                              0,
                                              0,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler,
                                              0,
                                              halfspin_fault_handler,
                                              halfspin_fault_handler};

void halfspin_reset_handler(void) {
#if defined(__ARM_FP)
  /* CPACR (0xE000ED88): full access to coprocessors 10 and 11 (bits 20-23). */
  *(volatile uint32_t*)0xE000ED88u |= 0xFu << 20;
  __asm__ volatile("dsb\n isb" ::: "memory");
#endif
  for (uint32_t* p = &__bss_start__; p < &__bss_end__; ++p) {
    *p = 0;
  }
  for (halfspin_init_function* f = __init_array_start; f < __init_array_end; ++f) {
    (*f)();
  }
  halfspin_semihosting_exit(main());
}
