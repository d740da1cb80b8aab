#pragma once
/// @file
/// Renormalization policies: how the propagator pulls the attitude back to unit norm after a step.
/// Rounding (and, for Runge–Kutta steppers, truncation) lets ‖q‖ drift from 1; a non-unit q still
/// names a rotation (every conversion here is scale-invariant or divides by ‖q‖²), but the drift
/// scales vectors rotated with `rotate` and grows without bound. Each policy is a small object the
/// propagator owns (some count steps); `apply` takes the post-step attitude and returns the one to
/// keep. Every policy here only scales q, and `scaling` returns that scale as the pair
/// Scaling{f, f − 1} (f − 1 computed without cancellation where the policy can), standing in for
/// `apply` where the propagator holds the attitude as more than one quaternion: the compensated
/// accumulation (compensated_accumulation.hpp) multiplies its pair by f instead of rounding it to
/// one quaternion, scaling it and reading the factor back. A policy of your own needs only
/// `apply`; without `scaling` the factor is read back from apply's result. Cost per step in flops
/// is noted with each.
///
/// How far ‖q‖ strays under each policy (the bounds computed by norm_error_bound at the end of this
/// header; model of Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §2.2–3.1: each
/// operation rounds with relative error ≤ u = ε/2, a length-4 dot product of positive terms with
/// γ₄ = 4u/(1 − 4u)). Let every step change ‖q‖ by a relative amount ≤ d (the step's norm drift:
/// for the steppers that end in q ⊗ quaternion_exp(φ) — exponential-map steps, Magnus 4, the coning
/// algorithms, RKMK4 — d = exponential_map_step_norm_drift(θ) ≈ 2γ₄ + 2u ≈ 10u for gyro-sized
/// steps; Runge–Kutta steppers must add their truncation drift). Figures for float, where u = 6e-8
/// and d ≈ 6e-7:
///   exact        |‖q‖ − 1| ≤ (1 + u)/(1 − u)·(1 + γ₄/(2(1 − γ₄))) − 1 ≈ 4u = 2ε after every step,
///                whatever came in (√ of a γ₄-accurate sum, then one division per component).
///   first_order  the least fixed point of b ↦ 4u + (3/2)(b + d)² + …, about 4u = 2ε as long as the
///                incoming error is ≪ √u: the Newton step squares the incoming error and adds its
///                own rounding (factor γ₄/2 + u, product u). Past |‖q‖² − 1| = E ≈ √u the policy
///                prescales q by about 1/‖q‖ first, so it never exceeds 4u + 3E²/8 ≤ 4u + 3u/8
///                (2.25ε in float), whatever came in (any step and stepper; ‖q‖² a normal number).
///   periodic     (1 + b_c)(1 + d)^(period − 1) − 1 ≈ 4u + (period − 1)·d, b_c the inner policy's
///                bound: the drift of period − 1 uncorrected steps (15 × 10u for the default 16).
///   threshold    max(the inner policy's bound, τ/2 + γ₄/2): the kept attitude passed the test
///                |‖q‖² − 1| ≤ τ on a γ₄-accurate ‖q‖², so |‖q‖ − 1| ≤ about τ/2 (5e-6 for the
///                default τ = 1e-5), whatever the step drift.
///   none         (1 + b₀)(1 + d)^N − 1 after N steps: rigorous, informative (≤ 1) in float only
///                up to ~10⁶ steps, vacuous beyond (10⁸ steps of 10u: 10²⁵). What it does in
///                practice depends on the data. Roundings add as a random walk (√N·u) when they
///                are uncorrelated. With the increment form (stepper_traits.hpp: q + q ⊗ δ) the
///                soak, vibration about a fixed mean attitude, ends at |‖q‖ − 1| = 7.3e-4 after
///                10⁸ float steps; the earlier product form q ⊗ exp(φ/2), which multiplied a
///                quasi-static q by a factor a few ulps from 1 and rounded it the same way step
///                after step, drifted linearly (0.26ε per step, 0.11 after 10⁸). The attitude is
///                unaffected by the norm (every conversion here is scale-invariant); vectors
///                rotated with `rotate` are scaled.
/// tests/soak/ checks each bound over 10⁸ float steps under coning vibration (ctest -L soak);
/// tests/propagation/test_renormalization_bounds.cpp checks them against measured norms.

