// The bound after exactly k steps (error_bound_after_steps, bounds/horizon_bound.hpp): it is the
// horizon form at horizon = k·dt (the definition: ceil(k·dt/dt) = k when k·dt is exact), it is
// non-decreasing in k (each term is; header comment), and it is never below the error measured
// at the step ends 1, 2, 3 and after a long run on truth motions with closed-form attitudes
// (constant rate: q0 ⊗ exp(ωt/2), common practice, no source; classical coning: Miller 1983, see
// REFERENCES.md; the torque-free axisymmetric body: common practice, no source). Also the mixed
// scalar rule: a double horizon with a float description gives the all-float answer. The parts
// (error_bound_parts_after_steps) are the terms the bound adds.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <vector>

#include "catalogue_types.hpp"
#include "described_motions.hpp"
#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/bounds/step_selection.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "step_end_errors.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::LD;

namespace {

using test::described::body;
using test::described::coning;
using test::described::constant;
using test::described::describe_body;
using test::described::describe_coning;
using test::described::describe_constant;

// Constant rate, coning and the axisymmetric body with their descriptions: described_motions.hpp.

// A maneuver envelope with every derivative known (invented numbers).
template <class T>
MotionDescription<T> describe_maneuver() {
  MotionDescription<T> d{};
  d.maneuver = RateEnvelope<T>{{T(2), T(8), T(40), T(200), T(1000), T(5000)}};
  return d;
}

template <class Stepper, class T>
void check_definition_and_monotone(const MotionDescription<T>& d) {
  const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  const T dt = periods / T(256);  // k·dt and k·dt/dt are exact in binary for the k below
  for (const std::int64_t k : {1, 2, 3, 7, 100, 4096}) {
    const T horizon = static_cast<T>(k) * dt;
    INFO(Stepper::name << " " << test::type_name<T>() << ", k = " << k);
    REQUIRE(steps_for_horizon(dt, horizon) == k);
    CHECK(error_bound_after_steps<Stepper, T>(d, dt, k) ==
          horizon_error_bound<Stepper, T>(d, dt, horizon));
    CHECK(error_bound_after_steps<Stepper, T, CompensatedAccumulation>(d, dt, k) ==
          horizon_error_bound<Stepper, T, CompensatedAccumulation>(d, dt, horizon));
    // ceil: half a step more is one step more.
    CHECK(steps_for_horizon(dt, horizon + dt / T(2)) == k + 1);
    // The parts a caller reads to say which term limits: each the function that defines it, and
    // their total the bound itself, bit for bit.
    const ErrorBoundParts<T> parts =
        error_bound_parts_after_steps<Stepper, T, CompensatedAccumulation>(d, dt, k);
    CHECK(parts.truncation == truncation_bound<Stepper>(d, dt, k));
    CHECK(parts.startup == startup_bound<Stepper>(d, dt));
    CHECK(parts.roundoff ==
          roundoff_floor_worst<Stepper, T, CompensatedAccumulation>(step_rotation_bound(d, dt), k));
    CHECK(parts.total() == error_bound_after_steps<Stepper, T, CompensatedAccumulation>(d, dt, k));
  }
  CHECK(error_bound_parts_after_steps<Stepper, T>(d, dt, 0).total() == T(0));
  CHECK(error_bound_after_steps<Stepper, T>(d, dt, 0) == T(0));
  CHECK(std::isnan(error_bound_after_steps<Stepper, T>(d, dt, -1)));
  // Non-decreasing: every k up to 300, then powers of two up to 2⁴⁰.
  T previous = T(0);
  for (std::int64_t k = 1; k <= 300; ++k) {
    const T b = error_bound_after_steps<Stepper, T>(d, dt, k);
    INFO(Stepper::name << " " << test::type_name<T>() << ", k = " << k);
    CHECK(b >= previous);
    previous = b;
  }
  for (std::int64_t k = 512; k <= (std::int64_t{1} << 40); k *= 2) {
    const T b = error_bound_after_steps<Stepper, T>(d, dt, k);
    CHECK(b >= previous);
    previous = b;
  }
}

}  // namespace

TEMPLATE_LIST_TEST_CASE("bound after k steps: the horizon form at k·dt, non-decreasing in k",
                        "[bounds]", test::CatalogueSteppers) {
  check_definition_and_monotone<TestType, float>(describe_maneuver<float>());
  check_definition_and_monotone<TestType, double>(describe_maneuver<double>());
  check_definition_and_monotone<TestType, float>(describe_coning<float>());
  check_definition_and_monotone<TestType, double>(describe_coning<double>());
  check_definition_and_monotone<TestType, double>(describe_body<double>());
}

