// halfspin-stepstudy --log: every studied method at every coarsening of a gyro log, compared with
// the log's finest solution (the reference below), whose own error is estimated by Richardson
// extrapolation; no truth needed. `halfspin-stepstudy --help` and README.md document the choices.
//
// Memory: the log is streamed twice in chunks (a check pass, then the study with every run fed
// chunk by chunk), so memory does not grow with the log's length.
//
// Caution: these measurements support engineering judgement; validate in hardware-in-the-loop and
// flight test under local airworthiness rules and licensed practice.

#include "log_study.hpp"

#include <algorithm>
#include <array>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <limits>
#include <memory>
#include <numeric>
#include <optional>
#include <string>
#include <vector>

#include "../propagate/truth_track.hpp"
#include "gyro_log.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "log_runs.hpp"
#include "method_registry.hpp"
#include "number_text.hpp"
#include "sensor_report.hpp"
#include "svg_chart.hpp"

namespace halfspin::tools::stepstudy {
namespace {

constexpr int exit_ok = 0;
constexpr int exit_usage = 1;
constexpr int exit_failure = 2;

// The references: of each form's order-3 and order-4 sample steppers, the one with the smallest
// worst true error over the five truth motions' logs at 1 kHz (README.md, "Choosing the
// reference"): four-sample coning for delta-angle logs, classic RK4 on rate samples for rate
// logs, each tried first; then two- and one-sample coning (delta), Magnus 4 and the midpoint-mean
// exponential map (rate). Run in long double.
using DeltaReference = Coning4Sample;
using RateReference = RungeKutta4Sampled;
inline constexpr int reference_levels = 4;  // 1, 2, 4, 8 log periods per sample
// A log whose motion is fast for its rate (vibration near a tenth of the sample rate) can put the
// default reference outside its asymptotic range: a four-sample step spans four log periods.
// So each candidate below is first run at its own levels (a pass over the log), and the one
// whose Richardson estimate has the smallest upper end is the reference: a reliable estimate
// before an unreliable one.

// Every interval between rows must be within this fraction of the first (a fixed gyro period).
constexpr double period_tolerance = 1e-6;
constexpr std::size_t chunk_rows = 8192;

std::string csv_number(double v) { return std::isnan(v) ? std::string() : number_text("%.17g", v); }

// What the check pass learns about a log.
struct LogShape {
  GyroLogForm form = GyroLogForm::rate;
  std::int64_t first_row = 0;  // 0 in a rate log (the rate at t0), 1 in a delta-angle log
  std::int64_t last_row = 0;   // the last row studied (--duration may end before the file)
  double period_s = 0;         // h: (last time − first time) / (rows − 1)
  double start_s = 0;          // t0: a rate log's first time, a delta-angle log's first time − h
};

bool open_log(const std::string& path, std::ifstream& in, std::string& error) {
  in.open(path, std::ios::binary);
  if (!in) {
    error = "cannot open the log " + path + ": " + std::strerror(errno);
    return false;
  }
  return true;
}

// Reads the header into `layout` (resolve_gyro_log_layout: the time and gyro columns by name, in
// any order, other columns ignored) and makes the reader read those columns.
bool read_log_layout(NumericCsvReader<4>& reader, const std::string& path, GyroLogLayout& layout,
                     std::string& error) {
  std::string header;
  if (!reader.read_header(header)) {
    error = path + (reader.line() == 0 ? ": empty file" : ":1: header line too long");
    return false;
  }
  const std::string reason = resolve_gyro_log_layout(header, std::nullopt, {}, layout);
  if (!reason.empty()) {
    error = path + ":1: the header must name the columns t and wx,wy,wz (rate log) or dx,dy,dz " +
            "(delta-angle log), in any order among other columns: found '" + header + "'";
    return false;
  }
  reader.select_columns(layout.column, layout.field_count);
  return true;
}

// The header's names of t, x, y, z, for the reader's messages (valid while `layout` lives).
std::array<const char*, 4> field_names(const GyroLogLayout& layout) {
  return {{layout.name[0].c_str(), layout.name[1].c_str(), layout.name[2].c_str(),
           layout.name[3].c_str()}};
}

// The check pass: header, every row, and a fixed period.
bool scan_log(const Options& o, LogShape& shape, std::string& error) {
  const std::string& path = o.log.file;
  std::ifstream in;
  if (!open_log(path, in, error)) {
    return false;
  }
  NumericCsvReader<4> reader(in);
  GyroLogLayout layout;
  if (!read_log_layout(reader, path, layout, error)) {
    return false;
  }
  if (!layout.ignored.empty()) {
    std::string list;
    for (const std::size_t c : layout.ignored) {
      list += (list.empty() ? "" : ", ") + std::to_string(c + 1) + " '" + layout.header[c] + "'";
    }
    std::printf("note: %s: column%s %s ignored\n", path.c_str(),
                layout.ignored.size() > 1 ? "s" : "", list.c_str());
  }
  shape.form = layout.form;
  const std::array<const char*, 4> names = field_names(layout);
  std::array<double, 4> row{};
  std::int64_t rows = 0;
  double first_t = 0;
  double previous_t = 0;
  double first_interval = 0;
  while (true) {
    const ReadOutcome r = reader.next(row, names);
    if (r == ReadOutcome::end) {
      break;
    }
    if (r == ReadOutcome::bad) {
      error = path + ":" + std::to_string(reader.line()) + ": " + reader.message();
      return false;
    }
    if (rows == 0) {
      first_t = row[0];
    } else {
      const double interval = row[0] - previous_t;
      if (rows == 1) {
        first_interval = interval;
      }
      if (!(interval > 0) ||
          std::fabs(interval - first_interval) > period_tolerance * first_interval) {
        error = path + ":" + std::to_string(reader.line()) + ": the interval " +
                number_text("%.9g", interval) + " s to the previous row is " +
                (interval > 0 ? "not the log's period " + number_text("%.9g", first_interval) +
                                    " s within 1 ppm"
                              : std::string("not positive")) +
                ": the study needs a fixed gyro period";
        return false;
      }
    }
    previous_t = row[0];
    ++rows;
  }
  if (rows < 2) {
    error = path + ": the log needs at least two rows (it has " + std::to_string(rows) + ")";
    return false;
  }
  shape.period_s = (previous_t - first_t) / static_cast<double>(rows - 1);
  shape.first_row = layout.form == GyroLogForm::rate ? 0 : 1;
  shape.start_s = layout.form == GyroLogForm::rate ? first_t : first_t - shape.period_s;
  shape.last_row = shape.first_row + rows - 1;
  if (o.log.duration_given) {
    // The last row ending within --duration of t0 (a relative 1e-9 absorbs decimal rounding).
    const auto within =
        static_cast<std::int64_t>(std::floor(o.duration / shape.period_s * (1.0 + 1e-9)));
    shape.last_row = std::min(shape.last_row, within);
  }
  return true;
}

// The study pass: the log's rows in chunks, with each row's time.
class LogRows {
 public:
  bool open(const std::string& path, std::string& error) {
    if (!open_log(path, in_, error)) {
      return false;
    }
    reader_.emplace(in_);
    if (!read_log_layout(*reader_, path, layout_, error)) {
      error = path + ": the log changed since it was checked";
      return false;
    }
    return true;
  }
  // The next rows up to last_row (at most chunk_rows); false when none are left.
  bool next(const LogShape& shape, LogChunk& chunk, std::vector<double>& times) {
    if (!chunk.values.empty()) {
      chunk.before = chunk.values.back();
    }
    chunk.first_row = next_row_;
    chunk.values.clear();
    times.clear();
    std::array<double, 4> row{};
    while (next_row_ <= shape.last_row && chunk.values.size() < chunk_rows &&
           reader_->next(row, field_names(layout_)) == ReadOutcome::row) {
      chunk.values.push_back(
          {static_cast<LD>(row[1]), static_cast<LD>(row[2]), static_cast<LD>(row[3])});
      times.push_back(row[0]);
      ++next_row_;
    }
    return !chunk.values.empty();
  }
  void start_at(std::int64_t row) { next_row_ = row; }

