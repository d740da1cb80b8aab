#pragma once
/// @file
/// Runge–Kutta–Munthe-Kaas (RKMK4): classic RK4 applied in the Lie algebra, mapped back to the
/// group with the exponential map, so the attitude stays on the unit sphere to roundoff with no
/// renormalization (Munthe-Kaas 1998).
///
/// Within a step write q(t + τ) = q(t) ⊗ exp(θ(τ)/2) with the rotation vector θ(0) = 0. θ obeys the
/// rotation-vector (Bortz 1971) equation θ̇ = dexp⁻¹_θ(ω) = ω + ½ θ×ω + f(|θ|) θ×(θ×ω), f(0) = 1/12
/// (f and its series: bounds/magnus_family_bounds.hpp §1, §3). RK4 integrates θ over the step and
/// the update is q₊ = q ⊗ exp(θ(dt)/2), a product of two unit quaternions: the norm carries no
/// truncation error, only the rounding of each step. When the rates vary, those roundings are
/// uncorrelated and | |q| − 1 | grows as a random walk (measured 0.23·√N·ε over 10⁶ steps in
/// double). When |θ| is the same every step (constant rate, coning) the scalar part cos(|θ|/2) is
/// rounded alike each step and the drift grows linearly, up to ~ε/4 per step (measured 0.09 ε in
/// double, 0.23 ε in float on coning). In float, quaternion_exp's series (used for |θ|² < 0.1)
/// drops a θ⁶/46080 term of one sign, another linear drift at coarse steps. Renormalization stays
/// the propagator's policy; this stepper only makes it rarely needed.
///
/// dexp⁻¹ truncated to ω + ½ θ×ω + (1/12) θ×(θ×ω): the stage θ are O(dt), so the dropped terms are
/// O(dt⁴)·|ω| in θ̇, O(dt⁵) per step — what order 4 needs (Munthe-Kaas: commutators up to order p −
/// 2 suffice) — and no libm call is made inside the stages. For constant ω every stage θ is
/// parallel to ω, both cross products vanish (to rounding), θ(dt) = ω·dt, and the step is the exact
/// exponential map.
///
/// Against the other Lie-group methods: a fourth-order Crouch–Grossman method composes one
/// exponential per stage (five stages, more order conditions); the commutator-free method of
/// commutator_free_4.hpp composes two exponentials and computes no cross product at all (on
/// attitude kinematics the rate depends on time only, so its stages are plain rate samples: 138
/// flops against RKMK4's 190, the same samples and order). RKMK4 needs one exponential per step,
/// reuses the classic RK4 tableau and the generic stage-rate machinery, and its dexp⁻¹ correction
/// is the rotation-vector equation strapdown engineers already know.
///
/// Inputs as for ExplicitRungeKutta: three samples (start, middle, end; two sample periods per
/// step): order 4; two samples with linear interpolation: order 2 only; a rate function: order 4.
///
/// Cost (counted from the code; + − × ÷ one flop, sign flips free): stage 1 reads ω₁ (0); stages
/// 2–4: θ_i 7 per nonzero a_ij (a·dt 1, 3 ×, 3 +), dexp⁻¹ 30 (two cross products 18, 6 ×, 6 +);
/// θ(dt) 7 per nonzero b_i; exp(θ/2) − 1 19 on its series branch (|θ|² below
/// ScalarTraits::exp_series_angle_squared; above, add √, ÷ and two sines, each counted 1); the
/// plain application 32. The increment (stepper_traits.hpp) is exp(θ(dt)/2) − 1. Memory: four rate
/// vectors and four algebra slopes on the stack; nothing between steps.

#include <array>
#include <cstddef>
#include <type_traits>
#include <utility>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace detail {

// dexp⁻¹_θ(ω) truncated after the double cross product: ω + ½ θ×ω + (1/12) θ×(θ×ω) (rad/s).
template <class T>
constexpr Vector3<T> rotation_vector_rate(const Vector3<T>& theta, const Vector3<T>& w) noexcept {
  const Vector3<T> once = cross(theta, w);
  const Vector3<T> twice = cross(theta, once);
  return w + T(0.5) * once + T(1.0L / 12) * twice;
}

}  // namespace detail

/// The Munthe-Kaas stepper on a tableau of order ≤ 4 (the dexp⁻¹ truncation limits it to 4).
/// q body → reference, ω rad/s, dt s; the result is unit to roundoff when q is.
template <class Tableau, SampleLayout Layout, std::size_t Window>
struct MuntheKaasRungeKutta {
  static_assert(Tableau::value.order <= 4, "the dexp⁻¹ truncation supports order ≤ 4");
  using Explicit = ExplicitRungeKutta<Tableau, Layout, Window>;  ///< same inputs
  using tableau = Tableau;  ///< the coefficients, for the bounds layer
  using family =
      MuntheKaasRungeKutta<Tableau, Layout, Window>;  ///< the bounds layer dispatches on it
  static constexpr SampleLayout layout = Layout;      ///< what the input holds
  static constexpr std::size_t window = Window;       ///< samples the step reads
  /// Samples that arrive per step.
  static constexpr std::size_t new_samples = Explicit::new_samples;
  static constexpr std::size_t stages = Explicit::stages;  ///< stages of the tableau
  /// Classical order of the tableau on the rotation-vector equation, capped at 2 by interpolated
  /// stage rates (no norm/attitude distinction: the update is a rotation).
  static constexpr int order = Explicit::state_order;
  static constexpr bool has_estimate = false;  ///< whether the increment carries an error estimate
  /// Floating-point operations per step: the increment and its plain application.
  static constexpr int flops = 30 * (static_cast<int>(stages) - 1) +
                               7 * static_cast<int>(detail::count_nonzero(Tableau::value.a) +
                                                    detail::count_nonzero(Tableau::value.b)) +
                               quaternion_exp_minus_one_series_flops + apply_increment_flops +
                               detail::stage_rate_flops(Tableau::value, Layout, Window);

