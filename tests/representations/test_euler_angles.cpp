// Euler angles in all 12 sequences: round trips, ranges, the gimbal-lock band and its flag,
// 180° rotations, tiny angles. Tolerances are 2–4× the worst values measured with these seeds
// (stated beside each check; rerun with HALFSPIN_REPORT_WORST=1 in the environment to print them).
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <string>

#include "halfspin/representations/euler_angles.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// With HALFSPIN_REPORT_WORST set in the environment, prints the worst values measured (how the
// tolerances below were chosen).
void report(const char* what, int sequence, long double worst) {
  test::report_worst(std::string(what) + " seq " + std::to_string(sequence), worst);
}

constexpr long double pi_ld = 3.141592653589793238462643383279502884L;

// Rotation about a coordinate axis, in long double (the reference for the float/double code).
Quaternion<long double> axis_rotation_ld(int axis, long double angle) {
  const long double s = std::sin(angle / 2);
  return {std::cos(angle / 2), axis == 0 ? s : 0.0L, axis == 1 ? s : 0.0L, axis == 2 ? s : 0.0L};
}

// q_a(first) ⊗ q_b(second) ⊗ q_c(third) in long double.
Quaternion<long double> reference_quaternion(long double first, long double second,
                                             long double third, EulerSequence sequence) {
  const EulerAxes a = euler_axes(sequence);
  return axis_rotation_ld(a.first, first) * axis_rotation_ld(a.second, second) *
         axis_rotation_ld(a.third, third);
}

template <class T>
Quaternion<T> rounded(const Quaternion<long double>& q) {
  return {static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y), static_cast<T>(q.z)};
}

// Exact widening to long double (the warning set forbids implicit float/double promotion).
template <class A>
constexpr long double ld(A x) {
  return static_cast<long double>(x);
}

// |a − b| reduced modulo 2π into [0, π].
template <class A, class B>
long double angle_difference(A a, B b) {
  return std::fabs(std::remainder(ld(a) - ld(b), 2 * pi_ld));
}

template <class T>
bool in_range(const EulerAngles<T>& a) {
  const bool outer = a.first > -pi<T> && a.first <= pi<T> && a.third > -pi<T> && a.third <= pi<T>;
  if (is_proper_euler(a.sequence)) {
    return outer && a.second >= T(0) && a.second <= pi<T>;
  }
  return outer && a.second >= -T(0.5) * pi<T> && a.second <= T(0.5) * pi<T>;
}

// Distance (rad) of the middle angle from the nearest gimbal-lock value of the sequence.
template <class A>
long double distance_from_singular(A middle, EulerSequence sequence) {
  const long double second = ld(middle);
  if (is_proper_euler(sequence)) {
    return std::fmin(std::fabs(second), std::fabs(pi_ld - second));
  }
  return std::fabs(pi_ld / 2 - std::fabs(second));
}

// +1 when first + third is the combination determined at the nearest singularity, −1 when it is
// first − third (from the θ± forms in the header: Tait–Bryan s·second → +π/2 keeps θ+, proper
// second → 0 keeps θ+).
template <class A>
long double determined_sign(A middle, EulerSequence sequence) {
  const long double second = ld(middle);
  if (is_proper_euler(sequence)) {
    return second < pi_ld / 2 ? 1 : -1;
  }
  const long double s = is_cyclic_euler(sequence) ? 1 : -1;
  return s * second > 0 ? 1 : -1;
}

}  // namespace

