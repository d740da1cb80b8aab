#pragma once
// The exact per-step truncation error of any stepper under pure classical coning, and the horizon
// bound built from it.
//
// Why every step makes the same error. Classical coning of half-angle a at Ω rad/s is
//     q(t) = (cos(a/2), 0, sin(a/2) cos Ωt, sin(a/2) sin Ωt),
//     ω(t) = (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt),
//     ∫_{t0}^{t1} ω = (−Ω(1 − cos a)(t1 − t0), −2 sin a sin(Ω(t1 − t0)/2) sin Ωt_m,
//                      2 sin a sin(Ω(t1 − t0)/2) cos Ωt_m),   t_m = (t0 + t1)/2.
// (The first line is a rotation by a about the axis (0, cos Ωt, sin Ωt); ω = 2 q* ⊗ q̇ gives the
// second; the third integrates it, written with sum-to-product identities so that short
// intervals keep their relative accuracy. Re-derived here because bounds may not include truth/.)
// With r(t) = exp(x̂ Ωt/2): q(t) = r(t) ⊗ q(0) ⊗ r(t)*, and ω(t + τ) = R_x(Ωt)·ω(τ), so every
// input of a step starting at t (rates, delta-angles, a rate function) is the input of the step
// starting at 0 rotated by R_x(Ωt). Every stepper here is equivariant under rotating its inputs
// (sums, scalings and cross products of input vectors commute with a rotation; so do
// quaternion_exp and the slopes q ⊗ (0, ω)): a step from q(t) gives r ⊗ (q(0) ⊗ P) ⊗ r* where
// q(0) ⊗ P is the step from q(0), and the truth is r ⊗ q(dt) ⊗ r*. The angle metric is
// bi-invariant, so the local error d(q(0) ⊗ P, q(dt)) is the same for every step.
//
// Horizon. For the exact increment Φ* and the numerical Φ of a step, d(q ⊗ Φ, Q ⊗ Φ*) ≤ d(q, Q)
// + d(Φ, Φ*) (bi-invariance and the triangle inequality), so after N steps the error is at most
// N × (local error): a rigorous bound with no growth factor. It is tight when the local error is
// secular, i.e. along the cone axis (the coning drift), which is the part every step repeats in
// the same direction; the part across the axis turns with the cone and its sum stays bounded, so
// for a stepper whose local error is mostly lateral (the zero-order-hold exponential-map steps at
// small cone angles) N × local overestimates horizons much longer than a cone period.
//
// Arithmetic: the step is run in long double (on platforms where long double is double, in
// double), so the value is the truncation error of the method up to long double rounding, which
// the caller's roundoff floor for T (≥ 16 u_T per step) covers many times over when T is float or
// double.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace detail {

// The closed-form coning lines above, in long double; a half-angle (rad), Ω (rad/s), t (s).
struct ConingClosedForm {
  long double half_angle;
  long double omega;

  Quaternion<long double> attitude(long double t) const noexcept {
    const long double s = std::sin(0.5L * half_angle);
    return {std::cos(0.5L * half_angle), 0.0L, s * std::cos(omega * t), s * std::sin(omega * t)};
  }
  // 1 − cos a as 2 sin²(a/2): no cancellation at small cone angles.
  long double one_minus_cos() const noexcept {
    const long double s = std::sin(0.5L * half_angle);
    return 2.0L * s * s;
  }
  Vector3<long double> rate(long double t) const noexcept {
    const long double lateral = omega * std::sin(half_angle);
    return {-omega * one_minus_cos(), -lateral * std::sin(omega * t),
            lateral * std::cos(omega * t)};
  }
  Vector3<long double> delta_angle(long double t0, long double t1) const noexcept {
    const long double mid = omega * (0.5L * (t0 + t1));
    const long double lateral = 2.0L * std::sin(half_angle) * std::sin(0.5L * omega * (t1 - t0));
    return {-omega * one_minus_cos() * (t1 - t0), -lateral * std::sin(mid),
            lateral * std::cos(mid)};
  }
};

}  // namespace detail

// Local (one-step) attitude error (rad) of Stepper on pure classical coning of half-angle
// `half_angle` (rad) at `frequency_hz` (Hz), for one step of length dt (s), measured from the
// exact attitude against the exact attitude one step later. Same at every step (header comment).
template <class Stepper>
long double coning_step_error(long double half_angle, long double frequency_hz,
                              long double dt) noexcept {
  const detail::ConingClosedForm m{half_angle, 2.0L * 3.141592653589793238462643383279502884L *
                                                   frequency_hz};
  const Quaternion<long double> start = m.attitude(0.0L);
  Quaternion<long double> end{};
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    end = Stepper::step(start, [&m](long double tau) noexcept { return m.rate(tau); }, dt);
  } else {
    constexpr std::size_t window = Stepper::window;
    constexpr std::size_t periods = periods_per_step(Stepper::layout, window);
    const long double h = dt / static_cast<long double>(periods);
    std::array<Vector3<long double>, window> input{};
    for (std::size_t i = 0; i < window; ++i) {
      const long double k = static_cast<long double>(i);
      switch (Stepper::layout) {
        case SampleLayout::rate_at_end: input[i] = m.rate(dt); break;
        case SampleLayout::rates_spanning: input[i] = m.rate(k * h); break;
        case SampleLayout::delta_angles: input[i] = m.delta_angle(k * h, (k + 1.0L) * h); break;
        case SampleLayout::delta_angles_with_previous:
          // [0] the previous step's last delta-angle, over (−h, 0].
          input[i] = m.delta_angle((k - 1.0L) * h, k * h);
          break;
        case SampleLayout::rate_function: break;
      }
    }
    end = Stepper::step(start, input, dt);
  }
  return angle_between(end, m.attitude(dt));
}

// The same for a ConingSpec in T, returned in T (rad); dt in s.
template <class Stepper, class T>
T coning_step_error(const ConingSpec<T>& coning, T dt) noexcept {
  return static_cast<T>(coning_step_error<Stepper>(static_cast<long double>(coning.half_angle),
                                                   static_cast<long double>(coning.frequency_hz),
                                                   static_cast<long double>(dt)));
}

// Truncation error bound (rad) over `steps` steps of pure coning: steps × the exact local error
// (triangle inequality, header comment). Rounding is not included (see roundoff_floor.hpp).
template <class Stepper, class T>
T coning_truncation_bound(const ConingSpec<T>& coning, T dt, std::int64_t steps) noexcept {
  return static_cast<T>(steps) * coning_step_error<Stepper>(coning, dt);
}

}  // namespace halfspin
