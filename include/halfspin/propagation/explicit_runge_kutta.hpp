#pragma once
/// @file
/// One generic explicit Runge–Kutta stepper on the quaternion kinematics q̇ = ½ q ⊗ (0, ω(t)),
/// driven by any ButcherTableau, and its named configurations (RK2 midpoint, RK3 Kutta, RK4
/// classic, each with three input forms).
///
/// The state is the four quaternion components; the update is q₊ = q + dt Σ b_i k_i with
/// k_i = ½ q_i ⊗ (0, ω(t + c_i dt)), q_i = q + dt Σ_{j<i} a_ij k_j. The stages are linear in q, so
/// k_i = q ⊗ m_i with m_i computed from q = 1, and the step is q₊ = q ⊗ P, P = 1 + dt Σ b_i m_i:
/// the stepper returns the increment δ = P − 1 = dt Σ b_i m_i (stepper_traits.hpp), formed from
/// the stage increments D_i = dt Σ_j a_ij m_j as m_i = ½(0, ω_i) + ½ D_i ⊗ (0, ω_i), so nothing
/// is ever added to 1 inside the step and δ is accurate relative to its own size. Nothing
/// renormalizes inside the step: the norm drifts (for RK4 at constant rate by a factor √(1 −
/// θ⁶/4608
/// + θ⁸/147456) per step, θ = |ω| dt; see test_runge_kutta.cpp), and renormalization is the
/// propagator's policy.
///
/// Where the stage rates come from decides the order reached (Butcher's order conditions assume
/// exact stage values of ω):
///   rates_spanning, window W: W rate samples equally spaced over the step. A stage whose node
///     c·(W−1) is an integer reads a sample; any other stage interpolates linearly between the two
///     neighbouring samples. The interpolation error is O(dt²) in ω, hence O(dt³) in the rotation
///     per step, so the global order is min(order of the tableau, 2) unless every node is on the
///     sample grid. RK2/RK3/RK4 (nodes 0, 1/2, 1) with W = 3: full order 2/3/4, the step spans two
///     sample periods. With W = 2 (one new sample per step): RK2 keeps order 2, RK3 and RK4 reach
///     only order 2.
///   rate_function: a callable rate_at(τ) → Vector3<T> (rad/s), τ ∈ [0, dt] from step start, that
///     must not throw; full order of the tableau. The only form for tableaus whose nodes fall
///     between samples (Bogacki–Shampine, Dormand–Prince).
///
/// Attitude versus state: `order` is the classical order, which bounds the whole quaternion state
/// (attitude and norm). Kutta's RK3 does better on the attitude alone: its O(dt⁴) local error is,
/// to leading order, a real multiple of q (a norm change, as at constant rate where the missing
/// series term (A dt)⁴/24 is a scalar), so its attitude angle converges at order 4 while its norm
/// error converges at 3. Measured on coning, a single-axis oscillation and a generic two-gimbal
/// motion (tests); not a property of third-order methods in general (Bogacki–Shampine shows 3).
///
/// Cost, counted from the code below (+ − × ÷ one flop each; sign flips free; the rate function's
/// own cost not counted): dt/2 1; per stage with a nonzero stage increment the slope
/// (0, ω_i) + D_i ⊗ (0, ω_i) 23 (the first stage's slope is (0, ω_1): free); per nonzero a_ij and
/// per nonzero b_i 5 (coefficient × dt/2, 4 ×) plus 4 to add it to the sum it joins (the first
/// term of a sum starts it); interpolated stage rates 9 per distinct off-grid node;
/// rate_function 1 × per distinct node strictly inside (0, 1); the plain application of δ 32.
/// The `flops` member computes the totals from the tableau. Memory: S stage slopes (quaternions)
/// and S stage rates (vectors) on the stack, for RK4 224 bytes in double and 112 in float;
/// nothing between steps.

#include <array>
#include <cstddef>
#include <type_traits>
#include <utility>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace detail {

// Where each stage's rate is read in a window of W equally spaced samples: the sample just at or
// below the node, and the fraction of a sample period above it (zero on the grid).
template <std::size_t S>
struct StageSamplePositions {
  std::array<std::size_t, S> lower;
  std::array<long double, S> fraction;
};

