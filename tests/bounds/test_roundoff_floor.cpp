// The roundoff floor (bounds/roundoff_floor.hpp): the exponential map's distance property it rests
// on, the per-step bound against measured rounding, and 10⁶-step propagations in float and double
// against the predicted worst-case floor. With HALFSPIN_REPORT_WORST set, prints the
// measured/worst-case ratios.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <string>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/roundoff_floor.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/commutator_free_4.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::narrow;
using test::widen;

namespace {

using LD = long double;

// Builds the input of one step of S from a long-double rate function of t ∈ [0, dt] (rates at
// the sample times; delta-angles by the midpoint value times h, exact for a constant rate, the
// only rate the per-step test uses).
template <class S, class T>
std::array<Vector3<T>, S::window> constant_rate_input(const Vector3<LD>& w, LD dt) {
  constexpr std::size_t periods = periods_per_step(S::layout, S::window);
  const LD h = dt / static_cast<LD>(periods);
  std::array<Vector3<T>, S::window> in{};
  for (std::size_t i = 0; i < S::window; ++i) {
    in[i] = narrow<T>(carries_delta_angles(S::layout) ? w * h : w);
  }
  return in;
}

template <class S, class T, class Q>
Quaternion<Q> run_step(const Quaternion<Q>& q, const Vector3<LD>& w, LD dt) {
  if constexpr (S::layout == SampleLayout::rate_function) {
    const Vector3<Q> wq = [&] {
      if constexpr (std::is_same<Q, LD>::value) {
        return w;
      } else {
        return narrow<Q>(w);
      }
    }();
    return S::step(
        q, [wq](Q) { return wq; }, static_cast<Q>(dt));
  } else {
    if constexpr (std::is_same<Q, LD>::value) {
      return S::step(q, constant_rate_input<S, LD>(w, dt), dt);
    } else {
      return S::step(q, constant_rate_input<S, Q>(w, dt), static_cast<Q>(dt));
    }
  }
}

// One step in T (inputs rounded to T, result renormalized in T) against the same step in long
// double from the same start: the difference is rounding only (the truncation is identical).
template <class S, class T>
void check_per_step_bound(std::uint64_t seed) {
  test::RandomRotations rng(seed);
  LD worst_ratio = 0;
  for (int i = 0; i < 20000; ++i) {
    const Quaternion<T> q = rng.quaternion<T>();
    const LD theta = static_cast<LD>(rng.log_uniform<double>(1e-7, 0.3));
    const LD dt = static_cast<LD>(rng.log_uniform<double>(1e-4, 1e-1));
    const Vector3<LD> w = widen(rng.unit_vector<double>()) * (theta / dt);
    const Quaternion<T> got = normalized(run_step<S, T>(q, w, dt));
    const Quaternion<LD> want = run_step<S, T>(widen(q), w, dt);
    const LD measured = angle_between(widen(got), want);
    // θ with margin for the rounding of w and dt to T.
    const T bound = roundoff_per_step<S, T>(static_cast<T>(theta * (1.0L + 1e-6L)));
    INFO(S::name << " " << test::type_name<T>() << " theta " << static_cast<double>(theta)
                 << " measured " << static_cast<double>(measured) << " bound " << test::ld(bound));
    REQUIRE(measured <= test::ld(bound));
    worst_ratio = std::fmax(worst_ratio, measured / test::ld(bound));
  }
  test::report_worst(
      std::string("per-step rounding measured/bound ") + S::name + " " + test::type_name<T>(),
      worst_ratio);
}

// The increment of S for a constant rate w over dt, in Q.
template <class S, class T, class Q>
Quaternion<Q> constant_rate_increment(const Vector3<LD>& w, LD dt) {
  if constexpr (S::layout == SampleLayout::rate_function) {
    const Vector3<Q> wq = [&] {
      if constexpr (std::is_same<Q, LD>::value) {
        return w;
      } else {
        return narrow<Q>(w);
      }
    }();
    return S::increment([wq](Q) { return wq; }, static_cast<Q>(dt)).delta;
  } else if constexpr (std::is_same<Q, LD>::value) {
    return S::increment(constant_rate_input<S, LD>(w, dt), dt).delta;
  } else {
    return S::increment(constant_rate_input<S, Q>(w, dt), static_cast<Q>(dt)).delta;
  }
}

// One compensated step in T (a pair q_hi + q_lo with |q_lo| up to half an ulp per component, the
// increment formed in T, the pair renormalized through with_attitude as the propagator does)
// against the exact product (q_hi + q_lo) ⊗ (1 + δ) in long double from the same pair and the same
// stepper: the difference is rounding only.
template <class S, class T>
void check_compensated_per_step_bound(std::uint64_t seed) {
  using A = CompensatedAccumulation;
  test::RandomRotations rng(seed);
  LD worst_ratio = 0;
  const T u = std::numeric_limits<T>::epsilon() / T(2);
  for (int i = 0; i < 20000; ++i) {
    typename A::template State<T> s = A::start(rng.quaternion<T>());
    s.lo = {static_cast<T>(rng.uniform<double>(-0.5, 0.5)) * u * s.hi.w,
            static_cast<T>(rng.uniform<double>(-0.5, 0.5)) * u * s.hi.x,
            static_cast<T>(rng.uniform<double>(-0.5, 0.5)) * u * s.hi.y,
            static_cast<T>(rng.uniform<double>(-0.5, 0.5)) * u * s.hi.z};
    const LD theta = static_cast<LD>(rng.log_uniform<double>(1e-7, 0.3));
    const LD dt = static_cast<LD>(rng.log_uniform<double>(1e-4, 1e-1));
    const Vector3<LD> w = widen(rng.unit_vector<double>()) * (theta / dt);
    const auto advanced = A::advanced(s, constant_rate_increment<S, T, T>(w, dt));
    const auto next = A::with_attitude(advanced, normalized(A::attitude(advanced)));
    const Quaternion<LD> start = widen(s.hi) + widen(s.lo);
    const Quaternion<LD> want = start + start * constant_rate_increment<S, T, LD>(w, dt);
    const LD measured = angle_between(widen(next.hi) + widen(next.lo), want);
    const T bound = roundoff_per_step<S, T, A>(static_cast<T>(theta * (1.0L + 1e-6L)));
    INFO(S::name << " " << test::type_name<T>() << " theta " << static_cast<double>(theta)
                 << " measured " << static_cast<double>(measured) << " bound " << test::ld(bound));
    REQUIRE(measured <= test::ld(bound));
    worst_ratio = std::fmax(worst_ratio, measured / test::ld(bound));
  }
  test::report_worst(std::string("compensated per-step rounding measured/bound ") + S::name + " " +
                         test::type_name<T>(),
                     worst_ratio);
}

}  // namespace

