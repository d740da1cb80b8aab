#pragma once
/// @file
/// The local bound of an exponential-map, Magnus or coning step for a motion that contains cones
/// but is not pure coning: coning plus a turn, vibration lines, either with a manoeuvre envelope.
///
/// Without this, such a motion is bounded through its summed derivative envelope alone
/// (horizon_bound.hpp), which is loose by up to 10⁴ on the coning part: the coning algorithms
/// cancel the leading terms of exactly that motion, and a derivative bound cannot see it. Here the
/// cones keep their exact error and only what the rest adds is bounded:
///  1. Split (split_cones): the rate is ω = Σ_j u_j + v with u_j classical cones — the
///     description's ConingSpec, and for each vibration line the circle turning with it (radius
///     ρ₊ = Ω·sin a_j, motion_description.hpp) as a cone of half-angle a_j = asin(ρ₊/Ω) in the
///     plane of the line's ellipse — and v the rest: the manoeuvre envelope, each line's circle
///     turning against it (radius ρ₋: D_k = ρ₋·Ωᵏ) and the axial rate Ω(1 − cos a_j) the line has
///     not but the cone has (a constant: D0 only). A line whose cone would exceed 1 rad stays whole
///     in v. A cone in another plane and phase is the canonical cone rotated and shifted in time,
///     and every stepper of the family is equivariant under both (coning_error.hpp), so its error
///     is the canonical one.
///  2. Bound: for a rotation-vector step φ̂ = α̂ + β̂ against φ* = α + β + R (magnus_family_bounds.hpp
///     sections 1–4), α̂ − α is linear and β̂ − β bilinear in the rate, so
///     |φ̂ − φ*| ≤ Σ_j |φ̂ − φ*|(u_j) + (the family's split_remainder: the rest's quadrature and
///     commutator error, the polarized cross terms cone–cone and cones–rest, and the remainders
///     R of each cone and of the whole rate). |φ̂ − φ*|(u_j) is computed exactly in long double
///     (coning_step_rotation_vector_error). The angle error is at most |φ̂ − φ*| (section 0), with
///     the same range check.
/// The result is rigorous for every rate the description admits, and local_truncation_bound takes
/// the smaller of it and the envelope bound. Over a horizon it is summed linearly (every step's
/// bound, bi-invariance): tight where the error is secular (the coning algorithms' drift along the
/// cone axis), loose where a step's error turns with the cone (the zero-order-hold exponential-map
/// steps, and the 3- and 4-sample algorithms at steps of a few tenths of a radian of cone phase),
/// for which pure coning alone has the closed form of coning_error.hpp.
/// Measured (tests/bounds/test_mixed_motion_bound.cpp, a 15 Hz cone of 0.03 rad with a 0.8 rad/s
/// turn about its axis or 0.7 rad/s across it, 20 cone periods, gyro at 250–1000 Hz):
/// bound/measured 1.3 (coning_1_sample), 1.3–1.5 (coning_2_sample), 1.9–4.2 (Miller's set), 2.8–6.5
/// (one plus previous), 6.6–33 (coning_3_sample, coning_4_sample); with the summed
/// envelope 1.3–215. The same runs' sum of exact local errors (each step from the exact attitude;
/// no summing bound goes below it) over the measured error: 1.0 (one and two samples), 1.1–1.2
/// (Miller), 1.3–5.4 (one plus previous), 2.0–2.5 with the axial turn and 5.3–5.8 with the banked
/// turn (three and four samples). So with the banked turn the three- and four-sample algorithms
/// cannot reach 3 with a summing bound; with the axial turn the remaining factor of 3–7 is this
/// bound's remainder term (the third-order terms between cone and turn, majorized by norm
/// products).

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <type_traits>
#include <utility>

#include "halfspin/bounds/coning_error.hpp"
#include "halfspin/bounds/local_error_bound.hpp"
#include "halfspin/bounds/magnus_family_bounds.hpp"
#include "halfspin/bounds/motion_description.hpp"

