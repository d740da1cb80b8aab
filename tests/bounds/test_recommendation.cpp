// The recommendation (bounds/recommendation.hpp) on three invented scenarios, each worked out by
// hand below from leading-order formulas, then checked: the chosen stepper, and every candidate's
// bound within 15 % of the hand value (so the hand working, not just the decision, is checked).
// Sources of the hand formulas: the coning motion and its drift (Miller 1983), the coning
// algorithms' coefficients and residuals as derived in propagation/coning_compensation.hpp
// (Ignagni 1990), the rotation vector of a step Φ* = ∫ω + ½∫α×ω + … (Bortz 1971), the quadrature
// errors of the hold and trapezoid rules (common practice, no source), and the rounding model of
// roundoff_floor.hpp (Higham 2002). Costs: flops per step from each stepper's header divided by
// its periods per step: hold-end 51, midpoint-mean 55, RK2 interpolated 68, RK4 sampled
// 144/2 = 72, one-sample 48, two-sample 66/2 = 33, three-sample 96/3 = 32, four-sample
// 138/4 = 34.5 flops per gyro sample.
//
#include <catch2/catch.hpp>

#include <cmath>
#include <cstring>

#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

template <class T, std::size_t N>
void check_candidate(const Recommendation<T, N>& r, std::size_t i, const char* name,
                     double hand_bound, CandidateOutcome outcome, double cost) {
  const CandidateReport<T>& c = r.candidates[i];
  INFO(c.name << " bound " << test::ld(c.bound_rad) << " hand " << hand_bound << " cost "
              << test::ld(c.cost_flops_per_s));
  CHECK(std::strcmp(c.name, name) == 0);
  CHECK(std::fabs(static_cast<double>(c.bound_rad) / hand_bound - 1.0) <= 0.15);
  CHECK(c.outcome == outcome);
  CHECK(static_cast<double>(c.cost_flops_per_s) == Approx(cost).epsilon(1e-6));
}

}  // namespace

// How a coning horizon bound is worked by hand (the small-angle form of coning_error.hpp's
// closed form). Every step makes the same error up to a turn about the cone axis by λ = Ω·dt, so
// split the step's error rotation vector e in the cone's frame: the axial part e_ax repeats and
// adds up (N·e_ax after N steps); the lateral part e_lat turns by λ per step, and its running sum
// traces a circle of diameter e_lat/sin(λ/2), never more. The lateral error also lengthens the
// composed per-step rotation by e_lat²/(4·tan(λ/2)) (second order: cos(α/2) = cos(λ/2)cos(e/2) −
// …), which adds to the axial drift. Bound ≈ √((N·(e_ax + e_lat²/(4 tan(λ/2))))² +
// (e_lat/sin(λ/2))²)
// + roundoff. The error of a step in the body frame: with v the stepper's rotation vector,
// e ≈ v − Φ* − ½·v × Φ* (Baker–Campbell–Hausdorff to second order), Φ*'s axial part carrying the
// coning drift d = ½ sin²a (λ − sin λ) ≈ a²λ³/12 (a the half-angle, here λ = Ω·h per sample);
// seen from the body at the step's start the cone axis is (cos a, 0, sin a) and the lateral rate
// points along z, so e_ax = e_x + a·e_z.