// Common practice, no source (a comparison-theorem fact of the trade): the exponential map of S³
// does not increase distances in the ball |φ| < π: d(exp(a/2), exp(b/2)) ≤ |a − b|. Checked in long
// double over random pairs, near (|a − b| from 1e-12 to 1) and far, lengths up to 0.999π.
TEST_CASE("roundoff floor: the exponential map does not increase distances below pi",
          "[reference]") {
  test::RandomRotations rng(4401);
  const LD pi_ld = 3.141592653589793238462643383279502884L;
  LD worst = 0;
  for (int i = 0; i < test::property_samples; ++i) {
    const Vector3<LD> a =
        widen(rng.unit_vector<double>()) * static_cast<LD>(rng.uniform<double>(0.0, 0.999)) * pi_ld;
    Vector3<LD> b{};
    do {
      const LD step = static_cast<LD>(rng.log_uniform<double>(1e-12, 3.0));
      b = a + widen(rng.unit_vector<double>()) * step;
    } while (norm(b) >= 0.999L * pi_ld);
    const LD d = angle_between(quaternion_exp(a), quaternion_exp(b));
    const LD gap = norm(a - b);
    INFO("|a| " << static_cast<double>(norm(a)) << " |b| " << static_cast<double>(norm(b)) << " d "
                << static_cast<double>(d) << " |a-b| " << static_cast<double>(gap));
    // Long double rounding of d: relative 1e-15 plus 1e-18 rad.
    REQUIRE(d <= gap * (1.0L + 1e-15L) + 1e-18L);
    worst = std::fmax(worst, d / gap);
  }
  test::report_worst("exp-map distance ratio d/|a-b| (<= 1)", worst);
}

