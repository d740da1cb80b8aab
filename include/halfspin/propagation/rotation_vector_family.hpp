#pragma once
/// @file
/// The rotation-vector family as data: every stepper whose step is q ⊗ exp(φ/2) with
///     φ = α̂ + β̂,   α̂ = Σ w_i s_i (× dt for rates),   β̂ = Σ_m c_m Σ_{j−i=m} s_i × s_j (× dt² for
///     rates),
/// the s_i being the samples of the step's window: rate samples (rad/s) at points of the step, or
/// delta-angles (rad) over the sample intervals that tile it (with, for one algorithm, the previous
/// step's last one in front). α̂ is a quadrature of ∫ω (exact for delta-angles), β̂ estimates the
/// commutator (coning) term β = ½∫α×ω of the Magnus expansion / Bortz's rotation-vector equation
/// (see REFERENCES.md; the split φ* = α + β + R: bounds/magnus_family_bounds.hpp §1). The
/// exponential-map steps (β̂ = 0), the fourth-order Magnus step and the multi-sample coning
/// algorithms are the members; each is one RotationVectorRule below, and everything else is
/// derived from it here: the order for general smooth motion, the order of the
/// coning drift under pure classical coning, the flop count, and (in the bounds layer) the
/// a-priori error bound. A stepper and its bound therefore cannot disagree.
///
/// Order for general motion (derivation ours, the inputs are the Magnus expansion and the
/// moments of the samples; bounds/magnus_family_bounds.hpp §2–§4 has the full error expansion):
///   quadrature: a rule exact for polynomials of degree d has local error O(h^(d+2)), global d + 1;
///   commutator: with the step as τ ∈ [−½, ½] and ω = m + pτ + qτ²/2 + …, β = h³/12·m×p + O(h⁵),
///     and β̂ has coefficient κ_p = Σ c(μ0ᵢμ1ⱼ − μ0ⱼμ1ᵢ) on m×p and κ_q = Σ c(μ0ᵢμ2ⱼ − μ0ⱼμ2ᵢ) on
///     m×q (μ_k the moments ℓ(τᵏ/k!) of each sample functional ℓ). κ_p ≠ 1/12 leaves an h³ term
///     (global order 2), κ_q ≠ 0 an h⁴ term (order 3), otherwise the third Magnus term O(h⁵)
///     remains (order 4).
///   order = min(d + 1, that); delta-angles carry α exactly.
/// Coning order (delta-angle rules): coning_drift_order applies the series-matching criterion
/// derived in coning_compensation.hpp ("Derivation of c_m") to the rule's weights.
/// Flops (+ − ×, counted from the code below): quadrature 3 per added sample, 3 per weight other
/// than 1, 3 for the scaling (rates: dt times the weight denominator 1 more); commutator per
/// separation with a nonzero weight 9 per pair, 3 per added pair, 3 to scale, 3 to add
/// (rates: 2 for dt²·c); then exp(φ/2) − 1 (series branch) and the plain application.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <type_traits>
#include <utility>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// Per-pair weights of the cross products, by separation: a product of two samples `separation`
/// = index + 1 sample periods apart has weight numerators[index]/denominator.
template <std::size_t Separations>
struct ConingCoefficientSet {
  std::array<std::int32_t, Separations> numerators;  ///< numerator per separation
  std::int32_t denominator;                          ///< the common denominator
};

/// One member of the family: its input layout, the quadrature weights of its window's samples
/// (numerators over one denominator; for delta-angles 1 on the samples of the step, 0 on a
/// previous one) and the commutator weights by separation (W − 1 separations, zeros allowed).
template <std::size_t W>
struct RotationVectorRule {
  static constexpr std::size_t window = W;               ///< W, the samples in the window
  SampleLayout layout;                                   ///< what the samples hold
  std::array<std::int32_t, W> quadrature;                ///< quadrature numerators, one per sample
  std::int32_t quadrature_denominator;                   ///< their common denominator
  ConingCoefficientSet<(W > 0 ? W - 1 : 0)> commutator;  ///< commutator weights by separation
};

