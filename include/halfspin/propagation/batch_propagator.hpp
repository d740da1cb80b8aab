#pragma once
/// @file
/// Batch propagation for desktop Monte Carlo: N independent attitudes (body → reference,
/// scalar-first (w, x, y, z), Hamilton product) in structure-of-arrays form, stepped together by
/// the one-sample delta-angle update q ← q ⊗ exp(Δθ/2) (the update of Coning1Sample) and a
/// renormalization. The stepper contract is the scalar path's (stepper_traits.hpp): each lane forms
/// the increment δ = exp(Δθ/2) − 1 without cancellation (the series of cos(θ/2) − 1 has no
/// constant term) and applies it through the accumulation policy: PlainAccumulation (q + q ⊗ δ
/// rounded in T, the default) or CompensatedAccumulation (the lane's attitude held as the pair
/// q_hi + q_lo, compensated_accumulation.hpp; see "Compensated lanes" below). Input per call, also
/// structure-of-arrays (BatchSamples, written in place through samples() or copied in by step(dx,
/// dy, dz, dt)): delta-angles dx, dy, dz (rad, body frame, integral of ω over the lane's sample
/// interval) and a per-lane interval dt (s). dt is per lane so that lanes may run with jittered or
/// different sample timing; it is used for validation and elapsed time only (delta-angles already
/// carry time).
///
/// Why a separate class and not N Propagators: the lane loop is written so that g++ and clang++
/// vectorize it at -O2/-O3 on the default x86-64 target (SSE2: 4 float or 2 double lanes per
/// instruction). The lane body is straight-line: no function pointers, no calls to sin/cos/sqrt,
/// and no data-dependent branch. Six things make that possible:
///   - the exponential is a branch-free series, valid up to max_step_angle (below) per step;
///   - validation is a mask computed with comparisons (a NaN fails every comparison), and the
///     update is a select: a rejected lane stores back its own bits (both words of a compensated
///     lane), so it stays bit-identical;
///   - every value the update computes is used whatever the lane's outcome: the finiteness test
///     (below) reads them, and the compensated read-back selects with masks made from sign bits
///     (CompensatedAccumulation::with_attitude_branch_free). g++ computes a value used in one arm
///     of a ?: only in that arm, a branch, and since a floating-point operation may trap it then
///     cannot turn the branch back into a select;
///   - counting the rejections by class needs a branch, so it is done after the lane loop, in a
///     scalar pass that runs only when some lane was rejected (rare in a Monte Carlo run);
///   - the state is double-buffered and the input lives in the object, so the compilers can see
///     that nothing overlaps and need no run-time alias checks (see the members for why);
///   - the lane loop is flattened ([[gnu::flatten]]: every call in it inlined), so that no
///     inlining heuristic can leave a call in the lane body (see step_lanes).
/// Checked in the assembly (objdump -d) of g++ 12 and clang++ 14 at -O2 and -O3, default x86-64
/// target, for float and double, N = 4, 8, 64 and 1024, both accumulation policies and both
/// renormalizations: the lane loop is all packed arithmetic (mulps/addps/subps/divps,
/// mulpd/addpd/subpd/divpd; the selects in and/andn/or or blend forms), no scalar ss/sd
/// arithmetic or comparison and no call; the same in bench/bench_batch.cpp, a unit with many
/// instantiations (before the flattening g++ left the compensated lanes scalar there). The packed
/// add/sub/mul/div count per vector of lanes equals the flop count below (float, first-order: 103
/// plain, 220 compensated). N = 1 is scalar code, naturally.
///
/// The series and its accuracy (derivation). With θ = |Δθ|,
///     cos(θ/2)   =   Σ_k (−1)^k (θ/2)^{2k}/(2k)!
///                = 1 − θ²/8 + θ⁴/384 − θ⁶/46080 + θ⁸/10321920 − …
///     sin(θ/2)/θ = ½ Σ_k (−1)^k (θ/2)^{2k}/(2k+1)!
///                = ½ − θ²/48 + θ⁴/3840 − θ⁶/645120 + θ⁸/185794560 − …
/// Both are kept through θ⁸ (Horner in θ², so no square root) from the core's series threshold
/// up (θ² ≥ ScalarTraits::exp_series_angle_squared: 0.1 float, 1e-4 double); below it the θ⁸
/// coefficients are selected to zero, which makes the evaluation the core's θ⁶ series operation
/// for operation (its dropped θ⁸ term is at most 1e-4/10321920 = 8e-5 ε in float, 4e-8 ε in
/// double, within the same criterion). For θ/2 < 1 the terms decrease and alternate, so the
/// truncation is below the first dropped term:
///     cos:            (θ/2)^10/10!        = θ^10/3715891200
///     sin(θ/2)/θ · Δθ_i (|Δθ_i| ≤ θ): ½ (θ/2)^10/11! · θ = (θ/2)^11/11!, smaller by (θ/2)/11.
/// Requiring the dropped term below 1e-3 ε (the criterion of the core exponential map,
/// core/scalar_traits.hpp, so that its fixed sign cannot bias a long run measurably) gives
///     float  (ε = 2^−23 ≈ 1.19e-7): θ ≤ 0.5 rad → 0.25^10/10! = 2.6e-13 = 2.2e-6 ε;
///     double (ε = 2^−52 ≈ 2.22e-16): θ ≤ 0.1 rad → 0.05^10/10! = 2.7e-20 = 1.2e-4 ε
/// (the criterion alone would allow 0.92 rad in float, 0.12 rad in double). A sample whose |Δθ|
/// exceeds max_step_angle is rejected (counted as rejected_over_angle; its lane is untouched). The
/// per-axis rate check already bounds |Δθ| by √3·max_rate·dt, so this never fires while that is
/// below max_step_angle: in double, 35 rad/s per axis at 1 kHz gives at most 0.061 rad. For faster
/// motion or longer steps in double use the scalar Propagator, whose exponential switches to
/// sin/cos.
///
/// Agreement with the scalar path: below the core's series threshold (θ² < 0.1 float, 1e-4
/// double) a lane performs the operations of Propagator<T, Coning1Sample, R, A> in the same order
/// (the same series, the policy's step, the renormalization and, for the compensated policy, the
/// read-back, whose branch-free form gives with_attitude's bits), so the two are bit-identical
/// step after step, for both accumulation policies, where the compiler does not contract a·b + c
/// into fused multiply-adds (the default x86-64 target has none; with FMA, -march=native or
/// aarch64, vector and scalar code may contract differently: an ulp per step at most,
/// random-walking). Above the threshold the scalar path uses sin/cos, equally accurate: one step
/// from the same state differs by at most an ulp (measured 1 ε in float, 0.5 ε plain and 1 ε
/// compensated in double). The tests check bit-identity over 10⁵ coning steps (compensated) and
/// 4000 random steps (plain).
///
/// Compensated lanes (Accumulation = CompensatedAccumulation; the policy's header has the method,
/// its sources and its rounding bound). Each lane-step is the scalar policy's: p = q_hi ⊗ δ, then
/// DWPlusFP (TwoSum, an addition, Fast2Sum) per component of the pair; the attitude q_hi + q_lo
/// rounded once goes through the renormalization, and the factor 1 + κ it applied is read back
/// from the sums of the components' magnitudes and added to the pair as κ·q_hi (a double-word
/// addition again).
/// The scalar read-back rescales both words instead when |κ| > 2⁻¹⁰ (far from the unit sphere).
/// That can happen here: set_lane and the constructor take any q (as Propagator's constructor and
/// reset do; normalizing there would break the agreement above), and the first step from a q of
/// norm 1000 or 1/1000 reads back κ ≈ −1 or 999. After one renormalized step ‖q‖ − 1 is a few u,
/// so |κ| stays ≪ 2⁻¹⁰ and the far path is never selected again (and never without
/// renormalization, where κ = 0). Both paths are computed every step and one is selected per word
/// (CompensatedAccumulation::with_attitude_branch_free): 24 flops and 8 selects per lane-step for
/// a path that matters only on a lane's first step, the price of straight-line code. lane(i)
/// returns q_hi + q_lo rounded, lane_state(i) both words; w(), x(), y(), z() are the high words.
///
/// Validation, per lane, in the order of validate_delta_angle (gyro_input.hpp) for the counts:
/// non-finite delta-angle or dt → rejected_non_finite; dt ≤ 0 → rejected_non_positive_step;
/// dt > limits.max_step → rejected_step_too_long; |Δθ_i| > limits.max_rate·dt on an axis →
/// rejected_over_range; |Δθ| > max_step_angle → rejected_over_angle; a result that is not finite
/// (only a non-finite state can give one) → rejected_non_finite, as in Propagator. (The one-sample
/// update has no history, so a gap only loses the rotation in it; re-anchor the lane with
/// set_lane.)
///
/// Cost per lane-step (flops, + − × ÷), with first-order renormalization (36 flops in float, 41 in
/// double, renormalization.hpp; NoRenormalization saves them):
///   plain        validation 7 (rate bound 1, θ² 5, dt − dt 1), series 15, scaling Δθ 3,
///                application 32, renormalization 36/41, elapsed-time (Kahan) sum 4, finiteness
///                of the result 6: 103 (float) / 108 (double); plus 9 comparisons and 9 selects
///                (validation 7 and finiteness 1 comparisons; the series' range 1 comparison and
///                2 selects; the store 7 selects) and the renormalization's 6 integer/bit ops.
///   compensated  validation 7, series 15, scaling Δθ 3, q_hi ⊗ δ 28, four DWPlusFP 40, the
///                rounded attitude 4, renormalization 36/41, read-back 69 (the sums of magnitudes
///                and their differences 10, a reciprocal and κ 2, the range test 1, κ·q_hi and its
///                four DWPlusFP with Fast2Sum 32, the far path 24: the factor 4 and the scaling
///                20), Kahan sum 4, finiteness 14 (the new pair and the renormalized attitude):
///                220 (float) / 225 (double), 2.1× the plain lane; plus the plain lane's
///                comparisons and selects, 4 more selects for the low words, and the read-back's
///                8 sign-bit selects and 9 sign clears.
/// Memory, all inside the object (no heap): the state double-buffered, 12·N scalars plain (w, x,
/// y, z, elapsed-time sum and carry) and 20·N compensated (the low words add 4·N per copy), 4·N of
/// input, N accept flags and N 64-bit rejection counters, plus under 100 bytes of limits and
/// totals: 17·N·sizeof(T) + 8·N bytes plain (about 144 kB for 1024 double lanes) and
/// 25·N·sizeof(T) + 8·N compensated (about 208 kB for 1024 double lanes, 6.8 kB for 64 float
/// lanes). Allocate a large batch statically or on the heap, not on a small stack.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The branch-free exponential series used by the batch path, with the largest step angle it is
/// accurate for (derivation in the header comment).
template <class T>
struct BatchExponentialSeries;

