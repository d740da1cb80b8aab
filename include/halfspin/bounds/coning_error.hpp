#pragma once
/// @file
/// The exact per-step truncation error of any stepper under pure classical coning, and the horizon
/// bound built from it.
///
/// Why every step makes the same error. Classical coning of half-angle a at Ω rad/s is
///     q(t) = (cos(a/2), 0, sin(a/2) cos Ωt, sin(a/2) sin Ωt),
///     ω(t) = (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt),
///     ∫_{t0}^{t1} ω = (−Ω(1 − cos a)(t1 − t0), −2 sin a sin(Ω(t1 − t0)/2) sin Ωt_m,
///                      2 sin a sin(Ω(t1 − t0)/2) cos Ωt_m),   t_m = (t0 + t1)/2.
/// (The first line is a rotation by a about the axis (0, cos Ωt, sin Ωt); ω = 2 q* ⊗ q̇ gives the
/// second; the third integrates it, written with sum-to-product identities so that short
/// intervals keep their relative accuracy. Re-derived here because bounds may not include truth/.)
/// With r(t) = exp(x̂ Ωt/2): q(t) = r(t) ⊗ q(0) ⊗ r(t)*, and ω(t + τ) = R_x(Ωt)·ω(τ), so every
/// input of a step starting at t (rates, delta-angles, a rate function) is the input of the step
/// starting at 0 rotated by R_x(Ωt). Every stepper here is equivariant under rotating its inputs
/// (sums, scalings and cross products of input vectors commute with a rotation; so do
/// quaternion_exp and the slopes q ⊗ (0, ω)): a step from q(t) gives r ⊗ (q(0) ⊗ P) ⊗ r* where
/// q(0) ⊗ P is the step from q(0), and the truth is r ⊗ q(dt) ⊗ r*. The angle metric is
/// bi-invariant, so the local error d(q(0) ⊗ P, q(dt)) is the same for every step.
///
/// Horizon. For the exact increment Φ* and the numerical Φ of a step, d(q ⊗ Φ, Q ⊗ Φ*) ≤ d(q, Q)
/// + d(Φ, Φ*) (bi-invariance and the triangle inequality), so after N steps the error is at most
/// N × (local error): a rigorous bound with no growth factor. It is tight when the local error is
/// secular, i.e. along the cone axis (the coning drift), which is the part every step repeats in
/// the same direction; the part across the axis turns with the cone and its sum stays bounded, so
/// for a stepper whose local error is mostly lateral (the zero-order-hold exponential-map steps at
/// small cone angles) N × local overestimates horizons much longer than a cone period; the form
/// coning_truncation_bound_tight below does not.
///
/// Arithmetic: the step is run in long double (on platforms where long double is double, in
/// double), so the value is the truncation error of the method up to long double rounding, which
/// the caller's roundoff floor for T (≥ 16 u_T per step) covers many times over when T is float or
/// double.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
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

/// The inputs one step of a sample-driven Stepper reads on the closed-form coning from 0 to dt (s),
/// in long double, as its layout asks (zero_previous: the propagator's very first step, whose
/// previous delta-angle is zero).
template <class Stepper>
std::array<Vector3<long double>, Stepper::window> coning_step_inputs(
    const detail::ConingClosedForm& m, long double dt, bool zero_previous = false) noexcept {
  constexpr std::size_t window = Stepper::window;
  constexpr std::size_t periods = periods_per_step(Stepper::layout, window);
  const long double h = dt / static_cast<long double>(periods);
  std::array<Vector3<long double>, window> input{};
  for (std::size_t i = 0; i < window; ++i) {
    const long double k = static_cast<long double>(i);
    switch (Stepper::layout) {
      case SampleLayout::rate_at_end:
        input[i] = m.rate(dt);
        break;
      case SampleLayout::rates_spanning:
        input[i] = m.rate(k * h);
        break;
      case SampleLayout::delta_angles:
        input[i] = m.delta_angle(k * h, (k + 1.0L) * h);
        break;
      case SampleLayout::delta_angles_with_previous:
        // [0] the previous step's last delta-angle, over (−h, 0] (zero for the propagator's
        // very first step, which has no previous sample).
        input[i] = (i == 0 && zero_previous) ? Vector3<long double>{0.0L, 0.0L, 0.0L}
                                             : m.delta_angle((k - 1.0L) * h, k * h);
        break;
      case SampleLayout::rate_function:
        break;
    }
  }
  return input;
}

