#pragma once
// Command-line values that describe motion, shared by the tools so that they read the same text
// the same way: halfspin-stepstudy describes a vehicle with them for the bounds, halfspin-gyro-log
// builds the truth motion of the same description. Tool code.
//
//   --vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ]   parse_vibration → VibrationOption → vibration_line()
//       a sinusoidal line at HZ (Hz), amplitude X,Y,Z (>= 0) about the body axes in UNIT: rad or
//       deg (angle amplitude θ_i; rate amplitude 2π·HZ·θ_i) or rad/s or deg/s (rate amplitude);
//       optional phases PX,PY,PZ (deg), axis i's rate being A_i·cos(2π·HZ·t + P_i)
//   --coning DEG,HZ                         parse_coning: half-angle in (0, 90) deg, HZ > 0
//   X,Y,Z                                   parse_triple: three finite numbers
// The library's VibrationLine (bounds/motion_description.hpp) is what a line becomes.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdlib>
#include <string>
#include <string_view>
#include <vector>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin::tools {

// The largest number of vibration lines (VibrationSpec's capacity).
inline constexpr std::size_t max_vibration_lines = VibrationSpec<double>::capacity;

// Units a vibration amplitude can be given in: an angle amplitude (rad, deg) or a rate amplitude
// (rad/s, deg/s), per body axis.
enum class AmplitudeUnit { rad, deg, rad_per_s, deg_per_s };

// One --vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ] as given.
struct VibrationOption {
  std::string text;  // the option's value, for messages
  double frequency_hz = 0;
  std::array<double, 3> amplitude{};  // in `unit`, each >= 0
  AmplitudeUnit unit = AmplitudeUnit::rad;
  bool phases_known = false;
  std::array<double, 3> phase_deg{};  // deg, when known
};

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

// A finite number filling the whole text.
inline bool parse_number(const std::string& text, double& value) {
  if (text.empty()) {
    return false;
  }
  char* end = nullptr;
  value = std::strtod(text.c_str(), &end);
  return end - text.c_str() == static_cast<std::ptrdiff_t>(text.size()) && std::isfinite(value);
}

// Three comma-separated finite numbers, each >= 0 unless `signed_values`.
inline bool parse_triple(std::string_view text, std::array<double, 3>& out, bool signed_values) {
  const std::vector<std::string> parts = split(text);
  if (parts.size() != 3) {
    return false;
  }
  for (std::size_t i = 0; i < 3; ++i) {
    if (!parse_number(parts[i], out.at(i)) || (!signed_values && out.at(i) < 0)) {
      return false;
    }
  }
  return true;
}

// Splits on ':' (the fields of --vibration).
inline std::vector<std::string> fields(std::string_view text) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t colon = text.find(':', start);
    if (colon == std::string_view::npos) {
      parts.emplace_back(text.substr(start));
      return parts;
    }
    parts.emplace_back(text.substr(start, colon - start));
    start = colon + 1;
  }
}

inline constexpr double degrees_per_radian = 180.0 / 3.14159265358979323846;

inline Vector3<double> as_vector(const std::array<double, 3>& a) { return {a[0], a[1], a[2]}; }

}  // namespace detail

// One --vibration value, HZ:X,Y,Z:UNIT[:PX,PY,PZ]; false with a message in `error`.
inline bool parse_vibration(const std::string& text, VibrationOption& v, std::string& error) {
  using detail::parse_number;
  using detail::parse_triple;
  const std::string head = "--vibration '" + text + "': ";
  // The unit rad/s contains no ':', so the fields split cleanly on ':'.
  const std::vector<std::string> f = detail::fields(text);
  if (f.size() != 3 && f.size() != 4) {
    error = head + "expected HZ:X,Y,Z:UNIT or HZ:X,Y,Z:UNIT:PX,PY,PZ (e.g. 120:0,0,0.01:rad)";
    return false;
  }
  v.text = text;
  if (!parse_number(f[0], v.frequency_hz) || !(v.frequency_hz > 0)) {
    error = head + "the frequency '" + f[0] + "' is not a positive finite number (Hz)";
    return false;
  }
  if (!parse_triple(f[1], v.amplitude, false)) {
    error = head + "the amplitude '" + f[1] + "' is not three non-negative finite numbers X,Y,Z";
    return false;
  }
  if (!(v.amplitude[0] > 0 || v.amplitude[1] > 0 || v.amplitude[2] > 0)) {
    error = head + "every amplitude is zero (no vibration)";
    return false;
  }
  if (f[2] == "rad") {
    v.unit = AmplitudeUnit::rad;
  } else if (f[2] == "deg") {
    v.unit = AmplitudeUnit::deg;
  } else if (f[2] == "rad/s") {
    v.unit = AmplitudeUnit::rad_per_s;
  } else if (f[2] == "deg/s") {
    v.unit = AmplitudeUnit::deg_per_s;
  } else {
    error = head + "the unit '" + f[2] +
            "' is not one of rad, deg (angle amplitude), rad/s, deg/s (rate amplitude)";
    return false;
  }
  v.phases_known = f.size() == 4;
  if (v.phases_known && !parse_triple(f[3], v.phase_deg, true)) {
    error = head + "the phases '" + f[3] + "' are not three finite numbers PX,PY,PZ (deg)";
    return false;
  }
  return true;
}

// One --coning DEG,HZ value: a half-angle in (0, 90) deg and a positive frequency (Hz); false with
// a message in `error`.
inline bool parse_coning(const std::string& text, double& half_angle_deg, double& frequency_hz,
                         std::string& error) {
  const std::vector<std::string> parts = detail::split(text);
  if (parts.size() != 2 || !detail::parse_number(parts[0], half_angle_deg) ||
      !detail::parse_number(parts[1], frequency_hz) || !(half_angle_deg > 0) ||
      !(frequency_hz > 0) || !(half_angle_deg < 90)) {
    error = "--coning takes DEG,HZ: a half-angle in (0, 90) deg and a positive frequency in Hz";
    return false;
  }
  return true;
}

// The library's line for one --vibration value (its unit decides the factory).
inline VibrationLine<double> vibration_line(const VibrationOption& v) {
  const Vector3<double> a = detail::as_vector(v.amplitude);
  VibrationLine<double> line{};
  switch (v.unit) {
    case AmplitudeUnit::rad:
      line = VibrationLine<double>::from_angle_amplitude(v.frequency_hz, a);
      break;
    case AmplitudeUnit::deg:
      line = VibrationLine<double>::from_angle_amplitude_deg(v.frequency_hz, a);
      break;
    case AmplitudeUnit::rad_per_s:
      line = VibrationLine<double>::from_rate_amplitude(v.frequency_hz, a);
      break;
    case AmplitudeUnit::deg_per_s:
      line = VibrationLine<double>::from_rate_amplitude_deg_s(v.frequency_hz, a);
      break;
  }
  if (v.phases_known) {
    line = line.with_phases(detail::as_vector(v.phase_deg) / detail::degrees_per_radian);
  }
  return line;
}

}  // namespace halfspin::tools
