#pragma once
// halfspin-stepstudy's description of a vehicle from what an engineer knows (the description
// options of options.hpp) as the library's MotionDescription, and the printed account of what the
// tool understood: each D_k with its unit and where it came from, each vibration line's rate and
// angle amplitude and whether its phases are known, the coning. Tool code.
//
// The parts and their derivations live in the library (include/halfspin/bounds/
// motion_description.hpp): the Bernstein envelope D_k = (2πB)ᵏ·D0 (from_bandwidth), a line's rate
// amplitude A_i = 2πf·θ_i from an angle amplitude θ_i (from_angle_amplitude), and the sum of the
// parts' envelopes (MotionDescription::envelope).

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <string>
#include <vector>

#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/core/vector3.hpp"
#include "number_text.hpp"
#include "options.hpp"

namespace halfspin::tools::stepstudy {

namespace detail {

using tools::detail::as_vector;
using tools::detail::degrees_per_radian;

inline std::string triple(const char* fmt, const Vector3<double>& v) {
  return "(" + number_text(fmt, v.x) + ", " + number_text(fmt, v.y) + ", " + number_text(fmt, v.z) +
         ")";
}

// "rad/s", "rad/s^2", ...: the unit of D_k.
inline std::string derivative_unit(std::size_t k) {
  return k == 0 ? std::string("rad/s") : "rad/s^" + std::to_string(k + 1);
}

}  // namespace detail

// The description the options give (bounds-only mode) and a one-line summary of it.
inline MotionDescription<double> vehicle_description(const Options& o, std::string& summary) {
  MotionDescription<double> d{};
  std::vector<std::string> parts;
  if (!o.envelope.empty()) {
    d.maneuver = RateEnvelope<double>{};  // unknown (+inf) beyond the entries given
    for (std::size_t k = 0; k < o.envelope.size(); ++k) {
      d.maneuver.derivative.at(k) = o.envelope[k];
    }
    parts.push_back("envelope D0..D" + std::to_string(o.envelope.size() - 1) + " given");
  } else if (o.has_max_rate || o.has_axis_rates) {
    const double d0 = o.has_axis_rates ? norm(detail::as_vector(o.axis_rates)) : o.max_rate;
    if (o.has_bandwidth) {
      d.maneuver = o.has_axis_rates ? RateEnvelope<double>::from_axis_rates_and_bandwidth(
                                          detail::as_vector(o.axis_rates), o.bandwidth_hz)
                                    : RateEnvelope<double>::from_bandwidth(d0, o.bandwidth_hz);
      parts.push_back(number_text("max rate %g rad/s", d0) +
                      number_text(", bandwidth %g Hz", o.bandwidth_hz));
    } else {
      d.maneuver = RateEnvelope<double>::from_derivatives(d0);
      parts.push_back(number_text("max rate %g rad/s (D1.. unknown)", d0));
    }
  }
  for (const VibrationOption& v : o.vibration) {
    d.vibration.add(vibration_line(v));
    parts.push_back(number_text("vibration %g Hz", v.frequency_hz));
  }
  if (o.has_coning) {
    d.coning = ConingSpec<double>{o.coning_deg / detail::degrees_per_radian, o.coning_hz};
    parts.push_back(number_text("coning %g deg", o.coning_deg) +
                    number_text(" at %g Hz", o.coning_hz));
  }
  summary.clear();
  for (const std::string& p : parts) {
    summary += (summary.empty() ? "" : " + ") + p;
  }
  return d;
}

// Prints the description as understood, before the table (help text: "The description as
// understood").
inline void print_vehicle_description(const Options& o, const MotionDescription<double>& d) {
  using detail::derivative_unit;
  std::printf("Description as understood (bounds only):\n");
  const bool maneuver_given = !o.envelope.empty() || o.has_max_rate || o.has_axis_rates;
  if (!maneuver_given) {
    std::printf("  manoeuvre: none described: D0..D5 = 0 (the motion is only the parts below)\n");
  } else {
    std::string origin;
    if (!o.envelope.empty()) {
      origin = "given by --envelope";
    } else if (o.has_axis_rates) {
      origin = "from " + o.max_rate_option + ": D0 = |" +
               detail::triple("%g", detail::as_vector(o.axis_rates)) + " rad/s|";
    } else {
      origin = "from " + o.max_rate_option + ": D0 = max |w|";
    }
    if (o.has_bandwidth) {
      origin += number_text(", D_k = (2*pi*B)^k * D0 with B = %g Hz (Bernstein)", o.bandwidth_hz);
    }
    std::printf("  manoeuvre envelope (%s):\n", origin.c_str());
    for (std::size_t k = 0; k < 6; ++k) {
      const double dk = d.maneuver[k];
      std::string source;
      if (!o.envelope.empty()) {
        source = k >= o.envelope.size() ? "unknown: not given"
                 : d.maneuver.known(k)  ? "given"
                                        : "unknown: given as unknown";
      } else if (k == 0) {
        source = "given";
        if (o.max_rate_option == "--max-rate-deg" || o.max_rate_option == "--axis-rates-deg") {
          source += number_text(" (%g deg/s)", dk * detail::degrees_per_radian);
        }
      } else {
        source =
            o.has_bandwidth ? "Bernstein from max rate and bandwidth" : "unknown: no --bandwidth";
      }
      if (d.maneuver.known(k)) {
        std::printf("    D%zu = %.6e %-8s %s\n", k, dk, derivative_unit(k).c_str(), source.c_str());
      } else {
        std::printf("    D%zu = unknown (%s): %s\n", k, derivative_unit(k).c_str(),
                    source.substr(std::string("unknown: ").size()).c_str());
      }
    }
    if (o.has_bandwidth) {
      std::printf(
          "    assumption (yours to own): every rate component is band-limited to %g Hz, no\n"
          "    content above it at all; vibration above it must be given as --vibration lines\n",
          o.bandwidth_hz);
    }
  }
  for (std::size_t i = 0; i < d.vibration.count; ++i) {
    const VibrationLine<double>& line = d.vibration.line.at(i);
    const double w = line.angular_frequency();
    const Vector3<double> angle = line.rate_amplitude / w;
    std::printf("  vibration line %zu (--vibration %s): %g Hz\n", i + 1,
                o.vibration.at(i).text.c_str(), line.frequency_hz);
    std::printf("    rate amplitude  %s rad/s\n",
                detail::triple("%.6e", line.rate_amplitude).c_str());
    std::printf("    angle amplitude %s rad = %s deg\n", detail::triple("%.6e", angle).c_str(),
                detail::triple("%.6e", angle * detail::degrees_per_radian).c_str());
    if (line.phases_known) {
      std::printf("    phases          %s deg (known)\n",
                  detail::triple("%g", line.phase * detail::degrees_per_radian).c_str());
    } else {
      std::printf("    phases          unknown (bounds hold for every phase)\n");
    }
  }
  if (d.coning.present()) {
    std::printf("  coning: half-angle %g deg (%.6e rad) at %g Hz\n", o.coning_deg,
                d.coning.half_angle, d.coning.frequency_hz);
  }
  const RateEnvelope<double> e = d.envelope();
  std::printf("  whole motion, sum of the parts (what envelope-based bounds use):\n   ");
  for (std::size_t k = 0; k < 6; ++k) {
    if (e.known(k)) {
      std::printf(" D%zu %.3e", k, e[k]);
    } else {
      std::printf(" D%zu unknown", k);
    }
  }
  std::printf("\n\n");
}

}  // namespace halfspin::tools::stepstudy
