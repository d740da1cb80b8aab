// Truth motions: every closed form (attitude, rate, delta-angle) against outside references.
//  - attitude: Boost.Odeint's runge_kutta_fehlberg78, controlled, integrating q̇ = ½ q ⊗ (0, ω(t))
//    in long double from the motion's own rate(t);
//  - the axisymmetric body also against Euler's equations integrated with the same integrator
//    (rate and attitude from the inertias alone, not from the closed-form rate);
//  - rate: ω = 2 q* ⊗ q̇ with q̇ from fourth-order central differences of attitude(t) in long double;
//  - delta-angle: GSL's 61-point Gauss–Kronrod rule (gsl_integration_qk61) of rate(t).
// Then the evaluation precision in float and double against the long double closed forms.

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <string>
#include <type_traits>

#include <gsl/gsl_integration.h>
#include <boost/numeric/odeint.hpp>
#include <catch2/catch.hpp>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/composed_motion.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "halfspin/truth/vibration_lines.hpp"
#include "test_support.hpp"

namespace {

using halfspin::AxisymmetricBodyMotion;
using halfspin::ClassicalConingMotion;
using halfspin::ConstantRateMotion;
using halfspin::Quaternion;
using halfspin::SingleAxisOscillation;
using halfspin::Vector3;
using halfspin::test::ld;
namespace odeint = boost::numeric::odeint;
using LD = long double;

// ---- The motions under test, with parameters exactly representable in float (dyadic values),
// so that the float, double and long double versions describe the same motion. --------------

// A float quaternion in T; in double and long double renormalized there, which changes its length
// (unit to ε_T, as rotate() and angular_momentum() assume) but not its direction, hence not the
// rotation that angle_between compares.
template <class T>
Quaternion<T> widen_or_narrow(const Quaternion<float>& q) {
  const Quaternion<T> w{static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y),
                        static_cast<T>(q.z)};
  return std::is_same<T, float>::value ? w : halfspin::normalized(w);
}
template <class T>
Vector3<T> widen_or_narrow(const Vector3<float>& v) {
  return {static_cast<T>(v.x), static_cast<T>(v.y), static_cast<T>(v.z)};
}

// A fixed random attitude, drawn once in float (so all three types share it).
Quaternion<float> start_attitude(std::uint64_t seed) {
  halfspin::test::RandomRotations r(seed);
  return r.quaternion<float>();
}

template <class T>
ConstantRateMotion<T> constant_rate_motion() {
  return {widen_or_narrow<T>(start_attitude(11)), Vector3<T>{T(0.375), T(-1.125), T(0.6875)}};
}
template <class T>
ClassicalConingMotion<T> coning_motion() {
  return {T(0.125), T(8.25)};  // a = 0.125 rad, Ω = 8.25 rad/s (period 0.76 s)
}
template <class T>
SingleAxisOscillation<T> oscillation_motion() {
  const halfspin::Vector3<float> n = halfspin::normalized(Vector3<float>{1.0f, 2.0f, -0.5f});
  return {widen_or_narrow<T>(n), T(0.4375), T(1.75), T(0.3125),
          widen_or_narrow<T>(start_attitude(12))};
}
// Flattened body (I3 > It: λ > 0) and elongated body (I3 < It: λ < 0).
template <class T>
AxisymmetricBodyMotion<T> flattened_body() {
  return {widen_or_narrow<T>(start_attitude(13)), T(2), T(3), T(0.75), T(0.375), T(2.125)};
}
template <class T>
AxisymmetricBodyMotion<T> elongated_body() {
  return {widen_or_narrow<T>(start_attitude(14)), T(2.5), T(0.625), T(1.25), T(-1.5), T(-1.75)};
}

// A steady turn carrying a coned body (the tools' demo scenario, at test-friendly rates).
template <class T>
auto turning_coned_motion() {
  return halfspin::compose<T>(constant_rate_motion<T>(), coning_motion<T>());
}

// ---- Boost.Odeint reference integration ---------------------------------------------------------

using State4 = std::array<LD, 4>;
using State7 = std::array<LD, 7>;

Quaternion<LD> as_quaternion(const LD* x) { return {x[0], x[1], x[2], x[3]}; }

