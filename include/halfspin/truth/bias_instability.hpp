#pragma once
/// @file
/// Bias instability for the synthetic gyro: flicker (1/f) rate noise approximated over a band of
/// averaging times by a sum of first-order Gauss–Markov processes with octave-spaced correlation
/// times and equal variances, generated exactly in discrete time (rate samples) and integrated
/// exactly over each sample interval (delta-angle samples). Allocation-free; float and double.
///
/// Units: B in rad/s, times in s, rates in rad/s, angles in rad.
///
/// §1 Why a sum. Flicker rate noise of PSD S(f) = B²/(2πf) (two-sided in the sense of IEEE Std
/// 952-1997 Annex C, whose Allan variance of a rate PSD is σ²(τ) = 4∫₀^∞ S(f) sin⁴(πfτ)/(πfτ)² df)
/// has the flat Allan variance σ² = (2 ln 2/π)·B², i.e. σ(τ) = √(2 ln 2/π)·B ≈ 0.664·B, because
/// ∫₀^∞ sin⁴x/x³ dx = ln 2 (Annex C's relation; the integral is checked by GSL quadrature in
/// tests/truth/test_gyro_noise_processes.cpp). One Gauss–Markov process gives a bump, not a flat
/// region (below).
///
/// §2 One Gauss–Markov process. x with autocorrelation R(s) = q²·e^{−|s|/T} (stationary variance
/// q², correlation time T; PSD S(f) = 2q²T/(1 + (2πfT)²)). Its angle θ(t) = ∫x has
/// D(u) = E[(θ(t+u) − θ(t))²] = 2∫₀^u (u − s)R(s) ds = 2q²T²(u/T − 1 + e^{−u/T}), and the Allan
/// variance of any stationary rate is E[(θ(t+2τ) − 2θ(t+τ) + θ(t))²]/(2τ²) = (4D(τ) − D(2τ))/(2τ²),
/// so with x = τ/T:
///     σ²(τ) = q²·g(x),   g(x) = f(x)/x²,   f(x) = 2x − 3 + 4e^{−x} − e^{−2x}.
/// g rises as 2x/3 for x ≪ 1 (a rate random walk) and falls as 2/x for x ≫ 1 (white): a bump.
/// For small x, f cancels catastrophically; f(x)/x³ = Σ_{n≥3} (−1)^{n+1}(2^n − 4)x^{n−3}/n! is
/// summed instead below x = 1 (gauss_markov_f_over_cube).
///
/// §3 The octave sum is exactly flat. With φ(x) = (1 − e^{−x})/x², g(x) = 2/x − 4φ(x) + 4φ(2x).
/// For correlation times T_i = T_0·2^i (i = 0 … M−1) and x_i = τ/T_i (so 2x_i = x_{i−1}) the φ
/// terms telescope and the 2/x_i form a geometric series:
///     Σ_i g(x_i) = 2 − U(τ/T_{M−1}) − L(τ/T_0),
///     U(y) = 2 − 4(y − 1 + e^{−y})/y²  (≈ 2y/3 for small y),
///     L(x) = 2/x − (1 − e^{−2x})/x²    (≈ 2/x for large x),
/// both ≥ 0. An infinite octave sum of equal variances q² thus has the Allan variance 2q² at every
/// τ, with no ripple; a finite one falls short by (U + L)/2 relative near its ends. We set
/// q² = (ln 2/π)·B², so that 2q² is the flicker level (2 ln 2/π)·B².
///
/// §4 The band. For a requested band [τ_lo, τ_hi] we take T_0 = 0.01·τ_lo and add octaves until
/// T_{M−1} ≥ τ_hi/0.03. Then at any τ in the band L(τ/T_0)/2 ≤ 1/100 (L/2 < 1/x and x ≥ 100) and
/// U(τ/T_{M−1})/2 ≤ y/3 ≤ 1/100 (y ≤ 0.03), so the Allan variance lies within 2 % below the
/// flicker level and the Allan deviation within 1 % below √(2 ln 2/π)·B (checked on a dense τ
/// grid, and against GSL quadrature of the Annex C integral of the sum's PSD, in the tests). That
/// takes M = 1 + ⌈log₂(τ_hi/τ_lo · 10⁴/3)⌉ processes: 23 for a band of three decades, at most
/// bias_instability_capacity (32: a band ratio up to about 6·10⁵); a wider band is cut at its long
/// end (flat_band_longest() says where it then ends). Outside the band the sum turns into white
/// noise above T_{M−1} and into a rate random walk below T_0, as flicker itself cannot (its
/// variance is infinite): choose the band to cover every τ the study looks at.
///
/// §5 Exact discretization (common practice, no source: Gaussian conditional moments of the
/// Ornstein–Uhlenbeck process dx = −x/T dt + q√(2/T) dW). Over one sample interval Δ, a = Δ/T,
/// φ = e^{−a}, c = 1 − φ = −expm1(−a) (accurate for tiny a), given x at the interval's start:
///     x_end = φ·x + e₁,                          Var e₁ = q²(1 − φ²) = q²·c(2 − c);
///     ∫ x dt = T·c·x + I,                        Var I = q²T²·f(a), Cov(e₁, I) = q²T·c²;
/// drawn from two standard normals z₁, z₂ as e₁ = s·z₁, I = k₁·e₁ + k₂·z₂ with s = q√(c(2 − c)),
/// k₁ = Cov/Var e₁ = T·c/(2 − c), k₂ = q·T·a^{3/2}·√r(a), r(a) = f(a)/a³ − (c/a)³/(2 − c) (→ 1/6
/// for small a, no cancellation beyond a factor 4). Delta-angle samples take the integral over
/// their interval, rate samples its mean (the integral over dt): exact in distribution, the only
/// error being the rounding of the coefficients and of x − c·x + s·z₁ in T (x is updated as
/// x − c·x, not φ·x, so that a decay c far below the unit roundoff is not lost to φ rounding to 1).
/// Why the mean for rates: processes with correlation times far below dt (the bank goes down to
/// 0.01·τ_lo) have no meaningful instantaneous reading at the sample rate; an instantaneous
/// sample would alias their whole variance q² into each rate sample, far above their Allan
/// variance. The synthetic gyro's white noise is the same kind of mean (σ = N/√dt).

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Most Gauss–Markov processes in a bias-instability bank (§4).
inline constexpr std::size_t bias_instability_capacity = 32;

