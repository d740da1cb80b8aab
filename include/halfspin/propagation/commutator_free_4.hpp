#pragma once
/// @file
/// The fourth-order commutator-free Lie-group method of Celledoni, Marthinsen and Owren (2003)
/// on attitude kinematics: two exponentials, no commutator.
///     φ₁ = dt/12·(3ω₀ + 4ω₁ − ω₂),   φ₂ = dt/12·(−ω₀ + 4ω₁ + 3ω₂),
///     q(t + dt) = q(t) ⊗ exp(φ₁/2) ⊗ exp(φ₂/2),
/// rates in rad/s at the start, middle and end of the step (two sample periods per step). The
/// published method has four stages at the nodes 0, ½, ½, 1 and the exponents
/// ¼k₁ + ⅙k₂ + ⅙k₃ − 1/12·k₄ (first) and −1/12·k₁ + ⅙k₂ + ⅙k₃ + ¼k₄ (second); the attitude rate
/// depends on time only, so k₂ = k₃ = ω₁ and the two middle weights merge into ⅓.
/// Why it is fourth order without a commutator: φ₁ + φ₂ is Simpson's rule; the product's
/// second-order term ½φ₁×φ₂ = dt²/288·(3ω₀ + 4ω₁ − ω₂)×(−ω₀ + 4ω₁ + 3ω₂) = dt³/12·ω×ω̇ + O(dt⁵)
/// (ω, ω̇ at mid-step), the commutator term of the Magnus expansion, which Magnus 4 computes as
/// dt²/12·ω₀×ω₂; the third-order term (1/12)(φ₁ − φ₂)×(φ₁×φ₂) is O(dt⁵) because
/// φ₁ − φ₂ = dt/3·(ω₀ − ω₂) is O(dt²) (commutator_free_family.hpp derives it for every member).
/// Against Magnus 4 (magnus4.hpp), same samples and order: two exponentials instead of one and a
/// cross product; the increment's rounding stays that of unit-quaternion products.
/// Order, flops and the a-priori bound are derived from the rule below
/// (bounds/commutator_free_bounds.hpp).

#include "halfspin/propagation/commutator_free_family.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace commutator_free_rules {
/// The exponents over the samples ω₀, ω₁, ω₂ (twelfths): (3, 4, −1), then (−1, 4, 3).
struct CommutatorFree4 {
  /// The rule's data.
  static constexpr CommutatorFreeRule<3, 2> value{
      SampleLayout::rates_spanning, {{{{3, 4, -1}}, {{-1, 4, 3}}}}, 12};
};
}  // namespace commutator_free_rules

/// q ⊗ exp(φ₁/2) ⊗ exp(φ₂/2), rates in rad/s at start, middle and end of the step; dt in s.
/// Global order 4.
struct CommutatorFree4 : CommutatorFreeStepper<commutator_free_rules::CommutatorFree4> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "commutator_free_4";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "4th-order commutator-free: two exponentials of rate combinations; 2 rates/step, order 4";
};

}  // namespace halfspin
