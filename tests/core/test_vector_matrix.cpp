// Vector3 and Matrix3 basics.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>

#include "halfspin/core/matrix3.hpp"
#include "halfspin/core/vector3.hpp"
#include "test_support.hpp"

using namespace halfspin;

TEMPLATE_TEST_CASE("cross product follows the right-hand rule and is orthogonal",
                   "[core][reference]", float, double) {
  using T = TestType;
  // e_x × e_y = e_z (right-handed axes: common practice, no source).
  const Vector3<T> ex{1, 0, 0}, ey{0, 1, 0}, ez{0, 0, 1};
  REQUIRE(cross(ex, ey) == ez);
  REQUIRE(cross(ey, ez) == ex);
  REQUIRE(cross(ez, ex) == ey);
  REQUIRE(cross(ey, ex) == -ez);
  test::RandomRotations rng(11);
  for (int i = 0; i < 1000; ++i) {
    const Vector3<T> a = rng.unit_vector<T>(), b = rng.unit_vector<T>();
    const Vector3<T> c = cross(a, b);
    REQUIRE(std::fabs(dot(a, c)) <= T(4) * std::numeric_limits<T>::epsilon());
    REQUIRE(std::fabs(dot(b, c)) <= T(4) * std::numeric_limits<T>::epsilon());
  }
}

TEMPLATE_TEST_CASE("norm survives components near the overflow and underflow limits", "[core]",
                   float, double) {
  using T = TestType;
  const T big = std::numeric_limits<T>::max() / T(4);
  const Vector3<T> v{big, big, T(0)};
  REQUIRE(std::isfinite(norm(v)));
  REQUIRE(norm(v) == Approx(big * std::sqrt(T(2))).epsilon(4 * std::numeric_limits<T>::epsilon()));
  const T tiny = std::numeric_limits<T>::denorm_min() * T(8);
  const Vector3<T> u{tiny, T(0), T(0)};
  REQUIRE(norm(u) == tiny);
  REQUIRE(norm(Vector3<T>::zero()) == T(0));
  REQUIRE(norm(Vector3<T>{T(3), T(4), T(12)}) == T(13));
}

TEMPLATE_TEST_CASE("normalized is unit for subnormal and near-overflow vectors",
                   "[core][reference]", float, double) {
  // Reference: a/|a| evaluated in long double (x87 extended precision, whose exponent range holds
  // the squares of every float and double), the definition of the direction.
  using T = TestType;
  const T d = std::numeric_limits<T>::denorm_min();
  const T hi = std::numeric_limits<T>::max();
  const T lo = std::numeric_limits<T>::min();
  for (const Vector3<T>& a :
       {Vector3<T>{d, d, T(0)}, Vector3<T>{T(3) * d, -d, T(5) * d}, Vector3<T>{T(0), T(0), -d},
        Vector3<T>{lo, T(2) * lo, -lo}, Vector3<T>{hi, hi, hi}, Vector3<T>{hi, -hi / 3, d},
        Vector3<T>{T(3), T(4), T(12)}}) {
    const Vector3<T> n = normalized(a);
    const long double length = test::length_ld(a);
    const Vector3<T> expect{static_cast<T>(test::ld(a.x) / length),
                            static_cast<T>(test::ld(a.y) / length),
                            static_cast<T>(test::ld(a.z) / length)};
    INFO("a = (" << static_cast<double>(a.x) << ", " << static_cast<double>(a.y) << ", "
                 << static_cast<double>(a.z) << ")");
    REQUIRE(std::fabs(test::length_ld(n) - 1.0L) <= 2 * test::eps<T>());
    REQUIRE(test::vector_error_eps(n, expect) <= 1);
  }
}

TEMPLATE_TEST_CASE("matrix product, transpose, determinant and cross matrix", "[core]", float,
                   double) {
  using T = TestType;
  const Matrix3<T> a{{{T(1), T(2), T(3)}, {T(0), T(1), T(4)}, {T(5), T(6), T(0)}}};
  REQUIRE(determinant(a) == T(1));
  const Matrix3<T> i = Matrix3<T>::identity();
  const Matrix3<T> ai = a * i;
  const Matrix3<T> at = transpose(a);
  for (std::size_t r = 0; r < 3; ++r) {
    for (std::size_t c = 0; c < 3; ++c) {
      REQUIRE(ai(r, c) == a(r, c));
      REQUIRE(at(r, c) == a(c, r));
    }
  }
  // The inverse of a worked by hand: [[-24, 18, 5], [20, -15, -4], [-5, 4, 1]].
  const Matrix3<T> inv{{{T(-24), T(18), T(5)}, {T(20), T(-15), T(-4)}, {T(-5), T(4), T(1)}}};
  const Matrix3<T> p = a * inv;
  for (std::size_t r = 0; r < 3; ++r) {
    for (std::size_t c = 0; c < 3; ++c) {
      REQUIRE(p(r, c) == (r == c ? T(1) : T(0)));
    }
  }
  const Vector3<T> v{T(1), T(-2), T(0.5)}, u{T(-3), T(0.25), T(2)};
  REQUIRE(cross_matrix(v) * u == cross(v, u));
  REQUIRE(a * Vector3<T>{T(1), T(1), T(1)} == Vector3<T>{T(6), T(5), T(11)});
  REQUIRE(a.row(2) == Vector3<T>{T(5), T(6), T(0)});
  REQUIRE(a.column(2) == Vector3<T>{T(3), T(4), T(0)});
}
