#pragma once
// What halfspin-propagate writes: the output CSV (header and rows), the summary and the bad-input
// reports on stderr, and the method list. Formatting only: the numbers come from the run
// (propagate_run.hpp). Tool code.

#include <array>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <string>

#include "gyro_log.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "method_registry.hpp"

namespace halfspin::tools::propagate {

// Bad-input classes the summary counts (the reader's, and the time checks the tool makes).
struct SkipCounts {
  std::uint64_t malformed = 0;
  std::uint64_t non_numeric = 0;
  std::uint64_t non_finite = 0;
  std::uint64_t time_not_increasing = 0;
  std::uint64_t gap = 0;
  std::uint64_t over_range = 0;
};

// The attitude error against --truth over the written rows (max < 0: no row compared yet).
struct TruthErrors {
  double max_rad = -1.0;
  double max_time = 0.0;
  double final_rad = 0.0;
};

// Everything the summary prints, in the units it prints them.
struct RunSummary {  // NOLINT(clang-analyzer-optin.performance.Padding): grouped by meaning
  const char* method = "";
  const char* scalar = "";
  const char* renormalization = "";
  const char* accumulation = "";
  std::string euler;  // sequence name, e.g. "zyx"
  PropagationCounters counters{};
  std::uint64_t samples_read = 0;
  double max_interval = 0;  // s
  SkipCounts skipped;
  double max_norm_error = 0;
  std::uint64_t near_singular_rows = 0;
  std::array<double, 4> attitude{};   // final q (w, x, y, z)
  std::array<double, 3> euler_deg{};  // final Euler angles (deg)
  int digits = 17;                    // significant digits of the scalar type
  bool has_truth = false;
  TruthErrors truth;
};

inline double to_degrees(double rad) noexcept { return rad * (180.0 / pi<double>); }

// The output header: t,qw,qx,qy,qz, the three Euler angles of `seq`, norm_error and, for a
// stepper with an estimate, error_estimate_rad.
inline void write_output_header(std::FILE* out, const std::string& seq, bool has_estimate) {
  std::fprintf(out, "t,qw,qx,qy,qz,first_%c_deg,second_%c_deg,third_%c_deg,norm_error%s\n", seq[0],
               seq[1], seq[2], has_estimate ? ",error_estimate_rad" : "");
}

// One row: the ten columns, or the first nine when the stepper has no error estimate.
inline void write_output_row(std::FILE* out, const std::array<double, 10>& row, bool has_estimate,
                             int digits) {
  if (has_estimate) {
    write_csv_row(out, row, digits);
    return;
  }
  std::array<double, 9> shorter{};
  for (std::size_t i = 0; i < shorter.size(); ++i) shorter[i] = row[i];
  write_csv_row(out, shorter, digits);
}

// "LOG:LINE: reason" on stderr.
inline void report_bad_line(const std::string& log, std::size_t line, const std::string& reason) {
  std::fprintf(stderr, "%s:%zu: %s\n", log.c_str(), line, reason.c_str());
}

inline std::string beyond_scalar_message(std::size_t field, const char* name, double value,
                                         const char* scalar, double largest) {
  std::array<char, 200> buf{};
  std::snprintf(buf.data(), buf.size(),
                "sample over range: field %zu (%s) = %.17g is beyond the largest %s (%.9g)", field,
                name, value, scalar, largest);
  return buf.data();
}

inline std::string time_not_increasing_message(double t, double previous) {
  std::array<char, 160> buf{};
  std::snprintf(buf.data(), buf.size(), "timestamp %.17g does not increase (previous %.17g)", t,
                previous);
  return buf.data();
}

inline std::string gap_message(double dt, double max_interval) {
  std::array<char, 200> buf{};
  std::snprintf(buf.data(), buf.size(),
                "gap: interval %.17g s exceeds the limit %.17g s (--max-interval; default "
                "2.5 x the first interval)",
                dt, max_interval);
  return buf.data();
}

inline std::string over_range_message(double max_rate) {
  return "sample over range: a rate (or delta-angle / interval) above --max-rate " +
         std::to_string(max_rate) + " rad/s";
}

inline std::string non_finite_step_message(const char* scalar) {
  return std::string(
             "sample rejected by the propagator: non_finite (the step's result is not finite in ") +
         scalar +
         ": a rate or delta-angle too large for the scalar type; set --max-rate to the gyro's "
         "full scale)";
}

namespace detail {

inline unsigned long long count(std::uint64_t n) { return static_cast<unsigned long long>(n); }

inline void print_counts(const RunSummary& s) {
  const PropagationCounters& c = s.counters;
  std::fprintf(stderr, "steps: %llu\n", count(c.steps));
  std::fprintf(stderr, "samples read: %llu\n", count(s.samples_read));
  std::fprintf(stderr, "longest interval accepted: %.9g s (a longer one is a gap)\n",
               s.max_interval);
  std::fprintf(stderr,
               "skipped by class: malformed %llu, non_numeric %llu, non_finite %llu, "
               "time_not_increasing %llu, gap %llu, over_range %llu\n",
               count(s.skipped.malformed), count(s.skipped.non_numeric),
               count(s.skipped.non_finite), count(s.skipped.time_not_increasing),
               count(s.skipped.gap), count(s.skipped.over_range));
  std::fprintf(stderr,
               "propagator: accepted %llu, rejected non_finite %llu, non_positive_step %llu, "
               "step_too_long %llu, over_range %llu, discarded after gap %llu\n",
               count(c.samples_accepted), count(c.rejected_non_finite),
               count(c.rejected_non_positive_step), count(c.rejected_step_too_long),
               count(c.rejected_over_range), count(c.discarded_samples));
}

inline void print_attitude(const RunSummary& s) {
  std::fprintf(stderr, "max norm error: %.3e\n", s.max_norm_error);
  if (s.near_singular_rows > 0) {
    std::fprintf(stderr, "rows near Euler gimbal lock (first/third split ill-conditioned): %llu\n",
                 count(s.near_singular_rows));
  }
  const int d = s.digits;
  std::fprintf(stderr, "final attitude: q = %.*g,%.*g,%.*g,%.*g  %s = %.6f, %.6f, %.6f deg\n", d,
               s.attitude[0], d, s.attitude[1], d, s.attitude[2], d, s.attitude[3], s.euler.c_str(),
               s.euler_deg[0], s.euler_deg[1], s.euler_deg[2]);
  if (s.has_truth) {
    std::fprintf(stderr,
                 "attitude error vs truth: max %.6e rad (%.6e deg) at t = %.9g s; final %.6e rad "
                 "(%.6e deg)\n",
                 s.truth.max_rad, to_degrees(s.truth.max_rad), s.truth.max_time, s.truth.final_rad,
                 to_degrees(s.truth.final_rad));
  }
}

}  // namespace detail

// The summary on stderr after a complete run.
inline void print_summary(const RunSummary& s) {
  std::fprintf(stderr, "method %s, scalar %s, renormalization %s, accumulation %s, Euler %s\n",
               s.method, s.scalar, s.renormalization, s.accumulation, s.euler.c_str());
  detail::print_counts(s);
  detail::print_attitude(s);
}

// --list-methods: every method, the input it takes and its description, on stdout.
inline void list_methods() {
  for (const MethodInfo& m : method_catalogue()) {
    const char* input = m.layout == SampleLayout::rate_function
                            ? "[rate-function: not usable on a log]"
                        : carries_delta_angles(m.layout) ? "[delta]"
                                                         : "[rate]";
    std::printf("%-36s %-38s %s%s\n", m.name, input, m.description,
                m.has_estimate ? " (error estimate column)" : "");
  }
}

}  // namespace halfspin::tools::propagate
