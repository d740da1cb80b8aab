// The C++ reference of the C interface test: the same samples through the C++ Propagator, called
// directly (its own mapping from the C enums to types, written apart from c/halfspin_c.cpp's
// table), so that the C program compares the interface against the library bit for bit.

#include "c_reference.h"

#include <cstddef>
#include <cstdint>

#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;

// Where a sample's values and a result's fields are for scalar T.
template <class T>
struct Slots;
template <>
struct Slots<float> {
  static const float* value(const halfspin_test_sample& s) { return s.value_f; }
  static float dt(const halfspin_test_sample& s) { return s.dt_f; }
  static float* attitude(halfspin_test_result* r) { return r->attitude_f; }
  static float* zyx(halfspin_test_result* r) { return r->zyx_f; }
  static float* zxz(halfspin_test_result* r) { return r->zxz_f; }
  static float* elapsed(halfspin_test_result* r) { return &r->elapsed_f; }
};
template <>
struct Slots<double> {
  static const double* value(const halfspin_test_sample& s) { return s.value_d; }
  static double dt(const halfspin_test_sample& s) { return s.dt_d; }
  static double* attitude(halfspin_test_result* r) { return r->attitude_d; }
  static double* zyx(halfspin_test_result* r) { return r->zyx_d; }
  static double* zxz(halfspin_test_result* r) { return r->zxz_d; }
  static double* elapsed(halfspin_test_result* r) { return &r->elapsed_d; }
};

template <class T>
Vector3<T> sample_value(const halfspin_test_sample& s) {
  const T* v = Slots<T>::value(s);
  return {v[0], v[1], v[2]};
}

template <class T>
void store_angles(const EulerDecomposition<T>& e, T* out) {
  out[0] = e.angles.first;
  out[1] = e.angles.second;
  out[2] = e.angles.third;
}

template <class T, class Stepper, class Renormalization, class Accumulation>
int run_with(const halfspin_test_run& run, const halfspin_test_sample* samples, std::size_t count,
             int* statuses, halfspin_test_result* out) {
  const Quaternion<T> initial{static_cast<T>(run.initial[0]), static_cast<T>(run.initial[1]),
                              static_cast<T>(run.initial[2]), static_cast<T>(run.initial[3])};
  Propagator<T, Stepper, Renormalization, Accumulation> p(
      initial, GyroLimits<T>{static_cast<T>(run.max_rate), static_cast<T>(run.max_step)},
      static_cast<T>(run.tick_period));
  for (std::size_t i = 0; i < count; ++i) {
    const halfspin_test_sample& s = samples[i];
    const Status st = s.by_ticks != 0 ? p.push(sample_value<T>(s), Ticks{s.ticks})
                                      : p.push(sample_value<T>(s), Slots<T>::dt(s));
    statuses[i] = static_cast<int>(st);
  }
  const Quaternion<T> q = p.attitude();
  const EulerDecomposition<T> zyx = to_euler_angles(q, EulerSequence::zyx);
  const EulerDecomposition<T> zxz = to_euler_angles(q, EulerSequence::zxz);
  T* attitude = Slots<T>::attitude(out);
  attitude[0] = q.w;
  attitude[1] = q.x;
  attitude[2] = q.y;
  attitude[3] = q.z;
  store_angles(zyx, Slots<T>::zyx(out));
  store_angles(zxz, Slots<T>::zxz(out));
  *Slots<T>::elapsed(out) = p.elapsed_seconds();
  out->zyx_near_singular = zyx.near_singular ? 1 : 0;
  out->zxz_near_singular = zxz.near_singular ? 1 : 0;
  const PropagationCounters& c = p.counters();
  out->counters.samples_accepted = c.samples_accepted;
  out->counters.steps = c.steps;
  out->counters.rejected_non_finite = c.rejected_non_finite;
  out->counters.rejected_non_positive_step = c.rejected_non_positive_step;
  out->counters.rejected_step_too_long = c.rejected_step_too_long;
  out->counters.rejected_over_range = c.rejected_over_range;
  out->counters.rejected_no_tick_period = c.rejected_no_tick_period;
  out->counters.discarded_samples = c.discarded_samples;
  out->counters.elapsed_ticks = p.elapsed_ticks();
  return 1;
}

