// halfspin-stepstudy: steppers × steps × scalar types, measured against the exact truth of a
// motion and against the library's a-priori horizon bounds; with a budget, the recommended method
// and step (bounds layer: recommend_stepper at the gyro rate, select_step per studied method).
// `halfspin-stepstudy --help` documents the options, units and exit codes.
//
// Caution: the bounds and measurements support engineering judgement; validate in
// hardware-in-the-loop and flight test under local airworthiness rules and licensed practice.

#include <unistd.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <fstream>
#include <limits>
#include <string>
#include <tuple>
#include <type_traits>
#include <utility>
#include <vector>

#include "advice.hpp"
#include "first_order_update.hpp"
#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/recommendation.hpp"
#include "halfspin/bounds/step_selection.hpp"
#include "log_study.hpp"
#include "measure.hpp"
#include "method_registry.hpp"
#include "number_text.hpp"
#include "options.hpp"
#include "reference_run.hpp"
#include "sensor_report.hpp"
#include "study_motions.hpp"
#include "svg_chart.hpp"
#include "vehicle_description.hpp"

namespace {

using namespace halfspin;
using namespace halfspin::tools;
using namespace halfspin::tools::stepstudy;

constexpr int exit_ok = 0;
constexpr int exit_usage = 1;
constexpr int exit_failure = 2;
constexpr int exit_no_recommendation = 3;
constexpr double degree = 3.14159265358979323846 / 180.0;

// One row of the table: NaN where not measured.
struct Row {
  std::string method;
  std::string scalar;
  double step_s = 0;
  std::int64_t steps = 0;
  double max_error_rad = std::numeric_limits<double>::quiet_NaN();
  double bound_rad = std::numeric_limits<double>::quiet_NaN();
  std::string bound_note;  // why there is no finite bound ("needs D3", ...); empty when there is
  double order = std::numeric_limits<double>::quiet_NaN();
  double ns_per_step = std::numeric_limits<double>::quiet_NaN();
  double local_error_sum_rad = std::numeric_limits<double>::quiet_NaN();  // --local-errors
  bool reference = false;  // the first-order firmware update (--baseline), not a halfspin method
};

// The sample-driven steppers of the catalogue as a StepperList (recommend_stepper's candidates).
template <class Tuple>
struct SampleDriven;
template <class... S>
struct SampleDriven<std::tuple<S...>> {
  using tuple = decltype(std::tuple_cat(
      std::declval<std::conditional_t<S::layout != SampleLayout::rate_function, std::tuple<S>,
                                      std::tuple<>>>()...));
};
template <class Tuple>
struct AsStepperList;
template <class... S>
struct AsStepperList<std::tuple<S...>> {
  using type = StepperList<S...>;
};
using SampleDrivenList = AsStepperList<SampleDriven<AllMethods>::tuple>::type;

const MethodInfo* find_method(const std::string& name) {
  for (const MethodInfo& m : method_catalogue()) {
    if (name == m.name) {
      return &m;
    }
  }
  return nullptr;
}

std::vector<double> step_grid(double lo, double hi, int n) {
  std::vector<double> steps;
  if (n == 1) {
    steps.push_back(lo);
    return steps;
  }
  for (int i = 0; i < n; ++i) {
    const double f = static_cast<double>(i) / static_cast<double>(n - 1);
    steps.push_back(lo * std::pow(hi / lo, f));
  }
  return steps;
}

class Progress {
 public:
  explicit Progress(std::size_t total) : total_(total), on_(isatty(2) != 0) {}
  void show(std::size_t done, const std::string& what) const {
    if (on_) {
      std::fprintf(stderr, "\r[%3zu/%zu] %-60.60s", done, total_, what.c_str());
      std::fflush(stderr);
    }
  }
  void finish() const {
    if (on_) {
      std::fprintf(stderr, "\r%*s\r", 72, "");
      std::fflush(stderr);
    }
  }

