// halfspin-gyro-log: writes the exact gyro log (rates or delta-angles) of one of the library's
// truth motions or of the user's own (a turn carrying coning and vibration lines, composed
// exactly), optionally with a gyro's own errors added (SyntheticGyro's processes), and its truth
// attitude, for halfspin-propagate. `--help` documents it all.
#include <array>
#include <cerrno>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "demo_scenario.hpp"
#include "gyro_log.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/sensor_error.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/composed_motion.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "halfspin/truth/vibration_lines.hpp"
#include "motion_options.hpp"

namespace {

using namespace halfspin;
using namespace halfspin::tools;
using Real = long double;  // truth is evaluated in long double, written as double

constexpr int exit_ok = 0;
constexpr int exit_usage = 1;
constexpr int exit_failure = 2;

constexpr const char* help_text =
    R"(halfspin-gyro-log: write the exact gyro log of a truth motion (invented parameters).

Usage: halfspin-gyro-log --motion M --output FILE [options]
       halfspin-gyro-log [--turn X,Y,Z] [--coning DEG,HZ] [--vibration V]... --output FILE
                         [options]

Example (a turn near 3 rad/s with a 120 Hz, 0.01 rad vibration line on body z, gyro at 2 kHz,
delta-angles, 20 minutes, with truth):
  halfspin-gyro-log --turn 0.6,-2.1,2 --vibration 120:0,0,0.01:rad --rate 2000 --duration 1200 \
      --form delta --output log.csv --truth truth.csv

Options:
  --motion M      constant | oscillation | coning | body | demo: a fixed motion (parameters below)
  Or your own motion, the parts below in any combination (not with --motion); they compose
  exactly, q(t) = q_turn(t) * q_coning(t) * q_vibration(t), q(0) = identity (body -> reference):
  --turn X,Y,Z    a constant body rate (rad/s) carrying the rest: q_turn(t) = exp(w t / 2)
  --turn-deg X,Y,Z
                  the same in deg/s (one of --turn, --turn-deg)
  --coning DEG,HZ classical coning of half-angle DEG (deg) at HZ (Hz) inside the turn
                  (the same text and meaning as halfspin-stepstudy --coning)
  --vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ]
                  a vibration line at HZ (Hz), the same text and meaning as halfspin-stepstudy
                  --vibration: amplitude X,Y,Z (>= 0) about the body axes in UNIT, rad or deg
                  (angle amplitude a_i) or rad/s or deg/s (rate amplitude A_i = 2 pi HZ a_i);
                  phases PX,PY,PZ (deg, default 0,0,0). Repeat for up to 4 lines.
                  Exact attitude: q_vibration(t) = exp(theta(t)/2), the body's rotation vector
                  relative to the coned frame theta_i(t) = sum over lines of
                  a_i sin(2 pi HZ t + P_i), whose derivative is the lines' rate signal
                  A_i cos(2 pi HZ t + P_i). The body rate written is that attitude's exact rate:
                  equal to theta' when every line is on one axis, otherwise theta' plus the
                  lines' own coning, at most |theta| |theta'|/2 + |theta|^2 |theta'|/6
                  (include/halfspin/truth/vibration_lines.hpp).
  --form F        rate (default) | delta
                    rate:  header t,wx,wy,wz; rows at t = k/rate, k = 0, 1, ..., body rate (rad/s)
                    delta: header t,dx,dy,dz; rows at t = k/rate, k = 1, 2, ..., each the exact
                           integral of the body rate over ((k-1)/rate, k/rate] (rad): closed form
                           where the motion has one, else 8-point Gauss-Legendre quadrature per
                           interval (below 2e-23 dt (W dt)^16 times the rate amplitude for a rate
                           band-limited to W rad/s: far below double rounding while W dt < 1)
  --rate HZ       sample rate (default 1000)
  --duration S    length (s, default 10): rows up to t = duration
  --output FILE   required; the log
  --truth FILE    also write the truth attitude t,qw,qx,qy,qz (body -> reference) at every sample
                  time, t = 0 included (halfspin-propagate --truth FILE --initial truth)
  --help          this text

