#pragma once
/// @file
/// The propagator: owns the attitude and the fixed-size sample history its stepper needs,
/// validates every input, runs the stepper, applies the increment it returns through the
/// accumulation policy (compensated in float, plain in double by default: DefaultAccumulation
/// below), runs the
/// renormalization policy, and keeps counters and the last per-step error estimate. The stepper
/// computes one increment; the propagator decides when and with what input.
///
/// Bad input never touches the state: a sample with NaN/Inf, a non-positive or oversized interval,
/// or a rate beyond the gyro range is rejected with its status code, the attitude and the history
/// stay bit-for-bit as they were, and the rejection is counted. A step whose result is not finite
/// (a rate function that returned NaN), whose error estimate is not finite, or whose renormalized
/// result is not finite or has a squared norm of zero or beyond T's range, is rejected the same
/// way, as non_finite.
///
/// The usual sample takes a short path with the same result: one pass of comparisons accepts it
/// (gyro_input.hpp: accepts_rate / accepts_delta_angle; anything it refuses is classified by the
/// full validation), and with the default first-order renormalization a step whose fl(‖q‖²) is
/// within 2⁻¹² (float) or 2⁻²⁷ (double) of 1 is renormalized by the Newton step alone, with ‖q‖²
/// the only norm computed (renormalization.hpp: the near-unit form); a step farther from unit norm
/// whose ‖q‖² is still a normal number is renormalized by the policy's own form without further
/// checks (its result is provably usable); every other step takes the general path, which checks
/// and renormalizes as described above. The rare paths are out of line.
/// Both paths keep the same bits (tests/propagation/test_fast_paths.cpp).
///
/// Gap policy: an interval above limits.max_step is rejected as step_too_long (samples were
/// missed; the rotation during the gap is lost and the attitude must be re-anchored by whatever
/// aiding the vehicle has). The first sample accepted after it restarts the history: samples that
/// were waiting in a partly filled window are discarded and counted in `discarded_samples`, so no
/// step ever spans the gap.
///
/// Time: `push(sample, dt)` takes the sample interval in seconds; `push(sample, Ticks{n})` takes
/// it as an integer count of timer ticks of `tick_period` seconds (a constructor argument: without
/// one, every tick push is rejected as no_tick_period), and elapsed time is then kept exactly as a
/// 64-bit tick count. Elapsed seconds are a compensated (Kahan) sum, so float keeps
/// ulp-level resolution over a flight instead of losing it within the hour.
///
/// Calibration: the fifth template parameter is the calibration stage applied to every sample
/// after its validation (gyro_calibration.hpp: ω_cal = M·(ω_raw − b(T)), Δθ_cal = M·(Δθ − b·dt));
/// NoCalibration, the default, is empty and skipped at compile time, so a Propagator that names
/// none is the code it was before. CalibratedPropagator<T, Stepper> names a calibrated one;
/// set_temperature(°C) sets the bias's temperature.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/gyro_calibration.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// A sample interval as an integer count of timer ticks.
struct Ticks {
  std::uint32_t count;  ///< ticks in the interval
};

/// What happened so far. Rejections by class; `steps` counts steps taken.
struct PropagationCounters {
  std::uint64_t samples_accepted = 0;            ///< samples accepted into the history
  std::uint64_t steps = 0;                       ///< steps taken
  std::uint64_t rejected_non_finite = 0;         ///< rejected as Status::non_finite
  std::uint64_t rejected_non_positive_step = 0;  ///< rejected as Status::non_positive_step
  std::uint64_t rejected_step_too_long = 0;      ///< rejected as Status::step_too_long
  std::uint64_t rejected_over_range = 0;         ///< rejected as Status::over_range
  std::uint64_t rejected_no_tick_period = 0;     ///< push(…, Ticks) with no tick period set
  std::uint64_t discarded_samples = 0;  ///< dropped from a partly filled window after a gap

  /// All rejected inputs.
  constexpr std::uint64_t rejected() const noexcept {
    return rejected_non_finite + rejected_non_positive_step + rejected_step_too_long +
           rejected_over_range + rejected_no_tick_period;
  }
};

/// The accumulation policy of a Propagator<T, …> that names none: compensated in float, plain in
/// double. In float the plain policy's rounding, not the method, decides the error over minutes
/// (the demo scenario: 3.9e-5 rad plain, 1.1e-6 compensated, 5.4e-7 in double; and its worst-case
/// bound, N·c·u, meets no ordinary budget), for 1.1–1.5× the host time and +78 Cortex-M4F cycles
/// per step; in double the plain rounding is 10⁻¹⁶ per step and the pair would cost for nothing.
/// Name PlainAccumulation to trade that accuracy for cycles.
template <class T>
using DefaultAccumulation =
    std::conditional_t<std::is_same<T, float>::value, CompensatedAccumulation, PlainAccumulation>;

