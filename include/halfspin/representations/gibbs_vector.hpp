#pragma once
// Quaternion ↔ Gibbs vector (classical Rodrigues parameters) g = v/w = tan(θ/2)·axis, for the
// body → reference attitude q = (w, v). Sign-insensitive (q and −q give the same g). Infinite at
// θ = 180° (w = 0); the result then carries a flag instead of infinities or NaN.

#include <cmath>
#include <limits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

template <class T>
struct GibbsVector {
  // tan(θ/2)·axis (dimensionless) when singular is false. When singular is true the rotation is a
  // half turn whose Gibbs vector is infinite, and g holds the unit axis instead (the direction in
  // which g diverges; −g is the same half turn).
  Vector3<T> g;
  bool singular;
};

// Quaternion (body → reference, q ≠ 0, any scale) → Gibbs vector tan(θ/2)·axis, one rounding per
// component. singular is set when w = 0 or when |v/w| overflows T (w within an ulp-scale of 0);
// g is then the unit axis sign(w)·v/|v| (+v/|v| for w = ±0). A non-finite q gives a non-finite
// g with singular false, so bad input is never mistaken for a half turn.
template <class T>
GibbsVector<T> to_gibbs_vector(const Quaternion<T>& q) noexcept {
  const Vector3<T> g = q.vector() / q.w;
  // w = 0 gives inf, or NaN where a component of v is also 0; both fail is_finite.
  if (is_finite(g) || !is_finite(q)) {
    return {g, false};
  }
  const Vector3<T> v = q.w < T(0) ? -q.vector() : q.vector();
  return {v / norm(v), true};
}

// Gibbs vector (body → reference; finite g, or a unit-or-not axis with singular set) → unit
// quaternion (1, g)/√(1 + |g|²) with w ≥ 0; a singular input gives the half turn (0, g/|g|).
// |g|² may overflow T without harm (the scaled norm is used then).
template <class T>
Quaternion<T> quaternion_from_gibbs_vector(const GibbsVector<T>& gibbs) noexcept {
  const Vector3<T>& g = gibbs.g;
  if (gibbs.singular) {
    return Quaternion<T>::from_parts(T(0), g / norm(g));
  }
  const T n2 = squared_norm(g);
  // √(1 + |g|²); when |g|² overflows, 1/|g|² is below ε² and √(1 + |g|²) rounds to |g|.
  const T d = n2 <= std::numeric_limits<T>::max() ? std::sqrt(T(1) + n2) : norm(g);
  return {T(1) / d, g.x / d, g.y / d, g.z / d};
}

}  // namespace halfspin
