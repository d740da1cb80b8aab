#pragma once
/// @file
/// Quaternion ↔ rotation vector φ (axis × angle, rad). Named forms of the exponential and
/// logarithm maps of core/exponential_map.hpp, for symmetry with the other representations.

#include "halfspin/core/exponential_map.hpp"

namespace halfspin {

/// Unit quaternion → rotation vector (rad) of the shortest rotation, |φ| ≤ π.
template <class T>
Vector3<T> to_rotation_vector(const Quaternion<T>& q) noexcept {
  return quaternion_log(q);
}

/// Rotation vector (rad) → unit quaternion; any |φ|, a 2π turn gives −identity (same rotation).
template <class T>
Quaternion<T> quaternion_from_rotation_vector(const Vector3<T>& phi) noexcept {
  return quaternion_exp(phi);
}

}  // namespace halfspin
