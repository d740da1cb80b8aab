// halfspin-gyro-noise: the noise terms of a gyro from a static log (rate or delta-angle form, the
// tools' gyro-log CSV): the overlapping Allan deviation per axis with confidence intervals, the
// terms read from it (IEEE Std 952-1997 Annex C), a log–log chart, and the flags for
// halfspin-stepstudy. `--help` documents it all.
//
//   allan_deviation.hpp   the estimator: a temporary binary file and one pass of read cursors
//   noise_terms.hpp       the intervals (chi-squared) and the fitted terms
#include <unistd.h>

#include <array>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <optional>
#include <string>
#include <vector>

#include "allan_deviation.hpp"
#include "gyro_log.hpp"
#include "noise_terms.hpp"
#include "propagate_options.hpp"
#include "svg_chart.hpp"

namespace {

using namespace halfspin::tools;
using namespace halfspin::tools::noise;

constexpr int exit_ok = 0;
constexpr int exit_usage = 1;
constexpr int exit_input = 2;

constexpr const char* help_text =
    R"(halfspin-gyro-noise: the noise terms of a gyro from a static log (overlapping Allan deviation).

Usage: halfspin-gyro-noise LOG [options]

Input LOG: the tools' gyro-log CSV (as halfspin-gyro-log writes it and halfspin-propagate reads
it): a header naming t and wx,wy,wz (rates, rad/s) or dx,dy,dz (delta-angles, rad), in any order
among other columns, then one sample per line. Record it with the gyro still (on a bench, not
powered-up in a vehicle that moves), at a steady temperature, for a long time: the longest
averaging time is half the log's length, and a term shows only where it dominates the curve.
Timestamps must increase evenly (the method assumes a uniform sample interval; the summary
notes the largest deviation from the mean interval).

Options:
  --chart FILE.svg      the Allan deviation on a log-log chart, one panel per axis: the points
                        with their confidence bars, the fitted lines of the terms (labelled) and
                        the points where each term is read
  --table FILE.csv      the curve: tau_s,m,clusters,terms and for each axis
                        adev_A,low_A,high_A (rad/s), 17 significant digits
  --terms FILE.csv      the terms: axis,term,visible,value,low,high,upper_limit,unit (SI)
  --confidence P        confidence of the intervals, 0 < P < 1 (default 0.95)
  --scratch-dir DIR     where the temporary sample file goes (default $TMPDIR, else /tmp); it
                        takes 24 bytes per sample and is removed from the directory at once
  --columns t=NAME,x=NAME,y=NAME,z=NAME, --form rate|delta, --time-unit s|ms|us,
  --rate-unit rad/s|deg/s, --angle-unit rad|deg
                        as for halfspin-propagate: other column names and units
  --max-interval S      longest sample interval (s) accepted; longer is a gap (missed samples),
                        which the method cannot take. Default: 1.5 x the first interval.
  --help                this text

Output (stdout): the log's length and sample interval, the mean rate per axis (the constant
bias, plus the Earth's rate and any tilt of the mount), the Allan deviation table, the terms
per axis in SI and datasheet units, and one line of flags for halfspin-stepstudy:
  --angle-random-walk <rad/sqrt(s)> --bias-instability <rad/s> --rate-random-walk <rad/s/sqrt(s)>
(the largest axis of each visible term; a term not visible in the log is left out, with a note).