// q̇ = ½ q ⊗ (0, ω(t)) with ω from the motion's closed-form rate(t).
template <class Motion>
struct Kinematics {
  const Motion* motion;
  void operator()(const State4& x, State4& dxdt, LD t) const {
    const Vector3<LD> w = motion->rate(t);
    const Quaternion<LD> d = LD(0.5) * (as_quaternion(x.data()) * Quaternion<LD>{0, w.x, w.y, w.z});
    dxdt = {d.w, d.x, d.y, d.z};
  }
};

// Euler's equations of a torque-free body with principal inertias (I1, I2, I3) and the kinematics:
// state (q, ω), I ω̇ = −ω × (I ω).
struct EulerEquations {
  LD i1, i2, i3;
  void operator()(const State7& x, State7& dxdt, LD /*t*/) const {
    const LD w1 = x[4], w2 = x[5], w3 = x[6];
    const Quaternion<LD> d = LD(0.5) * (as_quaternion(x.data()) * Quaternion<LD>{0, w1, w2, w3});
    dxdt = {d.w,
            d.x,
            d.y,
            d.z,
            (i2 - i3) * w2 * w3 / i1,
            (i3 - i1) * w3 * w1 / i2,
            (i1 - i2) * w1 * w2 / i3};
  }
};

// Controlled runge_kutta_fehlberg78 (tolerances near long double roundoff) from checkpoint to
// checkpoint t_k = k·spacing; calls check(t_k, state) at each.
template <class State, class System, class Check>
void integrate_with_checkpoints(System system, State x, int checkpoints, LD spacing, Check check) {
  auto stepper = odeint::make_controlled(LD(1e-18), LD(1e-18),
                                         odeint::runge_kutta_fehlberg78<State, LD, State, LD>());
  LD dt = LD(1e-3);
  for (int k = 1; k <= checkpoints; ++k) {
    const LD t0 = LD(k - 1) * spacing, t1 = LD(k) * spacing;
    odeint::integrate_adaptive(stepper, system, x, t0, t1, std::min(dt, spacing));
    check(t1, x);
  }
}

template <class Motion>
LD worst_attitude_vs_odeint(const Motion& motion, int checkpoints, LD spacing) {
  const Quaternion<LD> q0 = motion.attitude(0);
  LD worst = halfspin::angle_between(q0, motion.attitude(0));
  integrate_with_checkpoints(
      Kinematics<Motion>{&motion}, State4{q0.w, q0.x, q0.y, q0.z}, checkpoints, spacing,
      [&](LD t, const State4& x) {
        worst =
            std::max(worst, halfspin::angle_between(motion.attitude(t), as_quaternion(x.data())));
      });
  return worst;
}

// ---- Rate from the attitude by central differences ---------------------------------------------

// ω = 2 q* ⊗ q̇ / |q|², q̇ by the fourth-order central difference
// (8(q(t+h) − q(t−h)) − (q(t+2h) − q(t−2h)))/(12h), truncation h⁴ q⁽⁵⁾/30.
template <class Motion>
Vector3<LD> rate_from_attitude(const Motion& motion, LD t, LD h) {
  const Quaternion<LD> d1 = motion.attitude(t + h) - motion.attitude(t - h);
  const Quaternion<LD> d2 = motion.attitude(t + 2 * h) - motion.attitude(t - 2 * h);
  const Quaternion<LD> qdot = (LD(1) / (12 * h)) * (LD(8) * d1 - d2);
  const Quaternion<LD> q = motion.attitude(t);
  const Quaternion<LD> w = (LD(2) / halfspin::squared_norm(q)) * (halfspin::conjugate(q) * qdot);
  return {w.x, w.y, w.z};
}

template <class Motion>
LD worst_rate_vs_differences(const Motion& motion, LD horizon, LD h = LD(2e-5)) {
  LD worst = 0;
  for (int k = 0; k <= 64; ++k) {
    const LD t = horizon * LD(k) / 64;
    const Vector3<LD> a = rate_from_attitude(motion, t, h);
    const Vector3<LD> b = motion.rate(t);
    worst = std::max(worst, halfspin::norm(a - b));
  }
  return worst;
}

// ---- GSL quadrature of the rate -----------------------------------------------------------------

template <class Motion>
struct RateComponent {
  const Motion* motion;
  int axis;
};

