// The attitude error a gyro's own errors cause (bounds/sensor_error.hpp): each formula against
// IEEE Std 952-1997 Annex C's noise model through GSL quadrature, against simulation through the
// propagator, and the criterion built on it.

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_integration.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <cstdint>
#include <limits>
#include <vector>

#include "halfspin/bounds/sensor_error.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/representations/rotation_vector.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"

namespace {

using namespace halfspin;

// ∫₀^∞ g(f)·w(f) df for g = 1/f² times a trigonometric polynomial, by GSL: qag (61-point
// Gauss–Kronrod) on [0, a], and on [a, ∞) the constant part exactly plus each cosine by
// gsl_integration_qawf (the Fourier-integral routine, QAWF). `constant` and the cosine terms
// (coefficient, angular frequency in rad per Hz) describe the numerator: c0 + Σ c_i·cos(ω_i f).
struct TrigOverSquare {
  double constant;
  std::vector<std::pair<double, double>> cosines;
  double value(double f) const {
    double n = constant;
    for (const auto& c : cosines) n += c.first * std::cos(c.second * f);
    return n / (f * f);
  }
};

double integrate_to_infinity(const TrigOverSquare& g, double a) {
  gsl_integration_workspace* ws = gsl_integration_workspace_alloc(2000);
  gsl_integration_workspace* cycles = gsl_integration_workspace_alloc(2000);
  gsl_function f;
  f.function = [](double x, void* p) { return static_cast<const TrigOverSquare*>(p)->value(x); };
  f.params = const_cast<TrigOverSquare*>(&g);
  double head = 0, error = 0;
  // Near 0 the numerator vanishes to second order (a cancellation): evaluate from a tiny offset;
  // the integrand is bounded there, so the piece left out is below 1e-12 of the whole.
  REQUIRE(gsl_integration_qag(&f, 1e-12, a, 0.0, 1e-12, 2000, GSL_INTEG_GAUSS61, ws, &head,
                              &error) == 0);
  double tail = g.constant / a;
  for (const auto& c : g.cosines) {
    gsl_integration_qawo_table* table =
        gsl_integration_qawo_table_alloc(c.second, 1.0, GSL_INTEG_COSINE, 200);
    gsl_function h;
    h.function = [](double x, void*) { return 1.0 / (x * x); };
    h.params = nullptr;
    double part = 0;
    REQUIRE(gsl_integration_qawf(&h, a, 1e-12, 2000, ws, cycles, table, &part, &error) == 0);
    tail += c.first * part;
    gsl_integration_qawo_table_free(table);
  }
  gsl_integration_workspace_free(cycles);
  gsl_integration_workspace_free(ws);
  return head + tail;
}

constexpr double pi_d = 3.141592653589793238462643383279502884;

}  // namespace

TEST_CASE("white rate noise: angle error N times root t, from Annex C's spectrum", "[reference]") {
  // Reference: IEEE Std 952-1997 Annex C, white rate noise S_Ω(f) = N² (two-sided), whose Allan
  // variance is σ²(τ) = 4∫₀^∞ S_Ω(f)·sin⁴(πfτ)/(πfτ)² df = N²/τ; the angle over [0, t] is the
  // rate through the integrator, |H(f)|² = sin²(πft)/(πf)², so Var θ(t) = 2∫₀^∞ S_Ω·|H|² df.
  // Both integrals by GSL (qag + qawf). The same S gives N²/τ (the term's definition) and N²·t
  // (the header's formula): the formula is tied to the figure a datasheet or an Allan plot gives.
  const double n = 2.5e-4;  // rad/√s (invented; about 0.86 °/√h)
  for (const double t : {0.5, 3.0, 40.0}) {
    // sin²(πft) = (1 − cos 2πft)/2.
    const TrigOverSquare attitude{0.5, {{-0.5, 2 * pi_d * t}}};
    const double variance = 2 * n * n / (pi_d * pi_d) * integrate_to_infinity(attitude, 50.0 / t);
    const double formula =
        sensor_attitude_error(GyroNoiseTerms<double>{n, 0, 0, 0}, t).angle_random_walk_rad;
    CHECK(std::sqrt(variance) == Approx(formula).epsilon(1e-7));
  }
  for (const double tau : {0.01, 1.0, 30.0}) {
    // sin⁴(πfτ) = (3 − 4 cos 2πfτ + cos 4πfτ)/8.
    const TrigOverSquare allan{3.0 / 8, {{-0.5, 2 * pi_d * tau}, {1.0 / 8, 4 * pi_d * tau}}};
    const double variance =
        4 * n * n / (pi_d * pi_d * tau * tau) * integrate_to_infinity(allan, 50.0 / tau);
    CHECK(std::sqrt(variance) == Approx(n / std::sqrt(tau)).epsilon(1e-7));
  }
}

