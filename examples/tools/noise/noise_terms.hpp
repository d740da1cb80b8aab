#pragma once
// Confidence intervals of the Allan deviation and the gyro's noise terms read from it. Tool code.
//
// Intervals. IEEE Std 952-1997 Annex C gives the percentage error of an Allan deviation estimated
// from n independent clusters as 1/√(2(n − 1)); that is the relative spread of σ̂ when
// ν·σ̂²/σ² is chi-squared with ν = n − 1 degrees of freedom. We use that chi-squared law:
//     σ² ∈ [ν σ̂²/χ²_ν(1 − α/2), ν σ̂²/χ²_ν(α/2)]   at confidence 1 − α.
// It assumes the noise type the percentage error was derived for. The overlapping estimator
// we use scatters less than n independent clusters would for white and flicker rate noise at
// m ≥ 2 (it has more equivalent degrees of freedom there), so these intervals are conservative
// there and about right for a rate random walk. At m = 1 it does not: its n − 1 second
// differences overlap pairwise, and for white rate noise the spread of σ̂² is then about √1.5
// times that of n − 1 independent ones (a sum of squares of an MA(1) sequence with correlation
// −½: the squares correlate at ¼, so Var Σ = (n − 1)·Var·(1 + 2·¼); common practice, no
// source; flicker and white phase noise are worse). So the m = 1 point gets ν = (n − 1)/2,
// which covers white phase (quantization), white rate and flicker rate noise alike (measured
// coverage of N's 95 % interval on still logs of white rate noise alone: README.md).
// Quantiles: the regularized incomplete gamma function by its series and continued fraction
// (Abramowitz and Stegun 6.5.29 and 6.5.31, from memory), inverted by bisection; above ν = 10⁴ the
// Wilson–Hilferty cube-root normal approximation (common practice, no source; relative error far
// below the interval's width there).
//
// Terms (IEEE Std 952-1997 Annex C relations): with σ²(τ) = Σ C_p τ^p,
//     quantization Q      (slope −1 in σ):   σ² = 3Q²/τ²,           Q = σ(√3 s), rad
//     angle random walk N (slope −½):        σ² = N²/τ,             N = σ(1 s),  rad/√s
//     bias instability B  (flat):            σ² = (2 ln 2/π)·B²,    B = σ_flat/0.664, rad/s
//     rate random walk K  (slope +½):        σ² = K²τ/3,            K = σ(3 s),  rad/s/√s
// The four lines are fitted together to the curve: weighted least squares on σ² with
// non-negative coefficients (every subset of the terms solved, the best non-negative one
// kept), weights ν_i/(2 σ²_model(τ_i)²) (the chi-squared variance of σ̂²), reweighted twice
// from the model so that low scatter does not pull the fit down. Each term in a subset costs
// the 99 % point of chi-squared with one degree of freedom (6.63) in the weighted residual: a
// likelihood-ratio test at 1 % per added term, so a term enters only where the curve needs it.
// Without it the fit always found small B and K shares in a log of white noise alone and took
// them off N, whose 95 % interval then held the true value in only 90–93 % of short logs
// (measured, README.md). Fitting them together keeps a
// neighbour's overlap out of each line (a line fitted alone near a corner reads high). A term is
// visible where its line carries at least half of the fitted σ² at a point with at least 4
// clusters; otherwise "not visible in this log", with the upper limit the curve allows: the least
// over the points of (upper confidence limit)² / τ^p, converted like the term.
// A term's interval: at each point where it carries at least half the fitted σ², the point's
// interval less the other terms' fitted share gives an interval of C_p; the narrowest is
// reported, converted like the term. It is taken given the other terms, and is not narrowed by
// combining points, since overlapping points at neighbouring τ share most of their data.
// Rate ramp (σ ∝ τ) and sinusoidal terms are not fitted: a log that shows them is outside this
// model (the chart shows the curve whatever it holds).
#include <algorithm>
#include <array>
#include <bitset>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

