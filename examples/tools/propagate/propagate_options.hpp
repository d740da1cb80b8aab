#pragma once
// Command line of halfspin-propagate: the options, their parsing and the help text. Tool code.
//
//   parse_options(args, o)   fills `o` from the arguments (without the program name); returns
//                            what to do (propagate, print the help, list the methods) or the
//                            usage error to report.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "gyro_log.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/representations/euler_angles.hpp"

namespace halfspin::tools::propagate {

inline constexpr int exit_ok = 0;
inline constexpr int exit_usage = 1;
inline constexpr int exit_input = 2;

inline constexpr const char* help_text =
    R"(halfspin-propagate: propagate the attitude through a gyro log with one halfspin stepper.

Usage: halfspin-propagate LOG --output FILE [options]

Input LOG: CSV with a header row, then one sample per line (LF or CRLF line ends; a UTF-8
byte-order mark before the header is skipped; the last line may lack its newline):
  t,wx,wy,wz   rate form: t (s), body rate (rad/s) at t. Propagation starts at the first row's
               time with the initial attitude; a step ends at each row that completes a window.
  t,dx,dy,dz   delta-angle form: t (s), delta-angle (rad) = integral of the body rate over the
               interval ending at t; the first interval starts at --start-time. A first row at
               the start time whose delta-angle is zero is the log's start (its interval is
               empty): it is accepted, noted in the summary, and not propagated.
The header's columns may come in any order and among other columns (a temperature, a counter):
those are ignored, with a note naming them; every row has as many fields as the header, and
only the used ones must be numbers. Other names are mapped with --columns (and --form), other
units with --time-unit, --rate-unit and --angle-unit.
The method must match the form: rate methods take rate logs, delta-angle (coning) methods take
delta-angle logs. Rate-function methods need a model of the motion and cannot run on a log.

Options:
  --output FILE         required. CSV written through a temporary file in the same directory and
                        renamed at the end: on any error nothing is written (an existing FILE is
                        left as it was).
  --method NAME         stepper (default exponential_map_midpoint_mean for rate logs,
                        coning_2_sample for delta-angle logs); --list-methods prints them. The
                        previous release's names (expmap_*, magnus4, rk4_*, rkmk4_*, …) are
                        accepted as aliases for one release.
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
  --accumulation P      plain | compensated: how each step is added to the attitude. compensated
                        holds it as a pair of numbers of the scalar type (rounding about
                        c*u*(angle turned) instead of N*c*u over N steps; about 1.1-1.5x the plain
                        cost). Default: compensated in float, plain in double.
  --euler SEQ           Euler sequence of the output angles: xyz xzy yxz yzx zxy zyx (default;
                        yaw, pitch, roll) xyx xzx yxy yzy zxz zyz. Intrinsic: zyx means
                        q = qz(first) * qy(second) * qx(third).
  --columns t=NAME,x=NAME,y=NAME,z=NAME
                        the header names of the time column and of the gyro's x, y, z columns
                        (body axes); any of the four, the rest keep their default names (t, and
                        wx,wy,wz or dx,dy,dz). Example: --columns t=time_us,x=gx,y=gy,z=gz
  --form rate|delta     what the gyro columns hold, when their names do not say it (needed when
                        --columns maps x, y and z to names other than wx,wy,wz or dx,dy,dz, or
                        when the header has both sets).
  --time-unit s|ms|us   unit of the log's time column (default s). Intervals are taken as
                        differences in that unit, then converted (exact for integer stamps).
  --rate-unit rad/s|deg/s
                        unit of a rate log's gyro columns (default rad/s).
  --angle-unit rad|deg  unit of a delta-angle log's gyro columns (default rad).
  --start-time S        delta-angle logs: start of the first row's interval (s whatever
                        --time-unit, default 0).
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

