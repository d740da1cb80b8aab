// Euler angles against published formula collections: the explicit direction-cosine-matrix
// entries and inverse formulas for the 3-2-1 and 3-1-3 sequences, and the 3-2-1 / 3-1-3 quaternion
// formulas, as given in J. Diebel, "Representing attitude: Euler angles, unit quaternions, and
// rotation vectors" (Stanford, 2006) and J. R. Wertz (ed.), Spacecraft Attitude Determination and
// Control (Reidel, 1978), Appendix E. Both are cited from memory (the texts are not at hand); each
// formula was re-derived below before use. Those texts give the reference→body matrix
// C = transpose(to_rotation_matrix(q)).
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "halfspin/representations/euler_angles.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

constexpr long double pi_ld = 3.141592653589793238462643383279502884L;
constexpr long double degree = pi_ld / 180;

using Dcm = std::array<std::array<long double, 3>, 3>;

// Exact widening to long double (the warning set forbids implicit float/double promotion).
template <class A>
constexpr long double ld(A x) {
  return static_cast<long double>(x);
}

// 3-2-1 (yaw ψ, pitch θ, roll φ), reference→body, C = R1(φ)·R2(θ)·R3(ψ) with frame rotations
// R_i (Diebel 2006 and Wertz 1978 App. E, from memory):
//   [ cθcψ              cθsψ              −sθ  ]
//   [ sφsθcψ − cφsψ     sφsθsψ + cφcψ     sφcθ ]
//   [ cφsθcψ + sφsψ     cφsθsψ − sφcψ     cφcθ ]
template <class A>
Dcm dcm_321(A yaw, A pitch, A roll) {
  const long double psi = ld(yaw), theta = ld(pitch), phi = ld(roll);
  const long double cps = std::cos(psi), sps = std::sin(psi), cth = std::cos(theta),
                    sth = std::sin(theta), cph = std::cos(phi), sph = std::sin(phi);
  return {{{cth * cps, cth * sps, -sth},
           {sph * sth * cps - cph * sps, sph * sth * sps + cph * cps, sph * cth},
           {cph * sth * cps + sph * sps, cph * sth * sps - sph * cps, cph * cth}}};
}

// 3-1-3 (φ, θ, ψ), reference→body, C = R3(ψ)·R1(θ)·R3(φ) (same sources, from memory):
//   [  cψcφ − sψcθsφ     cψsφ + sψcθcφ    sψsθ ]
//   [ −sψcφ − cψcθsφ    −sψsφ + cψcθcφ    cψsθ ]
//   [  sθsφ             −sθcφ             cθ   ]
template <class A>
Dcm dcm_313(A first, A second, A third) {
  const long double phi = ld(first), theta = ld(second), psi = ld(third);
  const long double cph = std::cos(phi), sph = std::sin(phi), cth = std::cos(theta),
                    sth = std::sin(theta), cps = std::cos(psi), sps = std::sin(psi);
  return {{{cps * cph - sps * cth * sph, cps * sph + sps * cth * cph, sps * sth},
           {-sps * cph - cps * cth * sph, -sps * sph + cps * cth * cph, cps * sth},
           {sth * sph, -sth * cph, cth}}};
}

// Largest |C(i,j) − transpose(R)(i,j)| in units of ε of T.
template <class T>
long double dcm_error_eps(const Dcm& c, const Matrix3<T>& r) {
  long double d = 0;
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      d = std::fmax(d, std::fabs(c[i][j] - static_cast<long double>(r(j, i))));
    }
  }
  return d / test::eps<T>();
}

template <class A, class B>
long double angle_difference(A a, B b) {
  return std::fabs(std::remainder(ld(a) - ld(b), 2 * pi_ld));
}

template <class T>
Quaternion<T> rounded(const Quaternion<long double>& q) {
  return {static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y), static_cast<T>(q.z)};
}

void report(const char* what, long double worst) { test::report_worst(what, worst); }

// Concrete triples (degrees), none near gimbal lock, covering all quadrants of first/third.
constexpr std::array<std::array<long double, 3>, 6> triples_321{{{30, 20, 10},
                                                                 {-120, 45, 170},
                                                                 {179, -80, -95},
                                                                 {5, 0.5L, -3},
                                                                 {90, -30, 90},
                                                                 {-60, 70, -150}}};
