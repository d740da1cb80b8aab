// The fourth-order Magnus step: its rotation vector against the exact one of classical coning,
// local order 5 (global 4), and the sign of the commutator term.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

// Local error (rad) of one Magnus step of length h from t0 on classical coning, against the exact
// relative rotation q(t0)* ⊗ q(t0 + h), in long double. sign = +1 is the method; −1 flips the
// commutator term.
long double local_error(long double h, long double t0, int sign) {
  const ClassicalConingMotion<long double> m{0.1L, 2 * 3.14159265358979323846L * 5};
  const std::array<Vector3<long double>, 3> w{m.rate(t0), m.rate(t0 + h / 2), m.rate(t0 + h)};
  const Vector3<long double> phi = (w[0] + w[2] + 4.0L * w[1]) * (h / 6) +
                                   static_cast<long double>(sign) * Magnus4::commutator_term(w, h);
  const Quaternion<long double> step = quaternion_exp(phi);
  const Quaternion<long double> exact = conjugate(m.attitude(t0)) * m.attitude(t0 + h);
  return angle_between(step, exact);
}

}  // namespace

TEST_CASE("Magnus 4: local error falls as h^5 - a flipped commutator only as h^3",
          "[propagation][order][reference]") {
  // Fourth-order Magnus truncation: local error O(h^5) (Iserles and Nørsett 1999; Blanes, Casas,
  // Oteo and Ros 2009). The commutator sign follows the Bortz equation (Bortz 1971): flipping it
  // leaves an O(h^3) coning error.
  std::vector<double> hs, good, flipped;
  for (int k = 0; k < 6; ++k) {
    const long double h = 0.02L / std::pow(2.0L, k);
    hs.push_back(static_cast<double>(h));
    good.push_back(static_cast<double>(local_error(h, 0.013L, +1)));
    flipped.push_back(static_cast<double>(local_error(h, 0.013L, -1)));
  }
  const double p_good = test::log_log_slope(hs, good), p_flipped = test::log_log_slope(hs, flipped);
  test::report_worst("magnus_4 local order (expect 5)", test::ld(p_good));
  test::report_worst("magnus_4 with flipped commutator local order (expect 3)",
                     test::ld(p_flipped));
  CHECK(std::fabs(p_good - 5.0) <= 0.2);
  CHECK(std::fabs(p_flipped - 3.0) <= 0.2);
}

TEMPLATE_TEST_CASE("Magnus 4 step is q + q ⊗ (exp(φ/2) − 1) with the documented φ", "[propagation]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(311);
  for (int n = 0; n < 1000; ++n) {
    const Quaternion<T> q = rng.quaternion<T>();
    const std::array<Vector3<T>, 3> w{rng.unit_vector<T>(), rng.unit_vector<T>(),
                                      rng.unit_vector<T>()};
    const T dt = T(0.02);
    const Vector3<T> phi = Magnus4::rotation_vector(w, dt);
    REQUIRE(Magnus4::step(q, w, dt) == apply_increment(q, quaternion_exp_minus_one(phi)));
    // Constant rate: the commutator vanishes and φ = ω·dt to rounding.
    const std::array<Vector3<T>, 3> c{w[0], w[0], w[0]};
    REQUIRE(Magnus4::commutator_term(c, dt) == Vector3<T>::zero());
    REQUIRE(test::vector_error_eps(Magnus4::rotation_vector(c, dt), w[0] * dt) <= 2);
  }
}
