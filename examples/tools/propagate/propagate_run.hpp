#pragma once
// One run of halfspin-propagate: the gyro log, line by line, through the library's Propagator
// with the chosen stepper and scalar type, each completed step written as it happens. The checks
// the tool adds to the propagator's own (sample beyond the scalar type, time order, gaps, the
// first rate row, a zero first delta-angle row at the start time) and the units of the log are
// handled here, with the motion's peak rate and total angle for the summary; formatting is in
// propagate_output.hpp. Tool code.
//
//   run_log(opt, reader, layout, out, truth)   runs opt.method (a log method) on the log whose
//                                              header `reader` has read (layout: its columns
//                                              and form); returns the exit code

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <limits>
#include <optional>
#include <string>
#include <type_traits>

#include "gyro_log.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/representations/euler_angles.hpp"
#include "method_registry.hpp"
#include "propagate_options.hpp"
#include "propagate_output.hpp"
#include "truth_track.hpp"

namespace halfspin::tools::propagate {

// The library's policies behind one run-time choice (each apply() is the library's own).
template <class T>
struct SelectedRenormalization {
  Renormalize kind = Renormalize::first_order;
  NoRenormalization none{};
  ExactRenormalization exact{};
  FirstOrderRenormalization first_order{};
  PeriodicRenormalization<ExactRenormalization> periodic{};
  ThresholdRenormalization<T, ExactRenormalization> threshold{};

  Quaternion<T> apply(const Quaternion<T>& q) noexcept {
    switch (kind) {
      case Renormalize::none:
        return none.apply(q);
      case Renormalize::exact:
        return exact.apply(q);
      case Renormalize::first_order:
        return first_order.apply(q);
      case Renormalize::periodic:
        return periodic.apply(q);
      case Renormalize::threshold:
        return threshold.apply(q);
    }
    return q;
  }
};

// `x` in the scalar type T, ±infinity beyond T's finite range: converting an out-of-range double
// to float is undefined behaviour in C++ ([conv.double]), so it is never done directly.
template <class T>
T to_scalar(double x) noexcept {
  if (std::fabs(x) > static_cast<double>(std::numeric_limits<T>::max())) {
    return std::signbit(x) ? -std::numeric_limits<T>::infinity()
                           : std::numeric_limits<T>::infinity();
  }
  return static_cast<T>(x);
}

template <class T>
Quaternion<T> to_scalar_quaternion(const Quaternion<double>& q) noexcept {
  return Quaternion<T>{static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y),
                       static_cast<T>(q.z)};
}

template <class T>
constexpr const char* scalar_name() noexcept {
  return std::is_same<T, float>::value ? "float" : "double";
}

template <class T, class Stepper, class Accumulation>
class LogRun {
 public:
  LogRun(const Options& opt, NumericCsvReader<4>& reader, const GyroLogLayout& layout,
         std::FILE* out, TruthTrack* truth)
      : opt_(opt),
        reader_(reader),
        form_(layout.form),
        names_{{layout.name[0].c_str(), layout.name[1].c_str(), layout.name[2].c_str(),
                layout.name[3].c_str()}},
        gyro_scale_(opt.rate_unit == "deg/s" || opt.angle_unit == "deg" ? pi<double> / 180.0 : 1.0),
        column_(layout.column),
        out_(out),
        truth_(truth),
        seq_(euler_name(opt.euler)),
        q0_(to_scalar_quaternion<T>(normalized(opt.initial))),
        max_interval_(opt.max_interval),
        max_rate_(to_scalar<T>(opt.max_rate)),
        start_time_(layout.form == GyroLogForm::delta_angle ? opt.start_time : 0.0),
        have_prev_time_(layout.form == GyroLogForm::delta_angle),
        truth_initial_done_(!opt.initial_from_truth) {
    policy_.kind = opt.renormalize;
    policy_.periodic.period = opt.period;
    policy_.threshold.threshold = to_scalar<T>(opt.threshold);
  }

  // The whole run: header, every line, the end checks, the summary. The exit code.
  int run() {
    write_output_header(out_, seq_, has_estimate);
    if (max_interval_) make_propagator(*max_interval_);
    if (!read_log() || !check_end()) return exit_input;
    print_summary(summary());
    return exit_ok;
  }