/// Float: the series is used up to max_step_angle.
template <>
struct BatchExponentialSeries<float> {
  static constexpr float max_step_angle = 0.5f;  ///< rad; truncation ≤ 2.2e-6 ε
};

/// Double: the series is used up to max_step_angle.
template <>
struct BatchExponentialSeries<double> {
  static constexpr double max_step_angle = 0.1;  ///< rad; truncation ≤ 1.2e-4 ε
};

/// exp(φ/2) − 1 for a rotation vector φ (rad) with |φ| ≤ max_step_angle, by the series through
/// θ⁸: returns cos(θ/2) − 1 in c_minus_one and sin(θ/2)/θ in s_over_angle (θ² given as t).
/// Below the core's series threshold (ScalarTraits::exp_series_angle_squared) the θ⁸ coefficients
/// are selected to zero: t·0 + c₆ is exactly c₆ for finite t ≥ 0, so the evaluation is then the
/// core's series (detail::half_angle_series) operation for operation, and a lane gets the scalar
/// path's increment bit for bit. Straight-line code (the select is a mask, not a branch).
template <class T>
constexpr void batch_exponential_series(T t, T& c_minus_one, T& s_over_angle) noexcept {
  const bool core_range = t < ScalarTraits<T>::exp_series_angle_squared;
  const T c8 = core_range ? T(0) : T(1.0L / 10321920);
  const T s8 = core_range ? T(0) : T(1.0L / 185794560);
  c_minus_one = t * (T(-1.0L / 8) + t * (T(1.0L / 384) + t * (T(-1.0L / 46080) + t * c8)));
  s_over_angle =
      T(0.5) + t * (T(-1.0L / 48) + t * (T(1.0L / 3840) + t * (T(-1.0L / 645120) + t * s8)));
}

