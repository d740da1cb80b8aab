// halfspin-gyro-noise run as a user would run it, on static logs written by static_log_writer
// (halfspin's SyntheticGyro with chosen noise terms): the fitted terms against the chosen ones,
// the curve against an independent numpy computation and against Annex C's white-noise relation,
// the chi-squared quantiles against GSL, the chart, bad input, the help's caution.
//
// Statistical checks use the tool's intervals at 99.9 % (--confidence 0.999): a case compares
// up to 12 terms or 20 points, so a per-point 99.9 % keeps the chance of a false failure near
// 1 % (Bonferroni); the seeds are fixed, so the outcome is deterministic. Each such case also
// checks that a clearly wrong value (×1.5 or ×0.6) falls outside, so the intervals mean
// something.
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include <gsl/gsl_cdf.h>
#include <catch2/catch.hpp>

#include "noise_terms.hpp"

namespace {

namespace fs = std::filesystem;

struct Run {
  int code;
  std::string out;
  std::string err;
};

fs::path work_dir(const std::string& name) {
  const fs::path d = fs::path(HALFSPIN_NOISE_WORK_DIR) / name;
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

Run run(const std::string& exe, const std::vector<std::string>& args, const fs::path& dir) {
  std::string cmd = "'" + exe + "'";
  for (const std::string& a : args) cmd += " '" + a + "'";
  cmd += " >'" + (dir / "stdout.txt").string() + "' 2>'" + (dir / "stderr.txt").string() + "'";
  const int status = std::system(cmd.c_str());
  return {WIFEXITED(status) ? WEXITSTATUS(status) : -1, slurp(dir / "stdout.txt"),
          slurp(dir / "stderr.txt")};
}

// A static log: form, sample rate, samples, seed, N, B and its band, K, bias, angle LSB, scalar.
struct LogSpec {
  std::string form = "rate";
  double hz = 100;
  long samples = 1 << 15;
  unsigned seed = 1;
  double n = 0, b = 0, band_lo = 0, band_hi = 0, k = 0, bias = 0, lsb = 0;
  std::string scalar = "double";
};

fs::path write_log(const fs::path& dir, const LogSpec& s) {
  const fs::path log = dir / "static.csv";
  const auto g = [](double x) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", x);
    return std::string(buf);
  };
  const Run r =
      run(HALFSPIN_STATIC_LOG_WRITER,
          {log.string(), s.form, g(s.hz), std::to_string(s.samples), std::to_string(s.seed), g(s.n),
           g(s.b), g(s.band_lo), g(s.band_hi), g(s.k), g(s.bias), g(s.lsb), s.scalar},
          dir);
  REQUIRE(r.code == 0);
  return log;
}

struct TermRow {
  bool visible;
  double value, low, high, upper_limit;
};

// The --terms CSV: (axis, term) → row.
std::map<std::pair<char, std::string>, TermRow> read_terms(const fs::path& p) {
  std::map<std::pair<char, std::string>, TermRow> rows;
  std::ifstream in(p);
  std::string line;
  std::getline(in, line);
  while (std::getline(in, line)) {
    std::stringstream s(line);
    std::vector<std::string> f;
    std::string field;
    while (std::getline(s, field, ',')) f.push_back(field);
    REQUIRE(f.size() == 8);
    rows[{f[0][0], f[1]}] = {f[2] == "1", std::stod(f[3]), std::stod(f[4]), std::stod(f[5]),
                             std::stod(f[6])};
  }
  return rows;
}

// The --table CSV rows: tau, m, clusters, terms, then (adev, low, high) per axis.
std::vector<std::vector<double>> read_table(const fs::path& p) {
  std::vector<std::vector<double>> rows;
  std::ifstream in(p);
  std::string line;
  std::getline(in, line);
  while (std::getline(in, line)) {
    std::vector<double> row;
    std::stringstream s(line);
    std::string field;
    while (std::getline(s, field, ',')) row.push_back(std::stod(field));
    rows.push_back(row);
  }
  return rows;
}

int count(const std::string& text, const std::string& what) {
  int n = 0;
  for (std::size_t at = text.find(what); at != std::string::npos; at = text.find(what, at + 1)) ++n;
  return n;
}

const std::string tool = HALFSPIN_GYRO_NOISE_EXE;

}  // namespace