Method (README.md beside the tool has the formulas and their sources):
  Overlapping Allan deviation, IEEE Std 952-1997 Annex C, at octave-spaced averaging times
  tau = 2^j tau0 (j = 0, 1, ... while 2 tau fits in the log), with the mean removed first.
  Intervals: chi-squared with nu = n - 1 degrees of freedom for n = floor(N/m) independent
  clusters (Annex C's percentage error 1/sqrt(2(n - 1))). They assume a noise type; for white
  and flicker rate noise the overlapping estimator scatters less, so there they are
  conservative.
  Terms (Annex C): quantization Q (slope -1: sigma^2 = 3 Q^2/tau^2, read at tau = sqrt(3) s),
  angle random walk N (slope -1/2: N = sigma(1 s)), bias instability B (flat: B = the flat level
  / sqrt(2 ln 2/pi), about 0.664), rate random walk K (slope +1/2: K = sigma(3 s)). The four
  lines are fitted together to the curve (non-negative weighted least squares on sigma^2); a
  term is visible where its line carries at least half the curve at a point with 4 or more
  clusters; otherwise "not visible in this log", with the upper limit the curve allows. A
  term's interval is the narrowest its points give, less the other terms' share.
  Not fitted: rate ramp, sinusoids, temperature effects. Rate quantization shows as white noise
  (part of N), not as Q; Q shows in delta-angle logs of an accumulating angle counter.

Memory stays bounded however long the log: the log is read once, line by line, into the
temporary file; the curve comes from one pass over that file with one small buffer per octave.
A progress line is shown on stderr when it is a terminal.

Exit codes: 0 ok; 1 bad usage; 2 bad input (a bad line, time not increasing, a gap, fewer than
4 samples, a read or write failure), reported as FILE:LINE: reason.

Caution: attitude errors can crash vehicles and hurt people. These results support engineering
judgement; they do not replace it. Validate any attitude solution in hardware-in-the-loop and
flight test; local airworthiness rules and licensed engineering practice govern what may fly.
)";

int usage_error(const std::string& message) {
  std::fprintf(stderr, "halfspin-gyro-noise: %s (see --help)\n", message.c_str());
  return exit_usage;
}

struct Settings {          // NOLINT(clang-analyzer-optin.performance.Padding): read once
  propagate::Options log;  // the log options shared with halfspin-propagate
  std::string chart;
  std::string table;
  std::string terms;
  double confidence = 0.95;
  std::string scratch;
  std::optional<double> max_interval;
};

// The command line: "" or the usage error; `help` set for --help.
std::string parse(const std::vector<std::string>& args, Settings& s, bool& help) {
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--help" || a == "-h") {
      help = true;
      return "";
    }
    const bool value = a == "--chart" || a == "--table" || a == "--terms" || a == "--confidence" ||
                       a == "--scratch-dir" || a == "--columns" || a == "--form" ||
                       a == "--time-unit" || a == "--rate-unit" || a == "--angle-unit" ||
                       a == "--max-interval";
    if (!value) {
      if (!a.empty() && a[0] == '-') return "unknown option '" + a + "'";
      if (!s.log.log.empty()) return "more than one log given ('" + s.log.log + "', '" + a + "')";
      s.log.log = a;
      continue;
    }
    if (i + 1 >= args.size()) return "option " + a + " needs a value";
    const std::string& v = args[++i];
    std::string error;
    if (a == "--chart") {
      s.chart = v;
    } else if (a == "--table") {
      s.table = v;
    } else if (a == "--terms") {
      s.terms = v;
    } else if (a == "--scratch-dir") {
      s.scratch = v;
    } else if (a == "--confidence") {
      const std::optional<double> p = propagate::parse_number(v);
      if (!p || !(*p > 0 && *p < 1)) return "--confidence needs a number between 0 and 1";
      s.confidence = *p;
    } else if (a == "--max-interval") {
      const std::optional<double> x = propagate::parse_number(v);
      if (!x || !(*x > 0)) return "--max-interval needs a number > 0";
      s.max_interval = *x;
    } else if (a == "--columns") {
      error = propagate::detail::set_columns(v, s.log);
    } else {
      error = propagate::detail::set_unit(a, v, s.log);
    }
    if (!error.empty()) return error;
  }
  if (s.log.log.empty()) return "no gyro log given";
  if (s.scratch.empty()) {
    const char* tmp = std::getenv("TMPDIR");
    s.scratch = tmp != nullptr && *tmp != '\0' ? tmp : "/tmp";
  }
  return "";
}

