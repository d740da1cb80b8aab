#pragma once
// Minimal steppers for testing the propagator's plumbing (cadence, history, estimates, rejection)
// independently of any real algorithm. Test-only.

#include <array>
#include <cstddef>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin::test {

// Delta-angles tiling the step, summed and applied by the exponential map (no coning term).
template <std::size_t N>
struct SummedDeltaAngles {
  static constexpr SampleLayout layout = SampleLayout::delta_angles;
  static constexpr std::size_t window = N;
  static constexpr std::size_t new_samples = N;
  static constexpr int order = 1;
  static constexpr int flops = 0;
  static constexpr const char* name = "test_summed_delta_angles";
  static constexpr bool has_estimate = false;
  template <class T>
  static Increment<T> increment(const std::array<Vector3<T>, N>& d, T) noexcept {
    Vector3<T> sum = Vector3<T>::zero();
    for (const auto& v : d) {
      sum += v;
    }
    return {quaternion_exp_minus_one(sum), T(0)};
  }
};

// The previous delta-angle then one new one; applies only the new one.
struct WithPreviousDeltaAngle {
  static constexpr SampleLayout layout = SampleLayout::delta_angles_with_previous;
  static constexpr std::size_t window = 2;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 0;
  static constexpr const char* name = "test_with_previous";
  static constexpr bool has_estimate = false;
  template <class T>
  static Increment<T> increment(const std::array<Vector3<T>, 2>& d, T) noexcept {
    return {quaternion_exp_minus_one(d[1]), T(0)};
  }
};

// Hold-start exponential map that also reports |ω_end − ω_start|·dt as its "estimate".
struct EstimatingHoldStart {
  static constexpr SampleLayout layout = SampleLayout::rates_spanning;
  static constexpr std::size_t window = 2;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 0;
  static constexpr const char* name = "test_estimating";
  static constexpr bool has_estimate = true;
  template <class T>
  static Increment<T> increment(const std::array<Vector3<T>, 2>& w, T dt) noexcept {
    return {quaternion_exp_minus_one(w[0] * dt), norm(w[1] - w[0]) * dt};
  }
};

// Rate-function stepper: exponential map of the rate at mid-step.
struct MidpointRateFunction {
  static constexpr SampleLayout layout = SampleLayout::rate_function;
  static constexpr std::size_t window = 0;
  static constexpr std::size_t new_samples = 0;
  static constexpr int order = 2;
  static constexpr int flops = 0;
  static constexpr const char* name = "test_midpoint_function";
  static constexpr bool has_estimate = false;
  template <class T, class F>
  static Increment<T> increment(const F& rate_at, T dt) noexcept {
    return {quaternion_exp_minus_one(rate_at(T(0.5) * dt) * dt), T(0)};
  }
};

}  // namespace halfspin::test