namespace detail {
// Where the propagator keeps its calibration stage: a member, or for an empty stage (NoCalibration)
// a base, which the empty-base optimization makes free: the default propagator keeps its size.
template <class Calibration, bool = std::is_empty<Calibration>::value>
class CalibrationSlot {
 public:
  constexpr explicit CalibrationSlot(const Calibration& c) noexcept : stage_(c) {}
  constexpr const Calibration& stage() const noexcept { return stage_; }
  constexpr Calibration& stage() noexcept { return stage_; }

 private:
  Calibration stage_;
};
template <class Calibration>
class CalibrationSlot<Calibration, true> : private Calibration {
 public:
  constexpr explicit CalibrationSlot(const Calibration& c) noexcept : Calibration(c) {}
  constexpr const Calibration& stage() const noexcept { return *this; }
  constexpr Calibration& stage() noexcept { return *this; }
};
// Whether a renormalization policy has the near-unit form (near_unit_range, near_unit_factor,
// near_unit_half_defect: FirstOrderRenormalization), which the propagator's usual step takes.
template <class Renormalization, class T, class = void>
struct has_near_unit_form : std::false_type {};
template <class Renormalization, class T>
struct has_near_unit_form<Renormalization, T,
                          std::void_t<decltype(Renormalization::template near_unit_range<T>()),
                                      decltype(Renormalization::near_unit_factor(T(1))),
                                      decltype(Renormalization::near_unit_half_defect(T(1)))>>
    : std::true_type {};
}  // namespace detail

/// Propagates one attitude (body → reference) from gyro samples: Calibration corrects each
/// sample, Stepper computes each step's increment, Accumulation applies it and Renormalization
/// keeps the norm (see the file comment).
template <class T, class Stepper, class Renormalization = FirstOrderRenormalization,
          class Accumulation = DefaultAccumulation<T>, class Calibration = NoCalibration>
class Propagator : private detail::CalibrationSlot<Calibration> {
  using Slot = detail::CalibrationSlot<Calibration>;

 public:
  using scalar = T;                                       ///< the scalar type
  using stepper = Stepper;                                ///< the stepper
  using accumulation = Accumulation;                      ///< the accumulation policy
  using calibration_stage = Calibration;                  ///< the gyro calibration stage
  static constexpr std::size_t window = Stepper::window;  ///< samples the stepper reads per step

  /// Starts at `initial` (body → reference, unit). tick_period (s) is used by push(…, Ticks);
  /// left at 0, tick pushes are rejected as no_tick_period.
  /// Only for a stage that needs no parameters (NoCalibration): a calibrated propagator takes its
  /// stage below, so none is left out by accident.
  template <class C = Calibration,
            std::enable_if_t<std::is_default_constructible<C>::value, int> = 0>
  constexpr Propagator(const Quaternion<T>& initial, const GyroLimits<T>& limits,
                       T tick_period = T(0), Renormalization policy = {}) noexcept
      : Slot(Calibration{}),
        state_(Accumulation::start(initial)),
        limits_(limits),
        accept_limits_(finite_limits(limits)),
        tick_period_(usable_tick_period(tick_period)),
        policy_(policy) {
    restart_history();
  }

  /// The same with a calibration stage (gyro_calibration.hpp), applied to every sample.
  constexpr Propagator(const Quaternion<T>& initial, const GyroLimits<T>& limits,
                       const Calibration& calibration, T tick_period = T(0),
                       Renormalization policy = {}) noexcept
      : Slot(calibration),
        state_(Accumulation::start(initial)),
        limits_(limits),
        accept_limits_(finite_limits(limits)),
        tick_period_(usable_tick_period(tick_period)),
        policy_(policy) {
    restart_history();
  }

