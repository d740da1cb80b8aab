#pragma once
// The floating-point roundoff floor of a propagation: how far N steps in scalar type T can drift
// from the exactly-rounded-free result through rounding alone, worst case (linear in N) and
// expected (random walk, √N).
//
// Model (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §2.2 and §3.1): every
// + − × ÷ √ returns the exact result times (1 + δ), |δ| ≤ u = ε/2; n such factors compound to
// at most γ_n = n·u/(1 − n·u). A recursively summed dot product of length n is in error by at
// most γ_n·Σ|a_i||b_i| (Higham §3.1). The attitude error is the rotation angle d(p, q) between
// attitudes (angle_between), which is bi-invariant, so per-step contributions add by the
// triangle inequality: d(q̂_N, q_N) ≤ Σ_k (rounding angle of step k). A 4-vector X perturbed by
// E with |E| ≤ x·|X| (x < 1) turns by at most asin(x) ≤ x/(1 − x) as a direction in ℝ⁴, and the
// rotation angle is twice the angle between the quaternions: at most 2x/(1 − x).
//
// Per-step derivation. θ = D0·dt bounds the rotation angle of one step (D0 = max ‖ω‖).
//  (a) Exponential-map family (every stepper ending in q ⊗ quaternion_exp(φ): the hold and
//      midpoint steps, Magnus4, the coning algorithms, Munthe-Kaas):
//      - Hamilton product q ⊗ P̂: each component is a 4-term dot product of |q| with a signed
//        permutation of P̂, error ≤ γ_4·|q||P̂| per component by Higham §3.1 and Cauchy–Schwarz,
//        so |E| ≤ √4·γ_4|q||P̂| = 2γ_4|q ⊗ P̂|: rotation angle ≤ 2x/(1 − x), x = 2γ_4 (≈ 16u).
//      - Renormalization (q/‖q‖ or the Newton factor q·(3 − ‖q‖²)/2): each component is one
//        product or quotient, componentwise relative error ≤ u (an error in the common factor
//        only rescales and does not turn q): x = u, angle ≤ 2u/(1 − u).
//      - The exponential map: on the series branch the vector part carries a relative error of at
//        most γ_12 (‖φ‖² 5 roundings, Horner 6, the scaling 1) and the scalar part an absolute
//        error ≤ u + γ_12·θ²/8; since the vector part has length ≤ θ/2, the direction of P̂ in ℝ⁴
//        moves by ≤ (u + γ_12)·θ/2 + O(uθ³), rotation angle ≤ γ_14·θ. The libm branch (θ² above
//        the threshold) is also covered by γ_14 with sin, cos within 1 ulp each (2u), √ and ÷.
//        The series' own truncation (first dropped terms θ⁸/10321920 in cos(θ/2) and relative
//        θ⁸/92897280 in sin(θ/2)/θ) turns P by less than θ⁹/5·10⁶.
//      - The rotation vector φ̂ itself: the inputs are rounded to T (samples componentwise by u,
//        dt by u) and φ is formed with at most Stepper::flops further roundings (an upper count:
//        `flops` counts every operation of the step). Every intermediate of the increment is a
//        sum, scaled sum or cross product of rate·dt terms, bounded with its sensitivity by
//        θ·G (G the stage growth of (b) below), so |φ̂ − φ| ≤ γ_{flops+2}·θ·G, and the
//        exponential map does not increase distances in the ball |φ| < π
//        (magnus_family_bounds.hpp §0; checked again in test_roundoff_floor.cpp), so the
//        rotation angle is at most that.
//  (b) Runge–Kutta family (q₊ = q + Σ_i b_i(dt/2)·k̃_i, the stepper declares state_order or
//      embedded_order): the sum over at most S nonzero weights rounds each component of the
//      result by at most γ_S·(|q_j| + Σ_i |x_ij|), x_i = b_i(dt/2)k̃_i, so |E| ≤ γ_S·|q|·(1 + B)
//      with B = Σ_i|x_i|/|q| ≤ (θ/2)·Σ_i|b_i|·G_i (G_i below); the exact result has
//      |X| ≥ |q|(1 − B) by the triangle inequality, so x = γ_S(1 + B)/(1 − B) (≈ 4u for RK4: 8u in
//      angle), plus the stage errors γ_{flops+2}·θ·max_i G_i as in (a), plus renormalization
//      2u/(1 − u). Stage growth: q_i = q + (dt/2)Σ_j a_ij q_j ⊗ (0, ω_j) gives
//      |q_i| ≤ |q|·G_i with G_1 = 1, G_i = 1 + (θ/2)·Σ_{j<i}|a_ij|·G_j, computed from the stepper's
//      own tableau (`using tableau`; at θ = 0.1, max G_i is 1.05 for RK4 and 2.25 for
//      Dormand–Prince, whose rows sum to up to 24.7 in absolute value). A stepper that does not
//      publish a tableau (the exponential-map family, Munthe-Kaas, whose stages are rotation
//      vectors) gets the cover-all G_i ≤ (1 + 13θ)^i (A = 13 ≥ half of every row sum in the
//      library, S = its `stages`, 1 if it declares none) and Σ|b_i| ≤ S.
// The expected form treats the per-step rounding errors as independent with zero mean, so they
// add in quadrature: √N·(per-step bound). It is a typical size, not a bound; correlated rounding
// (identical steps at constant rate) can exceed it, never the worst case.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace detail {

// Whether Stepper is a Runge–Kutta method on the quaternion state (q + Σ b_i k_i form).
template <class Stepper, class = void>
struct has_state_order : std::false_type {};
template <class Stepper>
struct has_state_order<Stepper, std::void_t<decltype(Stepper::state_order)>> : std::true_type {};
template <class Stepper, class = void>
struct has_embedded_order : std::false_type {};
template <class Stepper>
struct has_embedded_order<Stepper, std::void_t<decltype(Stepper::embedded_order)>>
    : std::true_type {};
