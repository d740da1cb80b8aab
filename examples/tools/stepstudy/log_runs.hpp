#pragma once
// The runs of halfspin-stepstudy's log study (--log): one stepper, in scalar T, fed a gyro log
// coarsened k times, through the library's Propagator; and the Richardson estimate of the
// reference solution's own error. Tool code (not part of the installed library).
//
// Rows. A log's rows are numbered r: a rate log's first row is r = 0 (the rate at the log's start
// t0), a delta-angle log's first row is r = 1 (the integral over (t0, t0 + h]); row r ends at
// t0 + r·h, h the log's period. A run with coarsening k takes one sample per k log periods:
//   delta_sums      (delta-angle log) the sum of k consecutive delta-angles, rows (j−1)k+1 .. jk,
//                   summed in long double: the exact delta-angle of the longer period up to that
//                   rounding (integrals add);
//   rate_every_kth  (rate log) the rate of row jk: an exact sample (j ≥ 0 for rates_spanning
//                   layouts, which start with the sample at the log's start, j ≥ 1 otherwise);
//   trapezoid_sums  (rate log, delta-angle stepper) the trapezoid rule per log period,
//                   h·(ω_{r−1} + ω_r)/2, summed over rows (j−1)k+1 .. jk: an interpolation, exact
//                   only for a rate linear in time over each log period.
// Sample j is rounded once from long double to T (what a sensor delivering T would give), and
// pushed with dt = k·h. A step of the stepper spans p = periods_per_step(layout, window) samples,
// so step s ends at row s·p·k. Every run starts from the same attitude (identity, or the truth's
// first attitude) with the propagator's default renormalization (FirstOrderRenormalization), as
// the truth study does (measure.hpp): the angle error does not depend on the norm.

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <limits>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "measure.hpp"

namespace halfspin::tools::stepstudy {

enum class LogInput { delta_sums, rate_every_kth, trapezoid_sums };

// Rows [first_row, first_row + values.size()) of a log, in long double.
struct LogChunk {
  std::int64_t first_row = 0;
  std::vector<Vector3<LD>> values;  // rad (delta-angle log) or rad/s (rate log), one per row
  Vector3<LD> before{};             // rate logs: the row before first_row (zero before row 0)
};

// A step end: the row it ends at and the attitude there (body → reference).
struct StepEnd {
  std::int64_t row = 0;
  Quaternion<LD> attitude;
};

class LogRun {
 public:
  LogRun() = default;
  LogRun(const LogRun&) = delete;
  LogRun& operator=(const LogRun&) = delete;
  LogRun(LogRun&&) = delete;
  LogRun& operator=(LogRun&&) = delete;
  virtual ~LogRun() = default;
  // Feeds a chunk: `ends` receives the step ends it completes (cleared first). False if the
  // propagator rejected a sample (the run then stops).
  virtual bool feed(const LogChunk& chunk, std::vector<StepEnd>& ends) = 0;
  // Steps taken and the steady_clock time of the propagator's push calls so far (ns).
  virtual std::int64_t steps() const = 0;
  virtual double propagator_ns() const = 0;
};

template <class T>
Quaternion<T> narrow_quaternion(const Quaternion<LD>& q) {
  return {static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y), static_cast<T>(q.z)};
}

template <class Stepper, class T, class Accumulation>
class LogRunOf final : public LogRun {
  static_assert(Stepper::layout != SampleLayout::rate_function, "a log run pushes samples");

 public:
  static constexpr std::int64_t periods =
      static_cast<std::int64_t>(periods_per_step(Stepper::layout, Stepper::window));

  // Coarsening k log periods per sample, log period h (s), starting attitude q0.
  LogRunOf(const Quaternion<LD>& q0, std::int64_t k, LD h, LogInput input)
      : propagator_(narrow_quaternion<T>(q0),
                    GyroLimits<T>{T(1e4), static_cast<T>(std::max(10.0L, 4.0L * h * k))}),
        k_(k),
        h_(h),
        dt_(static_cast<T>(h * static_cast<LD>(k))),
        input_(input) {}

  bool feed(const LogChunk& chunk, std::vector<StepEnd>& ends) override {
    ends.clear();
    if (failed_) {
      return false;
    }
    samples_.clear();
    for (std::size_t i = 0; i < chunk.values.size(); ++i) {
      const std::int64_t row = chunk.first_row + static_cast<std::int64_t>(i);
      const Vector3<LD>& v = chunk.values[i];
      if (input_ == LogInput::rate_every_kth) {
        if (row % k_ == 0 && (row > 0 || Stepper::layout == SampleLayout::rates_spanning)) {
          samples_.push_back(detail::narrow_vector<T>(v));
        }
        continue;
      }
      if (input_ == LogInput::delta_sums) {
        sum_ += v;
      } else if (row >= 1) {
        const Vector3<LD>& previous = i == 0 ? chunk.before : chunk.values[i - 1];
        sum_ += (previous + v) * (h_ / 2);
      }
      if (row >= 1 && ++summed_ == k_) {
        samples_.push_back(detail::narrow_vector<T>(sum_));
        sum_ = Vector3<LD>{};
        summed_ = 0;
      }
    }
    attitudes_.clear();
    const auto start = std::chrono::steady_clock::now();
    for (const Vector3<T>& sample : samples_) {
      const Status s = propagator_.push(sample, dt_);
      if (s == Status::ok) {
        attitudes_.push_back(propagator_.attitude());
      } else if (s != Status::waiting_for_samples) {
        failed_ = true;
        break;
      }
    }
    spent_ += std::chrono::steady_clock::now() - start;
    for (const Quaternion<T>& q : attitudes_) {
      ++steps_;
      ends.push_back({steps_ * periods * k_, detail::widen_quaternion(q)});
    }
    return !failed_;
  }

