// Bit-exact replay: propagates the integer-generated float gyro log (gyro_log.hpp) with every
// stepper that avoids libm and prints each step's attitude as the four IEEE single bit patterns.
// The same source is built for the Cortex-M images (tests/target/replay.cmake) and for the host
// (tests/target/host_replay.cmake); compare_replay.cmake runs both and requires identical output.
// Why bit-identical results are possible at all: IEEE 754-2008 requires +, −, ×, ÷ and √ to be
// correctly rounded, so two conforming platforms that perform the same operations in the same
// order on the same float inputs, rounding to nearest, get the same bits. sin, cos and atan2 carry
// no such requirement, and the libm implementations of newlib and glibc differ.
//
// Output lines (one per step, then one summary per configuration):
//   Q <stepper>/<renormalization> <step> <w> <x> <y> <z> <estimate>   bit patterns in hex
//   H <stepper>/<renormalization> steps <n> fnv1a <hash> elapsed <bits>
//   L ...   steps that call libm (sin, cos, atan2): printed to show whether they replay, compared
//           but not required to match
//   # ...   platform information, never compared
// The FNV-1a 64-bit hash runs over every step's bit patterns (little-endian bytes of w, x, y, z).
// The program exits non-zero if the floating-point environment is not the IEEE default (round to
// nearest, no flush to zero) or if the propagator rejected a sample.
#include <cfloat>
#include <cstdint>
#include <cstdio>
#include <cstring>

#include "gyro_log.hpp"
#include "halfspin/halfspin.hpp"

#if defined(__x86_64__) || defined(__i386__)
#include <xmmintrin.h>
#endif

// Evaluation in the declared type: no excess precision (x87 would be 2). Arm and x86-64 SSE2 are 0.
static_assert(FLT_EVAL_METHOD == 0, "replay needs float arithmetic evaluated in float");

namespace {

using halfspin::Quaternion;
using halfspin::Status;
using halfspin::Vector3;
using halfspin_replay::GyroLog;
using halfspin_replay::GyroSample;
using halfspin_replay::sample_count;
using halfspin_replay::sample_period;

int failures = 0;

std::uint32_t bits(float v) {
  std::uint32_t u;
  std::memcpy(&u, &v, sizeof u);
  return u;
}

unsigned long hex(float v) { return static_cast<unsigned long>(bits(v)); }

// One configuration's output: every step as hex, and the running FNV-1a hash.
class Trace {
 public:
  Trace(char tag, const char* stepper, const char* policy) noexcept
      : tag_(tag), stepper_(stepper), policy_(policy) {}

  void step(const Quaternion<float>& q, float estimate) noexcept {
    std::printf("%c %s/%s %d %08lx %08lx %08lx %08lx %08lx\n", tag_, stepper_, policy_, steps_,
                hex(q.w), hex(q.x), hex(q.y), hex(q.z), hex(estimate));
    mix(q.w);
    mix(q.x);
    mix(q.y);
    mix(q.z);
    ++steps_;
  }

  void vector(const Vector3<float>& v) noexcept {
    std::printf("%c %s/%s %d %08lx %08lx %08lx\n", tag_, stepper_, policy_, steps_, hex(v.x),
                hex(v.y), hex(v.z));
    mix(v.x);
    mix(v.y);
    mix(v.z);
    ++steps_;
  }

  void finish(float elapsed) noexcept {
    std::printf("%c %s/%s steps %d fnv1a %016llx elapsed %08lx\n", tag_ == 'Q' ? 'H' : tag_,
                stepper_, policy_, steps_, static_cast<unsigned long long>(hash_), hex(elapsed));
  }

  void reject(Status s) noexcept {
    std::printf("# %s/%s rejected a sample at step %d: status %d\n", stepper_, policy_, steps_,
                static_cast<int>(s));
    ++failures;
  }

 private:
  void mix(float v) noexcept {
    const std::uint32_t u = bits(v);
    for (int i = 0; i < 4; ++i) {
      hash_ ^= (u >> (8 * i)) & 0xFFu;
      hash_ *= 0x100000001B3ull;
    }
  }

