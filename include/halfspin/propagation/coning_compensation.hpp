#pragma once
/// @file
/// Multi-sample coning-compensated steppers on delta-angles. The rotation vector of one step is
///     φ = α + β̂,   α = Σ Δθ_i,   β̂ = Σ_{m≥1} c_m Σ_{j−i=m} Δθ_i × Δθ_j,
/// followed by the exact exponential-map update q ← q ⊗ quaternion_exp(φ). α + β is the first
/// two Magnus terms of the step, β = ½∫ α(t) × ω(t) dt (Bortz's rotation-vector equation
/// integrated to second order: bounds/magnus_family_bounds.hpp §1); the c_m estimate β from the
/// delta-angles alone.
///
/// Derivation of c_m (ours; every number below is re-derived by tests/propagation/test_coning.cpp).
/// Classical coning, ω(t) = (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt), N delta-angles of
/// period h per step, λ = Ωh. The x component (cone axis, the part that drifts) of a product of
/// two delta-angles j − i = m periods apart depends only on m:
///     [Δθ_i × Δθ_j]_x = sin²a · 2(1 − cos λ) · sin(mλ)
/// (write the lateral part of Δθ_k as sin a · e^{iΩt_{k−1}}(e^{iλ} − 1) in the complex plane), and
/// the exact term over the step is β_x = ½ sin²a (Nλ − sin Nλ). Only the total weight per
/// separation, K_m = (N − m)·c_m here, is seen by coning. Matching the odd powers λ³ … λ^{2N−1}
/// (N − 1 linear equations in K_1 … K_{N−1}) gives, with series
///     2(1 − cos λ) sin mλ = mλ³ − (2m³ + m)λ⁵/12 + (3m⁵ + 5m³ + m)λ⁷/360 − …,
///     ½(x − sin x)        = x³/12 − x⁵/240 + x⁷/10080 − …,
///   N = 2: K_1 = 2/3;                       error −λ⁵/30 · sin²a per step
///   N = 3: K = (27/20, 9/20);               error −3λ⁷/280 · sin²a
///   N = 4: K = (214/105, 92/105, 54/105);   error −λ⁹/315 · sin²a
/// and for one new sample with the previous one (Δθ_prev × Δθ, separation 1): k = 1/12, error
/// −λ⁵/60 · sin²a. The per-step coning error is O(λ^{2N+1}); summed over 1/(Nh) steps per unit
/// time the attitude drift falls as h^{2N}. For any coefficient set (Miller's below too) the same
/// criterion gives the coning order: if λ^{2k+1} is the first odd power at which
/// Σ_m K_m·2(1 − cos λ) sin mλ and ½(Nλ − sin Nλ) differ (N the new samples of a step), that term
/// is the per-step error and the drift falls as h^{2k}; coning_drift_order
/// (rotation_vector_family.hpp) evaluates it from a rule's weights. The weights are spread evenly
/// over the pairs of one separation (c_m = K_m/(N − m)), which keeps the estimate symmetric under
/// time reversal: for N = 3 that is the form 9/20 Δθ1×Δθ3 + 27/40 Δθ2×(Δθ3 − Δθ1).
///
/// Orders. Under pure classical coning the coning drift error falls as h^{2N} (N new samples; the
/// one-plus-previous algorithm: h⁴). That holds only while it exceeds the remainder of the
/// second-order form α + β itself (the third Magnus term), which under coning is, per update of
/// length T (ours, series of the closed form, measured in the tests): (a⁴/240)(ΩT)⁵ along the
/// cone axis, a drift, and a³(ΩT)⁵/240 across it, which turns with the cone and so stays bounded
/// near a³(ΩT)⁴/240. Both are fourth order in h. At a cone angle of 0.02 rad they hide
/// the orders of N = 3 and N = 4 entirely (both measure 4.0, with the error of an ideal update by
/// the exact α + β within 1 %); at 1e-3 rad N = 4 still measures 4; at 1e-5 rad (vibration-sized
/// coning) over 32 cone cycles all of 2, 4, 6, 8 show. The tests therefore check N = 4 against
/// the exact coning term (per update, λ⁹) and the attitude at a = 1e-5 rad.
/// For general motion (not pure coning) the `order` constant is what is reached: 2 for one sample
/// (β dropped), 4 for N ≥ 2 (the even-spread estimate of β is exact through T⁴ for any smooth rate,
/// and the third Magnus term is O(T⁵) per update), and 3 for one-plus-previous (the estimate of β
/// uses the previous interval, so it is not symmetric: a T⁴ term ω × ω̈ per step remains). At a
/// fixed sample period, general motion favours N = 2: N = 3, 4 lengthen the update interval T = N·h
/// that the O(T⁵) remainder grows with (measured on an axisymmetric body: N = 4 about 19× worse
/// than N = 2).
///
/// Each algorithm is a RotationVectorRule (rotation_vector_family.hpp): delta-angle samples,
/// unit quadrature weights and the coefficient set below; order, coning order, flops and the
/// a-priori bound are all derived from that data.
/// Cost as implemented (flops: + − ×; exp(φ/2) − 1 on its series branch 19 and the plain
/// application 32): sum of the N samples 3(N − 1); each cross product 9; summing the products of
/// one separation 3 each; scaling and adding each separation's sum 6. Totals: one sample 51,
/// one-plus-previous 66, two 69, three 99, four 141.
/// Memory: none beyond the input window (3 scalars per sample).

