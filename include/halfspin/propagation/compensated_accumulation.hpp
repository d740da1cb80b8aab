#pragma once
/// @file
/// The compensated accumulation policy: the attitude held as an unevaluated sum q_hi + q_lo of two
/// T quaternions (a "double-word" number per component), each step's increment q ⊗ δ added with
/// error-free transformations, the public attitude q_hi + q_lo rounded once. It keeps in T what the
/// plain policy (stepper_traits.hpp: q + q ⊗ δ rounded in T) loses every step: a nearly still
/// attitude multiplied by a factor a few ulps from 1 is rounded the same way step after step, so
/// the plain float attitude drifts at a rate set by T's rounding rather than by the method.
///
/// Building blocks (published, error-free in binary floating point with round-to-nearest):
///   TwoSum (Knuth, TAOCP vol. 2, 4.2.2): s = fl(a + b), e = a + b − s exactly, 6 flops, no branch;
///   Fast2Sum (Dekker 1971): the same in 3 flops when |a| ≥ |b| (or a = 0);
///   double-word + word (Joldes, Muller and Popescu 2017, "Tight and rigorous error bounds for
///   basic building blocks of double-word arithmetic", ACM TOMS, their algorithm DWPlusFP: TwoSum,
///   one addition, Fast2Sum): (hi, lo) + y with relative error at most 2u², u the unit roundoff of
///   T, and the result normalized (|lo| ≤ ½ulp(hi)); see also Ogita, Rump and Oishi 2005, "Accurate
///   sum and dot product", SIAM J. Sci. Comput., for the summation scheme.
///
/// One step (δ = P − 1 from the stepper): p = q_hi ⊗ δ rounded in T (28 flops), then per component
/// (q_hi, q_lo) ← DWPlusFP(q_hi, q_lo, p) (10 flops each): 68 flops against the plain 32.
/// Rounding per step (Higham's model, u = unit roundoff; derivation ours):
///   - p: each component is a 4-term dot product of unit-size q_hi with δ, error ≤ γ₄·|δ|
///     (γ₄ = 4u/(1 − 4u)) per component, so ≤ 2γ₄·|δ| in the 2-norm;
///   - the dropped q_lo ⊗ δ: |q_lo| ≤ ½ulp per component ≤ u·|q_hi|, so ≤ u·|δ|·(1 + O(u));
///   - the four DWPlusFP: ≤ 2u² relative each, ≤ 2u²·|q| in the 2-norm.
///   So the pair moves from its exact value by at most 9·u·|δ| + 2u² in the quaternion 2-norm
///   (2γ₄/u → 8, plus 1; |q| ≈ 1), on top of the increment's own rounding (the stepper's; relative
///   to |δ| too, since δ is formed without cancellation).
///   A renormalization (below) adds fl(κ̂·q_hi) where scaling the pair would add κ̂·(q_hi + q_lo):
///   the rounding of the product (u·|κ̂|), the missing κ̂·q_lo (≤ u·|κ̂|) and the four double-word
///   additions (2u²; DWPlusFP with Fast2Sum for TwoSum, the same pair since |κ̂| ≤ 2⁻¹⁰) move the
///   direction by at most 2u·|κ̂| + 2u²; an error in κ̂ itself is parallel to the attitude and
///   changes only its norm. |κ̂| is the norm error the policy corrects: what the previous
///   renormalization left (its own rounding, a few u: |q|² in γ₄, the factor, the read-back of the
///   factor, ≤ 2u + 4u·|κ| (with_attitude); at most 8u for every policy of renormalization.hpp)
///   plus the step's norm change, plus the policy's rounding of this factor (again at most 8u): |κ̂|
///   ≤ 16u + (norm change). As a rotation angle each is at most twice as much, and |δ| ≤ θ/2 for a
///   step that rotates by θ (|exp(φ/2) − 1| = 2 sin(θ/4)): per step ≤ c1·u·2|δ| + c2·u² + 4u·(norm
///   change) (rad) with c1 = 9 and c2 = 4 + 4 + 64 = 72 (4 without renormalization), that is ≤
///   c1·u·θ + c2·u² for the exponential-map family; over N steps ≤ c1·u·(angle traversed) +
///   N·c2·u², instead of the plain policy's N·c·u (bounds/roundoff_floor.hpp (c) adds the
///   increment's own rounding). A renormalization policy that runs less often corrects the sum of
///   the steps' norm changes at once, so the total of 4u·|κ̂| over a run is the same. The bound
///   assumes the attitude stays within 2⁻¹⁰ of the unit sphere (the branch below that scales both
///   words is not covered).
/// Renormalization acts on the pair: the propagator asks its policy for the factor f = 1 + κ it
/// would scale the rounded attitude by (`scaling`, renormalization.hpp; every policy there has
/// it), and κ·q_hi (a number of size |κ|, rounded with a relative error u) is added to the pair
/// like an increment (with_scaling). An error in κ changes only the norm, which a scale cannot
/// turn into a direction error. The direction moves by O(u·|κ|) = O(u²) when renormalizing every
/// step. A policy with only `apply` works too: its result is taken and κ read back from it
/// (with_attitude), a few flops more and the same bound.
///
/// Requirements: IEEE binary arithmetic with round-to-nearest and no reassociation: -ffast-math
/// (or -fassociative-math) may rewrite b − (s − a) as 0 and make TwoSum and Fast2Sum inexact, so
/// using this policy under __FAST_MATH__ is a compile error. Contraction of a·b + c into a fused
/// multiply-add does not touch TwoSum (additions only) but changes the rounding of q_hi ⊗ δ, so
/// host and Cortex-M results are bit-identical only with -ffp-contract=off, which the library's
/// builds set (tests/target replays compensated configurations on both). No libm call, no branch,
/// no heap.

