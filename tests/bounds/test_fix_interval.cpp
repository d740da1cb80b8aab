// The longest time between attitude fixes (bounds/fix_interval.hpp): the count k returned meets
// the budget and k + 1 does not (by the bound after k steps, bounds/horizon_bound.hpp); it equals
// a scan of every count on small cases (pure coning, whose tight form is a minimum of two
// non-decreasing terms, included); the statuses for a budget no step meets, a budget met at every
// count up to the cap, and a missing derivative bound; and the error measured on truth motions
// with closed-form attitudes (classical coning: Miller 1983, REFERENCES.md; the torque-free
// axisymmetric body: common practice, no source) stays within the budget at every step end up to k.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <vector>

#include "catalogue_types.hpp"
#include "described_motions.hpp"
#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "step_end_errors.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::LD;

namespace {

using test::described::body;
using test::described::coning;
using test::described::describe_body;
using test::described::describe_coning;

// The answer against the definition: bound(k) ≤ budget < bound(k + 1), and against a scan of
// every count from 1 while the scan stays below `scan_limit` (returns whether it did).
template <class Stepper, class T, class Accumulation = PlainAccumulation>
bool check_against_scan(const MotionDescription<T>& d, T dt, T budget, std::int64_t scan_limit) {
  const FixInterval<T> f = longest_fix_interval<Stepper, T, Accumulation>(d, dt, budget);
  INFO(Stepper::name << " " << test::type_name<T>() << ", dt = " << static_cast<double>(dt)
                     << ", budget = " << static_cast<double>(budget) << ": " << f.steps
                     << " steps, status " << static_cast<int>(f.status));
  REQUIRE(f.status == FixIntervalStatus::ok);
  const auto bound = [&](std::int64_t k) {
    return error_bound_after_steps<Stepper, T, Accumulation>(d, dt, k);
  };
  CHECK(bound(f.steps) <= budget);
  CHECK(bound(f.steps + 1) > budget);
  CHECK(f.bound_rad == bound(f.steps));
  CHECK(f.next_bound_rad == bound(f.steps + 1));
  CHECK(f.interval_s == static_cast<T>(f.steps) * dt);
  std::int64_t scanned = 0;
  while (scanned < scan_limit && bound(scanned + 1) <= budget) {
    ++scanned;
  }
  if (scanned < scan_limit) {
    CHECK(scanned == f.steps);
    return true;
  }
  return false;
}

}  // namespace

TEMPLATE_LIST_TEST_CASE("fix interval: the largest count meeting the budget, against a scan",
                        "[bounds]", test::CatalogueSteppers) {
  using S = TestType;
  const std::int64_t periods = static_cast<std::int64_t>(periods_per_step(S::layout, S::window));
  // Budgets a few steps' and a few thousand steps' worth of the one-step bound.
  for (const double factor : {3.5, 40.0, 2500.0}) {
    {
      const MotionDescription<double> d = describe_coning<double>();
      const double dt = static_cast<double>(periods) / 256;
      const double budget = factor * error_bound_after_steps<S, double>(d, dt, 1);
      check_against_scan<S, double>(d, dt, budget, 20000);
      check_against_scan<S, double, CompensatedAccumulation>(d, dt, budget, 20000);
    }
    {
      const MotionDescription<float> d = describe_coning<float>();
      const float dt = static_cast<float>(periods) / 256;
      const float budget = static_cast<float>(factor) * error_bound_after_steps<S, float>(d, dt, 1);
      check_against_scan<S, float>(d, dt, budget, 20000);
    }
    {
      const MotionDescription<double> d = describe_body<double>();
      const double dt = static_cast<double>(periods) / 128;
      const double budget = factor * error_bound_after_steps<S, double>(d, dt, 1);
      // The linear form without a start-up term: bound(k) = k·bound(1), so k ≤ factor and the
      // scan always completes (a stepper with a start-up term can go much further).
      const bool scanned = check_against_scan<S, double>(d, dt, budget, 20000);
      CHECK((scanned || S::layout == SampleLayout::delta_angles_with_previous));
    }
  }
}

