// halfspin_callgrind_driver: runs one propagation of the shared workload for valgrind's callgrind
// to count instructions (bench/callgrind/instruction_counts.py runs it at two step counts and
// takes the difference, so start-up and table set-up cancel).
//
//   halfspin_callgrind_driver <method> <float|double> <steps> [step|propagator]
//   halfspin_callgrind_driver --list        every method: name, flops, sample-driven (1/0)
//
// <method> is a stepper's name (the step/… benchmarks) or eigen_exponential_map, odeint_rk4,
// first_order_normalized, floor_exponential_map (the baselines; `step` mode only). `step` runs the
// bare step (BareStepRun), `propagator` the Propagator path (PropagatorRun): the same loop bodies
// as halfspin_bench. Prints the final attitude so that nothing can be optimized away; exit 1 if the
// run went wrong, 2 on bad usage.
//
// Benchmark tool code (not part of the installed library).
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string_view>

#include "baseline_runs.hpp"
#include "method_registry.hpp"
#include "runs.hpp"

namespace {

using namespace halfspin;

template <class Run>
int run(std::uint64_t steps) {
  Run r;
  for (std::uint64_t n = 0; n < steps; ++n) {
    r.step();
  }
  const auto q = r.attitude();
  std::printf("%.17g %.17g %.17g %.17g\n", static_cast<double>(q.w), static_cast<double>(q.x),
              static_cast<double>(q.y), static_cast<double>(q.z));
  if (!r.healthy_after(steps)) {
    std::fprintf(stderr, "halfspin_callgrind_driver: the propagation went wrong\n");
    return 1;
  }
  return 0;
}

template <class T>
int run_typed(std::string_view method, std::uint64_t steps, bool propagator) {
  if (!propagator) {
    if (method == "eigen_exponential_map") return run<bench::EigenExponentialMapRun<T>>(steps);
    if (method == "odeint_rk4") return run<bench::OdeintRk4Run<T>>(steps);
    if (method == "first_order_normalized") return run<bench::FirstOrderNormalizedRun<T>>(steps);
    if (method == "floor_exponential_map") return run<bench::FloorExponentialMapRun<T>>(steps);
  }
  int status = 2;
  const bool found = tools::visit_method(method, [&](auto tag) {
    using Stepper = typename decltype(tag)::type;
    status = propagator ? run<bench::PropagatorRun<Stepper, T>>(steps)
                        : run<bench::BareStepRun<Stepper, T>>(steps);
  });
  if (!found) {
    std::fprintf(stderr, "halfspin_callgrind_driver: unknown method '%.*s' (see --list)\n",
                 static_cast<int>(method.size()), method.data());
  }
  return status;
}

int usage() {
  std::fprintf(
      stderr,
      "usage: halfspin_callgrind_driver <method> <float|double> <steps> [step|propagator]\n"
      "       halfspin_callgrind_driver --list\n");
  return 2;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc == 2 && std::strcmp(argv[1], "--list") == 0) {
    tools::for_each_method([](auto tag) {
      using Stepper = typename decltype(tag)::type;
      std::printf("%s %d %d\n", Stepper::name, Stepper::flops,
                  Stepper::layout == SampleLayout::rate_function ? 0 : 1);
    });
    return 0;
  }
  if (argc != 4 && argc != 5) return usage();
  const std::string_view method(argv[1]);
  const std::string_view scalar(argv[2]);
  char* end = nullptr;
  const unsigned long long steps = std::strtoull(argv[3], &end, 10);
  if (end == argv[3] || *end != '\0') return usage();
  bool propagator = false;
  if (argc == 5) {
    const std::string_view mode(argv[4]);
    if (mode == "propagator") {
      propagator = true;
    } else if (mode != "step") {
      return usage();
    }
  }
  if (scalar == "float") return run_typed<float>(method, steps, propagator);
  if (scalar == "double") return run_typed<double>(method, steps, propagator);
  return usage();
}
