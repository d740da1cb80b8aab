#pragma once
// Command line of halfspin-stepstudy: parsing and the help text. Tool code.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdlib>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

#include "halfspin/bounds/sensor_error.hpp"
#include "log_options.hpp"
#include "method_registry.hpp"
#include "motion_options.hpp"

namespace halfspin::tools::stepstudy {

inline constexpr std::array<const char*, 8> default_methods{"exponential_map_midpoint_mean",
                                                            "magnus_4",
                                                            "coning_1_sample",
                                                            "coning_2_sample",
                                                            "coning_3_sample",
                                                            "runge_kutta_4_sampled",
                                                            "munthe_kaas_4_sampled",
                                                            "dormand_prince_54_rate_function"};

// The vibration lines and the coning are read by the shared parser (common/motion_options.hpp), so
// that halfspin-gyro-log reads the same text the same way.
using tools::AmplitudeUnit;
using tools::max_vibration_lines;
using tools::VibrationOption;

// Grouped by meaning, not packed: read once from the command line.
struct Options {  // NOLINT(clang-analyzer-optin.performance.Padding)
  bool help = false;
  std::string motion;            // truth motion name ("" in bounds-only mode)
  bool bounds_only = false;      // any of the description options below
  std::vector<double> envelope;  // D0..D5 (rad/s^(k+1)) as given; +inf = unknown
  // The maximum rate: a magnitude (rad/s) or per body axis (rad/s); max_rate_option says which
  // option gave it and in what unit, for the printed description.
  bool has_max_rate = false;
  bool has_axis_rates = false;
  double max_rate = 0;                 // rad/s (magnitude)
  std::array<double, 3> axis_rates{};  // rad/s (per body axis)
  std::string max_rate_option;         // "--max-rate", "--max-rate-deg", "--axis-rates", ...
  bool has_bandwidth = false;
  double bandwidth_hz = 0;                 // manoeuvre bandwidth (Hz)
  std::vector<VibrationOption> vibration;  // at most four lines
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
  bool fixes = false;         // --fixes: longest time between external attitude fixes per method
  bool local_errors = false;  // --local-errors: also sum each step's own error (truth runs)
  bool baseline = false;      // --baseline: the first-order firmware update as a reference series

  // The gyro's noise terms (SI; the *-deg options convert datasheet units) and the criterion
  // they give: the integration error at most sensor_fraction of the sensor-driven error over
  // --horizon. With --budget too, `budget` is the stricter of the two and `absolute_budget` the
  // one given; with the terms alone, `budget` is the criterion's.
  bool has_sensor = false;
  GyroNoiseTerms<double> sensor{};
  double sensor_fraction = 0.1;
  bool has_absolute_budget = false;
  double absolute_budget = 0;  // rad, --budget as given
  double sensor_budget = 0;    // rad, sensor_fraction x the combined sensor error over --horizon

