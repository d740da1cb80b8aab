// Local (one-step) error bounds of the Runge–Kutta family (bounds/runge_kutta_bounds.hpp).
//
// Safety: for every stepper the bound is never below the measured one-step attitude error. The
// step is taken in long double from the truth attitude at many start times and step sizes (14
// steps, ratio √2, from D0·h = 1 rad down to 0.011 rad; the coarsest give +∞ for some steppers) on
// the closed-form truth motions (classical coning, single-axis oscillation, torque-free
// axisymmetric body) and on random sums of sinusoids whose truth comes from
// Boost.Odeint's Runge–Kutta–Fehlberg 7(8) in long double with 256 substeps per step. The envelope
// of each motion is its exact derivative bound. Checks are strict (measured ≤ bound) wherever the
// bound is ≥ 1e-15 rad, i.e. ≥ 10⁴ times the long double measurement floor (~1e-19); at least 8
// step sizes per motion are checked. Exactness: with D1..D5 = 0 the bound equals the closed-form
// constant-rate angle error (RKMK4: exactly 0). The RKMK4 bound relies on the exponential map being
// distance non-increasing in the ball of radius π and on an upper bound for the dexp⁻¹ coefficient
// β; both are checked here. With HALFSPIN_REPORT_WORST set, the bound/measured ratios (min, median,
// max) are printed.
#include <catch2/catch.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <string>
#include <vector>

#include <boost/numeric/odeint.hpp>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/runge_kutta_bounds.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "test_support.hpp"

namespace {

using halfspin::Quaternion;
using halfspin::RateEnvelope;
using halfspin::Vector3;
using LD = long double;

// One step of Stepper in long double from q over [t0, t0 + h], input drawn from motion.rate.
template <class Stepper, class Motion>
Quaternion<LD> one_step(const Motion& motion, const Quaternion<LD>& q, LD t0, LD h) {
  if constexpr (Stepper::layout == halfspin::SampleLayout::rate_function) {
    const auto rate_at = [&](LD tau) noexcept { return motion.rate(t0 + tau); };
    return Stepper::step(q, rate_at, h);
  } else {
    std::array<Vector3<LD>, Stepper::window> input{};
    for (std::size_t i = 0; i < Stepper::window; ++i) {
      input[i] = motion.rate(t0 + h * static_cast<LD>(i) / static_cast<LD>(Stepper::window - 1));
    }
    return Stepper::template step<LD>(q, input, h);
  }
}

// Random smooth motion: ω(t) = c + Σ_j v_j cos(Ω_j t + ψ_j); derivative bounds
// D0 = |c| + Σ|v_j|, D_k = Σ |v_j| Ω_j^k (triangle inequality; common practice, no source).
struct SinusoidSum {
  Vector3<LD> constant{};
  std::array<Vector3<LD>, 3> amplitude{};
  std::array<LD, 3> frequency{};
  std::array<LD, 3> phase{};

