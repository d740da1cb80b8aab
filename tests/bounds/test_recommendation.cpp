// The recommendation (bounds/recommendation.hpp) on three invented scenarios, each worked out by
// hand below from leading-order formulas, then checked: the chosen stepper, and every candidate's
// bound within 15 % of the hand value (so the hand working, not just the decision, is checked).
// Sources of the hand formulas: the per-step coning errors of the coning algorithms as derived in
// propagation/coning_compensation.hpp (the coning motion: Miller 1983; coefficients: Ignagni
// 1990), the zero-order-hold error ∫(ω(h) − ω(τ))dτ ≈ ω̇h²/2 (common practice, no source), and
// the rounding model of roundoff_floor.hpp (Higham 2002). Costs: flops per step from each
// stepper's header divided by its periods per step: hold-end 51, midpoint-mean 55, RK2
// interpolated 68, RK4 sampled 144/2 = 72, one-sample 48, two-sample 66/2 = 33, three-sample
// 96/3 = 32, four-sample 138/4 = 34.5 flops per gyro sample.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstring>

#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

template <class T, std::size_t N>
void check_candidate(const Recommendation<T, N>& r, std::size_t i, const char* name, double hand_bound,
                     CandidateOutcome outcome, double cost) {
  const CandidateReport<T>& c = r.candidates[i];
  INFO(c.name << " bound " << test::ld(c.bound_rad) << " hand " << hand_bound << " cost "
              << test::ld(c.cost_flops_per_s));
  CHECK(std::strcmp(c.name, name) == 0);
  CHECK(std::fabs(static_cast<double>(c.bound_rad) / hand_bound - 1.0) <= 0.15);
  CHECK(c.outcome == outcome);
  CHECK(static_cast<double>(c.cost_flops_per_s) == Approx(cost).epsilon(1e-6));
}

}  // namespace

// Scenario 1, a quiet platform (double): a gentle 1e-3 rad wobble at 0.5 Hz (coning), rate gyro
// at 1 kHz, 10 minutes. Ω = π rad/s, h = 1 ms, 600 000 steps of one period for every candidate
// except RK4 sampled (two periods, 300 000 steps).
//   hold-end: local ≈ ω̇h²/2 = Ω² sin a h²/2 = 9.8696·1e-3·1e-6/2 = 4.935e-9 → ×6e5 = 2.961e-3 rad
//   midpoint-mean (trapezoid on ω, then exp): local ≈ |ω̈|h³/12 = Ω³ sin a h³/12
//     = 31.006·1e-3·1e-9/12 = 2.584e-12 → ×6e5 = 1.550e-6 rad
//   RK2 interpolated (midpoint rate = mean of the ends, same rotation vector to leading order):
//     also 1.550e-6 rad
//   RK4 sampled: truncation negligible here (≪ 1e-9); bound = roundoff floor 3e5·10u_d
//     = 3e5·10·1.11e-16 = 3.33e-10 rad
//   Budget 1e-2 rad: all meet; cheapest is hold-end (51 kflop/s) → expmap_hold_end.
//   Budget 1e-3 rad: hold-end (2.96e-3) fails; next cheapest meeting: midpoint-mean (55 kflop/s).
TEST_CASE("recommendation: quiet platform, the cheapest exponential-map step suffices",
          "[reference]") {
  MotionDescription<double> d{};
  d.coning = {1e-3, 0.5};
  const StepperList<ExpMapHoldEnd, ExpMapMidpointMean, RungeKutta2Interpolated, RungeKutta4Sampled>
      list{};
  const auto loose = recommend_stepper(list, d, 1e-2, 600.0, 1000.0);
  REQUIRE(loose.found);
  CHECK(std::strcmp(loose.name, "expmap_hold_end") == 0);
  CHECK(loose.index == 0);
  check_candidate(loose, 0, "expmap_hold_end", 2.961e-3, CandidateOutcome::meets_budget, 51e3);
  check_candidate(loose, 1, "expmap_midpoint_mean", 1.550e-6, CandidateOutcome::meets_budget, 55e3);
  check_candidate(loose, 2, "rk2_midpoint_interpolated", 1.550e-6, CandidateOutcome::meets_budget,
                  68e3);
  check_candidate(loose, 3, "rk4_sampled", 3.33e-10, CandidateOutcome::meets_budget, 72e3);

  const auto tight = recommend_stepper(list, d, 1e-3, 600.0, 1000.0);
  REQUIRE(tight.found);
  CHECK(std::strcmp(tight.name, "expmap_midpoint_mean") == 0);
  CHECK(tight.candidates[0].outcome == CandidateOutcome::over_budget);  // why the cheaper failed
  CHECK(tight.cost_flops_per_s == Approx(55e3));
}

