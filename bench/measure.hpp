#pragma once
// The timed loop every propagation benchmark shares: one Run::step() per iteration (one step of a
// propagation whose attitude carries over), the attitude kept live every iteration and observed
// after the loop, and the run's own health check (finite unit attitude; for a propagator, every
// iteration stepped and nothing was rejected) turned into an error instead of a figure.
#include <benchmark/benchmark.h>

#include <cstdint>
#include <type_traits>

namespace halfspin::bench {

// The <scalar> part of a benchmark name.
template <class T>
const char* scalar_name() {
  return std::is_same<T, float>::value ? "float" : "double";
}

template <class Run>
void measure(benchmark::State& state) {
  Run run;
  for (auto _ : state) {
    run.step();
    // Keeps the step's result live: each step consumes the previous one, so the whole chain must
    // be computed. A copy of one scalar, not a reference into `run`, so that the run's state does
    // not escape to the asm barrier (which would force all of it through memory every step).
    const auto w = run.attitude().w;
    benchmark::DoNotOptimize(w);
  }
  auto final_attitude = run.attitude();
  benchmark::DoNotOptimize(final_attitude);
  const auto steps = static_cast<std::uint64_t>(state.iterations());
  if (!run.healthy_after(steps)) {
    state.SkipWithError("the propagation went wrong (non-finite, off the unit sphere or rejected)");
  }
  state.SetItemsProcessed(state.iterations());  // steps
}

}  // namespace halfspin::bench
