// Batch (structure-of-arrays) propagation: each lane against the scalar propagator fed the same
// samples (plain and compensated accumulation), constant-rate lanes against the closed form, bad
// samples masked per lane (both words of a compensated lane), lanes independent of each other,
// compensated lanes against plain ones on a slow rotation, and the batch exponential series
// against cos/sin.
// Measured worst errors print with HALFSPIN_REPORT_WORST=1.
#include <catch2/catch.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <memory>
#include <numeric>
#include <random>
#include <string>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/batch_propagator.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "test_support.hpp"

using namespace halfspin;
using halfspin::test::ld;

namespace {

// Full scale 2000 rad/s per axis (large, so that the rate check never masks the largest step
// angles tested here) and gaps above 0.1 s.
template <class T>
constexpr GyroLimits<T> wide_limits{T(2000), T(0.1)};

// Whether the compiler may contract a·b + c into a fused multiply-add (the target has one): then
// vector and scalar code may round differently, and bit-identity with the scalar path is not
// expected (batch_propagator.hpp, "Agreement with the scalar path").
#if defined(__FMA__) || defined(__FP_FAST_FMA) || defined(__FP_FAST_FMAF)
constexpr bool contraction_possible = true;
#else
constexpr bool contraction_possible = false;
#endif

template <class T>
bool same_bits(T a, T b) {
  return std::memcmp(&a, &b, sizeof(T)) == 0;
}
template <class T>
bool same_bits(const Quaternion<T>& a, const Quaternion<T>& b) {
  return same_bits(a.w, b.w) && same_bits(a.x, b.x) && same_bits(a.y, b.y) && same_bits(a.z, b.z);
}
template <class T>
bool same_bits(const CompensatedAccumulation::State<T>& a,
               const CompensatedAccumulation::State<T>& b) {
  return same_bits(a.hi, b.hi) && same_bits(a.lo, b.lo);
}

// A delta-angle of random direction and log-uniform size in [lo, hi] rad.
template <class T>
Vector3<T> random_delta(test::RandomRotations& random, T lo, T hi) {
  const Vector3<T> axis = random.unit_vector<T>();
  return random.log_uniform<T>(lo, hi) * axis;
}

// Heap-allocated: a batch of 1024 double lanes is about 140 kB, too much for a test's stack.
template <class T, std::size_t N, class Accumulation = PlainAccumulation>
std::unique_ptr<BatchPropagator<T, N, FirstOrderRenormalization, Accumulation>> make_batch(
    const Quaternion<T>& q0, const GyroLimits<T>& limits) {
  return std::make_unique<BatchPropagator<T, N, FirstOrderRenormalization, Accumulation>>(q0,
                                                                                          limits);
}

// One step of every lane from the batch's own state, compared with a scalar Propagator reset to
// that state and pushed the same sample: the per-step difference, in ε (largest component), and
// whether every step gave the same bits.
struct OneStep {
  long double worst_eps = 0;
  bool identical = true;
};

template <class T, std::size_t N, class Accumulation = PlainAccumulation>
OneStep one_step_run(std::uint64_t seed, int steps, T smallest_angle, T largest_angle) {
  test::RandomRotations random(seed);
  auto batch = make_batch<T, N, Accumulation>(Quaternion<T>::identity(), wide_limits<T>);
  for (std::size_t i = 0; i < N; ++i) {
    batch->set_lane(i, random.quaternion<T>());
  }
  Propagator<T, Coning1Sample, FirstOrderRenormalization, Accumulation> scalar(
      Quaternion<T>::identity(), wide_limits<T>);
  OneStep out;
  for (int k = 0; k < steps; ++k) {
    std::array<Quaternion<T>, N> before;
    for (std::size_t i = 0; i < N; ++i) {
      // Re-anchored at its own attitude, so that a compensated lane starts with q_lo = 0 like
      // the scalar propagator after reset() (for the plain policy this changes nothing).
      before[i] = batch->lane(i);
      batch->set_lane(i, before[i]);
      const Vector3<T> d = random_delta<T>(random, smallest_angle, largest_angle);
      batch->samples().dx[i] = d.x;
      batch->samples().dy[i] = d.y;
      batch->samples().dz[i] = d.z;
      batch->samples().dt[i] = random.uniform<T>(T(5e-4), T(1.5e-3));
    }
    REQUIRE(batch->step() == N);
    for (std::size_t i = 0; i < N; ++i) {
      scalar.reset(before[i]);
      const auto& s = batch->samples();
      REQUIRE(scalar.push(Vector3<T>{s.dx[i], s.dy[i], s.dz[i]}, s.dt[i]) == Status::ok);
      out.worst_eps =
          std::max(out.worst_eps, test::quaternion_error_eps(batch->lane(i), scalar.attitude()));
      out.identical = out.identical && same_bits(batch->lane(i), scalar.attitude());
    }
  }
  return out;
}

template <class T, std::size_t N>
long double one_step_worst(std::uint64_t seed, int steps, T largest_angle) {
  return one_step_run<T, N>(seed, steps, T(1e-7), largest_angle).worst_eps;
}

// N lanes and N independent scalar propagators run side by side for `steps` steps.
template <class T, std::size_t N>
struct LongRun {
  long double worst_eps = 0;
  bool attitude_identical = true;
  bool elapsed_identical = true;
  bool steps_identical = true;
};

template <class T, std::size_t N>
LongRun<T, N> long_run(std::uint64_t seed, int steps, T largest_angle) {
  test::RandomRotations random(seed);
  auto batch = make_batch<T, N>(Quaternion<T>::identity(), wide_limits<T>);
  std::vector<Propagator<T, Coning1Sample, FirstOrderRenormalization, PlainAccumulation>> scalar;
  for (std::size_t i = 0; i < N; ++i) {
    const Quaternion<T> q0 = random.quaternion<T>();
    batch->set_lane(i, q0);
    scalar.emplace_back(q0, wide_limits<T>);
  }
  for (int k = 0; k < steps; ++k) {
    for (std::size_t i = 0; i < N; ++i) {
      const Vector3<T> d = random_delta<T>(random, T(1e-7), largest_angle);
      const T dt = random.uniform<T>(T(5e-4), T(1.5e-3));
      batch->samples().dx[i] = d.x;
      batch->samples().dy[i] = d.y;
      batch->samples().dz[i] = d.z;
      batch->samples().dt[i] = dt;
      REQUIRE(scalar[i].push(d, dt) == Status::ok);
    }
    REQUIRE(batch->step() == N);
  }
  LongRun<T, N> out;
  for (std::size_t i = 0; i < N; ++i) {
    out.worst_eps =
        std::max(out.worst_eps, test::quaternion_error_eps(batch->lane(i), scalar[i].attitude()));
    out.attitude_identical =
        out.attitude_identical && same_bits(batch->lane(i), scalar[i].attitude());
    out.elapsed_identical =
        out.elapsed_identical && same_bits(batch->elapsed_seconds(i), scalar[i].elapsed_seconds());
    out.steps_identical = out.steps_identical && batch->lane_steps(i) == scalar[i].counters().steps;
  }
  return out;
}

}  // namespace

