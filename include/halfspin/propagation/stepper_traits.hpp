#pragma once
// What every stepper declares, and how the propagator reads it.
//
// A stepper is a struct of static constexpr facts and a static, pure `step` function: it takes the
// attitude at step start, the gyro input covering the step, and the step length dt (s), and
// returns the attitude at step end. It keeps no state; the propagator owns the attitude and the
// sample history. Facts every stepper declares:
//
//   static constexpr SampleLayout layout;        // what the input array holds (below)
//   static constexpr std::size_t window;         // samples the step reads
//   static constexpr std::size_t new_samples;    // samples that arrive per step
//   static constexpr int order;                  // global order reached WITH THIS INPUT on any
//                                                //   smooth motion (the attitude, i.e. the angle
//                                                //   error, renormalized)
//   static constexpr int flops;                  // floating-point operations per step (+ − × ÷ √,
//                                                //   a libm call counted as documented in the header)
//   static constexpr const char* name;           // short identifier (tools, benchmarks)
//
// and one of
//   template <class T> static Quaternion<T> step(const Quaternion<T>& q,
//       const std::array<Vector3<T>, window>& input, T dt) noexcept;          // sample layouts
//   template <class T, class RateFunction> static Quaternion<T> step(const Quaternion<T>& q,
//       const RateFunction& rate_at, T dt) noexcept;                          // rate_function
// Runge–Kutta steppers also declare `state_order`: the order of the quaternion state including its
// norm, which can be lower than the attitude order (Kutta's RK3: state 3, attitude 4).
// Coning-compensation steppers also declare `coning_order`: the order of the attitude error under
// pure classical coning at small cone angles (2N for the N-sample algorithms), higher than `order`.
// Steppers with a cheap a-posteriori error signal also provide `step_with_estimate`, same
// arguments, returning StepOutcome<T>.
//
// The order is the order the method reaches with the input it takes: classic Runge–Kutta 4 fed
// rates interpolated linearly between samples is second order, and its header says so.

#include <array>
#include <cstddef>
#include <cstdint>
#include <type_traits>
#include <utility>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

enum class SampleLayout : std::uint8_t {
  // One body rate (rad/s) at the end of the step; the step spans one sample period.
  rate_at_end,
  // `window` body rates (rad/s) equally spaced over the step, [0] at its start and [window−1] at
  // its end; consecutive steps share the boundary sample, so new_samples = window − 1 and the
  // step spans window − 1 sample periods.
  rates_spanning,
  // `window` delta-angles (rad), each the integral of the rate over one sample period, that tile
  // the step, oldest first; new_samples = window.
  delta_angles,
  // The previous step's last delta-angle, then new_samples = window − 1 delta-angles that tile
  // the step (algorithms that use one sample of history).
  delta_angles_with_previous,
  // A callable rate_at(τ) → Vector3<T> (rad/s) for τ ∈ [0, dt] from step start: a dynamics model
  // on a desktop, for steppers whose stages fall between samples.
  rate_function
};

// Whether a layout carries delta-angles (rad) rather than rates (rad/s).
constexpr bool carries_delta_angles(SampleLayout layout) noexcept {
  return layout == SampleLayout::delta_angles || layout == SampleLayout::delta_angles_with_previous;
}

// Sample periods one step spans, given the layout and window.
constexpr std::size_t periods_per_step(SampleLayout layout, std::size_t window) noexcept {
  switch (layout) {
    case SampleLayout::rate_at_end: return 1;
    case SampleLayout::rates_spanning: return window - 1;
    case SampleLayout::delta_angles: return window;
    case SampleLayout::delta_angles_with_previous: return window - 1;
    case SampleLayout::rate_function: return 1;
  }
  return 1;
}

// A step's result where the stepper also estimates its local error (rad, an angle).
template <class T>
struct StepOutcome {
  Quaternion<T> attitude;
  T error_estimate;
};

// Detects whether Stepper offers step_with_estimate for sample inputs of scalar T.
template <class Stepper, class T, class = void>
struct has_error_estimate : std::false_type {};
template <class Stepper, class T>
struct has_error_estimate<
    Stepper, T,
    std::void_t<decltype(Stepper::template step_with_estimate<T>(
        std::declval<const Quaternion<T>&>(),
        std::declval<const std::array<Vector3<T>, Stepper::window>&>(), std::declval<T>()))>>
    : std::true_type {};

// Detects whether a rate-function Stepper offers step_with_estimate for callable F.
template <class Stepper, class T, class F, class = void>
struct has_rate_function_error_estimate : std::false_type {};
template <class Stepper, class T, class F>
struct has_rate_function_error_estimate<
    Stepper, T, F,
    std::void_t<decltype(Stepper::step_with_estimate(std::declval<const Quaternion<T>&>(),
                                                     std::declval<const F&>(), std::declval<T>()))>>
    : std::true_type {};

}  // namespace halfspin