TEST_CASE("a static rate log with chosen N, B, K and a bias gives them back within the intervals",
          "[tools][reference]") {
  // Reference: the terms' definitions and relations of IEEE Std 952-1997 Annex C (the tool reads
  // them; the log is made with those values by SyntheticGyro, whose processes are checked
  // against Annex C in tests/truth/test_gyro_noise_processes.cpp). Invented gyro: N = 7e-5
  // rad/√s (0.24 °/√h), B = 1e-4 rad/s (21 °/h), K = 3.6e-5 rad/s/√s (445 °/h/√h), 100 Hz,
  // 2^18 samples (44 minutes), so that white noise dominates below about 1 s, bias instability
  // from 1 to 10 s and the rate random walk above (its points have few clusters: its interval
  // is wide, so the wrong-value check for K uses ×3 and ×1/3).
  const fs::path dir = work_dir("terms_rate");
  LogSpec spec;
  spec.samples = 1 << 18;
  spec.seed = 2026;
  spec.n = 7e-5;
  spec.b = 1e-4;
  spec.band_lo = 0.01;
  spec.band_hi = 1400;
  spec.k = 3.6e-5;
  spec.bias = 2e-3;
  const fs::path log = write_log(dir, spec);
  const Run r = run(tool,
                    {log.string(), "--confidence", "0.999", "--terms", (dir / "terms.csv").string(),
                     "--chart", (dir / "chart.svg").string()},
                    dir);
  INFO(r.out << r.err);
  REQUIRE(r.code == 0);
  const auto terms = read_terms(dir / "terms.csv");
  const std::array<std::pair<std::string, double>, 3> chosen{
      {{"angle_random_walk", spec.n}, {"bias_instability", spec.b}, {"rate_random_walk", spec.k}}};
  for (const char axis : {'x', 'y', 'z'}) {
    for (const auto& [name, value] : chosen) {
      const TermRow& t = terms.at({axis, name});
      INFO(axis << " " << name << ": " << t.value << " [" << t.low << ", " << t.high << "], chosen "
                << value);
      CHECK(t.visible);
      CHECK(t.low <= value);
      CHECK(value <= t.high);
      const double wrong = name == "rate_random_walk" ? 3.0 : 1.5;
      CHECK(!(t.low <= wrong * value && wrong * value <= t.high));
      CHECK(!(t.low <= value / wrong && value / wrong <= t.high));
    }
    // Rate quantization would be white noise: no Q in a rate log with no quantization.
    CHECK_FALSE(terms.at({axis, "quantization"}).visible);
  }
  CHECK(r.out.find("mean rate (rad/s): x ") != std::string::npos);
  // The stepstudy line, in SI, the three flags.
  CHECK(r.out.find("--angle-random-walk 7.") != std::string::npos);
  CHECK(r.out.find("--bias-instability ") != std::string::npos);
  CHECK(r.out.find("--rate-random-walk ") != std::string::npos);
  CHECK(count(r.out, "\xC2\xB0/\xE2\x88\x9Ah") == 3);  // N in °/√h, once per axis
  CHECK(count(r.out, "\xC2\xB0/h/\xE2\x88\x9Ah") == 3);
  // The chart: well-formed SVG (xmllint), renders (rsvg-convert), one panel per axis, bars on
  // every point, a label per visible term.
  const std::string svg = slurp(dir / "chart.svg");
  CHECK(count(svg, "class=\"chart\"") == 3);
  CHECK(count(svg, "class=\"bar\"") == 3 * 18);
  CHECK(count(svg, "class=\"label\"") == 9);
  CHECK(svg.find("N = 7") != std::string::npos);
  CHECK(run(HALFSPIN_XMLLINT_EXE, {"--noout", (dir / "chart.svg").string()}, dir).code == 0);
  CHECK(run(HALFSPIN_RSVG_CONVERT_EXE,
            {(dir / "chart.svg").string(), "-o", (dir / "chart.png").string()}, dir)
            .code == 0);
}

