#pragma once
// Renormalization policies: how the propagator pulls the attitude back to unit norm after a step.
// Rounding (and, for Runge–Kutta steppers, truncation) lets ‖q‖ drift from 1; a non-unit q still
// names a rotation (every conversion here is scale-invariant or divides by ‖q‖²), but the drift
// scales vectors rotated with `rotate` and grows without bound. Each policy is a small object the
// propagator owns (some count steps); `apply` takes the post-step attitude and returns the one to
// keep. Cost per step in flops is noted with each.
//
// How far ‖q‖ strays under each policy (the bounds computed by norm_error_bound at the end of this
// header; model of Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §2.2–3.1: each
// operation rounds with relative error ≤ u = ε/2, a length-4 dot product of positive terms with
// γ₄ = 4u/(1 − 4u)). Let every step change ‖q‖ by a relative amount ≤ d (the step's norm drift:
// for the steppers that end in q ⊗ quaternion_exp(φ) — exponential-map steps, Magnus 4, the coning
// algorithms, RKMK4 — d = exponential_map_step_norm_drift(θ) ≈ 2γ₄ + 2u ≈ 10u for gyro-sized
// steps; Runge–Kutta steppers must add their truncation drift). Figures for float, where u = 6e-8
// and d ≈ 6e-7:
//   exact        |‖q‖ − 1| ≤ (1 + u)/(1 − u)·(1 + γ₄/(2(1 − γ₄))) − 1 ≈ 4u = 2ε after every step,
//                whatever came in (√ of a γ₄-accurate sum, then one division per component).
//   first_order  the least fixed point of b ↦ 4u + (3/2)(b + d)² + …, about 4u = 2ε as long as the
//                incoming error is ≪ √u: the Newton step squares the incoming error and adds its
//                own rounding (factor γ₄/2 + u, product u).
//   periodic     (1 + b_c)(1 + d)^(period − 1) − 1 ≈ 4u + (period − 1)·d, b_c the inner policy's
//                bound: the drift of period − 1 uncorrected steps (15 × 10u for the default 16).
//   threshold    max(the inner policy's bound, τ/2 + γ₄/2): the kept attitude passed the test
//                |‖q‖² − 1| ≤ τ on a γ₄-accurate ‖q‖², so |‖q‖ − 1| ≤ about τ/2 (5e-6 for the
//                default τ = 1e-5), whatever the step drift.
//   none         (1 + b₀)(1 + d)^N − 1 after N steps: rigorous, informative (≤ 1) in float only
//                up to ~10⁶ steps, vacuous beyond (10⁸ steps of 10u: 10²⁵). What it does in
//                practice depends on the data. Roundings add as a random walk (√N·u) only when
//                they are uncorrelated; they are not when a step multiplies a quasi-static q by a
//                factor a few ulps from 1 — cos(|φ|/2) of quaternion_exp at a constant |φ| per
//                step (constant rate; pure coning, whose |ω| is constant) — because the product
//                then rounds the same way step after step: a linear drift (README: 0.23ε per step
//                at constant rate; the soak, vibration about a fixed mean attitude: 0.26ε per step
//                over the first 10⁶ float steps, |‖q‖ − 1| = 0.11 after 10⁸). The attitude is
//                unaffected by the norm (every conversion here is scale-invariant); vectors
//                rotated with `rotate` are scaled.
// tests/soak/ checks each bound over 10⁸ float steps under coning vibration (ctest -L soak);
// tests/propagation/test_renormalization_bounds.cpp checks them against measured norms.

#include <cmath>
#include <cstdint>
#include <limits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"

namespace halfspin {

// Leaves q as it is: for Lie-group steppers that stay on the unit sphere to roundoff, and for
// measuring drift. Cost 0.
struct NoRenormalization {
  static constexpr const char* name = "none";
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return q;
  }
};

// q/‖q‖ every step: exact to rounding. Cost 7 + one square root + 4 divisions.
struct ExactRenormalization {
  static constexpr const char* name = "exact";
  template <class T>
  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return normalized(q);
  }
};

