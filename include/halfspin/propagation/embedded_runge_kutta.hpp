#pragma once
/// @file
/// Embedded Runge–Kutta pairs on q̇ = ½ q ⊗ (0, ω): one set of stages, two solutions of different
/// order, and their difference as a local error estimate every step. Bogacki–Shampine 3(2) and
/// Dormand–Prince 5(4), both fed by a rate function (their nodes 3/4, 1/5, 3/10, 8/9 fall between
/// rate samples, so samples would cap them at order 2; see explicit_runge_kutta.hpp).
///
/// The attitude returned is the higher-order solution (local extrapolation): global order 3 for
/// BS32, 5 for DP54 (the classical orders, which bound the whole quaternion state; on classical
/// coning DP54's attitude angle alone converges at 6 over the measurable range, its leading dt⁶
/// local term being a norm change there). The estimate is for the lower-order solution, so it
/// bounds the error of the returned one with a margin that grows as dt shrinks (measured on coning:
/// the returned attitude's error is ≤ 5 % of the estimate; the estimate is within 0.5 % of the
/// lower member's true local error).
///
/// The estimate is 2‖δ‖ (rad) with δ = q_high − q_low = dt Σ (b_i − b̂_i) k_i formed directly from
/// the stage slopes. Why not angle_between(q_high, q_low): both solutions carry ~ε rounding, so
/// their angle has an ε floor and costs an atan2; δ built from the slopes is accurate relative to
/// itself far below ε and costs one square root. Why 2‖δ‖: for unit q and small δ, the rotation
/// angle between q and q + δ is 2‖δ⊥‖ (δ⊥ the part of δ orthogonal to q) and the remaining, radial
/// part is the norm error of the unrenormalized step; 2‖δ‖ covers both, in radians.
///
/// Cost (counted as in explicit_runge_kutta.hpp, sqrt one flop): the explicit stepper's cost plus
/// the weighted sum of the b_i − b̂_i (5 per nonzero weight, 4 per addition) plus 9 for the
/// estimate (|δ|² 7, √ 1, × 2 1); `flops` computes the totals from the tableau. The last stage of
/// each pair is the first of the next step (first-same-as-last); these steppers are stateless and
/// recompute it. Memory: S slopes and S rates on the stack.

#include <array>
#include <cmath>
#include <cstddef>
#include <type_traits>
#include <utility>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// The generic embedded pair on a tableau with b_embedded; layouts as ExplicitRungeKutta.
template <class Tableau, SampleLayout Layout, std::size_t Window>
struct EmbeddedRungeKutta {
  static_assert(Tableau::value.embedded_order > 0, "the tableau has no embedded solution");
  /// The explicit method it shares its stages with.
  using Base = ExplicitRungeKutta<Tableau, Layout, Window>;
  using tableau = Tableau;  ///< the coefficients, for the bounds layer (stage growth, weights)
  using family = Base;      ///< the bound of the returned solution is the explicit method's

  static constexpr SampleLayout layout = Layout;                 ///< what the input holds
  static constexpr std::size_t window = Window;                  ///< samples the step reads
  static constexpr std::size_t new_samples = Base::new_samples;  ///< samples that arrive per step
  static constexpr std::size_t stages = Base::stages;            ///< stages of the tableau
  /// Order of the quaternion state (attitude and norm).
  static constexpr int state_order = Base::state_order;
  static constexpr int order = Base::order;  ///< of the returned (higher-order) solution
  /// Order of the embedded solution with this input (for step-size control).
  static constexpr int embedded_order =
      Base::order < Tableau::value.embedded_order ? Base::order : Tableau::value.embedded_order;
  static constexpr bool has_estimate = true;  ///< whether the increment carries an error estimate
  /// Floating-point operations per step: the increment and its plain application.
  static constexpr int flops =
      Base::flops + detail::weighted_sum_flops(detail::weight_difference(Tableau::value)) + 9;

  /// The higher-order solution's increment and 2‖δ_high − δ_low‖ (rad), from rate samples.
  template <class T, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rates_spanning, int> = 0>
  static Increment<T> increment(const std::array<Vector3<T>, Window>& rate, T dt) noexcept {
    return from_stage_rates(detail::stage_rates_from_samples<Tableau, Window>(rate), dt);
  }
  /// The same from a rate function rate_at(τ) (rad/s), τ ∈ [0, dt] s from step start.
  template <class T, class RateFunction, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rate_function, int> = 0>
  static Increment<T> increment(const RateFunction& rate_at, T dt) noexcept {
    return from_stage_rates(detail::stage_rates_from_function<Tableau>(rate_at, dt), dt);
  }

  /// The higher-order solution alone, applied plainly (q body → reference, ω rad/s, dt s).
  template <class T, class Input>
  static Quaternion<T> step(const Quaternion<T>& q, const Input& input, T dt) noexcept {
    return apply_increment(q, increment(input, dt).delta);
  }
  /// The higher-order solution and 2‖q_high − q_low‖ (rad) as the local error estimate.
  template <class T, class Input>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q, const Input& input,
                                           T dt) noexcept {
    const Increment<T> inc = increment(input, dt);
    return {apply_increment(q, inc.delta), inc.error_estimate};
  }

  /// Both from the rates at the stage times (rad/s).
  template <class T>
  static Increment<T> from_stage_rates(const std::array<Vector3<T>, stages>& stage_rate,
                                       T dt) noexcept {
    const T half_dt = T(0.5) * dt;
    const std::array<Quaternion<T>, stages> k =
        detail::increment_stage_slopes<Tableau>(stage_rate, half_dt);
    const Quaternion<T> high = detail::weighted_slopes<detail::SolutionWeights<Tableau, T>>(
        k, half_dt, std::make_index_sequence<stages>{});
    const Quaternion<T> difference = detail::weighted_slopes<detail::DifferenceWeights<Tableau, T>>(
        k, half_dt, std::make_index_sequence<stages>{});
    return {high, T(2) * std::sqrt(squared_norm(difference))};
  }
};

/// Bogacki–Shampine 3(2), rate function: order 3 returned, order-2 estimate.
struct BogackiShampine32RateFunction
    : EmbeddedRungeKutta<BogackiShampine32Tableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "bogacki_shampine_32_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Bogacki-Shampine 3(2) pair on a rate function (truth motions only); order 3, estimate";
};

/// Dormand–Prince 5(4), rate function: order 5 returned, order-4 estimate.
struct DormandPrince54RateFunction
    : EmbeddedRungeKutta<DormandPrince54Tableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "dormand_prince_54_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Dormand-Prince 5(4) pair on a rate function (truth motions only); order 5, estimate";
};

}  // namespace halfspin
