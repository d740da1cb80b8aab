/* A downstream C99 program using the installed C interface (halfspin::c, compiled by the consumer
 * from the installed source). 1 rad/s about body x for 1 s at 1 kHz in delta-angles, with the
 * interval as timer ticks: the zyx roll must be 1 rad (rotation about a fixed axis at constant
 * rate: angle = rate x time; common practice, no source). With --expect-opposite-sense it expects
 * -1 rad, so it must exit non-zero: proof that the check can fail. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "halfspin_c.h"

int main(int argc, char** argv) {
  static halfspin_propagator_f attitude; /* static storage: zeroed before init */
  const float identity[4] = {1.0f, 0.0f, 0.0f, 0.0f};
  const float delta_angle[3] = {1e-3f, 0.0f, 0.0f};
  const double want = argc > 1 && strcmp(argv[1], "--expect-opposite-sense") == 0 ? -1.0 : 1.0;
  halfspin_configuration configuration;
  halfspin_counters counters;
  float angles[3];
  int k, near_singular, ok;

  configuration.stepper = HALFSPIN_CONING_2_SAMPLE;
  configuration.renormalization = HALFSPIN_RENORMALIZATION_FIRST_ORDER;
  configuration.accumulation = HALFSPIN_ACCUMULATION_DEFAULT;
  if (halfspin_init_f(&attitude, configuration, identity, 35.0f, 5e-3f, 1e-6f) != HALFSPIN_OK) {
    printf("init failed\n");
    return 1;
  }
  for (k = 0; k < 1000; ++k) {
    const halfspin_status s = halfspin_push_delta_angle_ticks_f(&attitude, delta_angle, 1000u);
    if (halfspin_is_rejection(s)) {
      printf("sample %d rejected: %s\n", k, halfspin_status_name(s));
      return 1;
    }
  }
  halfspin_euler_angles_f(&attitude, HALFSPIN_EULER_ZYX, angles, &near_singular);
  halfspin_counters_f(&attitude, &counters);
  ok = fabs((double)angles[2] - want) < 1e-4 && fabs((double)angles[0]) < 1e-6 &&
       fabs((double)angles[1]) < 1e-6 && counters.steps == 500 &&
       counters.elapsed_ticks == 1000000u;
  printf("C interface: roll %.6f rad after %lu steps, want %.1f: %s\n", (double)angles[2],
         (unsigned long)counters.steps, want, ok ? "ok" : "WRONG");
  return ok ? 0 : 1;
}