// One Newton step toward ‖q‖ = 1 with no square root: q·(3 − ‖q‖²)/2. If ‖q‖² = 1 + e, the
// result has ‖q‖² = 1 − 3e²/4 + e³/4: quadratic convergence, so with the per-step drift of a
// gyro step (e ~ ε) the norm stays at rounding level. Cost 7 + 2 + 4 = 13 multiplications/adds.
// Converges only while e stays below about 1 (past ‖q‖² = 3 the factor changes sign and the error
// grows): fine for the exponential-map family, whose steps change the norm by rounding only, but a
// Runge–Kutta step over a large angle θ can leave that range (measured by fuzzing: up to about
// 0.19·θ⁴ for RK2); with Runge–Kutta steppers use first order only for θ ≤ 0.5 rad (norm error ≤
// θ⁴/2), or use exact. The propagator rejects a step whose renormalized result overflows.
struct FirstOrderRenormalization {
  static constexpr const char* name = "first_order";
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const T factor = T(1.5) - T(0.5) * squared_norm(q);
    return factor * q;
  }
};

// Applies Inner every `period` steps and leaves q alone otherwise (a CPU-budget trade: the
// drift between corrections grows linearly for Runge–Kutta steppers, as a random walk for
// exponential-map ones).
template <class Inner = ExactRenormalization>
struct PeriodicRenormalization {
  static constexpr const char* name = "periodic";
  std::uint32_t period = 16;  // steps between corrections (≥ 1)
  std::uint32_t count = 0;    // steps since the last correction
  Inner inner{};

  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    if (++count >= period) {
      count = 0;
      return inner.apply(q);
    }
    return q;
  }
};

// Applies Inner only when | ‖q‖² − 1 | exceeds `threshold` (dimensionless; | ‖q‖ − 1 | is about
// half of it). Cost 7 + a comparison per step, plus Inner when it fires.
template <class T, class Inner = ExactRenormalization>
struct ThresholdRenormalization {
  static constexpr const char* name = "threshold";
  T threshold = T(1e-5);
  Inner inner{};

  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const T e = squared_norm(q) - T(1);
    return (e > threshold || e < -threshold) ? inner.apply(q) : q;
  }
};

// Norm-error bounds (model and figures in the header comment). Every bound is on |‖q‖ − 1|
// (dimensionless) of the attitude a policy keeps, in the rounding of scalar type T.

namespace detail {

// Higham's γ_n = n·u/(1 − n·u) in T, u = ε/2; +∞ once n·u ≥ 1.
template <class T>
constexpr T norm_gamma(int n) noexcept {
  const T nu = static_cast<T>(n) * (std::numeric_limits<T>::epsilon() / T(2));
  return nu < T(1) ? nu / (T(1) - nu) : std::numeric_limits<T>::infinity();
}

// The larger of | √(1 + x) − 1 | over x ∈ [lo, hi] (−1 < lo ≤ 0 ≤ hi), without a square root:
// √(1 + x) − 1 ≤ x/2 and 1 − √(1 − y) = y/(1 + √(1 − y)) ≤ y/(2 − y).
template <class T>
constexpr T norm_from_squared_norm(T lo, T hi) noexcept {
  const T up = T(0.5) * hi;
  const T y = -lo;
  const T down = y < T(1) ? y / (T(2) - y) : std::numeric_limits<T>::infinity();
  return up > down ? up : down;
}

// x^n for n ≥ 0 by repeated squaring.
template <class T>
constexpr T norm_power(T x, std::uint64_t n) noexcept {
  T result = T(1);
  while (n != 0) {
    if ((n & 1U) != 0) {
      result *= x;
    }
    x *= x;
    n >>= 1U;
  }
  return result;
}

// |‖q‖ − 1| ≤ b and `steps` steps of relative norm drift ≤ d: (1 + b)(1 + d)^steps − 1 (the
// upper side dominates the lower one, 1 − (1 − b)(1 − d)^steps).
template <class T>
constexpr T drifted_norm_error(T b, T d, std::uint64_t steps) noexcept {
  return (T(1) + b) * norm_power(T(1) + d, steps) - T(1);
}

// Sup over n of b_n, b₀ = start, b_{n+1} = next(b_n), for a monotone `next`: iterates to a
// numerical fixed point, widens it by 1 % and accepts it only if next(B) ≤ B — then b_n ≤ B for
// every n by induction (b₀ ≤ B, b_{n+1} = next(b_n) ≤ next(B) ≤ B). +∞ if there is none.
template <class T, class Next>
constexpr T least_invariant_bound(T start, const Next& next) noexcept {
  T b = start;
  for (int i = 0; i < 200; ++i) {
    const T n = next(b);
    if (!(n < std::numeric_limits<T>::infinity())) {
      return std::numeric_limits<T>::infinity();
    }
    if (n <= b) {
      break;
    }
    b = n;
  }
  const T candidate = b * T(1.01) + std::numeric_limits<T>::denorm_min();
  return next(candidate) <= candidate ? candidate : std::numeric_limits<T>::infinity();
}

}  // namespace detail