namespace halfspin {

/// A motion as cones plus a rest (header comment, step 1).
template <class T>
struct ConeSplit {
  /// The most cones: 1 + VibrationSpec<T>::capacity.
  static constexpr std::size_t capacity = 1 + VibrationSpec<T>::capacity;
  std::array<ConingSpec<T>, capacity> cone{};      ///< the cones; the first `count` are used
  std::size_t count = 0;                           ///< cones in use
  RateEnvelope<T> rest = RateEnvelope<T>::none();  ///< the derivative bounds of what is not a cone
};

/// Splits a description into cones and a rest (header comment, step 1).
template <class T>
ConeSplit<T> split_cones(const MotionDescription<T>& d) noexcept {
  ConeSplit<T> s{};
  s.rest = d.maneuver;
  if (d.coning.present()) {
    s.cone[s.count++] = d.coning;
  }
  for (std::size_t i = 0; i < d.vibration.count; ++i) {
    const VibrationLine<T>& line = d.vibration.line[i];
    const T w = line.angular_frequency();
    const CircularParts<T> c = line.circular_parts();
    if (w > T(0) && c.with_line > T(0) && c.with_line <= w * std::sin(T(1))) {
      const T a = std::asin(c.with_line / w);
      s.cone[s.count++] = ConingSpec<T>{a, line.frequency_hz};
      const T half = std::sin(T(0.5) * a);
      RateEnvelope<T> against{};
      T p = c.against_line;
      for (std::size_t k = 0; k < 6; ++k) {
        against.derivative[k] = p;
        p *= w;
      }
      s.rest = s.rest + RateEnvelope<T>::constant_rate(T(2) * w * half * half) + against;
    } else {
      s.rest = s.rest + line.envelope();
    }
  }
  return s;
}

/// |M| (rad·s) for a cone and one step of Stepper of length dt (s): the cross term of the step's
/// commutator error between the cone u and a constant rate c is exactly M × c (magnus_family_bounds
/// split_remainder). Computed in long double: β̂'s part from the stepper's own commutator_term
/// (β̂(u + c) − β̂(u) − β̂(c) for c the three unit vectors), β's part from
/// β(u + c) − β(u) − β(c) = ½∫₀^dt (dt − 2t)·u(t) dt × c (β = ½∫α×ω; α_c = c·t), the integral by
/// 8-point Gauss–Legendre on 8 panels (exact far below the long double rounding for the
/// step lengths the bounds allow, Ω·dt < π). Same at every step (the cone's equivariance).
template <class Stepper>
long double coning_constant_cross(long double half_angle, long double frequency_hz,
                                  long double dt) noexcept {
  using V = Vector3<long double>;
  const detail::ConingClosedForm m{half_angle,
                                   2.0L * 3.141592653589793238462643383279502884L * frequency_hz};
  // ½∫₀^dt (dt − 2t)·u(t) dt.
  static constexpr std::array<long double, 4> node{
      0.1834346424956498049394761423601840L, 0.5255324099163289858177390491892463L,
      0.7966664774136267395915539364758304L, 0.9602898564975362316835608685694730L};
  static constexpr std::array<long double, 4> weight{
      0.3626837833783619829651504492771957L, 0.3137066458778872873379622019866013L,
      0.2223810344533744705443559944052344L, 0.1012285362903762591525313543099622L};
  constexpr int panels = 8;
  const long double p = dt / panels;
  V exact{0.0L, 0.0L, 0.0L};
  for (int j = 0; j < panels; ++j) {
    const long double mid = (static_cast<long double>(j) + 0.5L) * p;
    for (std::size_t i = 0; i < 4; ++i) {
      for (const long double sign : {-1.0L, 1.0L}) {
        const long double t = mid + sign * 0.5L * p * node[i];
        exact = exact + (0.25L * p * weight[i] * (dt - 2.0L * t)) * m.rate(t);
      }
    }
  }
  V method{0.0L, 0.0L, 0.0L};
  if constexpr (Stepper::has_estimate) {
    constexpr std::size_t window = Stepper::window;
    const auto u = coning_step_inputs<Stepper>(m, dt);
    const long double length =
        carries_delta_angles(Stepper::layout)
            ? dt / static_cast<long double>(periods_per_step(Stepper::layout, window))
            : 1.0L;
    auto cross_with = [&](const V& c) noexcept {
      std::array<V, window> only{};
      std::array<V, window> both{};
      for (std::size_t i = 0; i < window; ++i) {
        only[i] = length * c;
        both[i] = u[i] + only[i];
      }
      return Stepper::commutator_term(both, dt) - Stepper::commutator_term(u, dt) -
             Stepper::commutator_term(only, dt);
    };
    // D(c) = M̂ × c: M̂ × x̂ = (0, M̂z, −M̂y), M̂ × ŷ = (−M̂z, 0, M̂x), M̂ × ẑ = (M̂y, −M̂x, 0).
    const V dx = cross_with({1.0L, 0.0L, 0.0L});
    const V dy = cross_with({0.0L, 1.0L, 0.0L});
    const V dz = cross_with({0.0L, 0.0L, 1.0L});
    method = V{0.5L * (dy.z - dz.y), 0.5L * (dz.x - dx.z), 0.5L * (dx.y - dy.x)};
  }
  return norm(method - exact);
}

/// Whether Stepper's family bounds a split motion (has split_remainder and checked).
template <class Stepper, class T, class = void>
struct has_split_bound : std::false_type {};
template <class Stepper, class T>
struct has_split_bound<
    Stepper, T,
    std::void_t<decltype(LocalErrorBound<Stepper>::template checked<T>(
        std::declval<const RateEnvelope<T>&>(), std::declval<T>(), std::declval<T>()))>>
    : std::true_type {};

/// Local bound (rad) of one step of length dt (s) of Stepper for the description, keeping its
/// cones exact (header comment); +∞ when the description has no cone or the family has no split
/// bound (the caller then has the envelope bound alone).
template <class Stepper, class T>
T split_local_bound(const MotionDescription<T>& d, T dt) noexcept {
  if constexpr (has_split_bound<Stepper, T>::value) {
    const ConeSplit<T> s = split_cones(d);
    if (s.count == 0) {
      return std::numeric_limits<T>::infinity();
    }
    std::array<RateEnvelope<T>, ConeSplit<T>::capacity> envelope{};
    std::array<T, ConeSplit<T>::capacity> constant_cross{};
    long double exact = 0.0L;
    for (std::size_t j = 0; j < s.count; ++j) {
      const long double a = static_cast<long double>(s.cone[j].half_angle);
      const long double f = static_cast<long double>(s.cone[j].frequency_hz);
      const long double step = static_cast<long double>(dt);
      envelope[j] = s.cone[j].envelope();
      exact += coning_step_rotation_vector_error<Stepper>(a, f, step);
      constant_cross[j] = static_cast<T>(coning_constant_cross<Stepper>(a, f, step));
    }
    // The samples reach dt/2 from mid-step, and one sample period further back for a stepper
    // that reads the previous delta-angle.
    const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
    const T half_span = Stepper::layout == SampleLayout::delta_angles_with_previous
                            ? dt * (T(0.5) + T(1) / periods)
                            : T(0.5) * dt;
    const RateEnvelope<T> total = d.envelope();
    return LocalErrorBound<Stepper>::checked(
        total, dt,
        static_cast<T>(exact) + LocalErrorBound<Stepper>::split_remainder(envelope, constant_cross,
                                                                          s.count, s.rest, total,
                                                                          dt, half_span));
  } else {
    return std::numeric_limits<T>::infinity();
  }
}

}  // namespace halfspin
