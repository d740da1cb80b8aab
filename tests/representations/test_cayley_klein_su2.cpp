// Euler parameters, the SU(2) matrix and the Cayley–Klein parameters.
// Set HALFSPIN_REPORT_WORST=1 to print the worst observed error of each property test.

#include <array>
#include <catch2/catch.hpp>
#include <complex>
#include <cstdio>
#include <cstdlib>
#include <string>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/representations/axis_angle.hpp"
#include "halfspin/representations/cayley_klein.hpp"
#include "halfspin/representations/euler_parameters.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "halfspin/representations/su2_matrix.hpp"
#include "test_support.hpp"

using namespace halfspin;
using halfspin::test::eps;
using halfspin::test::property_samples;
using halfspin::test::RandomRotations;

namespace {

using CL = std::complex<long double>;

// A 2×2 complex matrix in long double: the checks below multiply the library's T results in long
// double so that the measured error is the library's, not the check's.
struct M2 {
  CL a[2][2];
};

template <class T>
M2 widen(const Su2Matrix<T>& u) {
  M2 r;
  for (std::size_t i = 0; i < 2; ++i) {
    for (std::size_t j = 0; j < 2; ++j) {
      r.a[i][j] =
          CL(static_cast<long double>(u(i, j).real()), static_cast<long double>(u(i, j).imag()));
    }
  }
  return r;
}

M2 mul(const M2& x, const M2& y) {
  M2 r;
  for (std::size_t i = 0; i < 2; ++i) {
    for (std::size_t j = 0; j < 2; ++j) {
      r.a[i][j] = x.a[i][0] * y.a[0][j] + x.a[i][1] * y.a[1][j];
    }
  }
  return r;
}

M2 adjoint(const M2& x) {
  M2 r;
  for (std::size_t i = 0; i < 2; ++i) {
    for (std::size_t j = 0; j < 2; ++j) {
      r.a[i][j] = std::conj(x.a[j][i]);
    }
  }
  return r;
}

M2 scaled_identity(long double s) {
  M2 r;
  r.a[0][0] = CL(s, 0);
  r.a[0][1] = CL(0, 0);
  r.a[1][0] = CL(0, 0);
  r.a[1][1] = CL(s, 0);
  return r;
}

long double max_abs_diff(const M2& x, const M2& y) {
  long double d = 0;
  for (std::size_t i = 0; i < 2; ++i) {
    for (std::size_t j = 0; j < 2; ++j) {
      d = std::fmax(d, std::abs(x.a[i][j] - y.a[i][j]));
    }
  }
  return d;
}

// v·σ = v1 σ1 + v2 σ2 + v3 σ3 with the Pauli matrices σ1 = [[0, 1], [1, 0]],
// σ2 = [[0, −i], [i, 0]], σ3 = [[1, 0], [0, −1]] (common practice, no source).
M2 pauli_combination(long double x, long double y, long double z) {
  M2 r;
  r.a[0][0] = CL(z, 0);
  r.a[0][1] = CL(x, -y);
  r.a[1][0] = CL(x, y);
  r.a[1][1] = CL(-z, 0);
  return r;
}

void report(const char* what, long double worst) { test::report_worst(what, worst); }

template <class T>
const char* type_name() {
  return sizeof(T) == sizeof(float) ? "float" : "double";
}

template <class T>
bool su2_equal(const Su2Matrix<T>& a, const Su2Matrix<T>& b) {
  for (std::size_t i = 0; i < 2; ++i) {
    for (std::size_t j = 0; j < 2; ++j) {
      if (a(i, j) != b(i, j)) {
        return false;
      }
    }
  }
  return true;
}

// Compile-time checks: the conversions are constexpr.
constexpr Quaternion<double> kQ{0.5, 0.5, -0.5, 0.5};
static_assert(to_euler_parameters(kQ).eta == 0.5 && to_euler_parameters(kQ).epsilon.y == -0.5, "");
static_assert(quaternion_from_euler_parameters(to_euler_parameters(kQ)) == kQ, "");
static_assert(to_su2_matrix(kQ)(0, 1).real() == 0.5 && to_su2_matrix(kQ)(0, 1).imag() == -0.5, "");
static_assert(quaternion_from_su2_matrix(to_su2_matrix(kQ)) == kQ, "");
static_assert(to_cayley_klein(kQ).alpha.imag() == -0.5, "");
static_assert(quaternion_from_cayley_klein(to_cayley_klein(kQ)) == kQ, "");

}  // namespace

