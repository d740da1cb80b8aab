#pragma once
// The desktop tools' view of the library's one stepper catalogue (stepper_catalogue.hpp): every
// stepper by its `name`, with its one line of description, and a way to run code for a stepper
// chosen at run time.
//
//   for_each_method(f)        calls f(MethodTag<Stepper>{}) for every stepper, in catalogue order
//   visit_method(name, f)     calls f(MethodTag<Stepper>{}) for the stepper called `name` (or by
//                             a documented alias, method_aliases); returns false (and calls
//                             nothing) if there is none
//   method_catalogue()        name, description and static facts of every stepper
//
// Tool code (not part of the installed library): it may use the standard library freely.

#include <array>
#include <cstddef>
#include <string_view>
#include <tuple>
#include <utility>

#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin::tools {

template <class Stepper>
struct MethodTag {
  using type = Stepper;
};

namespace detail {
template <class List>
struct AsTuple;
template <class... S>
struct AsTuple<TypeList<S...>> {
  using type = std::tuple<S...>;
};
}  // namespace detail

// Every stepper, in the library catalogue's order
// (include/halfspin/propagation/stepper_catalogue.hpp).
using AllMethods = detail::AsTuple<StepperCatalogue::steppers>::type;

inline constexpr std::size_t method_count = StepperCatalogue::size;

// One line per stepper (what it does, what it takes); same order as AllMethods.
inline constexpr std::array<const char*, method_count> method_descriptions =
    StepperCatalogue::descriptions;

// The run-time names of the previous release, accepted for one release as documented aliases of
// the catalogue's names (docs/desktop-tools.md). Each maps to exactly one catalogued name.
struct MethodAlias {
  const char* old_name;
  const char* name;
};
inline constexpr std::array<MethodAlias, 20> method_aliases{{
    {"expmap_hold_end", "exponential_map_hold_end"},
    {"expmap_hold_start", "exponential_map_hold_start"},
    {"expmap_midpoint_mean", "exponential_map_midpoint_mean"},
    {"expmap_midpoint_sample", "exponential_map_midpoint_sample"},
    {"magnus4", "magnus_4"},
    {"coning_3_sample_older", "coning_3_sample_miller"},
    {"rk2_midpoint_sampled", "runge_kutta_2_midpoint_sampled"},
    {"rk2_midpoint_interpolated", "runge_kutta_2_midpoint_interpolated"},
    {"rk2_midpoint_rate_function", "runge_kutta_2_midpoint_rate_function"},
    {"rk3_kutta_sampled", "runge_kutta_3_kutta_sampled"},
    {"rk3_kutta_interpolated", "runge_kutta_3_kutta_interpolated"},
    {"rk3_kutta_rate_function", "runge_kutta_3_kutta_rate_function"},
    {"rk4_sampled", "runge_kutta_4_sampled"},
    {"rk4_interpolated", "runge_kutta_4_interpolated"},
    {"rk4_rate_function", "runge_kutta_4_rate_function"},
    {"rkmk4_sampled", "munthe_kaas_4_sampled"},
    {"rkmk4_interpolated", "munthe_kaas_4_interpolated"},
    {"rkmk4_rate_function", "munthe_kaas_4_rate_function"},
    {"rk2_sampled", "runge_kutta_2_midpoint_sampled"},
    {"rk3_sampled", "runge_kutta_3_kutta_sampled"},
}};

// The catalogue name for `name`: itself if catalogued, the new name of an alias, else `name`.
inline std::string_view canonical_method_name(std::string_view name) noexcept {
  for (const MethodAlias& a : method_aliases) {
    if (name == std::string_view(a.old_name)) {
      return a.name;
    }
  }
  return name;
}

// The static facts of a stepper the tools print and select on.
struct MethodInfo {
  const char* name;
  const char* description;
  SampleLayout layout;
  std::size_t window;
  std::size_t periods_per_step;  // gyro sample periods one step spans (0: rate function)
  int order;
  int flops;
  bool has_estimate;  // step_with_estimate: the propagator reports an error estimate
};

namespace detail {

using RateFunctionPointer = Vector3<double> (*)(double);

template <class Stepper>
constexpr bool method_has_estimate() noexcept {
  return Stepper::has_estimate;
}

template <class Stepper>
constexpr MethodInfo method_info(std::size_t index) noexcept {
  static_cast<void>(index);
  return {Stepper::name,
          Stepper::description,
          Stepper::layout,
          Stepper::window,
          Stepper::layout == SampleLayout::rate_function
              ? std::size_t{0}
              : periods_per_step(Stepper::layout, Stepper::window),
          Stepper::order,
          Stepper::flops,
          method_has_estimate<Stepper>()};
}

template <std::size_t... I>
constexpr std::array<MethodInfo, method_count> make_catalogue(std::index_sequence<I...>) noexcept {
  return {{method_info<std::tuple_element_t<I, AllMethods>>(I)...}};
}

}  // namespace detail

inline constexpr std::array<MethodInfo, method_count> method_catalogue_table =
    detail::make_catalogue(std::make_index_sequence<method_count>{});

inline const std::array<MethodInfo, method_count>& method_catalogue() noexcept {
  return method_catalogue_table;
}

template <class F>
void for_each_method(F&& f) {
  std::apply([&f](auto... s) { (f(MethodTag<decltype(s)>{}), ...); }, AllMethods{});
}

// Calls f(MethodTag<Stepper>{}) for the stepper called `name` or by one of its documented aliases.
template <class F>
bool visit_method(std::string_view requested, F&& f) {
  const std::string_view name = canonical_method_name(requested);
  bool found = false;
  for_each_method([&](auto tag) {
    using S = typename decltype(tag)::type;
    if (!found && name == std::string_view(S::name)) {
      found = true;
      f(tag);
    }
  });
  return found;
}

}  // namespace halfspin::tools
