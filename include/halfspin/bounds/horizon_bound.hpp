#pragma once
/// @file
/// The attitude-error bound over a horizon: steps × (local truncation bound) + roundoff floor,
/// after an exact number of steps (error_bound_after_steps) or over a horizon in seconds
/// (horizon_error_bound: ceil(horizon/dt) steps).
///
/// Why linear accumulation is rigorous: for the exact increment Φ* and the numerical Φ of a step,
/// d(q ⊗ Φ, Q ⊗ Φ*) ≤ d(q ⊗ Φ, Q ⊗ Φ) + d(Q ⊗ Φ, Q ⊗ Φ*) = d(q, Q) + d(Φ, Φ*) in the bi-invariant
/// angle metric, so the global error after N steps is at most the sum of the N local errors, with
/// no growth factor; rounding adds its own per-step angle the same way (roundoff_floor.hpp).
///
/// The local term: for pure classical coning the exact per-step error (coning_error.hpp), whose
/// sum over a horizon is then replaced by the smaller exact-structure form where the error turns
/// with the cone (truncation_bound below); for any other motion
/// LocalErrorBound<Stepper>::local(description.envelope(), dt), the rigorous per-step bound over
/// every rate with those derivative bounds, or where the motion has cones (coning, vibration
/// lines) beside other motion and the stepper is an exponential-map, Magnus or coning step, the
/// smaller bound that keeps the cones' exact error and bounds what the rest adds
/// (mixed_motion_bound.hpp). A stepper without a LocalErrorBound specialization gets
/// +∞ for non-coning motions ("no bound known": we do not guess), so the recommendation can list it
/// as unbounded instead of failing to compile.
///
/// The roundoff term is that of the propagator's accumulation policy: PlainAccumulation (the
/// default; N·c·u, which in float exceeds any useful budget beyond about 10⁶ steps) or
/// CompensatedAccumulation (about c·u·(angle traversed) + N·c2·u²: roundoff_floor.hpp (c)).

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>
#include <utility>

#include "halfspin/bounds/commutator_free_bounds.hpp"
#include "halfspin/bounds/coning_error.hpp"
#include "halfspin/bounds/magnus_family_bounds.hpp"
#include "halfspin/bounds/mixed_motion_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/roundoff_floor.hpp"
#include "halfspin/bounds/runge_kutta_bounds.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The largest count steps_for_horizon returns (2⁶²).
inline constexpr std::int64_t max_step_count = std::int64_t{1} << 62;
/// Steps (≥ 1) of length dt (s) that cover horizon_s (s): ceil(horizon/dt), the quotient rounded
/// in T. The horizon may be of any arithmetic type H (a double horizon with a float step); it is
/// converted to T with static_cast first, so the count is the one the all-T call gives. A horizon
/// computed as k·dt can round to k + 1 steps (ceil of k(1 + ε)): to mean exactly k steps, use the
/// step-count functions below (error_bound_after_steps). A non-finite or huge quotient saturates at
/// max_step_count, a NaN or non-positive one gives 1.
template <class T, class H>
std::int64_t steps_for_horizon(T dt, H horizon_s) noexcept {
  static_assert(std::is_arithmetic<H>::value, "the horizon (s) is an arithmetic type");
  const T n = std::ceil(static_cast<T>(horizon_s) / dt);
  if (!(n >= T(1))) {
    return std::int64_t{1};
  }
  if (!(n < static_cast<T>(max_step_count))) {
    return max_step_count;
  }
  return static_cast<std::int64_t>(n);
}

/// Local truncation bound (rad) of one step of length dt (s): exact under pure coning; else the
/// smaller of the stepper's LocalErrorBound over the description's envelope and, where the motion
/// has cones and the family can split them off, the bound that keeps them exact
/// (mixed_motion_bound.hpp); +∞ where none applies.
template <class Stepper, class T>
T local_truncation_bound(const MotionDescription<T>& description, T dt) noexcept {
  if (description.is_pure_coning()) {
    return coning_step_error<Stepper>(description.coning, dt);
  }
  T envelope_bound = std::numeric_limits<T>::infinity();
  if constexpr (has_local_error_bound<Stepper, T>::value) {
    envelope_bound = LocalErrorBound<Stepper>::template local<T>(description.envelope(), dt);
  }
  const T split = split_local_bound<Stepper>(description, dt);
  return split < envelope_bound ? split : envelope_bound;
}

/// Rotation angle bound (rad) of one step of length dt (s), θ = D0·dt, for the roundoff model.
template <class T>
T step_rotation_bound(const MotionDescription<T>& description, T dt) noexcept {
  return description.envelope().derivative[0] * dt;
}

/// Truncation part (rad) of the horizon bound over `steps` steps. Any motion but pure coning:
/// worst-case linear accumulation, steps × the local bound. Pure coning: the smaller of steps × the
/// exact per-step error and coning_error.hpp's closed form from E_N = (δ0 ⊗ r)^N ⊗ r^(−N), in which
/// the axial drift adds up and the lateral part, which turns with the cone, stays bounded (both
/// rigorous; the second is what keeps a mostly lateral local error — the zero-order-hold steps,
/// the one-plus-previous algorithm — from being summed as if it never turned).
template <class Stepper, class T>
T truncation_bound(const MotionDescription<T>& description, T dt, std::int64_t steps) noexcept {
  if (description.is_pure_coning()) {
    return coning_truncation_bound_tight<Stepper>(description.coning, dt, steps);
  }
  return static_cast<T>(steps) * local_truncation_bound<Stepper>(description, dt);
}

