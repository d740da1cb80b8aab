// ns per attitude-step of the batch (structure-of-arrays) propagator for desktop Monte Carlo,
// against a loop over N scalar propagators doing the same work: the one-sample delta-angle update
// q ⊗ exp(Δθ/2), first-order renormalization, validation of every sample and the elapsed-time sum.
//   batch/exponential_map_x<N>/<scalar>              BatchPropagator<T, N>::step(), samples
//                                                    written in place
//   batch/exponential_map_compensated_x<N>/<scalar>  the same with CompensatedAccumulation
//   batch/loop_of_propagators_x<N>/<scalar>          N × Propagator<T, Coning1Sample>::push(Δθ, dt)
//   batch/loop_of_compensated_propagators_x<N>/<scalar>  the same with CompensatedAccumulation
// items = attitude-steps (N per iteration); the counter `per_attitude_step` is the time of one
// (seconds, printed with an SI prefix: "2.1n" is 2.1 ns). The speed-up is the ratio of the two at
// the same N and scalar. Inputs: |Δθ| up to 0.01 rad, seeded, the same every iteration (the
// attitudes evolve, so no step repeats); N = 1024 keeps its state and input in L2.
#include <benchmark/benchmark.h>

#include <cstddef>
#include <cstdint>
#include <memory>
#include <random>
#include <type_traits>
#include <vector>

#include "halfspin/propagation/batch_propagator.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/propagator.hpp"

namespace {

using namespace halfspin;

template <class T>
constexpr GyroLimits<T> limits{T(35), T(5e-3)};  // 35 rad/s per axis, gaps above 5 ms

template <class T, std::size_t N>
BatchSamples<T, N> seeded_samples() {
  BatchSamples<T, N> s;
  std::mt19937_64 engine(1234);
  std::uniform_real_distribution<double> u(-5.7e-3, 5.7e-3);  // |Δθ| ≤ 0.01 rad
  for (std::size_t i = 0; i < N; ++i) {
    s.dx[i] = static_cast<T>(u(engine));
    s.dy[i] = static_cast<T>(u(engine));
    s.dz[i] = static_cast<T>(u(engine));
    s.dt[i] = T(1e-3);
  }
  return s;
}

template <class T>
Quaternion<T> initial_attitude() {
  return normalized(Quaternion<T>{T(0.9), T(0.1), T(-0.3), T(0.2)});
}

template <class T>
bool unit_and_finite(const Quaternion<T>& q) {
  const T e = squared_norm(q) - T(1);
  return is_finite(q) && e < T(1e-3) && e > T(-1e-3);
}

void report(benchmark::State& state, std::size_t lanes) {
  const auto attitude_steps = static_cast<double>(state.iterations()) * static_cast<double>(lanes);
  state.SetItemsProcessed(static_cast<std::int64_t>(attitude_steps));
  state.counters["per_attitude_step"] =
      benchmark::Counter(attitude_steps, benchmark::Counter::kIsRate | benchmark::Counter::kInvert);
}

template <class T, std::size_t N, class Accumulation = PlainAccumulation>
void batch_exponential_map(benchmark::State& state) {
  auto batch = std::make_unique<BatchPropagator<T, N, FirstOrderRenormalization, Accumulation>>(
      initial_attitude<T>(), limits<T>);
  batch->samples() = seeded_samples<T, N>();
  std::size_t accepted = 0;
  for (auto _ : state) {
    accepted += batch->step();
    benchmark::ClobberMemory();  // the state is in memory and consumed by the next call
  }
  benchmark::DoNotOptimize(accepted);
  bool healthy = accepted == static_cast<std::size_t>(state.iterations()) * N;
  for (std::size_t i = 0; i < N; ++i) {
    healthy = healthy && unit_and_finite(batch->lane(i));
  }
  if (!healthy) {
    state.SkipWithError("the batch went wrong (rejected samples, non-finite or non-unit lanes)");
  }
  report(state, N);
}

template <class T, std::size_t N, class Accumulation = PlainAccumulation>
void loop_of_propagators(benchmark::State& state) {
  using Lane = Propagator<T, Coning1Sample, FirstOrderRenormalization, Accumulation>;
  std::vector<Lane> lanes(N, Lane(initial_attitude<T>(), limits<T>));
  const BatchSamples<T, N> s = seeded_samples<T, N>();
  std::uint64_t bad = 0;
  for (auto _ : state) {
    for (std::size_t i = 0; i < N; ++i) {
      bad += lanes[i].push(Vector3<T>{s.dx[i], s.dy[i], s.dz[i]}, s.dt[i]) != Status::ok;
    }
    benchmark::ClobberMemory();
  }
  bool healthy = bad == 0;
  for (std::size_t i = 0; i < N; ++i) {
    healthy = healthy && unit_and_finite(lanes[i].attitude());
  }
  if (!healthy) {
    state.SkipWithError("a propagator went wrong (rejected samples, non-finite or non-unit)");
  }
  report(state, N);
}

}  // namespace

BENCHMARK(batch_exponential_map<float, 1>)->Name("batch/exponential_map_x1/float");
BENCHMARK(batch_exponential_map<double, 1>)->Name("batch/exponential_map_x1/double");
BENCHMARK(batch_exponential_map<float, 8>)->Name("batch/exponential_map_x8/float");
BENCHMARK(batch_exponential_map<double, 8>)->Name("batch/exponential_map_x8/double");
BENCHMARK(batch_exponential_map<float, 1024>)->Name("batch/exponential_map_x1024/float");
BENCHMARK(batch_exponential_map<double, 1024>)->Name("batch/exponential_map_x1024/double");
BENCHMARK(loop_of_propagators<float, 1>)->Name("batch/loop_of_propagators_x1/float");
BENCHMARK(loop_of_propagators<double, 1>)->Name("batch/loop_of_propagators_x1/double");
BENCHMARK(loop_of_propagators<float, 8>)->Name("batch/loop_of_propagators_x8/float");
BENCHMARK(loop_of_propagators<double, 8>)->Name("batch/loop_of_propagators_x8/double");
BENCHMARK(loop_of_propagators<float, 1024>)->Name("batch/loop_of_propagators_x1024/float");
BENCHMARK(loop_of_propagators<double, 1024>)->Name("batch/loop_of_propagators_x1024/double");
BENCHMARK(batch_exponential_map<float, 8, CompensatedAccumulation>)
    ->Name("batch/exponential_map_compensated_x8/float");
BENCHMARK(batch_exponential_map<double, 8, CompensatedAccumulation>)
    ->Name("batch/exponential_map_compensated_x8/double");
BENCHMARK(batch_exponential_map<float, 1024, CompensatedAccumulation>)
    ->Name("batch/exponential_map_compensated_x1024/float");
BENCHMARK(batch_exponential_map<double, 1024, CompensatedAccumulation>)
    ->Name("batch/exponential_map_compensated_x1024/double");
BENCHMARK(loop_of_propagators<float, 8, CompensatedAccumulation>)
    ->Name("batch/loop_of_compensated_propagators_x8/float");
BENCHMARK(loop_of_propagators<double, 8, CompensatedAccumulation>)
    ->Name("batch/loop_of_compensated_propagators_x8/double");
BENCHMARK(loop_of_propagators<float, 1024, CompensatedAccumulation>)
    ->Name("batch/loop_of_compensated_propagators_x1024/float");
BENCHMARK(loop_of_propagators<double, 1024, CompensatedAccumulation>)
    ->Name("batch/loop_of_compensated_propagators_x1024/double");
