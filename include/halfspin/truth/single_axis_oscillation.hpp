#pragma once
/// @file
/// Truth motion: single-axis sinusoidal oscillation. The body turns about a fixed unit axis n (the
/// same vector in body and reference, since the rotation is about it) by the angle
///     θ(t) = A sin(2π f t + φ),
/// so that, with q_c the attitude at θ = 0,
///     q(t) = q_c ⊗ exp(½ θ(t) n),     ω(t) = θ̇(t)·n = 2π f A cos(2π f t + φ)·n,
/// and the delta-angle over (t0, t1] is (θ(t1) − θ(t0))·n. The rate never changes direction, so
/// successive rotations commute: every stepper that integrates the rate's magnitude exactly is
/// exact here, which isolates quadrature error from coning error. Evaluate in double or long
/// double.

#include <cmath>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A sinusoidal oscillation about one axis (see the file comment).
template <class T>
struct SingleAxisOscillation {
  Vector3<T> axis{T(1), T(0), T(0)};                ///< n, unit, body frame (= reference frame)
  T amplitude{};                                    ///< A, rad
  T frequency{};                                    ///< f, Hz
  T phase{};                                        ///< φ, rad
  Quaternion<T> center{Quaternion<T>::identity()};  ///< q_c, attitude at θ = 0 (body → reference)

  /// Rotation angle θ(t) = A sin(2π f t + φ), rad; t in s.
  T angle(T t) const noexcept { return amplitude * std::sin(T(2) * pi<T> * frequency * t + phase); }
  /// Attitude (body → reference) at t (s): q_c ⊗ exp(½ θ(t) n). Built from the rotation vector θ n,
  /// so attitude and rate stay consistent (ω = θ̇ n exactly) even when n is unit only to rounding.
  Quaternion<T> attitude(T t) const noexcept { return center * quaternion_exp(angle(t) * axis); }
  /// Body rate (rad/s) at t (s): 2π f A cos(2π f t + φ)·n.
  Vector3<T> rate(T t) const noexcept {
    const T angular_frequency = T(2) * pi<T> * frequency;
    return (angular_frequency * amplitude * std::cos(angular_frequency * t + phase)) * axis;
  }
  /// Delta-angle (rad): the integral of the body rate over (t0, t1], t in s. Written as
  /// 2A cos(2πf (t0 + t1)/2 + φ) sin(πf (t1 − t0)) rather than θ(t1) − θ(t0): the difference of two
  /// nearly equal sines would lose the relative accuracy of a short gyro interval.
  Vector3<T> delta_angle(T t0, T t1) const noexcept {
    const T angular_frequency = T(2) * pi<T> * frequency;
    const T mid = angular_frequency * (T(0.5) * (t0 + t1)) + phase;
    const T half_span = T(0.5) * angular_frequency * (t1 - t0);
    return (T(2) * amplitude * std::cos(mid) * std::sin(half_span)) * axis;
  }
};

}  // namespace halfspin
