// ns per step of every stepper of the library (the catalogue's AllMethods list, by the stepper's
// `name`), in float and double: step/<method>/<scalar>. The bare step: q ← Stepper::step(q, input,
// dt) with the attitude carried from step to step over a 1 kHz gyro workload
// (callgrind/workload.hpp: a few mrad per step; rate-function steppers get the linear rate ω(τ) =
// ω_k + τ·ω̇_k). No validation, no renormalization (one normalization per 256 steps keeps the run on
// the unit sphere); bench_propagator.cpp measures the same steps through the Propagator.
#include <benchmark/benchmark.h>

#include <string>
#include <type_traits>

#include "measure.hpp"
#include "method_registry.hpp"
#include "runs.hpp"

namespace {

using namespace halfspin;

template <class Stepper, class T>
void register_step() {
  const std::string name = std::string("step/") + Stepper::name + "/" + bench::scalar_name<T>();
  benchmark::RegisterBenchmark(name.c_str(), &bench::measure<bench::BareStepRun<Stepper, T>>);
}

const bool registered = [] {
  tools::for_each_method([](auto tag) {
    using Stepper = typename decltype(tag)::type;
    register_step<Stepper, float>();
    register_step<Stepper, double>();
  });
  return true;
}();

}  // namespace
