#pragma once
/// @file
/// A synthetic gyro: samples a truth motion as body rates or as delta-angles, with an optional
/// constant bias, seeded white noise and quantization. Allocation-free and deterministic, so the
/// same scenario replays bit for bit on a desktop and on a target.
///
/// Timing. Sample k is taken at t_k = k·dt, k an integer counter (time is never accumulated by
/// repeated addition, which in float loses resolution within an hour). Rate sample k (k = 0, 1, …)
/// is ω(t_k); delta-angle sample k (k = 1, 2, …) is the integral of ω over (t_{k−1}, t_k].
///
/// Delta-angles come from the motion's closed-form delta_angle(t0, t1) when it has one; a motion
/// that offers only rate(t) is integrated with the 8-point Gauss–Legendre rule over each sample
/// interval (exact for polynomials of degree 15; for a rate band-limited to Ω rad/s its error is
/// below 2e-23·dt·(Ω dt)^16 times the rate's amplitude, far under roundoff whenever Ω·dt < 1).
///
/// Errors, applied in this order to each axis:
///  - bias b (rad/s), constant: adds b to a rate sample and b·dt to a delta-angle;
///  - white rate noise of density N (rad/s/√Hz, which is also the angle random walk in rad/√s): a
///    rate sample gets a Gaussian error of σ = N·√(1/dt) = N·√(sample rate); a delta-angle gets
///    the integral of that noise over its interval, σ = N·√dt. Noise draws are made for every
///    sample whatever N is, so two gyros with the same seed see the same noise sequence;
///    the rate random walk and the bias instability draw from a second source of their own
///    (seeded from the same seed) and only when they are enabled, so a model without them gives
///    bit for bit the sequence it gave before they existed;
///  - rate random walk K (rad/s/√s): a bias that random-walks, b(t) = K·W(t), W a standard Wiener
///    process starting at 0 with the first sample; increments of σ = K·√dt per sample and axis. A
///    delta-angle gets the exact integral of b over its interval, a rate sample its mean over the
///    interval of length dt that ends at t_k (as for the white noise: Annex C's relations then hold
///    from τ = dt in both forms, as for a gyro that averages over its sample interval), drawn
///    jointly with the increment from two normals z₁, z₂ (common practice, no source: Gaussian
///    moments of a Wiener process, Var ∫₀^Δ W = Δ³/3, Cov(∫₀^Δ W, W(Δ)) = Δ²/2):
///        b_end = b + K√dt·z₁,   ∫ b dt = b·dt + K·dt^{3/2}·(z₁/2 + z₂/(2√3));
///  - bias instability B (rad/s): flicker rate noise, flat Allan deviation √(2 ln 2/π)·B ≈ 0.664·B
///    over a band of averaging times [flicker_band_shortest, flicker_band_longest], made as a sum
///    of octave-spaced Gauss–Markov processes, exact in discrete time and integrated exactly over
///    each sample interval (rate samples: the mean over it, as for the random walk; derivation,
///    flatness within 1 % over the band, and its limits: truth/bias_instability.hpp);
///  - quantization to a multiple of the least significant bit (LSB), rounding to nearest: rates
///    to rate_quantum (rad/s), each sample independently (an instantaneous reading, error ≤ LSB/2);
///    delta-angles to angle_quantum (rad), carrying the residual to the next sample when
///    carry_angle_residual is set, as real delta-angle outputs do (they read an accumulating angle
///    counter). With the carry the sum of the outputs stays within LSB/2 of the sum of the inputs
///    forever, up to the roundoff of adding the residual in T (each output is within one LSB of its
///    input); without it the rounding errors add up as a random walk. A quantum of 0 turns
///    quantization off.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>
#include <utility>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/truth/bias_instability.hpp"

