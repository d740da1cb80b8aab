#pragma once
/// @file
/// The floating-point roundoff floor of a propagation: how far N steps in scalar type T can drift
/// from the result without rounding through rounding alone, worst case, for each accumulation
/// policy: plain (the attitude rounded every step: linear in N) and compensated (the attitude's
/// own rounding made second order: about linear in the angle traversed).
///
/// Model (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §2.2 and §3.1): every
/// + − × ÷ √ returns the exact result times (1 + δ), |δ| ≤ u = ε/2; n such factors compound to
/// at most γ_n = n·u/(1 − n·u). A recursively summed dot product of length n is in error by at
/// most γ_n·Σ|a_i||b_i| (Higham §3.1). The attitude error is the rotation angle d(p, q) between
/// attitudes (angle_between), which is bi-invariant, so per-step contributions add by the
/// triangle inequality: d(q̂_N, q_N) ≤ Σ_k (rounding angle of step k). A 4-vector X perturbed by
/// E with |E| ≤ x·|X| (x < 1) turns by at most asin(x) ≤ x/(1 − x) as a direction in ℝ⁴, and the
/// rotation angle is twice the angle between the quaternions: at most 2x/(1 − x).
///
/// Per-step derivation. θ = D0·dt bounds the rotation angle of one step (D0 = max ‖ω‖).
///  (a) Exponential-map family (every stepper ending in q ⊗ quaternion_exp(φ): the hold and
///      midpoint steps, Magnus4, the coning algorithms, Munthe-Kaas):
///      - Hamilton product q ⊗ P̂: each component is a 4-term dot product of |q| with a signed
///        permutation of P̂, error ≤ γ_4·|q||P̂| per component by Higham §3.1 and Cauchy–Schwarz,
///        so |E| ≤ √4·γ_4|q||P̂| = 2γ_4|q ⊗ P̂|: rotation angle ≤ 2x/(1 − x), x = 2γ_4 (≈ 16u).
///      - Renormalization (q/‖q‖ or the Newton factor q·(3 − ‖q‖²)/2): each component is one
///        product or quotient, componentwise relative error ≤ u (an error in the common factor
///        only rescales and does not turn q): x = u, angle ≤ 2u/(1 − u).
///      - The exponential map: on the series branch the vector part carries a relative error of at
///        most γ_12 (‖φ‖² 5 roundings, Horner 6, the scaling 1) and the scalar part an absolute
///        error ≤ u + γ_12·θ²/8; since the vector part has length ≤ θ/2, the direction of P̂ in ℝ⁴
///        moves by ≤ (u + γ_12)·θ/2 + O(uθ³), rotation angle ≤ γ_14·θ. The libm branch (θ² above
///        the threshold) is also covered by γ_14 with sin, cos within 1 ulp each (2u), √ and ÷.
///        For a stepper that derives its rounding depth (one exp(φ/2) − 1 on the series branch)
///        the sharper θ·(1.01u + γ₁₀θ²/47 + γ₉θ/7.9), about 2u·θ as an angle
///        (exponential_rounding below). The series' own truncation (first dropped terms θ⁸/10321920
///        in cos(θ/2) and relative θ⁸/92897280 in sin(θ/2)/θ) turns P by less than θ⁹/5·10⁶.
///      - The rotation vector φ̂ itself: the inputs are rounded to T (samples componentwise by u,
///        dt by u) and φ is formed with at most Stepper::rounding_depth further roundings on any
///        path from an input (Higham Lemma 3.1 over the expression tree; a stepper that does not
///        derive its depth is charged Stepper::flops, every operation of the step, an upper
///        count). Every intermediate of the increment is a sum, scaled sum or cross product of
///        rate·dt terms, bounded with its sensitivity by θ·G (G the stage growth of (b) below), so
///        |φ̂ − φ| ≤ γ_{depth+2}·θ·G, and the exponential map does not increase distances in the
///        ball |φ| < π (magnus_family_bounds.hpp §0; checked again in test_roundoff_floor.cpp), so
///        the rotation angle is at most that.
///  (b) Runge–Kutta family (q₊ = q + Σ_i b_i(dt/2)·k̃_i, the stepper declares state_order or
///      embedded_order): the sum over at most S nonzero weights rounds each component of the
///      result by at most γ_S·(|q_j| + Σ_i |x_ij|), x_i = b_i(dt/2)k̃_i, so |E| ≤ γ_S·|q|·(1 + B)
///      with B = Σ_i|x_i|/|q| ≤ (θ/2)·Σ_i|b_i|·G_i (G_i below); the exact result has
///      |X| ≥ |q|(1 − B) by the triangle inequality, so x = γ_S(1 + B)/(1 − B) (≈ 4u for RK4: 8u in
///      angle), plus the stage errors γ_{depth+2}·θ·max_i G_i as in (a), plus renormalization
///      2u/(1 − u). Stage growth: q_i = q + (dt/2)Σ_j a_ij q_j ⊗ (0, ω_j) gives
///      |q_i| ≤ |q|·G_i with G_1 = 1, G_i = 1 + (θ/2)·Σ_{j<i}|a_ij|·G_j, computed from the
///      stepper's own tableau (`using tableau`; at θ = 0.1, max G_i is 1.05 for RK4 and 2.25 for
///      Dormand–Prince, whose rows sum to up to 24.7 in absolute value). A stepper that does not
///      publish a tableau (the exponential-map family, Munthe-Kaas, whose stages are rotation
///      vectors) gets the cover-all G_i ≤ (1 + 13θ)^i (A = 13 ≥ half of every row sum in the
///      library, S = its `stages`, 1 if it declares none) and Σ|b_i| ≤ S.
/// Both forms were derived for q ⊗ P̂ and q + Σ b_i k̃_i; with the increment contract the plain
/// policy computes q + q ⊗ δ̂ (stepper_traits.hpp), whose rounding, u·|q| + 2γ_4·|q||δ̂| per step
/// (Higham §3.1), is below the product term above for every step angle below 1.7 rad, so the form
/// stands as an upper bound.
///
///  (c) The compensated accumulation (propagation/compensated_accumulation.hpp, which derives its
///      constants c1, c2 and the bound on the renormalization factor κ): the attitude's own
///      rounding, N·(product + renormalization) above, is replaced by
///          c1·u·2|δ̂| + c2·u² + 4u·(κ beyond the policy's 8u)
///      per step, with |δ̂| ≤ (angle of P)/2 + (the increment's rounding): the angle from the
///      family's bound on its rotation vectors (rotation_linear·θ + rotation_quadratic·θ², the
///      rotation-vector and commutator-free families), θ·G for the other exponential-map steppers,
///      and |δ̂| ≤ B + (its rounding) for Runge–Kutta; κ beyond 8u is the
///      step's own norm change: the increment's rounding (as an angle, an upper bound on the
///      relative norm change) and, for Runge–Kutta, |P| − 1 ≤ B. What remains is the rounding of
///      the increment itself, relative to θ. Over N steps the floor is then about
///      (c·u)·(angle traversed) + N·c2·u², c the increment's and the accumulation's constants
///      together, instead of N·18u. Valid while the attitude stays within 2⁻¹⁰ of the unit sphere
///      (every renormalization policy of renormalization.hpp keeps it there at the step angles the
///      bounds cover); the factor 1/(1 − 2⁻¹⁰) for |q| ≠ 1 is included.
///
/// There is no "expected" (random-walk) form: correlated rounding (a vibration that repeats with
/// the sample pattern, a still attitude) exceeds √N·(per-step bound) by factors of 1.5 to 24 on
/// the project's own motions, so it described nothing a user could rely on; the compensated
/// accumulation makes the worst case itself usable in float.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
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

