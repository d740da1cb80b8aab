#pragma once
/// @file
/// Truth motion: vibration lines (sinusoids on several body axes, any phases) with exact attitude.
/// The motion is defined by its attitude: the rotation whose rotation vector is a sum of
/// sinusoids per body axis,
///     q(t) = exp(½ θ(t)),   θ_i(t) = Σ_l (A_li / Ω_l)·sin(Ω_l t + φ_li),   Ω_l = 2π f_l,
/// for the lines l of a VibrationSpec (bounds/motion_description.hpp: A_li the rate amplitude about
/// body axis i, φ_li its phase; phases 0 where unknown; every f_l > 0). So A_li/Ω_l is the angle
/// amplitude of line l about axis i, and θ̇_i(t) = Σ_l A_li·cos(Ω_l t + φ_li) is exactly the rate
/// signal the VibrationSpec describes.
///
/// Derivation of the body rate. The body rate of q(t) = exp(½ θ(t)) is ω = 2 q* ⊗ q̇ =
/// J(θ)·θ̇, with J the derivative of the exponential map in the body frame (the right Jacobian of
/// SO(3); common practice, no source):
///     ω = θ̇ − c₁(ϑ)·(θ × θ̇) + c₂(ϑ)·θ × (θ × θ̇),   ϑ = |θ|,
///     c₁ = (1 − cos ϑ)/ϑ² = 2 sin²(ϑ/2)/ϑ²,   c₂ = (ϑ − sin ϑ)/ϑ³.
/// (To first order in θ, 2 q* ⊗ q̇ = θ̇ − ½ θ × θ̇, which fixes the sign of the c₁ term.) Hence
/// ω = θ̇ exactly when θ and θ̇ stay parallel (every line on one axis, or one line with equal
/// phases), and otherwise differs from the described signal by at most ½|θ||θ̇| + |θ|²|θ̇|/6: the
/// vibration's coning, which the described rate alone does not contain. Composing this with a turn
/// (composed_motion.hpp) gives a manoeuvring vehicle whose gyro frame vibrates, exactly.
/// Below ϑ² = 10⁻² c₁ and c₂ come from their Taylor series through ϑ¹⁰ (c₂'s closed form cancels
/// there; the first dropped terms, ϑ¹²/14! and ϑ¹²/15!, are below 10⁻²³); above it, the closed
/// forms, whose cancellation costs c₂ at most a factor 600 of its rounding where the c₂ term is
/// at most 2·10⁻³ of |θ̇|.
/// There is no closed-form delta-angle: truth_delta_angle (synthetic_gyro.hpp) integrates rate(t)
/// by Gauss–Legendre quadrature. Evaluate in double or long double.

#include <cmath>
#include <cstddef>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Vibration lines with exact attitude (see the file comment).
template <class T>
struct VibrationLinesMotion {
  VibrationSpec<T> lines{};  ///< each line: f > 0 (Hz), rate amplitude (rad/s) and phase (rad)

  /// θ(t) (rad): the rotation vector of the attitude at t (s).
  Vector3<T> rotation_vector(T t) const noexcept {
    Vector3<T> theta = Vector3<T>::zero();
    for (std::size_t l = 0; l < lines.count; ++l) {
      const VibrationLine<T>& line = lines.line[l];
      const T w = line.angular_frequency();
      const Vector3<T> p = line.phases_known ? line.phase : Vector3<T>::zero();
      const Vector3<T> a = line.rate_amplitude / w;
      theta += Vector3<T>{a.x * std::sin(w * t + p.x), a.y * std::sin(w * t + p.y),
                          a.z * std::sin(w * t + p.z)};
    }
    return theta;
  }
  /// θ̇(t) (rad/s): the sum of the lines' rate signals (VibrationLine::rate).
  Vector3<T> rotation_vector_rate(T t) const noexcept {
    Vector3<T> rate_sum = Vector3<T>::zero();
    for (std::size_t l = 0; l < lines.count; ++l) {
      rate_sum += lines.line[l].rate(t);
    }
    return rate_sum;
  }
  /// Attitude (body → carrying frame) at t (s): exp(½ θ(t)).
  Quaternion<T> attitude(T t) const noexcept { return quaternion_exp(rotation_vector(t)); }
  /// Body rate (rad/s) at t (s): J(θ)·θ̇ (header comment).
  Vector3<T> rate(T t) const noexcept {
    const Vector3<T> theta = rotation_vector(t);
    const Vector3<T> theta_rate = rotation_vector_rate(t);
    const T x = squared_norm(theta);
    T c1;
    T c2;
    if (x < T(1e-2)) {
      c1 = T(1) / T(2) +
           x * (T(-1) / T(24) +
                x * (T(1) / T(720) +
                     x * (T(-1) / T(40320) + x * (T(1) / T(3628800) - x / T(479001600)))));
      c2 = T(1) / T(6) +
           x * (T(-1) / T(120) +
                x * (T(1) / T(5040) +
                     x * (T(-1) / T(362880) + x * (T(1) / T(39916800) - x / T(6227020800)))));
    } else {
      const T angle = std::sqrt(x);
      const T s = std::sin(T(0.5) * angle);
      c1 = T(2) * s * s / x;
      c2 = (angle - std::sin(angle)) / (x * angle);
    }
    const Vector3<T> first = cross(theta, theta_rate);
    return theta_rate - c1 * first + c2 * cross(theta, first);
  }
};

}  // namespace halfspin