#include <array>
#include <cstddef>
#include <cstdint>

#include "halfspin/propagation/rotation_vector_family.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The coefficient sets (derivation in the header comment; published values, from memory, are
/// compared in the tests). Per-pair weights c_m; the total per separation is (N − m)·c_m.
namespace coning_coefficients {
inline constexpr ConingCoefficientSet<0> one_sample{{}, 1};  ///< no cross product
/// Previous × new: 1/12.
inline constexpr ConingCoefficientSet<1> one_sample_plus_previous{{1}, 12};
inline constexpr ConingCoefficientSet<1> two_sample{{2}, 3};          ///< 2/3
inline constexpr ConingCoefficientSet<2> three_sample{{27, 18}, 40};  ///< 27/40, 9/20
/// 214/315, 46/105, 18/35 per pair; totals 214/105, 92/105, 54/105 by separation 1, 2, 3.
inline constexpr ConingCoefficientSet<3> four_sample{{214, 138, 162}, 315};
/// Miller's three-sample set (Miller 1983, from memory): 33/80 Δθ1×Δθ3 + 57/80 Δθ2×(Δθ3 − Δθ1).
/// It matches only the λ³ term under classical coning (its λ⁵ term is off by 3λ⁵/80 · sin²a), so
/// its coning drift falls as h⁴, not h⁶: one error term fewer cancelled than `three_sample`.
inline constexpr ConingCoefficientSet<2> three_sample_miller{{57, 33}, 80};  ///< 57/80, 33/80
}  // namespace coning_coefficients

namespace rotation_vector_rules {
/// N delta-angles tiling the step, coefficient set `set` (unit quadrature weights).
template <std::size_t N>
constexpr RotationVectorRule<N> coning(
    const ConingCoefficientSet<(N > 0 ? N - 1 : 0)>& set) noexcept {
  RotationVectorRule<N> r{SampleLayout::delta_angles, {}, 1, set};
  for (std::size_t i = 0; i < N; ++i) {
    r.quadrature[i] = 1;
  }
  return r;
}
/// One delta-angle, no coning correction.
struct Coning1Sample {
  /// The rule's data.
  static constexpr RotationVectorRule<1> value = coning<1>(coning_coefficients::one_sample);
};
/// Two delta-angles, coefficient set two_sample.
struct Coning2Sample {
  /// The rule's data.
  static constexpr RotationVectorRule<2> value = coning<2>(coning_coefficients::two_sample);
};
/// Three delta-angles, coefficient set three_sample.
struct Coning3Sample {
  /// The rule's data.
  static constexpr RotationVectorRule<3> value = coning<3>(coning_coefficients::three_sample);
};
/// Three delta-angles, coefficient set three_sample_miller.
struct Coning3SampleMiller {
  /// The rule's data.
  static constexpr RotationVectorRule<3> value =
      coning<3>(coning_coefficients::three_sample_miller);
};
/// Four delta-angles, coefficient set four_sample.
struct Coning4Sample {
  /// The rule's data.
  static constexpr RotationVectorRule<4> value = coning<4>(coning_coefficients::four_sample);
};
/// The previous step's last delta-angle (weight 0 in the sum), then the new one.
struct Coning1SamplePlusPrevious {
  /// The rule's data.
  static constexpr RotationVectorRule<2> value{SampleLayout::delta_angles_with_previous,
                                               {{0, 1}},
                                               1,
                                               coning_coefficients::one_sample_plus_previous};
};
}  // namespace rotation_vector_rules