// The per-step bound against measured rounding of one step (own derivation: the Higham model,
// Higham 2002 §2.2, §3.1, in the header), for each stepper family and both types.
TEST_CASE("roundoff floor: one step's rounding stays under the per-step bound", "[reference]") {
  check_per_step_bound<ExponentialMapHoldEnd, float>(1);
  check_per_step_bound<ExponentialMapHoldEnd, double>(2);
  check_per_step_bound<Magnus4, float>(3);
  check_per_step_bound<Magnus4, double>(4);
  check_per_step_bound<Coning2Sample, float>(5);
  check_per_step_bound<Coning2Sample, double>(6);
  check_per_step_bound<RungeKutta4Sampled, float>(7);
  check_per_step_bound<RungeKutta4Sampled, double>(8);
  check_per_step_bound<MuntheKaas4RateFunction, float>(9);
  check_per_step_bound<MuntheKaas4RateFunction, double>(10);
  // The stage growth from each tableau's own coefficients: Kutta's third order (a negative
  // coefficient) and Dormand–Prince (rows summing to 24.7 in absolute value).
  check_per_step_bound<RungeKutta3KuttaSampled, float>(11);
  check_per_step_bound<RungeKutta3KuttaSampled, double>(12);
  check_per_step_bound<DormandPrince54RateFunction, float>(13);
  check_per_step_bound<DormandPrince54RateFunction, double>(14);
}

// The compensated per-step bound (roundoff_floor.hpp (c), compensated_accumulation.hpp: own
// derivation under Higham's model) against measured rounding of one step, for each family, in
// float. Not in double: the compensated double step is accurate to about u² = 1.2e-32 relative
// plus its increment's rounding, below the long double reference's own rounding (5.4e-20).
TEST_CASE("roundoff floor: one compensated step's rounding stays under its per-step bound",
          "[reference]") {
  check_compensated_per_step_bound<ExponentialMapHoldEnd, float>(21);
  check_compensated_per_step_bound<Magnus4, float>(23);
  check_compensated_per_step_bound<Coning2Sample, float>(25);
  check_compensated_per_step_bound<RungeKutta4Sampled, float>(27);
  check_compensated_per_step_bound<MuntheKaas4RateFunction, float>(29);
  check_compensated_per_step_bound<RungeKutta3KuttaSampled, float>(31);
  check_compensated_per_step_bound<DormandPrince54RateFunction, float>(33);
  check_compensated_per_step_bound<CommutatorFree4, float>(35);
  check_compensated_per_step_bound<Coning3Sample, float>(37);
}