/// Totals over all lanes since construction. A lane-step is one lane's update in one call.
struct BatchCounters {
  std::uint64_t calls = 0;                ///< calls of step()
  std::uint64_t lane_steps = 0;           ///< accepted lane-steps
  std::uint64_t rejected_non_finite = 0;  ///< lane-samples rejected as Status::non_finite
  /// Lane-samples rejected as Status::non_positive_step.
  std::uint64_t rejected_non_positive_step = 0;
  std::uint64_t rejected_step_too_long = 0;  ///< lane-samples rejected as Status::step_too_long
  std::uint64_t rejected_over_range = 0;     ///< lane-samples rejected as Status::over_range (rate)
  std::uint64_t rejected_over_angle = 0;     ///< |Δθ| above the batch series' max_step_angle

  /// All rejected lane-samples.
  constexpr std::uint64_t rejected() const noexcept {
    return rejected_non_finite + rejected_non_positive_step + rejected_step_too_long +
           rejected_over_range + rejected_over_angle;
  }
};

/// One sample per lane in structure-of-arrays form: delta-angle (dx, dy, dz) in rad (body frame)
/// over the interval dt in s.
template <class T, std::size_t N>
struct BatchSamples {
  std::array<T, N> dx{};  ///< delta-angle x per lane (rad)
  std::array<T, N> dy{};  ///< delta-angle y per lane (rad)
  std::array<T, N> dz{};  ///< delta-angle z per lane (rad)
  std::array<T, N> dt{};  ///< interval per lane (s)
};

