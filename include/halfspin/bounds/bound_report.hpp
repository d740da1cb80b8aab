#pragma once
/// @file
/// The horizon bound with the reason when it is not finite: which derivative bound is missing, or
/// that the step is too large, or that the stepper has no bound, instead of a silent +∞.
///
/// The bounds are +∞ in three ways (magnus_family_bounds.hpp, runge_kutta_bounds.hpp,
/// commutator_free_bounds.hpp): a D_k the stepper's bound needs is unknown (+∞), whatever the
/// others; D0·dt > 1 rad; or the local bound reaches the end of its derivation's range (2 rad for
/// the rotation-vector family). The report tells them apart by probing: each unknown D_j, j ≤ k,
/// is replaced by the finite value p_j = 2⁻¹⁰·dt^−(j+1) (rad/s^(j+1); a term of about a
/// thousandth of a radian per step, small enough not to push a bound out of its range), for
/// k = 0, 1, …, 5; the first k whose probed bound is finite is the derivative the stepper needs:
/// supplying finite bounds for the unknown ones among D_0..D_k gives a finite bound (their size
/// changes the value, not its finiteness, as long as the step stays in range). If no k makes it
/// finite, no derivative information helps at this step: step_too_large. The probe values are
/// never reported as a bound; they only locate the missing derivative. p_j is capped at the
/// largest finite T / 2¹⁶, so in float with dt below about 10⁻⁶ s the top probes can be inexact:
/// the status is then still step_too_large or needs_derivative, the index possibly one too high.

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/local_error_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"

namespace halfspin {

/// Why a horizon bound is finite, or why it is +∞ (see the file comment).
enum class BoundStatus : std::uint8_t {
  ok,                ///< value_rad is a finite bound
  needs_derivative,  ///< +∞ for want of derivative bounds: supply D_0..D_k, k = needed_derivative
  step_too_large,    ///< +∞ whatever the unknown derivatives: D0·dt > 1 rad, or the local bound
                     ///< leaves the range of its derivation; a smaller step is needed
  no_bound_for_stepper,  ///< the stepper has no LocalErrorBound (and the motion is not pure coning)
  invalid_arguments  ///< dt or horizon not positive and finite, steps < 1, a D_k negative or NaN
};

/// A horizon bound and its status: the reason when it is +∞.
template <class T>
struct BoundReport {
  T value_rad = std::numeric_limits<T>::infinity();  ///< the bound (rad); +∞ unless status is ok
  BoundStatus status = BoundStatus::invalid_arguments;  ///< ok, or why value_rad is +∞
  std::size_t needed_derivative = 0;  ///< with needs_derivative: k, supply D_0..D_k (rad/s^(k+1))
  std::int64_t steps = 0;             ///< steps the bound covers
};

namespace detail {

// D_j of e, with the unknown (+∞) ones up to `through` replaced by the probe values of the header
// comment.
template <class T>
RateEnvelope<T> probed_envelope(const RateEnvelope<T>& e, T dt, std::size_t through) noexcept {
  constexpr T cap = std::numeric_limits<T>::max() / T(65536);
  RateEnvelope<T> r = e;
  T probe = T(1.0 / 1024);
  for (std::size_t j = 0; j <= through && j < r.derivative.size(); ++j) {
    probe = probe / dt < cap ? probe / dt : cap;
    if (!std::isfinite(r.derivative[j])) {
      r.derivative[j] = probe;
    }
  }
  return r;
}

template <class T>
bool valid_description(const MotionDescription<T>& description) noexcept {
  const RateEnvelope<T> e = description.envelope();
  for (const T d : e.derivative) {
    if (!(d >= T(0))) {  // negative or NaN; +∞ is "unknown", which is allowed
      return false;
    }
  }
  return true;
}

}  // namespace detail

/// error_bound_after_steps (horizon_bound.hpp) with its status (rad; dt in s): ok and the finite
/// bound, or why there is none (header comment).
template <class Stepper, class T, class Accumulation = PlainAccumulation>
BoundReport<T> error_report_after_steps(const MotionDescription<T>& description, T dt,
                                        std::int64_t steps) noexcept {
  BoundReport<T> r{};
  r.steps = steps;
  if (!(dt > T(0)) || !std::isfinite(dt) || steps < 1 || !detail::valid_description(description)) {
    return r;
  }
  if (!description.is_pure_coning() && !has_local_error_bound<Stepper, T>::value) {
    r.status = BoundStatus::no_bound_for_stepper;
    return r;
  }
  const T value = error_bound_after_steps<Stepper, T, Accumulation>(description, dt, steps);
  if (std::isfinite(value)) {
    r.value_rad = value;
    r.status = BoundStatus::ok;
    return r;
  }
  r.status = BoundStatus::step_too_large;
  const RateEnvelope<T> e = description.envelope();
  if (std::isfinite(e.derivative[0]) && !(e.derivative[0] * dt <= T(1))) {
    return r;  // D0·dt > 1 rad: no derivative information helps
  }
  for (std::size_t k = 0; k < e.derivative.size(); ++k) {
    if (std::isfinite(e.derivative[k])) {
      continue;  // supplying D_0..D_k is then the same as supplying D_0..D_(k−1)
    }
    MotionDescription<T> probe{};  // the whole envelope as a maneuver: same envelope()
    probe.maneuver = detail::probed_envelope(e, dt, k);
    if (std::isfinite(error_bound_after_steps<Stepper, T, Accumulation>(probe, dt, steps))) {
      r.status = BoundStatus::needs_derivative;
      r.needed_derivative = k;
      return r;
    }
  }
  return r;
}

/// horizon_error_bound (horizon_bound.hpp) with its status: the report after
/// steps_for_horizon(dt, horizon_s) = ceil(horizon/dt) steps. The horizon (s) may be any
/// arithmetic type, converted to T (static_cast).
template <class Stepper, class T, class Accumulation = PlainAccumulation, class H>
BoundReport<T> horizon_error_report(const MotionDescription<T>& description, T dt,
                                    H horizon_s) noexcept {
  static_assert(std::is_arithmetic<H>::value, "the horizon (s) is an arithmetic type");
  const T horizon = static_cast<T>(horizon_s);
  if (!(horizon > T(0)) || !std::isfinite(horizon)) {
    return BoundReport<T>{};
  }
  return error_report_after_steps<Stepper, T, Accumulation>(description, dt,
                                                            steps_for_horizon(dt, horizon));
}

}  // namespace halfspin
