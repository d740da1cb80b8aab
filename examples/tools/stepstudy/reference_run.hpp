#pragma once
// halfspin-stepstudy's reference series (--baseline): the first-order firmware update
// (examples/tools/common/first_order_update.hpp; not a halfspin method, no a-priori bound) run on a
// truth motion exactly as measure_run runs a catalogued stepper, so the two share their error
// measure and their clock:
//
// Inputs: one rate sample per step, the latest one: step k (ending at t = k·dt) uses ω(k·dt) from
// the long double truth rounded to T. The attitude starts from the truth's at 0 rounded to T.
// Timing: samples are prepared in chunks outside the clock; steady_clock brackets only the
// update calls of each chunk (and the copy of each step's end, as measure_run copies the
// propagator's attitude). The error against the truth is computed after each chunk, outside the
// clock.
//
// Tool code (not part of the installed library).

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <vector>

#include "first_order_update.hpp"
#include "halfspin/core/angle_between.hpp"
#include "measure.hpp"
#include "study_motions.hpp"

namespace halfspin::tools::stepstudy {

// Runs `steps` first-order updates of length dt_s (s) in T on the truth motion.
template <class T>
MeasuredRun measure_first_order_run(const TruthMotion& motion, double dt_s, std::int64_t steps) {
  using clock = std::chrono::steady_clock;
  MeasuredRun run;
  const Quaternion<LD> q0 = motion.attitude(0.0L);
  Quaternion<T> q{static_cast<T>(q0.w), static_cast<T>(q0.x), static_cast<T>(q0.y),
                  static_cast<T>(q0.z)};
  const LD dt = static_cast<LD>(dt_s);
  const T dt_t = static_cast<T>(dt_s);
  std::vector<Vector3<T>> samples;
  std::vector<Quaternion<T>> ends;
  samples.reserve(static_cast<std::size_t>(detail::chunk_steps));
  ends.reserve(static_cast<std::size_t>(detail::chunk_steps));
  clock::duration spent{};
  LD worst = 0;
  std::int64_t done = 0;
  bool finite = true;
  for (std::int64_t begin = 1; begin <= steps; begin += detail::chunk_steps) {
    const std::int64_t end = std::min(steps + 1, begin + detail::chunk_steps);
    samples.clear();
    for (std::int64_t k = begin; k < end; ++k) {
      samples.push_back(detail::narrow_vector<T>(motion.rate(static_cast<LD>(k) * dt)));
    }
    const clock::time_point start = clock::now();
    for (const Vector3<T>& w : samples) {
      q = first_order_normalized_step(q, w, dt_t);
      ends.push_back(q);
    }
    spent += clock::now() - start;
    for (const Quaternion<T>& e : ends) {
      finite = finite && is_finite(e);
      const LD t = static_cast<LD>(done + 1) * dt;
      worst = std::fmax(worst, angle_between(detail::widen_quaternion(e), motion.attitude(t)));
      ++done;
    }
    ends.clear();
  }
  run.steps = done;
  run.ok = finite && done == steps;
  run.max_error_rad = static_cast<double>(worst);
  run.ns_per_step = steps > 0
                        ? static_cast<double>(
                              std::chrono::duration_cast<std::chrono::nanoseconds>(spent).count()) /
                              static_cast<double>(steps)
                        : 0.0;
  return run;
}

}  // namespace halfspin::tools::stepstudy
