// ns per call of the core maps and the representation conversions, in float and double.
// Inputs cycle through a fixed table of seeded random rotations so that the branches of the
// conversions (series vs trigonometric, Shepperd's four cases) are all exercised.
#include <benchmark/benchmark.h>

#include <array>
#include <cstddef>
#include <random>

#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;

constexpr std::size_t table_size = 256;  // a power of two: the index wraps with a mask

template <class T>
const std::array<Quaternion<T>, table_size>& rotations() {
  static const std::array<Quaternion<T>, table_size> table = [] {
    std::array<Quaternion<T>, table_size> t{};
    std::mt19937_64 engine(7);
    std::normal_distribution<double> g(0.0, 1.0);
    for (auto& q : t) {
      q = normalized(Quaternion<T>{static_cast<T>(g(engine)), static_cast<T>(g(engine)),
                                   static_cast<T>(g(engine)), static_cast<T>(g(engine))});
    }
    return t;
  }();
  return table;
}

// Small rotation vectors, as one gyro step produces (|φ| from 1e-5 to 1e-2 rad).
template <class T>
const std::array<Vector3<T>, table_size>& small_rotation_vectors() {
  static const std::array<Vector3<T>, table_size> table = [] {
    std::array<Vector3<T>, table_size> t{};
    std::mt19937_64 engine(8);
    std::uniform_real_distribution<double> u(-1e-2, 1e-2);
    for (auto& v : t) {
      v = Vector3<T>{static_cast<T>(u(engine)), static_cast<T>(u(engine)),
                     static_cast<T>(u(engine))};
    }
    return t;
  }();
  return table;
}

template <class T, class F>
void run_over_rotations(benchmark::State& state, F f) {
  const auto& table = rotations<T>();
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(f(table[i]));
    i = (i + 1) & (table_size - 1);
  }
}

template <class T>
void exp_small(benchmark::State& state) {
  const auto& table = small_rotation_vectors<T>();
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(quaternion_exp(table[i]));
    i = (i + 1) & (table_size - 1);
  }
}

template <class T>
void exp_large(benchmark::State& state) {
  run_over_rotations<T>(state,
                        [](const Quaternion<T>& q) { return quaternion_exp(q.vector() * T(3)); });
}
template <class T>
void log_any(benchmark::State& state) {
  run_over_rotations<T>(state, [](const Quaternion<T>& q) { return quaternion_log(q); });
}
template <class T>
void to_matrix(benchmark::State& state) {
  run_over_rotations<T>(state, [](const Quaternion<T>& q) { return to_rotation_matrix(q); });
}
template <class T>
void from_matrix(benchmark::State& state) {
  std::array<Matrix3<T>, table_size> m{};
  for (std::size_t k = 0; k < table_size; ++k) {
    m[k] = to_rotation_matrix(rotations<T>()[k]);
  }
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(quaternion_from_rotation_matrix(m[i]));
    i = (i + 1) & (table_size - 1);
  }
}
template <class T>
void to_euler_321(benchmark::State& state) {
  run_over_rotations<T>(
      state, [](const Quaternion<T>& q) { return to_euler_angles(q, EulerSequence::zyx); });
}
template <class T>
void from_euler_321(benchmark::State& state) {
  run_over_rotations<T>(state, [](const Quaternion<T>& q) {
    return quaternion_from_euler_angles(EulerAngles<T>{q.x, q.y, q.z, EulerSequence::zyx});
  });
}
template <class T>
void product(benchmark::State& state) {
  const auto& table = rotations<T>();
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(table[i] * table[(i + 1) & (table_size - 1)]);
    i = (i + 1) & (table_size - 1);
  }
}
template <class T>
void rotate_vector(benchmark::State& state) {
  run_over_rotations<T>(state, [](const Quaternion<T>& q) {
    return rotate(q, Vector3<T>{T(1), T(2), T(3)});
  });
}

}  // namespace

BENCHMARK(product<float>)->Name("convert/product/float");
BENCHMARK(product<double>)->Name("convert/product/double");
BENCHMARK(rotate_vector<float>)->Name("convert/rotate/float");
BENCHMARK(rotate_vector<double>)->Name("convert/rotate/double");
BENCHMARK(exp_small<float>)->Name("convert/exp_small_angle/float");
BENCHMARK(exp_small<double>)->Name("convert/exp_small_angle/double");
BENCHMARK(exp_large<float>)->Name("convert/exp_large_angle/float");
BENCHMARK(exp_large<double>)->Name("convert/exp_large_angle/double");
BENCHMARK(log_any<float>)->Name("convert/log/float");
BENCHMARK(log_any<double>)->Name("convert/log/double");
BENCHMARK(to_matrix<float>)->Name("convert/to_rotation_matrix/float");
BENCHMARK(to_matrix<double>)->Name("convert/to_rotation_matrix/double");
BENCHMARK(from_matrix<float>)->Name("convert/from_rotation_matrix/float");
BENCHMARK(from_matrix<double>)->Name("convert/from_rotation_matrix/double");
BENCHMARK(to_euler_321<float>)->Name("convert/to_euler_321/float");
BENCHMARK(to_euler_321<double>)->Name("convert/to_euler_321/double");
BENCHMARK(from_euler_321<float>)->Name("convert/from_euler_321/float");
BENCHMARK(from_euler_321<double>)->Name("convert/from_euler_321/double");
