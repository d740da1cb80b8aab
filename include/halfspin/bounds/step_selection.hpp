#pragma once
/// @file
/// The inverse of the horizon bound: the largest step that keeps the attitude error over a horizon
/// inside a budget, for a stepper and scalar type.
///
/// The total bound B(dt) = steps·local(dt) + steps·roundoff(dt) is U-shaped in dt: the truncation
/// part falls as dt^p when dt shrinks (p the global order), the roundoff part grows as 1/dt (with
/// the compensated accumulation only its small N·c2·u² part does; the rest is fixed by the angle
/// traversed, so the least bound sits at much smaller steps). The
/// search runs on a geometric grid of `grid_points` steps over [dt_min, dt_max]:
///  1. the grid point of least B is the minimizer (to within one grid ratio); if its B misses the
///     budget, no step in the range meets it: status budget_unreachable, with that minimum;
///  2. otherwise the first grid point above the minimizer whose B exceeds the budget brackets the
///     crossing with the last one that meets it, and bisection in log dt narrows the bracket until
///     hi/lo ≤ 1 + relative_tolerance (1e-3 by default: from a grid ratio r that takes
///     ⌈log2(ln r / ln(1 + tol))⌉ bisections, 6 for the default grid). The returned step is the
///     lower end, which meets the budget; the upper end, at most (1 + tolerance) times larger,
///     does not.
/// "The first crossing above the minimizer" is the largest step meeting the budget whenever B
/// increases beyond the minimizer, which holds in the truncation-dominated range of every
/// stepper (local ∝ dt^(p+1)); the grid guards against the ripple of ceil(horizon/dt).

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The outcome of a step selection.
enum class StepSelectionStatus : std::uint8_t {
  ok,                  ///< step_s meets the budget
  budget_unreachable,  ///< even the minimizing step misses the budget (minimum reported)
  no_bound,            ///< no finite bound for this stepper and motion (e.g. a needed derivative
                       ///< bound is +∞, or no LocalErrorBound exists)
  invalid_arguments    ///< non-positive or non-finite budget, horizon or step range
};

/// The step chosen for a budget, its bound and rates, and the minimizer.
template <class T>
struct StepSelection {
  /// Ok, or why step_s does not meet the budget.
  StepSelectionStatus status = StepSelectionStatus::invalid_arguments;
  T step_s = T(0);             ///< chosen step (s); the minimizer when the budget is unreachable
  T bound_rad = T(0);          ///< horizon bound at step_s (rad)
  T update_rate_hz = T(0);     ///< 1/step_s (Hz): attitude updates per second
  T sample_rate_hz = T(0);     ///< gyro samples per second = update rate × periods per step (Hz)
  T minimizing_step_s = T(0);  ///< grid step of least bound (s)
  T minimum_bound_rad = T(0);  ///< the least bound (rad)
};

/// Search settings: the step range (s), the grid and the bisection tolerance (relative, in dt).
template <class T>
struct StepSearch {
  T dt_min = T(1e-6);              ///< smallest step searched (s)
  T dt_max = T(1);                 ///< largest step searched (s)
  std::size_t grid_points = 241;   ///< 40 per decade over six decades
  T relative_tolerance = T(1e-3);  ///< bisection stops when hi/lo ≤ 1 + this
};

/// Largest step (s) whose worst-case horizon bound (rad) over horizon_s (s) meets budget_rad (rad)
/// for Stepper in T with Accumulation (the propagator's policy: plain by default); see the header
/// comment for the search and the status values. The horizon may be any arithmetic type,
/// converted to T (static_cast) first.
template <class Stepper, class T, class Accumulation = PlainAccumulation, class H>
StepSelection<T> select_step(const MotionDescription<T>& description, T budget_rad, H horizon,
                             const StepSearch<T>& search = StepSearch<T>{}) noexcept {
  static_assert(std::is_arithmetic<H>::value, "the horizon (s) is an arithmetic type");
  const T horizon_s = static_cast<T>(horizon);
  StepSelection<T> r{};
  const bool valid = budget_rad > T(0) && horizon_s > T(0) && search.dt_min > T(0) &&
                     search.dt_max > search.dt_min && std::isfinite(budget_rad) &&
                     std::isfinite(horizon_s) && std::isfinite(search.dt_max) &&
                     search.grid_points >= 2 && search.relative_tolerance > T(0);
  if (!valid) {
    return r;
  }
  const T periods = static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  const T log_min = std::log(search.dt_min);
  const T log_step = (std::log(search.dt_max) - log_min) / static_cast<T>(search.grid_points - 1);
  auto grid = [&](std::size_t i) noexcept {
    return std::exp(log_min + log_step * static_cast<T>(i));
  };
  auto bound = [&](T dt) noexcept {
    return horizon_error_bound<Stepper, T, Accumulation>(description, dt, horizon_s);
  };
  auto finish = [&](StepSelectionStatus status, T dt, T b) noexcept {
    r.status = status;
    r.step_s = dt;
    r.bound_rad = b;
    r.update_rate_hz = T(1) / dt;
    r.sample_rate_hz = periods / dt;
    return r;
  };

  std::size_t best = 0;
  T best_bound = std::numeric_limits<T>::infinity();
  for (std::size_t i = 0; i < search.grid_points; ++i) {
    const T b = bound(grid(i));
    if (b < best_bound) {  // NaN never wins
      best_bound = b;
      best = i;
    }
  }
  r.minimizing_step_s = grid(best);
  r.minimum_bound_rad = best_bound;
  if (!std::isfinite(best_bound)) {
    return finish(StepSelectionStatus::no_bound, r.minimizing_step_s, best_bound);
  }
  if (best_bound > budget_rad) {
    return finish(StepSelectionStatus::budget_unreachable, r.minimizing_step_s, best_bound);
  }
  std::size_t pass = best;
  while (pass + 1 < search.grid_points && bound(grid(pass + 1)) <= budget_rad) {
    ++pass;
  }
  if (pass + 1 == search.grid_points) {
    return finish(StepSelectionStatus::ok, grid(pass), bound(grid(pass)));
  }
  // Bisection in log dt between lo (meets) and hi (misses).
  T lo = std::log(grid(pass));
  T hi = std::log(grid(pass + 1));
  const T log_tolerance = std::log1p(search.relative_tolerance);
  for (int k = 0; k < 200 && hi - lo > log_tolerance; ++k) {
    const T mid = T(0.5) * (lo + hi);
    if (bound(std::exp(mid)) <= budget_rad) {
      lo = mid;
    } else {
      hi = mid;
    }
  }
  const T dt = std::exp(lo);
  const T b = bound(dt);
  // exp(log(x)) can land one ulp off the point tested; fall back to the grid point if so.
  if (!(b <= budget_rad)) {
    return finish(StepSelectionStatus::ok, grid(pass), bound(grid(pass)));
  }
  return finish(StepSelectionStatus::ok, dt, b);
}

}  // namespace halfspin
