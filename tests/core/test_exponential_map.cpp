// The exponential and logarithm maps: ulp-level accuracy near zero angle (series branch and
// trigonometric branch, and across the switch between them), correctness near π, denormal sizes,
// and the double cover (a 2π turn is −1).
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// exp(φ/2) evaluated in long double from the T-valued input: the reference for ulp errors.
template <class T>
Quaternion<long double> reference_exp(const Vector3<T>& phi) {
  const long double x = test::ld(phi.x), y = test::ld(phi.y), z = test::ld(phi.z);
  const long double t = x * x + y * y + z * z;
  long double c, s;
  if (t < 1e-12L) {  // long double series: truncation below 1e-36 relative
    c = 1.0L + t * (-1.0L / 8 + t * (1.0L / 384 - t / 46080));
    s = 0.5L + t * (-1.0L / 48 + t * (1.0L / 3840 - t / 645120));
  } else {
    const long double a = std::sqrt(t);
    c = std::cos(a / 2);
    s = std::sin(a / 2) / a;
  }
  return {c, s * x, s * y, s * z};
}

// log in long double of the T-valued quaternion (shortest rotation).
template <class T>
Vector3<long double> reference_log(const Quaternion<T>& q) {
  long double w = test::ld(q.w), x = test::ld(q.x), y = test::ld(q.y), z = test::ld(q.z);
  if (w < 0) {
    w = -w;
    x = -x;
    y = -y;
    z = -z;
  }
  const long double s2 = x * x + y * y + z * z;
  long double f;
  if (s2 < 1e-12L * w * w) {
    const long double r2 = s2 / (w * w);
    f = (2.0L / w) * (1.0L + r2 * (-1.0L / 3 + r2 * (1.0L / 5 - r2 / 7)));
  } else {
    const long double s = std::sqrt(s2);
    f = 2.0L * std::atan2(s, w) / s;
  }
  return {f * x, f * y, f * z};
}

template <class T>
long double worst_component_ulps(const Quaternion<T>& q, const Quaternion<long double>& r) {
  return std::fmax(std::fmax(test::ulp_error(q.w, r.w), test::ulp_error(q.x, r.x)),
                   std::fmax(test::ulp_error(q.y, r.y), test::ulp_error(q.z, r.z)));
}

template <class T>
long double worst_component_ulps(const Vector3<T>& v, const Vector3<long double>& r) {
  return std::fmax(test::ulp_error(v.x, r.x),
                   std::fmax(test::ulp_error(v.y, r.y), test::ulp_error(v.z, r.z)));
}

}  // namespace

TEMPLATE_TEST_CASE("quaternion_exp is accurate to a few ulp per component for angles up to 1 rad",
                   "[core]", float, double) {
  using T = TestType;
  test::RandomRotations rng(31);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T angle = rng.log_uniform<T>(T(1e-30), T(1));
    const Vector3<T> phi = angle * rng.unit_vector<T>();
    worst = std::fmax(worst, worst_component_ulps(quaternion_exp(phi), reference_exp(phi)));
  }
  REQUIRE(worst <= 3);
}

TEMPLATE_TEST_CASE("below the threshold (no libm call) quaternion_exp is within 2 ulp", "[core]",
                   float, double) {
  // The small-angle kernel of a gyro step: series only, no sin/cos/sqrt.
  using T = TestType;
  test::RandomRotations rng(36);
  const T edge = std::sqrt(ScalarTraits<T>::exp_series_angle_squared);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T angle = rng.log_uniform<T>(T(1e-30), edge * T(0.999));
    const Vector3<T> phi = angle * rng.unit_vector<T>();
    worst = std::fmax(worst, worst_component_ulps(quaternion_exp(phi), reference_exp(phi)));
  }
  test::report_worst(std::string("exp series branch [ulp] ") + test::type_name<T>(), worst);
  REQUIRE(worst <= 2);
}

TEMPLATE_TEST_CASE("quaternion_exp is continuous across the series threshold", "[core]", float,
                   double) {
  using T = TestType;
  test::RandomRotations rng(32);
  const T edge = std::sqrt(ScalarTraits<T>::exp_series_angle_squared);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T angle = edge * rng.uniform<T>(T(0.999), T(1.001));
    const Vector3<T> phi = angle * rng.unit_vector<T>();
    worst = std::fmax(worst, worst_component_ulps(quaternion_exp(phi), reference_exp(phi)));
  }
  REQUIRE(worst <= 3);
}

TEMPLATE_TEST_CASE("quaternion_log is accurate to a few ulp per component for angles up to 1 rad",
                   "[core]", float, double) {
  using T = TestType;
  test::RandomRotations rng(33);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T angle = rng.log_uniform<T>(T(1e-30), T(1));
    const Quaternion<T> q = quaternion_exp(angle * rng.unit_vector<T>());
    worst = std::fmax(worst, worst_component_ulps(quaternion_log(q), reference_log(q)));
  }
  REQUIRE(worst <= 4);
}