A gyro's own errors, added to every sample (the truth file stays the exact attitude), the same
option names and units as halfspin-stepstudy's (per axis, independent axes, seeded; made by
include/halfspin/truth/synthetic_gyro.hpp; a rate sample carries each process's mean over its
interval, a delta-angle its integral):
  --angle-random-walk N        white rate noise, rad/sqrt(s) (--angle-random-walk-deg: deg/sqrt(h))
  --bias-instability B         flicker rate noise, rad/s, flat at 0.664 B in the Allan deviation
                               over --flicker-band (--bias-instability-deg: deg/h)
  --flicker-band LO,HI         that band of averaging times, s (default 1,1000)
  --rate-random-walk K         rad/s/sqrt(s) (--rate-random-walk-deg: deg/h/sqrt(h))
  --gyro-bias X,Y,Z            a constant bias per axis, rad/s (--gyro-bias-deg: deg/h)
  --seed S                     the noise sequence (default 1)
A log of a still gyro (--turn 0,0,0 with errors) is the static log halfspin-gyro-noise reads.
All numbers are written with 17 significant digits (they round-trip a double). Truth is evaluated
in long double. Files are written through temporaries in the same directory and renamed at the
end: on any error nothing is written.

The motion as understood (each part, each line's angle and rate amplitudes) and the peak |w|
at the sample times (rad/s and deg/s) are printed on stderr.

Fixed motions (all start at t = 0; invented, no real vehicle):
  constant     q(t) = exp(w t / 2), w = (0.3, -0.2, 0.5) rad/s
  oscillation  about the unit axis (1, 2, 2)/3: angle 0.4 sin(2 pi 2 t + 0.3) rad
  coning       classical coning, cone angle 0.05 rad, cone frequency 10 Hz (62.83 rad/s)
  body         torque-free axisymmetric body, I3/It = 1.6, transverse rate 0.8 rad/s at phase
               0.2 rad, axial rate 3 rad/s, q(0) = identity
  demo         the tools' demo drone: a 35 deg banked turn at 18 m/s carrying 0.02 deg, 85 Hz
               engine-vibration coning (examples/tools/common/demo_scenario.hpp)

Exit codes: 0 ok; 1 bad usage (unknown option or motion, bad value, --motion with parts of your
own, output cannot be created); 2 write failure.

Caution: attitude errors can crash vehicles and hurt people. Synthetic logs and the results drawn
from them support engineering judgement; they do not replace it. Validate any attitude solution
in hardware-in-the-loop and flight test; local airworthiness rules and licensed engineering
practice govern what may fly.
)";

[[noreturn]] void usage_error(const std::string& message) {
  std::fprintf(stderr, "halfspin-gyro-log: %s (see --help)\n", message.c_str());
  std::exit(exit_usage);
}

bool parse_positive(const std::string& text, double& out) {
  return tools::detail::parse_number(text, out) && out > 0.0;
}

// No errors; bias instability, when given, flat over 1 .. 1000 s unless --flicker-band says.
GyroErrorModel<double> default_errors() {
  GyroErrorModel<double> m;
  m.flicker_band_shortest = 1;
  m.flicker_band_longest = 1000;
  return m;
}

// Grouped by meaning, not packed: read once from the command line.
struct Settings {  // NOLINT(clang-analyzer-optin.performance.Padding)
  bool delta = false;
  double rate_hz = 1000.0;
  double duration_s = 10.0;
  std::string motion;  // a fixed motion, or "" for the user's parts below
  bool has_turn = false;
  std::array<double, 3> turn{};  // rad/s
  bool has_coning = false;
  double coning_deg = 0;  // half-angle (deg)
  double coning_hz = 0;   // Hz
  std::vector<VibrationOption> vibration;
  std::string output;
  std::string truth;
  // The gyro's own errors (SI), added to every sample when any is given.
  bool has_errors = false;
  GyroErrorModel<double> errors = default_errors();
  std::uint64_t seed = 1;
};