/// The linear-accumulation form alone, steps × local bound, for every motion (pure coning
/// included): the textbook worst case the tighter coning form is measured against.
template <class Stepper, class T>
T truncation_bound_linear(const MotionDescription<T>& description, T dt,
                          std::int64_t steps) noexcept {
  return static_cast<T>(steps) * local_truncation_bound<Stepper>(description, dt);
}

/// Extra error (rad) of the propagator's first step (exact under pure coning). A stepper that uses
/// the previous step's last
/// delta-angle (Coning1SamplePlusPrevious) starts from a zero previous sample (propagator.hpp),
/// so its first step lacks the correction c·Δθ_prev × Δθ with c = 1/12. Since
/// Δθ_prev × Δθ = Δθ_prev × (Δθ − Δθ_prev) and |Δθ − Δθ_prev| ≤ D1·dt² (each is ∫ω over dt, the two
/// a step apart), |c·Δθ_prev × Δθ| ≤ c·D0·dt·min(D0·dt, D1·dt²). Every other stepper's first step
/// is an ordinary step. Added to either truncation form: the propagated attitude after N steps is
/// Q0 ⊗ P'0 ⊗ X against the steady-state run's Q0 ⊗ P0 ⊗ X (X the same later increments), and
/// d(Q0 ⊗ P'0 ⊗ X, Q0 ⊗ P0 ⊗ X) = d(P'0, P0) by bi-invariance.
template <class Stepper, class T>
T startup_bound(const MotionDescription<T>& description, T dt) noexcept {
  if constexpr (Stepper::layout == SampleLayout::delta_angles_with_previous) {
    if (description.is_pure_coning()) {  // exact for coning (coning_error.hpp)
      return static_cast<T>(coning_startup_error<Stepper>(
          static_cast<long double>(description.coning.half_angle),
          static_cast<long double>(description.coning.frequency_hz), static_cast<long double>(dt)));
    }
    const RateEnvelope<T> e = description.envelope();
    const T angle = e.derivative[0] * dt;
    const T change = e.derivative[1] * dt * dt;
    const auto& c = coning_coefficients::one_sample_plus_previous;
    return T(c.numerators[0]) / T(c.denominator) * angle * (change < angle ? change : angle);
  } else {
    return T(0);
  }
}

/// The three terms of error_bound_after_steps (rad), for a caller that must say which one limits:
/// the truncation over the steps (linear, or the tighter coning form), the first step's extra, and
/// the worst-case roundoff over the steps with the accumulation policy.
template <class T>
struct ErrorBoundParts {
  T truncation = T(0);  ///< the truncation over the steps (rad)
  T startup = T(0);     ///< the first step's extra (rad)
  T roundoff = T(0);    ///< the worst-case roundoff over the steps (rad)
  /// Their sum, in the order error_bound_after_steps adds them (so the two agree bit for bit).
  constexpr T total() const noexcept { return truncation + startup + roundoff; }
};

/// The parts of error_bound_after_steps (below) after `steps` ≥ 1 steps; all 0 for steps ≤ 0.
template <class Stepper, class T, class Accumulation = PlainAccumulation>
ErrorBoundParts<T> error_bound_parts_after_steps(const MotionDescription<T>& description, T dt,
                                                 std::int64_t steps) noexcept {
  ErrorBoundParts<T> parts{};
  if (steps <= 0) {
    return parts;
  }
  parts.truncation = truncation_bound<Stepper>(description, dt, steps);
  parts.startup = startup_bound<Stepper>(description, dt);
  parts.roundoff =
      roundoff_floor_worst<Stepper, T, Accumulation>(step_rotation_bound(description, dt), steps);
  return parts;
}

/// Worst-case attitude error bound (rad) after exactly `steps` steps of length dt (s) of Stepper in
/// T with Accumulation: truncation over the steps (linear, or the tighter coning form) + the first
/// step's extra + worst-case roundoff over the steps (error_bound_parts_after_steps). Every term is
/// non-decreasing in `steps`, so the value also bounds the error at every earlier step end. 0
/// steps: 0 (the attitude is the initial one); negative steps: NaN. +∞ where a needed derivative
/// bound is +∞, D0·dt > 1 rad or no bound exists (bound_report.hpp says which).
template <class Stepper, class T, class Accumulation = PlainAccumulation>
T error_bound_after_steps(const MotionDescription<T>& description, T dt,
                          std::int64_t steps) noexcept {
  if (steps <= 0) {
    return steps == 0 ? T(0) : std::numeric_limits<T>::quiet_NaN();
  }
  return error_bound_parts_after_steps<Stepper, T, Accumulation>(description, dt, steps).total();
}

/// Worst-case attitude error bound (rad) after horizon_s (s) of steps of length dt (s) of Stepper
/// in T with Accumulation: error_bound_after_steps at steps_for_horizon(dt, horizon_s), i.e.
/// ceil(horizon/dt) steps. The horizon may be any arithmetic type, converted to T (static_cast).
template <class Stepper, class T, class Accumulation = PlainAccumulation, class H>
T horizon_error_bound(const MotionDescription<T>& description, T dt, H horizon_s) noexcept {
  return error_bound_after_steps<Stepper, T, Accumulation>(description, dt,
                                                           steps_for_horizon(dt, horizon_s));
}

}  // namespace halfspin