TEMPLATE_TEST_CASE("log inverts exp for every angle below π, and near π", "[core]", float, double) {
  using T = TestType;
  test::RandomRotations rng(34);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const T angle = rng.uniform<T>(T(0), pi<T> * T(0.9999));
    const Vector3<T> phi = angle * rng.unit_vector<T>();
    const Vector3<T> back = quaternion_log(quaternion_exp(phi));
    worst = std::fmax(worst, test::vector_error_eps(back, phi));
  }
  REQUIRE(worst <= 8);
  // Within 1e-6 rad of π on either side: the rounded φ may land just past π, where the shortest
  // rotation vector flips to the opposite axis; so compare angles and rotations, not vectors.
  long double worst_angle = 0, worst_rotation = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const Vector3<T> axis = rng.unit_vector<T>();
    const T angle = pi<T> + rng.uniform<T>(T(-1e-6), T(1e-6));
    const Vector3<T> phi = angle * axis;
    const Vector3<T> back = quaternion_log(quaternion_exp(phi));
    const long double exact = test::length_ld(phi);
    const long double shortest =
        std::fmin(exact, 2 * 3.141592653589793238462643383279502884L - exact);
    worst_angle = std::fmax(
        worst_angle, std::fabs(static_cast<long double>(norm(back)) - shortest) / test::eps<T>());
    worst_rotation = std::fmax(
        worst_rotation, test::quaternion_error_eps(quaternion_exp(back), quaternion_exp(phi)));
  }
  REQUIRE(worst_angle <= 16);  // ε units; the angle is near π, so this is 8 ulp of π
  REQUIRE(worst_rotation <= 4);
}

TEMPLATE_TEST_CASE("log returns the shortest rotation for either sign and past π", "[core]", float,
                   double) {
  using T = TestType;
  const Vector3<T> axis{0, 0, 1};
  // A 3π/2 turn about +z is the same rotation as a π/2 turn about −z.
  const Vector3<T> phi = quaternion_log(quaternion_exp(T(1.5) * pi<T> * axis));
  REQUIRE(
      phi.z ==
      Approx(static_cast<double>(-pi<T> / T(2))).epsilon(8 * std::numeric_limits<T>::epsilon()));
  const Quaternion<T> q = quaternion_exp(Vector3<T>{T(0.3), T(-0.2), T(0.1)});
  REQUIRE(quaternion_log(-q) == quaternion_log(q));
  // Scale invariance: log of a non-unit multiple gives the same vector to rounding.
  REQUIRE(test::vector_error_eps(quaternion_log(T(3) * q), quaternion_log(q)) <= 4);
  REQUIRE(quaternion_log(Quaternion<T>::identity()) == Vector3<T>::zero());
}

TEMPLATE_TEST_CASE("a 2π turn is −1 and a 4π turn is +1 in the quaternion double cover",
                   "[core][reference]", float, double) {
  using T = TestType;
  // Facts of the trade (common practice, no source): exp(2π n/2) = −1, exp(4π n/2) = +1.
  test::RandomRotations rng(35);
  for (int n = 0; n < 100; ++n) {
    const Vector3<T> axis = rng.unit_vector<T>();
    const Quaternion<T> half = quaternion_exp(T(2) * pi<T> * axis);
    const Quaternion<T> full = quaternion_exp(T(4) * pi<T> * axis);
    REQUIRE(test::quaternion_error_eps(half, -Quaternion<T>::identity()) <= 8);
    REQUIRE(half.w < T(0));
    REQUIRE(test::quaternion_error_eps(full, Quaternion<T>::identity()) <= 16);
    REQUIRE(full.w > T(0));
  }
}

TEMPLATE_TEST_CASE("denormal-sized rotation vectors stay exact through exp and log", "[core]",
                   float, double) {
  using T = TestType;
  const T dmin = std::numeric_limits<T>::denorm_min();
  for (int k = 2; k < 200; k += 7) {
    const Vector3<T> phi{T(2 * k) * dmin, -T(4 * k) * dmin, T(6 * k) * dmin};  // even multiples
    const Quaternion<T> q = quaternion_exp(phi);
    REQUIRE(q.w == T(1));
    REQUIRE(q.x == phi.x / T(2));
    REQUIRE(q.y == phi.y / T(2));
    REQUIRE(q.z == phi.z / T(2));
    REQUIRE(quaternion_log(q) == phi);
  }
  // An odd multiple cannot be halved exactly: the error is at most one denormal step.
  const Vector3<T> odd{T(3) * dmin, T(0), T(0)};
  const Vector3<T> back = quaternion_log(quaternion_exp(odd));
  REQUIRE(std::fabs(back.x - odd.x) <= dmin);
  REQUIRE(quaternion_exp(Vector3<T>::zero()) == Quaternion<T>::identity());
}