namespace detail {

// Exact rationals (int64) for the derivations: a consistent or symmetric rule's mismatch must be
// exactly 0 in every scalar type.
struct Rational {
  std::int64_t num{0};
  std::int64_t den{1};  // > 0; a value-initialized Rational is 0
};
constexpr std::int64_t greatest_common_divisor(std::int64_t a, std::int64_t b) noexcept {
  a = a < 0 ? -a : a;
  b = b < 0 ? -b : b;
  while (b != 0) {
    const std::int64_t r = a % b;
    a = b;
    b = r;
  }
  return a == 0 ? 1 : a;
}
constexpr Rational reduced(std::int64_t num, std::int64_t den) noexcept {
  const std::int64_t g = greatest_common_divisor(num, den);
  return den < 0 ? Rational{-num / g, -den / g} : Rational{num / g, den / g};
}
constexpr Rational operator+(Rational a, Rational b) noexcept {
  const std::int64_t g = greatest_common_divisor(a.den, b.den);
  return reduced(a.num * (b.den / g) + b.num * (a.den / g), (a.den / g) * b.den);
}
constexpr Rational operator-(Rational a, Rational b) noexcept {
  return a + Rational{-b.num, b.den};
}
constexpr Rational operator*(Rational a, Rational b) noexcept {
  const Rational x = reduced(a.num, b.den);
  const Rational y = reduced(b.num, a.den);
  return reduced(x.num * y.num, x.den * y.den);
}
template <class T>
constexpr T to_scalar(Rational r) noexcept {
  return static_cast<T>(r.num) / static_cast<T>(r.den);
}
template <class T>
constexpr T absolute_value(T x) noexcept {
  return x < T(0) ? -x : x;
}

// Moments of one linear functional ℓ of ω, in units where the step is [−½, ½] (τ = t/h − ½):
// mu[j] = ℓ(τʲ/j!), j = 0..3, exact, and absolute moments abs[j] = ℓ(|τ|ʲ/j!), j = 0..4.
template <class T>
struct SampleMoments {
  std::array<Rational, 4> mu{};
  std::array<T, 5> abs{};
};

// ℓ(ω) = ∫_a^b ω dτ (a delta-angle over [a, b], dimensionless).
template <class T>
constexpr SampleMoments<T> interval_moments(Rational a, Rational b) noexcept {
  SampleMoments<T> s{};
  Rational pa{1, 1};
  Rational pb{1, 1};
  std::int64_t factorial = 1;
  const T at = to_scalar<T>(a);
  const T bt = to_scalar<T>(b);
  for (int j = 0; j < 5; ++j) {
    factorial *= j + 1;  // (j+1)!
    pa = pa * a;         // a^(j+1)
    pb = pb * b;
    if (j < 4) {
      s.mu[static_cast<std::size_t>(j)] = (pb - pa) * Rational{1, factorial};
    }
    // ∫|τ|ʲ dτ = S(b) − S(a), S(x) = sign(x)|x|^(j+1)/(j+1).
    const T ab = absolute_value(to_scalar<T>(pb));
    const T aa = absolute_value(to_scalar<T>(pa));
    const T sb = bt < T(0) ? -ab : ab;
    const T sa = at < T(0) ? -aa : aa;
    s.abs[static_cast<std::size_t>(j)] = (sb - sa) / static_cast<T>(factorial);
  }
  return s;
}

// ℓ(ω) = ω(τ) (a rate sample at dimensionless time τ).
template <class T>
constexpr SampleMoments<T> point_moments(Rational tau) noexcept {
  SampleMoments<T> s{};
  Rational p{1, 1};
  std::int64_t factorial = 1;
  for (int j = 0; j < 5; ++j) {
    if (j > 0) {
      factorial *= j;
      p = p * tau;
    }
    const Rational m = p * Rational{1, factorial};
    if (j < 4) {
      s.mu[static_cast<std::size_t>(j)] = m;
    }
    s.abs[static_cast<std::size_t>(j)] = absolute_value(to_scalar<T>(m));
  }
  return s;
}

// A cross product of the rule: weight·ℓ_first × ℓ_second (dimensionless; rate samples: × h²).
struct WeightedPair {
  std::size_t first;
  std::size_t second;
  Rational weight;
};

// Where the samples of a rule sit, as functionals of ω over the step [−½, ½].
template <class T, std::size_t W>
constexpr std::array<SampleMoments<T>, W> rule_sample_moments(
    const RotationVectorRule<W>& r) noexcept {
  std::array<SampleMoments<T>, W> s{};
  const std::int64_t w = static_cast<std::int64_t>(W);
  for (std::size_t i = 0; i < W; ++i) {
    const std::int64_t k = static_cast<std::int64_t>(i);
    switch (r.layout) {
      case SampleLayout::rate_at_end:
        s[i] = point_moments<T>(Rational{1, 2});
        break;
      case SampleLayout::rates_spanning:  // τ = i/(W − 1) − ½ = (2i − W + 1)/(2(W − 1))
        s[i] = point_moments<T>(reduced(2 * k - w + 1, 2 * (w - 1)));
        break;
      case SampleLayout::delta_angles:  // [i/W − ½, (i + 1)/W − ½]
        s[i] = interval_moments<T>(reduced(2 * k - w, 2 * w), reduced(2 * k + 2 - w, 2 * w));
        break;
      case SampleLayout::delta_angles_with_previous:  // the previous period, then W − 1 tiling the
                                                      // step
        s[i] = k == 0 ? interval_moments<T>(Rational{-3, 2}, Rational{-1, 2})
                      : interval_moments<T>(reduced(2 * (k - 1) - (w - 1), 2 * (w - 1)),
                                            reduced(2 * k - (w - 1), 2 * (w - 1)));
        break;
      case SampleLayout::rate_function:
        break;
    }
  }
  return s;
}

// Number of sample pairs i < j within the window at separations 1 … W − 1.
constexpr std::size_t all_pairs(std::size_t w) noexcept { return w * (w - 1) / 2; }

// Every pair of the rule (zero weights included), by separation, then by position.
template <std::size_t W>
constexpr std::array<WeightedPair, all_pairs(W)> rule_pairs(
    const RotationVectorRule<W>& r) noexcept {
  std::array<WeightedPair, all_pairs(W)> p{};
  std::size_t n = 0;
  for (std::size_t m = 1; m < W; ++m) {
    for (std::size_t i = 0; i + m < W; ++i) {
      p[n] =
          WeightedPair{i, i + m, reduced(r.commutator.numerators[m - 1], r.commutator.denominator)};
      ++n;
    }
  }
  return p;
}

constexpr bool carries_rates(SampleLayout layout) noexcept {
  return layout == SampleLayout::rate_at_end || layout == SampleLayout::rates_spanning;
}

// Degree of polynomial exactness of the quadrature of a rate rule on [0, 1] (up to 8; −1 if it
// is not even consistent). Delta-angle rules carry α exactly: 8 (the cap) when their weights are
// 1 on the step's samples and 0 on a previous one, −1 otherwise.
template <std::size_t W>
constexpr int quadrature_degree(const RotationVectorRule<W>& r) noexcept {
  if (!carries_rates(r.layout)) {
    const std::size_t first = r.layout == SampleLayout::delta_angles_with_previous ? 1 : 0;
    for (std::size_t i = 0; i < W; ++i) {
      if (r.quadrature[i] != (i < first ? 0 : r.quadrature_denominator)) {
        return -1;
      }
    }
    return 8;
  }
  int degree = -1;
  for (int k = 0; k <= 8; ++k) {
    Rational sum{0, 1};
    for (std::size_t i = 0; i < W; ++i) {
      // the point as a fraction of the step: 1 (rate at end) or i/(W − 1)
      const Rational x =
          r.layout == SampleLayout::rate_at_end
              ? Rational{1, 1}
              : reduced(static_cast<std::int64_t>(i), static_cast<std::int64_t>(W - 1));
      Rational xk{1, 1};
      for (int j = 0; j < k; ++j) {
        xk = xk * x;
      }
      sum = sum + reduced(r.quadrature[i], r.quadrature_denominator) * xk;
    }
    const Rational defect = sum - Rational{1, k + 1};
    if (defect.num != 0) {
      return degree;
    }
    degree = k;
  }
  return degree;
}

// The commutator coefficients κ_p − 1/12 and κ_q of the rule (section "Order" above).
struct CommutatorMismatch {
  Rational p;
  Rational q;
};
// For any samples (their moments) and cross products (pairs): the family's own rules and the
// second-order part of other families (commutator_free_family.hpp).
template <std::size_t K, std::size_t P>
constexpr CommutatorMismatch commutator_mismatch(
    const std::array<SampleMoments<long double>, K>& s,
    const std::array<WeightedPair, P>& pairs) noexcept {
  Rational kp{-1, 12};
  Rational kq{0, 1};
  for (const WeightedPair& pair : pairs) {
    const SampleMoments<long double>& a = s[pair.first];
    const SampleMoments<long double>& b = s[pair.second];
    kp = kp + pair.weight * (a.mu[0] * b.mu[1] - b.mu[0] * a.mu[1]);
    kq = kq + pair.weight * (a.mu[0] * b.mu[2] - b.mu[0] * a.mu[2]);
  }
  return {kp, kq};
}
template <std::size_t W>
constexpr CommutatorMismatch commutator_mismatch(const RotationVectorRule<W>& r) noexcept {
  return commutator_mismatch(rule_sample_moments<long double>(r), rule_pairs(r));
}

// Global order for general smooth motion (header comment).
template <std::size_t W>
constexpr int rotation_vector_order(const RotationVectorRule<W>& r) noexcept {
  const CommutatorMismatch k = commutator_mismatch(r);
  const int commutator = k.p.num != 0 ? 2 : (k.q.num != 0 ? 3 : 4);
  const int quadrature = quadrature_degree(r) + 1;
  return quadrature < commutator ? quadrature : commutator;
}

// Order of the coning drift under pure classical coning (delta-angle rules; 0 for rate rules).
template <std::size_t W>
constexpr int coning_drift_order(const RotationVectorRule<W>& r) noexcept {
  if (carries_rates(r.layout)) {
    return 0;
  }
  const std::size_t first = r.layout == SampleLayout::delta_angles_with_previous ? 1 : 0;
  const long double n = static_cast<long double>(W - first);
  // Series coefficients (odd powers 3, 5, …, 19) of 2(1 − cos λ) sin mλ and of ½(x − sin x).
  constexpr int top = 19;
  for (int power = 3; power <= top; power += 2) {
    long double exact = 0.0L;  // ½(Nλ − sin Nλ): −½(−1)^((p−1)/2) N^p / p!
    {
      long double term = 1.0L;
      for (int j = 1; j <= power; ++j) {
        term *= n / static_cast<long double>(j);
      }
      exact = (((power - 1) / 2) % 2 == 0 ? -0.5L : 0.5L) * term;
    }
    long double estimate = 0.0L;
    for (std::size_t m = 1; m < W; ++m) {
      const long double pairs = static_cast<long double>(W - m);
      const long double weight = static_cast<long double>(r.commutator.numerators[m - 1]) /
                                 static_cast<long double>(r.commutator.denominator);
      // 2(1 − cos λ) = Σ_{k≥1} 2(−1)^(k+1) λ^(2k)/(2k)!, sin mλ = Σ_{l≥0} (−1)^l
      // (mλ)^(2l+1)/(2l+1)!
      long double product = 0.0L;
      for (int even = 2; even < power; even += 2) {
        const int odd = power - even;
        long double c = 2.0L;
        for (int j = 1; j <= even; ++j) {
          c /= static_cast<long double>(j);
        }
        c *= ((even / 2) % 2 == 1) ? 1.0L : -1.0L;
        long double s = 1.0L;
        for (int j = 1; j <= odd; ++j) {
          s *= static_cast<long double>(m) / static_cast<long double>(j);
        }
        s *= (((odd - 1) / 2) % 2 == 0) ? 1.0L : -1.0L;
        product += c * s;
      }
      estimate += pairs * weight * product;
    }
    const long double d = estimate - exact;
    const long double scale = exact < 0.0L ? -exact : exact;
    if (d > 1e-12L * scale || d < -1e-12L * scale) {
      return power - 1;
    }
  }
  return top + 1;
}

// Flops of φ = α̂ + β̂ as computed by RotationVectorStepper (header comment).
template <std::size_t W>
constexpr int rotation_vector_flops(const RotationVectorRule<W>& r) noexcept {
  const bool rates = carries_rates(r.layout);
  int n = 0;
  int terms = 0;
  for (std::size_t i = 0; i < W; ++i) {
    if (r.quadrature[i] != 0) {
      n += terms > 0 ? 3 : 0;
      n += r.quadrature[i] != 1 ? 3 : 0;
      ++terms;
    }
  }
  if (rates) {
    n += 3 + (r.quadrature_denominator != 1 ? 1 : 0);
  } else if (r.quadrature_denominator != 1) {
    n += 3;
  }
  for (std::size_t m = 1; m < W; ++m) {
    if (r.commutator.numerators[m - 1] != 0) {
      const int pairs = static_cast<int>(W - m);
      n += 9 * pairs + 3 * (pairs - 1) + 6 + (rates ? 2 : 0);
    }
  }
  return n;
}

// Rounding depth of φ = α̂ + β̂: the most roundings on any path from a sample to φ, counting the
// rule's weights rounded to T at compile time as one each (for the roundoff model of
// bounds/roundoff_floor.hpp: by induction over the expression tree of Higham, Accuracy and
// Stability of Numerical Algorithms, 2nd ed., Lemma 3.1, the computed φ̂ differs from φ by at most
// γ_depth times φ evaluated with absolute values, a sharper count than the number of flops).
// Upper counts from the code below:
//   α̂: an integer weight other than 1 (1), the sum of k terms (k − 1), the scaling (delta-angles
//      with a denominator: the rounded inverse and the product, 2; rates: dt × inverse, the
//      inverse's own rounding and the product, 3): at most k + 3;
//   β̂: a cross product's component (2), the sum over the pairs of one separation (W − 2 at most),
//      the weight (rounded, and the product: 2; rates 4 with dt²), the sum over the separations
//      (W − 2 at most): at most 2W + 2;
//   φ: their sum, 1 more.
template <std::size_t W>
constexpr int rotation_vector_rounding_depth(const RotationVectorRule<W>& r) noexcept {
  int terms = 0;
  bool commutator = false;
  for (std::size_t i = 0; i < W; ++i) {
    terms += r.quadrature[i] != 0 ? 1 : 0;
  }
  for (std::size_t m = 1; m < W; ++m) {
    commutator = commutator || r.commutator.numerators[m - 1] != 0;
  }
  const int alpha = terms + 3;
  const int beta = commutator ? 2 * static_cast<int>(W) + 2 : 0;
  return (alpha > beta ? alpha : beta) + (commutator ? 1 : 0);
}

// Bounds on |φ| for a step of rotation ≤ θ = D0·dt: |α̂| ≤ (Σ|w_i|/denominator)·θ for rates
// (|s_i|·dt ≤ θ) and ≤ (max|w_i|/denominator)·θ for delta-angles that tile the step
// (Σ|s_i| ≤ θ); |β̂| ≤ (Σ_m |c_m|·(W − m))·θ² for rates (each |s_i × s_j|·dt² ≤ θ²) and for a
// rule that reads the previous step's delta-angle (|s_0| ≤ θ too), a quarter of it for
// delta-angles that tile the step (|s_i||s_j| ≤ θ_i·θ_j ≤ θ²/4 where θ_i + θ_j ≤ θ). The roundoff
// model (bounds/roundoff_floor.hpp) takes |δ| = |exp(φ/2) − 1| ≤ |φ|/2 from them.
template <std::size_t W>
constexpr long double rotation_vector_quadrature_magnitude(
    const RotationVectorRule<W>& r) noexcept {
  long double sum = 0.0L;
  long double largest = 0.0L;
  for (std::size_t i = 0; i < W; ++i) {
    const long double w =
        static_cast<long double>(r.quadrature[i] < 0 ? -r.quadrature[i] : r.quadrature[i]);
    sum += w;
    largest = w > largest ? w : largest;
  }
  return (carries_rates(r.layout) ? sum : largest) /
         static_cast<long double>(r.quadrature_denominator);
}
template <std::size_t W>
constexpr long double rotation_vector_commutator_magnitude(
    const RotationVectorRule<W>& r) noexcept {
  long double sum = 0.0L;
  for (std::size_t m = 1; m < W; ++m) {
    const std::int32_t c = r.commutator.numerators[m - 1];
    sum += static_cast<long double>(c < 0 ? -c : c) * static_cast<long double>(W - m);
  }
  sum /= static_cast<long double>(r.commutator.denominator);
  return r.layout == SampleLayout::delta_angles ? sum / 4.0L : sum;
}

template <std::size_t W>
constexpr bool has_commutator(const RotationVectorRule<W>& r) noexcept {
  for (std::size_t m = 1; m < W; ++m) {
    if (r.commutator.numerators[m - 1] != 0) {
      return true;
    }
  }
  return false;
}

constexpr std::size_t new_samples_of(SampleLayout layout, std::size_t window) noexcept {
  switch (layout) {
    case SampleLayout::rate_at_end:
      return 1;
    case SampleLayout::rates_spanning:
      return window - 1;
    case SampleLayout::delta_angles:
      return window;
    case SampleLayout::delta_angles_with_previous:
      return window - 1;
    case SampleLayout::rate_function:
      return 0;
  }
  return 0;
}

// A sum of weight numerators times samples, scaled to radians: rates × dt, then (unless the
// denominator is 1) × the inverse denominator (rounded once to T at compile time).
template <SampleLayout Layout, std::int32_t Denominator, class T>
constexpr Vector3<T> scaled_weighted_sum(const Vector3<T>& sum, T dt, T inverse) noexcept {
  if constexpr (carries_rates(Layout)) {
    if constexpr (Denominator == 1) {
      return sum * dt;
    } else {
      return sum * (dt * inverse);
    }
  } else {
    static_cast<void>(dt);
    if constexpr (Denominator == 1) {
      return sum;
    } else {
      return inverse * sum;
    }
  }
}

// The rule's weights rounded once to T at compile time (no division at run time).
template <class Rule, class T>
struct RotationVectorWeights {
  static constexpr std::size_t W = Rule::value.window;
  static constexpr std::size_t S = W > 0 ? W - 1 : 0;
  static constexpr T quadrature_inverse =
      T(1) / T(Rule::value.quadrature_denominator);  // correctly rounded 1/denominator
  static constexpr std::array<T, S> commutator = [] {
    std::array<T, S> c{};
    for (std::size_t m = 0; m < S; ++m) {
      c[m] = T(Rule::value.commutator.numerators[m]) / T(Rule::value.commutator.denominator);
    }
    return c;
  }();
};

}  // namespace detail

