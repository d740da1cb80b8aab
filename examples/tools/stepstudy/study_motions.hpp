#pragma once
// The truth motions halfspin-stepstudy can run (fixed, invented parameters), each with the
// description an engineer would hand the a-priori bounds, and the default step range of its sweep.
//
//   constant     constant body rate (0.9, −0.6, 1.3) rad/s from q0 = (0.8, 0.2, −0.4, 0.4);
//                described by RateEnvelope::constant_rate(|ω| = 1.6912 rad/s).
//   oscillation  single-axis oscillation θ(t) = 0.15 sin(2π·2.5 t + 0.3) rad about (2, 3, 6)/7;
//                described as a VibrationSpec: one sinusoid of amplitude 2πfA·n = 2.356 rad/s
//                along n at 2.5 Hz.
//   coning       classical coning, half-angle 0.04 rad at 5 Hz; described by its ConingSpec
//                (pure coning: the bounds use the exact per-step coning error).
//   body         torque-free axisymmetric body, It = 1, I3 = 1.8 kg·m², ω⊥ = 0.6 rad/s at phase
//                0.4 rad, ω3 = 2.5 rad/s, q0 = (0.7, 0.1, 0.5, −0.5). Envelope derived from the
//                closed-form rate ω = (ω⊥ cos(λt + φ0), ω⊥ sin(λt + φ0), ω3), λ = (I3 − It)/It·ω3
//                = 2 rad/s: D0 = |ω| = √(ω⊥² + ω3²) = 2.571 rad/s (constant), and for k ≥ 1 only
//                the transverse part moves, a circle of radius ω⊥ turning at λ: Dk = ω⊥·|λ|ᵏ.
//   demo         the tools' demo scenario (common/demo_scenario.hpp), demo::description().
//
// Tool code (not part of the installed library).

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <functional>
#include <string>
#include <string_view>

#include "demo_scenario.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"

