// Bad input never corrupts state: every rejection class leaves the attitude bit-for-bit unchanged
// (memcmp) and the history untouched (the propagator then behaves exactly like a twin that never
// saw the bad sample), and is counted. The gap policy restarts the history.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "propagation_test_steppers.hpp"
#include "rejection_checks.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

template <class T>
constexpr GyroLimits<T> limits{T(35), T(0.1)};

using test::same_bits;

// Every input class against a twin (support/rejection_checks.hpp), on a plain propagator with a
// 35 rad/s gyro range and a 100 ms gap limit.
template <class T, class Stepper>
void check_all_classes(T scale, bool delta_angles) {
  const auto make = [](const Quaternion<T>& q0) {
    return Propagator<T, Stepper>(q0, limits<T>, T(1e-4));
  };
  test::check_every_input_class<T>(make, scale, delta_angles, 601);
}

}  // namespace

TEMPLATE_TEST_CASE("every bad-input class is rejected with its status and leaves state intact",
                   "[propagation]", float, double) {
  using T = TestType;
  check_all_classes<T, Magnus4>(T(1), false);                         // rates, window of 3
  check_all_classes<T, ExponentialMapHoldEnd>(T(1), false);           // rates, window of 1
  check_all_classes<T, test::SummedDeltaAngles<3>>(T(1e-3), true);    // delta-angles
  check_all_classes<T, test::WithPreviousDeltaAngle>(T(1e-3), true);  // with history
}

// The tick trap (issue 19): a propagator built without a usable tick period (the constructor's
// default 0, a negative one, NaN, infinity) must not turn push(…, Ticks) into a silent step of
// 0 s (which validation would call non_positive_step); each tick push is rejected with a status
// of its own, counted, and changes nothing, while pushes in seconds go on working.
TEMPLATE_TEST_CASE("ticks pushed without a tick period are rejected as no_tick_period",
                   "[propagation]", float, double) {
  using T = TestType;
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const T inf = std::numeric_limits<T>::infinity();
  const Vector3<T> w{T(0.1), T(-0.2), T(0.3)};
  for (const T period : {T(0), T(-1e-4), nan, inf}) {
    INFO("tick period " << period);
    const auto make = [period](const Quaternion<T>& q0) {
      return Propagator<T, Magnus4>(q0, limits<T>, period);
    };
    for (const std::uint32_t n : {0U, 1U, 10U}) {
      test::check_rejection_against_twin<T>(
          "ticks without a period", Status::no_tick_period, make,
          [&](auto& p) { return p.push(w, Ticks{n}); }, T(1), 602);
    }
    Propagator<T, ExponentialMapHoldEnd> p(Quaternion<T>::identity(), limits<T>, period);
    REQUIRE(p.push(w, Ticks{10}) == Status::no_tick_period);
    REQUIRE(p.elapsed_ticks() == 0);
    REQUIRE(p.push(w, T(1e-3)) == Status::ok);  // seconds still work
    REQUIRE(p.counters().rejected_no_tick_period == 1);
    REQUIRE(p.counters().rejected() == 1);
  }
  // With a period, ticks step as before, and zero ticks stay non_positive_step.
  Propagator<T, ExponentialMapHoldEnd> p(Quaternion<T>::identity(), limits<T>, T(1e-4));
  REQUIRE(p.push(w, Ticks{10}) == Status::ok);
  REQUIRE(p.elapsed_ticks() == 10);
  REQUIRE(p.push(w, Ticks{0}) == Status::non_positive_step);
  REQUIRE(p.counters().rejected_no_tick_period == 0);
  REQUIRE(std::string(status_name(Status::no_tick_period)) == "no_tick_period");
}

TEMPLATE_TEST_CASE("a gap is rejected, then the history restarts", "[propagation]", float, double) {
  using T = TestType;
  const T dt = T(1e-3);
  const Vector3<T> w{T(0.2), 0, 0};
  Propagator<T, Magnus4> p(Quaternion<T>::identity(), limits<T>);
  p.push(w, dt);
  p.push(w, dt);
  REQUIRE(p.push(w, dt) == Status::ok);                   // step 1 over samples 1–3
  REQUIRE(p.push(w, dt) == Status::waiting_for_samples);  // sample 4 waits
  const Quaternion<T> before = p.attitude();
  REQUIRE(p.push(w, T(0.5)) == Status::step_too_long);  // 500 ms since the last sample
  REQUIRE(same_bits(p.attitude(), before));
  REQUIRE(p.counters().rejected_step_too_long == 1);
  // After the gap the window starts again: sample 4 is discarded, three new samples make a step.
  REQUIRE(p.push(w, dt) == Status::waiting_for_samples);
  REQUIRE(p.counters().discarded_samples == 1);
  REQUIRE(p.push(w, dt) == Status::waiting_for_samples);
  REQUIRE(p.push(w, dt) == Status::ok);
  REQUIRE(p.counters().steps == 2);
}

