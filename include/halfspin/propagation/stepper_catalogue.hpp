#pragma once
/// @file
/// The one catalogue of steppers: every stepper of the library, once, with a stable numeric id.
/// Everything that enumerates steppers derives from this list: the desktop tools' method list and
/// descriptions, the tests that sweep "all steppers" (orders, bound safety, replay on the
/// microcontroller), the footprint images, the benchmarks, the fuzz harness (which selects a
/// stepper by id, so stored corpora keep their meaning when steppers are added) and the docs'
/// tables. A build check fails when a stepper type exists that this list lacks
/// (tests/build_checks: catalogue_complete), and when a listed stepper has no finite a-priori
/// bound for a smooth rate envelope, or a name that is not the snake_case of its type (names are
/// then unique as the types are; tests/propagation/test_catalogue.cpp).
///
/// Adding a stepper: its header (one algorithm; for a family member, its data), one line below
/// with the next unused id (ids are never reused or renumbered), and its own tests.
///
/// The list is also read by CMake and scripts (cmake/HalfspinCatalogue.cmake), one entry per
/// line in the form `CatalogueEntry<id, TypeName>`; keep that form.

#include <array>
#include <cstddef>
#include <cstdint>
#include <type_traits>
#include <utility>

#include "halfspin/propagation/commutator_free_4.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

/// A list of types (the library may not use `<tuple>`).
template <class... Ts>
struct TypeList {
  static constexpr std::size_t size = sizeof...(Ts);  ///< the number of types
};

/// One stepper and its stable id.
template <std::uint16_t Id, class Stepper>
struct CatalogueEntry {
  static constexpr std::uint16_t id = Id;  ///< the stable id
  using stepper = Stepper;                 ///< the stepper type
};

namespace detail {

// What the contract (stepper_traits.hpp) requires of every catalogued stepper, at compile time.
template <class S>
constexpr bool meets_contract() noexcept {
  static_assert(std::is_same<decltype(S::name), const char* const>::value, "a stepper has a name");
  static_assert(std::is_same<decltype(S::description), const char* const>::value,
                "a stepper has a one-line description");
  static_assert(std::is_same<decltype(S::layout), const SampleLayout>::value,
                "a stepper has a layout");
  static_assert(std::is_same<decltype(S::window), const std::size_t>::value,
                "a stepper has a window");
  static_assert(std::is_same<decltype(S::order), const int>::value, "a stepper has an order");
  static_assert(std::is_same<decltype(S::flops), const int>::value, "a stepper counts its flops");
  static_assert(std::is_same<decltype(S::has_estimate), const bool>::value,
                "a stepper says whether it estimates its error");
  static_assert(S::order >= 1 && S::flops > 0, "order and flops are positive");
  using family = typename S::family;  // the data the bounds layer dispatches on
  static_cast<void>(sizeof(family*));
  return true;
}

}  // namespace detail

/// A catalogue: its entries and what can be read from them.
template <class... Entries>
struct StepperCatalogueOf {
  static constexpr std::size_t size = sizeof...(Entries);   ///< the number of entries
  using entries = TypeList<Entries...>;                     ///< the entries, in order
  using steppers = TypeList<typename Entries::stepper...>;  ///< the stepper types, in order
  static constexpr std::array<std::uint16_t, size> ids{{Entries::id...}};  ///< the ids, in order
  /// The names, in order.
  static constexpr std::array<const char*, size> names{{Entries::stepper::name...}};
  /// The descriptions, in order.
  static constexpr std::array<const char*, size> descriptions{{Entries::stepper::description...}};

  /// Calls f(Entry{}) for every entry, in catalogue order.
  template <class F>
  static constexpr void for_each(F&& f) {
    (f(Entries{}), ...);
  }
  /// Calls f(Entry{}) for the entry with this id; false (and no call) if there is none.
  template <class F>
  static constexpr bool visit_id(std::uint16_t id, F&& f) {
    bool found = false;
    ((!found && Entries::id == id ? (f(Entries{}), found = true) : false), ...);
    return found;
  }
  /// Whether every stepper meets the contract (stepper_traits.hpp); fails to compile otherwise.
  static constexpr bool all_meet_contract =
      (detail::meets_contract<typename Entries::stepper>() && ...);
  /// Whether no two entries share an id.
  static constexpr bool ids_unique() noexcept {
    for (std::size_t i = 0; i < size; ++i) {
      for (std::size_t j = 0; j < i; ++j) {
        if (ids[i] == ids[j]) {
          return false;
        }
      }
    }
    return true;
  }
};

/// The catalogue, in the order the tools list it: exponential-map family, Magnus, coning
/// algorithms, Runge–Kutta, embedded pairs, Lie-group methods. Ids are stable (never reused).
/// One entry per line, as cmake/HalfspinCatalogue.cmake and fuzz/make_seeds.py read it.
// clang-format off
using StepperCatalogue = StepperCatalogueOf<
    CatalogueEntry<0, ExponentialMapHoldEnd>,
    CatalogueEntry<16, ExponentialMapHoldStart>,
    CatalogueEntry<1, ExponentialMapMidpointMean>,
    CatalogueEntry<17, ExponentialMapMidpointSample>,
    CatalogueEntry<2, Magnus4>,
    CatalogueEntry<14, Coning1Sample>,
    CatalogueEntry<5, Coning2Sample>,
    CatalogueEntry<18, Coning3Sample>,
    CatalogueEntry<19, Coning3SampleMiller>,
    CatalogueEntry<6, Coning4Sample>,
    CatalogueEntry<7, Coning1SamplePlusPrevious>,
    CatalogueEntry<15, RungeKutta2MidpointSampled>,
    CatalogueEntry<9, RungeKutta2MidpointInterpolated>,
    CatalogueEntry<20, RungeKutta2MidpointRateFunction>,
    CatalogueEntry<10, RungeKutta3KuttaSampled>,
    CatalogueEntry<21, RungeKutta3KuttaInterpolated>,
    CatalogueEntry<22, RungeKutta3KuttaRateFunction>,
    CatalogueEntry<8, RungeKutta4Sampled>,
    CatalogueEntry<23, RungeKutta4Interpolated>,
    CatalogueEntry<11, RungeKutta4RateFunction>,
    CatalogueEntry<12, BogackiShampine32RateFunction>,
    CatalogueEntry<13, DormandPrince54RateFunction>,
    CatalogueEntry<3, MuntheKaas4Sampled>,
    CatalogueEntry<24, MuntheKaas4Interpolated>,
    CatalogueEntry<4, MuntheKaas4RateFunction>,
    CatalogueEntry<25, CommutatorFree4>>;
// clang-format on

static_assert(StepperCatalogue::all_meet_contract, "every catalogued stepper meets the contract");
static_assert(StepperCatalogue::ids_unique(), "catalogue ids are unique");

}  // namespace halfspin
