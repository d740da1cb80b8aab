// The yardsticks for the step and propagator figures, on the same workload
// (callgrind/baseline_runs.hpp):
//   baseline/eigen_expmap/<scalar>  Eigen 3's Quaternion and AngleAxis plus normalized(): the
//                                   obvious general-purpose exponential-map update
//   baseline/odeint_rk4/<scalar>    Boost.Odeint runge_kutta4 on a 4-element state, one do_step
//                                   per iteration, rates at the stage nodes from three samples
//   floor/expmap/<scalar>           a minimal hand-written series exp + Hamilton product
// bench/ratios.py compares them with step/… and propagator/… in one run.
#include <benchmark/benchmark.h>

#include "baseline_runs.hpp"
#include "measure.hpp"

namespace {

using halfspin::bench::EigenExpMapRun;
using halfspin::bench::FloorExpMapRun;
using halfspin::bench::measure;
using halfspin::bench::OdeintRk4Run;

}  // namespace

BENCHMARK(measure<EigenExpMapRun<float>>)->Name("baseline/eigen_expmap/float");
BENCHMARK(measure<EigenExpMapRun<double>>)->Name("baseline/eigen_expmap/double");
BENCHMARK(measure<OdeintRk4Run<float>>)->Name("baseline/odeint_rk4/float");
BENCHMARK(measure<OdeintRk4Run<double>>)->Name("baseline/odeint_rk4/double");
BENCHMARK(measure<FloorExpMapRun<float>>)->Name("floor/expmap/float");
BENCHMARK(measure<FloorExpMapRun<double>>)->Name("floor/expmap/double");
