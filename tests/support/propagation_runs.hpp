#pragma once
// Runs a stepper through the propagator on a truth motion and measures the global attitude error:
// shared by the order measurements and the error-bound checks. Test-only.

#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "test_support.hpp"

namespace halfspin::test {

using LD = long double;

struct RunError {
  LD error;  // largest angle (rad) between propagated and true attitude at step ends
  long steps;
};

// Propagates over [0, horizon] from the truth's attitude at 0 (exact renormalization, so only the
// attitude error counts), sampling the motion every h seconds as the stepper's layout asks, with
// the given accumulation policy (stepper_traits.hpp, compensated_accumulation.hpp).
template <class Stepper, class T, class Motion, class Accumulation = PlainAccumulation>
RunError max_error(const Motion& m, LD h, LD horizon) {
  Propagator<T, Stepper, ExactRenormalization, Accumulation> p(narrow<T>(m.attitude(0)),
                                                               GyroLimits<T>{T(1e3), T(10)});
  const long samples = std::lround(horizon / h);
  LD worst = 0;
  auto compare = [&](long k) {
    worst =
        std::fmax(worst, angle_between(widen(p.attitude()), m.attitude(static_cast<LD>(k) * h)));
  };
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    for (long k = 0; k < samples; ++k) {
      const LD t0 = static_cast<LD>(k) * h;
      REQUIRE(p.advance([&](T tau) { return narrow<T>(m.rate(t0 + test::ld(tau))); },
                        static_cast<T>(h)) == Status::ok);
      compare(k + 1);
    }
  } else {
    const long first = Stepper::layout == SampleLayout::rates_spanning ? 0 : 1;
    for (long k = first; k <= samples; ++k) {
      const LD t = static_cast<LD>(k) * h;
      const Vector3<T> sample = carries_delta_angles(Stepper::layout)
                                    ? narrow<T>(truth_delta_angle(m, t - h, t))
                                    : narrow<T>(m.rate(t));
      const Status s = p.push(sample, static_cast<T>(h));
      REQUIRE(!is_rejection(s));
      if (s == Status::ok) {
        compare(k);
      }
    }
  }
  return {worst, static_cast<long>(p.counters().steps)};
}

}  // namespace halfspin::test