// A progress line on stderr, only when it is a terminal, at most five times a second.
class Progress {
 public:
  Progress() : on_(isatty(2) != 0) {}
  void show(const char* what, double fraction) {
    if (!on_) return;
    const auto now = std::chrono::steady_clock::now();
    if (now - last_ < std::chrono::milliseconds(200)) return;
    last_ = now;
    std::fprintf(stderr, "\r%s %5.1f %%", what, 100 * fraction);
    std::fflush(stderr);
  }
  void finish() const {
    if (!on_) return;
    std::fprintf(stderr, "\r%*s\r", 40, "");
    std::fflush(stderr);
  }

 private:
  bool on_;
  std::chrono::steady_clock::time_point last_{};
};

// What the first pass learned about the log.
struct LogSummary {
  GyroLogForm form = GyroLogForm::rate;
  std::size_t count = 0;
  std::array<long double, 3> mean{};  // rad/s or rad
  double tau0 = 0;                    // s
  double duration = 0;                // s, first to last row
  double worst_jitter = 0;            // largest |interval − τ0|/τ0
};

// Pass 1: the CSV, line by line, into `file`; false (reported) on bad input.
bool read_log(const Settings& s, SampleFile& file, LogSummary& summary, Progress& progress) {
  const std::string& path = s.log.log;
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    std::fprintf(stderr, "%s: cannot read: %s\n", path.c_str(), std::strerror(errno));
    return false;
  }
  in.seekg(0, std::ios::end);
  const auto size = static_cast<double>(in.tellg());
  in.seekg(0, std::ios::beg);
  NumericCsvReader<4> reader(in);
  const std::optional<GyroLogLayout> layout =
      read_gyro_log_layout(reader, path, s.log.form, s.log.columns);
  if (!layout) return false;
  summary.form = layout->form;
  const bool rates = layout->form == GyroLogForm::rate;
  if ((rates && !s.log.angle_unit.empty()) || (!rates && !s.log.rate_unit.empty())) {
    std::fprintf(stderr, "%s: %s applies to %s logs, but this is a %s log\n", path.c_str(),
                 rates ? "--angle-unit" : "--rate-unit", rates ? "delta-angle" : "rate",
                 rates ? "rate" : "delta-angle");
    return false;
  }
  const double scale =
      s.log.rate_unit == "deg/s" || s.log.angle_unit == "deg" ? 3.14159265358979323846 / 180 : 1;
  const std::array<const char*, 4> names{{layout->name[0].c_str(), layout->name[1].c_str(),
                                          layout->name[2].c_str(), layout->name[3].c_str()}};
  std::array<double, 4> v{};
  std::array<long double, 3> sum{};
  double first_raw = 0;
  double previous_raw = 0;
  std::size_t previous_line = 0;
  double first_interval = 0;
  double smallest = 0;
  double largest = 0;
  const auto fail = [&](const std::string& reason) {
    progress.finish();
    std::fprintf(stderr, "%s:%zu: %s\n", path.c_str(), reader.line(), reason.c_str());
    return false;
  };
  while (true) {
    const ReadOutcome r = reader.next(v, names);
    if (r == ReadOutcome::end) break;
    if (r == ReadOutcome::bad) return fail(reader.message());
    const double raw_t = v[0];
    if (summary.count > 0) {
      const double interval = (raw_t - previous_raw) / s.log.time_divisor;
      if (!(raw_t > previous_raw)) {
        return fail("time does not increase: " + std::to_string(raw_t) + " after " +
                    std::to_string(previous_raw) + " on line " + std::to_string(previous_line));
      }
      if (summary.count == 1) {
        first_interval = interval;
        smallest = largest = interval;
      }
      const double limit = s.max_interval ? *s.max_interval : 1.5 * first_interval;
      if (interval > limit) {
        return fail("gap: interval " + std::to_string(interval) + " s after line " +
                    std::to_string(previous_line) + " exceeds " + std::to_string(limit) +
                    " s (--max-interval); the Allan deviation needs an unbroken log");
      }
      smallest = std::min(smallest, interval);
      largest = std::max(largest, interval);
    } else {
      first_raw = raw_t;
    }
    previous_raw = raw_t;
    previous_line = reader.line();
    const Sample sample{v[1] * scale, v[2] * scale, v[3] * scale};
    for (std::size_t a = 0; a < 3; ++a) sum[a] += static_cast<long double>(sample[a]);
    if (!file.append(sample))
      return fail(std::string("cannot write the temporary file: ") + std::strerror(errno));
    ++summary.count;
    if ((summary.count & 0xFFFF) == 0 && size > 0) {
      progress.show("reading the log", static_cast<double>(in.tellg()) / size);
    }
  }
  if (!file.flush())
    return fail(std::string("cannot write the temporary file: ") + std::strerror(errno));
  if (summary.count < 4) return fail("fewer than 4 samples: no Allan deviation");
  summary.duration = (previous_raw - first_raw) / s.log.time_divisor;
  summary.tau0 = summary.duration / static_cast<double>(summary.count - 1);
  summary.worst_jitter = std::max(largest - summary.tau0, summary.tau0 - smallest) / summary.tau0;
  for (std::size_t a = 0; a < 3; ++a) {
    summary.mean[a] = sum[a] / static_cast<long double>(summary.count);
  }
  return true;
}