// ∫ rate_axis over [t0, t1] by GSL's 61-point Gauss–Kronrod rule gsl_integration_qk61 (exact for
// polynomials of degree 91) on pieces of at most 1/16 s, summed in long double. The adaptive
// gsl_integration_qag cannot be asked for less than 50 ε relative error and reports a roundoff
// failure on the smooth, nearly exact integrands here; the fixed rule on short pieces is already
// accurate to roundoff (a piece spans at most 0.52 rad of the fastest phase, 8.25 rad/s).
template <class Motion>
Vector3<double> gsl_delta_angle(const Motion& motion, double t0, double t1) {
  const int pieces = std::max(1, static_cast<int>(std::ceil((t1 - t0) * 16)));
  double out[3];
  for (int axis = 0; axis < 3; ++axis) {
    RateComponent<Motion> params{&motion, axis};
    gsl_function f;
    f.function = [](double t, void* p) -> double {
      const auto* rc = static_cast<const RateComponent<Motion>*>(p);
      return rc->motion->rate(t)[rc->axis];
    };
    f.params = &params;
    LD sum = 0;
    for (int j = 0; j < pieces; ++j) {
      const double a = t0 + (t1 - t0) * j / pieces;
      const double b = (j + 1 == pieces) ? t1 : t0 + (t1 - t0) * (j + 1) / pieces;
      double result = 0, abserr = 0, resabs = 0, resasc = 0;
      gsl_integration_qk61(&f, a, b, &result, &abserr, &resabs, &resasc);
      sum += ld(result);
    }
    out[axis] = static_cast<double>(sum);
  }
  return {out[0], out[1], out[2]};
}

// Largest |closed form − GSL| over a set of intervals, relative to ∫|ω| (≥ |Δθ|) over the interval.
template <class Motion>
double worst_delta_vs_gsl(const Motion& motion) {
  const double starts[] = {0.0, 0.3125, 1.75, 7.0};
  const double spans[] = {1.0 / 1024, 0.01, 0.25, 3.5};
  double worst = 0;
  for (double t0 : starts) {
    for (double h : spans) {
      const Vector3<double> a = motion.delta_angle(t0, t0 + h);
      const Vector3<double> b = gsl_delta_angle(motion, t0, t0 + h);
      double scale = 0;  // max |ω| over the interval times its length
      for (int k = 0; k <= 16; ++k) {
        scale = std::max(scale, halfspin::norm(motion.rate(t0 + h * k / 16)));
      }
      scale *= h;
      worst = std::max(worst, halfspin::norm(a - b) / scale);
    }
  }
  return worst;
}

}  // namespace

// ------------------------------------------------------------------------------------------------

TEST_CASE("closed-form attitudes match Boost.Odeint rkf78 integration of their rates",
          "[truth][reference]") {
  // Reference: Boost.Odeint runge_kutta_fehlberg78, controlled, abs/rel tolerance 1e-18, in long
  // double, integrating q̇ = ½ q ⊗ (0, ω(t)) from each motion's own rate(t).
  const LD tol = 5e-16L;  // measured worst 5.6e-17 .. 1.4e-16 rad (report_worst)
  SECTION("constant rate, 40 s") {
    const LD worst = worst_attitude_vs_odeint(constant_rate_motion<LD>(), 80, LD(0.5));
    halfspin::test::report_worst("odeint: constant rate attitude (rad)", worst);
    CHECK(worst < tol);
  }
  SECTION("classical coning, 13 cone periods") {
    const LD worst = worst_attitude_vs_odeint(coning_motion<LD>(), 40, LD(0.25));
    halfspin::test::report_worst("odeint: coning attitude (rad)", worst);
    CHECK(worst < tol);
  }
  SECTION("single-axis oscillation, 17 periods") {
    const LD worst = worst_attitude_vs_odeint(oscillation_motion<LD>(), 40, LD(0.25));
    halfspin::test::report_worst("odeint: oscillation attitude (rad)", worst);
    CHECK(worst < tol);
  }
  SECTION("a steady turn carrying classical coning (composed motion), 20 s") {
    const LD worst = worst_attitude_vs_odeint(turning_coned_motion<LD>(), 80, LD(0.25));
    halfspin::test::report_worst("odeint: composed turn + coning attitude (rad)", worst);
    CHECK(worst < tol);
  }
  SECTION("axisymmetric body, flattened and elongated, 40 s") {
    const LD a = worst_attitude_vs_odeint(flattened_body<LD>(), 80, LD(0.5));
    const LD b = worst_attitude_vs_odeint(elongated_body<LD>(), 80, LD(0.5));
    halfspin::test::report_worst("odeint: axisymmetric flattened attitude (rad)", a);
    halfspin::test::report_worst("odeint: axisymmetric elongated attitude (rad)", b);
    CHECK(a < tol);
    CHECK(b < tol);
  }
}

