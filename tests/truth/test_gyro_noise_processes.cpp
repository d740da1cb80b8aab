// The synthetic gyro's noise processes measured the way an engineer reads a gyro: the overlapping
// Allan deviation of a static log (IEEE Std 952-1997 Annex C). White rate noise gives N/√τ, a rate
// random walk K·√(τ/3), the bias-instability bank its derived Allan variance, flat within 1 % of
// √(2 ln 2/π)·B over its band; the derivations (truth/bias_instability.hpp) against GSL
// quadrature of Annex C's integral of the power spectral density; and the new processes leave
// the old models' sequences alone.
//
// Statistical checks use chi-squared intervals with ν = n − 1 degrees of freedom for n = ⌊N/m⌋
// independent clusters (the distribution behind Annex C's percentage error 1/√(2(n − 1)); GSL
// gsl_cdf_chisq_Pinv), at 99.9 % per point so that the ~20 points of a case rarely fail
// together by chance (Bonferroni: at most 2 % family-wise). The seeds are fixed, so the outcome
// is deterministic; each case also checks that a 15 % wrong parameter is rejected, so the
// intervals are narrow enough to mean something.

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <functional>
#include <string>
#include <vector>

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_integration.h>
#include <catch2/catch.hpp>

#include "halfspin/truth/bias_instability.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "test_support.hpp"

