#pragma once
// Command line of halfspin-stepstudy: parsing and the help text. Tool code.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdlib>
#include <string>
#include <string_view>
#include <vector>

namespace halfspin::tools::stepstudy {

inline constexpr std::array<const char*, 8> default_methods{"exponential_map_midpoint_mean",
                                                            "magnus_4",
                                                            "coning_1_sample",
                                                            "coning_2_sample",
                                                            "coning_3_sample",
                                                            "runge_kutta_4_sampled",
                                                            "munthe_kaas_4_sampled",
                                                            "dormand_prince_54_rate_function"};

// Grouped by meaning, not packed: read once from the command line.
struct Options {  // NOLINT(clang-analyzer-optin.performance.Padding)
  bool help = false;
  std::string motion;            // truth motion name ("" in bounds-only mode)
  bool bounds_only = false;      // --envelope and/or --coning
  std::vector<double> envelope;  // D0..D5 (rad/s^(k+1))
  bool has_coning = false;
  double coning_deg = 0;             // half-angle (deg)
  double coning_hz = 0;              // frequency (Hz)
  std::vector<std::string> methods;  // empty: the default set
  bool all_methods = false;
  double step_min = 0;  // s (0: the motion's default)
  double step_max = 0;  // s
  int steps = 8;
  bool steps_given = false;
  bool want_float = true;
  bool want_double = true;
  bool compensated_float = true;  // --accumulation: the float propagator's policy
  double duration = 5.0;          // s
  std::string csv;
  std::string svg;
  bool has_budget = false;
  double budget = 0;          // rad
  double horizon = 0;         // s
  double gyro_rate = 1000.0;  // Hz
  std::string recommendation_file;
};

inline const char* help_text() {
  return "halfspin-stepstudy: sweep halfspin steppers x steps x scalar types against the exact "
         "truth\n"
         "of a motion and the library's a-priori error bounds; recommend a method and step for a "
         "budget.\n"
         "\n"
         "Usage:\n"
         "  halfspin-stepstudy [--motion NAME | --envelope D0,D1,D2[,...] | --coning DEG,HZ] "
         "[options]\n"
         "\n"
         "What to study (one of):\n"
         "  --motion NAME        a truth motion with exact attitude (default: demo):\n"
         "                         constant     constant body rate (0.9, -0.6, 1.3) rad/s;\n"
         "                                      bounds: RateEnvelope::constant_rate(|w|)\n"
         "                         oscillation  0.15 rad single-axis oscillation at 2.5 Hz about "
         "(2,3,6)/7;\n"
         "                                      bounds: VibrationSpec (2.356 rad/s sinusoid at 2.5 "
         "Hz)\n"
         "                         coning       classical coning, half-angle 0.04 rad at 5 Hz;\n"
         "                                      bounds: ConingSpec (pure coning: exact per-step "
         "error)\n"
         "                         body         torque-free axisymmetric body (It = 1, I3 = 1.8 kg "
         "m^2,\n"
         "                                      w_perp = 0.6 rad/s, w3 = 2.5 rad/s); bounds: "
         "envelope\n"
         "                                      D0 = |w| = 2.571 rad/s, Dk = w_perp*|lambda|^k, "
         "lambda = 2 rad/s\n"
         "                         demo         the invented survey drone: banked turn carrying "
         "0.02 deg\n"
         "                                      coning at 85 Hz; bounds: its rate envelope\n"
         "  --envelope D0,D1,D2[,D3,D4,D5]\n"
         "                       a motion known only by bounds on |w| (rad/s), |w'| (rad/s^2), "
         "|w''|\n"
         "                       (rad/s^3), ...; derivatives not given are unknown (+inf)\n"
         "  --coning DEG,HZ      classical coning of half-angle DEG (deg) at HZ (Hz); alone it is "
         "pure\n"
         "                       coning, with --envelope it is added to the envelope\n"
         "                       With --envelope/--coning only bounds are shown (no measured "
         "error,\n"
         "                       no timing) and rate-function steppers are left out.\n"
         "\n"
         "Sweep:\n"
         "  --methods LIST       comma-separated stepper names, or 'all' (default: "
         "exponential_map_midpoint_mean,\n"
         "                       magnus_4, coning_1_sample, coning_2_sample, coning_3_sample, "
         "runge_kutta_4_sampled,\n"
         "                       munthe_kaas_4_sampled, dormand_prince_54_rate_function); "
         "--methods list prints\n"
         "                       every stepper with its order and cost\n"
         "  --step-min S         smallest step (s): the attitude update interval; a step spans "
         "the\n"
         "                       method's gyro periods per step (default: per motion, e.g. 1e-4 "
         "demo)\n"
         "  --step-max S         largest step (s) (default: per motion, e.g. 4e-3 demo)\n"
         "  --steps N            number of log-spaced steps from min to max (default 8; N = 1 "
         "needs\n"
         "                       min = max)\n"
         "  --step S             a single step (s): same as --step-min S --step-max S --steps 1\n"
         "  --scalar LIST        float, double or float,double (default: both)\n"
         "  --accumulation P     how the float propagator adds each step to the attitude: "
         "compensated\n"
         "                       (default: the attitude as a pair of floats, rounding error "
         "about\n"
         "                       c*u*(angle turned) + N*c2*u^2) or plain (one float, rounded "
         "every step:\n"
         "                       N*c*u); measured rows, bounds and the float recommendation "
         "all use it.\n"
         "                       Double is always plain (its rounding is negligible).\n"
         "  --duration S         length of every truth run (s) (default 5); the bound column is "
         "the\n"
         "                       horizon bound over the same duration\n"
         "\n"
         "Output:\n"
         "  stdout               a table: method, scalar, step (s), steps run, max error (rad: max "
         "over\n"
         "                       step ends of the angle between propagated and true attitude), "
         "bound\n"
         "                       (rad), observed order (log-log slope to the next smaller step of "
         "the\n"
         "                       same method and scalar, '-' where undefined), ns per step (wall "
         "clock\n"
         "                       around the propagator calls; rate-function rows include the "
         "motion's\n"
         "                       rate evaluations)\n"
         "  --csv FILE           the table as CSV: method,scalar,step_s,max_error_rad,bound_rad,\n"
         "                       ns_per_step (empty fields where not measured)\n"
         "  --svg FILE           two log-log charts: max error (rad) against step (s) with the "
         "bounds\n"
         "                       dashed and the budget line; max error (rad) against cost "
         "(ns/step)\n"
         "\n"
         "Recommendation:\n"
         "  --budget RAD         attitude-error budget (rad) over --horizon (needs --horizon)\n"
         "  --horizon S          flight time the budget covers (s)\n"
         "  --gyro-rate HZ       gyro sample rate (Hz) (default 1000)\n"
         "  --recommendation-file FILE\n"
         "                       writes key=value lines: method, form (rate|delta), step_s,\n"
         "                       gyro_rate_hz, bound_rad (needs --budget)\n"
         "                       The recommendation is the cheapest sample-driven stepper (flops x "
         "steps\n"
         "                       per second) whose worst-case bound meets the budget at the gyro "
         "rate,\n"
         "                       printed for each studied scalar; the file holds double's when "
         "double\n"
         "                       is studied, else float's. Also printed: the largest step meeting "
         "the\n"
         "                       budget for each studied method (select_step).\n"
         "\n"
         "  --help               this text\n"
         "\n"
         "Runs use the library's Propagator with exact renormalization and the accumulation "
         "above, fed\n"
         "exact samples (long double truth rounded to the scalar); progress goes to stderr when "
         "it is a\n"
         "terminal.\n"
         "\n"
         "Exit codes: 0 ok; 1 bad usage; 2 an output file could not be written or a run failed;\n"
         "3 a recommendation file was asked for but no sample-driven stepper meets the budget at "
         "the\n"
         "gyro rate (nothing written).\n"
         "\n"
         "Caution: attitude errors can crash vehicles and hurt people. These bounds and "
         "measurements\n"
         "support engineering judgement; they do not replace it. Validate any attitude solution "
         "in\n"
         "hardware-in-the-loop and flight test; local airworthiness rules and licensed "
         "engineering\n"
         "practice govern what may fly.\n";
}

namespace detail {

inline std::vector<std::string> split(std::string_view text) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t comma = text.find(',', start);
    const std::size_t end = comma == std::string_view::npos ? text.size() : comma;
    parts.emplace_back(text.substr(start, end - start));
    if (comma == std::string_view::npos) {
      break;
    }
    start = comma + 1;
  }
  return parts;
}

