// The propagator's usual path against its general one: the one-pass acceptance of a sample
// (gyro_input.hpp: accepts_rate, accepts_delta_angle on finite_limits) accepts only what the full
// validation accepts, and exactly that with finite limits; and the near-unit form of the
// first-order renormalization (renormalization.hpp) keeps bit for bit what the general path keeps,
// with the plain and the compensated accumulation, on steps inside its range and outside it (there
// the propagator takes the policy's own form without the general path's checks; steps whose
// ‖q‖² is not a normal number, which only overflow makes, are test_bad_input.cpp's).
// Internal consistency: the general path is the reference (it is the one the bad-input, replay and
// bound tests were written against).
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <limits>

#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "rejection_checks.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

template <class T>
std::array<T, 15> special_values() {
  const T max = std::numeric_limits<T>::max();
  const T inf = std::numeric_limits<T>::infinity();
  return {T(0),
          -T(0),
          T(1e-3),
          T(-34.9),
          T(35),
          T(-35),
          T(35.001),
          T(1e30),
          max,
          -max,
          inf,
          -inf,
          std::numeric_limits<T>::quiet_NaN(),
          std::numeric_limits<T>::denorm_min(),
          -std::numeric_limits<T>::denorm_min()};
}

template <class T>
std::array<T, 11> special_steps() {
  const T max = std::numeric_limits<T>::max();
  return {T(-1),
          -T(0),
          T(0),
          std::numeric_limits<T>::denorm_min(),
          T(1e-3),
          T(0.1),
          T(0.1001),
          T(2),
          max,
          std::numeric_limits<T>::infinity(),
          std::numeric_limits<T>::quiet_NaN()};
}

// A first-order policy without the near-unit form: the propagator takes its general path on
// every step (apply and scaling are FirstOrderRenormalization's own).
struct GeneralFirstOrder {
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return FirstOrderRenormalization{}.apply(q);
  }
  template <class T>
  constexpr Scaling<T> scaling(const Quaternion<T>& q) noexcept {
    return FirstOrderRenormalization{}.scaling(q);
  }
};

}  // namespace

TEMPLATE_TEST_CASE("one-pass acceptance decides every sample as the full validation does",
                   "[propagation][input]", float, double) {
  using T = TestType;
  const T max = std::numeric_limits<T>::max();
  const T inf = std::numeric_limits<T>::infinity();
  const T nan = std::numeric_limits<T>::quiet_NaN();
  // Ordinary limits, unbounded ones, NaN ones, the largest finite ones, and a rate limit whose
  // product with a long step overflows.
  const std::array<GyroLimits<T>, 6> all_limits{
      {{T(35), T(0.1)}, {inf, inf}, {nan, nan}, {max, max}, {T(1e30), T(1e30)}, {T(0), T(0.1)}}};
  int accepted = 0;
  int cases = 0;
  int left_to_validation = 0;  // accepted by the validation only (an infinite or NaN limit)
  for (const GyroLimits<T>& limits : all_limits) {
    const GyroLimits<T> finite = finite_limits(limits);
    const bool limits_finite = limits.max_rate <= max && limits.max_step <= max;
    REQUIRE(finite.max_rate <= max);
    REQUIRE(finite.max_step <= max);
    for (const T x : special_values<T>()) {
      for (const T y : {T(0), T(-1e-3)}) {
        for (const T dt : special_steps<T>()) {
          for (int axis = 0; axis < 3; ++axis) {
            Vector3<T> s{y, y, y};
            (axis == 0 ? s.x : axis == 1 ? s.y : s.z) = x;
            INFO("limits " << limits.max_rate << ", " << limits.max_step << "; sample " << s.x
                           << ", " << s.y << ", " << s.z << "; dt " << dt);
            // Acceptance implies that the validation accepts; with finite limits, exactly then.
            const Status rate = validate_rate(s, dt, limits);
            const bool rate_accepted = accepts_rate(s, dt, finite);
            REQUIRE((!rate_accepted || rate == Status::ok));
            const Status delta = validate_delta_angle(s, dt, limits);
            const bool delta_accepted = accepts_delta_angle(s, dt, finite);
            REQUIRE((!delta_accepted || delta == Status::ok));
            if (limits_finite) {
              REQUIRE(rate_accepted == (rate == Status::ok));
              REQUIRE(delta_accepted == (delta == Status::ok));
            } else {
              left_to_validation += (delta == Status::ok && !delta_accepted) ? 1 : 0;
            }
            accepted += rate_accepted ? 1 : 0;
            ++cases;
          }
        }
      }
    }
  }
  // Both outcomes were exercised, and the case the propagator leaves to the validation occurs.
  REQUIRE(accepted > 0);
  REQUIRE(accepted < cases);
  REQUIRE(left_to_validation > 0);
}

