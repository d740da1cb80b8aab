#pragma once
/// @file
/// Gyro input: the configured limits of a gyro and the validation every sample passes before it
/// can touch the attitude. Rates are body-frame angular velocity in rad/s; a delta-angle is the
/// integral of that rate over its sample interval (t_prev, t], in rad.

#include <cmath>
#include <limits>

#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/status.hpp"

namespace halfspin {

/// What the propagator accepts. A gyro saturates per axis, so the range is per axis.
template <class T>
struct GyroLimits {
  T max_rate;  ///< rad/s: the largest |ω| on any axis the gyro can measure (its full scale)
  T max_step;  ///< s: the longest sample interval accepted; longer means samples were missed
};

/// Checks a time step: finite, positive, not longer than the limit. Order of checks: non_finite,
/// non_positive_step, step_too_long.
template <class T>
constexpr Status validate_step(T dt, const GyroLimits<T>& limits) noexcept {
  if (!(dt == dt) || dt - dt != T(0)) {  // NaN, or ±infinity (inf − inf is NaN)
    return Status::non_finite;
  }
  if (!(dt > T(0))) {
    return Status::non_positive_step;
  }
  if (dt > limits.max_step) {
    return Status::step_too_long;
  }
  return Status::ok;
}

/// Checks a rate sample (rad/s) and its sample interval dt (s).
template <class T>
Status validate_rate(const Vector3<T>& rate, T dt, const GyroLimits<T>& limits) noexcept {
  if (!is_finite(rate)) {
    return Status::non_finite;
  }
  const Status s = validate_step(dt, limits);
  if (s != Status::ok) {
    return s;
  }
  if (std::fabs(rate.x) > limits.max_rate || std::fabs(rate.y) > limits.max_rate ||
      std::fabs(rate.z) > limits.max_rate) {
    return Status::over_range;
  }
  return Status::ok;
}

/// Checks a delta-angle sample (rad over dt); it is over range when its mean rate on some axis,
/// |δ_i|/dt, exceeds max_rate (tested as |δ_i| > max_rate·dt, no division).
template <class T>
Status validate_delta_angle(const Vector3<T>& delta, T dt, const GyroLimits<T>& limits) noexcept {
  if (!is_finite(delta)) {
    return Status::non_finite;
  }
  const Status s = validate_step(dt, limits);
  if (s != Status::ok) {
    return s;
  }
  const T bound = limits.max_rate * dt;
  if (std::fabs(delta.x) > bound || std::fabs(delta.y) > bound || std::fabs(delta.z) > bound) {
    return Status::over_range;
  }
  return Status::ok;
}

/// The limits with each value brought into T's finite range (a larger, infinite or NaN value
/// becomes T's largest), for the one-pass acceptance tests below: with finite limits they need no
/// separate finiteness test (|x| ≤ a finite bound is false for a NaN or an infinite x).
template <class T>
constexpr GyroLimits<T> finite_limits(const GyroLimits<T>& limits) noexcept {
  constexpr T largest = std::numeric_limits<T>::max();
  return {limits.max_rate <= largest ? limits.max_rate : largest,
          limits.max_step <= largest ? limits.max_step : largest};
}

/// The common case in one pass, for `finite` = finite_limits(limits): true only when
/// validate_rate(rate, dt, limits) is ok, and exactly when it is if the limits were finite already
/// (an infinite or NaN limit, brought down to T's largest, can refuse a sample the validation
/// accepts; the caller then classifies it with validate_rate, which decides). Five comparisons,
/// short-circuit: on the Cortex-M4F a comparison combined without a branch took an IT block and an
/// AND more each (vcmp, vmrs, it, mov, and) than one followed by a branch not taken.
template <class T>
constexpr bool accepts_rate(const Vector3<T>& rate, T dt, const GyroLimits<T>& finite) noexcept {
  const T r = finite.max_rate;
  return std::fabs(rate.x) <= r && std::fabs(rate.y) <= r && std::fabs(rate.z) <= r && dt > T(0) &&
         dt <= finite.max_step;
}

/// The same for a delta-angle and validate_delta_angle. The bound max_rate·dt is brought into the
/// finite range too (it overflows for a huge rate limit over a long step, and |±∞| ≤ ∞ would let an
/// infinite delta-angle pass); with max_rate ≤ the original limit it is never above the
/// validation's bound (rounding is monotonic), so acceptance still implies ok.
template <class T>
constexpr bool accepts_delta_angle(const Vector3<T>& delta, T dt,
                                   const GyroLimits<T>& finite) noexcept {
  constexpr T largest = std::numeric_limits<T>::max();
  const T product = finite.max_rate * dt;
  const T b = product <= largest ? product : largest;
  return std::fabs(delta.x) <= b && std::fabs(delta.y) <= b && std::fabs(delta.z) <= b &&
         dt > T(0) && dt <= finite.max_step;
}

}  // namespace halfspin
