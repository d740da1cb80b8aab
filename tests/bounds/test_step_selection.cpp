// Step selection (bounds/step_selection.hpp) on the coning path: the returned step meets the
// budget when the stepper is run on the classical-coning truth (truth/classical_coning.hpp;
// the motion of Miller 1983), and twice that step does not meet it by the bound (the step is not
// needlessly small). Also: the U shape (roundoff side) and the unreachable-budget status.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <string>

#include "halfspin/bounds/step_selection.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::narrow;
using test::widen;

namespace {

using LD = long double;
constexpr LD two_pi = 6.283185307179586476925286766559005768L;

// Largest angle (rad) to the truth at step ends over `steps` steps of length dt (s) of S in T,
// exact inputs rounded once to T, q/|q| after every step.
template <class S, class T>
LD run_on_coning(const ClassicalConingMotion<LD>& m, LD dt, std::int64_t steps) {
  constexpr std::size_t periods = periods_per_step(S::layout, S::window);
  const LD h = dt / static_cast<LD>(periods);
  Quaternion<T> q = narrow<T>(m.attitude(0));
  LD worst = 0;
  for (std::int64_t k = 0; k < steps; ++k) {
    const LD t0 = static_cast<LD>(k) * dt;
    std::array<Vector3<T>, S::window> in{};
    for (std::size_t i = 0; i < S::window; ++i) {
      const LD ki = static_cast<LD>(i);
      if constexpr (S::layout == SampleLayout::rates_spanning) {
        in[i] = narrow<T>(m.rate(t0 + ki * h));
      } else if constexpr (S::layout == SampleLayout::delta_angles) {
        in[i] = narrow<T>(m.delta_angle(t0 + ki * h, t0 + (ki + 1) * h));
      } else {
        static_assert(
            S::layout == SampleLayout::rates_spanning || S::layout == SampleLayout::delta_angles,
            "layouts used here");
      }
    }
    q = normalized(S::step(q, in, static_cast<T>(dt)));
    worst = std::fmax(worst, angle_between(widen(q), m.attitude(static_cast<LD>(k + 1) * dt)));
  }
  return worst;
}

template <class S, class T>
void check_selection(T half_angle, T frequency_hz, T budget, T horizon) {
  MotionDescription<T> d{};
  d.coning = {half_angle, frequency_hz};
  const StepSelection<T> sel = select_step<S>(d, budget, horizon);
  INFO(S::name << " " << test::type_name<T>() << " budget " << test::ld(budget) << " step "
               << test::ld(sel.step_s) << " bound " << test::ld(sel.bound_rad));
  REQUIRE(sel.status == StepSelectionStatus::ok);
  CHECK(sel.bound_rad <= budget);
  CHECK(sel.step_s >= sel.minimizing_step_s);
  CHECK(sel.update_rate_hz == T(1) / sel.step_s);
  CHECK(sel.sample_rate_hz == static_cast<T>(periods_per_step(S::layout, S::window)) / sel.step_s);
  // The returned step run on the truth meets the budget.
  const std::int64_t steps = steps_for_horizon(sel.step_s, horizon);
  const LD measured = run_on_coning<S, T>(
      ClassicalConingMotion<LD>{test::ld(half_angle), two_pi * test::ld(frequency_hz)},
      test::ld(sel.step_s), steps);
  INFO("measured " << static_cast<double>(measured));
  CHECK(measured <= test::ld(budget));
  // Twice the step: the bound misses the budget.
  CHECK(horizon_error_bound<S>(d, T(2) * sel.step_s, horizon) > budget);
  // And so does a step larger by the bisection tolerance (relative 1e-3), twice over.
  CHECK(horizon_error_bound<S>(d, sel.step_s * T(1.002), horizon) > budget);
  test::report_worst(
      std::string("selected step ") + S::name + " " + test::type_name<T>() + " measured/budget",
      measured / test::ld(budget));
}

}  // namespace