  char tag_;
  const char* stepper_;
  const char* policy_;
  int steps_ = 0;
  std::uint64_t hash_ = 0xCBF29CE484222325ull;
};

const halfspin::GyroLimits<float> limits{35.0f, 0.01f};

// A stepper fed by samples (rates or delta-angles, as its layout says), one push per sample; the
// label names the renormalization policy (and a non-plain accumulation policy).
template <class Stepper, class Policy, class Accumulation = halfspin::PlainAccumulation>
void run_samples(const char* label = Policy::name) {
  halfspin::Propagator<float, Stepper, Policy, Accumulation> p(Quaternion<float>::identity(),
                                                               limits);
  Trace trace('Q', Stepper::name, label);
  GyroLog log;
  for (int k = 0; k < sample_count; ++k) {
    const GyroSample s = log.next();
    const Vector3<float>& input =
        halfspin::carries_delta_angles(Stepper::layout) ? s.delta : s.rate;
    const Status status = p.push(input, sample_period);
    if (status == Status::ok) {
      trace.step(p.attitude(), p.last_error_estimate());
    } else if (status != Status::waiting_for_samples) {
      trace.reject(status);
    }
  }
  trace.finish(p.elapsed_seconds());
}

// A rate-function stepper: one step per sample period, the rate interpolated linearly between the
// samples at its ends (pure arithmetic, so it replays like the samples themselves).
template <class Stepper, class Policy, class Accumulation = halfspin::PlainAccumulation>
void run_rate_function(const char* label = Policy::name) {
  halfspin::Propagator<float, Stepper, Policy, Accumulation> p(Quaternion<float>::identity(),
                                                               limits);
  Trace trace('Q', Stepper::name, label);
  GyroLog log;
  Vector3<float> start = log.next().rate;
  for (int k = 1; k < sample_count; ++k) {
    const Vector3<float> end = log.next().rate;
    const auto rate_at = [&start, &end](float tau) noexcept {
      return start + (tau * halfspin_replay::sample_rate) * (end - start);
    };
    const Status status = p.advance(rate_at, sample_period);
    if (status == Status::ok) {
      trace.step(p.attitude(), p.last_error_estimate());
    } else {
      trace.reject(status);
    }
    start = end;
  }
  trace.finish(p.elapsed_seconds());
}

// The gyro calibration stage (gyro_calibration.hpp) with invented parameters: a temperature set
// before the first sample and changed half-way through the log, so that b(T) is recomputed and
// both biases replay. Rate, delta-angle and rate-function steppers (the rate function is
// calibrated per evaluated rate).
halfspin::GyroCalibrationParameters<float> replay_calibration() {
  halfspin::GyroCalibrationParameters<float> p;
  p.scale_misalignment = {
      {{1.0123f, 0.0037f, -0.0021f}, {-0.0044f, 0.9911f, 0.0029f}, {0.0018f, -0.0052f, 1.0064f}}};
  p.bias = {0.0031f, -0.0017f, 0.0026f};
  p.bias_slope = {2.5e-5f, -1.75e-5f, 3.25e-5f};
  p.reference_temperature = 25.0f;
  p.min_temperature = -40.0f;
  p.max_temperature = 85.0f;
  return p;
}

template <class Stepper, class Accumulation = halfspin::PlainAccumulation>
void run_calibrated(const char* label) {
  const halfspin::GyroCalibration<float> stage(replay_calibration());
  if (!stage.valid()) {
    std::printf("# %s/%s: invalid calibration (%s)\n", Stepper::name, label,
                halfspin::calibration_check_name(stage.check()));
    ++failures;
  }
  halfspin::CalibratedPropagator<float, Stepper, halfspin::FirstOrderRenormalization, Accumulation>
      p(Quaternion<float>::identity(), limits, stage);
  Trace trace('Q', Stepper::name, label);
  const auto temperature = [&](float celsius) {
    const Status status = p.set_temperature(celsius);
    if (status != Status::ok) {
      trace.reject(status);
    }
  };
  temperature(31.3f);
  GyroLog log;
  Vector3<float> start{};
  for (int k = 0; k < sample_count; ++k) {
    if (k == sample_count / 2) {
      temperature(38.7f);
    }
    const GyroSample s = log.next();
    Status status;
    if constexpr (Stepper::layout == halfspin::SampleLayout::rate_function) {
      if (k == 0) {  // the first sample only starts the first interval
        start = s.rate;
        continue;
      }
      const Vector3<float> end = s.rate;
      const auto rate_at = [&start, &end](float tau) noexcept {
        return start + (tau * halfspin_replay::sample_rate) * (end - start);
      };
      status = p.advance(rate_at, sample_period);
      start = end;
    } else {
      status =
          p.push(halfspin::carries_delta_angles(Stepper::layout) ? s.delta : s.rate, sample_period);
    }
    if (status == Status::ok) {
      trace.step(p.attitude(), p.last_error_estimate());
    } else if (status != Status::waiting_for_samples) {
      trace.reject(status);
    }
  }
  trace.finish(p.elapsed_seconds());
}

// The two-speed arrangement: delta-angles accumulated at the sample rate, the attitude updated
// every fourth one, first-order renormalization after each update.
void run_two_speed() {
  halfspin::TwoSpeedAccumulator<float> accumulator(4);
  halfspin::FirstOrderRenormalization policy;
  Quaternion<float> q = Quaternion<float>::identity();
  Trace trace('Q', "two_speed_ratio_4", policy.name);
  GyroLog log;
  for (int k = 0; k < sample_count; ++k) {
    if (accumulator.add(log.next().delta)) {
      q = policy.apply(halfspin::two_speed_update(q, accumulator.take()));
      trace.step(q, 0.0f);
    }
  }
  trace.finish(0.0f);
}

// Counter-example 1: the exponential-map step with 1 s steps, so |φ|² mostly exceeds the series
// threshold and quaternion_exp calls sqrt, cos and sin (libm: newlib on the target, glibc on the
// host).
void run_libm_exponential() {
  halfspin::Propagator<float, halfspin::ExponentialMapHoldEnd, halfspin::ExactRenormalization> p(
      Quaternion<float>::identity(), halfspin::GyroLimits<float>{35.0f, 2.0f});
  Trace trace('L', "exponential_map_hold_end_1s_steps", "exact");
  GyroLog log;
  int libm_steps = 0;
  for (int k = 0; k < sample_count; ++k) {
    const Vector3<float> rate = log.next().rate;
    libm_steps +=
        halfspin::squared_norm(rate) >= halfspin::ScalarTraits<float>::exp_series_angle_squared ? 1
                                                                                                : 0;
    const Status status = p.push(rate, 1.0f);
    if (status == Status::ok) {
      trace.step(p.attitude(), 0.0f);
    } else {
      trace.reject(status);
    }
  }
  trace.finish(p.elapsed_seconds());
  std::printf("# exponential_map_hold_end_1s_steps: %d of %d steps on the sin/cos branch\n",
              libm_steps, sample_count);
}

// Counter-example 2: the same exponential maps one by one (each sample's rate over 1 s, no
// accumulation), so each differing line is one call whose sin or cos rounded differently.
void run_libm_exponential_calls() {
  Trace trace('L', "quaternion_exp_of_rate_times_1s", "none");
  GyroLog log;
  for (int k = 0; k < sample_count; ++k) {
    const Vector3<float> phi = log.next().rate;
    if (halfspin::squared_norm(phi) >= halfspin::ScalarTraits<float>::exp_series_angle_squared) {
      trace.step(halfspin::quaternion_exp(phi), 0.0f);
    }
  }
  trace.finish(0.0f);
}

// Counter-example 3: the logarithm map (atan2 above its series threshold) of each attitude of a
// replaying propagation.
void run_libm_logarithm() {
  halfspin::Propagator<float, halfspin::ExponentialMapMidpointMean, halfspin::ExactRenormalization>
      p(Quaternion<float>::identity(), limits);
  Trace trace('L', "log_of_exponential_map_midpoint_mean", "exact");
  GyroLog log;
  for (int k = 0; k < sample_count; ++k) {
    const Status status = p.push(log.next().rate, sample_period);
    if (status == Status::ok) {
      trace.vector(halfspin::quaternion_log(p.attitude()));
    } else if (status != Status::waiting_for_samples) {
      trace.reject(status);
    }
  }
  trace.finish(p.elapsed_seconds());
}

// Whether this translation unit fuses a·b + c (informational: the comparison is the test).
// (1 + 2^-23)² = 1 + 2^-22 + 2^-46: rounded product minus 1 + 2^-22 is 0, fused it is 2^-46.
volatile float probe_a = 1.0f + FLT_EPSILON;
volatile float probe_c = -(1.0f + 2.0f * FLT_EPSILON);
const char* contraction_probe() {
  const float a = probe_a;
  const float c = probe_c;
  return a * a + c == 0.0f ? "separate multiply and add" : "FUSED multiply-add";
}

// Checks the floating-point environment the replay assumes: round to nearest, denormals kept.
bool check_environment() {
  std::printf("# float evaluation method %d, a*a+c: %s\n", static_cast<int>(FLT_EVAL_METHOD),
              contraction_probe());
#if defined(__ARM_FP)
  std::uint32_t fpscr;
  __asm volatile("vmrs %0, fpscr" : "=r"(fpscr));
  std::printf("# Arm hard float, FPSCR %08lx (rounding mode %lu, flush-to-zero %lu)\n",
              static_cast<unsigned long>(fpscr), static_cast<unsigned long>((fpscr >> 22) & 3u),
              static_cast<unsigned long>((fpscr >> 24) & 1u));
  return ((fpscr >> 22) & 3u) == 0 && ((fpscr >> 24) & 1u) == 0;
#elif defined(__arm__)
  std::printf("# Arm soft float (libgcc single-precision routines, round to nearest)\n");
  return true;
#elif defined(__x86_64__) || defined(__i386__)
  const unsigned csr = _mm_getcsr();
  std::printf("# x86 SSE, MXCSR %08x (rounding mode %u, flush-to-zero %u, denormals-are-zero %u)\n",
              csr, (csr >> 13) & 3u, (csr >> 15) & 1u, (csr >> 6) & 1u);
  return ((csr >> 13) & 3u) == 0 && ((csr >> 15) & 1u) == 0 && ((csr >> 6) & 1u) == 0;
#else
  std::printf("# unknown platform: environment not checked\n");
  return false;
#endif
}

}  // namespace

