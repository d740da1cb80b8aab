#pragma once
/// @file
/// The longest time between external attitude fixes (a star tracker, a GNSS-aided heading, a
/// vision fix) over which a stepper at a given step dt keeps the worst-case attitude error inside a
/// budget: the largest step count k whose bound after k steps (error_bound_after_steps,
/// horizon_bound.hpp) meets the budget, and the time k·dt.
///
/// Why a search over k finds every k' ≤ k meeting the budget: the bound after k steps is
/// non-decreasing in k. Its terms are k × (local bound) and k × (rounding per step), each ≥ 0 and
/// fixed for a given step, the first step's extra (constant), and, for pure coning, the smaller of
/// k × (exact local error) and 4·asin(√(g/2)) with g = k²(α − φ)²/8 + tilt
/// (coning_truncation_bound_tight, coning_error.hpp), both non-decreasing in k; the smaller of two
/// non-decreasing functions is non-decreasing. So the largest k meeting the budget is found by
/// doubling k from 1 until the bound exceeds the budget, then bisecting between the last count
/// that met it and the first that did not. Each evaluation is rounded, and rounding (and the
/// library's asin) could in principle break a tie between neighbouring k by an ulp; the answer is
/// safe regardless, because the bound after k steps bounds the error at EVERY step end up to k
/// (each term is a bound on the whole run so far), and tests/bounds/test_fix_interval.cpp checks
/// the search against a scan of every k on small cases, pure coning included.
///
/// The count is capped at max_fix_steps = 2⁴⁰ (about 35 years at 1000 steps per second): a stepper
/// whose bound still meets the budget there is reported as unbounded with that count.

#include <cmath>
#include <cstddef>
#include <cstdint>

#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"

namespace halfspin {

/// The largest step count the search tries, 2⁴⁰ (see the file comment).
inline constexpr std::int64_t max_fix_steps = std::int64_t{1} << 40;

/// The outcome of the search for the longest interval between fixes.
enum class FixIntervalStatus : std::uint8_t {
  ok,                ///< steps is the largest count meeting the budget; steps + 1 misses it
  not_one_step,      ///< even one step's bound exceeds the budget (steps = 0; next_bound_rad: it)
  unbounded,         ///< the budget is met at every count up to max_fix_steps (steps = that cap)
  no_bound,          ///< the first step's bound is not finite: bound_status says why
  invalid_arguments  ///< dt or budget not positive and finite, or a D_k negative or NaN
};

/// The longest interval between fixes that keeps the bound inside the budget, and its status.
template <class T>
struct FixInterval {
  /// Ok, or why steps is not the answer.
  FixIntervalStatus status = FixIntervalStatus::invalid_arguments;
  std::int64_t steps = 0;   ///< largest step count meeting the budget
  T interval_s = T(0);      ///< steps·dt (s): the longest time between fixes
  T bound_rad = T(0);       ///< error bound after `steps` steps (rad)
  T next_bound_rad = T(0);  ///< error bound after steps + 1 steps (rad), above the budget when ok
  BoundReport<T> first_step{};  ///< the report after one step (its status explains no_bound)
};

/// Largest number of steps of length dt (s) of Stepper in T with Accumulation, and the time
/// steps·dt (s), over which the worst-case attitude error bound stays ≤ budget_rad (rad) at every
/// step end (header comment for the search and the cap).
template <class Stepper, class T, class Accumulation = PlainAccumulation>
FixInterval<T> longest_fix_interval(const MotionDescription<T>& description, T dt,
                                    T budget_rad) noexcept {
  FixInterval<T> r{};
  r.first_step = error_report_after_steps<Stepper, T, Accumulation>(description, dt, 1);
  if (r.first_step.status == BoundStatus::invalid_arguments || !(budget_rad > T(0)) ||
      !std::isfinite(budget_rad)) {
    r.status = FixIntervalStatus::invalid_arguments;
    return r;
  }
  auto bound = [&](std::int64_t k) noexcept {
    return error_bound_after_steps<Stepper, T, Accumulation>(description, dt, k);
  };
  auto finish = [&](FixIntervalStatus status, std::int64_t k) noexcept {
    r.status = status;
    r.steps = k;
    r.interval_s = static_cast<T>(k) * dt;
    r.bound_rad = bound(k);
    r.next_bound_rad = bound(k + 1);
    return r;
  };
  if (r.first_step.status != BoundStatus::ok) {
    r.status = FixIntervalStatus::no_bound;
    return r;
  }
  if (!(r.first_step.value_rad <= budget_rad)) {
    return finish(FixIntervalStatus::not_one_step, 0);
  }
  // Doubling: lo meets the budget; stop at the first hi that misses it, or at the cap.
  std::int64_t lo = 1;
  std::int64_t hi = 2;
  while (bound(hi) <= budget_rad) {
    lo = hi;
    if (hi == max_fix_steps) {
      return finish(FixIntervalStatus::unbounded, hi);
    }
    hi = 2 * hi < max_fix_steps ? 2 * hi : max_fix_steps;
  }
  // Bisection: bound(lo) ≤ budget < bound(hi) (a NaN bound counts as a miss).
  while (hi - lo > 1) {
    const std::int64_t mid = lo + (hi - lo) / 2;
    if (bound(mid) <= budget_rad) {
      lo = mid;
    } else {
      hi = mid;
    }
  }
  return finish(FixIntervalStatus::ok, lo);
}

}  // namespace halfspin
