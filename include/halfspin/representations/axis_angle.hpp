#pragma once
// Quaternion ↔ axis–angle: a unit axis and an angle (rad) of right-handed rotation about it.

#include <cmath>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

template <class T>
struct AxisAngle {
  Vector3<T> axis;  // unit vector; (1, 0, 0) by convention when angle is 0
  T angle;          // rad, in [0, π] from to_axis_angle
};

// Quaternion → axis–angle of the shortest rotation, angle in [0, π]. For the identity (no axis
// is determined) the axis is (1, 0, 0) and the angle 0. Scale-invariant in q (q ≠ 0).
template <class T>
AxisAngle<T> to_axis_angle(const Quaternion<T>& q) noexcept {
  const Quaternion<T> p = q.w < T(0) ? -q : q;
  const T s = norm(p.vector());
  if (s == T(0)) {
    return {{T(1), T(0), T(0)}, T(0)};
  }
  return {p.vector() / s, T(2) * std::atan2(s, p.w)};
}

// Axis–angle → unit quaternion (cos(angle/2), sin(angle/2)·axis). The axis must be unit; any
// angle is accepted (angle + 2π gives −q, the same rotation).
template <class T>
Quaternion<T> quaternion_from_axis_angle(const AxisAngle<T>& a) noexcept {
  const T half = T(0.5) * a.angle;
  return Quaternion<T>::from_parts(std::cos(half), std::sin(half) * a.axis);
}

}  // namespace halfspin