#include <cmath>
#include <cstdint>
#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/propagation/renormalization.hpp"

namespace halfspin {

namespace detail {

// A rounded result and its rounding error: sum + error equals the exact result.
template <class T>
struct SumAndError {
  T sum;
  T error;
};

// TwoSum (Knuth): fl(a + b) and the exact error, for any finite a, b.
template <class T>
constexpr SumAndError<T> two_sum(T a, T b) noexcept {
  const T s = a + b;
  const T b_virtual = s - a;
  const T a_virtual = s - b_virtual;
  return {s, (a - a_virtual) + (b - b_virtual)};
}

// Fast2Sum (Dekker): fl(a + b) and the exact error when |a| ≥ |b| or a = 0.
template <class T>
constexpr SumAndError<T> fast_two_sum(T a, T b) noexcept {
  const T s = a + b;
  return {s, b - (s - a)};
}

// (hi, lo) + y as a normalized double-word (Joldes, Muller and Popescu 2017, DWPlusFP): relative
// error ≤ 2u².
template <class T>
constexpr SumAndError<T> double_word_plus(T hi, T lo, T y) noexcept {
  const SumAndError<T> s = two_sum(hi, y);
  const T v = lo + s.error;
  return fast_two_sum(s.sum, v);
}

// double_word_plus when |y| ≤ |hi| (or hi = 0): Fast2Sum gives TwoSum's pair there, so the
// result is double_word_plus's bit for bit, in 7 flops instead of 10.
template <class T>
constexpr SumAndError<T> double_word_plus_smaller(T hi, T lo, T y) noexcept {
  const SumAndError<T> s = fast_two_sum(hi, y);
  const T v = lo + s.error;
  return fast_two_sum(s.sum, v);
}

// The pair (hi, lo) + p, componentwise.
template <class T>
constexpr void add_to_pair(Quaternion<T>& hi, Quaternion<T>& lo, const Quaternion<T>& p) noexcept {
  const SumAndError<T> w = double_word_plus(hi.w, lo.w, p.w);
  const SumAndError<T> x = double_word_plus(hi.x, lo.x, p.x);
  const SumAndError<T> y = double_word_plus(hi.y, lo.y, p.y);
  const SumAndError<T> z = double_word_plus(hi.z, lo.z, p.z);
  hi = {w.sum, x.sum, y.sum, z.sum};
  lo = {w.error, x.error, y.error, z.error};
}

// Branch-free selects on the sign bit, for with_attitude_branch_free: an unsigned integer of T's
// size (float and double; other types have none and take the branching path).
template <class T>
struct SignSelectBits {
  static constexpr bool available = false;
};
template <>
struct SignSelectBits<float> {
  static constexpr bool available = true;
  using Bits = std::uint32_t;
};
template <>
struct SignSelectBits<double> {
  static constexpr bool available = true;
  using Bits = std::uint64_t;
};

// |x| by clearing the sign bit.
template <class T>
constexpr T magnitude_bits(T x) noexcept {
  using Bits = typename SignSelectBits<T>::Bits;
  constexpr Bits sign = Bits(1) << (8U * sizeof(Bits) - 1U);
  return __builtin_bit_cast(T, static_cast<Bits>(__builtin_bit_cast(Bits, x) & ~sign));
}

// a where the sign bit of key is set, else b: a mask from the sign bit, then and/and-not/or. No
// comparison and no branch, so a compiler cannot sink the computation of a or b into a branch
// (g++ does so for the arms of a ?: and then, since a floating-point operation may trap, cannot
// vectorize the loop around it).
template <class T>
constexpr T select_if_sign(T key, T a, T b) noexcept {
  using Bits = typename SignSelectBits<T>::Bits;
  constexpr unsigned top = 8U * sizeof(Bits) - 1U;
  const Bits mask = static_cast<Bits>(Bits(0) - (__builtin_bit_cast(Bits, key) >> top));
  return __builtin_bit_cast(T, static_cast<Bits>((__builtin_bit_cast(Bits, a) & mask) |
                                                 (__builtin_bit_cast(Bits, b) & ~mask)));
}

#if defined(__FAST_MATH__)
inline constexpr bool reassociation_possible = true;
#else
inline constexpr bool reassociation_possible = false;
#endif
// Dependent on T so that the check fires where the policy is used, not where it is included.
template <class T>
inline constexpr bool error_free_sums = !reassociation_possible && std::is_floating_point<T>::value;

}  // namespace detail

/// The compensated accumulation policy (see the file comment).
struct CompensatedAccumulation {
  static constexpr const char* name = "compensated";  ///< the policy's name
  static constexpr int flops = 28 + 4 * 10;           ///< q_hi ⊗ δ, four double-word additions
  /// Rounding per step as a rotation angle (rad): ≤ c1·u·2|δ| + c2·u² + 4u·(the step's norm
  /// change), ≤ c1·u·θ + c2·u² for a step rotating by θ whose increment keeps the norm (header
  /// comment); u the unit roundoff of T.
  static constexpr int rounding_c1 = 9;
  static constexpr int rounding_c2 = 72;  ///< c2 of the bound above