template <std::size_t S>
constexpr StageSamplePositions<S> stage_sample_positions(const ButcherTableau<S>& t,
                                                         std::size_t window) noexcept {
  StageSamplePositions<S> p{};
  const long double periods = static_cast<long double>(window - 1);
  for (std::size_t i = 0; i < S; ++i) {
    const long double x = t.c[i] * periods;
    std::size_t l = 0;
    while (l + 1 < window && static_cast<long double>(l + 1) <= x + 1e-15L) {
      ++l;
    }
    long double f = x - static_cast<long double>(l);
    if (f < 1e-15L) {
      f = 0.0L;  // on the grid: read the sample, do not interpolate
    }
    p.lower[i] = l;
    p.fraction[i] = f;
  }
  return p;
}

template <std::size_t S>
constexpr bool all_nodes_on_grid(const ButcherTableau<S>& t, std::size_t window) noexcept {
  const StageSamplePositions<S> p = stage_sample_positions(t, window);
  for (std::size_t i = 0; i < S; ++i) {
    if (p.fraction[i] != 0.0L) {
      return false;
    }
  }
  return true;
}

// Flops spent turning the input into stage rates (see the header comment).
template <std::size_t S>
constexpr int stage_rate_flops(const ButcherTableau<S>& t, SampleLayout layout,
                               std::size_t window) noexcept {
  const std::array<std::size_t, S> first = first_stage_with_node(t);
  int n = 0;
  for (std::size_t i = 0; i < S; ++i) {
    if (first[i] != i) {
      continue;
    }
    if (layout == SampleLayout::rate_function) {
      n += (t.c[i] != 0.0L && t.c[i] != 1.0L) ? 1 : 0;
    } else if (stage_sample_positions(t, window).fraction[i] != 0.0L) {
      n += 9;
    }
  }
  return n;
}

// The interpolation fractions rounded once to T at compile time (no long double at run time).
template <class Tableau, std::size_t Window, class T>
struct StageSampleFractions {
  static constexpr std::size_t S = Tableau::value.stages;
  static constexpr StageSamplePositions<S> positions =
      stage_sample_positions(Tableau::value, Window);
  static constexpr std::array<T, S> fraction = round_all<T>(positions.fraction);
};

// Stage I's rate from W samples spanning the step (rad/s): a repeated node reuses its first
// stage's rate, a node on the grid reads its sample, any other interpolates; decided at compile
// time, so a step tests no coefficient.
template <class Tableau, std::size_t Window, std::size_t I, class T, std::size_t S>
constexpr void stage_rate_from_samples(std::array<Vector3<T>, S>& w,
                                       const std::array<Vector3<T>, Window>& rate) noexcept {
  using F = StageSampleFractions<Tableau, Window, T>;
  constexpr std::size_t first = first_stage_with_node(Tableau::value)[I];
  constexpr std::size_t lower = F::positions.lower[I];
  if constexpr (first != I) {
    w[I] = w[first];
  } else if constexpr (F::positions.fraction[I] == 0.0L) {
    w[I] = rate[lower];
  } else {
    w[I] = rate[lower] + F::fraction[I] * (rate[lower + 1] - rate[lower]);
  }
}

template <class Tableau, std::size_t Window, class T, std::size_t... I>
constexpr std::array<Vector3<T>, sizeof...(I)> stage_rates_from_samples(
    const std::array<Vector3<T>, Window>& rate, std::index_sequence<I...> /*stages*/) noexcept {
  std::array<Vector3<T>, sizeof...(I)> w{};
  (stage_rate_from_samples<Tableau, Window, I>(w, rate), ...);
  return w;
}

// Rates at the stage times from W samples spanning the step (rad/s).
template <class Tableau, std::size_t Window, class T>
constexpr std::array<Vector3<T>, Tableau::value.stages> stage_rates_from_samples(
    const std::array<Vector3<T>, Window>& rate) noexcept {
  return stage_rates_from_samples<Tableau, Window>(
      rate, std::make_index_sequence<Tableau::value.stages>{});
}

// Rates at the stage times from a rate function of τ ∈ [0, dt] (rad/s); one call per distinct node.
template <class Tableau, class T, class RateFunction>
std::array<Vector3<T>, Tableau::value.stages> stage_rates_from_function(const RateFunction& rate_at,
                                                                        T dt) noexcept {
  constexpr std::size_t S = Tableau::value.stages;
  constexpr std::array<std::size_t, S> first = first_stage_with_node(Tableau::value);
  using C = TableauCoefficients<Tableau, T>;
  std::array<Vector3<T>, S> w{};
  for (std::size_t i = 0; i < S; ++i) {
    if (first[i] != i) {
      w[i] = w[first[i]];
    } else if (C::c[i] == T(0)) {
      w[i] = rate_at(T(0));
    } else if (C::c[i] == T(1)) {
      w[i] = rate_at(dt);  // exactly the step end, not a rounded c·dt
    } else {
      w[i] = rate_at(C::c[i] * dt);
    }
  }
  return w;
}

