// Exponential-map steps with zero-order hold: exact for constant rate, and the one-step formulas.
#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// Runs `steps` steps of a rate-sample stepper on a constant-rate motion through the propagator and
// returns the angle (rad) to the closed form at the end.
template <class Stepper, class T>
T constant_rate_final_error(long steps, T sample_dt) {
  const ConstantRateMotion<long double> truth{Quaternion<long double>{0.9L, 0.1L, -0.3L, 0.2L},
                                              Vector3<long double>{0.7L, -1.1L, 0.4L}};
  const Quaternion<long double> q0 = normalized(truth.initial);
  const ConstantRateMotion<long double> motion{q0, truth.body_rate};
  const Quaternion<T> start{static_cast<T>(q0.w), static_cast<T>(q0.x), static_cast<T>(q0.y),
                            static_cast<T>(q0.z)};
  Propagator<T, Stepper, ExactRenormalization> p(start, GyroLimits<T>{T(10), T(1)});
  const Vector3<T> rate{static_cast<T>(motion.body_rate.x), static_cast<T>(motion.body_rate.y),
                        static_cast<T>(motion.body_rate.z)};
  const long samples =
      steps * static_cast<long>(periods_per_step(Stepper::layout, Stepper::window)) +
      (Stepper::layout == SampleLayout::rates_spanning ? 1 : 0);
  for (long k = 0; k < samples; ++k) {
    const Status s = p.push(rate, sample_dt);
    REQUIRE(!is_rejection(s));
  }
  REQUIRE(p.counters().steps == static_cast<std::uint64_t>(steps));
  const long double t_end =
      static_cast<long double>(samples -
                               (Stepper::layout == SampleLayout::rates_spanning ? 1 : 0)) *
      static_cast<long double>(sample_dt);
  const Quaternion<long double> exact = motion.attitude(t_end);
  const Quaternion<T> got = p.attitude();
  return static_cast<T>(angle_between(
      Quaternion<long double>{test::ld(got.w), test::ld(got.x), test::ld(got.y), test::ld(got.z)},
      exact));
}

}  // namespace

TEST_CASE("every stepper exact for constant rate ends 10^6 steps within 1e-10 rad",
          "[propagation][reference]") {
  // Closed form q(t) = q0 ⊗ exp(ω t/2) for constant ω (common practice, no source). The bound
  // 1e-10 rad is issue 3's; the residual is double rounding, ~1e6·ε·√(steps) at most.
  const long steps = 1000000;
  const double dt = 1e-3;
  const double e_end = constant_rate_final_error<ExponentialMapHoldEnd, double>(steps, dt);
  const double e_start = constant_rate_final_error<ExponentialMapHoldStart, double>(steps, dt);
  const double e_mean = constant_rate_final_error<ExponentialMapMidpointMean, double>(steps, dt);
  const double e_mid =
      constant_rate_final_error<ExponentialMapMidpointSample, double>(steps, dt / 2);
  const double e_magnus = constant_rate_final_error<Magnus4, double>(steps, dt / 2);
  test::report_worst("constant rate 1e6 steps exponential_map_hold_end [rad]", test::ld(e_end));
  test::report_worst("constant rate 1e6 steps exponential_map_hold_start [rad]", test::ld(e_start));
  test::report_worst("constant rate 1e6 steps exponential_map_midpoint_mean [rad]",
                     test::ld(e_mean));
  test::report_worst("constant rate 1e6 steps exponential_map_midpoint_sample [rad]",
                     test::ld(e_mid));
  test::report_worst("constant rate 1e6 steps magnus_4 [rad]", test::ld(e_magnus));
  CHECK(e_end <= 1e-10);
  CHECK(e_start <= 1e-10);
  CHECK(e_mean <= 1e-10);
  CHECK(e_mid <= 1e-10);
  CHECK(e_magnus <= 1e-10);
}

TEMPLATE_TEST_CASE("zero-order-hold steps apply the documented rate", "[propagation]", float,
                   double) {
  using T = TestType;
  test::RandomRotations rng(301);
  for (int n = 0; n < 1000; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const Vector3<T> a = rng.unit_vector<T>() * T(2), b = rng.unit_vector<T>(),
                     c = rng.unit_vector<T>();
    const T dt = T(0.01);
    REQUIRE(ExponentialMapHoldEnd::step<T>(q, {a}, dt) ==
            apply_increment(q, quaternion_exp_minus_one(a * dt)));
    REQUIRE(ExponentialMapHoldStart::step<T>(q, {a, b}, dt) ==
            apply_increment(q, quaternion_exp_minus_one(a * dt)));
    REQUIRE(ExponentialMapMidpointMean::step<T>(q, {a, b}, dt) ==
            apply_increment(q, quaternion_exp_minus_one((a + b) * (T(0.5) * dt))));
    REQUIRE(ExponentialMapMidpointSample::step<T>(q, {a, b, c}, dt) ==
            apply_increment(q, quaternion_exp_minus_one(b * dt)));
  }
}