TEST_CASE("sequence helpers: axes, proper/Tait–Bryan, cyclic order", "[euler][reference]") {
  // Axis numbering 1-2-3 = x-y-z (common practice, no source).
  STATIC_REQUIRE(euler_axes(EulerSequence::zyx).first == 2);
  STATIC_REQUIRE(euler_axes(EulerSequence::zyx).second == 1);
  STATIC_REQUIRE(euler_axes(EulerSequence::zyx).third == 0);
  STATIC_REQUIRE(euler_axes(EulerSequence::zxz).first == 2);
  STATIC_REQUIRE(euler_axes(EulerSequence::zxz).second == 0);
  STATIC_REQUIRE(euler_axes(EulerSequence::zxz).third == 2);
  int proper = 0, cyclic = 0;
  for (const EulerSequence s : all_euler_sequences) {
    const EulerAxes a = euler_axes(s);
    REQUIRE(a.first != a.second);
    REQUIRE(a.second != a.third);
    proper += is_proper_euler(s) ? 1 : 0;
    cyclic += is_cyclic_euler(s) ? 1 : 0;
    REQUIRE(euler_remaining_axis(s) != a.first);
    REQUIRE(euler_remaining_axis(s) != a.second);
    if (!is_proper_euler(s)) {
      REQUIRE(euler_remaining_axis(s) == a.third);
    }
  }
  REQUIRE(proper == 6);
  REQUIRE(cyclic == 6);
  STATIC_REQUIRE(is_cyclic_euler(EulerSequence::xyz));
  STATIC_REQUIRE(!is_cyclic_euler(EulerSequence::zyx));
  STATIC_REQUIRE(is_cyclic_euler(EulerSequence::zxz));   // (z, x, y) is cyclic
  STATIC_REQUIRE(!is_cyclic_euler(EulerSequence::zyz));  // (z, y, x) is not
  // The band is ε^(1/3) (see the header).
  const float ef = std::numeric_limits<float>::epsilon();
  const double ed = std::numeric_limits<double>::epsilon();
  REQUIRE(std::fabs(EulerSingularBand<float>::half_width - std::cbrt(ef)) <=
          4 * ef * EulerSingularBand<float>::half_width);
  REQUIRE(std::fabs(EulerSingularBand<double>::half_width - std::cbrt(ed)) <=
          4 * ed * EulerSingularBand<double>::half_width);
}

TEMPLATE_TEST_CASE("random rotations: quaternion → angles → quaternion, angles in range", "[euler]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(101);
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    long double worst = 0;
    bool all_in_range = true;
    for (int n = 0; n < test::property_samples; ++n) {
      const Quaternion<T> q = rng.quaternion<T>();
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      all_in_range = all_in_range && in_range(d.angles) && d.angles.sequence == s;
      worst =
          std::fmax(worst, test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)));
      // Scale invariance: a non-unit q gives the angles of q/|q|.
      if (n % 16 == 0) {
        const EulerDecomposition<T> d2 = to_euler_angles(T(1.7) * q, s);
        if (!d.near_singular) {
          REQUIRE(angle_difference(d2.angles.first, d.angles.first) <= 64 * test::eps<T>());
          REQUIRE(angle_difference(d2.angles.third, d.angles.third) <= 64 * test::eps<T>());
        }
        REQUIRE(std::fabs(ld(d2.angles.second) - ld(d.angles.second)) <= 4 * test::eps<T>());
      }
    }
    REQUIRE(all_in_range);
    // Measured worst over all sequences: float 3.5 ε, double 2.9 ε (4.0 and 3.3 in a separate
    // 100,000-sample run).
    report(sizeof(T) == 4 ? "float q->angles->q (eps)" : "double q->angles->q (eps)",
           static_cast<int>(s), worst);
    REQUIRE(worst <= 8);
  }
}

