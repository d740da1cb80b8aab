// halfspin-gyro-log making the user's motion and halfspin-propagate on real-looking logs (issue 16,
// items 5 and 6), run as a user would (tool_runner.hpp). Each check names its outside source.
#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "tool_runner.hpp"

namespace {

using namespace halfspin::test::tools;
using LD = long double;

constexpr LD pi_ld = 3.141592653589793238462643383279502884L;

// The engineer's motion (invented values): a turn near 3 rad/s carrying a 120 Hz vibration line of
// angle amplitude 0.01 rad on body z, phase 0.3 rad, gyro at 2 kHz.
constexpr std::array<LD, 3> turn{0.625L, -2.125L, 2.0L};  // rad/s
constexpr LD line_hz = 120;
constexpr LD line_angle = 0.01L;  // rad
constexpr LD line_phase = 0.3L;   // rad

// halfspin-gyro-log's arguments for that motion over `duration` (s) in `form`, the log and its
// truth written to dir/<form>.csv and dir/truth.csv.
std::vector<std::string> engineer_log_args(const fs::path& dir, const char* duration,
                                           const char* form) {
  return {
      "--turn",      "0.625,-2.125,2",
      "--vibration", "120:0,0,0.01:rad:0,0," + g17(static_cast<double>(line_phase * 180 / pi_ld)),
      "--rate",      "2000",
      "--duration",  duration,
      "--form",      form,
      "--output",    (dir / (std::string(form) + ".csv")).string(),
      "--truth",     (dir / "truth.csv").string()};
}

// Closed form of that motion, written out here from the addition of angular velocities and the
// rotation about a fixed axis (common practice, no source): the body turns by θ(t) =
// a sin(Ωt + φ) about its z axis relative to the turning frame, so q(t) = exp(c t/2) ⊗
// (cos θ/2, 0, 0, sin θ/2) and ω(t) = R_z(θ)ᵀ c + θ̇ ẑ.
Quaternion<LD> engineer_attitude(LD t) {
  const LD theta = line_angle * std::sin(2 * pi_ld * line_hz * t + line_phase);
  const Quaternion<LD> q_turn = constant_rate_attitude(Quaternion<LD>::identity(), turn, t);
  return q_turn * Quaternion<LD>{std::cos(theta / 2), 0, 0, std::sin(theta / 2)};
}
std::array<LD, 3> engineer_rate(LD t) {
  const LD w = 2 * pi_ld * line_hz;
  const LD theta = line_angle * std::sin(w * t + line_phase);
  const LD theta_rate = line_angle * w * std::cos(w * t + line_phase);
  const LD c = std::cos(theta), s = std::sin(theta);
  return {c * turn[0] + s * turn[1], -s * turn[0] + c * turn[1], turn[2] + theta_rate};
}

// The library's a-priori description of that motion, for its horizon bound. Decompose the rate
// as ω = m(t) + θ̇ ẑ: θ̇ ẑ is exactly the vibration line (VibrationLine, phase φ on z), and
// m(t) = R_z(θ)ᵀ c keeps |m| = |c| (D0) while its x–y part is |c_xy|·e^{−iθ(t)}. By Faà di Bruno's
// formula (common practice, no source) the k-th derivative of e^{−iθ(t)} is a sum over the
// partitions of k derivatives into m blocks, each block of size j contributing |θ⁽ʲ⁾| ≤ aΩʲ, so
// |dᵏ e^{−iθ}/dtᵏ| ≤ Ωᵏ Σ_{m=1..k} S(k, m) aᵐ, S the Stirling numbers of the second kind (the
// number of such partitions; recurrence S(n, k) = k S(n−1, k) + S(n−1, k−1), common practice, no
// source). Hence D_k(m) ≤ |c_xy| Ωᵏ Σ_m S(k, m) aᵐ for k = 1..5.
halfspin::MotionDescription<double> engineer_description() {
  const double a = static_cast<double>(line_angle);
  const double w = static_cast<double>(2 * pi_ld * line_hz);
  const double c_xy = std::hypot(static_cast<double>(turn[0]), static_cast<double>(turn[1]));
  std::array<std::array<double, 6>, 6> stirling{};
  stirling[0][0] = 1;
  for (std::size_t n = 1; n < 6; ++n) {
    for (std::size_t k = 1; k <= n; ++k) {
      stirling[n][k] = static_cast<double>(k) * stirling[n - 1][k] + stirling[n - 1][k - 1];
    }
  }
  halfspin::MotionDescription<double> d{};
  d.maneuver.derivative[0] = std::sqrt(c_xy * c_xy + static_cast<double>(turn[2] * turn[2]));
  for (std::size_t k = 1; k < 6; ++k) {
    double sum = 0;
    for (std::size_t m = 1; m <= k; ++m)
      sum += stirling[k][m] * std::pow(a, static_cast<double>(m));
    d.maneuver.derivative[k] = c_xy * std::pow(w, static_cast<double>(k)) * sum;
  }
  d.vibration.add(
      halfspin::VibrationLine<double>::from_angle_amplitude(static_cast<double>(line_hz),
                                                            halfspin::Vector3<double>{0, 0, a})
          .with_phases(halfspin::Vector3<double>{0, 0, static_cast<double>(line_phase)}));
  return d;
}

}  // namespace