 private:
  std::size_t total_;
  bool on_;
};

// The table's words for a report without a finite bound (bound_report.hpp); "" when it has one.
template <class T>
std::string bound_note(const BoundReport<T>& r) {
  switch (r.status) {
    case BoundStatus::ok:
      return "";
    case BoundStatus::needs_derivative:
      return "needs D" + std::to_string(r.needed_derivative);
    case BoundStatus::step_too_large:
      return "step too large";
    case BoundStatus::no_bound_for_stepper:
      return "no bound";
    case BoundStatus::invalid_arguments:
      return "invalid";
  }
  return "";
}

// The horizon the table's bounds cover (s): a truth run's length; in bounds-only mode --horizon
// when given (what the budget is for), else --duration.
double table_horizon(const Options& o) {
  return o.bounds_only && o.has_budget ? o.horizon : o.duration;
}

template <class T>
void set_bound(Row& row, const BoundReport<T>& r) {
  row.bound_rad = static_cast<double>(r.value_rad);
  row.bound_note = bound_note(r);
}

template <class Stepper, class T, class Accumulation>
Row study_point(const Options& o, const StudyMotion& motion, double dt, bool& failed) {
  Row row;
  row.method = Stepper::name;
  row.scalar = sizeof(T) == sizeof(float) ? "float" : "double";
  row.step_s = dt;
  const MotionDescription<T> d = description_in<T>(motion.description);
  if (o.bounds_only) {
    row.steps = steps_for_horizon(dt, table_horizon(o));
    set_bound(row, horizon_error_report<Stepper, T, Accumulation>(
                       d, static_cast<T>(dt), static_cast<T>(table_horizon(o))));
    return row;
  }
  const std::int64_t steps = std::max<std::int64_t>(1, std::llround(o.duration / dt));
  const MeasuredRun run = measure_run<Stepper, T, Accumulation>(motion.truth, dt, steps);
  if (!run.ok) {
    failed = true;
  }
  row.steps = run.steps;
  row.max_error_rad = run.max_error_rad;
  row.ns_per_step = run.ns_per_step;
  if (o.local_errors) {
    row.local_error_sum_rad = local_error_sum<Stepper, T>(motion.truth, dt, steps).sum_rad;
  }
  set_bound(row, horizon_error_report<Stepper, T, Accumulation>(
                     d, static_cast<T>(dt), static_cast<T>(static_cast<double>(steps) * dt)));
  return row;
}

// A row of the reference series (--baseline): the first-order firmware update on the truth
// motion, one latest rate sample per step; no a-priori bound exists for it.
template <class T>
Row reference_point(const Options& o, const StudyMotion& motion, double dt, bool& failed) {
  Row row;
  row.method = first_order_normalized_name;
  row.scalar = sizeof(T) == sizeof(float) ? "float" : "double";
  row.step_s = dt;
  row.reference = true;
  row.bound_note = "none";
  const std::int64_t steps = std::max<std::int64_t>(1, std::llround(o.duration / dt));
  const MeasuredRun run = measure_first_order_run<T>(motion.truth, dt, steps);
  if (!run.ok) {
    failed = true;
  }
  row.steps = run.steps;
  row.max_error_rad = run.max_error_rad;
  row.ns_per_step = run.ns_per_step;
  return row;
}

void fill_orders(std::vector<Row>& rows) {
  for (std::size_t i = 1; i < rows.size(); ++i) {
    const Row& a = rows[i - 1];
    Row& b = rows[i];
    if (a.method != b.method || a.scalar != b.scalar) {
      continue;
    }
    if (a.max_error_rad > 0 && b.max_error_rad > 0 && std::isfinite(a.max_error_rad) &&
        std::isfinite(b.max_error_rad) && b.step_s != a.step_s) {
      b.order = std::log(b.max_error_rad / a.max_error_rad) / std::log(b.step_s / a.step_s);
    }
  }
}

// The table; with noise terms, each bound as a fraction of the sensor-driven error over the same
// horizon (the criterion's view: at most --sensor-fraction meets it).
void print_table(const std::vector<Row>& rows, const Options& o) {
  const double sensor = sensor_error_over(o, table_horizon(o));
  std::printf("%-34s %-6s %10s %10s %11s %14s %6s %10s%s%s\n", "method", "scalar", "step (s)",
              o.bounds_only ? "steps" : "steps run", "max err rad", "bound (rad)", "order",
              "ns/step", o.has_sensor ? "  bound/sensor" : "",
              o.local_errors ? "  sum of local errors (rad)" : "");
  for (const Row& r : rows) {
    const std::string order = std::isfinite(r.order) ? number_text("%.2f", r.order) : "-";
    const std::string ns = std::isfinite(r.ns_per_step) ? number_text("%.1f", r.ns_per_step) : "-";
    const std::string bound = r.bound_note.empty() ? scientific_cell(r.bound_rad) : r.bound_note;
    const std::string fraction =
        o.has_sensor
            ? number_text("  %12.3g", r.bound_note.empty() ? r.bound_rad / sensor : std::nan(""))
            : "";
    const std::string local = o.local_errors ? "  " + scientific_cell(r.local_error_sum_rad) : "";
    std::printf("%-34s %-6s %10.3e %10lld %11s %14s %6s %10s%s%s\n", r.method.c_str(),
                r.scalar.c_str(), r.step_s, static_cast<long long>(r.steps),
                scientific_cell(r.max_error_rad).c_str(), bound.c_str(), order.c_str(), ns.c_str(),
                fraction.c_str(), local.c_str());
  }
}

bool write_csv(const std::string& path, const std::vector<Row>& rows, const Options& o) {
  std::ofstream out(path);
  if (!out) {
    return false;
  }
  out << "method,scalar,step_s,max_error_rad,bound_rad,ns_per_step" << (o.baseline ? ",series" : "")
      << (o.local_errors ? ",local_error_sum_rad" : "") << (o.has_sensor ? ",sensor_error_rad" : "")
      << '\n';
  auto field = [](double v) { return std::isnan(v) ? std::string() : number_text("%.17g", v); };
  const double sensor = sensor_error_over(o, table_horizon(o));
  for (const Row& r : rows) {
    out << r.method << ',' << r.scalar << ',' << number_text("%.17g", r.step_s) << ','
        << field(r.max_error_rad) << ',' << field(r.bound_rad) << ',' << field(r.ns_per_step);
    if (o.baseline) {
      out << ',' << (r.reference ? "reference" : "method");
    }
    if (o.local_errors) {
      out << ',' << field(r.local_error_sum_rad);
    }
    if (o.has_sensor) {
      out << ',' << field(sensor);
    }
    out << '\n';
  }
  return static_cast<bool>(out.flush());
}

bool write_svg(const std::string& path, const Options& o, const StudyMotion& motion,
               const std::vector<std::string>& methods, const std::vector<Row>& rows) {
  svg::Figure fig;
  fig.title = "halfspin step study: " + motion.name;
  fig.subtitle =
      motion.summary +
      (o.bounds_only ? "; bounds over " + number_text("%g s", table_horizon(o))
                     : "; errors and bounds over runs of " + number_text("%g s", o.duration));
  svg::Chart error_chart;
  error_chart.title =
      o.bounds_only ? "Horizon bound against step" : "Max attitude error against step";
  error_chart.x_label = "step (s)";
  error_chart.y_label = "attitude error (rad)";
  svg::Chart cost_chart;
  cost_chart.title = "Max attitude error against cost";
  cost_chart.x_label = "cost (ns per step, measured on this machine)";
  cost_chart.y_label = "max attitude error (rad)";
  // Like with like: the chart's errors and bounds cover table_horizon(o); a budget for a longer
  // (or shorter) --horizon is drawn scaled to it, as if the error grew linearly, and says so.
  const double budget_scale = o.has_budget ? table_horizon(o) / o.horizon : 1.0;
  const std::string budget_text =
      (budget_scale == 1.0
           ? "budget " + number_text("%.3e rad", o.budget) + " over " +
                 number_text("%g s", o.horizon)
           : "budget x " + number_text("%g s", table_horizon(o)) + " / " +
                 number_text("%g s", o.horizon) + " = " +
                 number_text("%.3e rad", o.budget * budget_scale) + " (linear growth assumed)") +
      budget_origin(o);
  if (o.has_budget) {
    error_chart.has_reference = true;
    error_chart.reference_y = o.budget * budget_scale;
    error_chart.reference_label = budget_text;
  }
  for (std::size_t m = 0; m < methods.size(); ++m) {
    fig.legend.push_back({methods[m], m});
    for (const char* scalar : {"double", "float"}) {
      const bool is_double = std::string(scalar) == "double";
      svg::Series measured{m,
                           svg::LineStyle::solid,
                           is_double ? svg::Marker::filled_circle : svg::Marker::open_square,
                           {}};
      svg::Series bound{
          m, is_double ? svg::LineStyle::dashed : svg::LineStyle::dotted, svg::Marker::none, {}};
      svg::Series cost{m,
                       svg::LineStyle::solid,
                       is_double ? svg::Marker::filled_circle : svg::Marker::open_square,
                       {}};
      for (const Row& r : rows) {
        if (r.method != methods[m] || r.scalar != scalar) {
          continue;
        }
        if (!o.bounds_only) {
          measured.points.emplace_back(r.step_s, r.max_error_rad);
          cost.points.emplace_back(r.ns_per_step, r.max_error_rad);
        }
        bound.points.emplace_back(r.step_s, r.bound_rad);
      }
      if (!measured.points.empty()) {
        error_chart.series.push_back(measured);
      }
      if (!bound.points.empty()) {
        error_chart.series.push_back(bound);
      }
      if (!cost.points.empty()) {
        cost.line = svg::LineStyle::none;  // ns/step barely changes with the step: points only
        cost_chart.series.push_back(cost);
      }
    }
  }
  if (o.baseline) {
    // The reference series: its own ink, its own legend words, a note in the subtitle and one
    // label in each chart, so that it cannot be read as one of the methods.
    fig.subtitle += "; brown: a reference, not a halfspin method";
    fig.legend.push_back(
        {std::string("reference: ") + first_order_normalized_label, svg::reference_series_colour});
    const std::string label = std::string(first_order_normalized_label) + " (reference)";
    bool labelled = false;
    for (const char* scalar : {"float", "double"}) {
      const bool is_double = std::string(scalar) == "double";
      svg::Series measured{svg::reference_series_colour,
                           svg::LineStyle::solid,
                           is_double ? svg::Marker::filled_circle : svg::Marker::open_square,
                           {}};
      svg::Series cost = measured;
      cost.line = svg::LineStyle::none;
      for (const Row& r : rows) {
        if (r.reference && r.scalar == scalar) {
          measured.points.emplace_back(r.step_s, r.max_error_rad);
          cost.points.emplace_back(r.ns_per_step, r.max_error_rad);
        }
      }
      if (measured.points.empty()) {
        continue;
      }
      if (!labelled) {
        // Above a point a third of the way along the steps (the largest step's end of the chart
        // meets the legend), and beside the costliest-but-one point of the cost chart.
        const auto& at = measured.points[measured.points.size() / 3];
        error_chart.labels.push_back({at.first, at.second, label, svg::reference_series_colour});
        auto by_cost = cost.points;
        std::sort(by_cost.begin(), by_cost.end());
        const auto& c = by_cost[by_cost.size() > 1 ? by_cost.size() - 2 : 0];
        cost_chart.labels.push_back({c.first, c.second, label, svg::reference_series_colour});
        labelled = true;
      }
      error_chart.series.push_back(measured);
      cost_chart.series.push_back(cost);
    }
  }
  if (!o.bounds_only) {
    if (o.want_double) {
      fig.keys.push_back({svg::LineStyle::solid, svg::Marker::filled_circle,
                          "double, measured (chart 2: points)"});
    }
    if (o.want_float) {
      fig.keys.push_back(
          {svg::LineStyle::solid, svg::Marker::open_square, "float, measured (chart 2: points)"});
    }
  }
  if (o.has_budget) {
    fig.reference_key = budget_text;
  }
  if (o.want_double) {
    fig.keys.push_back({svg::LineStyle::dashed, svg::Marker::none, "double, a-priori bound"});
  }
  if (o.want_float) {
    fig.keys.push_back({svg::LineStyle::dotted, svg::Marker::none, "float, a-priori bound"});
  }
  fig.charts.push_back(error_chart);
  if (!o.bounds_only) {
    fig.charts.push_back(cost_chart);
  }
  std::ofstream out(path);
  if (!out) {
    return false;
  }
  out << svg::render(fig);
  return static_cast<bool>(out.flush());
}

// The median of a few timings (ns per step): one figure per series that a momentary load on a
// shared machine does not decide.
double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v.empty() ? std::nan("") : v[v.size() / 2];
}

