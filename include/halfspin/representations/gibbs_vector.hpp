#pragma once
/// @file
/// Quaternion ↔ Gibbs vector (classical Rodrigues parameters) g = v/w = tan(θ/2)·axis, for the
/// body → reference attitude q = (w, v). Sign-insensitive (q and −q give the same g). Infinite at
/// θ = 180° (w = 0); the result then carries a flag instead of infinities or NaN.

#include <cmath>
#include <limits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A Gibbs vector, or the axis of a half turn (see g).
template <class T>
struct GibbsVector {
  /// tan(θ/2)·axis (dimensionless) when singular is false. When singular is true the rotation is a
  /// half turn whose Gibbs vector is infinite, and g holds the unit axis instead (the direction in
  /// which g diverges; −g is the same half turn).
  Vector3<T> g;
  bool singular;  ///< whether q is a half turn (w = 0)
};

/// Quaternion (body → reference, q ≠ 0, any scale) → Gibbs vector tan(θ/2)·axis, one rounding per
/// component. singular is set when w = 0 or when |v/w| overflows T (w within an ulp-scale of 0);
/// g is then the unit axis sign(w)·v/|v| (+v/|v| for w = ±0). A non-finite q gives a non-finite
/// g with singular false, so bad input is never mistaken for a half turn.
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

/// Gibbs vector (body → reference; finite g, or a unit-or-not axis with singular set) → unit
/// quaternion (1, g)/√(1 + |g|²) with w ≥ 0; a singular input gives the half turn (0, g/|g|).
/// Unit to a few ulps for every finite g, however large (|g|² and |g| may overflow T), and for a
/// singular axis of any finite nonzero length (subnormal or near overflow).
template <class T>
Quaternion<T> quaternion_from_gibbs_vector(const GibbsVector<T>& gibbs) noexcept {
  const Vector3<T>& g = gibbs.g;
  if (gibbs.singular) {
    return Quaternion<T>::from_parts(T(0), normalized(g));
  }
  const T n2 = squared_norm(g);
  if (n2 <= std::numeric_limits<T>::max()) {
    const T d = std::sqrt(T(1) + n2);
    return {T(1) / d, g.x / d, g.y / d, g.z / d};
  }
  // |g|² overflows (|g| > √max: a rotation within 2/√max of π, float 1.1e-19 rad, double
  // 1.5e-154 rad). Scale by 2^−e, e the exponent of g's largest component (exact, e ≥ 63 in float,
  // ≥ 511 in double): (1, g)/√(1 + |g|²) = (2^−e, h)/√(2^−2e + |h|²) with h = g·2^−e, |h| in
  // [1, 2√3). 2^−2e < 2^−126 is below half an ulp of |h|² ≥ 1 and drops out; 2^−e itself is
  // representable (subnormal at worst), so w = 2^−e/|h| is rounded once. Dividing by |g| directly
  // gave zero once |g| overflowed.
  if (!is_finite(g)) {
    const T d = norm(g);  // non-finite g: a non-finite or zero result, never a valid-looking one
    return {T(1) / d, g.x / d, g.y / d, g.z / d};
  }
  const T m = std::fmax(std::fabs(g.x), std::fmax(std::fabs(g.y), std::fabs(g.z)));
  const int e = std::ilogb(m);
  const Vector3<T> h{std::scalbn(g.x, -e), std::scalbn(g.y, -e), std::scalbn(g.z, -e)};
  const T d = std::sqrt(squared_norm(h));
  return {std::scalbn(T(1), -e) / d, h.x / d, h.y / d, h.z / d};
}

}  // namespace halfspin