TEMPLATE_TEST_CASE("random angles → quaternion → the same angles", "[euler]", float, double) {
  using T = TestType;
  test::RandomRotations rng(102);
  const long double band = ld(EulerSingularBand<T>::half_width);
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    const bool proper = is_proper_euler(s);
    long double worst_forward = 0, worst_scaled = 0, worst_middle = 0, worst_determined = 0;
    for (int n = 0; n < test::property_samples; ++n) {
      const T a1 = rng.uniform<T>(-pi<T>, pi<T>);
      const T a3 = rng.uniform<T>(-pi<T>, pi<T>);
      const T a2 =
          proper ? rng.uniform<T>(T(0), pi<T>) : rng.uniform<T>(-T(0.5) * pi<T>, T(0.5) * pi<T>);
      const Quaternion<T> q = quaternion_from_euler_angles(EulerAngles<T>{a1, a2, a3, s});
      worst_forward = std::fmax(
          worst_forward, test::quaternion_error_eps(
                             q, rounded<T>(reference_quaternion(ld(a1), ld(a2), ld(a3), s))));
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      const long double u = distance_from_singular(a2, s);
      worst_middle =
          std::fmax(worst_middle, std::fabs(ld(d.angles.second) - ld(a2)) / test::eps<T>());
      // The flag marks exactly the band (a margin of 8 ε for the rounding of the middle angle).
      if (u < band - 8 * test::eps<T>()) {
        REQUIRE(d.near_singular);
      } else if (u > band + 8 * test::eps<T>()) {
        REQUIRE_FALSE(d.near_singular);
      }
      if (!d.near_singular) {
        // Outside the band each angle is off by at most c·ε/min(u, 1): the split's sensitivity.
        const long double e =
            std::fmax(angle_difference(d.angles.first, a1), angle_difference(d.angles.third, a3));
        worst_scaled = std::fmax(worst_scaled, e * std::fmin(u, 1.0L) / test::eps<T>());
      } else {
        const long double k = determined_sign(a2, s);
        const long double got = ld(d.angles.first) + k * ld(d.angles.third);
        worst_determined = std::fmax(worst_determined,
                                     angle_difference(got, ld(a1) + k * ld(a3)) / test::eps<T>());
      }
    }
    // Measured worst over all sequences: forward 1.5 ε (both types); split·min(u,1) float 3.0 ε,
    // double 2.7 ε; middle angle 2 ε; determined combination in the band float 4 ε (no double
    // sample falls in its 6e-6 rad band; the near-singular case below covers it).
    const char* tn = sizeof(T) == 4 ? "float " : "double ";
    report((std::string(tn) + "angles->q vs long double (eps)").c_str(), static_cast<int>(s),
           worst_forward);
    report((std::string(tn) + "split error * min(u,1) (eps)").c_str(), static_cast<int>(s),
           worst_scaled);
    report((std::string(tn) + "middle angle (eps)").c_str(), static_cast<int>(s), worst_middle);
    report((std::string(tn) + "in-band determined comb. (eps)").c_str(), static_cast<int>(s),
           worst_determined);
    REQUIRE(worst_forward <= 4);
    REQUIRE(worst_scaled <= 8);
    REQUIRE(worst_middle <= 8);
    REQUIRE(worst_determined <= 16);
  }
}

TEMPLATE_TEST_CASE("near the singularities: flag set, round trip and middle angle accurate",
                   "[euler]", float, double) {
  using T = TestType;
  test::RandomRotations rng(103);
  const long double band = ld(EulerSingularBand<T>::half_width);
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    const bool proper = is_proper_euler(s);
    long double worst_q = 0, worst_middle = 0, worst_determined = 0;
    for (int n = 0; n < test::property_samples; ++n) {
      // Distance from the singular value: exactly 0, exactly 1e-7, or log-uniform up to the band.
      long double u;
      switch (n % 10) {
        case 0:
          u = 0;
          break;
        case 1:
          u = 1e-7L;
          break;
        default:
          u = rng.log_uniform<long double>(1e-15L, band * 0.999L);
          break;
      }
      const bool upper = (n / 10) % 2 == 0;
      const long double a1 = rng.uniform<long double>(-pi_ld, pi_ld);
      const long double a3 = rng.uniform<long double>(-pi_ld, pi_ld);
      const long double a2 =
          proper ? (upper ? pi_ld - u : u) : (upper ? pi_ld / 2 - u : -(pi_ld / 2 - u));
      CAPTURE(u, a2);
      const Quaternion<T> q = rounded<T>(reference_quaternion(a1, a2, a3, s));
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      REQUIRE(d.near_singular);
      REQUIRE(in_range(d.angles));
      worst_q =
          std::fmax(worst_q, test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)));
      worst_middle =
          std::fmax(worst_middle, std::fabs(ld(d.angles.second) - ld(a2)) / test::eps<T>());
      const long double k = determined_sign(a2, s);
      worst_determined =
          std::fmax(worst_determined,
                    angle_difference(ld(d.angles.first) + k * ld(d.angles.third), a1 + k * a3) /
                        test::eps<T>());
    }
    // Measured worst over all sequences: round trip float 3.25 ε, double 2.5 ε; middle angle
    // 1.23 ε; determined combination float 7.1 ε, double 5.2 ε.
    const char* tn = sizeof(T) == 4 ? "float " : "double ";
    report((std::string(tn) + "near-sing. q round trip (eps)").c_str(), static_cast<int>(s),
           worst_q);
    report((std::string(tn) + "near-sing. middle (eps)").c_str(), static_cast<int>(s),
           worst_middle);
    report((std::string(tn) + "near-sing. determined (eps)").c_str(), static_cast<int>(s),
           worst_determined);
    REQUIRE(worst_q <= 8);
    REQUIRE(worst_middle <= 4);
    REQUIRE(worst_determined <= 16);
  }
  // Just outside the band the flag is clear.
  for (const EulerSequence s : all_euler_sequences) {
    const long double u = band * 1.01L;
    const long double a2 = is_proper_euler(s) ? u : pi_ld / 2 - u;
    const auto d = to_euler_angles(rounded<T>(reference_quaternion(0.3L, a2, -0.2L, s)), s);
    REQUIRE_FALSE(d.near_singular);
  }
}