 private:
  std::ifstream in_;
  std::optional<NumericCsvReader<4>> reader_;
  GyroLogLayout layout_;
  std::int64_t next_row_ = 0;
};

// One studied (method, scalar, coarsening) and what was measured.
struct MethodRun {
  std::string method;
  const char* scalar = "";
  std::int64_t k = 1;
  std::int64_t periods = 1;  // samples per step
  LogInput input = LogInput::delta_sums;
  std::unique_ptr<LogRun> run;
  bool ok = true;
  std::int64_t compared = 0;
  double max_difference = 0;  // against the reference (rad)
  double sum_te = 0;          // Σ t·e and Σ t² for the growth rate
  double sum_tt = 0;
  double max_true = std::numeric_limits<double>::quiet_NaN();  // against --log-truth (rad)
  double order = std::numeric_limits<double>::quiet_NaN();
  double step_s = 0;
};

// One candidate's outcome in the choice of the reference.
struct ReferenceCandidate {
  const char* name = "";
  RichardsonEstimate estimate;
};

struct StudyResult {
  std::vector<MethodRun> runs;
  std::vector<ReferenceCandidate> candidates;  // the references tried, in order
  RichardsonEstimate reference;
  double reference_true = std::numeric_limits<double>::quiet_NaN();
  const char* reference_name = "";
  std::int64_t reference_periods = 1;
  LogShape shape;
  int failure_code = exit_usage;  // when run_study fails: bad input (1) or a failed run (2)
};

template <class S>
void add_method_runs(const Options& o, const std::vector<std::int64_t>& levels, LogInput input,
                     const Quaternion<LD>& q0, LD h, std::vector<MethodRun>& runs) {
  for (const char* scalar : {"float", "double"}) {
    const bool is_float = std::string(scalar) == "float";
    if ((is_float && !o.want_float) || (!is_float && !o.want_double)) {
      continue;
    }
    for (const std::int64_t k : levels) {
      MethodRun m;
      m.method = S::name;
      m.scalar = scalar;
      m.k = k;
      m.periods = static_cast<std::int64_t>(periods_per_step(S::layout, S::window));
      m.input = input;
      m.step_s = static_cast<double>(h) * static_cast<double>(k * m.periods);
      if (!is_float) {
        m.run = std::make_unique<LogRunOf<S, double, PlainAccumulation>>(q0, k, h, input);
      } else if (o.compensated_float) {
        m.run = std::make_unique<LogRunOf<S, float, CompensatedAccumulation>>(q0, k, h, input);
      } else {
        m.run = std::make_unique<LogRunOf<S, float, PlainAccumulation>>(q0, k, h, input);
      }
      runs.push_back(std::move(m));
    }
  }
}

std::int64_t lcm(std::int64_t a, std::int64_t b) { return a / std::gcd(a, b) * b; }

// The methods to run on this log, their runs, and notes on the ones left out.
bool plan_runs(const Options& o, const LogShape& shape, std::int64_t reference_periods,
               const Quaternion<LD>& q0, std::vector<MethodRun>& runs, std::string& error) {
  const std::vector<std::string> names = requested_method_names(o);
  const int level_count = o.steps_given ? o.steps : default_log_levels;
  const LD h = static_cast<LD>(shape.period_s);
  std::vector<std::string> done;
  for (const std::string& requested : names) {
    bool duplicate = false;
    const bool known = visit_method(requested, [&](auto tag) {
      using S = typename decltype(tag)::type;
      duplicate = std::find(done.begin(), done.end(), S::name) != done.end();
      if (duplicate) {
        return;
      }
      done.emplace_back(S::name);
      if constexpr (S::layout == SampleLayout::rate_function) {
        std::printf("note: %s not run: it needs the rate at any time, a log has samples only\n",
                    S::name);
      } else {
        const bool delta_method = carries_delta_angles(S::layout);
        if (shape.form == GyroLogForm::delta_angle && !delta_method) {
          std::printf(
              "note: %s not run: it needs rate samples, and a delta-angle log holds integrals "
              "(differencing them would be an interpolation)\n",
              S::name);
          return;
        }
        const LogInput input = shape.form == GyroLogForm::delta_angle ? LogInput::delta_sums
                               : delta_method                         ? LogInput::trapezoid_sums
                                                                      : LogInput::rate_every_kth;
        std::vector<std::int64_t> levels;
        const auto p = static_cast<std::int64_t>(periods_per_step(S::layout, S::window));
        for (int i = 0; i < level_count; ++i) {
          const std::int64_t k = std::int64_t{1} << i;
          if (lcm(p * k, reference_periods) <= shape.last_row) {
            levels.push_back(k);
          } else {
            std::printf(
                "note: %s at %lld log periods per sample left out: no step end in "
                "common with the reference within the log\n",
                S::name, static_cast<long long>(k));
          }
        }
        add_method_runs<S>(o, levels, input, q0, h, runs);
      }
    });
    if (!known) {
      error = "unknown method '" + requested + "' (--methods list shows them)";
      return false;
    }
  }
  if (runs.empty()) {
    error = "no method to run on this " +
            std::string(shape.form == GyroLogForm::rate ? "rate" : "delta-angle") + " log";
    return false;
  }
  return true;
}

// A reference stepper run in long double at 1, 2, 4, 8 log periods per sample from one start,
// fed chunk by chunk: the finest run's attitude at every step end, the largest differences
// between neighbouring levels, and Richardson's estimate of the finest run's own error from them.
template <class Reference>
class ReferenceLevels {
 public:
  // Log periods per reference sample at the finest level.
  static constexpr auto periods =
      static_cast<std::int64_t>(periods_per_step(Reference::layout, Reference::window));

