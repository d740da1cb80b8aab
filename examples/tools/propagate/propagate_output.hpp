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

// The motion the log holds, over the samples the propagator took.
struct MotionSeen {
  double peak_rate = 0;    // rad/s: |w| of a rate row, |delta-angle|/interval of a delta row
  double peak_time = 0;    // s
  double total_angle = 0;  // rad: trapezoid of |w| dt (rate rows) or sum of |delta-angle|
};

// Above this peak |w| (rad/s) a log read as rad/s or rad more likely holds degrees: 2000 deg/s
// (34.9 rad/s) is the largest full scale of common MEMS gyros (common practice, from memory).
inline constexpr double degrees_suspected_above_rad_s = 35.0;

// The largest axis rate of an over-range sample: its column's name, rad/s, and whether it is a
// delta-angle over its interval.
struct AxisRate {
  const char* name = "";
  double rate = 0;
  bool from_delta = false;
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
  MotionSeen motion;
  bool delta_form = false;
  bool unit_given = false;  // --rate-unit or --angle-unit given
  std::string log;
  std::size_t start_row_line = 0;  // the zero first delta-angle row taken as the start (0: none)
  double start_time = 0;           // s
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

// A log time as the user wrote it, with its unit, and in seconds when the unit is not s.
inline std::string log_time_text(double raw, const std::string& unit, double divisor) {
  std::array<char, 96> buf{};
  if (divisor == 1.0) {
    std::snprintf(buf.data(), buf.size(), "%.17g s", raw);
  } else {
    std::snprintf(buf.data(), buf.size(), "%.17g %s (%.9g s)", raw, unit.c_str(), raw / divisor);
  }
  return buf.data();
}

inline std::string time_not_increasing_message(const std::string& t, const std::string& previous,
                                               std::size_t previous_line) {
  return "timestamp " + t + " does not increase: the previous row (line " +
         std::to_string(previous_line) + ") is at " + previous;
}

// A first delta-angle row not after --start-time (t and start in s; delta in rad).
inline std::string start_time_message(const std::string& stamp, double t, double start,
                                      const std::array<double, 3>& delta) {
  std::array<char, 400> buf{};
  if (t < start) {
    std::snprintf(buf.data(), buf.size(),
                  "timestamp %s is before --start-time %.17g s, where the first interval starts",
                  stamp.c_str(), start);
  } else {
    std::snprintf(buf.data(), buf.size(),
                  "timestamp %s is at --start-time %.17g s: the interval from --start-time is "
                  "zero, but the row's delta-angle (%.9g, %.9g, %.9g) rad is not (a zero row "
                  "there is taken as the log's start)",
                  stamp.c_str(), start, delta[0], delta[1], delta[2]);
  }
  return buf.data();
}

// first_interval 0: the limit is --max-interval's; else the default, 2.5 x the first interval.
inline std::string gap_message(double dt, double max_interval, std::size_t previous_line,
                               double first_interval) {
  std::array<char, 300> buf{};
  if (first_interval > 0) {
    std::snprintf(buf.data(), buf.size(),
                  "gap: interval %.17g s from the previous row (line %zu) exceeds the limit "
                  "%.17g s (the default, 2.5 x the first interval %.17g s; set --max-interval)",
                  dt, previous_line, max_interval, first_interval);
  } else {
    std::snprintf(buf.data(), buf.size(),
                  "gap: interval %.17g s from the previous %s exceeds the limit %.17g s "
                  "(--max-interval)",
                  dt, previous_line == 0 ? "time (--start-time)" : "row", max_interval);
  }
  return buf.data();
}

inline std::string over_range_message(const AxisRate& axis, double max_rate) {
  std::array<char, 300> buf{};
  std::snprintf(buf.data(), buf.size(),
                "sample over range: |%s|%s = %.9g rad/s is above --max-rate %.9g rad/s (per axis)",
                axis.name, axis.from_delta ? " / interval" : "", axis.rate, max_rate);
  return buf.data();
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

inline void print_motion(const RunSummary& s) {
  const MotionSeen& m = s.motion;
  std::fprintf(stderr, "peak |w|: %.6g rad/s (%.6g deg/s) at t = %.9g s%s\n", m.peak_rate,
               to_degrees(m.peak_rate), m.peak_time,
               s.delta_form ? " (|delta-angle| / interval)" : "");
  std::fprintf(stderr, "total angle traversed: %.6g rad (%.6g deg) (%s)\n", m.total_angle,
               to_degrees(m.total_angle),
               s.delta_form ? "sum of |delta-angle|" : "trapezoid rule on |w| over the rows");
  if (s.start_row_line > 0) {
    std::fprintf(stderr,
                 "note: %s:%zu: the zero delta-angle row at --start-time %.17g s is the log's "
                 "start (an empty interval, not propagated)\n",
                 s.log.c_str(), s.start_row_line, s.start_time);
  }
  if (!s.unit_given && m.peak_rate > degrees_suspected_above_rad_s) {
    std::fprintf(stderr,
                 "note: peak |w| %.6g rad/s is above %.0f rad/s (2000 deg/s, the largest full "
                 "scale of common MEMS gyros): if %s holds degrees%s, give %s\n",
                 m.peak_rate, degrees_suspected_above_rad_s, s.log.c_str(),
                 s.delta_form ? "" : " per second",
                 s.delta_form ? "--angle-unit deg" : "--rate-unit deg/s");
  }
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
  detail::print_motion(s);
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
