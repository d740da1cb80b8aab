#pragma once
/// @file
/// The left-handed product convention (i·j = −k, j·k = −i, k·i = −j, stored scalar-last
/// {q1, q2, q3, q4}, sometimes called the JPL convention). In it a quaternion's matrix
///   C(q) = (2 q4² − 1) I − 2 q4 [q×] + 2 q qᵀ,   q = (q1, q2, q3),
/// maps reference vectors to body vectors. Since C(q) is the transpose of our body → reference
/// matrix R of the same four numbers, the left-handed quaternion of an attitude holds the same
/// numbers as our Hamilton body → reference quaternion, only stored scalar-last; and because
/// C(a ⊗_L b) = C(a)·C(b) = R(a)ᵀR(b)ᵀ = R(b ⊗ a)ᵀ, its product a ⊗_L b equals our b ⊗ a.

#include <array>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Hamilton body → reference quaternion → the left-handed-convention quaternion {q1, q2, q3, q4}
/// of the same attitude (reference → body matrix C above); the same numbers {x, y, z, w}, exact.
template <class T>
constexpr std::array<T, 4> to_left_handed_convention(const Quaternion<T>& q) noexcept {
  return {q.x, q.y, q.z, q.w};
}

/// Left-handed-convention quaternion {q1, q2, q3, q4} (scalar last, C(q) maps reference → body)
/// → our Hamilton body → reference quaternion (q4, q1, q2, q3) of the same attitude; exact.
template <class T>
constexpr Quaternion<T> quaternion_from_left_handed_convention(const std::array<T, 4>& a) noexcept {
  return {a[3], a[0], a[1], a[2]};
}

/// Left-handed product a ⊗_L b of two scalar-last left-handed-convention quaternions (rotation b
/// applied first to reference vectors, then a: C(a ⊗_L b) = C(a)·C(b)); computed as our b ⊗ a.
template <class T>
constexpr std::array<T, 4> left_handed_product(const std::array<T, 4>& a,
                                               const std::array<T, 4>& b) noexcept {
  return to_left_handed_convention(quaternion_from_left_handed_convention(b) *
                                   quaternion_from_left_handed_convention(a));
}

}  // namespace halfspin