// Most roundings on a path from an input to the stepper's rotation vector or stages: its declared
// rounding_depth, else its flops (an upper count).
template <class Stepper, class = void>
struct rounding_depth {
  static constexpr int value = Stepper::flops;
};
template <class Stepper>
struct rounding_depth<Stepper, std::void_t<decltype(Stepper::rounding_depth)>> {
  static constexpr int value = Stepper::rounding_depth;
};

// |δ| = |P − 1| ≤ (angle of P)/2 for a step rotating by ≤ theta: from the family's bound on its
// rotation vectors where it declares one (rotation_linear·θ + rotation_quadratic·θ²: the
// rotation-vector and commutator-free families), else θ·G with the stage growth G below (the
// cover-all of the header comment).
template <class Stepper, class = void>
struct declares_rotation_bound : std::false_type {};
template <class Stepper>
struct declares_rotation_bound<Stepper, std::void_t<decltype(Stepper::rotation_linear)>>
    : std::true_type {};

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

/// True when Stepper updates the quaternion additively (Runge–Kutta family), false when it ends in
/// q ⊗ quaternion_exp(φ) (exponential-map family).
template <class Stepper>
inline constexpr bool is_additive_quaternion_stepper =
    detail::has_state_order<Stepper>::value || detail::has_embedded_order<Stepper>::value;

