#pragma once
// Renormalization policies: how the propagator pulls the attitude back to unit norm after a step.
// Rounding (and, for Runge–Kutta steppers, truncation) lets ‖q‖ drift from 1; a non-unit q still
// names a rotation (every conversion here is scale-invariant or divides by ‖q‖²), but the drift
// scales vectors rotated with `rotate` and grows without bound. Each policy is a small object the
// propagator owns (some count steps); `apply` takes the post-step attitude and returns the one to
// keep. Cost per step in flops is noted with each.

#include <cmath>
#include <cstdint>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

// Leaves q as it is: for Lie-group steppers that stay on the unit sphere to roundoff, and for
// measuring drift. Cost 0.
struct NoRenormalization {
  static constexpr const char* name = "none";
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return q;
  }
};

// q/‖q‖ every step: exact to rounding. Cost 7 + one square root + 4 divisions.
struct ExactRenormalization {
  static constexpr const char* name = "exact";
  template <class T>
  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return normalized(q);
  }
};

// One Newton step toward ‖q‖ = 1 with no square root: q·(3 − ‖q‖²)/2. If ‖q‖² = 1 + e, the
// result has ‖q‖² = 1 − 3e²/4 + e³/4: quadratic convergence, so with the per-step drift of a
// gyro step (e ~ ε) the norm stays at rounding level. Cost 7 + 2 + 4 = 13 multiplications/adds.
struct FirstOrderRenormalization {
  static constexpr const char* name = "first_order";
  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const T factor = T(1.5) - T(0.5) * squared_norm(q);
    return factor * q;
  }
};

// Applies Inner every `period` steps and leaves q alone otherwise (a CPU-budget trade: the
// drift between corrections grows linearly for Runge–Kutta steppers, as a random walk for
// exponential-map ones).
template <class Inner = ExactRenormalization>
struct PeriodicRenormalization {
  static constexpr const char* name = "periodic";
  std::uint32_t period = 16;  // steps between corrections (≥ 1)
  std::uint32_t count = 0;    // steps since the last correction
  Inner inner{};

  template <class T>
  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    if (++count >= period) {
      count = 0;
      return inner.apply(q);
    }
    return q;
  }
};

// Applies Inner only when | ‖q‖² − 1 | exceeds `threshold` (dimensionless; | ‖q‖ − 1 | is about
// half of it). Cost 7 + a comparison per step, plus Inner when it fires.
template <class T, class Inner = ExactRenormalization>
struct ThresholdRenormalization {
  static constexpr const char* name = "threshold";
  T threshold = T(1e-5);
  Inner inner{};

  constexpr Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    const T e = squared_norm(q) - T(1);
    return (e > threshold || e < -threshold) ? inner.apply(q) : q;
  }
};

}  // namespace halfspin