 private:
  static constexpr bool has_estimate = has_error_estimate<Stepper, T>::value;
  static constexpr int digits = std::is_same<T, float>::value ? 9 : 17;
  using Prop = Propagator<T, Stepper, SelectedRenormalization<T>, Accumulation>;
  enum class Verdict { use, skip, fatal };  // of one check on a sample

  // The gap limit is known from --max-interval or from the first interval.
  void make_propagator(double max_step) {
    prop_.emplace(q0_, GyroLimits<T>{max_rate_, to_scalar<T>(max_step)}, T(0), policy_);
  }

  void bad(std::size_t line, const std::string& reason) const {
    report_bad_line(opt_.log, line, reason);
  }

  // Every line of the log; false at the first fatal problem (reported).
  bool read_log() {
    std::array<double, 4> v{};
    while (true) {
      const ReadOutcome r = reader_.next(v, names_);
      if (r == ReadOutcome::end) return true;
      ++samples_read_;
      const std::size_t line = reader_.line();
      const bool ok = r == ReadOutcome::bad ? bad_line(line, v) : sample_line(line, v);
      if (!ok) return false;
    }
  }

  // A line the reader rejected: fatal, or counted and skipped with --skip-bad.
  bool bad_line(std::size_t line, const std::array<double, 4>& v) {
    const LineProblem p = reader_.problem();
    if (!opt_.skip_bad) {
      bad(line, reader_.message());
      return false;
    }
    if (p == LineProblem::non_finite) {
      ++skipped_.non_finite;
    } else if (p == LineProblem::non_numeric) {
      ++skipped_.non_numeric;
    } else {
      ++skipped_.malformed;
    }
    // A finite, increasing timestamp with non-finite values still marks the interval: the
    // propagator sees the sample (and counts its rejection), and the next interval starts here.
    const bool time_ok = p == LineProblem::non_finite && std::isfinite(v[0]);
    if (!time_ok || !have_prev_time_ || !prop_) return true;
    const std::optional<double> dt = interval_to(v[0]);
    if (!dt) return true;
    const std::array<double, 4> u = in_units(v);
    static_cast<void>(prop_->push(
        Vector3<T>{to_scalar<T>(u[1]), to_scalar<T>(u[2]), to_scalar<T>(u[3])}, to_scalar<T>(*dt)));
    advance(v[0], line);
    return true;
  }

  // A well-formed line: checked, then pushed. False on a fatal problem (reported).
  bool sample_line(std::size_t line, const std::array<double, 4>& raw) {
    const std::array<double, 4> v = in_units(raw);
    const double t = v[0];
    const Verdict range = scalar_range(line, v);
    if (range != Verdict::use) return range == Verdict::skip;
    if (!have_prev_time_) {  // rate form, first row: the start
      hold_first_row(line, v, raw[0]);
      return true;
    }
    if (previous_is_start_time() && is_log_start(t, v)) {
      start_row_line_ = line;
      advance(raw[0], line);
      return true;
    }
    const std::optional<double> interval = interval_to(raw[0]);
    if (!interval) {
      if (!opt_.skip_bad) return fail(line, not_after_previous_message(raw[0], v));
      ++skipped_.time_not_increasing;
      return true;
    }
    const double dt = *interval;
    if (!max_interval_) {
      max_interval_ = 2.5 * dt;
      first_interval_ = dt;
      make_propagator(*max_interval_);
    }
    if (!start_from_truth() || !push_held_first(dt)) return false;
    if (dt > *max_interval_) {
      if (!opt_.skip_bad) {
        return fail(line, gap_message(dt, *max_interval_, line_of_previous_time_,
                                      opt_.max_interval ? 0.0 : first_interval_));
      }
      ++skipped_.gap;
    }
    advance(raw[0], line);
    const Vector3<T> sample{static_cast<T>(v[1]), static_cast<T>(v[2]), static_cast<T>(v[3])};
    return push(sample, dt, t, line, true);
  }

  // The row in tool units: t in s, the gyro columns in rad/s or rad.
  std::array<double, 4> in_units(const std::array<double, 4>& raw) const noexcept {
    return {raw[0] / opt_.time_divisor, raw[1] * gyro_scale_, raw[2] * gyro_scale_,
            raw[3] * gyro_scale_};
  }

  // Whether the previous time is --start-time (a delta-angle log before its first used row).
  bool previous_is_start_time() const noexcept {
    return form_ == GyroLogForm::delta_angle && line_of_previous_time_ == 0;
  }

