#pragma once
/// @file
/// The exponential-map step with the rate held over the step (zero-order hold):
///     q(t + dt) = q(t) ⊗ exp(ω̄ dt / 2),
/// exact when the body rate is constant over the step. For a time-varying rate the local error is
/// the difference between ω̄·dt and the true rotation vector of the step (quadrature error plus the
/// non-commutativity, or coning, term): O(dt²) per step with ω̄ at one end (global order 1), O(dt³)
/// per step with ω̄ at mid-step (global order 2).
///
/// Each is a RotationVectorRule (rotation_vector_family.hpp), from which its order, flops and
/// bound are derived: quadrature weights, no commutator term. Cost (series branch of
/// quaternion_exp_minus_one, |ω̄ dt|² below ScalarTraits::exp_series_angle_squared, the usual case
/// for a gyro step): scaling ω·dt 3, exp(φ/2) − 1 19, plain application 32 → 54 flops; the mean of
/// two samples costs 4 more. Above the threshold add a square root, a division and two sines.
/// Memory: none beyond the input window.

#include <cstddef>

#include "halfspin/propagation/rotation_vector_family.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The rules: which sample is held, or how the two end samples are averaged.
namespace rotation_vector_rules {
/// The rate at the end of the step held over it: rectangle rule, degree 0.
struct HoldEnd {
  /// The rule's data.
  static constexpr RotationVectorRule<1> value{SampleLayout::rate_at_end, {{1}}, 1, {{}, 1}};
};
/// The rate at the start held over it (the end sample read only to close the step).
struct HoldStart {
  /// The rule's data.
  static constexpr RotationVectorRule<2> value{SampleLayout::rates_spanning, {{1, 0}}, 1, {{0}, 1}};
};
/// The mean of the two end rates: trapezoid rule, degree 1.
struct MidpointMean {
  /// The rule's data.
  static constexpr RotationVectorRule<2> value{SampleLayout::rates_spanning, {{1, 1}}, 2, {{0}, 1}};
};
/// A real sample at mid-step: midpoint rule, degree 1; the step spans two sample periods.
struct MidpointSample {
  /// The rule's data.
  static constexpr RotationVectorRule<3> value{
      SampleLayout::rates_spanning, {{0, 1, 0}}, 1, {{0, 0}, 1}};
};
}  // namespace rotation_vector_rules

/// q ⊗ exp(ω_end·dt/2): the newest sample held back over the step. Global order 1.
struct ExponentialMapHoldEnd : RotationVectorStepper<rotation_vector_rules::HoldEnd> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "exponential_map_hold_end";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "exponential map of the rate at the step's end held over the step; 1 rate/step, order 1";
};

/// q ⊗ exp(ω_start·dt/2); rate[0] at step start, rate[1] (unused) at its end. Global order 1.
struct ExponentialMapHoldStart : RotationVectorStepper<rotation_vector_rules::HoldStart> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "exponential_map_hold_start";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "exponential map of the rate at the step's start held over the step; 1 rate/step, order 1";
};

/// q ⊗ exp((ω_start + ω_end)·dt/4): the trapezoid rule for the rotation vector. Global order 2.
/// The usual choice when only one rate sample per step arrives.
struct ExponentialMapMidpointMean : RotationVectorStepper<rotation_vector_rules::MidpointMean> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "exponential_map_midpoint_mean";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "exponential map of the mean of the two end rates (trapezoid); 1 rate/step, order 2";
};

/// q ⊗ exp(ω_mid·dt/2): the midpoint rule, samples at start, middle and end (only the middle one
/// is read). Global order 2.
struct ExponentialMapMidpointSample : RotationVectorStepper<rotation_vector_rules::MidpointSample> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "exponential_map_midpoint_sample";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "exponential map of the mid-step rate sample; 2 rates/step, order 2";
};

}  // namespace halfspin
