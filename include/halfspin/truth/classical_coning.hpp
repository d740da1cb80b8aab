#pragma once
/// @file
/// Truth motion: classical coning. The body's x axis sweeps a cone: the attitude is a rotation by
/// the fixed cone angle a about an axis that turns in the reference y–z plane at Ω rad/s,
///     q(t) = (cos(a/2), sin(a/2)·(0, cos Ωt, sin Ωt)),
/// and the body rate that produces it (from ω = 2 q* ⊗ q̇) is
///     ω(t) = (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt).
/// The motion nobody can integrate exactly from samples: the rate vector turns, so successive
/// rotations do not commute and the attitude drifts about x at −Ω(1 − cos a) (the coning rate),
/// which is what the coning algorithms correct. Evaluate in double or long double.

#include <cmath>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Classical coning (see the file comment).
template <class T>
struct ClassicalConingMotion {
  T cone_angle;      ///< a, rad
  T cone_frequency;  ///< Ω, rad/s

  /// 1 − cos a as 2 sin²(a/2): no cancellation for small cone angles.
  T one_minus_cos() const noexcept {
    const T s = std::sin(T(0.5) * cone_angle);
    return T(2) * s * s;
  }
  /// Attitude (body → reference) at t (s).
  Quaternion<T> attitude(T t) const noexcept {
    const T s = std::sin(T(0.5) * cone_angle);
    const T phase = cone_frequency * t;
    return {std::cos(T(0.5) * cone_angle), T(0), s * std::cos(phase), s * std::sin(phase)};
  }
  /// Body rate (rad/s) at t (s).
  Vector3<T> rate(T t) const noexcept {
    const T phase = cone_frequency * t;
    const T lateral = cone_frequency * std::sin(cone_angle);
    return {-cone_frequency * one_minus_cos(), -lateral * std::sin(phase),
            lateral * std::cos(phase)};
  }
  /// Delta-angle (rad): the integral of the body rate over (t0, t1], in closed form. The lateral
  /// part sin a·(cos Ωt1 − cos Ωt0, sin Ωt1 − sin Ωt0) is written with the sum-to-product
  /// identities, 2 sin a sin(Ω(t1 − t0)/2)·(−sin Ωt_mid, cos Ωt_mid): differences of nearly equal
  /// cosines would lose the relative accuracy of a short gyro interval.
  Vector3<T> delta_angle(T t0, T t1) const noexcept {
    const T mid = cone_frequency * (T(0.5) * (t0 + t1));
    const T lateral = T(2) * std::sin(cone_angle) * std::sin(T(0.5) * cone_frequency * (t1 - t0));
    return {-cone_frequency * one_minus_cos() * (t1 - t0), -lateral * std::sin(mid),
            lateral * std::cos(mid)};
  }
};

}  // namespace halfspin