  // A zero delta-angle at the start time: the log's start (an empty interval), not a sample.
  bool is_log_start(double t, const std::array<double, 4>& v) const noexcept {
    return t == start_time_ && v[1] == 0.0 && v[2] == 0.0 && v[3] == 0.0;
  }

  // The interval (s) from the previous time to the log time `raw_t`, if it is after it: a
  // difference in the log's time unit, then converted (exact for integer stamps in ms or us).
  std::optional<double> interval_to(double raw_t) const noexcept {
    if (previous_is_start_time()) {
      const double t = raw_t / opt_.time_divisor;
      if (!(t > start_time_)) return std::nullopt;
      return t - start_time_;
    }
    if (!(raw_t > prev_raw_time_)) return std::nullopt;
    return (raw_t - prev_raw_time_) / opt_.time_divisor;
  }

  // The previous time is now the row at `line` with log time raw_t.
  void advance(double raw_t, std::size_t line) noexcept {
    prev_raw_time_ = raw_t;
    line_of_previous_time_ = line;
  }

  // Why the row at log time raw_t (values v in tool units) is not after the previous time,
  // naming what it was compared with.
  std::string not_after_previous_message(double raw_t, const std::array<double, 4>& v) const {
    const std::string stamp = log_time_text(raw_t, opt_.time_unit, opt_.time_divisor);
    if (previous_is_start_time()) {
      return start_time_message(stamp, v[0], start_time_, {v[1], v[2], v[3]});
    }
    return time_not_increasing_message(
        stamp, log_time_text(prev_raw_time_, opt_.time_unit, opt_.time_divisor),
        line_of_previous_time_);
  }

  bool fail(std::size_t line, const std::string& reason) {
    bad(line, reason);
    return false;
  }

  // A finite double beyond the scalar type's range (float: 3.4e38) cannot be converted: such a
  // sample is fatal (reported), or counted and skipped with --skip-bad.
  Verdict scalar_range(std::size_t line, const std::array<double, 4>& v) {
    constexpr double largest = static_cast<double>(std::numeric_limits<T>::max());
    std::size_t beyond = 0;
    for (std::size_t i = 1; i < 4 && beyond == 0; ++i) {
      if (std::fabs(v[i]) > largest) beyond = i;
    }
    if (beyond == 0) return Verdict::use;
    if (opt_.skip_bad) {
      ++skipped_.over_range;
      return Verdict::skip;
    }
    bad(line, beyond_scalar_message(layout_column(beyond) + 1, names_[beyond], v[beyond],
                                    scalar_name<T>(), largest));
    return Verdict::fatal;
  }

  // The log's column (0-based) of role r (t, x, y, z).
  std::size_t layout_column(std::size_t r) const noexcept { return column_[r]; }

  // Rate form: the first row opens the first window; it is held until the first interval is
  // known (its own interval lies before the start and is not used by the stepper).
  void hold_first_row(std::size_t line, const std::array<double, 4>& v, double raw_t) {
    have_prev_time_ = true;
    advance(raw_t, line);
    start_time_ = v[0];
    held_first_ = v;
    held_line_ = line;
    note_motion(Vector3<T>{static_cast<T>(v[1]), static_cast<T>(v[2]), static_cast<T>(v[3])}, 0.0,
                v[0]);
  }

  // The start row opens the window of steppers whose window spans the step; a rate-at-end stepper
  // does not use it. Its nominal interval (unused by the stepper) is the first interval, capped
  // at the gap limit so that validation passes.
  bool push_held_first(double dt) {
    if (!held_first_) return true;
    const std::array<double, 4> h = *held_first_;
    held_first_.reset();
    if (Stepper::layout != SampleLayout::rates_spanning) return true;
    return push(Vector3<T>{static_cast<T>(h[1]), static_cast<T>(h[2]), static_cast<T>(h[3])},
                std::fmin(dt, *max_interval_), h[0], held_line_, false);
  }

  // --initial truth: the attitude is reset to the truth at the start time, once.
  bool start_from_truth() {
    if (truth_initial_done_) return true;
    Quaternion<double> qt;
    if (!truth_->at(start_time_, qt)) return false;
    if (!(norm(qt) > 0.0)) {
      std::fprintf(stderr, "%s: truth attitude at the start time is zero\n", opt_.truth.c_str());
      return false;
    }
    prop_->reset(to_scalar_quaternion<T>(normalized(qt)));
    truth_initial_done_ = true;
    return true;
  }