  Vector3<LD> rate(LD t) const noexcept {
    Vector3<LD> w = constant;
    for (std::size_t j = 0; j < 3; ++j) {
      w = w + std::cos(frequency[j] * t + phase[j]) * amplitude[j];
    }
    return w;
  }
  RateEnvelope<LD> envelope() const {
    RateEnvelope<LD> e = RateEnvelope<LD>::none();
    e.derivative[0] = halfspin::norm(constant);
    for (std::size_t j = 0; j < 3; ++j) {
      LD p = halfspin::norm(amplitude[j]);
      for (std::size_t k = 0; k < 6; ++k) {
        e.derivative[k] += p;
        p *= frequency[j];
      }
    }
    return e;
  }
};

// The truth increment of a SinusoidSum over [t0, t0 + h] from q: q̇ = ½ q ⊗ (0, ω) integrated by
// Boost.Odeint's runge_kutta_fehlberg78 (reference library, Debian libboost-dev) in long double,
// 256 fixed substeps (its local error, ~(D0·h/256)⁹, is far below 1e-15 rad for D0·h ≤ 1).
Quaternion<LD> odeint_truth(const SinusoidSum& m, const Quaternion<LD>& q, LD t0, LD h) {
  using State = std::array<LD, 4>;
  State x{q.w, q.x, q.y, q.z};
  const auto rhs = [&m](const State& s, State& ds, LD t) {
    const Vector3<LD> w = m.rate(t);
    ds[0] = -0.5L * (s[1] * w.x + s[2] * w.y + s[3] * w.z);
    ds[1] = 0.5L * (s[0] * w.x + s[2] * w.z - s[3] * w.y);
    ds[2] = 0.5L * (s[0] * w.y - s[1] * w.z + s[3] * w.x);
    ds[3] = 0.5L * (s[0] * w.z + s[1] * w.y - s[2] * w.x);
  };
  boost::numeric::odeint::runge_kutta_fehlberg78<State, LD, State, LD> stepper;
  const int substeps = 256;
  const LD dt = h / substeps;
  for (int i = 0; i < substeps; ++i) {
    stepper.do_step(rhs, x, t0 + dt * i, dt);
  }
  return {x[0], x[1], x[2], x[3]};
}

// Bound/measured statistics per (stepper, motion).
struct RatioLog {
  std::vector<LD> ratio;
  std::vector<LD> finest;  // ratios at the finest checked step
  int checked_steps = 0;
};
void print_ratios(const std::string& key, RatioLog log) {
  if (std::getenv("HALFSPIN_REPORT_WORST") == nullptr || log.ratio.empty()) {
    return;
  }
  std::sort(log.ratio.begin(), log.ratio.end());
  std::sort(log.finest.begin(), log.finest.end());
  std::printf(
      "%-50s bound/measured min %9.3Lg median %9.3Lg max %9.3Lg; finest step median %9.3Lg"
      " (%zu checks, %d steps)\n",
      key.c_str(), log.ratio.front(), log.ratio[log.ratio.size() / 2], log.ratio.back(),
      log.finest.empty() ? 0.0L : log.finest[log.finest.size() / 2], log.ratio.size(),
      log.checked_steps);
}

constexpr LD measurement_floor = 1e-15L;  // compare only where the bound is this large (rad)
constexpr int step_sizes = 14;
constexpr int start_times = 32;

// Sweep: one step of length h = x/D0 (x = 2^(−j/2), j = 0..13) from start_times start times over
// [0, period); truth(t0) → attitude at t0, truth_step(q, t0, h) → exact attitude at t0 + h.
template <class Stepper, class Motion, class Truth, class TruthStep>
void check_safety(const std::string& label, const Motion& motion, const RateEnvelope<LD>& e,
                  LD period, const Truth& truth, const TruthStep& truth_step) {
  RatioLog log;
  halfspin::test::RandomRotations random(20261201);
  for (int j = 0; j < step_sizes; ++j) {
    const LD h = std::pow(2.0L, -0.5L * j) / e.derivative[0];
    const LD bound = halfspin::LocalErrorBound<Stepper>::local(e, h);
    REQUIRE(bound >= 0.0L);
    if (!(bound < std::numeric_limits<LD>::infinity()) || bound < measurement_floor) {
      continue;
    }
    ++log.checked_steps;
    log.finest.clear();
    for (int k = 0; k < start_times; ++k) {
      const LD t0 = random.uniform<LD>(0.0L, period);
      const Quaternion<LD> q0 = truth(t0);
      const Quaternion<LD> exact = truth_step(q0, t0, h);
      const LD measured = halfspin::angle_between(one_step<Stepper>(motion, q0, t0, h), exact);
      INFO(Stepper::name << " on " << label << ": h = " << static_cast<double>(h)
                         << " t0 = " << static_cast<double>(t0));
      REQUIRE(measured <= bound);
      if (measured > 0.0L) {
        log.ratio.push_back(bound / measured);
        log.finest.push_back(bound / measured);
      }
    }
  }
  REQUIRE(log.checked_steps >= 8);
  print_ratios(std::string(Stepper::name) + " / " + label, log);
}

template <class Stepper>
void check_all_motions() {
  // Classical coning, half-angle 0.3 rad at 5 Hz (truth/classical_coning.hpp, closed form);
  // envelope from ConingSpec (exact derivative norms).
  {
    const halfspin::ClassicalConingMotion<LD> m{0.3L, 2.0L * halfspin::pi<LD> * 5.0L};
    const halfspin::ConingSpec<LD> spec{0.3L, 5.0L};
    check_safety<Stepper>(
        "coning", m, spec.envelope(), 0.2L, [&](LD t) { return m.attitude(t); },
        [&](const Quaternion<LD>&, LD t0, LD h) { return m.attitude(t0 + h); });
  }
  // Single-axis oscillation, 0.4 rad at 3 Hz about a tilted axis: D_k = A (2πf)^(k+1).
  {
    halfspin::SingleAxisOscillation<LD> m{};
    const LD n = std::sqrt(3.0L);
    m.axis = {1.0L / n, -1.0L / n, 1.0L / n};
    m.amplitude = 0.4L;
    m.frequency = 3.0L;
    m.phase = 0.2L;
    RateEnvelope<LD> e{};
    LD p = m.amplitude * 2.0L * halfspin::pi<LD> * m.frequency;
    for (std::size_t k = 0; k < 6; ++k) {
      e.derivative[k] = p;
      p *= 2.0L * halfspin::pi<LD> * m.frequency;
    }
    check_safety<Stepper>(
        "single-axis", m, e, 1.0L / 3, [&](LD t) { return m.attitude(t); },
        [&](const Quaternion<LD>&, LD t0, LD h) { return m.attitude(t0 + h); });
  }
  // Torque-free axisymmetric body: ω = (ω⊥ cos(λt + φ0), ω⊥ sin(λt + φ0), ω3):
  // D0 = √(ω⊥² + ω3²), D_k = ω⊥ |λ|^k.
  {
    halfspin::AxisymmetricBodyMotion<LD> m{};
    m.transverse_inertia = 1.0L;
    m.axial_inertia = 1.8L;
    m.transverse_rate = 2.0L;
    m.transverse_phase = 0.4L;
    m.axial_rate = 6.0L;
    const LD lambda = std::fabs(m.body_turning_rate());
    RateEnvelope<LD> e{};
    e.derivative[0] = std::hypot(m.transverse_rate, m.axial_rate);
    LD p = m.transverse_rate * lambda;
    for (std::size_t k = 1; k < 6; ++k) {
      e.derivative[k] = p;
      p *= lambda;
    }
    check_safety<Stepper>(
        "axisymmetric body", m, e, 2.0L * halfspin::pi<LD> / lambda,
        [&](LD t) { return m.attitude(t); },
        [&](const Quaternion<LD>&, LD t0, LD h) { return m.attitude(t0 + h); });
  }
  // Random sums of sinusoids, truth by Boost.Odeint.
  halfspin::test::RandomRotations random(4242);
  for (int trial = 0; trial < 4; ++trial) {
    SinusoidSum m{};
    // Draws sequenced one per statement: the same motions under every compiler.
    const LD size = random.uniform<LD>(0.0L, 3.0L);
    m.constant = size * random.unit_vector<LD>();
    for (std::size_t j = 0; j < 3; ++j) {
      const LD amplitude = random.uniform<LD>(0.2L, 2.0L);
      m.amplitude[j] = amplitude * random.unit_vector<LD>();
      m.frequency[j] = random.uniform<LD>(1.0L, 30.0L);
      m.phase[j] = random.uniform<LD>(0.0L, 6.3L);
    }
    check_safety<Stepper>(
        "random sinusoids " + std::to_string(trial), m, m.envelope(), 2.0L,
        [](LD t) {
          return halfspin::quaternion_exp(Vector3<LD>{0.1L * t, -0.2L, 0.3L});
        },
        [&](const Quaternion<LD>& q0, LD t0, LD h) { return odeint_truth(m, q0, t0, h); });
  }
}

// The closed-form constant-rate angle error, computed directly (2·atan2(|v|, w) − θ for the
// stepper's own increment at constant rate, in long double): what the bound must equal.
template <class Stepper>
LD constant_rate_error(LD theta) {
  const halfspin::ConstantRateMotion<LD> m{Quaternion<LD>::identity(), {0.0L, 0.0L, theta}};
  const Quaternion<LD> p = one_step<Stepper>(m, Quaternion<LD>::identity(), 0.0L, 1.0L);
  return std::fabs(2.0L * std::atan2(p.z, p.w) - theta);
}

template <class Stepper>
void check_constant_rate() {
  for (LD theta = 0.05L; theta <= 1.0L; theta += 0.05L) {
    const LD closed_form = constant_rate_error<Stepper>(theta);
    // Bound with D1..D5 = 0 at h = 1 s, rate θ: equal to the closed form to relative 1e-9 plus
    // 64 ε_ld·θ, the cancellation floor of the direct formula 2·atan2(v, w) − θ in long double
    // (the header evaluates the same closed form without that cancellation).
    const LD bound_ld =
        halfspin::LocalErrorBound<Stepper>::local(RateEnvelope<LD>::constant_rate(theta), 1.0L);
    INFO(Stepper::name << " theta = " << static_cast<double>(theta));
    const LD floor =
        64.0L * std::numeric_limits<LD>::epsilon() * theta;  // direct formula's cancellation
    REQUIRE(std::fabs(bound_ld - closed_form) <= 1e-9L * closed_form + floor);
    const double bound_d = halfspin::LocalErrorBound<Stepper>::local(
        RateEnvelope<double>::constant_rate(static_cast<double>(theta)), 1.0);
    REQUIRE(std::fabs(static_cast<LD>(bound_d) - closed_form) <= 1e-9L * closed_form + floor);
    const float bound_f = halfspin::LocalErrorBound<Stepper>::local(
        RateEnvelope<float>::constant_rate(static_cast<float>(theta)), 1.0f);
    // float: θ itself is rounded (relative 6e-8), which moves a θ^(p+1) error by (p+1)·6e-8.
    const LD theta_f = static_cast<LD>(static_cast<float>(theta));
    REQUIRE(std::fabs(static_cast<LD>(bound_f) - constant_rate_error<Stepper>(theta_f)) <=
            4e-6L * closed_form);
  }
  // Monotone in θ on [0, 1] (section 1 of the header relies on it): dense grid.
  LD previous = 0.0L;
  for (int i = 1; i <= 10000; ++i) {
    const LD theta = static_cast<LD>(i) / 10000.0L;
    const LD f =
        halfspin::LocalErrorBound<Stepper>::local(RateEnvelope<LD>::constant_rate(theta), 1.0L);
    REQUIRE(f >= previous);
    previous = f;
  }
  // No motion at all: the bound is exactly 0.
  REQUIRE(halfspin::LocalErrorBound<Stepper>::local(RateEnvelope<LD>::none(), 0.01L) == 0.0L);
}

}  // namespace

