#pragma once
// Numbers as text for the tools' tables and messages.

#include <array>
#include <cmath>
#include <cstdio>
#include <string>

namespace halfspin::tools {

// One number printed with a printf format holding one floating-point conversion.
inline std::string number_text(const char* fmt, double v) {
  std::array<char, 64> buffer{};
  std::snprintf(buffer.data(), buffer.size(), fmt, v);
  return buffer.data();
}

// A table cell: "%.3e", "-" for NaN (nothing measured), "inf" for an infinity.
inline std::string scientific_cell(double v) {
  return std::isfinite(v) ? number_text("%.3e", v) : (std::isnan(v) ? "-" : "inf");
}

}  // namespace halfspin::tools
