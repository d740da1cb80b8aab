#pragma once
/// @file
/// The commutator-free family as data: every stepper whose step is a product of exponentials
///     P = exp(φ_1/2) ⊗ exp(φ_2/2) ⊗ … ⊗ exp(φ_E/2),   φ_j = Σ_i a_ji s_i (× dt for rates),
/// the s_i being the samples of the step's window (as in rotation_vector_family.hpp: rates at
/// points of the step, or delta-angles over the sample intervals that tile it) and a_ji fixed
/// weights; φ_1 acts first in time. These are the commutator-free Lie-group methods (Celledoni,
/// Marthinsen and Owren 2003) specialised to attitude kinematics: there the rate depends on time
/// only, not on the attitude, so every stage rate is a rate sample at the stage's node, and the
/// Crouch–Grossman methods (one exponential per stage) are members too. No commutator is computed:
/// the non-commutativity is carried by the order of the factors. Each member is one
/// CommutatorFreeRule below; order and flops are derived from it here, the a-priori bound from it
/// in bounds/commutator_free_bounds.hpp.
///
/// Order (derivation ours; inputs: the Baker–Campbell–Hausdorff series and the Magnus expansion,
/// REFERENCES.md). The product is exp(Φ/2) with Φ = Σφ_j + ½Σ_{j<k} φ_j×φ_k + T3 + O(φ⁴), where the
/// third-order part is T3 = Σ_k [½B_k×φ_k + (1/12)(S_k − φ_k)×(S_k×φ_k)], S_k = Σ_{j<k} φ_j,
/// B_k = ½Σ_{i<j<k} φ_i×φ_j (from the rotation-vector equation for the piecewise-constant rate
/// whose flow is the product; for E = 2 it is the BCH term (1/12)(φ_1 − φ_2)×(φ_1×φ_2)). So the
/// step is a member of the rotation-vector family with the quadrature weights w_i = Σ_j a_ji and
/// the cross-product weights c_il = ½Σ_{j<k}(a_ji a_kl − a_jl a_ki), plus T3. The first two give
/// the order as in rotation_vector_family.hpp (quadrature degree, κ_p, κ_q); T3 has, with
/// ω = m + pτ about mid-step, the h⁴ coefficient t·m×(m×p), t = Σ_k[(1/12)(σ_k − w_k)s_k −
/// ½b_k w_k] (w_k, σ_k, s_k, b_k the leading coefficients of φ_k, S_k, S_k×φ_k, B_k), which must
/// vanish for order 4; the rest of T3 and the third Magnus term are O(h⁵), so order ≤ 4.
///
/// Flops (+ − ×, counted from the code below): per exponential 3 per added sample, 3 per weight
/// other than 1, 3 for the scaling (rates: dt times the inverse denominator 1 more), exp(φ/2) − 1
/// (series branch); per exponential after the first, the increments composed as
/// δ ← δ + δ_j + δ ⊗ δ_j (the product 28, two sums 8); then the plain application.

#include <array>
#include <cstddef>
#include <cstdint>
#include <utility>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/rotation_vector_family.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// One member: its input layout and, for each of its E exponentials (first in time first), the
/// weights of its window's W samples (numerators over one denominator).
template <std::size_t W, std::size_t E>
struct CommutatorFreeRule {
  static constexpr std::size_t window = W;        ///< W, the samples in the window
  static constexpr std::size_t exponentials = E;  ///< E, the exponentials in the product
  SampleLayout layout;                            ///< what the samples hold
  /// Weights[j][i]: sample i's numerator in exponential j.
  std::array<std::array<std::int32_t, W>, E> weights;
  std::int32_t denominator;  ///< the weights' common denominator
};

