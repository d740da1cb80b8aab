// One minimal image per stepper for the footprint table, the hygiene checks and the cycle
// estimates (tests/target/footprint.cmake builds it once per stepper, scalar and mode). No printf:
// the image holds the halfspin code, the startup file and only the libm/libgcc helpers that code
// really needs, so what the linker pulls in is what a firmware build would pay.
//
// Selected by compile definitions (one translation unit, many images):
//   HALFSPIN_FOOTPRINT_STEPPER    a stepper type, e.g. halfspin::Magnus4
//   HALFSPIN_FOOTPRINT_SCALAR     float or double
//   HALFSPIN_FOOTPRINT_STEP_ONLY  1: only the stepper's step function (stepper cost alone);
//                                 0: samples pushed through a Propagator (stepper + propagator)
//   HALFSPIN_FOOTPRINT_ACCUMULATION  optional, an accumulation policy (default
//                                 halfspin::PlainAccumulation); with another one the step image
//                                 steps that policy's state (increment + accumulation) and the
//                                 propagator image uses it
//   HALFSPIN_FOOTPRINT_CALIBRATION  optional, 1: the propagator image holds the gyro calibration
//                                 stage (gyro_calibration.hpp) with invented parameters
//
// The halfspin code sits in one non-inlined extern "C" function per image
// (halfspin_footprint_push, halfspin_footprint_advance or halfspin_footprint_step), so that
// `nm --size-sort` attributes its flash and bench/target/cycle_estimate.py finds the step function
// in the disassembly. Inputs come from volatile arrays and the result goes to a volatile output,
// so the compiler can neither fold the computation away nor specialize it to the input values.
#include <array>
#include <cstddef>
#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/gyro_calibration.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

#if !defined(HALFSPIN_FOOTPRINT_ACCUMULATION)
#define HALFSPIN_FOOTPRINT_ACCUMULATION halfspin::PlainAccumulation
#endif

#if !defined(HALFSPIN_FOOTPRINT_CALIBRATION)
#define HALFSPIN_FOOTPRINT_CALIBRATION 0
#endif

#if !defined(HALFSPIN_FOOTPRINT_STEPPER) || !defined(HALFSPIN_FOOTPRINT_SCALAR) || \
    !defined(HALFSPIN_FOOTPRINT_STEP_ONLY)
#error "footprint.cmake sets HALFSPIN_FOOTPRINT_STEPPER, _SCALAR and _STEP_ONLY"
#endif

namespace {

using Stepper = HALFSPIN_FOOTPRINT_STEPPER;
using Accumulation = HALFSPIN_FOOTPRINT_ACCUMULATION;
using T = HALFSPIN_FOOTPRINT_SCALAR;
using Vec = halfspin::Vector3<T>;
using Quat = halfspin::Quaternion<T>;

constexpr bool step_only = HALFSPIN_FOOTPRINT_STEP_ONLY != 0;
constexpr bool rate_function = Stepper::layout == halfspin::SampleLayout::rate_function;
constexpr bool delta_angles = halfspin::carries_delta_angles(Stepper::layout);
constexpr std::size_t input_count = 4;

// A trivial analytic rate, ω(τ) = a + b·τ (rad/s, τ in s from step start), for the steppers whose
// stages fall between samples.
struct LinearRate {
  Vec a;
  Vec b;
  Vec operator()(T tau) const noexcept { return a + tau * b; }
};

}  // namespace

// Invented input, rad/s (scaled by dt for delta-angle steppers): a slow tumble, nothing measured.
extern "C" {
volatile T halfspin_footprint_input[input_count][3] = {{T(0.10), T(-0.20), T(0.30)},
                                                       {T(0.12), T(-0.18), T(0.31)},
                                                       {T(0.14), T(-0.16), T(0.29)},
                                                       {T(0.13), T(-0.19), T(0.28)}};
volatile T halfspin_footprint_dt = T(0.001);        // s
volatile unsigned halfspin_footprint_repeat = 256;  // passes over the input (cycle measurements)
volatile T halfspin_footprint_output[4];
}

namespace {

Vec read_sample(std::size_t k) noexcept {
  const T scale = delta_angles ? T(halfspin_footprint_dt) : T(1);
  return Vec{halfspin_footprint_input[k][0] * scale, halfspin_footprint_input[k][1] * scale,
             halfspin_footprint_input[k][2] * scale};
}

void write_output(const Quat& q) noexcept {
  halfspin_footprint_output[0] = q.w;
  halfspin_footprint_output[1] = q.x;
  halfspin_footprint_output[2] = q.y;
  halfspin_footprint_output[3] = q.z;
}

}  // namespace

#if HALFSPIN_FOOTPRINT_STEP_ONLY

// The stepper alone: one step from q with the given input. For rate-function steppers the input
// holds a and b of the linear rate in its first two entries.
using StepInput = std::array<Vec, rate_function ? 2 : Stepper::window>;

namespace {
// A template, so that only the branch for the stepper's layout is instantiated.
template <class S>
Quat step_once(const Quat& q, const StepInput& input, T dt) noexcept {
  if constexpr (S::layout == halfspin::SampleLayout::rate_function) {
    return S::step(q, LinearRate{input[0], input[1]}, dt);
  } else {
    return S::template step<T>(q, input, dt);
  }
}
}  // namespace

template <class S>
halfspin::Increment<T> increment_once(const StepInput& input, T dt) noexcept {
  if constexpr (S::layout == halfspin::SampleLayout::rate_function) {
    return S::increment(LinearRate{input[0], input[1]}, dt);
  } else {
    return S::template increment<T>(input, dt);
  }
}