TEST_CASE("a delta-angle log with a quantized angle counter shows Q and N - not B or K",
          "[tools][reference]") {
  // Annex C: the angle quantization noise of an LSB of q has Q = q/√12 (Annex C's relation
  // σ² = 3Q²/τ²; q/√12 is the standard deviation of a uniform error, common practice, no
  // source). Float log, 200 Hz, 2^16 samples; per-sample noise σ = N√dt = q/2.5, so that the
  // carried residual is close to white (the residual of a counter decorrelates from sample to
  // sample by the factor exp(−(2πσ/q)²/2) ≈ 0.04, derived here). Q is checked to 5 % (that
  // remaining correlation, not the interval, limits it); N within its interval. Bias instability
  // and rate random walk are absent: "not visible in this log".
  const fs::path dir = work_dir("terms_delta");
  LogSpec spec;
  spec.form = "delta";
  spec.hz = 200;
  spec.samples = 1 << 16;
  spec.seed = 3;
  spec.n = 5e-5;
  spec.bias = 1e-3;
  spec.lsb = 2.5 * spec.n * std::sqrt(1 / spec.hz);
  spec.scalar = "float";
  const fs::path log = write_log(dir, spec);
  const Run r = run(
      tool, {log.string(), "--confidence", "0.999", "--terms", (dir / "terms.csv").string()}, dir);
  INFO(r.out << r.err);
  REQUIRE(r.code == 0);
  const auto terms = read_terms(dir / "terms.csv");
  const double q = spec.lsb / std::sqrt(12.0);
  for (const char axis : {'x', 'y', 'z'}) {
    const TermRow& quantization = terms.at({axis, "quantization"});
    const TermRow& white = terms.at({axis, "angle_random_walk"});
    INFO(axis << ": Q " << quantization.value << " (chosen " << q << "), N " << white.value << " ["
              << white.low << ", " << white.high << "]");
    CHECK(quantization.visible);
    CHECK(std::fabs(quantization.value / q - 1) < 0.05);
    CHECK(white.visible);
    CHECK(white.low <= spec.n);
    CHECK(spec.n <= white.high);
    CHECK_FALSE(terms.at({axis, "bias_instability"}).visible);
    CHECK_FALSE(terms.at({axis, "rate_random_walk"}).visible);
  }
  CHECK(count(r.out, "not visible in this log") == 7);  // 6 terms and the flags' note
  CHECK(r.out.find("left out, not visible in this log: --bias-instability, --rate-random-walk") !=
        std::string::npos);
}

TEST_CASE(
    "the overlapping Allan deviation agrees with numpy to 1e-12 - and white noise gives "
    "N/sqrt(tau) within its intervals",
    "[tools][reference]") {
  // Reference: an independent numpy computation (Debian python3-numpy) of the Annex C
  // definition, tests/tools/noise/allan_numpy.py, on the same log and the tool's --table; and
  // Annex C's white-noise relation σ(τ) = N/√τ against the tool's own intervals.
  for (const std::string form : {"rate", "delta"}) {
    const fs::path dir = work_dir("numpy_" + form);
    LogSpec spec;
    spec.form = form;
    spec.samples = 40000;
    spec.seed = 17;
    spec.n = 3e-4;
    spec.bias = 5e-2;  // a large bias: the mean removal must keep the digits
    const fs::path log = write_log(dir, spec);
    const fs::path table = dir / "table.csv";
    const Run r =
        run(tool, {log.string(), "--table", table.string(), "--confidence", "0.999"}, dir);
    INFO(r.out << r.err);
    REQUIRE(r.code == 0);
    const Run check =
        run(HALFSPIN_PYTHON_EXE,
            {HALFSPIN_ALLAN_NUMPY_SCRIPT, log.string(), table.string(), "1e-12"}, dir);
    INFO(check.out << check.err);
    CHECK(check.code == 0);
    CHECK(check.out.find("numpy check: 15 averaging times") != std::string::npos);
    const auto rows = read_table(table);
    REQUIRE(rows.size() == 15);  // m = 1 … 2^14, 2m ≤ 40000
    int outside = 0, outside_wrong = 0;
    for (const auto& row : rows) {
      const double expected = spec.n / std::sqrt(row[0]);
      for (std::size_t a = 0; a < 3; ++a) {
        const double low = row[5 + 3 * a], high = row[6 + 3 * a];
        if (expected < low || expected > high) ++outside;
        if (1.15 * expected < low || 1.15 * expected > high) ++outside_wrong;
      }
    }
    CHECK(outside == 0);
    CHECK(outside_wrong >= 3);
  }
}

