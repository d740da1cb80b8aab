/* The C interface (c/halfspin_c.h) driven from C99, compared bit for bit with the C++ Propagator
 * (c_reference.cpp) in every listed configuration, float and double, over an invented motion
 * with every kind of rejection; plus the interface's own argument errors and one check against
 * a fact of the trade. Prints each failure and "N passed, M failed"; exit status 1 on a failure.
 * Built on the host with gcc and clang and on the Cortex-M4F image (tests/target). */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "c_reference.h"
#include "halfspin_c.h"

/* The configurations the interface under test was built with (28: all; a build that selects fewer
 * with HALFSPIN_C_STEPPERS and friends says how many, and names one stepper it left out). */
#ifndef HALFSPIN_C_TEST_CONFIGURATIONS
#define HALFSPIN_C_TEST_CONFIGURATIONS 28
#endif

#define SAMPLE_COUNT 400
#define PERIOD 1e-3
#define TICK_PERIOD 1e-6
#define TICKS_PER_PERIOD 1000u

static halfspin_test_sample rate_samples[SAMPLE_COUNT];
static halfspin_test_sample delta_samples[SAMPLE_COUNT];
static int expected_status[SAMPLE_COUNT]; /* -1: accepted (ok or waiting), else the rejection */
static int statuses_c[SAMPLE_COUNT];
static int statuses_reference[SAMPLE_COUNT];
static unsigned passed;
static unsigned failed;

static void check(int condition, const char* what, const char* scalar, halfspin_configuration c) {
  if (condition) {
    ++passed;
    return;
  }
  ++failed;
  printf("FAILED: %s (%s, %s, renormalization %d, accumulation %d)\n", what, scalar,
         halfspin_stepper_name(c.stepper), (int)c.renormalization, (int)c.accumulation);
}

/* Invented motion (rad/s): omega(t) = (0.8 sin(a t), 0.5 cos(b t), 0.3 + 0.2 sin(c t)). */
static const double pi = 3.14159265358979323846;
static void motion_rate(double t, double out[3]) {
  out[0] = 0.8 * sin(2.0 * pi * 1.3 * t);
  out[1] = 0.5 * cos(2.0 * pi * 0.7 * t);
  out[2] = 0.3 + 0.2 * sin(2.0 * pi * 2.1 * t);
}
/* Its integral over [t0, t1] (rad), in closed form. */
static void motion_delta_angle(double t0, double t1, double out[3]) {
  const double a = 2.0 * pi * 1.3, b = 2.0 * pi * 0.7, c = 2.0 * pi * 2.1;
  out[0] = 0.8 * (cos(a * t0) - cos(a * t1)) / a;
  out[1] = 0.5 * (sin(b * t1) - sin(b * t0)) / b;
  out[2] = 0.3 * (t1 - t0) + 0.2 * (cos(c * t0) - cos(c * t1)) / c;
}

static void set_values(halfspin_test_sample* s, const double v[3], double dt) {
  int i;
  for (i = 0; i < 3; ++i) {
    s->value_d[i] = v[i];
    s->value_f[i] = (float)v[i];
  }
  s->dt_d = dt;
  s->dt_f = (float)dt;
}

static void make_samples(void) {
  int k;
  for (k = 0; k < SAMPLE_COUNT; ++k) {
    const double t1 = (k + 1) * PERIOD;
    double rate[3];
    double delta[3];
    motion_rate(t1, rate);
    motion_delta_angle(t1 - PERIOD, t1, delta);
    set_values(&rate_samples[k], rate, PERIOD);
    set_values(&delta_samples[k], delta, PERIOD);
    rate_samples[k].by_ticks = delta_samples[k].by_ticks =
        (k >= 151 && k < 200) || (k >= 330 && k < 360) || k == 300;
    rate_samples[k].ticks = delta_samples[k].ticks = TICKS_PER_PERIOD;
    expected_status[k] = -1;
  }
  /* The rejections, each of its own kind. */
  rate_samples[150].value_d[0] = delta_samples[150].value_d[0] = NAN;
  rate_samples[150].value_f[0] = delta_samples[150].value_f[0] = NAN;
  expected_status[150] = HALFSPIN_NON_FINITE;
  rate_samples[200].value_d[0] = 100.0; /* rad/s, above max_rate 35 */
  rate_samples[200].value_f[0] = 100.0f;
  delta_samples[200].value_d[0] = 100.0 * PERIOD;
  delta_samples[200].value_f[0] = (float)(100.0 * PERIOD);
  expected_status[200] = HALFSPIN_OVER_RANGE;
  rate_samples[251].dt_d = delta_samples[251].dt_d = -PERIOD;
  rate_samples[251].dt_f = delta_samples[251].dt_f = (float)-PERIOD;
  expected_status[251] = HALFSPIN_NON_POSITIVE_STEP;
  rate_samples[252].dt_d = delta_samples[252].dt_d = 0.05; /* a gap: max_step is 5 ms */
  rate_samples[252].dt_f = delta_samples[252].dt_f = 0.05f;
  expected_status[252] = HALFSPIN_STEP_TOO_LONG;
  rate_samples[300].ticks = delta_samples[300].ticks = 0;
  expected_status[300] = HALFSPIN_NON_POSITIVE_STEP;
  rate_samples[320].dt_d = delta_samples[320].dt_d = INFINITY;
  rate_samples[320].dt_f = delta_samples[320].dt_f = INFINITY;
  expected_status[320] = HALFSPIN_NON_FINITE;
}

