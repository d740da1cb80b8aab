// Observed global order of every stepper on three motions with exact truth: classical coning (at a
// cone angle large enough that the general, not coning-specific, error terms show), the
// torque-free axisymmetric body, and the two-gimbal motion (rate changing in direction and
// magnitude: the generic case). The observed order is the least-squares slope of log(error)
// against log(step) over the finest 4 steps of a sweep (ratio √2) whose error stays above the
// roundoff floor of the run, 3·ε·√(steps) (a random walk of ε-sized
// rounding errors, with margin; measured floors in float are 1–2·ε·√(steps)); each must be within
// ±0.2 of the order the stepper claims with its input. (The 2N coning orders of the N-sample coning
// algorithms under pure coning at small cone angles are measured in test_coning.) The global error
// is the largest angle between the propagated attitude and the truth at step ends over the horizon.
// With HALFSPIN_REPORT_WORST set, the table of observed orders is printed.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdio>
#include <string>
#include <type_traits>
#include <vector>

#include "catalogue_types.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "halfspin/truth/two_gimbal.hpp"
#include "propagation_runs.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::max_error;
using test::narrow;
using test::RunError;
using test::widen;

namespace {

using LD = long double;
constexpr LD two_pi = 6.283185307179586476925286766559005768L;

struct Sweep {
  std::vector<double> h, error, floor;  // sample period (s), error (rad), roundoff floor (rad)
};

// Sweeps the sample period from h0 down by factors of √2. The roundoff floor of a run is taken as
// ε·√(steps): rounding errors of order ε per step adding as a random walk (measured floors in
// float and double are 1–2 times that).
template <class Stepper, class T, class Accumulation = PlainAccumulation, class Motion>
Sweep sweep(const Motion& m, LD h0, LD horizon, int points) {
  Sweep s;
  for (int j = 0; j < points; ++j) {
    const LD h = h0 / std::pow(2.0L, 0.5L * static_cast<LD>(j));
    const RunError r = max_error<Stepper, T, Motion, Accumulation>(m, h, horizon);
    s.h.push_back(static_cast<double>(h));
    s.error.push_back(static_cast<double>(r.error));
    s.floor.push_back(static_cast<double>(test::eps<T>() * std::sqrt(static_cast<LD>(r.steps))));
  }
  return s;
}

// The finest 4 points whose error exceeds 100× the floor (so that rounding changes no point by
// more than about 1 %); empty if fewer than 4 qualify.
std::vector<std::size_t> fit_points(const Sweep& s) {
  std::vector<std::size_t> idx;
  for (std::size_t i = 0; i < s.h.size(); ++i) {
    if (s.error[i] > 100 * s.floor[i]) {
      idx.push_back(i);
    }
  }
  if (idx.size() < 4) {
    return {};
  }
  idx.erase(idx.begin(), idx.end() - 4);
  return idx;
}

// Least-squares slope of log(error) against log(h) over the given points, NaN if none.
double slope_over(const Sweep& s, const std::vector<std::size_t>& idx) {
  if (idx.empty()) {
    return std::nan("");
  }
  std::vector<double> hs, es;
  for (const std::size_t i : idx) {
    hs.push_back(s.h[i]);
    es.push_back(s.error[i]);
  }
  return test::log_log_slope(hs, es);
}

// The two motions (invented parameters). Coning: 0.2 rad half-angle at 2 Hz; body: a flattened
// axisymmetric body tumbling at about 1.7 rad/s.
const ClassicalConingMotion<LD> coning{0.2L, two_pi * 2};
const AxisymmetricBodyMotion<LD> body{
    normalized(Quaternion<LD>{0.9L, 0.2L, -0.3L, 0.1L}), 1.0L, 1.6L, 0.8L, 0.3L, 1.5L};
const TwoGimbalMotion<LD> gimbal{};

// The order expected on a motion. Coning and the axisymmetric body keep |ω| constant; on them the
// Dormand–Prince 5(4) attitude shows order 6 over every step where it can be measured in double
// (measured 5.9 and 5.8 here; 5.96 on coning in test_embedded_pairs), an observed fact we have not
// derived. On the generic two-gimbal motion it shows its order 5, but only at errors between about
// 1e-13 and 1e-17 rad, below double's rounding floor (≈ 4e-15 there): that check runs in long
// double (same code) in its own test case below, and the double sweep on the gimbal is only
// checked for tracking.
template <class Stepper>
int expected_order(bool constant_rate_magnitude) {
  if (std::is_same<Stepper, DormandPrince54RateFunction>::value) {
    return constant_rate_magnitude ? 6 : 0;  // 0: order measured in long double instead
  }
  return Stepper::order;
}

// Double: the observed order on each motion is within ±0.2 of the claimed one. Float: the float
// rounding floor leaves only coarse steps above 100 floors; where double's slope over those same
// steps is already within ±0.2 of the claim (the steps are in the asymptotic range), float's must
// be too; everywhere, the float error stays within 10 floors of the double error at the same step,
// i.e. float runs the same method and adds only its rounding.
template <class Stepper, class T, class Accumulation>
void check_orders_on(const char* motion_name, int want, const Sweep& s,
                     const Sweep& reference_double) {
  const std::string who = std::string(Stepper::name) + " " + test::type_name<T>() + " (" +
                          Accumulation::name + ") on " + motion_name;
  const std::vector<std::size_t> idx = fit_points(s);
  const double p = slope_over(s, idx);
  test::report_worst("order (claims " + std::to_string(want) + ") " + who, test::ld(p));
  INFO(who);
  if (want == 0) {
    // order measured elsewhere (see expected_order)
  } else if (!std::is_same<T, float>::value) {
    CHECK(std::fabs(p - want) <= 0.2);
  } else if (std::fabs(slope_over(reference_double, idx) - want) <= 0.2) {
    CHECK(std::fabs(p - want) <= 0.2);
  }
  for (std::size_t i = 0; i < s.h.size(); ++i) {
    CHECK(s.error[i] <= reference_double.error[i] + 10 * s.floor[i]);
  }
}

template <class Stepper, class T, class Accumulation = PlainAccumulation>
void check_orders() {
  // Coning: horizon 2 s (4 cone periods), sample period from 1/16 s. Body: horizon 4 s, from
  // 0.2 s. Gimbal (rates to about 12 rad/s): horizon 1 s, from 1/64 s.
  const Sweep cone = sweep<Stepper, T, Accumulation>(coning, 1.0L / 16, 2.0L, 14);
  const Sweep cone_double = sweep<Stepper, double>(coning, 1.0L / 16, 2.0L, 14);
  const Sweep bod = sweep<Stepper, T, Accumulation>(body, 0.2L, 4.0L, 14);
  const Sweep bod_double = sweep<Stepper, double>(body, 0.2L, 4.0L, 14);
  const Sweep gim = sweep<Stepper, T, Accumulation>(gimbal, 1.0L / 64, 1.0L, 14);
  const Sweep gim_double = sweep<Stepper, double>(gimbal, 1.0L / 64, 1.0L, 14);
  check_orders_on<Stepper, T, Accumulation>("coning", expected_order<Stepper>(true), cone,
                                            cone_double);
  check_orders_on<Stepper, T, Accumulation>("axisymmetric body", expected_order<Stepper>(true), bod,
                                            bod_double);
  check_orders_on<Stepper, T, Accumulation>("two gimbals", expected_order<Stepper>(false), gim,
                                            gim_double);
}

}  // namespace

// Every stepper of the catalogue (include/halfspin/propagation/stepper_catalogue.hpp), in float
// and double: a stepper added to the catalogue is measured here without another list.
TEMPLATE_LIST_TEST_CASE("observed orders on three motions", "[order]", test::CatalogueSteppers) {
  check_orders<TestType, float>();
  check_orders<TestType, double>();
}

// The same with the compensated accumulation (float: the policy the rounding matters for): the
// accumulation changes the rounding, never the method, so the orders and the tracking of the
// double error hold as for the plain one.
TEMPLATE_LIST_TEST_CASE("observed orders on three motions, compensated float accumulation",
                        "[order]", test::CatalogueSteppers) {
  check_orders<TestType, float, CompensatedAccumulation>();
}

TEST_CASE("observed order: Dormand–Prince 5(4) on the two-gimbal motion, in long double",
          "[order]") {
  using T = long double;
  const Sweep gim = sweep<DormandPrince54RateFunction, T>(gimbal, 1.0L / 64, 1.0L, 14);
  const double p = slope_over(gim, fit_points(gim));
  test::report_worst("order (claims 5) dormand_prince_54_rate_function long double on two gimbals",
                     test::ld(p));
  CHECK(std::fabs(p - 5) <= 0.2);
}
