// The stepper catalogue (include/halfspin/propagation/stepper_catalogue.hpp): one name per stepper,
// stable ids, a description each, and a finite a-priori bound for every catalogued stepper.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <string>
#include <string_view>

#include "halfspin/bounds/horizon_bound.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"

using namespace halfspin;

namespace {

// The type's name as the compiler spells it (g++ and clang++: "... [with T = halfspin::X]" /
// "... [T = halfspin::X]"), without its namespace.
template <class T>
std::string type_name() {
  const std::string_view f = __PRETTY_FUNCTION__;
  const std::size_t eq = f.find("T = ");
  std::string_view t = f.substr(eq + 4);
  t = t.substr(0, t.find_first_of(";]"));
  const std::size_t colon = t.rfind("::");
  if (colon != std::string_view::npos) {
    t = t.substr(colon + 2);
  }
  return std::string(t);
}

// CamelCase with digit runs → snake_case: RungeKutta2MidpointSampled →
// runge_kutta_2_midpoint_sampled.
std::string snake_case(const std::string& camel) {
  std::string out;
  for (std::size_t i = 0; i < camel.size(); ++i) {
    const char c = camel[i];
    const bool upper = c >= 'A' && c <= 'Z';
    const bool digit = c >= '0' && c <= '9';
    const bool previous_digit = i > 0 && camel[i - 1] >= '0' && camel[i - 1] <= '9';
    if (i > 0 && (upper || (digit && !previous_digit) || (!digit && previous_digit))) {
      out += '_';
    }
    out += upper ? static_cast<char>(c - 'A' + 'a') : c;
  }
  return out;
}

}  // namespace

TEST_CASE("one name per stepper: the run-time name is the snake_case of the type's name",
          "[catalogue]") {
  CHECK(snake_case("RungeKutta2MidpointSampled") == "runge_kutta_2_midpoint_sampled");
  CHECK(snake_case("BogackiShampine32RateFunction") == "bogacki_shampine_32_rate_function");
  std::size_t checked = 0;
  StepperCatalogue::for_each([&](auto entry) {
    using S = typename decltype(entry)::stepper;
    INFO(type_name<S>());
    CHECK(snake_case(type_name<S>()) == S::name);
    CHECK(std::string(S::description).size() > 10);
    CHECK(std::string(S::description).find('\n') == std::string::npos);
    ++checked;
  });
  CHECK(checked == StepperCatalogue::size);
}

TEST_CASE("catalogue ids are stable: stored fuzz corpora keep their stepper", "[catalogue]") {
  // The ids 0–15 are the selector values of the fuzz harness's corpora and regression inputs
  // written before the catalogue (fuzz/corpus/fuzz_propagator, fuzz/regressions); they must keep
  // naming the same steppers.
  const char* const before_catalogue[16] = {"exponential_map_hold_end",
                                            "exponential_map_midpoint_mean",
                                            "magnus_4",
                                            "munthe_kaas_4_sampled",
                                            "munthe_kaas_4_rate_function",
                                            "coning_2_sample",
                                            "coning_4_sample",
                                            "coning_1_sample_plus_previous",
                                            "runge_kutta_4_sampled",
                                            "runge_kutta_2_midpoint_interpolated",
                                            "runge_kutta_3_kutta_sampled",
                                            "runge_kutta_4_rate_function",
                                            "bogacki_shampine_32_rate_function",
                                            "dormand_prince_54_rate_function",
                                            "coning_1_sample",
                                            "runge_kutta_2_midpoint_sampled"};
  for (std::uint16_t id = 0; id < 16; ++id) {
    std::string name;
    REQUIRE(
        StepperCatalogue::visit_id(id, [&](auto entry) { name = decltype(entry)::stepper::name; }));
    CHECK(name == before_catalogue[id]);
  }
  CHECK_FALSE(StepperCatalogue::visit_id(999, [](auto) {}));
  STATIC_REQUIRE(StepperCatalogue::ids_unique());
  for (std::size_t i = 0; i < StepperCatalogue::size; ++i) {
    for (std::size_t j = 0; j < i; ++j) {
      CHECK(std::string(StepperCatalogue::names[i]) != StepperCatalogue::names[j]);
    }
  }
}

TEST_CASE("every catalogued stepper has a finite a-priori bound for a smooth rate envelope",
          "[catalogue][bounds]") {
  // A smooth motion: |dᵏω/dtᵏ| ≤ 1·2ᵏ (a 2 rad/s sinusoid of 1 rad/s amplitude), 1 ms steps.
  const RateEnvelope<double> smooth{{1.0, 2.0, 4.0, 8.0, 16.0, 32.0}};
  StepperCatalogue::for_each([&](auto entry) {
    using S = typename decltype(entry)::stepper;
    INFO(S::name);
    STATIC_REQUIRE(has_local_error_bound<S, double>::value);
    STATIC_REQUIRE(has_local_error_bound<S, float>::value);
    const double b = LocalErrorBound<S>::template local<double>(smooth, 1e-3);
    CHECK(std::isfinite(b));
    CHECK(b >= 0.0);
  });
}