Summary (stderr): steps, samples read, skipped/rejected samples by class, the peak |w| (rad/s
and deg/s; a delta-angle row gives |delta-angle|/interval) and the total angle traversed (rad
and deg: the integral of |w| dt by the trapezoid rule over the rate rows, or the sum of
|delta-angle| over the delta-angle rows), max norm error, final attitude (quaternion and Euler),
and with --truth the attitude error. Notes (stderr, never a rejection): columns ignored; a zero
first delta-angle row taken as the log's start; a peak |w| above 35 rad/s (2000 deg/s) in a log
read as rad/s or rad by default (no --rate-unit or --angle-unit given): 2000 deg/s is the
largest full scale of common MEMS gyros (common practice, from memory), so such a log more
likely holds degrees (--rate-unit deg/s, --angle-unit deg). Below that, the peak printed in
both units is what tells a unit mix-up.

Bad input: a malformed or over-long line, a wrong number of fields, a non-numeric field, NaN or
infinity, a timestamp that does not increase (each message names what it was compared with: the
previous row and its line, or --start-time), a gap (interval > --max-interval), a sample over
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

enum class Renormalize { none, exact, first_order, periodic, threshold };

// Grouped by meaning, not packed: read once from the command line.
struct Options {  // NOLINT(clang-analyzer-optin.performance.Padding)
  std::string log;
  std::string output;
  std::string method;  // "" until chosen: then the default for the log's form
  Renormalize renormalize = Renormalize::first_order;
  std::uint32_t period = 16;
  double threshold = 1e-5;
  bool initial_from_truth = false;
  Quaternion<double> initial = Quaternion<double>::identity();
  bool use_float = false;
  // --accumulation: compensated (the attitude as a pair, propagation/compensated_accumulation.hpp)
  // or plain; unset: compensated in float, plain in double.
  std::optional<bool> compensated;
  EulerSequence euler = EulerSequence::zyx;
  double start_time = 0.0;             // s
  std::array<std::string, 4> columns;  // --columns: header names of t, x, y, z ("" default)
  std::optional<GyroLogForm> form;     // --form; unset: from the header's names
  std::string time_unit = "s";         // --time-unit: s, ms, us
  double time_divisor = 1.0;           // log time unit per second: 1, 1e3, 1e6
  std::string rate_unit;               // --rate-unit as given ("" = rad/s)
  std::string angle_unit;              // --angle-unit as given ("" = rad)
  std::optional<double> max_interval;
  double max_rate = std::numeric_limits<double>::infinity();
  bool skip_bad = false;
  std::string truth;
};

enum class Command { propagate, help, list_methods };

struct ParseResult {
  Command command = Command::propagate;
  std::string error;  // non-empty: bad usage, reported as is
};

// A finite number filling the whole text, or nothing.
inline std::optional<double> parse_number(const std::string& text) {
  if (text.empty()) return std::nullopt;
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  if (end - text.c_str() != static_cast<std::ptrdiff_t>(text.size()) || !(v - v == 0.0)) {
    return std::nullopt;
  }
  return v;
}

// "zyx" for EulerSequence::zyx: the axes of the first, second and third rotation.
inline std::string euler_name(EulerSequence s) {
  const EulerAxes a = euler_axes(s);
  constexpr std::array<char, 3> axis{'x', 'y', 'z'};
  return {axis[static_cast<std::size_t>(a.first)], axis[static_cast<std::size_t>(a.second)],
          axis[static_cast<std::size_t>(a.third)]};
}

inline const char* renormalize_name(Renormalize r) {
  switch (r) {
    case Renormalize::none:
      return "none";
    case Renormalize::exact:
      return "exact";
    case Renormalize::first_order:
      return "first_order";
    case Renormalize::periodic:
      return "periodic";
    case Renormalize::threshold:
      return "threshold";
  }
  return "threshold";
}

