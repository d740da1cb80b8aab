#pragma once
// The exponential-map step with the rate held over the step (zero-order hold):
//     q(t + dt) = q(t) ⊗ exp(ω̄ dt / 2),
// exact when the body rate is constant over the step. For a time-varying rate the local error is
// the difference between ω̄·dt and the true rotation vector of the step (quadrature error plus the
// non-commutativity, or coning, term): O(dt²) per step with ω̄ at one end (global order 1), O(dt³)
// per step with ω̄ at mid-step (global order 2).
//
// Cost (series branch of quaternion_exp, |ω̄ dt|² below ScalarTraits::exp_series_angle_squared,
// the usual case for a gyro step): scaling ω·dt 3, quaternion_exp 20, product 28 → 51 flops; the
// mean of two samples costs 4 more. Above the threshold add a square root, a division and
// sin/cos. Memory: none beyond the input window.

#include <array>
#include <cstddef>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

// Rate sampled at the end of the step, held back over it ("the newest sample"). Global order 1.
struct ExpMapHoldEnd {
  static constexpr SampleLayout layout = SampleLayout::rate_at_end;
  static constexpr std::size_t window = 1;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 3 + quaternion_exp_series_flops + quaternion_product_flops;
  static constexpr const char* name = "expmap_hold_end";

  // q ⊗ exp(ω_end·dt/2); ω in rad/s, dt in s.
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                            T dt) noexcept {
    return q * quaternion_exp(rate[0] * dt);
  }
};

// Rate sampled at the start of the step, held over it. Global order 1.
struct ExpMapHoldStart {
  static constexpr SampleLayout layout = SampleLayout::rates_spanning;
  static constexpr std::size_t window = 2;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 3 + quaternion_exp_series_flops + quaternion_product_flops;
  static constexpr const char* name = "expmap_hold_start";

  // q ⊗ exp(ω_start·dt/2); rate[0] at step start, rate[1] (unused) at its end.
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                            T dt) noexcept {
    return q * quaternion_exp(rate[0] * dt);
  }
};

// Mean of the two end samples held over the step: the trapezoid rule for the rotation vector.
// Global order 2. The usual choice when only one rate sample per step arrives.
struct ExpMapMidpointMean {
  static constexpr SampleLayout layout = SampleLayout::rates_spanning;
  static constexpr std::size_t window = 2;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 2;
  static constexpr int flops = 7 + quaternion_exp_series_flops + quaternion_product_flops;
  static constexpr const char* name = "expmap_midpoint_mean";

  // q ⊗ exp((ω_start + ω_end)·dt/4).
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                            T dt) noexcept {
    return q * quaternion_exp((rate[0] + rate[1]) * (T(0.5) * dt));
  }
};

// A real sample at mid-step held over the step: the midpoint rule. Global order 2. The step
// spans two sample periods (samples at start, middle, end; only the middle one is read).
struct ExpMapMidpointSample {
  static constexpr SampleLayout layout = SampleLayout::rates_spanning;
  static constexpr std::size_t window = 3;
  static constexpr std::size_t new_samples = 2;
  static constexpr int order = 2;
  static constexpr int flops = 3 + quaternion_exp_series_flops + quaternion_product_flops;
  static constexpr const char* name = "expmap_midpoint_sample";

  // q ⊗ exp(ω_mid·dt/2).
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                            T dt) noexcept {
    return q * quaternion_exp(rate[1] * dt);
  }
};

}  // namespace halfspin
