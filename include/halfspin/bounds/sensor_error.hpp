#pragma once
/// @file
/// The attitude error a gyro's own errors cause over a horizon, term by term, and the integration
/// budget that keeps the integration error a chosen fraction of it. Integration error only has to
/// be small beside what the sensor itself causes: pushing it far below costs cycles and buys
/// nothing.
///
/// The terms are the noise terms read from a static log's Allan deviation (IEEE Std 952-1997,
/// Annex C), with Annex C's two-sided rate power spectral densities S_Ω(f):
///   angle random walk N (rad/√s):  S_Ω = N²,              Allan variance σ²(τ) = N²/τ;
///   rate random walk K (rad/s/√s): S_Ω = (K/2π)²/f²,      σ²(τ) = K²τ/3;
///   bias instability B (rad/s):    S_Ω = (B²/2π)/f (f ≤ f0), σ(τ) → B·√(2 ln 2/π) ≈ 0.664·B;
/// and a residual bias b (rad/s): what calibration leaves (turn-on repeatability, the residue of
/// the temperature model), a constant over the horizon.
///
/// The attitude error of one axis over a horizon t, the integral of the rate error over [0, t]
/// (small angles: the errors are far below a radian, so the axes' errors add as rotation vectors):
///   N:  white rate noise integrates to a random walk in angle: σ_θ = N·√t (1σ). From Annex C's
///       S_Ω: Var θ(t) = ∫ S_Ω(f)·sin²(πft)/(πf)² df over all f = N²·t (checked by quadrature in
///       the tests);
///   K:  a rate that random-walks from its value at the start (the bias known at t = 0) is a
///       Wiener process of intensity K², and Var ∫₀ᵗ W = K²·∫₀ᵗ∫₀ᵗ min(s, u) ds du = K²·t³/3:
///       σ_θ = K·t^{3/2}/√3 (1σ);
///   B:  the bias wanders within about ±B of its calibrated value over the times where the Allan
///       deviation is flat, so the angle grows by at most about B·t. A common rule of the trade
///       (common practice, no source), not a bound of a stochastic process: flicker noise's
///       variance over [0, t] grows without limit as the low-frequency cut-off goes to zero;
///   b:  a constant bias turns the attitude by b·t, exactly.
/// The combined figure is the root-sum-square of the four: the processes are independent, and
/// the root-sum-square is the smallest of the usual combinations (at most the linear sum, at least
/// half of it), so a fraction of it is the strict criterion for the integration error. All figures
/// are per axis: an attitude error angle over three axes with the same terms is √3 times larger in
/// r.m.s., so the per-axis figure keeps the criterion strict again.
///
/// Caution: these are models of a datasheet's or a static log's figures. On a vehicle, vibration
/// rectification, g-sensitivity, scale-factor and misalignment residues, and temperature
/// transients add to them; validate in hardware-in-the-loop and flight test, under local
/// airworthiness rules and licensed practice.

#include <cmath>
#include <limits>

#include "halfspin/core/scalar_traits.hpp"

namespace halfspin {

/// A gyro's noise terms, per axis, in SI units. All zero is a perfect gyro.
template <class T>
struct GyroNoiseTerms {
  T angle_random_walk =
      T(0);  ///< N, rad/√s (= rad/s/√Hz): the −½ slope of the Allan deviation at τ = 1 s
  T bias_instability = T(0);  ///< B, rad/s: the Allan deviation's flat minimum / 0.664
  T rate_random_walk = T(0);  ///< K, rad/s/√s: the +½ slope at τ = 3 s
  T residual_bias = T(0);     ///< b, rad/s: the bias left after calibration, taken as constant
};

/// Datasheet units to SI: angle random walk °/√h → rad/√s.
template <class T>
constexpr T angle_random_walk_from_degrees_per_root_hour(T value) noexcept {
  return value * (pi<T> / T(180)) / T(60);
}
/// Bias (or bias instability) °/h → rad/s.
template <class T>
constexpr T rate_from_degrees_per_hour(T value) noexcept {
  return value * (pi<T> / T(180)) / T(3600);
}
/// Rate random walk °/h/√h → rad/s/√s.
template <class T>
constexpr T rate_random_walk_from_degrees_per_hour_root_hour(T value) noexcept {
  return value * (pi<T> / T(180)) / T(3600) / T(60);
}

/// The attitude error each term causes over a horizon, per axis (rad), and their combination.
template <class T>
struct SensorAttitudeError {
  T angle_random_walk_rad = T(0);  ///< N·√t, 1σ
  T rate_random_walk_rad = T(0);   ///< K·t^{3/2}/√3, 1σ
  T bias_instability_rad = T(0);   ///< B·t, the trade's rule for the bias wander
  T residual_bias_rad = T(0);      ///< |b|·t
  T combined_rad = T(0);           ///< root-sum-square of the four; NaN for invalid arguments
};

/// Whether every term is finite and not negative (the residual bias may have either sign).
template <class T>
bool noise_terms_valid(const GyroNoiseTerms<T>& terms) noexcept {
  return std::isfinite(terms.angle_random_walk) && terms.angle_random_walk >= T(0) &&
         std::isfinite(terms.bias_instability) && terms.bias_instability >= T(0) &&
         std::isfinite(terms.rate_random_walk) && terms.rate_random_walk >= T(0) &&
         std::isfinite(terms.residual_bias);
}

/// The attitude error of one axis over horizon_s (s) from each term (formulas above). Invalid
/// terms, or a horizon that is not positive and finite, give NaN in every field.
template <class T>
SensorAttitudeError<T> sensor_attitude_error(const GyroNoiseTerms<T>& terms, T horizon_s) noexcept {
  SensorAttitudeError<T> e;
  if (!noise_terms_valid(terms) || !(horizon_s > T(0)) || !std::isfinite(horizon_s)) {
    const T nan = std::numeric_limits<T>::quiet_NaN();
    return {nan, nan, nan, nan, nan};
  }
  const T root_t = std::sqrt(horizon_s);
  e.angle_random_walk_rad = terms.angle_random_walk * root_t;
  e.rate_random_walk_rad = terms.rate_random_walk * horizon_s * root_t / std::sqrt(T(3));
  e.bias_instability_rad = terms.bias_instability * horizon_s;
  e.residual_bias_rad = std::fabs(terms.residual_bias) * horizon_s;
  // Scaled by the largest part, so squaring neither overflows nor underflows.
  const T largest = std::fmax(std::fmax(e.angle_random_walk_rad, e.rate_random_walk_rad),
                              std::fmax(e.bias_instability_rad, e.residual_bias_rad));
  if (largest > T(0)) {
    const T a = e.angle_random_walk_rad / largest;
    const T k = e.rate_random_walk_rad / largest;
    const T bi = e.bias_instability_rad / largest;
    const T b = e.residual_bias_rad / largest;
    e.combined_rad = largest * std::sqrt(a * a + k * k + bi * bi + b * b);
  }
  return e;
}

/// The integration budget (rad) that holds the integration error to `fraction` of the combined
/// sensor-driven error over horizon_s: fraction·combined. NaN for invalid terms or horizon, or a
/// fraction outside (0, 1]; 0 for a perfect gyro (then only an absolute budget can apply).
template <class T>
T sensor_fraction_budget(const GyroNoiseTerms<T>& terms, T horizon_s, T fraction) noexcept {
  if (!(fraction > T(0)) || !(fraction <= T(1))) {
    return std::numeric_limits<T>::quiet_NaN();
  }
  return fraction * sensor_attitude_error(terms, horizon_s).combined_rad;
}

}  // namespace halfspin