namespace {

using halfspin::BiasInstabilityBank;
using halfspin::ConstantRateMotion;
using halfspin::GyroErrorModel;
using halfspin::GyroOutputForm;
using halfspin::Quaternion;
using halfspin::SyntheticGyro;
using halfspin::Vector3;
using LD = long double;

constexpr double ln2 = 0.693147180559945309417;
constexpr double pi_d = 3.14159265358979323846;

// One point of an overlapping Allan deviation, with its chi-squared interval.
struct AllanPoint {
  std::size_t m;
  double tau;
  double deviation;
  double low;
  double high;
};

// Quantile p of the chi-squared distribution with ν degrees of freedom: GSL gsl_cdf_chisq_Pinv up
// to ν = 10⁴ (its inversion stops converging further up), above it the Wilson–Hilferty cube-root
// normal approximation ν(1 − 2/(9ν) + z_p√(2/(9ν)))³ (common practice, no source; its relative
// error there is below 1e-6, far inside the intervals' width).
double chi_squared_quantile(double p, double nu) {
  if (nu <= 1e4) return gsl_cdf_chisq_Pinv(p, nu);
  const double h = 2 / (9 * nu);
  const double c = 1 - h + gsl_cdf_ugaussian_Pinv(p) * std::sqrt(h);
  return nu * c * c * c;
}

// Overlapping Allan deviation (IEEE Std 952-1997 Annex C) of per-sample angle increments
// (rad) at octave cluster sizes m = 1, 2, 4, … while n = ⌊N/m⌋ ≥ 2, from the cumulative angle
// θ_0 = 0, θ_k = Σ_{i<k} increment_i (mean removed, long double):
//   σ²(mτ0) = Σ_{k=0}^{N−2m} (θ_{k+2m} − 2θ_{k+m} + θ_k)² / (2 (mτ0)² (N − 2m + 1)).
// Written here independently of the tool (examples/tools/noise/), in memory.
std::vector<AllanPoint> allan(const std::vector<double>& increment, double tau0,
                              double confidence) {
  const std::size_t n = increment.size();
  LD mean = 0;
  for (double v : increment) mean += static_cast<LD>(v);
  mean /= static_cast<LD>(n);
  std::vector<LD> theta(n + 1, 0);
  for (std::size_t i = 0; i < n; ++i)
    theta[i + 1] = theta[i] + (static_cast<LD>(increment[i]) - mean);
  std::vector<AllanPoint> out;
  for (std::size_t m = 1; n / m >= 2; m *= 2) {
    LD sum = 0;
    for (std::size_t k = 0; k + 2 * m <= n; ++k) {
      const LD d = theta[k + 2 * m] - 2 * theta[k + m] + theta[k];
      sum += d * d;
    }
    const double tau = static_cast<double>(m) * tau0;
    const double variance = static_cast<double>(
        sum / (2 * static_cast<LD>(tau) * static_cast<LD>(tau) * static_cast<LD>(n - 2 * m + 1)));
    const double nu = static_cast<double>(n / m - 1);
    const double tail = 0.5 * (1 - confidence);
    out.push_back({m, tau, std::sqrt(variance),
                   std::sqrt(variance * nu / chi_squared_quantile(1 - tail, nu)),
                   std::sqrt(variance * nu / chi_squared_quantile(tail, nu))});
  }
  return out;
}

// One axis of a static gyro's samples as angle increments (rad): delta-angles as they are,
// rates times dt.
template <class T>
std::vector<double> static_log(GyroOutputForm form, T dt, const GyroErrorModel<T>& model,
                               std::uint64_t seed, std::size_t count, int axis) {
  const ConstantRateMotion<T> still{Quaternion<T>::identity(), {0, 0, 0}};
  SyntheticGyro<T, ConstantRateMotion<T>> gyro(still, form, dt, model, seed);
  std::vector<double> out(count);
  for (double& v : out) {
    const Vector3<T> s = gyro.next();
    const double value = static_cast<double>(s[axis]);
    v = form == GyroOutputForm::rate ? value * static_cast<double>(dt) : value;
  }
  return out;
}

// The points (with at least `min_clusters` clusters and τ ≤ max_tau) whose interval does not
// hold expected(τ), listed in `text`.
struct Agreement {
  int points = 0;
  int outside = 0;
  std::string text;
};
Agreement agree(const std::vector<AllanPoint>& curve, std::size_t count, std::size_t min_clusters,
                const std::function<double(double)>& expected, double max_tau = 1e300) {
  Agreement a;
  for (const AllanPoint& p : curve) {
    if (count / p.m < min_clusters || p.tau > max_tau) continue;
    ++a.points;
    const double e = expected(p.tau);
    const bool inside = e >= p.low && e <= p.high;
    if (!inside) ++a.outside;
    a.text += (inside ? "  tau " : "  OUTSIDE tau ") + std::to_string(p.tau) +
              " s: " + std::to_string(p.low) + " <= " + std::to_string(p.deviation) +
              " <= " + std::to_string(p.high) + ", expected " + std::to_string(e) + "\n";
  }
  return a;
}

// Annex C's Allan variance of a rate PSD S (two-sided, rad²/s²/Hz), by GSL quadrature:
//   σ²(τ) = 4∫₀^∞ S(f) sin⁴(πfτ)/(πfτ)² df = (4/(πτ)) ∫₀^∞ S(x/(πτ)) sin⁴x/x² dx,
// summed over the half-periods [jπ, (j+1)π] (gsl_integration_qags, relative 1e-12) until the
// tail, below S(X/(πτ))/X for the decreasing PSDs used here, is under 1e-13 of the sum.
double annex_c_allan_variance(const std::function<double(double)>& psd, double tau) {
  struct Params {
    const std::function<double(double)>* psd;
    double tau;
  } params{&psd, tau};
  gsl_function f;
  f.function = [](double x, void* v) -> double {
    const Params* p = static_cast<const Params*>(v);
    if (x == 0) return 0;
    const double s = std::sin(x);
    return (*p->psd)(x / (pi_d * p->tau)) * s * s * s * s / (x * x);
  };
  f.params = &params;
  gsl_integration_workspace* ws = gsl_integration_workspace_alloc(1000);
  double sum = 0;
  double x = 0;
  for (int j = 0; j < 2000000; ++j) {
    double result = 0, error = 0;
    REQUIRE(gsl_integration_qags(&f, x, x + pi_d, 0, 1e-12, 1000, ws, &result, &error) == 0);
    sum += result;
    x += pi_d;
    if (psd(x / (pi_d * tau)) / x < 1e-13 * sum) break;
  }
  gsl_integration_workspace_free(ws);
  return 4 / (pi_d * tau) * sum;
}

}  // namespace