TEST_CASE("Runge-Kutta local bounds are exact at constant rate", "[bounds][reference]") {
  // Reference: the stability polynomial R(z) = Σ γ_k z^k of an explicit Runge–Kutta method
  // applied to y' = A y with constant A (Butcher); the measured increment is the stepper's own.
  check_constant_rate<halfspin::RungeKutta2MidpointSampled>();
  check_constant_rate<halfspin::RungeKutta2MidpointInterpolated>();
  check_constant_rate<halfspin::RungeKutta2MidpointRateFunction>();
  check_constant_rate<halfspin::RungeKutta3KuttaSampled>();
  check_constant_rate<halfspin::RungeKutta3KuttaInterpolated>();
  check_constant_rate<halfspin::RungeKutta3KuttaRateFunction>();
  check_constant_rate<halfspin::RungeKutta4Sampled>();
  check_constant_rate<halfspin::RungeKutta4Interpolated>();
  check_constant_rate<halfspin::RungeKutta4RateFunction>();
  check_constant_rate<halfspin::BogackiShampine32RateFunction>();
  check_constant_rate<halfspin::DormandPrince54RateFunction>();
}

TEST_CASE("RK4 constant-rate bound follows the series -theta^5/1920", "[bounds][reference]") {
  // RK4's increment at constant rate is the exp series truncated after degree 4,
  // P = 1 + z + z²/2 + z³/6 + z⁴/24 with z = (θ/2)n, n² = −1 (Butcher: stability polynomial).
  // Derived: the missing z⁵/120 term is (θ/2)⁵/120·n, which turns P by −2(θ/2)⁵/120 = −θ⁵/1920
  // to leading order, the next terms being O(θ⁷).
  for (LD theta = 1e-3L; theta < 0.02L; theta *= 1.5L) {
    const LD bound = halfspin::LocalErrorBound<halfspin::RungeKutta4RateFunction>::local(
        RateEnvelope<LD>::constant_rate(theta), 1.0L);
    const LD series = std::pow(theta, 5) / 1920.0L;
    REQUIRE(std::fabs(bound - series) <= 1e-3L * series);
  }
}