TEST_CASE("step selection: the returned step meets the budget on the truth, twice it does not",
          "[reference]") {
  // Coning 0.05 rad at 5 Hz, 1e-4 rad over 20 s in double; 1e-2 rad in float, whose roundoff
  // floor (~1e-6 rad per step) puts 1e-3 rad over 20 s out of reach.
  check_selection<Coning2Sample, double>(0.05, 5.0, 1e-4, 20.0);
  check_selection<Coning1Sample, double>(0.05, 5.0, 1e-4, 20.0);
  check_selection<Magnus4, double>(0.05, 5.0, 1e-4, 20.0);
  check_selection<ExponentialMapMidpointMean, double>(0.05, 5.0, 1e-2, 2.0);
  check_selection<RungeKutta4Sampled, double>(0.05, 5.0, 1e-4, 20.0);
  check_selection<Coning2Sample, float>(0.05f, 5.0f, 1e-2f, 20.0f);
  check_selection<Coning3Sample, float>(0.05f, 5.0f, 1e-2f, 20.0f);
}

TEST_CASE("step selection: the total is U-shaped and an unreachable budget is reported") {
  // Float, a 1e-5 rad budget over 600 s on mild coning: the roundoff floor alone (≥ 16u per step,
  // ~1e-6 rad) over the ≥ 600/dt steps needed exceeds the budget at every step size; the
  // truncation side rises at large steps.
  MotionDescription<float> d{};
  d.coning = {0.05f, 5.0f};
  const StepSelection<float> sel = select_step<Coning2Sample>(d, 1e-5f, 600.0f);
  INFO("minimizer " << sel.minimizing_step_s << " minimum " << sel.minimum_bound_rad);
  REQUIRE(sel.status == StepSelectionStatus::budget_unreachable);
  CHECK(sel.minimum_bound_rad > 1e-5f);
  CHECK(sel.step_s == sel.minimizing_step_s);
  const float dt = sel.minimizing_step_s;
  CHECK(horizon_error_bound<Coning2Sample>(d, dt / 8.0f, 600.0f) > sel.minimum_bound_rad);
  CHECK(horizon_error_bound<Coning2Sample>(d, dt * 8.0f, 600.0f) > sel.minimum_bound_rad);
  // Roundoff side: eight times more steps, about eight times the floor.
  const float fine = horizon_error_bound<Coning2Sample>(d, 1e-6f, 600.0f);
  const float finer = horizon_error_bound<Coning2Sample>(d, 1.25e-7f, 600.0f);
  CHECK(finer / fine > 7.0f);
  CHECK(finer / fine < 9.0f);
}

// The compensated accumulation (roundoff_floor.hpp (c)): where the plain float floor, N·18u, makes
// a budget unreachable at any step, the compensated floor, about c·u·(angle traversed) + N·c2·u²,
// does not grow as the step shrinks, so the same search finds a step that meets the budget by a
// bound (own derivation; the per-step form is checked against measured rounding in
// test_roundoff_floor.cpp).
TEST_CASE("step selection: float over a long horizon with the compensated accumulation") {
  MotionDescription<float> d{};
  d.coning = {1e-3f, 10.0f};
  const float budget = 5e-4f;
  const float horizon = 600.0f;
  REQUIRE(select_step<Coning4Sample>(d, budget, horizon).status ==
          StepSelectionStatus::budget_unreachable);
  const StepSelection<float> sel =
      select_step<Coning4Sample, float, CompensatedAccumulation>(d, budget, horizon);
  INFO("step " << sel.step_s << " bound " << sel.bound_rad);
  REQUIRE(sel.status == StepSelectionStatus::ok);
  const auto bound = [&](float dt) {
    return horizon_error_bound<Coning4Sample, float, CompensatedAccumulation>(d, dt, horizon);
  };
  CHECK(bound(sel.step_s) <= budget);
  CHECK(sel.bound_rad == bound(sel.step_s));
  CHECK(bound(sel.step_s * 1.01f) > budget);
  // Halving the step at the least bound changes the compensated floor by little (the angle
  // traversed is the same; only N·c2·u² doubles), where the plain floor doubles.
  const float fine = sel.minimizing_step_s;
  const float floor_fine = roundoff_floor_worst<Coning4Sample, float, CompensatedAccumulation>(
      step_rotation_bound(d, fine), steps_for_horizon(fine, horizon));
  const float floor_finer = roundoff_floor_worst<Coning4Sample, float, CompensatedAccumulation>(
      step_rotation_bound(d, fine / 2), steps_for_horizon(fine / 2, horizon));
  CHECK(floor_finer / floor_fine < 1.5f);
  const float plain_fine = roundoff_floor_worst<Coning4Sample, float>(
      step_rotation_bound(d, fine), steps_for_horizon(fine, horizon));
  const float plain_finer = roundoff_floor_worst<Coning4Sample, float>(
      step_rotation_bound(d, fine / 2), steps_for_horizon(fine / 2, horizon));
  CHECK(plain_finer / plain_fine > 1.9f);
}