TEST_CASE("a still log from halfspin-gyro-log gives back the datasheet figures it was made with",
          "[tools]") {
  // The user's path: halfspin-gyro-log writes a still gyro with an invented datasheet's angle
  // random walk (0.5 deg/sqrt(h)) and bias (20 deg/h), this tool reads N back (Annex C: the
  // -1/2 line at tau = 1 s) within its interval, and the mean rate is the bias (common practice,
  // no source: 1 deg/sqrt(h) = pi/180/60 rad/sqrt(s), 1 deg/h = pi/180/3600 rad/s).
  const fs::path dir = work_dir("from_gyro_log");
  const fs::path log = dir / "still.csv";
  const Run made =
      run(HALFSPIN_GYRO_LOG_EXE,
          {"--turn", "0,0,0", "--rate", "100", "--duration", "300", "--angle-random-walk-deg",
           "0.5", "--gyro-bias-deg", "20,20,20", "--seed", "11", "--output", log.string()},
          dir);
  REQUIRE(made.code == 0);
  // 99.9 % per axis, as the other cases here: three axes at 95 % each would miss one in seven
  // runs by chance alone.
  const Run r = run(
      tool, {log.string(), "--confidence", "0.999", "--terms", (dir / "terms.csv").string()}, dir);
  INFO(r.out << r.err);
  REQUIRE(r.code == 0);
  const double pi = std::acos(-1.0);
  const double n = 0.5 * pi / 180 / 60;
  const auto terms = read_terms(dir / "terms.csv");
  for (const char axis : {'x', 'y', 'z'}) {
    const TermRow& t = terms.at({axis, "angle_random_walk"});
    INFO(axis << ": " << t.value << " [" << t.low << ", " << t.high << "], chosen " << n);
    CHECK(t.visible);
    CHECK(t.low <= n);
    CHECK(n <= t.high);
  }
  // The mean rate is the bias, to N/sqrt(T) (3e-5 over 300 s; six of them allowed).
  double mean_x = 0;
  REQUIRE(std::sscanf(r.out.c_str() + r.out.find("mean rate (rad/s): x "),
                      "mean rate (rad/s): x %lf", &mean_x) == 1);
  CHECK(std::fabs(mean_x - 20 * pi / 180 / 3600) <= 6 * n / std::sqrt(300.0));
}

TEST_CASE("chi-squared quantiles match GSL", "[tools][reference]") {
  // Reference: GSL gsl_cdf_chisq_Pinv (up to ν = 10⁴, where GSL's inversion still converges).
  double worst = 0;
  for (const double nu : {1.0, 2.0, 3.0, 7.0, 31.0, 255.0, 4095.0, 9999.0}) {
    for (const double p : {0.0005, 0.005, 0.025, 0.16, 0.5, 0.84, 0.975, 0.995, 0.9995}) {
      const double ours = halfspin::tools::noise::chi_squared_quantile(p, nu);
      const double gsl = gsl_cdf_chisq_Pinv(p, nu);
      INFO("nu " << nu << " p " << p << ": " << ours << " vs GSL " << gsl);
      worst = std::max(worst, std::fabs(ours / gsl - 1));
      CHECK(std::fabs(ours / gsl - 1) < 1e-9);
    }
  }
  // Above 10⁴ the tool switches to Wilson–Hilferty: at the switch it agrees with GSL too.
  CHECK(std::fabs(halfspin::tools::noise::chi_squared_quantile(0.0005, 10001.0) /
                      gsl_cdf_chisq_Pinv(0.0005, 10001.0) -
                  1) < 1e-6);
  std::printf("chi-squared quantiles: worst relative difference from GSL %.3g\n", worst);
}

