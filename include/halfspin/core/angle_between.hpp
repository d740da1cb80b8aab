#pragma once
/// @file
/// The rotation angle between two attitudes, insensitive to the sign of either quaternion.

#include <cmath>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Angle (rad, in [0, π]) of the rotation that takes attitude a to attitude b; q and −q count as
/// the same attitude. Computed as 2·atan2(|vec(a*⊗b)|, |scalar(a*⊗b)|), accurate for tiny angles
/// (unlike acos of the dot product) and scale-invariant in each argument.
template <class T>
T angle_between(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  const Quaternion<T> d = conjugate(a) * b;
  return T(2) * std::atan2(norm(d.vector()), std::fabs(d.w));
}

}  // namespace halfspin