// Scenario 1, a quiet platform (double): a gentle 1e-3 rad wobble at 0.5 Hz (coning), rate gyro
// at 1 kHz, 10 minutes. Ω = π rad/s, h = 1 ms, λ = Ωh = π·1e-3, d = a²λ³/12 = 2.584e-15 rad;
// N = 600 000 steps of one period for every candidate except RK4 sampled (two periods, 300 000).
// Roundoff (roundoff_floor.hpp, θ ≈ 3e-6 so its θ terms vanish): exponential-map family 18u per
// step (Hamilton product 16u, renormalization 2u), u = 2⁻⁵³ = 1.11e-16: 6e5·2.0e-15 = 1.2e-9;
// RK2 6u (sum of 2 weights 2·γ₂ = 4u, renormalization 2u): 4.0e-10; RK4 10u per step: 3e5·1.11e-15
// = 3.33e-10.
//   hold-end, v = h·ω(h): lateral quadrature error ≈ ω̇h²/2 = Ω² sin a h²/2 = 4.935e-9, bounded
//     part e_lat/sin(λ/2) = Ωh·sin a = 3.1416e-6; axial: e_x = −d + 3d (the BCH term, −½·v×Φ*
//     with v ∦ Φ*: ½·a²λ³/2) = 2d, e_z = −aλ³/3 (h·ω(h)'s in-phase part aλ cos λ against
//     a sin λ), e_ax = 2d − 4d = −2d: N·2d = 3.1e-9, and the lengthening e_lat²/(4 tan(λ/2))
//     = 3.9e-15 nearly cancels it; both are negligible against the lateral part.
//     Bound ≈ 3.1416e-6 + 1.2e-9 = 3.143e-6 rad.
//   midpoint-mean, v = h(ω(0) + ω(h))/2: exact axial, in-phase (z) trapezoid error −aλ³/12
//     = −2.584e-12, bounded part aλ³/12/(λ/2) = aλ²/6 = 1.645e-9; e_x = −d (no commutator; v ∥ ∫ω
//     so no BCH term), e_ax = −d − a·aλ³/12 = −2d: N·2d = 3.100e-9.
//     Bound ≈ √(3.100² + 1.645²)·1e-9 + 1.2e-9 = 3.510e-9 + 1.2e-9 = 4.71e-9 rad.
//   RK2 interpolated: the same lateral error; the product of its two slopes puts (h²/8)·ω(0) × ω(h)
//     = a²λ³/8 into the vector part against the truth's d = a²λ³/12: e_x = +a²λ³/24 = d/2,
//     e_ax = d/2 − d = −d/2: N·d/2 = 7.75e-10. Bound ≈ √(0.775² + 1.645²)·1e-9 + 4.0e-10
//     = 1.818e-9 + 0.40e-9 = 2.22e-9 rad.
//   RK4 sampled: truncation below 1e-14 here; bound = roundoff floor 3.33e-10 rad.
//   Budget 1e-5 rad: all meet; cheapest is hold-end (54 kflop/s) → exponential_map_hold_end.
//   Budget 1e-6 rad: hold-end (3.14e-6) fails; next cheapest meeting: midpoint-mean (58 kflop/s).
TEST_CASE("recommendation: quiet platform, the cheapest exponential-map step suffices",
          "[reference]") {
  MotionDescription<double> d{};
  d.coning = {1e-3, 0.5};
  const StepperList<ExponentialMapHoldEnd, ExponentialMapMidpointMean,
                    RungeKutta2MidpointInterpolated, RungeKutta4Sampled>
      list{};
  const auto loose = recommend_stepper(list, d, 1e-5, 600.0, 1000.0);
  REQUIRE(loose.found);
  CHECK(std::strcmp(loose.name, "exponential_map_hold_end") == 0);
  CHECK(loose.index == 0);
  check_candidate(loose, 0, "exponential_map_hold_end", 3.143e-6, CandidateOutcome::meets_budget,
                  54e3);
  check_candidate(loose, 1, "exponential_map_midpoint_mean", 4.71e-9,
                  CandidateOutcome::meets_budget, 58e3);
  check_candidate(loose, 2, "runge_kutta_2_midpoint_interpolated", 2.22e-9,
                  CandidateOutcome::meets_budget, 75e3);
  check_candidate(loose, 3, "runge_kutta_4_sampled", 3.33e-10, CandidateOutcome::meets_budget,
                  74.5e3);

  const auto tight = recommend_stepper(list, d, 1e-6, 600.0, 1000.0);
  REQUIRE(tight.found);
  CHECK(std::strcmp(tight.name, "exponential_map_midpoint_mean") == 0);
  CHECK(tight.candidates[0].outcome == CandidateOutcome::over_budget);  // why the cheaper failed
  CHECK(tight.cost_flops_per_s == Approx(58e3));
}

