/* The C++ side of the C interface test: runs samples through the C++ Propagator directly (no C
 * interface code), so the C program can compare the two bit for bit. C99. */
#ifndef HALFSPIN_C_REFERENCE_H
#define HALFSPIN_C_REFERENCE_H

#include <stddef.h>
#include <stdint.h>

#include "halfspin_c.h"

#ifdef __cplusplus
extern "C" {
#endif

/* One pushed sample in both scalars (the float values are the double ones rounded once, by the
 * test, before either side sees them). by_ticks: the interval is `ticks`, else dt_* seconds. */
typedef struct halfspin_test_sample {
  double value_d[3];
  double dt_d;
  float value_f[3];
  float dt_f;
  uint32_t ticks;
  int by_ticks;
} halfspin_test_sample;

typedef struct halfspin_test_run {
  double initial[4]; /* the float run uses (float)initial[i] */
  double max_rate;
  double max_step;
  double tick_period;
} halfspin_test_run;

/* What one run ends with, in one scalar (the float run fills the _f fields, the double run _d). */
typedef struct halfspin_test_result {
  float attitude_f[4];
  float zyx_f[3];
  float zxz_f[3];
  float elapsed_f;
  double attitude_d[4];
  double zyx_d[3];
  double zxz_d[3];
  double elapsed_d;
  int zyx_near_singular;
  int zxz_near_singular;
  halfspin_counters counters;
} halfspin_test_result;

/* Runs `samples` through Propagator<float or double, Stepper, Renormalization, Accumulation> as
 * `configuration` names it (DEFAULT: the library's DefaultAccumulation), pushing rates or
 * delta-angles as the stepper takes them; statuses[i] gets each push's status. Returns 1, or 0
 * when the reference does not know the configuration. */
int halfspin_reference_run_f(halfspin_configuration configuration, const halfspin_test_run* run,
                             const halfspin_test_sample* samples, size_t count, int* statuses,
                             halfspin_test_result* out);
int halfspin_reference_run_d(halfspin_configuration configuration, const halfspin_test_run* run,
                             const halfspin_test_sample* samples, size_t count, int* statuses,
                             halfspin_test_result* out);

#ifdef __cplusplus
}
#endif

#endif