namespace halfspin {

/// A small seeded pseudo-random source: 64-bit state advanced by a Weyl sequence and scrambled by
/// the SplitMix64 output mix (Steele, Lea and Flood, OOPSLA 2014; constants from memory), turned
/// into standard normal deviates by the Box–Muller transform. Statistical quality is ample for
/// sensor-noise simulation; it is not for cryptography.
template <class T>
class GaussianNoiseSource {
 public:
  /// Seeds the generator; any 64-bit seed is valid, including 0.
  constexpr explicit GaussianNoiseSource(std::uint64_t seed) noexcept : state_(seed) {}

  /// The next 64 pseudo-random bits.
  constexpr std::uint64_t next_bits() noexcept {
    state_ += 0x9E3779B97F4A7C15ULL;
    std::uint64_t z = state_;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
    return z ^ (z >> 31);
  }

  /// Uniform deviate in (0, 1], with the type's full mantissa (up to 64 bits); never 0, so its
  /// logarithm is finite.
  T next_uniform() noexcept {
    constexpr int bits = std::numeric_limits<T>::digits < 64 ? std::numeric_limits<T>::digits : 64;
    const std::uint64_t m = next_bits() >> (64 - bits);
    return std::ldexp(static_cast<T>(m) + T(1), -bits);
  }

  /// Standard normal deviate (mean 0, variance 1). Box–Muller yields two per pair of uniforms; the
  /// second is kept for the next call.
  T next_gaussian() noexcept {
    if (has_spare_) {
      has_spare_ = false;
      return spare_;
    }
    const T u1 = next_uniform();
    const T u2 = next_uniform();
    const T radius = std::sqrt(T(-2) * std::log(u1));
    const T angle = T(2) * pi<T> * u2;
    spare_ = radius * std::sin(angle);
    has_spare_ = true;
    return radius * std::cos(angle);
  }