  // False (with `error`) if the coarsest level needs more rows than the log has.
  static bool fits(const Options& o, const LogShape& shape, std::string& error) {
    if (periods << (reference_levels - 1) <= shape.last_row) {
      return true;
    }
    error = o.log.file + ": too short for the reference: " + Reference::name + " at " +
            std::to_string(1 << (reference_levels - 1)) + " log periods per sample needs " +
            std::to_string(periods << (reference_levels - 1)) + " rows";
    return false;
  }

  // What to say when a level rejected a sample of the log.
  static std::string rejection(const Options& o) {
    return std::string("the reference ") + Reference::name + " rejected a sample of " + o.log.file +
           " (rates over 1e4 rad/s?)";
  }

  ReferenceLevels(const Quaternion<LD>& q0, const LogShape& shape)
      : h_(static_cast<LD>(shape.period_s)), rate_log_(shape.form == GyroLogForm::rate) {
    const LogInput input =
        carries_delta_angles(Reference::layout) ? LogInput::delta_sums : LogInput::rate_every_kth;
    for (int l = 0; l < reference_levels; ++l) {
      runs_.at(static_cast<std::size_t>(l)) =
          std::make_unique<LogRunOf<Reference, LD, PlainAccumulation>>(q0, std::int64_t{1} << l, h_,
                                                                       input);
    }
  }