// Relative norm drift d of one step q ← q ⊗ quaternion_exp(φ) in T, |φ| ≤ theta (rad): the
// product moves ‖q ⊗ P̂‖ by at most 2γ₄·‖q‖‖P̂‖ (each component a 4-term dot product,
// roundoff_floor.hpp (a)), and quaternion_exp's ‖P̂‖ is 1 within |δc| + γ₁₄θ²/4 (scalar part
// absolute error δc ≤ 2u + γ₁₄θ²/4 on either branch, vector part of length ≤ θ/2 relative γ₁₄).
// The rotation vector's own rounding does not matter: exp of any φ is unit.
template <class T>
constexpr T exponential_map_step_norm_drift(T theta) noexcept {
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g14 = detail::norm_gamma<T>(14);
  const T theta2 = theta * theta;
  const T dc = T(2) * u + g14 * theta2 / T(4);
  const T vector2 = theta2 / T(4);  // |v|² ≤ (θ/2)²
  // ‖P̂‖² − 1 within [−(2|δc| + |v|²(2γ₁₄)), 2|δc| + δc² + |v|²(2γ₁₄ + γ₁₄²)]; on the series
  // branch its truncation (θ⁸/10321920 relative) added as θ⁸·1e-7.
  const T truncation =
      theta2 < ScalarTraits<T>::exp_series_angle_squared ? theta2 * theta2 * theta2 * theta2 * T(1e-7) : T(0);
  const T hi = T(2) * dc + dc * dc + vector2 * (T(2) * g14 + g14 * g14) + T(2) * truncation;
  const T lo = -(T(2) * dc + vector2 * T(2) * g14 + T(2) * truncation);
  const T exp_norm = detail::norm_from_squared_norm(lo, hi);
  const T g4 = detail::norm_gamma<T>(4);
  return (T(1) + exp_norm) * (T(1) + T(2) * g4) - T(1);
}

// |‖q‖ − 1| right after a policy is applied to a q with |‖q‖ − 1| ≤ incoming, in T.
// Exact: q/‖q‖ rounds ‖q‖² by γ₄, the square root and each division by u: ≈ 4u whatever came in.
template <class T>
constexpr T renormalized_norm_error(const ExactRenormalization&, T incoming) noexcept {
  static_cast<void>(incoming);
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g4 = detail::norm_gamma<T>(4);
  // ‖r‖ = (1 + η)/((1 + δ)√(1 + θ)), |η|, |δ| ≤ u, |θ| ≤ γ₄; 1/√(1 − x) ≤ 1 + x/(2(1 − x)).
  const T up = (T(1) + u) / (T(1) - u) * (T(1) + g4 / (T(2) * (T(1) - g4))) - T(1);
  const T down = T(1) - (T(1) - u) / (T(1) + u) * (T(1) - T(0.5) * g4);
  return up > down ? up : down;
}
// First order: ‖r‖² = g(s)·(1 + ρ) with s = ‖q‖² = 1 + E, g(s) = (3/2 − s/2)²s = 1 − 3E²/4 + E³/4 ≤ 1
// the exact Newton step, and ρ from the factor (relative s·γ₄/(2(3/2 − s/2)) + u) and the product
// (u per component). +∞ when the incoming error exceeds 0.05 (outside the derivation's range).
template <class T>
constexpr T renormalized_norm_error(const FirstOrderRenormalization&, T incoming) noexcept {
  if (!(incoming <= T(0.05))) {
    return std::numeric_limits<T>::infinity();
  }
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g4 = detail::norm_gamma<T>(4);
  const T e = (T(1) + incoming) * (T(1) + incoming) - T(1);  // |s − 1| ≤ e
  const T k = (T(1) + e) * g4 / (T(2) * (T(1.5) - T(0.5) * (T(1) + e)));
  const T hi = (T(1) + k) * (T(1) + k) * detail::norm_power(T(1) + u, 4) - T(1);
  const T g_lo = T(1) - T(0.75) * e * e - T(0.25) * e * e * e;
  const T lo = g_lo * (T(1) - k) * (T(1) - k) * detail::norm_power(T(1) - u, 4) - T(1);
  return detail::norm_from_squared_norm(lo, hi);
}
// None: what came in.
template <class T>
constexpr T renormalized_norm_error(const NoRenormalization&, T incoming) noexcept {
  return incoming;
}