  /// The attitude as the pair hi + lo.
  template <class T>
  struct State {
    Quaternion<T> hi;                          ///< q_hi, the high words
    Quaternion<T> lo{T(0), T(0), T(0), T(0)};  ///< q_lo, the low words
  };
  /// The state holding attitude q (body → reference), exactly.
  template <class T>
  static constexpr State<T> start(const Quaternion<T>& q) noexcept {
    return {q, {T(0), T(0), T(0), T(0)}};
  }
  /// The state after one step with increment delta: (q_hi + q_lo) + q_hi ⊗ delta.
  template <class T>
  static constexpr State<T> advanced(const State<T>& s, const Quaternion<T>& delta) noexcept {
    static_assert(detail::error_free_sums<T>,
                  "CompensatedAccumulation needs exact TwoSum/Fast2Sum: compile without "
                  "-ffast-math (-fassociative-math), or use PlainAccumulation");
    State<T> r = s;
    detail::add_to_pair(r.hi, r.lo, s.hi * delta);
    return r;
  }
  /// The attitude the state stands for (body → reference): q_hi + q_lo rounded once.
  template <class T>
  static constexpr Quaternion<T> attitude(const State<T>& s) noexcept {
    return s.hi + s.lo;
  }
  /// The state scaled by 1 + kappa, |kappa| ≤ 2⁻¹⁰ (renormalization): κ·q_hi added to the pair
  /// like an increment, by DWPlusFP with Fast2Sum in place of TwoSum (|q_hi| ≥ |κ·q_hi|, where the
  /// two give the same pair), so bit for bit the double-word addition. 32 flops.
  template <class T>
  static constexpr State<T> scaled(const State<T>& s, T kappa) noexcept {
    const Quaternion<T> t = kappa * s.hi;
    const detail::SumAndError<T> w = detail::double_word_plus_smaller(s.hi.w, s.lo.w, t.w);
    const detail::SumAndError<T> x = detail::double_word_plus_smaller(s.hi.x, s.lo.x, t.x);
    const detail::SumAndError<T> y = detail::double_word_plus_smaller(s.hi.y, s.lo.y, t.y);
    const detail::SumAndError<T> z = detail::double_word_plus_smaller(s.hi.z, s.lo.z, t.z);
    return {{w.sum, x.sum, y.sum, z.sum}, {w.error, x.error, y.error, z.error}};
  }
  /// The state after the propagator's renormalization policy turned attitude(s) = a into kept, a
  /// positive multiple f·a of it (every policy of renormalization.hpp scales). The factor is read
  /// back from the sums of magnitudes, S_a = Σ|a_i| ≥ ‖a‖ > 0 and S_k = Σ|kept_i|:
  /// κ = Σ(|kept_i| − |a_i|)/S_a = f − 1 and f = S_k/S_a (one division: r = 1/S_a, then two
  /// products). Each difference is exact when f is within a factor 2 of 1 (Sterbenz), so κ's
  /// relative error is a few u, plus the policy's own rounding of kept (ε_i, at most 2u per
  /// component for the policies of renormalization.hpp), which enters as their mean weighted by
  /// |a_i|. Near the unit sphere (|κ| ≤ 2⁻¹⁰, every step of a propagator that renormalizes)
  /// κ·q_hi is added to the pair like an increment: the direction moves by O(u·|κ|) only, and an
  /// error in κ changes only the norm, so the policy's own rounding of kept (u per component, a
  /// direction error in the plain policy) does not reach the attitude. Far from it (an attitude or
  /// a step far off the unit sphere, where adding −(1 − f)·q_hi would cancel) both words are
  /// multiplied by f and the pair is renormalized: a direction error of order u, once. Cost near
  /// the unit sphere: 8 magnitudes, 4 subtractions, 6 additions, a division, a product and
  /// scaled()'s 32 flops, with no comparison but the range test (reading κ from the largest
  /// component, a search of 3 compare-and-selects, and TwoSum where Fast2Sum suffices cost 41
  /// Cortex-M4F cycles more per step: exponential_map_hold_end's propagator, 493 → 452).
  template <class T>
  static constexpr State<T> with_attitude(const State<T>& s, const Quaternion<T>& kept) noexcept {
    return with_scaling(s, read_back(attitude(s), kept));
  }
  /// The state scaled by f = scale.factor (a renormalization policy's `scaling` of attitude(s),
  /// renormalization.hpp), without rounding the pair to one quaternion and reading f back: near the
  /// unit sphere (|f − 1| ≤ 2⁻¹⁰) scale.minus_one·q_hi is added to the pair (scaled), far from it
  /// both words are multiplied by f (rescaled). The propagator takes this path when its policy
  /// has `scaling`; the rounding analysis is with_attitude's with κ = scale.minus_one. Cost near
  /// the unit sphere: the range test and scaled()'s 32 flops.
  template <class T>
  static constexpr State<T> with_scaling(const State<T>& s, const Scaling<T>& scale) noexcept {
    if (scale.minus_one <= T(1.0 / 1024) && scale.minus_one >= T(-1.0 / 1024)) {
      return scaled(s, scale.minus_one);
    }
    return rescaled(s, scale.factor);
  }
  /// with_attitude without a branch, for loops that must vectorize (the BatchPropagator lanes):
  /// both outcomes (scaled() and rescaled()) are computed and the choice is a select on a sign
  /// bit. The range test is with_attitude's, written as the sign of an exact difference: |κ| >
  /// 2⁻¹⁰ as 2⁻¹⁰ − |κ| < 0 (for finite operands a difference rounds to the sign of the exact one,
  /// and is +0 when they are equal). So the result is with_attitude's bit for bit whenever that is
  /// finite, and not finite when it is not (a NaN or an infinity in attitude(s) or kept reaches
  /// every outcome; only the NaN's sign bit, which the two forms may read differently, is left to
  /// chance). Types without a same-size unsigned integer (long double) take with_scaling. Cost:
  /// the near-unit path's flops (above) plus rescaled()'s 20 flops, a sign clear, a sign-bit mask
  /// and 8 selects (and, and-not, or). A loop that calls it must inline it to vectorize; clang++ 14
  /// judges it too costly to inline by its own heuristics, so BatchPropagator flattens its lane
  /// loop.
  template <class T>
  static constexpr State<T> with_attitude_branch_free(const State<T>& s,
                                                      const Quaternion<T>& kept) noexcept {
    return with_scaling_branch_free(s, read_back(attitude(s), kept));
  }
  /// with_scaling without a branch, in the same way (the result is with_scaling's bit for bit
  /// whenever that is finite).
  template <class T>
  static constexpr State<T> with_scaling_branch_free(const State<T>& s,
                                                     const Scaling<T>& scale) noexcept {
    if constexpr (!detail::SignSelectBits<T>::available) {
      return with_scaling(s, scale);
    } else {
      using detail::magnitude_bits;
      using detail::select_if_sign;
      const T far_key = T(1.0 / 1024) - magnitude_bits(scale.minus_one);  // < 0 iff |κ| > 2⁻¹⁰
      const State<T> near = scaled(s, scale.minus_one);
      const State<T> far = rescaled(s, scale.factor);
      return {{select_if_sign(far_key, far.hi.w, near.hi.w),
               select_if_sign(far_key, far.hi.x, near.hi.x),
               select_if_sign(far_key, far.hi.y, near.hi.y),
               select_if_sign(far_key, far.hi.z, near.hi.z)},
              {select_if_sign(far_key, far.lo.w, near.lo.w),
               select_if_sign(far_key, far.lo.x, near.lo.x),
               select_if_sign(far_key, far.lo.y, near.lo.y),
               select_if_sign(far_key, far.lo.z, near.lo.z)}};
    }
  }

