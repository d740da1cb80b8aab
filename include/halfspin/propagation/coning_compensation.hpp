#pragma once
// Multi-sample coning-compensated steppers on delta-angles. The rotation vector of one step is
//     φ = α + β̂,   α = Σ Δθ_i,   β̂ = Σ_{m≥1} c_m Σ_{j−i=m} Δθ_i × Δθ_j,
// followed by the exact exponential-map update q ← q ⊗ quaternion_exp(φ). α + β is the first
// two Magnus terms of the step, β = ½∫ α(t) × ω(t) dt (Bortz's rotation-vector equation
// integrated to second order); the c_m estimate β from the delta-angles alone.
//
// Derivation of c_m (ours; every number below is re-derived by tests/propagation/test_coning.cpp).
// Classical coning, ω(t) = (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt), N delta-angles of
// period h per step, λ = Ωh. The x component (cone axis, the part that drifts) of a product of
// two delta-angles j − i = m periods apart depends only on m:
//     [Δθ_i × Δθ_j]_x = sin²a · 2(1 − cos λ) · sin(mλ)
// (write the lateral part of Δθ_k as sin a · e^{iΩt_{k−1}}(e^{iλ} − 1) in the complex plane), and
// the exact term over the step is β_x = ½ sin²a (Nλ − sin Nλ). Only the total weight per
// separation, K_m = (N − m)·c_m here, is seen by coning. Matching the odd powers λ³ … λ^{2N−1}
// (N − 1 linear equations in K_1 … K_{N−1}) gives, with series
//     2(1 − cos λ) sin mλ = mλ³ − (2m³ + m)λ⁵/12 + (3m⁵ + 5m³ + m)λ⁷/360 − …,
//     ½(x − sin x)        = x³/12 − x⁵/240 + x⁷/10080 − …,
//   N = 2: K_1 = 2/3;                       error −λ⁵/30 · sin²a per step
//   N = 3: K = (27/20, 9/20);               error −3λ⁷/280 · sin²a
//   N = 4: K = (214/105, 92/105, 54/105);   error −λ⁹/315 · sin²a
// and for one new sample with the previous one (Δθ_prev × Δθ, separation 1): k = 1/12, error
// −λ⁵/60 · sin²a. The per-step coning error is O(λ^{2N+1}); summed over 1/(Nh) steps per unit
// time the attitude drift falls as h^{2N}. The weights are spread evenly over the pairs of one
// separation (c_m = K_m/(N − m)), which keeps the estimate symmetric under time reversal: for N = 3
// that is the form 9/20 Δθ1×Δθ3 + 27/40 Δθ2×(Δθ3 − Δθ1).
//
// Orders. Under pure classical coning the coning drift error falls as h^{2N} (N new samples; the
// one-plus-previous algorithm: h⁴). That holds only while it exceeds the remainder of the
// second-order form α + β itself (the third Magnus term), which under coning is, per update of
// length T (ours, series of the closed form, measured in the tests): (a⁴/240)(ΩT)⁵ along the
// cone axis, a drift, and a³(ΩT)⁵/240 across it, which turns with the cone and so stays bounded
// near a³(ΩT)⁴/240. Both are fourth order in h. At a cone angle of 0.02 rad they hide
// the orders of N = 3 and N = 4 entirely (both measure 4.0, with the error of an ideal update by
// the exact α + β within 1 %); at 1e-3 rad N = 4 still measures 4; at 1e-5 rad (vibration-sized
// coning) over 32 cone cycles all of 2, 4, 6, 8 show. The tests therefore check N = 4 against
// the exact coning term (per update, λ⁹) and the attitude at a = 1e-5 rad.
// For general motion (not pure coning) the `order` constant is what is reached: 2 for one sample
// (β dropped), 4 for N ≥ 2 (the even-spread estimate of β is exact through T⁴ for any smooth rate,
// and the third Magnus term is O(T⁵) per update), and 3 for one-plus-previous (the estimate of β
// uses the previous interval, so it is not symmetric: a T⁴ term ω × ω̈ per step remains). At a
// fixed sample period, general motion favours N = 2: N = 3, 4 lengthen the update interval T = N·h
// that the O(T⁵) remainder grows with (measured on an axisymmetric body: N = 4 about 19× worse than
// N = 2).
//
// Cost as implemented (flops: + − ×; the exponential map as in exponential_map_step.hpp, its
// series branch 20 flops, and the quaternion product 28): sum of the N samples 3(N − 1); each
// cross product 9; summing the products of one separation 3 each; scaling and adding each
// separation's sum 6. Totals: one sample 48, one-plus-previous 63, two 66, three 96, four 138.
// Memory: none beyond the input window (3 scalars per sample).

#include <array>
#include <cstddef>
#include <cstdint>
#include <type_traits>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

// A coefficient set as exact rationals: per-pair weight of a cross product of two delta-angles
// `separation` = index + 1 sample periods apart is numerators[index]/denominator.
template <std::size_t Separations>
struct ConingCoefficientSet {
  std::array<std::int32_t, Separations> numerators;
  std::int32_t denominator;
};

