// The heart of the bounds: for every stepper, every truth motion (described the way a firmware
// engineer would describe it) and a sweep of 8 steps from coarse to fine, the a-priori horizon
// bound is never below the measured global error (safe), in float and in double. On constant rate
// (where only the Runge–Kutta family has truncation error) the bound is also tight: at most 10×
// the measured error where truncation dominates. (Tightness on coning is in test_coning_error.)
// With HALFSPIN_REPORT_WORST set, the worst and typical bound/measured ratios are printed.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "catalogue_types.hpp"
#include "described_motions.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/magnus_family_bounds.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/runge_kutta_bounds.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/two_gimbal.hpp"
#include "propagation_runs.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::LD;

namespace {

using test::described::body;
using test::described::coning;
using test::described::constant;
using test::described::describe_body;
using test::described::describe_coning;
using test::described::describe_constant;
using test::described::two_pi;

// The other truth motions (invented parameters) and how an engineer would describe each; constant
// rate, coning and the axisymmetric body are in described_motions.hpp.
const SingleAxisOscillation<LD> oscillation{normalized(Vector3<LD>{0.3L, -0.5L, 0.8L}), 0.2L, 3.0L,
                                            0.4L, Quaternion<LD>::identity()};
const TwoGimbalMotion<LD> gimbal{};

template <class T>
MotionDescription<T> describe_oscillation() {
  // ω = 2πfA·cos(2πft + phase)·n: a sinusoid of amplitude 2πfA along n.
  MotionDescription<T> d{};
  d.vibration.add(VibrationLine<T>::along_axis(
      static_cast<T>(oscillation.frequency),
      test::narrow<T>(oscillation.axis * (two_pi * oscillation.frequency * oscillation.amplitude)),
      static_cast<T>(oscillation.phase)));
  return d;
}

// The gimbal motion has no simple closed-form derivative bounds; as an engineer would, take the
// maxima over a fine grid of one period (1 s) of central finite differences in long double, with
// a 25 % margin for the grid and the differences (a test-side description, documented).
template <class T>
MotionDescription<T> describe_gimbal() {
  MotionDescription<T> d{};
  const LD h = 1e-3L;
  std::array<LD, 6> worst{};
  for (int i = 0; i <= 20000; ++i) {
    const LD t = static_cast<LD>(i) / 20000;
    // 7-point central differences for derivatives 1..5 (order-2 accurate in h is enough here).
    std::array<Vector3<LD>, 7> w{};
    for (int j = 0; j < 7; ++j) {
      w[static_cast<std::size_t>(j)] = gimbal.rate(t + static_cast<LD>(j - 3) * h);
    }
    const std::array<Vector3<LD>, 6> der{
        w[3],
        (w[4] - w[2]) / (2 * h),
        (w[4] - 2.0L * w[3] + w[2]) / (h * h),
        (w[5] - 2.0L * w[4] + 2.0L * w[2] - w[1]) / (2 * h * h * h),
        (w[5] - 4.0L * w[4] + 6.0L * w[3] - 4.0L * w[2] + w[1]) / (h * h * h * h),
        (w[6] - 4.0L * w[5] + 5.0L * w[4] - 5.0L * w[2] + 4.0L * w[1] - w[0]) /
            (2 * h * h * h * h * h)};
    for (std::size_t k = 0; k < 6; ++k) {
      worst[k] = std::fmax(worst[k], test::length_ld(der[k]));
    }
  }
  for (std::size_t k = 0; k < 6; ++k) {
    d.maneuver.derivative[k] = static_cast<T>(1.25L * worst[k]);
  }
  return d;
}

struct Ratios {
  double worst_margin = 1e300;  // smallest bound/measured seen (must stay ≥ 1)
  double largest = 0;           // largest bound/measured among truncation-dominated points
};

// Sweeps 8 sample periods from h0 down by halves over `horizon`; checks bound ≥ measured.
template <class Stepper, class T, class Motion>
Ratios check_safe(const char* motion_name, const Motion& m, const MotionDescription<T>& d, LD h0,
                  LD horizon) {
  Ratios r;
  const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  for (int j = 0; j < 8; ++j) {
    const LD h = h0 / std::pow(2.0L, j);
    const LD measured = test::max_error<Stepper, T>(m, h, horizon).error;
    const T dt = static_cast<T>(h) * periods;
    const LD bound = test::ld(horizon_error_bound<Stepper, T>(d, dt, static_cast<T>(horizon)));
    INFO(Stepper::name << " " << test::type_name<T>() << " on " << motion_name << ", h = "
                       << static_cast<double>(h) << ": measured " << static_cast<double>(measured)
                       << " rad, bound " << static_cast<double>(bound) << " rad");
    CHECK(bound >= measured);
    if (measured > 0) {
      r.worst_margin = std::fmin(r.worst_margin, static_cast<double>(bound / measured));
      r.largest = std::fmax(r.largest, static_cast<double>(bound / measured));
    }
  }
  return r;
}

template <class Stepper, class T>
void check_all_motions() {
  const std::string who = std::string(Stepper::name) + " " + test::type_name<T>();
  const Ratios a =
      check_safe<Stepper, T>("constant rate", constant, describe_constant<T>(), 1.0L / 16, 2.0L);
  const Ratios b = check_safe<Stepper, T>("oscillation", oscillation, describe_oscillation<T>(),
                                          1.0L / 32, 2.0L);
  const Ratios c = check_safe<Stepper, T>("coning", coning, describe_coning<T>(), 1.0L / 32, 2.0L);
  const Ratios e =
      check_safe<Stepper, T>("axisymmetric body", body, describe_body<T>(), 1.0L / 8, 4.0L);
  const Ratios g =
      check_safe<Stepper, T>("two gimbals", gimbal, describe_gimbal<T>(), 1.0L / 64, 1.0L);
  test::report_worst(
      "bound/measured, smallest over all motions " + who,
      test::ld(std::fmin(std::fmin(a.worst_margin, b.worst_margin),
                         std::fmin(c.worst_margin, std::fmin(e.worst_margin, g.worst_margin)))));
  test::report_worst("bound/measured, largest on coning " + who, test::ld(c.largest));
  test::report_worst("bound/measured, largest on the axisymmetric body " + who,
                     test::ld(e.largest));
  test::report_worst("bound/measured, largest on two gimbals " + who, test::ld(g.largest));
}

}  // namespace

