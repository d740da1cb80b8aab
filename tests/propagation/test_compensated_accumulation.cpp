// The compensated accumulation policy (propagation/compensated_accumulation.hpp): its error-free
// building blocks against long double, and the accumulation's per-step rounding bound on a motion
// the plain policy cannot follow at all in float.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <random>
#include <type_traits>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

using L = long double;

// A float with a random sign, mantissa and binary exponent in [low, high).
float random_float(std::mt19937& rng, int low, int high) {
  std::uniform_real_distribution<float> mantissa(1.0f, 2.0f);
  std::uniform_int_distribution<int> exponent(low, high - 1);
  std::bernoulli_distribution negative(0.5);
  const float m = std::ldexp(mantissa(rng), exponent(rng));
  return negative(rng) ? -m : m;
}

constexpr L u_float = static_cast<L>(std::numeric_limits<float>::epsilon()) / 2;  // unit roundoff

}  // namespace

TEST_CASE("TwoSum and Fast2Sum are error-free in float", "[reference]") {
  // Source: Knuth, TAOCP vol. 2, 4.2.2 (TwoSum: s + e = a + b exactly for any a, b); Dekker 1971
  // (Fast2Sum: exactly, when |a| ≥ |b|). The exact sums are formed in long double (64-bit
  // significand: exact for two floats whose exponents differ by less than 40).
  std::mt19937 rng(3);
  for (int i = 0; i < 100000; ++i) {
    const float a = random_float(rng, -20, 20);
    const float b = random_float(rng, -20, 20);
    const detail::SumAndError<float> t = detail::two_sum(a, b);
    CHECK(static_cast<L>(t.sum) + static_cast<L>(t.error) == static_cast<L>(a) + static_cast<L>(b));
    CHECK(t.sum == a + b);
    const float big = std::fabs(a) >= std::fabs(b) ? a : b;
    const float small = std::fabs(a) >= std::fabs(b) ? b : a;
    const detail::SumAndError<float> f = detail::fast_two_sum(big, small);
    CHECK(static_cast<L>(f.sum) + static_cast<L>(f.error) ==
          static_cast<L>(big) + static_cast<L>(small));
  }
}

TEST_CASE("double-word plus word: relative error at most 2u², result normalized", "[reference]") {
  // Source: Joldes, Muller and Popescu 2017, ACM TOMS, algorithm DWPlusFP: relative error ≤ 2u²
  // (u the unit roundoff of float here), output a normalized double-word.
  std::mt19937 rng(5);
  L worst = 0;
  for (int i = 0; i < 100000; ++i) {
    const float hi = random_float(rng, -2, 2);
    // A normalized low part: |lo| ≤ ½ulp(hi).
    const float half_ulp = std::ldexp(1.0f, std::ilogb(hi) - 24);
    std::uniform_real_distribution<float> fraction(-1.0f, 1.0f);
    const float lo = fraction(rng) * half_ulp;
    const float y = random_float(rng, -30, 3);
    const detail::SumAndError<float> r = detail::double_word_plus(hi, lo, y);
    const L exact = static_cast<L>(hi) + static_cast<L>(lo) + static_cast<L>(y);
    const L got = static_cast<L>(r.sum) + static_cast<L>(r.error);
    if (exact != 0) {
      worst = std::fmax(worst, std::fabs(got - exact) / std::fabs(exact));
    }
    CHECK(r.sum == r.sum + r.error);  // normalized: the low part is below half an ulp
  }
  INFO("worst relative error " << static_cast<double>(worst / (u_float * u_float)) << " u²");
  CHECK(worst <= 2 * u_float * u_float);
}