template <class Stepper, class = void>
struct stage_count {
  static constexpr std::size_t value = 1;
};
template <class Stepper>
struct stage_count<Stepper, std::void_t<decltype(Stepper::stages)>> {
  static constexpr std::size_t value = Stepper::stages;
};

// Stage growth of the roundoff model (header comment (b)): `growth` bounds every stage's
// |q_i|/|q| and `spread` bounds B = Σ_i|x_i|/|q|, for a step of rotation ≤ theta. From the
// stepper's own tableau where it publishes one (the recursion G_i), else the cover-all
// (1 + 13θ)^S and B = θ·(1 + 13θ)^S·S/2.
template <class T>
struct StageGrowth {
  T growth;
  T spread;
};
template <class Stepper, class T, class = void>
struct stage_growth {
  static constexpr StageGrowth<T> of(T theta) noexcept {
    constexpr std::size_t stages = stage_count<Stepper>::value;
    T growth = T(1);
    for (std::size_t i = 0; i < stages; ++i) {
      growth *= T(1) + T(13) * theta;
    }
    return {growth, theta * growth * static_cast<T>(stages) / T(2)};
  }
};
template <class Stepper, class T>
struct stage_growth<Stepper, T, std::void_t<typename Stepper::tableau>> {
  static constexpr StageGrowth<T> of(T theta) noexcept {
    constexpr auto& t = Stepper::tableau::value;
    constexpr std::size_t stages = std::remove_reference_t<decltype(t)>::stages;
    std::array<T, stages> g{};
    T growth = T(1);
    T weighted = T(0);
    for (std::size_t i = 0; i < stages; ++i) {
      T row = T(0);
      for (std::size_t j = 0; j < i; ++j) {
        row += static_cast<T>(t.a[i][j] < 0.0L ? -t.a[i][j] : t.a[i][j]) * g[j];
      }
      g[i] = T(1) + theta / T(2) * row;
      growth = g[i] > growth ? g[i] : growth;
      weighted += static_cast<T>(t.b[i] < 0.0L ? -t.b[i] : t.b[i]) * g[i];
    }
    return {growth, theta / T(2) * weighted};
  }
};

// Higham's γ_n = n·u/(1 − n·u), u = ε/2; +∞ once n·u ≥ 1 (the model no longer bounds anything).
template <class T>
constexpr T gamma_rounding(std::int64_t n) noexcept {
  const T nu = static_cast<T>(n) * (std::numeric_limits<T>::epsilon() / T(2));
  return nu < T(1) ? nu / (T(1) - nu) : std::numeric_limits<T>::infinity();
}

// Rotation angle (rad) of a quaternion perturbed by a relative amount x: 2x/(1 − x).
template <class T>
constexpr T angle_of_relative_perturbation(T x) noexcept {
  return x < T(1) ? T(2) * x / (T(1) - x) : std::numeric_limits<T>::infinity();
}

}  // namespace detail

// True when Stepper updates the quaternion additively (Runge–Kutta family), false when it ends in
// q ⊗ quaternion_exp(φ) (exponential-map family).
template <class Stepper>
inline constexpr bool is_additive_quaternion_stepper =
    detail::has_state_order<Stepper>::value || detail::has_embedded_order<Stepper>::value;

// Worst-case rounding angle (rad) of ONE step of Stepper in T, renormalization included, for a
// step whose rotation angle is at most theta = D0·dt (rad). Derivation in the header comment.
template <class Stepper, class T>
constexpr T roundoff_per_step(T theta) noexcept {
  constexpr std::size_t stages = detail::stage_count<Stepper>::value;
  const detail::StageGrowth<T> stage = detail::stage_growth<Stepper, T>::of(theta);
  const T growth = stage.growth;
  const T renormalization =
      detail::angle_of_relative_perturbation(std::numeric_limits<T>::epsilon() / T(2));
  const T increment =
      detail::gamma_rounding<T>(static_cast<std::int64_t>(Stepper::flops) + 2) * theta * growth;
  if constexpr (is_additive_quaternion_stepper<Stepper>) {
    const T spread = stage.spread;  // B
    if (!(spread < T(1))) {
      return std::numeric_limits<T>::infinity();
    }
    const T x = detail::gamma_rounding<T>(static_cast<std::int64_t>(stages)) * (T(1) + spread) /
                (T(1) - spread);
    return detail::angle_of_relative_perturbation(x) + renormalization + increment;
  } else {
    const T product = detail::angle_of_relative_perturbation(T(2) * detail::gamma_rounding<T>(4));
    const T theta2 = theta * theta;
    const T theta4 = theta2 * theta2;
    const T series_truncation = theta4 * theta4 * theta * T(2e-7);  // θ⁹/5·10⁶
    return product + renormalization + increment + detail::gamma_rounding<T>(14) * theta +
           series_truncation;
  }
}

// Worst-case roundoff floor (rad) of `steps` steps of Stepper in T, each of rotation ≤ theta
// (rad): steps × roundoff_per_step (triangle inequality in the bi-invariant angle metric).
template <class Stepper, class T>
constexpr T roundoff_floor_worst(T theta, std::int64_t steps) noexcept {
  return static_cast<T>(steps) * roundoff_per_step<Stepper, T>(theta);
}

// Expected (random-walk) roundoff floor (rad): √steps × roundoff_per_step, a typical size for
// uncorrelated rounding, not a bound.
template <class Stepper, class T>
T roundoff_floor_expected(T theta, std::int64_t steps) noexcept {
  return std::sqrt(static_cast<T>(steps)) * roundoff_per_step<Stepper, T>(theta);
}

}  // namespace halfspin
