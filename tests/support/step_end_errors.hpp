#pragma once
// The attitude error at EVERY step end of a propagator run on a truth motion (max_error in
// propagation_runs.hpp keeps only the largest): for checking a bound after exactly k steps.
// Test-only.

#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "test_support.hpp"

namespace halfspin::test {

using LD = long double;

// Angles (rad) between the propagated and the true attitude after steps 1, 2, …, `steps` of
// Stepper in T (exact renormalization, plain accumulation), the gyro sampled every h seconds as the
// layout asks (delta-angles from the truth's integral, rates at the sample times); the first
// sample of a spanning window only opens it (propagator.hpp), so a step ends at
// k·periods_per_step·h.
template <class Stepper, class T, class Motion>
std::vector<long double> step_end_errors(const Motion& m, long double h, std::int64_t steps) {
  Propagator<T, Stepper, ExactRenormalization> p(narrow<T>(m.attitude(0)),
                                                 GyroLimits<T>{T(1e3), T(10)});
  std::vector<LD> errors;
  errors.reserve(static_cast<std::size_t>(steps));
  const auto record = [&](LD t) {
    errors.push_back(angle_between(widen(p.attitude()), m.attitude(t)));
  };
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    for (std::int64_t k = 0; k < steps; ++k) {
      const LD t0 = static_cast<LD>(k) * h;
      REQUIRE(p.advance([&](T tau) { return narrow<T>(m.rate(t0 + ld(tau))); },
                        static_cast<T>(h)) == Status::ok);
      record(static_cast<LD>(k + 1) * h);
    }
  } else {
    std::int64_t k = Stepper::layout == SampleLayout::rates_spanning ? 0 : 1;
    while (static_cast<std::int64_t>(errors.size()) < steps) {
      const LD t = static_cast<LD>(k) * h;
      const Vector3<T> sample = carries_delta_angles(Stepper::layout)
                                    ? narrow<T>(truth_delta_angle(m, t - h, t))
                                    : narrow<T>(m.rate(t));
      const Status s = p.push(sample, static_cast<T>(h));
      REQUIRE(!is_rejection(s));
      if (s == Status::ok) {
        record(t);
      }
      ++k;
    }
  }
  REQUIRE(static_cast<std::int64_t>(p.counters().steps) == steps);
  return errors;
}

}  // namespace halfspin::test
