// halfspin-gyro-log: writes the exact gyro log (rates or delta-angles) of one of the library's
// truth motions, and optionally its truth attitude, for halfspin-propagate. `--help` documents it
// all.
#include <array>
#include <cerrno>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>

#include "demo_scenario.hpp"
#include "gyro_log.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/truth/axisymmetric_body.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/single_axis_oscillation.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"

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

Options:
  --motion M      constant | oscillation | coning | body | demo  (required; parameters below)
  --form F        rate (default) | delta
                    rate:  header t,wx,wy,wz; rows at t = k/rate, k = 0, 1, ..., body rate (rad/s)
                    delta: header t,dx,dy,dz; rows at t = k/rate, k = 1, 2, ..., each the exact
                           integral of the body rate over ((k-1)/rate, k/rate] (rad): closed form
                           where the motion has one, else 8-point Gauss-Legendre quadrature per
                           interval (far below double rounding at these steps)
  --rate HZ       sample rate (default 1000)
  --duration S    length (s, default 10): rows up to t = duration
  --output FILE   required; the log
  --truth FILE    also write the truth attitude t,qw,qx,qy,qz (body -> reference) at every sample
                  time, t = 0 included (halfspin-propagate --truth FILE --initial truth)
  --help          this text
All numbers are written with 17 significant digits (they round-trip a double). Truth is evaluated
in long double. Files are written through temporaries in the same directory and renamed at the
end: on any error nothing is written.

Motions (all start at t = 0; invented, no real vehicle):
  constant     q(t) = exp(w t / 2), w = (0.3, -0.2, 0.5) rad/s
  oscillation  about the unit axis (1, 2, 2)/3: angle 0.4 sin(2 pi 2 t + 0.3) rad
  coning       classical coning, cone angle 0.05 rad, cone frequency 10 Hz (62.83 rad/s)
  body         torque-free axisymmetric body, I3/It = 1.6, transverse rate 0.8 rad/s at phase
               0.2 rad, axial rate 3 rad/s, q(0) = identity
  demo         the tools' demo drone: a 35 deg banked turn at 18 m/s carrying 0.02 deg, 85 Hz
               engine-vibration coning (examples/tools/common/demo_scenario.hpp)

Exit codes: 0 ok; 1 bad usage (unknown option or motion, bad value, output cannot be created);
2 write failure.

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
  if (text.empty()) return false;
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  if (end - text.c_str() != static_cast<std::ptrdiff_t>(text.size()) || !(v - v == 0.0) ||
      !(v > 0.0)) {
    return false;
  }
  out = v;
  return true;
}

struct Settings {
  bool delta = false;
  double rate_hz = 1000.0;
  double duration_s = 10.0;
};

template <class Motion>
bool write_log(const Motion& motion, const Settings& s, std::FILE* log, std::FILE* truth) {
  std::fprintf(log, "%s\n",
               gyro_log_header(s.delta ? GyroLogForm::delta_angle : GyroLogForm::rate));
  if (truth != nullptr) std::fprintf(truth, "%s\n", attitude_csv_header);
  // Last index: the largest k with k/rate <= duration (a relative 1e-12 slack absorbs the
  // rounding of duration*rate, e.g. 0.3 s at 10 Hz).
  const auto last = static_cast<std::int64_t>(std::floor(s.duration_s * s.rate_hz * (1.0 + 1e-12)));
  double previous_t = 0.0;
  for (std::int64_t k = 0; k <= last; ++k) {
    const double t = static_cast<double>(k) / s.rate_hz;  // from the integer k, never accumulated
    if (truth != nullptr) {
      const Quaternion<Real> q = motion.attitude(static_cast<Real>(t));
      write_csv_row(truth,
                    std::array<double, 5>{t, static_cast<double>(q.w), static_cast<double>(q.x),
                                          static_cast<double>(q.y), static_cast<double>(q.z)},
                    17);
    }
    Vector3<Real> v;
    if (s.delta) {
      if (k == 0) continue;
      v = truth_delta_angle(motion, static_cast<Real>(previous_t), static_cast<Real>(t));
    } else {
      v = motion.rate(static_cast<Real>(t));
    }
    previous_t = t;
    write_csv_row(log,
                  std::array<double, 4>{t, static_cast<double>(v.x), static_cast<double>(v.y),
                                        static_cast<double>(v.z)},
                  17);
    if (std::ferror(log) != 0) return false;
  }
  return std::ferror(log) == 0 && (truth == nullptr || std::ferror(truth) == 0);
}

}  // namespace