namespace detail {

// The rotation-vector rule with the same quadrature (w_i = Σ_j a_ji) and no commutator: the
// family's first-order part, whose quadrature degree and sample geometry the derivations reuse.
template <std::size_t W, std::size_t E>
constexpr RotationVectorRule<W> first_order_part(const CommutatorFreeRule<W, E>& r) noexcept {
  RotationVectorRule<W> p{r.layout, {}, r.denominator, {}};
  for (std::size_t i = 0; i < W; ++i) {
    std::int32_t sum = 0;
    for (std::size_t j = 0; j < E; ++j) {
      sum += r.weights[j][i];
    }
    p.quadrature[i] = sum;
  }
  p.commutator.denominator = 1;
  return p;
}

// The weight a_ji as an exact rational.
template <std::size_t W, std::size_t E>
constexpr Rational weight_of(const CommutatorFreeRule<W, E>& r, std::size_t j,
                             std::size_t i) noexcept {
  return reduced(r.weights[j][i], r.denominator);
}

// The cross products of Σ_{j<k} φ_j × φ_k over exponentials j in [first, k) (k fixed) or, with
// k = E, ½Σ_{j<k} φ_j×φ_k over all pairs: γ_il ℓ_i × ℓ_l for i < l (rates: × h²).
template <std::size_t W, std::size_t E>
constexpr std::array<WeightedPair, all_pairs(W)> second_order_pairs(
    const CommutatorFreeRule<W, E>& r) noexcept {
  std::array<WeightedPair, all_pairs(W)> p{};
  std::size_t n = 0;
  for (std::size_t m = 1; m < W; ++m) {
    for (std::size_t i = 0; i + m < W; ++i) {
      const std::size_t l = i + m;
      Rational c{0, 1};
      for (std::size_t k = 0; k < E; ++k) {
        for (std::size_t j = 0; j < k; ++j) {
          c = c + weight_of(r, j, i) * weight_of(r, k, l) - weight_of(r, j, l) * weight_of(r, k, i);
        }
      }
      p[n] = WeightedPair{i, l, c * Rational{1, 2}};
      ++n;
    }
  }
  return p;
}

// The h⁴ coefficient t of the third-order part T3 (header comment), exactly.
template <std::size_t W, std::size_t E>
constexpr Rational third_order_coefficient(const CommutatorFreeRule<W, E>& r) noexcept {
  const std::array<SampleMoments<long double>, W> s =
      rule_sample_moments<long double>(first_order_part(r));
  std::array<Rational, E> w{};      // w_k: φ_k ≈ w_k·h·m
  std::array<Rational, E> sk{};     // s_k: S_k × φ_k ≈ s_k·h³·m×p
  std::array<Rational, E> sigma{};  // σ_k = Σ_{j<k} w_j
  Rational nu{0, 1};                // Σ_{j<k} μ_j
  for (std::size_t k = 0; k < E; ++k) {
    Rational mu{0, 1};
    for (std::size_t i = 0; i < W; ++i) {
      w[k] = w[k] + weight_of(r, k, i) * s[i].mu[0];
      mu = mu + weight_of(r, k, i) * s[i].mu[1];
    }
    sk[k] = sigma[k] * mu - nu * w[k];
    if (k + 1 < E) {
      sigma[k + 1] = sigma[k] + w[k];
    }
    nu = nu + mu;
  }
  // t = Σ_k [(1/12)(σ_k − w_k)s_k − ½b_k w_k] with b_k = ½Σ_{j<k} s_j.
  Rational t{0, 1};
  for (std::size_t k = 0; k < E; ++k) {
    t = t + (sigma[k] - w[k]) * sk[k] * Rational{1, 12};
    for (std::size_t j = 0; j < k; ++j) {
      t = t - sk[j] * w[k] * Rational{1, 4};
    }
  }
  return t;
}

// Global order for general smooth motion (header comment).
template <std::size_t W, std::size_t E>
constexpr int commutator_free_order(const CommutatorFreeRule<W, E>& r) noexcept {
  const RotationVectorRule<W> first = first_order_part(r);
  const CommutatorMismatch k =
      commutator_mismatch(rule_sample_moments<long double>(first), second_order_pairs(r));
  const int second = k.p.num != 0 ? 2 : (k.q.num != 0 ? 3 : 4);
  const int third = third_order_coefficient(r).num != 0 ? 3 : 4;
  const int quadrature = quadrature_degree(first) + 1;
  const int order = second < third ? second : third;
  return quadrature < order ? quadrature : order;
}

// Flops of the step as CommutatorFreeStepper computes it (header comment), without the
// exponentials and the application.
template <std::size_t W, std::size_t E>
constexpr int commutator_free_flops(const CommutatorFreeRule<W, E>& r) noexcept {
  int n = 0;
  for (std::size_t j = 0; j < E; ++j) {
    int terms = 0;
    for (std::size_t i = 0; i < W; ++i) {
      if (r.weights[j][i] != 0) {
        n += terms > 0 ? 3 : 0;
        n += (r.weights[j][i] != 1 && r.weights[j][i] != -1) ? 3 : 0;
        ++terms;
      }
    }
    n += carries_rates(r.layout) ? 3 + (r.denominator != 1 ? 1 : 0) : (r.denominator != 1 ? 3 : 0);
  }
  return n + static_cast<int>(E > 0 ? E - 1 : 0) * 36;
}

// The rule's inverse denominator rounded once to T at compile time.
template <class Rule, class T>
struct CommutatorFreeWeights {
  static constexpr T inverse = T(1) / T(Rule::value.denominator);
};

}  // namespace detail

