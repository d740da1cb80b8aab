// The two-speed arrangement (two_speed.hpp): high-rate α, β accumulation, low-rate quaternion
// update. Outside sources:
//  - the high-rate β recursion ½ Σ (α_prev + Δθ_prev/6) × Δθ is the standard form (Savage 1998,
//    from memory); its coning error is derived here by series (ours) and measured;
//  - ratio 1 is the one-sample-plus-previous algorithm 1/12 Δθ_prev × Δθ (Savage 1998, from
//    memory), checked against Coning1SamplePlusPrevious;
//  - exactness for constant rate (common practice, no source).
// Truth: closed forms of classical_coning.hpp, constant_rate.hpp, axisymmetric_body.hpp in long
// double.

#include <cmath>
#include <cstdint>
#include <initializer_list>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/two_speed.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::narrow;

namespace {

using L = long double;

std::vector<L> ladder(L largest, int count) {
  std::vector<L> out;
  for (int i = 0; i < count; ++i) out.push_back(largest / std::pow(std::sqrt(L(2)), L(i)));
  return out;
}

template <class T>
Quaternion<L> wide(const Quaternion<T>& q) {
  return {test::ld(q.w), test::ld(q.x), test::ld(q.y), test::ld(q.z)};
}

// Max over the horizon of the attitude error of the two-speed arrangement at ratio r, sample
// period h (s), sampling `motion` exactly (closed-form delta-angles rounded to T). Sample k covers
// (k·h, (k+1)·h]; the accumulator is seeded with the sample before t = 0.
template <class T, class Motion>
L two_speed_global_error(const Motion& motion, std::uint32_t r, L h, L horizon) {
  TwoSpeedAccumulator<T> acc(r);
  acc.restart(narrow<T>(motion.delta_angle(-h, L(0))));
  Quaternion<T> q = narrow<T>(motion.attitude(L(0)));
  const long long samples = std::llround(horizon / h / L(r)) * static_cast<long long>(r);
  L worst = 0;
  for (long long k = 0; k < samples; ++k) {
    if (acc.add(narrow<T>(motion.delta_angle(L(k) * h, L(k + 1) * h)))) {
      q = two_speed_update(q, acc.take());
      worst = std::fmax(worst, angle_between(wide(q), motion.attitude(L(k + 1) * h)));
    }
  }
  return worst;
}

}  // namespace

TEST_CASE("two-speed at ratio 1 is the one-sample-plus-previous algorithm",
          "[two_speed][reference]") {
  // Savage 1998 (from memory): the high-rate β recursion at one sample per update reduces to
  // 1/12 Δθ_prev × Δθ. Same rotation vector to rounding (the two evaluate 1/12 differently:
  // ½·((1/6)·Δθ_prev × Δθ) against (1/12)·(Δθ_prev × Δθ)), and the same attitude after 10⁴ updates.
  const ClassicalConingMotion<L> motion{0.02L, L(1)};
  const L h = 0.05L;
  TwoSpeedAccumulator<double> acc(1);
  Vector3<double> prev = narrow<double>(motion.delta_angle(-h, L(0)));
  acc.restart(prev);
  Quaternion<double> q_two = narrow<double>(motion.attitude(0)), q_one = q_two;
  L worst_eps = 0;
  for (long long k = 0; k < 10000; ++k) {
    const Vector3<double> d = narrow<double>(motion.delta_angle(L(k) * h, L(k + 1) * h));
    REQUIRE(acc.add(d));
    const Vector3<double> phi_two = acc.take();
    const std::array<Vector3<double>, 2> window{prev, d};
    const Vector3<double> phi_one = Coning1SamplePlusPrevious::rotation_vector(window);
    prev = d;
    // Largest component difference over |φ|, in ε: a rounding or two of the β term (|β| ≪ |φ|)
    // and one of the sum α + β.
    worst_eps =
        std::fmax(worst_eps, test::vector_error_eps(phi_two, phi_one) / test::length_ld(phi_one));
    q_two = two_speed_update(q_two, phi_two);
    q_one = Coning1SamplePlusPrevious::step(q_one, window, double(h));
  }
  test::report_worst("ratio 1 vs one-plus-previous rotation vector [eps relative]", worst_eps);
  CHECK(worst_eps < 0.05L);
  const L apart = angle_between(wide(q_two), wide(q_one));
  test::report_worst("ratio 1 vs one-plus-previous attitude after 1e4 updates [rad]", apart);
  CHECK(apart < 1e-14L);
}

