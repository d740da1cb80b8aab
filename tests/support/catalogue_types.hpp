#pragma once
// The library's stepper catalogue as a std::tuple, for Catch2's TEMPLATE_LIST_TEST_CASE: the
// tests that sweep "every stepper" enumerate it instead of keeping lists of their own.
#include <tuple>

#include "halfspin/propagation/stepper_catalogue.hpp"

namespace halfspin::test {

template <class List>
struct AsTuple;
template <class... S>
struct AsTuple<TypeList<S...>> {
  using type = std::tuple<S...>;
};

using CatalogueSteppers = AsTuple<StepperCatalogue::steppers>::type;

}  // namespace halfspin::test