// q ⊗ (0, ω): the kinematic slope without its factor ½ (folded into dt/2 by the callers).
template <class T>
constexpr Quaternion<T> times_pure(const Quaternion<T>& q, const Vector3<T>& w) noexcept {
  return {-(q.x * w.x + q.y * w.y + q.z * w.z), q.w * w.x + q.y * w.z - q.z * w.y,
          q.w * w.y - q.x * w.z + q.z * w.x, q.w * w.z + q.x * w.y - q.y * w.x};
}

// Which weights of the tableau a weighted sum of slopes uses, rounded once to T: row `Row` of a
// (a stage increment), b (the solution) or b − b̂ (the embedded pair's estimate).
template <class Tableau, class T, std::size_t Row>
struct StageWeights {
  static constexpr std::array<T, Tableau::value.stages> value =
      TableauCoefficients<Tableau, T>::a[Row];
};
template <class Tableau, class T>
struct SolutionWeights {
  static constexpr std::array<T, Tableau::value.stages> value = TableauCoefficients<Tableau, T>::b;
};
template <class Tableau, class T>
struct DifferenceWeights {
  static constexpr std::array<T, Tableau::value.stages> value =
      TableauCoefficients<Tableau, T>::b_difference;
};

// Adds (w_J · dt/2) k̃_J to sum when w_J ≠ 0, decided at compile time (the first term starts the
// sum: no 0 + x). Unrolled by the fold in weighted_slopes: a step carries no test of a
// coefficient, whatever the compiler's unrolling heuristics.
template <class Weights, std::size_t J, class T, std::size_t S>
constexpr void add_weighted_slope(Quaternion<T>& sum, bool& started,
                                  const std::array<Quaternion<T>, S>& k, T half_dt) noexcept {
  if constexpr (Weights::value[J] != T(0)) {
    const Quaternion<T> term = (Weights::value[J] * half_dt) * k[J];
    sum = started ? sum + term : term;
    started = true;
  }
}

// Σ_{j ∈ J} (w_j · dt/2) k̃_j over the nonzero weights.
template <class Weights, class T, std::size_t S, std::size_t... J>
constexpr Quaternion<T> weighted_slopes(const std::array<Quaternion<T>, S>& k, T half_dt,
                                        std::index_sequence<J...> /*indices*/) noexcept {
  Quaternion<T> sum{T(0), T(0), T(0), T(0)};
  bool started = false;
  (add_weighted_slope<Weights, J>(sum, started, k, half_dt), ...);
  return sum;
}

template <std::size_t S>
constexpr bool any_nonzero(const std::array<long double, S>& row) noexcept {
  return count_nonzero(row) != 0;
}

// Stage I's slope from q = 1 (without its factor ½): k̃_I = (1 + D_I) ⊗ (0, ω_I) with the stage
// increment D_I = (dt/2) Σ_{j<I} a_Ij k̃_j, formed as (0, ω_I) + D_I ⊗ (0, ω_I).
template <class Tableau, std::size_t I, class T, std::size_t S>
constexpr void stage_slope(std::array<Quaternion<T>, S>& k, const std::array<Vector3<T>, S>& rate,
                           T half_dt) noexcept {
  const Quaternion<T> pure{T(0), rate[I].x, rate[I].y, rate[I].z};
  if constexpr (any_nonzero(Tableau::value.a[I])) {
    const Quaternion<T> d =
        weighted_slopes<StageWeights<Tableau, T, I>>(k, half_dt, std::make_index_sequence<I>{});
    k[I] = pure + times_pure(d, rate[I]);
  } else {
    k[I] = pure;
  }
}

template <class Tableau, class T, std::size_t S, std::size_t... I>
constexpr std::array<Quaternion<T>, S> increment_stage_slopes(
    const std::array<Vector3<T>, S>& rate, T half_dt,
    std::index_sequence<I...> /*stages*/) noexcept {
  std::array<Quaternion<T>, S> k{};
  (stage_slope<Tableau, I>(k, rate, half_dt), ...);
  return k;
}

// The stage slopes k̃_i of the whole tableau, in stage order.
template <class Tableau, class T>
constexpr std::array<Quaternion<T>, Tableau::value.stages> increment_stage_slopes(
    const std::array<Vector3<T>, Tableau::value.stages>& rate, T half_dt) noexcept {
  return increment_stage_slopes<Tableau>(rate, half_dt,
                                         std::make_index_sequence<Tableau::value.stages>{});
}