// Scenario 2, strong coning (double): 2e-3 rad at 50 Hz, 1 kHz delta-angles (hold-end on 1 kHz
// rates), 60 s, budget 5e-6 rad. λ = Ωh = 2π·50·1e-3 = 0.31416, sin²a = 4.0e-6,
// d = ½ sin²a (λ − sin λ) = ½·4e-6·5.142e-3 = 1.028e-8. Roundoff ≤ 1.2e-10 for every candidate.
//   hold-end: lateral e_lat = a·|λ e^{iλ/2} − 2 sin(λ/2)| = 2e-3·0.049213 = 9.843e-5 (≈ aλ²/2),
//     bounded part 9.843e-5/sin(λ/2) = 9.843e-5/0.15643 = 6.292e-4; axial −2d = −2.057e-8 per
//     step (as in scenario 1) plus the lengthening e_lat²/(4 tan(λ/2)) = 9.688e-9/0.63354
//     = 1.529e-8: net −5.28e-9 → ×6e4 = 3.17e-4. Bound ≈ √(6.292² + 3.17²)·1e-4 = 7.05e-4: fails.
//   one-sample (no coning term): e_ax = −d per step, lateral negligible → ×6e4 = 6.17e-4: fails
//   two-sample: its coning residual λ⁵/30·sin²a = 3.060e-3/30·4e-6 = 4.08e-10 per step of 2h
//     → ×3e4 = 1.22e-5 rad: fails
//   four-sample: its coning residual λ⁹/315·sin²a = 2.98e-5/315·4e-6 = 3.79e-13 per step of 4h
//     → ×1.5e4 = 5.68e-9; its larger but lateral third-Magnus error a³(4λ)⁵/240 = 1.04e-10 stays
//     within 1.04e-10/sin(2λ) = 1.8e-10 (the linear sum would have made it 1.57e-6); roundoff
//     3e-11: bound ≈ 5.7e-9 rad: meets.
//   Only a coning algorithm meets; the cheapest candidate, two-sample (34.5 kflop/s), fails on its
//   λ⁵ coning residual, so the answer is four-sample at 35.25 kflop/s.
TEST_CASE("recommendation: strong coning, only a coning algorithm meets the budget at 1 kHz",
          "[reference]") {
  MotionDescription<double> d{};
  d.coning = {2e-3, 50.0};
  const StepperList<ExponentialMapHoldEnd, Coning1Sample, Coning2Sample, Coning4Sample> list{};
  const auto r = recommend_stepper(list, d, 5e-6, 60.0, 1000.0);
  REQUIRE(r.found);
  CHECK(std::strcmp(r.name, "coning_4_sample") == 0);
  CHECK(r.cost_flops_per_s == Approx(35.25e3));
  check_candidate(r, 0, "exponential_map_hold_end", 7.05e-4, CandidateOutcome::over_budget, 54e3);
  check_candidate(r, 1, "coning_1_sample", 6.17e-4, CandidateOutcome::over_budget, 51e3);
  check_candidate(r, 2, "coning_2_sample", 1.22e-5, CandidateOutcome::over_budget, 34.5e3);
  check_candidate(r, 3, "coning_4_sample", 5.7e-9, CandidateOutcome::meets_budget, 35.25e3);
}

