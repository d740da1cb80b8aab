// ns per step through the propagator, the firmware path: Propagator<T, Stepper> with the plain
// accumulation (double's default; float's default is the compensated one, measured below), the
// default renormalization (first_order) and GyroLimits validation of every sample, fed push(sample,
// dt) new_samples times per iteration so that every iteration completes exactly one step:
// propagator/<method>/<scalar>, for every sample-driven stepper; rate-function steppers go through
// advance(rate, dt) with the same linear rate as their bare step. Compare with
// step/<method>/<scalar> (bench_steppers.cpp) for the cost of validation, history and
// renormalization; bench/ratios.py prints the ratios.
//
// Also propagator_renormalization/<policy>/<method>/<scalar> for three steppers and the policies
// none, first_order (the default) and periodic (exact every 16 steps): what the policy adds to the
// step's serial chain (the attitude of step n+1 waits for the renormalized attitude of step n).
// And propagator_compensated/<method>/<scalar>: the same path with the compensated accumulation
// (compensated_accumulation.hpp), for every sample-driven stepper; its cost against
// propagator/<method>/<scalar>.
#include <benchmark/benchmark.h>

#include <string>
#include <type_traits>

#include "measure.hpp"
#include "method_registry.hpp"
#include "runs.hpp"

namespace {

using namespace halfspin;

template <class Stepper, class T>
void register_propagator() {
  const std::string name =
      std::string("propagator/") + Stepper::name + "/" + bench::scalar_name<T>();
  benchmark::RegisterBenchmark(name.c_str(), &bench::measure<bench::PropagatorRun<Stepper, T>>);
}

template <class Stepper, class T>
void register_compensated() {
  const std::string name =
      std::string("propagator_compensated/") + Stepper::name + "/" + bench::scalar_name<T>();
  benchmark::RegisterBenchmark(
      name.c_str(),
      &bench::measure<
          bench::PropagatorRun<Stepper, T, FirstOrderRenormalization, CompensatedAccumulation>>);
}

template <class Stepper, class T, class Renormalization>
void register_renormalization() {
  const std::string name = std::string("propagator_renormalization/") + Renormalization::name +
                           "/" + Stepper::name + "/" + bench::scalar_name<T>();
  benchmark::RegisterBenchmark(name.c_str(),
                               &bench::measure<bench::PropagatorRun<Stepper, T, Renormalization>>);
}

template <class Stepper>
void register_renormalizations() {
  register_renormalization<Stepper, float, NoRenormalization>();
  register_renormalization<Stepper, double, NoRenormalization>();
  register_renormalization<Stepper, float, FirstOrderRenormalization>();
  register_renormalization<Stepper, double, FirstOrderRenormalization>();
  register_renormalization<Stepper, float, PeriodicRenormalization<>>();
  register_renormalization<Stepper, double, PeriodicRenormalization<>>();
}

const bool registered = [] {
  tools::for_each_method([](auto tag) {
    using Stepper = typename decltype(tag)::type;
    register_propagator<Stepper, float>();
    register_propagator<Stepper, double>();
    register_compensated<Stepper, float>();
    register_compensated<Stepper, double>();
  });
  register_renormalizations<ExponentialMapHoldEnd>();
  register_renormalizations<Coning2Sample>();
  register_renormalizations<RungeKutta4Sampled>();
  return true;
}();

}  // namespace
