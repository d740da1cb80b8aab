#pragma once
// halfspin-stepstudy: the gyro's own error beside the integration error. Prints the attitude
// error each noise term causes over --horizon (include/halfspin/bounds/sensor_error.hpp), the
// fraction criterion it gives, and which budget the study uses. Tool code.

#include <array>
#include <cstdio>
#include <limits>
#include <string>

#include "halfspin/bounds/sensor_error.hpp"
#include "interval_budget.hpp"
#include "number_text.hpp"
#include "options.hpp"

namespace halfspin::tools::stepstudy {

// Where the study's budget comes from, for labels: "" without noise terms.
inline std::string budget_origin(const Options& o) {
  if (!o.has_sensor || !(o.sensor_budget > 0)) {
    return "";
  }
  const std::string criterion =
      number_text("%g %%", 100 * o.sensor_fraction) + " of the sensor-driven error";
  if (!o.has_absolute_budget) {
    return " (" + criterion + ")";
  }
  return o.budget == o.sensor_budget ? " (" + criterion + ", stricter than --budget)"
                                     : " (--budget, stricter than " + criterion + ")";
}

// The combined sensor-driven error (rad) over `horizon_s`, NaN without noise terms.
inline double sensor_error_over(const Options& o, double horizon_s) {
  return o.has_sensor ? sensor_attitude_error(o.sensor, horizon_s).combined_rad
                      : std::numeric_limits<double>::quiet_NaN();
}

// The budget over an interval between fixes (interval_budget.hpp) for these options.
inline IntervalBudget interval_budget(const Options& o) {
  IntervalBudget b;
  if (o.has_sensor && o.sensor_budget > 0) {
    b.has_sensor = true;
    b.sensor = o.sensor;
    b.fraction = o.sensor_fraction;
    if (o.has_absolute_budget) {
      b.absolute_rad = o.absolute_budget;
    }
  } else {
    b.absolute_rad = o.budget;
  }
  return b;
}

// The block printed before the table when noise terms are given.
inline void print_sensor_errors(const Options& o) {
  if (!o.has_sensor) {
    return;
  }
  constexpr double degree = 3.14159265358979323846 / 180;
  const GyroNoiseTerms<double>& g = o.sensor;
  const SensorAttitudeError<double> e = sensor_attitude_error(g, o.horizon);
  std::printf(
      "Sensor-driven attitude error over --horizon %g s, per axis (bounds/sensor_error.hpp):\n",
      o.horizon);
  struct Line {
    const char* term;
    double value;      // SI
    const char* unit;  // SI
    double datasheet;  // in the datasheet unit
    const char* datasheet_unit;
    const char* formula;
    double error_rad;
    const char* note;
  };
  const std::array<Line, 4> lines{{
      {"angle random walk N", g.angle_random_walk, "rad/sqrt(s)", g.angle_random_walk / degree * 60,
       "deg/sqrt(h)", "N*sqrt(t)", e.angle_random_walk_rad, " (1 sigma)"},
      {"rate random walk K", g.rate_random_walk, "rad/s/sqrt(s)",
       g.rate_random_walk / degree * 3600 * 60, "deg/h/sqrt(h)", "K*t^1.5/sqrt(3)",
       e.rate_random_walk_rad, " (1 sigma)"},
      {"bias instability B", g.bias_instability, "rad/s", g.bias_instability / degree * 3600,
       "deg/h", "B*t", e.bias_instability_rad, " (the trade's rule for the bias wander)"},
      {"residual bias b", g.residual_bias, "rad/s", g.residual_bias / degree * 3600, "deg/h",
       "|b|*t", e.residual_bias_rad, ""},
  }};
  for (const Line& l : lines) {
    std::printf("  %-20s %10.3e %-13s = %9.4g %-13s %-16s %.3e rad%s\n", l.term, l.value, l.unit,
                l.datasheet, l.datasheet_unit, l.formula, l.error_rad, l.note);
  }
  std::printf("  %-84s %.3e rad (%.4f deg)\n", "combined (root-sum-square)", e.combined_rad,
              e.combined_rad / degree);
  if (!(o.sensor_budget > 0)) {
    std::printf("  no criterion from a perfect gyro: the study uses --budget %.3e rad\n\n",
                o.absolute_budget);
    return;
  }
  std::printf(
      "  criterion: the integration error at most %g %% of it (--sensor-fraction): %.3e rad\n",
      100 * o.sensor_fraction, o.sensor_budget);
  if (o.has_absolute_budget) {
    std::printf("  the study's budget: the stricter of it and --budget %.3e rad: %.3e rad%s\n\n",
                o.absolute_budget, o.budget, budget_origin(o).c_str());
  } else {
    std::printf("  the study's budget: the criterion's, %.3e rad\n\n", o.budget);
  }
}

}  // namespace halfspin::tools::stepstudy
