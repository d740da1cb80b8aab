// The commutator-free family (propagation/commutator_free_family.hpp, its bound in
// bounds/commutator_free_bounds.hpp): the product's expansion that the derived order and the bound
// rest on, against the Baker–Campbell–Hausdorff series; the derived order against the observed one
// on rules built to satisfy or violate each order condition; and each member's own checks.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <random>
#include <vector>

#include "fixed_step_drivers.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/propagation/commutator_free_4.hpp"
#include "halfspin/propagation/commutator_free_family.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/two_gimbal.hpp"
#include "test_support.hpp"

using namespace halfspin;
using test::fitted_order;
using test::global_error;

namespace {

using L = long double;

// Rules of the family made for these tests (not library steppers).
namespace rules {
// One exponential of the mean of the two end rates: the exponential-map midpoint-mean step.
struct OneExponential {
  static constexpr CommutatorFreeRule<2, 1> value{SampleLayout::rates_spanning, {{{{1, 1}}}}, 2};
};
// Half a step on each end rate: trapezoidal quadrature, but ½φ₁×φ₂ has 1/8, not 1/12, on ω×ω̇.
struct NaiveSplit {
  static constexpr CommutatorFreeRule<2, 2> value{
      SampleLayout::rates_spanning, {{{{1, 0}}, {{0, 1}}}}, 2};
};
// Simpson's quadrature and the right second-order term, but factors of unequal weight (2/3 and
// 1/3): the third-order term keeps an h⁴ part, order 3.
struct UnequalFactors {
  static constexpr CommutatorFreeRule<3, 2> value{
      SampleLayout::rates_spanning, {{{{4, 4, 0}}, {{-2, 4, 2}}}}, 12};
};
}  // namespace rules

template <class Rule>
struct TestStepper : CommutatorFreeStepper<Rule> {
  static constexpr const char* name = "test_rule";
};

// The rotation vector of exp(φ₁/2) ⊗ exp(φ₂/2) ⊗ … (long double).
template <std::size_t E>
Vector3<L> product_rotation_vector(const std::array<Vector3<L>, E>& phi) {
  Quaternion<L> p = Quaternion<L>::identity();
  for (const Vector3<L>& f : phi) {
    p = p * quaternion_exp(f);
  }
  return quaternion_log(p);
}

// The family's expansion through third order: Σφ + ½Σ_{j<k}φ_j×φ_k + T3,
// T3 = Σ_k [½B_k×φ_k + (1/12)(S_k − φ_k)×(S_k×φ_k)].
template <std::size_t E>
Vector3<L> third_order_expansion(const std::array<Vector3<L>, E>& phi) {
  Vector3<L> sum = Vector3<L>::zero();
  Vector3<L> b = Vector3<L>::zero();  // B_k
  Vector3<L> second = Vector3<L>::zero();
  Vector3<L> third = Vector3<L>::zero();
  for (std::size_t k = 0; k < E; ++k) {
    const Vector3<L> sk_cross = cross(sum, phi[k]);
    third += 0.5L * cross(b, phi[k]) + (1.0L / 12) * cross(sum - phi[k], sk_cross);
    second += 0.5L * sk_cross;
    b += 0.5L * sk_cross;
    sum += phi[k];
  }
  return sum + second + third;
}

template <std::size_t E>
L expansion_residual(const std::array<Vector3<L>, E>& phi, L scale) {
  std::array<Vector3<L>, E> scaled{};
  for (std::size_t k = 0; k < E; ++k) {
    scaled[k] = scale * phi[k];
  }
  return norm(product_rotation_vector(scaled) - third_order_expansion(scaled));
}

template <std::size_t E>
void check_expansion_is_third_order() {
  std::mt19937 rng(20261203);
  std::uniform_real_distribution<long double> u(-1.0L, 1.0L);
  for (int trial = 0; trial < 20; ++trial) {
    std::array<Vector3<L>, E> phi{};
    for (Vector3<L>& f : phi) {
      f = Vector3<L>{u(rng), u(rng), u(rng)};
    }
    // The residual is O(|φ|⁴): halving every factor divides it by about 16.
    const L coarse = expansion_residual(phi, 0.01L);
    const L fine = expansion_residual(phi, 0.005L);
    INFO("trial " << trial << ": residual " << coarse << " then " << fine);
    CHECK(coarse / fine > 15.0L);
    CHECK(coarse / fine < 17.0L);
  }
}

template <class Stepper>
L observed_order_on_two_gimbals() {
  const TwoGimbalMotion<L> motion{};
  const std::vector<int> steps{32, 64, 128, 256};
  std::vector<L> error;
  for (int n : steps) {
    error.push_back(global_error<Stepper, double>(motion, 1.0L, n).angle);
  }
  return fitted_order(steps, error);
}

}  // namespace

