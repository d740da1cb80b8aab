#pragma once
// One propagation, one step per call, over the shared workload (workload.hpp): the loop bodies of
// the step/… and propagator/… benchmarks and of halfspin_callgrind_driver, so that both measure
// the same code.
//
//   BareStepRun<Stepper, T>   q ← Stepper::step(q, window_k, dt): the stepper alone
//   PropagatorRun<Stepper, T[, Renormalization[, Accumulation]]>
//                             Propagator<T, Stepper, Renormalization> (default: the propagator's
//                             default, first_order) fed push(sample, dt)
//                             new_samples times per call (the firmware path), or advance(rate, dt)
//                             for rate-function steppers
//
// The attitude carries from one call to the next (a real propagation). The bare step has no
// renormalization of its own, so it normalizes once per pass over the 256-entry table (1/256 of a
// normalization per step, a few tenths of a flop) to keep the attitude from drifting off the unit
// sphere over billions of benchmark steps (Runge–Kutta truncation, rounding); the propagator keeps
// its own policy.

#include <cstddef>
#include <cstdint>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/gyro_input.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "workload.hpp"

namespace halfspin::bench {

// Full scale 35 rad/s (a 2000 °/s gyro), gaps above 5 ms: no sample of the workload is rejected.
template <class T>
constexpr GyroLimits<T> workload_limits() noexcept {
  return {T(35), T(5e-3)};
}

template <class Stepper, class T>
class BareStepRun {
 public:
  static constexpr bool rate_function = Stepper::layout == SampleLayout::rate_function;

  BareStepRun() : gyro_(gyro_table<T>()) {
    if constexpr (!rate_function) {
      inputs_ = &step_inputs<Stepper, T>();
    }
  }

  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    if constexpr (rate_function) {
      const LinearRate<T> rate{gyro_.rate[i_], gyro_.rate_slope[i_]};
      q_ = Stepper::step(q_, rate, T(sample_period_s));
    } else {
      q_ = Stepper::template step<T>(q_, inputs_->window[i_], inputs_->dt);
    }
    i_ = (i_ + 1) & table_mask;
    if (i_ == 0) {
      q_ = normalized(q_);
    }
  }

  const Quaternion<T>& attitude() const noexcept { return q_; }
  bool healthy_after(std::uint64_t /*steps*/) const noexcept { return healthy(q_); }

 private:
  const GyroTable<T>& gyro_;
  const StepInputs<Stepper, T>* inputs_ = nullptr;
  Quaternion<T> q_ = Quaternion<T>::identity();
  std::size_t i_ = 0;
};

template <class Stepper, class T, class Renormalization = FirstOrderRenormalization,
          class Accumulation = PlainAccumulation>
class PropagatorRun {
 public:
  static constexpr bool rate_function = Stepper::layout == SampleLayout::rate_function;
  static constexpr bool deltas = carries_delta_angles(Stepper::layout);

  PropagatorRun()
      : gyro_(gyro_table<T>()),
        samples_(deltas ? gyro_.delta_angle : gyro_.rate),
        propagator_(Quaternion<T>::identity(), workload_limits<T>()) {
    if constexpr (Stepper::layout == SampleLayout::rates_spanning) {
      // The first window needs its start sample too; after it every call completes one step.
      // (delta_angles_with_previous starts from its zero previous sample: no priming.)
      static_cast<void>(propagator_.push(samples_[k_], dt_));
      k_ = (k_ + 1) & table_mask;
    }
  }

  // One step: new_samples pushes (the last one steps), or one advance.
  HALFSPIN_BENCH_FLATTEN void step() noexcept {
    if constexpr (rate_function) {
      const LinearRate<T> rate{gyro_.rate[k_], gyro_.rate_slope[k_]};
      static_cast<void>(propagator_.advance(rate, dt_));
      k_ = (k_ + 1) & table_mask;
    } else {
      for (std::size_t j = 0; j < Stepper::new_samples; ++j) {
        static_cast<void>(propagator_.push(samples_[k_], dt_));
        k_ = (k_ + 1) & table_mask;
      }
    }
  }

  Quaternion<T> attitude() const noexcept { return propagator_.attitude(); }
  // Every call stepped, nothing was rejected, and the attitude is sound.
  bool healthy_after(std::uint64_t steps) const noexcept {
    const PropagationCounters& c = propagator_.counters();
    return c.steps == steps && c.rejected() == 0 && c.discarded_samples == 0 &&
           healthy(propagator_.attitude());
  }

 private:
  const GyroTable<T>& gyro_;
  const std::array<Vector3<T>, table_size>& samples_;
  Propagator<T, Stepper, Renormalization, Accumulation> propagator_;
  std::size_t k_ = 0;
  T dt_ = T(sample_period_s);
};

}  // namespace halfspin::bench
