// Gibbs vector (classical Rodrigues parameters) and modified Rodrigues parameters.
// Set HALFSPIN_REPORT_WORST=1 to print the worst observed error of each property test.

#include <array>
#include <catch2/catch.hpp>
#include <cstdio>
#include <cstdlib>
#include <string>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/representations/gibbs_vector.hpp"
#include "halfspin/representations/modified_rodrigues.hpp"
#include "halfspin/representations/rotation_matrix.hpp"
#include "test_support.hpp"

using namespace halfspin;
using halfspin::test::eps;
using halfspin::test::property_samples;
using halfspin::test::quaternion_error_eps;
using halfspin::test::RandomRotations;

namespace {

using LV = Vector3<long double>;

void report_worst(const std::string& what, long double worst) { test::report_worst(what, worst); }

template <class T>
std::string tname() {
  return sizeof(T) == sizeof(float) ? " float" : " double";
}

template <class T>
LV widen(const Vector3<T>& v) {
  return {static_cast<long double>(v.x), static_cast<long double>(v.y),
          static_cast<long double>(v.z)};
}

// |a − b| / |b|, in units of ε of T.
template <class T>
long double relative_error_eps(const Vector3<T>& a, const LV& b) {
  return norm(widen(a) - b) / norm(b) / eps<T>();
}

// A rotation of angle θ (long double, rad) about a long double unit axis, rounded once to T.
template <class T>
Quaternion<T> rounded_rotation(long double angle, const LV& axis) {
  const long double c = std::cos(0.5L * angle);
  const long double s = std::sin(0.5L * angle);
  return {static_cast<T>(c), static_cast<T>(s * axis.x), static_cast<T>(s * axis.y),
          static_cast<T>(s * axis.z)};
}

// Same rotation, whatever the sign of either quaternion: the angle between them, in ε.
template <class T>
long double rotation_error_eps(const Quaternion<T>& a, const Quaternion<T>& b) {
  return static_cast<long double>(angle_between(a, b)) / eps<T>();
}

// The skewed half-turn axes used by the edge-case tests (normalized in long double).
std::array<LV, 7> half_turn_axes() {
  const long double r2 = std::sqrt(0.5L), r3 = std::sqrt(1.0L / 3);
  const LV odd = LV{1, -2, 3} / std::sqrt(14.0L);
  return {LV{1, 0, 0},    LV{0, 1, 0},     LV{0, 0, 1}, LV{r2, r2, 0},
          LV{0, -r2, r2}, LV{r3, r3, -r3}, odd};
}

}  // namespace

// ---------------------------------------------------------------------------------------------
// Gibbs vector

TEMPLATE_TEST_CASE("Gibbs vector: round trip over random rotations", "[gibbs]", float, double) {
  using T = TestType;
  RandomRotations rng(401);
  long double worst = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const GibbsVector<T> g = to_gibbs_vector(q);
    REQUIRE_FALSE(g.singular);
    const Quaternion<T> back = quaternion_from_gibbs_vector(g);
    REQUIRE(back.w >= T(0));
    worst = std::fmax(worst, quaternion_error_eps(back, q));
    // q and −q give the same Gibbs vector, bit for bit.
    REQUIRE(to_gibbs_vector(-q).g == g.g);
  }
  report_worst("Gibbs round trip q->g->q" + tname<T>() + " [eps]", worst);
  CHECK(worst <= 3.0L);  // observed 1.0 ε (float and double)
}

TEMPLATE_TEST_CASE("Gibbs vector: g = tan(θ/2)·axis", "[gibbs][reference]", float, double) {
  // g = tan(θ/2)·n (Shuster 1993, definition of the Gibbs vector; from memory).
  using T = TestType;
  RandomRotations rng(402);
  long double worst = 0;
  for (int n = 0; n < property_samples; ++n) {
    const LV axis = rng.unit_vector<long double>();
    const long double angle = rng.uniform<long double>(1e-3L, 3.14159L);
    const GibbsVector<T> g = to_gibbs_vector(rounded_rotation<T>(angle, axis));
    REQUIRE_FALSE(g.singular);
    worst = std::fmax(worst, relative_error_eps(g.g, std::tan(0.5L * angle) * axis));
  }
  report_worst("Gibbs vs tan(θ/2) axis, relative" + tname<T>() + " [eps]", worst);
  CHECK(worst <= 3.0L);  // observed 1.05 ε float, 0.98 ε double
}

