#pragma once
// Fixed-step drivers for order measurements of a stepper on a motion with closed-form truth,
// shared by the Runge–Kutta, embedded-pair and Lie-group tests. Test-only.

#include <array>
#include <cmath>
#include <cstddef>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "test_support.hpp"

namespace halfspin::test {

using L = long double;
// Global errors over a horizon: the largest attitude angle to the truth (rad, scale- and
// sign-insensitive) and the largest Euclidean distance of the unrenormalized quaternion state to
// the unit truth (sign-aligned; includes the norm error).
struct GlobalError {
  L angle = 0;
  L state = 0;
};

// Runs Stepper over `steps` equal steps of a motion with closed-form attitude(t) and rate(t); time
// is t = k·dt in long double (never accumulated), samples and dt are rounded once to T.
template <class Stepper, class T, class Motion>
GlobalError global_error(const Motion& motion, L horizon, int steps) {
  const L dt = horizon / steps;
  const T dt_t = static_cast<T>(dt);
  Quaternion<T> q = narrow<T>(motion.attitude(0));
  GlobalError e;
  for (int k = 0; k < steps; ++k) {
    const L t0 = static_cast<L>(k) * dt;
    if constexpr (Stepper::layout == SampleLayout::rate_function) {
      q = Stepper::step(
          q, [&](T tau) { return narrow<T>(motion.rate(t0 + test::ld(tau))); }, dt_t);
    } else {
      std::array<Vector3<T>, Stepper::window> rate{};
      for (std::size_t i = 0; i < Stepper::window; ++i) {
        rate[i] = narrow<T>(
            motion.rate(t0 + dt * static_cast<L>(i) / static_cast<L>(Stepper::window - 1)));
      }
      q = Stepper::step(q, rate, dt_t);
    }
    const Quaternion<L> truth = motion.attitude(static_cast<L>(k + 1) * dt);
    const Quaternion<L> p = widen(q);
    e.angle = std::fmax(e.angle, angle_between(p, truth));
    const Quaternion<L> d = p - (dot(p, truth) < 0 ? -truth : truth);
    e.state = std::fmax(e.state, std::sqrt(squared_norm(d)));
  }
  return e;
}
// Least-squares slope of log(error) against log(dt) = horizon/steps.
inline L fitted_order(const std::vector<int>& steps, const std::vector<L>& error) {
  const std::size_t n = steps.size();
  L sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const L x = -std::log(static_cast<L>(steps[i]));
    const L y = std::log(error[i]);
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  const L nn = static_cast<L>(n);
  return (nn * sxy - sx * sy) / (nn * sxx - sx * sx);
}

}  // namespace halfspin::test