TEST_CASE("double-word plus a smaller word: Fast2Sum gives the TwoSum form's bits") {
  // The renormalization adds κ·q_hi with |κ| ≤ 2⁻¹⁰, so |y| ≤ |hi|, where Fast2Sum's pair is
  // TwoSum's (Dekker 1971; both error-free): double_word_plus_smaller must equal double_word_plus
  // bit for bit, including y of hi's own magnitude, opposite signs and zeros.
  std::mt19937 rng(7);
  std::uniform_real_distribution<float> fraction(-1.0f, 1.0f);
  int differing = 0;
  for (int i = 0; i < 100000; ++i) {
    const float hi = random_float(rng, -4, 2);
    const float lo = fraction(rng) * std::ldexp(1.0f, std::ilogb(hi) - 24);
    // |y| ≤ |hi|: a random fraction of hi, some at ±hi and ±hi·2⁻¹⁰ exactly, some zero.
    const int kind = i % 5;
    const float y = kind == 0   ? -hi
                    : kind == 1 ? hi * std::ldexp(fraction(rng) >= 0 ? 1.0f : -1.0f, -10)
                    : kind == 2 ? 0.0f
                                : hi * fraction(rng) * std::ldexp(1.0f, -(i % 30));
    const detail::SumAndError<float> a = detail::double_word_plus(hi, lo, y);
    const detail::SumAndError<float> b = detail::double_word_plus_smaller(hi, lo, y);
    if (std::memcmp(&a.sum, &b.sum, sizeof(float)) != 0 ||
        std::memcmp(&a.error, &b.error, sizeof(float)) != 0) {
      ++differing;
    }
  }
  CHECK(differing == 0);
}

TEMPLATE_TEST_CASE("the read-back takes the policy's factor: direction kept, norm the policy's", "",
                   FirstOrderRenormalization, ExactRenormalization) {
  // with_attitude reads κ = f − 1 from Σ(|kept_i| − |a_i|)/Σ|a_i| and adds κ·q_hi to the pair.
  // Derived bounds (compensated_accumulation.hpp): the direction moves by at most 4u·|κ| + 4u²
  // (as an angle; 2u·|κ| + 2u² in the 2-norm), and the factor read back differs from the policy's
  // per-component factors f(1 + ε_i), |ε_i| ≤ 2u, by at most 2u + 4u·|κ|, so the pair's norm is
  // within (4u + 4u·|κ|)·‖a‖ of ‖kept‖ (both are ε-weighted means), plus the 2u·|κ| + 2u² above.
  std::mt19937 rng(23);
  test::RandomRotations random(29);
  std::uniform_real_distribution<float> c(-1.0f, 1.0f);
  L worst_direction = 0;
  L worst_norm = 0;
  for (int i = 0; i < 20000; ++i) {
    // A pair near the unit sphere (norm error up to 10⁻⁴, what a Runge–Kutta step may leave), with
    // a low word from a few steps.
    CompensatedAccumulation::State<float> s =
        CompensatedAccumulation::start((1.0f + 1e-4f * c(rng)) * random.quaternion<float>());
    for (int k = 0; k < 3; ++k) {
      s = CompensatedAccumulation::advanced(
          s, quaternion_exp_minus_one(Vector3<float>{c(rng), c(rng), c(rng)} * 1e-3f));
    }
    const Quaternion<float> a = CompensatedAccumulation::attitude(s);
    TestType policy;
    const Quaternion<float> kept = policy.apply(a);
    const CompensatedAccumulation::State<float> r = CompensatedAccumulation::with_attitude(s, kept);
    const Quaternion<L> before = test::widen(s.hi) + test::widen(s.lo);
    const Quaternion<L> after = test::widen(r.hi) + test::widen(r.lo);
    const L na = std::sqrt(squared_norm(test::widen(a)));
    const L nk = std::sqrt(squared_norm(test::widen(kept)));
    const L kappa = std::fabs(nk / na - 1);
    const L u = u_float;
    const L direction_bound = 4 * u * kappa + 4 * u * u;
    const L norm_bound = (4 * u + 4 * u * kappa) * na + 2 * u * kappa + 2 * u * u;
    const L direction = angle_between(before, after);
    const L norm_gap = std::fabs(std::sqrt(squared_norm(after)) - nk);
    worst_direction = std::fmax(worst_direction, direction / direction_bound);
    worst_norm = std::fmax(worst_norm, norm_gap / norm_bound);
    REQUIRE(direction <= direction_bound);
    REQUIRE(norm_gap <= norm_bound);
  }
  test::report_worst(std::string("read-back direction measured/bound ") + TestType::name,
                     worst_direction);
  test::report_worst(std::string("read-back norm measured/bound ") + TestType::name, worst_norm);
}