TEST_CASE("gyro-log makes a turn with a 120 Hz line: rates and truth match the closed form",
          "[tools]") {
  const fs::path dir = work_dir("engineer_rates");
  const Run r = gyro_log(engineer_log_args(dir, "0.25", "rate"), dir);
  INFO(r.err);
  REQUIRE(r.code == 0);
  // The motion as understood: the line's rate amplitude is 2π·120·0.01 = 7.5398 rad/s.
  CHECK(r.err.find("vibration 120 Hz: angle amplitude (0, 0, 0.01) rad, rate amplitude (0, 0, "
                   "7.53982) rad/s, phases (0, 0, 17.1887) deg") != std::string::npos);
  const Csv log = read_csv(dir / "rate.csv");
  const Csv truth = read_csv(dir / "truth.csv");
  REQUIRE(log.rows.size() == 501u);
  REQUIRE(truth.rows.size() == 501u);
  double worst_rate = 0;
  double worst_attitude = 0;
  double peak = 0;
  for (std::size_t i = 0; i < log.rows.size(); ++i) {
    const LD t = static_cast<LD>(log.rows[i][0]);
    CHECK(log.rows[i][0] == static_cast<double>(i) / 2000.0);
    const std::array<LD, 3> w = engineer_rate(t);
    for (std::size_t a = 0; a < 3; ++a) {
      worst_rate = std::fmax(
          worst_rate, std::fabs(static_cast<double>(static_cast<LD>(log.rows[i][a + 1]) - w[a])));
    }
    peak = std::fmax(peak, static_cast<double>(std::sqrt(w[0] * w[0] + w[1] * w[1] + w[2] * w[2])));
    const Quaternion<LD> q = engineer_attitude(t);
    worst_attitude = std::fmax(
        worst_attitude, halfspin::angle_between(
                            Quaternion<double>{static_cast<double>(q.w), static_cast<double>(q.x),
                                               static_cast<double>(q.y), static_cast<double>(q.z)},
                            row_quaternion(truth.rows[i])));
  }
  INFO("worst rate " << worst_rate << " rad/s, worst attitude " << worst_attitude << " rad");
  CHECK(worst_rate < 1e-14);      // |ω| ≤ 10 rad/s written to 17 digits
  CHECK(worst_attitude < 1e-15);  // phases ≤ 190 rad in long double, written to 17 digits
  // The closing line reports the peak |ω| over the sample times in rad/s and deg/s.
  CHECK(std::fabs(number_after(r.err, "peak |w| at the sample times: ") - peak) < 1e-5 * peak);
}

