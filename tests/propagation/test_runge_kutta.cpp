// The generic explicit Runge–Kutta stepper and its RK2/RK3/RK4 configurations: the tableaus against
// Butcher's order conditions, the RK4 constant-rate closed form (per-step phase and norm error),
// and the observed global order on classical coning for every input form in float and double.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <string>
#include <type_traits>
#include <vector>

#include "fixed_step_drivers.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/butcher_tableau.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::fitted_order;
using test::global_error;
using test::GlobalError;
using test::narrow;
using test::widen;

namespace {

using L = long double;

struct ObservedOrders {
  L angle;
  L state;
};

template <class Stepper, class T, class Motion>
ObservedOrders observed_orders(const Motion& motion, L horizon, const std::vector<int>& steps) {
  std::vector<L> angle, state;
  for (int n : steps) {
    const GlobalError e = global_error<Stepper, T>(motion, horizon, n);
    angle.push_back(e.angle);
    state.push_back(e.state);
  }
  const ObservedOrders o{fitted_order(steps, angle), fitted_order(steps, state)};
  test::report_worst(std::string("order angle ") + Stepper::name + " " + test::type_name<T>(),
                     o.angle);
  test::report_worst(std::string("order state ") + Stepper::name + " " + test::type_name<T>(),
                     o.state);
  return o;
}

// Classical coning with a large cone angle (1 rad) at 1 Hz over one period: large truncation
// errors relative to the float roundoff floor, and the rate vector turns through 2π.
const ClassicalConingMotion<L> coning{1.0L, 2 * pi<L>};
constexpr L horizon = 1.0L;

// Step counts in the truncation-dominated range, chosen from the measured error tables (run with
// HALFSPIN_REPORT_WORST). Double: the floor is ~1e-14 and truncation dominates from 16 steps (Ω·dt
// = π/8) on. Float: the floor after N steps is ~N·ε_f·(a few) ≈ 1e-6 at 64 steps, so the range
// stops where the error is still ≥ 20× that: 4…32 steps for fourth order, 16…128 for second.
const std::vector<int> second_order_double{16, 32, 64, 128, 256};
const std::vector<int> second_order_float{16, 32, 64, 128, 256};
const std::vector<int> higher_order_double{16, 32, 64, 128, 256};
const std::vector<int> higher_order_float{4, 8, 16, 32};

template <class T>
const std::vector<int>& steps_for(int order) {
  if (std::is_same<T, float>::value) {
    return order <= 2 ? second_order_float : higher_order_float;
  }
  return order <= 2 ? second_order_double : higher_order_double;
}

// ---- Butcher's order conditions (rooted trees through order 5) ---------------------------------

template <std::size_t S>
struct TableauSums {
  const ButcherTableau<S>& t;
  std::array<L, S> ac(const std::array<L, S>& v) const {  // (A v)_i
    std::array<L, S> r{};
    for (std::size_t i = 0; i < S; ++i) {
      for (std::size_t j = 0; j < S; ++j) {
        r[i] += t.a[i][j] * v[j];
      }
    }
    return r;
  }
  static std::array<L, S> times(const std::array<L, S>& u, const std::array<L, S>& v) {
    std::array<L, S> r{};
    for (std::size_t i = 0; i < S; ++i) {
      r[i] = u[i] * v[i];
    }
    return r;
  }
  static L weigh(const std::array<L, S>& w, const std::array<L, S>& v) {
    L s = 0;
    for (std::size_t i = 0; i < S; ++i) {
      s += w[i] * v[i];
    }
    return s;
  }
};

// Residuals Φ(τ) − 1/γ(τ) of the 17 rooted trees of order ≤ 5 for the weights w (Butcher, Numerical
// Methods for ODEs, order conditions; the γ values are from memory and recomputed here as products
// of subtree orders in the comments).
template <std::size_t S>
std::vector<L> order_condition_residuals(const ButcherTableau<S>& t, const std::array<L, S>& w,
                                         int order) {
  using Sums = TableauSums<S>;
  Sums m{t};
  std::array<L, S> one{};
  one.fill(1.0L);
  const auto& c = t.c;
  const auto c2 = Sums::times(c, c);
  const auto c3 = Sums::times(c2, c);
  const auto Ac = m.ac(c);
  const auto Ac2 = m.ac(c2);
  const auto AAc = m.ac(Ac);
  std::vector<L> r;
  r.push_back(Sums::weigh(w, one) - 1.0L);                    // γ = 1
  if (order >= 2) r.push_back(Sums::weigh(w, c) - 1.0L / 2);  // γ = 2
  if (order >= 3) {
    r.push_back(Sums::weigh(w, c2) - 1.0L / 3);  // γ = 3
    r.push_back(Sums::weigh(w, Ac) - 1.0L / 6);  // γ = 3·2
  }
  if (order >= 4) {
    r.push_back(Sums::weigh(w, c3) - 1.0L / 4);                  // γ = 4
    r.push_back(Sums::weigh(w, Sums::times(c, Ac)) - 1.0L / 8);  // γ = 4·2
    r.push_back(Sums::weigh(w, Ac2) - 1.0L / 12);                // γ = 4·3
    r.push_back(Sums::weigh(w, AAc) - 1.0L / 24);                // γ = 4·3·2
  }
  if (order >= 5) {
    r.push_back(Sums::weigh(w, Sums::times(c3, c)) - 1.0L / 5);         // γ = 5
    r.push_back(Sums::weigh(w, Sums::times(c2, Ac)) - 1.0L / 10);       // γ = 5·2
    r.push_back(Sums::weigh(w, Sums::times(c, Ac2)) - 1.0L / 15);       // γ = 5·3
    r.push_back(Sums::weigh(w, Sums::times(c, AAc)) - 1.0L / 30);       // γ = 5·3·2
    r.push_back(Sums::weigh(w, Sums::times(Ac, Ac)) - 1.0L / 20);       // γ = 5·2·2
    r.push_back(Sums::weigh(w, m.ac(c3)) - 1.0L / 20);                  // γ = 5·4
    r.push_back(Sums::weigh(w, m.ac(Sums::times(c, Ac))) - 1.0L / 40);  // γ = 5·4·2
    r.push_back(Sums::weigh(w, m.ac(Ac2)) - 1.0L / 60);                 // γ = 5·4·3
    r.push_back(Sums::weigh(w, m.ac(AAc)) - 1.0L / 120);                // γ = 5·4·3·2
  }
  return r;
}

template <std::size_t S>
L worst_residual(const ButcherTableau<S>& t, const std::array<L, S>& w, int order) {
  L worst = 0;
  for (L x : order_condition_residuals(t, w, order)) {
    worst = std::fmax(worst, std::fabs(x));
  }
  return worst;
}

// The first failing order (one past the last one all of whose conditions hold).
template <std::size_t S>
int order_reached(const ButcherTableau<S>& t, const std::array<L, S>& w) {
  int p = 0;
  while (p < 5 && worst_residual(t, w, p + 1) < 1e-15L) {
    ++p;
  }
  return p;
}

}  // namespace