TEST_CASE("compensated float keeps rotations the plain policy rounds away, within its bound") {
  // 10⁶ steps of 10⁻⁹ rad about a fixed axis (|δ| = 5·10⁻¹⁰, below half an ulp of 1 in float):
  // the plain policy returns the start attitude every step; the compensated one must follow the
  // 10⁻³ rad rotation to within its bound c1·u·(angle traversed) + N·c2·u² plus the increment's
  // own rounding (the same rounded δ every step: at most u·|δ| per step, as an angle u·θ).
  const int steps = 1000000;
  const L theta = 1e-9L;
  const Vector3<L> axis = normalized(Vector3<L>{0.3L, -0.5L, 0.8L});
  const Quaternion<float> delta = test::narrow<float>(quaternion_exp_minus_one(axis * theta));
  const Quaternion<float> start =
      test::narrow<float>(normalized(Quaternion<L>{0.9L, 0.2L, -0.3L, 0.1L}));
  PlainAccumulation::State<float> plain = PlainAccumulation::start(start);
  CompensatedAccumulation::State<float> compensated = CompensatedAccumulation::start(start);
  for (int k = 0; k < steps; ++k) {
    plain = PlainAccumulation::advanced(plain, delta);
    compensated = CompensatedAccumulation::advanced(compensated, delta);
  }
  const Quaternion<L> truth =
      test::widen(start) * quaternion_exp(axis * (theta * static_cast<L>(steps)));
  const L plain_error = angle_between(test::widen(PlainAccumulation::attitude(plain)), truth);
  // The pair in long double, so the check sees the accumulation, not the final rounding.
  const Quaternion<L> pair = test::widen(compensated.hi) + test::widen(compensated.lo);
  const L compensated_error = angle_between(pair, truth);
  const L traversed = theta * steps;
  const L bound = (CompensatedAccumulation::rounding_c1 + 1) * u_float * traversed +
                  steps * CompensatedAccumulation::rounding_c2 * u_float * u_float;
  INFO("plain " << static_cast<double>(plain_error) << " rad, compensated "
                << static_cast<double>(compensated_error) << " rad, bound "
                << static_cast<double>(bound) << " rad");
  CHECK(plain_error > 0.9e-3L);  // the plain policy lost the whole rotation
  CHECK(compensated_error <= bound);
  CHECK(compensated_error < 1e-6L * traversed + 1e-7L);
}

TEST_CASE("scaling the pair changes its norm, not its direction") {
  // Renormalization adds κ·q_hi to the pair; the direction moves by O(u·κ) only (κ is of the
  // size of the norm error, O(u), when renormalizing every step).
  std::mt19937 rng(11);
  std::uniform_real_distribution<float> c(-1.0f, 1.0f);
  for (int i = 0; i < 1000; ++i) {
    CompensatedAccumulation::State<float> s =
        CompensatedAccumulation::start(Quaternion<float>{c(rng), c(rng), c(rng), c(rng)});
    const float kappa = c(rng) * 1e-6f;
    const CompensatedAccumulation::State<float> r = CompensatedAccumulation::scaled(s, kappa);
    const Quaternion<L> before = test::widen(s.hi) + test::widen(s.lo);
    const Quaternion<L> after = test::widen(r.hi) + test::widen(r.lo);
    const L expected_norm = std::sqrt(squared_norm(before)) * (1 + static_cast<L>(kappa));
    // κ·q_hi is rounded with relative error u: at most u·|κ| per component, so 2u·|κ| in the
    // 2-norm and twice that as an angle; the additions add 2u² each.
    CHECK(angle_between(before, after) <=
          4 * u_float * std::fabs(static_cast<L>(kappa)) + 8 * u_float * u_float);
    CHECK(std::fabs(std::sqrt(squared_norm(after)) - expected_norm) <=
          4 * u_float * u_float + 2 * u_float * std::fabs(static_cast<L>(kappa)));
  }
}

