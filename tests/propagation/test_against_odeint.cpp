// Against general-purpose high-accuracy integrators: an asymmetric torque-free rigid body (invented
// inertia diag(1.0, 2.0, 3.5) kg·m², initial rate ≈ 1 rad/s mostly about the unstable intermediate
// axis, so it tumbles). Reference: Boost.Odeint's runge_kutta_fehlberg78 in a controlled stepper
// on long double, integrating Euler's equations and the quaternion kinematics together (7 states).
// Our fourth- and fifth-order steppers are fed ω(t) at their stage times from Euler's equations
// alone, integrated by the same Odeint stepper, and must agree with the reference attitude within
// 1e-11 rad at dt = 1/1024 s in double. GSL's gsl_odeiv2 rk8pd (double) cross-checks the reference.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <boost/numeric/odeint.hpp>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "test_support.hpp"

using namespace halfspin;
namespace odeint = boost::numeric::odeint;

namespace {

using L = long double;
using BodyState = std::array<L, 7>;  // ω (rad/s, body), then q = (w, x, y, z)
using RateState = std::array<L, 3>;  // ω only

// Invented body and initial state.
constexpr L inertia_x = 1.0L, inertia_y = 2.0L, inertia_z = 3.5L;  // kg·m²
const std::array<L, 3> initial_rate{0.1L, 0.95L, 0.3L};            // rad/s, |ω| ≈ 1.0
const std::array<L, 4> initial_attitude{0.9L, 0.1L, -0.3L, 0.2L};  // normalized below

// Euler's equations for a torque-free body in principal axes: I₁ω̇₁ = (I₂ − I₃)ω₂ω₃ and cyclic
// (Markley and Crassidis 2014, torque-free motion; common practice).
void euler_equations(const L* w, L* dw) {
  dw[0] = (inertia_y - inertia_z) / inertia_x * w[1] * w[2];
  dw[1] = (inertia_z - inertia_x) / inertia_y * w[2] * w[0];
  dw[2] = (inertia_x - inertia_y) / inertia_z * w[0] * w[1];
}

// q̇ = ½ q ⊗ (0, ω), written out component-wise (Hamilton product, scalar first).
void kinematics(const L* w, const L* q, L* dq) {
  dq[0] = -0.5L * (q[1] * w[0] + q[2] * w[1] + q[3] * w[2]);
  dq[1] = 0.5L * (q[0] * w[0] + q[2] * w[2] - q[3] * w[1]);
  dq[2] = 0.5L * (q[0] * w[1] - q[1] * w[2] + q[3] * w[0]);
  dq[3] = 0.5L * (q[0] * w[2] + q[1] * w[1] - q[2] * w[0]);
}

BodyState initial_body_state() {
  const L n = std::sqrt(
      initial_attitude[0] * initial_attitude[0] + initial_attitude[1] * initial_attitude[1] +
      initial_attitude[2] * initial_attitude[2] + initial_attitude[3] * initial_attitude[3]);
  return {initial_rate[0],         initial_rate[1],         initial_rate[2],
          initial_attitude[0] / n, initial_attitude[1] / n, initial_attitude[2] / n,
          initial_attitude[3] / n};
}

constexpr L tolerance =
    1e-17L;  // Odeint controlled stepper, absolute and relative (long double ε ≈ 1.1e-19)

auto reference_stepper() {
  return odeint::make_controlled(tolerance, tolerance,
                                 odeint::runge_kutta_fehlberg78<BodyState, L>());
}

// ω(t) from Euler's equations alone, integrated forward on demand from the last time asked for.
// The steppers ask for their stage times in increasing order; a time before the last one restarts
// from t = 0 (counted, so the test can show it never happens).
class EulerRateSource {
 public:
  EulerRateSource() { reset(); }
  Vector3<L> rate(L t) {
    if (t < time_) {
      reset();
      ++restarts_;
    }
    if (t > time_) {
      odeint::integrate_adaptive(
          odeint::make_controlled(tolerance, tolerance,
                                  odeint::runge_kutta_fehlberg78<RateState, L>()),
          [](const RateState& w, RateState& dw, L) { euler_equations(w.data(), dw.data()); },
          state_, time_, t, (t - time_) / 2);
      time_ = t;
    }
    return {state_[0], state_[1], state_[2]};
  }
  int restarts() const { return restarts_; }