TEMPLATE_TEST_CASE("a rate function that returns NaN is rejected and leaves state intact",
                   "[propagation]", float, double) {
  using T = TestType;
  const Quaternion<T> q0{T(0.6), 0, T(0.8), 0};
  Propagator<T, test::MidpointRateFunction> p(q0, limits<T>);
  const auto bad = [](T) { return Vector3<T>{std::numeric_limits<T>::quiet_NaN(), 0, 0}; };
  REQUIRE(p.advance(bad, T(0.01)) == Status::non_finite);
  REQUIRE(same_bits(p.attitude(), q0));
  REQUIRE(p.counters().rejected_non_finite == 1);
  REQUIRE(p.advance([](T) { return Vector3<T>{}; }, T(0)) == Status::non_positive_step);
  REQUIRE(p.advance([](T) { return Vector3<T>{}; }, T(1)) == Status::step_too_long);
  REQUIRE(same_bits(p.attitude(), q0));
}

// A stepper result that is not finite — which validated input cannot produce from a finite
// state, but an overflow inside the step can (here Simpson's 4·ω1 with ω1 near FLT_MAX, accepted
// by a gyro range set to FLT_MAX) — is rejected as non_finite with the attitude bit-for-bit
// unchanged, and the propagator keeps working once the window holds sane samples again.
TEST_CASE("a non-finite step result is rejected and leaves state intact", "[propagation]") {
  const float big = 3e38f;  // finite, in range, but 4·big overflows float
  const GyroLimits<float> wide{std::numeric_limits<float>::max(), 1.0f};
  const Quaternion<float> q0{0.6f, 0.0f, 0.8f, 0.0f};
  Propagator<float, Magnus4> p(q0, wide);
  const float dt = 1e-3f;
  const Vector3<float> w{0.1f, -0.2f, 0.3f};
  REQUIRE(p.push(w, dt) == Status::waiting_for_samples);
  REQUIRE(p.push(Vector3<float>{big, 0.0f, 0.0f}, dt) == Status::waiting_for_samples);
  REQUIRE(p.push(w, dt) == Status::non_finite);  // φ = dt/6·(ω0 + 4ω1 + ω2) overflows
  REQUIRE(same_bits(p.attitude(), q0));
  REQUIRE(p.counters().rejected_non_finite == 1);
  REQUIRE(p.counters().steps == 0);
  // Re-anchored, it steps normally and agrees with a fresh propagator bit for bit.
  p.reset(q0);
  Propagator<float, Magnus4> fresh(q0, wide);
  for (int k = 0; k < 7; ++k) {
    REQUIRE(p.push(w, dt) == fresh.push(w, dt));
    REQUIRE(same_bits(p.attitude(), fresh.attitude()));
  }
  REQUIRE(p.counters().steps == 3);
}