#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"

namespace halfspin {

/// The factor a policy scales an attitude by: factor = f and minus_one = f − 1, both to a few
/// u·(f + |f − 1|) (minus_one not as 1 − f rounded from a rounded f where the policy can do
/// better: first order inside its range gives it exactly from the rounded ‖q‖²). An error in
/// either changes only the norm the attitude is pulled to, not its direction.
template <class T>
struct Scaling {
  T factor;     ///< f
  T minus_one;  ///< f − 1
};

/// Leaves q as it is: for Lie-group steppers that stay on the unit sphere to roundoff, and for
/// measuring drift. Cost 0.
struct NoRenormalization {
  static constexpr const char* name = "none";  ///< the policy's name
  /// Returns q unchanged.
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return q;
  }
  /// The factor 1 (f − 1 = 0).
  template <class T>
  constexpr Scaling<T> scaling(const Quaternion<T>& /*q*/) noexcept {
    return {T(1), T(0)};
  }
};

/// q/‖q‖ every step: exact to rounding. Cost 7 + one square root + 4 divisions (scaling: 7 + one
/// square root + 1 division + 1).
struct ExactRenormalization {
  static constexpr const char* name = "exact";  ///< the policy's name
  /// Q/‖q‖.
  template <class T>
  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return normalized(q);
  }
  /// f = 1/‖q‖ (relative error u beyond the norm's), f − 1 exact from it (Sterbenz, f in [½, 2]).
  template <class T>
  Scaling<T> scaling(const Quaternion<T>& q) noexcept {
    const T f = T(1) / norm(q);
    return {f, f - T(1)};
  }
};