TEMPLATE_TEST_CASE("each batch lane steps like the scalar one-sample propagator",
                   "[propagation][batch]", float, double) {
  using T = TestType;
  const T largest = BatchPropagator<T, 1>::max_step_angle;
  // One step from the same state, every accepted step angle up to the batch's limit: only the
  // series (one term longer here, sin/cos in the scalar path above its threshold) can differ.
  const long double one_step =
      std::max({one_step_worst<T, 1>(11, 3000, largest), one_step_worst<T, 13>(12, 300, largest),
                one_step_worst<T, 64>(13, 60, largest)});
  test::report_worst(std::string("batch vs scalar, one step, eps, ") + test::type_name<T>(),
                     one_step);
  CHECK(one_step <= 2.0L);
  // Below the core's series threshold, up to it: the same operations, the same bits (unless the
  // compiler contracts; see contraction_possible). Steps near the threshold, where the series'
  // highest terms matter most.
  const T threshold_angle = std::sqrt(ScalarTraits<T>::exp_series_angle_squared);
  const OneStep below =
      one_step_run<T, 64>(14, 300, threshold_angle * T(0.3), threshold_angle * T(0.999));
  test::report_worst(std::string("batch vs scalar, one step below the series threshold, eps, ") +
                         test::type_name<T>(),
                     below.worst_eps);
  CHECK((contraction_possible || below.identical));

  // Long runs: below the core's series threshold (θ² < 0.1 float, 1e-4 double) both paths
  // evaluate the same series, product and renormalization in the same order: bit-identical
  // without FMA (x86-64's default target). Where the compiler contracts a·b + c into fused
  // multiply-adds (-march=native with FMA, aarch64; gnu++17 allows it) the vector and scalar
  // code contract differently, the one-step difference stays ≤ 1 ε and the difference
  // random-walks: measured 12.5 ε after 4000 steps, 5.3 ε after 100. Allowed 4 + √M/2 ε.
  const T small = std::sqrt(ScalarTraits<T>::exp_series_angle_squared) * T(0.9);
  const LongRun<T, 8> r8 = long_run<T, 8>(21, 4000, small);
  const LongRun<T, 1024> r1024 = long_run<T, 1024>(22, 100, small);
  test::report_worst(
      std::string("batch vs scalar, 4000 steps x 8 lanes, eps, ") + test::type_name<T>(),
      r8.worst_eps);
  test::report_worst(
      std::string("batch vs scalar, 100 steps x 1024 lanes, eps, ") + test::type_name<T>(),
      r1024.worst_eps);
  CHECK(r8.worst_eps <= 4.0L + std::sqrt(4000.0L) / 2);
  CHECK(r1024.worst_eps <= 4.0L + std::sqrt(100.0L) / 2);
  CHECK((contraction_possible || r8.attitude_identical));
  CHECK((contraction_possible || r1024.attitude_identical));
  // The elapsed time is the same Kahan sum in the same order: bit-identical. Steps match too.
  CHECK(r8.elapsed_identical);
  CHECK(r1024.elapsed_identical);
  CHECK(r8.steps_identical);
  CHECK(r1024.steps_identical);
}