TEST_CASE("two-speed coning error per update is −r·λ⁵/60·sin²a: drift independent of the ratio",
          "[two_speed][order][reference]") {
  // Ours (series, two_speed.hpp header): the coning term of an update of r samples is off by
  // −r·λ⁵/60·sin²a, λ = Ω·h; published form of the recursion: Savage 1998 (from memory). Measured
  // on the x (cone-axis) component against the closed-form α_x + β_x, λ ∈ [0.1, 0.4] (next term
  // a relative ~λ²/8; errors ≥ 1e-12·sin²a, far above double roundoff of φ_x).
  const L a = 0.02L;
  const ClassicalConingMotion<L> motion{a, L(1)};
  const L s2a = std::sin(a) * std::sin(a);
  const auto lam = ladder(0.4L, 5);
  for (std::uint32_t r : {1u, 2u, 3u, 4u, 8u}) {
    std::vector<L> err;
    L coefficient = 0;
    for (L l : lam) {
      const L t0 = 0.7L;  // start of the update, s (Ω = 1)
      TwoSpeedAccumulator<double> acc(r);
      acc.restart(narrow<double>(motion.delta_angle(t0 - l, t0)));
      for (std::uint32_t i = 0; i < r; ++i) {
        acc.add(narrow<double>(motion.delta_angle(t0 + L(i) * l, t0 + L(i + 1) * l)));
      }
      REQUIRE(acc.update_due());
      const Vector3<double> phi = acc.take();
      const L U = L(r) * l;
      const L sh = std::sin(a / 2);
      const L exact_x = -2 * sh * sh * U + L(0.5) * s2a * (U - std::sin(U));
      err.push_back(std::fabs(test::ld(phi.x) - exact_x) / s2a);
      coefficient = (test::ld(phi.x) - exact_x) / s2a / std::pow(l, L(5));
    }
    const L p = test::log_log_slope(lam, err);
    test::report_worst("two-speed coning-term order, ratio " + std::to_string(r), p);
    test::report_worst("two-speed coning-term coefficient / (-r/60), ratio " + std::to_string(r),
                       coefficient / (-L(r) / 60));
    CHECK(std::fabs(p - 5) < 0.2L);
    CHECK(std::fabs(coefficient / (-L(r) / 60) - 1) < 0.03L);
  }
}

TEST_CASE("two-speed attitude error under pure coning falls as h⁴ at every ratio",
          "[two_speed][order]") {
  // Cone angle 1e-5 rad, horizon Ω·t = 200 (as in test_coning.cpp, so that the drift, not the
  // second-order form's remainder, dominates); λ = Ω·h ∈ [0.2, 0.8]. The drift per unit time does
  // not depend on the ratio (coefficient above), so at equal h the errors agree within 5 %.
  const ClassicalConingMotion<L> motion{1e-5L, L(1)};
  const L horizon = 200;
  const auto lam = ladder(0.8L, 5);
  std::vector<L> at_ratio_1;
  for (std::uint32_t r : {1u, 2u, 4u, 8u}) {
    std::vector<L> err;
    for (L l : lam) err.push_back(two_speed_global_error<double>(motion, r, l, horizon));
    if (r == 1) at_ratio_1 = err;
    const L p = test::log_log_slope(lam, err);
    test::report_worst("two-speed global order at ratio " + std::to_string(r), p);
    CHECK(std::fabs(p - 4) < 0.2L);
    const L rel = err.back() / at_ratio_1.back();
    test::report_worst(
        "two-speed error at smallest h over ratio-1 error, ratio " + std::to_string(r), rel);
    CHECK(std::fabs(rel - 1) < 0.05L);
  }
}

TEST_CASE("two-speed on general motion (axisymmetric body): order 3, and (r·h)⁴ at large ratios",
          "[two_speed][order][reference]") {
  // As one-plus-previous (coning_compensation.hpp): the within-sample term is estimated from the
  // previous sample, leaving a T⁴ term per sample, global h³, the same at every ratio. On top, the
  // update uses α + β only, so the third Magnus term over the low-rate interval, O((r·h)⁵) per
  // update (Blanes, Casas, Oteo and Ros 2009, from memory), adds a global (r·h)⁴ term, which
  // dominates at large ratios until h is small. Ratio 2, h ∈ [0.00625, 0.025] s: third order;
  // ratio 8, h ∈ [0.0125, 0.05] s: fourth order (errors ≥ 7e-7 rad, far above roundoff).
  AxisymmetricBodyMotion<L> motion;
  motion.initial = Quaternion<L>{0.5L, 0.5L, -0.5L, 0.5L};
  motion.axial_inertia = 1.5L;
  motion.transverse_rate = 0.6L;
  motion.transverse_phase = 0.3L;
  motion.axial_rate = 1.0L;
  auto order_at = [&](std::uint32_t r, L largest) {
    const auto hs = ladder(largest, 5);
    std::vector<L> err;
    for (L h : hs) err.push_back(two_speed_global_error<double>(motion, r, h, L(20)));
    const L p = test::log_log_slope(hs, err);
    test::report_worst("two-speed general-motion order, ratio " + std::to_string(r), p);
    return p;
  };
  CHECK(std::fabs(order_at(2, 0.025L) - 3) < 0.2L);
  CHECK(std::fabs(order_at(8, 0.05L) - 4) < 0.2L);
}