TEMPLATE_TEST_CASE("Gibbs vector: composition rule for the Hamilton product", "[gibbs][reference]",
                   float, double) {
  // Composition of Gibbs vectors (Shuster 1993, from memory; the sign of the cross term depends
  // on the product convention). For our Hamilton order q = q1 ⊗ q2 (q2 applied first):
  //   g = (g1 + g2 + g1 × g2) / (1 − g1·g2).
  // Evaluated in long double from the T Gibbs vectors and compared as rotations.
  using T = TestType;
  RandomRotations rng(403);
  long double worst = 0;
  int other_sign_passes = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q1 = rng.quaternion<T>();
    const Quaternion<T> q2 = rng.quaternion<T>();
    const LV g1 = widen(to_gibbs_vector(q1).g);
    const LV g2 = widen(to_gibbs_vector(q2).g);
    const long double den = 1 - dot(g1, g2);
    // As a quaternion (den, g1 + g2 ± g1 × g2)/norm: avoids dividing by a small den.
    const auto as_quaternion = [&](long double sign) {
      const LV num = g1 + g2 + sign * cross(g1, g2);
      const long double s = std::sqrt(den * den + squared_norm(num));
      return Quaternion<long double>{den / s, num.x / s, num.y / s, num.z / s};
    };
    const Quaternion<T> q = q1 * q2;
    const Quaternion<long double> ref = as_quaternion(1);
    const Quaternion<long double> wrong = as_quaternion(-1);
    const Quaternion<long double> ql{static_cast<long double>(q.w), static_cast<long double>(q.x),
                                     static_cast<long double>(q.y), static_cast<long double>(q.z)};
    worst = std::fmax(worst, quaternion_error_eps(ql, ref) * eps<long double>() / eps<T>());
    if (quaternion_error_eps(ql, wrong) * eps<long double>() / eps<T>() <= 4.0L) {
      ++other_sign_passes;
    }
  }
  report_worst("Gibbs composition (Hamilton order) as rotation" + tname<T>() + " [eps]", worst);
  CHECK(worst <= 4.0L);  // observed 1.75 ε float, 1.74 ε double
  CHECK(other_sign_passes == 0);
}

TEMPLATE_TEST_CASE("Gibbs vector: half turns are flagged singular and carry the axis",
                   "[gibbs][edge]", float, double) {
  using T = TestType;
  for (const LV& a : half_turn_axes()) {
    const Quaternion<T> q{T(0), static_cast<T>(a.x), static_cast<T>(a.y), static_cast<T>(a.z)};
    const GibbsVector<T> g = to_gibbs_vector(q);
    REQUIRE(g.singular);
    CHECK(relative_error_eps(g.g, a) <= 1.0L);
    // The axis read back gives the same half turn; so does the opposite axis.
    CHECK(quaternion_error_eps(quaternion_from_gibbs_vector(g), q) <= 1.0L);
    CHECK(rotation_error_eps(quaternion_from_gibbs_vector(GibbsVector<T>{-g.g, true}), q) <= 1.0L);
    // −q = (−0, −v): still flagged, the axis flips (same half turn).
    const GibbsVector<T> gn = to_gibbs_vector(-q);
    REQUIRE(gn.singular);
    CHECK(relative_error_eps(gn.g, -a) <= 1.0L);
  }
  // w so small that |v/w| overflows T: also singular, axis along sign(w)·v.
  const T w_tiny = std::numeric_limits<T>::denorm_min();
  const GibbsVector<T> g = to_gibbs_vector(Quaternion<T>{-w_tiny, T(0.6), T(0), T(0.8)});
  REQUIRE(g.singular);
  CHECK(g.g.x == T(-0.6));
  CHECK(g.g.z == T(-0.8));
  // Non-finite input is passed through, never reported as a half turn.
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const GibbsVector<T> gnan = to_gibbs_vector(Quaternion<T>{nan, T(0.6), T(0), T(0.8)});
  CHECK_FALSE(gnan.singular);
  CHECK_FALSE(is_finite(gnan.g));
  const GibbsVector<T> ginf =
      to_gibbs_vector(Quaternion<T>{T(0), std::numeric_limits<T>::infinity(), T(0), T(0)});
  CHECK_FALSE(ginf.singular);
  CHECK_FALSE(is_finite(ginf.g));
  // Identity: zero, not singular.
  const GibbsVector<T> gi = to_gibbs_vector(Quaternion<T>::identity());
  CHECK_FALSE(gi.singular);
  CHECK(gi.g == Vector3<T>::zero());
  CHECK(quaternion_from_gibbs_vector(gi) == Quaternion<T>::identity());
}

