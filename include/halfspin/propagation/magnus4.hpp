#pragma once
/// @file
/// The fourth-order Magnus step from three rate samples spanning the step (start, middle, end; the
/// step is two sample periods):
///     φ = dt/6·(ω0 + 4ω1 + ω2) + dt²/12·(ω0 × ω2),   q(t + dt) = q(t) ⊗ exp(φ/2).
/// Why order 4 (Magnus expansion: Iserles and Nørsett 1999; Blanes, Casas, Oteo and Ros 2009):
/// Simpson's rule is exact through cubics and the weight 1/12 on ω0 × ω2 gives the commutator
/// coefficient κ_p = 1/12 with κ_q = 0 by time symmetry, so only the third Magnus term, O(dt⁵) per
/// step, remains with real samples at start, middle and end. Derivation:
/// rotation_vector_family.hpp ("Order"); error expansion and bound:
/// bounds/magnus_family_bounds.hpp §1–§4. Its delta-angle counterpart is the two-sample coning
/// algorithm (coning_compensation.hpp).
///
/// A RotationVectorRule (rotation_vector_family.hpp): Simpson weights 1, 4, 1 over 6 and the
/// commutator weight 1/12 at separation 2; order, flops and bound are derived from it.
/// Cost: quadrature 13, commutator 14, sum 3, exp(φ/2) − 1 19 (series branch), plain application
/// 32 → 81. Memory: none beyond the three-sample window. Online error signal: the size of the
/// commutator term |dt²/12·ω0 × ω2| (rad), the non-commutativity that zero-order-hold steps ignore:
/// an a-posteriori indicator of how much non-commutativity the step saw, not this method's own
/// error (O(dt⁵), measured 4× to 10⁵× smaller), and not the whole error of the trapezoid step,
/// whose quadrature error can dominate (tests/bounds/test_magnus_family_bounds.cpp: estimate/
/// |φ* − ∫ω| → 1.00; estimate/trapezoid-step error 0.19 on classical coning, 1.7 on an
/// axisymmetric body).

#include "halfspin/propagation/rotation_vector_family.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

namespace rotation_vector_rules {
/// Simpson's rule and the commutator dt²/12·ω0 × ω2 on rates at start, middle and end.
struct Magnus4 {
  /// The rule's data.
  static constexpr RotationVectorRule<3> value{
      SampleLayout::rates_spanning, {{1, 4, 1}}, 6, {{0, 1}, 12}};
};
}  // namespace rotation_vector_rules

/// φ = dt/6·(ω0 + 4ω1 + ω2) + dt²/12·(ω0 × ω2), q ⊗ exp(φ/2); rates in rad/s at start, middle, end
/// of the step; dt in s. Global order 4.
struct Magnus4 : RotationVectorStepper<rotation_vector_rules::Magnus4> {
  /// The stepper's one name (snake_case of its type).
  static constexpr const char* name = "magnus_4";
  /// One line: what it does, what it takes.
  static constexpr const char* description =
      "4th-order Magnus: Simpson rotation vector plus commutator term; 2 rates/step, order 4";
};

}  // namespace halfspin