TEST_CASE("bad logs are rejected with FILE:LINE - usage errors and the help's caution", "[tools]") {
  const fs::path dir = work_dir("bad");
  const auto write = [&](const std::string& name, const std::string& text) {
    std::ofstream(dir / name) << text;
    return (dir / name).string();
  };
  const std::string gap =
      write("gap.csv", "t,wx,wy,wz\n0,0,0,0\n0.01,0,0,0\n0.02,0,0,0\n0.05,0,0,0\n");
  Run r = run(tool, {gap}, dir);
  CHECK(r.code == 2);
  CHECK(r.err.find("gap.csv:5: gap") != std::string::npos);
  const std::string back = write("back.csv", "t,wx,wy,wz\n0,0,0,0\n0.01,0,0,0\n0.01,0,0,0\n");
  r = run(tool, {back}, dir);
  CHECK(r.code == 2);
  CHECK(r.err.find("back.csv:4: time does not increase") != std::string::npos);
  const std::string text = write("text.csv", "t,dx,dy,dz\n0.01,0,0,0\n0.02,0,zero,0\n");
  r = run(tool, {text}, dir);
  CHECK(r.code == 2);
  CHECK(r.err.find("text.csv:3: field 3 (dy) is not a number") != std::string::npos);
  const std::string short_log = write("short.csv", "t,wx,wy,wz\n0,0,0,0\n0.01,0,0,0\n");
  r = run(tool, {short_log}, dir);
  CHECK(r.code == 2);
  CHECK(r.err.find("fewer than 4 samples") != std::string::npos);
  CHECK(run(tool, {(dir / "missing.csv").string()}, dir).code == 2);
  CHECK(run(tool, {gap, "--confidence", "1"}, dir).code == 1);
  CHECK(run(tool, {gap, "--bogus"}, dir).code == 1);
  CHECK(run(tool, {gap, "--angle-unit", "deg"}, dir).code == 2);  // a rate log
  r = run(tool, {"--help"}, dir);
  CHECK(r.code == 0);
  CHECK(r.out.find("Validate any attitude solution in hardware-in-the-loop and") !=
        std::string::npos);
  CHECK(r.out.find("local airworthiness rules and licensed engineering") != std::string::npos);
  // Nothing is left in the scratch directory (the temporary file is unlinked at once).
  const std::string ok =
      write("ok.csv", "t,wx,wy,wz\n0,1,0,0\n0.01,2,0,0\n0.02,1,0,0\n0.03,3,0,0\n");
  const fs::path scratch = dir / "scratch";
  fs::create_directories(scratch);
  CHECK(run(tool, {ok, "--scratch-dir", scratch.string()}, dir).code == 0);
  CHECK(fs::is_empty(scratch));
}

namespace {

// fork + exec + wait4: the child's own peak resident set (ru_maxrss, KiB on Linux).
long peak_rss_kib(const std::vector<std::string>& argv_text) {
  std::vector<std::string> copies = argv_text;
  std::vector<char*> argv;
  for (std::string& a : copies) argv.push_back(a.data());
  argv.push_back(nullptr);
  const pid_t pid = fork();
  if (pid == 0) {
    if (std::freopen("/dev/null", "w", stdout) == nullptr) _exit(127);
    execv(argv[0], argv.data());
    _exit(127);
  }
  REQUIRE(pid > 0);
  int status = 0;
  rusage usage{};
  REQUIRE(wait4(pid, &status, 0, &usage) == pid);
  REQUIRE(WIFEXITED(status));
  REQUIRE(WEXITSTATUS(status) == 0);
  return usage.ru_maxrss;
}

}  // namespace

TEST_CASE("memory does not grow with the log's length", "[soak]") {
  // Peak RSS of the tool on 2^18 and 2^21 samples (8 times as long, 170 MB of CSV): a tool that
  // kept even one double per sample would grow by 14 MiB; the bound allows 2 MiB (allocator
  // noise, and the three more octaves' buffers of 48 KiB each). The figures are printed for the
  // README (measured there with a 10x log), not asserted as targets.
  const fs::path dir = work_dir("memory");
  std::array<long, 2> peak{};
  for (std::size_t i = 0; i < 2; ++i) {
    LogSpec spec;
    spec.samples = i == 0 ? 1 << 18 : 1 << 21;
    spec.n = 7e-5;
    spec.b = 1e-4;
    spec.band_lo = 0.01;
    spec.band_hi = 2e4;
    spec.k = 3.6e-5;
    const fs::path log = write_log(dir, spec);
    peak[i] = peak_rss_kib({tool, log.string(), "--scratch-dir", dir.string()});
    std::printf("halfspin-gyro-noise on %ld samples: peak RSS %ld KiB\n", spec.samples, peak[i]);
    fs::remove(log);
  }
  CHECK(peak[1] - peak[0] < 2048);
}