/// Why a lane's sample was rejected (Status::ok if accepted). rejected_over_angle maps to
/// Status::over_range; `over_angle` tells the two apart.
struct BatchLaneVerdict {
  Status status;    ///< Status::ok, or the rejection
  bool over_angle;  ///< rejected for |Δθ| above max_step_angle
};

namespace detail {

// The lane state of a batch in structure-of-arrays form, double-buffered by BatchPropagator: the
// attitude's words (w, x, y, z; for the compensated policy the high words q_hi) and the elapsed
// time's Kahan sum and carry, plus, for the compensated policy, the low words q_lo.
template <class T, std::size_t N, bool Compensated>
struct BatchLaneState {
  std::array<T, N> w{};
  std::array<T, N> x{};
  std::array<T, N> y{};
  std::array<T, N> z{};
  std::array<T, N> elapsed_sum{};
  std::array<T, N> elapsed_carry{};
};
template <class T, std::size_t N>
struct BatchLaneState<T, N, true> {
  std::array<T, N> w{};
  std::array<T, N> x{};
  std::array<T, N> y{};
  std::array<T, N> z{};
  std::array<T, N> elapsed_sum{};
  std::array<T, N> elapsed_carry{};
  std::array<T, N> low_w{};
  std::array<T, N> low_x{};
  std::array<T, N> low_y{};
  std::array<T, N> low_z{};
};

}  // namespace detail