TEST_CASE("two-speed float: order 4 above the roundoff floor", "[two_speed][order]") {
  // One float setting: a = 0.02 rad, Ω·t ≤ 20, ratio 4, λ ∈ [0.28, 0.8]: errors ≥ 8e-7 rad, 10×
  // above the float floor measured in test_coning.cpp (~1e-8 – 7e-8 rad at this cone angle).
  const ClassicalConingMotion<L> motion{0.02L, L(1)};
  const auto lam = ladder(0.8L, 4);
  std::vector<L> err;
  for (L l : lam) err.push_back(two_speed_global_error<float>(motion, 4, l, L(20)));
  const L p = test::log_log_slope(lam, err);
  test::report_worst("two-speed float order, ratio 4", p);
  CHECK(std::fabs(p - 4) < 0.2L);
}

TEST_CASE("two-speed, constant rate: 10^6 updates in double within 1e-10 rad",
          "[two_speed][reference]") {
  // Common practice, no source: parallel delta-angles make every cross product vanish and the
  // exponential map is exact for constant rate. Ratio 2 (2·10⁶ samples at 1 kHz).
  const ConstantRateMotion<L> motion{Quaternion<L>{0.5L, 0.5L, -0.5L, 0.5L},
                                     Vector3<L>{0.31L, -0.17L, 0.52L}};
  const L h = 1.0L / 1000;
  TwoSpeedAccumulator<double> acc(2);
  Quaternion<double> q = narrow<double>(motion.initial);
  long long updates = 0;
  long long k = 0;
  while (updates < 1000000) {
    if (acc.add(narrow<double>(motion.delta_angle(L(k) * h, L(k + 1) * h)))) {
      q = two_speed_update(q, acc.take());
      ++updates;
    }
    ++k;
  }
  const L err = angle_between(wide(q), motion.attitude(L(k) * h));
  test::report_worst("two-speed constant rate 1e6 updates [rad]", err);
  CHECK(err < 1e-10L);
}

TEST_CASE("two-speed accumulator bookkeeping", "[two_speed]") {
  TwoSpeedAccumulator<float> acc(3);
  CHECK(acc.ratio() == 3u);
  CHECK(TwoSpeedAccumulator<float>(0).ratio() == 1u);  // ratio 0 is taken as 1
  const Vector3<float> d1{1e-3f, 0.0f, 0.0f}, d2{0.0f, 1e-3f, 0.0f}, d3{0.0f, 0.0f, 1e-3f};
  CHECK_FALSE(acc.add(d1));
  CHECK_FALSE(acc.add(d2));
  CHECK(acc.count() == 2u);
  CHECK_FALSE(acc.update_due());
  CHECK(acc.add(d3));
  CHECK(acc.update_due());
  // β by hand: ½((0 + 0)×d1) + ½((d1 + d1/6)×d2) + ½((d1 + d2 + d2/6)×d3), float arithmetic in the
  // same order as the header; the sum α = d1 + d2 + d3.
  const Vector3<float> b2 = 0.5f * cross(d1 + d1 * (1.0f / 6), d2);
  const Vector3<float> b3 = 0.5f * cross((d1 + d2) + d2 * (1.0f / 6), d3);
  const Vector3<float> beta =
      (Vector3<float>::zero() + 0.5f * cross(Vector3<float>::zero(), d1) + b2) + b3;
  const Vector3<float> expected = ((d1 + d2) + d3) + beta;
  CHECK(acc.rotation_vector() == expected);
  CHECK(acc.take() == expected);
  CHECK(acc.count() == 0u);
  CHECK(acc.rotation_vector() == Vector3<float>::zero());
  // The last delta-angle survives take(): the next β increment uses it.
  acc.add(d1);
  CHECK(acc.rotation_vector() == d1 + 0.5f * cross(d3 * (1.0f / 6), d1));
  // restart() forgets it.
  acc.restart();
  acc.add(d2);
  CHECK(acc.rotation_vector() == d2 + 0.5f * cross(Vector3<float>::zero(), d2));
}