// Each step: q ⊗ exp(φ/2) with φ = α + β̂ from the delta-angles (rad), oldest first; dt (s) is
// not read (delta-angles already carry time). step_with_estimate's signal is |β̂| (rad), the
// coning correction: the rotation that summing the delta-angles alone (Coning1Sample on the same
// step) would miss. It estimates the error of that lower-order method on the same step (measured
// ratio 0.98–1.02 on coarse steps, 1.00 on fine ones, on classical coning and an axisymmetric
// body), not this method's own error, which it exceeds by 35× to 10⁵×
// (tests/bounds/test_magnus_family_bounds.cpp).

/// One delta-angle per step, no coning correction: φ = Δθ. Global order 2.
struct Coning1Sample : RotationVectorStepper<rotation_vector_rules::Coning1Sample> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_1_sample";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "delta-angle exponential map, no coning term; 1 delta-angle/step, order 2";
};

/// Two delta-angles per step: φ = Δθ1 + Δθ2 + 2/3 Δθ1×Δθ2. Global order 4 (coning: h⁴).
struct Coning2Sample : RotationVectorStepper<rotation_vector_rules::Coning2Sample> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_2_sample";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "two-sample coning compensation; 2 delta-angles/step, order 4";
};

/// Three delta-angles: φ = α + 9/20 Δθ1×Δθ3 + 27/40 Δθ2×(Δθ3 − Δθ1). Global order 4 for general
/// motion (third Magnus term); coning drift h⁶ while a⁴ is small (header comment).
struct Coning3Sample : RotationVectorStepper<rotation_vector_rules::Coning3Sample> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_3_sample";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "three-sample coning compensation; 3 delta-angles/step, order 4";
};

/// Three delta-angles with Miller's set 33/80, 57/80 (Miller 1983, from memory): cancels the λ³
/// coning term only, so coning drift h⁴ (one term fewer than Coning3Sample). Global order 4.
struct Coning3SampleMiller : RotationVectorStepper<rotation_vector_rules::Coning3SampleMiller> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_3_sample_miller";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "three-sample coning, Miller's 1983 coefficient set; 3 delta-angles/step, order 4";
};

/// Four delta-angles, per-pair weights 214/315, 46/105, 18/35 by separation 1, 2, 3. Global order 4
/// for general motion; coning drift h⁸ only at small cone angles (header comment).
struct Coning4Sample : RotationVectorStepper<rotation_vector_rules::Coning4Sample> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_4_sample";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "four-sample coning compensation; 4 delta-angles/step, order 4";
};

/// One new delta-angle with the previous step's last one: φ = Δθ + 1/12 Δθ_prev × Δθ. Global
/// order 3 for general motion (header comment), coning drift h⁴. Input: [0] previous, [1] new.
struct Coning1SamplePlusPrevious
    : RotationVectorStepper<rotation_vector_rules::Coning1SamplePlusPrevious> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "coning_1_sample_plus_previous";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "one sample plus the previous one (cross-step coning term); 1 delta-angle/step, order 3";
};

}  // namespace halfspin