// Found by fuzzing (fuzz/fuzz_propagator.cpp; inputs in fuzz/regressions/fuzz_propagator/): a
// step result that is finite can renormalize to an attitude that is not. Classic RK4 over a step
// angle of √3·1000 rad/s·2 s ≈ 3500 rad (a gyro range and gap limit this wide make it valid input)
// returns ‖q‖² ≈ 1e23 in float. Before the fix the first-order Newton factor 3/2 − ‖q‖²/2 gave
// components near 3e34 whose squared norm overflows, and the step was taken (status ok) with that
// attitude. First-order renormalization now falls back to q/‖q‖ outside its Newton range
// (renormalization.hpp), so that step is taken with a unit attitude; the propagator's check of
// the renormalized result (‖q‖² positive and finite) is still what rejects a step whose own
// result overflows: 3e5 rad/s per axis over 1 s (rate function) or 2 s (samples) gives ‖q‖² beyond
// FLT_MAX (≈ 3.6e40 for 1 s: the θ⁴/24 term of P at θ/2 = 2.6e5), rejected as
// non_finite with the state intact, the policy's own state (a periodic counter) included.
TEST_CASE(
    "a step whose renormalized result or error estimate overflows is rejected with state intact",
    "[propagation]") {
  const GyroLimits<float> wide{1000.0f, 1.0f};
  const Quaternion<float> q0{0.6f, 0.0f, 0.8f, 0.0f};
  const Vector3<float> w{1000.0f, -1000.0f, 1000.0f};
  {
    // ‖q‖² ≈ 1e23 after the step: first order falls back to the exact form, a unit attitude.
    Propagator<float, RungeKutta4Sampled, FirstOrderRenormalization> taken(q0, wide);
    REQUIRE(taken.push(w, 1.0f) == Status::waiting_for_samples);
    REQUIRE(taken.push(w, 1.0f) == Status::waiting_for_samples);
    REQUIRE(taken.push(w, 1.0f) == Status::ok);
    REQUIRE(std::fabs(taken.norm_error()) <= 4 * std::numeric_limits<float>::epsilon());
  }
  const GyroLimits<float> huge{3e5f, 1.0f};
  const Vector3<float> w_huge{3e5f, -3e5f, 3e5f};
  Propagator<float, RungeKutta4Sampled, FirstOrderRenormalization> p(q0, huge);
  REQUIRE(p.push(w_huge, 1.0f) == Status::waiting_for_samples);
  REQUIRE(p.push(w_huge, 1.0f) == Status::waiting_for_samples);
  REQUIRE(p.push(w_huge, 1.0f) == Status::non_finite);
  REQUIRE(same_bits(p.attitude(), q0));
  REQUIRE(p.counters().rejected_non_finite == 1);
  REQUIRE(p.counters().steps == 0);
  REQUIRE(p.counters().samples_accepted == 2);
  // The rate-function path checks the same.
  Propagator<float, RungeKutta4RateFunction, FirstOrderRenormalization> f(q0, huge);
  REQUIRE(f.advance([&w_huge](float) { return w_huge; }, 1.0f) == Status::non_finite);
  REQUIRE(same_bits(f.attitude(), q0));
  // Periodic, every second step: the first step is kept as it is (‖q‖² ≈ 1e23, finite), the
  // second overflows inside the step and would have reached the Newton factor as −∞; it is
  // rejected and the policy's counter stays where the first step left it.
  PeriodicRenormalization<FirstOrderRenormalization> every_second{};
  every_second.period = 2;
  Propagator<float, RungeKutta4Sampled, PeriodicRenormalization<FirstOrderRenormalization>> r(
      q0, wide, 0.0f, every_second);
  for (int k = 0; k < 2; ++k) REQUIRE(r.push(w, 1.0f) == Status::waiting_for_samples);
  REQUIRE(r.push(w, 1.0f) == Status::ok);
  REQUIRE(r.renormalization().count == 1);
  const Quaternion<float> after_first = r.attitude();
  REQUIRE(r.push(w, 1.0f) == Status::waiting_for_samples);
  REQUIRE(r.push(w, 1.0f) == Status::non_finite);
  REQUIRE(r.counters().rejected_non_finite == 1);
  REQUIRE(r.renormalization().count == 1);
  REQUIRE(same_bits(r.attitude(), after_first));
  // An error estimate that overflows is rejected the same way: Bogacki–Shampine 3(2) over a step
  // of 3e5 rad/s per axis for 1 s returns ‖q‖² ≈ 9e30 (which exact renormalization would bring
  // back to unit) but 2‖q_high − q_low‖ = +∞ in float; before the fix only a NaN estimate was
  // rejected and the infinity entered last_error_estimate() and accumulated_error_estimate().
  const GyroLimits<float> wider{3e5f, 1.0f};
  Propagator<float, BogackiShampine32RateFunction, ExactRenormalization> b(q0, wider);
  const Vector3<float> fast{3e5f, -3e5f, 3e5f};
  REQUIRE(b.advance([&fast](float) { return fast; }, 1.0f) == Status::non_finite);
  REQUIRE(same_bits(b.attitude(), q0));
  REQUIRE(b.last_error_estimate() == 0.0f);
  REQUIRE(b.accumulated_error_estimate() == 0.0f);
  REQUIRE(b.counters().rejected_non_finite == 1);
  // With exact renormalization the same step keeps a unit attitude and is taken.
  Propagator<float, RungeKutta4Sampled, ExactRenormalization> e(q0, wide);
  static_cast<void>(e.push(w, 1.0f));
  static_cast<void>(e.push(w, 1.0f));
  REQUIRE(e.push(w, 1.0f) == Status::ok);
  REQUIRE(std::fabs(e.norm_error()) <= 4 * std::numeric_limits<float>::epsilon());
}