 private:
  // The factor f = 1 + κ that turned a into kept (with_attitude), as f and κ.
  template <class T>
  static constexpr Scaling<T> read_back(const Quaternion<T>& a,
                                        const Quaternion<T>& kept) noexcept {
    using std::fabs;
    const T aw = fabs(a.w), ax = fabs(a.x), ay = fabs(a.y), az = fabs(a.z);
    const T kw = fabs(kept.w), kx = fabs(kept.x), ky = fabs(kept.y), kz = fabs(kept.z);
    const T difference = ((kw - aw) + (kx - ax)) + ((ky - ay) + (kz - az));
    const T reciprocal = T(1) / ((aw + ax) + (ay + az));
    return {((kw + kx) + (ky + kz)) * reciprocal, difference * reciprocal};
  }
  // Both words multiplied by f and the pair renormalized with Fast2Sum (|f·hi| ≥ |f·lo|): the
  // far-from-unit case of with_attitude. 20 flops.
  template <class T>
  static constexpr State<T> rescaled(const State<T>& s, T f) noexcept {
    const Quaternion<T> hi = f * s.hi;
    const Quaternion<T> lo = f * s.lo;
    const detail::SumAndError<T> w = detail::fast_two_sum(hi.w, lo.w);
    const detail::SumAndError<T> x = detail::fast_two_sum(hi.x, lo.x);
    const detail::SumAndError<T> y = detail::fast_two_sum(hi.y, lo.y);
    const detail::SumAndError<T> z = detail::fast_two_sum(hi.z, lo.z);
    return {{w.sum, x.sum, y.sum, z.sum}, {w.error, x.error, y.error, z.error}};
  }
};

}  // namespace halfspin