TEST_CASE("the product of exponentials agrees with the family's third-order expansion to O(|φ|⁴)",
          "[reference]") {
  // Source: the Baker–Campbell–Hausdorff series Z = X + Y + ½[X, Y] + (1/12)([X, [X, Y]] +
  // [Y, [Y, X]]) + … (from memory), with [a, b] ↔ a × b for rotation vectors; for E = 2 the
  // family's T3 is exactly this third-order term, for E = 3 its composition.
  check_expansion_is_third_order<2>();
  check_expansion_is_third_order<3>();
}

TEST_CASE("a one-exponential rule is the exponential-map midpoint step, bit for bit") {
  using One = TestStepper<rules::OneExponential>;
  STATIC_REQUIRE(One::order == 2);
  const std::array<Vector3<float>, 2> rate{{{0.3f, -1.2f, 2.1f}, {0.5f, -1.0f, 1.7f}}};
  const Quaternion<float> q{0.5f, 0.5f, -0.5f, 0.5f};
  const Quaternion<float> a = One::step(q, rate, 0.01f);
  const Quaternion<float> b = ExponentialMapMidpointMean::step(q, rate, 0.01f);
  CHECK(a == b);
}

TEST_CASE("the derived order of a rule is the order it shows", "[order]") {
  using Naive = TestStepper<rules::NaiveSplit>;
  using Unequal = TestStepper<rules::UnequalFactors>;
  STATIC_REQUIRE(Naive::order == 2);
  STATIC_REQUIRE(Unequal::order == 3);
  STATIC_REQUIRE(detail::third_order_coefficient(rules::UnequalFactors::value).num != 0);
  CHECK(std::fabs(observed_order_on_two_gimbals<Naive>() - 2) <= 0.2L);
  CHECK(std::fabs(observed_order_on_two_gimbals<Unequal>() - 3) <= 0.2L);
}

TEST_CASE("the family's bound is safe for rules of every order, and 0 at constant rate") {
  using Naive = TestStepper<rules::NaiveSplit>;
  using Unequal = TestStepper<rules::UnequalFactors>;
  // An axisymmetric body (invented parameters): ω turns about body z at λ with |ω| constant, so
  // D0 = |ω| and D_k = ω⊥·|λ|ᵏ exactly (truth/axisymmetric_body.hpp).
  const AxisymmetricBodyMotion<L> body{
      normalized(Quaternion<L>{0.9L, 0.2L, -0.3L, 0.1L}), 1.0L, 1.6L, 0.8L, 0.3L, 1.5L};
  RateEnvelope<double> e{};
  const L lambda = std::fabs(body.body_turning_rate());
  L p = body.transverse_rate;
  e.derivative[0] = static_cast<double>(std::hypot(body.transverse_rate, body.axial_rate));
  for (std::size_t k = 1; k < 6; ++k) {
    p *= lambda;
    e.derivative[k] = static_cast<double>(p);
  }
  for (int n : {4, 16, 64, 256}) {
    const L h = 1.0L / n;
    // One step from the exact attitude against the bound of that step.
    const L naive = global_error<Naive, double>(body, h, 1).angle;
    const L unequal = global_error<Unequal, double>(body, h, 1).angle;
    INFO("h = " << static_cast<double>(h) << ": errors " << static_cast<double>(naive) << ", "
                << static_cast<double>(unequal));
    CHECK(test::ld(LocalErrorBound<Naive>::local(e, static_cast<double>(h))) >= naive);
    CHECK(test::ld(LocalErrorBound<Unequal>::local(e, static_cast<double>(h))) >= unequal);
  }
  const RateEnvelope<double> still = RateEnvelope<double>::constant_rate(2.0);
  CHECK(LocalErrorBound<Naive>::local(still, 0.01) == 0.0);
  CHECK(LocalErrorBound<Unequal>::local(still, 0.01) == 0.0);
}