namespace halfspin::tools::stepstudy {

using LD = long double;

// A truth motion behind a uniform interface. Inputs are built from the long double truth (rounded
// to the scalar under test); rate-function steppers call the double copy (a desktop dynamics
// model), which is what their ns/step then includes.
struct TruthMotion {
  std::function<Quaternion<LD>(LD)> attitude;          // body → reference at t (s)
  std::function<Vector3<LD>(LD)> rate;                 // body rate (rad/s) at t (s)
  std::function<Vector3<LD>(LD, LD)> delta_angle;      // ∫ω over (t0, t1] (rad)
  std::function<Vector3<double>(double)> rate_double;  // body rate (rad/s), in double
};

struct StudyMotion {
  std::string name;
  std::string summary;              // one line: what it is, its parameters
  std::string description_summary;  // one line: how the bounds see it
  TruthMotion truth;
  MotionDescription<double> description;
  double default_step_min = 1e-3;  // s
  double default_step_max = 1e-1;  // s
};

inline constexpr std::array<const char*, 5> motion_names{
    {"constant", "oscillation", "coning", "body", "demo"}};

namespace detail {

template <class Motion>
TruthMotion erase(const Motion& ld, std::function<Vector3<double>(double)> rate_double) {
  TruthMotion m;
  m.attitude = [ld](LD t) { return ld.attitude(t); };
  m.rate = [ld](LD t) { return ld.rate(t); };
  m.delta_angle = [ld](LD t0, LD t1) { return truth_delta_angle(ld, t0, t1); };
  m.rate_double = std::move(rate_double);
  return m;
}

template <class T>
ConstantRateMotion<T> constant_motion() {
  return {Quaternion<T>{T(0.8L), T(0.2L), T(-0.4L), T(0.4L)},
          Vector3<T>{T(0.9L), T(-0.6L), T(1.3L)}};
}
template <class T>
SingleAxisOscillation<T> oscillation_motion() {
  return {Vector3<T>{T(2) / T(7), T(3) / T(7), T(6) / T(7)}, T(0.15L), T(2.5L), T(0.3L),
          Quaternion<T>::identity()};
}
template <class T>
ClassicalConingMotion<T> coning_motion() {
  return {T(0.04L), T(2) * pi<T> * T(5)};
}
template <class T>
AxisymmetricBodyMotion<T> body_motion() {
  return {
      Quaternion<T>{T(0.7L), T(0.1L), T(0.5L), T(-0.5L)}, T(1), T(1.8L), T(0.6L), T(0.4L), T(2.5L)};
}

inline std::string format(const char* fmt, double a, double b = 0, double c = 0) {
  std::array<char, 256> buffer{};
  std::snprintf(buffer.data(), buffer.size(), fmt, a, b, c);
  return buffer.data();
}

}  // namespace detail

// The motion called `name`; false if there is none.
inline bool make_study_motion(std::string_view name, StudyMotion& out) {
  using namespace detail;
  StudyMotion s;
  s.name = std::string(name);
  if (name == "constant") {
    const auto d = constant_motion<double>();
    s.truth = erase(constant_motion<LD>(), [d](double t) { return d.rate(t); });
    const double w = norm(d.body_rate);
    s.summary = "constant body rate (0.9, -0.6, 1.3) rad/s, |w| = " + format("%.4f rad/s", w);
    s.description.maneuver = RateEnvelope<double>::constant_rate(w);
    s.description_summary = "RateEnvelope::constant_rate(" + format("%.4f rad/s", w) + ")";
    s.default_step_min = 1e-3;
    s.default_step_max = 1e-1;
  } else if (name == "oscillation") {
    const auto d = oscillation_motion<double>();
    s.truth = erase(oscillation_motion<LD>(), [d](double t) { return d.rate(t); });
    const double peak = 2.0 * pi<double> * d.frequency * d.amplitude;
    s.summary = "single-axis oscillation 0.15 rad at 2.5 Hz (phase 0.3 rad) about (2, 3, 6)/7";
    s.description.vibration.add(
        VibrationLine<double>::along_axis(d.frequency, d.axis * peak, d.phase));
    s.description_summary =
        "VibrationSpec: one line along the axis, " + format("%.4f rad/s at 2.5 Hz", peak);
    s.default_step_min = 1e-3;
    s.default_step_max = 5e-2;
  } else if (name == "coning") {
    const auto d = coning_motion<double>();
    s.truth = erase(coning_motion<LD>(), [d](double t) { return d.rate(t); });
    s.summary = "classical coning, half-angle 0.04 rad at 5 Hz";
    s.description.coning = ConingSpec<double>{0.04, 5.0};
    s.description_summary = "ConingSpec{0.04 rad, 5 Hz} (pure coning: exact per-step error)";
    s.default_step_min = 1e-3;
    s.default_step_max = 2e-2;
  } else if (name == "body") {
    const auto d = body_motion<double>();
    s.truth = erase(body_motion<LD>(), [d](double t) { return d.rate(t); });
    const double lambda = std::fabs(d.body_turning_rate());
    s.summary =
        "torque-free axisymmetric body: It = 1, I3 = 1.8 kg m^2, w_perp = 0.6 rad/s, "
        "w3 = 2.5 rad/s";
    double p = d.transverse_rate;
    s.description.maneuver.derivative[0] = std::hypot(d.transverse_rate, d.axial_rate);
    for (std::size_t k = 1; k < 6; ++k) {
      p *= lambda;
      s.description.maneuver.derivative[k] = p;
    }
    s.description_summary = "envelope D0 = " + format("%.4f rad/s, Dk = 0.6*%.1f^k rad/s^(k+1)",
                                                      s.description.maneuver.derivative[0], lambda);
    s.default_step_min = 1e-3;
    s.default_step_max = 1e-1;
  } else if (name == "demo") {
    const auto d = demo::motion<double>();
    s.truth = erase(demo::motion<LD>(), [d](double t) { return d.rate(t); });
    s.summary = "demo drone: banked turn (" + format("%.4f rad/s", demo::turn_rate()) +
                ") carrying 0.02 deg coning at 85 Hz (invented)";
    s.description = demo::description();
    s.description_summary = "demo::description() (coning + the turn as a rate envelope)";
    s.default_step_min = 1e-4;
    s.default_step_max = 4e-3;
  } else {
    return false;
  }
  out = std::move(s);
  return true;
}

// The description in scalar T (the bounds' roundoff floor is the scalar's).
template <class T>
MotionDescription<T> description_in(const MotionDescription<double>& d) {
  return d.converted<T>();
}

}  // namespace halfspin::tools::stepstudy