 private:
  std::uint64_t state_;
  T spare_{};
  bool has_spare_{false};
};

/// Rounds x to the nearest multiple of quantum (half-way cases away from zero); quantum 0 returns
/// x unchanged. Units are those of x (rad/s or rad).
template <class T>
T quantize(T x, T quantum) noexcept {
  return quantum > T(0) ? quantum * std::round(x / quantum) : x;
}

/// Whether a truth motion has a closed-form delta_angle(t0, t1) (else it is integrated from
/// rate(t)).
template <class Motion, class T, class = void>
struct has_closed_form_delta_angle : std::false_type {};
template <class Motion, class T>
struct has_closed_form_delta_angle<Motion, T,
                                   std::void_t<decltype(std::declval<const Motion&>().delta_angle(
                                       std::declval<T>(), std::declval<T>()))>> : std::true_type {};

/// The integral of motion.rate(t) (rad/s) over [t0, t1] (s), in rad, by the 8-point Gauss–Legendre
/// rule on that interval.
template <class T, class Motion>
Vector3<T> gauss_legendre_delta_angle(const Motion& motion, T t0, T t1) noexcept {
  // Nodes ±x_i on [−1, 1] and their weights, computed to 30 digits by Newton's method on the
  // degree-8 Legendre polynomial (checked against GSL's table in the tests).
  constexpr std::array<long double, 4> node{
      0.183434642495649804939476142360L, 0.525532409916328985817739049189L,
      0.796666477413626739591553936476L, 0.960289856497536231683560868569L};
  constexpr std::array<long double, 4> weight{
      0.362683783378361982965150449277L, 0.313706645877887287337962201987L,
      0.222381034453374470544355994426L, 0.101228536290376259152531354310L};
  const T half = T(0.5) * (t1 - t0);
  const T mid = t0 + half;
  Vector3<T> sum = Vector3<T>::zero();
  for (std::size_t i = 0; i < 4; ++i) {
    const T offset = half * static_cast<T>(node[i]);
    sum += static_cast<T>(weight[i]) * (motion.rate(mid - offset) + motion.rate(mid + offset));
  }
  return half * sum;
}

/// The integral of the body rate over (t0, t1] (s), in rad: closed form when the motion has one,
/// otherwise Gauss–Legendre quadrature of rate(t).
template <class T, class Motion>
Vector3<T> truth_delta_angle(const Motion& motion, T t0, T t1) noexcept {
  if constexpr (has_closed_form_delta_angle<Motion, T>::value) {
    return motion.delta_angle(t0, t1);
  } else {
    return gauss_legendre_delta_angle(motion, t0, t1);
  }
}

/// Which quantity the gyro outputs.
enum class GyroOutputForm : std::uint8_t {
  rate,        ///< body rate at the sample time, rad/s
  delta_angle  ///< integral of the body rate over the sample interval, rad
};

/// The gyro's error model; all zero is a perfect gyro.
template <class T>
struct GyroErrorModel {
  Vector3<T> bias{};  ///< rad/s per axis, constant
  T noise_density{};  ///< N, rad/s/√Hz (= rad/√s), white rate noise
  T rate_quantum{};   ///< rad/s, LSB of a rate output; 0 = not quantized
  T angle_quantum{};  ///< rad, LSB of a delta-angle output; 0 = not quantized
  /// delta-angles: carry the rounding residual to the next sample
  bool carry_angle_residual{true};
  T rate_random_walk{};       ///< K, rad/s/√s; 0 = none
  T bias_instability{};       ///< B, rad/s; 0 = none
  T flicker_band_shortest{};  ///< s: B's flat Allan band starts here (needs B > 0)
  T flicker_band_longest{};   ///< s: and ends here (truth/bias_instability.hpp, §4)
};

/// Samples `Motion` (anything with rate(T) → Vector3<T> in rad/s, and optionally
/// delta_angle(T, T) → Vector3<T> in rad) at a fixed sample period. Holds a copy of the motion.
template <class T, class Motion>
class SyntheticGyro {
 public:
  /// form: rates or delta-angles; sample_period dt > 0 in s; seed: the noise sequence.
  SyntheticGyro(const Motion& motion, GyroOutputForm form, T sample_period,
                const GyroErrorModel<T>& model, std::uint64_t seed) noexcept
      : motion_(motion),
        form_(form),
        dt_(sample_period),
        model_(model),
        noise_(seed),
        rate_sigma_(model.noise_density / std::sqrt(sample_period)),
        angle_sigma_(model.noise_density * std::sqrt(sample_period)),
        index_(form == GyroOutputForm::rate ? 0 : 1),
        process_noise_(seed ^ process_seed_offset),
        walk_step_(model.rate_random_walk * std::sqrt(sample_period)),
        walk_integral_(model.rate_random_walk * sample_period * std::sqrt(sample_period) / T(2)),
        walk_integral_spread_(walk_integral_ / std::sqrt(T(3))),
        instability_(model.bias_instability, model.flicker_band_shortest,
                     model.flicker_band_longest, sample_period) {
    instability_.start(normal());
  }

  /// The next sample: a rate (rad/s) at t_k = k·dt, or a delta-angle (rad) over (t_{k−1}, t_k];
  /// advances k.
  Vector3<T> next() noexcept {
    const Vector3<T> noise{noise_.next_gaussian(), noise_.next_gaussian(), noise_.next_gaussian()};
    Vector3<T> out;
    if (form_ == GyroOutputForm::rate) {
      Vector3<T> v = truth_rate(index_) + model_.bias + rate_sigma_ * noise;
      if (has_processes()) {
        v += next_process_rate();
      }
      out = {quantize(v.x, model_.rate_quantum), quantize(v.y, model_.rate_quantum),
             quantize(v.z, model_.rate_quantum)};
    } else {
      Vector3<T> v = truth_delta_angle_sample(index_) + dt_ * model_.bias + angle_sigma_ * noise;
      if (has_processes()) {
        v += next_process_angle();
      }
      const Vector3<T> carried = model_.carry_angle_residual ? v + residual_ : v;
      out = {quantize(carried.x, model_.angle_quantum), quantize(carried.y, model_.angle_quantum),
             quantize(carried.z, model_.angle_quantum)};
      if (model_.carry_angle_residual) {
        residual_ = carried - out;
      }
    }
    ++index_;
    return out;
  }