// The user's motion: a turn carrying classical coning carrying vibration lines, each part
// identity where not given (truth/composed_motion.hpp composes them exactly).
using UserMotion =
    ComposedMotion<Real, ConstantRateMotion<Real>,
                   ComposedMotion<Real, ClassicalConingMotion<Real>, VibrationLinesMotion<Real>>>;

UserMotion user_motion(const Settings& s) {
  const ConstantRateMotion<Real> turn{
      Quaternion<Real>::identity(),
      Vector3<Real>{static_cast<Real>(s.turn[0]), static_cast<Real>(s.turn[1]),
                    static_cast<Real>(s.turn[2])}};
  const ClassicalConingMotion<Real> cone{static_cast<Real>(s.coning_deg) * pi<Real> / Real(180),
                                         Real(2) * pi<Real> * static_cast<Real>(s.coning_hz)};
  VibrationSpec<double> lines{};
  for (const VibrationOption& v : s.vibration) lines.add(vibration_line(v));
  VibrationLinesMotion<Real> vibration;
  vibration.lines = lines.converted<Real>();
  return compose<Real>(turn, compose<Real>(cone, vibration));
}

// The user's motion as understood, on stderr.
void describe_user_motion(const Settings& s) {
  std::fprintf(stderr,
               "motion: q(t) = q_turn(t) * q_coning(t) * q_vibration(t), q(0) = identity\n");
  if (s.has_turn) {
    const double w =
        std::sqrt(s.turn[0] * s.turn[0] + s.turn[1] * s.turn[1] + s.turn[2] * s.turn[2]);
    std::fprintf(stderr, "  turn: body rate (%g, %g, %g) rad/s, |w| = %g rad/s (%g deg/s)\n",
                 s.turn[0], s.turn[1], s.turn[2], w, w * tools::detail::degrees_per_radian);
  }
  if (s.has_coning) {
    std::fprintf(stderr, "  coning: half-angle %g deg at %g Hz\n", s.coning_deg, s.coning_hz);
  }
  for (const VibrationOption& v : s.vibration) {
    const VibrationLine<double> line = vibration_line(v);
    const Vector3<double> a = line.rate_amplitude / line.angular_frequency();
    const Vector3<double> p = line.phase * tools::detail::degrees_per_radian;
    std::fprintf(stderr,
                 "  vibration %g Hz: angle amplitude (%g, %g, %g) rad, rate amplitude (%g, %g, "
                 "%g) rad/s, phases (%g, %g, %g) deg\n",
                 v.frequency_hz, a.x, a.y, a.z, line.rate_amplitude.x, line.rate_amplitude.y,
                 line.rate_amplitude.z, p.x, p.y, p.z);
  }
}

// The largest |w| (rad/s) seen at the sample times, for the closing note.
struct PeakRate {
  double rad_s = 0;
  double at_s = 0;
};