// ---------------------------------------------------------------------------------------------
// Euler parameters

TEMPLATE_TEST_CASE("Euler parameters: exact round trip of the same four numbers",
                   "[euler_parameters]", float, double) {
  using T = TestType;
  RandomRotations rng(101);
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const EulerParameters<T> e = to_euler_parameters(q);
    REQUIRE(e.eta == q.w);
    REQUIRE(e.epsilon == q.vector());
    REQUIRE(quaternion_from_euler_parameters(e) == q);
  }
}

TEMPLATE_TEST_CASE("Euler parameters: cos/sin of the half angle and the Euler-Rodrigues matrix",
                   "[euler_parameters][reference]", float, double) {
  using T = TestType;
  RandomRotations rng(102);
  long double worst_half_angle = 0;
  long double worst_matrix = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Vector3<T> axis = rng.unit_vector<T>();
    const T angle = rng.uniform<T>(T(0), pi<T>);
    const EulerParameters<T> e =
        to_euler_parameters(quaternion_from_axis_angle(AxisAngle<T>{axis, angle}));
    // η = cos(θ/2), ε = sin(θ/2)·n (Shuster 1993, definition of the Euler parameters; from memory).
    const long double h = 0.5L * static_cast<long double>(angle);
    const long double c = std::cos(h);
    const long double s = std::sin(h);
    const long double d = std::fmax(
        std::fabs(static_cast<long double>(e.eta) - c),
        std::fmax(
            std::fabs(static_cast<long double>(e.epsilon.x) - s * static_cast<long double>(axis.x)),
            std::fmax(std::fabs(static_cast<long double>(e.epsilon.y) -
                                s * static_cast<long double>(axis.y)),
                      std::fabs(static_cast<long double>(e.epsilon.z) -
                                s * static_cast<long double>(axis.z)))));
    worst_half_angle = std::fmax(worst_half_angle, d / eps<T>());

    // Euler–Rodrigues form of the body → reference matrix from (η, ε):
    // R = (η² − εᵀε) I + 2 ε εᵀ + 2 η [ε×] (Shuster 1993 gives the transpose, the
    // reference → body attitude matrix, with −2η[ε×]; from memory). Evaluated in long double.
    const long double et = static_cast<long double>(e.eta),
                      e1 = static_cast<long double>(e.epsilon.x),
                      e2 = static_cast<long double>(e.epsilon.y),
                      e3 = static_cast<long double>(e.epsilon.z);
    const long double k = et * et - (e1 * e1 + e2 * e2 + e3 * e3);
    const long double r[3][3] = {
        {k + 2 * e1 * e1, 2 * e1 * e2 - 2 * et * e3, 2 * e1 * e3 + 2 * et * e2},
        {2 * e2 * e1 + 2 * et * e3, k + 2 * e2 * e2, 2 * e2 * e3 - 2 * et * e1},
        {2 * e3 * e1 - 2 * et * e2, 2 * e3 * e2 + 2 * et * e1, k + 2 * e3 * e3}};
    const Matrix3<T> m = to_rotation_matrix(quaternion_from_euler_parameters(e));
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        worst_matrix = std::fmax(worst_matrix,
                                 std::fabs(static_cast<long double>(m(i, j)) - r[i][j]) / eps<T>());
      }
    }
  }
  report((std::string("Euler params vs cos/sin(θ/2) ") + type_name<T>() + " [eps]").c_str(),
         worst_half_angle);
  report((std::string("Euler-Rodrigues matrix vs R ") + type_name<T>() + " [eps]").c_str(),
         worst_matrix);
  CHECK(worst_half_angle <= 1.5L);  // observed 0.49 ε (float and double)
  CHECK(worst_matrix <= 8.0L);      // observed 2.8 ε float, 3.3 ε double
}

// ---------------------------------------------------------------------------------------------
// SU(2)