// One sample-driven stepper at the step the gyro rate gives it, in float, over the run: its
// error, its measured cost per second of flight (ns per step x steps per second).
struct AtGyroRate {
  std::string method;
  double step_s = 0;
  double max_error_rad = 0;
  double ns_per_step = 0;
  double ns_per_s = 0;
  bool ok = false;
};

template <class Accumulation>
std::vector<AtGyroRate> float_methods_at_gyro_rate(const Options& o, const StudyMotion& motion,
                                                   int repetitions, double& baseline_ns,
                                                   MeasuredRun& baseline) {
  std::vector<AtGyroRate> out;
  std::vector<std::vector<double>> ns;
  for_each_method([&](auto tag) {
    using S = typename decltype(tag)::type;
    if (S::layout == SampleLayout::rate_function) {
      return;  // a gyro delivers samples: these need a rate function
    }
    AtGyroRate a;
    a.method = S::name;
    a.step_s = static_cast<double>(periods_per_step(S::layout, S::window)) / o.gyro_rate;
    out.push_back(a);
    ns.emplace_back();
  });
  const double h = 1.0 / o.gyro_rate;
  const std::int64_t baseline_steps = std::max<std::int64_t>(1, std::llround(o.duration / h));
  std::vector<double> baseline_times;
  // Interleaved repetitions: a load change on the machine hits every series alike.
  for (int rep = 0; rep < repetitions; ++rep) {
    baseline = measure_first_order_run<float>(motion.truth, h, baseline_steps);
    baseline_times.push_back(baseline.ns_per_step);
    std::size_t i = 0;
    for_each_method([&](auto tag) {
      using S = typename decltype(tag)::type;
      if (S::layout == SampleLayout::rate_function) {
        return;
      }
      AtGyroRate& a = out[i];
      const std::int64_t n = std::max<std::int64_t>(1, std::llround(o.duration / a.step_s));
      const MeasuredRun run = measure_run<S, float, Accumulation>(motion.truth, a.step_s, n);
      a.ok = run.ok;
      a.max_error_rad = run.max_error_rad;
      ns[i].push_back(run.ns_per_step);
      ++i;
    });
  }
  baseline_ns = median(baseline_times);
  for (std::size_t i = 0; i < out.size(); ++i) {
    out[i].ns_per_step = median(ns[i]);
    out[i].ns_per_s = out[i].ns_per_step / out[i].step_s;
  }
  return out;
}