namespace detail {

// The range of FirstOrderRenormalization's plain Newton step: |fl(‖q‖²) − 1| ≤ E, E the largest
// power of two with E² ≤ u (float 2⁻¹², double 2⁻²⁷). There the step's own error, 3E²/8 on ‖q‖,
// stays below 3u/8, under one rounding, so the policy keeps the 2ε-class tolerance of
// norm_error_bound (derivation at renormalized_norm_error).
template <class T>
constexpr T first_order_range() noexcept {
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  T e = T(1);
  while (e * e > u) {
    e /= T(2);
  }
  return e;
}

// The bit-pattern guess of 1/√s for a normal s > 0: reading the bits of a positive T as an
// integer gives, up to scale and offset, a piecewise-linear approximation of log₂ s, so
// offset − bits(s)/2 reads back as about s^(−1/2). `offset` minimizes the worst relative error of
// the guess, |guess·√s − 1| ≤ guess_error, found by our own search (float: every s in [1, 4), a
// full period, since guess(4s) = guess(s)/2 exactly; double: the float optimum moved to the
// double layout, refined on 2²⁴ points of [1, 4)); the test "first-order renormalization: the
// reciprocal square root guess" checks it. newton_steps Newton steps y ← y(3/2 − s·y²/2) take
// the relative error η to at most 3η²/2 + η³/2 (+ 3u of rounding): 0.0343 → 1.8e-3 → 5.0e-6
// (float, 2 steps) → 3.5e-11 (double, 3 steps), below the 2⁻¹³ and 2⁻²⁸ the range above needs.
template <class T>
struct ReciprocalSquareRootGuess {
  static constexpr bool available = false;
};
template <>
struct ReciprocalSquareRootGuess<float> {
  static constexpr bool available = true;
  using Bits = std::uint32_t;
  static constexpr Bits offset = 0x5F37642DU;
  static constexpr int newton_steps = 2;
  static constexpr float guess_error = 0.0343f;
};
template <>
struct ReciprocalSquareRootGuess<double> {
  static constexpr bool available = true;
  using Bits = std::uint64_t;
  static constexpr Bits offset = 0x5FE6EC85C0000000U;
  static constexpr int newton_steps = 3;
  static constexpr double guess_error = 0.0343;
};

// The bits of x as an unsigned integer of its size, and back (constexpr, no memory).
template <class Bits, class T>
constexpr Bits bits_of(T x) noexcept {
  return __builtin_bit_cast(Bits, x);
}
template <class T, class Bits>
constexpr T from_bits(Bits b) noexcept {
  return __builtin_bit_cast(T, b);
}

// The guess of 1/√s refined by Newton steps (s normal and positive; see ReciprocalSquareRootGuess).
template <class T>
constexpr T reciprocal_square_root(T s) noexcept {
  using Guess = ReciprocalSquareRootGuess<T>;
  using Bits = typename Guess::Bits;
  T y = from_bits<T>(static_cast<Bits>(Guess::offset - (bits_of<Bits>(s) >> 1U)));
  // Written out rather than looped: g++ 12 leaves a short inner loop in place and then cannot
  // vectorize the batch lane loop around it. (s·y)·y, not s·y², so that y² cannot underflow.
  y = y * (T(1.5) - T(0.5) * ((s * y) * y));
  y = y * (T(1.5) - T(0.5) * ((s * y) * y));
  if constexpr (Guess::newton_steps > 2) {
    y = y * (T(1.5) - T(0.5) * ((s * y) * y));
  }
  return y;
}

// The factor FirstOrderRenormalization scales q by before its Newton step: exactly 1 when
// |s − 1| ≤ first_order_range (s = fl(‖q‖²)), else about 1/√s. Branch-free: both are computed and
// one is selected by a mask made from the sign bit of range − |s − 1| (a comparison turned into a
// bool and then into a 64-bit mask kept g++ 12 from vectorizing the double batch lanes).
template <class T>
constexpr T first_order_prescale(T s) noexcept {
  if constexpr (ReciprocalSquareRootGuess<T>::available) {
    using Bits = typename ReciprocalSquareRootGuess<T>::Bits;
    constexpr unsigned top = 8U * sizeof(Bits) - 1U;
    constexpr Bits sign = Bits(1) << top;
    const T y = reciprocal_square_root(s);
    // |s − 1| by clearing the sign bit; s − 1 is exact near the range (Sterbenz), so the test
    // |fl(‖q‖²) − 1| ≤ range is decided without rounding.
    const T distance = from_bits<T>(static_cast<Bits>(bits_of<Bits>(s - T(1)) & ~sign));
    const Bits outside =
        static_cast<Bits>(Bits(0) - (bits_of<Bits>(first_order_range<T>() - distance) >> top));
    return from_bits<T>(static_cast<Bits>((bits_of<Bits>(T(1)) & static_cast<Bits>(~outside)) |
                                          (bits_of<Bits>(y) & outside)));
  } else {
    // Other scalar types (long double): the square root, with a branch; nothing vectorizes them.
    const T d = s - T(1);
    return (d <= first_order_range<T>() && d >= -first_order_range<T>()) ? T(1)
                                                                         : T(1) / std::sqrt(s);
  }
}

}  // namespace detail