constexpr std::array<std::array<long double, 3>, 6> triples_313{{{40, 60, -70},
                                                                 {-150, 10, 30},
                                                                 {100, 170, -100},
                                                                 {0.5L, 90, 179},
                                                                 {-90, 120, -10},
                                                                 {60, 45, 60}}};

}  // namespace

TEMPLATE_TEST_CASE("3-2-1: direction cosine matrix entries of the published formula",
                   "[euler][reference]", float, double) {
  using T = TestType;
  long double worst = 0;
  for (const auto& t : triples_321) {
    const T yaw = static_cast<T>(t[0] * degree), pitch = static_cast<T>(t[1] * degree),
            roll = static_cast<T>(t[2] * degree);
    const Matrix3<T> r = to_rotation_matrix(
        quaternion_from_euler_angles(EulerAngles<T>{yaw, pitch, roll, EulerSequence::zyx}));
    worst = std::fmax(worst, dcm_error_eps(dcm_321(yaw, pitch, roll), r));
  }
  report(sizeof(T) == 4 ? "float 3-2-1 DCM entries (eps)" : "double 3-2-1 DCM entries (eps)",
         worst);
  // Measured worst: float 0.97 ε, double 1.35 ε.
  REQUIRE(worst <= 5);

  // Worked by hand for yaw 30°, pitch 20°, roll 10° from the matrix above, with
  // cos 30° = 0.8660254037844386, sin 30° = 0.5, cos 20° = 0.9396926207859084,
  // sin 20° = 0.3420201433256687, cos 10° = 0.9848077530122080, sin 10° = 0.1736481776669303:
  //   C11 = cos20·cos30 = 0.8137976813493738     C12 = cos20·sin30 = 0.4698463103929542
  //   C13 = −sin20      = −0.3420201433256687    C23 = sin10·cos20 = 0.1631759111665348
  //   C33 = cos10·cos20 = 0.9254165783983234
  //   C21 = sin10·sin20·cos30 − cos10·sin30 = 0.0514342... − 0.4924038765 = −0.4409696105298824
  // (products evaluated to 16 digits with a calculator). C = transpose(R), so C(i,j) = R(j,i).
  const Matrix3<T> r = to_rotation_matrix(quaternion_from_euler_angles(
      EulerAngles<T>{static_cast<T>(30 * degree), static_cast<T>(20 * degree),
                     static_cast<T>(10 * degree), EulerSequence::zyx}));
  const long double tol = 4 * test::eps<T>();
  REQUIRE(std::fabs(ld(r(0, 0)) - 0.8137976813493738L) <= tol);
  REQUIRE(std::fabs(ld(r(1, 0)) - 0.4698463103929542L) <= tol);
  REQUIRE(std::fabs(ld(r(2, 0)) + 0.3420201433256687L) <= tol);
  REQUIRE(std::fabs(ld(r(2, 1)) - 0.1631759111665348L) <= tol);
  REQUIRE(std::fabs(ld(r(2, 2)) - 0.9254165783983234L) <= tol);
  REQUIRE(std::fabs(ld(r(0, 1)) + 0.4409696105298824L) <= tol);
}

TEMPLATE_TEST_CASE("3-2-1: published inverse formulas give our angles", "[euler][reference]", float,
                   double) {
  using T = TestType;
  // ψ = atan2(C12, C11), θ = −asin(C13), φ = atan2(C23, C33) (Diebel 2006; Wertz 1978 App. E;
  // from memory). Evaluated in long double on the exact matrix of the rounded input angles.
  long double worst = 0;
  test::RandomRotations rng(301);
  for (int n = 0; n < 1006; ++n) {
    std::array<long double, 3> deg{};
    if (n < 6) {
      deg = triples_321[static_cast<std::size_t>(n)];
    } else {
      deg = {rng.uniform<long double>(-180, 180), rng.uniform<long double>(-85, 85),
             rng.uniform<long double>(-180, 180)};
    }
    const T yaw = static_cast<T>(deg[0] * degree), pitch = static_cast<T>(deg[1] * degree),
            roll = static_cast<T>(deg[2] * degree);
    const Dcm c = dcm_321(yaw, pitch, roll);
    const long double psi = std::atan2(c[0][1], c[0][0]);
    const long double theta = -std::asin(c[0][2]);
    const long double phi = std::atan2(c[1][2], c[2][2]);
    const EulerDecomposition<T> d = to_euler_angles(
        quaternion_from_euler_angles(EulerAngles<T>{yaw, pitch, roll, EulerSequence::zyx}),
        EulerSequence::zyx);
    REQUIRE_FALSE(d.near_singular);
    worst = std::fmax(worst, std::fmax(angle_difference(d.angles.first, psi),
                                       std::fmax(angle_difference(d.angles.second, theta),
                                                 angle_difference(d.angles.third, phi))) /
                                 test::eps<T>());
  }
  report(
      sizeof(T) == 4 ? "float 3-2-1 inverse formulas (eps)" : "double 3-2-1 inverse formulas (eps)",
      worst);
  // Pitch within ±85°, so the split's sensitivity 1/cos θ ≤ 11.5. Measured worst: float 10 ε,
  // double 8 ε.
  REQUIRE(worst <= 40);
}

