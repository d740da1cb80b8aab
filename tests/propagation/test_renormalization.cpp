// Renormalization policies: what each does to the norm, and when.
// Measured worst errors print with HALFSPIN_REPORT_WORST=1.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <memory>
#include <random>
#include <string>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/batch_propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// The first-order policy as it was before the fallback (q·(3/2 − ‖q‖²/2), the one Newton step
// alone): inside its range the policy must still give these bits, so that stored replays keep
// theirs.
template <class T>
Quaternion<T> newton_step_alone(const Quaternion<T>& q) {
  const T factor = T(1.5) - T(0.5) * squared_norm(q);
  return factor * q;
}

template <class T>
bool same_bits(const Quaternion<T>& a, const Quaternion<T>& b) {
  return std::memcmp(&a, &b, sizeof(Quaternion<T>)) == 0;
}

// q scaled (in long double, then rounded to T) so that ‖q‖² = n2.
template <class T>
Quaternion<T> with_squared_norm(const Quaternion<T>& q, long double n2) {
  const long double s = std::sqrt(n2) / test::norm_ld(q);
  return {static_cast<T>(test::ld(q.w) * s), static_cast<T>(test::ld(q.x) * s),
          static_cast<T>(test::ld(q.y) * s), static_cast<T>(test::ld(q.z) * s)};
}

// Largest component difference between r and q/‖q‖ (evaluated in long double), in ε of T.
template <class T>
long double direction_error_eps(const Quaternion<T>& r, const Quaternion<T>& q) {
  const long double n = test::norm_ld(q);
  const long double d = std::fmax(std::fmax(std::fabs(test::ld(r.w) - test::ld(q.w) / n),
                                            std::fabs(test::ld(r.x) - test::ld(q.x) / n)),
                                  std::fmax(std::fabs(test::ld(r.y) - test::ld(q.y) / n),
                                            std::fabs(test::ld(r.z) - test::ld(q.z) / n)));
  return d / test::eps<T>();
}

}  // namespace

TEMPLATE_TEST_CASE("first-order renormalization: inside its range, the Newton step bit for bit",
                   "[propagation]", float, double) {
  using T = TestType;
  test::RandomRotations rng(401);
  FirstOrderRenormalization policy;
  const T range = detail::first_order_range<T>();
  const long double u = test::eps<T>() / 2;
  // E is the largest power of two with E² ≤ u: float 2⁻¹², double 2⁻²⁷.
  REQUIRE(test::ld(range) * test::ld(range) <= u);
  REQUIRE(4.0L * test::ld(range) * test::ld(range) > u);
  int inside = 0;
  int outside = 0;
  for (int n = 0; n < 4000; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    // ‖q‖² − 1 from rounding level to 4E, both signs: both branches, and their boundary.
    const long double e =
        rng.log_uniform<long double>(1e-3L, 4.0L) * test::ld(range) * (n % 2 == 0 ? 1.0L : -1.0L);
    const Quaternion<T> input = with_squared_norm(q, 1.0L + e);
    const Quaternion<T> r = policy.apply(input);
    // The branch is decided on fl(‖q‖²) as the policy computes it.
    const T s = squared_norm(input);
    if (std::fabs(s - T(1)) <= range) {
      ++inside;
      REQUIRE(same_bits(r, newton_step_alone(input)));
      // Which still follows the Newton law ‖r‖² − 1 = −3e²/4 + e³/4 (+ rounding).
      const long double actual_e = test::norm_ld(input) * test::norm_ld(input) - 1.0L;
      const long double n2 = test::norm_ld(r) * test::norm_ld(r);
      const long double predicted =
          -0.75L * actual_e * actual_e + 0.25L * actual_e * actual_e * actual_e;
      REQUIRE(std::fabs((n2 - 1.0L) - predicted) <= 16 * test::eps<T>());
    } else {
      ++outside;
      // The fallback: q/‖q‖ to rounding.
      REQUIRE(std::fabs(test::norm_ld(r) - 1.0L) <=
              test::ld(renormalized_norm_error(policy, T(0.5))));
      REQUIRE(direction_error_eps(r, input) <= 4);
    }
  }
  REQUIRE(inside > 1000);
  REQUIRE(outside > 400);
}