TEST_CASE("axisymmetric body: rate and attitude match Euler's equations integrated by Odeint",
          "[truth][reference]") {
  // Reference: Euler's equations I ω̇ = −ω × (I ω) with the kinematics q̇ = ½ q ⊗ (0, ω), integrated
  // from the initial state alone by Boost.Odeint runge_kutta_fehlberg78 (controlled, 1e-18) in long
  // double. Nothing of the closed form but ω(0) and q(0) enters the reference.
  for (const AxisymmetricBodyMotion<LD>& m : {flattened_body<LD>(), elongated_body<LD>()}) {
    const Quaternion<LD> q0 = m.attitude(0);
    const Vector3<LD> w0 = m.rate(0);
    const LD lambda = m.body_turning_rate();
    LD worst_rate = 0, worst_attitude = 0, worst_flipped = 0, worst_momentum = 0;
    const Vector3<LD> momentum = m.angular_momentum();
    integrate_with_checkpoints(
        EulerEquations{m.transverse_inertia, m.transverse_inertia, m.axial_inertia},
        State7{q0.w, q0.x, q0.y, q0.z, w0.x, w0.y, w0.z}, 80, LD(0.5), [&](LD t, const State7& x) {
          const Vector3<LD> w{x[4], x[5], x[6]};
          worst_rate = std::max(worst_rate, halfspin::norm(w - m.rate(t)));
          worst_attitude = std::max(
              worst_attitude, halfspin::angle_between(m.attitude(t), as_quaternion(x.data())));
          // The opposite sign of λ must disagree: this check can tell the two apart.
          const LD a = -lambda * t + m.transverse_phase;
          const Vector3<LD> flipped{m.transverse_rate * std::cos(a),
                                    m.transverse_rate * std::sin(a), m.axial_rate};
          worst_flipped = std::max(worst_flipped, halfspin::norm(w - flipped));
          // Torque-free: the inertial angular momentum R(q) I ω is constant (common practice, no
          // source; Markley and Crassidis 2014, torque-free motion, from memory).
          const Vector3<LD> h_body{m.transverse_inertia * x[4], m.transverse_inertia * x[5],
                                   m.axial_inertia * x[6]};
          worst_momentum = std::max(
              worst_momentum, halfspin::norm(halfspin::rotate(m.attitude(t), h_body) - momentum));
        });
    halfspin::test::report_worst("Euler equations: axisymmetric rate (rad/s)", worst_rate);
    halfspin::test::report_worst("Euler equations: axisymmetric attitude (rad)", worst_attitude);
    halfspin::test::report_worst("Euler equations: momentum drift (kg m^2/s)", worst_momentum);
    // Measured worst: rate 1.4e-16 rad/s, attitude 1.4e-16 rad, momentum 1.1e-16·|H|.
    CHECK(worst_rate < 5e-16L);
    CHECK(worst_attitude < 5e-16L);
    CHECK(worst_momentum < 5e-16L * halfspin::norm(momentum));
    CHECK(worst_flipped > 0.5L);
  }
}