// Constant rate: every delta-angle is the same vector, the increments commute, and the attitude
// after M steps is q0 ⊗ exp(M·Δθ/2) exactly (constant-rate closed form of q̇ = ½ q ⊗ (0, ω):
// common practice, no source). Truth in long double from the T-valued Δθ.
TEMPLATE_TEST_CASE("constant-rate lanes follow the closed form q0 ⊗ exp(ωt/2)",
                   "[propagation][batch][reference]", float, double) {
  using T = TestType;
  constexpr std::size_t N = 16;
  constexpr int steps = 2000;
  test::RandomRotations random(31);
  auto batch = make_batch<T, N>(Quaternion<T>::identity(), wide_limits<T>);
  std::array<Quaternion<T>, N> q0;
  std::array<Vector3<T>, N> delta;
  const T dt = T(1e-3);
  for (std::size_t i = 0; i < N; ++i) {
    q0[i] = random.quaternion<T>();
    batch->set_lane(i, q0[i]);
    // Rates from 0.01 to 50 rad/s at 1 kHz, capped at the batch's step-angle limit.
    const T largest = std::min(T(0.05), BatchPropagator<T, N>::max_step_angle);
    delta[i] = random_delta<T>(random, T(1e-5), largest);
    batch->samples().dx[i] = delta[i].x;
    batch->samples().dy[i] = delta[i].y;
    batch->samples().dz[i] = delta[i].z;
    batch->samples().dt[i] = dt;
  }
  for (int k = 0; k < steps; ++k) {
    REQUIRE(batch->step() == N);  // step() leaves samples() as they were: the same input again
  }
  long double worst = 0;
  long double worst_eps = 0;
  for (std::size_t i = 0; i < N; ++i) {
    const Vector3<long double> phi = static_cast<long double>(steps) * test::widen(delta[i]);
    const long double angle = test::length_ld(phi);
    const long double c = std::cos(angle / 2);
    const long double s = std::sin(angle / 2) / angle;
    const Quaternion<long double> truth =
        test::widen(q0[i]) * Quaternion<long double>{c, s * phi.x, s * phi.y, s * phi.z};
    // Rounding only, of two kinds: the product and renormalization round every step, and with
    // the same increment every step their errors need not cancel (worst case linear in M, the
    // γ_n model of roundoff_floor.hpp); and the step rotation exp(Δθ/2) is rounded once and
    // applied M times, so its relative rounding (~ε) scales the total angle M·|Δθ|. Allowed:
    // M/4 + 2·angle ε (measured worst fraction of it printed).
    const long double allowed = static_cast<long double>(steps) / 4 + 2 * angle;
    const long double error = test::quaternion_error_eps(batch->lane(i), test::narrow<T>(truth));
    worst = std::max(worst, error / allowed);
    worst_eps = std::max(worst_eps, error);
  }
  test::report_worst(std::string("batch constant rate, 2000 steps, eps, ") + test::type_name<T>(),
                     worst_eps);
  test::report_worst(
      std::string("batch constant rate, 2000 steps, fraction of allowed, ") + test::type_name<T>(),
      worst);
  CHECK(worst <= 1.0L);
}