// ---- commutator_free_4 (propagation/commutator_free_4.hpp) ------------------------------------

TEST_CASE("commutator_free_4 has the published fourth-order exponents", "[reference]") {
  // Source: Celledoni, Marthinsen and Owren 2003, the fourth-order commutator-free method: nodes
  // 0, ½, ½, 1; exponents ¼k₁ + ⅙k₂ + ⅙k₃ − 1/12·k₄, then −1/12·k₁ + ⅙k₂ + ⅙k₃ + ¼k₄ (from
  // memory). The attitude rate depends on time only, so k₂ = k₃ = ω(½) and the middle weights
  // add.
  constexpr std::array<std::array<L, 4>, 2> published{
      {{{0.25L, 1.0L / 6, 1.0L / 6, -1.0L / 12}}, {{-1.0L / 12, 1.0L / 6, 1.0L / 6, 0.25L}}}};
  constexpr auto& rule = commutator_free_rules::CommutatorFree4::value;
  STATIC_REQUIRE(rule.layout == SampleLayout::rates_spanning);
  for (std::size_t j = 0; j < 2; ++j) {
    const std::array<L, 3> merged{
        {published[j][0], published[j][1] + published[j][2], published[j][3]}};
    for (std::size_t i = 0; i < 3; ++i) {
      CHECK(static_cast<L>(rule.weights[j][i]) / rule.denominator ==
            Approx(static_cast<double>(merged[i])).epsilon(1e-15));
    }
  }
  STATIC_REQUIRE(CommutatorFree4::order == 4);
  STATIC_REQUIRE(detail::third_order_coefficient(rule).num == 0);
}

TEMPLATE_TEST_CASE("commutator_free_4 at constant rate is the exponential map", "", float, double) {
  using T = TestType;
  const Vector3<T> w{T(0.7), T(-1.1), T(0.4)};
  const Quaternion<T> q = normalized(Quaternion<T>{T(0.9), T(0.1), T(-0.3), T(0.2)});
  for (T dt : {T(0.001), T(0.01), T(0.1)}) {
    const std::array<Vector3<T>, 3> rate{{w, w, w}};
    const Quaternion<T> cf = CommutatorFree4::step(q, rate, dt);
    const Quaternion<T> exact = q * quaternion_exp(w * dt);
    // Two exponentials of the parallel halves: rounding only (a few ε).
    CHECK(test::quaternion_error_eps(cf, exact) <= 4);
  }
  CHECK(LocalErrorBound<CommutatorFree4>::local(RateEnvelope<T>::constant_rate(norm(w)), T(0.01)) ==
        T(0));
}

TEST_CASE("commutator_free_4 and magnus_4 agree to fifth order per step") {
  // Same samples, both fourth order: one step of each from the identity differs by O(h⁵)
  // (both reproduce the Magnus expansion through its second term); halving h divides the
  // difference by about 32.
  const TwoGimbalMotion<L> motion{};
  auto difference = [&](L h) {
    const std::array<Vector3<L>, 3> rate{
        {motion.rate(0.2L), motion.rate(0.2L + h / 2), motion.rate(0.2L + h)}};
    const Quaternion<L> one = Quaternion<L>::identity();
    return angle_between(CommutatorFree4::step(one, rate, h), Magnus4::step(one, rate, h));
  };
  const L coarse = difference(0.02L);
  const L fine = difference(0.01L);
  INFO("differences " << static_cast<double>(coarse) << ", " << static_cast<double>(fine));
  CHECK(coarse / fine > 24.0L);
  CHECK(coarse / fine < 40.0L);
}