TEMPLATE_TEST_CASE("SU(2): unitary, determinant 1, exact round trip, U(-q) = -U(q)", "[su2]", float,
                   double) {
  using T = TestType;
  RandomRotations rng(201);
  long double worst_unitary = 0;
  long double worst_det = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const Su2Matrix<T> u = to_su2_matrix(q);
    const M2 w = widen(u);
    worst_unitary =
        std::fmax(worst_unitary, max_abs_diff(mul(w, adjoint(w)), scaled_identity(1)) / eps<T>());
    const CL det = w.a[0][0] * w.a[1][1] - w.a[0][1] * w.a[1][0];
    worst_det = std::fmax(worst_det, std::abs(det - CL(1, 0)) / eps<T>());
    // Reading back averages two equal copies of each component: exact.
    REQUIRE(quaternion_from_su2_matrix(u) == q);
    // Negation only flips signs: exact, and SU(2) tells q from −q (the double cover).
    const Su2Matrix<T> un = to_su2_matrix(-q);
    for (std::size_t i = 0; i < 2; ++i) {
      for (std::size_t j = 0; j < 2; ++j) {
        REQUIRE(un(i, j) == -u(i, j));
      }
    }
    REQUIRE_FALSE(su2_equal(un, u));
  }
  report((std::string("SU(2) |UU^H - I| ") + type_name<T>() + " [eps]").c_str(), worst_unitary);
  report((std::string("SU(2) |det U - 1| ") + type_name<T>() + " [eps]").c_str(), worst_det);
  // The entries are the components of q, so both errors are |q|² − 1 of the normalized input.
  CHECK(worst_unitary <= 4.0L);  // observed 1.95 ε float, 1.94 ε double
  CHECK(worst_det <= 4.0L);      // observed 1.95 ε float, 1.94 ε double
}

TEMPLATE_TEST_CASE("SU(2): homomorphism U(q1 ⊗ q2) = U(q1) U(q2) for the Hamilton product",
                   "[su2][reference]", float, double) {
  // Pauli matrices and the quaternion–SU(2) correspondence 1 → I, i → −iσ1, j → −iσ2, k → −iσ3
  // (i·j = k maps to (−iσ1)(−iσ2) = −iσ3): common practice, no source.
  using T = TestType;
  RandomRotations rng(202);
  long double worst = 0;
  int reversed_also_passes = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q1 = rng.quaternion<T>();
    const Quaternion<T> q2 = rng.quaternion<T>();
    const M2 lhs = widen(to_su2_matrix(q1 * q2));
    const M2 u1 = widen(to_su2_matrix(q1));
    const M2 u2 = widen(to_su2_matrix(q2));
    worst = std::fmax(worst, max_abs_diff(lhs, mul(u1, u2)) / eps<T>());
    // The check can fail: the reversed order U(q2)U(q1) differs by 2|v1 × v2|.
    if (max_abs_diff(lhs, mul(u2, u1)) / eps<T>() <= 3.0L) {
      ++reversed_also_passes;
    }
  }
  report((std::string("SU(2) homomorphism ") + type_name<T>() + " [eps]").c_str(), worst);
  CHECK(worst <= 3.0L);  // observed 1.0 ε (float and double): the rounding of q1 ⊗ q2
  CHECK(reversed_also_passes == 0);
}

TEMPLATE_TEST_CASE("SU(2): U (v·σ) U^H = (R v)·σ with R = to_rotation_matrix (body to reference)",
                   "[su2][reference]", float, double) {
  // SU(2) acts on traceless Hermitian matrices v·σ as SO(3) acts on v (the double cover):
  // common practice, no source. R comes from the library's own to_rotation_matrix.
  using T = TestType;
  RandomRotations rng(203);
  long double worst = 0;
  int transpose_also_passes = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const Vector3<T> v = rng.unit_vector<T>();
    const M2 u = widen(to_su2_matrix(q));
    const M2 h = pauli_combination(static_cast<long double>(v.x), static_cast<long double>(v.y),
                                   static_cast<long double>(v.z));
    const M2 lhs = mul(mul(u, h), adjoint(u));
    const Matrix3<T> r = to_rotation_matrix(q);
    const Vector3<T> rv = r * v;
    worst = std::fmax(worst, max_abs_diff(lhs, pauli_combination(static_cast<long double>(rv.x),
                                                                 static_cast<long double>(rv.y),
                                                                 static_cast<long double>(rv.z))) /
                                 eps<T>());
    // The opposite sense (reference → body, Rᵀ v) must not pass.
    const Vector3<T> rtv = transpose(r) * v;
    if (max_abs_diff(
            lhs, pauli_combination(static_cast<long double>(rtv.x), static_cast<long double>(rtv.y),
                                   static_cast<long double>(rtv.z))) /
            eps<T>() <=
        8.0L) {
      ++transpose_also_passes;
    }
  }
  report((std::string("SU(2) action on v.sigma vs R v ") + type_name<T>() + " [eps]").c_str(),
         worst);
  CHECK(worst <= 8.0L);  // observed 3.4 ε float, 3.3 ε double
  CHECK(transpose_also_passes == 0);
}