TEMPLATE_TEST_CASE(
    "bad samples leave their lane bit-identical and are counted - other lanes unaffected",
    "[propagation][batch]", float, double) {
  using T = TestType;
  constexpr std::size_t N = 16;
  const T inf = std::numeric_limits<T>::infinity();
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const GyroLimits<T> limits{T(100), T(5e-3)};  // 100 rad/s per axis, gaps above 5 ms
  const T dt = T(1e-3);
  test::RandomRotations random(41);
  auto bad = make_batch<T, N>(Quaternion<T>::identity(), limits);
  auto good = make_batch<T, N>(Quaternion<T>::identity(), limits);
  for (std::size_t i = 0; i < N; ++i) {
    const Quaternion<T> q = random.quaternion<T>();
    bad->set_lane(i, q);
    good->set_lane(i, q);
  }
  const auto fill_good = [&](BatchSamples<T, N>& s) {
    for (std::size_t i = 0; i < N; ++i) {
      const Vector3<T> d = random_delta<T>(random, T(1e-4), T(0.05));
      s.dx[i] = d.x;
      s.dy[i] = d.y;
      s.dz[i] = d.z;
      s.dt[i] = dt;
    }
  };
  // A few good steps first, so that elapsed time and its Kahan carry are not trivial.
  for (int k = 0; k < 5; ++k) {
    fill_good(good->samples());
    bad->samples() = good->samples();
    REQUIRE(good->step() == N);
    REQUIRE(bad->step() == N);
  }
  // Over the angle limit but within the rate limit of `wide` (1000 rad/s × 1 ms = 1 rad per
  // axis): every axis at 0.3 rad (float, limit 0.5) or 0.06 rad (double, limit 0.1), so |Δθ| is
  // √3 × that, 0.52 or 0.104 rad.
  const T over_angle_axis = sizeof(T) == 4 ? T(0.3) : T(0.06);
  const GyroLimits<T> wide{T(1000), T(5e-3)};
  fill_good(good->samples());
  BatchSamples<T, N> s = good->samples();
  s.dx[1] = nan;                          // non_finite
  s.dy[2] = inf;                          // non_finite
  s.dz[3] = -inf;                         // non_finite
  s.dt[4] = nan;                          // non_finite
  s.dt[5] = inf;                          // non_finite
  s.dt[6] = T(0);                         // non_positive_step
  s.dt[7] = -dt;                          // non_positive_step
  s.dt[8] = T(6e-3);                      // step_too_long (gap)
  s.dx[9] = T(0.11);                      // over_range: 110 rad/s on x
  s.dy[10] = -T(0.11);                    // over_range on y
  s.dt[11] = -T(0);                       // non_positive_step (negative zero)
  s.dx[13] = s.dy[13] = s.dz[13] = T(0);  // non_positive_step: no rotation, but dt = 0 says the
  s.dt[13] = T(0);                        // timing is broken (no rate bound catches this one)
  const std::array<std::size_t, 12> bad_lanes{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 13};
  // Lane 12: a state that is not finite (a caller's bad fix) with a good sample: the result is
  // not finite and is rejected as in Propagator, the lane keeps its (NaN) bits.
  const Quaternion<T> nan_state{nan, T(0), T(0), T(0)};
  bad->set_lane(12, nan_state);
  bad->samples() = s;
  std::array<Quaternion<T>, N> before;
  std::array<T, N> elapsed_before;
  for (std::size_t i = 0; i < N; ++i) {
    before[i] = bad->lane(i);
    elapsed_before[i] = bad->elapsed_seconds(i);
  }
  const std::size_t accepted = bad->step();
  REQUIRE(good->step() == N);
  CHECK(accepted == N - bad_lanes.size() - 1);
  for (std::size_t i = 0; i < N; ++i) {
    const bool rejected =
        i == 12 || std::find(bad_lanes.begin(), bad_lanes.end(), i) != bad_lanes.end();
    INFO("lane " << i);
    CHECK(bad->lane_accepted(i) == !rejected);
    CHECK(bad->lane_rejections(i) == (rejected ? 1U : 0U));
    if (rejected) {
      CHECK(same_bits(bad->lane(i), before[i]));
      CHECK(same_bits(bad->elapsed_seconds(i), elapsed_before[i]));
    } else {
      CHECK(same_bits(bad->lane(i), good->lane(i)));
      CHECK(same_bits(bad->elapsed_seconds(i), good->elapsed_seconds(i)));
    }
  }
  const BatchCounters& c = bad->counters();
  CHECK(c.rejected_non_finite == 6);  // lanes 1–5 and 12
  CHECK(c.rejected_non_positive_step == 4);
  CHECK(c.rejected_step_too_long == 1);
  CHECK(c.rejected_over_range == 2);
  CHECK(c.rejected_over_angle == 0);
  CHECK(c.rejected() == N - accepted);
  CHECK(c.calls == 6);
  CHECK(c.lane_steps == 5 * N + accepted);

  // The angle limit, on a gyro whose rate limit lets the step through: only the batch rejects it
  // (the scalar path would take it with sin/cos), counted apart from over_range.
  auto wide_batch = make_batch<T, N>(Quaternion<T>::identity(), wide);
  fill_good(wide_batch->samples());
  wide_batch->samples().dx[0] = over_angle_axis;
  wide_batch->samples().dy[0] = over_angle_axis;
  wide_batch->samples().dz[0] = over_angle_axis;
  const Quaternion<T> start = wide_batch->lane(0);
  CHECK(wide_batch->step() == N - 1);
  CHECK(same_bits(wide_batch->lane(0), start));
  CHECK(wide_batch->counters().rejected_over_angle == 1);
  CHECK(wide_batch->counters().rejected() == 1);
  CHECK(wide_batch->verdict(over_angle_axis, over_angle_axis, over_angle_axis, dt).over_angle);
  CHECK(validate_delta_angle(Vector3<T>{over_angle_axis, over_angle_axis, over_angle_axis}, dt,
                             wide) == Status::ok);

  // The classes agree with the scalar validation of the same samples.
  for (std::size_t i : bad_lanes) {
    INFO("lane " << i);
    const Vector3<T> d{s.dx[i], s.dy[i], s.dz[i]};
    CHECK(bad->verdict(d.x, d.y, d.z, s.dt[i]).status == validate_delta_angle(d, s.dt[i], limits));
  }
  // The same bad samples through a scalar Propagator are rejected too (it keeps its state).
  Propagator<T, Coning1Sample> scalar(before[0], limits);
  for (std::size_t i : bad_lanes) {
    CHECK(is_rejection(scalar.push(Vector3<T>{s.dx[i], s.dy[i], s.dz[i]}, s.dt[i])));
  }
  CHECK(same_bits(scalar.attitude(), before[0]));
}