  // Pushes one sample; false on a fatal problem (reported). `counted`: the sample enters the peak
  // rate and the total angle once the propagator has taken it.
  bool push(const Vector3<T>& v, double dt, double t, std::size_t line, bool counted) {
    const Status s = prop_->push(v, to_scalar<T>(dt));
    if (counted && (s == Status::ok || s == Status::waiting_for_samples)) note_motion(v, dt, t);
    if (s == Status::ok) return emit(t);
    if (s == Status::over_range) {
      if (!opt_.skip_bad) return fail(line, over_range_message(largest_axis(v, dt), opt_.max_rate));
      ++skipped_.over_range;
    } else if (s == Status::non_finite && !opt_.skip_bad) {
      // The input was checked finite: the step's result overflowed the scalar type.
      return fail(line, non_finite_step_message(scalar_name<T>()));
    } else if (is_rejection(s) && !opt_.skip_bad) {
      return fail(line, std::string("sample rejected by the propagator: ") + status_name(s));
    }
    return true;
  }

  // The largest axis rate (rad/s) a sample stands for, and its name: |w_i|, or |d_i|/dt.
  AxisRate largest_axis(const Vector3<T>& v, double dt) const {
    AxisRate a;
    for (std::size_t i = 0; i < 3; ++i) {
      const double x = std::fabs(static_cast<double>(v[static_cast<int>(i)]));
      const double r = form_ == GyroLogForm::rate ? x : x / dt;
      if (r > a.rate) a = AxisRate{names_[i + 1], r, form_ == GyroLogForm::delta_angle};
    }
    return a;
  }

  // The peak |w| (a rate row's |w|, a delta-angle row's |delta|/dt) and the total angle (the
  // trapezoid rule on |w| over the rate rows, or the sum of |delta|).
  void note_motion(const Vector3<T>& v, double dt, double t) {
    const double magnitude = std::sqrt(static_cast<double>(v.x) * static_cast<double>(v.x) +
                                       static_cast<double>(v.y) * static_cast<double>(v.y) +
                                       static_cast<double>(v.z) * static_cast<double>(v.z));
    double rate = magnitude;
    if (form_ == GyroLogForm::delta_angle) {
      rate = magnitude / dt;
      motion_.total_angle += magnitude;
    } else {
      if (previous_magnitude_) motion_.total_angle += 0.5 * (*previous_magnitude_ + magnitude) * dt;
      previous_magnitude_ = magnitude;
    }
    if (rate > motion_.peak_rate) {
      motion_.peak_rate = rate;
      motion_.peak_time = t;
    }
  }

  // The row of the step that ended at t; with --truth, its error. False if truth has no row at t.
  bool emit(double t) {
    const std::array<double, 10> row = output_row(t);
    write_output_row(out_, row, has_estimate, digits);
    if (truth_ == nullptr) return true;
    Quaternion<double> qt;
    if (!truth_->at(t, qt)) return false;
    const double err = angle_between(Quaternion<double>{row[1], row[2], row[3], row[4]}, qt);
    if (err > truth_errors_.max_rad) {
      truth_errors_.max_rad = err;
      truth_errors_.max_time = t;
    }
    truth_errors_.final_rad = err;
    return true;
  }

  // t, q, Euler angles (deg), norm error, error estimate; updates the norm and gimbal counts.
  std::array<double, 10> output_row(double t) {
    const Quaternion<T> q = prop_->attitude();
    const EulerDecomposition<T> e = to_euler_angles(q, opt_.euler);
    if (e.near_singular) ++near_singular_rows_;
    const double norm_error = std::fabs(static_cast<double>(prop_->norm_error()));
    max_norm_error_ = std::fmax(max_norm_error_, norm_error);
    const T deg = T(180) / pi<T>;
    return {t,
            static_cast<double>(q.w),
            static_cast<double>(q.x),
            static_cast<double>(q.y),
            static_cast<double>(q.z),
            static_cast<double>(e.angles.first * deg),
            static_cast<double>(e.angles.second * deg),
            static_cast<double>(e.angles.third * deg),
            norm_error,
            static_cast<double>(prop_->last_error_estimate())};
  }