namespace {

// error(k') ≤ bound(k') at k' = 1, 2, 3 and `long_k`, and the largest error over the whole run
// ≤ bound(long_k) (the bound after k steps holds at every earlier step end).
template <class Stepper, class T, class Motion>
void check_safe_after_steps(const char* motion_name, const Motion& m, const MotionDescription<T>& d,
                            LD h, std::int64_t long_k) {
  const T dt =
      static_cast<T>(h) * static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  const std::vector<LD> errors = test::step_end_errors<Stepper, T>(m, h, long_k);
  LD worst = 0;
  for (const LD e : errors) {
    worst = std::fmax(worst, e);
  }
  for (const std::int64_t k : {std::int64_t{1}, std::int64_t{2}, std::int64_t{3}, long_k}) {
    const LD bound = test::ld(error_bound_after_steps<Stepper, T>(d, dt, k));
    const LD measured = errors[static_cast<std::size_t>(k - 1)];
    INFO(Stepper::name << " " << test::type_name<T>() << " on " << motion_name << ", k = " << k
                       << ": measured " << static_cast<double>(measured) << " rad, bound "
                       << static_cast<double>(bound) << " rad");
    CHECK(bound >= measured);
  }
  CHECK(test::ld(error_bound_after_steps<Stepper, T>(d, dt, long_k)) >= worst);
}

template <class Stepper, class T>
void check_safe_all_motions() {
  check_safe_after_steps<Stepper, T>("constant rate", constant, describe_constant<T>(), 1.0L / 64,
                                     1000);
  check_safe_after_steps<Stepper, T>("coning", coning, describe_coning<T>(), 1.0L / 128, 1000);
  check_safe_after_steps<Stepper, T>("axisymmetric body", body, describe_body<T>(), 1.0L / 64,
                                     1000);
}

}  // namespace

TEMPLATE_LIST_TEST_CASE("bound after k steps is safe at k = 1, 2, 3 and 1000 on truth motions",
                        "[bounds][reference]", test::CatalogueSteppers) {
  check_safe_all_motions<TestType, float>();
  check_safe_all_motions<TestType, double>();
}

TEST_CASE("mixed scalar types: a double horizon with a float description", "[bounds]") {
  // The rule (horizon_bound.hpp): the horizon is converted to T with static_cast first, so the
  // answer is the all-float call's, bit for bit.
  const MotionDescription<float> d = describe_maneuver<float>();
  const float dt = 1.0f / 400;
  for (const double horizon : {0.1, 1.0, 600.0, 1234.5678}) {
    const float horizon_f = static_cast<float>(horizon);
    CHECK(steps_for_horizon(dt, horizon) == steps_for_horizon(dt, horizon_f));
    CHECK(horizon_error_bound<Magnus4>(d, dt, horizon) ==
          horizon_error_bound<Magnus4>(d, dt, horizon_f));
    CHECK(horizon_error_bound<Coning2Sample, float, CompensatedAccumulation>(d, dt, horizon) ==
          horizon_error_bound<Coning2Sample, float, CompensatedAccumulation>(d, dt, horizon_f));
    const BoundReport<float> a = horizon_error_report<RungeKutta4Sampled>(d, dt, horizon);
    const BoundReport<float> b = horizon_error_report<RungeKutta4Sampled>(d, dt, horizon_f);
    CHECK(a.value_rad == b.value_rad);
    CHECK(a.steps == b.steps);
    const StepSelection<float> s = select_step<Magnus4>(d, 1e-3f, horizon);
    const StepSelection<float> t = select_step<Magnus4>(d, 1e-3f, horizon_f);
    CHECK(s.status == t.status);
    CHECK(s.step_s == t.step_s);
    const auto r =
        recommend_stepper<float>(StepperList<Magnus4, Coning2Sample>{}, d, 1e-2f, horizon, 2000.0f);
    const auto u = recommend_stepper<float>(StepperList<Magnus4, Coning2Sample>{}, d, 1e-2f,
                                            horizon_f, 2000.0f);
    CHECK(r.index == u.index);
    CHECK(r.candidates[0].bound_rad == u.candidates[0].bound_rad);
    CHECK(r.candidates[1].bound_rad == u.candidates[1].bound_rad);
  }
  // An integer horizon too.
  CHECK(horizon_error_bound<Magnus4>(d, dt, 600) == horizon_error_bound<Magnus4>(d, dt, 600.0f));
}
