#pragma once
/// @file
/// Truth motion: constant body rate. Closed form q(t) = q0 ⊗ exp(ω t / 2).
/// Evaluate truth in double or long double; time t is seconds from the motion's start.

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A constant body rate (see the file comment).
template <class T>
struct ConstantRateMotion {
  Quaternion<T> initial;  ///< attitude at t = 0 (body → reference)
  Vector3<T> body_rate;   ///< rad/s

  /// Attitude (body → reference) at t (s).
  Quaternion<T> attitude(T t) const noexcept { return initial * quaternion_exp(body_rate * t); }
  /// Body rate (rad/s) at t (s).
  constexpr Vector3<T> rate(T /*t*/) const noexcept { return body_rate; }
  /// Delta-angle (rad): the integral of the body rate over (t0, t1].
  constexpr Vector3<T> delta_angle(T t0, T t1) const noexcept { return body_rate * (t1 - t0); }
};

}  // namespace halfspin
