// The bound's report (bounds/bound_report.hpp): a finite bound is reported ok with the value of
// error_bound_after_steps; a +∞ one names the derivative bound that is missing, or says the step
// is too large, or that the stepper has no bound. The needed derivative is checked against the
// bound itself with values of our own choosing, different from the report's probe values
// (supplying D_0..D_k makes the bound finite, supplying only D_0..D_(k−1) does not), for every
// stepper of the catalogue; the named cases are the (Magnus 4 and classic Runge–Kutta 4
// with D0..D2 only). The step-size limit D0·dt ≤ 1 rad is the derivation's
// (magnus_family_bounds.hpp section 0, runge_kutta_bounds.hpp).
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdint>
#include <limits>

#include "catalogue_types.hpp"
#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"

using namespace halfspin;

namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

// D0..D2 known (max rate 3 rad/s, 30 rad/s², 300 rad/s³: invented numbers), the rest unknown.
template <class T>
MotionDescription<T> partial(std::size_t known) {
  const std::array<T, 6> values{T(3), T(30), T(300), T(3000), T(3e4), T(3e5)};
  MotionDescription<T> d{};
  d.maneuver = RateEnvelope<T>{};
  for (std::size_t k = 0; k < known; ++k) {
    d.maneuver.derivative[k] = values[k];
  }
  return d;
}

template <class Stepper, class T>
void check_needed_derivative_is_honest(std::size_t known) {
  const MotionDescription<T> d = partial<T>(known);
  const T dt = T(1e-3) * static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  const std::int64_t steps = 1000;
  const BoundReport<T> r = error_report_after_steps<Stepper, T>(d, dt, steps);
  INFO(Stepper::name << " " << (known) << " derivatives known, status "
                     << static_cast<int>(r.status) << ", needs D" << r.needed_derivative);
  CHECK(r.steps == steps);
  const T direct = error_bound_after_steps<Stepper, T>(d, dt, steps);
  if (std::isfinite(direct)) {
    CHECK(r.status == BoundStatus::ok);
    CHECK(r.value_rad == direct);
    return;
  }
  REQUIRE(r.status == BoundStatus::needs_derivative);
  CHECK(std::isinf(r.value_rad));
  const std::size_t k = r.needed_derivative;
  CHECK(k >= known);
  CHECK(k <= 5);
  // Our own values for the unknown ones: D_j = 3·10^j (a 10 rad/s bandwidth).
  MotionDescription<T> through_k = partial<T>(k + 1);
  CHECK(std::isfinite(error_bound_after_steps<Stepper, T>(through_k, dt, steps)));
  if (k > known) {
    MotionDescription<T> short_of_k = partial<T>(k);
    CHECK(std::isinf(error_bound_after_steps<Stepper, T>(short_of_k, dt, steps)));
  }
}

}  // namespace

TEMPLATE_LIST_TEST_CASE("bound report: the needed derivative, for every stepper", "[bounds]",
                        test::CatalogueSteppers) {
  for (std::size_t known = 1; known <= 6; ++known) {
    check_needed_derivative_is_honest<TestType, double>(known);
    check_needed_derivative_is_honest<TestType, float>(known);
  }
}

TEST_CASE("bound report: Magnus 4 and Runge-Kutta 4 with D0..D2 only", "[bounds]") {
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::from_rate_bounds(3.0, 30.0, 300.0);
  const double h = 1.0 / 2000;  // a 2 kHz gyro
  // Classic Runge–Kutta 4 on sampled rates: its bound needs D5 (runge_kutta_bounds.hpp: the
  // state-order remainder of a fourth-order method takes the fifth derivative of the rate).
  for (const BoundReport<double>& r :
       {horizon_error_report<RungeKutta4Sampled>(d, 2 * h, 1200.0),
        horizon_error_report<RungeKutta4RateFunction>(d, h, 1200.0),
        horizon_error_report<MuntheKaas4Sampled>(d, 2 * h, 1200.0)}) {
    CHECK(r.status == BoundStatus::needs_derivative);
    CHECK(r.needed_derivative == 5);
    CHECK(r.value_rad == inf);
  }
  CHECK(horizon_error_report<RungeKutta2MidpointSampled>(d, 2 * h, 1200.0).needed_derivative == 3);
  CHECK(horizon_error_report<RungeKutta3KuttaSampled>(d, 2 * h, 1200.0).needed_derivative == 4);
  // Magnus 4: its bound has a D0..D2 form (magnus_family_bounds.hpp sections 2 and 4, the
  // expansions stopped at D2), so D0..D2 give a finite bound: ok, not +∞. Knowing D3 and D4 makes
  // it much smaller (the Simpson and D3/D4 tiers).
  const BoundReport<double> magnus = horizon_error_report<Magnus4>(d, 2 * h, 1200.0);
  CHECK(magnus.status == BoundStatus::ok);
  CHECK(std::isfinite(magnus.value_rad));
  CHECK(magnus.value_rad == horizon_error_bound<Magnus4>(d, 2 * h, 1200.0));
  MotionDescription<double> more = d;
  more.maneuver.derivative[3] = 3000.0;
  more.maneuver.derivative[4] = 3e4;
  CHECK(horizon_error_report<Magnus4>(more, 2 * h, 1200.0).value_rad < magnus.value_rad);
  // Steppers that are fine with D0..D2: the two-sample coning algorithm and the midpoint step.
  for (const BoundReport<double>& r :
       {horizon_error_report<Coning2Sample>(d, 2 * h, 1200.0),
        horizon_error_report<ExponentialMapMidpointMean>(d, h, 1200.0)}) {
    CHECK(r.status == BoundStatus::ok);
    CHECK(std::isfinite(r.value_rad));
  }
  // Nothing known at all: the max rate is the first thing needed by every bound that
  // uses the envelope (the exponential-map hold step's bound is D0·D1·dt²-like: needs D1 too).
  MotionDescription<double> nothing{};
  nothing.maneuver = RateEnvelope<double>{};
  const BoundReport<double> none = horizon_error_report<ExponentialMapHoldEnd>(nothing, h, 10.0);
  CHECK(none.status == BoundStatus::needs_derivative);
  CHECK(none.needed_derivative == 1);
}