TEST_CASE(
    "tableaus satisfy Butcher's order conditions exactly to their stated order and no further",
    "[runge_kutta][reference]") {
  // Butcher, Numerical Methods for Ordinary Differential Equations: rooted-tree order conditions.
  // Bogacki and Shampine 1989 (3(2) pair), Dormand and Prince 1980 (5(4) pair): stated orders.
  CHECK(order_reached(MidpointTableau::value, MidpointTableau::value.b) == 2);
  CHECK(order_reached(Kutta3Tableau::value, Kutta3Tableau::value.b) == 3);
  CHECK(order_reached(ClassicRungeKutta4Tableau::value, ClassicRungeKutta4Tableau::value.b) == 4);
  CHECK(order_reached(BogackiShampine32Tableau::value, BogackiShampine32Tableau::value.b) == 3);
  CHECK(order_reached(BogackiShampine32Tableau::value,
                      BogackiShampine32Tableau::value.b_embedded) == 2);
  CHECK(worst_residual(DormandPrince54Tableau::value, DormandPrince54Tableau::value.b, 5) < 1e-15L);
  CHECK(order_reached(DormandPrince54Tableau::value, DormandPrince54Tableau::value.b_embedded) ==
        4);
  // Each tableau states the order the conditions give.
  CHECK(MidpointTableau::value.order == 2);
  CHECK(Kutta3Tableau::value.order == 3);
  CHECK(ClassicRungeKutta4Tableau::value.order == 4);
  CHECK(BogackiShampine32Tableau::value.order == 3);
  CHECK(BogackiShampine32Tableau::value.embedded_order == 2);
  CHECK(DormandPrince54Tableau::value.order == 5);
  CHECK(DormandPrince54Tableau::value.embedded_order == 4);
}