  std::int64_t steps() const override { return steps_; }
  double propagator_ns() const override {
    return static_cast<double>(
        std::chrono::duration_cast<std::chrono::nanoseconds>(spent_).count());
  }

 private:
  Propagator<T, Stepper, FirstOrderRenormalization, Accumulation> propagator_;
  std::int64_t k_;
  LD h_;
  T dt_;
  LogInput input_;
  Vector3<LD> sum_{};
  std::int64_t summed_ = 0;
  std::vector<Vector3<T>> samples_;
  std::vector<Quaternion<T>> attitudes_;
  std::int64_t steps_ = 0;
  std::chrono::steady_clock::duration spent_{};
  bool failed_ = false;
};

// Richardson extrapolation (L. F. Richardson, "The approximate arithmetical solution by finite
// differences of physical problems ...", Phil. Trans. R. Soc. A 210, 1911; in any
// numerical-analysis text, e.g. Hairer, Nørsett and Wanner, Solving ODEs I, §II.4; cited from
// memory): a method of order p with error e(h) ≈ C·h^p gives, from solutions at h and 2h, e(h) ≈
// |q_h − q_2h| / (2^p − 1). The reference runs at 1, 2, 4 and 8 log periods per sample; d1 = max
// |q1 − q2|, d2 = max |q2 − q4|, d3 = max |q4 − q8| (angles at their common step ends), and the
// observed orders p_fine = log2(d2/d1), p_coarse = log2(d3/d2). The estimate uses p = min(p_fine,
// declared order): an observed order above the declared one means the leading error term is small
// or cancelling at these steps (pre-asymptotic, or a motion that favours the method, as pure coning
// favours a coning algorithm), which need not last at the finest step, and the lower order gives
// the larger, safer estimate (on the truth-made logs of README.md it also gives the closer one).
// The interval allows any order between min(p_fine, p_coarse, declared) and max(p_fine, p_coarse),
// widened by a factor 2 both ways for what a three-level check cannot see (the maximum over time of
// a difference is not the difference of the maxima). When the differences do not shrink like an
// order between 0.5 and 16 (rounding level), or the two observed orders differ by more than 1 (a
// reference outside its asymptotic range: the demo's 85 Hz vibration logged at 500 Hz gave 3.85
// and 1.02, and a true error below that interval), the estimate uses the declared order and is
// marked unreliable, with d1 itself as its upper end (the error at h is below the difference
// from 2h when halving the step at least halves the error). The upper end then adds the log's own
// rounding, `data_floor_rad` (its values are doubles: ε/2 of each sample's angle, summed as a worst
// case), which no solution of the log can see.
struct RichardsonEstimate {
  int declared_order = 0;
  std::array<double, 3> differences{};  // d1, d2, d3 (rad)
  double order_fine = std::numeric_limits<double>::quiet_NaN();
  double order_coarse = std::numeric_limits<double>::quiet_NaN();
  bool reliable = false;
  double order_used = 0;
  double estimate_rad = 0;
  double low_rad = 0;
  double high_rad = 0;  // includes data_floor_rad
  double data_floor_rad = 0;
};

inline constexpr double richardson_widening = 2.0;
inline constexpr double max_order_spread = 1.0;

inline RichardsonEstimate richardson_estimate(const std::array<double, 3>& d, int declared_order,
                                              double data_floor_rad) {
  RichardsonEstimate r;
  r.declared_order = declared_order;
  r.data_floor_rad = data_floor_rad;
  r.differences = d;
  if (d[0] > 0 && d[1] > 0 && d[2] > 0) {
    r.order_fine = std::log2(d[1] / d[0]);
    r.order_coarse = std::log2(d[2] / d[1]);
  }
  const auto plausible = [](double p) { return std::isfinite(p) && p >= 0.5 && p <= 16; };
  r.reliable = plausible(r.order_fine) && plausible(r.order_coarse) &&
               std::fabs(r.order_fine - r.order_coarse) <= max_order_spread;
  const auto factor = [](double p) { return std::exp2(p) - 1.0; };
  const auto declared = static_cast<double>(declared_order);
  if (r.reliable) {
    r.order_used = std::min(r.order_fine, declared);
    r.estimate_rad = d[0] / factor(r.order_used);
    const double p_low = std::min({r.order_fine, r.order_coarse, declared});
    const double p_high = std::max(r.order_fine, r.order_coarse);
    r.low_rad = d[0] / factor(p_high) / richardson_widening;
    r.high_rad = d[0] / factor(p_low) * richardson_widening + data_floor_rad;
  } else {
    r.order_used = declared;
    r.estimate_rad = d[0] / factor(declared);
    r.low_rad = 0;
    r.high_rad = d[0] + data_floor_rad;
  }
  return r;
}

// A method's difference from the reference counts as "at the reference's resolution" below this
// many times the upper end of the reference's error estimate: there the reference's own error can
// change it by a tenth or more (|d(m, ref) − d(m, truth)| ≤ d(ref, truth), the triangle inequality
// of the angle metric on rotations, common practice, no source).
inline constexpr double resolution_margin = 10.0;

}  // namespace halfspin::tools::stepstudy