template <class T, class Stepper, class Renormalization>
int with_accumulation(const halfspin_configuration& c, const halfspin_test_run& run,
                      const halfspin_test_sample* samples, std::size_t count, int* statuses,
                      halfspin_test_result* out) {
  switch (c.accumulation) {
    case HALFSPIN_ACCUMULATION_DEFAULT:
      return run_with<T, Stepper, Renormalization, DefaultAccumulation<T>>(run, samples, count,
                                                                           statuses, out);
    case HALFSPIN_ACCUMULATION_PLAIN:
      return run_with<T, Stepper, Renormalization, PlainAccumulation>(run, samples, count, statuses,
                                                                      out);
    case HALFSPIN_ACCUMULATION_COMPENSATED:
      return run_with<T, Stepper, Renormalization, CompensatedAccumulation>(run, samples, count,
                                                                            statuses, out);
  }
  return 0;
}

template <class T, class Stepper>
int with_renormalization(const halfspin_configuration& c, const halfspin_test_run& run,
                         const halfspin_test_sample* samples, std::size_t count, int* statuses,
                         halfspin_test_result* out) {
  switch (c.renormalization) {
    case HALFSPIN_RENORMALIZATION_FIRST_ORDER:
      return with_accumulation<T, Stepper, FirstOrderRenormalization>(c, run, samples, count,
                                                                      statuses, out);
    case HALFSPIN_RENORMALIZATION_EXACT:
      return with_accumulation<T, Stepper, ExactRenormalization>(c, run, samples, count, statuses,
                                                                 out);
  }
  return 0;
}

template <class T>
int reference_run(const halfspin_configuration& c, const halfspin_test_run& run,
                  const halfspin_test_sample* samples, std::size_t count, int* statuses,
                  halfspin_test_result* out) {
  switch (c.stepper) {
    case HALFSPIN_EXPONENTIAL_MAP_HOLD_END:
      return with_renormalization<T, ExponentialMapHoldEnd>(c, run, samples, count, statuses, out);
    case HALFSPIN_EXPONENTIAL_MAP_MIDPOINT_MEAN:
      return with_renormalization<T, ExponentialMapMidpointMean>(c, run, samples, count, statuses,
                                                                 out);
    case HALFSPIN_MAGNUS_4:
      return with_renormalization<T, Magnus4>(c, run, samples, count, statuses, out);
    case HALFSPIN_CONING_1_SAMPLE:
      return with_renormalization<T, Coning1Sample>(c, run, samples, count, statuses, out);
    case HALFSPIN_CONING_2_SAMPLE:
      return with_renormalization<T, Coning2Sample>(c, run, samples, count, statuses, out);
    case HALFSPIN_CONING_3_SAMPLE:
      return with_renormalization<T, Coning3Sample>(c, run, samples, count, statuses, out);
    case HALFSPIN_CONING_4_SAMPLE:
      return with_renormalization<T, Coning4Sample>(c, run, samples, count, statuses, out);
  }
  return 0;
}

}  // namespace

extern "C" {

int halfspin_reference_run_f(halfspin_configuration configuration, const halfspin_test_run* run,
                             const halfspin_test_sample* samples, size_t count, int* statuses,
                             halfspin_test_result* out) {
  return reference_run<float>(configuration, *run, samples, count, statuses, out);
}

int halfspin_reference_run_d(halfspin_configuration configuration, const halfspin_test_run* run,
                             const halfspin_test_sample* samples, size_t count, int* statuses,
                             halfspin_test_result* out) {
  return reference_run<double>(configuration, *run, samples, count, statuses, out);
}

}  // extern "C"
