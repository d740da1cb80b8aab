#pragma once
/// @file
/// How a stepper finds its a-priori local error bound: through its family's data. Every stepper
/// names its family (`using family = …`, stepper_traits.hpp): a rotation-vector rule, an explicit
/// Runge–Kutta tableau with its input form, a Munthe-Kaas method, …; each family has ONE bound,
/// FamilyLocalErrorBound<Family>, defined in the family's bounds header and computed from the same
/// data the stepper runs on. LocalErrorBound<Stepper>::local(envelope, dt) (rad) is that bound for
/// one step of length dt (s); a stepper whose family has no bound gets an empty LocalErrorBound
/// (no `local`), which has_local_error_bound reports and code that needs a bound refuses to
/// compile (the catalogue's build check `catalogue_bounds` turns that into a named failure).

#include <type_traits>
#include <utility>

#include "halfspin/bounds/motion_description.hpp"

namespace halfspin {

/// One partial specialization per family, in the family's bounds header.
template <class Family>
struct FamilyLocalErrorBound;

template <class Stepper, class = void>
struct LocalErrorBound {};  ///< no bound: the family has none

template <class Stepper>
struct LocalErrorBound<
    Stepper, std::void_t<decltype(sizeof(FamilyLocalErrorBound<typename Stepper::family>))>>
    : FamilyLocalErrorBound<typename Stepper::family> {};

/// Whether LocalErrorBound<Stepper> has a `local` for scalar T.
template <class Stepper, class T, class = void>
struct has_local_error_bound : std::false_type {};
template <class Stepper, class T>
struct has_local_error_bound<Stepper, T,
                             std::void_t<decltype(LocalErrorBound<Stepper>::template local<T>(
                                 std::declval<const RateEnvelope<T>&>(), std::declval<T>()))>>
    : std::true_type {};

}  // namespace halfspin