TEMPLATE_TEST_CASE("lanes are independent: permuting the inputs permutes the outputs",
                   "[propagation][batch]", float, double) {
  using T = TestType;
  constexpr std::size_t N = 37;  // not a multiple of any vector width: the remainder lanes too
  const GyroLimits<T> limits{T(100), T(5e-3)};
  test::RandomRotations random(51);
  std::vector<std::size_t> perm(N);
  std::iota(perm.begin(), perm.end(), std::size_t(0));
  std::shuffle(perm.begin(), perm.end(), std::mt19937_64(52));
  auto a = make_batch<T, N>(Quaternion<T>::identity(), limits);
  auto b = make_batch<T, N>(Quaternion<T>::identity(), limits);
  for (std::size_t i = 0; i < N; ++i) {
    const Quaternion<T> q = random.quaternion<T>();
    a->set_lane(i, q);
    b->set_lane(perm[i], q);
  }
  std::uint64_t rejected = 0;
  for (int k = 0; k < 200; ++k) {
    for (std::size_t i = 0; i < N; ++i) {
      Vector3<T> d = random_delta<T>(random, T(1e-6), T(0.08));
      T dt = random.uniform<T>(T(5e-4), T(1.5e-3));
      // About one sample in 20 is bad, so that masks are permuted too.
      if (random.uniform<T>(T(0), T(1)) < T(0.05)) {
        d.y = std::numeric_limits<T>::quiet_NaN();
        ++rejected;
      }
      a->samples().dx[i] = d.x;
      a->samples().dy[i] = d.y;
      a->samples().dz[i] = d.z;
      a->samples().dt[i] = dt;
      b->samples().dx[perm[i]] = d.x;
      b->samples().dy[perm[i]] = d.y;
      b->samples().dz[perm[i]] = d.z;
      b->samples().dt[perm[i]] = dt;
    }
    REQUIRE(a->step() == b->step());
  }
  REQUIRE(rejected > 0);
  CHECK(a->counters().rejected_non_finite == rejected);
  bool identical = true;
  for (std::size_t i = 0; i < N; ++i) {
    identical = identical && same_bits(a->lane(i), b->lane(perm[i])) &&
                same_bits(a->elapsed_seconds(i), b->elapsed_seconds(perm[i])) &&
                a->lane_rejections(i) == b->lane_rejections(perm[i]);
  }
  CHECK(identical);
  // And the lanes did move: a permutation of identical lanes would prove nothing.
  CHECK(!same_bits(a->lane(0), a->lane(1)));
}

namespace {

// Compensated lanes (CompensatedAccumulation) and N scalar compensated propagators fed the same
// classical-coning delta-angles for `steps` steps. Lane i cones at half-angle 0.02 + 0.01·i rad
// and 1 + i Hz (|Δθ| up to about 5e-3 rad at 1 kHz: below the core's series threshold in float
// and double); lanes 0 and 1 start 1000 and 1/1000 times too long, so that their first
// renormalization takes the far-from-unit path of the read-back.
template <class T, std::size_t N, class Renormalization>
LongRun<T, N> compensated_coning_run(std::uint64_t seed, int steps) {
  using Batch = BatchPropagator<T, N, Renormalization, CompensatedAccumulation>;
  using Scalar = Propagator<T, Coning1Sample, Renormalization, CompensatedAccumulation>;
  test::RandomRotations random(seed);
  auto batch = std::make_unique<Batch>(Quaternion<T>::identity(), wide_limits<T>);
  std::vector<Scalar> scalar;
  std::vector<ClassicalConingMotion<long double>> motion;
  for (std::size_t i = 0; i < N; ++i) {
    Quaternion<T> q0 = random.quaternion<T>();
    if (i == 0) {
      q0 = T(1000) * q0;
    } else if (i == 1) {
      q0 = T(1e-3) * q0;
    }
    batch->set_lane(i, q0);
    scalar.emplace_back(q0, wide_limits<T>);
    const long double two_pi = 2 * std::acos(-1.0L);
    motion.push_back(
        {0.02L + 0.01L * static_cast<long double>(i), two_pi * (1 + static_cast<long double>(i))});
  }
  const long double dt = 1e-3L;
  for (int k = 0; k < steps; ++k) {
    const long double t0 = dt * static_cast<long double>(k);
    for (std::size_t i = 0; i < N; ++i) {
      const Vector3<T> d = test::narrow<T>(motion[i].delta_angle(t0, t0 + dt));
      batch->samples().dx[i] = d.x;
      batch->samples().dy[i] = d.y;
      batch->samples().dz[i] = d.z;
      batch->samples().dt[i] = static_cast<T>(dt);
      REQUIRE(scalar[i].push(d, static_cast<T>(dt)) == Status::ok);
    }
    REQUIRE(batch->step() == N);
  }
  LongRun<T, N> out;
  for (std::size_t i = 0; i < N; ++i) {
    out.worst_eps =
        std::max(out.worst_eps, test::quaternion_error_eps(batch->lane(i), scalar[i].attitude()));
    out.attitude_identical =
        out.attitude_identical && same_bits(batch->lane(i), scalar[i].attitude());
    out.elapsed_identical =
        out.elapsed_identical && same_bits(batch->elapsed_seconds(i), scalar[i].elapsed_seconds());
    out.steps_identical = out.steps_identical && batch->lane_steps(i) == scalar[i].counters().steps;
  }
  return out;
}

}  // namespace