namespace detail {

// Each returns the usage error, "" when the value is good.

inline std::string set_renormalize(const std::string& p, Options& o) {
  for (const Renormalize r : {Renormalize::none, Renormalize::exact, Renormalize::first_order,
                              Renormalize::periodic, Renormalize::threshold}) {
    if (p == renormalize_name(r)) {
      o.renormalize = r;
      return "";
    }
  }
  return "unknown renormalization '" + p + "'";
}

inline std::string set_scalar(const std::string& s, Options& o) {
  if (s != "float" && s != "double") return "--scalar must be float or double";
  o.use_float = s == "float";
  return "";
}

inline std::string set_accumulation(const std::string& s, Options& o) {
  if (s != "plain" && s != "compensated") return "--accumulation must be plain or compensated";
  o.compensated = s == "compensated";
  return "";
}

inline std::string set_euler(const std::string& s, Options& o) {
  for (const EulerSequence e : all_euler_sequences) {
    if (euler_name(e) == s) {
      o.euler = e;
      return "";
    }
  }
  return "unknown Euler sequence '" + s + "'";
}

// A bad --columns item, or (role given) a role mapped twice.
inline std::string columns_item_error(const std::string& text, const std::string& item,
                                      const char* role = nullptr) {
  std::string m = "--columns '" + text + "': ";
  if (role != nullptr) return m.append(role).append(" is mapped twice");
  return m.append("'").append(item).append(
      "' is not ROLE=NAME with ROLE one of t, x, y, z and a non-empty NAME (e.g. "
      "t=time_us,x=gx,y=gy,z=gz)");
}

// --columns t=NAME,x=NAME,y=NAME,z=NAME (any of the four, each once, names non-empty).
inline std::string set_columns(const std::string& text, Options& o) {
  constexpr std::array<const char*, 4> roles{{"t", "x", "y", "z"}};
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = text.find(',', start);
    const std::string item =
        text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    const std::size_t equals = item.find('=');
    std::size_t role = roles.size();
    for (std::size_t r = 0; r < roles.size() && equals != std::string::npos; ++r) {
      if (item.compare(0, equals, roles[r]) == 0 && equals == 1) role = r;
    }
    if (role == roles.size() || equals + 1 >= item.size()) return columns_item_error(text, item);
    if (!o.columns[role].empty()) return columns_item_error(text, "", roles[role]);
    o.columns[role] = item.substr(equals + 1);
    if (comma == std::string::npos) return "";
    start = comma + 1;
  }
}

// --form, --time-unit, --rate-unit, --angle-unit.
inline std::string set_unit(const std::string& option, const std::string& value, Options& o) {
  if (option == "--form") {
    if (value != "rate" && value != "delta") return "--form must be rate or delta";
    o.form = value == "rate" ? GyroLogForm::rate : GyroLogForm::delta_angle;
  } else if (option == "--time-unit") {
    if (value != "s" && value != "ms" && value != "us") return "--time-unit must be s, ms or us";
    o.time_unit = value;
    o.time_divisor = value == "s" ? 1.0 : value == "ms" ? 1e3 : 1e6;
  } else if (option == "--rate-unit") {
    if (value != "rad/s" && value != "deg/s") return "--rate-unit must be rad/s or deg/s";
    o.rate_unit = value;
  } else {
    if (value != "rad" && value != "deg") return "--angle-unit must be rad or deg";
    o.angle_unit = value;
  }
  return "";
}

inline std::string set_number(const std::string& option, const std::string& text, Options& o) {
  const std::optional<double> x = parse_number(text);
  const bool positive = x && *x > 0;
  if (option == "--renormalize-period") {
    if (!x || *x < 1 || *x > 4294967295.0 || *x != std::floor(*x)) {
      return "--renormalize-period needs an integer >= 1";
    }
    o.period = static_cast<std::uint32_t>(*x);
  } else if (option == "--renormalize-threshold") {
    if (!positive) return "--renormalize-threshold needs a number > 0";
    o.threshold = *x;
  } else if (option == "--start-time") {
    if (!x) return "--start-time needs a finite number";
    o.start_time = *x;
  } else if (option == "--max-interval") {
    if (!positive) return "--max-interval needs a number > 0";
    o.max_interval = *x;
  } else if (option == "--max-rate") {
    if (!positive) return "--max-rate needs a number > 0";
    o.max_rate = *x;
  }
  return "";
}