int main(int argc, char** argv) {
  Settings s;
  std::string motion;
  std::string output;
  std::string truth_path;
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
    } else if (a == "--motion") {
      motion = value();
    } else if (a == "--form") {
      const std::string f = value();
      if (f == "rate")
        s.delta = false;
      else if (f == "delta")
        s.delta = true;
      else
        usage_error("--form must be rate or delta");
    } else if (a == "--rate") {
      if (!parse_positive(value(), s.rate_hz)) usage_error("--rate needs a number > 0 (Hz)");
    } else if (a == "--duration") {
      if (!parse_positive(value(), s.duration_s)) usage_error("--duration needs a number > 0 (s)");
    } else if (a == "--output") {
      output = value();
    } else if (a == "--truth") {
      truth_path = value();
    } else {
      usage_error("unknown option or argument '" + a + "'");
    }
  }
  if (motion.empty()) usage_error("--motion is required");
  if (output.empty()) usage_error("--output FILE is required");
  if (s.duration_s * s.rate_hz > 1e9) usage_error("more than 1e9 samples requested");
  if (motion != "constant" && motion != "oscillation" && motion != "coning" && motion != "body" &&
      motion != "demo") {
    usage_error("unknown motion '" + motion + "'");
  }

  StagedOutputFile log_file;
  StagedOutputFile truth_file;
  if (!log_file.open(output)) {
    std::fprintf(stderr, "halfspin-gyro-log: cannot create a file beside %s: %s\n", output.c_str(),
                 std::strerror(errno));
    return exit_usage;
  }
  if (!truth_path.empty() && !truth_file.open(truth_path)) {
    std::fprintf(stderr, "halfspin-gyro-log: cannot create a file beside %s: %s\n",
                 truth_path.c_str(), std::strerror(errno));
    return exit_usage;  // log_file's temporary is removed by its destructor
  }
  std::FILE* t = truth_path.empty() ? nullptr : truth_file.get();

  bool ok = false;
  if (motion == "constant") {
    const ConstantRateMotion<Real> m{Quaternion<Real>::identity(),
                                     Vector3<Real>{Real(0.3), Real(-0.2), Real(0.5)}};
    ok = write_log(m, s, log_file.get(), t);
  } else if (motion == "oscillation") {
    SingleAxisOscillation<Real> m;
    m.axis = Vector3<Real>{Real(1) / 3, Real(2) / 3, Real(2) / 3};
    m.amplitude = Real(0.4);
    m.frequency = Real(2);
    m.phase = Real(0.3);
    ok = write_log(m, s, log_file.get(), t);
  } else if (motion == "coning") {
    const ClassicalConingMotion<Real> m{Real(0.05), Real(2) * pi<Real> * Real(10)};
    ok = write_log(m, s, log_file.get(), t);
  } else if (motion == "body") {
    AxisymmetricBodyMotion<Real> m;
    m.transverse_inertia = Real(1);
    m.axial_inertia = Real(1.6);
    m.transverse_rate = Real(0.8);
    m.transverse_phase = Real(0.2);
    m.axial_rate = Real(3);
    ok = write_log(m, s, log_file.get(), t);
  } else {
    ok = write_log(demo::motion<Real>(), s, log_file.get(), t);
  }
  if (!ok || !log_file.commit() || (!truth_path.empty() && !truth_file.commit())) {
    std::fprintf(stderr, "halfspin-gyro-log: write failure: %s\n", std::strerror(errno));
    return exit_failure;
  }
  std::fprintf(stderr, "wrote %s%s%s\n", output.c_str(), truth_path.empty() ? "" : " and ",
               truth_path.c_str());
  return exit_ok;
}