TEST_CASE("stepper facts: layout, window, samples per step and the order stated with each input",
          "[runge_kutta]") {
  // Three samples on the grid of the nodes 0, 1/2, 1: full order, two new samples per step.
  STATIC_REQUIRE(RungeKutta4Sampled::layout == SampleLayout::rates_spanning);
  STATIC_REQUIRE(RungeKutta4Sampled::window == 3);
  STATIC_REQUIRE(RungeKutta4Sampled::new_samples == 2);
  STATIC_REQUIRE(RungeKutta2MidpointSampled::order == 2);
  STATIC_REQUIRE(RungeKutta3KuttaSampled::state_order == 3);
  STATIC_REQUIRE(RungeKutta3KuttaSampled::order == 4);  // attitude: see explicit_runge_kutta.hpp
  STATIC_REQUIRE(RungeKutta4Sampled::order == 4);
  // Two samples, linear interpolation at mid-step: order 2 at most.
  STATIC_REQUIRE(RungeKutta4Interpolated::window == 2);
  STATIC_REQUIRE(RungeKutta4Interpolated::new_samples == 1);
  STATIC_REQUIRE(RungeKutta2MidpointInterpolated::order == 2);
  STATIC_REQUIRE(RungeKutta3KuttaInterpolated::order == 2);
  STATIC_REQUIRE(RungeKutta4Interpolated::order == 2);
  // Rate function: full order, no sample window.
  STATIC_REQUIRE(RungeKutta4RateFunction::layout == SampleLayout::rate_function);
  STATIC_REQUIRE(RungeKutta4RateFunction::window == 0);
  STATIC_REQUIRE(RungeKutta4RateFunction::new_samples == 0);
  STATIC_REQUIRE(RungeKutta4RateFunction::order == 4);
  STATIC_REQUIRE(RungeKutta3KuttaRateFunction::state_order == 3);
  STATIC_REQUIRE(RungeKutta3KuttaRateFunction::order == 4);
  // Flop count of classic RK4 on samples, counted by hand from the code: dt/2 (1); slopes of
  // stages 2–4 (0, ω_i) + D_i ⊗ (0, ω_i) at 23 (the first stage's slope is free); three stage
  // increments with one term each at 5 (coefficient × dt/2, 4 ×); δ from four weights at 5 plus
  // three additions at 4; the plain application q + q ⊗ δ 32.
  STATIC_REQUIRE(RungeKutta4Sampled::flops == 1 + 3 * 23 + 3 * 5 + 4 * 5 + 3 * 4 + 32);
  // Interpolation adds one mid-step rate ω₀ + ½(ω₁ − ω₀), 9 flops, shared by stages 2 and 3.
  STATIC_REQUIRE(RungeKutta4Interpolated::flops == RungeKutta4Sampled::flops + 9);
}

