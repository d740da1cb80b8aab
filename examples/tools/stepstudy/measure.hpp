#pragma once
// One measured run of halfspin-stepstudy: a stepper, in scalar T, fed exact inputs from a truth
// motion at a fixed step, through the library's Propagator; the worst attitude error at step ends
// against the truth, and the time per step.
//
// Inputs: the step dt spans periods_per_step(layout, window) gyro periods h = dt/periods. Rate
// sample k is ω(k·h) and delta-angle sample k is ∫ω over ((k−1)h, kh], both from the long double
// truth rounded to T (what a perfect sensor in T would deliver); rates_spanning layouts start with
// the sample at t = 0, the others with sample 1. Rate-function steppers call the motion's rate in
// double at t0 + τ (rounded to T). The propagator starts from the truth's attitude at 0 rounded to
// T with the propagator's default renormalization (FirstOrderRenormalization, what a user's
// Propagator<T, Stepper> runs; the angle error does not depend on the norm, and the bounds'
// roundoff model covers this policy); the accumulation policy is the caller's (plain or
// compensated, propagation/compensated_accumulation.hpp; the propagator's default is compensated
// in float, plain in double).
//
// Timing: samples are prepared in chunks outside the clock; steady_clock brackets only the
// propagator's push/advance calls of each chunk (validation, history, the step, renormalization,
// and for rate-function steppers the rate evaluations). The error against the truth is computed
// after each chunk, also outside the clock.
//
// Tool code (not part of the installed library).

#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "study_motions.hpp"

namespace halfspin::tools::stepstudy {

struct MeasuredRun {
  bool ok = false;           // every sample accepted and every step taken
  double max_error_rad = 0;  // max over step ends of angle_between(propagated, truth)
  std::int64_t steps = 0;    // steps taken
  double ns_per_step = 0;    // steady_clock time of the propagator calls / steps
};

// The sum over the steps of each step's own error: the angle between the step's increment
// (normalized, as exact renormalization applies it) and the truth's relative rotation over the same
// interval, each step started from the exact attitude. It is what a horizon bound that adds up
// local errors would give with perfect local bounds, so sum/measured is the least bound/measured
// such a bound can reach on this motion (what cancels between steps it cannot see).
struct LocalErrorSum {
  double sum_rad = 0;
  double worst_step_rad = 0;
};

namespace detail {

template <class T>
Vector3<T> narrow_vector(const Vector3<LD>& v) {
  return {static_cast<T>(v.x), static_cast<T>(v.y), static_cast<T>(v.z)};
}
template <class T>
Vector3<T> narrow_vector(const Vector3<double>& v) {
  return {static_cast<T>(v.x), static_cast<T>(v.y), static_cast<T>(v.z)};
}
template <class T>
Quaternion<LD> widen_quaternion(const Quaternion<T>& q) {
  return {static_cast<LD>(q.w), static_cast<LD>(q.x), static_cast<LD>(q.y), static_cast<LD>(q.z)};
}

inline constexpr std::int64_t chunk_steps = 4096;

// The timed loop over one chunk of samples, flattened (every call in it inlined, the propagator's
// out-of-line rare paths excepted): this tool's unit holds every stepper in both scalars, and past
// its inline-growth limit g++ 12 -O3 calls pieces of the step out of line (the quaternion
// exponential, the product), which a firmware image holding one stepper does not
// (bench/callgrind/workload.hpp). False on a status other than ok or waiting_for_samples.
template <class Propagator, class T>
[[gnu::flatten]] bool push_chunk(Propagator& propagator, const std::vector<Vector3<T>>& samples,
                                 T h, std::vector<Quaternion<T>>& ends) {
  for (const Vector3<T>& sample : samples) {
    const Status s = propagator.push(sample, h);
    if (s == Status::ok) {
      ends.push_back(propagator.attitude());
    } else if (s != Status::waiting_for_samples) {
      return false;
    }
  }
  return true;
}

}  // namespace detail

// Runs `steps` steps of length dt_s (s) of Stepper in T with Accumulation on the truth motion.
template <class Stepper, class T, class Accumulation = PlainAccumulation>
MeasuredRun measure_run(const TruthMotion& motion, double dt_s, std::int64_t steps) {
  using clock = std::chrono::steady_clock;
  MeasuredRun run;
  const Quaternion<LD> q0 = motion.attitude(0.0L);
  const GyroLimits<T> limits{T(1e4), static_cast<T>(std::max(10.0, 4.0 * dt_s))};
  Propagator<T, Stepper, FirstOrderRenormalization, Accumulation> propagator(
      Quaternion<T>{static_cast<T>(q0.w), static_cast<T>(q0.x), static_cast<T>(q0.y),
                    static_cast<T>(q0.z)},
      limits);
  const LD dt = static_cast<LD>(dt_s);
  std::vector<Quaternion<T>> ends;
  ends.reserve(static_cast<std::size_t>(detail::chunk_steps));
  clock::duration spent{};
  LD worst = 0;
  std::int64_t done = 0;  // steps whose end was compared

  auto compare_chunk = [&]() {
    for (std::size_t i = 0; i < ends.size(); ++i) {
      const LD t = static_cast<LD>(done + 1) * dt;
      worst =
          std::fmax(worst, angle_between(detail::widen_quaternion(ends[i]), motion.attitude(t)));
      ++done;
    }
    ends.clear();
  };

  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    const T dt_t = static_cast<T>(dt_s);
    for (std::int64_t begin = 0; begin < steps; begin += detail::chunk_steps) {
      const std::int64_t end = std::min(steps, begin + detail::chunk_steps);
      const clock::time_point start = clock::now();
      for (std::int64_t k = begin; k < end; ++k) {
        const double t0 = static_cast<double>(k) * dt_s;
        const Status s = propagator.advance(
            [&](T tau) {
              return detail::narrow_vector<T>(motion.rate_double(t0 + static_cast<double>(tau)));
            },
            dt_t);
        if (s != Status::ok) {
          return run;
        }
        ends.push_back(propagator.attitude());
      }
      spent += clock::now() - start;
      compare_chunk();
    }
  } else {
    constexpr std::int64_t periods =
        static_cast<std::int64_t>(periods_per_step(Stepper::layout, Stepper::window));
    const LD h = dt / static_cast<LD>(periods);
    const T h_t = static_cast<T>(h);
    const std::int64_t first = Stepper::layout == SampleLayout::rates_spanning ? 0 : 1;
    const std::int64_t last = steps * periods;  // the sample that ends the last step
    std::vector<Vector3<T>> samples;
    samples.reserve(static_cast<std::size_t>(detail::chunk_steps * periods + 1));
    const std::int64_t chunk = detail::chunk_steps * periods;
    for (std::int64_t begin = first; begin <= last; begin += chunk) {
      const std::int64_t end = std::min(last + 1, begin + chunk);
      samples.clear();
      for (std::int64_t k = begin; k < end; ++k) {
        const LD t = static_cast<LD>(k) * h;
        samples.push_back(carries_delta_angles(Stepper::layout)
                              ? detail::narrow_vector<T>(motion.delta_angle(t - h, t))
                              : detail::narrow_vector<T>(motion.rate(t)));
      }
      const clock::time_point start = clock::now();
      const bool pushed = detail::push_chunk(propagator, samples, h_t, ends);
      spent += clock::now() - start;
      if (!pushed) {
        return run;
      }
      compare_chunk();
    }
  }
  run.steps = static_cast<std::int64_t>(propagator.counters().steps);
  run.ok = run.steps == steps && done == steps;
  run.max_error_rad = static_cast<double>(worst);
  run.ns_per_step = steps > 0
                        ? static_cast<double>(
                              std::chrono::duration_cast<std::chrono::nanoseconds>(spent).count()) /
                              static_cast<double>(steps)
                        : 0.0;
  return run;
}

