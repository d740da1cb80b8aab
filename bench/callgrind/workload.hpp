#pragma once
// The workload shared by halfspin_bench (bench_steppers.cpp, bench_propagator.cpp,
// bench_baselines.cpp) and halfspin_callgrind_driver, so that ns per step and instructions per step
// describe the same computation.
//
// A 1 kHz gyro on an invented manoeuvring vehicle: slow body rates of up to about 1.5 rad/s plus a
// 0.3 rad/s vibration at 85 Hz, so one step turns the body by a few milliradians (the series branch
// of quaternion_exp, the usual case for a gyro step, for every stepper here including the
// four-sample coning step, |φ| ≤ 8 mrad < 10 mrad, the double threshold). The samples are
// precomputed into a table of 256 (the index wraps with a mask), so the timed loops read memory
// and do only the step. Rate-function steppers get a linear rate ω(τ) = ω_k + τ·ω̇_k (rad/s, τ in s
// from step start) built from the same table: three multiply-adds per call, cheap on purpose so
// that the stepper, not the model, is measured.
//
// Benchmark and tool code (not part of the installed library): it may use the standard library.

// Every Run's step() (runs.hpp, baseline_runs.hpp) is flattened: every call in it inlined. A
// firmware image holds one stepper and g++ inlines its whole step there; this binary holds every
// stepper in both scalars, and past its unit-growth limit g++ 12 -O3 stopped inlining and called
// the quaternion product and exponential out of line in both the bare step and the propagator
// (callgrind: apply_increment and quaternion_exp_minus_one as functions of their own). Flattening
// measures each path as it compiles alone. Functions marked noinline (the propagator's rare paths)
// stay out of line, as they do in an image.
#if defined(__GNUC__)
#define HALFSPIN_BENCH_FLATTEN [[gnu::flatten]]
#else
#define HALFSPIN_BENCH_FLATTEN
#endif

#include <array>
#include <cmath>
#include <cstddef>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin::bench {

inline constexpr std::size_t table_size = 256;  // a power of two
inline constexpr std::size_t table_mask = table_size - 1;
inline constexpr double sample_period_s = 1e-3;  // 1 kHz gyro

// The gyro stream: rate (rad/s) at each sample instant, the delta-angle (rad) of the interval
// ending there, and the rate's slope (rad/s²) for the linear rate function.
template <class T>
struct GyroTable {
  std::array<Vector3<T>, table_size> rate{};
  std::array<Vector3<T>, table_size> delta_angle{};
  std::array<Vector3<T>, table_size> rate_slope{};
};

namespace detail {
// Invented motion, rad/s at time t (s): slow manoeuvre plus 85 Hz vibration on two axes.
inline std::array<double, 3> invented_rate(double t) {
  const double two_pi = 6.283185307179586;
  return {1.0 * std::sin(two_pi * 0.7 * t) + 0.3 * std::sin(two_pi * 85.0 * t),
          0.8 * std::cos(two_pi * 0.5 * t) + 0.3 * std::cos(two_pi * 85.0 * t),
          0.4 * std::sin(two_pi * 0.3 * t + 1.0)};
}
template <class T>
Vector3<T> to_vector(const std::array<double, 3>& v) {
  return {static_cast<T>(v[0]), static_cast<T>(v[1]), static_cast<T>(v[2])};
}
}  // namespace detail

template <class T>
const GyroTable<T>& gyro_table() {
  static const GyroTable<T> table = [] {
    GyroTable<T> g;
    const double h = sample_period_s;
    for (std::size_t k = 0; k < table_size; ++k) {
      const double t = static_cast<double>(k) * h;
      const auto w = detail::invented_rate(t);
      const auto w_before = detail::invented_rate(t - h);
      const auto w_mid = detail::invented_rate(t - 0.5 * h);
      const auto w_after = detail::invented_rate(t + h);
      std::array<double, 3> d{};
      std::array<double, 3> s{};
      for (std::size_t a = 0; a < 3; ++a) {
        d[a] = h / 6.0 * (w_before[a] + 4.0 * w_mid[a] + w[a]);  // Simpson over (t − h, t]
        s[a] = (w_after[a] - w_before[a]) / (2.0 * h);
      }
      g.rate[k] = detail::to_vector<T>(w);
      g.delta_angle[k] = detail::to_vector<T>(d);
      g.rate_slope[k] = detail::to_vector<T>(s);
    }
    return g;
  }();
  return table;
}

// The sample a propagator is pushed at stream position k: a rate or a delta-angle, as the
// stepper's layout says.
template <class Stepper, class T>
const Vector3<T>& stream_sample(std::size_t k) {
  const GyroTable<T>& g = gyro_table<T>();
  return carries_delta_angles(Stepper::layout) ? g.delta_angle[k & table_mask]
                                               : g.rate[k & table_mask];
}

// The input windows a bare step reads, formed from the stream exactly as the propagator forms
// them (consecutive steps share the boundary sample where the layout says so), and the step
// length (s).
template <class Stepper, class T>
struct StepInputs {
  std::array<std::array<Vector3<T>, Stepper::window>, table_size> window{};
  T dt{};
};

template <class Stepper, class T>
const StepInputs<Stepper, T>& step_inputs() {
  static_assert(Stepper::layout != SampleLayout::rate_function, "rate functions take rate_at()");
  static const StepInputs<Stepper, T> inputs = [] {
    StepInputs<Stepper, T> in;
    constexpr std::size_t stride = Stepper::new_samples;
    for (std::size_t k = 0; k < table_size; ++k) {
      for (std::size_t j = 0; j < Stepper::window; ++j) {
        // Layouts that carry a sample over start one position back.
        const std::size_t back = Stepper::window - stride;
        in.window[k][j] = stream_sample<Stepper, T>(k * stride + j + table_size - back);
      }
    }
    in.dt = static_cast<T>(static_cast<double>(periods_per_step(Stepper::layout, Stepper::window)) *
                           sample_period_s);
    return in;
  }();
  return inputs;
}

// The cheap rate callable of rate-function steppers: ω(τ) = ω0 + τ·ω̇ (rad/s, τ in s).
template <class T>
struct LinearRate {
  Vector3<T> start;
  Vector3<T> slope;
  Vector3<T> operator()(T tau) const noexcept { return start + tau * slope; }
};

template <class T>
LinearRate<T> linear_rate(std::size_t k) {
  const GyroTable<T>& g = gyro_table<T>();
  return {g.rate[k & table_mask], g.rate_slope[k & table_mask]};
}

// True when q is a usable attitude after a run (finite, norm near 1): the benchmarks report an
// error instead of a figure otherwise.
template <class T>
bool healthy(const Quaternion<T>& q) {
  const T n2 = squared_norm(q);
  return is_finite(q) && n2 > T(0.5) && n2 < T(2);
}

}  // namespace halfspin::bench