TEST_CASE("step selection: invalid arguments are refused") {
  MotionDescription<double> d{};
  d.coning = {0.05, 5.0};
  CHECK(select_step<Coning2Sample>(d, -1.0, 10.0).status == StepSelectionStatus::invalid_arguments);
  CHECK(select_step<Coning2Sample>(d, 1e-3, 0.0).status == StepSelectionStatus::invalid_arguments);
  CHECK(select_step<Coning2Sample>(d, std::nan(""), 10.0).status ==
        StepSelectionStatus::invalid_arguments);
  StepSearch<double> s{};
  s.dt_min = 1.0;
  s.dt_max = 0.5;
  CHECK(select_step<Coning2Sample>(d, 1e-3, 10.0, s).status ==
        StepSelectionStatus::invalid_arguments);
}

// The non-coning path through a TEST-ONLY stepper with a TEST-ONLY LocalErrorBound (never a real
// stepper's: those bounds live in bounds/magnus_family_bounds.hpp and runge_kutta_bounds.hpp).
// Its "local bound" is c·D1·dt² with c = 1/2, so the horizon bound and the selected step have
// closed forms: B(dt) = ⌈H/dt⌉·D1·dt²/2 + floor; without roundoff, B ≈ H·D1·dt/2, so the
// largest step for a budget b is about 2b/(H·D1). Own arithmetic, checked against the code.
namespace bounds_test_only {
struct TestOnlyBoundedStepper {
  static constexpr SampleLayout layout = SampleLayout::rate_at_end;
  static constexpr std::size_t window = 1;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 51;
  static constexpr const char* name = "test_only_bounded";
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, 1>& w,
                            T dt) noexcept {
    return q * quaternion_exp(w[0] * dt);
  }
};
}  // namespace bounds_test_only

namespace halfspin {
template <>
struct LocalErrorBound<bounds_test_only::TestOnlyBoundedStepper> {
  template <class T>
  static T local(const RateEnvelope<T>& e, T dt) noexcept {
    return T(0.5) * e.derivative[1] * dt * dt;
  }
};
}  // namespace halfspin

TEST_CASE("step selection: non-coning motions use the stepper's LocalErrorBound") {
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::from_rate_bounds(1.0, 2.0, 4.0);
  REQUIRE_FALSE(d.is_pure_coning());
  const double dt = 1e-3;
  const double horizon = 10.0;
  const std::int64_t steps = steps_for_horizon(dt, horizon);
  CHECK(steps == 10000);
  const double floor =
      roundoff_floor_worst<bounds_test_only::TestOnlyBoundedStepper, double>(1.0 * dt, steps);
  CHECK(horizon_error_bound<bounds_test_only::TestOnlyBoundedStepper>(d, dt, horizon) ==
        Approx(10000.0 * 0.5 * 2.0 * dt * dt + floor).epsilon(1e-12));
  // Budget 1e-3 rad over 10 s with D1 = 2: dt ≈ 2·1e-3/(10·2) = 1e-4 s.
  const StepSelection<double> sel =
      select_step<bounds_test_only::TestOnlyBoundedStepper>(d, 1e-3, horizon);
  REQUIRE(sel.status == StepSelectionStatus::ok);
  CHECK(sel.step_s == Approx(1e-4).epsilon(2e-3));
  CHECK(sel.bound_rad <= 1e-3);
  // An unknown derivative (+∞) gives no bound.
  MotionDescription<double> unknown{};
  unknown.maneuver = RateEnvelope<double>{};
  CHECK(select_step<bounds_test_only::TestOnlyBoundedStepper>(unknown, 1e-3, horizon).status ==
        StepSelectionStatus::no_bound);
}