TEMPLATE_TEST_CASE("Gibbs vector: near 0, near π, huge and denormal-sized",
                   "[gibbs][edge][reference]", float, double) {
  // g = tan(θ/2)·n (Shuster 1993, from memory), relative accuracy across the range.
  using T = TestType;
  RandomRotations rng(404);
  long double worst_small = 0, worst_small_back = 0;
  long double worst_near_pi = 0, worst_near_pi_back = 0;
  for (int n = 0; n < property_samples; ++n) {
    const LV axis = rng.unit_vector<long double>();
    const long double small = rng.log_uniform<long double>(1e-30L, 1e-3L);
    const Quaternion<T> qs = rounded_rotation<T>(small, axis);
    const GibbsVector<T> gs = to_gibbs_vector(qs);
    REQUIRE_FALSE(gs.singular);
    worst_small = std::fmax(worst_small, relative_error_eps(gs.g, std::tan(0.5L * small) * axis));
    worst_small_back =
        std::fmax(worst_small_back, quaternion_error_eps(quaternion_from_gibbs_vector(gs), qs));

    const long double delta = rng.log_uniform<long double>(1e-15L, 1e-7L);
    const long double big = 3.14159265358979323846264338327950288L - delta;
    const Quaternion<T> qp = rounded_rotation<T>(big, axis);
    const GibbsVector<T> gp = to_gibbs_vector(qp);
    REQUIRE_FALSE(gp.singular);
    worst_near_pi = std::fmax(worst_near_pi, relative_error_eps(gp.g, std::tan(0.5L * big) * axis));
    worst_near_pi_back =
        std::fmax(worst_near_pi_back, quaternion_error_eps(quaternion_from_gibbs_vector(gp), qp));
  }
  report_worst("Gibbs near 0 relative" + tname<T>() + " [eps]", worst_small);
  report_worst("Gibbs near 0 round trip" + tname<T>() + " [eps]", worst_small_back);
  report_worst("Gibbs near pi relative" + tname<T>() + " [eps]", worst_near_pi);
  report_worst("Gibbs near pi round trip" + tname<T>() + " [eps]", worst_near_pi_back);
  CHECK(worst_small <= 2.5L);         // observed 0.99 ε float, 1.06 ε double
  CHECK(worst_small_back <= 3.0L);    // observed 0.5 ε float, 1.0 ε double
  CHECK(worst_near_pi <= 2.5L);       // observed 1.0 ε float, 0.93 ε double
  CHECK(worst_near_pi_back <= 3.0L);  // observed 1.0 ε (float and double)

  // |g|² overflows T (w = smallest normal): the scaled path still gives the half-turn-like q.
  const T wmin = std::numeric_limits<T>::min();
  const Quaternion<T> qh{wmin, T(0.6), T(0), T(0.8)};
  const GibbsVector<T> gh = to_gibbs_vector(qh);
  REQUIRE_FALSE(gh.singular);
  REQUIRE(squared_norm(gh.g) > std::numeric_limits<T>::max());
  const Quaternion<T> qh_back = quaternion_from_gibbs_vector(gh);
  CHECK(quaternion_error_eps(qh_back, qh) <= 2.0L);
  CHECK(std::fabs(static_cast<long double>(qh_back.w) - static_cast<long double>(wmin)) <=
        2 * eps<T>() * static_cast<long double>(wmin));

  // Denormal-sized vector part: w = 1, so g = v and the round trip are exact.
  const T d = std::numeric_limits<T>::denorm_min();
  const Quaternion<T> qd{T(1), T(3) * d, -d, T(0)};
  const GibbsVector<T> gd = to_gibbs_vector(qd);
  CHECK_FALSE(gd.singular);
  CHECK(gd.g == qd.vector());
  CHECK(quaternion_from_gibbs_vector(gd) == qd);
}