TEMPLATE_TEST_CASE("3-2-1: published quaternion formulas", "[euler][reference]", float, double) {
  using T = TestType;
  // With half angles (Diebel 2006; from memory; re-derived from q_z(ψ)⊗q_y(θ)⊗q_x(φ)):
  //   q0 = cφcθcψ + sφsθsψ,  q1 = sφcθcψ − cφsθsψ,  q2 = cφsθcψ + sφcθsψ,  q3 = cφcθsψ − sφsθcψ
  long double worst = 0;
  for (const auto& t : triples_321) {
    const T yaw = static_cast<T>(t[0] * degree), pitch = static_cast<T>(t[1] * degree),
            roll = static_cast<T>(t[2] * degree);
    const long double cps = std::cos(ld(yaw) / 2), sps = std::sin(ld(yaw) / 2),
                      cth = std::cos(ld(pitch) / 2), sth = std::sin(ld(pitch) / 2),
                      cph = std::cos(ld(roll) / 2), sph = std::sin(ld(roll) / 2);
    const Quaternion<long double> ref{
        cph * cth * cps + sph * sth * sps, sph * cth * cps - cph * sth * sps,
        cph * sth * cps + sph * cth * sps, cph * cth * sps - sph * sth * cps};
    worst = std::fmax(worst, test::quaternion_error_eps(quaternion_from_euler_angles(EulerAngles<T>{
                                                            yaw, pitch, roll, EulerSequence::zyx}),
                                                        rounded<T>(ref)));
  }
  report(sizeof(T) == 4 ? "float 3-2-1 quaternion formula (eps)"
                        : "double 3-2-1 quaternion formula (eps)",
         worst);
  // Measured worst: float 0.5 ε, double 0.5 ε.
  REQUIRE(worst <= 2);
  // Worked value for yaw 30°, pitch 20°, roll 10° (half angles 15°, 10°, 5°):
  //   q0 = c5·c10·c15 + s5·s10·s15 = 0.9515485246437885, q1 = 0.0381345764748501,
  //   q2 = 0.1893078574120000, q3 = 0.2392983377447303 (evaluated with a calculator).
  const Quaternion<T> q = quaternion_from_euler_angles(
      EulerAngles<T>{static_cast<T>(30 * degree), static_cast<T>(20 * degree),
                     static_cast<T>(10 * degree), EulerSequence::zyx});
  const long double tol = 4 * test::eps<T>();
  REQUIRE(std::fabs(ld(q.w) - 0.9515485246437885L) <= tol);
  REQUIRE(std::fabs(ld(q.x) - 0.0381345764748501L) <= tol);
  REQUIRE(std::fabs(ld(q.y) - 0.1893078574120000L) <= tol);
  REQUIRE(std::fabs(ld(q.z) - 0.2392983377447303L) <= tol);
}