TEMPLATE_TEST_CASE("the compensated propagator follows a slow rotation the plain one loses", "",
                   FirstOrderRenormalization, ExactRenormalization, NoRenormalization) {
  // A constant 10⁻⁵ rad/s at 1 kHz for 1000 s: 10⁻⁸ rad per step, whose increment is below half
  // an ulp of every attitude component. In float the plain propagator stays where it started
  // (0.01 rad off); the compensated one must follow within the accumulation's bound
  // c1·u·(angle traversed) + N·c2·u² (renormalization included), plus the increment's own
  // rounding (the same δ every step, formed from a rounded ω·dt: at most 2u·θ per step).
  const int steps = 1000000;
  const float dt = 1e-3f;
  const Vector3<float> rate{0.0f, 6e-6f, -8e-6f};  // |ω| = 10⁻⁵ rad/s
  const Quaternion<float> start =
      test::narrow<float>(normalized(Quaternion<L>{0.9L, 0.2L, -0.3L, 0.1L}));
  const GyroLimits<float> limits{35.0f, 0.01f};  // a 2000 °/s gyro, gaps above 10 ms
  Propagator<float, ExponentialMapHoldEnd, TestType, PlainAccumulation> plain(start, limits);
  Propagator<float, ExponentialMapHoldEnd, TestType, CompensatedAccumulation> compensated(start,
                                                                                          limits);
  for (int k = 0; k < steps; ++k) {
    REQUIRE(plain.push(rate, dt) == Status::ok);
    REQUIRE(compensated.push(rate, dt) == Status::ok);
  }
  const L traversed = 1e-8L * steps;
  const Quaternion<L> truth =
      test::widen(start) * quaternion_exp(test::widen(rate) * (static_cast<L>(dt) * steps));
  const L plain_error = angle_between(test::widen(plain.attitude()), truth);
  const L compensated_error = angle_between(test::widen(compensated.attitude()), truth);
  const L bound = (CompensatedAccumulation::rounding_c1 + 2) * u_float * traversed +
                  steps * CompensatedAccumulation::rounding_c2 * u_float * u_float;
  INFO(TestType::name << ": plain " << static_cast<double>(plain_error) << " rad, compensated "
                      << static_cast<double>(compensated_error) << " rad, bound "
                      << static_cast<double>(bound) << " rad");
  CHECK(plain_error > 0.9e-2L);
  CHECK(compensated_error <= bound);
  CHECK(std::fabs(std::sqrt(squared_norm(test::widen(compensated.attitude()))) - 1) <=
        (std::is_same<TestType, NoRenormalization>::value ? 1e-6L : 4 * u_float));
}

TEST_CASE("renormalizing a pair far from the unit sphere scales both words") {
  // An attitude 10³ times too long (a huge Runge–Kutta step, or a careless start) normalized by
  // the exact policy: adding κ·q_hi with κ ≈ −1 would cancel (found by the fuzz harness); the
  // pair is scaled instead, a direction error of order u once.
  std::mt19937 rng(13);
  std::uniform_real_distribution<float> c(-1.0f, 1.0f);
  for (int i = 0; i < 1000; ++i) {
    const Quaternion<float> q{c(rng) * 1e3f, c(rng) * 1e3f, c(rng) * 1e3f, c(rng) * 1e3f};
    const CompensatedAccumulation::State<float> s = CompensatedAccumulation::start(q);
    ExactRenormalization exact;
    const Quaternion<float> kept = exact.apply(CompensatedAccumulation::attitude(s));
    const CompensatedAccumulation::State<float> r = CompensatedAccumulation::with_attitude(s, kept);
    const Quaternion<L> after = test::widen(r.hi) + test::widen(r.lo);
    CHECK(std::fabs(std::sqrt(squared_norm(after)) - 1) <= 8 * u_float);
    CHECK(angle_between(test::widen(q), after) <= 8 * u_float);
  }
}

namespace {

template <class T>
bool same_bits(T a, T b) {
  return std::memcmp(&a, &b, sizeof(T)) == 0;
}
template <class T>
bool same_bits(const CompensatedAccumulation::State<T>& a,
               const CompensatedAccumulation::State<T>& b) {
  const std::array<T, 8> x{a.hi.w, a.hi.x, a.hi.y, a.hi.z, a.lo.w, a.lo.x, a.lo.y, a.lo.z};
  const std::array<T, 8> y{b.hi.w, b.hi.x, b.hi.y, b.hi.z, b.lo.w, b.lo.x, b.lo.y, b.lo.z};
  for (std::size_t i = 0; i < 8; ++i) {
    if (!same_bits(x[i], y[i])) {
      return false;
    }
  }
  return true;
}
template <class T>
bool finite_state(const CompensatedAccumulation::State<T>& s) {
  return is_finite(s.hi) && is_finite(s.lo);
}

}  // namespace

