#pragma once
// The invented motion the firmware example's simulated IMU measures: a steady roll at r rad/s about
// the reference x axis, with a coning vibration of the body x axis on top (half-angle a rad at
// Ω rad/s, the classical coning of halfspin/truth/classical_coning.hpp). Attitude, body →
// reference:
//     q(t) = exp(x̂·r·t/2) ⊗ q_cone(t),   q_cone(t) = (cos a/2, 0, sin a/2·cos Ωt, sin a/2·sin Ωt).
// Body rate, from ω = R(q_cone)ᵀ·r·x̂ + ω_cone (the roll rate seen in the coning body frame):
//     ω(t) = (r cos a − Ω(1 − cos a), −(r + Ω) sin a sin Ωt, (r + Ω) sin a cos Ωt),
// and its integral over one sample interval (t0, t0 + h], in closed form (sum-to-product):
//     Δθ = (A, −B sin Ωt_mid, B cos Ωt_mid),  A = (r cos a − Ω(1 − cos a))·h,
//                                            B = (r + Ω) sin a · 2 sin(Ωh/2)/Ω.
// Derived here (ours); tests/target/host_firmware.cmake's run checks the propagated result against
// q(t), which a wrong Δθ would miss by far more than the budget.
// The vibration has a whole number of samples per cycle, so the phase is reduced exactly by
// the sample index before any floating-point arithmetic: a float phase Ω·t would lose 1e-4 rad
// after a few seconds.
#include <cmath>
#include <cstdint>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace firmware {

struct RollWithConing {
  double roll_rate;                 // r, rad/s
  double cone_angle;                // a, rad
  std::uint32_t samples_per_cycle;  // vibration period in sample intervals (Ω = 2π/(this·h))
  double sample_period;             // h, s

  double cone_rate() const noexcept {  // Ω, rad/s
    return 2.0 * 3.141592653589793 / (static_cast<double>(samples_per_cycle) * sample_period);
  }
  // Vibration phase Ω·(k + offset)·h, reduced exactly with k mod samples_per_cycle.
  double phase(std::uint32_t k, double offset) const noexcept {
    const double j = static_cast<double>(k % samples_per_cycle) + offset;
    return 2.0 * 3.141592653589793 * j / static_cast<double>(samples_per_cycle);
  }

  // The delta-angle constants A and B of the header, in double (rounded to float once).
  double axial_per_sample() const noexcept {
    const double s = std::sin(0.5 * cone_angle);
    return (roll_rate * std::cos(cone_angle) - cone_rate() * 2.0 * s * s) * sample_period;
  }
  double lateral_per_sample() const noexcept {
    const double w = cone_rate();
    return (roll_rate + w) * std::sin(cone_angle) * 2.0 * std::sin(0.5 * w * sample_period) / w;
  }

  // Attitude (body → reference) at the end of sample interval k, t = k·h, in double.
  halfspin::Quaternion<double> attitude(std::uint32_t k) const noexcept {
    const double t = static_cast<double>(k) * sample_period;
    const halfspin::Quaternion<double> roll =
        halfspin::quaternion_exp(halfspin::Vector3<double>{roll_rate * t, 0.0, 0.0});
    const double p = phase(k, 0.0);
    const double s = std::sin(0.5 * cone_angle);
    const halfspin::Quaternion<double> cone{std::cos(0.5 * cone_angle), 0.0, s * std::cos(p),
                                            s * std::sin(p)};
    return roll * cone;
  }
};

// The float side that runs in the simulated IMU's interrupt: Δθ of interval k ((k−1)h, kh], rad.
struct DeltaAngleSource {
  float axial;    // A
  float lateral;  // B
  std::uint32_t samples_per_cycle;

  explicit DeltaAngleSource(const RollWithConing& m) noexcept
      : axial(static_cast<float>(m.axial_per_sample())),
        lateral(static_cast<float>(m.lateral_per_sample())),
        samples_per_cycle(m.samples_per_cycle) {}

  halfspin::Vector3<float> operator()(std::uint32_t k) const noexcept {
    // Mid-interval phase Ω·(k − ½)·h, from the reduced index, in float.
    const float j = static_cast<float>(k % samples_per_cycle) - 0.5f;
    const float p = 6.28318530717958647692f * j / static_cast<float>(samples_per_cycle);
    return {axial, -lateral * std::sin(p), lateral * std::cos(p)};
  }
};

}  // namespace firmware