TEST_CASE("a step from a rate function reading the samples equals the step from the samples",
          "[runge_kutta]") {
  // Same stage rates in, same arithmetic: bit-identical results.
  test::RandomRotations rng(7);
  for (int n = 0; n < 100; ++n) {
    const Quaternion<double> q = rng.quaternion<double>();
    const std::array<Vector3<double>, 3> w{rng.unit_vector<double>() * 2.0,
                                           rng.unit_vector<double>(),
                                           rng.unit_vector<double>() * 0.5};
    const double dt = 0.01;
    const auto by_sample = [&](double tau) {
      return tau == 0.0 ? w[0] : (tau == dt ? w[2] : w[1]);
    };
    CHECK(RungeKutta4Sampled::step(q, w, dt) == RungeKutta4RateFunction::step(q, by_sample, dt));
    CHECK(RungeKutta3KuttaSampled::step(q, w, dt) ==
          RungeKutta3KuttaRateFunction::step(q, by_sample, dt));
    CHECK(RungeKutta2MidpointSampled::step(q, w, dt) ==
          RungeKutta2MidpointRateFunction::step(q, by_sample, dt));
    // Interpolated RK4 forms the mid-step rate ω₀ + ½(ω₁ − ω₀) and then proceeds as with samples.
    const Vector3<double> mid = w[0] + 0.5 * (w[2] - w[0]);
    const std::array<Vector3<double>, 2> ends{w[0], w[2]};
    const std::array<Vector3<double>, 3> grid{w[0], mid, w[2]};
    CHECK(RungeKutta4Interpolated::step(q, ends, dt) == RungeKutta4Sampled::step(q, grid, dt));
  }
}

TEST_CASE("the generic stepper is usable in constant expressions", "[runge_kutta]") {
  constexpr std::array<Vector3<double>, 3> w{Vector3<double>{0.0, 0.0, 1.0},
                                             Vector3<double>{0.0, 0.0, 1.0},
                                             Vector3<double>{0.0, 0.0, 1.0}};
  constexpr Quaternion<double> q = RungeKutta4Sampled::step(Quaternion<double>::identity(), w, 0.5);
  // θ = 0.5 about z: increment (1 − θ²/8 + θ⁴/384, 0, 0, θ/2 − θ³/48), see the closed form below.
  constexpr double dw = q.w - (1.0 - 0.25 / 8 + 0.0625 / 384);
  constexpr double dz = q.z - (0.25 - 0.125 / 48);
  STATIC_REQUIRE(dw < 1e-15 && dw > -1e-15);
  STATIC_REQUIRE(dz < 1e-15 && dz > -1e-15);
  STATIC_REQUIRE(q.x == 0.0);
}

// ---- RK4 at constant rate: the closed form
// --------------------------------------------------------
//
// With ω constant the stage equations are linear with the constant quaternion A = ½(0, ω), so one
// RK4 step multiplies q by the truncated exponential series P = Σ_{k≤4} (A dt)^k / k!. (A dt)² =
// −θ²/4 with θ = |ω|·dt (a pure unit quaternion squares to −1), hence, with n = ω/|ω|,
//     P = (1 − θ²/8 + θ⁴/384,  (θ/2 − θ³/48)·n),
// the series of (cos(θ/2), sin(θ/2)·n) cut after θ⁴ and θ³. Its squared norm is
//     |P|² = (1 − θ²/8 + θ⁴/384)² + (θ/2 − θ³/48)² = 1 − θ⁶/4608 + θ⁸/147456
// (the θ² and θ⁴ terms cancel exactly), so each step shrinks the norm by √(1 − θ⁶/4608 + θ⁸/147456)
// ≈ 1 − θ⁶/9216, and its rotation angle is
//     φ = 2·atan2(θ/2 − θ³/48, 1 − θ²/8 + θ⁴/384),   φ − θ = −θ⁵/1920 + O(θ⁷)
// (a phase lag: atan2 of the truncated sine and cosine of u = θ/2 is u − u⁵/120 + …). After N steps
// P commutes with itself, so the norm is |P|^N and the phase error N·(φ − θ) exactly.

namespace {

L rk4_constant_rate_norm(L theta) {
  const L t2 = theta * theta, t6 = t2 * t2 * t2;
  return std::sqrt(1.0L - t6 / 4608 + t6 * t2 / 147456);
}
L rk4_constant_rate_angle(L theta) {
  const L t2 = theta * theta;
  return 2 * std::atan2(theta / 2 - theta * t2 / 48, 1 - t2 / 8 + t2 * t2 / 384);
}

}  // namespace