TEST_CASE("flicker rate noise has the flat Allan deviation sqrt(2 ln 2/pi) B",
          "[truth][reference]") {
  // IEEE Std 952-1997 Annex C: S(f) = B²/(2πf) gives σ²(τ) = (2 ln 2/π)·B² at every τ, through
  // ∫₀^∞ sin⁴x/x³ dx = ln 2. Checked by GSL quadrature of Annex C's integral (the 1/f PSD decays
  // too slowly for the tail rule, so its tail ∫_X^∞ sin⁴x/x³ dx is bounded by 1/(2X²) instead).
  const double b = 3e-5;
  for (const double tau : {0.01, 1.0, 250.0}) {
    gsl_function f;
    f.function = [](double x, void*) -> double {
      if (x < 1e-4) return x * (1 - 2 * x * x / 3);  // sin⁴x/x³ = x − 2x³/3 + …
      const double s = std::sin(x);
      return s * s * s * s / (x * x * x);
    };
    f.params = nullptr;
    gsl_integration_workspace* ws = gsl_integration_workspace_alloc(10000);
    double result = 0, error = 0;
    REQUIRE(gsl_integration_qags(&f, 0, 2e4, 0, 1e-13, 10000, ws, &result, &error) == 0);
    gsl_integration_workspace_free(ws);
    const double integral = result + 0.375 / (2e4 * 2e4);  // tail: the mean of sin⁴ is 3/8
    CHECK(std::fabs(integral - ln2) < 1e-8);
    // (4 B²/(2π)) ∫ sin⁴x/x³ dx, with x = πfτ: the τ drops out.
    const double variance = 4 * b * b / (2 * pi_d) * integral;
    CHECK(std::fabs(variance / (halfspin::flicker_allan_variance_factor<double>() * b * b) - 1) <
          1e-7);
    (void)tau;
  }
  CHECK(std::sqrt(halfspin::flicker_allan_variance_factor<double>()) ==
        Approx(0.6642824702).epsilon(1e-9));  // 0.664 (Annex C), more digits computed here
  CHECK(halfspin::flicker_allan_variance_factor<float>() ==
        static_cast<float>(halfspin::flicker_allan_variance_factor<double>()));
}

TEST_CASE("Gauss-Markov Allan variance: the closed form matches GSL quadrature of Annex C",
          "[truth][reference]") {
  // truth/bias_instability.hpp §2: σ²(τ) = q² f(x)/x², x = τ/T, for the PSD 2q²T/(1 + (2πfT)²)
  // of R(s) = q² e^{−|s|/T}. Both branches of f(x)/x³ (series below 1, direct above) are covered.
  const double q2 = 4e-8, correlation = 2.5;
  const std::function<double(double)> psd = [&](double f) {
    const double w = 2 * pi_d * f * correlation;
    return 2 * q2 * correlation / (1 + w * w);
  };
  LD worst = 0;
  for (const double x : {1e-4, 3e-3, 0.1, 0.6, 0.999, 1.0, 1.5, 7.0, 60.0, 2e3}) {
    const double tau = x * correlation;
    const double quad = annex_c_allan_variance(psd, tau);
    const double closed = halfspin::gauss_markov_allan_variance(tau, correlation, q2);
    INFO("x = " << x << ": closed form " << closed << ", quadrature " << quad);
    worst = std::max(worst, std::fabs(static_cast<LD>(closed) / static_cast<LD>(quad) - 1));
    CHECK(std::fabs(closed / quad - 1) < 1e-9);
  }
  halfspin::test::report_worst("Gauss-Markov Allan variance vs GSL quadrature (relative)", worst);
  // Float: the same closed form, to float accuracy, on both branches.
  for (const float x : {1e-3f, 0.5f, 0.9999f, 1.0001f, 3.0f, 100.0f}) {
    const double d = halfspin::gauss_markov_f_over_cube(static_cast<double>(x));
    const float f = halfspin::gauss_markov_f_over_cube(x);
    CHECK(std::fabs(static_cast<double>(f) / d - 1) < 1e-5);
  }
}

