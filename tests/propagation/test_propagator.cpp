// The propagator: step cadence per input layout, equality with driving the stepper by hand,
// integer ticks, elapsed time, error-estimate plumbing, reset.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>

#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "propagation_test_steppers.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {
template <class T>
constexpr GyroLimits<T> limits{T(35), T(0.1)};  // 2000 °/s full scale; gaps above 100 ms
}

TEMPLATE_TEST_CASE("steps happen when the stepper's window is full", "[propagation]", float,
                   double) {
  using T = TestType;
  const Vector3<T> w{T(0.1), T(0.2), T(-0.3)};
  const T dt = T(1e-3);
  {
    Propagator<T, ExponentialMapHoldEnd> p(Quaternion<T>::identity(), limits<T>);
    for (int k = 1; k <= 5; ++k) {
      REQUIRE(p.push(w, dt) == Status::ok);
      REQUIRE(p.counters().steps == static_cast<std::uint64_t>(k));
    }
  }
  {
    Propagator<T, ExponentialMapMidpointMean> p(Quaternion<T>::identity(), limits<T>);
    REQUIRE(p.push(w, dt) == Status::waiting_for_samples);  // needs the step's start sample
    for (int k = 1; k <= 5; ++k) {
      REQUIRE(p.push(w, dt) == Status::ok);
      REQUIRE(p.counters().steps == static_cast<std::uint64_t>(k));
    }
  }
  {
    Propagator<T, Magnus4> p(Quaternion<T>::identity(), limits<T>);
    REQUIRE(p.push(w, dt) == Status::waiting_for_samples);
    REQUIRE(p.push(w, dt) == Status::waiting_for_samples);
    REQUIRE(p.push(w, dt) == Status::ok);
    REQUIRE(p.push(w, dt) == Status::waiting_for_samples);  // shares the boundary sample
    REQUIRE(p.push(w, dt) == Status::ok);
    REQUIRE(p.counters().steps == 2);
    REQUIRE(p.counters().samples_accepted == 5);
    REQUIRE(p.elapsed_seconds() == Approx(static_cast<double>(4 * dt)));
  }
  {
    Propagator<T, test::SummedDeltaAngles<3>> p(Quaternion<T>::identity(), limits<T>);
    for (int k = 1; k <= 9; ++k) {
      REQUIRE(p.push(w * dt, dt) == (k % 3 == 0 ? Status::ok : Status::waiting_for_samples));
    }
    REQUIRE(p.counters().steps == 3);
  }
  {
    Propagator<T, test::WithPreviousDeltaAngle> p(Quaternion<T>::identity(), limits<T>);
    REQUIRE(p.push(w * dt, dt) == Status::ok);  // the first step uses a zero previous sample
    REQUIRE(p.push(w * dt, dt) == Status::ok);
    REQUIRE(p.counters().steps == 2);
  }
}

TEMPLATE_TEST_CASE("the propagator reproduces the stepper driven by hand, bit for bit",
                   "[propagation]", float, double) {
  using T = TestType;
  test::RandomRotations rng(501);
  const Quaternion<T> q0 = rng.quaternion<T>();
  // The plain accumulation: the stepper's step() applies its increment plainly (the float
  // default, compensated, is held to the same steps in test_compensated_accumulation.cpp).
  Propagator<T, Magnus4, FirstOrderRenormalization, PlainAccumulation> p(q0, limits<T>);
  FirstOrderRenormalization policy;
  Quaternion<T> manual = q0;
  std::array<Vector3<T>, 3> window{};
  const T dt = T(5e-4);
  window[0] = rng.unit_vector<T>();
  REQUIRE(p.push(window[0], dt) == Status::waiting_for_samples);
  for (int n = 0; n < 500; ++n) {
    window[1] = rng.unit_vector<T>();
    window[2] = rng.unit_vector<T>();
    REQUIRE(p.push(window[1], dt) == Status::waiting_for_samples);
    REQUIRE(p.push(window[2], dt) == Status::ok);
    manual = policy.apply(Magnus4::step(manual, window, dt + dt));
    REQUIRE(p.attitude() == manual);
    window[0] = window[2];
  }
}

TEMPLATE_TEST_CASE("integer ticks: same steps as seconds, elapsed ticks exact", "[propagation]",
                   float, double) {
  using T = TestType;
  const T tick = T(1.0 / 32768.0);  // a 32.768 kHz timer: exact in binary
  Propagator<T, ExponentialMapMidpointMean> by_ticks(Quaternion<T>::identity(), limits<T>, tick);
  Propagator<T, ExponentialMapMidpointMean> by_seconds(Quaternion<T>::identity(), limits<T>);
  test::RandomRotations rng(502);
  for (int n = 0; n < 2000; ++n) {
    const Vector3<T> w = rng.unit_vector<T>();
    const std::uint32_t count = 32 + static_cast<std::uint32_t>(n % 3);  // ~1 kHz with jitter
    by_ticks.push(w, Ticks{count});
    by_seconds.push(w, static_cast<T>(count) * tick);
  }
  REQUIRE(by_ticks.attitude() == by_seconds.attitude());
  std::uint64_t expect = 0;
  for (int n = 0; n < 2000; ++n) {
    expect += 32 + static_cast<std::uint64_t>(n % 3);
  }
  REQUIRE(by_ticks.elapsed_ticks() == expect);
}