// The plain step keeps its own signature (q in, q out: the README's cycle figures); another
// accumulation policy steps its state: the stepper's increment, then the policy's accumulation.
// (Templates, so that only the branch for the policy is instantiated.)
template <class A, bool Plain = std::is_same<A, halfspin::PlainAccumulation>::value>
struct Stepping {
  using State = Quat;
  static State start() noexcept { return Quat::identity(); }
  static State advanced(const State& q, const StepInput& input, T dt) noexcept {
    return step_once<Stepper>(q, input, dt);
  }
  static Quat attitude(const State& q) noexcept { return q; }
};
template <class A>
struct Stepping<A, false> {
  using State = typename A::template State<T>;
  static State start() noexcept { return A::start(Quat::identity()); }
  static State advanced(const State& s, const StepInput& input, T dt) noexcept {
    return A::advanced(s, increment_once<Stepper>(input, dt).delta);
  }
  static Quat attitude(const State& s) noexcept { return A::attitude(s); }
};
using Steps = Stepping<Accumulation>;
using State = Steps::State;

extern "C" __attribute__((noinline)) State halfspin_footprint_step(const State& s,
                                                                   const StepInput& input,
                                                                   T dt) noexcept {
  return Steps::advanced(s, input, dt);
}

int main() {
  State s = Steps::start();
  const unsigned repeat = halfspin_footprint_repeat;
  for (unsigned r = 0; r < repeat; ++r) {
    StepInput input{};
    for (std::size_t i = 0; i < input.size(); ++i) {
      input[i] = read_sample(i % input_count);
    }
    s = halfspin_footprint_step(s, input, T(halfspin_footprint_dt));
  }
  write_output(Steps::attitude(s));
  return 0;
}

#else

namespace {
using Calibration = std::conditional_t<HALFSPIN_FOOTPRINT_CALIBRATION != 0,
                                       halfspin::GyroCalibration<T>, halfspin::NoCalibration>;
using Propagator = halfspin::Propagator<T, Stepper, halfspin::FirstOrderRenormalization,
                                        Accumulation, Calibration>;
#if HALFSPIN_FOOTPRINT_CALIBRATION
constexpr halfspin::GyroLimits<T> limits{T(35), T(0.01)};

// Invented calibration: scale factors and misalignments of a few parts per thousand to per cent,
// a bias of a few mrad/s with a slope of tens of µrad/s per °C; nothing measured.
halfspin::GyroCalibrationParameters<T> invented_calibration() noexcept {
  halfspin::GyroCalibrationParameters<T> p;
  p.scale_misalignment = {{{T(1.012), T(0.0031), T(-0.0024)},
                           {T(-0.0017), T(0.994), T(0.0042)},
                           {T(0.0026), T(-0.0035), T(1.007)}}};
  p.bias = {T(0.0021), T(-0.0013), T(0.0034)};
  p.bias_slope = {T(2.0e-5), T(-1.5e-5), T(3.5e-5)};
  p.reference_temperature = T(25);
  p.min_temperature = T(-40);
  p.max_temperature = T(85);
  return p;
}
#endif
}  // namespace

// The propagator object lives in .bss/.data (not on the stack) so that its size shows up as a
// symbol of its own in the RAM column.
extern "C" {
#if HALFSPIN_FOOTPRINT_CALIBRATION
Propagator halfspin_footprint_propagator(Quat::identity(), limits,
                                         halfspin::GyroCalibration<T>(invented_calibration()));
#else
Propagator halfspin_footprint_propagator(Quat::identity(), halfspin::GyroLimits<T>{T(35), T(0.01)});
#endif
}

namespace {
// A template, so that only the entry point for the stepper's layout is instantiated.
template <class S>
halfspin::Status push_once(
    halfspin::Propagator<T, S, halfspin::FirstOrderRenormalization, Accumulation, Calibration>& p,
    const Vec& sample, T dt) noexcept {
  if constexpr (S::layout == halfspin::SampleLayout::rate_function) {
    // Rate-function steppers take a callable instead of samples: a = the sample, b = −a/2.
    return p.advance(LinearRate{sample, T(-0.5) * sample}, dt);
  } else {
    return p.push(sample, dt);
  }
}
}  // namespace

extern "C" __attribute__((noinline)) halfspin::Status halfspin_footprint_push(const Vec& sample,
                                                                              T dt) noexcept {
  return push_once(halfspin_footprint_propagator, sample, dt);
}

int main() {
  const unsigned repeat = halfspin_footprint_repeat;
  unsigned rejected = 0;
#if HALFSPIN_FOOTPRINT_CALIBRATION
  // A temperature within the calibrated range (°C), set once as firmware would between samples.
  rejected +=
      halfspin::is_rejection(halfspin_footprint_propagator.set_temperature(T(41.5))) ? 1u : 0u;
  rejected += halfspin_footprint_propagator.calibration().valid() ? 0u : 1u;
#endif
  for (unsigned r = 0; r < repeat; ++r) {
    for (std::size_t k = 0; k < input_count; ++k) {
      const halfspin::Status s = halfspin_footprint_push(read_sample(k), T(halfspin_footprint_dt));
      rejected += halfspin::is_rejection(s) ? 1u : 0u;
    }
  }
  write_output(halfspin_footprint_propagator.attitude());
  return rejected == 0 ? 0 : 1;
}

#endif