TEMPLATE_TEST_CASE("SU(2): a 2π rotation is -I and a 4π rotation is +I", "[su2][reference]", float,
                   double) {
  // Spinor sign under a full turn: common practice, no source. The rotation matrix of the same
  // 2π turn is +I (checked alongside), which is what makes the sign invisible in SO(3).
  using T = TestType;
  RandomRotations rng(204);
  long double worst_direct = 0;
  long double worst_composed_2pi = 0;
  long double worst_composed_4pi = 0;
  constexpr int steps = 16;  // 2π as 16 rotations of π/8 about the same axis
  for (int n = 0; n < 1000; ++n) {
    const Vector3<T> axis = rng.unit_vector<T>();
    const M2 u2pi =
        widen(to_su2_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, T(2) * pi<T>})));
    const M2 u4pi =
        widen(to_su2_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, T(4) * pi<T>})));
    worst_direct = std::fmax(worst_direct, max_abs_diff(u2pi, scaled_identity(-1)) / eps<T>());
    worst_direct = std::fmax(worst_direct, max_abs_diff(u4pi, scaled_identity(1)) / eps<T>());
    const Matrix3<T> r2pi =
        to_rotation_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, T(2) * pi<T>}));
    REQUIRE(test::matrix_error_eps(r2pi, Matrix3<T>::identity()) <= 8.0L);

    // Products of the matrices of the steps, multiplied in T as a user would.
    const Su2Matrix<T> step =
        to_su2_matrix(quaternion_from_axis_angle(AxisAngle<T>{axis, pi<T> / T(steps / 2)}));
    Su2Matrix<T> acc = to_su2_matrix(Quaternion<T>::identity());
    for (int k = 1; k <= 2 * steps; ++k) {
      Su2Matrix<T> next{};
      for (std::size_t i = 0; i < 2; ++i) {
        for (std::size_t j = 0; j < 2; ++j) {
          next.m[i][j] = acc(i, 0) * step(0, j) + acc(i, 1) * step(1, j);
        }
      }
      acc = next;
      if (k == steps) {
        worst_composed_2pi =
            std::fmax(worst_composed_2pi, max_abs_diff(widen(acc), scaled_identity(-1)) / eps<T>());
      }
    }
    worst_composed_4pi =
        std::fmax(worst_composed_4pi, max_abs_diff(widen(acc), scaled_identity(1)) / eps<T>());
  }
  report((std::string("SU(2) of 2pi/4pi turns (direct) ") + type_name<T>() + " [eps]").c_str(),
         worst_direct);
  report((std::string("SU(2) of 16 x pi/8 ") + type_name<T>() + " [eps]").c_str(),
         worst_composed_2pi);
  report((std::string("SU(2) of 32 x pi/8 ") + type_name<T>() + " [eps]").c_str(),
         worst_composed_4pi);
  CHECK(worst_direct <= 4.0L);         // observed 1.5 ε float, 1.1 ε double
  CHECK(worst_composed_2pi <= 20.0L);  // observed 7.1 ε float, 5.0 ε double
  CHECK(worst_composed_4pi <= 32.0L);  // observed 13 ε float, 8.8 ε double
}

// ---------------------------------------------------------------------------------------------
// Cayley–Klein parameters

TEMPLATE_TEST_CASE("Cayley-Klein: the entries of U(q), delta = conj(alpha), gamma = -conj(beta)",
                   "[cayley_klein]", float, double) {
  using T = TestType;
  RandomRotations rng(301);
  long double worst_det = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const CayleyKlein<T> c = to_cayley_klein(q);
    const Su2Matrix<T> u = to_su2_matrix(q);
    REQUIRE(c.alpha == u(0, 0));
    REQUIRE(c.beta == u(0, 1));
    REQUIRE(c.gamma == u(1, 0));
    REQUIRE(c.delta == u(1, 1));
    REQUIRE(c.delta == std::conj(c.alpha));
    REQUIRE(c.gamma == -std::conj(c.beta));
    REQUIRE(quaternion_from_cayley_klein(c) == q);
    const auto wide = [](const std::complex<T>& z) {
      return CL(static_cast<long double>(z.real()), static_cast<long double>(z.imag()));
    };
    const CL a = wide(c.alpha), b = wide(c.beta), g = wide(c.gamma), d = wide(c.delta);
    worst_det = std::fmax(worst_det, std::abs(a * d - b * g - CL(1, 0)) / eps<T>());
  }
  report((std::string("Cayley-Klein |ad - bg - 1| ") + type_name<T>() + " [eps]").c_str(),
         worst_det);
  CHECK(worst_det <= 4.0L);  // observed 1.9 ε (float and double)
}