/// The attitude after one step of Stepper from the exact coning attitude at 0 (rad, s), in long
/// double, with the closed-form inputs its layout asks for.
template <class Stepper>
Quaternion<long double> coning_step_end(const detail::ConingClosedForm& m, long double dt,
                                        bool zero_previous = false) noexcept {
  const Quaternion<long double> start = m.attitude(0.0L);
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    return Stepper::step(
        start, [&m](long double tau) noexcept { return m.rate(tau); }, dt);
  } else {
    return Stepper::step(start, coning_step_inputs<Stepper>(m, dt, zero_previous), dt);
  }
}

/// Local (one-step) attitude error (rad) of Stepper on pure classical coning of half-angle
/// `half_angle` (rad) at `frequency_hz` (Hz), for one step of length dt (s), measured from the
/// exact attitude against the exact attitude one step later. Same at every step (header comment).
template <class Stepper>
long double coning_step_error(long double half_angle, long double frequency_hz,
                              long double dt) noexcept {
  const detail::ConingClosedForm m{half_angle,
                                   2.0L * 3.141592653589793238462643383279502884L * frequency_hz};
  return angle_between(coning_step_end<Stepper>(m, dt), m.attitude(dt));
}

/// The same for a ConingSpec in T, returned in T (rad); dt in s.
template <class Stepper, class T>
T coning_step_error(const ConingSpec<T>& coning, T dt) noexcept {
  return static_cast<T>(coning_step_error<Stepper>(static_cast<long double>(coning.half_angle),
                                                   static_cast<long double>(coning.frequency_hz),
                                                   static_cast<long double>(dt)));
}

/// The same step's error as rotation vectors (rad): |log(P̂) − log(P*)| for the stepper's increment
/// P̂ = q(0)* ⊗ q̂(dt) and the exact one P* = q(0)* ⊗ q(dt) (principal logarithms). At least the
/// angle above (section 0 of magnus_family_bounds.hpp); for a rotation-vector stepper, whose P̂
/// is exp(φ̂/2), it is |φ̂ − φ*|, the quantity that section's split adds up (mixed_motion_bound.hpp).
/// Same at every step (header comment: the logarithm commutes with the rotation by r).
template <class Stepper>
long double coning_step_rotation_vector_error(long double half_angle, long double frequency_hz,
                                              long double dt) noexcept {
  const detail::ConingClosedForm m{half_angle,
                                   2.0L * 3.141592653589793238462643383279502884L * frequency_hz};
  const Quaternion<long double> start_inverse = conjugate(m.attitude(0.0L));
  const Vector3<long double> method =
      quaternion_log(start_inverse * normalized(coning_step_end<Stepper>(m, dt)));
  const Vector3<long double> exact = quaternion_log(start_inverse * m.attitude(dt));
  return norm(method - exact);
}

/// Extra error (rad) of the propagator's first step under pure coning for a stepper that uses the
/// previous step's delta-angle: the first step has none (the propagator starts it from zero), and
/// its end differs from the steady-state step's end by exactly this angle (0 for other layouts).
template <class Stepper>
long double coning_startup_error(long double half_angle, long double frequency_hz,
                                 long double dt) noexcept {
  if constexpr (Stepper::layout == SampleLayout::delta_angles_with_previous) {
    const detail::ConingClosedForm m{half_angle,
                                     2.0L * 3.141592653589793238462643383279502884L * frequency_hz};
    return angle_between(coning_step_end<Stepper>(m, dt, true), coning_step_end<Stepper>(m, dt));
  } else {
    return 0.0L;
  }
}