/// N attitudes (body → reference) stepped together; Renormalization is NoRenormalization or
/// FirstOrderRenormalization (stateless and straight-line, so the lane loop stays vectorizable);
/// Accumulation is PlainAccumulation (q + q ⊗ δ rounded in T) or CompensatedAccumulation (each
/// lane's attitude held as the pair q_hi + q_lo, compensated_accumulation.hpp).
template <class T, std::size_t N, class Renormalization = FirstOrderRenormalization,
          class Accumulation = PlainAccumulation>
class BatchPropagator {
  static_assert(std::is_floating_point<T>::value, "halfspin works on IEEE floating-point types");
  static_assert(N > 0 && N < (std::size_t(1) << 31), "1 to 2^31 − 1 lanes (counted in int32)");
  static_assert(std::is_same<Renormalization, NoRenormalization>::value ||
                    std::is_same<Renormalization, FirstOrderRenormalization>::value,
                "the batch path supports NoRenormalization and FirstOrderRenormalization "
                "(the others need a square root or per-lane state and would stop vectorization)");
  static_assert(std::is_same<Accumulation, PlainAccumulation>::value ||
                    std::is_same<Accumulation, CompensatedAccumulation>::value,
                "the batch path supports PlainAccumulation and CompensatedAccumulation");
  static constexpr bool compensated = std::is_same<Accumulation, CompensatedAccumulation>::value;
  // Whether the lanes renormalize by the policy's scale (stepper_traits.hpp), as the scalar
  // Propagator with the same policies does.
  static constexpr bool by_scaling =
      renormalizes_by_scaling<Accumulation, Renormalization, T>::value;

 public:
  using scalar = T;                    ///< the scalar type
  using accumulation = Accumulation;   ///< the accumulation policy
  using Lanes = std::array<T, N>;      ///< one value per lane
  using Samples = BatchSamples<T, N>;  ///< one sample per lane
  /// One lane's attitude as the accumulation policy holds it (both words for the compensated one).
  using LaneAttitudeState = typename Accumulation::template State<T>;
  static constexpr std::size_t lanes = N;  ///< N, the number of lanes
  /// Largest |Δθ| per step (rad).
  static constexpr T max_step_angle = BatchExponentialSeries<T>::max_step_angle;

  /// Every lane starts at `initial` (body → reference, unit).
  constexpr BatchPropagator(const Quaternion<T>& initial, const GyroLimits<T>& limits) noexcept
      : limits_(limits) {
    for (std::size_t i = 0; i < N; ++i) {
      set_lane(i, initial);
    }
  }

  /// The next sample of every lane, written in place by the caller before step(): lane i's
  /// delta-angle (dx[i], dy[i], dz[i]) (rad, body frame) over dt[i] (s). Keeping the input inside
  /// the object lets the compiler see that it cannot overlap the state, so the lane loop needs no
  /// run-time alias checks (g++ at -O2 vectorizes only loops that need none).
  constexpr Samples& samples() noexcept { return samples_; }
  /// The next sample of every lane (read-only view).
  constexpr const Samples& samples() const noexcept { return samples_; }

  /// One step of every lane with samples(). Returns the number of lanes accepted; rejected lanes
  /// keep their attitude and elapsed time bit-for-bit.
  std::size_t step() noexcept {
    // Constant buffer indices let the compiler see that the two copies do not overlap.
    const std::size_t accepted_lanes = current_ == 0 ? step_lanes<0>() : step_lanes<1>();
    current_ ^= 1U;
    ++counters_.calls;
    counters_.lane_steps += accepted_lanes;
    if (accepted_lanes != N) {
      count_rejections();
    }
    return accepted_lanes;
  }

  /// The same after copying the sample arrays (rad, rad, rad, s) into samples().
  std::size_t step(const Lanes& dx, const Lanes& dy, const Lanes& dz, const Lanes& dt) noexcept {
    samples_.dx = dx;
    samples_.dy = dy;
    samples_.dz = dz;
    samples_.dt = dt;
    return step();
  }

