#pragma once
/// @file
/// Truth motion: the torque-free axisymmetric rigid body (principal inertias I1 = I2 = It about
/// the transverse axes x, y and I3 about the symmetry axis z), in closed form.
///
/// Rate. Euler's equations without torque, I ω̇ + ω × (I ω) = 0, become
///     It ω̇1 = (It − I3) ω2 ω3,   It ω̇2 = (I3 − It) ω3 ω1,   I3 ω̇3 = 0,
/// so ω3 is constant and, with λ = (I3 − It)/It · ω3, ω̇1 = −λ ω2 and ω̇2 = λ ω1:
///     ω(t) = (ω⊥ cos(λt + φ0), ω⊥ sin(λt + φ0), ω3).
/// The transverse rate turns about the body z axis at +λ (with z for a flattened body, I3 > It;
/// against it for an elongated one).
///
/// Attitude (body → reference). Let h(t) = I ω(t) be the angular momentum in body axes and
/// h0 = h(0). Then ω = h/It − λ e3, and the attitude is
///     q(t) = q0 ⊗ exp(½ (h0/It) t) ⊗ exp(−½ λ t e3),
/// with exp the quaternion exponential of a rotation vector, exp(½ φ) = (cos(|φ|/2), sin(|φ|/2)
/// φ/|φ|). Why: write q = q0 ⊗ P(t) ⊗ S(t) with P = exp(½ ν t u0), u0 = h0/|h0|, ν = |h0|/It, and S
/// = exp(−½ λ t e3). Then 2 q* ⊗ q̇ = S* ⊗ (0, ν u0) ⊗ S − λ e3 = ν R(S)ᵀ u0 − λ e3, and R(S)ᵀ turns
/// h0 by +λt about e3, which is h(t) (ω⊥'s phase advances by λt, h3 is constant); hence the rate is
/// h(t)/It − λ e3 = ω(t). Equivalently q(t) = exp(½ ν t û) ⊗ q0 ⊗ S(t) with û = R(q0) u0 the
/// direction of the inertial angular momentum H = R(q0) h0: a fixed rotation (q0, which carries h0
/// onto H), a precession about H at |H|/It, and a body spin at −λ about the symmetry axis. H =
/// R(q(t)) h(t) stays constant, as it must without torque. Evaluate in double or long double.

#include <cmath>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// The torque-free axisymmetric body (see the file comment).
template <class T>
struct AxisymmetricBodyMotion {
  Quaternion<T> initial{Quaternion<T>::identity()};  ///< q0: attitude at t = 0 (body → reference)
  T transverse_inertia{T(1)};  ///< It = I1 = I2, kg·m² (only the ratio I3/It matters)
  T axial_inertia{T(1)};       ///< I3, kg·m²
  T transverse_rate{};         ///< ω⊥ ≥ 0, rad/s: magnitude of the rate's x–y part
  T transverse_phase{};  ///< φ0, rad: direction of the x–y part at t = 0, from body x towards y
  T axial_rate{};        ///< ω3, rad/s: rate about the symmetry axis (constant)

  /// λ = (I3 − It)/It · ω3, rad/s: the rate at which ω turns about body z (seen from the body).
  T body_turning_rate() const noexcept {
    return (axial_inertia - transverse_inertia) / transverse_inertia * axial_rate;
  }
  /// h0/It, rad/s (body axes at t = 0): the precession rate vector |H|/It along the momentum.
  Vector3<T> precession_rate_vector() const noexcept {
    return {transverse_rate * std::cos(transverse_phase),
            transverse_rate * std::sin(transverse_phase),
            axial_inertia / transverse_inertia * axial_rate};
  }
  /// |H|/It, rad/s: the rate at which the symmetry axis precesses about the inertial momentum.
  T precession_rate() const noexcept { return norm(precession_rate_vector()); }
  /// Angular momentum H in the reference frame, kg·m²/s (constant in time).
  Vector3<T> angular_momentum() const noexcept {
    return rotate(initial, transverse_inertia * precession_rate_vector());
  }
  /// Attitude (body → reference) at t (s): q0 ⊗ exp(½ (h0/It) t) ⊗ exp(−½ λ t e3).
  Quaternion<T> attitude(T t) const noexcept {
    return initial * quaternion_exp(precession_rate_vector() * t) *
           quaternion_exp(Vector3<T>{T(0), T(0), -body_turning_rate() * t});
  }
  /// Body rate (rad/s) at t (s): (ω⊥ cos(λt + φ0), ω⊥ sin(λt + φ0), ω3).
  Vector3<T> rate(T t) const noexcept {
    const T a = body_turning_rate() * t + transverse_phase;
    return {transverse_rate * std::cos(a), transverse_rate * std::sin(a), axial_rate};
  }
  /// Delta-angle (rad): the integral of the body rate over (t0, t1], t in s. The transverse part,
  /// ω⊥ (sin a1 − sin a0, cos a0 − cos a1)/λ, is written as ω⊥ (t1 − t0) sinc(λ(t1 − t0)/2)
  /// (cos a_mid, sin a_mid): no cancellation for a short interval, and no division by λ, which is
  /// zero for a sphere (I3 = It) or without axial spin.
  Vector3<T> delta_angle(T t0, T t1) const noexcept {
    const T lambda = body_turning_rate();
    const T span = t1 - t0;
    const T mid = lambda * (T(0.5) * (t0 + t1)) + transverse_phase;
    const T transverse = transverse_rate * span * sin_over_angle(T(0.5) * lambda * span);
    return {transverse * std::cos(mid), transverse * std::sin(mid), axial_rate * span};
  }

 private:
  // sin(x)/x, 1 at 0. Below the threshold the series 1 − x²/6 + x⁴/120 is used: it is sin(θ/2)/θ
  // of quaternion_exp (θ = 2x) times two, so the same per-type threshold keeps the dropped term
  // x⁶/5040 under a quarter ulp.
  static T sin_over_angle(T x) noexcept {
    const T x2 = x * x;
    if (T(4) * x2 < ScalarTraits<T>::exp_series_angle_squared) {
      return T(1) + x2 * (T(-1.0L / 6) + x2 * T(1.0L / 120));
    }
    return std::sin(x) / x;
  }
};

}  // namespace halfspin
