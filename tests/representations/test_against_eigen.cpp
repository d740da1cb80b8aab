// Checks against Eigen 3 (Debian libeigen3-dev), a general-purpose reference library: the
// quaternion product, rotation of vectors, and quaternion ↔ matrix both ways, on the same seeded
// random set. Eigen's Quaternion uses the Hamilton product and its toRotationMatrix() is the active
// rotation v' = R v, the same sense as our body → reference matrix.
#include <catch2/catch.hpp>

#include <Eigen/Geometry>
#include <cmath>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

template <class T>
Eigen::Quaternion<T> to_eigen(const Quaternion<T>& q) {
  return Eigen::Quaternion<T>(q.w, q.x, q.y, q.z);
}
template <class T>
Quaternion<T> from_eigen(const Eigen::Quaternion<T>& q) {
  return {q.w(), q.x(), q.y(), q.z()};
}
template <class T>
Matrix3<T> from_eigen(const Eigen::Matrix<T, 3, 3>& m) {
  Matrix3<T> r{};
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      r(i, j) = m(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j));
    }
  }
  return r;
}

}  // namespace

TEMPLATE_TEST_CASE("quaternion product matches Eigen", "[reference][eigen]", float, double) {
  using T = TestType;
  test::RandomRotations rng(71);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto a = rng.quaternion<T>(), b = rng.quaternion<T>();
    worst = std::fmax(worst,
                      test::quaternion_error_eps(a * b, from_eigen<T>(to_eigen(a) * to_eigen(b))));
  }
  REQUIRE(worst <= 2);
}

TEMPLATE_TEST_CASE("rotation of vectors matches Eigen", "[reference][eigen]", float, double) {
  using T = TestType;
  test::RandomRotations rng(72);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const auto v = rng.unit_vector<T>();
    const Eigen::Matrix<T, 3, 1> e = to_eigen(q) * Eigen::Matrix<T, 3, 1>(v.x, v.y, v.z);
    worst = std::fmax(worst, test::vector_error_eps(rotate(q, v), Vector3<T>{e.x(), e.y(), e.z()}));
  }
  REQUIRE(worst <= 8);
}

TEMPLATE_TEST_CASE("quaternion → matrix matches Eigen", "[reference][eigen]", float, double) {
  using T = TestType;
  test::RandomRotations rng(73);
  long double worst = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    worst = std::fmax(worst, test::matrix_error_eps(to_rotation_matrix(q),
                                                    from_eigen<T>(to_eigen(q).toRotationMatrix())));
  }
  REQUIRE(worst <= 8);  // observed 4: the two sides round differently (2/|q|² vs 2)
}

TEMPLATE_TEST_CASE("matrix → quaternion matches Eigen", "[reference][eigen]", float, double) {
  using T = TestType;
  test::RandomRotations rng(74);
  long double worst = 0;
  auto check = [&](const Eigen::Matrix<T, 3, 3>& m) {
    const Quaternion<T> ours = quaternion_from_rotation_matrix(from_eigen<T>(m));
    const Quaternion<T> theirs = from_eigen<T>(Eigen::Quaternion<T>(m));
    worst = std::fmax(worst, test::quaternion_error_eps(ours, theirs));
  };
  for (int n = 0; n < test::property_samples; ++n) {
    check(to_eigen(rng.quaternion<T>()).toRotationMatrix());
  }
  // Half turns, where the trace is −1 and the extraction must branch on the diagonal.
  for (int n = 0; n < 1000; ++n) {
    const auto axis = rng.unit_vector<T>();
    check(Eigen::AngleAxis<T>(pi<T>, Eigen::Matrix<T, 3, 1>(axis.x, axis.y, axis.z))
              .toRotationMatrix());
  }
  REQUIRE(worst <= 8);  // observed 3.5: we renormalize, Eigen does not
}