namespace detail {

// The rounding of exp(φ/2) − 1 (rad, as an angle) for |φ| ≤ theta. A stepper whose rounding depth
// covers φ only (it declares rounding_depth) forms its increment with one
// quaternion_exp_minus_one, whose series branch (θ² below ScalarTraits' threshold, certain when
// θ²(1 + γ₄) is) rounds as follows (own derivation, Higham's model): t = |φ|² within γ₃;
// sin(θ/2)/θ = ½ + P with |P| ≤ 1.01·t/48 and P within γ₁₀ of its absolute evaluation (6 roundings
// of Horner and its coefficients, t up to the cube), so after the addition (u) and the scaling of
// φ (u) the vector part is within 1.01·2u + γ₁₀·1.02·t/24 of its size θ/2 (relative to ½ − |P|);
// cos(θ/2) − 1 within γ₉ of 1.01·θ²/8. So |δ̂ − δ| ≤ θ·(1.01u + γ₁₀·θ²/47 + γ₉·θ/7.9), turning
// 1 + δ by at most 2x/(1 − x) with x that bound. Otherwise (the libm branch, or a stepper charged
// its flops) the cover-all γ₁₄·θ of the header comment.
template <class Stepper, class T>
constexpr T exponential_rounding(T theta) noexcept {
  const T theta2 = theta * theta;
  constexpr bool declares_depth = rounding_depth<Stepper>::value != Stepper::flops;
  if (declares_depth &&
      theta2 * (T(1) + gamma_rounding<T>(4)) < ScalarTraits<T>::exp_series_angle_squared) {
    const T u = std::numeric_limits<T>::epsilon() / T(2);
    return angle_of_relative_perturbation(theta *
                                          (T(1.01) * u + gamma_rounding<T>(10) * theta2 / T(47) +
                                           gamma_rounding<T>(9) * theta / T(7.9)));
  }
  return gamma_rounding<T>(14) * theta;
}

// The rounding of the increment itself (rad, as an angle), for a step rotating by ≤ theta: the
// rotation vector or stages (γ_{depth+2}·θ·G), then for the exponential-map family the
// exponential and its series' truncation, for Runge–Kutta (with `with_stage_sum`) the weighted
// sum of the stages, γ_S·B relative to |q| (the plain form counts that sum with q + Σ instead).
template <class Stepper, class T>
constexpr T increment_rounding(T theta, bool with_stage_sum) noexcept {
  constexpr std::size_t stages = stage_count<Stepper>::value;
  const StageGrowth<T> stage = stage_growth<Stepper, T>::of(theta);
  const T increment =
      gamma_rounding<T>(static_cast<std::int64_t>(rounding_depth<Stepper>::value) + 2) * theta *
      stage.growth;
  if constexpr (is_additive_quaternion_stepper<Stepper>) {
    if (!with_stage_sum) {
      return increment;
    }
    return increment + angle_of_relative_perturbation(
                           gamma_rounding<T>(static_cast<std::int64_t>(stages)) * stage.spread);
  } else {
    static_cast<void>(with_stage_sum);
    const T theta2 = theta * theta;
    const T theta4 = theta2 * theta2;
    const T series_truncation = theta4 * theta4 * theta * T(2e-7);  // θ⁹/5·10⁶
    return increment + exponential_rounding<Stepper, T>(theta) + series_truncation;
  }
}

// Worst-case rounding angle (rad) of one step of Stepper in T with Accumulation, renormalized
// every step, for a step whose rotation angle is at most theta = D0·dt (rad).
template <class Stepper, class T, class Accumulation>
struct per_step_rounding;

template <class Stepper, class T>
struct per_step_rounding<Stepper, T, PlainAccumulation> {
  static constexpr T of(T theta) noexcept {
    constexpr std::size_t stages = stage_count<Stepper>::value;
    const T renormalization =
        angle_of_relative_perturbation(std::numeric_limits<T>::epsilon() / T(2));
    const T increment = increment_rounding<Stepper, T>(theta, false);
    if constexpr (is_additive_quaternion_stepper<Stepper>) {
      const T spread = stage_growth<Stepper, T>::of(theta).spread;  // B
      if (!(spread < T(1))) {
        return std::numeric_limits<T>::infinity();
      }
      const T x =
          gamma_rounding<T>(static_cast<std::int64_t>(stages)) * (T(1) + spread) / (T(1) - spread);
      return angle_of_relative_perturbation(x) + renormalization + increment;
    } else {
      const T product = angle_of_relative_perturbation(T(2) * gamma_rounding<T>(4));
      return product + renormalization + increment;
    }
  }
};

// |δ| = |P − 1| ≤ (angle of P)/2 for a step rotating by ≤ theta (declares_rotation_bound above).
template <class Stepper, class T>
constexpr T increment_size(T theta) noexcept {
  if constexpr (declares_rotation_bound<Stepper>::value) {
    return (static_cast<T>(Stepper::rotation_linear) +
            static_cast<T>(Stepper::rotation_quadratic) * theta) *
           theta / T(2);
  } else {
    return stage_growth<Stepper, T>::of(theta).growth * theta / T(2);
  }
}

template <class Stepper, class T>
struct per_step_rounding<Stepper, T, CompensatedAccumulation> {
  static constexpr T of(T theta) noexcept {
    constexpr T u = std::numeric_limits<T>::epsilon() / T(2);
    constexpr T near_unit = T(1) / (T(1) - T(1.0 / 1024));  // |q| ≥ 1 − 2⁻¹⁰
    const T increment = increment_rounding<Stepper, T>(theta, true);
    T size = increment_size<Stepper, T>(theta);  // |δ| of P − 1
    T norm_change = increment;
    if constexpr (is_additive_quaternion_stepper<Stepper>) {
      const T spread = stage_growth<Stepper, T>::of(theta).spread;  // B ≥ |δ| and ≥ ||P| − 1|
      if (!(spread < T(1))) {
        return std::numeric_limits<T>::infinity();
      }
      size = spread;
      norm_change += spread;
    }
    size += increment;
    const T accumulation =
        (T(CompensatedAccumulation::rounding_c1) * u * T(2) * size +
         T(CompensatedAccumulation::rounding_c2) * u * u + T(4) * u * norm_change) *
        near_unit;
    return increment + accumulation;
  }
};

}  // namespace detail

/// Worst-case rounding angle (rad) of ONE step of Stepper in T, renormalization included, for a
/// step whose rotation angle is at most theta = D0·dt (rad), with the plain (default) or the
/// compensated accumulation. Derivation in the header comment.
template <class Stepper, class T, class Accumulation = PlainAccumulation>
constexpr T roundoff_per_step(T theta) noexcept {
  return detail::per_step_rounding<Stepper, T, Accumulation>::of(theta);
}

/// Worst-case roundoff floor (rad) of `steps` steps of Stepper in T, each of rotation ≤ theta
/// (rad): steps × roundoff_per_step (triangle inequality in the bi-invariant angle metric).
template <class Stepper, class T, class Accumulation = PlainAccumulation>
constexpr T roundoff_floor_worst(T theta, std::int64_t steps) noexcept {
  return static_cast<T>(steps) * roundoff_per_step<Stepper, T, Accumulation>(theta);
}

}  // namespace halfspin