TEST_CASE("fix interval: statuses", "[bounds]") {
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::from_rate_bounds(3.0, 30.0, 300.0);
  // Not even one step.
  const FixInterval<double> tiny = longest_fix_interval<Magnus4, double>(d, 1e-3, 1e-15);
  CHECK(tiny.status == FixIntervalStatus::not_one_step);
  CHECK(tiny.steps == 0);
  CHECK(tiny.interval_s == 0.0);
  CHECK(tiny.next_bound_rad > 1e-15);
  // No motion at all in double: the bound is the rounding floor only, about 10⁻¹⁵ rad a step, so a
  // 1 rad budget holds at every count up to the cap 2⁴⁰.
  const MotionDescription<double> still{};
  const FixInterval<double> forever = longest_fix_interval<Magnus4, double>(still, 1e-3, 1.0);
  CHECK(forever.status == FixIntervalStatus::unbounded);
  CHECK(forever.steps == max_fix_steps);
  CHECK(forever.bound_rad <= 1.0);
  // A missing derivative: no bound, and the first step's report says which (D5 for classic
  // Runge–Kutta 4, bound_report.hpp).
  const FixInterval<double> missing =
      longest_fix_interval<RungeKutta4Sampled, double>(d, 1e-3, 1e-3);
  CHECK(missing.status == FixIntervalStatus::no_bound);
  CHECK(missing.first_step.status == BoundStatus::needs_derivative);
  CHECK(missing.first_step.needed_derivative == 5);
  // Invalid arguments.
  CHECK(longest_fix_interval<Magnus4, double>(d, 1e-3, -1.0).status ==
        FixIntervalStatus::invalid_arguments);
  CHECK(longest_fix_interval<Magnus4, double>(d, 0.0, 1e-3).status ==
        FixIntervalStatus::invalid_arguments);
  CHECK(longest_fix_interval<Magnus4, double>(d, 1e-3, std::nan("")).status ==
        FixIntervalStatus::invalid_arguments);
}

namespace {

// Run the stepper for the returned count on the truth: every step-end error ≤ budget.
template <class Stepper, class T, class Motion>
void check_safe(const char* motion_name, const Motion& m, const MotionDescription<T>& d, LD h,
                T budget) {
  const T dt =
      static_cast<T>(h) * static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  const FixInterval<T> f = longest_fix_interval<Stepper, T>(d, dt, budget);
  INFO(Stepper::name << " " << test::type_name<T>() << " on " << motion_name << ": " << f.steps
                     << " steps");
  REQUIRE(f.status == FixIntervalStatus::ok);
  REQUIRE(f.steps >= 1);
  REQUIRE(f.steps <= 1000000);
  const std::vector<LD> errors = test::step_end_errors<Stepper, T>(m, h, f.steps);
  LD worst = 0;
  for (const LD e : errors) {
    worst = std::fmax(worst, e);
  }
  INFO("largest measured " << static_cast<double>(worst) << " rad, budget "
                           << static_cast<double>(budget) << " rad");
  CHECK(worst <= test::ld(budget));
}

}  // namespace

TEMPLATE_LIST_TEST_CASE("fix interval: the measured error stays within the budget",
                        "[bounds][reference]", test::CatalogueSteppers) {
  using S = TestType;
  // Budgets of 50 one-step bounds: counts from 50 (linear form) to a few hundred thousand (the
  // tight coning form, where a mostly lateral error does not add up).
  const double periods = static_cast<double>(periods_per_step(S::layout, S::window));
  const double one_coning =
      error_bound_after_steps<S, double>(describe_coning<double>(), periods / 128, 1);
  check_safe<S, double>("coning", coning, describe_coning<double>(), 1.0L / 128, 50 * one_coning);
  const float one_coning_f = error_bound_after_steps<S, float>(
      describe_coning<float>(), static_cast<float>(periods) / 128, 1);
  check_safe<S, float>("coning", coning, describe_coning<float>(), 1.0L / 128, 50 * one_coning_f);
  const double one_body =
      error_bound_after_steps<S, double>(describe_body<double>(), periods / 64, 1);
  check_safe<S, double>("axisymmetric body", body, describe_body<double>(), 1.0L / 64,
                        50 * one_body);
}