  /// Why step() would reject lane sample (dx, dy, dz) (rad) over dt (s), without stepping (a
  /// non-finite state, which makes a valid sample's result non-finite, is not looked at).
  BatchLaneVerdict verdict(T ax, T ay, T az, T h) const noexcept {
    const Status s = validate_delta_angle(Vector3<T>{ax, ay, az}, h, limits_);
    if (s != Status::ok) {
      return {s, false};
    }
    const T t = ax * ax + ay * ay + az * az;
    if (!(t <= max_step_angle * max_step_angle)) {
      return {Status::over_range, true};
    }
    return {Status::ok, false};
  }

  /// Lane i's attitude (body → reference); i < N. For the compensated policy q_hi + q_lo rounded
  /// once, as Propagator::attitude() returns it.
  constexpr Quaternion<T> lane(std::size_t i) const noexcept {
    return Accumulation::attitude(lane_state(i));
  }
  /// Lane i's attitude as the accumulation policy holds it (compensated: both words).
  constexpr LaneAttitudeState lane_state(std::size_t i) const noexcept {
    return load(state_[current_], i);
  }
  /// Re-anchors lane i at q (body → reference; compensated: q_hi = q, q_lo = 0, as
  /// Propagator::reset); counters and elapsed time are kept.
  constexpr void set_lane(std::size_t i, const Quaternion<T>& q) noexcept {
    LaneState& s = state_[current_];
    const LaneAttitudeState a = Accumulation::start(q);
    const Quaternion<T>& hi = high_words(a);
    s.w[i] = hi.w;
    s.x[i] = hi.x;
    s.y[i] = hi.y;
    s.z[i] = hi.z;
    if constexpr (compensated) {
      s.low_w[i] = a.lo.w;
      s.low_x[i] = a.lo.x;
      s.low_y[i] = a.lo.y;
      s.low_z[i] = a.lo.z;
    }
  }
  /// The components of all lanes. For the compensated policy these are the high words q_hi, within
  /// an ulp of the attitude lane(i) returns (q_hi + q_lo rounded; |q_lo| ≤ ½ulp(q_hi)).
  constexpr const Lanes& w() const noexcept { return state_[current_].w; }
  /// The x components of all lanes (see w()).
  constexpr const Lanes& x() const noexcept { return state_[current_].x; }
  /// The y components of all lanes (see w()).
  constexpr const Lanes& y() const noexcept { return state_[current_].y; }
  /// The z components of all lanes (see w()).
  constexpr const Lanes& z() const noexcept { return state_[current_].z; }

  /// Totals over all lanes since construction.
  constexpr const BatchCounters& counters() const noexcept { return counters_; }
  /// Samples rejected on lane i since construction; lane i took calls − that many steps.
  constexpr std::uint64_t lane_rejections(std::size_t i) const noexcept {
    return lane_rejections_[i];
  }
  /// Steps lane i took since construction.
  constexpr std::uint64_t lane_steps(std::size_t i) const noexcept {
    return counters_.calls - lane_rejections_[i];
  }
  /// Seconds propagated on lane i (compensated sum of its accepted intervals).
  constexpr T elapsed_seconds(std::size_t i) const noexcept {
    return state_[current_].elapsed_sum[i];
  }
  /// Whether lane i's sample was accepted by the last call of step() (false before the first).
  constexpr bool lane_accepted(std::size_t i) const noexcept { return accepted_[i] != 0; }
  /// The gyro limits every lane is checked against.
  constexpr const GyroLimits<T>& limits() const noexcept { return limits_; }