namespace {

// 10⁶ steps of S in T with accumulation policy A on a motion with closed-form truth (attitude(t),
// rate(t), delta_angle), renormalized q/|q| every step through the policy, as the propagator does;
// returns the largest angle to the truth at checkpoints every 1000 steps and at the end (rad).
template <class S, class T, class A = PlainAccumulation, class Motion>
LD long_run_error(const Motion& m, LD h, long steps_total) {
  constexpr std::size_t periods = periods_per_step(S::layout, S::window);
  const LD dt = h * static_cast<LD>(periods);
  typename A::template State<T> state = A::start(narrow<T>(m.attitude(0)));
  LD worst = 0;
  for (long k = 0; k < steps_total; ++k) {
    const LD t0 = static_cast<LD>(k) * dt;
    Quaternion<T> delta{};
    if constexpr (S::layout == SampleLayout::rate_function) {
      delta = S::increment([&](T tau) { return narrow<T>(m.rate(t0 + test::ld(tau))); },
                           static_cast<T>(dt))
                  .delta;
    } else {
      std::array<Vector3<T>, S::window> in{};
      for (std::size_t i = 0; i < S::window; ++i) {
        const LD ki = static_cast<LD>(i);
        if constexpr (S::layout == SampleLayout::rate_at_end) {
          in[i] = narrow<T>(m.rate(t0 + dt));
        } else if constexpr (S::layout == SampleLayout::rates_spanning) {
          in[i] = narrow<T>(m.rate(t0 + ki * h));
        } else if constexpr (S::layout == SampleLayout::delta_angles) {
          in[i] = narrow<T>(m.delta_angle(t0 + ki * h, t0 + (ki + 1) * h));
        } else {
          in[i] = narrow<T>(m.delta_angle(t0 + (ki - 1) * h, t0 + ki * h));
        }
      }
      delta = S::increment(in, static_cast<T>(dt)).delta;
    }
    const auto advanced = A::advanced(state, delta);
    state = A::with_attitude(advanced, normalized(A::attitude(advanced)));
    if ((k + 1) % 1000 == 0 || k + 1 == steps_total) {
      const Quaternion<T> q = A::attitude(state);
      worst = std::fmax(worst, angle_between(widen(q), m.attitude(static_cast<LD>(k + 1) * dt)));
    }
  }
  return worst;
}

template <class S, class T, class A = PlainAccumulation>
void long_run_constant_rate() {
  // 0.5 rad/s about a fixed oblique axis, h = 1 ms: θ = 5e-4 per period; truncation zero for the
  // exponential-map family at constant rate, θ⁵-sized for Runge–Kutta (below 1e-17 rad/step).
  const LD h = 1e-3L;
  const long steps = 1000000;
  const ConstantRateMotion<LD> m{{0.9L, 0.1L, -0.3L, 0.3L}, {0.3L, -0.2L, 0.3464101615137754587L}};
  const ConstantRateMotion<LD> mu{normalized(m.initial), m.body_rate};
  const LD measured = long_run_error<S, T, A>(mu, h, steps);
  const T theta = static_cast<T>(norm(mu.body_rate) * h *
                                 static_cast<LD>(periods_per_step(S::layout, S::window)));
  const LD worst_floor = test::ld(roundoff_floor_worst<S, T, A>(theta, steps));
  INFO(S::name << " " << test::type_name<T>() << " " << A::name << " measured "
               << static_cast<double>(measured) << " worst-case floor "
               << static_cast<double>(worst_floor));
  CHECK(measured <= worst_floor);
  test::report_worst(std::string("constant rate 1e6 steps measured/worst-case floor ") + S::name +
                         " " + test::type_name<T>() + " " + A::name,
                     measured / worst_floor);
}

template <class S, class T, class A = PlainAccumulation>
void long_run_slow_coning() {
  // Slowly varying rate: coning of half-angle 0.3 rad at 0.05 Hz, h = 1 ms (λ = Ωh ≈ 3e-4): the
  // truncation part, taken exactly from coning_error.hpp, is far below the floor in float.
  const LD h = 1e-3L;
  const long steps = 1000000 / static_cast<long>(periods_per_step(S::layout, S::window));
  const ClassicalConingMotion<LD> m{0.3L, 6.283185307179586476925286766559005768L * 0.05L};
  const LD measured = long_run_error<S, T, A>(m, h, steps);
  MotionDescription<T> d{};
  d.coning = {T(0.3), T(0.05)};
  const T dt = static_cast<T>(h * static_cast<LD>(periods_per_step(S::layout, S::window)));
  const T horizon = static_cast<T>(h * 1e6L);
  const LD worst_total = test::ld(horizon_error_bound<S, T, A>(d, dt, horizon));
  INFO(S::name << " " << test::type_name<T>() << " " << A::name << " measured "
               << static_cast<double>(measured) << " worst-case bound "
               << static_cast<double>(worst_total));
  CHECK(measured <= worst_total);
  test::report_worst(std::string("slow coning 1e6 periods measured/worst-case bound ") + S::name +
                         " " + test::type_name<T>() + " " + A::name,
                     measured / worst_total);
}

}  // namespace

