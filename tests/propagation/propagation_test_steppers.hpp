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
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, N>& d, T) noexcept {
    Vector3<T> sum = Vector3<T>::zero();
    for (const auto& v : d) {
      sum += v;
    }
    return q * quaternion_exp(sum);
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
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, 2>& d, T) noexcept {
    return q * quaternion_exp(d[1]);
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
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, 2>& w, T dt) noexcept {
    return q * quaternion_exp(w[0] * dt);
  }
  template <class T>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q, const std::array<Vector3<T>, 2>& w,
                                           T dt) noexcept {
    return {step(q, w, dt), norm(w[1] - w[0]) * dt};
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
  template <class T, class F>
  static Quaternion<T> step(const Quaternion<T>& q, const F& rate_at, T dt) noexcept {
    return q * quaternion_exp(rate_at(T(0.5) * dt) * dt);
  }
};

}  // namespace halfspin::test