/// One Newton step toward ‖q‖ = 1 with no square root: q·(3 − ‖q‖²)/2. If ‖q‖² = 1 + e, the
/// result has ‖q‖² = 1 − 3e²/4 + e³/4: quadratic convergence, so with the per-step drift of a
/// gyro step (e ~ ε) the norm stays at rounding level. The step alone converges only for e below
/// about 1 and diverges past ‖q‖² = 3 (a large Runge–Kutta step or a far-from-unit initial
/// attitude can get there), and well before that its error 3e²/8 exceeds rounding. So it is taken
/// as it is only inside |fl(‖q‖²) − 1| ≤ E = detail::first_order_range (float 2⁻¹², double 2⁻²⁷,
/// where 3E²/8 ≤ 3u/8), bit for bit as it always was; outside, q is first multiplied by an
/// approximation y of 1/‖q‖ (a bit-pattern guess and 2 (float) or 3 (double) Newton steps on 1/√s,
/// no square root, |‖y·q‖² − 1| ≤ 1.1e-5 float, 7e-11 double) and the same Newton step then
/// finishes: the exact form q/‖q‖ to rounding. Both are computed and one selected, branch-free, so
/// the BatchPropagator lane loop stays vectorized (checked in the assembly of g++ 12 and
/// clang++ 14, -O2 and -O3, default x86-64 target, BatchPropagator<float, 1024> and
/// <double, 1024>, objdump of the lane loop: packed arithmetic only — mulps/addps/subps, the guess
/// in psrld/psubd and the select in and/andn/or (ps or p- forms), and the same in pd and q forms
/// for double — no scalar add/sub/mul/div/sqrt/compare in ss or sd, no call; g++ reloads a few
/// constants with movss/movsd and broadcasts them inside the loop, 1 in float and 9 in double,
/// against 1 and 2 before the fallback existed). There is no square root on purpose: std::sqrt sets
/// errno under the default -fmath-errno, so neither compiler vectorizes a loop that calls it
/// (checked on a loop of the same shape: one scalar sqrtss/sqrtsd and a call to sqrtf/sqrt remain,
/// also with std::fabs, std::fmax or a select in front of the argument).
/// The result is unit to about 2ε (norm_error_bound) for every q whose ‖q‖² is a normal number of T
/// (float: 1.1e-19 < ‖q‖ < 1.8e19; double: 1.5e-154 < ‖q‖ < 1.3e154), any step size and stepper.
/// Cost in flops: 7 (‖q‖²) + 2 (range test) + 5 per Newton step on 1/√s + 4 (prescale) + 7 + 2 + 4
/// (the step) = 36 in float, 41 in double, plus 2 integer operations for the guess and 4 bit
/// operations for the select (13 flops before the fallback existed). A q = 0, or one whose ‖q‖²
/// overflows, gives 0 or a non-finite result, which the propagator rejects.
struct FirstOrderRenormalization {
  static constexpr const char* name = "first_order";  ///< the policy's name
  /// Q scaled toward unit norm by one Newton step, prescaled outside the near-unit range (see
  /// above).
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const Quaternion<T> r = detail::first_order_prescale(squared_norm(q)) * q;  // r = q inside
    const T factor = T(1.5) - T(0.5) * squared_norm(r);
    return factor * r;
  }
  /// The same factor, p·(3 − p²·s)/2 with s = fl(‖q‖²) and p the prescale (1 inside the range,
  /// where p²·s = s exactly and the step is apply's). f − 1 = p·(1 − p²s)/2 + (p − 1): inside the
  /// range (1 − s)/2, exact (Sterbenz and a power of 2), so the compensated pair's norm is
  /// corrected by the Newton step itself, with no rounding of q. Branch-free, as apply. Cost: 7 +
  /// the prescale + 8 (apply: 7 + the prescale + 15).
  template <class T>
  constexpr Scaling<T> scaling(const Quaternion<T>& q) noexcept {
    const T s = squared_norm(q);
    const T p = detail::first_order_prescale(s);
    const T half_defect = T(0.5) - T(0.5) * ((p * p) * s);
    return {p * (T(1) + half_defect), p * half_defect + (p - T(1))};
  }

  /// The near-unit form, for a caller that has s = fl(‖q‖²) already and branches (the scalar
  /// Propagator; the BatchPropagator keeps apply and scaling branch-free for its lane loops). For
  /// |s − 1| ≤ near_unit_range() the prescale is exactly 1, so there apply(q) is bit for bit
  /// near_unit_factor(s)·q, and scaling(q) is {1 + h, h} with h = near_unit_half_defect(s): the
  /// Newton step alone, 7 + 2 + 4 flops where apply takes 36 (float) or 41 (double), and off the
  /// serial chain of steps the guess of 1/√s and its Newton steps. A NaN or an infinite s fails the
  /// range test, so a caller that takes this form only inside it needs no other finiteness check.
  template <class T>
  static constexpr T near_unit_range() noexcept {
    return detail::first_order_range<T>();
  }
  /// The factor 1.5 − 0.5·s (see near_unit_range()).
  template <class T>
  static constexpr T near_unit_factor(T s) noexcept {
    return T(1.5) - T(0.5) * s;
  }
  /// The half defect 0.5 − 0.5·s (see near_unit_range()).
  template <class T>
  static constexpr T near_unit_half_defect(T s) noexcept {
    return T(0.5) - T(0.5) * s;
  }
};

