#pragma once
// The fourth-order Magnus step from three rate samples spanning the step (start, middle, end; the
// step is two sample periods):
//     φ = dt/6·(ω0 + 4ω1 + ω2) + dt²/12·(ω0 × ω2),   q(t + dt) = q(t) ⊗ exp(φ/2).
// Derivation: for q̇ = ½ q ⊗ (0, ω) the rotation vector of the step obeys Bortz's equation
// φ̇ = ω + ½ φ × ω + O(|φ|²|ω|), so φ = ∫ω + ½∫₀^dt (∫₀^t ω) × ω(t) dt + O(dt⁵). Simpson's rule makes
// the first term fourth order. In the second, with ω = a + b·τ about mid-step, the double integral
// is (dt³/12)·a × b + O(dt⁵), and ω0 × ω2 = dt·a × b + O(dt³): the commutator (coning) term
// dt²/12·ω0 × ω2. Local error O(dt⁵), global order 4 with real samples at start, middle and end
// (Magnus expansion: Iserles and Nørsett 1999; Blanes, Casas, Oteo and Ros 2009). Its delta-angle
// counterpart is the two-sample coning algorithm (coning_compensation.hpp).
//
// Cost: quadrature 13, commutator 14, sum 3, quaternion_exp 20 (series branch), product 28 → 78.
// Memory: none beyond the three-sample window. Online error signal: the size of the commutator
// term |dt²/12·ω0 × ω2| (rad), the non-commutativity that zero-order-hold steps ignore.

#include <array>
#include <cstddef>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/stepper_traits.hpp"

namespace halfspin {

struct Magnus4 {
  static constexpr SampleLayout layout = SampleLayout::rates_spanning;
  static constexpr std::size_t window = 3;
  static constexpr std::size_t new_samples = 2;
  static constexpr int order = 4;
  static constexpr int flops = 30 + quaternion_exp_series_flops + quaternion_product_flops;
  static constexpr const char* name = "magnus4";

  // The step's rotation vector (rad) from rates (rad/s) at start, middle and end, and dt (s).
  template <class T>
  static constexpr Vector3<T> rotation_vector(const std::array<Vector3<T>, window>& rate,
                                              T dt) noexcept {
    // Multiplying by rounded 1/6 and 1/12 instead of dividing: a division costs 14 cycles on a
    // Cortex-M4F, a multiplication 1.
    return quadrature_term(rate, dt) + commutator_term(rate, dt);
  }

  // Simpson's rule dt/6·(ω0 + 4ω1 + ω2) (rad).
  template <class T>
  static constexpr Vector3<T> quadrature_term(const std::array<Vector3<T>, window>& rate,
                                              T dt) noexcept {
    return (rate[0] + rate[2] + T(4) * rate[1]) * (dt * T(1.0L / 6));
  }

  // The commutator (coning) term dt²/12·ω0 × ω2 (rad).
  template <class T>
  static constexpr Vector3<T> commutator_term(const std::array<Vector3<T>, window>& rate,
                                              T dt) noexcept {
    return cross(rate[0], rate[2]) * (dt * dt * T(1.0L / 12));
  }

  // q ⊗ exp(φ/2); rates in rad/s at start, middle, end of the step; dt in s.
  template <class T>
  static Quaternion<T> step(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                            T dt) noexcept {
    return q * quaternion_exp(rotation_vector(rate, dt));
  }

  // step() plus the online error signal |dt²/12·ω0 × ω2| (rad): the size of the non-commutative
  // (coning) part of the step's rotation, |φ* − ∫ω|, which any step that only integrates the rate
  // (zero-order hold, trapezoid) misses. It is an a-posteriori indicator of how much
  // non-commutativity the step saw, not this method's own error (O(dt⁵), measured 4× to 10⁵×
  // smaller), and not the whole error of the trapezoid step, whose quadrature error can dominate
  // (measured in tests/bounds/test_magnus_family_bounds.cpp: estimate/|φ* − ∫ω| → 1.00;
  // estimate/trapezoid-step error 0.19 on classical coning, 1.7 on an axisymmetric body).
  // Cost: step() plus the norm (6 flops with the square root); the commutator is computed once
  // and the attitude is bit-identical to step()'s (same expression).
  template <class T>
  static StepOutcome<T> step_with_estimate(const Quaternion<T>& q, const std::array<Vector3<T>, window>& rate,
                                           T dt) noexcept {
    const Vector3<T> commutator = commutator_term(rate, dt);
    return {q * quaternion_exp(quadrature_term(rate, dt) + commutator), norm(commutator)};
  }
};

}  // namespace halfspin