constexpr double degrees_per_radian = 180 / 3.14159265358979323846;

struct TermText {
  const char* name;
  const char* symbol;
  const char* unit;
  const char* datasheet_unit;
  double datasheet_factor;  // SI → datasheet unit
  const char* where;        // where it is read
};

const std::array<TermText, term_count>& term_texts() {
  static const std::array<TermText, term_count> texts{{
      {"quantization", "Q", "rad", "deg", degrees_per_radian, "at tau = sqrt(3) s on the -1 line"},
      {"angle random walk", "N", "rad/\xE2\x88\x9As", "\xC2\xB0/\xE2\x88\x9Ah",
       degrees_per_radian * 60, "at tau = 1 s on the -1/2 line"},
      {"bias instability", "B", "rad/s", "\xC2\xB0/h", degrees_per_radian * 3600,
       "the flat level / 0.664"},
      {"rate random walk", "K", "rad/s/\xE2\x88\x9As", "\xC2\xB0/h/\xE2\x88\x9Ah",
       degrees_per_radian * 3600 * 60, "at tau = 3 s on the +1/2 line"},
  }};
  return texts;
}

constexpr std::array<char, 3> axis_name{{'x', 'y', 'z'}};

void print_report(const Settings& s, const LogSummary& log, const std::vector<AllanPoint>& curve,
                  const std::array<AxisTerms, 3>& terms) {
  const bool rates = log.form == GyroLogForm::rate;
  std::printf("halfspin-gyro-noise: %s: %zu %s samples over %.6g s, tau0 = %.6g s (%.6g Hz)\n",
              s.log.log.c_str(), log.count, rates ? "rate" : "delta-angle", log.duration, log.tau0,
              1 / log.tau0);
  if (log.worst_jitter > 0.01) {
    std::printf(
        "note: a sample interval differs from tau0 by %.3g %%: the method assumes even "
        "sampling\n",
        100 * log.worst_jitter);
  }
  std::printf(
      "mean rate (rad/s): x %.6g  y %.6g  z %.6g  (the constant bias, with the Earth's "
      "rate and any tilt of the mount)\n",
      static_cast<double>(log.mean[0]) / (rates ? 1 : log.tau0),
      static_cast<double>(log.mean[1]) / (rates ? 1 : log.tau0),
      static_cast<double>(log.mean[2]) / (rates ? 1 : log.tau0));
  std::printf(
      "\noverlapping Allan deviation (IEEE Std 952-1997 Annex C), rad/s; %.4g %% "
      "intervals (chi-squared, nu = clusters - 1)\n",
      100 * s.confidence);
  std::printf("%12s %9s  %-33s %-33s %-33s\n", "tau_s", "clusters", "x [low, high]",
              "y [low, high]", "z [low, high]");
  for (const AllanPoint& p : curve) {
    std::printf("%12.6g %9zu", p.tau, p.clusters);
    for (std::size_t a = 0; a < 3; ++a) {
      std::printf("  %10.4g [%9.4g, %9.4g]", p.deviation[a], p.low[a], p.high[a]);
    }
    std::printf("\n");
  }
  std::printf(
      "\nnoise terms (Annex C; the lines of slopes -1, -1/2, 0, +1/2 fitted together; "
      "%.4g %% intervals)\n",
      100 * s.confidence);
  for (std::size_t a = 0; a < 3; ++a) {
    std::printf("axis %c:\n", axis_name[a]);
    for (std::size_t p = 0; p < term_count; ++p) {
      const TermText& t = term_texts()[p];
      const TermEstimate& e = terms[a].term[p];
      if (!e.visible) {
        std::printf("  %-18s %s  not visible in this log (below %.3g %s, %.3g %s)\n", t.name,
                    t.symbol, e.upper_limit, t.unit, e.upper_limit * t.datasheet_factor,
                    t.datasheet_unit);
        continue;
      }
      std::printf(
          "  %-18s %s = %.4g %s [%.4g, %.4g] = %.4g %s [%.4g, %.4g]; %s, dominant "
          "from tau %.4g to %.4g s\n",
          t.name, t.symbol, e.value, t.unit, e.low, e.high, e.value * t.datasheet_factor,
          t.datasheet_unit, e.low * t.datasheet_factor, e.high * t.datasheet_factor, t.where,
          e.tau_from, e.tau_to);
    }
  }
  // The flags: the largest axis of each visible term.
  std::string flags;
  std::string left_out;
  constexpr std::array<std::pair<Term, const char*>, 3> flag_terms{
      {{Term::angle_random_walk, "--angle-random-walk"},
       {Term::bias_instability, "--bias-instability"},
       {Term::rate_random_walk, "--rate-random-walk"}}};
  for (const auto& [term, flag] : flag_terms) {
    double largest = 0;
    bool any = false;
    for (std::size_t a = 0; a < 3; ++a) {
      const TermEstimate& e = terms[a].term[static_cast<std::size_t>(term)];
      if (e.visible) {
        any = true;
        largest = std::max(largest, e.value);
      }
    }
    std::array<char, 64> number{};
    std::snprintf(number.data(), number.size(), "%.4g", largest);
    if (any) {
      flags += (flags.empty() ? "" : " ") + std::string(flag) + " " + number.data();
    } else {
      left_out += (left_out.empty() ? "" : ", ") + std::string(flag);
    }
  }
  std::printf("\nhalfspin-stepstudy flags (SI, the largest axis of each visible term):\n  %s\n",
              flags.c_str());
  if (!left_out.empty()) {
    std::printf("  (left out, not visible in this log: %s)\n", left_out.c_str());
  }
}