  // After the last line: the output was written, and at least one step completed.
  bool check_end() const {
    if (std::ferror(out_) != 0) {
      std::fprintf(stderr, "halfspin-propagate: write error on %s\n", opt_.output.c_str());
      return false;
    }
    if (prop_ && prop_->counters().steps > 0) return true;
    std::fprintf(stderr,
                 "%s:%zu: no complete step in the log (%llu samples read after the header; %s "
                 "needs %zu per step)\n",
                 opt_.log.c_str(), reader_.line(), static_cast<unsigned long long>(samples_read_),
                 Stepper::name, Stepper::window);
    return false;
  }

  RunSummary summary() const {
    RunSummary s;
    s.method = Stepper::name;
    s.scalar = scalar_name<T>();
    s.accumulation = Accumulation::name;
    s.renormalization = renormalize_name(opt_.renormalize);
    s.euler = seq_;
    s.counters = prop_->counters();
    s.samples_read = samples_read_;
    s.max_interval = *max_interval_;
    s.skipped = skipped_;
    s.max_norm_error = max_norm_error_;
    s.near_singular_rows = near_singular_rows_;
    const Quaternion<T> q = prop_->attitude();
    s.attitude = {static_cast<double>(q.w), static_cast<double>(q.x), static_cast<double>(q.y),
                  static_cast<double>(q.z)};
    const EulerDecomposition<T> e = to_euler_angles(q, opt_.euler);
    const T deg = T(180) / pi<T>;
    s.euler_deg = {static_cast<double>(e.angles.first * deg),
                   static_cast<double>(e.angles.second * deg),
                   static_cast<double>(e.angles.third * deg)};
    s.digits = digits;
    s.has_truth = truth_ != nullptr;
    s.truth = truth_errors_;
    s.motion = motion_;
    s.delta_form = form_ == GyroLogForm::delta_angle;
    s.unit_given = !opt_.rate_unit.empty() || !opt_.angle_unit.empty();
    s.log = opt_.log;
    s.start_row_line = start_row_line_;
    s.start_time = start_time_;
    return s;
  }

  const Options& opt_;
  NumericCsvReader<4>& reader_;
  GyroLogForm form_;
  std::array<const char*, 4> names_;  // the header's names of t, x, y, z (for messages)
  double gyro_scale_;                 // log gyro unit to rad/s or rad
  std::array<std::size_t, 4> column_{};
  std::FILE* out_;
  TruthTrack* truth_;
  std::string seq_;
  SelectedRenormalization<T> policy_;
  Quaternion<T> q0_;
  std::optional<double> max_interval_;
  T max_rate_;
  std::optional<Prop> prop_;
  SkipCounts skipped_;
  std::uint64_t samples_read_ = 0;
  std::uint64_t near_singular_rows_ = 0;
  double max_norm_error_ = 0.0;
  TruthErrors truth_errors_;
  double start_time_;  // s
  bool have_prev_time_;
  double prev_raw_time_ = 0;               // the previous row's time in the log's unit
  std::size_t line_of_previous_time_ = 0;  // 0: the previous time is --start-time
  std::size_t start_row_line_ = 0;         // the zero first row taken as the start, if any
  double first_interval_ = 0;              // s (the default gap limit's base)
  MotionSeen motion_;
  std::optional<double> previous_magnitude_;
  bool truth_initial_done_;
  std::optional<std::array<double, 4>> held_first_;
  std::size_t held_line_ = 0;
};

// Runs the log through opt.method (known, and usable on a log) in opt's scalar type.
inline int run_log(const Options& opt, NumericCsvReader<4>& reader, const GyroLogLayout& layout,
                   std::FILE* out, TruthTrack* truth) {
  int code = exit_usage;
  visit_method(opt.method, [&](auto tag) {
    using S = typename decltype(tag)::type;
    if constexpr (S::layout != SampleLayout::rate_function) {
      const bool compensated = opt.compensated.value_or(opt.use_float);
      if (opt.use_float) {
        code =
            compensated
                ? LogRun<float, S, CompensatedAccumulation>(opt, reader, layout, out, truth).run()
                : LogRun<float, S, PlainAccumulation>(opt, reader, layout, out, truth).run();
      } else {
        code =
            compensated
                ? LogRun<double, S, CompensatedAccumulation>(opt, reader, layout, out, truth).run()
                : LogRun<double, S, PlainAccumulation>(opt, reader, layout, out, truth).run();
      }
    }
  });
  return code;
}

}  // namespace halfspin::tools::propagate