// Scenario 3, a float budget set by roundoff: 1e-3 rad coning at 1 Hz, 1 kHz samples, float.
// u = 2⁻²⁴ = 5.960e-8. θ = 2Ω sin(a/2)·dt ≤ 2.6e-5 rad, so the θ terms of the rounding model are
// negligible: per step 16u (Hamilton product, x = 2γ₄ ≈ 8u, angle 2x) + 2u (renormalization)
// = 18u = 1.073e-6 rad for the exponential-map family, 8u (sum over 4 weights, x = γ₄ ≈ 4u)
// + 2u = 10u = 5.96e-7 rad for RK4. Truncation is negligible, hold-end's too: its lateral error
// stays within Ωh·sin a = 6.3e-6 rad (scenario 1).
//   600 s, budget 0.2 rad: hold-end 6e5·1.073e-6 = 0.644; one-sample 6e5·1.073e-6
//   = 0.644; two-sample 3e5·1.073e-6 = 0.322; four-sample 1.5e5·1.073e-6 = 0.161; RK4 sampled
//   3e5·5.96e-7 = 0.179. Meeting: four-sample (35.25 kflop/s) and RK4 (74.5): answer four-sample;
//   the cheaper two-sample (33) fails on roundoff (twice the steps).
//   3600 s, budget 0.5 rad: the best floor is four-sample's 9e5·1.073e-6 = 0.966 rad: none meets.
TEST_CASE("recommendation: a float budget only the fewest-rounding choice meets, or none",
          "[reference]") {
  MotionDescription<float> d{};
  d.coning = {1e-3f, 1.0f};
  const StepperList<ExponentialMapHoldEnd, Coning1Sample, Coning2Sample, Coning4Sample,
                    RungeKutta4Sampled>
      list{};
  const auto r = recommend_stepper(list, d, 0.2f, 600.0f, 1000.0f);
  REQUIRE(r.found);
  CHECK(std::strcmp(r.name, "coning_4_sample") == 0);
  check_candidate(r, 0, "exponential_map_hold_end", 0.644, CandidateOutcome::over_budget, 54e3);
  check_candidate(r, 1, "coning_1_sample", 0.644, CandidateOutcome::over_budget, 51e3);
  check_candidate(r, 2, "coning_2_sample", 0.322, CandidateOutcome::over_budget, 34.5e3);
  check_candidate(r, 3, "coning_4_sample", 0.161, CandidateOutcome::meets_budget, 35.25e3);
  check_candidate(r, 4, "runge_kutta_4_sampled", 0.179, CandidateOutcome::meets_budget, 74.5e3);

  const auto none = recommend_stepper(list, d, 0.5f, 3600.0f, 1000.0f);
  CHECK_FALSE(none.found);
  CHECK(none.index == 5);
  for (const auto& c : none.candidates) {
    INFO(c.name << " " << c.bound_rad);
    CHECK(c.outcome == CandidateOutcome::over_budget);
  }
  CHECK(none.candidates[3].bound_rad == Approx(0.966).epsilon(0.05));
}

// Scenario 3 with the compensated accumulation: the same float platform, 600 s, budget 5e-4 rad.
// No candidate meets it by a bound with the plain accumulation (scenario 3: the best worst-case
// floor is four-sample's 0.161 rad). With the compensated one the floor is about
// c·u·(angle traversed) + N·c2·u² (roundoff_floor.hpp (c), own derivation): the coning rate is
// about α·2πf = 6.28e-3 rad/s, so 3.77 rad over 600 s. The rotation-vector steppers count their
// rounding depth (at most 13 + 2 for four-sample), the exponential 14 and the accumulation
// 9·2|δ|/θ ≤ 9, so c ≤ 40 and their floor is below 40·5.96e-8·3.77 + 6e5·72·3.55e-15 = 9.0e-6 +
// 1.5e-7; RK4 declares no depth and is charged its flops (149 + 2), its stage sum and the
// accumulation: c ≤ 151 + 4 + 2·9 = 173, floor below 3.9e-5. The truncation parts are those of
// scenario 3 (at most 6.3e-6). Every candidate meets the budget; the cheapest wins, its cost now
// with the compensated accumulation's 68 flops in place of the plain 32 (+36 per step):
//   hold-end (54 + 36)·1000 = 90e3, one-sample (51 + 36)·1000 = 87e3,
//   two-sample (69 + 36)·500 = 52.5e3, four-sample (141 + 36)·250 = 44.25e3,
//   RK4 (149 + 36)·500 = 92.5e3 flop/s: four-sample.
TEST_CASE("recommendation: the compensated accumulation, float over ten minutes", "[reference]") {
  MotionDescription<float> d{};
  d.coning = {1e-3f, 1.0f};
  const StepperList<ExponentialMapHoldEnd, Coning1Sample, Coning2Sample, Coning4Sample,
                    RungeKutta4Sampled>
      list{};
  CHECK_FALSE(recommend_stepper(list, d, 5e-4f, 600.0f, 1000.0f).found);
  const auto r = recommend_stepper<float, CompensatedAccumulation>(list, d, 5e-4f, 600.0f, 1000.0f);
  REQUIRE(r.found);
  CHECK(std::strcmp(r.name, "coning_4_sample") == 0);
  const char* names[] = {"exponential_map_hold_end", "coning_1_sample", "coning_2_sample",
                         "coning_4_sample", "runge_kutta_4_sampled"};
  const double costs[] = {90e3, 87e3, 52.5e3, 44.25e3, 92.5e3};
  const float bounds[] = {6.3e-6f + 9.2e-6f, 6.3e-6f + 9.2e-6f, 6.3e-6f + 9.2e-6f,
                          6.3e-6f + 9.2e-6f, 6.3e-6f + 3.9e-5f};
  for (std::size_t i = 0; i < 5; ++i) {
    const auto& c = r.candidates[i];
    INFO(c.name << " bound " << c.bound_rad << " cost " << c.cost_flops_per_s);
    CHECK(std::strcmp(c.name, names[i]) == 0);
    CHECK(c.outcome == CandidateOutcome::meets_budget);
    CHECK(c.bound_rad < bounds[i]);
    CHECK(static_cast<double>(c.cost_flops_per_s) == Approx(costs[i]).epsilon(1e-6));
  }
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
  const auto r = recommend_stepper(StepperList<bounds_test_only::TestOnlyUnboundedStepper>{}, d,
                                   1.0, 1.0, 100.0);
  CHECK_FALSE(r.found);
  CHECK(r.candidates[0].outcome == CandidateOutcome::no_bound);
}

