// halfspin-propagate: runs a gyro log through a chosen stepper with the library's Propagator (the
// code the board runs) and writes the attitude after every step. `--help` documents it all.
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <type_traits>

#include "gyro_log.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/representations/euler_angles.hpp"
#include "method_registry.hpp"

namespace {

using namespace halfspin;
using namespace halfspin::tools;

constexpr int exit_ok = 0;
constexpr int exit_usage = 1;
constexpr int exit_input = 2;

constexpr const char* help_text = R"(halfspin-propagate: propagate the attitude through a gyro log with one halfspin stepper.

Usage: halfspin-propagate LOG --output FILE [options]

Input LOG: CSV with a header row, then one sample per line (LF or CRLF line ends; a UTF-8
byte-order mark before the header is skipped; the last line may lack its newline):
  t,wx,wy,wz   rate form: t (s), body rate (rad/s) at t. Propagation starts at the first row's
               time with the initial attitude; a step ends at each row that completes a window.
  t,dx,dy,dz   delta-angle form: t (s), delta-angle (rad) = integral of the body rate over the
               interval ending at t; the first interval starts at --start-time.
The method must match the form: rate methods take rate logs, delta-angle (coning) methods take
delta-angle logs. Rate-function methods need a model of the motion and cannot run on a log.

Options:
  --output FILE         required. CSV written through a temporary file in the same directory and
                        renamed at the end: on any error nothing is written (an existing FILE is
                        left as it was).
  --method NAME         stepper (default expmap_midpoint_mean for rate logs, coning_2_sample for
                        delta-angle logs); --list-methods prints them.
  --list-methods        print every method, its input ([rate], [delta] or [rate-function: not
                        usable on a log]) and one line of description, then exit.
  --renormalize P       none | exact | first_order (default) | periodic | threshold
  --renormalize-period N      steps between corrections for `periodic` (default 16)
  --renormalize-threshold X   | |q|^2 - 1 | above which `threshold` corrects (default 1e-5)
  --initial qw,qx,qy,qz initial attitude (body -> reference, scalar first; normalized; must be
                        finite and nonzero). Default 1,0,0,0. `--initial truth` takes the --truth
                        file's row at the start time.
  --scalar float|double scalar type of the propagation (default double); float is what a
                        Cortex-M4F board runs.
  --euler SEQ           Euler sequence of the output angles: xyz xzy yxz yzx zxy zyx (default;
                        yaw, pitch, roll) xyx xzx yxy yzy zxz zyz. Intrinsic: zyx means
                        q = qz(first) * qy(second) * qx(third).
  --start-time S        delta-angle logs: start of the first row's interval (s, default 0).
  --max-interval S      longest sample interval (s) accepted; a longer one is a gap (missed
                        samples). Default: 2.5 x the first interval of the log.
  --max-rate R          gyro full scale (rad/s per axis); a rate or a delta-angle/interval above it
                        is over range. Default: no limit.
  --skip-bad            skip bad samples instead of rejecting the file; they are counted per class
                        in the summary (the propagator's own rejection counters too).
  --truth FILE          CSV t,qw,qx,qy,qz (as written by halfspin-gyro-log --truth) holding rows at
                        every step end time: the summary adds the max and final attitude error
                        against it (rad and deg, angle_between).
  --help                this text.

Output FILE: CSV, one row per completed step, at the step's end time:
  t,qw,qx,qy,qz                       s; attitude body -> reference, scalar first
  first_A_deg,second_B_deg,third_C_deg  Euler angles (deg) of --euler SEQ = ABC
  norm_error                          | |q| - 1 | after renormalization
  error_estimate_rad                  the stepper's per-step error estimate (rad); present only
                                      for methods that have one (see the README)
Numbers are printed to round-trip: 17 significant digits in double, 9 in float.

Summary (stderr): steps, samples read, skipped/rejected samples by class, max norm error, final
attitude (quaternion and Euler), and with --truth the attitude error.

Bad input: a malformed or over-long line, a wrong number of fields, a non-numeric field, NaN or
infinity, a timestamp that does not increase, a gap (interval > --max-interval), a sample over
range (above --max-rate, or with --scalar float beyond the largest float, 3.4e38), a sample whose
step result is not finite in the scalar type (e.g. a rate of 1e300 rad/s in double: set --max-rate
to the gyro's full scale), a bad header, an empty file, a log with no complete step. A last line
cut short is reported like any other bad line (a cut number is not a number, missing fields are a
malformed line). Subnormal values are valid numbers and propagate like any other. Each is reported
as FILE:LINE: reason. Without --skip-bad the first one rejects the file and nothing is written.

Memory stays constant however long the log: it is read one line at a time and written as it goes.

Exit codes: 0 ok; 1 bad usage (unknown option or method, bad option value, a method that needs
the other log form or a rate function, output cannot be created); 2 bad input (or a read/write
failure).

Caution: attitude errors can crash vehicles and hurt people. These results support engineering
judgement; they do not replace it. Validate any attitude solution in hardware-in-the-loop and
flight test; local airworthiness rules and licensed engineering practice govern what may fly.
)";

[[noreturn]] void usage_error(const std::string& message) {
  std::fprintf(stderr, "halfspin-propagate: %s (see --help)\n", message.c_str());
  std::exit(exit_usage);
}

std::optional<double> parse_number(const std::string& text) {
  if (text.empty()) return std::nullopt;
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  if (end - text.c_str() != static_cast<std::ptrdiff_t>(text.size()) || !(v - v == 0.0)) {
    return std::nullopt;
  }
  return v;
}

enum class Renormalize { none, exact, first_order, periodic, threshold };

struct Options {
  std::string log;
  std::string output;
  std::string method;
  Renormalize renormalize = Renormalize::first_order;
  std::uint32_t period = 16;
  double threshold = 1e-5;
  bool initial_from_truth = false;
  Quaternion<double> initial = Quaternion<double>::identity();
  bool use_float = false;
  EulerSequence euler = EulerSequence::zyx;
  double start_time = 0.0;
  std::optional<double> max_interval;
  double max_rate = std::numeric_limits<double>::infinity();
  bool skip_bad = false;
  std::string truth;
};

std::string euler_name(EulerSequence s) {
  const EulerAxes a = euler_axes(s);
  constexpr std::array<char, 3> axis{'x', 'y', 'z'};
  return {axis[static_cast<std::size_t>(a.first)], axis[static_cast<std::size_t>(a.second)],
          axis[static_cast<std::size_t>(a.third)]};
}

// The library's policies behind one run-time choice (each apply() is the library's own).
template <class T>
struct SelectedRenormalization {
  Renormalize kind = Renormalize::first_order;
  NoRenormalization none{};
  ExactRenormalization exact{};
  FirstOrderRenormalization first_order{};
  PeriodicRenormalization<ExactRenormalization> periodic{};
  ThresholdRenormalization<T, ExactRenormalization> threshold{};

  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    switch (kind) {
      case Renormalize::none: return none.apply(q);
      case Renormalize::exact: return exact.apply(q);
      case Renormalize::first_order: return first_order.apply(q);
      case Renormalize::periodic: return periodic.apply(q);
      case Renormalize::threshold: return threshold.apply(q);
    }
    return q;
  }
};

// Bad-input classes the summary counts (the reader's, and the time checks the tool makes).
struct SkipCounts {
  std::uint64_t malformed = 0;
  std::uint64_t non_numeric = 0;
  std::uint64_t non_finite = 0;
  std::uint64_t time_not_increasing = 0;
  std::uint64_t gap = 0;
  std::uint64_t over_range = 0;
};

// The truth file, read in step with the output.
class TruthTrack {
 public:
  bool open(const std::string& path) {
    path_ = path;
    in_.open(path, std::ios::binary);
    if (!in_) return false;
    reader_.emplace(in_);
    return true;
  }
  // Checks the header; false with a message on stderr.
  bool header() {
    std::string h;
    if (!reader_->read_header(h) || h != attitude_csv_header) {
      std::fprintf(stderr, "%s:1: truth header must be '%s'\n", path_.c_str(), attitude_csv_header);
      return false;
    }
    return true;
  }
  // The truth attitude at time t (rows before it are passed over). False with a message if the
  // file has no row at t.
  bool at(double t, Quaternion<double>& q) {
    while (true) {
      if (have_ && close_to(row_[0], t)) {
        q = Quaternion<double>{row_[1], row_[2], row_[3], row_[4]};
        return true;
      }
      if (have_ && row_[0] > t) {
        std::fprintf(stderr, "%s:%zu: truth has no row at t = %.17g (next row t = %.17g)\n",
                     path_.c_str(), reader_->line(), t, row_[0]);
        return false;
      }
      const ReadOutcome r = reader_->next(row_, attitude_field_names);
      if (r == ReadOutcome::end) {
        std::fprintf(stderr, "%s:%zu: truth ends before t = %.17g\n", path_.c_str(),
                     reader_->line(), t);
        return false;
      }
      if (r == ReadOutcome::bad) {
        std::fprintf(stderr, "%s:%zu: %s\n", path_.c_str(), reader_->line(),
                     reader_->message().c_str());
        return false;
      }
      have_ = true;
    }
  }