TEST_CASE("Runge-Kutta local bounds need only the derivatives they use", "[bounds]") {
  // A needed unknown derivative (+∞) makes the bound +∞; an unneeded one does not.
  RateEnvelope<double> e = RateEnvelope<double>::from_rate_bounds(2.0, 3.0, 4.0);
  REQUIRE(std::isinf(halfspin::LocalErrorBound<halfspin::RungeKutta4Sampled>::local(e, 0.01)));
  REQUIRE(std::isinf(halfspin::LocalErrorBound<halfspin::RungeKutta3KuttaSampled>::local(e, 0.01)));
  // RK2 uses D0..D3; interpolated stages cap RK4 at state order 2, so it uses D0..D3 too.
  e.derivative[3] = 5.0;
  const double rk2 =
      halfspin::LocalErrorBound<halfspin::RungeKutta2MidpointSampled>::local(e, 0.01);
  const double rk4i = halfspin::LocalErrorBound<halfspin::RungeKutta4Interpolated>::local(e, 0.01);
  REQUIRE(std::isfinite(rk2));
  REQUIRE(std::isfinite(rk4i));
  REQUIRE(rk2 > 0.0);
  REQUIRE(rk4i > 0.0);
  // Beyond the domain (D0·h > 1 rad) the bound is +∞ rather than a guess.
  REQUIRE(
      std::isinf(halfspin::LocalErrorBound<halfspin::RungeKutta2MidpointSampled>::local(e, 0.6)));
  // Order of the bound in h: halving h divides an RK4 (rate function) bound by ≈ 2⁵ once
  // the constant-rate and varying parts are both in their asymptotic range.
  const RateEnvelope<double> all{{2.0, 3.0, 4.0, 5.0, 6.0, 7.0}};
  const double b1 = halfspin::LocalErrorBound<halfspin::RungeKutta4RateFunction>::local(all, 1e-3);
  const double b2 =
      halfspin::LocalErrorBound<halfspin::RungeKutta4RateFunction>::local(all, 0.5e-3);
  REQUIRE(b1 / b2 == Approx(32.0).epsilon(0.01));
}

