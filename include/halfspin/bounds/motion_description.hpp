#pragma once
// Motion descriptions: what the firmware engineer knows about the rates the gyro will see, in the
// form the error bounds need.
//
// RateEnvelope: bounds D_k ≥ max over the flight of ‖dᵏω/dtᵏ‖ (rad/s^(k+1)), k = 0..5. The
// issue's minimum is D0 (max rate), D1 (max angular acceleration), D2; higher derivatives are
// needed only by higher-order steppers, and an unknown one is +∞ (a bound that needs it is then
// +∞: we do not guess). Sinusoidal parts (vibration, coning) know all their derivatives.
//
// VibrationSpec: up to three sinusoidal rate components ω_i(t) = a_i ⊙ sin(2π f_i t + phase),
// amplitude a_i per body axis (rad/s). Its derivative bounds: ‖dᵏω_i/dtᵏ‖ ≤ ‖a_i‖·(2πf_i)ᵏ.
//
// ConingSpec: classical coning of half-angle a at frequency f (truth/classical_coning.hpp): body
// rate (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt), Ω = 2πf; ‖ω‖ = 2Ω sin(a/2) and
// ‖dᵏω/dtᵏ‖ = Ωᵏ⁺¹ sin a for k ≥ 1.
//
// MotionDescription combines a maneuver envelope, vibration and coning. Its envelope() adds the
// parts' derivative bounds (the triangle inequality: safe for any superposition).

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

template <class T>
struct RateEnvelope {
  // D_k for k = 0..5 (rad/s^(k+1)); +∞ where unknown.
  std::array<T, 6> derivative{
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity(),
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity(),
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity()};

  // From max ‖ω‖ (rad/s), max ‖ω̇‖ (rad/s²), max ‖ω̈‖ (rad/s³); higher derivatives unknown.
  static constexpr RateEnvelope from_rate_bounds(T max_rate, T max_rate_derivative,
                                                 T max_second_derivative) noexcept {
    RateEnvelope e{};
    e.derivative[0] = max_rate;
    e.derivative[1] = max_rate_derivative;
    e.derivative[2] = max_second_derivative;
    return e;
  }
  // A constant rate of magnitude |ω| (rad/s): every derivative is zero.
  static constexpr RateEnvelope constant_rate(T rate) noexcept {
    return {{rate, T(0), T(0), T(0), T(0), T(0)}};
  }
  // No motion at all (the neutral element of +).
  static constexpr RateEnvelope none() noexcept { return {{T(0), T(0), T(0), T(0), T(0), T(0)}}; }
  // D_k (rad/s^(k+1)).
  constexpr T operator[](std::size_t k) const noexcept { return derivative[k]; }
};

// Sum of envelopes: bounds for the sum of two rate signals.
template <class T>
constexpr RateEnvelope<T> operator+(const RateEnvelope<T>& a, const RateEnvelope<T>& b) noexcept {
  RateEnvelope<T> r{};
  for (std::size_t k = 0; k < 6; ++k) {
    r.derivative[k] = a.derivative[k] + b.derivative[k];
  }
  return r;
}

// One sinusoidal rate component: amplitude per body axis (rad/s) at frequency_hz (Hz).
template <class T>
struct SinusoidalRate {
  Vector3<T> amplitude{};
  T frequency_hz{};

  // Derivative bounds ‖a‖·(2πf)ᵏ.
  RateEnvelope<T> envelope() const noexcept {
    const T a = norm(amplitude);
    const T w = T(2) * pi<T> * frequency_hz;
    RateEnvelope<T> e{};
    T p = a;
    for (std::size_t k = 0; k < 6; ++k) {
      e.derivative[k] = p;
      p *= w;
    }
    return e;
  }
};

// Up to three sinusoidal components (per-axis vibration of an engine, a rotor, a structure mode).
template <class T>
struct VibrationSpec {
  std::array<SinusoidalRate<T>, 3> component{};
  std::size_t count = 0;

  RateEnvelope<T> envelope() const noexcept {
    RateEnvelope<T> e = RateEnvelope<T>::none();
    for (std::size_t i = 0; i < count; ++i) {
      e = e + component[i].envelope();
    }
    return e;
  }
};

// Classical coning: half-angle (rad) and frequency (Hz).
template <class T>
struct ConingSpec {
  T half_angle{};
  T frequency_hz{};

  // Ω = 2πf (rad/s).
  T angular_frequency() const noexcept { return T(2) * pi<T> * frequency_hz; }
  // Exact derivative bounds of the classical coning rate.
  RateEnvelope<T> envelope() const noexcept {
    const T w = angular_frequency();
    RateEnvelope<T> e{};
    e.derivative[0] = T(2) * w * std::sin(T(0.5) * half_angle);
    T p = w * w * std::sin(half_angle);
    for (std::size_t k = 1; k < 6; ++k) {
      e.derivative[k] = p;
      p *= w;
    }
    return e;
  }
};

// What the bounds take: a maneuver envelope plus vibration plus coning, any part possibly empty.
template <class T>
struct MotionDescription {
  RateEnvelope<T> maneuver = RateEnvelope<T>::none();
  VibrationSpec<T> vibration{};
  ConingSpec<T> coning{};

  // True when the motion is pure classical coning (no maneuver, no vibration): the bounds then
  // use the exact per-step error of coning, which is the same at every step.
  bool is_pure_coning() const noexcept {
    bool quiet = vibration.count == 0;
    for (std::size_t k = 0; k < 6; ++k) {
      quiet = quiet && maneuver.derivative[k] == T(0);
    }
    return quiet && coning.half_angle != T(0) && coning.frequency_hz != T(0);
  }
  // Derivative bounds of the whole motion (sum of the parts').
  RateEnvelope<T> envelope() const noexcept {
    RateEnvelope<T> e = maneuver + vibration.envelope();
    if (coning.half_angle != T(0) && coning.frequency_hz != T(0)) {
      e = e + coning.envelope();
    }
    return e;
  }
};

}  // namespace halfspin