TEMPLATE_TEST_CASE("first-order renormalization: a replay inside the range keeps its bits",
                   "[propagation]", float, double) {
  using T = TestType;
  // What a propagator does with an exponential-map stepper (q ← policy(q ⊗ exp(φ/2))), and with a
  // Runge–Kutta-like step that also scales ‖q‖ (by up to E/4 per step): the policy's attitudes
  // equal, bit for bit, those of the Newton step alone that every stored replay was made with.
  test::RandomRotations rng(405);
  FirstOrderRenormalization policy;
  const long double drift = test::ld(detail::first_order_range<T>()) / 4;
  Quaternion<T> a = rng.quaternion<T>();
  Quaternion<T> b = a;
  Quaternion<T> c = a;
  Quaternion<T> d = a;
  for (int k = 0; k < 100000; ++k) {
    const Vector3<T> phi = rng.uniform<T>(T(0), T(0.02)) * rng.unit_vector<T>();
    const Quaternion<T> p = quaternion_exp(phi);
    a = policy.apply(a * p);
    b = newton_step_alone(b * p);
    const T scale = static_cast<T>(1.0L + rng.uniform<long double>(-drift, drift));
    c = policy.apply(scale * (c * p));
    d = newton_step_alone(scale * (d * p));
    if (!same_bits(a, b) || !same_bits(c, d)) {
      FAIL("bits differ at step " << k);
    }
  }
  REQUIRE(std::fabs(test::norm_ld(a) - 1.0L) <= 2 * test::eps<T>());
  REQUIRE(std::fabs(test::norm_ld(c) - 1.0L) <= 2 * test::eps<T>());
}

TEMPLATE_TEST_CASE("first-order renormalization: far from unit, the exact form",
                   "[propagation][reference]", float, double) {
  // Reference: q/‖q‖ evaluated in long double (the definition of the exact form); the Newton step
  // alone diverges past ‖q‖² = 3 (its factor 3/2 − ‖q‖²/2 turns negative: common practice, no
  // source), which the first check shows so that the rest cannot pass for the wrong reason.
  using T = TestType;
  test::RandomRotations rng(403);
  FirstOrderRenormalization policy;
  const long double bound = test::ld(renormalized_norm_error(policy, T(0.5)));
  REQUIRE(bound <= 2.5L * test::eps<T>());  // 4u + 3E²/8 and rounding: about 2.2ε
  {
    const Quaternion<T> q = with_squared_norm(rng.quaternion<T>(), 10.0L);
    REQUIRE(std::fabs(test::norm_ld(newton_step_alone(q)) - 1.0L) > 1.0L);
  }
  const long double lo = test::ld(std::numeric_limits<T>::min());
  const long double hi = test::ld(std::numeric_limits<T>::max());
  // ‖q‖² = 3 (where the Newton factor reaches 0), 10, 10⁶, 10⁻¹⁰, a few near-unit values outside
  // the range, 10³⁰, and the ends of T's normal range.
  const std::array<long double, 11> squared_norms{3.0L,  10.0L,  1e6L,   1e-10L, 1.5L, 0.5L,
                                                  1.01L, 0.999L, 4 * lo, hi / 4, 1e30L};
  long double worst_norm = 0;
  long double worst_direction = 0;
  for (const long double n2 : squared_norms) {
    for (int n = 0; n < 2000; ++n) {
      const Quaternion<T> q = with_squared_norm(rng.quaternion<T>(), n2);
      const Quaternion<T> r = policy.apply(q);
      const long double norm_error = std::fabs(test::norm_ld(r) - 1.0L);
      INFO("squared norm " << static_cast<double>(n2) << " result norm error "
                           << static_cast<double>(norm_error));
      REQUIRE(norm_error <= bound);
      worst_norm = std::fmax(worst_norm, norm_error);
      worst_direction = std::fmax(worst_direction, direction_error_eps(r, q));
    }
  }
  REQUIRE(worst_direction <= 4);
  test::report_worst(std::string("first-order fallback |norm - 1| [eps] ") + test::type_name<T>(),
                     worst_norm / test::eps<T>());
  test::report_worst(std::string("first-order fallback direction [eps] ") + test::type_name<T>(),
                     worst_direction);
  // Zero stays zero (the propagator rejects it); an overflowing ‖q‖² gives a non-finite result.
  REQUIRE(policy.apply(Quaternion<T>{0, 0, 0, 0}) == Quaternion<T>{0, 0, 0, 0});
  const T big = std::numeric_limits<T>::max() / T(2);
  const Quaternion<T> huge = policy.apply(Quaternion<T>{big, big, T(0), T(0)});
  REQUIRE_FALSE((std::isfinite(huge.w) && std::isfinite(huge.x)));
}