// --baseline with float: one line, the factor by which the most accurate sample-driven method
// that costs no more per second of flight than the first-order update (at one gyro period) beats
// its float error over the run, at --gyro-rate.
void print_same_cost_factor(const Options& o, const StudyMotion& motion, bool& failed) {
  constexpr int repetitions = 5;
  double baseline_ns = 0;
  MeasuredRun baseline;
  const std::vector<AtGyroRate> methods = o.compensated_float
                                              ? float_methods_at_gyro_rate<CompensatedAccumulation>(
                                                    o, motion, repetitions, baseline_ns, baseline)
                                              : float_methods_at_gyro_rate<PlainAccumulation>(
                                                    o, motion, repetitions, baseline_ns, baseline);
  if (!baseline.ok) {
    failed = true;
  }
  const double baseline_ns_per_s = baseline_ns * o.gyro_rate;
  const AtGyroRate* best = nullptr;
  int affordable = 0;
  for (const AtGyroRate& m : methods) {
    if (!m.ok) {
      failed = true;
      continue;
    }
    if (m.ns_per_s <= baseline_ns_per_s) {
      ++affordable;
      if (best == nullptr || m.max_error_rad < best->max_error_rad) {
        best = &m;
      }
    }
  }
  const std::string head = number_text("Same-cost factor (float, %g Hz gyro, ", o.gyro_rate) +
                           number_text("%g s of ", o.duration) + motion.name + ", median of " +
                           std::to_string(repetitions) +
                           " timings): " + first_order_normalized_name + " " +
                           number_text("%.3e rad at ", baseline.max_error_rad) +
                           number_text("%.1f us CPU per s of flight", baseline_ns_per_s * 1e-3);
  if (best == nullptr) {
    const AtGyroRate* cheapest = nullptr;
    for (const AtGyroRate& m : methods) {
      if (m.ok && (cheapest == nullptr || m.ns_per_s < cheapest->ns_per_s)) {
        cheapest = &m;
      }
    }
    if (cheapest == nullptr) {
      std::printf("%s; no halfspin run completed\n", head.c_str());
      return;
    }
    std::printf(
        "%s; no halfspin method of %zu costs no more: the cheapest, %s (step %.4e s), costs %.1f "
        "us/s (%.2fx) for %.3e rad (%.3gx smaller); target >= 100 at no higher cost: missed\n",
        head.c_str(), methods.size(), cheapest->method.c_str(), cheapest->step_s,
        cheapest->ns_per_s * 1e-3, cheapest->ns_per_s / baseline_ns_per_s, cheapest->max_error_rad,
        baseline.max_error_rad / cheapest->max_error_rad);
    return;
  }
  const double factor = baseline.max_error_rad / best->max_error_rad;
  std::printf(
      "%s; most accurate halfspin method no costlier (%d of %zu are): %s, step %.4e s, %.3e rad "
      "at %.1f us/s; factor %.3g (target >= 100: %s)\n",
      head.c_str(), affordable, methods.size(), best->method.c_str(), best->step_s,
      best->max_error_rad, best->ns_per_s * 1e-3, factor, factor >= 100 ? "met" : "missed");
}