  /// Accepts one gyro sample: a rate (rad/s) or a delta-angle (rad), as Stepper::layout says,
  /// covering the interval dt (s) that ends now. Steps when the stepper's window is full.
  Status push(const Vector3<T>& sample, T dt) noexcept {
    static_assert(Stepper::layout != SampleLayout::rate_function,
                  "a rate-function stepper is driven with advance()");
    // The common case in one pass of comparisons (gyro_input.hpp: acceptance implies that the
    // validation accepts); a sample it refuses is classified by the full validation, which
    // decides (with an infinite limit it can still accept).
    const bool accepted = carries_delta_angles(Stepper::layout)
                              ? accepts_delta_angle(sample, dt, accept_limits_)
                              : accepts_rate(sample, dt, accept_limits_);
    if (!accepted) {
      const Status s = classify(sample, dt);
      if (s != Status::ok) {
        return s;
      }
    }
    if constexpr (Calibration::identity) {
      return accept(sample, dt);
    } else {
      Vector3<T> calibrated{};
      if constexpr (carries_delta_angles(Stepper::layout)) {
        calibrated = this->stage().delta_angle(sample, dt);
      } else {
        calibrated = this->stage().rate(sample);
      }
      // x − x is +0 for finite x and NaN for ±∞ or NaN, so the sum is NaN exactly when some
      // component is not finite: 5 operations and one compare with itself where is_finite takes
      // 3 compares against the largest value and its load (5 Cortex-M4F cycles fewer,
      // bench/README.md).
      const T finite_probe = (calibrated.x - calibrated.x) + (calibrated.y - calibrated.y) +
                             (calibrated.z - calibrated.z);
      if (std::isnan(finite_probe)) {
        count_rejection(Status::non_finite);
        return Status::non_finite;
      }
      return accept(calibrated, dt);
    }
  }

  /// The same with the interval as a count of ticks of tick_period. A propagator built without a
  /// usable tick period (the constructors' default 0, or one that is negative or not finite)
  /// rejects every tick push as no_tick_period, changing nothing, rather than as a step of 0 s.
  Status push(const Vector3<T>& sample, Ticks ticks) noexcept {
    if (tick_period_ == T(0)) {  // none, or none usable (usable_tick_period)
      count_rejection(Status::no_tick_period);
      return Status::no_tick_period;
    }
    const Status s = push(sample, static_cast<T>(ticks.count) * tick_period_);
    if (s == Status::ok || s == Status::waiting_for_samples) {
      elapsed_ticks_ += ticks.count;
    }
    return s;
  }

  /// One step of dt (s) for a rate-function stepper: rate_at(τ) → Vector3<T> in rad/s, τ ∈ [0, dt]
  /// from the step start.
  template <class RateFunction>
  Status advance(const RateFunction& rate_at, T dt) noexcept {
    static_assert(Stepper::layout == SampleLayout::rate_function,
                  "advance() drives rate-function steppers; sample steppers take push()");
    const Status s = validate_step(dt, limits_);
    if (s != Status::ok) {
      count_rejection(s);
      return s;
    }
    if constexpr (!Calibration::identity) {
      return advance_calibrated(rate_at, dt);
    }
    const Increment<T> increment = Stepper::increment(rate_at, dt);
    return commit_if_usable(increment, dt) ? Status::ok : Status::non_finite;
  }

  /// Sets the calibration stage's temperature (°C): ok, or non_finite / over_range with nothing
  /// changed (gyro_calibration.hpp). Only with a stage that has a temperature.
  template <class C = Calibration>
  Status set_temperature(T celsius) noexcept {
    static_assert(!C::identity, "a propagator without a calibration stage has no temperature");
    return this->stage().set_temperature(celsius);
  }
  /// The calibration stage (its check(), bias(), temperature(), rejected_temperatures()).
  constexpr const Calibration& calibration() const noexcept { return this->stage(); }

  /// The attitude (body → reference) after the last step.
  constexpr Quaternion<T> attitude() const noexcept { return Accumulation::attitude(state_); }
  /// ‖q‖ − 1 of the attitude: what the renormalization policy keeps small.
  T norm_error() const noexcept { return norm(attitude()) - T(1); }
  /// What happened so far: samples, steps and rejections by class.
  constexpr const PropagationCounters& counters() const noexcept { return counters_; }
  /// The stepper's local error estimate for the last step (rad), 0 if it has none.
  constexpr T last_error_estimate() const noexcept { return last_error_estimate_; }
  /// Sum of the per-step estimates since the start (rad): worst-case linear accumulation.
  constexpr T accumulated_error_estimate() const noexcept { return accumulated_error_estimate_; }
  /// Seconds propagated (compensated sum of the intervals of the steps taken).
  constexpr T elapsed_seconds() const noexcept { return elapsed_sum_; }
  /// Ticks accepted through push(…, Ticks), exact.
  constexpr std::uint64_t elapsed_ticks() const noexcept { return elapsed_ticks_; }
  /// The renormalization policy (read its counters or settings).
  constexpr const Renormalization& renormalization() const noexcept { return policy_; }