template <class Motion>
bool write_log(const Motion& motion, const Settings& s, std::FILE* log, std::FILE* truth,
               PeakRate& peak) {
  std::fprintf(log, "%s\n",
               gyro_log_header(s.delta ? GyroLogForm::delta_angle : GyroLogForm::rate));
  if (truth != nullptr) std::fprintf(truth, "%s\n", attitude_csv_header);
  // Last index: the largest k with k/rate <= duration (a relative 1e-12 slack absorbs the
  // rounding of duration*rate, e.g. 0.3 s at 10 Hz).
  const auto last = static_cast<std::int64_t>(std::floor(s.duration_s * s.rate_hz * (1.0 + 1e-12)));
  double previous_t = 0.0;
  // The errors: a still gyro's output, sample for sample (its index runs with k: rates from
  // k = 0, delta-angles from k = 1).
  const ConstantRateMotion<Real> still{Quaternion<Real>::identity(), Vector3<Real>::zero()};
  GyroErrorModel<Real> model;
  model.bias = {static_cast<Real>(s.errors.bias.x), static_cast<Real>(s.errors.bias.y),
                static_cast<Real>(s.errors.bias.z)};
  model.noise_density = static_cast<Real>(s.errors.noise_density);
  model.rate_random_walk = static_cast<Real>(s.errors.rate_random_walk);
  model.bias_instability = static_cast<Real>(s.errors.bias_instability);
  model.flicker_band_shortest = static_cast<Real>(s.errors.flicker_band_shortest);
  model.flicker_band_longest = static_cast<Real>(s.errors.flicker_band_longest);
  SyntheticGyro<Real, ConstantRateMotion<Real>> sensor(
      still, s.delta ? GyroOutputForm::delta_angle : GyroOutputForm::rate,
      Real(1) / static_cast<Real>(s.rate_hz), model, s.seed);
  for (std::int64_t k = 0; k <= last; ++k) {
    const double t = static_cast<double>(k) / s.rate_hz;  // from the integer k, never accumulated
    if (truth != nullptr) {
      const Quaternion<Real> q = motion.attitude(static_cast<Real>(t));
      write_csv_row(truth,
                    std::array<double, 5>{t, static_cast<double>(q.w), static_cast<double>(q.x),
                                          static_cast<double>(q.y), static_cast<double>(q.z)},
                    17);
    }
    const Vector3<Real> w = motion.rate(static_cast<Real>(t));
    const auto magnitude = static_cast<double>(norm(w));
    if (magnitude > peak.rad_s) peak = PeakRate{magnitude, t};
    Vector3<Real> v = w;
    if (s.delta) {
      if (k == 0) continue;
      v = truth_delta_angle(motion, static_cast<Real>(previous_t), static_cast<Real>(t));
    }
    previous_t = t;
    if (s.has_errors) {
      v += sensor.next();
    }
    write_csv_row(log,
                  std::array<double, 4>{t, static_cast<double>(v.x), static_cast<double>(v.y),
                                        static_cast<double>(v.z)},
                  17);
    if (std::ferror(log) != 0) return false;
  }
  return std::ferror(log) == 0 && (truth == nullptr || std::ferror(truth) == 0);
}

// A motion part's option (--turn, --turn-deg, --coning, --vibration) with its value; false if
// `a` is none of them.
bool motion_part(const std::string& a, const std::string& value, Settings& s) {
  std::string error;
  if (a == "--turn" || a == "--turn-deg") {
    if (s.has_turn) usage_error(a + ": the turn is given twice (one of --turn, --turn-deg)");
    if (!tools::detail::parse_triple(value, s.turn, true)) {
      usage_error(a + " '" + value + "': expected three finite numbers X,Y,Z (" +
                  (a == "--turn" ? "rad/s" : "deg/s") + ")");
    }
    if (a == "--turn-deg") {
      for (double& r : s.turn) r /= tools::detail::degrees_per_radian;
    }
    s.has_turn = true;
  } else if (a == "--coning") {
    if (s.has_coning) usage_error("--coning is given twice");
    if (!parse_coning(value, s.coning_deg, s.coning_hz, error)) usage_error(error);
    s.has_coning = true;
  } else if (a == "--vibration") {
    VibrationOption line;
    if (!parse_vibration(value, line, error)) usage_error(error);
    if (s.vibration.size() == max_vibration_lines) {
      usage_error("--vibration: at most " + std::to_string(max_vibration_lines) + " lines");
    }
    s.vibration.push_back(line);
  } else {
    return false;
  }
  return true;
}