#include "allan_deviation.hpp"

namespace halfspin::tools::noise {

// Regularized lower incomplete gamma P(a, x), a > 0, x ≥ 0.
inline long double regularized_gamma_p(long double a, long double x) {
  if (x <= 0) return 0;
  const long double log_prefix = -x + a * std::log(x) - std::lgamma(a);
  if (x < a + 1) {
    long double term = 1 / a;
    long double sum = term;
    for (int n = 1; n < 100000; ++n) {
      term *= x / (a + n);
      sum += term;
      if (term < sum * 1e-19L) break;
    }
    return sum * std::exp(log_prefix);
  }
  // Q(a, x) by the continued fraction, modified Lentz's method.
  constexpr long double tiny = std::numeric_limits<long double>::min() * 1e10L;
  long double b = x + 1 - a;
  long double c = 1 / tiny;
  long double d = 1 / b;
  long double h = d;
  for (int i = 1; i < 100000; ++i) {
    const long double an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (std::fabs(d) < tiny) d = tiny;
    c = b + an / c;
    if (std::fabs(c) < tiny) c = tiny;
    d = 1 / d;
    const long double delta = d * c;
    h *= delta;
    if (std::fabs(delta - 1) < 1e-19L) break;
  }
  return 1 - std::exp(log_prefix) * h;
}

// Standard normal quantile, by bisection on erfc (|z| ≤ 40).
inline double normal_quantile(double p) {
  double lo = -40;
  double hi = 40;
  for (int i = 0; i < 200; ++i) {
    const double mid = 0.5 * (lo + hi);
    (0.5 * std::erfc(-mid / std::sqrt(2.0)) < p ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

// Quantile p ∈ (0, 1) of the chi-squared distribution with ν > 0 degrees of freedom.
inline double chi_squared_quantile(double p, double nu) {
  if (nu > 1e4) {
    const double h = 2 / (9 * nu);
    const double c = 1 - h + normal_quantile(p) * std::sqrt(h);
    return nu * c * c * c;
  }
  const long double a = 0.5L * static_cast<long double>(nu);
  const auto target = static_cast<long double>(p);
  long double lo = 0;
  long double hi = std::max(4.0L * a + 100, 1.0L);
  while (regularized_gamma_p(a, hi) < target) hi *= 2;
  for (int i = 0; i < 200 && hi - lo > 1e-17L * hi; ++i) {
    const long double mid = 0.5L * (lo + hi);
    (regularized_gamma_p(a, mid) < target ? lo : hi) = mid;
  }
  return static_cast<double>(lo + hi);  // x = 2·(the gamma variable)
}

// The degrees of freedom a point's σ̂² is given: n − 1 clusters, halved at m = 1 (header).
inline double degrees_of_freedom(const AllanPoint& p) {
  const double nu = static_cast<double>(p.clusters) - 1;
  return p.m == 1 ? 0.5 * nu : nu;
}

// Fills each point's interval at `confidence` (ν: degrees_of_freedom).
inline void add_intervals(std::vector<AllanPoint>& curve, double confidence) {
  const double tail = 0.5 * (1 - confidence);
  for (AllanPoint& p : curve) {
    const double nu = degrees_of_freedom(p);
    const double upper_quantile = chi_squared_quantile(1 - tail, nu);
    const double lower_quantile = chi_squared_quantile(tail, nu);
    for (std::size_t a = 0; a < 3; ++a) {
      p.low[a] = std::sqrt(p.variance[a] * nu / upper_quantile);
      p.high[a] = std::sqrt(p.variance[a] * nu / lower_quantile);
    }
  }
}

enum class Term : std::size_t {
  quantization = 0,
  angle_random_walk,
  bias_instability,
  rate_random_walk
};
inline constexpr std::size_t term_count = 4;
inline constexpr std::array<int, term_count> term_power{{-2, -1, 0, 1}};  // of τ in σ²

// σ²/B² of flicker rate noise, 2 ln 2/π (Annex C).
inline constexpr double flicker_factor = 2 * 0.693147180559945309417 / 3.14159265358979323846;

// The term's value from its coefficient C_p (σ² = C_p τ^p), in SI units.
inline double term_value(Term t, double coefficient) {
  const double c = std::max(coefficient, 0.0);
  switch (t) {
    case Term::quantization:
      return std::sqrt(c / 3);
    case Term::angle_random_walk:
      return std::sqrt(c);
    case Term::bias_instability:
      return std::sqrt(c / flicker_factor);
    case Term::rate_random_walk:
      return std::sqrt(3 * c);
  }
  return 0;
}

struct TermEstimate {
  bool visible = false;
  double coefficient = 0;  // C_p of the fit (0 when the fit left the term out)
  double value = 0;        // SI: rad, rad/√s, rad/s, rad/s/√s
  double low = 0;          // interval, SI
  double high = 0;
  double upper_limit = std::numeric_limits<double>::infinity();  // when not visible
  double tau_from = 0;  // s: where the term carries at least half of the fitted σ²
  double tau_to = 0;
};

struct AxisTerms {
  std::array<TermEstimate, term_count> term;
  std::array<double, term_count> coefficient{};
  double model(double tau) const {
    double s = 0;
    for (std::size_t p = 0; p < term_count; ++p) s += coefficient[p] * std::pow(tau, term_power[p]);
    return s;
  }
};

namespace detail {

// Weighted least squares over the terms in `mask`: coefficients, false if singular.
inline bool solve_subset(const std::vector<double>& tau, const std::vector<double>& value,
                         const std::vector<double>& weight, unsigned mask,
                         std::array<double, term_count>& c) {
  std::array<std::size_t, term_count> index{};
  std::size_t n = 0;
  for (std::size_t p = 0; p < term_count; ++p) {
    if (((mask >> p) & 1U) != 0) index[n++] = p;
  }
  // Columns scaled to unit weighted norm, for conditioning (τ^p spans many decades).
  std::array<long double, term_count> scale{};
  for (std::size_t j = 0; j < n; ++j) {
    long double s = 0;
    for (std::size_t i = 0; i < tau.size(); ++i) {
      const long double x = std::pow(static_cast<long double>(tau[i]), term_power[index[j]]);
      s += static_cast<long double>(weight[i]) * x * x;
    }
    scale[j] = s > 0 ? 1 / std::sqrt(s) : 1;
  }
  std::array<std::array<long double, term_count + 1>, term_count> a{};
  for (std::size_t i = 0; i < tau.size(); ++i) {
    std::array<long double, term_count> row{};
    for (std::size_t j = 0; j < n; ++j) {
      row[j] = std::pow(static_cast<long double>(tau[i]), term_power[index[j]]) * scale[j];
    }
    const auto w = static_cast<long double>(weight[i]);
    for (std::size_t j = 0; j < n; ++j) {
      for (std::size_t k = 0; k < n; ++k) a[j][k] += w * row[j] * row[k];
      a[j][n] += w * row[j] * static_cast<long double>(value[i]);
    }
  }
  for (std::size_t col = 0; col < n; ++col) {
    std::size_t pivot = col;
    for (std::size_t r = col + 1; r < n; ++r) {
      if (std::fabs(a[r][col]) > std::fabs(a[pivot][col])) pivot = r;
    }
    if (std::fabs(a[pivot][col]) < 1e-14L) return false;
    std::swap(a[col], a[pivot]);
    for (std::size_t r = 0; r < n; ++r) {
      if (r == col) continue;
      const long double f = a[r][col] / a[col][col];
      for (std::size_t k = col; k <= n; ++k) a[r][k] -= f * a[col][k];
    }
  }
  c.fill(0);
  for (std::size_t j = 0; j < n; ++j) {
    c[index[j]] = static_cast<double>(a[j][n] / a[j][j] * scale[j]);
  }
  return true;
}

}  // namespace detail

// The noise terms of one axis of a curve whose intervals are filled.
inline AxisTerms fit_terms(const std::vector<AllanPoint>& curve, std::size_t axis) {
  std::vector<double> tau;
  std::vector<double> value;
  std::vector<double> nu;
  std::vector<const AllanPoint*> used;
  for (const AllanPoint& p : curve) {
    if (p.clusters >= 2 && p.variance[axis] > 0 && std::isfinite(p.variance[axis])) {
      tau.push_back(p.tau);
      value.push_back(p.variance[axis]);
      nu.push_back(degrees_of_freedom(p));
      used.push_back(&p);
    }
  }
  AxisTerms r;
  if (tau.empty()) return r;
  const double added_term_cost = chi_squared_quantile(0.99, 1.0);
  std::vector<double> model = value;
  for (int iteration = 0; iteration < 3; ++iteration) {
    std::vector<double> weight(tau.size());
    for (std::size_t i = 0; i < tau.size(); ++i) weight[i] = nu[i] / (2 * model[i] * model[i]);
    double best = std::numeric_limits<double>::infinity();
    std::array<double, term_count> best_c{};
    for (unsigned mask = 1; mask < (1U << term_count); ++mask) {
      std::array<double, term_count> c{};
      if (!detail::solve_subset(tau, value, weight, mask, c)) continue;
      bool feasible = true;
      for (std::size_t p = 0; p < term_count; ++p) {
        if (((mask >> p) & 1U) != 0 && !(c[p] > 0)) feasible = false;
      }
      if (!feasible) continue;
      double residual = 0;
      for (std::size_t i = 0; i < tau.size(); ++i) {
        double m = 0;
        for (std::size_t p = 0; p < term_count; ++p) m += c[p] * std::pow(tau[i], term_power[p]);
        residual += weight[i] * (value[i] - m) * (value[i] - m);
      }
      // Each term in the subset must earn its place (header: the 99 % point of chi-squared
      // with one degree of freedom per term).
      const double penalized =
          residual + added_term_cost * static_cast<double>(std::bitset<term_count>(mask).count());
      if (penalized < best) {
        best = penalized;
        best_c = c;
      }
    }
    r.coefficient = best_c;
    for (std::size_t i = 0; i < tau.size(); ++i) {
      const double m = r.model(tau[i]);
      model[i] = m > 0 ? m : value[i];
    }
  }
  for (std::size_t p = 0; p < term_count; ++p) {
    const auto t = static_cast<Term>(p);
    TermEstimate& e = r.term[p];
    e.coefficient = r.coefficient[p];
    e.value = term_value(t, e.coefficient);
    double best_ratio = std::numeric_limits<double>::infinity();
    for (std::size_t i = 0; i < tau.size(); ++i) {
      const double power = std::pow(tau[i], term_power[p]);
      const double high = used[i]->high[axis];
      e.upper_limit = std::min(e.upper_limit, term_value(t, high * high / power));
      const double own = e.coefficient * power;
      const double total = r.model(tau[i]);
      if (!(own > 0) || own < 0.5 * total) continue;
      if (e.tau_from == 0) e.tau_from = tau[i];
      e.tau_to = tau[i];
      if (used[i]->clusters >= 4) e.visible = true;
      const double others = total - own;
      const double low = used[i]->low[axis];
      const double c_low = std::max(low * low - others, 0.0) / power;
      const double c_high = std::max(high * high - others, 0.0) / power;
      const double ratio = c_low > 0 ? c_high / c_low : std::numeric_limits<double>::max();
      if (ratio < best_ratio) {
        best_ratio = ratio;
        e.low = term_value(t, c_low);
        e.high = term_value(t, c_high);
      }
    }
  }
  return r;
}

}  // namespace halfspin::tools::noise