TEMPLATE_TEST_CASE("Gibbs vector: components near T's largest value, and extreme singular axes",
                   "[gibbs][edge][reference]", float, double) {
  // References: (1, g)/√(1 + |g|²) evaluated in long double, whose range holds |g|² for every
  // finite float and double g (x87 extended precision); and the limit: as |g| → ∞ the rotation
  // tends to the half turn about g/|g| (tan(θ/2) → ∞ as θ → π; common practice, no source). Here
  // |g| > √max, so the two differ by 2·atan(1/|g|) < 2/√max, far below ε.
  using T = TestType;
  const T hi = std::numeric_limits<T>::max();
  const T d = std::numeric_limits<T>::denorm_min();
  RandomRotations rng(405);
  long double worst_exact = 0, worst_limit = 0, worst_norm = 0;
  auto check = [&](const Vector3<T>& g) {
    const Quaternion<T> q = quaternion_from_gibbs_vector(GibbsVector<T>{g, false});
    const LV gl = widen(g);
    const long double n = std::sqrt(gl.x * gl.x + gl.y * gl.y + gl.z * gl.z);
    const long double r = std::sqrt(1.0L + n * n);
    const Quaternion<T> exact{static_cast<T>(1.0L / r), static_cast<T>(gl.x / r),
                              static_cast<T>(gl.y / r), static_cast<T>(gl.z / r)};
    const Quaternion<T> limit{T(0), static_cast<T>(gl.x / n), static_cast<T>(gl.y / n),
                              static_cast<T>(gl.z / n)};
    INFO("g = (" << static_cast<double>(g.x) << ", " << static_cast<double>(g.y) << ", "
                 << static_cast<double>(g.z) << ")");
    REQUIRE(is_finite(q));
    REQUIRE(q.w >= T(0));
    worst_exact = std::fmax(worst_exact, quaternion_error_eps(q, exact));
    worst_limit = std::fmax(worst_limit, quaternion_error_eps(q, limit));
    worst_norm = std::fmax(worst_norm, std::fabs(test::norm_ld(q) - 1.0L) / eps<T>());
  };
  // |g| itself overflows T here (the old result was the zero quaternion).
  check(Vector3<T>{hi, hi, hi});
  check(Vector3<T>{hi, -hi / 2, hi / 3});
  check(Vector3<T>{-hi, hi, T(1)});
  // |g|² overflows but |g| does not.
  check(Vector3<T>{hi, T(0), T(0)});
  check(Vector3<T>{T(0), -hi / 4, d});
  for (int n = 0; n < property_samples; ++n) {
    const LV axis = rng.unit_vector<long double>();
    const long double size = rng.log_uniform<long double>(
        2 * std::sqrt(static_cast<long double>(hi)), static_cast<long double>(hi));
    check(Vector3<T>{static_cast<T>(size * axis.x), static_cast<T>(size * axis.y),
                     static_cast<T>(size * axis.z)});
  }
  report_worst("Gibbs huge vs long double" + tname<T>() + " [eps]", worst_exact);
  report_worst("Gibbs huge vs half-turn limit" + tname<T>() + " [eps]", worst_limit);
  report_worst("Gibbs huge norm" + tname<T>() + " [eps]", worst_norm);
  CHECK(worst_exact <= 2.0L);
  CHECK(worst_limit <= 2.0L);
  CHECK(worst_norm <= 3.0L);

  // A unit quaternion whose g = v/w is finite per component but |g| overflows: w in
  // [0.58/max, 1/max), a subnormal in both types. The round trip comes back to q.
  const T c = static_cast<T>(std::sqrt(1.0L / 3));
  const Quaternion<T> near_half_turn{T(0.8) / hi, c, c, -c};
  const GibbsVector<T> gn = to_gibbs_vector(near_half_turn);
  REQUIRE_FALSE(gn.singular);
  REQUIRE(is_finite(gn.g));
  const Quaternion<T> back = quaternion_from_gibbs_vector(gn);
  CHECK(quaternion_error_eps(back, near_half_turn) <= 2.0L);
  CHECK(std::fabs(test::norm_ld(back) - 1.0L) <= 2 * eps<T>());

  // Singular (half turn) with an axis whose length overflows, or is subnormal: still (0, ĝ).
  for (const Vector3<T>& axis : {Vector3<T>{hi, hi, -hi}, Vector3<T>{d, T(2) * d, T(0)},
                                 Vector3<T>{T(3) * d, -d, T(5) * d}, Vector3<T>{T(0), T(0), -d}}) {
    const LV al = widen(axis);
    const long double n = std::sqrt(al.x * al.x + al.y * al.y + al.z * al.z);
    const Quaternion<T> expect{T(0), static_cast<T>(al.x / n), static_cast<T>(al.y / n),
                               static_cast<T>(al.z / n)};
    const Quaternion<T> q = quaternion_from_gibbs_vector(GibbsVector<T>{axis, true});
    CHECK(quaternion_error_eps(q, expect) <= 2.0L);
    CHECK(std::fabs(test::norm_ld(q) - 1.0L) <= 2 * eps<T>());
  }
}