// A gyro-error option (--angle-random-walk[-deg], --bias-instability[-deg], --flicker-band,
// --rate-random-walk[-deg], --gyro-bias[-deg], --seed) with its value; false if `a` is none.
bool sensor_error_part(const std::string& a, const std::string& value, Settings& s) {
  const bool degrees = a.size() > 4 && a.compare(a.size() - 4, 4, "-deg") == 0;
  const std::string name = degrees ? a.substr(0, a.size() - 4) : a;
  double x = 0;
  const auto non_negative = [&]() {
    if (!tools::detail::parse_number(value, x) || x < 0) {
      usage_error(a + " '" + value + "': expected a finite number >= 0");
    }
    return x;
  };
  if (name == "--angle-random-walk") {
    non_negative();
    s.errors.noise_density = degrees ? angle_random_walk_from_degrees_per_root_hour(x) : x;
  } else if (name == "--bias-instability") {
    non_negative();
    s.errors.bias_instability = degrees ? rate_from_degrees_per_hour(x) : x;
  } else if (name == "--rate-random-walk") {
    non_negative();
    s.errors.rate_random_walk = degrees ? rate_random_walk_from_degrees_per_hour_root_hour(x) : x;
  } else if (name == "--gyro-bias") {
    std::array<double, 3> b{};
    if (!tools::detail::parse_triple(value, b, true)) {
      usage_error(a + " '" + value + "': expected three finite numbers X,Y,Z (" +
                  (degrees ? "deg/h" : "rad/s") + ")");
    }
    for (double& c : b) c = degrees ? rate_from_degrees_per_hour(c) : c;
    s.errors.bias = {b[0], b[1], b[2]};
  } else if (a == "--flicker-band") {
    std::array<double, 2> band{};
    const std::size_t comma = value.find(',');
    if (comma == std::string::npos || !parse_positive(value.substr(0, comma), band[0]) ||
        !parse_positive(value.substr(comma + 1), band[1]) || !(band[1] > band[0])) {
      usage_error("--flicker-band '" + value + "': expected LO,HI with 0 < LO < HI (s)");
    }
    s.errors.flicker_band_shortest = band[0];
    s.errors.flicker_band_longest = band[1];
    return true;  // the band alone adds no error
  } else if (a == "--seed") {
    char* end = nullptr;
    errno = 0;
    const unsigned long long seed = std::strtoull(value.c_str(), &end, 10);
    if (value.empty() || value[0] == '-' || *end != '\0' || errno != 0) {
      usage_error("--seed '" + value + "': expected a whole number >= 0");
    }
    s.seed = seed;
    return true;
  } else {
    return false;
  }
  s.has_errors = true;
  return true;
}

Settings parse_settings(int argc, char** argv) {
  Settings s;
  for (int i = 1; i < argc; ++i) {
    // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
    const std::string a = argv[i];
    if (a == "--help" || a == "-h") {
      std::fputs(help_text, stdout);
      std::exit(exit_ok);
    }
    const bool takes_value =
        a == "--motion" || a == "--form" || a == "--rate" || a == "--duration" || a == "--output" ||
        a == "--truth" || a == "--turn" || a == "--turn-deg" || a == "--coning" ||
        a == "--vibration" || a == "--seed" || a == "--flicker-band" ||
        a.rfind("--angle-random-walk", 0) == 0 || a.rfind("--bias-instability", 0) == 0 ||
        a.rfind("--rate-random-walk", 0) == 0 || a.rfind("--gyro-bias", 0) == 0;
    if (!takes_value) usage_error("unknown option or argument '" + a + "'");
    if (i + 1 >= argc) usage_error("option " + a + " needs a value");
    // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
    const std::string value = argv[++i];
    if (motion_part(a, value, s) || sensor_error_part(a, value, s)) continue;
    if (a == "--motion") {
      s.motion = value;
    } else if (a == "--form") {
      if (value != "rate" && value != "delta") usage_error("--form must be rate or delta");
      s.delta = value == "delta";
    } else if (a == "--rate") {
      if (!parse_positive(value, s.rate_hz)) usage_error("--rate needs a number > 0 (Hz)");
    } else if (a == "--duration") {
      if (!parse_positive(value, s.duration_s)) usage_error("--duration needs a number > 0 (s)");
    } else if (a == "--output") {
      s.output = value;
    } else {
      s.truth = value;
    }
  }
  const bool own = s.has_turn || s.has_coning || !s.vibration.empty();
  if (own && !s.motion.empty()) {
    usage_error("--motion " + s.motion +
                " is a fixed motion: it cannot be combined with --turn, --turn-deg, --coning or "
                "--vibration");
  }
  if (!own && s.motion.empty()) {
    usage_error("no motion: give --motion M or parts of your own (--turn, --coning, --vibration)");
  }
  if (s.output.empty()) usage_error("--output FILE is required");
  if (s.duration_s * s.rate_hz > 1e9) usage_error("more than 1e9 samples requested");
  if (!own && s.motion != "constant" && s.motion != "oscillation" && s.motion != "coning" &&
      s.motion != "body" && s.motion != "demo") {
    usage_error("unknown motion '" + s.motion + "'");
  }
  return s;
}