/// The generic member of the family: Rule::value is a RotationVectorRule. Input: the window of
/// samples (rates in rad/s or delta-angles in rad, as the layout says); dt (s) the step length.
template <class Rule>
struct RotationVectorStepper {
  /// The family data (Rule::value).
  static constexpr const RotationVectorRule<Rule::value.window>& rule = Rule::value;
  using family = RotationVectorStepper<Rule>;          ///< the bounds layer dispatches on it
  static constexpr SampleLayout layout = rule.layout;  ///< what the input holds
  static constexpr std::size_t window = rule.window;   ///< samples the step reads
  /// Samples that arrive per step.
  static constexpr std::size_t new_samples = detail::new_samples_of(layout, window);
  /// Global attitude order with this input, on any smooth motion.
  static constexpr int order = detail::rotation_vector_order(rule);
  static constexpr int coning_order = detail::coning_drift_order(rule);  ///< 0: not a coning rule
  /// Whether the increment carries an error estimate.
  static constexpr bool has_estimate = detail::has_commutator(rule);
  /// Floating-point operations per step: the increment and its plain application.
  static constexpr int flops = detail::rotation_vector_flops(rule) +
                               quaternion_exp_minus_one_series_flops + apply_increment_flops;
  /// Most roundings on a path from a sample to φ (bounds/roundoff_floor.hpp reads it).
  static constexpr int rounding_depth = detail::rotation_vector_rounding_depth(rule);
  /// |φ| ≤ rotation_linear·θ + rotation_quadratic·θ² for a step rotating by ≤ θ (the roundoff
  /// model's |δ| ≤ |φ|/2).
  static constexpr long double rotation_linear = detail::rotation_vector_quadrature_magnitude(rule);
  /// The θ² coefficient of the bound above.
  static constexpr long double rotation_quadratic =
      detail::rotation_vector_commutator_magnitude(rule);
  static_assert(layout != SampleLayout::rate_function, "the family reads samples");
  static_assert(detail::quadrature_degree(rule) >= 0, "the quadrature weights must be consistent");