TEMPLATE_TEST_CASE("the branch-free read-back is with_attitude bit for bit", "", float, double) {
  // with_attitude_branch_free (for vectorized loops) against with_attitude on: pairs built by
  // steps of random size from random attitudes of random scale, read back from each
  // renormalization policy's result and from multiples f·a with f near 1, at the 2⁻¹⁰ boundary
  // and far from 1, and from unrelated quaternions; signed zeros; and non-finite inputs, where
  // both must give a non-finite state.
  using T = TestType;
  using C = CompensatedAccumulation;
  test::RandomRotations random(17);
  std::mt19937 rng(19);
  std::uniform_real_distribution<T> unit(T(-1), T(1));
  const std::array<T, 12> factors{T(1),
                                  T(1) + std::numeric_limits<T>::epsilon(),
                                  T(1) - std::numeric_limits<T>::epsilon(),
                                  T(1) + T(1.0 / 1024),
                                  T(1) - T(1.0 / 1024),
                                  T(1) + T(1.0 / 512),
                                  T(1) - T(1.0 / 512),
                                  T(0.5),
                                  T(2),
                                  T(1e3),
                                  T(1e-3),
                                  T(0.9)};
  int compared = 0;
  bool identical = true;
  for (int i = 0; i < 2000; ++i) {
    const T scale = std::pow(T(10), T(3) * unit(rng));
    C::State<T> s = C::start(scale * random.quaternion<T>());
    for (int k = 0; k < 3; ++k) {
      const Vector3<T> phi =
          random.unit_vector<T>() * std::pow(T(10), T(-4) * std::fabs(unit(rng)));
      s = C::advanced(s, quaternion_exp_minus_one(phi));
    }
    const Quaternion<T> a = C::attitude(s);
    std::vector<Quaternion<T>> kept{FirstOrderRenormalization{}.apply(a),
                                    ExactRenormalization{}.apply(a), NoRenormalization{}.apply(a),
                                    Quaternion<T>{unit(rng), unit(rng), unit(rng), unit(rng)}};
    for (const T f : factors) {
      kept.push_back(f * a);
    }
    for (const Quaternion<T>& k : kept) {
      identical =
          identical && same_bits(C::with_attitude_branch_free(s, k), C::with_attitude(s, k));
      ++compared;
    }
  }
  // Exactly representable components, so that f·a is exact and κ lands on ±2⁻¹⁰ (near-unit
  // path, ≤) or just beyond it; equal magnitudes; signed zeros.
  const std::array<Quaternion<T>, 5> exact{Quaternion<T>{T(0.5), T(0.25), T(-0.125), T(0.0625)},
                                           Quaternion<T>{T(-0.25), T(0.5), T(-0.5), T(0.125)},
                                           Quaternion<T>{T(0.5), T(-0.5), T(0.5), T(-0.5)},
                                           Quaternion<T>{-T(0), T(0), T(-0.75), T(0.75)},
                                           Quaternion<T>{T(0), T(0), T(0), T(1)}};
  for (const Quaternion<T>& q : exact) {
    const C::State<T> s = C::start(q);
    for (const T f : factors) {
      identical = identical &&
                  same_bits(C::with_attitude_branch_free(s, f * q), C::with_attitude(s, f * q));
      ++compared;
    }
  }
  INFO(compared << " read-backs compared");
  CHECK(identical);
  // The boundary itself is on the near-unit side in both: κ = 2⁻¹⁰ exactly adds κ·q_hi.
  const C::State<T> s = C::start(exact[0]);
  const T f = T(1) + T(1.0 / 1024);
  CHECK(same_bits(C::with_attitude_branch_free(s, f * exact[0]), C::scaled(s, T(1.0 / 1024))));

  // Non-finite attitude or kept: both results are not finite.
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const T inf = std::numeric_limits<T>::infinity();
  const std::array<Quaternion<T>, 4> bad{
      Quaternion<T>{nan, T(0.5), T(0.5), T(0.5)}, Quaternion<T>{T(0.5), inf, T(0.5), T(0.5)},
      Quaternion<T>{T(0.5), T(0.5), -inf, inf}, Quaternion<T>{T(0), T(0), T(0), T(0)}};
  for (const Quaternion<T>& q : bad) {
    const C::State<T> state = C::start(q);
    for (const Quaternion<T>& k : {q, FirstOrderRenormalization{}.apply(q), exact[0]}) {
      CHECK(!finite_state(C::with_attitude(state, k)));
      CHECK(!finite_state(C::with_attitude_branch_free(state, k)));
    }
  }
}