 private:
  void reset() {
    state_ = {initial_rate[0], initial_rate[1], initial_rate[2]};
    time_ = 0;
  }
  RateState state_{};
  L time_ = 0;
  int restarts_ = 0;
};

constexpr double step = 1.0 / 1024;  // s, exact in binary
constexpr L step_ld = 1.0L / 1024;
constexpr int steps = 4096;  // 4 s: about 0.6 turn of the tumble

// The reference attitude at t_k = k·step, k = 0…steps (7-state Odeint solution).
std::vector<Quaternion<L>> reference_attitudes() {
  BodyState s = initial_body_state();
  std::vector<Quaternion<L>> out{{s[3], s[4], s[5], s[6]}};
  const auto system = [](const BodyState& x, BodyState& dx, L) {
    euler_equations(x.data(), dx.data());
    kinematics(x.data(), x.data() + 3, dx.data() + 3);
  };
  for (int k = 0; k < steps; ++k) {
    odeint::integrate_adaptive(reference_stepper(), system, s, static_cast<L>(k) * step_ld,
                               static_cast<L>(k + 1) * step_ld, step_ld / 4);
    out.push_back({s[3], s[4], s[5], s[6]});
  }
  return out;
}

const std::vector<Quaternion<L>>& reference() {
  static const std::vector<Quaternion<L>> r = reference_attitudes();
  return r;
}

// Largest angle (rad) between our stepper's attitude in double and the reference over the run.
template <class Stepper>
L worst_angle_against_reference(int* restarts) {
  EulerRateSource source;
  const BodyState s0 = initial_body_state();
  Quaternion<double> q{static_cast<double>(s0[3]), static_cast<double>(s0[4]),
                       static_cast<double>(s0[5]), static_cast<double>(s0[6])};
  L worst = 0;
  for (int k = 0; k < steps; ++k) {
    const L t0 = static_cast<L>(k) * step_ld;
    q = Stepper::step(
        q,
        [&](double tau) {
          const Vector3<L> w = source.rate(t0 + test::ld(tau));
          return Vector3<double>{static_cast<double>(w.x), static_cast<double>(w.y),
                                 static_cast<double>(w.z)};
        },
        step);
    const Quaternion<L> p{test::ld(q.w), test::ld(q.x), test::ld(q.y), test::ld(q.z)};
    worst = std::fmax(worst, angle_between(p, reference()[static_cast<std::size_t>(k + 1)]));
  }
  *restarts = source.restarts();
  return worst;
}

}  // namespace

TEST_CASE("the Odeint reference conserves energy and inertial angular momentum",
          "[odeint][reference]") {
  // Torque-free motion conserves kinetic energy ½ωᵀIω and the angular momentum R(q)·Iω in the
  // reference frame (common practice, no source): checks that the reference solution is accurate.
  BodyState s = initial_body_state();
  const auto energy = [](const BodyState& x) {
    return 0.5L * (inertia_x * x[0] * x[0] + inertia_y * x[1] * x[1] + inertia_z * x[2] * x[2]);
  };
  const auto momentum = [](const BodyState& x) {
    const Quaternion<L> q{x[3], x[4], x[5], x[6]};
    return rotate(q, Vector3<L>{inertia_x * x[0], inertia_y * x[1], inertia_z * x[2]});
  };
  const L e0 = energy(s);
  const Vector3<L> h0 = momentum(s);
  const auto system = [](const BodyState& x, BodyState& dx, L) {
    euler_equations(x.data(), dx.data());
    kinematics(x.data(), x.data() + 3, dx.data() + 3);
  };
  odeint::integrate_adaptive(reference_stepper(), system, s, 0.0L, static_cast<L>(steps) * step_ld,
                             1e-3L);
  CHECK(std::fabs(energy(s) - e0) < 1e-15L);
  CHECK(std::sqrt(squared_norm(momentum(s) - h0)) < 1e-15L);
  // And it matches the per-step reference used below (same integrator, different step pattern).
  CHECK(angle_between(Quaternion<L>{s[3], s[4], s[5], s[6]}, reference().back()) < 1e-15L);
}

