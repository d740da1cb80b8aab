// halfspin-propagate on a 10^7-line gyro log (label `soak`): the tool streams its input and its
// output, so its peak resident memory must not grow with the length of the log. The check: peak RSS
// (wait4's ru_maxrss of the tool's own process) on a 10^7-line log exceeds the peak on a 10^4-line
// log by less than 4 MiB — a tool that kept as little as one byte per line would grow by 10 MB.
// The figures are printed (ctest -V) for the README; they are not asserted as speed or size
// targets. Also checked: every line was read, every step written, the summary's final attitude
// matches closed-form coning truth (halfspin's ClassicalConingMotion, evaluated in long double
// here) to within the a-priori horizon bound.
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/truth/classical_coning.hpp"

namespace {

namespace fs = std::filesystem;

struct Child {
  int code = -1;
  long peak_rss_kib = 0;
  double seconds = 0;
  std::string err;
};

// fork + exec + wait4: the child's own peak RSS (ru_maxrss, KiB on Linux), not the test's.
Child spawn(const std::string& exe, const std::vector<std::string>& args,
            const fs::path& err_file) {
  std::vector<char*> argv;
  std::string exe_copy = exe;
  std::vector<std::string> copies = args;
  argv.push_back(exe_copy.data());
  for (std::string& a : copies) argv.push_back(a.data());
  argv.push_back(nullptr);
  const auto t0 = std::chrono::steady_clock::now();
  const pid_t pid = fork();
  if (pid == 0) {
    std::FILE* e = std::freopen(err_file.c_str(), "w", stderr);
    std::FILE* o = std::freopen("/dev/null", "w", stdout);
    if (e == nullptr || o == nullptr) _exit(127);
    execv(argv[0], argv.data());
    _exit(127);
  }
  Child c;
  int status = 0;
  rusage usage{};
  REQUIRE(pid > 0);
  REQUIRE(wait4(pid, &status, 0, &usage) == pid);
  c.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  c.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  c.peak_rss_kib = usage.ru_maxrss;
  std::ifstream in(err_file);
  std::stringstream s;
  s << in.rdbuf();
  c.err = s.str();
  return c;
}

unsigned long long count_lines(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::vector<char> buf(1 << 20);
  unsigned long long n = 0;
  while (in) {
    in.read(buf.data(), static_cast<std::streamsize>(buf.size()));
    const std::streamsize got = in.gcount();
    for (std::streamsize i = 0; i < got; ++i) n += buf[static_cast<std::size_t>(i)] == '\n';
  }
  return n;
}

struct Run {
  Child generate;
  Child propagate;
  unsigned long long output_lines = 0;
  halfspin::Quaternion<double> final_attitude{};
};

// The log: classical coning (cone angle 0.05 rad at 10 Hz, halfspin-gyro-log's invented `coning`
// motion) as exact delta-angles at 1 kHz; `seconds` of it hold 1000·seconds data lines.
Run run_log(const fs::path& dir, long seconds) {
  fs::remove_all(dir);
  fs::create_directories(dir);
  Run r;
  const fs::path log = dir / "coning.csv";
  const fs::path out = dir / "attitude.csv";
  r.generate = spawn(HALFSPIN_GYRO_LOG_EXE,
                     {"--motion", "coning", "--form", "delta", "--rate", "1000", "--duration",
                      std::to_string(seconds), "--output", log.string()},
                     dir / "generate.txt");
  REQUIRE(r.generate.code == 0);
  r.propagate = spawn(HALFSPIN_PROPAGATE_EXE,
                      {log.string(), "--output", out.string(), "--method", "coning_2_sample"},
                      dir / "propagate.txt");
  INFO(r.propagate.err);
  REQUIRE(r.propagate.code == 0);
  const std::string samples = "samples read: " + std::to_string(1000 * seconds) + "\n";
  REQUIRE(r.propagate.err.find(samples) != std::string::npos);
  const std::string steps = "steps: " + std::to_string(500 * seconds) + "\n";
  REQUIRE(r.propagate.err.find(steps) != std::string::npos);
  r.output_lines = count_lines(out);
  const std::size_t at = r.propagate.err.find("final attitude: q = ");
  REQUIRE(at != std::string::npos);
  double w = 0, x = 0, y = 0, z = 0;
  REQUIRE(std::sscanf(r.propagate.err.c_str() + at, "final attitude: q = %lg,%lg,%lg,%lg", &w, &x,
                      &y, &z) == 4);
  r.final_attitude = {w, x, y, z};
  fs::remove_all(dir);  // about 1.5 GB for the long log
  return r;
}

}  // namespace

TEST_CASE("halfspin-propagate streams a 10^7-line log in constant memory", "[tools][soak]") {
  const fs::path work = fs::path(HALFSPIN_TOOLS_WORK_DIR) / "long_log";
  const Run small = run_log(work, 10);     // 10^4 lines
  const Run large = run_log(work, 10000);  // 10^7 lines
  std::printf("10^4-line log: propagate peak RSS %ld KiB, %.2f s\n", small.propagate.peak_rss_kib,
              small.propagate.seconds);
  std::printf(
      "10^7-line log: generate %.1f s (peak RSS %ld KiB); propagate peak RSS %ld KiB, %.1f s\n",
      large.generate.seconds, large.generate.peak_rss_kib, large.propagate.peak_rss_kib,
      large.propagate.seconds);
  // One header plus one row per step (coning_2_sample steps every second sample).
  REQUIRE(small.output_lines == 1 + 5000);
  REQUIRE(large.output_lines == 1 + 5000000);
  // Constant memory: growth below 4 MiB from 10^4 to 10^7 lines (one byte per line is 10 MB).
  REQUIRE(large.propagate.peak_rss_kib - small.propagate.peak_rss_kib < 4 * 1024);
  REQUIRE(large.generate.peak_rss_kib - small.generate.peak_rss_kib < 4 * 1024);

  // The result is right at the end of the long run: closed-form coning truth at t = 10^4 s
  // (Ω t = 6.28·10^5 rad, evaluated in long double), within halfspin's a-priori horizon bound for
  // the two-sample coning algorithm on this motion (bounds/horizon_bound.hpp: the exact coning
  // drift, about 4·10^-4 rad here, plus the worst-case rounding of 5·10^6 double steps).
  const halfspin::ClassicalConingMotion<long double> coning{0.05L,
                                                            2.0L * 3.14159265358979323846L * 10.0L};
  // The tool starts from the identity: it propagates q(0)* ⊗ q(t).
  const halfspin::Quaternion<long double> t =
      halfspin::conjugate(coning.attitude(0.0L)) * coning.attitude(10000.0L);
  const halfspin::Quaternion<double> truth{static_cast<double>(t.w), static_cast<double>(t.x),
                                           static_cast<double>(t.y), static_cast<double>(t.z)};
  const double error = halfspin::angle_between(large.final_attitude, truth);
  halfspin::MotionDescription<double> d{};
  d.coning = {0.05, 10.0};
  const double bound = halfspin::horizon_error_bound<halfspin::Coning2Sample>(d, 0.002, 10000.0);
  std::printf("10^7-line log: final attitude error vs truth %.4e rad, a-priori bound %.4e rad\n",
              error, bound);
  REQUIRE(error <= bound);
}