TEST_CASE(
    "the engineer's question: a turn with a 120 Hz line at 2 kHz, delta-angles, propagated "
    "within the library's bound",
    "[tools]") {
  const fs::path dir = work_dir("engineer_delta");
  REQUIRE(gyro_log(engineer_log_args(dir, "1", "delta"), dir).code == 0);
  const halfspin::MotionDescription<double> d = engineer_description();
  struct Case {
    const char* scalar;
    double bound;
    double measured;  // max error measured when this test was written (rad)
  };
  // coning_2_sample steps every 2 samples, 1 ms; horizon 1 s. Float uses the compensated
  // accumulation (its default), double the plain one.
  const Case cases[] = {
      {"double",
       halfspin::horizon_error_bound<halfspin::Coning2Sample, double, halfspin::PlainAccumulation>(
           d, 1e-3, 1.0),
       9.8e-8},
      {"float",
       static_cast<double>(halfspin::horizon_error_bound<halfspin::Coning2Sample, float,
                                                         halfspin::CompensatedAccumulation>(
           d.converted<float>(), 1e-3f, 1.0)),
       8.0e-8}};
  for (const Case& c : cases) {
    INFO(c.scalar);
    const Run r = propagate({(dir / "delta.csv").string(), "--method", "coning_2_sample",
                             "--scalar", c.scalar, "--truth", (dir / "truth.csv").string(),
                             "--initial", "truth", "--output", (dir / "out.csv").string()},
                            dir);
    INFO(r.err);
    REQUIRE(r.code == 0);
    const double error = number_after(r.err, "attitude error vs truth: max ");
    INFO("max error " << error << " rad, library bound " << c.bound << " rad");
    CHECK(error <= c.bound);
    CHECK(error < 4 * c.measured);  // regression guard: 9.8e-8 rad measured in double, 2.3e-7 float
    // The summary's peak |ω| and angle: a delta-angle row's |Δθ|/dt is the mean rate over the
    // interval, at most the peak of the closed form (≤ |c| + aΩ) and close to it.
    const double peak = number_after(r.err, "peak |w|: ");
    CHECK(peak <= 2.962 + 7.54);
    CHECK(peak > 9.5);
    const double angle = number_after(r.err, "total angle traversed: ");
    CHECK(angle > 2.96);  // at least |∫ω| of the turn alone, 2.96 rad over 1 s
    CHECK(angle < 10.5);  // at most the peak times 1 s
  }
}

TEST_CASE("gyro-log options: units, phases and parts as the help says, bad values exit 1",
          "[tools]") {
  const fs::path dir = work_dir("gyro_log_options");
  const std::string out = (dir / "log.csv").string();
  SECTION("a line in deg/s with a phase, a turn in deg/s, a line in deg: closed-form rates") {
    // One line on z under a turn about z: θ ∥ ẑ, so ω = (0, 0, turn + A cos(2π f t + P)) exactly
    // (rotations about one axis add; common practice, no source), A the rate amplitude (the
    // help): at t = 0, 90 deg/s + 2 deg/s·cos 60° = 91 deg/s.
    REQUIRE(gyro_log({"--turn-deg", "0,0,90", "--vibration", "50:0,0,2:deg/s:0,0,60", "--rate",
                      "1000", "--duration", "0.01", "--output", out},
                     dir)
                .code == 0);
    Csv log = read_csv(out);
    REQUIRE(log.rows.size() == 11u);
    const double deg = static_cast<double>(pi_ld / 180);
    const double w = 2 * static_cast<double>(pi_ld) * 50;
    for (const auto& row : log.rows) {
      CHECK(row[1] == 0.0);
      CHECK(row[2] == 0.0);
      CHECK(row[3] == Approx((90 + 2 * std::cos(w * row[0] + 60 * deg)) * deg).epsilon(1e-13));
    }
    // An angle amplitude in deg on y alone, phase 0: ω_y = 2π f·0.5 deg·cos(2π f t).
    REQUIRE(gyro_log({"--vibration", "50:0,0.5,0:deg", "--rate", "1000", "--duration", "0.01",
                      "--output", out},
                     dir)
                .code == 0);
    log = read_csv(out);
    for (const auto& row : log.rows) {
      CHECK(row[2] == Approx(w * 0.5 * deg * std::cos(w * row[0])).margin(1e-15));
    }
  }
  SECTION("coning alone is the classical coning of its half-angle") {
    // ω(0) = (−Ω(1 − cos a), 0, Ω sin a) (truth/classical_coning.hpp's documented closed form;
    // common practice, no source): half-angle 2 deg at 10 Hz.
    REQUIRE(gyro_log({"--coning", "2,10", "--duration", "0.01", "--output", out}, dir).code == 0);
    const Csv log = read_csv(out);
    const double a = 2 * static_cast<double>(pi_ld) / 180, w = 20 * static_cast<double>(pi_ld);
    CHECK(log.rows[0][1] == Approx(-w * (1 - std::cos(a))).epsilon(1e-12));
    CHECK(log.rows[0][2] == Approx(0.0).margin(1e-15));
    CHECK(log.rows[0][3] == Approx(w * std::sin(a)).epsilon(1e-12));
  }
  SECTION("malformed values and combinations exit 1 with a message and write nothing") {
    struct Bad {
      std::vector<std::string> args;
      const char* message;
    };
    const std::vector<Bad> bad{
        {{"--turn", "1,2"}, "--turn '1,2': expected three finite numbers X,Y,Z (rad/s)"},
        {{"--turn", "1,2,x"}, "expected three finite numbers"},
        {{"--turn-deg", "1,2,inf"}, "(deg/s)"},
        {{"--turn", "1,2,3", "--turn-deg", "1,2,3"}, "the turn is given twice"},
        {{"--coning", "0,10"}, "--coning takes DEG,HZ"},
        {{"--coning", "95,10"}, "half-angle in (0, 90) deg"},
        {{"--coning", "2,10", "--coning", "2,10"}, "--coning is given twice"},
        {{"--vibration", "120:0,0,0.01"}, "expected HZ:X,Y,Z:UNIT"},
        {{"--vibration", "0:0,0,0.01:rad"}, "the frequency '0' is not a positive"},
        {{"--vibration", "120:0,0,-1:rad"}, "not three non-negative finite numbers"},
        {{"--vibration", "120:0,0,0:rad"}, "every amplitude is zero"},
        {{"--vibration", "120:0,0,1:grad"}, "the unit 'grad' is not one of"},
        {{"--vibration", "120:0,0,1:rad:0,0"}, "the phases '0,0' are not three finite numbers"},
        {{"--vibration", "1:1,0,0:rad", "--vibration", "2:1,0,0:rad", "--vibration", "3:1,0,0:rad",
          "--vibration", "4:1,0,0:rad", "--vibration", "5:1,0,0:rad"},
         "at most 4 lines"},
        {{"--motion", "demo", "--turn", "1,0,0"}, "--motion demo is a fixed motion"},
        {{"--rate", "100"}, "no motion: give --motion M or parts of your own"},
        {{"--turn"}, "option --turn needs a value"},
    };
    for (const Bad& b : bad) {
      std::vector<std::string> args = b.args;
      if (args.back() != "--turn") {
        args.emplace_back("--output");
        args.push_back(out);
      }
      INFO(args.front() << " " << b.message);
      const Run r = gyro_log(args, dir);
      INFO(r.err);
      CHECK(r.code == 1);
      CHECK(r.err.find(b.message) != std::string::npos);
      CHECK(files_starting_with(dir, "log.csv") == 0);
    }
  }
}

