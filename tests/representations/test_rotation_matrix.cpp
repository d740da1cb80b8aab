// Quaternion ↔ rotation matrix: homomorphism, double cover, orthogonality, round trips, and the
// 180° rotations where naive extraction divides by zero.
#include <catch2/catch.hpp>

#include <cmath>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "test_support.hpp"

using namespace halfspin;

TEMPLATE_TEST_CASE("R(q1 ⊗ q2) = R(q1)·R(q2) and R(−q) = R(q)", "[representations][reference]",
                   float, double) {
  using T = TestType;
  // Homomorphism of the quaternion product onto SO(3), two-to-one (common practice, no source).
  test::RandomRotations rng(51);
  long double worst_hom = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto a = rng.quaternion<T>(), b = rng.quaternion<T>();
    worst_hom =
        std::fmax(worst_hom, test::matrix_error_eps(to_rotation_matrix(a * b),
                                                    to_rotation_matrix(a) * to_rotation_matrix(b)));
    const Matrix3<T> ra = to_rotation_matrix(a), rna = to_rotation_matrix(-a);
    REQUIRE(test::matrix_error_eps(ra, rna) == 0);  // every term is even in q: exact
  }
  REQUIRE(worst_hom <= 8);
}

TEMPLATE_TEST_CASE("rotation matrices are orthonormal with determinant +1 and rotate like q",
                   "[representations]", float, double) {
  using T = TestType;
  test::RandomRotations rng(52);
  long double worst_orth = 0, worst_det = 0, worst_rot = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const Matrix3<T> r = to_rotation_matrix(q);
    worst_orth =
        std::fmax(worst_orth, test::matrix_error_eps(r * transpose(r), Matrix3<T>::identity()));
    worst_det = std::fmax(
        worst_det, std::fabs(static_cast<long double>(determinant(r)) - 1.0L) / test::eps<T>());
    const auto v = rng.unit_vector<T>();
    worst_rot = std::fmax(worst_rot, test::vector_error_eps(r * v, rotate(q, v)));
  }
  REQUIRE(worst_orth <= 12);
  REQUIRE(worst_det <= 12);
  REQUIRE(worst_rot <= 12);
}

TEMPLATE_TEST_CASE("quaternion → matrix → quaternion round trip", "[representations]", float,
                   double) {
  using T = TestType;
  test::RandomRotations rng(53);
  long double worst = 0, worst_back = 0;
  for (int n = 0; n < test::property_samples; ++n) {
    const auto q = rng.quaternion<T>();
    const Quaternion<T> back = quaternion_from_rotation_matrix(to_rotation_matrix(q));
    REQUIRE(back.w >= T(0));
    worst = std::fmax(worst, test::quaternion_error_eps(back, q));
    const Matrix3<T> r = to_rotation_matrix(q);
    worst_back = std::fmax(
        worst_back,
        test::matrix_error_eps(to_rotation_matrix(quaternion_from_rotation_matrix(r)), r));
  }
  REQUIRE(worst <= 4);
  REQUIRE(worst_back <= 8);
}

TEMPLATE_TEST_CASE("180° rotations about principal and skewed axes, and near 0 and π",
                   "[representations][reference]", float, double) {
  using T = TestType;
  // A half turn about a unit axis n has R = 2nnᵀ − I (common practice, no source).
  test::RandomRotations rng(54);
  const Vector3<T> axes[] = {{1, 0, 0},
                             {0, 1, 0},
                             {0, 0, 1},
                             {-1, 0, 0},
                             normalized(Vector3<T>{1, 1, 0}),
                             normalized(Vector3<T>{1, -1, 1}),
                             normalized(Vector3<T>{T(1e-4), 1, T(-2e-4)}),
                             rng.unit_vector<T>(),
                             rng.unit_vector<T>()};
  for (const Vector3<T>& n : axes) {
    Matrix3<T> expect{};
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        expect(i, j) =
            T(2) * n[static_cast<int>(i)] * n[static_cast<int>(j)] - (i == j ? T(1) : T(0));
      }
    }
    const Quaternion<T> q = Quaternion<T>::from_parts(T(0), n);
    REQUIRE(test::matrix_error_eps(to_rotation_matrix(q), expect) <= 4);
    const Quaternion<T> back = quaternion_from_rotation_matrix(expect);
    REQUIRE(test::quaternion_error_eps(back, q) <= 4);
    // Within 1e-7 rad of the half turn, on both sides.
    for (const T d : {T(1e-7), T(-1e-7), T(1e-5)}) {
      const Quaternion<T> qn = quaternion_exp((pi<T> + d) * n);
      const Quaternion<T> bn = quaternion_from_rotation_matrix(to_rotation_matrix(qn));
      REQUIRE(test::quaternion_error_eps(bn, qn) <= 4);
    }
  }
  // Identity and tiny angles.
  REQUIRE(quaternion_from_rotation_matrix(Matrix3<T>::identity()) == Quaternion<T>::identity());
  for (int k = 1; k <= 30; ++k) {
    const T angle = std::pow(T(10), -T(k));
    const Quaternion<T> q = quaternion_exp(angle * rng.unit_vector<T>());
    const Quaternion<T> b = quaternion_from_rotation_matrix(to_rotation_matrix(q));
    REQUIRE(test::quaternion_error_eps(b, q) <= 2);
  }
}