bool write_staged(const std::string& path, const std::string& text) {
  StagedOutputFile out;
  if (!out.open(path)) return false;
  std::fputs(text.c_str(), out.get());
  return out.commit();
}

std::string table_csv(const std::vector<AllanPoint>& curve) {
  std::string text = "tau_s,m,clusters,terms";
  for (const char a : axis_name) {
    text += std::string(",adev_") + a + ",low_" + a + ",high_" + a;
  }
  text += '\n';
  std::array<char, 64> b{};
  for (const AllanPoint& p : curve) {
    std::snprintf(b.data(), b.size(), "%.17g,%zu,%zu,%zu", p.tau, p.m, p.clusters, p.terms);
    text += b.data();
    for (std::size_t a = 0; a < 3; ++a) {
      std::snprintf(b.data(), b.size(), ",%.17g,%.17g", p.deviation[a], p.low[a]);
      text += b.data();
      std::snprintf(b.data(), b.size(), ",%.17g", p.high[a]);
      text += b.data();
    }
    text += '\n';
  }
  return text;
}

std::string terms_csv(const std::array<AxisTerms, 3>& terms) {
  constexpr std::array<const char*, term_count> id{
      {"quantization", "angle_random_walk", "bias_instability", "rate_random_walk"}};
  constexpr std::array<const char*, term_count> unit{
      {"rad", "rad/sqrt(s)", "rad/s", "rad/s/sqrt(s)"}};
  std::string text = "axis,term,visible,value,low,high,upper_limit,unit\n";
  std::array<char, 256> b{};
  for (std::size_t a = 0; a < 3; ++a) {
    for (std::size_t p = 0; p < term_count; ++p) {
      const TermEstimate& e = terms[a].term[p];
      std::snprintf(b.data(), b.size(), "%c,%s,%d,%.17g,%.17g,%.17g,%.17g,%s\n", axis_name[a],
                    id[p], e.visible ? 1 : 0, e.value, e.low, e.high, e.upper_limit, unit[p]);
      text += b.data();
    }
  }
  return text;
}