// Every stepper of the catalogue (include/halfspin/propagation/stepper_catalogue.hpp), in float
// and double: a stepper added to the catalogue has its bound checked here without another list.
TEMPLATE_LIST_TEST_CASE("bounds are safe on five motions", "[bounds]", test::CatalogueSteppers) {
  check_all_motions<TestType, float>();
  check_all_motions<TestType, double>();
}

namespace {

// Constant rate, Runge–Kutta: the bound is N × the exact closed-form step error + the roundoff
// floor; where truncation dominates (measured above 100 floors) it is within 10× of the measured.
template <class Stepper>
void check_tight_at_constant_rate() {
  using T = double;
  const MotionDescription<T> d = describe_constant<T>();
  const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  double largest = 0;
  int counted = 0;
  // From θ = |ω|·dt ≈ 0.04 down: coarser steps make the roundoff model's stage-growth factor
  // (roundoff_floor.hpp) blow up, which is safe but not what this test is about.
  for (int j = 0; j < 8; ++j) {
    const LD h = (1.0L / 32) / static_cast<LD>(periods) / std::pow(2.0L, j);  // steps from 1/32 s
    const test::RunError run = test::max_error<Stepper, T>(constant, h, 2.0L);
    const LD floor = test::eps<T>() * std::sqrt(static_cast<LD>(run.steps));
    if (run.error < 100 * floor) {
      continue;
    }
    const LD bound =
        test::ld(horizon_error_bound<Stepper, T>(d, static_cast<T>(h) * periods, T(2)));
    INFO(Stepper::name << " at constant rate, h = " << static_cast<double>(h));
    CHECK(bound <= 10 * run.error);
    largest = std::fmax(largest, static_cast<double>(bound / run.error));
    ++counted;
  }
  CHECK(counted >= 4);
  test::report_worst(std::string("bound/measured at constant rate, largest ") + Stepper::name,
                     test::ld(largest));
}

}  // namespace

TEST_CASE("bounds are tight at constant rate for the Runge–Kutta family", "[bounds]") {
  check_tight_at_constant_rate<RungeKutta2MidpointSampled>();
  check_tight_at_constant_rate<RungeKutta3KuttaSampled>();
  check_tight_at_constant_rate<RungeKutta4Sampled>();
  check_tight_at_constant_rate<RungeKutta4RateFunction>();
  check_tight_at_constant_rate<BogackiShampine32RateFunction>();
}