TEMPLATE_TEST_CASE("compensated lanes step like the scalar compensated propagator",
                   "[propagation][batch]", float, double) {
  using T = TestType;
  // One step from the same state (q_lo = 0 on both sides), every accepted step angle up to the
  // batch's limit: only the increment can differ, above the core's series threshold (sin/cos in
  // the scalar path), by an ulp of δ; the attitude q_hi + q_lo rounds the same or an ulp apart.
  const T largest = BatchPropagator<T, 1>::max_step_angle;
  const long double one_step =
      std::max(one_step_run<T, 1, CompensatedAccumulation>(71, 3000, T(1e-7), largest).worst_eps,
               one_step_run<T, 64, CompensatedAccumulation>(72, 60, T(1e-7), largest).worst_eps);
  test::report_worst(
      std::string("compensated batch vs scalar, one step, eps, ") + test::type_name<T>(), one_step);
  CHECK(one_step <= 2.0L);
  // Below the series threshold, up to it: the same operations, so the same bits (see
  // contraction_possible).
  const T threshold_angle = std::sqrt(ScalarTraits<T>::exp_series_angle_squared);
  const OneStep below = one_step_run<T, 64, CompensatedAccumulation>(
      73, 300, threshold_angle * T(0.3), threshold_angle * T(0.999));
  test::report_worst(
      std::string("compensated batch vs scalar, one step below the series threshold, eps, ") +
          test::type_name<T>(),
      below.worst_eps);
  CHECK((contraction_possible || below.identical));

  // Long runs, 10⁵ steps of coning per lane (first-order renormalization) and 10⁴ without
  // renormalization (the read-back then sees κ = 0): bit-identical where no FMA contraction is
  // possible (measured so on x86-64); elsewhere the difference random-walks as for plain lanes,
  // allowed 4 + √M/2 ε.
  const int steps = 100000;
  const LongRun<T, 8> first_order =
      compensated_coning_run<T, 8, FirstOrderRenormalization>(74, steps);
  const LongRun<T, 8> none = compensated_coning_run<T, 8, NoRenormalization>(75, 10000);
  test::report_worst(std::string("compensated batch vs scalar, 1e5 coning steps x 8 lanes, eps, ") +
                         test::type_name<T>(),
                     first_order.worst_eps);
  test::report_worst(
      std::string("compensated batch vs scalar, no renormalization, 1e4 steps, eps, ") +
          test::type_name<T>(),
      none.worst_eps);
  CHECK((contraction_possible || first_order.attitude_identical));
  CHECK((contraction_possible || none.attitude_identical));
  CHECK(first_order.worst_eps <= 4.0L + std::sqrt(static_cast<long double>(steps)) / 2);
  CHECK(none.worst_eps <= 4.0L + std::sqrt(10000.0L) / 2);
  CHECK(first_order.elapsed_identical);
  CHECK(first_order.steps_identical);
  CHECK(none.elapsed_identical);
  CHECK(none.steps_identical);
}

TEMPLATE_TEST_CASE("a rejected compensated lane keeps both words bit-identical",
                   "[propagation][batch]", float, double) {
  using T = TestType;
  using Batch = BatchPropagator<T, 16, FirstOrderRenormalization, CompensatedAccumulation>;
  constexpr std::size_t N = 16;
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const T inf = std::numeric_limits<T>::infinity();
  const GyroLimits<T> limits{T(100), T(5e-3)};  // 100 rad/s per axis, gaps above 5 ms
  const T dt = T(1e-3);
  test::RandomRotations random(81);
  auto bad = std::make_unique<Batch>(Quaternion<T>::identity(), limits);
  auto good = std::make_unique<Batch>(Quaternion<T>::identity(), limits);
  for (std::size_t i = 0; i < N; ++i) {
    const Quaternion<T> q = random.quaternion<T>();
    bad->set_lane(i, q);
    good->set_lane(i, q);
  }
  const auto fill_good = [&](BatchSamples<T, N>& s) {
    for (std::size_t i = 0; i < N; ++i) {
      const Vector3<T> d = random_delta<T>(random, T(1e-6), T(0.05));
      s.dx[i] = d.x;
      s.dy[i] = d.y;
      s.dz[i] = d.z;
      s.dt[i] = dt;
    }
  };
  // Good steps first, so that the low words are not zero (checked: else the test would prove
  // nothing about them).
  for (int k = 0; k < 50; ++k) {
    fill_good(good->samples());
    bad->samples() = good->samples();
    REQUIRE(good->step() == N);
    REQUIRE(bad->step() == N);
  }
  std::size_t nonzero_low = 0;
  for (std::size_t i = 0; i < N; ++i) {
    const Quaternion<T> lo = bad->lane_state(i).lo;
    nonzero_low += (lo.w != T(0) || lo.x != T(0) || lo.y != T(0) || lo.z != T(0)) ? 1U : 0U;
  }
  REQUIRE(nonzero_low == N);

  fill_good(good->samples());
  BatchSamples<T, N> s = good->samples();
  s.dx[1] = nan;      // non_finite
  s.dz[2] = -inf;     // non_finite
  s.dt[3] = inf;      // non_finite
  s.dt[4] = T(0);     // non_positive_step
  s.dt[5] = T(6e-3);  // step_too_long
  s.dy[6] = T(0.11);  // over_range: 110 rad/s
  const std::array<std::size_t, 6> bad_lanes{1, 2, 3, 4, 5, 6};
  // Lane 7: a NaN attitude (a caller's bad fix) with a good sample: the result is not finite and
  // the lane is rejected, as in Propagator.
  bad->set_lane(7, Quaternion<T>{nan, T(0), T(0), T(0)});
  bad->samples() = s;
  std::array<CompensatedAccumulation::State<T>, N> before;
  std::array<T, N> elapsed_before;
  for (std::size_t i = 0; i < N; ++i) {
    before[i] = bad->lane_state(i);
    elapsed_before[i] = bad->elapsed_seconds(i);
  }
  const std::size_t accepted = bad->step();
  REQUIRE(good->step() == N);
  CHECK(accepted == N - bad_lanes.size() - 1);
  for (std::size_t i = 0; i < N; ++i) {
    const bool rejected =
        i == 7 || std::find(bad_lanes.begin(), bad_lanes.end(), i) != bad_lanes.end();
    INFO("lane " << i);
    CHECK(bad->lane_accepted(i) == !rejected);
    if (rejected) {
      CHECK(same_bits(bad->lane_state(i), before[i]));
      CHECK(same_bits(bad->elapsed_seconds(i), elapsed_before[i]));
    } else {
      CHECK(same_bits(bad->lane_state(i), good->lane_state(i)));
      CHECK(same_bits(bad->elapsed_seconds(i), good->elapsed_seconds(i)));
      CHECK(!same_bits(bad->lane_state(i), before[i]));  // it did step
    }
  }
  const BatchCounters& c = bad->counters();
  CHECK(c.rejected_non_finite == 4);  // lanes 1–3 and 7
  CHECK(c.rejected_non_positive_step == 1);
  CHECK(c.rejected_step_too_long == 1);
  CHECK(c.rejected_over_range == 1);
  CHECK(c.rejected() == N - accepted);
}