  /// Re-anchors the attitude (after a gap, or from an external fix) and restarts the history;
  /// a calibration stage keeps its parameters and temperature.
  void reset(const Quaternion<T>& attitude) noexcept {
    state_ = Accumulation::start(attitude);
    counters_.discarded_samples += pending_samples();
    restart_history();
    gap_pending_ = false;
  }

 private:
  // advance() with a calibration stage: each rate the stepper asks for is calibrated; a non-finite
  // one makes the step's result non-finite, rejected by commit_if_usable like any other.
  template <class RateFunction>
  Status advance_calibrated(const RateFunction& rate_at, T dt) noexcept {
    const Calibration& applied = this->stage();
    const auto calibrated_rate_at = [&applied, &rate_at](T tau) noexcept {
      return applied.rate(rate_at(tau));
    };
    const Increment<T> increment = Stepper::increment(calibrated_rate_at, dt);
    return commit_if_usable(increment, dt) ? Status::ok : Status::non_finite;
  }

  Status accept(const Vector3<T>& sample, T dt) noexcept {
    if (__builtin_expect(static_cast<long>(gap_pending_), 0L) != 0L) {
      counters_.discarded_samples += pending_samples();
      restart_history();
      gap_pending_ = false;
    }
    if constexpr (window > 1) {
      if (filled_ + 1 < window) {
        // A spanning window's first sample marks the step's start: its interval lies before it.
        if (Stepper::layout != SampleLayout::rates_spanning || filled_ != 0) {
          window_dt_ += dt;
        }
        history_[filled_] = sample;
        ++filled_;
        ++counters_.samples_accepted;
        return Status::waiting_for_samples;
      }
    }
    if constexpr (window == 1) {
      // A one-sample window has no history (nothing carries, no interval accumulates): step on
      // the sample itself, so a rejected step has nothing to restore.
      const std::array<Vector3<T>, 1> only{sample};
      const Increment<T> increment = Stepper::template increment<T>(only, dt);
      if (!commit_if_usable(increment, dt)) {
        return Status::non_finite;
      }
      ++counters_.samples_accepted;
      return Status::ok;
    }
    if constexpr (Stepper::new_samples > 2) {
      return step_on_window_out_of_line(sample, dt);
    } else {
      return step_on_window(sample, dt);
    }
  }

  // With three or more new samples per step, most pushes only store their sample; the step out of
  // line keeps their path free of the step's register needs (Cortex-M4F, g++ 12 -O2: a push of
  // r4–r7 and a vpush/vpop of d8–d12 around each stored sample, 36 of its 111 cycles), at the
  // price of a call and a second prologue on the push that steps: 201 → 174 cycles per sample for
  // coning_4_sample, but 212 → 220 for coning_2_sample, where every other push steps
  // (bench/target/cycle_trace.py).
  [[gnu::noinline]] Status step_on_window_out_of_line(const Vector3<T>& sample, T dt) noexcept {
    return step_on_window(sample, dt);
  }

  // The window is complete: step on the history with the new sample in its last slot. A
  // non-finite result (which validated input cannot produce, but state must never be
  // corrupted) puts the slot's previous bits back, so everything is as it was. (Stepping on a
  // copy of the window instead cost up to 1.3× a bare step in the propagator benchmarks.)
  Status step_on_window(const Vector3<T>& sample, T dt) noexcept {
    const Vector3<T> displaced = history_[window - 1];
    history_[window - 1] = sample;
    const T step_dt = window_dt_ + dt;
    const Increment<T> increment = Stepper::template increment<T>(history_, step_dt);
    if (!commit_if_usable(increment, step_dt)) {
      history_[window - 1] = displaced;
      return Status::non_finite;
    }
    ++counters_.samples_accepted;
    shift_history();
    return Status::ok;
  }

  // The tick period kept: the one given if positive and finite, else 0 (none), decided once here
  // so that push(…, Ticks) tests one value per sample instead of two.
  static constexpr T usable_tick_period(T period) noexcept {
    return period > T(0) && period <= std::numeric_limits<T>::max() ? period : T(0);
  }

  // An attitude the state may hold: ‖q‖² positive and finite in T (so no NaN or infinity, and
  // normalized(), rotate() and the conversions work on it).
  static bool is_usable(const Quaternion<T>& q) noexcept {
    const T n2 = squared_norm(q);
    return n2 > T(0) && n2 <= std::numeric_limits<T>::max();
  }

