// Rotation vector and axis–angle conversions: round trips and the conventions at 0 and π.
#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/representations/axis_angle.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "halfspin/representations/rotation_vector.hpp"
#include "test_support.hpp"

using namespace halfspin;

TEMPLATE_TEST_CASE("rotation vector round trips", "[representations]", float, double) {
  using T = TestType;
  test::RandomRotations rng(61);
  long double worst_q = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const Vector3<T> phi = to_rotation_vector(q);
    REQUIRE(norm(phi) <= pi<T> * (T(1) + 4 * std::numeric_limits<T>::epsilon()));
    worst_q = std::fmax(worst_q, test::quaternion_error_eps(quaternion_from_rotation_vector(phi), q));
  }
  REQUIRE(worst_q <= 4);
}

TEMPLATE_TEST_CASE("axis–angle round trips and conventions", "[representations]", float, double) {
  using T = TestType;
  test::RandomRotations rng(62);
  long double worst_q = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const AxisAngle<T> a = to_axis_angle(q);
    REQUIRE(a.angle >= T(0));
    REQUIRE(a.angle <= pi<T>);
    REQUIRE(std::fabs(norm(a.axis) - T(1)) <= 4 * std::numeric_limits<T>::epsilon());
    worst_q = std::fmax(worst_q, test::quaternion_error_eps(quaternion_from_axis_angle(a), q));
  }
  REQUIRE(worst_q <= 4);
  const AxisAngle<T> id = to_axis_angle(Quaternion<T>::identity());
  REQUIRE(id.angle == T(0));
  REQUIRE(id.axis == Vector3<T>{1, 0, 0});
  // Half turn about −y: the shortest form is π about ±y; either sign of the axis is one rotation.
  const AxisAngle<T> half = to_axis_angle(Quaternion<T>{0, 0, -1, 0});
  REQUIRE(half.angle == pi<T>);
  REQUIRE(std::fabs(half.axis.y) == T(1));
  // Angle + 2π gives −q.
  const AxisAngle<T> a{Vector3<T>{0, 0, 1}, T(0.5)};
  const AxisAngle<T> b{Vector3<T>{0, 0, 1}, T(0.5) + T(2) * pi<T>};
  REQUIRE(test::quaternion_error_eps(quaternion_from_axis_angle(b), -quaternion_from_axis_angle(a)) <=
          8);
  REQUIRE(quaternion_from_axis_angle(b).w < T(0));
}

TEMPLATE_TEST_CASE("axis–angle agrees with Rodrigues' rotation formula",
                   "[representations][reference]", float, double) {
  using T = TestType;
  // Rodrigues' formula R = I + sin θ [n×] + (1 − cos θ)[n×]² (common practice, no source).
  test::RandomRotations rng(63);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const Vector3<T> axis = rng.unit_vector<T>();
    const T angle = rng.uniform<T>(T(-4), T(4));
    const Matrix3<T> k = cross_matrix(axis);
    const Matrix3<T> k2 = k * k;
    Matrix3<T> expect = Matrix3<T>::identity();
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        expect(i, j) += std::sin(angle) * k(i, j) + (T(1) - std::cos(angle)) * k2(i, j);
      }
    }
    worst = std::fmax(worst, test::matrix_error_eps(
                                 to_rotation_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, angle})),
                                 expect));
  }
  REQUIRE(worst <= 16);
}
