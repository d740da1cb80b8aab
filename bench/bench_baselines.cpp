// The yardsticks for the step and propagator figures, on the same workload
// (callgrind/baseline_runs.hpp):
//   baseline/eigen_exponential_map/<scalar>  Eigen 3's Quaternion and AngleAxis plus normalized():
//   the
//                                   obvious general-purpose exponential-map update
//   baseline/odeint_rk4/<scalar>    Boost.Odeint runge_kutta4 on a 4-element state, one do_step
//                                   per iteration, rates at the stage nodes from three samples
//   baseline/first_order_normalized/<scalar>  the first-order update many firmwares use,
//                                   q + ½·dt·q ⊗ (0, ω) then q/‖q‖, latest rate sample
//   floor/exponential_map/<scalar>           a minimal hand-written series exp + Hamilton product
// bench/ratios.py compares them with step/… and propagator/… in one run.
#include <benchmark/benchmark.h>

#include "baseline_runs.hpp"
#include "measure.hpp"

namespace {

using halfspin::bench::EigenExponentialMapRun;
using halfspin::bench::FirstOrderNormalizedRun;
using halfspin::bench::FloorExponentialMapRun;
using halfspin::bench::measure;
using halfspin::bench::OdeintRk4Run;

}  // namespace

BENCHMARK(measure<EigenExponentialMapRun<float>>)->Name("baseline/eigen_exponential_map/float");
BENCHMARK(measure<EigenExponentialMapRun<double>>)->Name("baseline/eigen_exponential_map/double");
BENCHMARK(measure<OdeintRk4Run<float>>)->Name("baseline/odeint_rk4/float");
BENCHMARK(measure<OdeintRk4Run<double>>)->Name("baseline/odeint_rk4/double");
BENCHMARK(measure<FirstOrderNormalizedRun<float>>)->Name("baseline/first_order_normalized/float");
BENCHMARK(measure<FirstOrderNormalizedRun<double>>)->Name("baseline/first_order_normalized/double");
BENCHMARK(measure<FloorExponentialMapRun<float>>)->Name("floor/exponential_map/float");
BENCHMARK(measure<FloorExponentialMapRun<double>>)->Name("floor/exponential_map/double");
