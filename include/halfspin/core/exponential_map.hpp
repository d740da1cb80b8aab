#pragma once
/// @file
/// The exponential and logarithm maps between rotation vectors φ (axis × angle, rad) and unit
/// quaternions: q = exp(φ/2) = (cos(|φ|/2), sin(|φ|/2)·φ/|φ|).

#include <cmath>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Floating-point operations of quaternion_exp on its series branch, the usual case for a gyro
/// step: |φ|² 5, two cubics in θ² 12, scaling φ 3. (Above the threshold add a square root, a
/// division and sin/cos.) Steppers add this to their own counts.
inline constexpr int quaternion_exp_series_flops = 20;

namespace detail {
// Below ScalarTraits::exp_series_angle_squared, from t = θ²: cos(θ/2) − 1 = −θ²/8 + θ⁴/384 −
// θ⁶/46080
// + … and sin(θ/2)/θ = 1/2 − θ²/48 + θ⁴/3840 − θ⁶/645120. The θ⁶ terms are below half an ulp at the
// threshold but always of one sign: dropping them would bias every step the same way and the norm
// would drift linearly over a long run.
template <class T>
constexpr void half_angle_series(T t, T& c_minus_one, T& s_over_angle) noexcept {
  c_minus_one = t * (T(-1.0L / 8) + t * (T(1.0L / 384) + t * T(-1.0L / 46080)));
  s_over_angle = T(0.5) + t * (T(-1.0L / 48) + t * (T(1.0L / 3840) + t * T(-1.0L / 645120)));
}

// The branch above the series threshold (θ² = t ≥ ScalarTraits::exp_series_angle_squared: a
// square root, a division and the sines), out of line. With sinf or sin called inline, every value
// the step keeps across the call needs a callee-saved register, so the usual path of every step
// (the series, no call) saved and restored them: on the Cortex-M4F a vpush and vpop of d8–d10 and
// four stack stores around each exponential-map step. Same arithmetic, same bits.
template <class T>
struct HalfAngleTerms {
  T first;         // cos(θ/2), or cos(θ/2) − 1
  T s_over_angle;  // sin(θ/2)/θ
};
template <class T>
[[gnu::cold, gnu::noinline]] HalfAngleTerms<T> half_angle_cosine_large(T t) noexcept {
  const T angle = std::sqrt(t);
  const T half = T(0.5) * angle;
  return {std::cos(half), std::sin(half) / angle};
}
// cos(θ/2) − 1 as −2·sin²(θ/4), without cancellation.
template <class T>
[[gnu::cold, gnu::noinline]] HalfAngleTerms<T> half_angle_cosine_minus_one_large(T t) noexcept {
  const T angle = std::sqrt(t);
  const T quarter_sine = std::sin(T(0.25) * angle);
  return {T(-2) * quarter_sine * quarter_sine, std::sin(T(0.5) * angle) / angle};
}
}  // namespace detail

/// Rotation vector φ (rad) → unit quaternion exp(φ/2). Below the per-type threshold of
/// ScalarTraits the series of cos(θ/2) and sin(θ/2)/θ are used, which need only θ² (no square root,
/// no trigonometry) and stay exact for denormal-sized φ. Valid for |φ|² below the type's maximum.
template <class T>
Quaternion<T> quaternion_exp(const Vector3<T>& phi) noexcept {
  const T t = squared_norm(phi);
  T c;
  T s_over_angle;  // sin(θ/2)/θ
  if (t < ScalarTraits<T>::exp_series_angle_squared) {
    T c_minus_one;
    detail::half_angle_series(t, c_minus_one, s_over_angle);
    c = T(1) + c_minus_one;
  } else {
    const detail::HalfAngleTerms<T> large = detail::half_angle_cosine_large(t);
    c = large.first;
    s_over_angle = large.s_over_angle;
  }
  return {c, s_over_angle * phi.x, s_over_angle * phi.y, s_over_angle * phi.z};
}

/// Floating-point operations of quaternion_exp_minus_one on its series branch: |φ|² 5, the two
/// polynomials in θ² 11 (the scalar one has no constant term), scaling φ 3.
inline constexpr int quaternion_exp_minus_one_series_flops = 19;

/// Rotation vector φ (rad) → exp(φ/2) − 1 = (cos(θ/2) − 1, sin(θ/2)·φ/θ), θ = |φ|: the increment of
/// a step, formed without cancellation so that it is accurate relative to its own size however
/// small the step (cos(θ/2) − 1 is never formed as a difference: the series −θ²/8 + θ⁴/384 −
/// θ⁶/46080 below the threshold of quaternion_exp, −2·sin²(θ/4) above it). Adding 1 to the scalar
/// part gives quaternion_exp(φ) up to one rounding.
template <class T>
Quaternion<T> quaternion_exp_minus_one(const Vector3<T>& phi) noexcept {
  const T t = squared_norm(phi);
  T c_minus_one;
  T s_over_angle;  // sin(θ/2)/θ
  if (t < ScalarTraits<T>::exp_series_angle_squared) {
    detail::half_angle_series(t, c_minus_one, s_over_angle);
  } else {
    const detail::HalfAngleTerms<T> large = detail::half_angle_cosine_minus_one_large(t);
    c_minus_one = large.first;
    s_over_angle = large.s_over_angle;
  }
  return {c_minus_one, s_over_angle * phi.x, s_over_angle * phi.y, s_over_angle * phi.z};
}

/// Quaternion → rotation vector φ (rad) of the shortest rotation, |φ| ≤ π (q and −q give the same
/// φ). Scale-invariant, so a slightly non-unit q gives the φ of q/|q|; q must be nonzero. Uses
/// θ = 2·atan2(|v|, |w|), accurate near 0 and near π; below the threshold, the series of
/// 2·atan(r)/r with r = |v|/|w|.
template <class T>
Vector3<T> quaternion_log(const Quaternion<T>& q) noexcept {
  const Quaternion<T> p = q.w < T(0) ? -q : q;
  const Vector3<T> v = p.vector();
  const T s2 = squared_norm(v);
  const T w2 = p.w * p.w;
  T factor;  // θ/|v|
  if (s2 < ScalarTraits<T>::log_series_ratio_squared * w2) {
    const T r2 = s2 / w2;
    // 2·atan(r)/(r·w) = (2/w)·(1 − r²/3 + r⁴/5 − r⁶/7 + …), the r⁶ term kept for the same reason
    factor = (T(2) / p.w) * (T(1) + r2 * (T(-1.0L / 3) + r2 * (T(1.0L / 5) + r2 * T(-1.0L / 7))));
  } else {
    const T s = std::sqrt(s2);
    factor = T(2) * std::atan2(s, p.w) / s;
  }
  return factor * v;
}

}  // namespace halfspin