TEST_CASE("bound report: a step too large", "[bounds]") {
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::from_rate_bounds(3.0, 30.0, 300.0);
  // D0·dt = 3 · 0.5 = 1.5 rad > 1 rad: no derivative information helps.
  for (const BoundReport<double>& r : {horizon_error_report<Magnus4>(d, 0.5, 10.0),
                                       horizon_error_report<Coning2Sample>(d, 0.5, 10.0),
                                       horizon_error_report<RungeKutta4Sampled>(d, 0.5, 10.0)}) {
    CHECK(r.status == BoundStatus::step_too_large);
    CHECK(r.value_rad == inf);
  }
  // D0·dt ≤ 1 rad but a huge D1 pushes the local bound out of its range (≥ 2 rad): still
  // step_too_large, whatever D3.. would be.
  MotionDescription<double> violent{};
  violent.maneuver = RateEnvelope<double>{{3.0, 3e6, 3e9, 3e12, 3e15, 3e18}};
  const BoundReport<double> v = horizon_error_report<Magnus4>(violent, 0.3, 10.0);
  CHECK(std::isinf(horizon_error_bound<Magnus4>(violent, 0.3, 10.0)));
  CHECK(v.status == BoundStatus::step_too_large);
  // A tenth of the step brings D0·dt under 1 rad: then the report is about derivatives again.
  const MotionDescription<double> partial_d = partial<double>(3);
  CHECK(horizon_error_report<RungeKutta4Sampled>(partial_d, 0.05, 10.0).status ==
        BoundStatus::needs_derivative);
}

// A TEST-ONLY stepper with no LocalErrorBound (no family): no bound except under pure coning.
namespace bounds_test_only {
struct TestOnlyUnboundedStepper {
  static constexpr SampleLayout layout = SampleLayout::rate_at_end;
  static constexpr std::size_t window = 1;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 51;
  static constexpr const char* name = "test_only_unbounded";
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, 1>& w,
                            T dt) noexcept {
    return q * quaternion_exp(w[0] * dt);
  }
};
}  // namespace bounds_test_only

TEST_CASE("bound report: no bound for the stepper, and invalid arguments", "[bounds]") {
  using S = bounds_test_only::TestOnlyUnboundedStepper;
  static_assert(!has_local_error_bound<S, double>::value, "the test stepper has no bound");
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::constant_rate(1.0);
  CHECK(error_report_after_steps<S, double>(d, 1e-3, 10).status ==
        BoundStatus::no_bound_for_stepper);
  MotionDescription<double> cone{};
  cone.coning = {0.05, 4.0};
  const BoundReport<double> c = error_report_after_steps<S, double>(cone, 1e-3, 10);
  CHECK(c.status == BoundStatus::ok);  // pure coning: the exact per-step error of any stepper
  CHECK(std::isfinite(c.value_rad));

  CHECK(error_report_after_steps<Magnus4, double>(d, 0.0, 10).status ==
        BoundStatus::invalid_arguments);
  CHECK(error_report_after_steps<Magnus4, double>(d, std::nan(""), 10).status ==
        BoundStatus::invalid_arguments);
  CHECK(error_report_after_steps<Magnus4, double>(d, 1e-3, 0).status ==
        BoundStatus::invalid_arguments);
  CHECK(horizon_error_report<Magnus4>(d, 1e-3, -1.0).status == BoundStatus::invalid_arguments);
  CHECK(horizon_error_report<Magnus4>(d, 1e-3, inf).status == BoundStatus::invalid_arguments);
  MotionDescription<double> negative = d;
  negative.maneuver.derivative[2] = -1.0;
  CHECK(error_report_after_steps<Magnus4, double>(negative, 1e-3, 10).status ==
        BoundStatus::invalid_arguments);
}
