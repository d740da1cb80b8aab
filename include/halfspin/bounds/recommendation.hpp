#pragma once
/// @file
/// The cheapest stepper, from a compile-time list, that meets an attitude-error budget at a given
/// gyro sample rate, with the propagator's accumulation policy (plain by default, or compensated).
///
/// The gyro fixes the sample period h = 1/sample_rate; each stepper's step spans its
/// periods_per_step(layout, window) periods, so its step is dt = periods·h and it runs
/// sample_rate/periods steps per second. Its cost is flops × steps per second (flop/s), the flops
/// being the per-step count written down in each stepper's header with the plain application of
/// the increment replaced by the accumulation policy's (Accumulation::flops). Each candidate's
/// bound is the worst-case horizon bound (horizon_bound.hpp) at that dt; the answer is the
/// candidate of least cost whose bound meets the budget (ties: the smaller bound, then the earlier
/// in the list). Every candidate's outcome is returned, so a caller can say why the cheaper ones
/// failed: over budget (with their bound) or no finite bound.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// A compile-time list of candidate steppers.
template <class... Steppers>
struct StepperList {};

/// A candidate's verdict against the budget.
enum class CandidateOutcome : std::uint8_t {
  meets_budget,  ///< bound within the budget
  over_budget,   ///< finite bound above the budget
  no_bound       ///< bound +∞ or NaN: a derivative bound it needs is unknown, or no bound exists
};

/// One candidate stepper: its step, bound, cost and verdict.
template <class T>
struct CandidateReport {
  const char* name = "";      ///< the stepper's name
  T step_s = T(0);            ///< dt = periods per step / sample rate (s)
  T bound_rad = T(0);         ///< worst-case horizon bound (rad)
  T cost_flops_per_s = T(0);  ///< flops per step × steps per second
  CandidateOutcome outcome = CandidateOutcome::no_bound;  ///< its verdict
};

/// The recommended stepper, if any, and every candidate's report.
template <class T, std::size_t N>
struct Recommendation {
  bool found = false;         ///< whether a candidate meets the budget
  std::size_t index = N;      ///< position of the chosen stepper in the list (N if none)
  const char* name = "";      ///< its name ("" if none)
  T bound_rad = T(0);         ///< its bound (rad)
  T cost_flops_per_s = T(0);  ///< its cost (flop/s)
  std::array<CandidateReport<T>, N> candidates{};  ///< every candidate, in list order
};

namespace detail {

template <class Stepper, class T, class Accumulation>
CandidateReport<T> assess_candidate(const MotionDescription<T>& description, T budget_rad,
                                    T horizon_s, T sample_rate_hz) noexcept {
  CandidateReport<T> c{};
  const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  c.name = Stepper::name;
  c.step_s = periods / sample_rate_hz;
  c.cost_flops_per_s =
      static_cast<T>(Stepper::flops - apply_increment_flops + Accumulation::flops) *
      sample_rate_hz / periods;
  c.bound_rad = horizon_error_bound<Stepper, T, Accumulation>(description, c.step_s, horizon_s);
  if (!std::isfinite(c.bound_rad)) {
    c.outcome = CandidateOutcome::no_bound;
  } else {
    c.outcome =
        c.bound_rad <= budget_rad ? CandidateOutcome::meets_budget : CandidateOutcome::over_budget;
  }
  return c;
}

}  // namespace detail

/// The cheapest candidate (flop/s) whose worst-case bound over horizon_s (s) meets budget_rad
/// (rad) at sample_rate_hz (Hz) gyro samples, for scalar T and the propagator's Accumulation;
/// every candidate's outcome included. The horizon may be any arithmetic type, converted to T
/// (static_cast) first.
template <class T, class Accumulation = PlainAccumulation, class... Steppers, class H>
Recommendation<T, sizeof...(Steppers)> recommend_stepper(StepperList<Steppers...> /*list*/,
                                                         const MotionDescription<T>& description,
                                                         T budget_rad, H horizon,
                                                         T sample_rate_hz) noexcept {
  static_assert(std::is_arithmetic<H>::value, "the horizon (s) is an arithmetic type");
  const T horizon_s = static_cast<T>(horizon);
  constexpr std::size_t n = sizeof...(Steppers);
  Recommendation<T, n> r{};
  if (!(sample_rate_hz > T(0)) || !(horizon_s > T(0)) || !(budget_rad > T(0))) {
    return r;
  }
  r.candidates = {{detail::assess_candidate<Steppers, T, Accumulation>(
      description, budget_rad, horizon_s, sample_rate_hz)...}};
  for (std::size_t i = 0; i < n; ++i) {
    const CandidateReport<T>& c = r.candidates[i];
    if (c.outcome != CandidateOutcome::meets_budget) {
      continue;
    }
    const bool better = !r.found || c.cost_flops_per_s < r.cost_flops_per_s ||
                        (c.cost_flops_per_s == r.cost_flops_per_s && c.bound_rad < r.bound_rad);
    if (better) {
      r.found = true;
      r.index = i;
      r.name = c.name;
      r.bound_rad = c.bound_rad;
      r.cost_flops_per_s = c.cost_flops_per_s;
    }
  }
  return r;
}

}  // namespace halfspin