namespace {

// Pushes the same samples through a propagator on the near-unit path and one on the general path
// and requires the same status, attitude bits and counters after every push. Steps of `small`
// rad/s stay inside the near-unit range; every seventh window is pushed at `large` rad/s over a
// 50 ms sample, where a Runge–Kutta step's norm leaves it (‖q‖² − 1 of order θ⁵/500 at θ = 1.5
// rad per step, against a range of 2⁻¹² in float and 2⁻²⁷ in double) and the general path runs.
template <class T, class Stepper, class Accumulation>
void check_same_bits() {
  INFO(Stepper::name << ", " << Accumulation::name);
  test::RandomRotations rng(733);
  const Quaternion<T> q0 = rng.quaternion<T>();
  const GyroLimits<T> limits{T(35), T(0.1)};
  Propagator<T, Stepper, FirstOrderRenormalization, Accumulation> fast(q0, limits);
  Propagator<T, Stepper, GeneralFirstOrder, Accumulation> general(q0, limits);
  constexpr bool deltas = carries_delta_angles(Stepper::layout);
  for (int n = 0; n < 2000; ++n) {
    const bool big = n % 7 == 3;
    const T dt = big ? T(0.05) : T(1e-3);
    const T rate = big ? T(30) : T(2);
    const Vector3<T> w = rng.unit_vector<T>() * rate;
    const Vector3<T> sample = deltas ? w * dt : w;
    REQUIRE(fast.push(sample, dt) == general.push(sample, dt));
    REQUIRE(test::same_bits(fast.attitude(), general.attitude()));
  }
  REQUIRE(fast.counters().steps == general.counters().steps);
  REQUIRE(fast.counters().rejected() == general.counters().rejected());
  REQUIRE(fast.counters().steps > 0);
  REQUIRE(test::same_bits(fast.elapsed_seconds(), general.elapsed_seconds()));
  REQUIRE(test::same_bits(fast.accumulated_error_estimate(), general.accumulated_error_estimate()));
  REQUIRE(fast.norm_error() == general.norm_error());
}

}  // namespace

TEMPLATE_TEST_CASE("the near-unit renormalization keeps what the general path keeps, bit for bit",
                   "[propagation][renormalization]", float, double) {
  using T = TestType;
  check_same_bits<T, ExponentialMapHoldEnd, PlainAccumulation>();
  check_same_bits<T, ExponentialMapHoldEnd, CompensatedAccumulation>();
  check_same_bits<T, Coning2Sample, PlainAccumulation>();
  check_same_bits<T, Coning2Sample, CompensatedAccumulation>();
  check_same_bits<T, Magnus4, PlainAccumulation>();  // with an error estimate
  check_same_bits<T, RungeKutta4Sampled, PlainAccumulation>();
  check_same_bits<T, RungeKutta4Sampled, CompensatedAccumulation>();
  // The premise that the large windows leave the near-unit range: one RK4 step over two 50 ms
  // samples at 30 rad/s about a fixed axis, from the identity.
  const Vector3<T> w = Vector3<T>{T(0.6), T(-0.48), T(0.64)} * T(30);
  const std::array<Vector3<T>, 3> window{w, w, w};
  const Quaternion<T> q = RungeKutta4Sampled::step(Quaternion<T>::identity(), window, T(0.1));
  REQUIRE(std::fabs(squared_norm(q) - T(1)) > FirstOrderRenormalization::near_unit_range<T>());
}
