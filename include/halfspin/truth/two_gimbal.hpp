#pragma once
/// @file
/// Truth motion: two gimbals. An outer gimbal about reference z swings and drifts, an inner gimbal
/// about the outer gimbal's x oscillates at another frequency:
///     q(t) = exp(α(t)·ẑ/2) ⊗ exp(β(t)·x̂/2),
///     α(t) = A sin(2π f_a t) + drift·t,   β(t) = B sin(2π f_b t + phase),
/// and the body rate ω = 2 q* ⊗ q̇ = R(exp(β x̂/2))ᵀ·α̇ ẑ + β̇ x̂. The rate turns in direction AND
/// changes in magnitude with no symmetry, unlike coning or the axisymmetric body (both keep |ω|
/// constant): the generic case for measuring orders. Evaluate in double or long double.

#include <cmath>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Two gimbals (see the file comment).
template <class T>
struct TwoGimbalMotion {
  T outer_amplitude{T(0.8)};  ///< A, rad
  T outer_frequency{T(1)};    ///< f_a, Hz
  T outer_drift{T(0.5)};      ///< rad/s
  T inner_amplitude{T(0.6)};  ///< B, rad
  T inner_frequency{T(3)};    ///< f_b, Hz
  T inner_phase{T(0.3)};      ///< rad

  /// Outer gimbal angle α (rad) and its rate (rad/s) at t (s).
  T outer_angle(T t) const noexcept {
    return outer_amplitude * std::sin(T(2) * pi<T> * outer_frequency * t) + outer_drift * t;
  }
  /// Outer gimbal rate (rad/s) at t (s).
  T outer_rate(T t) const noexcept {
    const T w = T(2) * pi<T> * outer_frequency;
    return outer_amplitude * w * std::cos(w * t) + outer_drift;
  }
  /// Inner gimbal angle β (rad) and its rate (rad/s) at t (s).
  T inner_angle(T t) const noexcept {
    return inner_amplitude * std::sin(T(2) * pi<T> * inner_frequency * t + inner_phase);
  }
  /// Inner gimbal rate (rad/s) at t (s).
  T inner_rate(T t) const noexcept {
    const T w = T(2) * pi<T> * inner_frequency;
    return inner_amplitude * w * std::cos(w * t + inner_phase);
  }
  /// Attitude (body → reference) at t (s).
  Quaternion<T> attitude(T t) const noexcept {
    return quaternion_exp(Vector3<T>{T(0), T(0), outer_angle(t)}) *
           quaternion_exp(Vector3<T>{inner_angle(t), T(0), T(0)});
  }
  /// Body rate (rad/s) at t (s).
  Vector3<T> rate(T t) const noexcept {
    const Quaternion<T> inner = quaternion_exp(Vector3<T>{inner_angle(t), T(0), T(0)});
    return rotate(conjugate(inner), Vector3<T>{T(0), T(0), outer_rate(t)}) +
           Vector3<T>{inner_rate(t), T(0), T(0)};
  }
};

}  // namespace halfspin