TEST_CASE("the Odeint reference agrees with GSL's rk8pd", "[odeint][reference]") {
  // GSL gsl_odeiv2 with the rk8pd stepper (Prince–Dormand 8(9)) in double, tight tolerances: an
  // independent implementation of an independent method.
  gsl_odeiv2_system sys{[](double, const double y[], double dydt[], void*) -> int {
                          L w[3] = {test::ld(y[0]), test::ld(y[1]), test::ld(y[2])};
                          L q[4] = {test::ld(y[3]), test::ld(y[4]), test::ld(y[5]), test::ld(y[6])};
                          L dw[3], dq[4];
                          euler_equations(w, dw);
                          kinematics(w, q, dq);
                          for (int i = 0; i < 3; ++i) dydt[i] = static_cast<double>(dw[i]);
                          for (int i = 0; i < 4; ++i) dydt[3 + i] = static_cast<double>(dq[i]);
                          return GSL_SUCCESS;
                        },
                        nullptr, 7, nullptr};
  gsl_odeiv2_driver* driver =
      gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, 1e-3, 1e-15, 1e-15);
  const BodyState s0 = initial_body_state();
  double y[7];
  for (int i = 0; i < 7; ++i) y[i] = static_cast<double>(s0[static_cast<std::size_t>(i)]);
  double t = 0;
  L worst = 0;
  bool ok = true;
  for (int k = 1; k <= steps; k *= 2) {
    ok = ok && gsl_odeiv2_driver_apply(driver, &t, k * step, y) == GSL_SUCCESS;
    const Quaternion<L> q{test::ld(y[3]), test::ld(y[4]), test::ld(y[5]), test::ld(y[6])};
    worst = std::fmax(worst, angle_between(q, reference()[static_cast<std::size_t>(k)]));
  }
  gsl_odeiv2_driver_free(driver);
  test::report_worst("GSL rk8pd (double) vs Odeint rkf78 (long double), rad", worst);
  CHECK(ok);
  CHECK(worst < 1e-13L);
}

TEST_CASE("fourth- and fifth-order steppers agree with the Odeint reference within 1e-11 rad",
          "[odeint][reference]") {
  // Reference: Boost.Odeint runge_kutta_fehlberg78, controlled, long double, tolerances 1e-17.
  int restarts = 0;
  const L rk4 = worst_angle_against_reference<RungeKutta4RateFunction>(&restarts);
  CHECK(restarts == 0);
  const L rkmk4 = worst_angle_against_reference<MuntheKaas4RateFunction>(&restarts);
  CHECK(restarts == 0);
  const L dp54 = worst_angle_against_reference<DormandPrince54RateFunction>(&restarts);
  CHECK(restarts == 0);
  test::report_worst("RK4 rate function vs Odeint reference, rad", rk4);
  test::report_worst("RKMK4 rate function vs Odeint reference, rad", rkmk4);
  test::report_worst("DP54 rate function vs Odeint reference, rad", dp54);
  CHECK(rk4 < 1e-11L);  // issue 3's bound
  CHECK(rkmk4 < 1e-11L);
  CHECK(dp54 < 1e-11L);
  // Measured 1.1e-14, 7.7e-15, 9.5e-15 rad: at this step the truncation error is below the double
  // rounding of 4096 steps, so the agreement is at the roundoff level.
  CHECK(rk4 < 1e-13L);
  CHECK(rkmk4 < 1e-13L);
  CHECK(dp54 < 1e-13L);
  // The comparison can fail: the second-order midpoint rule at the same step is far outside it
  // (and the third-order Bogacki–Shampine just outside: 1.1e-11, reported only).
  const L rk2 = worst_angle_against_reference<RungeKutta2MidpointRateFunction>(&restarts);
  const L bs32 = worst_angle_against_reference<BogackiShampine32RateFunction>(&restarts);
  test::report_worst("RK2 rate function vs Odeint reference, rad", rk2);
  test::report_worst("BS32 rate function vs Odeint reference, rad", bs32);
  CHECK(rk2 > 1e-8L);
}
