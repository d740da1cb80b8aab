#pragma once
// The "bad input never corrupts state" check, shared by the plain propagator's tests
// (propagation/test_bad_input.cpp) and the calibrated propagator's (test_gyro_calibration.cpp):
// a propagator and a twin see the same good samples; one bad input is offered to the first only;
// then both see more good samples. The bad input must be rejected with its status, leave the
// attitude bit for bit (memcmp), be counted in its own class and nowhere else, and leave the
// history (and any stage state) untouched, which the identical continuation shows. Test-only.

#include <catch2/catch.hpp>

#include <cstdint>
#include <cstring>
#include <limits>
#include <type_traits>

#include "halfspin/propagation/propagator.hpp"
#include "test_support.hpp"

namespace halfspin::test {

// Bit-for-bit equality of two values of a trivially copyable type (a quaternion, a vector).
template <class V>
bool same_bits(const V& a, const V& b) {
  static_assert(std::is_trivially_copyable_v<V>);
  return std::memcmp(&a, &b, sizeof(V)) == 0;
}

// `make(q0)` builds a propagator anchored at q0 (called twice: the propagator and its twin);
// `offer_bad(p)` offers the bad input and returns its status; `scale` sizes the good samples
// (1 for rates, about dt for delta-angles).
template <class T, class Make, class Offer>
void check_rejection_against_twin(const char* what, Status expected, Make make, Offer offer_bad,
                                  T scale, std::uint64_t seed) {
  INFO(what);
  RandomRotations rng(seed);
  const Quaternion<T> q0 = rng.quaternion<T>();
  auto p = make(q0);
  auto twin = make(q0);
  const T dt = T(1e-3);
  for (int k = 0; k < 4; ++k) {  // leaves a multi-sample window partly filled
    const Vector3<T> s = rng.unit_vector<T>() * scale;
    p.push(s, dt);
    twin.push(s, dt);
  }
  const Quaternion<T> before = p.attitude();
  const PropagationCounters counted = p.counters();
  const Status got = offer_bad(p);
  REQUIRE(got == expected);
  REQUIRE(is_rejection(got));
  REQUIRE(same_bits(p.attitude(), before));
  const PropagationCounters now = p.counters();
  REQUIRE(now.rejected() == counted.rejected() + 1);
  REQUIRE(now.samples_accepted == counted.samples_accepted);
  REQUIRE(now.steps == counted.steps);
  const auto one_more = [](std::uint64_t after, std::uint64_t before_offer, bool this_class) {
    return after == before_offer + (this_class ? 1U : 0U);
  };
  REQUIRE(one_more(now.rejected_non_finite, counted.rejected_non_finite,
                   expected == Status::non_finite));
  REQUIRE(one_more(now.rejected_over_range, counted.rejected_over_range,
                   expected == Status::over_range));
  REQUIRE(one_more(now.rejected_non_positive_step, counted.rejected_non_positive_step,
                   expected == Status::non_positive_step));
  REQUIRE(one_more(now.rejected_step_too_long, counted.rejected_step_too_long,
                   expected == Status::step_too_long));
  REQUIRE(one_more(now.rejected_no_tick_period, counted.rejected_no_tick_period,
                   expected == Status::no_tick_period));
  for (int k = 0; k < 6; ++k) {
    const Vector3<T> s = rng.unit_vector<T>() * scale;
    REQUIRE(p.push(s, dt) == twin.push(s, dt));
    REQUIRE(same_bits(p.attitude(), twin.attitude()));
  }
  REQUIRE(p.counters().steps == twin.counters().steps);
}

// Every input-rejection class on every axis: NaN and ±∞ components, a component just over a
// 35 rad/s gyro range (36 rad/s, or 36 rad/s·dt as a delta-angle) of either sign, non-positive
// steps (zero, −0, negative, the negative denormal), zero ticks, and non-finite steps. The
// propagators `make` builds must have a 35 rad/s range and a gap limit above 1 ms.
template <class T, class Make>
void check_every_input_class(Make make, T scale, bool delta_angles, std::uint64_t seed) {
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const T inf = std::numeric_limits<T>::infinity();
  const T dt = T(1e-3);
  const Vector3<T> ok = Vector3<T>{T(0.1), T(-0.2), T(0.3)} * scale;
  const auto check = [&](const char* what, Status expected, auto offer) {
    check_rejection_against_twin<T>(what, expected, make, offer, scale, seed);
  };
  for (int axis = 0; axis < 3; ++axis) {
    for (const T bad : {nan, inf, -inf}) {
      Vector3<T> s = ok;
      (axis == 0 ? s.x : axis == 1 ? s.y : s.z) = bad;
      check("non-finite component", Status::non_finite, [&](auto& p) { return p.push(s, dt); });
    }
    for (const T sign : {T(1), T(-1)}) {
      Vector3<T> s = ok;
      (axis == 0 ? s.x : axis == 1 ? s.y : s.z) = sign * T(36) * (delta_angles ? dt : T(1));
      check("over range", Status::over_range, [&](auto& p) { return p.push(s, dt); });
    }
  }
  for (const T bad_dt : {T(0), T(-0.0), T(-1e-3), -std::numeric_limits<T>::denorm_min()}) {
    check("non-positive step", Status::non_positive_step,
          [&](auto& p) { return p.push(ok, bad_dt); });
  }
  check("zero ticks", Status::non_positive_step, [&](auto& p) { return p.push(ok, Ticks{0}); });
  for (const T bad_dt : {nan, inf, -inf}) {
    check("non-finite step", Status::non_finite, [&](auto& p) { return p.push(ok, bad_dt); });
  }
}

}  // namespace halfspin::test