// ---------------------------------------------------------------------------------------------
// Modified Rodrigues parameters

TEMPLATE_TEST_CASE("MRP: round trip, |p| <= 1, shadow set is the same rotation", "[mrp]", float,
                   double) {
  using T = TestType;
  RandomRotations rng(501);
  long double worst_back = 0, worst_norm_excess = 0, worst_shadow_rotation = 0;
  long double worst_shadow_back = 0, worst_shadow_twice = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const ModifiedRodrigues<T> m = to_modified_rodrigues(q);
    worst_norm_excess = std::fmax(worst_norm_excess, (norm(widen(m.p)) - 1) / eps<T>());
    const Quaternion<T> back = quaternion_from_modified_rodrigues(m);
    worst_back = std::fmax(worst_back, quaternion_error_eps(back, q));
    // The short set is kept as is by switch_to_short, bit for bit.
    if (squared_norm(m.p) <= T(1)) {
      REQUIRE(switch_to_short(m).p == m.p);
    }
    // q and −q give the same (short) set.
    REQUIRE(to_modified_rodrigues(-q).p == m.p);

    const ModifiedRodrigues<T> s = shadow_set(m);
    REQUIRE(norm(widen(s.p)) >= 1 - 4 * eps<T>());
    worst_shadow_rotation = std::fmax(
        worst_shadow_rotation, quaternion_error_eps(quaternion_from_modified_rodrigues(s), q));
    const ModifiedRodrigues<T> sw = switch_to_short(s);
    REQUIRE(squared_norm(sw.p) <= T(1) + T(4) * std::numeric_limits<T>::epsilon());
    worst_shadow_back = std::fmax(worst_shadow_back, relative_error_eps(sw.p, widen(m.p)));
    worst_shadow_twice =
        std::fmax(worst_shadow_twice, relative_error_eps(shadow_set(s).p, widen(m.p)));
  }
  report_worst("MRP round trip q->p->q" + tname<T>() + " [eps]", worst_back);
  report_worst("MRP |p| - 1 excess" + tname<T>() + " [eps]", worst_norm_excess);
  report_worst("MRP shadow set as rotation" + tname<T>() + " [eps]", worst_shadow_rotation);
  report_worst("MRP switch_to_short(shadow) vs p, relative" + tname<T>() + " [eps]",
               worst_shadow_back);
  report_worst("MRP shadow(shadow) vs p, relative" + tname<T>() + " [eps]", worst_shadow_twice);
  CHECK(worst_back <= 4.0L);             // observed 1.5 ε (float and double)
  CHECK(worst_norm_excess <= 1.0L);      // observed 0 (|p| never above 1 here)
  CHECK(worst_shadow_rotation <= 5.0L);  // observed 2.0 ε (float and double)
  CHECK(worst_shadow_back <= 5.0L);      // observed 2.14 ε float, 1.98 ε double
  CHECK(worst_shadow_twice <= 5.0L);     // observed 2.14 ε float, 1.98 ε double
}