/// σ²/B² of flicker rate noise, 2 ln 2/π (IEEE Std 952-1997 Annex C; §1).
template <class T>
constexpr T flicker_allan_variance_factor() noexcept {
  return T(2) * T(0.693147180559945309417232121458176568L) / pi<T>;
}

/// f(a)/a³ of §2, f(a) = 2a − 3 + 4e^{−a} − e^{−2a}: by its Taylor series below a = 1 (25 terms:
/// the remainder is below 2^28/28! < 1e-21 there), directly above. a ≥ 0, dimensionless.
template <class T>
T gauss_markov_f_over_cube(T a) noexcept {
  if (a < T(1)) {
    // Terms (−1)^{n+1}(2^n − 4) a^{n−3}/n!, n = 3, 4, …
    T sum = T(0);
    T power = T(1);      // a^{n−3}
    T factorial = T(6);  // n!
    T two_n = T(8);      // 2^n
    T sign = T(1);
    for (int n = 3; n < 28; ++n) {
      sum += sign * (two_n - T(4)) * power / factorial;
      power *= a;
      factorial *= static_cast<T>(n + 1);
      two_n *= T(2);
      sign = -sign;
    }
    return sum;
  }
  return (T(2) * a - T(3) + T(4) * std::exp(-a) - std::exp(T(-2) * a)) / (a * a * a);
}

/// Allan variance (rad²/s²) at averaging time tau (s) of one first-order Gauss–Markov rate process
/// of stationary variance `variance` (rad²/s²) and correlation time `correlation_time` (s) (§2).
template <class T>
T gauss_markov_allan_variance(T tau, T correlation_time, T variance) noexcept {
  const T x = tau / correlation_time;
  return variance * x * gauss_markov_f_over_cube(x);
}

/// A bank of octave-spaced Gauss–Markov processes on three axes approximating flicker rate noise
/// of coefficient B over a band of averaging times (§3–§5).
template <class T>
class BiasInstabilityBank {
 public:
  /// An empty bank: no bias instability.
  constexpr BiasInstabilityBank() noexcept = default;