TEMPLATE_TEST_CASE("Cayley-Klein: the classical form from the Euler parameters of the inverse",
                   "[cayley_klein][reference]", float, double) {
  // Classical Cayley–Klein parameters from Euler parameters e (Goldstein-style, from memory;
  // Shuster 1993 surveys the Cayley–Klein parameters): α = e0 + i e3, β = e2 + i e1,
  // γ = −e2 + i e1, δ = e0 − i e3. Claim in cayley_klein.hpp: with e = the components of q*
  // (the reference → body rotation) they are exactly our parameters of q; with e = q they are
  // ours of q* instead.
  using T = TestType;
  RandomRotations rng(302);
  int same_rotation_also_matches = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const auto classical = [](const Quaternion<T>& e) {
      return CayleyKlein<T>{std::complex<T>(e.w, e.z), std::complex<T>(e.y, e.x),
                            std::complex<T>(-e.y, e.x), std::complex<T>(e.w, -e.z)};
    };
    const auto same = [](const CayleyKlein<T>& a, const CayleyKlein<T>& b) {
      return a.alpha == b.alpha && a.beta == b.beta && a.gamma == b.gamma && a.delta == b.delta;
    };
    REQUIRE(same(classical(conjugate(q)), to_cayley_klein(q)));
    REQUIRE(same(classical(q), to_cayley_klein(conjugate(q))));
    if (same(classical(q), to_cayley_klein(q))) {
      ++same_rotation_also_matches;
    }
  }
  CHECK(same_rotation_also_matches == 0);
}

TEST_CASE("SU(2) and Cayley-Klein: edge cases", "[su2][cayley_klein]") {
  using T = double;
  // Identity → I exactly; a half turn about z → diag(−i, i); denormal-sized vector parts survive.
  const M2 id = widen(to_su2_matrix(Quaternion<T>::identity()));
  CHECK(max_abs_diff(id, scaled_identity(1)) == 0);
  const Su2Matrix<T> hz = to_su2_matrix(Quaternion<T>{0, 0, 0, 1});
  CHECK(hz(0, 0) == std::complex<T>(0, -1));
  CHECK(hz(1, 1) == std::complex<T>(0, 1));
  const T tiny = std::numeric_limits<T>::denorm_min() * 3;
  const Quaternion<T> qt{1, tiny, -tiny, 2 * tiny};
  CHECK(quaternion_from_su2_matrix(to_su2_matrix(qt)) == qt);
  CHECK(quaternion_from_cayley_klein(to_cayley_klein(qt)) == qt);
  const Quaternion<float> qf{1, std::numeric_limits<float>::denorm_min(), 0, 0};
  CHECK(quaternion_from_su2_matrix(to_su2_matrix(qf)) == qf);
  // Reading back averages redundant entries: a perturbation of one copy moves the result by half.
  Su2Matrix<T> u = to_su2_matrix(Quaternion<T>{0.5, 0.5, 0.5, 0.5});
  u.m[0][0] = std::complex<T>(0.5 + 0x1p-20, -0.5 - 0x1p-20);
  u.m[1][0] = std::complex<T>(0.5 + 0x1p-20, -0.5 - 0x1p-20);
  const Quaternion<T> qu = quaternion_from_su2_matrix(u);
  CHECK(qu.w == 0.5 + 0x1p-21);
  CHECK(qu.x == 0.5 + 0x1p-21);
  CHECK(qu.y == 0.5 + 0x1p-21);
  CHECK(qu.z == 0.5 + 0x1p-21);
  CayleyKlein<T> c = to_cayley_klein(Quaternion<T>{0.5, 0.5, 0.5, 0.5});
  c.gamma = std::complex<T>(0.5 + 0x1p-20, -0.5);
  c.beta = std::complex<T>(-0.5, -0.5 - 0x1p-20);
  const Quaternion<T> qc = quaternion_from_cayley_klein(c);
  CHECK(qc.y == 0.5 + 0x1p-21);
  CHECK(qc.x == 0.5 + 0x1p-21);
  CHECK(qc.w == 0.5);
  CHECK(qc.z == 0.5);
}
