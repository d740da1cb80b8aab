#pragma once
/// @file
/// Quaternion ↔ axis–angle: a unit axis and an angle (rad) of right-handed rotation about it.

#include <cmath>
#include <limits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A unit axis and a right-handed angle about it (rad).
template <class T>
struct AxisAngle {
  Vector3<T> axis;  ///< unit vector; (1, 0, 0) by convention when angle is 0
  T angle;          ///< rad, in [0, π] from to_axis_angle
};

/// Quaternion → axis–angle of the shortest rotation, angle in [0, π]. For the identity (no axis
/// is determined) the axis is (1, 0, 0) and the angle 0. Scale-invariant in q (q ≠ 0): for every
/// finite q with v ≠ 0 the axis is unit to a few ulps and the angle 2·atan2(|v|, w) accurate to a
/// few ulps (to the subnormal spacing when the angle itself is subnormal).
template <class T>
AxisAngle<T> to_axis_angle(const Quaternion<T>& q) noexcept {
  const Quaternion<T> p = q.w < T(0) ? -q : q;
  const Vector3<T> v = p.vector();
  const T n2 = squared_norm(v);
  if (n2 >= std::numeric_limits<T>::min() && n2 <= std::numeric_limits<T>::max()) {
    const T s = std::sqrt(n2);
    return {v / s, T(2) * std::atan2(s, p.w)};
  }
  // |v|² under- or overflows T (|v| subnormal, or near T's largest value). The axis: v scaled by
  // 2^−e (e the exponent of its largest component, an exact scaling) so that its length lies in
  // [1, 2√3) before the division, as normalized() does. The angle: atan2 is invariant under a
  // common scale, so |v| = s·2^e and w are both scaled by 2^−k, k the larger of the two exponents,
  // which keeps the larger argument in [1, 4) and rounds the smaller one only if it underflows —
  // where the ratio, and so the angle or its distance to π, is below T's normal range anyway.
  if (!is_finite(v) || !std::isfinite(p.w)) {
    const T s = norm(v);  // non-finite input: a non-finite result, as the common path gives
    return {v / s, T(2) * std::atan2(s, p.w)};
  }
  const T m = std::fmax(std::fabs(v.x), std::fmax(std::fabs(v.y), std::fabs(v.z)));
  if (m == T(0)) {
    return {{T(1), T(0), T(0)}, T(0)};
  }
  const int e = std::ilogb(m);
  const Vector3<T> scaled{std::scalbn(v.x, -e), std::scalbn(v.y, -e), std::scalbn(v.z, -e)};
  const T s = std::sqrt(squared_norm(scaled));
  // ilogb(±0) is FP_ILOGB0, below any exponent of a finite nonzero m: k = e then, and w stays 0.
  const int ew = std::ilogb(p.w);
  const int k = ew > e ? ew : e;
  const T angle = T(2) * std::atan2(std::scalbn(s, e - k), std::scalbn(p.w, -k));
  return {scaled / s, angle};
}

/// Axis–angle → unit quaternion (cos(angle/2), sin(angle/2)·axis). The axis must be unit; any
/// angle is accepted (angle + 2π gives −q, the same rotation).
template <class T>
Quaternion<T> quaternion_from_axis_angle(const AxisAngle<T>& a) noexcept {
  const T half = T(0.5) * a.angle;
  return Quaternion<T>::from_parts(std::cos(half), std::sin(half) * a.axis);
}

}  // namespace halfspin
