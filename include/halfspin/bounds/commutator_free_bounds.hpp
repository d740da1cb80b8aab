#pragma once
/// @file
/// The a-priori local (one-step) error bound of the commutator-free family
/// (propagation/commutator_free_family.hpp): one bound for every member, computed from its
/// CommutatorFreeRule. LocalErrorBound<S>::local(e, h) (rad) bounds the angle between the attitude
/// the stepper returns and the exact one after ONE step of length h (s) from the exact attitude,
/// for every rate whose derivatives obey e on the step; +∞ when a needed D_k is +∞, when D0·h > 1
/// rad or Σ_j|φ_j| may exceed 1 rad, or when the bound reaches 2 rad.
///
/// Derivation (ours; inputs: Bortz's rotation-vector equation and the Magnus expansion, see
/// REFERENCES.md, and the bounds of magnus_family_bounds.hpp, whose sections are cited as §n).
///
/// 1. Split. The product is exp(Φ/2), Φ the rotation vector of the flow of the piecewise-constant
///    rate that equals φ_k/(duration) on the k-th of E consecutive pieces. With the metric of §0
///    (|Φ| ≤ A := Σ|φ_j| ≤ 1 and the bound below 2 keep both rotation vectors shorter than π),
///    the error is at most |Φ − φ*|. Φ = Σφ_j + β̂ + R̃ with β̂ = ½Σ_{j<k} φ_j×φ_k exactly (§1
///    applied to the piecewise rate: α̃ ∥ ω̃ within a piece), and φ* = α + β + R, so
///        |Φ − φ*| ≤ |α̂ − α| + |β̂ − β| + |R| + |R̃|:
///    the quadrature error of the weights w_i = Σ_j a_ji (§2), the commutator error of the pairs
///    c_il = ½Σ_{j<k}(a_ji a_kl − a_jl a_ki) (§4), Bortz's remainder (§3) and the remainder R̃ of
///    the product beyond its second-order part, bounded here.
/// 2. R̃. On piece k, in its own time s ∈ [0, 1], write S_k = Σ_{j<k}φ_j, α̃ = S_k + sφ_k,
///    β̃ = B_k + ½s S_k×φ_k (B_k = ½Σ_{i<j<k}φ_i×φ_j) and ψ = Φ − α̃. Bortz's equation with the
///    rate φ_k gives ψ' = ½Φ×φ_k + f(|Φ|)Φ×(Φ×φ_k) and Φ×φ_k = S_k×φ_k + ψ×φ_k. With
///    C_k ≥ |S_k×φ_k|, P_k ≥ |φ_k|, f ≤ F = 1/12 + A²/700 and k0 = ½ + F·A (§3), Grönwall gives
///    |ψ| ≤ G_k := (G_{k−1} + k0·C_k)·e^{k0·P_k} on pieces 1…k (G_0 = 0). R̃ = ψ(end) − β̃(end)
///    = Σ_k ∫[½ψ×φ_k + fΦ×(Φ×φ_k)], so
///    (a) crude: |R̃| ≤ Q_E, Q_k = Q_{k−1} + ½P_k·G_k + F·A·(C_k + G_k·P_k) (third order in φ);
///    (b) fifth order: the integrand is T3's integrand ½β̃×φ_k + (1/12)α̃×(α̃×φ_k) plus
///        ½(ψ − β̃)×φ_k + (f − 1/12)Φ×(Φ×φ_k) + (1/12)[ψ×(Φ×φ_k) + α̃×(ψ×φ_k)], where |ψ − β̃| ≤ Q_k
///        and 0 ≤ f − 1/12 ≤ A²/700; integrated, T3 = Σ_k[½B_k×φ_k + (1/12)(S_k − φ_k)×(S_k×φ_k)]
///        and |R̃| ≤ Σ_k [½|B_k|P_k + (1/12)|S_k − φ_k|C_k] + Σ_k [½P_k·Q_k
///        + A³/700·(C_k + G_k·P_k) + (G_k·(C_k + G_k·P_k) + A·G_k·P_k)/12].
///    The smaller of (a) and (b) is used.
/// 3. From the envelope. A combination v = Σ λ_i ℓ_i(ω) of the samples (ℓ_i their functionals over
///    the step τ ∈ [−½, ½]; rates × h) has |v| ≤ h·D0·Σ|λ_i|ℓ_i(1), and, when Σλ_i ℓ_i(1) = 0,
///    |v| ≤ h²·D1·Σ|λ_i|ℓ_i(|τ|) (ω − ω(mid) ≤ D1·h|τ|). A cross combination Σ γ_il ℓ_i × ℓ_l
///    (× h²) has, with ℓ_i = ℓ_i(1)·ω(mid) + ℓ_i(ω − ω(mid)),
///    |·| ≤ h³·D0·D1·Σ|γ_il|(ℓ_i(1)ℓ_l(|τ|) + ℓ_l(1)ℓ_i(|τ|)) + h⁴·D1²·Σ|γ_il|ℓ_i(|τ|)ℓ_l(|τ|).
///    So P_k, C_k = the bound of S_k×φ_k, |S_k − φ_k| and |B_k| ≤ ½Σ_{j<k}C_j follow from the
///    weights. For E = 2 (B_2 = 0) and equal weight sums of the two factors, (b) is O(h⁵) like the
///    method's error; for E ≥ 3 the term ½|B_k|P_k is O(h⁴) (the cancellation between the B_k terms
///    that makes an order-4 method's T3 O(h⁵) is not tracked): the bound is then one order loose.
/// At constant rate every C_k, and with it R̃, is 0; §2–§4 vanish too: the bound is 0, as the
/// error is (all factors are exponentials of parallel vectors).

