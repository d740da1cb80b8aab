#pragma once
/// @file
/// What every stepper declares, and how the propagator reads it: the stepper contract.
///
/// For every stepper in the library the step is q_next = q ⊗ P, with P depending only on the gyro
/// input and the step length: P = exp(φ/2) for the exponential-map, Magnus, coning and Lie-group
/// families, and P = 1 + Σ b_i m_i for explicit Runge–Kutta on q̇ = ½ q ⊗ (0, ω), whose stages are
/// linear in q (k_i = q ⊗ m_i). A stepper therefore returns the increment δ = P − 1, computed
/// without cancellation (accurate relative to its own size, however small the step), and its local
/// error estimate where it has one. Applying it, q + q ⊗ δ rounded in T, happens in one place: the
/// propagator's accumulation policy (PlainAccumulation below), so that another accumulation can be
/// added without touching any stepper. A stepper keeps no state; the propagator owns the attitude
/// and the sample history. Facts every stepper declares:
///
/// @code{.cpp}
///   static constexpr SampleLayout layout;        // what the input array holds (below)
///   static constexpr std::size_t window;         // samples the step reads
///   static constexpr std::size_t new_samples;    // samples that arrive per step
///   static constexpr int order;                  // global order reached WITH THIS INPUT on any
///                                                //   smooth motion (the attitude, i.e. the angle
///                                                //   error, renormalized)
///   static constexpr int flops;                  // floating-point operations per step, the
///                                                //   increment and its plain application (+ − × ÷
///                                                //   √, a libm call counted as documented)
///   static constexpr bool has_estimate;          // the increment carries an error estimate
///   static constexpr const char* name;           // the one name, everywhere (tools, benchmarks,
///                                                //   CMake lists, docs): snake_case of the type
///   static constexpr const char* description;    // one line: what it does, what it takes
/// @endcode
///
/// and one of
/// @code{.cpp}
///   template <class T> static Increment<T> increment(
///       const std::array<Vector3<T>, window>& input, T dt) noexcept;          // sample layouts
///   template <class T, class RateFunction> static Increment<T> increment(
///       const RateFunction& rate_at, T dt) noexcept;                          // rate_function
/// @endcode
/// plus the conveniences step(q, input, dt) → Quaternion<T> and step_with_estimate(q, input, dt)
/// → StepOutcome<T>, both the plain application of the increment (apply_increment below).
/// Runge–Kutta steppers also declare `state_order`: the order of the quaternion state including its
/// norm, which can be lower than the attitude order (Kutta's RK3: state 3, attitude 4).
/// Coning-compensation steppers also declare `coning_order`: the order of the attitude error under
/// pure classical coning at small cone angles (2N for the N-sample algorithms), higher than
/// `order`. A stepper may declare `rounding_depth`: the most roundings on any path from an input to
/// its rotation vector (bounds/roundoff_floor.hpp; the rotation-vector family derives it from its
/// rule). Without it the roundoff model counts `flops`, an upper count. It may also declare
/// `rotation_linear` and `rotation_quadratic` (long double): |φ| ≤ rotation_linear·θ +
/// rotation_quadratic·θ² for a step rotating by ≤ θ (the compensated roundoff floor's |δ|).
/// Every stepper names its family's data as `family` (a rotation-vector rule, a Butcher tableau
/// with its input form, ...); the bounds layer dispatches on it, so a stepper and its bound are
/// derived from the same data and cannot disagree.
///
/// The order is the order the method reaches with the input it takes: classic Runge–Kutta 4 fed
/// rates interpolated linearly between samples is second order, and its header says so.

#include <array>
#include <cstddef>
#include <cstdint>
#include <type_traits>
#include <utility>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// What a stepper's input holds (the contract above).
enum class SampleLayout : std::uint8_t {
  /// One body rate (rad/s) at the end of the step; the step spans one sample period.
  rate_at_end,
  /// `window` body rates (rad/s) equally spaced over the step, [0] at its start and [window−1] at
  /// its end; consecutive steps share the boundary sample, so new_samples = window − 1 and the
  /// step spans window − 1 sample periods.
  rates_spanning,
  /// `window` delta-angles (rad), each the integral of the rate over one sample period, that tile
  /// the step, oldest first; new_samples = window.
  delta_angles,
  /// The previous step's last delta-angle, then new_samples = window − 1 delta-angles that tile
  /// the step (algorithms that use one sample of history).
  delta_angles_with_previous,
  /// A callable rate_at(τ) → Vector3<T> (rad/s) for τ ∈ [0, dt] from step start: a dynamics model
  /// on a desktop, for steppers whose stages fall between samples.
  rate_function
};

/// Whether a layout carries delta-angles (rad) rather than rates (rad/s).
constexpr bool carries_delta_angles(SampleLayout layout) noexcept {
  return layout == SampleLayout::delta_angles || layout == SampleLayout::delta_angles_with_previous;
}