TEST_CASE("white rate noise through the propagator: per-axis error N times root t", "[reference]") {
  // Simulation: a still gyro with white rate noise N (synthetic_gyro.hpp: a delta-angle sample
  // has σ = N·√dt), propagated with two-sample coning in double for t s, over many seeds. Each
  // axis's error (the rotation vector of the attitude, truth being the identity) is a zero-mean
  // Gaussian of variance N²·t to first order (the noise rotations' commutators are of order
  // (N√t)², 1e-6 of the error here). The sample variance over 3·seeds axes is checked against
  // the chi-squared interval with 99.99 % coverage (GSL gsl_cdf_chisq_Pinv).
  const double n = 3e-4;  // rad/√s
  const double dt = 1e-3;
  const int samples = 4000;  // t = 4 s
  const int seeds = 200;
  const double t = samples * dt;
  double sum_squares = 0;
  for (int s = 0; s < seeds; ++s) {
    const ConstantRateMotion<double> still{Quaternion<double>::identity(), {0, 0, 0}};
    GyroErrorModel<double> model;
    model.noise_density = n;
    SyntheticGyro<double, ConstantRateMotion<double>> gyro(still, GyroOutputForm::delta_angle, dt,
                                                           model, 1000 + std::uint64_t(s));
    Propagator<double, Coning2Sample> p(Quaternion<double>::identity(), GyroLimits<double>{10, 1});
    for (int k = 0; k < samples; ++k) {
      const Status status = p.push(gyro.next(), dt);
      REQUIRE((status == Status::ok || status == Status::waiting_for_samples));
    }
    const Vector3<double> e = to_rotation_vector(p.attitude());
    sum_squares += e.x * e.x + e.y * e.y + e.z * e.z;
  }
  const double dof = 3.0 * seeds;
  const double expected =
      sensor_attitude_error(GyroNoiseTerms<double>{n, 0, 0, 0}, t).angle_random_walk_rad;
  const double ratio = sum_squares / (dof * expected * expected);  // ~ χ²(dof)/dof
  INFO("sample variance / (N^2 t) = " << ratio);
  CHECK(ratio >= gsl_cdf_chisq_Pinv(0.5e-4, dof) / dof);
  CHECK(ratio <= gsl_cdf_chisq_Pinv(1 - 0.5e-4, dof) / dof);
}

TEST_CASE("rate random walk: angle error K t^(3/2) over root 3", "[reference]") {
  // Common practice, no source: a rate that random-walks from its known start value is a
  // Wiener process W of intensity K², and ∫₀ᵗ W = ∫₀ᵗ (t − s) dW(s) (integration by parts), so
  // Var = K²·∫₀ᵗ (t − s)² ds = K²·t³/3 (the Itô isometry). Checked here against a simulation of
  // the discrete walk (bias steps of σ = K·√dt each sample, the angle summed at the sample
  // rate), whose exact variance is K²·dt³·Σ_{j=1..n} j² = K²·t³/3·(1 + 3/(2n) + 1/(2n²)); the
  // sample variance must fall in its 99.99 % chi-squared interval (GSL).
  const double k = 2e-5;  // rad/s/√s
  const double dt = 0.01;
  const int n = 1000;  // t = 10 s
  const int seeds = 600;
  const double t = n * dt;
  GaussianNoiseSource<double> noise(77);
  double sum_squares = 0;
  for (int s = 0; s < seeds; ++s) {
    double bias = 0, angle = 0;
    for (int j = 0; j < n; ++j) {
      bias += k * std::sqrt(dt) * noise.next_gaussian();
      angle += bias * dt;
    }
    sum_squares += angle * angle;
  }
  const double discrete = 1 + 3.0 / (2 * n) + 1.0 / (2.0 * n * n);
  const double formula =
      sensor_attitude_error(GyroNoiseTerms<double>{0, 0, k, 0}, t).rate_random_walk_rad;
  const double ratio = sum_squares / (seeds * formula * formula * discrete);
  INFO("sample variance / (K^2 t^3 / 3) = " << ratio);
  CHECK(ratio >= gsl_cdf_chisq_Pinv(0.5e-4, seeds) / seeds);
  CHECK(ratio <= gsl_cdf_chisq_Pinv(1 - 0.5e-4, seeds) / seeds);
}

TEST_CASE("a constant residual bias turns the attitude by b t", "[reference]") {
  // Common practice, no source: a constant rate error b about one axis is a rotation of b·t about
  // it. Through the propagator (double, the exponential map is exact for a constant rate) the
  // attitude error after t s equals the formula to a few ulp per step.
  const double b = 1e-4;  // rad/s (about 20.6 °/h)
  const double dt = 2e-3;
  const int samples = 5000;  // 10 s
  Propagator<double, Coning2Sample> p(Quaternion<double>::identity(), GyroLimits<double>{10, 1});
  for (int k = 0; k < samples; ++k) {
    p.push(Vector3<double>{0, b * dt, 0}, dt);
  }
  const double measured = angle_between(p.attitude(), Quaternion<double>::identity());
  const double formula =
      sensor_attitude_error(GyroNoiseTerms<double>{0, 0, 0, -b}, samples * dt).residual_bias_rad;
  CHECK(measured == Approx(formula).epsilon(1e-10));
}

