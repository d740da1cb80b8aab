#pragma once
// The budget over an interval between external attitude fixes, and the longest such interval.
// With an absolute budget it is that budget, whatever the interval. With the sensor criterion
// (--angle-random-walk …, sensor_error.hpp) it is a fraction of the sensor-driven error over the
// interval itself, the stricter of it and an absolute budget when both are given: the criterion
// compares the two errors over the same time, so a shorter time between fixes also asks less of
// the integration error. Tool code.

#include <cmath>
#include <cstdint>
#include <limits>

#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/sensor_error.hpp"

namespace halfspin::tools::stepstudy {

struct IntervalBudget {
  double absolute_rad = std::numeric_limits<double>::infinity();  // +inf: none given
  bool has_sensor = false;
  GyroNoiseTerms<double> sensor{};
  double fraction = 0.1;

  // The budget (rad) for an interval of `interval_s` seconds.
  double over(double interval_s) const {
    if (!has_sensor) {
      return absolute_rad;
    }
    return std::fmin(absolute_rad, sensor_fraction_budget(sensor, interval_s, fraction));
  }
};

// The longest time between fixes, up to `longest_s`, over which Stepper at step dt keeps its
// worst-case bound within the budget over that time: sup{T ≤ longest_s : bound(T) ≤
// budget.over(T)}. With a fixed budget that is longest_fix_interval (which is not limited to
// longest_s: a longer interval is reported as such). With the sensor criterion the budget grows
// with T, so the set of T meeting it need not be an interval; the search is limited to
// longest_s (the horizon asked about) and runs T ← L(budget.over(T)) from T = longest_s, L being
// longest_fix_interval: L and budget.over are non-decreasing, so every iterate stays at or above
// the answer (T* ≤ L(budget(T*)) ≤ L(budget(T_n)) = T_{n+1}), and an iterate T with L(budget(T))
// ≥ T meets its own budget, so it is the answer. The step counts strictly decrease until then,
// so the loop ends. The criterion is checked at the interval's end, as the horizon study checks
// it at the horizon's end.
template <class Stepper, class T, class Accumulation>
FixInterval<T> longest_fix_interval_within(const MotionDescription<T>& d, T dt,
                                           const IntervalBudget& budget, double longest_s) {
  if (!budget.has_sensor) {
    return longest_fix_interval<Stepper, T, Accumulation>(d, dt,
                                                          static_cast<T>(budget.absolute_rad));
  }
  auto steps = static_cast<std::int64_t>(std::floor(longest_s / static_cast<double>(dt)));
  for (;;) {
    const double interval_s = static_cast<double>(steps) * static_cast<double>(dt);
    FixInterval<T> f = longest_fix_interval<Stepper, T, Accumulation>(
        d, dt, static_cast<T>(budget.over(interval_s)));
    if (steps < 1 ||
        (f.status != FixIntervalStatus::ok && f.status != FixIntervalStatus::unbounded)) {
      return f;
    }
    if (f.steps >= steps) {
      // This iterate meets the budget over itself: the answer.
      f.status = FixIntervalStatus::ok;
      f.steps = steps;
      f.interval_s = static_cast<T>(steps) * dt;
      f.bound_rad = error_bound_after_steps<Stepper, T, Accumulation>(d, dt, steps);
      f.next_bound_rad = error_bound_after_steps<Stepper, T, Accumulation>(d, dt, steps + 1);
      return f;
    }
    steps = f.steps;
  }
}

}  // namespace halfspin::tools::stepstudy