TEMPLATE_TEST_CASE("MRP: p = tan(θ/4)·axis and the shadow set -cot(θ/4)·axis", "[mrp][reference]",
                   float, double) {
  // p = tan(θ/4)·n, shadow set p_s = −p/|p|² (Shuster 1993, from memory; the shadow of a rotation θ
  // about n is the rotation θ − 2π about n: p_s = tan((θ − 2π)/4)·n = −cot(θ/4)·n).
  // θ is drawn over [1e-3, 2π − 1e-3): above π the short set is the rotation 2π − θ about −n.
  using T = TestType;
  RandomRotations rng(502);
  long double worst_p = 0, worst_shadow = 0;
  const long double two_pi = 6.28318530717958647692528676655900577L;
  for (int n = 0; n < property_samples; ++n) {
    const LV axis = rng.unit_vector<long double>();
    const long double angle = rng.uniform<long double>(1e-3L, two_pi - 1e-3L);
    const ModifiedRodrigues<T> m = to_modified_rodrigues(rounded_rotation<T>(angle, axis));
    const LV short_ref = angle <= two_pi / 2 ? std::tan(0.25L * angle) * axis
                                             : -std::tan(0.25L * (two_pi - angle)) * axis;
    worst_p = std::fmax(worst_p, relative_error_eps(m.p, short_ref));
    const LV shadow_ref = angle <= two_pi / 2 ? -(1 / std::tan(0.25L * angle)) * axis
                                              : (1 / std::tan(0.25L * (two_pi - angle))) * axis;
    worst_shadow = std::fmax(worst_shadow, relative_error_eps(shadow_set(m).p, shadow_ref));
  }
  report_worst("MRP vs tan(θ/4) axis, relative" + tname<T>() + " [eps]", worst_p);
  report_worst("MRP shadow vs -cot(θ/4) axis, relative" + tname<T>() + " [eps]", worst_shadow);
  CHECK(worst_p <= 3.0L);       // observed 1.23 ε float, 1.21 ε double
  CHECK(worst_shadow <= 5.0L);  // observed 2.02 ε float, 1.89 ε double
}

TEMPLATE_TEST_CASE("MRP: composition rule for the Hamilton product", "[mrp][reference]", float,
                   double) {
  // Composition of modified Rodrigues parameters (Shuster 1993, from memory; sign of the cross
  // term checked here for our Hamilton order q = q1 ⊗ q2):
  //   p = ((1 − |p1|²) p2 + (1 − |p2|²) p1 + 2 p1 × p2) / (1 + |p1|²|p2|² − 2 p1·p2).
  // The result may be the shadow set; compared as rotations.
  using T = TestType;
  RandomRotations rng(503);
  long double worst = 0;
  int other_sign_passes = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q1 = rng.quaternion<T>();
    const Quaternion<T> q2 = rng.quaternion<T>();
    const LV p1 = widen(to_modified_rodrigues(q1).p);
    const LV p2 = widen(to_modified_rodrigues(q2).p);
    const long double s1 = squared_norm(p1), s2 = squared_norm(p2);
    const auto as_quaternion = [&](long double sign) {
      const LV num = (1 - s1) * p2 + (1 - s2) * p1 + (2 * sign) * cross(p1, p2);
      const long double den = 1 + s1 * s2 - 2 * dot(p1, p2);
      const LV p = num / den;
      // q = ((1 − |p|²), 2p)/(1 + |p|²) (Shuster 1993, from memory), written out here.
      const long double sp = squared_norm(p);
      return Quaternion<long double>{(1 - sp) / (1 + sp), 2 * p.x / (1 + sp), 2 * p.y / (1 + sp),
                                     2 * p.z / (1 + sp)};
    };
    const Quaternion<T> q = q1 * q2;
    const Quaternion<long double> ql{static_cast<long double>(q.w), static_cast<long double>(q.x),
                                     static_cast<long double>(q.y), static_cast<long double>(q.z)};
    worst = std::fmax(worst,
                      quaternion_error_eps(ql, as_quaternion(1)) * eps<long double>() / eps<T>());
    if (quaternion_error_eps(ql, as_quaternion(-1)) * eps<long double>() / eps<T>() <= 5.0L) {
      ++other_sign_passes;
    }
  }
  report_worst("MRP composition (Hamilton order) as rotation" + tname<T>() + " [eps]", worst);
  CHECK(worst <= 5.0L);  // observed 1.97 ε float, 1.95 ε double
  CHECK(other_sign_passes == 0);
}

