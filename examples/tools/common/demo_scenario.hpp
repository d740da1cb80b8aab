#pragma once
// The tools' demo scenario (invented): a small fixed-wing survey drone circling in a steady banked
// turn, its gyro frame coned by engine vibration. 1 kHz gyro; budget 0.1° over 10 minutes.
//
//   Turn: coordinated, level, at airspeed V = 18 m/s and bank φ = 35°, so the turn rate is
//   ψ̇ = g·tan φ / V = 0.3815 rad/s (g = 9.80665 m/s², common practice, no source) and the body
//   rate is constant: (p, q, r) = (0, ψ̇ sin φ, ψ̇ cos φ) = (0, 0.2188, 0.3125) rad/s.
//   Vibration: classical coning of half-angle 0.02° at 85 Hz (an engine at 5100 rpm).
//   Truth: ComposedMotion (truth/composed_motion.hpp) of the turn carrying the coning, exact.
//
// Description for the a-priori bounds: the body rate is R(q_c)ᵀ·c + ω_cone, c the turn rate and
// q_c the coning attitude. With R(q_c) = I + sin a [n]× + (1 − cos a)[n]×², n(t) = (0, cos Ωt,
// sin Ωt), the k-th derivative (k ≥ 1) of the first term is at most |c|·(sin a·Ωᵏ + (1 − cos a)·
// (2Ω)ᵏ) ([n]×² = n nᵀ − I turns at 2Ω). That envelope is the manoeuvre and the coning its
// ConingSpec (MotionDescription): the exponential-map, Magnus and coning steppers keep the cone's
// exact error and bound what the turn adds (bounds/mixed_motion_bound.hpp); the others take the
// sum of the two envelopes.
// Nothing here is a real vehicle.

#include <cmath>
#include <cstddef>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/composed_motion.hpp"
#include "halfspin/truth/constant_rate.hpp"

namespace halfspin::tools::demo {

inline constexpr double airspeed_m_s = 18.0;
inline constexpr double bank_deg = 35.0;
inline constexpr double gravity_m_s2 = 9.80665;
inline constexpr double vibration_half_angle_deg = 0.02;
inline constexpr double vibration_frequency_hz = 85.0;
inline constexpr double gyro_rate_hz = 1000.0;
inline constexpr double budget_deg = 0.1;
inline constexpr double horizon_s = 600.0;

inline constexpr double pi = 3.141592653589793238462643383279502884;
inline constexpr double degree = pi / 180.0;

// Turn rate ψ̇ (rad/s) and the constant body rate of the turn (rad/s).
inline double turn_rate() noexcept {
  return gravity_m_s2 * std::tan(bank_deg * degree) / airspeed_m_s;
}
inline Vector3<double> turn_body_rate() noexcept {
  const double w = turn_rate();
  return {0.0, w * std::sin(bank_deg * degree), w * std::cos(bank_deg * degree)};
}

// The truth motion in T (double or long double): the turn, starting level-banked at heading 0,
// carrying the vibration coning.
template <class T>
using Motion = ComposedMotion<T, ConstantRateMotion<T>, ClassicalConingMotion<T>>;

template <class T>
Motion<T> motion() noexcept {
  const Vector3<double> c = turn_body_rate();
  const T half_bank = static_cast<T>(0.5 * bank_deg * degree);
  const ConstantRateMotion<T> turn{
      Quaternion<T>{std::cos(half_bank), std::sin(half_bank), T(0), T(0)},
      Vector3<T>{static_cast<T>(c.x), static_cast<T>(c.y), static_cast<T>(c.z)}};
  const ClassicalConingMotion<T> vibration{static_cast<T>(vibration_half_angle_deg * degree),
                                           static_cast<T>(2.0 * pi * vibration_frequency_hz)};
  return compose<T>(turn, vibration);
}

// The a-priori description of the same motion (header comment).
inline MotionDescription<double> description() noexcept {
  const double c = norm(turn_body_rate());
  const double a = vibration_half_angle_deg * degree;
  const double w = 2.0 * pi * vibration_frequency_hz;
  RateEnvelope<double> turn{};
  turn.derivative[0] = c;
  double wk = 1.0;
  double w2k = 1.0;
  for (std::size_t k = 1; k < 6; ++k) {
    wk *= w;
    w2k *= 2.0 * w;
    turn.derivative[k] = c * (std::sin(a) * wk + (1.0 - std::cos(a)) * w2k);
  }
  const ConingSpec<double> cone{a, vibration_frequency_hz};
  MotionDescription<double> d{};
  d.maneuver = turn;
  d.coning = cone;
  return d;
}

}  // namespace halfspin::tools::demo