TEST_CASE("bias-instability bank: flat within 1 percent over its band, as derived",
          "[truth][reference]") {
  const double b = 2e-5;  // rad/s
  const double flicker = halfspin::flicker_allan_variance_factor<double>() * b * b;
  struct Band {
    double shortest, longest;
  };
  for (const Band band : {Band{0.01, 100.0}, Band{1.0, 2.0}, Band{0.005, 300.0}}) {
    const BiasInstabilityBank<double> bank(b, band.shortest, band.longest, 0.005);
    INFO("band [" << band.shortest << ", " << band.longest << "] s, " << bank.process_count()
                  << " processes");
    // §4's count: 1 + ⌈log₂(τ_hi/τ_lo · 10⁴/3)⌉.
    CHECK(bank.process_count() == 1 + static_cast<std::size_t>(std::ceil(
                                          std::log2(band.longest / band.shortest * 1e4 / 3))));
    CHECK(bank.flat_band_longest() >= band.longest);
    const double t0 = bank.correlation_time(0);
    const double t_last = bank.correlation_time(bank.process_count() - 1);
    // §3's telescoped closed form equals the sum of the processes' Allan variances.
    double worst_low = 1, worst_high = 0, worst_telescoped = 0;
    for (double tau = band.shortest; tau <= band.longest * (1 + 1e-12); tau *= 1.01) {
      const double sum = bank.allan_variance(tau);
      const double y = tau / t_last, x = tau / t0;
      // (y − 1 + e^{−y})/y² = Σ_{n≥2} (−y)^{n−2}/n!: by the series below y = 1 (no cancellation).
      double v = 0;
      if (y < 1) {
        double term = 0.5;
        for (int j = 2; j < 30; ++j) {
          v += term;
          term *= -y / (j + 1);
        }
      } else {
        v = (y - 1 + std::exp(-y)) / (y * y);
      }
      const double u = 2 - 4 * v;
      const double l = 2 / x - (1 - std::exp(-2 * x)) / (x * x);
      const double telescoped = bank.process_variance() * (2 - u - l);
      worst_telescoped = std::max(worst_telescoped, std::fabs(sum / telescoped - 1));
      worst_low = std::min(worst_low, std::sqrt(sum / flicker));
      worst_high = std::max(worst_high, sum / flicker);
    }
    CHECK(worst_low >= 0.99);
    CHECK(worst_high <= 1 + 1e-12);
    halfspin::test::report_worst("bank deviation / flicker deviation, lowest in band",
                                 static_cast<LD>(worst_low));
    CHECK(worst_telescoped < 1e-12);
    // The band is where the flatness ends: a factor 10 outside it the deficit exceeds 1 %.
    CHECK(std::sqrt(bank.allan_variance(band.shortest / 10) / flicker) < 0.99);
    CHECK(std::sqrt(bank.allan_variance(band.longest * 10) / flicker) < 0.99);
  }
  // Against GSL quadrature of Annex C's integral of the bank's PSD Σ 2q²T_i/(1 + (2πfT_i)²).
  const BiasInstabilityBank<double> bank(b, 0.1, 100.0, 0.01);
  const std::function<double(double)> psd = [&](double f) {
    double s = 0;
    for (std::size_t i = 0; i < bank.process_count(); ++i) {
      const double t = bank.correlation_time(i), w = 2 * pi_d * f * t;
      s += 2 * bank.process_variance() * t / (1 + w * w);
    }
    return s;
  };
  for (const double tau : {0.1, 1.0, 10.0, 100.0}) {
    const double quad = annex_c_allan_variance(psd, tau);
    INFO("tau " << tau << ": bank " << bank.allan_variance(tau) << ", quadrature " << quad);
    CHECK(std::fabs(bank.allan_variance(tau) / quad - 1) < 1e-8);
    CHECK(std::sqrt(quad / flicker) > 0.99);
    CHECK(quad <= flicker * (1 + 1e-8));
  }
  // Invalid requests give an empty bank; a band beyond the capacity is cut at its long end.
  CHECK(BiasInstabilityBank<double>(b, 0.0, 1.0, 0.01).process_count() == 0);
  CHECK(BiasInstabilityBank<double>(b, 2.0, 1.0, 0.01).process_count() == 0);
  CHECK(BiasInstabilityBank<double>(0.0, 1.0, 2.0, 0.01).process_count() == 0);
  const BiasInstabilityBank<double> wide(b, 1e-3, 1e6, 1e-3);
  CHECK(wide.process_count() == halfspin::bias_instability_capacity);
  CHECK(wide.flat_band_longest() < 1e6);
  CHECK(wide.flat_band_longest() == Approx(0.03 * 1e-5 * std::ldexp(1.0, 31)));
}

TEST_CASE("white rate noise: Allan deviation N/sqrt(tau) within its confidence interval",
          "[truth][reference]") {
  // IEEE Std 952-1997 Annex C: white rate noise of density N has σ(τ) = N/√τ.
  const std::size_t count = 1 << 17;
  const double density = 3e-3;
  const double dt = 0.01;
  for (const GyroOutputForm form : {GyroOutputForm::rate, GyroOutputForm::delta_angle}) {
    GyroErrorModel<double> model;
    model.noise_density = density;
    model.bias = {1e-2, -3e-3, 0};
    const auto curve = allan(static_log(form, dt, model, 11, count, 0), dt, 0.999);
    const auto white = [&](double tau) { return density / std::sqrt(tau); };
    const Agreement ok = agree(curve, count, 8, white);
    INFO(ok.text);
    CHECK(ok.points >= 12);
    CHECK(ok.outside == 0);
    const Agreement wrong = agree(curve, count, 8, [&](double tau) { return 1.15 * white(tau); });
    CHECK(wrong.outside >= 3);
  }
  GyroErrorModel<float> model;
  model.noise_density = 3e-3f;
  const auto curve =
      allan(static_log(GyroOutputForm::delta_angle, 0.01f, model, 12, count, 1), 0.01, 0.999);
  const Agreement ok = agree(
      curve, count, 8, [](double tau) { return static_cast<double>(3e-3f) / std::sqrt(tau); });
  INFO("float: " << ok.text);
  CHECK(ok.points >= 12);
  CHECK(ok.outside == 0);
}