 private:
  static bool close_to(double a, double b) noexcept {
    return std::fabs(a - b) <= 1e-9 * std::fmax(1.0, std::fabs(b));
  }
  std::string path_;
  std::ifstream in_;
  std::optional<NumericCsvReader<5>> reader_;
  std::array<double, 5> row_{};
  bool have_ = false;
};

double to_degrees(double rad) noexcept { return rad * (180.0 / pi<double>); }

// `x` in the scalar type T, ±infinity beyond T's finite range: converting an out-of-range double
// to float is undefined behaviour in C++ ([conv.double]), so it is never done directly.
template <class T>
T to_scalar(double x) noexcept {
  if (std::fabs(x) > static_cast<double>(std::numeric_limits<T>::max())) {
    return std::signbit(x) ? -std::numeric_limits<T>::infinity()
                           : std::numeric_limits<T>::infinity();
  }
  return static_cast<T>(x);
}

template <class T, class Stepper>
int run(const Options& opt, std::istream& in, NumericCsvReader<4>& reader, GyroLogForm form,
        StagedOutputFile& out, TruthTrack* truth) {
  constexpr bool has_estimate = has_error_estimate<Stepper, T>::value;
  const int digits = std::is_same<T, float>::value ? 9 : 17;
  const std::string seq = euler_name(opt.euler);
  static_cast<void>(in);

  // Header of the output.
  std::fprintf(out.get(), "t,qw,qx,qy,qz,first_%c_deg,second_%c_deg,third_%c_deg,norm_error%s\n",
               seq[0], seq[1], seq[2], has_estimate ? ",error_estimate_rad" : "");

  SelectedRenormalization<T> policy;
  policy.kind = opt.renormalize;
  policy.periodic.period = opt.period;
  policy.threshold.threshold = to_scalar<T>(opt.threshold);

  Quaternion<double> q0d = normalized(opt.initial);
  const Quaternion<T> q0{static_cast<T>(q0d.w), static_cast<T>(q0d.x), static_cast<T>(q0d.y),
                         static_cast<T>(q0d.z)};
  // The gap limit is set once the first interval is known (or from --max-interval).
  std::optional<double> max_interval = opt.max_interval;
  const T max_rate = to_scalar<T>(opt.max_rate);
  std::optional<Propagator<T, Stepper, SelectedRenormalization<T>>> prop;
  const auto make_propagator = [&](double max_step) {
    prop.emplace(q0, GyroLimits<T>{max_rate, to_scalar<T>(max_step)}, T(0), policy);
  };
  if (max_interval) make_propagator(*max_interval);

  SkipCounts skipped;
  std::uint64_t samples_read = 0;
  std::uint64_t rows_written = 0;
  std::uint64_t near_singular_rows = 0;
  double max_norm_error = 0.0;
  double max_truth_error = -1.0;
  double max_truth_error_time = 0.0;
  double final_truth_error = 0.0;
  double start_time = form == GyroLogForm::delta_angle ? opt.start_time : 0.0;
  bool have_prev_time = form == GyroLogForm::delta_angle;
  double prev_time = start_time;
  // Rate form: the first row opens the first window; it is held until the first interval is
  // known (its own interval lies before the start and is not used by the stepper).
  std::optional<std::array<double, 4>> held_first;
  std::size_t held_line = 0;

  const auto bad = [&](std::size_t line, const std::string& reason) {
    std::fprintf(stderr, "%s:%zu: %s\n", opt.log.c_str(), line, reason.c_str());
  };

  const auto emit = [&](double t) -> bool {
    const Quaternion<T> q = prop->attitude();
    const EulerDecomposition<T> e = to_euler_angles(q, opt.euler);
    if (e.near_singular) ++near_singular_rows;
    const double norm_error = std::fabs(static_cast<double>(prop->norm_error()));
    max_norm_error = std::fmax(max_norm_error, norm_error);
    const T deg = T(180) / pi<T>;
    std::array<double, 10> row{t,
                               static_cast<double>(q.w),
                               static_cast<double>(q.x),
                               static_cast<double>(q.y),
                               static_cast<double>(q.z),
                               static_cast<double>(e.angles.first * deg),
                               static_cast<double>(e.angles.second * deg),
                               static_cast<double>(e.angles.third * deg),
                               norm_error,
                               static_cast<double>(prop->last_error_estimate())};
    if (has_estimate) {
      write_csv_row(out.get(), row, digits);
    } else {
      std::array<double, 9> shorter{};
      for (std::size_t i = 0; i < 9; ++i) shorter[i] = row[i];
      write_csv_row(out.get(), shorter, digits);
    }
    ++rows_written;
    if (truth != nullptr) {
      Quaternion<double> qt;
      if (!truth->at(t, qt)) return false;
      const Quaternion<double> qd{row[1], row[2], row[3], row[4]};
      const double err = angle_between(qd, qt);
      if (err > max_truth_error) {
        max_truth_error = err;
        max_truth_error_time = t;
      }
      final_truth_error = err;
    }
    return true;
  };

  // Pushes one sample; returns false on a fatal problem (message printed).
  const auto push = [&](const Vector3<T>& v, double dt, double t, std::size_t line) -> bool {
    const Status s = prop->push(v, to_scalar<T>(dt));
    if (s == Status::ok) {
      return emit(t);
    }
    if (s == Status::over_range) {
      if (!opt.skip_bad) {
        bad(line, "sample over range: a rate (or delta-angle / interval) above --max-rate " +
                      std::to_string(opt.max_rate) + " rad/s");
        return false;
      }
      ++skipped.over_range;
    } else if (s == Status::non_finite && !opt.skip_bad) {
      // The input was checked finite: the step's result overflowed the scalar type.
      bad(line, std::string("sample rejected by the propagator: non_finite (the step's result is "
                            "not finite in ") +
                    (std::is_same<T, float>::value ? "float" : "double") +
                    ": a rate or delta-angle too large for the scalar type; set --max-rate to the "
                    "gyro's full scale)");
      return false;
    } else if (is_rejection(s) && !opt.skip_bad) {
      bad(line, std::string("sample rejected by the propagator: ") + status_name(s));
      return false;
    }
    return true;
  };

  std::array<double, 4> v{};
  const auto names = gyro_log_field_names(form);
  bool truth_initial_done = !opt.initial_from_truth;
  while (true) {
    const ReadOutcome r = reader.next(v, names);
    if (r == ReadOutcome::end) break;
    ++samples_read;
    const std::size_t line = reader.line();
    if (r == ReadOutcome::bad) {
      const LineProblem p = reader.problem();
      const bool time_ok = p == LineProblem::non_finite && std::isfinite(v[0]);
      if (!opt.skip_bad) {
        bad(line, reader.message());
        return exit_input;
      }
      if (p == LineProblem::non_finite) {
        ++skipped.non_finite;
      } else if (p == LineProblem::non_numeric) {
        ++skipped.non_numeric;
      } else {
        ++skipped.malformed;
      }
      // A finite, increasing timestamp with non-finite values still marks the interval: the
      // propagator sees the sample (and counts its rejection), and the next interval starts here.
      if (!time_ok || !have_prev_time || !(v[0] > prev_time) || !prop) {
        continue;
      }
      static_cast<void>(prop->push(Vector3<T>{to_scalar<T>(v[1]), to_scalar<T>(v[2]),
                                              to_scalar<T>(v[3])},
                                   to_scalar<T>(v[0] - prev_time)));
      prev_time = v[0];
      continue;
    }
    const double t = v[0];
    // A finite double beyond the scalar type's range (float: 3.4e38) cannot be converted.
    std::size_t beyond = 0;
    for (std::size_t i = 1; i < 4 && beyond == 0; ++i) {
      if (std::fabs(v[i]) > static_cast<double>(std::numeric_limits<T>::max())) beyond = i;
    }
    if (beyond != 0) {
      if (!opt.skip_bad) {
        std::array<char, 200> buf{};
        std::snprintf(buf.data(), buf.size(),
                      "sample over range: field %zu (%s) = %.17g is beyond the largest %s (%.9g)",
                      beyond + 1, names[beyond], v[beyond],
                      std::is_same<T, float>::value ? "float" : "double",
                      static_cast<double>(std::numeric_limits<T>::max()));
        bad(line, buf.data());
        return exit_input;
      }
      ++skipped.over_range;
      continue;
    }
    const Vector3<T> sample{static_cast<T>(v[1]), static_cast<T>(v[2]), static_cast<T>(v[3])};
    if (!have_prev_time) {  // rate form, first row: the start
      have_prev_time = true;
      prev_time = t;
      start_time = t;
      held_first = v;
      held_line = line;
      continue;
    }
    if (!(t > prev_time)) {
      if (!opt.skip_bad) {
        std::array<char, 160> buf{};
        std::snprintf(buf.data(), buf.size(),
                      "timestamp %.17g does not increase (previous %.17g)", t, prev_time);
        bad(line, buf.data());
        return exit_input;
      }
      ++skipped.time_not_increasing;
      continue;
    }
    const double dt = t - prev_time;
    if (!max_interval) {
      max_interval = 2.5 * dt;
      make_propagator(*max_interval);
    }
    if (!truth_initial_done) {
      Quaternion<double> qt;
      if (!truth->at(start_time, qt)) return exit_input;
      if (!(norm(qt) > 0.0)) {
        std::fprintf(stderr, "%s: truth attitude at the start time is zero\n", opt.truth.c_str());
        return exit_input;
      }
      const Quaternion<double> n = normalized(qt);
      prop->reset(Quaternion<T>{static_cast<T>(n.w), static_cast<T>(n.x), static_cast<T>(n.y),
                                static_cast<T>(n.z)});
      truth_initial_done = true;
    }
    if (held_first) {
      // Rate form: the start row opens the window of steppers whose window spans the step; a
      // rate-at-end stepper does not use it. Its nominal interval (unused by the stepper) is the
      // first interval, capped at the gap limit so that validation passes.
      if (Stepper::layout == SampleLayout::rates_spanning) {
        const std::array<double, 4>& h = *held_first;
        if (!push(Vector3<T>{static_cast<T>(h[1]), static_cast<T>(h[2]), static_cast<T>(h[3])},
                  std::fmin(dt, *max_interval), h[0], held_line)) {
          return exit_input;
        }
      }
      held_first.reset();
    }
    if (dt > *max_interval) {
      if (!opt.skip_bad) {
        std::array<char, 200> buf{};
        std::snprintf(buf.data(), buf.size(),
                      "gap: interval %.17g s exceeds the limit %.17g s (--max-interval; default "
                      "2.5 x the first interval)",
                      dt, *max_interval);
        bad(line, buf.data());
        return exit_input;
      }
      ++skipped.gap;
    }
    prev_time = t;
    if (!push(sample, dt, t, line)) return exit_input;
  }
  if (std::ferror(out.get()) != 0) {
    std::fprintf(stderr, "halfspin-propagate: write error on %s\n", opt.output.c_str());
    return exit_input;
  }
  const PropagationCounters c = prop ? prop->counters() : PropagationCounters{};
  if (c.steps == 0) {
    std::fprintf(stderr,
                 "%s:%zu: no complete step in the log (%llu samples read after the header; %s "
                 "needs %zu per step)\n",
                 opt.log.c_str(), reader.line(), static_cast<unsigned long long>(samples_read),
                 Stepper::name, Stepper::window);
    return exit_input;
  }

  // Summary.
  const auto u = [](std::uint64_t n) { return static_cast<unsigned long long>(n); };
  const Quaternion<T> q = prop->attitude();
  const EulerDecomposition<T> e = to_euler_angles(q, opt.euler);
  std::fprintf(stderr, "method %s, scalar %s, renormalization %s, Euler %s\n", Stepper::name,
               std::is_same<T, float>::value ? "float" : "double",
               opt.renormalize == Renormalize::none          ? "none"
               : opt.renormalize == Renormalize::exact       ? "exact"
               : opt.renormalize == Renormalize::first_order ? "first_order"
               : opt.renormalize == Renormalize::periodic    ? "periodic"
                                                             : "threshold",
               seq.c_str());
  std::fprintf(stderr, "steps: %llu\n", u(c.steps));
  std::fprintf(stderr, "samples read: %llu\n", u(samples_read));
  std::fprintf(stderr, "longest interval accepted: %.9g s (a longer one is a gap)\n", *max_interval);
  std::fprintf(stderr,
               "skipped by class: malformed %llu, non_numeric %llu, non_finite %llu, "
               "time_not_increasing %llu, gap %llu, over_range %llu\n",
               u(skipped.malformed), u(skipped.non_numeric), u(skipped.non_finite),
               u(skipped.time_not_increasing), u(skipped.gap), u(skipped.over_range));
  std::fprintf(stderr,
               "propagator: accepted %llu, rejected non_finite %llu, non_positive_step %llu, "
               "step_too_long %llu, over_range %llu, discarded after gap %llu\n",
               u(c.samples_accepted), u(c.rejected_non_finite), u(c.rejected_non_positive_step),
               u(c.rejected_step_too_long), u(c.rejected_over_range), u(c.discarded_samples));
  std::fprintf(stderr, "max norm error: %.3e\n", max_norm_error);
  if (near_singular_rows > 0) {
    std::fprintf(stderr, "rows near Euler gimbal lock (first/third split ill-conditioned): %llu\n",
                 u(near_singular_rows));
  }
  const T deg = T(180) / pi<T>;
  std::fprintf(stderr, "final attitude: q = %.*g,%.*g,%.*g,%.*g  %s = %.6f, %.6f, %.6f deg\n",
               digits, static_cast<double>(q.w), digits, static_cast<double>(q.x), digits,
               static_cast<double>(q.y), digits, static_cast<double>(q.z), seq.c_str(),
               static_cast<double>(e.angles.first * deg), static_cast<double>(e.angles.second * deg),
               static_cast<double>(e.angles.third * deg));
  if (truth != nullptr) {
    std::fprintf(stderr,
                 "attitude error vs truth: max %.6e rad (%.6e deg) at t = %.9g s; final %.6e rad "
                 "(%.6e deg)\n",
                 max_truth_error, to_degrees(max_truth_error), max_truth_error_time,
                 final_truth_error, to_degrees(final_truth_error));
  }
  return exit_ok;
}

void list_methods() {
  for (const MethodInfo& m : method_catalogue()) {
    const char* input = m.layout == SampleLayout::rate_function ? "[rate-function: not usable on a log]"
                        : carries_delta_angles(m.layout)       ? "[delta]"
                                                               : "[rate]";
    std::printf("%-36s %-38s %s%s\n", m.name, input, m.description,
                m.has_estimate ? " (error estimate column)" : "");
  }
}

}  // namespace