TEMPLATE_TEST_CASE("first-order renormalization: the reciprocal square root guess", "[propagation]",
                   float, double) {
  using T = TestType;
  using Guess = detail::ReciprocalSquareRootGuess<T>;
  using Bits = typename Guess::Bits;
  // The guess alone (no Newton step) against 1/√s in long double, over one period s ∈ [1, 4):
  // every float, 2²⁴ evenly spaced doubles (the error moves by under 1e-7 between them).
  const Bits first = detail::bits_of<Bits>(T(1));
  const Bits last = detail::bits_of<Bits>(T(4));
  const Bits stride = sizeof(T) == 4 ? Bits(1) : static_cast<Bits>((last - first) >> 24U);
  long double worst = 0;
  for (Bits b = first; b < last; b += stride) {
    const T s = detail::from_bits<T>(b);
    const T y = detail::from_bits<T>(static_cast<Bits>(Guess::offset - (b >> 1U)));
    worst = std::fmax(worst, std::fabs(test::ld(y) * std::sqrt(test::ld(s)) - 1.0L));
  }
  test::report_worst(
      std::string("reciprocal square root guess relative error ") + test::type_name<T>(), worst);
  REQUIRE(worst <= test::ld(Guess::guess_error));
  REQUIRE(worst >= 0.99L * test::ld(Guess::guess_error));  // the constant is the measured worst
  // guess(4s) = guess(s)/2 over the whole normal range, so one period covers every normal s; and
  // with the Newton steps the prescaled |‖y·q‖² − 1| stays below its derived bound, itself below
  // the range (so that the Newton step that follows is inside it).
  test::RandomRotations rng(404);
  const long double prescaled_bound = test::ld(detail::first_order_prescaled_error<T>());
  REQUIRE(prescaled_bound < test::ld(detail::first_order_range<T>()) / 4);
  long double worst_prescaled = 0;
  const int max_exponent = std::numeric_limits<T>::max_exponent - 4;  // s within 2^±(max − 2)
  for (int n = 0; n < 20000; ++n) {
    const T s =
        std::ldexp(rng.uniform<T>(T(1), T(4)),
                   2 * static_cast<int>(rng.uniform<T>(T(-max_exponent / 2), T(max_exponent / 2))));
    const T guess =
        detail::from_bits<T>(static_cast<Bits>(Guess::offset - (detail::bits_of<Bits>(s) >> 1U)));
    REQUIRE(std::fabs(test::ld(guess) * std::sqrt(test::ld(s)) - 1.0L) <=
            test::ld(Guess::guess_error));
    const Quaternion<T> q = with_squared_norm(rng.quaternion<T>(), test::ld(s));
    const T y = detail::reciprocal_square_root(squared_norm(q));
    const Quaternion<T> r = y * q;
    worst_prescaled =
        std::fmax(worst_prescaled, std::fabs(test::norm_ld(r) * test::norm_ld(r) - 1.0L));
  }
  REQUIRE(worst_prescaled <= prescaled_bound);
  test::report_worst(std::string("prescaled |norm^2 - 1| measured/bound ") + test::type_name<T>(),
                     worst_prescaled / prescaled_bound);
}