TEST_CASE("recommendation: a tie in cost goes to the smaller bound, then to the earlier candidate",
          "[bounds]") {
  // The two three-sample coefficient sets cost the same (96 flops over 3 samples). At constant
  // rate both are exact (every cross product is of parallel vectors: common practice, no
  // source), so their bounds are their roundoff floors; under coning they differ. In either
  // case the choice must be the smaller bound, and on an exact tie the first listed: the
  // catalogue lists the derived set (coning_3_sample) before the published one (Miller's).
  MotionDescription<double> constant{};
  constant.maneuver = RateEnvelope<double>::constant_rate(2.0);
  MotionDescription<double> coning{};
  coning.coning = ConingSpec<double>{0.01, 20.0};
  for (const MotionDescription<double>* d : {&constant, &coning}) {
    const auto derived_first = recommend_stepper<double>(
        StepperList<Coning3Sample, Coning3SampleMiller>{}, *d, 1.0, 60.0, 1000.0);
    const auto published_first = recommend_stepper<double>(
        StepperList<Coning3SampleMiller, Coning3Sample>{}, *d, 1.0, 60.0, 1000.0);
    REQUIRE(derived_first.found);
    REQUIRE(published_first.found);
    const auto& a = derived_first.candidates;
    REQUIRE(a[0].cost_flops_per_s == a[1].cost_flops_per_s);
    INFO("derived " << a[0].bound_rad << " rad, Miller " << a[1].bound_rad << " rad");
    if (a[0].bound_rad == a[1].bound_rad) {
      CHECK(std::strcmp(derived_first.name, Coning3Sample::name) == 0);
      CHECK(std::strcmp(published_first.name, Coning3SampleMiller::name) == 0);
    } else {
      const char* smaller =
          a[0].bound_rad < a[1].bound_rad ? Coning3Sample::name : Coning3SampleMiller::name;
      CHECK(std::strcmp(derived_first.name, smaller) == 0);
      CHECK(std::strcmp(published_first.name, smaller) == 0);
    }
  }
  // The catalogue order the tools' candidate lists follow: derived before published.
  std::size_t derived = StepperCatalogue::size;
  std::size_t published = StepperCatalogue::size;
  for (std::size_t i = 0; i < StepperCatalogue::size; ++i) {
    if (std::strcmp(StepperCatalogue::names[i], Coning3Sample::name) == 0) {
      derived = i;
    }
    if (std::strcmp(StepperCatalogue::names[i], Coning3SampleMiller::name) == 0) {
      published = i;
    }
  }
  CHECK(derived < published);
  CHECK(published < StepperCatalogue::size);
}