namespace {
// A policy of a user's own with only `apply` (the exact form): the compensated propagator reads
// its factor back from the result.
struct ApplyOnlyRenormalization {
  template <class T>
  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    return normalized(q);
  }
};
}  // namespace

// Which path the propagator takes (stepper_traits.hpp, renormalizes_by_scaling).
static_assert(
    renormalizes_by_scaling<CompensatedAccumulation, FirstOrderRenormalization, float>::value,
    "compensated + first order: by the policy's scale");
static_assert(renormalizes_by_scaling<CompensatedAccumulation,
                                      PeriodicRenormalization<ExactRenormalization>, float>::value,
              "the wrappers pass their inner policy's scale on");
static_assert(!renormalizes_by_scaling<PlainAccumulation, FirstOrderRenormalization, float>::value,
              "the plain accumulation keeps the policy's result");
static_assert(
    !renormalizes_by_scaling<CompensatedAccumulation, ApplyOnlyRenormalization, float>::value,
    "a policy without scaling: the factor is read back");
static_assert(
    !renormalizes_by_scaling<CompensatedAccumulation,
                             PeriodicRenormalization<ApplyOnlyRenormalization>, float>::value,
    "nor with a wrapper around it");

TEST_CASE("a policy with only apply: the compensated propagator reads its factor back") {
  // The read-back path (with_attitude) and the scaling path (with_scaling, ExactRenormalization)
  // apply the same factor to rounding: after 10⁵ steps of a tumbling rotation both are within the
  // compensated bound of the truth and within a few u of each other's norm.
  const int steps = 100000;
  const float dt = 1e-3f;
  const Vector3<float> rate{0.3f, -0.2f, 0.5f};
  const Quaternion<float> start =
      test::narrow<float>(normalized(Quaternion<L>{0.9L, 0.2L, -0.3L, 0.1L}));
  const GyroLimits<float> limits{35.0f, 0.01f};
  Propagator<float, ExponentialMapHoldEnd, ApplyOnlyRenormalization, CompensatedAccumulation>
      read_back(start, limits);
  Propagator<float, ExponentialMapHoldEnd, ExactRenormalization, CompensatedAccumulation> scaling(
      start, limits);
  for (int k = 0; k < steps; ++k) {
    REQUIRE(read_back.push(rate, dt) == Status::ok);
    REQUIRE(scaling.push(rate, dt) == Status::ok);
  }
  const L theta = std::sqrt(squared_norm(test::widen(rate))) * static_cast<L>(dt);
  const Quaternion<L> truth =
      test::widen(start) * quaternion_exp(test::widen(rate) * (static_cast<L>(dt) * steps));
  // The increment's own rounding (hold-end exponential: a few u·θ per step) and the
  // accumulation's c1·u·θ + c2·u² per step.
  const L bound = (CompensatedAccumulation::rounding_c1 + 4) * u_float * theta * steps +
                  steps * CompensatedAccumulation::rounding_c2 * u_float * u_float;
  const L e_read_back = angle_between(test::widen(read_back.attitude()), truth);
  const L e_scaling = angle_between(test::widen(scaling.attitude()), truth);
  INFO("read-back " << static_cast<double>(e_read_back) << " rad, scaling "
                    << static_cast<double>(e_scaling) << " rad, bound "
                    << static_cast<double>(bound) << " rad");
  CHECK(e_read_back <= bound);
  CHECK(e_scaling <= bound);
  CHECK(std::fabs(test::norm_ld(read_back.attitude()) - 1) <= 6 * u_float);
  CHECK(std::fabs(test::norm_ld(scaling.attitude()) - 1) <= 6 * u_float);
}