  /// α̂ = Σ w_i s_i (rad): the quadrature of ∫ω over the step (delta-angles: their sum).
  template <class T>
  static constexpr Vector3<T> quadrature_term(const std::array<Vector3<T>, window>& s,
                                              T dt) noexcept {
    return detail::scaled_weighted_sum<layout, rule.quadrature_denominator>(
        weighted_sum(s, std::make_index_sequence<window>{}), dt,
        detail::RotationVectorWeights<Rule, T>::quadrature_inverse);
  }

  /// β̂ = Σ_m c_m Σ_{j−i=m} s_i × s_j (rad; rates: × dt²): the commutator (coning) term, also the
  /// online error signal. Zero for a rule without one.
  template <class T>
  static constexpr Vector3<T> commutator_term(const std::array<Vector3<T>, window>& s,
                                              T dt) noexcept {
    Vector3<T> beta{};
    bool started = false;
    add_separations(beta, started, s, dt,
                    std::make_index_sequence<(window > 0 ? window - 1 : 0)>{});
    static_cast<void>(dt);
    return beta;
  }

  /// φ = α̂ + β̂ (rad, body frame at the step start).
  template <class T>
  static constexpr Vector3<T> rotation_vector(const std::array<Vector3<T>, window>& s,
                                              T dt = T(0)) noexcept {
    if constexpr (has_estimate) {
      return quadrature_term(s, dt) + commutator_term(s, dt);
    } else {
      return quadrature_term(s, dt);
    }
  }