TEMPLATE_TEST_CASE("3-1-3: direction cosine matrix entries and inverse formulas",
                   "[euler][reference]", float, double) {
  using T = TestType;
  long double worst_dcm = 0, worst_inverse = 0;
  test::RandomRotations rng(302);
  for (int n = 0; n < 1006; ++n) {
    std::array<long double, 3> deg{};
    if (n < 6) {
      deg = triples_313[static_cast<std::size_t>(n)];
    } else {
      deg = {rng.uniform<long double>(-180, 180), rng.uniform<long double>(5, 175),
             rng.uniform<long double>(-180, 180)};
    }
    const T phi = static_cast<T>(deg[0] * degree), theta = static_cast<T>(deg[1] * degree),
            psi = static_cast<T>(deg[2] * degree);
    const Quaternion<T> q =
        quaternion_from_euler_angles(EulerAngles<T>{phi, theta, psi, EulerSequence::zxz});
    const Dcm c = dcm_313(phi, theta, psi);
    worst_dcm = std::fmax(worst_dcm, dcm_error_eps(c, to_rotation_matrix(q)));
    // φ = atan2(C31, −C32), θ = acos(C33), ψ = atan2(C13, C23) (Wertz 1978 App. E; Diebel 2006;
    // from memory).
    const long double phi_ref = std::atan2(c[2][0], -c[2][1]);
    const long double theta_ref = std::acos(c[2][2]);
    const long double psi_ref = std::atan2(c[0][2], c[1][2]);
    const EulerDecomposition<T> d = to_euler_angles(q, EulerSequence::zxz);
    REQUIRE_FALSE(d.near_singular);
    worst_inverse =
        std::fmax(worst_inverse, std::fmax(angle_difference(d.angles.first, phi_ref),
                                           std::fmax(angle_difference(d.angles.second, theta_ref),
                                                     angle_difference(d.angles.third, psi_ref))) /
                                     test::eps<T>());
  }
  report(sizeof(T) == 4 ? "float 3-1-3 DCM entries (eps)" : "double 3-1-3 DCM entries (eps)",
         worst_dcm);
  report(
      sizeof(T) == 4 ? "float 3-1-3 inverse formulas (eps)" : "double 3-1-3 inverse formulas (eps)",
      worst_inverse);
  // Measured worst: entries float 2.8 ε, double 2.8 ε; inverse (θ ∈ [5°, 175°]) float 3 ε,
  // double 2 ε.
  REQUIRE(worst_dcm <= 6);
  REQUIRE(worst_inverse <= 12);

  // Worked by hand for φ = 40°, θ = 60°, ψ = −70°: C33 = cos 60° = 1/2,
  // C13 = sin(−70°)·sin 60° = −0.9396926207859084·0.8660254037844386 = −0.8137976813493737,
  // C31 = sin 60°·sin 40° = 0.8660254037844386·0.6427876096865394 = 0.5566703992264194,
  // C32 = −sin 60°·cos 40° = −0.8660254037844386·0.7660444431189780 = −0.6634139481689384.
  const Matrix3<T> r = to_rotation_matrix(quaternion_from_euler_angles(
      EulerAngles<T>{static_cast<T>(40 * degree), static_cast<T>(60 * degree),
                     static_cast<T>(-70 * degree), EulerSequence::zxz}));
  const long double tol = 4 * test::eps<T>();
  REQUIRE(std::fabs(ld(r(2, 2)) - 0.5L) <= tol);
  REQUIRE(std::fabs(ld(r(2, 0)) + 0.8137976813493737L) <= tol);
  REQUIRE(std::fabs(ld(r(0, 2)) - 0.5566703992264194L) <= tol);
  REQUIRE(std::fabs(ld(r(1, 2)) + 0.6634139481689384L) <= tol);
}

TEMPLATE_TEST_CASE("3-1-3: published quaternion formulas", "[euler][reference]", float, double) {
  using T = TestType;
  // q0 = cos(θ/2)cos((φ+ψ)/2), q1 = sin(θ/2)cos((φ−ψ)/2), q2 = sin(θ/2)sin((φ−ψ)/2),
  // q3 = cos(θ/2)sin((φ+ψ)/2) (Wertz 1978 App. E; Shuster 1993; from memory; re-derived from
  // q_z(φ)⊗q_x(θ)⊗q_z(ψ)).
  long double worst = 0;
  for (const auto& t : triples_313) {
    const T phi = static_cast<T>(t[0] * degree), theta = static_cast<T>(t[1] * degree),
            psi = static_cast<T>(t[2] * degree);
    const long double h = ld(theta) / 2, sum = (ld(phi) + ld(psi)) / 2,
                      diff = (ld(phi) - ld(psi)) / 2;
    const Quaternion<long double> ref{std::cos(h) * std::cos(sum), std::sin(h) * std::cos(diff),
                                      std::sin(h) * std::sin(diff), std::cos(h) * std::sin(sum)};
    worst = std::fmax(worst, test::quaternion_error_eps(quaternion_from_euler_angles(EulerAngles<T>{
                                                            phi, theta, psi, EulerSequence::zxz}),
                                                        rounded<T>(ref)));
  }
  report(sizeof(T) == 4 ? "float 3-1-3 quaternion formula (eps)"
                        : "double 3-1-3 quaternion formula (eps)",
         worst);
  // Measured worst: float 0.5 ε, double 0.5 ε.
  REQUIRE(worst <= 2);
  // Worked value for φ = 40°, θ = 60°, ψ = −70°: q0 = cos 30°·cos(−15°) = 0.8365163037378079,
  // q1 = sin 30°·cos 55° = 0.2867882181755230, q2 = sin 30°·sin 55° = 0.4095760221444958,
  // q3 = cos 30°·sin(−15°) = −0.2241438680420134.
  const Quaternion<T> q = quaternion_from_euler_angles(
      EulerAngles<T>{static_cast<T>(40 * degree), static_cast<T>(60 * degree),
                     static_cast<T>(-70 * degree), EulerSequence::zxz});
  const long double tol = 4 * test::eps<T>();
  REQUIRE(std::fabs(ld(q.w) - 0.8365163037378079L) <= tol);
  REQUIRE(std::fabs(ld(q.x) - 0.2867882181755230L) <= tol);
  REQUIRE(std::fabs(ld(q.y) - 0.4095760221444958L) <= tol);
  REQUIRE(std::fabs(ld(q.z) + 0.2241438680420134L) <= tol);
}