// The largest |‖q‖ − 1| of the attitude a policy keeps over `steps` steps (the initial attitude
// included), when every step changes ‖q‖ by a relative amount ≤ step_drift and the initial
// attitude has |‖q₀‖ − 1| ≤ initial; +∞ where the derivation does not reach. All in T.
// None: (1 + b₀)(1 + d)^steps − 1, the only bound here that grows with `steps`.
template <class T>
constexpr T norm_error_bound(const NoRenormalization&, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  return detail::drifted_norm_error(initial, step_drift, steps);
}
// Exact: max(b₀, the rounding of one normalization).
template <class T>
constexpr T norm_error_bound(const ExactRenormalization& policy, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  const T after = renormalized_norm_error(policy, detail::drifted_norm_error(initial, step_drift, 1));
  return initial > after ? initial : after;
}
// First order: the least invariant bound of b ↦ after(b drifted by one step), from b₀.
template <class T>
constexpr T norm_error_bound(const FirstOrderRenormalization& policy, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  return detail::least_invariant_bound(initial, [&policy, step_drift](T b) {
    return renormalized_norm_error(policy, detail::drifted_norm_error(b, step_drift, 1));
  });
}
// Periodic: the inner policy sees period steps of drift; between corrections up to period − 1
// steps of drift accumulate on its result (or on b₀ before the first correction).
template <class T, class Inner>
constexpr T norm_error_bound(const PeriodicRenormalization<Inner>& policy, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  const std::uint64_t period = policy.period < 1U ? 1U : policy.period;
  const T corrected = detail::least_invariant_bound(initial, [&policy, step_drift, period](T b) {
    return renormalized_norm_error(policy.inner, detail::drifted_norm_error(b, step_drift, period));
  });
  return detail::drifted_norm_error(corrected, step_drift, period - 1U);
}
// Threshold τ: an attitude kept without correction passed |fl(‖q‖²) − 1| ≤ τ, so ‖q‖² lies in
// [(1 − τ)/(1 + γ₄), (1 + τ)/(1 − γ₄)]; a corrected one has the inner policy's bound for an
// incoming error of (the bound) + one step of drift.
template <class T, class Inner>
constexpr T norm_error_bound(const ThresholdRenormalization<T, Inner>& policy, T step_drift,
                             T initial, std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  const T g4 = detail::norm_gamma<T>(4);
  const T tau = policy.threshold < T(0) ? -policy.threshold : policy.threshold;
  const T kept = detail::norm_from_squared_norm((T(1) - tau) / (T(1) + g4) - T(1),
                                                (T(1) + tau) / (T(1) - g4) - T(1));
  const T floor = initial > kept ? initial : kept;
  return detail::least_invariant_bound(floor, [&policy, step_drift, floor](T b) {
    const T fired = renormalized_norm_error(policy.inner, detail::drifted_norm_error(b, step_drift, 1));
    return fired > floor ? fired : floor;
  });
}

}  // namespace halfspin
