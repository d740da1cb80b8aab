#pragma once
// When no stepper meets the budget: which term of the bound limits, and what would meet it.
//
// The least bound at the gyro rate is split into its terms (error_bound_parts_after_steps:
// truncation, the first step's extra, rounding with the accumulation policy), and the one that
// alone exceeds the budget is named with what moves it: truncation falls with a faster gyro (as
// dtᵖ) and grows with the horizon; the rounding of plain accumulation grows with the number of
// steps (a faster gyro makes it worse), the compensated one with the angle traversed; both fall
// in double. Then the alternatives, on the same description and budget:
//   - a faster gyro in the same scalar and policy: the slowest gyro at which any candidate meets
//     the budget (select_step per candidate: its largest step, as a sample rate), up to
//     max_advised_gyro_hz;
//   - float only: the same with the compensated accumulation (when the study used plain) and in
//     double;
//   - a time between external attitude fixes: the longest over the candidates at this gyro rate
//     (longest_fix_interval);
//   - a larger budget: the least bound at this gyro rate.
//
// Tool code (not part of the installed library).

#include <cmath>
#include <cstdint>
#include <cstdio>
#include <string>
#include <type_traits>

#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/bounds/step_selection.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "interval_budget.hpp"
#include "method_registry.hpp"

namespace halfspin::tools::stepstudy {

// The fastest gyro the advice considers (Hz): MEMS gyros for flight control sample at up to a few
// tens of kHz (common practice, no source).
inline constexpr double max_advised_gyro_hz = 64000.0;

// The candidate with the least finite bound at a gyro rate, with its bound's parts.
template <class T>
struct LeastBound {
  bool found = false;
  std::string name;
  T step_s = T(0);
  ErrorBoundParts<T> parts{};
};

template <class T, class Accumulation, class... S>
LeastBound<T> least_bound(StepperList<S...> /*list*/, const MotionDescription<T>& d, T horizon_s,
                          T sample_rate_hz) {
  LeastBound<T> best;
  auto consider = [&](auto tag) {
    using St = typename decltype(tag)::type;
    const T dt = static_cast<T>(periods_per_step(St::layout, St::window)) / sample_rate_hz;
    const ErrorBoundParts<T> p =
        error_bound_parts_after_steps<St, T, Accumulation>(d, dt, steps_for_horizon(dt, horizon_s));
    if (std::isfinite(p.total()) && (!best.found || p.total() < best.parts.total())) {
      best.found = true;
      best.name = St::name;
      best.step_s = dt;
      best.parts = p;
    }
  };
  (consider(MethodTag<S>{}), ...);
  return best;
}

// The longest time between fixes over the candidates at a gyro rate.
template <class T>
struct LongestFixes {
  bool found = false;
  std::string name;
  FixInterval<T> interval{};
};

template <class T, class Accumulation, class... S>
LongestFixes<T> longest_fixes(StepperList<S...> /*list*/, const MotionDescription<T>& d,
                              const IntervalBudget& budget, double longest_s, T sample_rate_hz) {
  LongestFixes<T> best;
  auto consider = [&](auto tag) {
    using St = typename decltype(tag)::type;
    const T dt = static_cast<T>(periods_per_step(St::layout, St::window)) / sample_rate_hz;
    const FixInterval<T> f =
        longest_fix_interval_within<St, T, Accumulation>(d, dt, budget, longest_s);
    const bool usable =
        f.status == FixIntervalStatus::ok || f.status == FixIntervalStatus::unbounded;
    if (usable && (!best.found || f.interval_s > best.interval.interval_s)) {
      best.found = true;
      best.name = St::name;
      best.interval = f;
    }
  };
  (consider(MethodTag<S>{}), ...);
  return best;
}

// The slowest gyro (Hz) at which a candidate meets the budget: for each candidate the largest step
// meeting it (select_step), as a sample rate (its gyro periods per step over that step); the
// least over the candidates, up to max_advised_gyro_hz.
template <class T>
struct SlowestGyro {
  bool found = false;
  std::string name;
  StepSelection<T> selection{};
};

template <class T, class Accumulation, class... S>
SlowestGyro<T> slowest_gyro(StepperList<S...> /*list*/, const MotionDescription<T>& d, T budget_rad,
                            T horizon_s) {
  SlowestGyro<T> best;
  auto consider = [&](auto tag) {
    using St = typename decltype(tag)::type;
    const StepSelection<T> s = select_step<St, T, Accumulation>(d, budget_rad, horizon_s);
    if (s.status == StepSelectionStatus::ok &&
        static_cast<double>(s.sample_rate_hz) <= max_advised_gyro_hz &&
        (!best.found || s.sample_rate_hz < best.selection.sample_rate_hz)) {
      best.found = true;
      best.name = St::name;
      best.selection = s;
    }
  };
  (consider(MethodTag<S>{}), ...);
  return best;
}

// Prints, after `label`, the slowest gyro at which T with Accumulation meets the budget.
template <class T, class Accumulation, class List>
void print_slowest_gyro(const std::string& label, List list,
                        const MotionDescription<double>& d_double, double budget_rad,
                        double horizon_s, double gyro_hz) {
  const SlowestGyro<T> g = slowest_gyro<T, Accumulation>(
      list, d_double.converted<T>(), static_cast<T>(budget_rad), static_cast<T>(horizon_s));
  if (!g.found) {
    std::printf("    %s: no, at any gyro rate up to %g Hz\n", label.c_str(), max_advised_gyro_hz);
    return;
  }
  const double rate = static_cast<double>(g.selection.sample_rate_hz);
  std::printf("    %s: yes, from a %.0f Hz gyro (%s, step %.4e s, bound %.3e rad)%s\n",
              label.c_str(), std::ceil(rate), g.name.c_str(),
              static_cast<double>(g.selection.step_s), static_cast<double>(g.selection.bound_rad),
              rate <= gyro_hz ? "; at this gyro rate already" : "");
}

// The whole advice, for scalar T with Accumulation, printed when nothing meets the budget.
template <class T, class Accumulation, class List>
void print_what_would_meet(List list, const MotionDescription<double>& d_double, double budget_rad,
                           double horizon_s, double gyro_hz, const IntervalBudget& fix_budget) {
  const MotionDescription<T> d = d_double.converted<T>();
  const char* scalar = std::is_same<T, float>::value ? "float" : "double";
  const LeastBound<T> best =
      least_bound<T, Accumulation>(list, d, static_cast<T>(horizon_s), static_cast<T>(gyro_hz));
  std::printf("  why nothing meets it:\n");
  if (!best.found) {
    std::printf(
        "    no candidate has a finite bound for this description at %g Hz (the 'needs Dk' and\n"
        "    'step too large' notes above say why); give the missing derivative bounds\n",
        gyro_hz);
  } else {
    const ErrorBoundParts<T>& p = best.parts;
    const double truncation = static_cast<double>(p.truncation);
    const double startup = static_cast<double>(p.startup);
    const double roundoff = static_cast<double>(p.roundoff);
    std::printf(
        "    the least bound at %g Hz is %.3e rad (%s, step %.4e s) over %g s:\n"
        "    truncation %.3e rad + start-up %.3e rad + %s rounding (%s accumulation) %.3e rad\n",
        gyro_hz, static_cast<double>(p.total()), best.name.c_str(),
        static_cast<double>(best.step_s), horizon_s, truncation, startup, scalar,
        Accumulation::name, roundoff);
    if (roundoff > budget_rad && truncation > budget_rad) {
      std::printf(
          "    both truncation and %s's rounding alone exceed the budget: truncation falls with a\n"
          "    faster gyro (as step^order), rounding does not; both grow with the horizon\n",
          scalar);
    } else if (roundoff > budget_rad) {
      const bool plain = std::is_same<Accumulation, PlainAccumulation>::value;
      std::printf(
          "    the limit is %s's rounding: alone it exceeds the budget. It grows with the %s, so\n"
          "    a faster gyro %s for this method (another method, with its own rounding terms, may\n"
          "    still meet it, below); double%s or a shorter time between fixes reduce it\n",
          scalar, plain ? "number of steps" : "angle traversed",
          plain ? "makes it worse" : "does not help",
          plain && std::is_same<T, float>::value ? ", the compensated accumulation" : "");
    } else if (truncation > budget_rad) {
      std::printf(
          "    the limit is truncation: alone it exceeds the budget. It falls with a faster gyro\n"
          "    (as step^order) and grows with the horizon\n");
    } else if (startup > budget_rad) {
      std::printf("    the limit is the first step's extra error: alone it exceeds the budget\n");
    } else {
      std::printf("    no term alone exceeds the budget; their sum does\n");
    }
  }
  std::printf("  what would meet %.3e rad over %g s:\n", budget_rad, horizon_s);
  print_slowest_gyro<T, Accumulation>(
      std::string("a faster gyro, ") + scalar + ", " + Accumulation::name + " accumulation", list,
      d_double, budget_rad, horizon_s, gyro_hz);
  if constexpr (std::is_same<T, float>::value) {
    if constexpr (std::is_same<Accumulation, PlainAccumulation>::value) {
      print_slowest_gyro<float, CompensatedAccumulation>("float, compensated accumulation", list,
                                                         d_double, budget_rad, horizon_s, gyro_hz);
    }
    print_slowest_gyro<double, PlainAccumulation>("double", list, d_double, budget_rad, horizon_s,
                                                  gyro_hz);
  }
  const LongestFixes<T> fixes =
      longest_fixes<T, Accumulation>(list, d, fix_budget, horizon_s, static_cast<T>(gyro_hz));
  if (fixes.found) {
    std::printf(
        "    external attitude fixes at %g Hz gyro, %s: at most %.4g s apart (%s; "
        "longest_fix_interval%s)\n",
        gyro_hz, scalar, static_cast<double>(fixes.interval.interval_s), fixes.name.c_str(),
        fix_budget.has_sensor ? ", the criterion over that interval" : "");
  } else {
    std::printf(
        "    external attitude fixes at %g Hz gyro, %s: none helps (one step's bound alone "
        "exceeds the budget)\n",
        gyro_hz, scalar);
  }
  if (best.found) {
    std::printf("    a larger budget: %.3e rad (%.4f deg) at %g Hz gyro, %s\n",
                static_cast<double>(best.parts.total()),
                static_cast<double>(best.parts.total()) * (180.0 / pi<double>), gyro_hz, scalar);
  }
}

}  // namespace halfspin::tools::stepstudy