  /// exp(θ(dt)/2) − 1 from rate samples: rate[0] at step start … rate[Window−1] at its end (rad/s).
  template <class T, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rates_spanning, int> = 0>
  static Increment<T> increment(const std::array<Vector3<T>, Window>& rate, T dt) noexcept {
    return {quaternion_exp_minus_one(
                rotation_vector(detail::stage_rates_from_samples<Tableau, Window>(rate), dt)),
            T(0)};
  }
  /// The same from a rate function rate_at(τ) (rad/s), τ ∈ [0, dt] seconds from step start.
  template <class T, class RateFunction, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rate_function, int> = 0>
  static Increment<T> increment(const RateFunction& rate_at, T dt) noexcept {
    return {quaternion_exp_minus_one(
                rotation_vector(detail::stage_rates_from_function<Tableau>(rate_at, dt), dt)),
            T(0)};
  }
  /// q ⊗ exp(θ(dt)/2), applied plainly (q body → reference).
  template <class T, class Input>
  static Quaternion<T> step(const Quaternion<T>& q, const Input& input, T dt) noexcept {
    return apply_increment(q, increment(input, dt).delta);
  }

  /// The step's rotation vector θ(dt) (rad, body frame) from the rates at the stage times (rad/s).
  template <class T>
  static constexpr Vector3<T> rotation_vector(const std::array<Vector3<T>, stages>& stage_rate,
                                              T dt) noexcept {
    std::array<Vector3<T>, stages> k{};
    k[0] = stage_rate[0];  // dexp⁻¹ at θ = 0 is the identity
    stage_slopes(k, stage_rate, dt, std::make_index_sequence<stages>{});
    return weighted_rates<detail::SolutionWeights<Tableau, T>>(k, dt,
                                                               std::make_index_sequence<stages>{});
  }

 private:
  // Folds over index sequences with `if constexpr` (as explicit_runge_kutta.hpp): a step tests no
  // coefficient at run time.
  template <class Weights, std::size_t J, class T>
  static constexpr void add_weighted_rate(Vector3<T>& theta,
                                          const std::array<Vector3<T>, stages>& k, T dt) noexcept {
    if constexpr (Weights::value[J] != T(0)) {
      theta += (Weights::value[J] * dt) * k[J];
    }
  }
  // θ = Σ_j (w_j·dt) k_j over the nonzero weights (rad).
  template <class Weights, class T, std::size_t... J>
  static constexpr Vector3<T> weighted_rates(const std::array<Vector3<T>, stages>& k, T dt,
                                             std::index_sequence<J...> /*indices*/) noexcept {
    Vector3<T> theta = Vector3<T>::zero();
    (add_weighted_rate<Weights, J>(theta, k, dt), ...);
    return theta;
  }
  template <std::size_t I, class T>
  static constexpr void stage_slope(std::array<Vector3<T>, stages>& k,
                                    const std::array<Vector3<T>, stages>& stage_rate,
                                    T dt) noexcept {
    if constexpr (I > 0) {
      const Vector3<T> theta =
          weighted_rates<detail::StageWeights<Tableau, T, I>>(k, dt, std::make_index_sequence<I>{});
      k[I] = detail::rotation_vector_rate(theta, stage_rate[I]);
    }
  }
  template <class T, std::size_t... I>
  static constexpr void stage_slopes(std::array<Vector3<T>, stages>& k,
                                     const std::array<Vector3<T>, stages>& stage_rate, T dt,
                                     std::index_sequence<I...> /*stages*/) noexcept {
    (stage_slope<I>(k, stage_rate, dt), ...);
  }
};

/// RKMK4, samples at start/middle/end (two sample periods per step): order 4.
struct MuntheKaas4Sampled
    : MuntheKaasRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rates_spanning, 3> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "munthe_kaas_4_sampled";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Munthe-Kaas RK4 on the rotation vector, stages at samples; 2 rates/step, order 4";
};
/// RKMK4, linear interpolation between two samples: ONLY order 2.
struct MuntheKaas4Interpolated
    : MuntheKaasRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rates_spanning, 2> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "munthe_kaas_4_interpolated";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Munthe-Kaas RK4, stage rates interpolated linearly; 1 rate/step, order 2";
};
/// RKMK4, rate function: order 4.
struct MuntheKaas4RateFunction
    : MuntheKaasRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "munthe_kaas_4_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Munthe-Kaas RK4 on a rate function (truth motions only); order 4";
};

}  // namespace halfspin
