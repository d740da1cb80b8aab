// The norm-error bounds of renormalization.hpp (norm_error_bound, renormalized_norm_error,
// exponential_map_step_norm_drift) against measured norms, evaluated in long double: every bound
// holds, and is not loose where the derivation says it is tight. The rounding model is Higham's
// (Accuracy and Stability of Numerical Algorithms, 2nd ed., §2.2–3.1); the long run is in
// tests/soak/ (ctest -L soak).
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// |‖q‖ − 1| in long double.
template <class T>
long double norm_error_ld(const Quaternion<T>& q) {
  return std::fabs(test::norm_ld(q) - 1.0L);
}

// q scaled so that ‖q‖ = 1 + e (before rounding to T).
template <class T>
Quaternion<T> with_norm(const Quaternion<T>& q, long double e) {
  const long double s = (1.0L + e) / test::norm_ld(q);
  return {static_cast<T>(test::ld(q.w) * s), static_cast<T>(test::ld(q.x) * s),
          static_cast<T>(test::ld(q.y) * s), static_cast<T>(test::ld(q.z) * s)};
}

}  // namespace

// Computable at compile time (firmware start-up checks), and of the documented size.
static_assert(renormalized_norm_error(ExactRenormalization{}, 0.0f) > 3.9f * 0x1p-24f &&
                  renormalized_norm_error(ExactRenormalization{}, 0.0f) < 4.1f * 0x1p-24f,
              "exact renormalization: about 4u");
static_assert(norm_error_bound(FirstOrderRenormalization{}, 6e-7f, 0.0f, 1) < 4.1f * 0x1p-24f,
              "first order with a gyro step's drift: about 4u");
static_assert(norm_error_bound(PeriodicRenormalization<>{}, 6e-7f, 0.0f, 1) > 15.0f * 6e-7f,
              "periodic: at least period - 1 steps of drift");

TEMPLATE_TEST_CASE("renormalization bounds: exact and first order hold for any incoming norm",
                   "[propagation]", float, double) {
  using T = TestType;
  test::RandomRotations rng(811);
  ExactRenormalization exact;
  FirstOrderRenormalization first_order;
  const long double exact_bound = test::ld(renormalized_norm_error(exact, T(0)));
  long double worst_exact = 0;
  // Up to 1e-5 only the Newton step runs; from 1e-3 on (past first_order_range, float 2⁻¹²,
  // double 2⁻²⁷) mostly the prescaled fallback, up to ‖q‖ = 1 ± 0.9. (From an incoming error of 1
  // on, q may be 0 and the bound is +∞: checked below.)
  for (const long double incoming : {0.0L, 1e-7L, 1e-5L, 1e-3L, 1e-2L, 0.05L, 0.5L, 0.9L}) {
    const long double fo_bound =
        test::ld(renormalized_norm_error(first_order, static_cast<T>(incoming)));
    long double worst_fo = 0;
    for (int n = 0; n < 2000; ++n) {
      const long double e = rng.uniform<long double>(-incoming, incoming);
      const Quaternion<T> q = with_norm(rng.quaternion<T>(), e);
      // Rounding q to T moves its norm by ≤ 2u more: the bound is asked for what q actually has.
      const T actual = static_cast<T>(norm_error_ld(q));
      const long double r_exact = norm_error_ld(exact.apply(q));
      const long double r_fo = norm_error_ld(first_order.apply(q));
      INFO("incoming " << static_cast<double>(incoming) << " exact " << static_cast<double>(r_exact)
                       << " first order " << static_cast<double>(r_fo));
      REQUIRE(r_exact <= exact_bound);
      REQUIRE(r_fo <= test::ld(renormalized_norm_error(first_order, actual)));
      worst_exact = std::fmax(worst_exact, r_exact);
      worst_fo = std::fmax(worst_fo, r_fo);
    }
    if (incoming >= 1e-2L) {
      // Past the range the result is q/‖q‖ to rounding, whatever came in: one bound for all
      // incoming errors (4u + 3E²/8 + rounding), reached within a factor 3.
      REQUIRE(fo_bound == test::ld(renormalized_norm_error(first_order, T(0.5))));
      REQUIRE(fo_bound <= 3.0L * worst_fo);
      test::report_worst(
          std::string("first order far from unit measured/bound ") + test::type_name<T>(),
          worst_fo / fo_bound);
    }
    REQUIRE(fo_bound >= worst_fo);
  }
  REQUIRE(std::isinf(renormalized_norm_error(first_order, T(1))));
  REQUIRE(std::isinf(renormalized_norm_error(first_order, std::numeric_limits<T>::max())));
  // 4u is a worst case; measured reach at least half of it over 12,000 draws.
  REQUIRE(worst_exact >= 0.25L * exact_bound);
  test::report_worst(std::string("exact renormalization measured/bound ") + test::type_name<T>(),
                     worst_exact / exact_bound);
}