TEMPLATE_TEST_CASE("exactly at the singularity: third is zero, first holds the combination",
                   "[euler]", float, double) {
  using T = TestType;
  test::RandomRotations rng(104);
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    const EulerAxes ax = euler_axes(s);
    const int c = euler_remaining_axis(s);
    const T sign = is_cyclic_euler(s) ? T(1) : T(-1);
    long double worst_first = 0, worst_q = 0;
    for (int n = 0; n < 1000; ++n) {
      const long double phi = rng.uniform<long double>(-pi_ld, pi_ld);
      const bool upper = n % 2 == 0;
      // Components on (scalar, axis a, axis b, remaining axis c), built so that the pair giving
      // the undetermined combination is exactly zero.
      std::array<T, 4> comp{};
      long double expected_first, expected_second;
      if (is_proper_euler(s)) {
        // second = 0: q = q_a(φ); second = π: q = (0, 0, cos φ/2, s·sin φ/2) on (a, b, c) axes.
        const T ch = static_cast<T>(std::cos(phi / 2)), sh = static_cast<T>(std::sin(phi / 2));
        comp = upper ? std::array<T, 4>{ch, sh, T(0), T(0)}
                     : std::array<T, 4>{T(0), T(0), ch, sign * sh};
        expected_first = phi;
        expected_second = upper ? 0 : pi_ld;
      } else {
        // From the header's forms: (w − s·qb, qa − qc) = 0 ⇔ s·second = π/2 with
        // first + third = 2·atan2(qa + qc, w + s·qb); the other side symmetrically.
        const T al = static_cast<T>(std::cos(phi / 2) / std::sqrt(2.0L));
        const T be = static_cast<T>(std::sin(phi / 2) / std::sqrt(2.0L));
        comp = upper ? std::array<T, 4>{al, be, sign * al, be}
                     : std::array<T, 4>{al, be, -sign * al, -be};
        expected_first = phi;
        expected_second = (upper ? 1 : -1) * static_cast<long double>(sign) * pi_ld / 2;
      }
      Quaternion<T> q{comp[0], T(0), T(0), T(0)};
      T* v[3] = {&q.x, &q.y, &q.z};
      *v[ax.first] = comp[1];
      *v[ax.second] = comp[2];
      *v[c] = comp[3];
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      REQUIRE(d.near_singular);
      REQUIRE(d.angles.third == T(0));
      REQUIRE(in_range(d.angles));
      // The middle angle is the singular value to within the rounding of π (atan2 of (y, 0)).
      REQUIRE(std::fabs(static_cast<long double>(d.angles.second) - expected_second) <=
              2 * test::eps<T>());
      worst_first =
          std::fmax(worst_first, angle_difference(d.angles.first, expected_first) / test::eps<T>());
      worst_q =
          std::fmax(worst_q, test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)));
    }
    const char* tn = sizeof(T) == 4 ? "float " : "double ";
    report((std::string(tn) + "exact-singular first (eps)").c_str(), static_cast<int>(s),
           worst_first);
    report((std::string(tn) + "exact-singular q round trip (eps)").c_str(), static_cast<int>(s),
           worst_q);
    // Measured worst: first (components rounded to T) float 1.8 ε, double 1.6 ε; round trip
    // float 0.75 ε, double 0.75 ε.
    REQUIRE(worst_first <= 6);
    REQUIRE(worst_q <= 3);
    // Through the forward map: proper sequences with second exactly 0 give an exactly zero pair.
    if (is_proper_euler(s)) {
      const T a1 = T(2.5), a3 = T(1.25);
      const auto d =
          to_euler_angles(quaternion_from_euler_angles(EulerAngles<T>{a1, T(0), a3, s}), s);
      REQUIRE(d.near_singular);
      REQUIRE(d.angles.second == T(0));
      REQUIRE(d.angles.third == T(0));
      REQUIRE(angle_difference(d.angles.first, ld(a1) + ld(a3)) <= 8 * test::eps<T>());
    }
  }
}