#include <array>
#include <cstddef>

#include "halfspin/bounds/local_error_bound.hpp"
#include "halfspin/bounds/magnus_family_bounds.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/commutator_free_family.hpp"

namespace halfspin {

namespace detail {
namespace commutator_free_bounds {

using magnus_bounds::absolute;
using magnus_bounds::exp_upper;
using magnus_bounds::infinity;
using magnus_bounds::product;
using magnus_bounds::smaller;

// Bound of |Σ λ_i ℓ_i(ω)| (rad; rates × h), section 3.
template <class T, std::size_t W>
constexpr T combination_bound(const std::array<SampleMoments<T>, W>& s,
                              const std::array<Rational, W>& lambda, const RateEnvelope<T>& e,
                              T h) noexcept {
  Rational total{0, 1};
  T zero_form = T(0);
  T first_form = T(0);
  for (std::size_t i = 0; i < W; ++i) {
    const T l = absolute(to_scalar<T>(lambda[i]));
    total = total + lambda[i] * s[i].mu[0];
    zero_form += l * s[i].abs[0];
    first_form += l * s[i].abs[1];
  }
  const T crude = product(zero_form * h, e[0]);
  return total.num == 0 ? smaller(crude, product(first_form * h * h, e[1])) : crude;
}

// Bound of |Σ_{i<l} γ_il ℓ_i × ℓ_l| (rad; rates × h²), section 3; gamma indexed [i][l].
template <class T, std::size_t W>
constexpr T cross_bound(const std::array<SampleMoments<T>, W>& s,
                        const std::array<std::array<Rational, W>, W>& gamma,
                        const RateEnvelope<T>& e, T h) noexcept {
  T mixed = T(0);
  T squared = T(0);
  for (std::size_t i = 0; i < W; ++i) {
    for (std::size_t l = i + 1; l < W; ++l) {
      const T g = absolute(to_scalar<T>(gamma[i][l]));
      mixed += g * (s[i].abs[0] * s[l].abs[1] + s[l].abs[0] * s[i].abs[1]);
      squared += g * s[i].abs[1] * s[l].abs[1];
    }
  }
  const T h3 = h * h * h;
  return product(mixed * h3, e[0], e[1]) + product(squared * h3 * h, e[1], e[1]);
}

// |R̃| (rad), section 2; +∞ when A may exceed 1 rad.
template <class T, std::size_t W, std::size_t E>
constexpr T product_remainder(const CommutatorFreeRule<W, E>& r,
                              const std::array<SampleMoments<T>, W>& s, const RateEnvelope<T>& e,
                              T h) noexcept {
  std::array<T, E> p{};       // P_k ≥ |φ_k|
  std::array<T, E> c{};       // C_k ≥ |S_k × φ_k|
  std::array<T, E> spread{};  // ≥ |S_k − φ_k|
  T a = T(0);
  for (std::size_t k = 0; k < E; ++k) {
    std::array<Rational, W> own{};
    std::array<Rational, W> difference{};
    std::array<std::array<Rational, W>, W> gamma{};
    for (std::size_t i = 0; i < W; ++i) {
      own[i] = weight_of(r, k, i);
      Rational before{0, 1};  // Σ_{j<k} a_ji
      for (std::size_t j = 0; j < k; ++j) {
        before = before + weight_of(r, j, i);
      }
      difference[i] = before - own[i];
    }
    for (std::size_t i = 0; i < W; ++i) {
      for (std::size_t l = i + 1; l < W; ++l) {
        Rational g{0, 1};
        for (std::size_t j = 0; j < k; ++j) {
          g = g + weight_of(r, j, i) * own[l] - weight_of(r, j, l) * own[i];
        }
        gamma[i][l] = g;
      }
    }
    p[k] = combination_bound(s, own, e, h);
    c[k] = k == 0 ? T(0) : cross_bound(s, gamma, e, h);
    spread[k] = combination_bound(s, difference, e, h);
    a += p[k];
  }
  if (!(a <= T(1))) {
    return infinity<T>();
  }
  const T f = T(1.0L / 12) + a * a / T(700);
  const T k0 = T(0.5) + f * a;
  T g = T(0);      // G_k
  T q = T(0);      // Q_k
  T b = T(0);      // ≥ |B_k| = ½|Σ_{j<k} S_j×φ_j|
  T fifth = T(0);  // bound (b)
  for (std::size_t k = 0; k < E; ++k) {
    g = (g + k0 * c[k]) * exp_upper(k0 * p[k]);
    const T cross_now = c[k] + g * p[k];  // ≥ |Φ × φ_k| on the piece
    q += T(0.5) * p[k] * g + f * a * cross_now;
    fifth += T(0.5) * b * p[k] + spread[k] * c[k] / T(12) + T(0.5) * p[k] * q +
             a * a * a / T(700) * cross_now + (g * cross_now + a * g * p[k]) / T(12);
    b += T(0.5) * c[k];
  }
  return smaller(q, fifth);
}

// The bound of one step of a member of the family (section 1).
template <class T, std::size_t W, std::size_t E>
constexpr T commutator_free_step(const CommutatorFreeRule<W, E>& r, const RateEnvelope<T>& given,
                                 T h) noexcept {
  const RateEnvelope<T> e = magnus_bounds::implied(given);
  if (!(e[0] * h <= T(1))) {
    return infinity<T>();
  }
  const RotationVectorRule<W> first = first_order_part(r);
  const std::array<SampleMoments<T>, W> s = rule_sample_moments<T>(first);
  const T sum =
      magnus_bounds::quadrature_error(first, e, h) +
      magnus_bounds::coning_term_error(s, second_order_pairs(r), magnus_bounds::single(e), h) +
      magnus_bounds::bortz_remainder(e, h) + product_remainder(r, s, e, h);
  return magnus_bounds::finish(e, h, sum);
}

}  // namespace commutator_free_bounds
}  // namespace detail

/// The one bound of the family, from the member's CommutatorFreeRule; h is the stepper's step (s):
/// W − 1 sample periods for rates spanning the step, W for W delta-angles.
template <class Rule>
struct FamilyLocalErrorBound<CommutatorFreeStepper<Rule>> {
  /// Local angle error bound (rad) for envelope e and step h (s).
  template <class T>
  static constexpr T local(const RateEnvelope<T>& e, T h) noexcept {
    return detail::commutator_free_bounds::commutator_free_step(Rule::value, e, h);
  }
};

}  // namespace halfspin