TEMPLATE_TEST_CASE("MRP: half turns have |p| = 1 and both sets are valid", "[mrp][edge]", float,
                   double) {
  using T = TestType;
  for (const LV& a : half_turn_axes()) {
    const Quaternion<T> q{T(0), static_cast<T>(a.x), static_cast<T>(a.y), static_cast<T>(a.z)};
    const ModifiedRodrigues<T> m = to_modified_rodrigues(q);
    CHECK(std::fabs(norm(widen(m.p)) - 1) <= 2 * eps<T>());
    CHECK(relative_error_eps(m.p, a) <= 2.0L);
    // The shadow of a half turn is −p: the same half turn.
    const ModifiedRodrigues<T> s = shadow_set(m);
    CHECK(relative_error_eps(s.p, -widen(m.p)) <= 3.0L);
    CHECK(rotation_error_eps(quaternion_from_modified_rodrigues(m), q) <= 4.0L);
    CHECK(rotation_error_eps(quaternion_from_modified_rodrigues(s), q) <= 4.0L);
    CHECK(rotation_error_eps(quaternion_from_modified_rodrigues(ModifiedRodrigues<T>{-m.p}), q) <=
          4.0L);
  }
  // Identity: p = 0 exactly and back.
  const ModifiedRodrigues<T> mi = to_modified_rodrigues(Quaternion<T>::identity());
  CHECK(mi.p == Vector3<T>::zero());
  CHECK(quaternion_from_modified_rodrigues(mi) == Quaternion<T>::identity());
}