TEMPLATE_TEST_CASE("first-order renormalization: batch lanes far from unit come back to unit",
                   "[propagation]", float, double) {
  using T = TestType;
  constexpr std::size_t lanes = 16;
  test::RandomRotations rng(406);
  const GyroLimits<T> limits{T(35), T(0.01)};
  auto batch = std::make_unique<BatchPropagator<T, lanes>>(Quaternion<T>::identity(), limits);
  const std::array<long double, 8> squared_norms{3.0L,  10.0L, 1e6L, 1e-10L,
                                                 0.25L, 1.01L, 2.9L, 1.0L};
  std::array<Quaternion<T>, lanes> start{};
  for (std::size_t i = 0; i < lanes; ++i) {
    start[i] = with_squared_norm(rng.quaternion<T>(), squared_norms[i % squared_norms.size()]);
    batch->set_lane(i, start[i]);
  }
  typename BatchPropagator<T, lanes>::Lanes dx{}, dy{}, dz{}, dt{};
  for (std::size_t i = 0; i < lanes; ++i) {
    const Vector3<T> d = rng.uniform<T>(T(0), T(0.01)) * rng.unit_vector<T>();
    dx[i] = d.x;
    dy[i] = d.y;
    dz[i] = d.z;
    dt[i] = T(1e-3);
  }
  REQUIRE(batch->step(dx, dy, dz, dt) == lanes);
  const long double bound = test::ld(renormalized_norm_error(FirstOrderRenormalization{}, T(0.5)));
  for (std::size_t i = 0; i < lanes; ++i) {
    const Quaternion<T> r = batch->lane(i);
    INFO("lane " << i << " squared norm "
                 << static_cast<double>(squared_norms[i % squared_norms.size()]));
    // Unit (the product with a unit increment moves ‖q‖ by a few u before the policy: the bound
    // of the fallback holds whatever came in).
    REQUIRE(std::fabs(test::norm_ld(r) - 1.0L) <= bound);
    // And the rotation is start ⊗ exp(Δθ/2), normalized.
    const Quaternion<T> expected = start[i] * quaternion_exp(Vector3<T>{dx[i], dy[i], dz[i]});
    REQUIRE(direction_error_eps(r, expected) <= 8);
  }
}