// The coefficient sets (derivation in the header comment; published values, from memory, are
// compared in the tests). Per-pair weights c_m; the total per separation is (N − m)·c_m.
namespace coning_coefficients {
inline constexpr ConingCoefficientSet<0> one_sample{{}, 1};
inline constexpr ConingCoefficientSet<1> one_sample_plus_previous{{1}, 12};
inline constexpr ConingCoefficientSet<1> two_sample{{2}, 3};
inline constexpr ConingCoefficientSet<2> three_sample{{27, 18}, 40};  // 27/40, 9/20
// 214/315, 46/105, 18/35 per pair; totals 214/105, 92/105, 54/105 by separation 1, 2, 3.
inline constexpr ConingCoefficientSet<3> four_sample{{214, 138, 162}, 315};
// The older three-sample set (Miller 1983, from memory): 33/80 Δθ1×Δθ3 + 57/80 Δθ2×(Δθ3 − Δθ1).
// It matches only the λ³ term under classical coning (its λ⁵ term is off by 3λ⁵/80 · sin²a), so
// its coning drift falls as h⁴, not h⁶: one error term fewer cancelled than `three_sample`.
inline constexpr ConingCoefficientSet<2> three_sample_older{{57, 33}, 80};  // 57/80, 33/80
}  // namespace coning_coefficients

namespace detail {

// β̂ = Σ_m c_m Σ_{j−i=m} s[i] × s[j] alone (rad): the coning correction, also the online error
// signal of the coning steppers. With the previous sample in front (first = 1) the pairs start at
// index 0. Zero for a set without separations (one sample).
template <class T, std::size_t W, std::size_t S>
constexpr Vector3<T> coning_correction(const std::array<Vector3<T>, W>& s, std::size_t first,
                                       const ConingCoefficientSet<S>& set) noexcept {
  if constexpr (S == 0) {
    static_cast<void>(s);
    static_cast<void>(first);
    static_cast<void>(set);
    return Vector3<T>::zero();
  } else {
    const std::size_t begin = first == 0 ? 0 : first - 1;
    Vector3<T> beta{};
    for (std::size_t m = 1; m <= S; ++m) {
      Vector3<T> sum = cross(s[begin], s[begin + m]);
      for (std::size_t i = begin + 1; i + m < W; ++i) {
        sum += cross(s[i], s[i + m]);
      }
      const Vector3<T> term = (T(set.numerators[m - 1]) / T(set.denominator)) * sum;
      beta = m == 1 ? term : beta + term;  // no 0 + x: the first term starts the sum
    }
    return beta;
  }
}

// α = Σ s[first..] (rad): the summed delta-angles of the step.
template <class T, std::size_t W>
constexpr Vector3<T> delta_angle_sum(const std::array<Vector3<T>, W>& s, std::size_t first) noexcept {
  Vector3<T> alpha = s[first];
  for (std::size_t i = first + 1; i < W; ++i) {
    alpha += s[i];
  }
  return alpha;
}

// φ = α + β̂ (rad), the rotation vector of a coning step; step() and step_with_estimate() both
// form it this way, so their attitudes are bit-identical and the estimate reuses β̂.
template <class T, std::size_t W, std::size_t S>
constexpr Vector3<T> coning_rotation_vector(const std::array<Vector3<T>, W>& s, std::size_t first,
                                            const ConingCoefficientSet<S>& set) noexcept {
  if constexpr (S == 0) {
    return delta_angle_sum(s, first);
  } else {
    return delta_angle_sum(s, first) + coning_correction(s, first, set);
  }
}

// The exact exponential-map update that ends every coning step: quaternion_exp and the product.
inline constexpr int exp_and_product_flops = quaternion_exp_series_flops + quaternion_product_flops;

}  // namespace detail

// N delta-angles tiling the step, oldest first, with coefficient set Set (N − 1 separations).
template <std::size_t N, const ConingCoefficientSet<(N > 0 ? N - 1 : 0)>& Set, int GeneralOrder,
          int ConingOrder, int Flops>
struct MultiSampleConing {
  static constexpr SampleLayout layout = SampleLayout::delta_angles;
  static constexpr std::size_t window = N;
  static constexpr std::size_t new_samples = N;
  static constexpr int order = GeneralOrder;        // any smooth motion, delta-angle input
  static constexpr int coning_order = ConingOrder;  // coning drift under pure classical coning
  static constexpr int flops = Flops;