TEST_CASE("datasheet units convert to SI", "[reference]") {
  // Common practice, no source: 1° = π/180 rad, 1 h = 3600 s, √h = 60 √s. Values from memory of
  // the usual conversion tables: 1 °/√h = 2.9089e-4 rad/√s, 1 °/h = 4.8481e-6 rad/s.
  CHECK(angle_random_walk_from_degrees_per_root_hour(1.0) == Approx(2.9088820866572158e-4));
  CHECK(rate_from_degrees_per_hour(1.0) == Approx(4.84813681109536e-6));
  CHECK(rate_random_walk_from_degrees_per_hour_root_hour(1.0) == Approx(4.84813681109536e-6 / 60));
  CHECK(angle_random_walk_from_degrees_per_root_hour(1.0F) == Approx(2.9088820866572158e-4));
}

TEST_CASE("sensor error: terms, combination and the fraction criterion", "[bounds]") {
  const GyroNoiseTerms<double> g{1e-4, 2e-5, 3e-6, -4e-5};
  const double t = 100;
  const SensorAttitudeError<double> e = sensor_attitude_error(g, t);
  CHECK(e.angle_random_walk_rad == Approx(1e-4 * 10));
  CHECK(e.rate_random_walk_rad == Approx(3e-6 * 1000 / std::sqrt(3.0)));
  CHECK(e.bias_instability_rad == Approx(2e-5 * 100));
  CHECK(e.residual_bias_rad == Approx(4e-5 * 100));
  const double rss = std::sqrt(e.angle_random_walk_rad * e.angle_random_walk_rad +
                               e.rate_random_walk_rad * e.rate_random_walk_rad +
                               e.bias_instability_rad * e.bias_instability_rad +
                               e.residual_bias_rad * e.residual_bias_rad);
  CHECK(e.combined_rad == Approx(rss).epsilon(1e-15));
  // The root-sum-square is between half the linear sum and the linear sum (four terms).
  const double linear = e.angle_random_walk_rad + e.rate_random_walk_rad + e.bias_instability_rad +
                        e.residual_bias_rad;
  CHECK(e.combined_rad <= linear);
  CHECK(e.combined_rad >= linear / 2);
  CHECK(sensor_fraction_budget(g, t, 0.1) == Approx(0.1 * rss));
  // Float agrees with double to float's rounding.
  const GyroNoiseTerms<float> gf{1e-4F, 2e-5F, 3e-6F, -4e-5F};
  CHECK(sensor_attitude_error(gf, 100.0F).combined_rad == Approx(rss).epsilon(1e-6));
  // No overflow or underflow in the combination at extreme scales.
  CHECK(sensor_attitude_error(GyroNoiseTerms<float>{0, 0, 0, 1e-30F}, 1e-10F).combined_rad ==
        Approx(1e-40).epsilon(1e-3));
  CHECK(std::isfinite(
      sensor_attitude_error(GyroNoiseTerms<float>{0, 0, 0, 1e30F}, 1e6F).combined_rad));
  // A perfect gyro: no sensor error, so the criterion allows nothing (only an absolute budget
  // can apply).
  CHECK(sensor_attitude_error(GyroNoiseTerms<double>{}, t).combined_rad == 0);
}

TEST_CASE("sensor error: invalid terms, horizon or fraction give NaN", "[bounds]") {
  const double inf = std::numeric_limits<double>::infinity();
  const double nan = std::numeric_limits<double>::quiet_NaN();
  CHECK(
      std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{-1e-4, 0, 0, 0}, 1.0).combined_rad));
  CHECK(
      std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{0, -1e-5, 0, 0}, 1.0).combined_rad));
  CHECK(
      std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{0, 0, -1e-6, 0}, 1.0).combined_rad));
  CHECK(std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{nan, 0, 0, 0}, 1.0).combined_rad));
  CHECK(std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{0, 0, 0, inf}, 1.0).combined_rad));
  CHECK(std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, 0.0).combined_rad));
  CHECK(std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, inf).combined_rad));
  CHECK(std::isnan(sensor_attitude_error(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, nan).combined_rad));
  CHECK(std::isnan(sensor_fraction_budget(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, 1.0, 0.0)));
  CHECK(std::isnan(sensor_fraction_budget(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, 1.0, 1.5)));
  CHECK(std::isnan(sensor_fraction_budget(GyroNoiseTerms<double>{1e-4, 0, 0, 0}, 1.0, nan)));
}