int main() {
  using namespace halfspin;
  std::printf("# halfspin bit-exact replay, %d samples\n", sample_count);
  if (!check_environment()) {
    std::printf("# floating-point environment is not the IEEE default\n");
    ++failures;
  }

  // Every catalogued stepper with the default first-order renormalization (a stepper added to
  // the catalogue is replayed without another list), then the other policies on a few.
  StepperCatalogue::for_each([](auto entry) {
    using S = typename decltype(entry)::stepper;
    if constexpr (S::layout == SampleLayout::rate_function) {
      run_rate_function<S, FirstOrderRenormalization>();
    } else {
      run_samples<S, FirstOrderRenormalization>();
    }
  });
  run_samples<ExponentialMapHoldEnd, ExactRenormalization>();
  run_samples<ExponentialMapMidpointMean, ExactRenormalization>();
  run_samples<RungeKutta4Sampled, ExactRenormalization>();
  run_samples<RungeKutta4Sampled, NoRenormalization>();
  run_samples<MuntheKaas4Sampled, NoRenormalization>();
  run_samples<MuntheKaas4Sampled, ExactRenormalization>();
  run_samples<Magnus4, ExactRenormalization>();
  run_samples<Coning2Sample, ExactRenormalization>();
  run_two_speed();
  run_rate_function<MuntheKaas4RateFunction, NoRenormalization>();
  run_rate_function<DormandPrince54RateFunction, ExactRenormalization>();
  // The compensated accumulation (compensated_accumulation.hpp): TwoSum and Fast2Sum are exact,
  // and so bit-identical on host and target, only without contraction into fused multiply-adds
  // and without -ffast-math; these configurations hold both builds to that.
  using halfspin::CompensatedAccumulation;
  run_samples<ExponentialMapHoldEnd, FirstOrderRenormalization, CompensatedAccumulation>(
      "first_order+compensated");
  run_samples<Coning2Sample, FirstOrderRenormalization, CompensatedAccumulation>(
      "first_order+compensated");
  run_samples<Coning3Sample, ExactRenormalization, CompensatedAccumulation>("exact+compensated");
  run_samples<MuntheKaas4Sampled, NoRenormalization, CompensatedAccumulation>("none+compensated");
  run_samples<CommutatorFree4, FirstOrderRenormalization, CompensatedAccumulation>(
      "first_order+compensated");
  run_rate_function<RungeKutta4RateFunction, FirstOrderRenormalization, CompensatedAccumulation>(
      "first_order+compensated");

  // The calibration stage: M·(ω − b(T)) and M·(Δθ − b(T)·dt) are products and sums, and b(T)
  // one product and two sums, so they replay like the steps.
  run_calibrated<ExponentialMapHoldEnd>("first_order+calibrated");
  run_calibrated<RungeKutta4Sampled>("first_order+calibrated");
  run_calibrated<Coning2Sample>("first_order+calibrated");
  run_calibrated<Coning2Sample, CompensatedAccumulation>("first_order+compensated+calibrated");
  run_calibrated<RungeKutta4RateFunction>("first_order+calibrated");

  run_libm_exponential();
  run_libm_exponential_calls();
  run_libm_logarithm();

  std::printf("E end of replay\n");
  std::printf("# %d failure(s)\n", failures);
  return failures == 0 ? 0 : 1;
}
