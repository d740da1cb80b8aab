#pragma once
/// @file
/// The two-speed arrangement of strapdown attitude updating: a cheap high-rate loop accumulates the
/// rotation vector of the coming low-rate interval from every delta-angle, and a low-rate loop
/// applies it to the quaternion, which is the expensive part. At the high rate, per delta-angle Δθ
/// (rad), with Δθ_prev the delta-angle before it:
///     β ← β + ½ (α + Δθ_prev/6) × Δθ,   α ← α + Δθ,
/// and at the low rate, every `ratio` delta-angles, q ← q ⊗ quaternion_exp(α + β), then α = β = 0
/// (Δθ_prev carries across the reset). ½ α × Δθ integrates ½∫α×ω exactly between samples; the
/// 1/12 Δθ_prev × Δθ term is the within-sample part, estimated as by Coning1SamplePlusPrevious
/// in coning_compensation.hpp. At ratio 1 the arrangement is exactly that single-rate algorithm.
///
/// Order (ours, re-derived in tests/propagation/test_two_speed.cpp): under classical coning with
/// λ = Ω·h (h the high-rate period) the coning term of one low-rate interval of r samples is in
/// error by −r·λ⁵/60 · sin²a, so the drift falls as h⁴ and does not depend on the ratio: the low
/// rate can be slowed to save quaternion updates without losing coning accuracy. For general motion
/// the order is 3 (as the one-plus-previous algorithm, the same h³ term at every ratio), plus the
/// remainder of the second-order form α + β over the low-rate interval, O((r·h)⁵) per update, i.e.
/// a global (r·h)⁴ term that grows with the ratio and dominates at large ratios until h is small
/// (measured: at ratio 8 on the test body for h above ~1 ms; coning_compensation.hpp describes
/// the same limit under coning, a⁴ and lateral a³ terms).
///
/// Cost: high rate 24 flops per delta-angle (Δθ_prev/6 3, sum 3, cross 9, halve 3, add to β 3, add
/// to α 3); low rate 3 (α + β) + 51 (exp(φ/2) − 1 and its plain application). Memory: 9 scalars and
/// two counters.

#include <cstdint>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// High-rate accumulator of the rotation vector α + β over one low-rate interval.
template <class T>
class TwoSpeedAccumulator {
 public:
  /// ratio: delta-angles per low-rate update (values below 1 are taken as 1).
  constexpr explicit TwoSpeedAccumulator(std::uint32_t ratio) noexcept
      : ratio_(ratio < 1u ? 1u : ratio) {}

  /// Adds one delta-angle (rad, the integral of the body rate over one high-rate period). Returns
  /// true when `ratio` delta-angles have been added since the last take(): an update is due.
  constexpr bool add(const Vector3<T>& delta) noexcept {
    beta_ += T(0.5) * cross(alpha_ + previous_ * T(1.0L / 6), delta);
    alpha_ += delta;
    previous_ = delta;
    ++count_;
    return count_ >= ratio_;
  }

  /// True when an update is due (ratio delta-angles accumulated).
  constexpr bool update_due() const noexcept { return count_ >= ratio_; }

  /// The rotation vector α + β (rad, body frame at the interval start) accumulated so far.
  constexpr Vector3<T> rotation_vector() const noexcept { return alpha_ + beta_; }

  /// Returns α + β (rad) and starts a new low-rate interval; the last delta-angle is kept.
  constexpr Vector3<T> take() noexcept {
    const Vector3<T> phi = alpha_ + beta_;
    alpha_ = Vector3<T>::zero();
    beta_ = Vector3<T>::zero();
    count_ = 0;
    return phi;
  }

  /// Forgets everything, including the previous delta-angle (after a gap in the samples); the
  /// within-sample term of the next delta-angle is then dropped once. `previous` (rad) may give
  /// the delta-angle just before the restart when it is known.
  constexpr void restart(const Vector3<T>& previous = Vector3<T>::zero()) noexcept {
    alpha_ = Vector3<T>::zero();
    beta_ = Vector3<T>::zero();
    previous_ = previous;
    count_ = 0;
  }

  /// Delta-angles per low-rate update.
  constexpr std::uint32_t ratio() const noexcept { return ratio_; }
  /// Delta-angles added since the last take().
  constexpr std::uint32_t count() const noexcept { return count_; }

 private:
  Vector3<T> alpha_{};     // Σ Δθ since the interval start, rad
  Vector3<T> beta_{};      // coning integral since the interval start, rad
  Vector3<T> previous_{};  // last delta-angle added, rad
  std::uint32_t ratio_;
  std::uint32_t count_{0};
};

/// Low-rate update: q ⊗ exp(φ/2) with φ = α + β (rad) from TwoSpeedAccumulator::take().
template <class T>
Quaternion<T> two_speed_update(const Quaternion<T>& q, const Vector3<T>& rotation_vector) noexcept {
  return apply_increment(q, quaternion_exp_minus_one(rotation_vector));
}

}  // namespace halfspin