TEST_CASE("rate random walk: Allan deviation K sqrt(tau/3) within its confidence interval",
          "[truth][reference]") {
  // IEEE Std 952-1997 Annex C: a rate random walk of coefficient K has σ(τ) = K·√(τ/3). Both
  // forms carry the walk's exact integral over each sample (rates: its mean), so the relation
  // holds down to τ = dt. An instantaneous reading b(t_k) summed as rectangles would exceed it by
  // the factor 1 + 1/(2m²) in variance at m samples per cluster (the difference of two cluster
  // means weights the walk's increments by a triangle, Σc_j² = m(2m² + 1)/3; derived here): 50 %
  // at m = 1, which the m = 1 point (2^17 clusters, interval ±1 %) would reject.
  const std::size_t count = 1 << 17;
  const double k = 2e-4;  // rad/s/√s
  const double dt = 0.01;
  const auto walk = [&](double tau) { return k * std::sqrt(tau / 3); };
  for (const GyroOutputForm form : {GyroOutputForm::delta_angle, GyroOutputForm::rate}) {
    GyroErrorModel<double> model;
    model.rate_random_walk = k;
    const auto curve = allan(static_log(form, dt, model, 21, count, 2), dt, 0.999);
    const Agreement ok = agree(curve, count, 8, walk);
    INFO(ok.text);
    CHECK(ok.points >= 12);
    CHECK(ok.outside == 0);
    const Agreement wrong = agree(curve, count, 8, [&](double tau) { return 1.15 * walk(tau); });
    CHECK(wrong.outside >= 3);
  }
  GyroErrorModel<float> model;
  model.rate_random_walk = 2e-4f;
  const auto curve =
      allan(static_log(GyroOutputForm::delta_angle, 0.01f, model, 22, count, 0), 0.01, 0.999);
  const Agreement ok = agree(
      curve, count, 8, [](double tau) { return static_cast<double>(2e-4f) * std::sqrt(tau / 3); });
  INFO("float: " << ok.text);
  CHECK(ok.outside == 0);
}

TEST_CASE(
    "bias instability: the Allan deviation of the generated log is the bank's, flat at "
    "0.664 B over the band",
    "[truth][reference]") {
  // Expected: the bank's derived Allan variance (truth/bias_instability.hpp §2–§4), within 1 %
  // below √(2 ln 2/π)·B over the band (IEEE Std 952-1997 Annex C). Delta-angles carry the
  // exact integral of each process, so the relation holds from τ = dt, where the fastest
  // processes (correlation times down to 0.01·dt) are far from constant over a sample: a
  // rectangle x·dt would put their whole variance q² into each sample.
  const std::size_t count = 1 << 17;
  const double b = 5e-5;
  const double dt = 0.01;
  GyroErrorModel<double> model;
  model.bias_instability = b;
  model.flicker_band_shortest = dt;
  model.flicker_band_longest = count * dt / 4;
  const ConstantRateMotion<double> still{Quaternion<double>::identity(), {0, 0, 0}};
  const SyntheticGyro<double, ConstantRateMotion<double>> probe(still, GyroOutputForm::delta_angle,
                                                                dt, model, 0);
  const auto& bank = probe.bias_instability();
  REQUIRE(bank.process_count() > 0);
  const auto expected = [&](double tau) { return std::sqrt(bank.allan_variance(tau)); };
  for (int axis = 0; axis < 3; ++axis) {
    const auto curve =
        allan(static_log(GyroOutputForm::delta_angle, dt, model, 31, count, axis), dt, 0.999);
    const Agreement ok = agree(curve, count, 8, expected);
    INFO("axis " << axis << "\n" << ok.text);
    CHECK(ok.points >= 12);
    CHECK(ok.outside == 0);
    const Agreement wrong =
        agree(curve, count, 8, [&](double tau) { return 1.15 * expected(tau); });
    CHECK(wrong.outside >= 3);
  }
  // Rate samples (the processes' mean over each interval): the same relation, from τ = dt.
  const auto rates = allan(static_log(GyroOutputForm::rate, dt, model, 32, count, 0), dt, 0.999);
  const Agreement ok = agree(rates, count, 8, expected);
  INFO("rates\n" << ok.text);
  CHECK(ok.outside == 0);
  // Float, delta-angles.
  GyroErrorModel<float> fmodel;
  fmodel.bias_instability = 5e-5f;
  fmodel.flicker_band_shortest = 0.01f;
  fmodel.flicker_band_longest = static_cast<float>(count) * 0.01f / 4;
  const auto fcurve =
      allan(static_log(GyroOutputForm::delta_angle, 0.01f, fmodel, 33, count, 0), 0.01, 0.999);
  const Agreement fok = agree(fcurve, count, 8, expected);
  INFO("float\n" << fok.text);
  CHECK(fok.outside == 0);
}