TEST_CASE("closed-form rates match 2 q* q' from central differences of the attitude",
          "[truth][reference]") {
  // Reference: the kinematics ω = 2 q* ⊗ q̇ (common practice, no source) with q̇ from fourth-order
  // central differences in long double. Error budget at h = 2e-5 s: truncation h⁴|q⁽⁵⁾|/30 ≤ 1e-16;
  // roundoff ε·(1 + phase)/h with phases up to ~30 rad: 1e-19·30/2e-5 ≈ 1.6e-13 rad/s.
  const LD tol = 5e-13L;
  const LD a = worst_rate_vs_differences(constant_rate_motion<LD>(), 20);
  const LD b = worst_rate_vs_differences(coning_motion<LD>(), 5);
  const LD c = worst_rate_vs_differences(oscillation_motion<LD>(), 5);
  const LD d = worst_rate_vs_differences(flattened_body<LD>(), 20);
  const LD e = worst_rate_vs_differences(elongated_body<LD>(), 20);
  const LD f = worst_rate_vs_differences(turning_coned_motion<LD>(), 5);
  halfspin::test::report_worst("differences: composed turn + coning (rad/s)", f);
  CHECK(f < tol);
  halfspin::test::report_worst("differences: constant rate (rad/s)", a);
  halfspin::test::report_worst("differences: coning (rad/s)", b);
  halfspin::test::report_worst("differences: oscillation (rad/s)", c);
  halfspin::test::report_worst("differences: axisymmetric flattened (rad/s)", d);
  halfspin::test::report_worst("differences: axisymmetric elongated (rad/s)", e);
  CHECK(a < tol);
  CHECK(b < tol);
  CHECK(c < tol);
  CHECK(d < tol);
  CHECK(e < tol);
}

TEST_CASE("closed-form delta-angles match GSL Gauss-Kronrod quadrature of the rate",
          "[truth][reference]") {
  // Reference: GSL gsl_integration_qk61, the 61-point Gauss–Kronrod rule on pieces ≤ 1/16 s, of
  // each rate component over intervals from 1/1024 s to 3.5 s. Error relative to max|ω|·(t1 − t0).
  const double tol = 16 * std::numeric_limits<double>::epsilon();
  const double a = worst_delta_vs_gsl(constant_rate_motion<double>());
  const double b = worst_delta_vs_gsl(coning_motion<double>());
  const double c = worst_delta_vs_gsl(oscillation_motion<double>());
  const double d = worst_delta_vs_gsl(flattened_body<double>());
  const double e = worst_delta_vs_gsl(elongated_body<double>());
  const double eps = std::numeric_limits<double>::epsilon();
  halfspin::test::report_worst("GSL qk61: constant rate delta-angle (eps)", ld(a / eps));
  halfspin::test::report_worst("GSL qk61: coning delta-angle (eps)", ld(b / eps));
  halfspin::test::report_worst("GSL qk61: oscillation delta-angle (eps)", ld(c / eps));
  halfspin::test::report_worst("GSL qk61: axisymmetric flattened delta-angle (eps)", ld(d / eps));
  halfspin::test::report_worst("GSL qk61: axisymmetric elongated delta-angle (eps)", ld(e / eps));
  CHECK(a < tol);
  CHECK(b < tol);
  CHECK(c < tol);
  CHECK(d < tol);
  CHECK(e < tol);
}

TEST_CASE("axisymmetric delta-angle stays accurate when the rate does not turn (λ = 0)",
          "[truth]") {
  // A sphere (I3 = It) and a body without axial spin have λ = 0: the transverse rate is constant,
  // so the delta-angle is ω·(t1 − t0) exactly; the sinc form must not divide by λ.
  AxisymmetricBodyMotion<double> sphere{Quaternion<double>::identity(), 2, 2, 0.75, 0.5, 1.5};
  AxisymmetricBodyMotion<double> no_spin{Quaternion<double>::identity(), 2, 3, 0.75, 0.5, 0.0};
  for (const auto& m : {sphere, no_spin}) {
    REQUIRE(m.body_turning_rate() == 0.0);
    const Vector3<double> d = m.delta_angle(0.25, 1.25);
    const Vector3<double> w = m.rate(0.5);
    CHECK(halfspin::test::vector_error_eps(d, w) <= 1.0L);
    CHECK(halfspin::is_finite(m.delta_angle(3.0, 3.0)));
  }
}

// ---- Precision in float and double, against the long double closed forms ----------------------

