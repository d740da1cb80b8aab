#pragma once
// Runs a stepper through the propagator on a truth motion and measures the global attitude error:
// shared by the order measurements and the error-bound checks. Test-only.

#include <catch2/catch.hpp>

#include <array>
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

// The sum over the run of max_error of each step's own error: the step taken from the exact
// attitude on the same samples, its increment normalized (as exact renormalization applies it),
// against the truth's relative rotation over the step. Rotations compose isometrically, so the
// run's error is at most this sum; a horizon bound that adds up local errors is at least it.
template <class Stepper, class T, class Motion>
LD local_error_sum(const Motion& m, LD h, LD horizon) {
  const long samples = std::lround(horizon / h);
  LD sum = 0;
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    for (long k = 0; k < samples; ++k) {
      const LD t0 = static_cast<LD>(k) * h;
      const Increment<T> inc = Stepper::template increment<T>(
          [&](T tau) { return narrow<T>(m.rate(t0 + test::ld(tau))); }, static_cast<T>(h));
      sum +=
          angle_between(m.attitude(t0) * normalized(Quaternion<LD>::identity() + widen(inc.delta)),
                        m.attitude(t0 + h));
    }
  } else {
    constexpr long periods = static_cast<long>(periods_per_step(Stepper::layout, Stepper::window));
    constexpr long window = static_cast<long>(Stepper::window);
    for (long last = periods; last <= samples; last += periods) {
      // The window of the step ending at sample `last`; a delta-angle layout's sample 0 is the
      // propagator's zero start value.
      std::array<Vector3<T>, Stepper::window> input{};
      for (long i = 0; i < window; ++i) {
        const long k = last - window + 1 + i;
        const LD t = static_cast<LD>(k) * h;
        if (carries_delta_angles(Stepper::layout)) {
          input[static_cast<std::size_t>(i)] =
              k >= 1 ? narrow<T>(truth_delta_angle(m, t - h, t)) : Vector3<T>{};
        } else {
          input[static_cast<std::size_t>(i)] = narrow<T>(m.rate(t));
        }
      }
      const Increment<T> inc =
          Stepper::template increment<T>(input, static_cast<T>(static_cast<LD>(periods) * h));
      const LD t1 = static_cast<LD>(last) * h;
      const LD t0 = t1 - static_cast<LD>(periods) * h;
      sum +=
          angle_between(m.attitude(t0) * normalized(Quaternion<LD>::identity() + widen(inc.delta)),
                        m.attitude(t1));
    }
  }
  return sum;
}

}  // namespace halfspin::test