static const halfspin_test_run run_with_ticks = {{0.9, 0.1, -0.3, 0.2}, 35.0, 5e-3, TICK_PERIOD};
static const halfspin_test_run run_without_ticks = {{1.0, 0.0, 0.0, 0.0}, 35.0, 5e-3, 0.0};

/* One scalar's checks; T the scalar, S the suffix (f or d), F the sample field suffix. */
#define DEFINE_SCALAR_CHECKS(T, S, F, NAME)                                                        \
  static halfspin_status push_##S(halfspin_propagator_##S* p, halfspin_input_kind kind,            \
                                  const halfspin_test_sample* s) {                                 \
    if (kind == HALFSPIN_INPUT_RATE) {                                                             \
      return s->by_ticks ? halfspin_push_rate_ticks_##S(p, s->value_##F, s->ticks)                 \
                         : halfspin_push_rate_##S(p, s->value_##F, s->dt_##F);                     \
    }                                                                                              \
    return s->by_ticks ? halfspin_push_delta_angle_ticks_##S(p, s->value_##F, s->ticks)            \
                       : halfspin_push_delta_angle_##S(p, s->value_##F, s->dt_##F);                \
  }                                                                                                \
  static void init_##S(halfspin_propagator_##S* p, halfspin_configuration c,                       \
                       const halfspin_test_run* run) {                                             \
    T initial[4];                                                                                  \
    int i;                                                                                         \
    for (i = 0; i < 4; ++i) {                                                                      \
      initial[i] = (T)run->initial[i];                                                             \
    }                                                                                              \
    memset(p, 0, sizeof *p);                                                                       \
    check(halfspin_init_##S(p, c, initial, (T)run->max_rate, (T)run->max_step,                     \
                            (T)run->tick_period) == HALFSPIN_OK,                                   \
          "init", NAME, c);                                                                        \
  }                                                                                                \
  /* Runs the samples through the interface and the reference; compares everything. */             \
  static void compare_run_##S(halfspin_configuration c, const halfspin_test_run* run,              \
                              const halfspin_test_sample* samples, size_t count, int strict) {     \
    halfspin_propagator_##S p;                                                                     \
    halfspin_test_result mine, reference;                                                          \
    const halfspin_input_kind kind = halfspin_stepper_input(c.stepper);                            \
    size_t k;                                                                                      \
    int near;                                                                                      \
    memset(&mine, 0, sizeof mine);                                                                 \
    memset(&reference, 0, sizeof reference);                                                       \
    init_##S(&p, c, run);                                                                          \
    for (k = 0; k < count; ++k) {                                                                  \
      T before[4], after[4];                                                                       \
      halfspin_attitude_##S(&p, before);                                                           \
      statuses_c[k] = (int)push_##S(&p, kind, &samples[k]);                                        \
      halfspin_attitude_##S(&p, after);                                                            \
      if (strict && expected_status[k] != -1) {                                                    \
        check(statuses_c[k] == expected_status[k], "the rejection's status", NAME, c);             \
        check(memcmp(before, after, sizeof before) == 0, "a rejection leaves the attitude", NAME,  \
              c);                                                                                  \
      } else if (strict) {                                                                         \
        check(!halfspin_is_rejection((halfspin_status)statuses_c[k]), "a good sample accepted",    \
              NAME, c);                                                                            \
      }                                                                                            \
    }                                                                                              \
    check(halfspin_attitude_##S(&p, mine.attitude_##F) == HALFSPIN_OK, "attitude", NAME, c);       \
    check(halfspin_euler_angles_##S(&p, HALFSPIN_EULER_ZYX, mine.zyx_##F,                          \
                                    &mine.zyx_near_singular) == HALFSPIN_OK,                       \
          "euler zyx", NAME, c);                                                                   \
    check(halfspin_euler_angles_##S(&p, HALFSPIN_EULER_ZXZ, mine.zxz_##F,                          \
                                    &mine.zxz_near_singular) == HALFSPIN_OK,                       \
          "euler zxz", NAME, c);                                                                   \
    check(halfspin_elapsed_seconds_##S(&p, &mine.elapsed_##F) == HALFSPIN_OK, "elapsed", NAME, c); \
    check(halfspin_counters_##S(&p, &mine.counters) == HALFSPIN_OK, "counters", NAME, c);          \
    check(halfspin_reference_run_##S(c, run, samples, count, statuses_reference, &reference) == 1, \
          "the reference knows the configuration", NAME, c);                                       \
    check(memcmp(statuses_c, statuses_reference, count * sizeof statuses_c[0]) == 0,               \
          "every status as the C++ propagator's", NAME, c);                                        \
    check(memcmp(mine.attitude_##F, reference.attitude_##F, sizeof mine.attitude_##F) == 0,        \
          "attitude bit-identical to the C++ propagator's", NAME, c);                              \
    check(memcmp(mine.zyx_##F, reference.zyx_##F, sizeof mine.zyx_##F) == 0 &&                     \
              mine.zyx_near_singular == reference.zyx_near_singular,                               \
          "zyx Euler angles bit-identical", NAME, c);                                              \
    check(memcmp(mine.zxz_##F, reference.zxz_##F, sizeof mine.zxz_##F) == 0 &&                     \
              mine.zxz_near_singular == reference.zxz_near_singular,                               \
          "zxz Euler angles bit-identical", NAME, c);                                              \
    check(memcmp(&mine.elapsed_##F, &reference.elapsed_##F, sizeof mine.elapsed_##F) == 0,         \
          "elapsed seconds bit-identical", NAME, c);                                               \
    check(memcmp(&mine.counters, &reference.counters, sizeof mine.counters) == 0,                  \
          "counters identical", NAME, c);                                                          \
    check(halfspin_euler_angles_##S(&p, (halfspin_euler_sequence)12, mine.zyx_##F, &near) ==       \
              HALFSPIN_INVALID_ARGUMENT,                                                           \
          "an unknown Euler sequence is refused", NAME, c);                                        \
  }                                                                                                \
  /* The interface's own refusals change nothing and count nothing. */                             \
  static void check_refusals_##S(halfspin_configuration c, const halfspin_test_sample* samples) {  \
    halfspin_propagator_##S p, zeroed;                                                             \
    halfspin_counters before, after;                                                               \
    T q0[4], q1[4];                                                                                \
    const halfspin_input_kind kind = halfspin_stepper_input(c.stepper);                            \
    const T nan_attitude[4] = {(T)NAN, (T)0, (T)0, (T)0};                                          \
    const T zero_attitude[4] = {(T)0, (T)0, (T)0, (T)0};                                           \
    init_##S(&p, c, &run_with_ticks);                                                              \
    push_##S(&p, kind, &samples[0]);                                                               \
    halfspin_counters_##S(&p, &before);                                                            \
    halfspin_attitude_##S(&p, q0);                                                                 \
    check((kind == HALFSPIN_INPUT_RATE                                                             \
               ? halfspin_push_delta_angle_##S(&p, samples[1].value_##F, samples[1].dt_##F)        \
               : halfspin_push_rate_##S(&p, samples[1].value_##F, samples[1].dt_##F)) ==           \
              HALFSPIN_WRONG_INPUT_KIND,                                                           \
          "the other input kind is refused", NAME, c);                                             \
    check(halfspin_push_rate_##S(&p, NULL, samples[1].dt_##F) == HALFSPIN_INVALID_ARGUMENT,        \
          "a null sample is refused", NAME, c);                                                    \
    check(halfspin_reset_##S(&p, nan_attitude) == HALFSPIN_INVALID_ARGUMENT,                       \
          "reset to NaN is refused", NAME, c);                                                     \
    halfspin_counters_##S(&p, &after);                                                             \
    halfspin_attitude_##S(&p, q1);                                                                 \
    check(memcmp(&before, &after, sizeof before) == 0 && memcmp(q0, q1, sizeof q0) == 0,           \
          "refusals change nothing", NAME, c);                                                     \
    memset(&zeroed, 0, sizeof zeroed);                                                             \
    check(halfspin_push_rate_##S(&zeroed, samples[0].value_##F, samples[0].dt_##F) ==              \
              HALFSPIN_NOT_INITIALIZED,                                                            \
          "zeroed storage is not initialized", NAME, c);                                           \
    check(halfspin_attitude_##S(NULL, q1) == HALFSPIN_INVALID_ARGUMENT, "null propagator", NAME,   \
          c);                                                                                      \
    check(halfspin_init_##S(&zeroed, c, zero_attitude, (T)35, (T)5e-3, (T)0) ==                    \
              HALFSPIN_INVALID_ARGUMENT,                                                           \
          "a zero initial attitude is refused", NAME, c);                                          \
    /* Ticks without a tick period: rejected, counted, attitude untouched. */                      \
    init_##S(&p, c, &run_without_ticks);                                                           \
    check(push_##S(&p, kind, &samples[151]) == HALFSPIN_NO_TICK_PERIOD,                            \
          "ticks without a tick period", NAME, c);                                                 \
    halfspin_counters_##S(&p, &after);                                                             \
    halfspin_attitude_##S(&p, q1);                                                                 \
    check(after.rejected_no_tick_period == 1 && q1[0] == (T)1 && q1[1] == (T)0 && q1[2] == (T)0 && \
              q1[3] == (T)0,                                                                       \
          "no_tick_period counted, attitude unchanged", NAME, c);                                  \
  }                                                                                                \
  /* Rotation at a constant rate about one axis turns by rate x time (common practice, no          \
   * source): 1 rad/s about body x from identity reads as that roll in zyx, yaw and pitch 0. */    \
  static void check_constant_rate_##S(halfspin_configuration c) {                                  \
    halfspin_propagator_##S p;                                                                     \
    halfspin_test_sample s;                                                                        \
    const double unit_x[3] = {1.0, 0.0, 0.0};                                                      \
    const double per_period[3] = {PERIOD, 0.0, 0.0};                                               \
    const halfspin_input_kind kind = halfspin_stepper_input(c.stepper);                            \
    T angles[3], elapsed;                                                                          \
    int k, near;                                                                                   \
    memset(&s, 0, sizeof s);                                                                       \
    set_values(&s, kind == HALFSPIN_INPUT_RATE ? unit_x : per_period, PERIOD);                     \
    init_##S(&p, c, &run_without_ticks);                                                           \
    for (k = 0; k < 1000; ++k) {                                                                   \
      push_##S(&p, kind, &s);                                                                      \
    }                                                                                              \
    halfspin_euler_angles_##S(&p, HALFSPIN_EULER_ZYX, angles, &near);                              \
    halfspin_elapsed_seconds_##S(&p, &elapsed);                                                    \
    check(elapsed > (T)0.99 && fabs((double)(angles[2] - elapsed)) < 1e-4 &&                       \
              fabs((double)angles[0]) < 1e-5 && fabs((double)angles[1]) < 1e-5 && near == 0,       \
          "constant rate about x: roll = rate x elapsed time", NAME, c);                           \
  }

DEFINE_SCALAR_CHECKS(float, f, f, "float")
DEFINE_SCALAR_CHECKS(double, d, d, "double")

static void check_configuration(halfspin_configuration c) {
  const halfspin_test_sample* samples =
      halfspin_stepper_input(c.stepper) == HALFSPIN_INPUT_RATE ? rate_samples : delta_samples;
  compare_run_f(c, &run_with_ticks, samples, SAMPLE_COUNT, 1);
  compare_run_d(c, &run_with_ticks, samples, SAMPLE_COUNT, 1);
  /* Ticks pushed without a tick period, compared with the C++ propagator too. */
  compare_run_f(c, &run_without_ticks, samples + 151, 10, 0);
  compare_run_d(c, &run_without_ticks, samples + 151, 10, 0);
  check_refusals_f(c, samples);
  check_refusals_d(c, samples);
  check_constant_rate_f(c);
  check_constant_rate_d(c);
}

int main(void) {
  size_t i;
  const size_t count = halfspin_configuration_count();
  halfspin_configuration c;
  halfspin_propagator_f pf;
  const float identity_f[4] = {1.0f, 0.0f, 0.0f, 0.0f};

  make_samples();
  c.stepper = HALFSPIN_CONING_2_SAMPLE;
  c.renormalization = HALFSPIN_RENORMALIZATION_FIRST_ORDER;
  c.accumulation = HALFSPIN_ACCUMULATION_PLAIN;
  check(count == HALFSPIN_C_TEST_CONFIGURATIONS,
        "the configurations built (all: 7 steppers x 2 renormalizations x 2 accumulations)", "any",
        c);
  for (i = 0; i < count; ++i) {
    check(halfspin_configuration_at(i, &c) == HALFSPIN_OK, "configuration_at", "any", c);
    check_configuration(c);
    if (c.accumulation == HALFSPIN_ACCUMULATION_COMPENSATED) {
      halfspin_configuration resolved;
      c.accumulation = HALFSPIN_ACCUMULATION_DEFAULT; /* the library's default per scalar */
      check_configuration(c);
      memset(&pf, 0, sizeof pf);
      halfspin_init_f(&pf, c, identity_f, 35.0f, 5e-3f, 0.0f);
      halfspin_configuration_f(&pf, &resolved);
      check(resolved.accumulation == HALFSPIN_ACCUMULATION_COMPENSATED,
            "float's default accumulation is the compensated one", "float", c);
    }
  }
  check(halfspin_configuration_at(count, &c) == HALFSPIN_INVALID_ARGUMENT,
        "configuration_at past the end", "any", c);

  /* Configurations that are not listed are refused, and leave the storage as it was. */
  memset(&pf, 0, sizeof pf);
  c.stepper = (halfspin_stepper)3; /* a catalogued stepper the interface does not list */
  c.renormalization = HALFSPIN_RENORMALIZATION_FIRST_ORDER;
  c.accumulation = HALFSPIN_ACCUMULATION_PLAIN;
  check(
      halfspin_init_f(&pf, c, identity_f, 35.0f, 5e-3f, 0.0f) == HALFSPIN_UNSUPPORTED_CONFIGURATION,
      "an unlisted stepper is refused", "float", c);
#ifdef HALFSPIN_C_TEST_EXCLUDED_STEPPER
  c.stepper = HALFSPIN_C_TEST_EXCLUDED_STEPPER; /* listed, but left out of this build */
  c.accumulation = HALFSPIN_ACCUMULATION_COMPENSATED;
  check(
      halfspin_init_f(&pf, c, identity_f, 35.0f, 5e-3f, 0.0f) == HALFSPIN_UNSUPPORTED_CONFIGURATION,
      "a stepper the build left out is refused", "float", c);
  c.accumulation = HALFSPIN_ACCUMULATION_PLAIN;
#endif
  c.stepper = HALFSPIN_CONING_2_SAMPLE;
  c.renormalization = (halfspin_renormalization)7;
  check(
      halfspin_init_f(&pf, c, identity_f, 35.0f, 5e-3f, 0.0f) == HALFSPIN_UNSUPPORTED_CONFIGURATION,
      "an unknown renormalization is refused", "float", c);
  c.renormalization = HALFSPIN_RENORMALIZATION_EXACT;
  c.accumulation = (halfspin_accumulation)9;
  check(
      halfspin_init_f(&pf, c, identity_f, 35.0f, 5e-3f, 0.0f) == HALFSPIN_UNSUPPORTED_CONFIGURATION,
      "an unknown accumulation is refused", "float", c);
  check(halfspin_push_delta_angle_f(&pf, identity_f, 1e-3f) == HALFSPIN_NOT_INITIALIZED,
        "refused init leaves the storage uninitialized", "float", c);

  check(strcmp(halfspin_status_name(HALFSPIN_NO_TICK_PERIOD), "no_tick_period") == 0 &&
            strcmp(halfspin_status_name(HALFSPIN_WRONG_INPUT_KIND), "wrong_input_kind") == 0 &&
            strcmp(halfspin_status_name((halfspin_status)99), "unknown") == 0,
        "status names", "any", c);
  check(strcmp(halfspin_stepper_name(HALFSPIN_MAGNUS_4), "magnus_4") == 0 &&
            halfspin_stepper_input(HALFSPIN_MAGNUS_4) == HALFSPIN_INPUT_RATE &&
            halfspin_stepper_input(HALFSPIN_CONING_4_SAMPLE) == HALFSPIN_INPUT_DELTA_ANGLE &&
            halfspin_stepper_input((halfspin_stepper)3) == HALFSPIN_INPUT_UNKNOWN,
        "stepper names and input kinds", "any", c);

  printf("c_interface: %u passed, %u failed\n", passed, failed);
  return failed == 0 ? 0 : 1;
}