/// Applies Inner every `period` steps and leaves q alone otherwise (a CPU-budget trade: the
/// drift between corrections grows linearly for Runge–Kutta steppers, as a random walk for
/// exponential-map ones).
template <class Inner = ExactRenormalization>
struct PeriodicRenormalization {
  static constexpr const char* name = "periodic";  ///< the policy's name
  std::uint32_t period = 16;                       ///< steps between corrections (≥ 1)
  std::uint32_t count = 0;                         ///< steps since the last correction
  Inner inner{};                                   ///< the policy applied every `period` steps

  /// Inner's result every `period` steps, q unchanged otherwise.
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    if (++count >= period) {
      count = 0;
      return inner.apply(q);
    }
    return q;
  }
  /// Present when Inner has it (I = Inner makes the test depend on the call, so that a missing
  /// member removes this one instead of failing).
  template <class T, class I = Inner>
  constexpr auto scaling(const Quaternion<T>& q) noexcept
      -> decltype(std::declval<I&>().scaling(q)) {
    if (++count >= period) {
      count = 0;
      return static_cast<I&>(inner).scaling(q);
    }
    return {T(1), T(0)};
  }
};

/// Applies Inner only when | ‖q‖² − 1 | exceeds `threshold` (dimensionless; | ‖q‖ − 1 | is about
/// half of it). Cost 7 + a comparison per step, plus Inner when it fires.
template <class T, class Inner = ExactRenormalization>
struct ThresholdRenormalization {
  static constexpr const char* name = "threshold";  ///< the policy's name
  T threshold = T(1e-5);                            ///< on | ‖q‖² − 1 | (dimensionless)
  Inner inner{};                                    ///< the policy applied above the threshold

