// Renormalization policies: what each does to the norm, and when.
#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/propagation/renormalization.hpp"
#include "test_support.hpp"

using namespace halfspin;

TEMPLATE_TEST_CASE("first-order renormalization converges quadratically without a square root",
                   "[propagation]", float, double) {
  using T = TestType;
  test::RandomRotations rng(401);
  FirstOrderRenormalization policy;
  for (int n = 0; n < 1000; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    for (const long double e : {1e-2L, -1e-2L, 1e-3L, -4e-4L}) {
      // Scale so that ‖q‖² = 1 + e; the Newton step leaves ‖q‖² − 1 = −3e²/4 + e³/4.
      const T scale = static_cast<T>(std::sqrt(1.0L + e));
      const Quaternion<T> input = scale * q;
      const long double actual_e = test::norm_ld(input) * test::norm_ld(input) - 1.0L;
      const Quaternion<T> r = policy.apply(input);
      const long double n2 = test::norm_ld(r) * test::norm_ld(r);
      const long double predicted = -0.75L * actual_e * actual_e + 0.25L * actual_e * actual_e * actual_e;
      REQUIRE(std::fabs((n2 - 1.0L) - predicted) <= 16 * test::eps<T>());
    }
    // At the rounding level it holds the norm at the rounding level.
    const Quaternion<T> r = policy.apply(q);
    REQUIRE(std::fabs(test::norm_ld(r) - 1.0L) <= 2 * test::eps<T>());
  }
}

TEMPLATE_TEST_CASE("exact renormalization gives unit norm; none leaves q alone", "[propagation]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(402);
  ExactRenormalization exact;
  NoRenormalization none;
  for (int n = 0; n < 1000; ++n) {
    const Quaternion<T> q = T(1.01) * rng.quaternion<T>();
    REQUIRE(std::fabs(test::norm_ld(exact.apply(q)) - 1.0L) <= 2 * test::eps<T>());
    REQUIRE(none.apply(q) == q);
  }
}

TEMPLATE_TEST_CASE("periodic and threshold policies fire when they say", "[propagation]", float,
                   double) {
  using T = TestType;
  const Quaternion<T> off = T(1.001) * Quaternion<T>::identity();  // ‖q‖² − 1 ≈ 2e-3
  PeriodicRenormalization<ExactRenormalization> periodic;
  periodic.period = 4;
  for (int k = 1; k <= 12; ++k) {
    const Quaternion<T> r = periodic.apply(off);
    if (k % 4 == 0) {
      REQUIRE(r == Quaternion<T>::identity());
    } else {
      REQUIRE(r == off);
    }
  }
  ThresholdRenormalization<T, ExactRenormalization> threshold;
  threshold.threshold = T(1e-3);
  REQUIRE(threshold.apply(off) == Quaternion<T>::identity());
  const Quaternion<T> near = T(1.0001) * Quaternion<T>::identity();  // 2e-4 < 1e-3
  REQUIRE(threshold.apply(near) == near);
}