TEST_CASE("elapsed seconds keep float resolution over long runs (compensated sum)",
          "[propagation]") {
  // 10^6 steps of 1 ms in float: a naive float running sum is off by tens of milliseconds
  // (common practice, no source: spacing of float at 1000 is 6.1e-5); the compensated sum stays
  // within one float ulp of the exact sum of the float intervals.
  Propagator<float, ExponentialMapHoldEnd, NoRenormalization> p(Quaternion<float>::identity(),
                                                                limits<float>);
  const float dt = 1e-3f;
  float naive = 0.0f;
  for (int n = 0; n < 1000000; ++n) {
    p.push(Vector3<float>{0.0f, 0.0f, 0.1f}, dt);
    naive += dt;
  }
  const long double exact = 1e6L * test::ld(dt);
  const long double ulp = test::ld(std::nextafter(1000.0f, 2000.0f) - 1000.0f);
  REQUIRE(std::fabs(test::ld(p.elapsed_seconds()) - exact) <= ulp);
  REQUIRE(std::fabs(test::ld(naive) - exact) > 100 * ulp);  // what the compensation avoids
}

TEMPLATE_TEST_CASE("per-step error estimates are exposed and accumulated", "[propagation]", float,
                   double) {
  using T = TestType;
  Propagator<T, test::EstimatingHoldStart> p(Quaternion<T>::identity(), limits<T>);
  const T dt = T(0.01);
  REQUIRE(p.last_error_estimate() == T(0));
  p.push(Vector3<T>{1, 0, 0}, dt);
  p.push(Vector3<T>{1, 0, 0}, dt);
  REQUIRE(p.last_error_estimate() == T(0));
  p.push(Vector3<T>{1, T(0.5), 0}, dt);
  REQUIRE(p.last_error_estimate() == Approx(static_cast<double>(T(0.5) * dt)));
  p.push(Vector3<T>{1, T(0.5), T(2)}, dt);
  REQUIRE(p.last_error_estimate() == Approx(static_cast<double>(T(2) * dt)));
  REQUIRE(p.accumulated_error_estimate() == Approx(static_cast<double>(T(2.5) * dt)));
}

TEMPLATE_TEST_CASE("rate-function steppers are driven by advance()", "[propagation]", float,
                   double) {
  using T = TestType;
  Propagator<T, test::MidpointRateFunction> p(Quaternion<T>::identity(), limits<T>);
  const auto rate_at = [](T tau) { return Vector3<T>{T(0), T(0), T(2) * tau}; };
  REQUIRE(p.advance(rate_at, T(0.01)) == Status::ok);
  REQUIRE(p.attitude() == FirstOrderRenormalization{}.apply(
                              quaternion_exp(Vector3<T>{T(0), T(0), T(0.01) * T(0.01)})));
  REQUIRE(p.counters().steps == 1);
}

TEMPLATE_TEST_CASE("reset re-anchors the attitude and restarts the history", "[propagation]", float,
                   double) {
  using T = TestType;
  Propagator<T, Magnus4> p(Quaternion<T>::identity(), limits<T>);
  const Vector3<T> w{T(0.3), 0, 0};
  p.push(w, T(1e-3));
  p.push(w, T(1e-3));
  const Quaternion<T> fix{T(0.6), T(0.8), 0, 0};
  p.reset(fix);
  REQUIRE(p.attitude() == fix);
  REQUIRE(p.counters().discarded_samples == 2);
  REQUIRE(p.push(w, T(1e-3)) == Status::waiting_for_samples);
  REQUIRE(p.push(w, T(1e-3)) == Status::waiting_for_samples);
  REQUIRE(p.push(w, T(1e-3)) == Status::ok);
}

TEMPLATE_TEST_CASE("an embedded pair's estimate reaches the propagator through advance()",
                   "[propagation]", float, double) {
  using T = TestType;
  Propagator<T, DormandPrince54RateFunction> p(Quaternion<T>::identity(), limits<T>);
  // A rate that turns (so the two embedded solutions differ): ω(t) = (cos 3t, sin 3t, 0.5).
  T t0 = T(0);
  const T dt = T(0.02);
  T sum = T(0);
  for (int k = 0; k < 10; ++k) {
    const auto rate_at = [t0](T tau) {
      return Vector3<T>{std::cos(T(3) * (t0 + tau)), std::sin(T(3) * (t0 + tau)), T(0.5)};
    };
    const StepOutcome<T> direct =
        DormandPrince54RateFunction::step_with_estimate(p.attitude(), rate_at, dt);
    REQUIRE(p.advance(rate_at, dt) == Status::ok);
    REQUIRE(p.last_error_estimate() == direct.error_estimate);
    REQUIRE(p.last_error_estimate() > T(0));
    sum += direct.error_estimate;
    t0 = static_cast<T>(k + 1) * dt;
  }
  REQUIRE(p.accumulated_error_estimate() == Approx(static_cast<double>(sum)).epsilon(1e-5));
}