 private:
  // The lane loop, reading copy From and writing the other; returns the lanes accepted. Flattened
  // (every call in it inlined, recursively): a call left in the lane body stops vectorization,
  // and g++ 12 stops inlining once a translation unit has grown by its inline-unit-growth limit
  // (a benchmark unit with many instantiations left CompensatedAccumulation::scaled out of line,
  // and the compensated lanes scalar).
  template <std::size_t From>
  // cppcheck-suppress unusedPrivateFunction ; called as step_lanes<0>() / <1>() by step()
  [[gnu::flatten]] std::size_t step_lanes() noexcept {
    const Lanes& dx = samples_.dx;
    const Lanes& dy = samples_.dy;
    const Lanes& dz = samples_.dz;
    const Lanes& dt = samples_.dt;
    const T max_rate = limits_.max_rate;
    const T max_step = limits_.max_step;
    const T max_angle_squared = max_step_angle * max_step_angle;
    const LaneState& from = std::get<From>(state_);
    LaneState& to = std::get<1 - From>(state_);
    // Counted in int32 through the 0/1 in T: g++ 12 has no SSE2 vector form for a 64-bit integer
    // sum, nor for a bool → int32 select beside double lanes; T → int32 conversion it has.
    std::int32_t accepted = 0;
    for (std::size_t i = 0; i < N; ++i) {
      const T ax = dx[i];
      const T ay = dy[i];
      const T az = dz[i];
      const T h = dt[i];
      const T t = ax * ax + ay * ay + az * az;  // θ² as squared_norm(Vector3) computes it
      const T bound = max_rate * h;
      // A mask built with &= (not &&, whose short circuit g++ keeps as branches: an ordered
      // comparison may trap on NaN, so it is not speculated). NaN anywhere fails a comparison; an
      // infinite delta-angle fails its axis bound or θ² ≤ max²; an infinite dt fails h − h == 0.
      bool valid = std::fabs(ax) <= bound;
      valid &= std::fabs(ay) <= bound;
      valid &= std::fabs(az) <= bound;
      valid &= h > T(0);
      valid &= h <= max_step;
      valid &= h - h == T(0);
      valid &= t <= max_angle_squared;
      T c_minus_one;
      T s;
      batch_exponential_series(t, c_minus_one, s);
      // The scalar Propagator's commit (propagator.hpp, commit_if_usable), operation for
      // operation: the policy's step, its attitude renormalized, the renormalized attitude read
      // back into the policy's state (for the compensated policy without a branch).
      const LaneAttitudeState q = load(from, i);
      const LaneAttitudeState advanced =
          Accumulation::advanced(q, Quaternion<T>{c_minus_one, s * ax, s * ay, s * az});
      const Quaternion<T> next = Accumulation::attitude(advanced);
      // The compensated lanes scale the pair by the policy's factor (with_scaling, without a
      // branch), the plain ones keep the policy's result.
      const Quaternion<T> kept = by_scaling ? next : Renormalization{}.apply(next);
      const LaneAttitudeState next_state = renormalized(advanced, next, kept);
      // Component by component, and for the plain policy straight from `kept` (which is what its
      // with_attitude returns): g++ 12 leaves a copy of a whole Quaternion<double> as one memory
      // access it cannot vectorize.
      const Quaternion<T>& next_high = compensated ? high_words(next_state) : kept;
      const T next_w = next_high.w;
      const T next_x = next_high.x;
      const T next_y = next_high.y;
      const T next_z = next_high.z;
      // Kahan sum of elapsed time, as Propagator keeps it.
      const T sum = from.elapsed_sum[i];
      const T carry = from.elapsed_carry[i];
      const T corrected = h - carry;
      const T total = sum + corrected;
      const T next_carry = (total - sum) - corrected;
      // A non-finite result is rejected, as in Propagator (finite input cannot produce one from a
      // finite state). Testing it here also makes every new value needed before the select, so
      // that g++ does not sink their computation into a branch it then cannot vectorize.
      T all = ((next_w + next_x) + (next_y + next_z)) + (total + next_carry);
      if constexpr (compensated) {
        // The low words too (the scalar path checks the renormalized pair's attitude), so that
        // g++ computes both outcomes of the scaling's select before it.
        all += (next_state.lo.w + next_state.lo.x) + (next_state.lo.y + next_state.lo.z);
      }
      bool ok = valid;
      ok &= all - all == T(0);
      to.w[i] = ok ? next_w : from.w[i];
      to.x[i] = ok ? next_x : from.x[i];
      to.y[i] = ok ? next_y : from.y[i];
      to.z[i] = ok ? next_z : from.z[i];
      if constexpr (compensated) {
        to.low_w[i] = ok ? next_state.lo.w : from.low_w[i];
        to.low_x[i] = ok ? next_state.lo.x : from.low_x[i];
        to.low_y[i] = ok ? next_state.lo.y : from.low_y[i];
        to.low_z[i] = ok ? next_state.lo.z : from.low_z[i];
      }
      to.elapsed_sum[i] = ok ? total : sum;
      to.elapsed_carry[i] = ok ? next_carry : carry;
      const T taken = ok ? T(1) : T(0);
      accepted_[i] = taken;
      accepted += static_cast<std::int32_t>(taken);
    }
    return static_cast<std::size_t>(accepted);
  }

