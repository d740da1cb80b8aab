#pragma once
// Running the tools as a user would, for the tool tests: the executables are spawned (paths from
// CMake), their files and stderr read back; working files under HALFSPIN_TOOLS_WORK_DIR/<case>/.
// Test-only helpers shared by the test sources of test_tools_propagate.
#include <sys/wait.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>
#include <string>
#include <vector>

#include "halfspin/core/quaternion.hpp"

namespace halfspin::test::tools {

namespace fs = std::filesystem;
using halfspin::Quaternion;

struct Run {
  int code;
  std::string err;
};

inline fs::path work_dir(const std::string& name) {
  const fs::path d = fs::path(HALFSPIN_TOOLS_WORK_DIR) / name;
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

inline std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

// Runs an executable with arguments (each single-quoted), stderr captured in dir/stderr.txt.
inline Run run(const char* exe, const std::vector<std::string>& args, const fs::path& dir) {
  std::string cmd = std::string("'") + exe + "'";
  for (const std::string& a : args) cmd += " '" + a + "'";
  const fs::path err = dir / "stderr.txt";
  cmd += " >/dev/null 2>'" + err.string() + "'";
  const int status = std::system(cmd.c_str());
  Run r{WIFEXITED(status) ? WEXITSTATUS(status) : -1, slurp(err)};
  fs::remove(err);
  return r;
}

inline Run propagate(const std::vector<std::string>& args, const fs::path& dir) {
  return run(HALFSPIN_PROPAGATE_EXE, args, dir);
}
inline Run gyro_log(const std::vector<std::string>& args, const fs::path& dir) {
  return run(HALFSPIN_GYRO_LOG_EXE, args, dir);
}

struct Csv {
  std::string header;
  std::vector<std::vector<double>> rows;
};

inline Csv read_csv(const fs::path& p) {
  Csv c;
  std::ifstream in(p);
  std::getline(in, c.header);
  std::string line;
  while (std::getline(in, line)) {
    std::vector<double> row;
    std::stringstream s(line);
    std::string field;
    while (std::getline(s, field, ',')) row.push_back(std::strtod(field.c_str(), nullptr));
    c.rows.push_back(row);
  }
  return c;
}

inline std::string g17(double x) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.17g", x);
  return buf;
}

// The number after `key` in text (e.g. key "gap " in "gap 3,"), or NaN.
inline double number_after(const std::string& text, const std::string& key) {
  const std::size_t at = text.find(key);
  if (at == std::string::npos) return std::numeric_limits<double>::quiet_NaN();
  return std::strtod(text.c_str() + at + key.size(), nullptr);
}

// Files in dir whose name starts with `stem` (the output and any temporary beside it).
inline int files_starting_with(const fs::path& dir, const std::string& stem) {
  int n = 0;
  for (const auto& e : fs::directory_iterator(dir)) {
    if (e.path().filename().string().rfind(stem, 0) == 0) ++n;
  }
  return n;
}

// Closed form at constant body rate (common practice, no source): q(t) = q0 ⊗ exp(ω t / 2),
// exp(φ/2) = (cos(|φ|/2), sin(|φ|/2) φ/|φ|); written out here in long double, Hamilton product.
inline Quaternion<long double> constant_rate_attitude(const Quaternion<long double>& q0,
                                                      const std::array<long double, 3>& w,
                                                      long double t) {
  const long double n = std::sqrt(w[0] * w[0] + w[1] * w[1] + w[2] * w[2]);
  const long double c = std::cos(0.5L * n * t);
  const long double s = std::sin(0.5L * n * t) / n;
  const long double bw = c, bx = s * w[0], by = s * w[1], bz = s * w[2];
  return {
      q0.w * bw - q0.x * bx - q0.y * by - q0.z * bz, q0.w * bx + q0.x * bw + q0.y * bz - q0.z * by,
      q0.w * by - q0.x * bz + q0.y * bw + q0.z * bx, q0.w * bz + q0.x * by - q0.y * bx + q0.z * bw};
}

inline Quaternion<double> row_quaternion(const std::vector<double>& r) {
  return {r[1], r[2], r[3], r[4]};
}

inline void write_lines(const fs::path& p, const std::vector<std::string>& lines) {
  std::ofstream f(p, std::ios::binary);
  for (const std::string& l : lines) f << l << '\n';
}

}  // namespace halfspin::test::tools