namespace {

// A constant-rate log (ω = (0.3, −0.4, 1.2) rad/s, |ω| = 1.3 rad/s, invented) at 100 Hz over
// 0.5 s, in the given units, with the given header and an extra column where the header has one.
struct LogSpec {
  std::string header = "t,wx,wy,wz";
  double time_scale = 1;  // log time unit per second
  double rate_scale = 1;  // log rate unit per rad/s
  bool temperature = false;
  bool temperature_first = false;
};

void write_constant_log(const fs::path& p, const LogSpec& spec) {
  std::vector<std::string> lines{spec.header};
  for (int k = 0; k <= 50; ++k) {
    const std::string t = g17(k * 0.01 * spec.time_scale);
    const std::string w = g17(0.3 * spec.rate_scale) + "," + g17(-0.4 * spec.rate_scale) + "," +
                          g17(1.2 * spec.rate_scale);
    if (spec.temperature_first) {
      lines.push_back(g17(20.5 + k * 0.01) + "," + w + "," + t);
    } else {
      lines.push_back(t + "," + w + (spec.temperature ? ",21.25" : ""));
    }
  }
  write_lines(p, lines);
}

}  // namespace

TEST_CASE("real logs: extra and reordered columns, mapped names, units, and the deg/s note",
          "[tools]") {
  const fs::path dir = work_dir("real_logs");
  const std::string out = (dir / "out.csv").string();
  write_constant_log(dir / "plain.csv", LogSpec{});
  REQUIRE(
      propagate({(dir / "plain.csv").string(), "--output", (dir / "plain_out.csv").string()}, dir)
          .code == 0);
  const std::string plain = slurp(dir / "plain_out.csv");
  SECTION("an extra column is ignored with a note naming it; the output is bit-identical") {
    LogSpec spec;
    spec.header = "t,wx,wy,wz,temp_c";
    spec.temperature = true;
    write_constant_log(dir / "extra.csv", spec);
    const Run r = propagate({(dir / "extra.csv").string(), "--output", out}, dir);
    INFO(r.err);
    REQUIRE(r.code == 0);
    CHECK(r.err.find("extra.csv:1: note: column 5 'temp_c' not used (ignored in every row)") !=
          std::string::npos);
    CHECK(slurp(out) == plain);
  }
  SECTION("reordered columns among others, mapped by name, in us and deg/s") {
    LogSpec spec;
    spec.header = "temperature, gyro_x ,gyro_y,gyro_z,time_us";
    spec.temperature_first = true;
    spec.time_scale = 1e6;
    spec.rate_scale = 180 / static_cast<double>(pi_ld);
    write_constant_log(dir / "mapped.csv", spec);
    const Run r = propagate(
        {(dir / "mapped.csv").string(), "--columns", "t=time_us,x=gyro_x,y=gyro_y,z=gyro_z",
         "--form", "rate", "--time-unit", "us", "--rate-unit", "deg/s", "--output", out},
        dir);
    INFO(r.err);
    REQUIRE(r.code == 0);
    CHECK(r.err.find("column 1 'temperature' not used") != std::string::npos);
    // Same motion as the plain log: the final attitude agrees to rounding of the unit changes.
    const Csv a = read_csv(out);
    const Csv b = read_csv(dir / "plain_out.csv");
    REQUIRE(a.rows.size() == b.rows.size());
    CHECK(a.rows.back()[0] == b.rows.back()[0]);  // integer µs / 1e6: the same seconds
    CHECK(halfspin::angle_between(row_quaternion(a.rows.back()), row_quaternion(b.rows.back())) <
          1e-14);
    // Peak and total angle in rad/s and rad: |ω| = 1.3 rad/s over 0.5 s is 0.65 rad (constant
    // rate, the trapezoid rule is exact).
    CHECK(number_after(r.err, "peak |w|: ") == Approx(1.3).epsilon(1e-12));
    CHECK(number_after(r.err, "total angle traversed: ") == Approx(0.65).epsilon(1e-12));
    CHECK(r.err.find("note: peak |w|") == std::string::npos);
  }
  SECTION("a deg/s log read as rad/s: the summary shows it, with a note naming the fix") {
    LogSpec spec;
    spec.rate_scale = 180 / static_cast<double>(pi_ld);  // |ω| = 74.5 deg/s
    write_constant_log(dir / "degrees.csv", spec);
    const Run r = propagate({(dir / "degrees.csv").string(), "--output", out}, dir);
    INFO(r.err);
    REQUIRE(r.code == 0);  // a note, not a rejection
    CHECK(number_after(r.err, "peak |w|: ") == Approx(74.48451).epsilon(1e-6));
    const double per_rad = 180 / static_cast<double>(pi_ld);  // the log's numbers read as rad/s
    CHECK(number_after(r.err, "peak |w|: 74.4845 rad/s (") ==
          Approx(1.3 * per_rad * per_rad).epsilon(1e-5));
    CHECK(r.err.find("note: peak |w| 74.4845 rad/s is above 35 rad/s (2000 deg/s, the largest "
                     "full scale of common MEMS gyros): if " +
                     (dir / "degrees.csv").string() +
                     " holds degrees per second, give --rate-unit deg/s") != std::string::npos);
    const Run fixed =
        propagate({(dir / "degrees.csv").string(), "--rate-unit", "deg/s", "--output", out}, dir);
    CHECK(fixed.err.find("note: peak") == std::string::npos);
    CHECK(number_after(fixed.err, "peak |w|: ") == Approx(1.3).epsilon(1e-12));
  }
  SECTION("time in ms: intervals from differences of the stamps") {
    LogSpec spec;
    spec.time_scale = 1e3;
    write_constant_log(dir / "ms.csv", spec);
    const Run r = propagate({(dir / "ms.csv").string(), "--time-unit", "ms", "--output", out}, dir);
    REQUIRE(r.code == 0);
    const Csv a = read_csv(out);
    const Csv b = read_csv(dir / "plain_out.csv");
    CHECK(halfspin::angle_between(row_quaternion(a.rows.back()), row_quaternion(b.rows.back())) <
          1e-14);
  }
}