namespace {

// Worst attitude angle and rate error of the T closed form against the long double closed form of
// the same (representable) motion, over 0 ≤ t ≤ horizon at dyadic times; each relative to ε_T ×
// (1 + the largest phase reached, ωmax·t), the size of the argument roundoff the formulas see.
template <class T, class MotionT, class MotionLD>
std::array<LD, 3> precision_in_eps(const MotionT& mt, const MotionLD& ml, LD horizon) {
  std::array<LD, 3> worst{0, 0, 0};
  for (int k = 0; k <= 256; ++k) {
    const T t = static_cast<T>(horizon * LD(k) / 256);  // exact: horizon is dyadic
    const LD tl = ld(t);
    LD rate_max = 0;
    for (int j = 0; j <= 8; ++j) {
      rate_max = std::max(rate_max, halfspin::norm(ml.rate(tl * LD(j) / 8)));
    }
    const LD scale = halfspin::test::eps<T>() * (1 + rate_max * tl);
    const Quaternion<T> qt = mt.attitude(t);
    const Quaternion<LD> q{ld(qt.w), ld(qt.x), ld(qt.y), ld(qt.z)};
    worst[0] = std::max(worst[0], halfspin::angle_between(q, ml.attitude(tl)) / scale);
    const Vector3<T> wt = mt.rate(t);
    const Vector3<LD> w{ld(wt.x), ld(wt.y), ld(wt.z)};
    worst[1] = std::max(worst[1], halfspin::norm(w - ml.rate(tl)) / (scale * (1 + rate_max)));
    // Delta-angle over one short interval ending at t (a gyro sample), relative to its size.
    const T h = T(1) / T(512);
    const Vector3<T> dt = mt.delta_angle(t, t + h);
    const Vector3<LD> d{ld(dt.x), ld(dt.y), ld(dt.z)};
    worst[2] = std::max(worst[2], halfspin::norm(d - ml.delta_angle(tl, tl + ld(h))) /
                                      (scale * (1 + rate_max) * ld(h)));
  }
  return worst;
}

template <class T>
void check_precision(const char* type, LD attitude_tol, LD rate_tol, LD delta_tol) {
  struct Row {
    std::string name;
    std::array<LD, 3> worst;
  };
  const Row rows[] = {
      {"constant rate",
       precision_in_eps<T>(constant_rate_motion<T>(), constant_rate_motion<LD>(), 32)},
      {"coning", precision_in_eps<T>(coning_motion<T>(), coning_motion<LD>(), 8)},
      {"oscillation", precision_in_eps<T>(oscillation_motion<T>(), oscillation_motion<LD>(), 8)},
      {"axisymmetric flattened",
       precision_in_eps<T>(flattened_body<T>(), flattened_body<LD>(), 32)},
      {"axisymmetric elongated",
       precision_in_eps<T>(elongated_body<T>(), elongated_body<LD>(), 32)}};
  for (const Row& r : rows) {
    INFO(type << " " << r.name << ": attitude " << double(r.worst[0]) << ", rate "
              << double(r.worst[1]) << ", delta-angle " << double(r.worst[2])
              << " (units of eps x phase)");
    halfspin::test::report_worst(std::string(type) + " " + r.name + " attitude (eps*phase)",
                                 r.worst[0]);
    halfspin::test::report_worst(std::string(type) + " " + r.name + " rate (eps*phase)",
                                 r.worst[1]);
    halfspin::test::report_worst(std::string(type) + " " + r.name + " delta (eps*phase)",
                                 r.worst[2]);
    CHECK(r.worst[0] < attitude_tol);
    CHECK(r.worst[1] < rate_tol);
    CHECK(r.worst[2] < delta_tol);
  }
}

}  // namespace

TEST_CASE("truth motions evaluate in float and double within a few eps of the phase", "[truth]") {
  check_precision<double>("double", 4, 4, 4);
  check_precision<float>("float", 4, 4, 4);
}

// ---- Vibration lines (truth/vibration_lines.hpp): attitude defined, rate derived ----------------