// Writes the log (and truth) of the motion the settings name.
bool write_motion(const Settings& s, std::FILE* log, std::FILE* truth, PeakRate& peak) {
  if (s.motion.empty()) {
    describe_user_motion(s);
    return write_log(user_motion(s), s, log, truth, peak);
  }
  if (s.motion == "constant") {
    const ConstantRateMotion<Real> m{Quaternion<Real>::identity(),
                                     Vector3<Real>{Real(0.3), Real(-0.2), Real(0.5)}};
    return write_log(m, s, log, truth, peak);
  }
  if (s.motion == "oscillation") {
    SingleAxisOscillation<Real> m;
    m.axis = Vector3<Real>{Real(1) / 3, Real(2) / 3, Real(2) / 3};
    m.amplitude = Real(0.4);
    m.frequency = Real(2);
    m.phase = Real(0.3);
    return write_log(m, s, log, truth, peak);
  }
  if (s.motion == "coning") {
    const ClassicalConingMotion<Real> m{Real(0.05), Real(2) * pi<Real> * Real(10)};
    return write_log(m, s, log, truth, peak);
  }
  if (s.motion == "body") {
    AxisymmetricBodyMotion<Real> m;
    m.transverse_inertia = Real(1);
    m.axial_inertia = Real(1.6);
    m.transverse_rate = Real(0.8);
    m.transverse_phase = Real(0.2);
    m.axial_rate = Real(3);
    return write_log(m, s, log, truth, peak);
  }
  return write_log(demo::motion<Real>(), s, log, truth, peak);
}

}  // namespace

int main(int argc, char** argv) {
  const Settings s = parse_settings(argc, argv);
  StagedOutputFile log_file;
  StagedOutputFile truth_file;
  if (!log_file.open(s.output)) {
    std::fprintf(stderr, "halfspin-gyro-log: cannot create a file beside %s: %s\n",
                 s.output.c_str(), std::strerror(errno));
    return exit_usage;
  }
  if (!s.truth.empty() && !truth_file.open(s.truth)) {
    std::fprintf(stderr, "halfspin-gyro-log: cannot create a file beside %s: %s\n", s.truth.c_str(),
                 std::strerror(errno));
    return exit_usage;  // log_file's temporary is removed by its destructor
  }
  PeakRate peak;
  const bool ok =
      write_motion(s, log_file.get(), s.truth.empty() ? nullptr : truth_file.get(), peak);
  if (!ok || !log_file.commit() || (!s.truth.empty() && !truth_file.commit())) {
    std::fprintf(stderr, "halfspin-gyro-log: write failure: %s\n", std::strerror(errno));
    return exit_failure;
  }
  std::fprintf(stderr, "peak |w| at the sample times: %.6g rad/s (%.6g deg/s) at t = %.9g s\n",
               peak.rad_s, peak.rad_s * tools::detail::degrees_per_radian, peak.at_s);
  std::fprintf(stderr, "wrote %s%s%s\n", s.output.c_str(), s.truth.empty() ? "" : " and ",
               s.truth.c_str());
  return exit_ok;
}