// The chart: one panel per axis.
std::string chart_svg(const Settings& s, const LogSummary& log,
                      const std::vector<AllanPoint>& curve, const std::array<AxisTerms, 3>& terms) {
  namespace svg = halfspin::tools::svg;
  svg::Figure f;
  f.title = "Allan deviation of " + s.log.log;
  std::array<char, 200> b{};
  std::snprintf(b.data(), b.size(),
                "overlapping estimator (IEEE Std 952-1997 Annex C), %zu samples at %.4g s; bars: "
                "%.4g %% intervals; dashed: the fitted terms",
                log.count, log.tau0, 100 * s.confidence);
  f.subtitle = b.data();
  const double tau_lo = curve.front().tau;
  const double tau_hi = curve.back().tau;
  // Colours: 0 the curve, 1..4 the terms (Q, N, B, K), 5 their sum.
  for (std::size_t a = 0; a < 3; ++a) {
    svg::Chart c;
    c.title = std::string("axis ") + axis_name[a];
    c.x_label = "averaging time \xCF\x84 (s)";
    c.y_label = "Allan deviation \xCF\x83(\xCF\x84) (rad/s)";
    svg::Series points;
    points.colour = 0;
    points.line = svg::LineStyle::solid;
    points.marker = svg::Marker::filled_circle;
    for (const AllanPoint& p : curve) {
      points.points.emplace_back(p.tau, p.deviation[a]);
      c.bars.push_back({p.tau, p.low[a], p.high[a], 0});
    }
    svg::Series sum;
    sum.colour = 5;
    sum.line = svg::LineStyle::dotted;
    // Half-octave steps from the first to the last averaging time.
    const auto half_octaves = static_cast<int>(std::round(2 * std::log2(tau_hi / tau_lo)));
    for (int i = 0; i <= half_octaves; ++i) {
      const double tau = tau_lo * std::exp2(0.5 * i);
      sum.points.emplace_back(tau, std::sqrt(terms[a].model(tau)));
    }
    c.series.push_back(sum);
    for (std::size_t p = 0; p < term_count; ++p) {
      const TermEstimate& e = terms[a].term[p];
      if (!e.visible) continue;
      svg::Series line;
      line.colour = 1 + p;
      line.line = svg::LineStyle::dashed;
      const auto at = [&](double tau) {
        return std::sqrt(e.coefficient * std::pow(tau, term_power[p]));
      };
      line.points = {{tau_lo, at(tau_lo)}, {tau_hi, at(tau_hi)}};
      // Where the term is read: τ = √3, 1, (the flat region's middle), 3 s.
      const std::array<double, term_count> read_at{
          {std::sqrt(3.0), 1.0, std::sqrt(e.tau_from * e.tau_to), 3.0}};
      svg::Series mark;
      mark.colour = 1 + p;
      mark.line = svg::LineStyle::none;
      mark.marker = svg::Marker::open_square;
      mark.points = {{read_at[p], at(read_at[p])}};
      const TermText& t = term_texts()[p];
      std::snprintf(b.data(), b.size(), "%s = %.3g %s (%.3g %s)", t.symbol, e.value, t.unit,
                    e.value * t.datasheet_factor, t.datasheet_unit);
      // Labels apart: N and Q where their lines start dominating, B under its level, K at 3 s.
      const Term term = static_cast<Term>(p);
      const double label_at = term == Term::angle_random_walk || term == Term::quantization
                                  ? std::max(e.tau_from, tau_lo) * 2
                                  : read_at[p];
      c.labels.push_back({label_at, at(label_at), b.data(), 1 + p, term == Term::bias_instability});
      c.series.push_back(line);
      c.series.push_back(mark);
    }
    c.series.push_back(points);
    f.charts.push_back(c);
  }
  std::snprintf(b.data(), b.size(), "Allan deviation, %.4g %% bars", 100 * s.confidence);
  f.legend = {{b.data(), 0},
              {"Q: quantization, slope \xE2\x88\x92"
               "1",
               1},
              {"N: angle random walk, slope \xE2\x88\x92\xC2\xBD", 2},
              {"B: bias instability, flat 0.664 B", 3},
              {"K: rate random walk, slope +\xC2\xBD", 4},
              {"sum of the fitted terms", 5}};
  f.keys = {{svg::LineStyle::dashed, svg::Marker::none, "a fitted term's line"},
            {svg::LineStyle::none, svg::Marker::open_square, "where the term is read"}};
  return svg::render(f);
}