inline bool takes_value(const std::string& option) {
  static constexpr std::array<const char*, 18> options{
      "--output",       "--method",       "--renormalize", "--renormalize-period",
      "--initial",      "--scalar",       "--euler",       "--renormalize-threshold",
      "--start-time",   "--max-interval", "--max-rate",    "--truth",
      "--accumulation", "--columns",      "--form",        "--time-unit",
      "--rate-unit",    "--angle-unit"};
  for (const char* o : options) {
    if (option == o) return true;
  }
  return false;
}

// `option value` (option one of takes_value()'s); --initial is kept as text until the end.
inline std::string set_value(const std::string& option, const std::string& value, Options& o,
                             std::string& initial_text) {
  if (option == "--output") {
    o.output = value;
  } else if (option == "--method") {
    o.method = value;
  } else if (option == "--initial") {
    initial_text = value;
  } else if (option == "--truth") {
    o.truth = value;
  } else if (option == "--renormalize") {
    return set_renormalize(value, o);
  } else if (option == "--scalar") {
    return set_scalar(value, o);
  } else if (option == "--euler") {
    return set_euler(value, o);
  } else if (option == "--accumulation") {
    return set_accumulation(value, o);
  } else if (option == "--columns") {
    return set_columns(value, o);
  } else if (option == "--form" || option == "--time-unit" || option == "--rate-unit" ||
             option == "--angle-unit") {
    return set_unit(option, value, o);
  } else {
    return set_number(option, value, o);
  }
  return "";
}

// --initial: "truth" or qw,qx,qy,qz (four finite numbers, nonzero finite norm).
inline std::string set_initial(const std::string& text, Options& o) {
  if (text == "truth") {
    if (o.truth.empty()) return "--initial truth needs --truth FILE";
    o.initial_from_truth = true;
    return "";
  }
  std::array<double, 4> c{};
  std::size_t n = 0;
  std::size_t start = 0;
  bool ok = true;
  while (ok) {
    const std::size_t comma = text.find(',', start);
    const std::optional<double> x =
        parse_number(text.substr(start, comma == std::string::npos ? comma : comma - start));
    ok = x && n < 4;
    if (ok) c[n++] = *x;
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  if (!ok || n != 4) return "--initial needs four finite numbers qw,qx,qy,qz";
  o.initial = Quaternion<double>{c[0], c[1], c[2], c[3]};
  const double n2 = squared_norm(o.initial);
  if (!(n2 > 0.0) || !(n2 - n2 == 0.0)) {
    return "--initial must be a nonzero quaternion of finite norm";
  }
  return "";
}

inline ParseResult usage(std::string message) {
  ParseResult r;
  r.error = std::move(message);
  return r;
}

}  // namespace detail

// The arguments in order: --help and --list-methods act at once, the first bad one is the error.
inline ParseResult parse_options(const std::vector<std::string>& args, Options& o) {
  std::string initial_text;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    std::string error;
    if (a == "--help" || a == "-h") {
      return ParseResult{Command::help, ""};
    } else if (a == "--list-methods") {
      return ParseResult{Command::list_methods, ""};
    } else if (a == "--skip-bad") {
      o.skip_bad = true;
    } else if (detail::takes_value(a)) {
      if (i + 1 >= args.size()) return detail::usage("option " + a + " needs a value");
      error = detail::set_value(a, args[++i], o, initial_text);
    } else if (!a.empty() && a[0] == '-') {
      error = "unknown option '" + a + "'";
    } else if (o.log.empty()) {
      o.log = a;
    } else {
      error = "more than one log given ('" + o.log + "', '" + a + "')";
    }
    if (!error.empty()) return detail::usage(error);
  }
  if (o.log.empty()) return detail::usage("no gyro log given");
  if (o.output.empty()) return detail::usage("--output FILE is required");
  if (!initial_text.empty()) {
    std::string error = detail::set_initial(initial_text, o);
    if (!error.empty()) return detail::usage(std::move(error));
  }
  return ParseResult{};
}

}  // namespace halfspin::tools::propagate