const char* outcome_text(CandidateOutcome c) {
  switch (c) {
    case CandidateOutcome::meets_budget:
      return "meets the budget";
    case CandidateOutcome::over_budget:
      return "over budget";
    case CandidateOutcome::no_bound:
      return "no finite bound";
  }
  return "";
}

// The step (s) the gyro rate gives Stepper: its gyro periods per step over the sample rate, in T,
// as recommend_stepper computes it.
template <class Stepper, class T>
T gyro_step(const Options& o) {
  return static_cast<T>(periods_per_step(Stepper::layout, Stepper::window)) /
         static_cast<T>(o.gyro_rate);
}

// --fixes: per studied method at its gyro step, the longest time between external attitude fixes
// over which the worst-case bound stays within the budget (fix_interval.hpp).
template <class T, class Accumulation>
void print_fix_intervals(const Options& o, const MotionDescription<T>& d,
                         const std::vector<std::string>& methods) {
  std::printf(
      "  longest time between external attitude fixes meeting the budget, per studied method at\n"
      "  the step the %g Hz gyro gives it (longest_fix_interval; --horizon %g s asked)%s:\n",
      o.gyro_rate, o.horizon,
      interval_budget(o).has_sensor
          ? ";\n  with the sensor criterion over each interval itself, searched up to --horizon"
          : "");
  for (const std::string& name : methods) {
    visit_method(name, [&](auto tag) {
      using S = typename decltype(tag)::type;
      const T dt = gyro_step<S, T>(o);
      const FixInterval<T> f =
          longest_fix_interval_within<S, T, Accumulation>(d, dt, interval_budget(o), o.horizon);
      const double step = static_cast<double>(dt);
      switch (f.status) {
        case FixIntervalStatus::ok:
          std::printf(
              "    %-34s step %.4e s: longest time between fixes %.6e s (%lld steps, bound %.3e "
              "rad)%s\n",
              S::name, step, static_cast<double>(f.interval_s), static_cast<long long>(f.steps),
              static_cast<double>(f.bound_rad),
              static_cast<double>(f.interval_s) >= o.horizon ? ", covers --horizon"
                                                             : ", shorter than --horizon");
          break;
        case FixIntervalStatus::unbounded:
          std::printf(
              "    %-34s step %.4e s: longest time between fixes at least %.6e s (%lld steps, "
              "the search cap; bound %.3e rad), covers --horizon\n",
              S::name, step, static_cast<double>(f.interval_s), static_cast<long long>(f.steps),
              static_cast<double>(f.bound_rad));
          break;
        case FixIntervalStatus::not_one_step:
          std::printf(
              "    %-34s step %.4e s: no time between fixes: one step's bound %.3e rad exceeds "
              "the budget\n",
              S::name, step, static_cast<double>(f.next_bound_rad));
          break;
        case FixIntervalStatus::no_bound:
          std::printf("    %-34s step %.4e s: no finite bound (%s)\n", S::name, step,
                      bound_note(f.first_step).c_str());
          break;
        case FixIntervalStatus::invalid_arguments:
          std::printf("    %-34s step %.4e s: invalid arguments\n", S::name, step);
          break;
      }
    });
  }
}