TEST_CASE("delta-angle logs: a zero first row at the start time is the log's start", "[tools]") {
  const fs::path dir = work_dir("zero_first_row");
  const std::string out = (dir / "out.csv").string();
  std::vector<std::string> rows;
  for (int k = 1; k <= 40; ++k) rows.push_back(g17(k * 0.005) + ",0.001,-0.002,0.0005");
  std::vector<std::string> plain{"t,dx,dy,dz"};
  plain.insert(plain.end(), rows.begin(), rows.end());
  write_lines(dir / "plain.csv", plain);
  std::vector<std::string> zero{"t,dx,dy,dz", "0,0,0,0"};
  zero.insert(zero.end(), rows.begin(), rows.end());
  write_lines(dir / "zero.csv", zero);
  REQUIRE(
      propagate({(dir / "plain.csv").string(), "--output", (dir / "plain_out.csv").string()}, dir)
          .code == 0);
  const Run r = propagate({(dir / "zero.csv").string(), "--output", out}, dir);
  INFO(r.err);
  REQUIRE(r.code == 0);
  CHECK(r.err.find("note: " + (dir / "zero.csv").string() +
                   ":2: the zero delta-angle row at --start-time 0 s is the log's start") !=
        std::string::npos);
  // An empty interval holds no rotation: the same steps and attitudes as without the row.
  CHECK(slurp(out) == slurp(dir / "plain_out.csv"));
  SECTION("at a --start-time of its own, in ms") {
    std::vector<std::string> ms{"t,dx,dy,dz", "1500,0,0,0", "1505,0.001,0,0", "1510,0.001,0,0"};
    write_lines(dir / "ms.csv", ms);
    const Run m = propagate(
        {(dir / "ms.csv").string(), "--time-unit", "ms", "--start-time", "1.5", "--output", out},
        dir);
    INFO(m.err);
    CHECK(m.code == 0);
    CHECK(m.err.find("ms.csv:2: the zero delta-angle row at --start-time 1.5 s") !=
          std::string::npos);
    // Without --start-time the interval from 0 to 1.5 s is a (zero) sample, not the start: the
    // default gap limit then comes from that 1.5 s interval, and no note is printed.
    const Run n = propagate({(dir / "ms.csv").string(), "--time-unit", "ms", "--output", out}, dir);
    CHECK(n.code == 0);
    CHECK(n.err.find("log's start") == std::string::npos);
  }
}