TEST_CASE("RK4 constant-rate closed form: the norm identity and the leading phase lag",
          "[runge_kutta]") {
  // The algebra above, checked in long double: the two forms of |P|² agree, and the exact phase
  // error matches its leading term −θ⁵/1920 to relative O(θ²).
  for (L theta : {0.01L, 0.05L, 0.1L, 0.3L}) {
    const L c = 1 - theta * theta / 8 + theta * theta * theta * theta / 384;
    const L s = theta / 2 - theta * theta * theta / 48;
    CHECK(std::fabs(c * c + s * s - rk4_constant_rate_norm(theta) * rk4_constant_rate_norm(theta)) <
          1e-18L);
    const L lag = rk4_constant_rate_angle(theta) - theta;
    const L leading = -std::pow(theta, 5) / 1920;
    CHECK(std::fabs(lag / leading - 1) < theta * theta);
  }
}

TEMPLATE_TEST_CASE(
    "RK4 at constant rate: measured per-step phase and norm error match the closed form",
    "[runge_kutta]", float, double) {
  using T = TestType;
  test::RandomRotations rng(11);
  L worst_phase = 0, worst_norm = 0;
  // θ from 0.05 to 0.5 rad per step: the phase lag θ⁵/1920 and norm loss θ⁶/9216 stand well above
  // rounding in double for all of them; in float only above θ ≈ 0.3 (lag 1.3e-6 against ε_f
  // = 1.2e-7), so float uses the larger angles and a tolerance relative to ε_f.
  const std::vector<L> thetas = std::is_same<T, float>::value
                                    ? std::vector<L>{0.3L, 0.4L, 0.5L}
                                    : std::vector<L>{0.05L, 0.1L, 0.2L, 0.5L};
  for (L theta : thetas) {
    for (int n = 0; n < 50; ++n) {
      const Vector3<T> axis = rng.unit_vector<T>();
      const T dt = T(0.01);
      const Vector3<T> w = axis * static_cast<T>(theta / test::ld(dt));
      const std::array<Vector3<T>, 3> rate{w, w, w};
      const Quaternion<T> p = RungeKutta4Sampled::step(Quaternion<T>::identity(), rate, dt);
      // θ as the stepper saw it (ω and dt rounded to T).
      const L th = test::length_ld(w) * test::ld(dt);
      const Quaternion<L> pl = widen(p);
      const L angle = 2 * std::atan2(std::sqrt(pl.x * pl.x + pl.y * pl.y + pl.z * pl.z), pl.w);
      worst_phase =
          std::fmax(worst_phase, std::fabs((angle - th) - (rk4_constant_rate_angle(th) - th)));
      worst_norm = std::fmax(worst_norm, std::fabs(test::norm_ld(p) - rk4_constant_rate_norm(th)));
      // The measured errors really are the closed-form ones, not rounding: where the predicted
      // lag and norm loss exceed 10⁴ ε, they match to 1e-3 relative.
      const L lag = rk4_constant_rate_angle(th) - th;
      const L loss = rk4_constant_rate_norm(th) - 1;
      if (std::fabs(lag) > 1e4L * test::eps<T>()) {
        CHECK((angle - th) / lag == Approx(1.0L).epsilon(1e-3));
      }
      if (std::fabs(loss) > 1e4L * test::eps<T>()) {
        CHECK((test::norm_ld(p) - 1) / loss == Approx(1.0L).epsilon(1e-3));
      }
    }
  }
  test::report_worst(
      std::string("RK4 constant-rate phase vs closed form (eps) ") + test::type_name<T>(),
      worst_phase / test::eps<T>());
  test::report_worst(
      std::string("RK4 constant-rate norm vs closed form (eps) ") + test::type_name<T>(),
      worst_norm / test::eps<T>());
  CHECK(worst_phase <= 2 * test::eps<T>());
  CHECK(worst_norm <= 2 * test::eps<T>());
}

