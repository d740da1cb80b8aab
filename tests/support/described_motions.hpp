#pragma once
// Truth motions shared by the bound tests (invented parameters), and how an engineer would describe
// each for the a-priori bounds: a constant rate, classical coning, a torque-free axisymmetric body.
// Test-only.

#include <cmath>
#include <cstddef>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "test_support.hpp"

namespace halfspin::test::described {

using LD = long double;

inline constexpr LD two_pi = 6.283185307179586476925286766559005768L;

inline const ConstantRateMotion<LD> constant{normalized(Quaternion<LD>{0.9L, 0.1L, -0.3L, 0.2L}),
                                             Vector3<LD>{0.7L, -1.1L, 0.4L}};
inline const ClassicalConingMotion<LD> coning{0.05L, two_pi * 4};
inline const AxisymmetricBodyMotion<LD> body{
    normalized(Quaternion<LD>{0.9L, 0.2L, -0.3L, 0.1L}), 1.0L, 1.6L, 0.8L, 0.3L, 1.5L};

template <class T>
MotionDescription<T> describe_constant() {
  MotionDescription<T> d{};
  d.maneuver = RateEnvelope<T>::constant_rate(static_cast<T>(length_ld(constant.body_rate)));
  return d;
}

template <class T>
MotionDescription<T> describe_coning() {
  MotionDescription<T> d{};
  d.coning.half_angle = static_cast<T>(coning.cone_angle);
  d.coning.frequency_hz = static_cast<T>(coning.cone_frequency / two_pi);
  return d;
}

// ω = (ω⊥ cos(λt + φ0), ω⊥ sin(λt + φ0), ω3): |ω| constant, kth derivative ω⊥|λ|ᵏ.
template <class T>
MotionDescription<T> describe_body() {
  MotionDescription<T> d{};
  const LD lambda = std::fabs(body.body_turning_rate());
  LD p = body.transverse_rate;
  d.maneuver.derivative[0] = static_cast<T>(std::hypot(body.transverse_rate, body.axial_rate));
  for (std::size_t k = 1; k < 6; ++k) {
    p *= lambda;
    d.maneuver.derivative[k] = static_cast<T>(p);
  }
  return d;
}

}  // namespace halfspin::test::described