/// The generic member of the family: Rule::value is a CommutatorFreeRule. Input: the window of
/// samples (rates in rad/s or delta-angles in rad, as the layout says); dt (s) the step length.
template <class Rule>
struct CommutatorFreeStepper {
  static constexpr const auto& rule = Rule::value;     ///< the family data (Rule::value)
  using family = CommutatorFreeStepper<Rule>;          ///< the bounds layer dispatches on it
  static constexpr SampleLayout layout = rule.layout;  ///< what the input holds
  static constexpr std::size_t window = rule.window;   ///< samples the step reads
  static constexpr std::size_t exponentials = rule.exponentials;  ///< exponentials in the product
  /// Samples that arrive per step.
  static constexpr std::size_t new_samples = detail::new_samples_of(layout, window);
  /// Global attitude order with this input, on any smooth motion.
  static constexpr int order = detail::commutator_free_order(rule);
  static constexpr bool has_estimate = false;  ///< whether the increment carries an error estimate
  /// Floating-point operations per step: the increment and its plain application.
  static constexpr int flops =
      detail::commutator_free_flops(rule) +
      static_cast<int>(exponentials) * quaternion_exp_minus_one_series_flops +
      apply_increment_flops;
  /// The exponentials' rotation vectors together are at most rotation_linear·θ long for a step
  /// rotating by ≤ θ (each is Σ_i a_ji s_i, |s_i| ≤ θ for rates × dt, Σ|s_i| ≤ θ for
  /// delta-angles), so the step's P is within that angle of 1 (the roundoff model's
  /// |δ| ≤ rotation_linear·θ/2).
  static constexpr long double rotation_linear = [] {
    long double sum = 0.0L;
    for (std::size_t j = 0; j < exponentials; ++j) {
      long double row = 0.0L;  // Σ_i |a_ji| for rates, max_i |a_ji| for delta-angles
      for (std::size_t i = 0; i < window; ++i) {
        const auto w = static_cast<long double>(rule.weights[j][i] < 0 ? -rule.weights[j][i]
                                                                       : rule.weights[j][i]);
        row = detail::carries_rates(layout) ? row + w : (w > row ? w : row);
      }
      sum += row;
    }
    return sum / static_cast<long double>(rule.denominator);
  }();
  /// 0: the rotation vectors are linear in the samples.
  static constexpr long double rotation_quadratic = 0.0L;
  static_assert(layout != SampleLayout::rate_function, "the family reads samples");
  static_assert(exponentials >= 1, "at least one exponential");
  static_assert(detail::quadrature_degree(detail::first_order_part(rule)) >= 0,
                "the weights must sum to a consistent quadrature");

  /// φ_j (rad, body frame), the rotation vector of the J-th factor.
  template <std::size_t J, class T>
  static constexpr Vector3<T> rotation_vector(const std::array<Vector3<T>, window>& s,
                                              T dt) noexcept {
    return detail::scaled_weighted_sum<layout, rule.denominator>(
        weighted_sum<J>(s, std::make_index_sequence<window>{}), dt,
        detail::CommutatorFreeWeights<Rule, T>::inverse);
  }

  /// P − 1 = (1 + δ_1)(1 + δ_2)… − 1 with δ_j = exp(φ_j/2) − 1, composed without forming 1 + δ.
  template <class T>
  static Increment<T> increment(const std::array<Vector3<T>, window>& s, T dt) noexcept {
    return {composed(s, dt, std::make_index_sequence<exponentials>{}), T(0)};
  }

  /// q ⊗ P, the increment applied plainly (q body → reference).
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& s,
                            T dt) noexcept {
    return apply_increment(q, increment(s, dt).delta);
  }

 private:
  // Folds over index sequences with `if constexpr`, as rotation_vector_family.hpp: a step tests
  // no weight at run time.
  template <std::size_t J, std::size_t I, class T>
  static constexpr void add_sample(Vector3<T>& sum, bool& started,
                                   const std::array<Vector3<T>, window>& s) noexcept {
    constexpr std::int32_t a = rule.weights[J][I];
    if constexpr (a != 0) {
      Vector3<T> term = s[I];
      if constexpr (a == -1) {
        term = -s[I];
      } else if constexpr (a != 1) {
        term = T(a) * s[I];
      }
      sum = started ? sum + term : term;  // no 0 + x: the first term starts the sum
      started = true;
    }
  }
  template <std::size_t J, class T, std::size_t... I>
  static constexpr Vector3<T> weighted_sum(const std::array<Vector3<T>, window>& s,
                                           std::index_sequence<I...> /*samples*/) noexcept {
    Vector3<T> sum{};
    bool started = false;
    (add_sample<J, I>(sum, started, s), ...);
    return sum;
  }
  template <std::size_t J, class T>
  static void compose(Quaternion<T>& delta, const std::array<Vector3<T>, window>& s,
                      T dt) noexcept {
    const Quaternion<T> factor = quaternion_exp_minus_one(rotation_vector<J>(s, dt));
    if constexpr (J == 0) {
      delta = factor;
    } else {
      delta = (delta + factor) + delta * factor;
    }
  }
  template <class T, std::size_t... J>
  static Quaternion<T> composed(const std::array<Vector3<T>, window>& s, T dt,
                                std::index_sequence<J...> /*exponentials*/) noexcept {
    Quaternion<T> delta{};
    (compose<J>(delta, s, dt), ...);
    return delta;
  }
};

}  // namespace halfspin