// The reason for compensated lanes: a slow constant rotation in float, where every step's
// increment is a few ulps of the attitude and plain rounding loses a fixed fraction of it each
// step. Truth: the constant-rate closed form q0 ⊗ exp(M·Δθ/2), Δθ the float sample widened
// (common practice, no source), in long double. 10⁵ steps of 1e-3 rad/s at 1 kHz (0.1 rad in
// 100 s) on 16 lanes with random axes and start attitudes. Measured (x86-64, g++ 12): plain
// worst 5.0e-3 rad, compensated worst 6.2e-8 rad (0.20 of the bound below), the smallest
// per-lane ratio 8.0e3. Asserted:
// the compensated lanes within the accumulation's bound (compensated_accumulation.hpp: c1·u per
// radian traversed plus N·c2·u², plus the increment's own rounding, the same every step, 2u per
// radian, plus 4u for rounding the pair once at the end), and every plain lane at least 100
// times as far off as its compensated twin.
TEST_CASE("compensated float lanes follow a slow rotation that plain float lanes lose",
          "[propagation][batch][reference]") {
  using T = float;
  constexpr std::size_t N = 16;
  constexpr int steps = 100000;
  const T dt = T(1e-3);
  const long double rate = 1e-3L;  // rad/s
  const GyroLimits<T> limits{T(35), T(0.01)};
  test::RandomRotations random(91);
  auto plain = make_batch<T, N>(Quaternion<T>::identity(), limits);
  auto compensated = make_batch<T, N, CompensatedAccumulation>(Quaternion<T>::identity(), limits);
  std::array<Quaternion<T>, N> q0;
  std::array<Vector3<T>, N> delta;
  for (std::size_t i = 0; i < N; ++i) {
    q0[i] = random.quaternion<T>();
    delta[i] = test::narrow<T>(test::widen(random.unit_vector<T>()) * (rate * ld(dt)));
    plain->set_lane(i, q0[i]);
    compensated->set_lane(i, q0[i]);
    plain->samples().dx[i] = delta[i].x;
    plain->samples().dy[i] = delta[i].y;
    plain->samples().dz[i] = delta[i].z;
    plain->samples().dt[i] = dt;
  }
  compensated->samples() = plain->samples();
  for (int k = 0; k < steps; ++k) {
    REQUIRE(plain->step() == N);
    REQUIRE(compensated->step() == N);
  }
  const long double u = test::eps<T>() / 2;
  long double worst_plain = 0;
  long double worst_compensated = 0;
  long double smallest_ratio = std::numeric_limits<long double>::infinity();
  long double worst_fraction_of_bound = 0;
  for (std::size_t i = 0; i < N; ++i) {
    const Vector3<long double> phi = static_cast<long double>(steps) * test::widen(delta[i]);
    const Quaternion<long double> truth = test::widen(q0[i]) * quaternion_exp(phi);
    const long double plain_error = angle_between(test::widen(plain->lane(i)), truth);
    const long double compensated_error = angle_between(test::widen(compensated->lane(i)), truth);
    const long double traversed = test::length_ld(phi);
    const long double bound = (CompensatedAccumulation::rounding_c1 + 2) * u * traversed +
                              steps * CompensatedAccumulation::rounding_c2 * u * u + 4 * u;
    worst_plain = std::max(worst_plain, plain_error);
    worst_compensated = std::max(worst_compensated, compensated_error);
    smallest_ratio = std::min(smallest_ratio, plain_error / compensated_error);
    worst_fraction_of_bound = std::max(worst_fraction_of_bound, compensated_error / bound);
  }
  test::report_worst("slow rotation, plain float lanes, rad", worst_plain);
  test::report_worst("slow rotation, compensated float lanes, rad", worst_compensated);
  test::report_worst("slow rotation, smallest plain/compensated ratio", smallest_ratio);
  test::report_worst("slow rotation, compensated, fraction of bound", worst_fraction_of_bound);
  CHECK(worst_fraction_of_bound <= 1.0L);
  CHECK(smallest_ratio >= 100.0L);
}