int main(int argc, char** argv) {
  Options opt;
  std::string initial_text;
  for (int i = 1; i < argc; ++i) {
    // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
    const std::string a = argv[i];
    const auto value = [&]() -> std::string {
      if (i + 1 >= argc) usage_error("option " + a + " needs a value");
      // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
      return argv[++i];
    };
    if (a == "--help" || a == "-h") {
      std::fputs(help_text, stdout);
      return exit_ok;
    } else if (a == "--list-methods") {
      list_methods();
      return exit_ok;
    } else if (a == "--output") {
      opt.output = value();
    } else if (a == "--method") {
      opt.method = value();
    } else if (a == "--renormalize") {
      const std::string p = value();
      if (p == "none") opt.renormalize = Renormalize::none;
      else if (p == "exact") opt.renormalize = Renormalize::exact;
      else if (p == "first_order") opt.renormalize = Renormalize::first_order;
      else if (p == "periodic") opt.renormalize = Renormalize::periodic;
      else if (p == "threshold") opt.renormalize = Renormalize::threshold;
      else usage_error("unknown renormalization '" + p + "'");
    } else if (a == "--renormalize-period") {
      const auto n = parse_number(value());
      if (!n || *n < 1 || *n > 4294967295.0 || *n != std::floor(*n)) {
        usage_error("--renormalize-period needs an integer >= 1");
      }
      opt.period = static_cast<std::uint32_t>(*n);
    } else if (a == "--renormalize-threshold") {
      const auto x = parse_number(value());
      if (!x || !(*x > 0)) usage_error("--renormalize-threshold needs a number > 0");
      opt.threshold = *x;
    } else if (a == "--initial") {
      initial_text = value();
    } else if (a == "--scalar") {
      const std::string s = value();
      if (s == "float") opt.use_float = true;
      else if (s == "double") opt.use_float = false;
      else usage_error("--scalar must be float or double");
    } else if (a == "--euler") {
      const std::string s = value();
      bool found = false;
      for (const EulerSequence e : all_euler_sequences) {
        if (euler_name(e) == s) {
          opt.euler = e;
          found = true;
        }
      }
      if (!found) usage_error("unknown Euler sequence '" + s + "'");
    } else if (a == "--start-time") {
      const auto x = parse_number(value());
      if (!x) usage_error("--start-time needs a finite number");
      opt.start_time = *x;
    } else if (a == "--max-interval") {
      const auto x = parse_number(value());
      if (!x || !(*x > 0)) usage_error("--max-interval needs a number > 0");
      opt.max_interval = *x;
    } else if (a == "--max-rate") {
      const auto x = parse_number(value());
      if (!x || !(*x > 0)) usage_error("--max-rate needs a number > 0");
      opt.max_rate = *x;
    } else if (a == "--skip-bad") {
      opt.skip_bad = true;
    } else if (a == "--truth") {
      opt.truth = value();
    } else if (!a.empty() && a[0] == '-') {
      usage_error("unknown option '" + a + "'");
    } else if (opt.log.empty()) {
      opt.log = a;
    } else {
      usage_error("more than one log given ('" + opt.log + "', '" + a + "')");
    }
  }
  if (opt.log.empty()) usage_error("no gyro log given");
  if (opt.output.empty()) usage_error("--output FILE is required");
  if (!initial_text.empty()) {
    if (initial_text == "truth") {
      if (opt.truth.empty()) usage_error("--initial truth needs --truth FILE");
      opt.initial_from_truth = true;
    } else {
      std::array<double, 4> c{};
      std::size_t n = 0;
      std::size_t start = 0;
      bool ok = true;
      while (ok) {
        const std::size_t comma = initial_text.find(',', start);
        const std::string part = initial_text.substr(
            start, comma == std::string::npos ? std::string::npos : comma - start);
        const auto x = parse_number(part);
        if (!x || n >= 4) ok = false;
        else c[n++] = *x;
        if (comma == std::string::npos) break;
        start = comma + 1;
      }
      if (!ok || n != 4) usage_error("--initial needs four finite numbers qw,qx,qy,qz");
      opt.initial = Quaternion<double>{c[0], c[1], c[2], c[3]};
      const double n2 = squared_norm(opt.initial);
      if (!(n2 > 0.0) || !(n2 - n2 == 0.0)) {
        usage_error("--initial must be a nonzero quaternion of finite norm");
      }
    }
  }

  // Method: known, and usable on a log.
  const MethodInfo* info = nullptr;
  if (!opt.method.empty()) {
    for (const MethodInfo& m : method_catalogue()) {
      if (opt.method == m.name) info = &m;
    }
    if (info == nullptr) usage_error("unknown method '" + opt.method + "' (--list-methods)");
    if (info->layout == SampleLayout::rate_function) {
      usage_error("method '" + opt.method +
                  "' needs a rate function (a model of the motion), not a gyro log");
    }
  }

  std::ifstream in(opt.log, std::ios::binary);
  if (!in) {
    std::fprintf(stderr, "%s: cannot read: %s\n", opt.log.c_str(), std::strerror(errno));
    return exit_input;
  }
  NumericCsvReader<4> reader(in);
  std::string header;
  if (!reader.read_header(header)) {
    if (reader.line() == 0) {
      std::fprintf(stderr, "%s:1: empty file: no header line (expected 't,wx,wy,wz' or 't,dx,dy,dz')\n",
                   opt.log.c_str());
    } else {
      std::fprintf(stderr, "%s:1: header line longer than %zu characters\n", opt.log.c_str(),
                   max_line_length);
    }
    return exit_input;
  }
  const std::optional<GyroLogForm> form = gyro_log_form_from_header(header);
  if (!form) {
    std::fprintf(stderr, "%s:1: header must be 't,wx,wy,wz' (rates) or 't,dx,dy,dz' "
                         "(delta-angles), found '%s'\n",
                 opt.log.c_str(), header.c_str());
    return exit_input;
  }
  if (opt.method.empty()) {
    opt.method = *form == GyroLogForm::rate ? "expmap_midpoint_mean" : "coning_2_sample";
    for (const MethodInfo& m : method_catalogue()) {
      if (opt.method == m.name) info = &m;
    }
  }
  const bool method_takes_deltas = carries_delta_angles(info->layout);
  if (method_takes_deltas != (*form == GyroLogForm::delta_angle)) {
    usage_error(std::string("method '") + opt.method + "' takes " +
                (method_takes_deltas ? "delta-angles" : "rates") + " but " + opt.log + " is a " +
                (*form == GyroLogForm::rate ? "rate" : "delta-angle") + " log");
  }

  TruthTrack truth;
  if (!opt.truth.empty()) {
    if (!truth.open(opt.truth)) {
      std::fprintf(stderr, "%s: cannot read: %s\n", opt.truth.c_str(), std::strerror(errno));
      return exit_input;
    }
    if (!truth.header()) return exit_input;
  }

  StagedOutputFile out;
  if (!out.open(opt.output)) {
    usage_error("cannot create a temporary file beside --output " + opt.output + ": " +
                std::strerror(errno));
  }

  int code = exit_usage;
  visit_method(opt.method, [&](auto tag) {
    using S = typename decltype(tag)::type;
    if constexpr (S::layout != SampleLayout::rate_function) {
      TruthTrack* t = opt.truth.empty() ? nullptr : &truth;
      code = opt.use_float ? run<float, S>(opt, in, reader, *form, out, t)
                           : run<double, S>(opt, in, reader, *form, out, t);
    }
  });
  if (code == exit_ok && in.bad()) {
    std::fprintf(stderr, "%s: read error\n", opt.log.c_str());
    code = exit_input;
  }
  if (code == exit_ok) {
    if (!out.commit()) {
      std::fprintf(stderr, "halfspin-propagate: cannot write %s: %s\n", opt.output.c_str(),
                   std::strerror(errno));
      return exit_input;
    }
    std::fprintf(stderr, "wrote %s\n", opt.output.c_str());
  } else {
    out.discard();
  }
  return code;
}