TEST_CASE("real-log options: malformed values and mismatches exit 1 or 2 with a message",
          "[tools]") {
  const fs::path dir = work_dir("real_log_options");
  const std::string out = (dir / "out.csv").string();
  write_lines(dir / "rate.csv", {"t,wx,wy,wz", "0,0.1,0,0", "0.01,0.1,0,0", "0.02,0.1,0,0"});
  write_lines(dir / "delta.csv", {"t,dx,dy,dz", "0.01,0.001,0,0", "0.02,0.001,0,0"});
  write_lines(dir / "both.csv", {"t,wx,wy,wz,dx,dy,dz", "0,0.1,0,0,0,0,0"});
  write_lines(dir / "named.csv", {"time,gx,gy,gz,gx", "0,0.1,0,0,0"});
  struct Bad {
    std::vector<std::string> args;
    int code;
    const char* message;
  };
  const std::string rate = (dir / "rate.csv").string();
  const std::string delta = (dir / "delta.csv").string();
  const std::vector<Bad> bad{
      {{rate, "--columns", "q=a"}, 1, "'q=a' is not ROLE=NAME with ROLE one of t, x, y, z"},
      {{rate, "--columns", "t="}, 1, "'t=' is not ROLE=NAME"},
      {{rate, "--columns", "tx=a"}, 1, "'tx=a' is not ROLE=NAME"},
      {{rate, "--columns", "t=a,t=b"}, 1, "t is mapped twice"},
      {{rate, "--form", "rates"}, 1, "--form must be rate or delta"},
      {{rate, "--time-unit", "min"}, 1, "--time-unit must be s, ms or us"},
      {{rate, "--rate-unit", "rpm"}, 1, "--rate-unit must be rad/s or deg/s"},
      {{rate, "--angle-unit", "grad"}, 1, "--angle-unit must be rad or deg"},
      {{delta, "--rate-unit", "deg/s"}, 1, "--rate-unit applies to rate logs, but"},
      {{rate, "--angle-unit", "deg"}, 1, "--angle-unit applies to delta-angle logs, but"},
      {{rate, "--form", "delta"},
       2,
       "rate.csv:1: header has no column 'dx' for x of the delta-angle form (--columns x=NAME maps "
       "another)"},
      {{rate, "--columns", "t=time"}, 2, "header has no column 'time' for t (--columns t=time)"},
      {{(dir / "both.csv").string()}, 2, "header has both rate columns wx,wy,wz and delta-angle"},
      {{(dir / "named.csv").string(), "--columns", "t=time,x=gx,y=gy,z=gz"},
       2,
       "names that do not say rates or delta-angles: give --form rate or --form delta"},
      {{(dir / "named.csv").string(), "--columns", "t=time,x=gx,y=gy,z=gz", "--form", "rate"},
       2,
       "header names column 'gx' (for x (--columns x=gx)) more than once (columns 2 and 5)"},
      {{(dir / "named.csv").string(), "--columns", "t=time,x=gy,y=gy,z=gz", "--form", "rate"},
       2,
       "--columns maps x and y to the same column 'gy'"},
  };
  for (const Bad& b : bad) {
    std::vector<std::string> args = b.args;
    args.emplace_back("--output");
    args.push_back(out);
    INFO(b.message);
    const Run r = propagate(args, dir);
    INFO(r.err);
    CHECK(r.code == b.code);
    CHECK(r.err.find(b.message) != std::string::npos);
    CHECK(files_starting_with(dir, "out.csv") == 0);
  }
}