TEMPLATE_TEST_CASE("the copying step() overload and NoRenormalization", "[propagation][batch]",
                   float, double) {
  using T = TestType;
  constexpr std::size_t N = 8;
  test::RandomRotations random(61);
  BatchPropagator<T, N> in_place(Quaternion<T>::identity(), wide_limits<T>);
  BatchPropagator<T, N> copied(Quaternion<T>::identity(), wide_limits<T>);
  BatchPropagator<T, N, NoRenormalization> plain(Quaternion<T>::identity(), wide_limits<T>);
  Propagator<T, Coning1Sample, NoRenormalization> scalar_plain(Quaternion<T>::identity(),
                                                               wide_limits<T>);
  std::array<T, N> dx{}, dy{}, dz{}, dt{};
  for (int k = 0; k < 50; ++k) {
    for (std::size_t i = 0; i < N; ++i) {
      const Vector3<T> d = random_delta<T>(random, T(1e-6), T(0.009));
      dx[i] = d.x;
      dy[i] = d.y;
      dz[i] = d.z;
      dt[i] = T(1e-3);
    }
    in_place.samples() = BatchSamples<T, N>{dx, dy, dz, dt};
    REQUIRE(in_place.step() == N);
    REQUIRE(copied.step(dx, dy, dz, dt) == N);
    plain.samples() = in_place.samples();
    REQUIRE(plain.step() == N);
    REQUIRE(scalar_plain.push(Vector3<T>{dx[3], dy[3], dz[3]}, dt[3]) == Status::ok);
  }
  bool identical = true;
  for (std::size_t i = 0; i < N; ++i) {
    identical = identical && same_bits(in_place.lane(i), copied.lane(i));
  }
  CHECK(identical);
  const long double plain_error =
      test::quaternion_error_eps(plain.lane(3), scalar_plain.attitude());
  test::report_worst(
      std::string("batch NoRenormalization vs scalar, 50 steps, eps, ") + test::type_name<T>(),
      plain_error);
  CHECK(plain_error <= 4.0L);
}

// The batch series against the closed form cos(θ/2) − 1 = −2 sin²(θ/4), sin(θ/2)/θ evaluated in
// long double (relative to cos(θ/2) − 1 itself: the increment form has no 1 to hide behind; the
// Taylor series of cos and sin: common practice, no source), from 0 to the largest accepted
// step angle: the truncation derived in the header is far below rounding, so what is left is the
// rounding of the evaluation, an ulp or so.
TEMPLATE_TEST_CASE("the batch exponential series is accurate up to max_step_angle",
                   "[propagation][batch][reference]", float, double) {
  using T = TestType;
  const T largest = BatchExponentialSeries<T>::max_step_angle;
  long double worst_c = 0;
  long double worst_s = 0;
  constexpr int samples = 20000;
  for (int k = 0; k <= samples; ++k) {
    const T angle = largest * static_cast<T>(k) / static_cast<T>(samples);
    const T t = angle * angle;
    T c;
    T s;
    batch_exponential_series(t, c, s);
    const long double exact_angle = std::sqrt(ld(t));  // the angle whose square was rounded to t
    const long double quarter_sine = std::sin(exact_angle / 4);
    const long double exact_c = -2 * quarter_sine * quarter_sine;  // cos(θ/2) − 1
    const long double exact_s = exact_angle == 0 ? 0.5L : std::sin(exact_angle / 2) / exact_angle;
    worst_c = std::max(worst_c, test::ulp_error(c, exact_c));
    worst_s = std::max(worst_s, test::ulp_error(s, exact_s));
  }
  test::report_worst(std::string("batch series cos(θ/2) − 1, ulp, ") + test::type_name<T>(),
                     worst_c);
  test::report_worst(std::string("batch series sin(θ/2)/θ, ulp, ") + test::type_name<T>(), worst_s);
  CHECK(worst_c <= 2.0L);
  CHECK(worst_s <= 2.0L);
  // Just above the limit the lane is rejected (so the series is never used there).
  BatchPropagator<T, 1> batch(Quaternion<T>::identity(), GyroLimits<T>{T(1e4), T(1)});
  const T over = std::nextafter(largest, T(1));
  CHECK(batch.step({over}, {T(0)}, {T(0)}, {T(1e-3)}) == 0);
  CHECK(batch.step({largest}, {T(0)}, {T(0)}, {T(1e-3)}) == 1);
}