namespace {

using halfspin::VibrationLine;
using halfspin::VibrationLinesMotion;

// Three lines on all three axes with different phases: θ and θ̇ are not parallel, so the body
// rate is not θ̇ (the check below makes sure of it). Amplitudes up to 0.5 rad: |θ| crosses the
// series threshold (|θ| = 0.1) in both directions. Low frequencies keep the Odeint runs short.
template <class T>
VibrationLinesMotion<T> three_axis_lines() {
  VibrationLinesMotion<T> m;
  m.lines.add(VibrationLine<T>::from_angle_amplitude(T(1.5), Vector3<T>{T(0.25), T(0.5), T(0.125)})
                  .with_phases(Vector3<T>{T(0.25), T(1.5), T(-0.75)}));
  m.lines.add(VibrationLine<T>::from_angle_amplitude(T(2.75), Vector3<T>{T(0.125), T(0), T(0.25)})
                  .with_phases(Vector3<T>{T(2), T(0), T(0.5)}));
  m.lines.add(VibrationLine<T>::from_rate_amplitude(T(0.625), Vector3<T>{T(0.5), T(0.25), T(0)}));
  return m;
}

// Small lines (|θ| < 0.03 rad): the rate is evaluated on the series branch only.
template <class T>
VibrationLinesMotion<T> small_lines() {
  VibrationLinesMotion<T> m;
  m.lines.add(
      VibrationLine<T>::from_angle_amplitude(T(3.25), Vector3<T>{T(0.0078125), T(0.015625), T(0)})
          .with_phases(Vector3<T>{T(0), T(1.25), T(0)}));
  m.lines.add(
      VibrationLine<T>::from_angle_amplitude(T(1.75), Vector3<T>{T(0), T(0.0078125), T(0.0078125)})
          .with_phases(Vector3<T>{T(0), T(-0.5), T(2.5)}));
  return m;
}

// The engineer's question (invented values): a turn near 3 rad/s carrying a 120 Hz, 0.01 rad
// vibration line on body z, sampled at 2 kHz.
template <class T>
auto turn_with_engine_line() {
  VibrationLinesMotion<T> v;
  v.lines.add(VibrationLine<T>::from_angle_amplitude(T(120), Vector3<T>{T(0), T(0), T(0.01)})
                  .with_phases(Vector3<T>{T(0), T(0), T(0.3)}));
  const ConstantRateMotion<T> turn{Quaternion<T>::identity(),
                                   Vector3<T>{T(0.625), T(-2.125), T(2)}};
  return halfspin::compose<T>(turn, v);
}

// The long double motion seen in double (GSL's type) from a start time t0 on: rate(s) is the
// rate at t0 + s evaluated in long double, so that neither the phase (thousands of radians) nor
// GSL's nodes t0 + s carry a double rounding; a node's s is exact to its own ulp.
template <class Motion>
struct ShiftedRate {
  Motion motion;
  LD t0;
  Vector3<double> rate(double s) const {
    const Vector3<LD> w = motion.rate(t0 + ld(s));
    return {static_cast<double>(w.x), static_cast<double>(w.y), static_cast<double>(w.z)};
  }
};

}  // namespace

TEST_CASE("vibration lines: attitude matches Boost.Odeint integration of the derived rate",
          "[truth][reference]") {
  // Reference: Boost.Odeint runge_kutta_fehlberg78, controlled, 1e-18, long double, integrating
  // q̇ = ½ q ⊗ (0, ω(t)) from the motion's own rate(t) (the derived J(θ)·θ̇). Measured worst
  // 1.5e-16 rad (three axes, turn) and 3.8e-16 rad (small lines, where the integrator's own error
  // is the larger part: the rate is exact to 2e-15 rad/s, next test).
  const LD tol = 1e-15L;
  const LD a = worst_attitude_vs_odeint(three_axis_lines<LD>(), 40, LD(0.25));
  const LD b = worst_attitude_vs_odeint(small_lines<LD>(), 40, LD(0.25));
  const LD c = worst_attitude_vs_odeint(
      halfspin::compose<LD>(constant_rate_motion<LD>(), three_axis_lines<LD>()), 40, LD(0.25));
  halfspin::test::report_worst("odeint: vibration lines, three axes (rad)", a);
  halfspin::test::report_worst("odeint: vibration lines, small (rad)", b);
  halfspin::test::report_worst("odeint: turn carrying vibration lines (rad)", c);
  CHECK(a < tol);
  CHECK(b < tol);
  CHECK(c < tol);
}

