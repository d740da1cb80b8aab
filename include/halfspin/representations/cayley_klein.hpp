#pragma once
/// @file
/// Quaternion ↔ Cayley–Klein parameters (α, β, γ, δ): the entries [[α, β], [γ, δ]] of the SU(2)
/// matrix U(q) = [[w − i z, −y − i x], [y − i x, w + i z]] of su2_matrix.hpp (same convention:
/// body → reference attitude, Hamilton product), so δ = α*, γ = −β*, αδ − βγ = |q|² = 1.
///
/// Relation to the classical textbook form (Goldstein-style, from memory): α = e0 + i e3,
/// β = e2 + i e1, γ = −e2 + i e1, δ = e0 − i e3 gives exactly these numbers when
/// (e0, e1, e2, e3) = (w, −x, −y, −z), the components of q*, i.e. the Euler parameters of the
/// inverse (reference → body) rotation. Checked numerically in tests/representations/
/// test_cayley_klein_su2.cpp. Never feed the Euler parameters of q itself into the classical
/// formulas and expect our α..δ: that gives U(q*) = U(q)†, the opposite rotation.

#include <complex>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// The Cayley–Klein parameters (see the file comment).
template <class T>
struct CayleyKlein {
  std::complex<T> alpha;  ///< w − i z
  std::complex<T> beta;   ///< −y − i x
  std::complex<T> gamma;  ///< y − i x
  std::complex<T> delta;  ///< w + i z
};

/// Unit quaternion (body → reference attitude) → Cayley–Klein parameters, the entries of U(q);
/// exact.
template <class T>
constexpr CayleyKlein<T> to_cayley_klein(const Quaternion<T>& q) noexcept {
  return {std::complex<T>(q.w, -q.z), std::complex<T>(-q.y, -q.x), std::complex<T>(q.y, -q.x),
          std::complex<T>(q.w, q.z)};
}

/// Cayley–Klein parameters (entries of U(q) above) → quaternion (w, x, y, z), body → reference.
/// Each component appears twice (δ = α*, γ = −β*); the two copies are averaged so that parameters
/// consistent only to rounding give the nearest quaternion. Not normalized.
template <class T>
constexpr Quaternion<T> quaternion_from_cayley_klein(const CayleyKlein<T>& c) noexcept {
  return {T(0.5) * (c.alpha.real() + c.delta.real()), T(-0.5) * (c.beta.imag() + c.gamma.imag()),
          T(0.5) * (c.gamma.real() - c.beta.real()), T(0.5) * (c.delta.imag() - c.alpha.imag())};
}

}  // namespace halfspin