  // The slow path: classify every rejected lane (the lane loop only knew accept/reject).
  void count_rejections() noexcept {
    const Samples& in = samples_;
    for (std::size_t i = 0; i < N; ++i) {
      if (accepted_[i] != 0) {
        continue;
      }
      ++lane_rejections_[i];
      const BatchLaneVerdict v = verdict(in.dx[i], in.dy[i], in.dz[i], in.dt[i]);
      if (v.status == Status::ok) {  // valid input, non-finite result (a non-finite state)
        ++counters_.rejected_non_finite;
        continue;
      }
      if (v.over_angle) {
        ++counters_.rejected_over_angle;
        continue;
      }
      switch (v.status) {
        case Status::non_finite:
          ++counters_.rejected_non_finite;
          break;
        case Status::non_positive_step:
          ++counters_.rejected_non_positive_step;
          break;
        case Status::step_too_long:
          ++counters_.rejected_step_too_long;
          break;
        case Status::over_range:
          ++counters_.rejected_over_range;
          break;
        case Status::no_tick_period:  // the batch takes seconds only: no verdict gives it
        case Status::ok:
        case Status::waiting_for_samples:
          break;
      }
    }
  }

  // The state is double-buffered: step() reads one copy and writes the other. Writing in place
  // would let the compiler drop the store-back of a rejected lane and turn the select into a
  // conditional store, which SSE2 has no vector form for.
  using LaneState = detail::BatchLaneState<T, N, compensated>;

  // The lane's state after renormalization: scaled by the policy's factor, or from the policy's
  // result kept (Propagator::commit_if_usable, without a branch).
  static constexpr LaneAttitudeState renormalized(const LaneAttitudeState& advanced,
                                                  const Quaternion<T>& next,
                                                  const Quaternion<T>& kept) noexcept {
    if constexpr (by_scaling) {
      return Accumulation::with_scaling_branch_free(advanced, Renormalization{}.scaling(next));
    } else {
      return Accumulation::with_attitude_branch_free(advanced, kept);
    }
  }
  // Lane i of a buffer as the policy's state.
  static constexpr LaneAttitudeState load(const LaneState& s, std::size_t i) noexcept {
    if constexpr (compensated) {
      return {{s.w[i], s.x[i], s.y[i], s.z[i]}, {s.low_w[i], s.low_x[i], s.low_y[i], s.low_z[i]}};
    } else {
      return {{s.w[i], s.x[i], s.y[i], s.z[i]}};
    }
  }
  // The words stored in w, x, y, z: the attitude (plain) or q_hi (compensated).
  static constexpr const Quaternion<T>& high_words(const LaneAttitudeState& a) noexcept {
    if constexpr (compensated) {
      return a.hi;
    } else {
      return a.attitude;
    }
  }

  // Declared before the state: declared after current_, it made clang 14 give up vectorizing
  // double lanes for N ≤ 32 ("unsafe dependent memory operations"); g++ does not mind.
  Lanes accepted_{};  // 1 where the last step() accepted the lane, else 0
  std::array<LaneState, 2> state_{};
  Samples samples_{};
  std::size_t current_ = 0;
  std::array<std::uint64_t, N> lane_rejections_{};
  GyroLimits<T> limits_;
  BatchCounters counters_{};
};

}  // namespace halfspin