TEST_CASE("the new processes leave existing models' output bit for bit unchanged", "[truth]") {
  // The rate random walk and the bias instability draw from their own source, only when
  // enabled: a model without them gives exactly the sequence the white noise and bias give
  // (recomputed here from a GaussianNoiseSource with the same seed), and enabling them changes
  // nothing in the white-noise draws (the difference of the two outputs is the processes alone,
  // identical for two gyros that differ only in N).
  const double dt = 1.0 / 500;
  const ConstantRateMotion<double> turn{Quaternion<double>::identity(), {0.25, -0.5, 1.0}};
  GyroErrorModel<double> model;
  model.noise_density = 2e-3;
  model.bias = {1e-3, -1e-3, 2e-3};
  for (const GyroOutputForm form : {GyroOutputForm::rate, GyroOutputForm::delta_angle}) {
    SyntheticGyro<double, ConstantRateMotion<double>> gyro(turn, form, dt, model, 5);
    halfspin::GaussianNoiseSource<double> source(5);
    const double sigma = form == GyroOutputForm::rate ? model.noise_density / std::sqrt(dt)
                                                      : model.noise_density * std::sqrt(dt);
    int mismatches = 0;
    for (std::int64_t k = 0; k < 20000; ++k) {
      const double nx = source.next_gaussian(), ny = source.next_gaussian(),
                   nz = source.next_gaussian();
      const Vector3<double> noise{nx, ny, nz};
      const Vector3<double> expected =
          form == GyroOutputForm::rate
              ? turn.rate(static_cast<double>(k) * dt) + model.bias + sigma * noise
              : turn.delta_angle(static_cast<double>(k) * dt, static_cast<double>(k + 1) * dt) +
                    dt * model.bias + sigma * noise;
      const Vector3<double> got = gyro.next();
      if (std::memcmp(&got, &expected, sizeof got) != 0) ++mismatches;
    }
    CHECK(mismatches == 0);
  }
  GyroErrorModel<double> with = model;
  with.rate_random_walk = 1e-4;
  with.bias_instability = 1e-4;
  with.flicker_band_shortest = 0.01;
  with.flicker_band_longest = 10;
  GyroErrorModel<double> twice = with;
  twice.noise_density = 0;
  GyroErrorModel<double> plain = model;
  plain.noise_density = 0;
  SyntheticGyro<double, ConstantRateMotion<double>> a(turn, GyroOutputForm::rate, dt, with, 9);
  SyntheticGyro<double, ConstantRateMotion<double>> b(turn, GyroOutputForm::rate, dt, model, 9);
  SyntheticGyro<double, ConstantRateMotion<double>> c(turn, GyroOutputForm::rate, dt, twice, 9);
  SyntheticGyro<double, ConstantRateMotion<double>> d(turn, GyroOutputForm::rate, dt, plain, 9);
  LD worst = 0;
  for (int k = 0; k < 5000; ++k) {
    const Vector3<double> processes_with_noise = a.next() - b.next();
    const Vector3<double> processes_alone = c.next() - d.next();
    worst = std::max(worst, halfspin::test::length_ld(processes_with_noise - processes_alone));
  }
  // Both differences hold the same process values; they differ only by the roundings of the
  // sums (a few ulps of the rates, about 1 rad/s here).
  CHECK(worst < 1e-14L);
}