  // Takes a step if its result is usable, else counts a non_finite rejection and changes nothing.
  // The usual step first: with a policy that has a near-unit form (FirstOrderRenormalization,
  // renormalization.hpp) and s = fl(‖next‖²) inside its range, next is finite (a NaN or infinite
  // component, or an overflow, makes s fail the range test) and the renormalized attitude has
  // ‖·‖² within rounding of 1 (usable), so s is the only norm computed and the step is bit for bit
  // what the general path below keeps. Everything else takes the general path.
  bool commit_if_usable(const Increment<T>& increment, T dt) noexcept {
    const typename Accumulation::template State<T> advanced =
        Accumulation::advanced(state_, increment.delta);
    const Quaternion<T> next = Accumulation::attitude(advanced);
    const T estimate = increment.error_estimate;
    if constexpr (detail::has_near_unit_form<Renormalization, T>::value) {
      constexpr T range = Renormalization::template near_unit_range<T>();
      const T s = squared_norm(next);
      const bool estimate_finite = estimate - estimate == T(0);
      if (std::fabs(s - T(1)) <= range && estimate_finite) {
        if constexpr (renormalizes_by_scaling<Accumulation, Renormalization, T>::value) {
          const T h = Renormalization::near_unit_half_defect(s);
          state_ = Accumulation::with_scaling(advanced, Scaling<T>{T(1) + h, h});
        } else {
          state_ =
              Accumulation::with_attitude(advanced, Renormalization::near_unit_factor(s) * next);
        }
        count_step(estimate, dt);
        return true;
      }
      // Farther from unit norm (a Runge–Kutta step whose stages see a changing rate drifts by
      // more than 2⁻²⁷ per step in double) but ‖q‖² a normal number: the policy's own form,
      // whose prescale brings any normal ‖q‖² within 1.1e-5 of 1 before the Newton step
      // (renormalization.hpp), so the result is usable and next is finite; the same bits as the
      // general path, without its checks.
      if (s >= std::numeric_limits<T>::min() && s <= std::numeric_limits<T>::max() &&
          estimate_finite) {
        Renormalization policy = policy_;
        if constexpr (renormalizes_by_scaling<Accumulation, Renormalization, T>::value) {
          state_ = Accumulation::with_scaling(advanced, policy.scaling(next));
        } else {
          state_ = Accumulation::with_attitude(advanced, policy.apply(next));
        }
        count_step(estimate, dt);
        return true;
      }
    }
    if constexpr (detail::has_near_unit_form<Renormalization, T>::value) {
      return commit_checked_cold(increment.delta, estimate, dt);
    } else {
      return commit_checked(advanced, next, estimate, dt);
    }
  }

  // The rare paths out of line, so that the usual one stays small enough for the compiler to
  // inline the stepper and the accumulation into it (with them inline in push, g++ 12 -O3 called
  // the quaternion product and exponential out of line: 1.3–2× the time per step).
  [[gnu::cold, gnu::noinline]] Status classify(const Vector3<T>& sample, T dt) noexcept {
    const Status s = carries_delta_angles(Stepper::layout)
                         ? validate_delta_angle(sample, dt, limits_)
                         : validate_rate(sample, dt, limits_);
    count_rejection(s);
    return s;
  }
  // Takes the increment by value (in registers) and recomputes the advanced state from the
  // unchanged state_, the same bits: passing the usual path's advanced state by reference made
  // the compiler keep it in memory on the usual path too (Cortex-M4F: 12 stores and loads).
  [[gnu::cold, gnu::noinline]] bool commit_checked_cold(Quaternion<T> delta, T estimate,
                                                        T dt) noexcept {
    const typename Accumulation::template State<T> advanced = Accumulation::advanced(state_, delta);
    return commit_checked(advanced, Accumulation::attitude(advanced), estimate, dt);
  }