/// Sample periods one step spans, given the layout and window.
constexpr std::size_t periods_per_step(SampleLayout layout, std::size_t window) noexcept {
  switch (layout) {
    case SampleLayout::rate_at_end:
      return 1;
    case SampleLayout::rates_spanning:
      return window - 1;
    case SampleLayout::delta_angles:
      return window;
    case SampleLayout::delta_angles_with_previous:
      return window - 1;
    case SampleLayout::rate_function:
      return 1;
  }
  return 1;
}

/// A step's result where the stepper also estimates its local error (rad, an angle).
template <class T>
struct StepOutcome {
  Quaternion<T> attitude;  ///< the attitude after the step (body → reference)
  T error_estimate;        ///< the local error estimate (rad)
};

/// What a stepper returns: the increment δ = P − 1 of q_next = q ⊗ P (dimensionless), and the
/// local error estimate of the step (rad; 0 where the stepper has none).
template <class T>
struct Increment {
  Quaternion<T> delta;  ///< δ = P − 1
  T error_estimate;     ///< the local error estimate (rad; 0 if none)
};

/// Floating-point operations of apply_increment: the product 28 and the sum 4.
inline constexpr int apply_increment_flops = 32;

/// q + q ⊗ δ (q body → reference): the plain application of an increment, rounded in T. The one
/// place where an increment meets the attitude; the propagator reaches it through its accumulation
/// policy.
template <class T>
constexpr Quaternion<T> apply_increment(const Quaternion<T>& q,
                                        const Quaternion<T>& delta) noexcept {
  return q + q * delta;
}

/// The plain accumulation policy: the attitude is one quaternion in T and each step adds q ⊗ δ to
/// it (one rounding per component on top of the product's). Policies own the attitude's storage,
/// so that a compensated one (the attitude as an unevaluated sum of two T quaternions) can replace
/// this without any change to a stepper or to the propagator's logic.
struct PlainAccumulation {
  static constexpr const char* name = "plain";         ///< the policy's name
  static constexpr int flops = apply_increment_flops;  ///< flops per step

  /// The attitude as one quaternion.
  template <class T>
  struct State {
    Quaternion<T> attitude;  ///< the attitude (body → reference)
  };
  /// The state holding attitude q (body → reference).
  template <class T>
  static constexpr State<T> start(const Quaternion<T>& q) noexcept {
    return {q};
  }
  /// The state after one step with increment delta.
  template <class T>
  static constexpr State<T> advanced(const State<T>& s, const Quaternion<T>& delta) noexcept {
    return {apply_increment(s.attitude, delta)};
  }
  /// The attitude the state stands for (body → reference).
  template <class T>
  static constexpr const Quaternion<T>& attitude(const State<T>& s) noexcept {
    return s.attitude;
  }
  /// The state with its attitude replaced by q (after renormalization).
  template <class T>
  static constexpr State<T> with_attitude(const State<T>& /*s*/, const Quaternion<T>& q) noexcept {
    return {q};
  }
  /// with_attitude in straight-line code, for loops that must vectorize (BatchPropagator's lanes):
  /// here with_attitude itself.
  template <class T>
  static constexpr State<T> with_attitude_branch_free(const State<T>& s,
                                                      const Quaternion<T>& q) noexcept {
    return with_attitude(s, q);
  }
};

/// Whether the propagator renormalizes state of Accumulation through the policy's scale (the
/// policy's `scaling(q)` and the accumulation's `with_scaling(state, scale)`: both present, as for
/// CompensatedAccumulation with every policy of renormalization.hpp) rather than through its result
/// (`apply(q)`, then `with_attitude(state, kept)`).
template <class Accumulation, class Renormalization, class T, class = void>
struct renormalizes_by_scaling : std::false_type {};
template <class Accumulation, class Renormalization, class T>
struct renormalizes_by_scaling<
    Accumulation, Renormalization, T,
    std::void_t<decltype(Accumulation::with_scaling(
        std::declval<const typename Accumulation::template State<T>&>(),
        std::declval<Renormalization&>().scaling(std::declval<const Quaternion<T>&>())))>>
    : std::true_type {};

/// The input a stepper's increment takes for scalar T: its sample window (rate_function steppers
/// take a callable instead and have no window type).
template <class Stepper, class T>
using StepperWindow = std::array<Vector3<T>, Stepper::window>;

/// Whether Stepper's increment carries an error estimate (its `has_estimate`), as a trait. T (and
/// the rate function type F) are accepted for the callers that name them; the answer is the
/// stepper's alone.
template <class Stepper, class T = void>
struct has_error_estimate : std::integral_constant<bool, Stepper::has_estimate> {};
template <class Stepper, class T = void, class F = void>
struct has_rate_function_error_estimate : std::integral_constant<bool, Stepper::has_estimate> {};

}  // namespace halfspin
