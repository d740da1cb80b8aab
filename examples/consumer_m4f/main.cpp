// A firmware consumer of the installed halfspin package on the Cortex-M4F (qemu mps2-an386): see
// docs/cross-compiling.md for the commands that install the package, cross-compile this project
// and run it.
//
// Invented scenario: an airframe bolted at a tilt on a rate table that turns at a constant
// 0.7 rad/s; its gyro delivers 1 kHz delta-angles for 10 s. The attitude is propagated in float
// with the two-sample coning algorithm and compared, in double, with the exact attitude of the
// samples the gyro delivered: for a constant body rate, exp(φ/2) with φ the sum of the samples
// (truth/constant_rate.hpp's closed form). The coning algorithm is exact for a constant rate
// (the two samples of a step are parallel, so the coning term vanishes), so what is left is
// rounding, and the budget is the library's worst-case roundoff floor for these steps
// (bounds/roundoff_floor.hpp). main returns 0 only if every sample was accepted and the error is
// within that bound; the board's startup code makes main's value qemu's exit status.
#include <cstdint>
#include <cstdio>

#include <halfspin/halfspin.hpp>

namespace {

using halfspin::Quaternion;
using halfspin::Vector3;

// The library's defaults for float: first-order renormalization, compensated accumulation.
using AttitudePropagator = halfspin::Propagator<float, halfspin::Coning2Sample>;

constexpr std::int64_t sample_count = 10000;  // 10 s at 1 kHz
constexpr float sample_interval = 1e-3f;      // s

Quaternion<double> widened(const Quaternion<float>& q) {
  return {static_cast<double>(q.w), static_cast<double>(q.x), static_cast<double>(q.y),
          static_cast<double>(q.z)};
}

}  // namespace

int main() {
  // The table's rate in the airframe's body axes (rad/s), invented; its norm is 0.7 rad/s.
  const Vector3<float> body_rate{0.3f, -0.2f, 0.6f};
  const Vector3<float> delta_angle = body_rate * sample_interval;  // rad, as the gyro rounds it

  // A 2000 °/s gyro (35 rad/s full scale); intervals above 5 ms are gaps.
  AttitudePropagator propagator(Quaternion<float>::identity(),
                                halfspin::GyroLimits<float>{35.0f, 5e-3f});
  std::int64_t rejected = 0;
  for (std::int64_t k = 0; k < sample_count; ++k) {
    if (halfspin::is_rejection(propagator.push(delta_angle, sample_interval))) {
      ++rejected;
    }
  }

  // Exact attitude of these samples: constant rate, so q = exp(φ/2), φ = N·Δθ (in double, from
  // the float samples themselves, so the gyro's rounding of ω·dt is not counted as an error).
  const Vector3<double> delta_angle_exact{static_cast<double>(delta_angle.x),
                                          static_cast<double>(delta_angle.y),
                                          static_cast<double>(delta_angle.z)};
  const halfspin::ConstantRateMotion<double> truth_motion{Quaternion<double>::identity(),
                                                          delta_angle_exact};
  const Quaternion<double> truth = truth_motion.attitude(static_cast<double>(sample_count));
  const Quaternion<float> attitude = propagator.attitude();
  const double error = halfspin::angle_between(widened(attitude), truth);

  // Each step takes two samples: a rotation of at most 2·|Δθ| per step.
  const float step_angle = 2.0f * halfspin::norm(delta_angle);
  const double bound =
      static_cast<double>(halfspin::roundoff_floor_worst<AttitudePropagator::stepper, float,
                                                         AttitudePropagator::accumulation>(
          step_angle, sample_count / 2));

  std::printf("attitude (w x y z)  %.7f %.7f %.7f %.7f\n", static_cast<double>(attitude.w),
              static_cast<double>(attitude.x), static_cast<double>(attitude.y),
              static_cast<double>(attitude.z));
  std::printf("exact    (w x y z)  %.7f %.7f %.7f %.7f\n", truth.w, truth.x, truth.y, truth.z);
  std::printf("samples %lld, rejected %lld\n", static_cast<long long>(sample_count),
              static_cast<long long>(rejected));
  const bool ok = rejected == 0 && error <= bound;
  std::printf("error %.3e rad, roundoff bound %.3e rad: %s\n", error, bound, ok ? "ok" : "FAILED");
  return ok ? 0 : 1;
}