  // Feeds one chunk to every level; `at_common_end(i)` is called for each row i of the chunk
  // where the two finest levels both end a step (finest(i) is then set). False if a level
  // rejected a sample.
  template <class CommonEnd>
  bool feed(const LogChunk& chunk, const CommonEnd& at_common_end) {
    for (const Vector3<LD>& v : chunk.values) {
      angle_turned_ += norm(v) * (rate_log_ ? h_ : 1.0L);
    }
    for (std::size_t l = 0; l < runs_.size(); ++l) {
      if (!runs_.at(l)->feed(chunk, ends_)) {
        return false;
      }
      tracks_.at(l).resize(chunk.values.size());
      for (const StepEnd& e : ends_) {
        const auto i = static_cast<std::size_t>(e.row - chunk.first_row);
        tracks_.at(l)[i] = e.attitude;
        if (l > 0) {
          differences_.at(l - 1) =
              std::max(differences_.at(l - 1),
                       static_cast<double>(angle_between(e.attitude, tracks_.at(l - 1)[i])));
        }
        if (l == 1) {
          at_common_end(i);
        }
      }
    }
    return true;
  }

  // The finest level's attitude at row i of the last chunk (set where it ended a step).
  const Quaternion<LD>& finest(std::size_t i) const { return tracks_[0][i]; }

  // Richardson's estimate of the finest level's error, with the long double rounding of the
  // angle turned as its floor.
  RichardsonEstimate estimate() const {
    return richardson_estimate(
        differences_, Reference::order,
        std::numeric_limits<double>::epsilon() / 2 * static_cast<double>(angle_turned_));
  }