struct Chosen {
  bool found = false;
  std::string method;
  bool delta = false;
  double step_s = 0;
  double bound_rad = 0;
};

// Every figure is a worst-case bound, with the roundoff term of the propagator's Accumulation.
template <class T, class Accumulation>
Chosen recommend(const Options& o, const StudyMotion& motion,
                 const std::vector<std::string>& methods, const char* scalar) {
  const MotionDescription<T> d = description_in<T>(motion.description);
  const char* figure = "bound";
  const auto r =
      recommend_stepper<T, Accumulation>(SampleDrivenList{}, d, static_cast<T>(o.budget),
                                         static_cast<T>(o.horizon), static_cast<T>(o.gyro_rate));
  std::printf(
      "\nRecommendation in %s, %s accumulation: budget %.3e rad (%.4f deg) over %g s%s, gyro %g "
      "Hz\n",
      scalar, Accumulation::name, o.budget, o.budget / degree, o.horizon, budget_origin(o).c_str(),
      o.gyro_rate);
  Chosen chosen;
  auto candidates = r.candidates;
  std::stable_sort(candidates.begin(), candidates.end(), [](const auto& a, const auto& b) {
    return a.cost_flops_per_s < b.cost_flops_per_s;
  });
  if (r.found) {
    const MethodInfo* info = find_method(r.name);
    chosen.found = true;
    chosen.method = r.name;
    chosen.delta = info != nullptr && carries_delta_angles(info->layout);
    // A whole number of gyro periods by construction; in float, periods/rate carries a rounding
    // (3/1000 is 0.0030000000261 as a float) that must not reach the file.
    chosen.step_s =
        std::round(static_cast<double>(r.candidates[r.index].step_s) * o.gyro_rate) / o.gyro_rate;
    chosen.bound_rad = static_cast<double>(r.bound_rad);
    std::printf(
        "  recommended: %s, step %.4e s (%.1f Hz updates, %s log), %s %.3e rad "
        "(%.4f deg), %.0f flop/s\n",
        r.name, chosen.step_s, 1.0 / chosen.step_s, chosen.delta ? "delta-angle" : "rate", figure,
        chosen.bound_rad, chosen.bound_rad / degree, static_cast<double>(r.cost_flops_per_s));
    std::printf(
        "  why: the cheapest sample-driven stepper (flops per step x steps per second) whose\n"
        "  worst-case horizon bound at this gyro rate meets the budget; the cheaper ones:\n");
  } else {
    std::printf("  no sample-driven stepper meets the budget at this gyro rate; candidates:\n");
  }
  bool any_cheaper = false;
  for (const auto& c : candidates) {
    any_cheaper = any_cheaper || !r.found || c.cost_flops_per_s < r.cost_flops_per_s;
  }
  if (!any_cheaper) {
    std::printf("    (none: it is the cheapest candidate)\n");
  }
  for (const auto& c : candidates) {
    if (r.found && !(c.cost_flops_per_s < r.cost_flops_per_s)) {
      continue;
    }
    std::printf("    %-30s %10.0f flop/s  step %.4e s  %s %s rad  %s\n", c.name,
                static_cast<double>(c.cost_flops_per_s), static_cast<double>(c.step_s), figure,
                scientific_cell(static_cast<double>(c.bound_rad)).c_str(), outcome_text(c.outcome));
  }
  std::printf("  largest step meeting the budget, per studied method (select_step):\n");
  for (const std::string& name : methods) {
    visit_method(name, [&](auto tag) {
      using S = typename decltype(tag)::type;
      const StepSelection<T> s =
          select_step<S, T, Accumulation>(d, static_cast<T>(o.budget), static_cast<T>(o.horizon));
      const double step = static_cast<double>(s.step_s);
      switch (s.status) {
        case StepSelectionStatus::ok:
          std::printf("    %-34s step %.4e s (%9.1f Hz updates, %9.1f Hz gyro)  %s %.3e rad\n",
                      S::name, step, static_cast<double>(s.update_rate_hz),
                      static_cast<double>(s.sample_rate_hz), figure,
                      static_cast<double>(s.bound_rad));
          break;
        case StepSelectionStatus::budget_unreachable:
          std::printf("    %-34s no step meets the budget (least %s %.3e rad at %.4e s)\n", S::name,
                      figure, static_cast<double>(s.minimum_bound_rad),
                      static_cast<double>(s.minimizing_step_s));
          break;
        case StepSelectionStatus::no_bound: {
          // Why, at the step the gyro rate gives this method (bound_report.hpp).
          const std::string why = bound_note(horizon_error_report<S, T, Accumulation>(
              d, gyro_step<S, T>(o), static_cast<T>(o.horizon)));
          std::printf("    %-34s no finite bound for this description%s%s\n", S::name,
                      why.empty() ? "" : ": ", why.c_str());
          break;
        }
        case StepSelectionStatus::invalid_arguments:
          std::printf("    %-34s invalid arguments\n", S::name);
          break;
      }
    });
  }
  if (o.fixes) {
    print_fix_intervals<T, Accumulation>(o, d, methods);
  }
  if (!r.found) {
    print_what_would_meet<T, Accumulation>(SampleDrivenList{}, motion.description, o.budget,
                                           o.horizon, o.gyro_rate, interval_budget(o));
  }
  return chosen;
}

}  // namespace