  /// B (rad/s) flat over [band_shortest, band_longest] (s), for samples every sample_period (s).
  /// B ≤ 0, or a band that is not finite with 0 < shortest < longest, gives an empty bank
  /// (process_count() == 0).
  BiasInstabilityBank(T bias_instability, T band_shortest, T band_longest,
                      T sample_period) noexcept {
    const bool valid = bias_instability > T(0) && band_shortest > T(0) &&
                       band_longest > band_shortest && std::isfinite(band_longest) &&
                       std::isfinite(bias_instability) && sample_period > T(0);
    if (!valid) {
      return;
    }
    const T ratio = band_longest / band_shortest * T(1e4) / T(3);
    const T octaves = std::ceil(std::log2(ratio));
    const T limit = static_cast<T>(bias_instability_capacity - 1);
    count_ = 1 + static_cast<std::size_t>(octaves < limit ? octaves : limit);
    variance_ =
        T(0.693147180559945309417232121458176568L) / pi<T> * bias_instability * bias_instability;
    const T q = std::sqrt(variance_);
    T time_constant = T(0.01) * band_shortest;  // T_i, s
    for (std::size_t i = 0; i < count_; ++i) {
      Coefficients& k = coefficients_[i];
      const T a = sample_period / time_constant;
      const T c = -std::expm1(-a);
      k.correlation_time = time_constant;
      k.decay = c;
      k.innovation = q * std::sqrt(c * (T(2) - c));
      k.mean_integral = time_constant * c;
      k.innovation_share = time_constant * c / (T(2) - c);
      const T c_over_a = c / a;
      const T r = gauss_markov_f_over_cube(a) - c_over_a * c_over_a * c_over_a / (T(2) - c);
      k.integral_spread = q * time_constant * a * std::sqrt(a) * std::sqrt(r > T(0) ? r : T(0));
      time_constant *= T(2);
    }
  }

  /// Number of Gauss–Markov processes (0: disabled).
  constexpr std::size_t process_count() const noexcept { return count_; }
  /// Correlation time (s) of process i < process_count(): T_0·2^i.
  constexpr T correlation_time(std::size_t i) const noexcept {
    return coefficients_[i].correlation_time;
  }
  /// Stationary variance q² (rad²/s²) of each process, (ln 2/π)·B².
  constexpr T process_variance() const noexcept { return variance_; }
  /// Longest τ (s) of the flat band actually built: the requested one unless the capacity cut it.
  constexpr T flat_band_longest() const noexcept {
    return count_ == 0 ? T(0) : T(0.03) * coefficients_[count_ - 1].correlation_time;
  }

  /// Allan variance (rad²/s²) of the bank's rate noise at averaging time tau (s), summed over the
  /// processes (§2).
  T allan_variance(T tau) const noexcept {
    T sum = T(0);
    for (std::size_t i = 0; i < count_; ++i) {
      sum += gauss_markov_allan_variance(tau, coefficients_[i].correlation_time, variance_);
    }
    return sum;
  }

  /// Draws the stationary initial state; `normal()` returns standard normal deviates.
  template <class Normal>
  void start(Normal&& normal) noexcept {
    const T q = std::sqrt(variance_);
    for (std::size_t i = 0; i < count_; ++i) {
      state_[i] = q * draw(normal);
    }
  }

  /// The integral (rad) of the rate over the next sample interval, advancing to its end.
  template <class Normal>
  Vector3<T> next_angle(Normal&& normal) noexcept {
    Vector3<T> sum = Vector3<T>::zero();
    for (std::size_t i = 0; i < count_; ++i) {
      const Coefficients& k = coefficients_[i];
      Vector3<T>& x = state_[i];
      const Vector3<T> e1 = k.innovation * draw(normal);
      const Vector3<T> z2 = draw(normal);
      sum += k.mean_integral * x + k.innovation_share * e1 + k.integral_spread * z2;
      x += e1 - k.decay * x;
    }
    return sum;
  }

 private:
  struct Coefficients {
    T correlation_time{};  ///< s
    T decay{};             ///< c = 1 − e^{−Δ/T}
    T innovation{};        ///< s = q√(c(2 − c)), rad/s
    T mean_integral{};     ///< T·c, s
    T innovation_share{};  ///< k₁ = T·c/(2 − c), s
    T integral_spread{};   ///< k₂, rad
  };

  template <class Normal>
  static Vector3<T> draw(Normal& normal) noexcept {
    const T x = normal();
    const T y = normal();
    const T z = normal();
    return {x, y, z};
  }

  std::array<Coefficients, bias_instability_capacity> coefficients_{};
  std::array<Vector3<T>, bias_instability_capacity> state_{};
  std::size_t count_ = 0;
  T variance_{};
};

}  // namespace halfspin