  LogStudyOptions log;  // --log, --log-truth: a gyro log studied without truth
};

inline const char* help_text() {
  return "halfspin-stepstudy: sweep halfspin steppers x steps x scalar types against the exact "
         "truth\n"
         "of a motion and the library's a-priori error bounds; recommend a method and step for a "
         "budget.\n"
         "\n"
         "Usage:\n"
         "  halfspin-stepstudy [--motion NAME | description options] [options]\n"
         "\n"
         "What to study: a truth motion, or a description of the vehicle (below).\n"
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
         "\n"
         "Or describe the vehicle (bounds only; any combination of the parts below, which add):\n"
         "  --envelope D0[,D1,...,D5]\n"
         "                       bounds on |w| (rad/s), |w'| (rad/s^2), |w''| (rad/s^3), ... up to "
         "D5\n"
         "                       (rad/s^6); an entry 'inf' or 'unknown', and every derivative not "
         "given,\n"
         "                       is unknown (+inf: a bound that needs it is shown as 'needs Dk')\n"
         "  --max-rate R         the largest body rate magnitude |w| (rad/s): D0 = R\n"
         "  --max-rate-deg R     the same in deg/s\n"
         "  --axis-rates X,Y,Z   the largest rate about each body axis (rad/s): D0 = |(X,Y,Z)|\n"
         "  --axis-rates-deg X,Y,Z\n"
         "                       the same in deg/s (one of the four max-rate options; not with "
         "--envelope)\n"
         "  --bandwidth HZ       the manoeuvre bandwidth (Hz), with a max-rate option: D_k = "
         "(2*pi*HZ)^k * D0\n"
         "                       (Bernstein's inequality). It assumes every rate component is "
         "band-limited\n"
         "                       to HZ (no content above it at all); describe vibration above it "
         "with\n"
         "                       --vibration. Without --bandwidth a max rate gives D0 only, D1.. "
         "unknown.\n"
         "  --vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ]\n"
         "                       a sinusoidal vibration line at HZ (Hz) with amplitude X,Y,Z (>= "
         "0) "
         "about\n"
         "                       the body axes in UNIT: rad or deg (angle amplitude: the rate "
         "amplitude\n"
         "                       is 2*pi*HZ times it) or rad/s or deg/s (rate amplitude); "
         "optional\n"
         "                       phases PX,PY,PZ (deg), axis i's rate being A_i*cos(2*pi*HZ*t + "
         "P_i);\n"
         "                       without them the phases are unknown and the bounds hold for "
         "every\n"
         "                       phase. Repeat for up to 4 lines.\n"
         "                       Example: --vibration 120:0,0,0.01:rad\n"
         "  --coning DEG,HZ      classical coning of half-angle DEG (deg) at HZ (Hz)\n"
         "                       Without a manoeuvre part (--envelope or a max-rate option) the "
         "motion is\n"
         "                       only the vibration and coning given (D_k = 0 otherwise); coning "
         "alone is\n"
         "                       pure coning. The description as understood (each D_k with its "
         "unit and\n"
         "                       origin, each line's rate and angle amplitude, the coning) is "
         "printed\n"
         "                       before the table. With a description only bounds are shown (no "
         "measured\n"
         "                       error, no timing) and rate-function steppers are left out.\n"
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
         "                       (rad; where there is none, why: 'needs Dk' when a derivative "
         "bound "
         "the\n"
         "                       method needs is unknown (supply D0..Dk), 'step too large', 'no "
         "bound'),\n"
         "                       observed order (log-log slope to the next smaller step of "
         "the\n"
         "                       same method and scalar, '-' where undefined), ns per step (wall "
         "clock\n"
         "                       around the propagator calls; rate-function rows include the "
         "motion's\n"
         "                       rate evaluations)\n"
         "  --csv FILE           the table as CSV: method,scalar,step_s,max_error_rad,bound_rad,\n"
         "                       ns_per_step (empty fields where not measured; bound_rad inf where "
         "there\n"
         "                       is none)\n"
         "  --local-errors       also measure each step's own error (the step started from the "
         "exact\n"
         "                       attitude) and print their sum over the run, with the CSV column\n"
         "                       local_error_sum_rad: a horizon bound that adds up local errors "
         "cannot\n"
         "                       be below this sum, so sum/max error shows how much of a bound's\n"
         "                       looseness is cancellation between steps (truth motions only)\n"
         "  --svg FILE           two log-log charts: max error (rad) against step (s) with the "
         "bounds\n"
         "                       dashed and the budget line; max error (rad) against cost "
         "(ns/step)\n"
         "  --baseline           also run the first-order firmware update, q + dt/2 q x (0, w) "
         "with the\n"
         "                       latest rate sample then q/|q|, as a REFERENCE series: not a "
         "halfspin\n"
         "                       method, not recommended, no a-priori bound (bound column "
         "'none').\n"
         "                       It gets rows in the table, a series on both charts, and the CSV "
         "the\n"
         "                       column series (after ns_per_step: 'method', or 'reference' for "
         "it).\n"
         "                       With float studied it also prints one line: the most accurate\n"
         "                       sample-driven method whose measured cost per second of flight, "
         "at\n"
         "                       the step --gyro-rate gives it, is no higher than the baseline's "
         "at\n"
         "                       one gyro period, and the ratio of their float errors over the "
         "run\n"
         "                       (truth motions only)\n"
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
         "                       budget for each studied method (select_step), or why it has no "
         "finite\n"
         "                       bound ('needs Dk' at the step the gyro rate gives it). Ties in "
         "cost\n"
         "                       go to the smaller bound, then to the catalogue's order (derived\n"
         "                       coefficient sets before published ones).\n"
         "                       When nothing meets the budget: which term of the least bound "
         "limits\n"
         "                       (truncation, start-up, the scalar's rounding), and what would "
         "meet it:\n"
         "                       the slowest gyro that would (same scalar; in float also with "
         "the\n"
         "                       compensated accumulation and in double), the longest time "
         "between\n"
         "                       external attitude fixes at this gyro rate, the least budget "
         "reachable.\n"
         "                       In bounds-only mode the table's bounds cover --horizon; with a "
         "truth\n"
         "                       motion they cover each run (--duration) and the chart's budget "
         "line is\n"
         "                       the budget scaled to the run, labelled.\n"
         "  --fixes              with --budget: --horizon is the time between external attitude "
         "fixes\n"
         "                       (attitude re-anchored from other sensors); prints, for each "
         "studied\n"
         "                       method at the step the gyro rate gives it (its gyro periods per "
         "step /\n"
         "                       --gyro-rate), the longest time between fixes over which its "
         "worst-case\n"
         "                       bound stays within the budget (longest_fix_interval), and "
         "whether that\n"
         "                       covers --horizon\n"
         "\n"
         "Sensor errors (the integration error only has to be small beside the gyro's own):\n"
         "  --angle-random-walk N        rad/sqrt(s) (--angle-random-walk-deg: deg/sqrt(h))\n"
         "  --bias-instability B         rad/s (--bias-instability-deg: deg/h)\n"
         "  --rate-random-walk K         rad/s/sqrt(s) (--rate-random-walk-deg: deg/h/sqrt(h))\n"
         "  --residual-bias b            rad/s left after calibration (--residual-bias-deg: "
         "deg/h)\n"
         "                       the gyro's noise terms, per axis, as a datasheet or\n"
         "                       halfspin-gyro-noise (the Allan deviation of a static log) gives\n"
         "                       them; each needs --horizon. Printed: the attitude error each\n"
         "                       causes over --horizon, per axis: N*sqrt(t) and K*t^1.5/sqrt(3)\n"
         "                       (1 sigma), B*t (the trade's rule for the bias wander), |b|*t, "
         "and\n"
         "                       their root-sum-square (include/halfspin/bounds/sensor_error.hpp "
         "has\n"
         "                       the derivations and sources). The table gains bound/sensor: each\n"
         "                       bound over the sensor error over the same time.\n"
         "  --sensor-fraction F  the criterion: the integration error at most F (default 0.1) of\n"
         "                       the combined sensor error over --horizon. It is the budget when\n"
         "                       --budget is not given, else the stricter of the two is; the\n"
         "                       recommendation, the largest steps and the advice use it, and\n"
         "                       --fixes applies it over each interval between fixes.\n"
         "\n"
         "Log study (your own gyro log, without truth):\n"
         "  --log FILE           study FILE instead of a truth motion: a gyro log, its form read "
         "from its\n"
         "                       header (t,wx,wy,wz: rate log; t,dx,dy,dz: delta-angle log). It "
         "needs a fixed\n"
         "                       period (every interval within 1 ppm of the first), and is read "
         "twice (a\n"
         "                       check, then the study) in chunks: memory does not grow with its "
         "length.\n"
         "                       Each method runs at k = 1, 2, 4, ..., 2^(N-1) log periods per "
         "sample\n"
         "                       (--steps N, default 6, at most 16). A delta-angle log gives the "
         "sum of k\n"
         "                       consecutive delta-angles (exact: integrals add; summed in long "
         "double), a\n"
         "                       rate log every k-th rate sample (exact samples). On a rate log, "
         "delta-angle\n"
         "                       methods take the trapezoid rule per log period, summed: "
         "INTERPOLATED (exact\n"
         "                       only for a rate linear over each period; marked in the table and "
         "CSV).\n"
         "                       Rate-sample methods do not run on a delta-angle log, nor "
         "rate-function\n"
         "                       methods on any log.\n"
         "                       Errors are max angles, at common step ends, to the log's finest "
         "solution,\n"
         "                       NOT truth: the reference at k = 1, in long double, chosen among\n"
         "                       coning_4_sample, coning_2_sample, coning_1_sample (delta-angle "
         "log) or\n"
         "                       runge_kutta_4_sampled, magnus_4, exponential_map_midpoint_mean "
         "(rate log):\n"
         "                       the one whose own error, estimated by Richardson extrapolation "
         "from its\n"
         "                       runs at k = 1, 2, 4, 8, is reliable and has the smallest upper "
         "end (the\n"
         "                       order used and the interval are printed), plus the log's own "
         "rounding;\n"
         "                       rows under 10x the interval's upper end are flagged ref-res (at "
         "the\n"
         "                       reference's resolution).\n"
         "                       growth: least-squares slope through the origin of the difference "
         "against\n"
         "                       time (rad/s); with --horizon S, growth x S: AN EXTRAPOLATION "
         "(linear\n"
         "                       growth), not a bound. --budget RAD (needs --horizon) lists the "
         "largest step\n"
         "                       per method whose extrapolation meets it. --duration S studies the "
         "first S\n"
         "                       seconds (default: the whole log). --methods, --scalar, "
         "--accumulation,\n"
         "                       --csv and --svg as above; the CSV's columns are the six above "
         "(bound_rad\n"
         "                       empty) and error_against (log_finest_solution), input "
         "(exact|interpolated),\n"
         "                       log_periods_per_sample, steps, at_reference_resolution (1|0),\n"
         "                       reference_error_rad, reference_error_low_rad, "
         "reference_error_high_rad,\n"
         "                       growth_rad_per_s, horizon_s, extrapolated_error_rad. Not with "
         "--motion, a\n"
         "                       description, --step*, --local-errors, --fixes, "
         "--recommendation-file.\n"
         "                       A log or truth that cannot be opened, is malformed or does not "
         "fit exits 1\n"
         "                       with a message naming the file and line.\n"
         "  --log-truth FILE     the log's truth attitude, t,qw,qx,qy,qz at the log's start and "
         "every sample\n"
         "                       time (as halfspin-gyro-log --truth writes it): adds the true "
         "error at the\n"
         "                       same step ends and the reference's true error (CSV: "
         "true_error_rad,\n"
         "                       reference_true_error_rad), to check the truth-free study on a "
         "made log\n"
         "\n"
         "  --help               this text\n"
         "\n"
         "Runs use the library's Propagator with its default policies: first-order "
         "renormalization,\n"
         "and the accumulation above (compensated in float, plain in double unless "
         "--accumulation plain),\n"
         "fed exact samples (long double truth rounded to the scalar); progress goes to stderr "
         "when it\n"
         "is a terminal.\n"
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

using tools::detail::parse_number;
using tools::detail::parse_triple;
using tools::detail::split;

}  // namespace detail

namespace detail {

// One of the noise-term options: its value (finite; not negative except the residual bias), in
// SI or, for the *-deg spelling, in the datasheet unit, stored in SI.
template <class Value>
bool sensor_term(const std::string& a, const Value& value, Options& o, std::string& error) {
  std::string v;
  double x = 0;
  if (!value(v)) {
    return false;
  }
  const bool signed_term = a.rfind("--residual-bias", 0) == 0;
  if (!parse_number(v, x) || (!signed_term && x < 0)) {
    error = a + ": '" + v + "' is not a " + (signed_term ? "" : "non-negative ") + "finite number";
    return false;
  }
  const bool datasheet = a.size() > 4 && a.compare(a.size() - 4, 4, "-deg") == 0;
  if (a.rfind("--angle-random-walk", 0) == 0) {
    o.sensor.angle_random_walk = datasheet ? angle_random_walk_from_degrees_per_root_hour(x) : x;
  } else if (a.rfind("--bias-instability", 0) == 0) {
    o.sensor.bias_instability = datasheet ? rate_from_degrees_per_hour(x) : x;
  } else if (a.rfind("--rate-random-walk", 0) == 0) {
    o.sensor.rate_random_walk = datasheet ? rate_random_walk_from_degrees_per_hour_root_hour(x) : x;
  } else {
    o.sensor.residual_bias = datasheet ? rate_from_degrees_per_hour(x) : x;
  }
  o.has_sensor = true;
  return true;
}

// With noise terms: the criterion over --horizon, and the budget the study uses (the stricter of
// it and --budget).
inline bool apply_sensor_criterion(Options& o, bool have_horizon, std::string& error) {
  o.has_absolute_budget = o.has_budget;
  o.absolute_budget = o.budget;
  if (!o.has_sensor) {
    return true;
  }
  if (!have_horizon) {
    error = "the gyro's noise terms need --horizon (the time over which the sensor error grows)";
    return false;
  }
  o.sensor_budget = sensor_fraction_budget(o.sensor, o.horizon, o.sensor_fraction);
  if (!(o.sensor_budget > 0)) {
    if (!o.has_budget) {
      error = "the gyro's noise terms are all zero: they set no criterion (give --budget)";
      return false;
    }
    return true;
  }
  o.budget = o.has_budget ? std::fmin(o.budget, o.sensor_budget) : o.sensor_budget;
  o.has_budget = true;
  return true;
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
      o.envelope.clear();  // the last --envelope counts
      for (const std::string& part : detail::split(v)) {
        double d = 0;
        if (part == "inf" || part == "unknown") {
          d = std::numeric_limits<double>::infinity();
        } else if (!detail::parse_number(part, d) || d < 0) {
          error =
              "--envelope: '" + part + "' is neither a non-negative finite number nor inf/unknown";
          return false;
        }
        o.envelope.push_back(d);
      }
      if (o.envelope.size() > 6) {
        error = "--envelope takes 1 to 6 values D0[,D1,...,D5]";
        return false;
      }
      o.bounds_only = true;
    } else if (a == "--max-rate" || a == "--max-rate-deg") {
      if (!value(v)) {
        return false;
      }
      if (!detail::parse_number(v, o.max_rate) || o.max_rate < 0) {
        error = a;
        error.append(": '").append(v).append("' is not a non-negative finite number");
        return false;
      }
      if (a == "--max-rate-deg") {
        o.max_rate *= std::acos(-1.0) / 180.0;
      }
      if (o.has_max_rate || o.has_axis_rates) {
        error = a + ": the maximum rate is given twice (one of --max-rate, --max-rate-deg, " +
                "--axis-rates, --axis-rates-deg)";
        return false;
      }
      o.has_max_rate = true;
      o.max_rate_option = a;
      o.bounds_only = true;
    } else if (a == "--axis-rates" || a == "--axis-rates-deg") {
      if (!value(v)) {
        return false;
      }
      if (!detail::parse_triple(v, o.axis_rates, false)) {
        error = a;
        error.append(": '").append(v).append("' is not three non-negative finite numbers X,Y,Z");
        return false;
      }
      if (a == "--axis-rates-deg") {
        for (double& r : o.axis_rates) {
          r *= std::acos(-1.0) / 180.0;
        }
      }
      if (o.has_max_rate || o.has_axis_rates) {
        error = a + ": the maximum rate is given twice (one of --max-rate, --max-rate-deg, " +
                "--axis-rates, --axis-rates-deg)";
        return false;
      }
      o.has_axis_rates = true;
      o.max_rate_option = a;
      o.bounds_only = true;
    } else if (a == "--bandwidth") {
      if (!positive(o.bandwidth_hz)) {
        return false;
      }
      o.has_bandwidth = true;
      o.bounds_only = true;
    } else if (a == "--vibration") {
      if (!value(v)) {
        return false;
      }
      VibrationOption line;
      if (!tools::parse_vibration(v, line, error)) {
        return false;
      }
      if (o.vibration.size() == max_vibration_lines) {
        error = "--vibration: at most 4 lines";
        return false;
      }
      o.vibration.push_back(line);
      o.bounds_only = true;
    } else if (a == "--fixes") {
      o.fixes = true;
    } else if (a == "--local-errors") {
      o.local_errors = true;
    } else if (a == "--baseline") {
      o.baseline = true;
    } else if (a == "--coning") {
      if (!value(v)) {
        return false;
      }
      if (!tools::parse_coning(v, o.coning_deg, o.coning_hz, error)) {
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
      o.log.duration_given = true;
    } else if (a == "--log") {
      if (!value(o.log.file)) {
        return false;
      }
    } else if (a == "--log-truth") {
      if (!value(o.log.truth)) {
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
    } else if (a == "--angle-random-walk" || a == "--angle-random-walk-deg" ||
               a == "--bias-instability" || a == "--bias-instability-deg" ||
               a == "--rate-random-walk" || a == "--rate-random-walk-deg" ||
               a == "--residual-bias" || a == "--residual-bias-deg") {
      if (!detail::sensor_term(a, value, o, error)) {
        return false;
      }
    } else if (a == "--sensor-fraction") {
      if (!positive(o.sensor_fraction)) {
        return false;
      }
      if (o.sensor_fraction > 1) {
        error =
            "--sensor-fraction: at most 1 (the integration error as a fraction of the "
            "sensor's)";
        return false;
      }
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
  if (!detail::apply_sensor_criterion(o, have_horizon, error)) {
    return false;
  }
  if (!o.log.file.empty() || !o.log.truth.empty()) {
    return check_log_options(o, step_given, have_horizon, error);
  }
  if (o.bounds_only && !o.motion.empty()) {
    error =
        "--motion cannot be combined with a description (--envelope, --max-rate*, "
        "--axis-rates*, --bandwidth, --vibration, --coning)";
    return false;
  }
  if (!o.envelope.empty() && (o.has_max_rate || o.has_axis_rates)) {
    error = "--envelope and a max-rate option both give D0: use one";
    return false;
  }
  if (o.has_bandwidth && !o.has_max_rate && !o.has_axis_rates) {
    error =
        "--bandwidth needs the maximum rate (--max-rate, --max-rate-deg, --axis-rates or "
        "--axis-rates-deg)";
    return false;
  }
  if (o.local_errors && o.bounds_only) {
    error = "--local-errors measures a truth motion: it cannot be combined with a description";
    return false;
  }
  if (o.baseline && o.bounds_only) {
    error = "--baseline measures a truth motion: it cannot be combined with a description";
    return false;
  }
  if (o.fixes && !o.has_budget) {
    error = "--fixes needs --budget and --horizon (the time between fixes)";
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

// The method names asked for: every catalogued one (--methods all), the default set, or the list
// as given (the caller checks the names: unknown ones, duplicates, aliases).
inline std::vector<std::string> requested_method_names(const Options& o) {
  std::vector<std::string> names;
  if (o.all_methods) {
    for (const MethodInfo& m : method_catalogue()) {
      names.emplace_back(m.name);
    }
  } else if (o.methods.empty()) {
    names.assign(std::begin(default_methods), std::end(default_methods));
  } else {
    names = o.methods;
  }
  return names;
}

}  // namespace halfspin::tools::stepstudy
