#pragma once
/// @file
/// Reference → body quaternions (v_body = q_rb ⊗ v_ref ⊗ q_rb*, Hamilton product, scalar first),
/// the other sense users meet, ↔ our body → reference attitude q = q_rb*. Named functions so that
/// the direction is never reinterpreted silently.

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Hamilton quaternion mapping reference → body vectors → our body → reference attitude (its
/// conjugate); exact.
template <class T>
constexpr Quaternion<T> quaternion_from_reference_to_body(const Quaternion<T>& q_rb) noexcept {
  return conjugate(q_rb);
}

/// Our body → reference attitude → the Hamilton quaternion mapping reference → body vectors (its
/// conjugate); exact.
template <class T>
constexpr Quaternion<T> to_reference_to_body(const Quaternion<T>& q) noexcept {
  return conjugate(q);
}

}  // namespace halfspin