TEMPLATE_TEST_CASE("exact renormalization gives unit norm - none leaves q alone", "[propagation]",
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

TEMPLATE_TEST_CASE("scaling: the factor each policy's apply scales by, and f − 1 to a few u",
                   "[propagation]", float, double) {
  // The compensated accumulation scales its pair by Scaling{f, f − 1} instead of rounding it to
  // one quaternion and reading apply's factor back (renormalization.hpp). Checked against long
  // double: apply(q) = f·q to the policies' own rounding (per component ≤ 8u·f·‖q‖ first order,
  // 4u exact), and minus_one within 4u·(f_LD + |f_LD − 1|) of the exact f_LD − 1, f_LD the factor
  // the policy's formula gives in long double (1/‖q‖ exact; p·(3 − p²s)/2 first order, with the
  // same p and s): an error in f − 1 changes only the norm the pair is pulled to. Inside the
  // first-order range, minus_one is (1 − s)/2 bit for bit. Norm errors from 10⁻⁶ (a step) to
  // 10³ (far off the unit sphere).
  using T = TestType;
  using L = long double;
  const L u = static_cast<L>(std::numeric_limits<T>::epsilon()) / 2;
  test::RandomRotations random(31);
  std::mt19937 rng(37);
  std::uniform_real_distribution<double> exponent(-6.0, 3.0);
  std::bernoulli_distribution shrink(0.5);
  L worst_apply = 0;
  L worst_minus_one = 0;
  for (int i = 0; i < 20000; ++i) {
    const double e = std::pow(10.0, exponent(rng));
    const T scale = static_cast<T>(shrink(rng) ? 1.0 / (1.0 + e) : 1.0 + e);
    const Quaternion<T> q = scale * random.quaternion<T>();
    const T s = squared_norm(q);
    // First order.
    {
      FirstOrderRenormalization policy;
      const Scaling<T> f = policy.scaling(q);
      const Quaternion<T> kept = policy.apply(q);
      const T p = detail::first_order_prescale(s);
      const L pl = static_cast<L>(p);
      const L f_ld = pl * (L(1.5) - L(0.5) * pl * pl * static_cast<L>(s));
      const L gap_minus_one = std::fabs(static_cast<L>(f.minus_one) - (f_ld - 1));
      const L minus_one_bound = 4 * u * (f_ld + std::fabs(f_ld - 1));
      worst_minus_one = std::fmax(worst_minus_one, gap_minus_one / minus_one_bound);
      REQUIRE(gap_minus_one <= minus_one_bound);
      if (p == T(1)) {
        REQUIRE(f.minus_one == T(0.5) - T(0.5) * s);
      }
      // apply's factor comes from ‖p·q‖² rounded (not p²·s): γ₄-close; its step is a Newton
      // step, so within the range a relative difference in s of γ₄ moves f by ≤ γ₄·|s| / 2.
      const L q_norm = test::norm_ld(test::widen(q));
      const std::array<T, 4> kc{kept.w, kept.x, kept.y, kept.z};
      const std::array<T, 4> qc{q.w, q.x, q.y, q.z};
      for (std::size_t k = 0; k < 4; ++k) {
        const L gap =
            std::fabs(static_cast<L>(kc[k]) - static_cast<L>(f.factor) * static_cast<L>(qc[k]));
        worst_apply = std::fmax(worst_apply, gap / (8 * u * f_ld * q_norm));
        REQUIRE(gap <= 8 * u * f_ld * q_norm);
      }
    }
    // Exact.
    {
      ExactRenormalization policy;
      const Scaling<T> f = policy.scaling(q);
      const Quaternion<T> kept = policy.apply(q);
      const L q_norm = test::norm_ld(q);
      const L f_ld = 1 / q_norm;
      REQUIRE(std::fabs(static_cast<L>(f.minus_one) - (f_ld - 1)) <=
              4 * u * (f_ld + std::fabs(f_ld - 1)));
      const std::array<T, 4> kc{kept.w, kept.x, kept.y, kept.z};
      const std::array<T, 4> qc{q.w, q.x, q.y, q.z};
      for (std::size_t k = 0; k < 4; ++k) {
        REQUIRE(std::fabs(static_cast<L>(kc[k]) -
                          static_cast<L>(f.factor) * static_cast<L>(qc[k])) <= 4 * u);
      }
    }
  }
  test::report_worst(std::string("scaling: apply vs factor, of bound ") + test::type_name<T>(),
                     worst_apply);
  test::report_worst(std::string("scaling: minus_one, of bound ") + test::type_name<T>(),
                     worst_minus_one);
  // None, and the wrappers: the same steps counted as apply counts them.
  CHECK(NoRenormalization{}.scaling(Quaternion<T>{T(2), T(0), T(0), T(0)}).minus_one == T(0));
  PeriodicRenormalization<ExactRenormalization> periodic;
  periodic.period = 3;
  const Quaternion<T> twice{T(2), T(0), T(0), T(0)};
  CHECK(periodic.scaling(twice).factor == T(1));
  CHECK(periodic.scaling(twice).factor == T(1));
  CHECK(periodic.scaling(twice).factor == T(0.5));
  CHECK(periodic.scaling(twice).minus_one == T(0));
  ThresholdRenormalization<T, ExactRenormalization> threshold;
  CHECK(threshold.scaling(twice).factor == T(0.5));
  CHECK(threshold.scaling(Quaternion<T>{T(1), T(0), T(0), T(0)}).minus_one == T(0));
}