TEST_CASE("RK2 bounds are never below the measured one-step error", "[bounds][reference]") {
  check_all_motions<halfspin::RungeKutta2MidpointSampled>();
  check_all_motions<halfspin::RungeKutta2MidpointInterpolated>();
  check_all_motions<halfspin::RungeKutta2MidpointRateFunction>();
}
TEST_CASE("RK3 bounds are never below the measured one-step error", "[bounds][reference]") {
  check_all_motions<halfspin::RungeKutta3KuttaSampled>();
  check_all_motions<halfspin::RungeKutta3KuttaInterpolated>();
  check_all_motions<halfspin::RungeKutta3KuttaRateFunction>();
}
TEST_CASE("RK4 bounds are never below the measured one-step error", "[bounds][reference]") {
  check_all_motions<halfspin::RungeKutta4Sampled>();
  check_all_motions<halfspin::RungeKutta4Interpolated>();
  check_all_motions<halfspin::RungeKutta4RateFunction>();
}
TEST_CASE("Embedded pair bounds are never below the measured one-step error",
          "[bounds][reference]") {
  check_all_motions<halfspin::BogackiShampine32RateFunction>();
  check_all_motions<halfspin::DormandPrince54RateFunction>();
}

TEST_CASE("RKMK4 bounds are never below the measured one-step error", "[bounds][reference]") {
  check_all_motions<halfspin::MuntheKaas4Sampled>();
  check_all_motions<halfspin::MuntheKaas4Interpolated>();
  check_all_motions<halfspin::MuntheKaas4RateFunction>();
}