// Scenario 2, strong coning (double): 2e-3 rad at 50 Hz, 1 kHz delta-angles (hold-end on 1 kHz
// rates), 60 s, budget 5e-6 rad. λ = Ωh = 2π·50·1e-3 = 0.31416, sin²a = 4.0e-6.
//   hold-end: Ω² sin a h²/2 = 98696·2e-3·1e-6/2 = 9.87e-5 per step → ×6e4 = 5.92 rad: fails
//   one-sample (no coning term): the coning drift ½ sin²a (λ − sin λ) = ½·4e-6·5.142e-3
//     = 1.028e-8 per step → ×6e4 = 6.17e-4 rad: fails
//   two-sample: λ⁵/30·sin²a = 3.060e-3/30·4e-6 = 4.08e-10 per step → ×3e4 = 1.22e-5 rad: fails
//   four-sample: its coning term λ⁹/315·sin²a = 3.8e-13 is swamped by the third Magnus term,
//     lateral a³(ΩT)⁵/240 with ΩT = 4λ = 1.2566: 8e-9·3.133/240 = 1.04e-10 per step
//     → ×1.5e4 = 1.57e-6 rad: meets.
//   Only a coning algorithm meets; the cheapest candidate, two-sample (33 kflop/s), fails on its
//   λ⁵ coning residual, so the answer is four-sample at 34.5 kflop/s.
TEST_CASE("recommendation: strong coning, only a coning algorithm meets the budget at 1 kHz",
          "[reference]") {
  MotionDescription<double> d{};
  d.coning = {2e-3, 50.0};
  const StepperList<ExpMapHoldEnd, ConingOneSample, ConingTwoSample, ConingFourSample> list{};
  const auto r = recommend_stepper(list, d, 5e-6, 60.0, 1000.0);
  REQUIRE(r.found);
  CHECK(std::strcmp(r.name, "coning_4_sample") == 0);
  CHECK(r.cost_flops_per_s == Approx(34.5e3));
  check_candidate(r, 0, "expmap_hold_end", 5.92, CandidateOutcome::over_budget, 51e3);
  check_candidate(r, 1, "coning_1_sample", 6.17e-4, CandidateOutcome::over_budget, 48e3);
  check_candidate(r, 2, "coning_2_sample", 1.22e-5, CandidateOutcome::over_budget, 33e3);
  check_candidate(r, 3, "coning_4_sample", 1.57e-6, CandidateOutcome::meets_budget, 34.5e3);
}

// Scenario 3, a float budget set by roundoff: 1e-3 rad coning at 1 Hz, 1 kHz samples, float.
// u = 2⁻²⁴ = 5.960e-8. θ = 2Ω sin(a/2)·dt ≤ 2.6e-5 rad, so the θ terms of the rounding model are
// negligible: per step 16u (Hamilton product, x = 2γ₄ ≈ 8u, angle 2x) + 2u (renormalization)
// = 18u = 1.073e-6 rad for the exponential-map family, 8u (sum over 4 weights, x = γ₄ ≈ 4u)
// + 2u = 10u = 5.96e-7 rad for RK4. Truncation is negligible except hold-end's 1.97e-8 per step
// (Ω² sin a h²/2 = 39.48·1e-3·1e-6/2).
//   600 s, budget 0.2 rad: hold-end 6e5·(1.073e-6 + 1.97e-8) = 0.656; one-sample 6e5·1.073e-6
//   = 0.644; two-sample 3e5·1.073e-6 = 0.322; four-sample 1.5e5·1.073e-6 = 0.161; RK4 sampled
//   3e5·5.96e-7 = 0.179. Meeting: four-sample (34.5 kflop/s) and RK4 (72): answer four-sample;
//   the cheaper two-sample (33) fails on roundoff (twice the steps).
//   3600 s, budget 0.5 rad: the best floor is four-sample's 9e5·1.073e-6 = 0.966 rad: none meets.
TEST_CASE("recommendation: a float budget only the fewest-rounding choice meets, or none",
          "[reference]") {
  MotionDescription<float> d{};
  d.coning = {1e-3f, 1.0f};
  const StepperList<ExpMapHoldEnd, ConingOneSample, ConingTwoSample, ConingFourSample,
                    RungeKutta4Sampled>
      list{};
  const auto r = recommend_stepper(list, d, 0.2f, 600.0f, 1000.0f);
  REQUIRE(r.found);
  CHECK(std::strcmp(r.name, "coning_4_sample") == 0);
  check_candidate(r, 0, "expmap_hold_end", 0.656, CandidateOutcome::over_budget, 51e3);
  check_candidate(r, 1, "coning_1_sample", 0.644, CandidateOutcome::over_budget, 48e3);
  check_candidate(r, 2, "coning_2_sample", 0.322, CandidateOutcome::over_budget, 33e3);
  check_candidate(r, 3, "coning_4_sample", 0.161, CandidateOutcome::meets_budget, 34.5e3);
  check_candidate(r, 4, "rk4_sampled", 0.179, CandidateOutcome::meets_budget, 72e3);

  const auto none = recommend_stepper(list, d, 0.5f, 3600.0f, 1000.0f);
  CHECK_FALSE(none.found);
  CHECK(none.index == 5);
  for (const auto& c : none.candidates) {
    INFO(c.name << " " << c.bound_rad);
    CHECK(c.outcome == CandidateOutcome::over_budget);
  }
  CHECK(none.candidates[3].bound_rad == Approx(0.966).epsilon(0.05));
}

// A candidate with no bound (a non-coning motion and no LocalErrorBound specialization in this
// translation unit for a test-only stepper) is reported as such, never chosen.
namespace bounds_test_only {
struct TestOnlyUnboundedStepper {
  static constexpr SampleLayout layout = SampleLayout::rate_at_end;
  static constexpr std::size_t window = 1;
  static constexpr std::size_t new_samples = 1;
  static constexpr int order = 1;
  static constexpr int flops = 1;
  static constexpr const char* name = "test_only_unbounded";
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, 1>&, T) noexcept {
    return q;
  }
};
}  // namespace bounds_test_only

TEST_CASE("recommendation: a stepper without a bound is listed as no_bound") {
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::constant_rate(1.0);
  const auto r = recommend_stepper(StepperList<bounds_test_only::TestOnlyUnboundedStepper>{}, d, 1.0, 1.0, 100.0);
  CHECK_FALSE(r.found);
  CHECK(r.candidates[0].outcome == CandidateOutcome::no_bound);
}
