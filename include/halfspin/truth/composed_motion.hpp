#pragma once
/// @file
/// Truth motion: one motion carried by another. The body moves by `inner` relative to a frame that
/// itself moves by `outer` relative to the reference:
///     q(t) = q_outer(t) ⊗ q_inner(t),
///     ω(t) = R(q_inner(t))ᵀ·ω_outer(t) + ω_inner(t).
/// Derivation: q̇ = q̇_o ⊗ q_i + q_o ⊗ q̇_i = ½ q_o ⊗ (0, ω_o) ⊗ q_i + ½ q_o ⊗ q_i ⊗ (0, ω_i), so
/// ω = 2 q* ⊗ q̇ = q_i* ⊗ (0, ω_o) ⊗ q_i + ω_i, the outer rate seen in the body frame plus the inner
/// rate (common practice, no source: the addition of angular velocities). Exact wherever the two
/// motions are: e.g. a vehicle in a steady banked turn (outer: ConstantRateMotion) whose gyro frame
/// is coned by engine vibration (inner: ClassicalConingMotion) — the demo scenario of the tools.
/// There is no closed-form delta-angle; SyntheticGyro integrates rate(t) by Gauss–Legendre
/// quadrature (synthetic_gyro.hpp).

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Inner carried by Outer (see the file comment).
template <class T, class Outer, class Inner>
struct ComposedMotion {
  Outer outer;  ///< the carrying frame relative to the reference
  Inner inner;  ///< the body relative to the carrying frame

  /// Attitude (body → reference) at t (s).
  Quaternion<T> attitude(T t) const noexcept { return outer.attitude(t) * inner.attitude(t); }

  /// Body rate (rad/s) at t (s).
  Vector3<T> rate(T t) const noexcept {
    return rotate(conjugate(inner.attitude(t)), outer.rate(t)) + inner.rate(t);
  }
};

/// compose<T>(outer, inner): a ComposedMotion without spelling out the motion types.
template <class T, class Outer, class Inner>
constexpr ComposedMotion<T, Outer, Inner> compose(const Outer& outer, const Inner& inner) noexcept {
  return {outer, inner};
}

}  // namespace halfspin
