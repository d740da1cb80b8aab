#pragma once
/// @file
/// Quaternion ↔ modified Rodrigues parameters p = v/(1 + w) = tan(θ/4)·axis, for the
/// body → reference attitude q = (w, v). The other sign of the quaternion gives the shadow set
/// −v/(1 − w) = −p/|p|², the same rotation; the two sets meet on |p| = 1 (half turns), so
/// keeping |p| ≤ 1 bounds p and avoids the singularity at θ = 360°.

#include <cmath>
#include <limits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Modified Rodrigues parameters (see the file comment).
template <class T>
struct ModifiedRodrigues {
  Vector3<T> p;  ///< tan(θ/4)·axis, dimensionless
};

/// Quaternion (body → reference, q ≠ 0, any scale) → modified Rodrigues parameters of the short
/// set, p = v/(|q| + |w|) with the sign of q chosen so that w ≥ 0; |p| ≤ 1 (= 1 only at half turns,
/// up to rounding). The denominator is ≥ |q|, so no cancellation occurs for any angle.
template <class T>
ModifiedRodrigues<T> to_modified_rodrigues(const Quaternion<T>& q) noexcept {
  const Vector3<T> v = q.w < T(0) ? -q.vector() : q.vector();
  const T d = norm(q) + std::fabs(q.w);
  return {v / d};
}

/// Modified Rodrigues parameters (body → reference, finite p, either set) → unit quaternion
/// ((1 − |p|²), 2p)/(1 + |p|²); w ≥ 0 for the short set (|p| ≤ 1), w < 0 for the shadow set (the
/// same rotation). |p|² may overflow T without harm: |p| is then factored out.
template <class T>
Quaternion<T> quaternion_from_modified_rodrigues(const ModifiedRodrigues<T>& m) noexcept {
  const Vector3<T>& p = m.p;
  const T n2 = squared_norm(p);
  if (n2 <= std::numeric_limits<T>::max()) {
    const T d = T(1) + n2;
    return {(T(1) - n2) / d, (T(2) * p.x) / d, (T(2) * p.y) / d, (T(2) * p.z) / d};
  }
  // The same quaternion is ((r² − 1), 2r·u)/(1 + r²) with r = 1/|p|, u = p/|p|; |p|² overflowed,
  // so r² < ε² and it rounds to (−1, 2r·u).
  const T s = norm(p);
  const T f = T(2) / s;
  return {T(-1), f * (p.x / s), f * (p.y / s), f * (p.z / s)};
}

/// The other set of the same rotation (body → reference): −p/|p|², for p ≠ 0 (the identity's
/// shadow is at infinity). |p|² below the normal range or above the maximum is avoided by
/// dividing by |p| twice.
template <class T>
ModifiedRodrigues<T> shadow_set(const ModifiedRodrigues<T>& m) noexcept {
  const T n2 = squared_norm(m.p);
  if (n2 >= std::numeric_limits<T>::min() && n2 <= std::numeric_limits<T>::max()) {
    return {-m.p / n2};
  }
  const T s = norm(m.p);
  return {-((m.p / s) / s)};
}

/// The short set of the same rotation (body → reference): p if |p|² ≤ 1, else its shadow set, so
/// the result has |p| ≤ 1 (up to rounding of the shadow).
template <class T>
ModifiedRodrigues<T> switch_to_short(const ModifiedRodrigues<T>& m) noexcept {
  return squared_norm(m.p) > T(1) ? shadow_set(m) : m;
}

}  // namespace halfspin