TEMPLATE_TEST_CASE("all 12 sequences: matrix is the product of the elementary rotations",
                   "[euler][reference]", float, double) {
  using T = TestType;
  // R = R_a(first)·R_b(second)·R_c(third) with the elementary body→reference rotations
  //   R_x(α) = [1 0 0; 0 c −s; 0 s c], R_y(α) = [c 0 s; 0 1 0; −s 0 c], R_z(α) = [c −s 0; s c 0; 0
  //   0 1]
  // (common practice, no source; Diebel 2006 builds every sequence this way, from memory).
  auto elementary = [](int axis, long double a) {
    const long double c = std::cos(a), s = std::sin(a);
    Dcm m{};
    const int i = (axis + 1) % 3, j = (axis + 2) % 3;
    m[static_cast<std::size_t>(axis)][static_cast<std::size_t>(axis)] = 1;
    m[static_cast<std::size_t>(i)][static_cast<std::size_t>(i)] = c;
    m[static_cast<std::size_t>(j)][static_cast<std::size_t>(j)] = c;
    m[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)] = -s;
    m[static_cast<std::size_t>(j)][static_cast<std::size_t>(i)] = s;
    return m;
  };
  auto product = [](const Dcm& a, const Dcm& b) {
    Dcm r{};
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        r[i][j] = a[i][0] * b[0][j] + a[i][1] * b[1][j] + a[i][2] * b[2][j];
      }
    }
    return r;
  };
  const std::array<EulerSequence, 12> all{
      EulerSequence::xyz, EulerSequence::xzy, EulerSequence::yxz, EulerSequence::yzx,
      EulerSequence::zxy, EulerSequence::zyx, EulerSequence::xyx, EulerSequence::xzx,
      EulerSequence::yxy, EulerSequence::yzy, EulerSequence::zxz, EulerSequence::zyz};
  test::RandomRotations rng(303);
  long double worst = 0;
  for (const EulerSequence s : all) {
    const EulerAxes ax = euler_axes(s);
    for (int n = 0; n < 1000; ++n) {
      const T a1 = rng.uniform<T>(-pi<T>, pi<T>), a2 = rng.uniform<T>(-pi<T>, pi<T>),
              a3 = rng.uniform<T>(-pi<T>, pi<T>);
      const Dcm ref = product(product(elementary(ax.first, ld(a1)), elementary(ax.second, ld(a2))),
                              elementary(ax.third, ld(a3)));
      const Matrix3<T> r =
          to_rotation_matrix(quaternion_from_euler_angles(EulerAngles<T>{a1, a2, a3, s}));
      // dcm_error_eps compares against the transpose; pass the transpose of ref.
      Dcm ref_t{};
      for (std::size_t i = 0; i < 3; ++i) {
        for (std::size_t j = 0; j < 3; ++j) {
          ref_t[i][j] = ref[j][i];
        }
      }
      worst = std::fmax(worst, dcm_error_eps(ref_t, r));
    }
  }
  report(sizeof(T) == 4 ? "float 12 sequences elementary product (eps)"
                        : "double 12 sequences elementary product (eps)",
         worst);
  // Measured worst: float 3.0 ε, double 2.8 ε.
  REQUIRE(worst <= 8);
}
