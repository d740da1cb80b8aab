#pragma once
// The desktop tools' catalogue of halfspin steppers: every stepper of the library by its `name`,
// with one line of description, and a way to run code for a stepper chosen at run time.
//
//   for_each_method(f)        calls f(MethodTag<Stepper>{}) for every stepper, in catalogue order
//   visit_method(name, f)     calls f(MethodTag<Stepper>{}) for the stepper called `name`;
//                             returns false (and calls nothing) if there is none
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
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin::tools {

template <class Stepper>
struct MethodTag {
  using type = Stepper;
};

// Every stepper, in the order the tools list them: exponential-map family, Magnus, coning
// algorithms, Runge–Kutta, embedded pairs, Lie-group Runge–Kutta.
using AllMethods =
    std::tuple<ExpMapHoldEnd, ExpMapHoldStart, ExpMapMidpointMean, ExpMapMidpointSample, Magnus4,
               ConingOneSample, ConingTwoSample, ConingThreeSample, ConingThreeSampleOlder,
               ConingFourSample, ConingOneSamplePlusPrevious, RungeKutta2Sampled,
               RungeKutta2Interpolated, RungeKutta2RateFunction, RungeKutta3Sampled,
               RungeKutta3Interpolated, RungeKutta3RateFunction, RungeKutta4Sampled,
               RungeKutta4Interpolated, RungeKutta4RateFunction, BogackiShampine32RateFunction,
               DormandPrince54RateFunction, MuntheKaas4Sampled, MuntheKaas4Interpolated,
               MuntheKaas4RateFunction>;

inline constexpr std::size_t method_count = std::tuple_size<AllMethods>::value;

// One line per stepper (what it does, what it takes); same order as AllMethods.
inline constexpr std::array<const char*, method_count> method_descriptions{{
    "exp map of the rate at the step's end held over the step; 1 rate/step, order 1",
    "exp map of the rate at the step's start held over the step; 1 rate/step, order 1",
    "exp map of the mean of the two end rates (trapezoid); 1 rate/step, order 2",
    "exp map of the mid-step rate sample; 2 rates/step, order 2",
    "4th-order Magnus: Simpson rotation vector plus commutator term; 2 rates/step, order 4",
    "delta-angle exp map, no coning term; 1 delta-angle/step, order 2",
    "two-sample coning compensation; 2 delta-angles/step, order 4",
    "three-sample coning compensation; 3 delta-angles/step, order 4",
    "three-sample coning, older coefficient set; 3 delta-angles/step, order 4",
    "four-sample coning compensation; 4 delta-angles/step, order 4",
    "one sample plus the previous one (cross-step coning term); 1 delta-angle/step, order 3",
    "classic RK2 (midpoint) on the quaternion, stages at samples; 2 rates/step, order 2",
    "RK2 (midpoint), mid-step rate interpolated linearly; 1 rate/step, order 2",
    "RK2 (midpoint) on a rate function (truth motions only)",
    "Kutta's RK3, stages at samples; 2 rates/step, attitude order 4",
    "Kutta's RK3, stage rates interpolated linearly; 1 rate/step, order 2",
    "Kutta's RK3 on a rate function (truth motions only); attitude order 4",
    "classic RK4, stages at samples; 2 rates/step, order 4",
    "classic RK4, stage rates interpolated linearly; 1 rate/step, order 2",
    "classic RK4 on a rate function (truth motions only); order 4",
    "Bogacki-Shampine 3(2) pair on a rate function (truth motions only); order 3, estimate",
    "Dormand-Prince 5(4) pair on a rate function (truth motions only); order 5, estimate",
    "Munthe-Kaas RK4 on the rotation vector, stages at samples; 2 rates/step, order 4",
    "Munthe-Kaas RK4, stage rates interpolated linearly; 1 rate/step, order 2",
    "Munthe-Kaas RK4 on a rate function (truth motions only); order 4",
}};

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
  if constexpr (Stepper::layout == SampleLayout::rate_function) {
    return has_rate_function_error_estimate<Stepper, double, RateFunctionPointer>::value;
  } else {
    return has_error_estimate<Stepper, double>::value;
  }
}

template <class Stepper>
constexpr MethodInfo method_info(std::size_t index) noexcept {
  return {Stepper::name,
          method_descriptions[index],
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

template <class F>
bool visit_method(std::string_view name, F&& f) {
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
