// Rotation vector and axis–angle conversions: round trips and the conventions at 0 and π.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <limits>
#include <string>

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
    worst_q =
        std::fmax(worst_q, test::quaternion_error_eps(quaternion_from_rotation_vector(phi), q));
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
  REQUIRE(test::quaternion_error_eps(quaternion_from_axis_angle(b),
                                     -quaternion_from_axis_angle(a)) <= 8);
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
    worst = std::fmax(
        worst,
        test::matrix_error_eps(
            to_rotation_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, angle})), expect));
  }
  REQUIRE(worst <= 16);
}

namespace {

// to_axis_angle(q) against its definition evaluated in long double — axis v/|v|, angle
// 2·atan2(|v|, w) for w ≥ 0 — where every float and double input is exact and |v|² cannot under-
// or overflow (x87 extended precision, exponent range ±16382). Errors: axis norm and components in
// ε of T, the angle in ulps of T at the reference (subnormal spacing for a subnormal angle).
struct AxisAngleErrors {
  long double axis_norm = 0;
  long double axis = 0;
  long double angle_ulps = 0;
  void add(const AxisAngleErrors& e) {
    axis_norm = std::fmax(axis_norm, e.axis_norm);
    axis = std::fmax(axis, e.axis);
    angle_ulps = std::fmax(angle_ulps, e.angle_ulps);
  }
};

template <class T>
AxisAngleErrors axis_angle_errors(const Quaternion<T>& q) {
  const AxisAngle<T> a = to_axis_angle(q);
  const Vector3<long double> v = test::widen(q.vector());
  const long double s = std::sqrt(v.x * v.x + v.y * v.y + v.z * v.z);
  const Vector3<long double> axis{v.x / s, v.y / s, v.z / s};
  const long double angle = 2 * std::atan2(s, test::ld(q.w));
  AxisAngleErrors e;
  e.axis_norm = std::fabs(test::length_ld(a.axis) - 1.0L) / test::eps<T>();
  e.axis = std::fmax(std::fabs(test::ld(a.axis.x) - axis.x),
                     std::fmax(std::fabs(test::ld(a.axis.y) - axis.y),
                               std::fabs(test::ld(a.axis.z) - axis.z))) /
           test::eps<T>();
  e.angle_ulps = test::ulp_error(a.angle, angle);
  return e;
}

}  // namespace

TEMPLATE_TEST_CASE("axis–angle: subnormal, tiny and huge vector parts",
                   "[representations][reference]", float, double) {
  // Reference: the definition of the conversion evaluated in long double (see axis_angle_errors).
  using T = TestType;
  const T d = std::numeric_limits<T>::denorm_min();
  const T lo = std::numeric_limits<T>::min();
  const T hi = std::numeric_limits<T>::max();
  AxisAngleErrors fixed;
  // Vector parts of a few subnormal units (a rotation angle of a few denorm_min), where the
  // division by a subnormal |v| gave a non-unit axis; with w itself subnormal (q not unit: the
  // conversion is scale-invariant); half turns; components at T's largest value (|v| overflows).
  const std::array<Quaternion<T>, 12> cases{Quaternion<T>{T(1), d, d, T(0)},
                                            Quaternion<T>{T(1), T(3) * d, -d, T(0)},
                                            Quaternion<T>{T(1), d, T(2) * d, T(2) * d},
                                            Quaternion<T>{T(1), T(0), T(0), d},
                                            Quaternion<T>{T(5) * d, T(3) * d, T(4) * d, T(0)},
                                            Quaternion<T>{T(0), d, d, d},
                                            Quaternion<T>{lo, d, T(0), T(0)},
                                            Quaternion<T>{T(1), lo, -lo, lo},
                                            Quaternion<T>{hi, hi, hi, hi},
                                            Quaternion<T>{T(0), hi, -hi / 2, hi / 3},
                                            Quaternion<T>{T(1), hi, hi, T(0)},
                                            Quaternion<T>{hi, T(1), T(0), T(0)}};
  for (const Quaternion<T>& q : cases) {
    const AxisAngleErrors e = axis_angle_errors(q);
    INFO("q = (" << static_cast<double>(q.w) << ", " << static_cast<double>(q.x) << ", "
                 << static_cast<double>(q.y) << ", " << static_cast<double>(q.z) << "): axis norm "
                 << static_cast<double>(e.axis_norm) << " ε, axis " << static_cast<double>(e.axis)
                 << " ε, angle " << static_cast<double>(e.angle_ulps) << " ulp");
    REQUIRE(e.axis_norm <= 3);
    REQUIRE(e.axis <= 3);
    REQUIRE(e.angle_ulps <= 4);
    fixed.add(e);
  }
  // Random directions, |v| log-uniform over the subnormal and tiny range (|v|² below T's smallest
  // normal) and over the huge one (|v|² above its largest), w = 1, comparable to |v|, or 0.
  test::RandomRotations rng(64);
  const long double sqrt_lo = std::sqrt(test::ld(lo));
  const long double sqrt_hi = std::sqrt(test::ld(hi));
  AxisAngleErrors random;
  for (int n = 0; n < test::property_samples; ++n) {
    const Vector3<long double> dir = rng.unit_vector<long double>();
    const bool huge = n % 2 == 1;
    const long double size = huge ? rng.log_uniform<long double>(sqrt_hi, test::ld(hi))
                                  : rng.log_uniform<long double>(64 * test::ld(d), sqrt_lo);
    const Vector3<T> v{static_cast<T>(size * dir.x), static_cast<T>(size * dir.y),
                       static_cast<T>(size * dir.z)};
    if (v == Vector3<T>::zero()) continue;
    const int kind = (n / 2) % 3;
    T w = T(0);  // kind 2: a half turn
    if (kind == 0) {
      w = T(1);
    } else if (kind == 1) {
      w = static_cast<T>(std::fmin(size * rng.uniform<long double>(0.1L, 10.0L), test::ld(hi)));
    }
    const AxisAngleErrors e = axis_angle_errors(Quaternion<T>::from_parts(w, v));
    random.add(e);
  }
  test::report_worst(std::string("axis-angle extreme axis norm [eps] ") + test::type_name<T>(),
                     std::fmax(fixed.axis_norm, random.axis_norm));
  test::report_worst(std::string("axis-angle extreme axis [eps] ") + test::type_name<T>(),
                     std::fmax(fixed.axis, random.axis));
  test::report_worst(std::string("axis-angle extreme angle [ulp] ") + test::type_name<T>(),
                     std::fmax(fixed.angle_ulps, random.angle_ulps));
  REQUIRE(random.axis_norm <= 3);
  REQUIRE(random.axis <= 3);
  REQUIRE(random.angle_ulps <= 4);
}