TEST_CASE("the help documents the new options, the notes and the threshold", "[tools]") {
  const fs::path dir = work_dir("real_log_help");
  {
    const fs::path help = dir / "help.txt";
    REQUIRE(std::system(
                ("'" + std::string(HALFSPIN_PROPAGATE_EXE) + "' --help > '" + help.string() + "'")
                    .c_str()) == 0);
    const std::string text = slurp(help);
    for (const char* s :
         {"--columns t=NAME,x=NAME,y=NAME,z=NAME", "--form rate|delta", "--time-unit s|ms|us",
          "--rate-unit rad/s|deg/s", "--angle-unit rad|deg", "35 rad/s (2000 deg/s)", "log's start",
          "peak |w|", "total angle traversed", "hardware-in-the-loop"}) {
      INFO(s);
      CHECK(text.find(s) != std::string::npos);
    }
    REQUIRE(std::system(
                ("'" + std::string(HALFSPIN_GYRO_LOG_EXE) + "' --help > '" + help.string() + "'")
                    .c_str()) == 0);
    const std::string g = slurp(help);
    for (const char* s :
         {"--turn X,Y,Z", "--turn-deg X,Y,Z", "--coning DEG,HZ",
          "--vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ]", "angle amplitude", "hardware-in-the-loop"}) {
      INFO(s);
      CHECK(g.find(s) != std::string::npos);
    }
  }
}

TEST_CASE("an output that is not a regular file (a named pipe) is written in place, not replaced",
          "[tools]") {
  // Writing through a temporary and renaming it over the destination keeps a half-written file
  // from ever appearing under the destination's name; but renaming over a device or a pipe
  // (/dev/null, a FIFO a plotting process reads) would replace it with a regular file. A FIFO in
  // the work directory stands in for both (POSIX mkfifo; a background cat drains it).
  using namespace halfspin::test::tools;
  const fs::path dir = work_dir("fifo_output");
  const fs::path log = dir / "log.csv";
  REQUIRE(
      gyro_log({"--motion", "constant", "--duration", "0.1", "--output", log.string()}, dir).code ==
      0);
  for (const char* tool : {"propagate", "gyro-log"}) {
    INFO(tool);
    const fs::path fifo = dir / (std::string(tool) + ".fifo");
    const fs::path drained = dir / (std::string(tool) + ".drained");
    REQUIRE(std::system(("mkfifo '" + fifo.string() + "'").c_str()) == 0);
    // Bounded (coreutils timeout) and detached from the test's output: if the tool replaced the
    // pipe, nothing ever writes to it and the cat must not outlive the test.
    REQUIRE(std::system(("timeout 10 cat '" + fifo.string() + "' > '" + drained.string() +
                         "' 2>/dev/null </dev/null &")
                            .c_str()) == 0);
    const Run r =
        std::string(tool) == "propagate"
            ? propagate({log.string(), "--output", fifo.string()}, dir)
            : gyro_log({"--motion", "constant", "--duration", "0.1", "--output", fifo.string()},
                       dir);
    CHECK(r.code == 0);
    CHECK(fs::is_fifo(fs::symlink_status(fifo)));  // still the pipe, not a regular file
    // The reader got the whole output: wait (bounded) for cat to finish, then read its copy.
    for (int i = 0; i < 200 && slurp(drained).find('\n') == std::string::npos; ++i) {
      REQUIRE(std::system("sleep 0.01") == 0);
    }
    CHECK(slurp(drained).rfind("t,", 0) == 0);  // the CSV header arrived first
  }
}