// The local errors of the run measure_run makes (same samples, same steps), summed.
template <class Stepper, class T>
LocalErrorSum local_error_sum(const TruthMotion& motion, double dt_s, std::int64_t steps) {
  const LD dt = static_cast<LD>(dt_s);
  LD sum = 0;
  LD worst = 0;
  Quaternion<LD> start = motion.attitude(0.0L);
  for (std::int64_t s = 0; s < steps; ++s) {
    Increment<T> increment{};
    if constexpr (Stepper::layout == SampleLayout::rate_function) {
      const double t0 = static_cast<double>(s) * dt_s;
      increment = Stepper::template increment<T>(
          [&](T tau) {
            return detail::narrow_vector<T>(motion.rate_double(t0 + static_cast<double>(tau)));
          },
          static_cast<T>(dt_s));
    } else {
      constexpr std::int64_t periods =
          static_cast<std::int64_t>(periods_per_step(Stepper::layout, Stepper::window));
      constexpr std::int64_t window = static_cast<std::int64_t>(Stepper::window);
      const LD h = dt / static_cast<LD>(periods);
      // The window of the step ending at sample (s + 1)·periods; before the first sample of a
      // delta-angle layout the propagator holds a zero previous sample.
      std::array<Vector3<T>, Stepper::window> input{};
      const std::int64_t last = (s + 1) * periods;
      for (std::int64_t i = 0; i < window; ++i) {
        const std::int64_t k = last - window + 1 + i;
        const LD t = static_cast<LD>(k) * h;
        if (carries_delta_angles(Stepper::layout)) {
          input[static_cast<std::size_t>(i)] =
              k >= 1 ? detail::narrow_vector<T>(motion.delta_angle(t - h, t)) : Vector3<T>{};
        } else {
          input[static_cast<std::size_t>(i)] = detail::narrow_vector<T>(motion.rate(t));
        }
      }
      increment = Stepper::template increment<T>(input, static_cast<T>(dt_s));
    }
    const Quaternion<LD> end = motion.attitude(static_cast<LD>(s + 1) * dt);
    const Quaternion<LD> step =
        normalized(Quaternion<LD>::identity() + detail::widen_quaternion(increment.delta));
    const LD e = angle_between(start * step, end);
    sum += e;
    worst = std::fmax(worst, e);
    start = end;
  }
  return {static_cast<double>(sum), static_cast<double>(worst)};
}

}  // namespace halfspin::tools::stepstudy