TEMPLATE_TEST_CASE("identity and 180° rotations", "[euler][reference]", float, double) {
  using T = TestType;
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    const bool proper = is_proper_euler(s);
    for (const Quaternion<T>& id : {Quaternion<T>::identity(), -Quaternion<T>::identity()}) {
      const EulerDecomposition<T> d = to_euler_angles(id, s);
      REQUIRE(d.angles.first == T(0));
      REQUIRE(d.angles.second == T(0));
      REQUIRE(d.angles.third == T(0));
      REQUIRE(d.near_singular == proper);  // proper sequences lock at second = 0
    }
    const EulerAxes ax = euler_axes(s);
    const int c = euler_remaining_axis(s);
    auto half_turn = [](int axis) {
      return Quaternion<T>{T(0), axis == 0 ? T(1) : T(0), axis == 1 ? T(1) : T(0),
                           axis == 2 ? T(1) : T(0)};
    };
    // Expected decompositions, by composing half turns (R_a(π)·R_b(π) = ±R_c(π) for distinct
    // axes; common practice, no source). Unique in our ranges, π rather than −π.
    struct Case {
      int axis;
      long double first, second, third;
    };
    const long double P = ld(pi<T>);
    std::array<Case, 3> cases{};
    if (proper) {
      cases = {Case{ax.first, P, 0, 0}, Case{ax.second, 0, P, 0}, Case{c, P, P, 0}};
    } else {
      cases = {Case{ax.first, P, 0, 0}, Case{ax.second, P, 0, P}, Case{ax.third, 0, 0, P}};
    }
    for (const Case& k : cases) {
      CAPTURE(k.axis);
      const Quaternion<T> q = half_turn(k.axis);
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      REQUIRE(in_range(d.angles));
      REQUIRE(std::fabs(static_cast<long double>(d.angles.first) - k.first) <= 2 * test::eps<T>());
      REQUIRE(std::fabs(static_cast<long double>(d.angles.second) - k.second) <=
              2 * test::eps<T>());
      REQUIRE(std::fabs(static_cast<long double>(d.angles.third) - k.third) <= 2 * test::eps<T>());
      REQUIRE(test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)) <= 4);
    }
    // Half turns about skewed axes: fixed ones and random ones.
    test::RandomRotations rng(105);
    const T r2 = T(1) / std::sqrt(T(2)), r3 = T(1) / std::sqrt(T(3));
    const std::array<Vector3<T>, 4> fixed{Vector3<T>{r2, r2, 0}, Vector3<T>{0, r2, -r2},
                                          Vector3<T>{r3, -r3, r3},
                                          Vector3<T>{T(0.6), T(0), T(0.8)}};
    long double worst_half_turn = 0;
    for (int n = 0; n < 1000; ++n) {
      const Vector3<T> axis = n < 4 ? fixed[static_cast<std::size_t>(n)] : rng.unit_vector<T>();
      const Quaternion<T> q = Quaternion<T>::from_parts(T(0), axis);
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      REQUIRE(in_range(d.angles));
      worst_half_turn = std::fmax(
          worst_half_turn, test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)));
    }
    report(sizeof(T) == 4 ? "float half turns q round trip (eps)"
                          : "double half turns q round trip (eps)",
           static_cast<int>(s), worst_half_turn);
    // Measured worst: float 3.0 ε, double 2.5 ε.
    REQUIRE(worst_half_turn <= 8);
  }
}