TEST_CASE("vibration lines: rate matches 2 q* q' from central differences, and is not theta'",
          "[truth][reference]") {
  // Reference: ω = 2 q* ⊗ q̇ (common practice, no source), q̇ by fourth-order central differences
  // in long double (error budget in "closed-form rates match 2 q* q' ..." above).
  const LD tol = 5e-13L;
  const LD a = worst_rate_vs_differences(three_axis_lines<LD>(), 5);
  const LD b = worst_rate_vs_differences(small_lines<LD>(), 5);
  // At 120 Hz the truncation h⁴|q⁽⁵⁾|/30 ≈ h⁴·0.01·754⁵/30 needs h = 2e-6 s (1.3e-12 rad/s);
  // roundoff ε·(754·0.05)/h ≈ 2e-12 rad/s.
  const LD c = worst_rate_vs_differences(turn_with_engine_line<LD>(), LD(0.05), LD(2e-6));
  halfspin::test::report_worst("differences: vibration lines, three axes (rad/s)", a);
  halfspin::test::report_worst("differences: vibration lines, small (rad/s)", b);
  halfspin::test::report_worst("differences: turn + 120 Hz line (rad/s)", c);
  CHECK(a < tol);
  CHECK(b < tol);
  CHECK(c < tol * 20);
  // The difference from θ̇ is the vibration's coning, of order ½|θ||θ̇|: a rate that simply
  // returned θ̇ would fail the checks above by far more than their tolerance.
  const VibrationLinesMotion<LD> m = three_axis_lines<LD>();
  LD largest_difference = 0;
  for (int k = 0; k <= 64; ++k) {
    const LD t = LD(k) * 5 / 64;
    largest_difference =
        std::max(largest_difference, halfspin::norm(m.rate(t) - m.rotation_vector_rate(t)));
  }
  CHECK(largest_difference > 0.1L);
}

TEST_CASE("vibration lines on one axis are the single-axis oscillation", "[truth]") {
  // θ parallel to θ̇: ω = θ̇ exactly, the same motion as SingleAxisOscillation with the angle
  // amplitude A/Ω and the same phase.
  VibrationLinesMotion<LD> m;
  m.lines.add(VibrationLine<LD>::from_angle_amplitude(LD(2.5), Vector3<LD>{0, 0.375L, 0})
                  .with_phases(Vector3<LD>{0, 0.625L, 0}));
  const SingleAxisOscillation<LD> o{Vector3<LD>{0, 1, 0}, 0.375L, 2.5L, 0.625L,
                                    Quaternion<LD>::identity()};
  for (int k = 0; k <= 32; ++k) {
    const LD t = LD(k) / 16;
    CHECK(halfspin::angle_between(m.attitude(t), o.attitude(t)) < 1e-18L);
    CHECK(halfspin::norm(m.rate(t) - o.rate(t)) < 1e-17L);
  }
}

TEST_CASE("truth delta-angles of a turn carrying a 120 Hz line at 2 kHz match GSL quadrature",
          "[truth][reference]") {
  // Reference: GSL gsl_integration_qk61 (61-point Gauss–Kronrod) of each rate component over one
  // 2 kHz gyro interval. Checks the accuracy claim of the 8-point Gauss–Legendre rule that
  // truth_delta_angle uses for this motion (synthetic_gyro.hpp: below 2e-23·dt·(Ω dt)^16 times the
  // rate amplitude for a rate band-limited to Ω; here Ω·dt ≈ 754/2048 = 0.37 for the line, and the
  // turn seen through the vibrating frame adds harmonics of amplitude ~|turn|·0.01ⁿ/n! at nΩ):
  // the difference must be GSL's own double rounding. Measured worst 0.52 ε of |ω|·dt.
  const auto motion = turn_with_engine_line<LD>();
  const double eps = std::numeric_limits<double>::epsilon();
  double worst = 0;
  for (const LD t0 : {0.0L, 0.3125L, 1.75L, 7.0L}) {
    const LD h = 1.0L / 2048;
    const Vector3<LD> a = halfspin::truth_delta_angle(motion, t0, t0 + h);
    const Vector3<double> b =
        gsl_delta_angle(ShiftedRate<decltype(motion)>{motion, t0}, 0.0, static_cast<double>(h));
    const Vector3<LD> difference{a.x - ld(b.x), a.y - ld(b.y), a.z - ld(b.z)};
    worst = std::max(worst, static_cast<double>(halfspin::norm(difference) /
                                                (halfspin::norm(motion.rate(t0)) * h)));
  }
  halfspin::test::report_worst("GSL qk61: turn + 120 Hz line delta-angle at 2 kHz (eps)",
                               ld(worst / eps));
  INFO("worst " << worst / eps << " eps");
  CHECK(worst < 2 * eps);
}