// Flops of the increment (stage slopes, δ, dt/2) plus the plain application (header comment).
template <std::size_t S>
constexpr int weighted_sum_flops(const std::array<long double, S>& w) noexcept {
  const int n = static_cast<int>(count_nonzero(w));
  return n == 0 ? 0 : 5 * n + 4 * (n - 1);
}
template <std::size_t S>
constexpr int quaternion_runge_kutta_flops(const ButcherTableau<S>& t) noexcept {
  int n = 1 + weighted_sum_flops(t.b) + apply_increment_flops;
  for (std::size_t i = 0; i < S; ++i) {
    const int row = weighted_sum_flops(t.a[i]);
    n += row == 0 ? 0 : row + 23;
  }
  return n;
}

}  // namespace detail

/// The generic explicit Runge–Kutta stepper on q̇ = ½ q ⊗ (0, ω). Layout is rates_spanning (Window
/// samples, [0] at step start) or rate_function (Window = 0). q is body → reference, ω in rad/s,
/// dt in s; the result is not renormalized.
template <class Tableau, SampleLayout Layout, std::size_t Window>
struct ExplicitRungeKutta {
  static_assert(Layout == SampleLayout::rates_spanning || Layout == SampleLayout::rate_function,
                "Runge–Kutta stages need rates: rate samples spanning the step or a rate function");
  static_assert(Layout != SampleLayout::rates_spanning || Window >= 2,
                "rates_spanning needs the samples at both ends of the step");
  static_assert(Layout != SampleLayout::rate_function || Window == 0,
                "a rate function replaces the sample window");

  using tableau = Tableau;  ///< the coefficients, for the bounds layer (stage growth, weights)
  using family =
      ExplicitRungeKutta<Tableau, Layout, Window>;  ///< the bounds layer dispatches on it
  static constexpr SampleLayout layout = Layout;    ///< what the input holds
  static constexpr std::size_t window = Window;     ///< samples the step reads
  /// Samples that arrive per step.
  static constexpr std::size_t new_samples = Window == 0 ? 0 : Window - 1;
  static constexpr std::size_t stages = Tableau::value.stages;  ///< stages of the tableau
  /// Whether every stage reads an exact rate: a rate function, or every node on the sample grid.
  static constexpr bool exact_stage_rates =
      Layout == SampleLayout::rate_function || detail::all_nodes_on_grid(Tableau::value, Window);
  /// Order of the quaternion state (attitude and norm). Interpolated stage rates cap it at 2 (see
  /// the header comment).
  static constexpr int state_order = exact_stage_rates
                                         ? Tableau::value.order
                                         : (Tableau::value.order < 2 ? Tableau::value.order : 2);
  /// Order of the attitude (the angle error once the norm is restored): the tableau's attitude
  /// order with exact stage rates, else the state order.
  static constexpr int order = exact_stage_rates ? Tableau::value.attitude_order : state_order;
  static constexpr bool has_estimate = false;  ///< whether the increment carries an error estimate
  /// Floating-point operations per step: the increment and its plain application.
  static constexpr int flops = detail::quaternion_runge_kutta_flops(Tableau::value) +
                               detail::stage_rate_flops(Tableau::value, Layout, Window);

  /// δ = P − 1 from rate samples: rate[0] at step start … rate[Window−1] at its end (rad/s).
  template <class T, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rates_spanning, int> = 0>
  static constexpr Increment<T> increment(const std::array<Vector3<T>, Window>& rate,
                                          T dt) noexcept {
    return {increment_from_stage_rates(detail::stage_rates_from_samples<Tableau, Window>(rate), dt),
            T(0)};
  }
  /// δ = P − 1 from a rate function rate_at(τ) (rad/s), τ ∈ [0, dt] seconds from step start.
  template <class T, class RateFunction, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rate_function, int> = 0>
  static Increment<T> increment(const RateFunction& rate_at, T dt) noexcept {
    return {increment_from_stage_rates(detail::stage_rates_from_function<Tableau>(rate_at, dt), dt),
            T(0)};
  }

  /// q + q ⊗ δ from rate samples (the plain application; q body → reference).
  template <class T, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rates_spanning, int> = 0>
  static constexpr Quaternion<T> step(const Quaternion<T>& q,
                                      const std::array<Vector3<T>, Window>& rate, T dt) noexcept {
    return apply_increment(q, increment(rate, dt).delta);
  }
  /// The same from a rate function.
  template <class T, class RateFunction, SampleLayout L = Layout,
            std::enable_if_t<L == SampleLayout::rate_function, int> = 0>
  static Quaternion<T> step(const Quaternion<T>& q, const RateFunction& rate_at, T dt) noexcept {
    return apply_increment(q, increment(rate_at, dt).delta);
  }