int run(const Settings& s) {
  Progress progress;
  SampleFile file;
  std::string error;
  if (!file.create(s.scratch, error)) {
    std::fprintf(stderr, "halfspin-gyro-noise: %s\n", error.c_str());
    return exit_input;
  }
  LogSummary log;
  if (!read_log(s, file, log, progress)) return exit_input;
  std::vector<AllanPoint> curve;
  const bool ok = overlapping_allan(
      file.descriptor(), log.count, log.mean, log.tau0, log.form == GyroLogForm::rate, curve,
      [&progress](std::size_t done, std::size_t total) {
        progress.show("Allan deviation", static_cast<double>(done) / static_cast<double>(total));
      });
  progress.finish();
  if (!ok) {
    std::fprintf(stderr, "halfspin-gyro-noise: cannot read the temporary file: %s\n",
                 std::strerror(errno));
    return exit_input;
  }
  add_intervals(curve, s.confidence);
  std::array<AxisTerms, 3> terms;
  for (std::size_t a = 0; a < 3; ++a) terms[a] = fit_terms(curve, a);
  print_report(s, log, curve, terms);
  const std::array<std::pair<const std::string*, std::string>, 3> outputs{
      {{&s.table, s.table.empty() ? "" : table_csv(curve)},
       {&s.terms, s.terms.empty() ? "" : terms_csv(terms)},
       {&s.chart, s.chart.empty() ? "" : chart_svg(s, log, curve, terms)}}};
  for (const auto& [path, text] : outputs) {
    if (path->empty()) continue;
    if (!write_staged(*path, text)) {
      std::fprintf(stderr, "halfspin-gyro-noise: cannot write %s: %s\n", path->c_str(),
                   std::strerror(errno));
      return exit_input;
    }
    std::fprintf(stderr, "wrote %s\n", path->c_str());
  }
  return exit_ok;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::string> args;
  for (int i = 1; i < argc; ++i) {
    // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
    args.emplace_back(argv[i]);
  }
  Settings s;
  bool help = false;
  const std::string error = parse(args, s, help);
  if (help) {
    std::fputs(help_text, stdout);
    return exit_ok;
  }
  if (!error.empty()) return usage_error(error);
  return run(s);
}