template <class Stepper>
void check_munthe_kaas_constant_rate() {
  // RKMK4 is exact at constant rate (lie_group_runge_kutta.hpp): the bound is exactly 0 there,
  // and the measured error of one step is at long double roundoff.
  halfspin::test::RandomRotations random(77);
  for (LD theta = 0.05L; theta <= 1.0L; theta += 0.05L) {
    const LD bound =
        halfspin::LocalErrorBound<Stepper>::local(RateEnvelope<LD>::constant_rate(theta), 1.0L);
    REQUIRE(bound == 0.0L);
    REQUIRE(halfspin::LocalErrorBound<Stepper>::local(
                RateEnvelope<double>::constant_rate(static_cast<double>(theta)), 1.0) == 0.0);
    REQUIRE(halfspin::LocalErrorBound<Stepper>::local(
                RateEnvelope<float>::constant_rate(static_cast<float>(theta)), 1.0f) == 0.0f);
    const Vector3<LD> w = theta * random.unit_vector<LD>();
    const halfspin::ConstantRateMotion<LD> m{Quaternion<LD>::identity(), w};
    const LD measured = halfspin::angle_between(
        one_step<Stepper>(m, Quaternion<LD>::identity(), 0.0L, 1.0L), m.attitude(1.0L));
    REQUIRE(measured <= 16.0L * std::numeric_limits<LD>::epsilon());
  }
  // A needed unknown derivative gives +∞.
  REQUIRE(std::isinf(halfspin::LocalErrorBound<Stepper>::local(
      RateEnvelope<double>::from_rate_bounds(1.0, 1.0, 1.0), 0.01)));
}

TEST_CASE("RKMK4 bounds are exactly zero at constant rate", "[bounds]") {
  check_munthe_kaas_constant_rate<halfspin::MuntheKaas4Sampled>();
  check_munthe_kaas_constant_rate<halfspin::MuntheKaas4Interpolated>();
  check_munthe_kaas_constant_rate<halfspin::MuntheKaas4RateFunction>();
}

TEST_CASE("The exponential map does not increase distances in the ball of radius pi",
          "[bounds][reference]") {
  // d(exp(a/2), exp(b/2)) ≤ |a − b| for rotation vectors |a|, |b| < π (common practice, no source;
  // the RKMK4 bound relies on it). Random pairs at all scales, near pairs and far pairs.
  halfspin::test::RandomRotations random(2718);
  LD worst = 0.0L;
  for (int i = 0; i < 200000; ++i) {
    const LD ra = random.uniform<LD>(0.0L, 3.14L);
    const Vector3<LD> a = ra * random.unit_vector<LD>();
    Vector3<LD> b{};
    if (i % 2 == 0) {
      const LD rb = random.uniform<LD>(0.0L, 3.14L);
      b = rb * random.unit_vector<LD>();
    } else {
      const LD offset = random.log_uniform<LD>(1e-8L, 1.0L);
      b = a + offset * random.unit_vector<LD>();
      if (halfspin::norm(b) >= 3.14L) {
        continue;
      }
    }
    const LD gap = halfspin::norm(a - b);
    const LD angle =
        halfspin::angle_between(halfspin::quaternion_exp(a), halfspin::quaternion_exp(b));
    // 4 ε_ld·(1 + |a|) allows the rounding of the two exponentials and the angle.
    REQUIRE(angle <= gap + 4.0L * std::numeric_limits<LD>::epsilon() * (1.0L + ra));
    worst = std::max(worst, gap > 0.0L ? angle / gap : 0.0L);
  }
  REQUIRE(worst <= 1.0L + 1e-12L);
}

TEST_CASE("The dexp-inverse coefficient excess is bounded from above", "[bounds][reference]") {
  // f(x) = (1 − (x/2)cot(x/2))/x² (Bortz 1971; the rotation-vector equation); the upper bound for
  // f(x) − 1/12 on [0, 1] (derivation: include/halfspin/bounds/magnus_family_bounds.hpp §3) must
  // hold and be within 1 % of the closed form.
  for (LD x = 0.01L; x <= 1.0L; x += 0.01L) {
    const LD beta = (1.0L - 0.5L * x / std::tan(0.5L * x)) / (x * x);
    const LD excess = beta - 1.0L / 12.0L;
    const LD bound = halfspin::detail::dexp_inverse_excess_bound(x);
    INFO("x = " << static_cast<double>(x));
    REQUIRE(bound >= excess);
    REQUIRE(bound <= 1.01L * excess + 1e-16L);
  }
}