  /// exp(φ/2) − 1 and, for a rule with a commutator, |β̂| (rad): the non-commutativity the step
  /// saw, i.e. the error a step without the correction would make (an indicator, not this
  /// method's own, much smaller, error; tests/bounds/test_magnus_family_bounds.cpp measures it).
  template <class T>
  static Increment<T> increment(const std::array<Vector3<T>, window>& s, T dt) noexcept {
    if constexpr (has_estimate) {
      const Vector3<T> beta = commutator_term(s, dt);
      return {quaternion_exp_minus_one(quadrature_term(s, dt) + beta), norm(beta)};
    } else {
      return {quaternion_exp_minus_one(quadrature_term(s, dt)), T(0)};
    }
  }

  /// q ⊗ exp(φ/2), the increment applied plainly (q body → reference).
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& s,
                            T dt) noexcept {
    return apply_increment(q, increment(s, dt).delta);
  }
  /// step() and the error estimate of increment().
  template <class T, bool E = has_estimate, std::enable_if_t<E, int> = 0>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q,
                                           const std::array<Vector3<T>, window>& s, T dt) noexcept {
    const Increment<T> inc = increment(s, dt);
    return {apply_increment(q, inc.delta), inc.error_estimate};
  }

 private:
  // The loops over the rule's weights are folds over index sequences with `if constexpr`, so a
  // step tests no weight and converts no integer at run time, whatever the compiler's unrolling
  // heuristics (arm-none-eabi-g++ -O2 kept the plain loops, with their tests, for four samples).
  template <class T, std::size_t I>
  static constexpr void add_sample(Vector3<T>& sum, bool& started,
                                   const std::array<Vector3<T>, window>& s) noexcept {
    if constexpr (rule.quadrature[I] != 0) {
      Vector3<T> term = s[I];
      if constexpr (rule.quadrature[I] != 1) {
        term = T(rule.quadrature[I]) * s[I];
      }
      sum = started ? sum + term : term;  // no 0 + x: the first term starts the sum
      started = true;
    }
  }
  template <class T, std::size_t... I>
  static constexpr Vector3<T> weighted_sum(const std::array<Vector3<T>, window>& s,
                                           std::index_sequence<I...> /*samples*/) noexcept {
    Vector3<T> sum{};
    bool started = false;
    (add_sample<T, I>(sum, started, s), ...);
    return sum;
  }
  // Σ_i s_i × s_(i+M) over the window, the first product starting the sum.
  template <std::size_t M, class T, std::size_t... I>
  static constexpr Vector3<T> cross_products(const std::array<Vector3<T>, window>& s,
                                             std::index_sequence<0, I...> /*pairs*/) noexcept {
    Vector3<T> sum = cross(s[0], s[M]);
    ((sum += cross(s[I], s[I + M])), ...);
    return sum;
  }
  template <class T, std::size_t Index>
  static constexpr void add_separation(Vector3<T>& beta, bool& started,
                                       const std::array<Vector3<T>, window>& s, T dt) noexcept {
    constexpr std::size_t m = Index + 1;
    if constexpr (rule.commutator.numerators[Index] != 0) {
      const Vector3<T> sum = cross_products<m>(s, std::make_index_sequence<window - m>{});
      constexpr T weight = detail::RotationVectorWeights<Rule, T>::commutator[Index];
      Vector3<T> term;
      if constexpr (detail::carries_rates(layout)) {
        term = sum * (dt * dt * weight);
      } else {
        term = weight * sum;
      }
      beta = started ? beta + term : term;
      started = true;
    }
  }
  template <class T, std::size_t... Index>
  static constexpr void add_separations(Vector3<T>& beta, bool& started,
                                        const std::array<Vector3<T>, window>& s, T dt,
                                        std::index_sequence<Index...> /*separations*/) noexcept {
    (add_separation<T, Index>(beta, started, s, dt), ...);
  }
};

}  // namespace halfspin