  /// Index k of the sample the next call to next() returns.
  constexpr std::int64_t next_index() const noexcept { return index_; }
  /// Sample time t_k = k·dt (s), computed from the integer k.
  constexpr T sample_time(std::int64_t k) const noexcept { return static_cast<T>(k) * dt_; }
  /// Error-free rate (rad/s) at t_k.
  Vector3<T> truth_rate(std::int64_t k) const noexcept { return motion_.rate(sample_time(k)); }
  /// Error-free delta-angle (rad) over (t_{k−1}, t_k].
  Vector3<T> truth_delta_angle_sample(std::int64_t k) const noexcept {
    return truth_delta_angle(motion_, sample_time(k - 1), sample_time(k));
  }
  /// Quantization residual (rad) carried into the next delta-angle; |each axis| ≤ angle_quantum/2.
  constexpr const Vector3<T>& carried_residual() const noexcept { return residual_; }
  /// σ of the noise on one output sample: rad/s for rates, rad for delta-angles.
  constexpr T noise_sigma() const noexcept {
    return form_ == GyroOutputForm::rate ? rate_sigma_ : angle_sigma_;
  }
  /// The rate random walk's bias (rad/s) at the next sample's time (rates) or at the start of the
  /// next sample's interval (delta-angles).
  constexpr const Vector3<T>& rate_random_walk_bias() const noexcept { return walk_; }
  /// The bias-instability processes (truth/bias_instability.hpp): count, correlation times, band.
  constexpr const BiasInstabilityBank<T>& bias_instability() const noexcept { return instability_; }
  /// Whether next() returns rates (rad/s) or delta-angles (rad).
  constexpr GyroOutputForm form() const noexcept { return form_; }
  /// The sample period dt, s.
  constexpr T sample_period() const noexcept { return dt_; }

 private:
  Motion motion_;
  GyroOutputForm form_;
  T dt_;
  GyroErrorModel<T> model_;
  GaussianNoiseSource<T> noise_;
  T rate_sigma_;
  T angle_sigma_;
  // The rate random walk's and bias instability's own source is seeded with seed XOR this (the
  // first 64 bits of the fractional part of √2), so it never replays the white-noise draws.
  static constexpr std::uint64_t process_seed_offset = 0x6A09E667F3BCC908ULL;

  // A standard normal deviate from the processes' source, as a callable for the bank.
  auto normal() noexcept {
    return [this]() noexcept { return process_noise_.next_gaussian(); };
  }

  constexpr bool has_processes() const noexcept {
    return walk_step_ > T(0) || instability_.process_count() > 0;
  }

  // Rate random walk plus bias instability (rad/s): their mean over the interval (t_k − dt, t_k]
  // (see the header comment); advances them.
  Vector3<T> next_process_rate() noexcept { return (T(1) / dt_) * next_process_angle(); }

  // Their integral over the sample interval (rad); advances them to its end.
  Vector3<T> next_process_angle() noexcept {
    Vector3<T> sum = Vector3<T>::zero();
    if (walk_step_ > T(0)) {
      Vector3<T> z1;
      Vector3<T> z2;
      z1.x = process_noise_.next_gaussian();
      z2.x = process_noise_.next_gaussian();
      z1.y = process_noise_.next_gaussian();
      z2.y = process_noise_.next_gaussian();
      z1.z = process_noise_.next_gaussian();
      z2.z = process_noise_.next_gaussian();
      sum = dt_ * walk_ + walk_integral_ * z1 + walk_integral_spread_ * z2;
      walk_ += walk_step_ * z1;
    }
    if (instability_.process_count() > 0) {
      sum += instability_.next_angle(normal());
    }
    return sum;
  }

  std::int64_t index_;
  Vector3<T> residual_{};
  GaussianNoiseSource<T> process_noise_;
  T walk_step_;             // K√dt, rad/s
  T walk_integral_;         // K·dt^{3/2}/2, rad
  T walk_integral_spread_;  // K·dt^{3/2}/(2√3), rad
  Vector3<T> walk_{};       // the random-walk bias, rad/s
  BiasInstabilityBank<T> instability_;
};

}  // namespace halfspin