  // The general path. The accumulation and the policy run on copies (the policy may count steps)
  // and the result is checked: a finite step result can still renormalize to a non-finite or zero
  // attitude (a first-order Newton step on a Runge–Kutta result far from unit norm after a huge
  // step angle). With a policy and an accumulation that renormalize by scaling
  // (renormalizes_by_scaling, stepper_traits.hpp: the compensated pair) the attitude checked is
  // f·next, f the policy's factor (what its apply would keep, to rounding), and the state is scaled
  // by f once the step is accepted (computing it first kept its 8 words live across the checks:
  // 20–30 Cortex-M4F cycles of spills); otherwise the policy's result is checked and kept.
  bool commit_checked(const typename Accumulation::template State<T>& advanced,
                      const Quaternion<T>& next, T estimate, T dt) noexcept {
    Renormalization policy = policy_;
    if constexpr (renormalizes_by_scaling<Accumulation, Renormalization, T>::value) {
      const auto scale = policy.scaling(next);
      if (!is_finite(next) || !is_usable(scale.factor * next) || !(estimate - estimate == T(0))) {
        count_rejection(Status::non_finite);
        return false;
      }
      state_ = Accumulation::with_scaling(advanced, scale);
    } else {
      const Quaternion<T> kept = policy.apply(next);
      if (!is_finite(next) || !is_usable(kept) || !(estimate - estimate == T(0))) {
        count_rejection(Status::non_finite);
        return false;
      }
      state_ = Accumulation::with_attitude(advanced, kept);
    }
    policy_ = policy;
    count_step(estimate, dt);
    return true;
  }

  // The bookkeeping of a step taken: its estimate (only a stepper that has one changes them: the
  // others' stay 0), the count, and the Kahan sum of elapsed time.
  void count_step(T estimate, T dt) noexcept {
    if constexpr (has_error_estimate<Stepper>::value) {
      last_error_estimate_ = estimate;
      accumulated_error_estimate_ += estimate;
    } else {
      static_cast<void>(estimate);
    }
    ++counters_.steps;
    const T y = dt - elapsed_carry_;
    const T t = elapsed_sum_ + y;
    elapsed_carry_ = (t - elapsed_sum_) - y;
    elapsed_sum_ = t;
  }

  // After a step: layouts that share a boundary sample keep the newest one as history_[0].
  void shift_history() noexcept {
    if constexpr (Stepper::layout == SampleLayout::rates_spanning ||
                  Stepper::layout == SampleLayout::delta_angles_with_previous) {
      history_[0] = history_[window - 1];
      carried_ = 1;
    } else {
      carried_ = 0;
    }
    filled_ = carried_;
    window_dt_ = T(0);
  }

  // Samples accepted but not yet used by a step (carried-over entries were used or are the zero
  // start value).
  std::size_t pending_samples() const noexcept { return filled_ - carried_; }

  void restart_history() noexcept {
    history_ = {};
    window_dt_ = T(0);
    // Delta-angle steppers with one sample of history start from a zero previous sample: the
    // first step applies its delta-angles in full and only lacks the cross term with the past.
    carried_ = Stepper::layout == SampleLayout::delta_angles_with_previous ? 1 : 0;
    filled_ = carried_;
  }

  void count_rejection(Status s) noexcept {
    switch (s) {
      case Status::non_finite:
        ++counters_.rejected_non_finite;
        break;
      case Status::non_positive_step:
        ++counters_.rejected_non_positive_step;
        break;
      case Status::step_too_long:
        ++counters_.rejected_step_too_long;
        gap_pending_ = true;
        break;
      case Status::over_range:
        ++counters_.rejected_over_range;
        break;
      case Status::no_tick_period:
        ++counters_.rejected_no_tick_period;
        break;
      case Status::ok:
      case Status::waiting_for_samples:
        break;
    }
  }

  typename Accumulation::template State<T> state_;
  GyroLimits<T> limits_;
  GyroLimits<T> accept_limits_;  // limits_ in T's finite range, for the one-pass acceptance
  T tick_period_;                // positive and finite, or 0 for none (usable_tick_period)
  Renormalization policy_;
  std::array<Vector3<T>, window> history_{};
  std::size_t filled_ = 0;   // entries of history_ in use
  std::size_t carried_ = 0;  // leading entries carried over from the previous step
  T window_dt_ = T(0);
  bool gap_pending_ = false;
  PropagationCounters counters_{};
  T last_error_estimate_ = T(0);
  T accumulated_error_estimate_ = T(0);
  T elapsed_sum_ = T(0);
  T elapsed_carry_ = T(0);
  std::uint64_t elapsed_ticks_ = 0;
};

/// A propagator with the gyro calibration stage, e.g. CalibratedPropagator<float, Coning2Sample>
/// constructed from (initial, limits, GyroCalibration<float>(parameters)).
template <class T, class Stepper, class Renormalization = FirstOrderRenormalization,
          class Accumulation = DefaultAccumulation<T>>
using CalibratedPropagator =
    Propagator<T, Stepper, Renormalization, Accumulation, GyroCalibration<T>>;

}  // namespace halfspin