int main(int argc, char** argv) {
  Options o;
  std::string error;
  if (!parse_options(argc, argv, o, error)) {
    std::fprintf(stderr, "halfspin-stepstudy: %s\n(see halfspin-stepstudy --help)\n",
                 error.c_str());
    return exit_usage;
  }
  if (o.help) {
    std::fputs(help_text(), stdout);
    return exit_ok;
  }
  if (o.methods.size() == 1 && o.methods[0] == "list") {
    std::printf("%-34s %-10s %5s %6s  %s\n", "method", "input", "order", "flops", "description");
    for (const MethodInfo& m : method_catalogue()) {
      const char* input = m.layout == SampleLayout::rate_function ? "function"
                          : carries_delta_angles(m.layout)        ? "delta"
                                                                  : "rate";
      std::printf("%-34s %-10s %5d %6d  %s\n", m.name, input, m.order, m.flops, m.description);
    }
    return exit_ok;
  }
  if (!o.log.file.empty()) {
    return run_log_study(o);  // a gyro log studied without truth (log_study.cpp)
  }

  // The motion: a truth motion, or a description alone.
  StudyMotion motion;
  if (o.bounds_only) {
    motion.name = "description";
    std::string summary;
    motion.description = vehicle_description(o, summary);
    motion.summary = summary;
    motion.description_summary = summary;
    motion.default_step_min = 1e-4;
    motion.default_step_max = 1e-2;
  } else if (!make_study_motion(o.motion, motion)) {
    std::fprintf(
        stderr,
        "halfspin-stepstudy: unknown motion '%s' (constant, oscillation, coning, body, demo)\n",
        o.motion.c_str());
    return exit_usage;
  }
  const double step_min = o.step_min > 0 ? o.step_min : motion.default_step_min;
  const double step_max = o.step_max > 0 ? o.step_max : motion.default_step_max;
  if (step_max < step_min || (o.steps == 1 && step_max != step_min) ||
      (o.steps > 1 && step_max == step_min)) {
    std::fprintf(stderr,
                 "halfspin-stepstudy: need --step-min < --step-max for --steps > 1, equal for 1\n");
    return exit_usage;
  }
  if (step_max > o.duration) {
    std::fprintf(stderr,
                 "halfspin-stepstudy: the largest step (%g s) is longer than --duration (%g s)\n",
                 step_max, o.duration);
    return exit_usage;
  }

  // The methods.
  std::vector<std::string> methods;
  for (const std::string& name : requested_method_names(o)) {
    if (find_method(name) == nullptr) {
      std::fprintf(stderr, "halfspin-stepstudy: unknown method '%s' (--methods list shows them)\n",
                   name.c_str());
      return exit_usage;
    }
    if (std::find(methods.begin(), methods.end(), name) == methods.end()) {
      methods.push_back(name);
    }
  }
  if (o.bounds_only) {
    std::vector<std::string> kept;
    for (const std::string& name : methods) {
      if (find_method(name)->layout == SampleLayout::rate_function) {
        std::printf("note: %s left out (rate-function steppers need a truth motion)\n",
                    name.c_str());
      } else {
        kept.push_back(name);
      }
    }
    methods = kept;
    if (methods.empty()) {
      std::fprintf(stderr, "halfspin-stepstudy: no sample-driven method to study\n");
      return exit_usage;
    }
  }

  const std::vector<double> steps = step_grid(step_min, step_max, o.steps);
  std::vector<const char*> scalars;
  if (o.want_float) {
    scalars.push_back("float");
  }
  if (o.want_double) {
    scalars.push_back("double");
  }

  std::printf("halfspin step study\n");
  std::printf("  motion:      %s%s\n", o.bounds_only ? "" : (motion.name + ": ").c_str(),
              motion.summary.c_str());
  std::printf("  bounds from: %s\n", motion.description_summary.c_str());
  if (o.bounds_only) {
    std::printf("  the table's bounds cover %g s (%s); steps %.3e .. %.3e s (%d, log-spaced)\n",
                table_horizon(o), o.has_budget ? "--horizon" : "--duration", step_min, step_max,
                o.steps);
  } else {
    std::printf(
        "  each run:    %g s (the table's errors and bounds cover the run%s); steps %.3e .. "
        "%.3e s (%d, log-spaced)\n",
        o.duration,
        o.has_budget ? (", the recommendation --horizon " + number_text("%g s", o.horizon)).c_str()
                     : "",
        step_min, step_max, o.steps);
  }
  std::printf(
      "  policies:    first-order renormalization; accumulation float %s, double plain (the\n"
      "               propagator's defaults%s)\n\n",
      o.compensated_float ? "compensated" : "plain",
      o.compensated_float ? "" : ", but float plain as --accumulation asks");
  if (o.bounds_only) {
    print_vehicle_description(o, motion.description);
  }
  print_sensor_errors(o);

  std::vector<Row> rows;
  Progress progress(methods.size() * scalars.size() * steps.size());
  std::size_t done = 0;
  bool failed = false;
  for (const std::string& name : methods) {
    visit_method(name, [&](auto tag) {
      using S = typename decltype(tag)::type;
      for (const char* scalar : scalars) {
        for (const double dt : steps) {
          progress.show(++done, name + " " + scalar + " step " + number_text("%.3e s", dt));
          if (std::string(scalar) == "double") {
            rows.push_back(study_point<S, double, PlainAccumulation>(o, motion, dt, failed));
          } else if (o.compensated_float) {
            rows.push_back(study_point<S, float, CompensatedAccumulation>(o, motion, dt, failed));
          } else {
            rows.push_back(study_point<S, float, PlainAccumulation>(o, motion, dt, failed));
          }
        }
      }
    });
  }
  if (o.baseline) {
    for (const char* scalar : scalars) {
      for (const double dt : steps) {
        if (std::string(scalar) == "double") {
          rows.push_back(reference_point<double>(o, motion, dt, failed));
        } else {
          rows.push_back(reference_point<float>(o, motion, dt, failed));
        }
      }
    }
  }
  progress.finish();
  fill_orders(rows);
  std::printf(
      o.bounds_only ? "Bounds over %g s:\n" : "Max errors and bounds over each run of %g s:\n",
      table_horizon(o));
  print_table(rows, o);
  if (o.has_sensor) {
    std::printf(
        "bound/sensor: each bound over %g s divided by the sensor-driven error over the same %g s\n"
        "(%.3e rad, combined as above); the criterion asks at most %g over --horizon.\n",
        table_horizon(o), table_horizon(o), sensor_error_over(o, table_horizon(o)),
        o.sensor_fraction);
  }
  if (o.baseline) {
    std::printf(
        "%s (bound 'none'): the %s, q + dt/2 q x (0, w) with the latest\n"
        "rate sample, then q/|q|; a reference, not a halfspin method: no a-priori bound, never "
        "recommended.\n",
        first_order_normalized_name, first_order_normalized_label);
    if (o.want_float) {
      print_same_cost_factor(o, motion, failed);
    }
  }
  if (failed) {
    std::fprintf(stderr, "halfspin-stepstudy: a run did not complete (a sample was rejected)\n");
  }

  int status = failed ? exit_failure : exit_ok;
  if (!o.csv.empty() && !write_csv(o.csv, rows, o)) {
    std::fprintf(stderr, "halfspin-stepstudy: cannot write %s\n", o.csv.c_str());
    status = exit_failure;
  }
  if (!o.svg.empty() && !write_svg(o.svg, o, motion, methods, rows)) {
    std::fprintf(stderr, "halfspin-stepstudy: cannot write %s\n", o.svg.c_str());
    status = exit_failure;
  }

  if (o.has_budget) {
    // Every requested scalar gets its recommendation; the file takes double's when double is
    // studied, else float's.
    Chosen file_choice;
    if (o.want_float) {
      if (o.compensated_float) {
        file_choice = recommend<float, CompensatedAccumulation>(o, motion, methods, "float");
      } else {
        file_choice = recommend<float, PlainAccumulation>(o, motion, methods, "float");
        if (!file_choice.found) {
          // The plain policy's rounding, N·c·u, is what fails in float over long horizons; show
          // what the compensated policy allows. It never feeds the recommendation file.
          recommend<float, CompensatedAccumulation>(o, motion, methods, "float");
        }
      }
    }
    if (o.want_double) {
      file_choice = recommend<double, PlainAccumulation>(o, motion, methods, "double");
    }
    if (!o.recommendation_file.empty()) {
      std::printf("\nRecommendation file %s: the %s recommendation\n",
                  o.recommendation_file.c_str(), o.want_double ? "double" : "float");
    }
    if (!o.recommendation_file.empty()) {
      if (!file_choice.found) {
        std::fprintf(stderr, "halfspin-stepstudy: no stepper meets the budget; %s not written\n",
                     o.recommendation_file.c_str());
        if (status == exit_ok) {
          status = exit_no_recommendation;
        }
      } else {
        std::ofstream out(o.recommendation_file);
        out << "method=" << file_choice.method << '\n'
            << "form=" << (file_choice.delta ? "delta" : "rate") << '\n'
            << "step_s=" << number_text("%.17g", file_choice.step_s) << '\n'
            << "gyro_rate_hz=" << number_text("%.17g", o.gyro_rate) << '\n'
            << "bound_rad=" << number_text("%.17g", file_choice.bound_rad) << '\n';
        if (!out.flush()) {
          std::fprintf(stderr, "halfspin-stepstudy: cannot write %s\n",
                       o.recommendation_file.c_str());
          status = exit_failure;
        }
      }
    }
  }
  std::printf(
      "\nCaution: bounds and measurements support engineering judgement. Validate in\n"
      "hardware-in-the-loop and flight test, under local airworthiness rules and licensed "
      "practice.\n");
  return status;
}