TEST_CASE("RK4 at constant rate over many steps: norm |P|^N and phase N·(φ − θ)", "[runge_kutta]") {
  // 10⁴ steps at θ = 0.2 rad in double: norm loss 1 − |P|^N ≈ N·θ⁶/9216 = 6.9e-5, phase lag
  // N·θ⁵/1920 = 1.7e-3 rad; both must match the closed form to a small fraction.
  const Vector3<double> w{0.0, 12.0, 16.0};  // |ω| = 20 rad/s
  const double dt = 0.01;                    // θ = 0.2
  const int steps = 10000;
  Quaternion<double> q = Quaternion<double>::identity();
  const std::array<Vector3<double>, 3> rate{w, w, w};
  for (int k = 0; k < steps; ++k) {
    q = RungeKutta4Sampled::step(q, rate, dt);
  }
  const L theta = test::length_ld(w) * test::ld(dt);
  const L expected_norm = std::pow(rk4_constant_rate_norm(theta), static_cast<L>(steps));
  CHECK(std::fabs(test::norm_ld(q) - expected_norm) < 1e-11L);
  CHECK(1 - expected_norm > 6e-5L);  // the drift is real and the closed form sees it
  // Compare with the exact motion advanced by N·φ (closed-form angle) and by N·θ (truth).
  const Vector3<L> axis{0.0L, 0.6L, 0.8L};
  const L phi_total = steps * rk4_constant_rate_angle(theta);
  const Quaternion<L> predicted = quaternion_exp(axis * phi_total);
  const Quaternion<L> truth = quaternion_exp(axis * (steps * theta));
  CHECK(angle_between(widen(q), predicted) < 1e-10L);
  CHECK(angle_between(widen(q), truth) ==
        Approx(std::fabs(phi_total - steps * theta)).epsilon(1e-6));
}

// ---- Observed orders on classical coning ------------------------------------------------------

namespace {

template <class Stepper, class T>
void check_order_on_coning(L expected_angle_order, L expected_state_order) {
  const ObservedOrders o =
      observed_orders<Stepper, T>(coning, horizon, steps_for<T>(Stepper::state_order));
  INFO(Stepper::name << " " << test::type_name<T>() << ": angle order " << o.angle
                     << ", state order " << o.state);
  CHECK(std::fabs(o.angle - expected_angle_order) <= 0.2L);
  CHECK(std::fabs(o.state - expected_state_order) <= 0.2L);
}

}  // namespace

TEMPLATE_TEST_CASE("RK2 midpoint reaches order 2 on coning with every input form",
                   "[runge_kutta][order]", float, double) {
  check_order_on_coning<RungeKutta2MidpointSampled, TestType>(2, 2);
  check_order_on_coning<RungeKutta2MidpointInterpolated, TestType>(2, 2);
  check_order_on_coning<RungeKutta2MidpointRateFunction, TestType>(2, 2);
}

// Kutta's RK3 on q̇ = ½ q ⊗ (0, ω): the quaternion state converges at the classical order 3, but
// the attitude (angle) error converges at order 4. The O(dt⁴) local error is, to leading order, a
// real multiple of q: it changes the norm only (as at constant rate, where the missing series term
// (A dt)⁴/24 = θ⁴/384 is a scalar). We measured this on coning, on a single-axis oscillation and on
// a generic non-commuting rate; it is not a property of third-order methods in general
// (Bogacki–Shampine's third-order solution shows angle order 3, test_embedded_pairs.cpp). The
// stepper states both: `order` 4 for the attitude, `state_order` 3 for the full quaternion.
TEMPLATE_TEST_CASE(
    "RK3 Kutta: state order 3, attitude order 4 on coning with stage samples or a rate function - "
    "order 2 interpolated",
    "[runge_kutta][order]", float, double) {
  check_order_on_coning<RungeKutta3KuttaSampled, TestType>(4, 3);
  check_order_on_coning<RungeKutta3KuttaRateFunction, TestType>(4, 3);
  check_order_on_coning<RungeKutta3KuttaInterpolated, TestType>(2, 2);
}

TEMPLATE_TEST_CASE(
    "RK4 classic reaches order 4 with stage samples or a rate function, only 2 interpolated",
    "[runge_kutta][order]", float, double) {
  check_order_on_coning<RungeKutta4Sampled, TestType>(4, 4);
  check_order_on_coning<RungeKutta4RateFunction, TestType>(4, 4);
  check_order_on_coning<RungeKutta4Interpolated, TestType>(2, 2);
}