 private:
  LD h_;
  bool rate_log_;
  std::array<std::unique_ptr<LogRun>, reference_levels> runs_;
  std::array<std::vector<Quaternion<LD>>, reference_levels> tracks_;
  std::vector<StepEnd> ends_;
  std::array<double, reference_levels - 1> differences_{};
  LD angle_turned_ = 0;  // Σ over rows of |Δθ| (delta-angle log) or |ω|·h (rate log), rad
};

// A candidate reference's own error on this log: its levels from the identity (the angle between
// two runs from the same start does not depend on it). False (with `error`) if the log cannot be
// read or the candidate needs more rows than the log has.
template <class Reference>
bool reference_estimate(const Options& o, const LogShape& shape, RichardsonEstimate& estimate,
                        std::string& error) {
  if (!ReferenceLevels<Reference>::fits(o, shape, error)) {
    return false;
  }
  ReferenceLevels<Reference> levels(Quaternion<LD>::identity(), shape);
  LogRows rows;
  if (!rows.open(o.log.file, error)) {
    return false;
  }
  rows.start_at(shape.first_row);
  LogChunk chunk;
  std::vector<double> times;
  while (rows.next(shape, chunk, times)) {
    if (!levels.feed(chunk, [](std::size_t) {})) {
      error = ReferenceLevels<Reference>::rejection(o);
      return false;
    }
  }
  estimate = levels.estimate();
  return true;
}

// Whether a is the better reference: reliable before unreliable, then the smaller upper end.
bool better_reference(const RichardsonEstimate& a, const RichardsonEstimate& b) {
  if (a.reliable != b.reliable) {
    return a.reliable;
  }
  return a.high_rad < b.high_rad;
}

// The study pass: reference runs and method runs fed chunk by chunk.
template <class Reference>
bool run_study(const Options& o, StudyResult& result, std::string& error) {
  const LogShape& shape = result.shape;
  const std::int64_t p_ref = ReferenceLevels<Reference>::periods;
  result.reference_name = Reference::name;
  result.reference_periods = p_ref;
  if (!ReferenceLevels<Reference>::fits(o, shape, error)) {
    return false;
  }

  // The truth, if given: the starting attitude and one attitude per row.
  std::optional<propagate::TruthTrack> truth;
  Quaternion<LD> q0 = Quaternion<LD>::identity();
  const auto truth_at = [&](double t, Quaternion<LD>& q) {
    Quaternion<double> qd;
    if (!truth->at(t, qd)) {
      return false;
    }
    q = {static_cast<LD>(qd.w), static_cast<LD>(qd.x), static_cast<LD>(qd.y),
         static_cast<LD>(qd.z)};
    return true;
  };
  if (!o.log.truth.empty()) {
    truth.emplace();
    if (!truth->open(o.log.truth)) {
      error = "cannot open the truth " + o.log.truth + ": " + std::strerror(errno);
      return false;
    }
    if (!truth->header() || !truth_at(shape.start_s, q0)) {
      error = o.log.truth + ": not a truth for this log (message above)";
      return false;
    }
  }

  ReferenceLevels<Reference> reference(q0, shape);
  if (!plan_runs(o, shape, p_ref, q0, result.runs, error)) {
    return false;
  }

  LogRows rows;
  if (!rows.open(o.log.file, error)) {
    result.failure_code = exit_failure;
    return false;
  }
  rows.start_at(shape.first_row);
  LogChunk chunk;
  std::vector<double> times;
  std::vector<StepEnd> ends;
  std::vector<Quaternion<LD>> truth_rows;
  double reference_true = 0;
  while (rows.next(shape, chunk, times)) {
    const std::size_t n = chunk.values.size();
    if (truth) {
      truth_rows.resize(n);
      for (std::size_t i = 0; i < n; ++i) {
        if (!truth_at(times[i], truth_rows[i])) {
          error = o.log.truth + ": not a truth for this log (message above)";
          return false;
        }
      }
    }
    const bool fed = reference.feed(chunk, [&](std::size_t i) {
      if (truth) {
        reference_true = std::max(
            reference_true, static_cast<double>(angle_between(reference.finest(i), truth_rows[i])));
      }
    });
    if (!fed) {
      error = ReferenceLevels<Reference>::rejection(o);
      result.failure_code = exit_failure;
      return false;
    }
    for (MethodRun& m : result.runs) {
      m.ok = m.run->feed(chunk, ends) && m.ok;
      for (const StepEnd& e : ends) {
        if (e.row % p_ref != 0) {
          continue;
        }
        const auto i = static_cast<std::size_t>(e.row - chunk.first_row);
        const double d = static_cast<double>(angle_between(e.attitude, reference.finest(i)));
        const double t = static_cast<double>(e.row) * shape.period_s;
        ++m.compared;
        m.max_difference = std::max(m.max_difference, d);
        m.sum_te += t * d;
        m.sum_tt += t * t;
        if (truth) {
          const double e_true = static_cast<double>(angle_between(e.attitude, truth_rows[i]));
          m.max_true = std::isnan(m.max_true) ? e_true : std::max(m.max_true, e_true);
        }
      }
    }
  }
  result.reference = reference.estimate();
  if (truth) {
    result.reference_true = reference_true;
  }
  for (std::size_t i = 1; i < result.runs.size(); ++i) {
    const MethodRun& a = result.runs[i - 1];
    MethodRun& b = result.runs[i];
    if (a.method == b.method && std::string(a.scalar) == b.scalar && a.max_difference > 0 &&
        b.max_difference > 0) {
      b.order = std::log(b.max_difference / a.max_difference) / std::log(b.step_s / a.step_s);
    }
  }
  return true;
}

double growth_rate(const MethodRun& m) { return m.sum_tt > 0 ? m.sum_te / m.sum_tt : 0.0; }
double extrapolated(const Options& o, const MethodRun& m) {
  return o.horizon > 0 ? growth_rate(m) * o.horizon : std::numeric_limits<double>::quiet_NaN();
}
bool at_resolution(const StudyResult& r, const MethodRun& m) {
  return m.max_difference < resolution_margin * r.reference.high_rad;
}
double ns_per_step(const MethodRun& m) {
  const std::int64_t steps = m.run->steps();
  return steps > 0 ? m.run->propagator_ns() / static_cast<double>(steps)
                   : std::numeric_limits<double>::quiet_NaN();
}
const char* input_word(LogInput input) {
  return input == LogInput::trapezoid_sums ? "interpolated" : "exact";
}
std::string form_words(GyroLogForm form) {
  return form == GyroLogForm::rate ? "rate" : "delta-angle";
}

void print_reference(const Options& o, const StudyResult& r) {
  const RichardsonEstimate& e = r.reference;
  const double h = r.shape.period_s;
  std::printf(
      "Reference (the log's finest solution): %s at 1 log period per sample (step %.4e s), long "
      "double\n",
      r.reference_name, h * static_cast<double>(r.reference_periods));
  std::printf(
      "  chosen among (each run at 1, 2, 4, 8 log periods per sample; a reliable estimate\n"
      "  first, then the smallest upper end of its own error):");
  for (const ReferenceCandidate& c : r.candidates) {
    std::printf(" %s %s %.3e rad%s", c.name, c.estimate.reliable ? "reliable," : "UNRELIABLE,",
                c.estimate.high_rad, &c == &r.candidates.back() ? "\n" : ";");
  }
  std::printf(
      "  its own error, by Richardson extrapolation (runs at 1, 2, 4, 8 log periods per sample):\n"
      "    max differences %.3e (1 vs 2), %.3e (2 vs 4), %.3e (4 vs 8) rad\n",
      e.differences[0], e.differences[1], e.differences[2]);
  if (e.reliable) {
    std::printf(
        "    observed orders %.2f (finest pair), %.2f (next); declared order %d\n"
        "    estimate %.3e rad = %.3e / (2^%.2f - 1), order used: the lesser of the finest pair's "
        "and the declared\n"
        "    uncertainty: %.3e .. %.3e rad (any order from the least to the greatest of these, "
        "then x or / %.0f,\n"
        "    plus the log's own rounding below)\n",
        e.order_fine, e.order_coarse, e.declared_order, e.estimate_rad, e.differences[0],
        e.order_used, e.low_rad, e.high_rad, richardson_widening);
  } else {
    std::printf(
        "    the differences do not shrink like one order from 0.5 to 16 (observed %s, %s): "
        "at the\n"
        "    rounding level or outside the asymptotic range: UNRELIABLE estimate %.3e rad, order "
        "used:\n"
        "    the declared %d; upper end the 1-vs-2 difference plus the log's own rounding: %.3e "
        "rad\n",
        std::isfinite(e.order_fine) ? number_text("%.2f", e.order_fine).c_str() : "-",
        std::isfinite(e.order_coarse) ? number_text("%.2f", e.order_coarse).c_str() : "-",
        e.estimate_rad, e.declared_order, e.high_rad);
  }
  std::printf(
      "    the log's own rounding (its values are doubles): up to %.3e rad (eps/2 x the angle "
      "the log turns),\n"
      "    invisible to any solution of the log; counted in the upper end\n",
      e.data_floor_rad);
  if (!o.log.truth.empty()) {
    std::printf(
        "    against --log-truth: the reference's true error %.3e rad (%s its interval)\n",
        r.reference_true,
        r.reference_true >= e.low_rad && r.reference_true <= e.high_rad ? "within" : "OUTSIDE");
  }
}

void print_table(const Options& o, const StudyResult& r) {
  const bool truth = !o.log.truth.empty();
  std::printf(
      "\nMax difference from the log's finest solution (%s), NOT against truth, at their common "
      "step ends:\n",
      r.reference_name);
  std::printf("%-34s %-6s %-12s %6s %10s %9s %11s %6s %8s %11s %11s %-7s%s\n", "method", "scalar",
              "input", "k", "step (s)", "steps", "max diff", "order", "ns/step", "growth rad/s",
              o.horizon > 0 ? "extrap. rad" : "extrap.", "flag", truth ? "  true err rad" : "");
  for (const MethodRun& m : r.runs) {
    std::printf("%-34s %-6s %-12s %6lld %10.3e %9lld %11s %6s %8s %11s %11s %-7s%s\n",
                m.method.c_str(), m.scalar, input_word(m.input), static_cast<long long>(m.k),
                m.step_s, static_cast<long long>(m.run->steps()),
                scientific_cell(m.max_difference).c_str(),
                std::isfinite(m.order) ? number_text("%.2f", m.order).c_str() : "-",
                std::isfinite(ns_per_step(m)) ? number_text("%.1f", ns_per_step(m)).c_str() : "-",
                scientific_cell(growth_rate(m)).c_str(),
                scientific_cell(extrapolated(o, m)).c_str(), at_resolution(r, m) ? "ref-res" : "-",
                truth ? ("  " + scientific_cell(m.max_true)).c_str() : "");
  }
  std::printf(
      "k: log periods per sample (a step spans the method's samples per step); input exact: "
      "%s;\n"
      "  interpolated: delta-angles from the rate log by the trapezoid rule per log period.\n"
      "max diff: max over the common step ends of the angle to the reference (rad); order: "
      "log-log slope\n"
      "  to the previous k. ref-res: at the reference's resolution, under %.0fx the upper end of "
      "its error\n"
      "  estimate (the reference's own error can change it by a tenth or more).\n"
      "growth: least-squares slope through the origin of the difference against elapsed time "
      "(rad/s);\n",
      r.shape.form == GyroLogForm::rate ? "every k-th rate sample"
                                        : "sums of k consecutive delta-angles",
      resolution_margin);
  if (o.horizon > 0) {
    std::printf(
        "extrap.: growth x --horizon %g s: AN EXTRAPOLATION assuming linear growth, not a "
        "measurement or a bound.\n",
        o.horizon);
  } else {
    std::printf("extrap.: give --horizon S to extrapolate the growth to S seconds.\n");
  }
}

void print_budget(const Options& o, const StudyResult& r) {
  std::printf(
      "\nBudget %.3e rad over %g s%s, against the extrapolations above (linear growth; an "
      "extrapolation\nfrom %g s of log, not a bound): the largest step meeting it, per method "
      "and scalar:\n",
      o.budget, o.horizon, budget_origin(o).c_str(),
      static_cast<double>(r.shape.last_row) * r.shape.period_s);
  for (std::size_t i = 0; i < r.runs.size(); ++i) {
    const MethodRun& m = r.runs[i];
    const bool last_of_group = i + 1 == r.runs.size() || r.runs[i + 1].method != m.method ||
                               std::string(r.runs[i + 1].scalar) != m.scalar;
    if (!last_of_group) {
      continue;
    }
    const MethodRun* best = nullptr;
    for (const MethodRun& c : r.runs) {
      if (c.method == m.method && std::string(c.scalar) == m.scalar && c.ok &&
          extrapolated(o, c) <= o.budget) {
        best = &c;
      }
    }
    if (best != nullptr) {
      std::printf("  %-34s %-6s step %.4e s (k = %lld): extrapolated %.3e rad\n", m.method.c_str(),
                  m.scalar, best->step_s, static_cast<long long>(best->k), extrapolated(o, *best));
    } else {
      std::printf("  %-34s %-6s no studied step meets it\n", m.method.c_str(), m.scalar);
    }
  }
}

bool write_csv(const Options& o, const StudyResult& r) {
  std::ofstream out(o.csv);
  if (!out) {
    return false;
  }
  const bool truth = !o.log.truth.empty();
  out << "method,scalar,step_s,max_error_rad,bound_rad,ns_per_step,error_against,input,"
         "log_periods_per_sample,steps,at_reference_resolution,reference_error_rad,"
         "reference_error_low_rad,reference_error_high_rad,growth_rad_per_s,horizon_s,extrapolated_"
         "error_rad"
      << (truth ? ",true_error_rad,reference_true_error_rad\n" : "\n");
  for (const MethodRun& m : r.runs) {
    out << m.method << ',' << m.scalar << ',' << csv_number(m.step_s) << ','
        << csv_number(m.max_difference) << ",," << csv_number(ns_per_step(m))
        << ",log_finest_solution," << input_word(m.input) << ',' << m.k << ',' << m.run->steps()
        << ',' << (at_resolution(r, m) ? 1 : 0) << ',' << csv_number(r.reference.estimate_rad)
        << ',' << csv_number(r.reference.low_rad) << ',' << csv_number(r.reference.high_rad) << ','
        << csv_number(growth_rate(m)) << ',' << (o.horizon > 0 ? csv_number(o.horizon) : "") << ','
        << csv_number(extrapolated(o, m));
    if (truth) {
      out << ',' << csv_number(m.max_true) << ',' << csv_number(r.reference_true);
    }
    out << '\n';
  }
  return static_cast<bool>(out.flush());
}

bool write_svg(const Options& o, const StudyResult& r) {
  svg::Figure fig;
  const std::string& file = o.log.file;
  const std::size_t slash = file.find_last_of('/');
  fig.title = "halfspin step study of a gyro log: " +
              (slash == std::string::npos ? file : file.substr(slash + 1));
  fig.subtitle = "against the log's finest solution (" + std::string(r.reference_name) +
                 "), not truth; " + form_words(r.shape.form) + " log, " +
                 number_text("%g s", static_cast<double>(r.shape.last_row) * r.shape.period_s) +
                 " at " + number_text("%g Hz", 1.0 / r.shape.period_s);
  svg::Chart error_chart;
  error_chart.title = "Max difference from the log's finest solution against step";
  error_chart.x_label = "step (s)";
  error_chart.y_label = "difference from the reference (rad)";
  svg::Chart cost_chart;
  cost_chart.title = "Max difference from the log's finest solution against cost";
  cost_chart.x_label = "cost (ns per step, measured on this machine)";
  cost_chart.y_label = "max difference (rad)";
  error_chart.has_reference = true;
  if (o.has_budget) {
    error_chart.reference_y = o.budget;
    error_chart.reference_label = "budget " + number_text("%.3e rad", o.budget) + " (over " +
                                  number_text("%g s", o.horizon) + ")";
    fig.reference_key = "budget (" + number_text("%.3e rad", o.budget) + ")";
  } else {
    error_chart.reference_y = r.reference.high_rad;
    error_chart.reference_label = "reference's own error, upper end (Richardson)";
    fig.reference_key = "reference's own error, upper end";
  }
  std::vector<std::string> methods;
  for (const MethodRun& m : r.runs) {
    if (std::find(methods.begin(), methods.end(), m.method) == methods.end()) {
      methods.push_back(m.method);
    }
  }
  for (std::size_t c = 0; c < methods.size(); ++c) {
    fig.legend.push_back({methods[c], c});
    for (const char* scalar : {"double", "float"}) {
      const bool is_double = std::string(scalar) == "double";
      const svg::Marker marker = is_double ? svg::Marker::filled_circle : svg::Marker::open_square;
      svg::Series measured{c, svg::LineStyle::solid, marker, {}};
      svg::Series extrapolation{
          c, is_double ? svg::LineStyle::dashed : svg::LineStyle::dotted, svg::Marker::none, {}};
      svg::Series cost{c, svg::LineStyle::none, marker, {}};
      for (const MethodRun& m : r.runs) {
        if (m.method == methods[c] && std::string(m.scalar) == scalar) {
          measured.points.emplace_back(m.step_s, m.max_difference);
          extrapolation.points.emplace_back(m.step_s, extrapolated(o, m));
          cost.points.emplace_back(ns_per_step(m), m.max_difference);
        }
      }
      if (!measured.points.empty()) {
        error_chart.series.push_back(measured);
        cost_chart.series.push_back(cost);
        if (o.horizon > 0) {
          error_chart.series.push_back(extrapolation);
        }
      }
    }
  }
  for (const bool is_double : {true, false}) {
    if ((is_double && !o.want_double) || (!is_double && !o.want_float)) {
      continue;
    }
    const std::string scalar = is_double ? "double" : "float";
    fig.keys.push_back({svg::LineStyle::solid,
                        is_double ? svg::Marker::filled_circle : svg::Marker::open_square,
                        scalar + ", max difference from the reference"});
    if (o.horizon > 0) {
      fig.keys.push_back(
          {is_double ? svg::LineStyle::dashed : svg::LineStyle::dotted, svg::Marker::none,
           scalar + ", extrapolated to " + number_text("%g s", o.horizon) + " (an extrapolation)"});
    }
  }
  fig.charts.push_back(error_chart);
  fig.charts.push_back(cost_chart);
  std::ofstream out(o.svg);
  if (!out) {
    return false;
  }
  out << svg::render(fig);
  return static_cast<bool>(out.flush());
}

}  // namespace

int run_log_study(const Options& o) {
  StudyResult result;
  std::string error;
  if (!scan_log(o, result.shape, error)) {
    std::fprintf(stderr, "halfspin-stepstudy: %s\n", error.c_str());
    return exit_usage;
  }
  const LogShape& shape = result.shape;
  std::printf("halfspin step study of a gyro log, without truth\n");
  std::printf(
      "  log:          %s: %s form, period %.9g s (%.6g Hz), rows %lld..%lld studied "
      "(%.6g s from t0 = %.9g s)\n",
      o.log.file.c_str(), form_words(shape.form).c_str(), shape.period_s, 1.0 / shape.period_s,
      static_cast<long long>(shape.first_row), static_cast<long long>(shape.last_row),
      static_cast<double>(shape.last_row) * shape.period_s, shape.start_s);
  std::printf("  accumulation: float %s, double plain (--accumulation)\n",
              o.compensated_float ? "compensated" : "plain");
  if (!o.log.truth.empty()) {
    std::printf("  truth:        %s (--log-truth: a check of the truth-free study)\n",
                o.log.truth.c_str());
  }
  // The reference: each candidate's own error first (a pass over the log each), then the study
  // with the best one.
  bool ran = false;
  const auto choose_and_run = [&](auto... tags) {
    bool ok = true;
    int best = -1;
    int index = 0;
    const auto consider = [&](auto tag) {
      using R = typename decltype(tag)::type;
      ReferenceCandidate c;
      c.name = R::name;
      if (ok && !reference_estimate<R>(o, shape, c.estimate, error)) {
        ok = false;
      }
      if (ok && (best < 0 ||
                 better_reference(c.estimate,
                                  result.candidates.at(static_cast<std::size_t>(best)).estimate))) {
        best = index;
      }
      result.candidates.push_back(c);
      ++index;
    };
    (consider(tags), ...);
    if (!ok) {
      return false;
    }
    int position = 0;
    bool done = false;
    const auto run_best = [&](auto tag) {
      using R = typename decltype(tag)::type;
      if (position++ == best) {
        done = run_study<R>(o, result, error);
      }
    };
    (run_best(tags), ...);
    return done;
  };
  if (shape.form == GyroLogForm::delta_angle) {
    ran = choose_and_run(MethodTag<DeltaReference>{}, MethodTag<Coning2Sample>{},
                         MethodTag<Coning1Sample>{});
  } else {
    ran = choose_and_run(MethodTag<RateReference>{}, MethodTag<Magnus4>{},
                         MethodTag<ExponentialMapMidpointMean>{});
  }
  if (!ran) {
    std::fprintf(stderr, "halfspin-stepstudy: %s\n", error.c_str());
    return result.failure_code;
  }
  std::printf("\n");
  print_sensor_errors(o);
  print_reference(o, result);
  print_table(o, result);
  if (o.has_budget) {
    print_budget(o, result);
  }
  int status = exit_ok;
  for (const MethodRun& m : result.runs) {
    if (!m.ok) {
      std::fprintf(stderr, "halfspin-stepstudy: %s %s at k = %lld rejected a sample\n",
                   m.method.c_str(), m.scalar, static_cast<long long>(m.k));
      status = exit_failure;
    }
  }
  if (!o.csv.empty() && !write_csv(o, result)) {
    std::fprintf(stderr, "halfspin-stepstudy: cannot write %s\n", o.csv.c_str());
    status = exit_failure;
  }
  if (!o.svg.empty() && !write_svg(o, result)) {
    std::fprintf(stderr, "halfspin-stepstudy: cannot write %s\n", o.svg.c_str());
    status = exit_failure;
  }
  std::printf(
      "\nCaution: these are differences from the log's own finest solution, not errors against "
      "truth;\nthe extrapolations are extrapolations. They support engineering judgement. "
      "Validate in\nhardware-in-the-loop and flight test, under local airworthiness rules and "
      "licensed practice.\n");
  return status;
}

}  // namespace halfspin::tools::stepstudy