TEMPLATE_TEST_CASE("renormalization bounds: the exponential-map step's norm drift", "[propagation]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(812);
  // Gyro-sized steps, the series branch near its threshold, and the libm branch.
  for (const long double theta : {1e-5L, 1e-3L, 1e-2L, 0.3L, 0.6L}) {
    const long double d = test::ld(exponential_map_step_norm_drift(static_cast<T>(theta)));
    long double worst = 0;
    for (int n = 0; n < 5000; ++n) {
      const Quaternion<T> q = rng.quaternion<T>();
      const Vector3<T> axis = rng.unit_vector<T>();
      const T angle = rng.uniform<T>(T(0), static_cast<T>(theta));
      const Quaternion<T> next = q * quaternion_exp(angle * axis);
      worst = std::fmax(worst, std::fabs(test::norm_ld(next) / test::norm_ld(q) - 1.0L));
    }
    INFO("theta " << static_cast<double>(theta) << " measured " << static_cast<double>(worst)
                  << " bound " << static_cast<double>(d));
    REQUIRE(worst <= d);
    REQUIRE(d <= 12.0L * test::eps<T>());  // about 10u (5ε) for every step the library takes
    test::report_worst(
        std::string("exp-map step norm drift measured/bound ") + test::type_name<T>(), worst / d);
  }
}

// A synthetic drift: every step scales q by a factor within [1 − d, 1 + d] (d ≫ u, so that the
// rounding of the scaling itself stays inside d), then the policy runs, as in the propagator.
template <class T, class Policy>
long double worst_under_drift(Policy policy, long double d, int steps, bool one_sided,
                              std::uint64_t seed) {
  test::RandomRotations rng(seed);
  Quaternion<T> q = rng.quaternion<T>();
  long double worst = norm_error_ld(q);
  for (int k = 0; k < steps; ++k) {
    const long double f = one_sided ? 0.5L * d : rng.uniform<long double>(-0.5L * d, 0.5L * d);
    q = static_cast<T>(1.0L + f) * q;
    q = policy.apply(q);
    worst = std::fmax(worst, norm_error_ld(q));
  }
  return worst;
}

TEMPLATE_TEST_CASE("renormalization bounds: every policy under a synthetic drift", "[propagation]",
                   float, double) {
  using T = TestType;
  const T d = T(1e-4);
  const T b0 = T(4) * std::numeric_limits<T>::epsilon();
  // none: (1 + b₀)(1 + d)^n − 1, reached within a factor 2.1 by a drift all of one sign (d/2).
  {
    const long double bound = test::ld(norm_error_bound(NoRenormalization{}, d, b0, 100));
    const long double one_sided =
        worst_under_drift<T>(NoRenormalization{}, test::ld(d), 100, true, 821);
    REQUIRE(one_sided <= bound);
    REQUIRE(bound <= 2.1L * one_sided);
    REQUIRE(worst_under_drift<T>(NoRenormalization{}, test::ld(d), 100, false, 822) <= bound);
  }
  // exact and first order: a few u, whatever the drift.
  for (const bool one_sided : {true, false}) {
    REQUIRE(worst_under_drift<T>(ExactRenormalization{}, test::ld(d), 1000, one_sided, 823) <=
            test::ld(norm_error_bound(ExactRenormalization{}, d, b0, 1000)));
    REQUIRE(worst_under_drift<T>(FirstOrderRenormalization{}, test::ld(d), 1000, one_sided, 824) <=
            test::ld(norm_error_bound(FirstOrderRenormalization{}, d, b0, 1000)));
  }
  // periodic: period − 1 steps of drift on top of the inner policy; tight for a one-sided drift.
  {
    PeriodicRenormalization<ExactRenormalization> periodic;
    periodic.period = 16;
    const long double bound = test::ld(norm_error_bound(periodic, d, b0, 1000));
    const long double one_sided = worst_under_drift<T>(periodic, test::ld(d), 1000, true, 825);
    REQUIRE(one_sided <= bound);
    REQUIRE(bound <= 2.1L * one_sided);
    PeriodicRenormalization<FirstOrderRenormalization> periodic_fo;
    periodic_fo.period = 16;
    REQUIRE(worst_under_drift<T>(periodic_fo, test::ld(d), 1000, true, 826) <=
            test::ld(norm_error_bound(periodic_fo, d, b0, 1000)));
  }
  // threshold: about τ/2, reached by a one-sided drift of steps far below τ.
  {
    ThresholdRenormalization<T, ExactRenormalization> threshold;
    threshold.threshold = T(1e-3);
    const long double bound = test::ld(norm_error_bound(threshold, d, b0, 1000));
    const long double one_sided = worst_under_drift<T>(threshold, test::ld(d), 1000, true, 827);
    REQUIRE(one_sided <= bound);
    REQUIRE(bound <= 1.2L * one_sided);
    REQUIRE(worst_under_drift<T>(threshold, test::ld(d), 1000, false, 828) <= bound);
  }
}
