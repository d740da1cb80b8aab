// Quaternion algebra: the Hamilton product, conjugate, inverse, normalization, rotation of vectors,
// the angle between attitudes and sign continuity.
#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/sign_continuity.hpp"
#include "test_support.hpp"

using namespace halfspin;

TEMPLATE_TEST_CASE("Hamilton multiplication table", "[core][reference]", float, double) {
  using T = TestType;
  // i² = j² = k² = ijk = −1 (Hamilton's rules; common practice, no source).
  const Quaternion<T> one{1, 0, 0, 0}, i{0, 1, 0, 0}, j{0, 0, 1, 0}, k{0, 0, 0, 1};
  REQUIRE(i * i == -one);
  REQUIRE(j * j == -one);
  REQUIRE(k * k == -one);
  REQUIRE(i * j * k == -one);
  REQUIRE(i * j == k);
  REQUIRE(j * k == i);
  REQUIRE(k * i == j);
  REQUIRE(j * i == -k);
  REQUIRE(one * i == i);
  REQUIRE(Quaternion<T>::identity() == one);
}

TEMPLATE_TEST_CASE("product is associative, conjugate reverses, inverse inverts", "[core]", float,
                   double) {
  using T = TestType;
  test::RandomRotations rng(21);
  long double worst_assoc = 0, worst_conj = 0, worst_inv = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto a = rng.quaternion<T>(), b = rng.quaternion<T>(), c = rng.quaternion<T>();
    worst_assoc = std::fmax(worst_assoc, test::quaternion_error_eps((a * b) * c, a * (b * c)));
    worst_conj = std::fmax(
        worst_conj, test::quaternion_error_eps(conjugate(a * b), conjugate(b) * conjugate(a)));
    const Quaternion<T> s = T(1.7) * a;  // non-unit on purpose
    worst_inv =
        std::fmax(worst_inv, test::quaternion_error_eps(s * inverse(s), Quaternion<T>::identity()));
  }
  REQUIRE(worst_assoc <= 4);
  REQUIRE(worst_conj <= 2);  // the two sides sum the same products in different orders
  REQUIRE(worst_inv <= 4);
}

TEMPLATE_TEST_CASE("normalized gives unit norm to within an ulp-level tolerance", "[core]", float,
                   double) {
  using T = TestType;
  test::RandomRotations rng(22);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T scale = rng.log_uniform<T>(T(1e-6), T(1e6));
    const Quaternion<T> q = normalized(scale * rng.quaternion<T>());
    worst = std::fmax(worst, std::fabs(test::norm_ld(q) - 1.0L) / test::eps<T>());
  }
  REQUIRE(worst <= 2);
}

TEMPLATE_TEST_CASE("rotate equals q ⊗ (0, v) ⊗ q* and preserves length", "[core][reference]", float,
                   double) {
  using T = TestType;
  // The rotation formula v' = q v q* for unit q (common practice, no source).
  test::RandomRotations rng(23);
  long double worst = 0, worst_len = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const auto v = rng.unit_vector<T>();
    const Quaternion<T> p = q * Quaternion<T>::from_parts(T(0), v) * conjugate(q);
    const Vector3<T> r = rotate(q, v);
    worst = std::fmax(worst, test::vector_error_eps(r, p.vector()));
    const long double len = test::length_ld(r);
    worst_len = std::fmax(worst_len, std::fabs(len - 1.0L) / test::eps<T>());
  }
  REQUIRE(worst <= 8);
  REQUIRE(worst_len <= 8);
}

TEMPLATE_TEST_CASE("rotating by a quarter turn about z takes x to y", "[core][reference]", float,
                   double) {
  using T = TestType;
  // Right-handed rotation by +90° about z maps e_x to e_y (common practice, no source).
  const T h = std::sqrt(T(0.5));
  const Quaternion<T> qz{h, 0, 0, h};
  const Vector3<T> r = rotate(qz, Vector3<T>{1, 0, 0});
  REQUIRE(std::fabs(r.x) <= 2 * std::numeric_limits<T>::epsilon());
  REQUIRE(std::fabs(r.y - T(1)) <= 2 * std::numeric_limits<T>::epsilon());
  REQUIRE(r.z == T(0));
}

TEMPLATE_TEST_CASE("angle_between is sign-insensitive and accurate for tiny angles", "[core]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(24);
  long double worst_rel = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto a = rng.quaternion<T>();
    const auto axis = rng.unit_vector<T>();
    const T angle = rng.log_uniform<T>(T(1e-20), T(3.1));
    const auto b = a * quaternion_exp(angle * axis);
    const T got = angle_between(a, b);
    REQUIRE(angle_between(a, -b) == got);
    REQUIRE(angle_between(-a, b) == got);
    REQUIRE(std::fabs(angle_between(b, a) - got) <= 4 * std::numeric_limits<T>::epsilon());
    // The composed b carries rounding of order ε in each component, so the angle is known to about
    // 2ε absolutely; for angles above 1e-3 compare relatively.
    const long double err =
        std::fabs(static_cast<long double>(got) - static_cast<long double>(angle));
    worst_rel = std::fmax(worst_rel, err / (test::eps<T>() * std::fmax(1.0L, angle)));
  }
  REQUIRE(worst_rel <= 8);
  REQUIRE(angle_between(Quaternion<T>::identity(), Quaternion<T>::identity()) == T(0));
}

TEMPLATE_TEST_CASE("nearest_sign and with_nonnegative_scalar pick the hemisphere", "[core]", float,
                   double) {
  using T = TestType;
  const Quaternion<T> prev{T(0.6), T(0.8), 0, 0};
  const Quaternion<T> q{T(-0.6), T(-0.79), T(0.1), 0};
  REQUIRE(nearest_sign(q, prev) == -q);
  REQUIRE(nearest_sign(-q, prev) == -q);
  REQUIRE(with_nonnegative_scalar(q) == -q);
  REQUIRE(with_nonnegative_scalar(prev) == prev);
  // A sequence that crosses w = 0 keeps a continuous sign.
  Quaternion<T> last = Quaternion<T>::identity();
  for (int n = 0; n <= 40; ++n) {
    const T angle = T(0.25) * static_cast<T>(n);  // up to 10 rad: past 2π
    const Quaternion<T> raw = with_nonnegative_scalar(quaternion_exp(Vector3<T>{0, 0, angle}));
    const Quaternion<T> cont = nearest_sign(raw, last);
    REQUIRE(dot(cont, last) > T(0.9));
    last = cont;
  }
}