inline bool parse_number(const std::string& text, double& value) {
  if (text.empty()) {
    return false;
  }
  char* end = nullptr;
  value = std::strtod(text.c_str(), &end);
  return end - text.c_str() == static_cast<std::ptrdiff_t>(text.size()) && std::isfinite(value);
}

}  // namespace detail

// Parses argv into `o`; on bad usage returns false with a message in `error`.
inline bool parse_options(int argc, char** argv, Options& o, std::string& error) {
  // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, argc entries
  std::vector<std::string> args(argv + 1, argv + argc);
  bool step_given = false;
  bool have_horizon = false;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--help" || a == "-h") {
      o.help = true;
      return true;
    }
    auto value = [&](std::string& v) {
      if (i + 1 >= args.size()) {
        error = a + " needs a value";
        return false;
      }
      v = args[++i];
      return true;
    };
    auto positive = [&](double& out) {
      std::string v;
      if (!value(v)) {
        return false;
      }
      if (!detail::parse_number(v, out) || !(out > 0)) {
        error = a;
        error.append(": '").append(v).append("' is not a positive finite number");
        return false;
      }
      return true;
    };
    std::string v;
    if (a == "--motion") {
      if (!value(o.motion)) {
        return false;
      }
    } else if (a == "--envelope") {
      if (!value(v)) {
        return false;
      }
      for (const std::string& part : detail::split(v)) {
        double d = 0;
        if (!detail::parse_number(part, d) || d < 0) {
          error = "--envelope: '" + part + "' is not a non-negative finite number";
          return false;
        }
        o.envelope.push_back(d);
      }
      if (o.envelope.size() < 3 || o.envelope.size() > 6) {
        error = "--envelope takes 3 to 6 values D0,D1,D2[,D3,D4,D5]";
        return false;
      }
      o.bounds_only = true;
    } else if (a == "--coning") {
      if (!value(v)) {
        return false;
      }
      const std::vector<std::string> parts = detail::split(v);
      if (parts.size() != 2 || !detail::parse_number(parts[0], o.coning_deg) ||
          !detail::parse_number(parts[1], o.coning_hz) || !(o.coning_deg > 0) ||
          !(o.coning_hz > 0) || !(o.coning_deg < 90)) {
        error = "--coning takes DEG,HZ: a half-angle in (0, 90) deg and a positive frequency in Hz";
        return false;
      }
      o.has_coning = true;
      o.bounds_only = true;
    } else if (a == "--methods") {
      if (!value(v)) {
        return false;
      }
      if (v == "all") {
        o.all_methods = true;
      } else {
        o.methods = detail::split(v);
      }
    } else if (a == "--step-min") {
      if (!positive(o.step_min)) {
        return false;
      }
    } else if (a == "--step-max") {
      if (!positive(o.step_max)) {
        return false;
      }
    } else if (a == "--step") {
      if (!positive(o.step_min)) {
        return false;
      }
      o.step_max = o.step_min;
      o.steps = 1;
      step_given = true;
    } else if (a == "--steps") {
      if (!value(v)) {
        return false;
      }
      char* end = nullptr;
      const long n = std::strtol(v.c_str(), &end, 10);
      if (v.empty() || end - v.c_str() != static_cast<std::ptrdiff_t>(v.size()) || n < 1 ||
          n > 400) {
        error = "--steps: '" + v + "' is not a whole number from 1 to 400";
        return false;
      }
      o.steps = static_cast<int>(n);
      o.steps_given = true;
    } else if (a == "--scalar") {
      if (!value(v)) {
        return false;
      }
      o.want_float = false;
      o.want_double = false;
      for (const std::string& s : detail::split(v)) {
        if (s == "float") {
          o.want_float = true;
        } else if (s == "double") {
          o.want_double = true;
        } else {
          error = "--scalar: '" + s + "' is neither float nor double";
          return false;
        }
      }
    } else if (a == "--accumulation") {
      std::string p;
      if (!value(p)) {
        return false;
      }
      if (p == "compensated") {
        o.compensated_float = true;
      } else if (p == "plain") {
        o.compensated_float = false;
      } else {
        error = "--accumulation: '" + p + "' is neither plain nor compensated";
        return false;
      }
    } else if (a == "--duration") {
      if (!positive(o.duration)) {
        return false;
      }
    } else if (a == "--csv") {
      if (!value(o.csv)) {
        return false;
      }
    } else if (a == "--svg") {
      if (!value(o.svg)) {
        return false;
      }
    } else if (a == "--budget") {
      if (!positive(o.budget)) {
        return false;
      }
      o.has_budget = true;
    } else if (a == "--horizon") {
      if (!positive(o.horizon)) {
        return false;
      }
      have_horizon = true;
    } else if (a == "--gyro-rate") {
      if (!positive(o.gyro_rate)) {
        return false;
      }
    } else if (a == "--recommendation-file") {
      if (!value(o.recommendation_file)) {
        return false;
      }
    } else {
      error = "unknown argument '" + a + "'";
      return false;
    }
  }
  if (o.bounds_only && !o.motion.empty()) {
    error = "--motion cannot be combined with --envelope/--coning";
    return false;
  }
  if (!o.bounds_only && o.motion.empty()) {
    o.motion = "demo";
  }
  if (o.has_budget != have_horizon) {
    error = "--budget and --horizon go together";
    return false;
  }
  if (!o.recommendation_file.empty() && !o.has_budget) {
    error = "--recommendation-file needs --budget and --horizon";
    return false;
  }
  if (step_given && o.steps_given && o.steps != 1) {
    error = "--step runs one step; it cannot be combined with --steps N > 1";
    return false;
  }
  return true;
}

}  // namespace halfspin::tools::stepstudy