  // Rotation vector (rad) of the step from the N delta-angles (rad), oldest first.
  template <class T>
  static constexpr Vector3<T> rotation_vector(
      const std::array<Vector3<T>, window>& delta) noexcept {
    return detail::coning_rotation_vector(delta, 0, Set);
  }
  // q ⊗ exp(φ/2) with φ = rotation_vector(delta); delta in rad, dt (s, unused: delta-angles
  // already carry time).
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& delta,
                            T /*dt*/) noexcept {
    return q * quaternion_exp(rotation_vector(delta));
  }
  // step() plus the online error signal |β̂| (rad), the coning correction: the rotation that
  // summing the delta-angles alone (ConingOneSample on the same step) would miss, i.e. the
  // non-commutativity the step saw. It estimates the error of that lower-order method on the
  // same step (measured ratio 0.98–1.02 on coarse steps, 1.00 on fine ones, on classical coning
  // and an axisymmetric body), not this method's own error, which it exceeds by 35× to 10⁵×
  // (tests/bounds/test_magnus_family_bounds.cpp). Only for N ≥ 2: one sample has no correction.
  // Cost: step() plus the norm of β̂ (step() forms φ as α + β̂ too, so the attitude is
  // bit-identical to step()'s and β̂ is computed once).
  template <class T, std::size_t M = N, std::enable_if_t<(M > 1), int> = 0>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q,
                                           const std::array<Vector3<T>, window>& delta, T dt) noexcept {
    static_cast<void>(dt);
    const Vector3<T> beta = detail::coning_correction(delta, 0, Set);
    return {q * quaternion_exp(detail::delta_angle_sum(delta, 0) + beta), norm(beta)};
  }
};

// One delta-angle per step, no coning correction: φ = Δθ. Global order 2.
struct ConingOneSample : MultiSampleConing<1, coning_coefficients::one_sample, 2, 2, 0 + detail::exp_and_product_flops> {
  static constexpr const char* name = "coning_1_sample";
};

// Two delta-angles per step: φ = Δθ1 + Δθ2 + 2/3 Δθ1×Δθ2. Global order 4 (coning: h⁴).
struct ConingTwoSample : MultiSampleConing<2, coning_coefficients::two_sample, 4, 4, 18 + detail::exp_and_product_flops> {
  static constexpr const char* name = "coning_2_sample";
};

// Three delta-angles: φ = α + 9/20 Δθ1×Δθ3 + 27/40 Δθ2×(Δθ3 − Δθ1). Global order 4 for general
// motion (third Magnus term); coning drift h⁶ while a⁴ is small (header comment).
struct ConingThreeSample : MultiSampleConing<3, coning_coefficients::three_sample, 4, 6, 48 + detail::exp_and_product_flops> {
  static constexpr const char* name = "coning_3_sample";
};

// Three delta-angles with the older set 33/80, 57/80 (Miller 1983, from memory): cancels the λ³
// coning term only, so coning drift h⁴ (one term fewer than ConingThreeSample). Global order 4.
struct ConingThreeSampleOlder
    : MultiSampleConing<3, coning_coefficients::three_sample_older, 4, 4, 48 + detail::exp_and_product_flops> {
  static constexpr const char* name = "coning_3_sample_older";
};

// Four delta-angles, per-pair weights 214/315, 46/105, 18/35 by separation 1, 2, 3. Global order 4
// for general motion; coning drift h⁸ only at small cone angles (header comment).
struct ConingFourSample : MultiSampleConing<4, coning_coefficients::four_sample, 4, 8, 90 + detail::exp_and_product_flops> {
  static constexpr const char* name = "coning_4_sample";
};

// One new delta-angle with the previous step's last one: φ = Δθ + 1/12 Δθ_prev × Δθ. Global
// order 3 for general motion (header comment), coning drift h⁴. Input: [0] previous, [1] new.
struct ConingOneSamplePlusPrevious {
  static constexpr SampleLayout layout = SampleLayout::delta_angles_with_previous;
  static constexpr std::size_t window = 2;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 3;
  static constexpr int coning_order = 4;
  static constexpr int flops = 15 + detail::exp_and_product_flops;
  static constexpr const char* name = "coning_1_sample_plus_previous";

  // Rotation vector (rad) of the step from [previous, new] delta-angles (rad).
  template <class T>
  static constexpr Vector3<T> rotation_vector(
      const std::array<Vector3<T>, window>& delta) noexcept {
    return detail::coning_rotation_vector(delta, 1, coning_coefficients::one_sample_plus_previous);
  }
  // q ⊗ exp(φ/2) with φ = rotation_vector(delta); delta in rad, dt (s) unused.
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& delta,
                            T /*dt*/) noexcept {
    return q * quaternion_exp(rotation_vector(delta));
  }
  // step() plus the online error signal |1/12·Δθ_prev × Δθ| (rad), the coning correction (see
  // MultiSampleConing::step_with_estimate for what it estimates).
  template <class T>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q,
                                           const std::array<Vector3<T>, window>& delta, T dt) noexcept {
    static_cast<void>(dt);
    const Vector3<T> beta =
        detail::coning_correction(delta, 1, coning_coefficients::one_sample_plus_previous);
    return {q * quaternion_exp(detail::delta_angle_sum(delta, 1) + beta), norm(beta)};
  }
};

}  // namespace halfspin
