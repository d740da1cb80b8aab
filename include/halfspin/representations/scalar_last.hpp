#pragma once
/// @file
/// Quaternion ↔ scalar-last storage {x, y, z, w}. Only the storage order changes: the numbers are
/// the same Hamilton-product, body → reference attitude quaternion. For the left-handed ("JPL")
/// product convention, which is also stored scalar-last, use left_handed_product.hpp instead so
/// that the product convention is stated at the call site.

#include <array>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Quaternion (w, x, y, z), Hamilton, body → reference → array {x, y, z, w}, same meaning; exact.
template <class T>
constexpr std::array<T, 4> to_scalar_last(const Quaternion<T>& q) noexcept {
  return {q.x, q.y, q.z, q.w};
}

/// Array {x, y, z, w} holding a Hamilton, body → reference quaternion → Quaternion (w, x, y, z);
/// exact.
template <class T>
constexpr Quaternion<T> quaternion_from_scalar_last(const std::array<T, 4>& a) noexcept {
  return {a[3], a[0], a[1], a[2]};
}

}  // namespace halfspin
