#pragma once
/// @file
/// Status codes returned by everything that accepts gyro input. Anything but `ok` and
/// `waiting_for_samples` is a rejection: the attitude and the sample history are left bit-for-bit
/// unchanged and the rejection is counted.

#include <cstdint>

namespace halfspin {

/// What became of one gyro sample (see the file comment).
enum class Status : std::uint8_t {
  ok,                   ///< a step was taken
  waiting_for_samples,  ///< the sample was accepted; the stepper needs more before it can step
  non_finite,           ///< NaN or infinity in a sample or in the time step
  non_positive_step,    ///< time step ≤ 0 (or zero ticks)
  step_too_long,        ///< time step above the configured maximum (a gap: missed samples)
  over_range,           ///< a rate above the gyro range, or a delta-angle implying one
  no_tick_period        ///< ticks pushed to a propagator built without a tick period (none, 0,
                        ///< negative or not finite): give it one, or push intervals in seconds
};

/// A short, stable name for logs and telemetry ("ok", "non_finite", ...).
constexpr const char* status_name(Status s) noexcept {
  switch (s) {
    case Status::ok:
      return "ok";
    case Status::waiting_for_samples:
      return "waiting_for_samples";
    case Status::non_finite:
      return "non_finite";
    case Status::non_positive_step:
      return "non_positive_step";
    case Status::step_too_long:
      return "step_too_long";
    case Status::over_range:
      return "over_range";
    case Status::no_tick_period:
      return "no_tick_period";
  }
  return "unknown";
}

/// True for the statuses that reject the input.
constexpr bool is_rejection(Status s) noexcept {
  return s != Status::ok && s != Status::waiting_for_samples;
}

}  // namespace halfspin