/// Truncation error bound (rad) over `steps` steps of pure coning, valid at every step end up to
/// `steps`. Derivation. Let Q_k = q(t_k) be the truth and q_k the propagated attitude, started at
/// Q_0, with increments q_{k+1} = q_k ⊗ P_k (every stepper's increment is independent of q). By the
/// equivariance in the header comment P_k = r_k ⊗ P_0 ⊗ r_k* and Q_k = r_k ⊗ Q_0 ⊗ r_k*, with
/// r_k = r^k, r = exp(x̂·Ω·dt/2). The global error E_k = q_k ⊗ Q_k* then obeys E_{k+1} = E_k ⊗ δ_k
/// with δ_k = Q_k ⊗ P_k ⊗ Φ*_k* ⊗ Q_k* = r^k ⊗ δ_0 ⊗ r^(−k), δ_0 = q_1 ⊗ Q_1* (one step's end
/// against the truth's), so
///     E_N = δ_0 ⊗ (r δ_0 r*) ⊗ (r² δ_0 r*²) ⊗ … = (δ_0 ⊗ r)^N ⊗ r^(−N),
/// exactly. With A = δ_0 ⊗ r = (cos(α/2), sin(α/2)·n) and r = (cos(φ/2), sin(φ/2)·x̂), φ = Ω·dt, the
/// scalar part of E_k is c = cos u cos v + μ sin u sin v = cos(u − v) − (1 − μ) sin u sin v with
/// u = kα/2, v = kφ/2, μ = n·x̂. Hence 1 − c ≤ (u − v)²/2 + (1 − μ) = k²(α − φ)²/8 + (1 − μ),
/// increasing in k, and the error angle 2·acos(|c|) ≤ 2·acos(c) is at most
///     2·acos(1 − N²(α − φ)²/8 − (1 − μ))
/// for every k ≤ N: the axial drift (α − φ per step) grows linearly, the lateral part (the tilt
/// 1 − μ of A's axis) stays bounded — the secular/oscillating split of the coning error, with no
/// first-order approximation. The bound returned is the smaller of this and N × local error (both
/// rigorous). Requires Ω·dt < π (else only N × local is used). horizon_bound.hpp uses this form
/// for pure coning: the linear sum N × local alone is tight only where the error is secular, this
/// form also where it is not (bound/measured 1.0–1.4× over one and over 20 cone periods for every
/// stepper, test_coning_error).
template <class Stepper>
long double coning_truncation_bound_tight(long double half_angle, long double frequency_hz,
                                          long double dt, std::int64_t steps) noexcept {
  const long double n = static_cast<long double>(steps);
  const long double linear = n * coning_step_error<Stepper>(half_angle, frequency_hz, dt);
  const long double omega = 2.0L * 3.141592653589793238462643383279502884L * frequency_hz;
  const long double phi = omega * dt;
  if (!(phi > 0.0L) || !(phi < 3.141592653589793238462643383279502884L)) {
    return linear;
  }
  const detail::ConingClosedForm m{half_angle, omega};
  const Quaternion<long double> step_end = coning_step_end<Stepper>(m, dt);
  const Quaternion<long double> delta = normalized(step_end) * conjugate(m.attitude(dt));
  const Quaternion<long double> r{std::cos(0.5L * phi), std::sin(0.5L * phi), 0.0L, 0.0L};
  Quaternion<long double> a = delta * r;
  if (a.w < 0.0L) {
    a = -a;
  }
  const long double s = std::sqrt(a.x * a.x + a.y * a.y + a.z * a.z);
  const long double alpha = 2.0L * std::atan2(s, a.w);
  // 1 − μ = (s − a.x)/s, written without cancellation when A's axis is nearly x̂.
  const long double tilt =
      s > 0.0L ? (a.x >= 0.0L ? (a.y * a.y + a.z * a.z) / (s * (s + a.x)) : (s - a.x) / s) : 0.0L;
  const long double g = n * n * (alpha - phi) * (alpha - phi) / 8.0L + tilt;
  // 2·acos(1 − g) written as 4·asin(√(g/2)) (1 − cos x = 2 sin²(x/2)): no cancellation for tiny g.
  const long double closed = g >= 2.0L ? 2.0L * 3.141592653589793238462643383279502884L
                                       : 4.0L * std::asin(std::sqrt(0.5L * g));
  return closed < linear ? closed : linear;
}

/// The same for a ConingSpec in T, returned in T (rad); dt in s. Rounding is not included (see
/// roundoff_floor.hpp).
template <class Stepper, class T>
T coning_truncation_bound_tight(const ConingSpec<T>& coning, T dt, std::int64_t steps) noexcept {
  return static_cast<T>(coning_truncation_bound_tight<Stepper>(
      static_cast<long double>(coning.half_angle), static_cast<long double>(coning.frequency_hz),
      static_cast<long double>(dt), steps));
}

/// Truncation error bound (rad) over `steps` steps of pure coning by worst-case linear
/// accumulation: steps × the exact local error (triangle inequality, header comment).
template <class Stepper, class T>
T coning_truncation_bound(const ConingSpec<T>& coning, T dt, std::int64_t steps) noexcept {
  return static_cast<T>(steps) * coning_step_error<Stepper>(coning, dt);
}

}  // namespace halfspin