// The roundoff test: 10⁶ tiny steps stay under the predicted worst-case floor. Reference:
// closed-form truth (constant rate: q0 ⊗ exp(ωt/2), common practice, no source; classical coning,
// Miller 1983), evaluated in long double.
TEST_CASE("roundoff floor: 10^6 float and double steps stay under the worst-case floor",
          "[reference]") {
  long_run_constant_rate<ExponentialMapHoldEnd, float>();
  long_run_constant_rate<ExponentialMapHoldEnd, double>();
  long_run_constant_rate<Coning1Sample, float>();
  long_run_constant_rate<Coning1Sample, double>();
  long_run_constant_rate<RungeKutta4Sampled, float>();
  long_run_constant_rate<RungeKutta4Sampled, double>();
  long_run_slow_coning<Coning2Sample, float>();
  long_run_slow_coning<Coning2Sample, double>();
  long_run_slow_coning<Magnus4, float>();
  long_run_slow_coning<Magnus4, double>();
}

// The same runs in float with the compensated accumulation, under its worst-case floor (own
// derivation, roundoff_floor.hpp (c)), which is 10²–10³ times below the plain one here.
TEST_CASE("roundoff floor: 10^6 compensated float steps stay under the compensated floor",
          "[reference]") {
  long_run_constant_rate<ExponentialMapHoldEnd, float, CompensatedAccumulation>();
  long_run_constant_rate<Coning1Sample, float, CompensatedAccumulation>();
  long_run_constant_rate<RungeKutta4Sampled, float, CompensatedAccumulation>();
  long_run_slow_coning<Coning2Sample, float, CompensatedAccumulation>();
  long_run_slow_coning<Magnus4, float, CompensatedAccumulation>();
}

// The families' bounds on their rotation vectors (own derivation, rotation_vector_family.hpp and
// commutator_free_family.hpp), which the compensated floor takes |δ| from: delta-angles that tile
// the step sum to at most θ; the Simpson and midpoint rate rules have weights summing to 1;
// CF4's two exponentials weigh the rates by (3, 4, −1)/12 and (−1, 4, 3)/12, 16/12 in all; the
// one-sample-plus-previous correction Δθ_prev × Δθ/12 is at most θ²/12.
static_assert(Coning3Sample::rotation_linear == 1.0L && Coning2Sample::rotation_linear == 1.0L,
              "tiling delta-angles: |alpha| <= theta");
static_assert(Magnus4::rotation_linear == 1.0L &&
                  ExponentialMapMidpointMean::rotation_linear == 1.0L,
              "positive rate weights summing to one");
static_assert(CommutatorFree4::rotation_linear == 16.0L / 12.0L &&
                  CommutatorFree4::rotation_quadratic == 0.0L,
              "CF4: 16/12");
static_assert(Coning1SamplePlusPrevious::rotation_quadratic == 1.0L / 12.0L,
              "the previous sample is not inside the step: no quarter");

// Issue 4 item 5: the floor can be checked at compile time (firmware start-up configuration).
// The value is the hand count of the header: exponential-map family at θ = 0, one float step,
// 2x/(1 − x) with x = 2γ₄ plus 2u/(1 − u), about 18u.
static_assert(roundoff_floor_worst<ExponentialMapHoldEnd, float>(0.0f, 1) >
                      17.9f * 0.5f * 1.1920929e-7f &&
                  roundoff_floor_worst<ExponentialMapHoldEnd, float>(0.0f, 1) <
                      18.1f * 0.5f * 1.1920929e-7f,
              "per-step floor of the exponential-map family is 18u at theta = 0");
static_assert(roundoff_floor_worst<RungeKutta4Sampled, double>(0.0, 1) > 9.9 * 0x1p-53 &&
                  roundoff_floor_worst<RungeKutta4Sampled, double>(0.0, 1) < 10.1 * 0x1p-53,
              "per-step floor of RK4 is 10u at theta = 0");
