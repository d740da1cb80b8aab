#pragma once
// The replay gyro log: 4096 samples of an invented motion (a banked turn: roll in, a yaw-rate
// plateau with a small pitch rate, roll out; engine vibration at three frequencies on every axis;
// a few counts of noise), generated from integer arithmetic only, so the Cortex-M image and the
// host program produce the same bits without sharing a file.
//
// Why integers: a rate is an integer count of gyro LSB (2^-13 rad/s) and the sample period is
// 2^-10 s, so the float rate count·2^-13 and the trapezoidal delta-angle (c_prev + c)·2^-24 rad
// are exact (|counts| < 2^24, scaling by a power of two). Vibration comes from integer
// "circle" oscillators (x -= e·y, y += e·x in fixed point), noise from a 32-bit xorshift: no
// floating point, no libm, nothing implementation-defined (right shifts of negative values are
// replaced by an explicit floor).
#include <array>
#include <cstddef>
#include <cstdint>

#include "halfspin/core/vector3.hpp"

namespace halfspin_replay {

inline constexpr int sample_count = 4096;
inline constexpr float rate_lsb = 1.0f / 8192.0f;             // rad/s per count, 2^-13
inline constexpr float sample_period = 1.0f / 1024.0f;        // s, 2^-10
inline constexpr float sample_rate = 1024.0f;                 // 1/s
inline constexpr float delta_angle_lsb = 1.0f / 16777216.0f;  // rad per summed count, 2^-24

// floor(a / 2^k) for either sign (a >> k is implementation-defined for negative a before C++20).
constexpr std::int64_t floor_shift(std::int64_t a, int k) noexcept {
  const std::int64_t d = std::int64_t{1} << k;
  return a >= 0 ? a / d : -((-a + d - 1) / d);
}

// A fixed-point circle oscillator: amplitude `amplitude` counts, angular step e = step/2^16 rad per
// sample (frequency e·1024/(2π) Hz), phase set by the starting point.
struct CircleOscillator {
  std::int64_t c;  // counts · 2^8
  std::int64_t s;  // counts · 2^8
  std::int64_t step;

  constexpr std::int64_t next() noexcept {
    c -= floor_shift(step * s, 16);
    s += floor_shift(step * c, 16);
    return floor_shift(s, 8);
  }
};

// Triangle pulse: `peak` counts at sample `centre`, zero beyond ± half_width samples.
constexpr std::int64_t pulse(int k, int centre, int half_width, std::int64_t peak) noexcept {
  const int d = k < centre ? centre - k : k - centre;
  return d >= half_width ? 0 : peak * (half_width - d) / half_width;
}

// Trapezoid: 0 before `up`, ramps to `level` by up + ramp, holds, ramps back to 0 from `down`.
constexpr std::int64_t plateau(int k, int up, int down, int ramp, std::int64_t level) noexcept {
  if (k <= up || k >= down + ramp) {
    return 0;
  }
  if (k < up + ramp) {
    return level * (k - up) / ramp;
  }
  if (k > down) {
    return level * (down + ramp - k) / ramp;
  }
  return level;
}

struct GyroSample {
  halfspin::Vector3<float> rate;   // rad/s at the sample instant
  halfspin::Vector3<float> delta;  // rad over the period ending at the sample (trapezoid)
  std::array<std::int32_t, 3> counts;
};

class GyroLog {
 public:
  // The next sample; call sample_count times.
  GyroSample next() noexcept {
    const int k = index_++;
    const std::int64_t v1 = vibration_[0].next();
    const std::int64_t v2 = vibration_[1].next();
    const std::int64_t v3 = vibration_[2].next();
    // Body rates in counts (2^-13 rad/s): roll pulses of ±0.8 rad/s in and out of the turn, a
    // 0.6 rad/s yaw plateau with a twelfth of it in pitch, vibration of a few hundredths rad/s.
    const std::int64_t yaw = plateau(k, 600, 2900, 500, 4915);
    const std::array<std::int64_t, 3> counts{
        pulse(k, 600, 150, 6554) - pulse(k, 3400, 150, 6554) + v1 + v2 / 2 + noise(),
        yaw / 12 + v2 + v3 / 2 + noise(), yaw + v3 + v1 / 4 + noise()};
    GyroSample out{};
    for (int i = 0; i < 3; ++i) {
      out.counts[static_cast<std::size_t>(i)] =
          static_cast<std::int32_t>(counts[static_cast<std::size_t>(i)]);
    }
    // First sample: no previous one, the delta-angle uses it twice (constant rate before it).
    const std::array<std::int32_t, 3> prev = k == 0 ? out.counts : previous_;
    out.rate = {static_cast<float>(out.counts[0]) * rate_lsb,
                static_cast<float>(out.counts[1]) * rate_lsb,
                static_cast<float>(out.counts[2]) * rate_lsb};
    out.delta = {static_cast<float>(prev[0] + out.counts[0]) * delta_angle_lsb,
                 static_cast<float>(prev[1] + out.counts[1]) * delta_angle_lsb,
                 static_cast<float>(prev[2] + out.counts[2]) * delta_angle_lsb};
    previous_ = out.counts;
    return out;
  }

 private:
  // Uniform in [-8, 7] counts (the top four bits of a 32-bit xorshift).
  std::int64_t noise() noexcept {
    state_ ^= state_ << 13;
    state_ ^= state_ >> 17;
    state_ ^= state_ << 5;
    return static_cast<std::int64_t>(state_ >> 28) - 8;
  }

  // Steps e = round(2π·f/1024 · 2^16) for f = 90, 143, 211 Hz; the circle algorithm turns by
  // acos(1 − e²/2) = 2·asin(e/2) per sample (trace of [[1, −e], [e, 1 − e²]]), so the frequencies
  // are about 91, 148 and 229 Hz. Starting radii 0.04, 0.03, 0.02 rad/s (the orbit is an ellipse).
  std::array<CircleOscillator, 3> vibration_{
      {{328 * 256, 0, 36191}, {0, 246 * 256, 57504}, {-164 * 256, 0, 84848}}};
  std::array<std::int32_t, 3> previous_{};
  std::uint32_t state_ = 0x2545F491u;
  int index_ = 0;
};

}  // namespace halfspin_replay
