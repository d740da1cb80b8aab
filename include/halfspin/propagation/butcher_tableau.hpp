#pragma once
/// @file
/// Butcher tableaus of explicit Runge–Kutta methods as compile-time data, and the compile-time
/// facts the generic steppers derive from them (coefficients rounded once to the scalar type,
/// nonzero counts for the flop tally, which stage nodes coincide).
///
/// Coefficients are written as exact rationals in long double and rounded once to T at compile
/// time, so float code never computes in a wider type at run time. Sources: Butcher (order
/// conditions, the classic methods); Bogacki and Shampine 1989 (3(2) pair); Dormand and Prince
/// 1980 (5(4) pair). The coefficients are from memory; tests/propagation/test_runge_kutta.cpp
/// checks every order condition through order 5 against Butcher's rooted-tree conditions, and the
/// static_asserts below check the row-sum condition Σ_j a_ij = c_i.

#include <array>
#include <cstddef>

namespace halfspin {

/// An explicit tableau with S stages: a is strictly lower triangular; b are the weights of the
/// returned solution; b_embedded those of an embedded solution of order embedded_order (all zero
/// and embedded_order = 0 when the method has none). attitude_order is the order of the attitude
/// alone on q̇ = ½ q ⊗ (0, ω) with exact stage rates, where it exceeds the classical order because
/// the leading local error term is a norm change (Kutta's RK3, explicit_runge_kutta.hpp), else
/// equal to `order`.
template <std::size_t S>
struct ButcherTableau {
  static constexpr std::size_t stages = S;  ///< S
  /// Stage coefficients a_ij (strictly lower triangular).
  std::array<std::array<long double, S>, S> a;
  std::array<long double, S> b;           ///< weights of the returned solution
  std::array<long double, S> c;           ///< nodes c_i (fractions of the step)
  std::array<long double, S> b_embedded;  ///< weights of the embedded solution (all zero if none)
  int order;                              ///< classical order of the returned solution
  int embedded_order;                     ///< order of the embedded solution (0 if none)
  int attitude_order;                     ///< order of the attitude alone (see above)
};

/// Explicit midpoint rule: second order, one rate at mid-step.
struct MidpointTableau {
  /// The tableau.
  static constexpr ButcherTableau<2> value{
      {{{{0.0L, 0.0L}}, {{0.5L, 0.0L}}}}, {{0.0L, 1.0L}}, {{0.0L, 0.5L}}, {{0.0L, 0.0L}}, 2, 0, 2};
};

/// Kutta's third-order method (nodes 0, 1/2, 1).
struct Kutta3Tableau {
  /// The tableau.
  static constexpr ButcherTableau<3> value{
      {{{{0.0L, 0.0L, 0.0L}}, {{0.5L, 0.0L, 0.0L}}, {{-1.0L, 2.0L, 0.0L}}}},
      {{1.0L / 6, 2.0L / 3, 1.0L / 6}},
      {{0.0L, 0.5L, 1.0L}},
      {{0.0L, 0.0L, 0.0L}},
      3,
      0,
      4};
};

/// The classic fourth-order method (nodes 0, 1/2, 1/2, 1).
struct ClassicRungeKutta4Tableau {
  /// The tableau.
  static constexpr ButcherTableau<4> value{{{{{0.0L, 0.0L, 0.0L, 0.0L}},
                                             {{0.5L, 0.0L, 0.0L, 0.0L}},
                                             {{0.0L, 0.5L, 0.0L, 0.0L}},
                                             {{0.0L, 0.0L, 1.0L, 0.0L}}}},
                                           {{1.0L / 6, 1.0L / 3, 1.0L / 3, 1.0L / 6}},
                                           {{0.0L, 0.5L, 0.5L, 1.0L}},
                                           {{0.0L, 0.0L, 0.0L, 0.0L}},
                                           4,
                                           0,
                                           4};
};

/// Bogacki–Shampine 3(2): third-order solution, second-order embedded one (nodes 0, 1/2, 3/4, 1).
/// The last stage is evaluated at the new solution (first-same-as-last), which only a stepper that
/// keeps state could reuse; our steppers are stateless and evaluate it every step.
struct BogackiShampine32Tableau {
  /// The tableau.
  static constexpr ButcherTableau<4> value{{{{{0.0L, 0.0L, 0.0L, 0.0L}},
                                             {{0.5L, 0.0L, 0.0L, 0.0L}},
                                             {{0.0L, 0.75L, 0.0L, 0.0L}},
                                             {{2.0L / 9, 1.0L / 3, 4.0L / 9, 0.0L}}}},
                                           {{2.0L / 9, 1.0L / 3, 4.0L / 9, 0.0L}},
                                           {{0.0L, 0.5L, 0.75L, 1.0L}},
                                           {{7.0L / 24, 1.0L / 4, 1.0L / 3, 1.0L / 8}},
                                           3,
                                           2,
                                           3};
};

/// Dormand–Prince 5(4): fifth-order solution, fourth-order embedded one, seven stages (first-same-
/// as-last, see above).
struct DormandPrince54Tableau {
  /// The tableau.
  static constexpr ButcherTableau<7> value{
      {{{{0.0L, 0.0L, 0.0L, 0.0L, 0.0L, 0.0L, 0.0L}},
        {{1.0L / 5, 0.0L, 0.0L, 0.0L, 0.0L, 0.0L, 0.0L}},
        {{3.0L / 40, 9.0L / 40, 0.0L, 0.0L, 0.0L, 0.0L, 0.0L}},
        {{44.0L / 45, -56.0L / 15, 32.0L / 9, 0.0L, 0.0L, 0.0L, 0.0L}},
        {{19372.0L / 6561, -25360.0L / 2187, 64448.0L / 6561, -212.0L / 729, 0.0L, 0.0L, 0.0L}},
        {{9017.0L / 3168, -355.0L / 33, 46732.0L / 5247, 49.0L / 176, -5103.0L / 18656, 0.0L,
          0.0L}},
        {{35.0L / 384, 0.0L, 500.0L / 1113, 125.0L / 192, -2187.0L / 6784, 11.0L / 84, 0.0L}}}},
      {{35.0L / 384, 0.0L, 500.0L / 1113, 125.0L / 192, -2187.0L / 6784, 11.0L / 84, 0.0L}},
      {{0.0L, 1.0L / 5, 3.0L / 10, 4.0L / 5, 8.0L / 9, 1.0L, 1.0L}},
      {{5179.0L / 57600, 0.0L, 7571.0L / 16695, 393.0L / 640, -92097.0L / 339200, 187.0L / 2100,
        1.0L / 40}},
      5,
      4,
      5};
};

namespace detail {

template <class T, std::size_t S>
constexpr std::array<T, S> round_all(const std::array<long double, S>& v) noexcept {
  std::array<T, S> r{};
  for (std::size_t i = 0; i < S; ++i) {
    r[i] = static_cast<T>(v[i]);
  }
  return r;
}

template <class T, std::size_t S>
constexpr std::array<std::array<T, S>, S> round_all(
    const std::array<std::array<long double, S>, S>& m) noexcept {
  std::array<std::array<T, S>, S> r{};
  for (std::size_t i = 0; i < S; ++i) {
    r[i] = round_all<T>(m[i]);
  }
  return r;
}

template <std::size_t S>
constexpr std::array<long double, S> weight_difference(const ButcherTableau<S>& t) noexcept {
  std::array<long double, S> d{};
  for (std::size_t i = 0; i < S; ++i) {
    d[i] = t.b[i] - t.b_embedded[i];
  }
  return d;
}

template <std::size_t S>
constexpr std::size_t count_nonzero(const std::array<long double, S>& v) noexcept {
  std::size_t n = 0;
  for (std::size_t i = 0; i < S; ++i) {
    n += v[i] != 0.0L ? 1u : 0u;
  }
  return n;
}

template <std::size_t S>
constexpr std::size_t count_nonzero(const std::array<std::array<long double, S>, S>& m) noexcept {
  std::size_t n = 0;
  for (std::size_t i = 0; i < S; ++i) {
    n += count_nonzero(m[i]);
  }
  return n;
}

// For each stage, the first stage with the same node: repeated nodes (c₂ = c₃ in classic RK4, the
// last two of Dormand–Prince) share one rate evaluation.
template <std::size_t S>
constexpr std::array<std::size_t, S> first_stage_with_node(const ButcherTableau<S>& t) noexcept {
  std::array<std::size_t, S> r{};
  for (std::size_t i = 0; i < S; ++i) {
    r[i] = i;
    for (std::size_t j = 0; j < i; ++j) {
      if (t.c[j] == t.c[i]) {
        r[i] = j;
        break;
      }
    }
  }
  return r;
}

template <std::size_t S>
constexpr bool rows_sum_to_nodes(const ButcherTableau<S>& t) noexcept {
  for (std::size_t i = 0; i < S; ++i) {
    long double sum = 0.0L;
    for (std::size_t j = 0; j < S; ++j) {
      if (j >= i && t.a[i][j] != 0.0L) {
        return false;  // not explicit
      }
      sum += t.a[i][j];
    }
    const long double d = sum - t.c[i];
    if (d > 1e-15L || d < -1e-15L) {
      return false;
    }
  }
  return true;
}

}  // namespace detail

/// The coefficients of Tableau rounded once to T (compile time).
template <class Tableau, class T>
struct TableauCoefficients {
  static constexpr std::size_t stages = decltype(Tableau::value)::stages;  ///< the tableau's stages
  /// A rounded to T.
  static constexpr std::array<std::array<T, stages>, stages> a =
      detail::round_all<T>(Tableau::value.a);
  /// B rounded to T.
  static constexpr std::array<T, stages> b = detail::round_all<T>(Tableau::value.b);
  /// C rounded to T.
  static constexpr std::array<T, stages> c = detail::round_all<T>(Tableau::value.c);
  /// b − b_embedded, formed exactly in long double before the one rounding to T, so the error
  /// estimate does not suffer the cancellation of two separately rounded weights.
  static constexpr std::array<T, stages> b_difference =
      detail::round_all<T>(detail::weight_difference(Tableau::value));
};

static_assert(detail::rows_sum_to_nodes(MidpointTableau::value), "midpoint tableau");
static_assert(detail::rows_sum_to_nodes(Kutta3Tableau::value), "Kutta 3 tableau");
static_assert(detail::rows_sum_to_nodes(ClassicRungeKutta4Tableau::value), "RK4 tableau");
static_assert(detail::rows_sum_to_nodes(BogackiShampine32Tableau::value), "BS32 tableau");
static_assert(detail::rows_sum_to_nodes(DormandPrince54Tableau::value), "DP54 tableau");

}  // namespace halfspin