TEST_CASE("gyro-log adds a gyro's own errors: bias, white noise, seeded, and the truth stays exact",
          "[tools]") {
  // The errors are SyntheticGyro's (include/halfspin/truth/synthetic_gyro.hpp, checked against
  // IEEE Std 952-1997 Annex C in tests/truth/); here: that the tool adds them to the exact samples
  // and leaves the truth alone. Turn (0.3, -0.2, 0.5) rad/s, 1 kHz, 10 s.
  const fs::path dir = work_dir("gyro_errors");
  const std::vector<std::string> turn_args{"--turn", "0.3,-0.2,0.5", "--rate",
                                           "1000",   "--duration",   "10"};
  const auto make = [&](const std::string& name, std::vector<std::string> extra,
                        const std::string& form = "rate") {
    std::vector<std::string> args = turn_args;
    args.insert(args.end(), {"--form", form, "--output", (dir / (name + ".csv")).string(),
                             "--truth", (dir / (name + "_truth.csv")).string()});
    args.insert(args.end(), extra.begin(), extra.end());
    const Run r = gyro_log(args, dir);
    INFO(name << ": " << r.err);
    REQUIRE(r.code == 0);
    return read_csv(dir / (name + ".csv"));
  };
  const Csv clean = make("clean", {});
  // A constant bias in deg/h (common practice, no source: 1 deg/h = pi/180/3600 rad/s): every
  // sample is the exact one plus the bias, to the rounding of the written values.
  const Csv biased = make("biased", {"--gyro-bias-deg", "36,-18,0"});
  const double deg_per_hour = std::acos(-1.0) / 180 / 3600;
  const std::array<double, 3> bias{36 * deg_per_hour, -18 * deg_per_hour, 0};
  REQUIRE(biased.rows.size() == clean.rows.size());
  double worst = 0;
  for (std::size_t i = 0; i < clean.rows.size(); ++i) {
    for (std::size_t a = 0; a < 3; ++a) {
      worst = std::max(worst, std::fabs(biased.rows[i][a + 1] - clean.rows[i][a + 1] - bias[a]));
    }
  }
  CHECK(worst <= 2e-16);
  CHECK(slurp(dir / "biased_truth.csv") == slurp(dir / "clean_truth.csv"));
  // White rate noise N: a rate sample's error has variance N^2 / dt, a delta-angle's N^2 dt
  // (Annex C's angle random walk). Checked per axis on 10^4 samples: the sample variance within
  // 6 standard errors (sqrt(2/n), the normal approximation of chi-squared), the mean within 6
  // sigma/sqrt(n) of zero.
  const double n = 1e-3;
  for (const std::string form : {"rate", "delta"}) {
    const Csv exact = form == "rate" ? clean : make("clean_delta", {}, "delta");
    const Csv noisy = make("noisy_" + form, {"--angle-random-walk", "1e-3", "--seed", "5"}, form);
    const double variance = form == "rate" ? n * n * 1000 : n * n / 1000;
    REQUIRE(noisy.rows.size() == exact.rows.size());
    const auto count = static_cast<double>(exact.rows.size());
    for (std::size_t a = 0; a < 3; ++a) {
      double sum = 0, squares = 0;
      for (std::size_t i = 0; i < exact.rows.size(); ++i) {
        const double e = noisy.rows[i][a + 1] - exact.rows[i][a + 1];
        sum += e;
        squares += e * e;
      }
      INFO(form << " axis " << a);
      CHECK(std::fabs(sum / count) <= 6 * std::sqrt(variance / count));
      CHECK(squares / count == Approx(variance).epsilon(6 * std::sqrt(2 / count)));
    }
  }
  // Seeded: the same seed writes the same file, another seed another one.
  make("again", {"--angle-random-walk", "1e-3", "--seed", "5"});
  make("other", {"--angle-random-walk", "1e-3", "--seed", "6"});
  CHECK(slurp(dir / "again.csv") == slurp(dir / "noisy_rate.csv"));
  CHECK(slurp(dir / "other.csv") != slurp(dir / "noisy_rate.csv"));
  // Bad values exit 1 and name the option.
  for (const std::vector<std::string>& bad :
       {std::vector<std::string>{"--angle-random-walk", "-1"},
        std::vector<std::string>{"--rate-random-walk-deg", "x"},
        std::vector<std::string>{"--flicker-band", "10,1"},
        std::vector<std::string>{"--gyro-bias", "1,2"}, std::vector<std::string>{"--seed", "-3"}}) {
    std::vector<std::string> args = turn_args;
    args.insert(args.end(), {"--output", (dir / "bad.csv").string()});
    args.insert(args.end(), bad.begin(), bad.end());
    const Run r = gyro_log(args, dir);
    INFO(bad[0] << " " << bad[1] << ": " << r.err);
    CHECK(r.code == 1);
    CHECK(r.err.find(bad[0]) != std::string::npos);
  }
}