  /// δ = (dt/2) Σ b_i k̃_i from the rates at the stage times (rad/s, one per stage).
  template <class T>
  static constexpr Quaternion<T> increment_from_stage_rates(
      const std::array<Vector3<T>, stages>& stage_rate, T dt) noexcept {
    const T half_dt = T(0.5) * dt;
    const std::array<Quaternion<T>, stages> k =
        detail::increment_stage_slopes<Tableau>(stage_rate, half_dt);
    return detail::weighted_slopes<detail::SolutionWeights<Tableau, T>>(
        k, half_dt, std::make_index_sequence<stages>{});
  }
};

// Named configurations. "Sampled": three samples (start, middle, end), the step spans two sample
// periods, every node on the grid. "Interpolated": two samples (start, end), one sample period per
// step, mid-step rates by linear interpolation. "RateFunction": a callable gives ω at any τ.

/// RK2 midpoint, samples at start/middle/end (only the middle one read): order 2.
struct RungeKutta2MidpointSampled
    : ExplicitRungeKutta<MidpointTableau, SampleLayout::rates_spanning, 3> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_2_midpoint_sampled";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "classic RK2 (midpoint) on the quaternion, stages at samples; 2 rates/step, order 2";
};
/// RK2 midpoint, mid-step rate = mean of the end samples: order 2.
struct RungeKutta2MidpointInterpolated
    : ExplicitRungeKutta<MidpointTableau, SampleLayout::rates_spanning, 2> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_2_midpoint_interpolated";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "RK2 (midpoint), mid-step rate interpolated linearly; 1 rate/step, order 2";
};
/// RK2 midpoint, rate function: order 2.
struct RungeKutta2MidpointRateFunction
    : ExplicitRungeKutta<MidpointTableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_2_midpoint_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "RK2 (midpoint) on a rate function (truth motions only); order 2";
};

/// RK3 Kutta, samples at start/middle/end: the quaternion state is third order, the attitude
/// fourth. Kutta's weights (1/6, 4/6, 1/6 at 0, ½, 1) are Simpson's rule, exact for the
/// quadrature part to dt⁴, and the remaining dt⁴ term of the local error is radial (it changes
/// ‖q‖, not the rotation) for q̇ = ½ q ⊗ (0, ω): for constant ω the step (1 − θ²/8, (θ/2 − θ³/48)n)
/// has rotation angle θ + O(θ⁵). Measured: attitude order 4.0 on classical coning, the
/// axisymmetric body and the two-gimbal motion, state order 3.0 (test_lie_group, test_orders).
/// With a renormalization policy the attitude error is what remains.
struct RungeKutta3KuttaSampled
    : ExplicitRungeKutta<Kutta3Tableau, SampleLayout::rates_spanning, 3> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_3_kutta_sampled";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Kutta's RK3, stages at samples; 2 rates/step, attitude order 4";
};
/// RK3 Kutta, linear interpolation between two samples: ONLY order 2.
struct RungeKutta3KuttaInterpolated
    : ExplicitRungeKutta<Kutta3Tableau, SampleLayout::rates_spanning, 2> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_3_kutta_interpolated";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Kutta's RK3, stage rates interpolated linearly; 1 rate/step, order 2";
};
/// RK3 Kutta, rate function: state order 3, attitude order 4 (see RungeKutta3KuttaSampled).
struct RungeKutta3KuttaRateFunction
    : ExplicitRungeKutta<Kutta3Tableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_3_kutta_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "Kutta's RK3 on a rate function (truth motions only); attitude order 4";
};

/// Classic RK4, samples at start/middle/end (the step spans two sample periods): order 4.
struct RungeKutta4Sampled
    : ExplicitRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rates_spanning, 3> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_4_sampled";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "classic RK4, stages at samples; 2 rates/step, order 4";
};
/// Classic RK4, linear interpolation between two samples: ONLY order 2.
struct RungeKutta4Interpolated
    : ExplicitRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rates_spanning, 2> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_4_interpolated";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "classic RK4, stage rates interpolated linearly; 1 rate/step, order 2";
};
/// Classic RK4, rate function: order 4.
struct RungeKutta4RateFunction
    : ExplicitRungeKutta<ClassicRungeKutta4Tableau, SampleLayout::rate_function, 0> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "runge_kutta_4_rate_function";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "classic RK4 on a rate function (truth motions only); order 4";
};

}  // namespace halfspin
