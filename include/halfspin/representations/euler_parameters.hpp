#pragma once
/// @file
/// Quaternion ↔ Euler parameters (η, ε): the classical symbols for the scalar and vector parts of a
/// unit quaternion, η = cos(θ/2), ε = sin(θ/2)·axis. Same four numbers, same rotation sense as the
/// attitude quaternion (body → reference); only the grouping and the names differ.

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// The Euler parameters (η, ε) of a unit quaternion.
template <class T>
struct EulerParameters {
  T eta;               ///< cos(θ/2), dimensionless
  Vector3<T> epsilon;  ///< sin(θ/2)·axis, dimensionless
};

/// Unit quaternion (w, x, y, z), body → reference → Euler parameters η = w, ε = (x, y, z); exact.
template <class T>
constexpr EulerParameters<T> to_euler_parameters(const Quaternion<T>& q) noexcept {
  return {q.w, q.vector()};
}

/// Euler parameters (η, ε) of a body → reference rotation → quaternion (η, ε); exact, no
/// normalization (the caller's η² + |ε|² is kept as given).
template <class T>
constexpr Quaternion<T> quaternion_from_euler_parameters(const EulerParameters<T>& e) noexcept {
  return Quaternion<T>::from_parts(e.eta, e.epsilon);
}

}  // namespace halfspin
