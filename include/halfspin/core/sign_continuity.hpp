#pragma once
/// @file
/// Hemisphere continuity: choose between q and −q (one rotation) the one nearest a previous value,
/// so that telemetry, interpolation and filters do not see a jump of the quaternion's sign.

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Returns q or −q, whichever has the non-negative four-dimensional dot product with previous.
template <class T>
constexpr Quaternion<T> nearest_sign(const Quaternion<T>& q,
                                     const Quaternion<T>& previous) noexcept {
  return dot(q, previous) < T(0) ? -q : q;
}

/// Returns q or −q, whichever has a non-negative scalar part (angle in [0, π]); the canonical sign.
template <class T>
constexpr Quaternion<T> with_nonnegative_scalar(const Quaternion<T>& q) noexcept {
  return q.w < T(0) ? -q : q;
}

}  // namespace halfspin