TEMPLATE_TEST_CASE("MRP: near 0, near π, huge shadow and denormal-sized", "[mrp][edge][reference]",
                   float, double) {
  // p = tan(θ/4)·n (Shuster 1993, from memory), relative accuracy across the range.
  using T = TestType;
  RandomRotations rng(504);
  long double worst_small = 0, worst_small_back = 0, worst_near_pi = 0, worst_near_pi_back = 0;
  for (int n = 0; n < property_samples; ++n) {
    const LV axis = rng.unit_vector<long double>();
    const long double small = rng.log_uniform<long double>(1e-30L, 1e-3L);
    const Quaternion<T> qs = rounded_rotation<T>(small, axis);
    const ModifiedRodrigues<T> ms = to_modified_rodrigues(qs);
    worst_small = std::fmax(worst_small, relative_error_eps(ms.p, std::tan(0.25L * small) * axis));
    worst_small_back = std::fmax(worst_small_back,
                                 quaternion_error_eps(quaternion_from_modified_rodrigues(ms), qs));

    const long double delta = rng.log_uniform<long double>(1e-15L, 1e-7L);
    const long double big = 3.14159265358979323846264338327950288L - delta;
    const Quaternion<T> qp = rounded_rotation<T>(big, axis);
    const ModifiedRodrigues<T> mp = to_modified_rodrigues(qp);
    worst_near_pi =
        std::fmax(worst_near_pi, relative_error_eps(mp.p, std::tan(0.25L * big) * axis));
    worst_near_pi_back = std::fmax(
        worst_near_pi_back, quaternion_error_eps(quaternion_from_modified_rodrigues(mp), qp));
  }
  report_worst("MRP near 0 relative" + tname<T>() + " [eps]", worst_small);
  report_worst("MRP near 0 round trip" + tname<T>() + " [eps]", worst_small_back);
  report_worst("MRP near pi relative" + tname<T>() + " [eps]", worst_near_pi);
  report_worst("MRP near pi round trip" + tname<T>() + " [eps]", worst_near_pi_back);
  CHECK(worst_small <= 2.5L);         // observed 1.06 ε float, 1.12 ε double
  CHECK(worst_small_back <= 1.5L);    // observed 0.5 ε (float and double)
  CHECK(worst_near_pi <= 3.0L);       // observed 0.94 ε float, 1.21 ε double
  CHECK(worst_near_pi_back <= 4.0L);  // observed 1.24 ε float, 1.47 ε double

  // A tiny rotation's shadow set is huge (|p|² overflows T): quaternion_from_modified_rodrigues
  // factors |p| out and returns −q of the tiny rotation, the same rotation.
  const T tiny = std::is_same<T, float>::value ? T(1e-30f) : T(1e-200);
  const ModifiedRodrigues<T> mt{Vector3<T>{tiny, T(0), T(0)}};
  const ModifiedRodrigues<T> huge = shadow_set(mt);
  REQUIRE(squared_norm(huge.p) > std::numeric_limits<T>::max());
  CHECK(std::fabs(static_cast<long double>(huge.p.x) + 1 / static_cast<long double>(tiny)) <=
        eps<T>() / static_cast<long double>(tiny));
  const Quaternion<T> from_huge = quaternion_from_modified_rodrigues(huge);
  const Quaternion<T> from_tiny = quaternion_from_modified_rodrigues(mt);
  CHECK(from_huge.w == T(-1));
  CHECK(std::fabs(static_cast<long double>(from_huge.x) + static_cast<long double>(from_tiny.x)) <=
        2 * eps<T>() * static_cast<long double>(from_tiny.x));
  CHECK(switch_to_short(huge).p.x > T(0));
  CHECK(relative_error_eps(switch_to_short(huge).p, widen(mt.p)) <= 4.0L);

  // Denormal-sized vector part: p = v/2 to within half a denormal step, back to within one.
  const T d = std::numeric_limits<T>::denorm_min();
  const Quaternion<T> qd{T(1), T(6) * d, T(-2) * d, T(5) * d};
  const ModifiedRodrigues<T> md = to_modified_rodrigues(qd);
  CHECK(md.p.x == T(3) * d);
  CHECK(md.p.y == -d);
  CHECK(std::fabs(static_cast<long double>(md.p.z) - 2.5L * static_cast<long double>(d)) <=
        0.5L * static_cast<long double>(d));
  const Quaternion<T> qd_back = quaternion_from_modified_rodrigues(md);
  CHECK(qd_back.w == T(1));
  CHECK(qd_back.x == qd.x);
  CHECK(qd_back.y == qd.y);
  CHECK(std::fabs(static_cast<long double>(qd_back.z) - static_cast<long double>(qd.z)) <=
        static_cast<long double>(d));
}

TEMPLATE_TEST_CASE("Gibbs and MRP: scale-invariant in the quaternion", "[gibbs][mrp]", float,
                   double) {
  // A slightly non-unit attitude (as propagation leaves it) gives the parameters of q/|q|.
  using T = TestType;
  RandomRotations rng(505);
  long double worst_gibbs = 0, worst_mrp = 0;
  for (int n = 0; n < property_samples; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const T k = rng.uniform<T>(T(0.5), T(2));
    const Quaternion<T> kq = k * q;
    worst_gibbs = std::fmax(worst_gibbs,
                            relative_error_eps(to_gibbs_vector(kq).g, widen(to_gibbs_vector(q).g)));
    worst_mrp = std::fmax(worst_mrp, relative_error_eps(to_modified_rodrigues(kq).p,
                                                        widen(to_modified_rodrigues(q).p)));
    // Powers of two scale exactly.
    REQUIRE(to_gibbs_vector(T(4) * q).g == to_gibbs_vector(q).g);
    REQUIRE(to_modified_rodrigues(T(0.25) * q).p == to_modified_rodrigues(q).p);
  }
  report_worst("Gibbs scale invariance, relative" + tname<T>() + " [eps]", worst_gibbs);
  report_worst("MRP scale invariance, relative" + tname<T>() + " [eps]", worst_mrp);
  CHECK(worst_gibbs <= 3.0L);  // observed 1.22 ε float, 1.16 ε double
  CHECK(worst_mrp <= 5.0L);    // observed 1.90 ε float, 2.01 ε double
}