TEMPLATE_TEST_CASE("tiny angles keep their relative accuracy", "[euler]", float, double) {
  using T = TestType;
  test::RandomRotations rng(106);
  for (const EulerSequence s : all_euler_sequences) {
    CAPTURE(static_cast<int>(s));
    const bool proper = is_proper_euler(s);
    long double worst_first = 0, worst_second = 0, worst_third = 0, worst_sum = 0, worst_q = 0;
    for (int n = 0; n < test::property_samples; ++n) {
      const T scale = rng.log_uniform<T>(T(1e-30), T(1e-3));
      auto pick = [&](bool positive) {
        const T m = scale * rng.uniform<T>(T(0.5), T(1));
        return positive || rng.uniform<T>(T(0), T(1)) < T(0.5) ? m : -m;
      };
      const T a1 = pick(false), a2 = pick(proper), a3 = pick(false);
      const Quaternion<T> q = quaternion_from_euler_angles(EulerAngles<T>{a1, a2, a3, s});
      const EulerDecomposition<T> d = to_euler_angles(q, s);
      REQUIRE(in_range(d.angles));
      worst_q =
          std::fmax(worst_q, test::quaternion_error_eps(q, quaternion_from_euler_angles(d.angles)) /
                                 ld(scale));
      worst_second = std::fmax(worst_second, test::ulp_error<T>(d.angles.second, ld(a2)));
      if (proper) {
        // second ≪ band: first/third split undetermined; first + third is determined, to an
        // absolute error relative to the size of the rotation (first + third may cancel).
        if (a2 < EulerSingularBand<T>::half_width) {
          REQUIRE(d.near_singular);
        }
        const long double sum = ld(a1) + ld(a3);
        worst_sum = std::fmax(worst_sum, std::fabs(ld(d.angles.first) + ld(d.angles.third) - sum) /
                                             (test::eps<T>() * ld(scale)));
      } else {
        REQUIRE_FALSE(d.near_singular);
        worst_first = std::fmax(worst_first, test::ulp_error<T>(d.angles.first, ld(a1)));
        worst_third = std::fmax(worst_third, test::ulp_error<T>(d.angles.third, ld(a3)));
      }
    }
    // Measured worst: Tait–Bryan first/third 3 ulp; second float 3 ulp, double 4 ulp; q round
    // trip float 1.1, double 1.5 (units of ε·scale); proper first + third float 1.8, double 2.7
    // (units of ε·scale).
    const char* tn = sizeof(T) == 4 ? "float " : "double ";
    report((std::string(tn) + "tiny first (ulp)").c_str(), static_cast<int>(s), worst_first);
    report((std::string(tn) + "tiny second (ulp)").c_str(), static_cast<int>(s), worst_second);
    report((std::string(tn) + "tiny third (ulp)").c_str(), static_cast<int>(s), worst_third);
    report((std::string(tn) + "tiny q round trip (eps*scale)").c_str(), static_cast<int>(s),
           worst_q);
    report((std::string(tn) + "tiny proper first+third (eps*scale)").c_str(), static_cast<int>(s),
           worst_sum);
    REQUIRE(worst_first <= 8);
    REQUIRE(worst_third <= 8);
    REQUIRE(worst_second <= 12);
    REQUIRE(worst_q <= 4);
    REQUIRE(worst_sum <= 8);
  }
  // Mixed scales (Tait–Bryan): a tiny first angle next to a large third (second as tiny as the
  // first) keeps its relative accuracy, thanks to the atan2 of quadratic forms; the sum θ+ + θ−
  // would lose it entirely.
  for (const EulerSequence s : all_euler_sequences) {
    if (is_proper_euler(s)) {
      continue;
    }
    CAPTURE(static_cast<int>(s));
    long double worst = 0;
    for (int n = 0; n < test::property_samples; ++n) {
      const T small = rng.log_uniform<T>(T(1e-30), T(1e-10));
      const T big = rng.uniform<T>(T(-1), T(1));
      const T tiny = small * rng.uniform<T>(T(0.5), T(1));
      const T a1 = n % 2 == 0 ? tiny : big;
      const T a3 = n % 2 == 0 ? big : tiny;
      const T a2 = small * rng.uniform<T>(T(-1), T(1));
      const EulerDecomposition<T> d =
          to_euler_angles(quaternion_from_euler_angles(EulerAngles<T>{a1, a2, a3, s}), s);
      worst = std::fmax(worst, std::fmax(test::ulp_error<T>(d.angles.first, ld(a1)),
                                         test::ulp_error<T>(d.angles.third, ld(a3))));
    }
    report(sizeof(T) == 4 ? "float mixed-scale first/third (ulp)"
                          : "double mixed-scale first/third (ulp)",
           static_cast<int>(s), worst);
    // Measured worst 4 ulp.
    REQUIRE(worst <= 8);
  }
}