  /// Inner's result above the threshold, q unchanged otherwise.
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const T e = squared_norm(q) - T(1);
    return (e > threshold || e < -threshold) ? inner.apply(q) : q;
  }
  /// Present when Inner has it (as PeriodicRenormalization::scaling).
  template <class I = Inner>
  constexpr auto scaling(const Quaternion<T>& q) noexcept
      -> decltype(std::declval<I&>().scaling(q)) {
    const T e = squared_norm(q) - T(1);
    if (e > threshold || e < -threshold) {
      return static_cast<I&>(inner).scaling(q);
    }
    return {T(1), T(0)};
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

/// Relative norm drift d of one step q ← q ⊗ quaternion_exp(φ) in T, |φ| ≤ theta (rad): the
/// product moves ‖q ⊗ P̂‖ by at most 2γ₄·‖q‖‖P̂‖ (each component a 4-term dot product,
/// roundoff_floor.hpp (a)), and quaternion_exp's ‖P̂‖ is 1 within |δc| + γ₁₄θ²/4 (scalar part
/// absolute error δc ≤ 2u + γ₁₄θ²/4 on either branch, vector part of length ≤ θ/2 relative γ₁₄).
/// The rotation vector's own rounding does not matter: exp of any φ is unit.
template <class T>
constexpr T exponential_map_step_norm_drift(T theta) noexcept {
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g14 = detail::norm_gamma<T>(14);
  const T theta2 = theta * theta;
  const T dc = T(2) * u + g14 * theta2 / T(4);
  const T vector2 = theta2 / T(4);  // |v|² ≤ (θ/2)²
  // ‖P̂‖² − 1 within [−(2|δc| + |v|²(2γ₁₄)), 2|δc| + δc² + |v|²(2γ₁₄ + γ₁₄²)]; on the series
  // branch its truncation (θ⁸/10321920 relative) added as θ⁸·1e-7.
  const T truncation = theta2 < ScalarTraits<T>::exp_series_angle_squared
                           ? theta2 * theta2 * theta2 * theta2 * T(1e-7)
                           : T(0);
  const T hi = T(2) * dc + dc * dc + vector2 * (T(2) * g14 + g14 * g14) + T(2) * truncation;
  const T lo = -(T(2) * dc + vector2 * T(2) * g14 + T(2) * truncation);
  const T exp_norm = detail::norm_from_squared_norm(lo, hi);
  const T g4 = detail::norm_gamma<T>(4);
  return (T(1) + exp_norm) * (T(1) + T(2) * g4) - T(1);
}

/// |‖q‖ − 1| right after a policy is applied to a q with |‖q‖ − 1| ≤ incoming, in T.
/// Exact: q/‖q‖ rounds ‖q‖² by γ₄, the square root and each division by u: ≈ 4u whatever came in.
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
namespace detail {

// The Newton step alone on an r with |‖r‖² − 1| ≤ e ≤ 0.05: ‖result‖² = g(s)·(1 + ρ) with
// s = ‖r‖² = 1 + E, g(s) = (3/2 − s/2)²s = 1 − 3E²/4 + E³/4 ≤ 1 the exact Newton step, and ρ from
// the factor (relative s·γ₄/(2(3/2 − s/2)) + u) and the product (u per component).
template <class T>
constexpr T first_order_newton_error(T e) noexcept {
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g4 = norm_gamma<T>(4);
  const T k = (T(1) + e) * g4 / (T(2) * (T(1.5) - T(0.5) * (T(1) + e)));
  const T hi = (T(1) + k) * (T(1) + k) * norm_power(T(1) + u, 4) - T(1);
  const T g_lo = T(1) - T(0.75) * e * e - T(0.25) * e * e * e;
  const T lo = g_lo * (T(1) - k) * (T(1) - k) * norm_power(T(1) - u, 4) - T(1);
  return norm_from_squared_norm(lo, hi);
}

// |‖y·q‖² − 1| for the prescaled q outside the range. y from the guess (relative error
// η₀ ≤ guess_error against 1/√s, s = fl(‖q‖²)) and Newton steps: a step computes
// y(3/2 − fl(fl(s·y)·y)/2), the product rounded twice (Δ, |Δ| ≤ 2u + u², an absolute error
// ≤ (1 + η)²(2u + u²)/2 in the bracket), the bracket and the new y once each, so
// η' ≤ (1 + 3η²/2 + η³/2 + (1 + η)³(2u + u²)/2)(1 + u)² − 1. Then each component of y·q rounds by
// u and s = ‖q‖²(1 + θ), |θ| ≤ γ₄: ‖y·q‖² = (1 + η)²(1 + δ)²/(1 + θ), |δ| ≤ u. (Gradual underflow
// of a component far below the largest adds under denorm_min to a unit-size norm, ignored.)
template <class T>
constexpr T first_order_prescaled_error() noexcept {
  using Guess = ReciprocalSquareRootGuess<T>;
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  const T g4 = norm_gamma<T>(4);
  // Without the guess (other scalar types) y = 1/√s: a square root and a division, u each.
  T eta = T(2) * u;
  int steps = 0;
  if constexpr (Guess::available) {
    eta = Guess::guess_error;
    steps = Guess::newton_steps;
  }
  for (int i = 0; i < steps; ++i) {
    const T bracket = (T(1) + eta) * (T(1) + eta) * (T(1) + eta) * (T(2) * u + u * u) / T(2);
    eta =
        (T(1) + T(1.5) * eta * eta + T(0.5) * eta * eta * eta + bracket) * (T(1) + u) * (T(1) + u) -
        T(1);
  }
  const T up = (T(1) + eta) * (T(1) + eta) * (T(1) + u) * (T(1) + u) / (T(1) - g4) - T(1);
  const T down = T(1) - (T(1) - eta) * (T(1) - eta) * (T(1) - u) * (T(1) - u) / (T(1) + g4);
  return up > down ? up : down;
}

}  // namespace detail

/// First order: the Newton step on r = q (branch taken when |fl(s) − 1| ≤ E, s = ‖q‖²) or on the
/// prescaled r = y·q (otherwise). With |‖q‖² − 1| ≤ e_in (from the incoming error): if even
/// e_in + γ₄(1 + e_in) ≤ E, fl(s) cannot leave the range and the bound is the Newton step's on
/// e_in, as before the fallback existed. Otherwise either branch may run: the Newton branch sees at
/// most e_reach = (E + γ₄)/(1 − γ₄) (fl(s) = s(1 + θ) within E of 1), the fallback at most
/// first_order_prescaled_error (< E by the choice of Newton steps), so the bound is the Newton
/// step's on the larger of the two, whatever came in: ≈ 4u + 3E²/8 ≤ 4u + 3u/8 (as evaluated in
/// T: float 2.25ε; double 2.0ε, where 3E²/8 = 3u/16 is below the evaluation's own rounding). +∞
/// where q may be 0 or ‖q‖² may overflow (incoming ≥ 1 or (1 + incoming)² near T's largest value),
/// where no bound holds.
template <class T>
constexpr T renormalized_norm_error(const FirstOrderRenormalization&, T incoming) noexcept {
  const T g4 = detail::norm_gamma<T>(4);
  const T big = T(1) + incoming;
  if (!(incoming < T(1)) || !(big * big <= std::numeric_limits<T>::max() * (T(1) - g4))) {
    return std::numeric_limits<T>::infinity();
  }
  // |s − 1| ≤ e_in (the lower side, 1 − (1 − incoming)², is the smaller).
  const T e_in = big * big - T(1);
  const T range = detail::first_order_range<T>();
  if (e_in + g4 * (T(1) + e_in) <= range) {
    return detail::first_order_newton_error(e_in);
  }
  const T e_reach = (range + g4) / (T(1) - g4);
  const T e_branch = e_in < e_reach ? e_in : e_reach;
  const T e_fallback = detail::first_order_prescaled_error<T>();
  return detail::first_order_newton_error(e_branch > e_fallback ? e_branch : e_fallback);
}
/// None: what came in.
template <class T>
constexpr T renormalized_norm_error(const NoRenormalization&, T incoming) noexcept {
  return incoming;
}

/// The largest |‖q‖ − 1| of the attitude a policy keeps over `steps` steps (the initial attitude
/// included), when every step changes ‖q‖ by a relative amount ≤ step_drift and the initial
/// attitude has |‖q₀‖ − 1| ≤ initial; +∞ where the derivation does not reach. All in T.
/// None: (1 + b₀)(1 + d)^steps − 1, the only bound here that grows with `steps`.
template <class T>
constexpr T norm_error_bound(const NoRenormalization&, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  return detail::drifted_norm_error(initial, step_drift, steps);
}
/// Exact: max(b₀, the rounding of one normalization).
template <class T>
constexpr T norm_error_bound(const ExactRenormalization& policy, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  const T after =
      renormalized_norm_error(policy, detail::drifted_norm_error(initial, step_drift, 1));
  return initial > after ? initial : after;
}
/// First order: the least invariant bound of b ↦ after(b drifted by one step), from b₀.
template <class T>
constexpr T norm_error_bound(const FirstOrderRenormalization& policy, T step_drift, T initial,
                             std::uint64_t steps) noexcept {
  static_cast<void>(steps);
  return detail::least_invariant_bound(initial, [&policy, step_drift](T b) {
    return renormalized_norm_error(policy, detail::drifted_norm_error(b, step_drift, 1));
  });
}
/// Periodic: the inner policy sees period steps of drift; between corrections up to period − 1
/// steps of drift accumulate on its result (or on b₀ before the first correction).
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
/// Threshold τ: an attitude kept without correction passed |fl(‖q‖²) − 1| ≤ τ, so ‖q‖² lies in
/// [(1 − τ)/(1 + γ₄), (1 + τ)/(1 − γ₄)]; a corrected one has the inner policy's bound for an
/// incoming error of (the bound) + one step of drift.
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
    const T fired =
        renormalized_norm_error(policy.inner, detail::drifted_norm_error(b, step_drift, 1));
    return fired > floor ? fired : floor;
  });
}

}  // namespace halfspin
