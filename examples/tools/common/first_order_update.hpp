#pragma once
// The first-order firmware update, kept as a REFERENCE to compare halfspin's methods against; it
// is not a halfspin stepper, is not in the stepper catalogue or the recommendation, has no
// a-priori bound, and is not recommended:
//
//   q ← q + ½·dt·q ⊗ (0, ω),  then  q ← q / ‖q‖  (one square root and one division)
//
// with ω the latest gyro rate sample (rad/s, body frame) and dt the step (s). Many firmwares
// integrate attitude this way (common practice, no source). Its error is first order in dt: the
// held rate sample misses the rate's change over the step (and the truncated exponential misses
// the ½(|ω|dt)² term, which the normalization turns into a third-order angle error per step).
//
// Conventions: scalar-first Hamilton quaternions, q maps body vectors to the reference frame,
// q̇ = ½ q ⊗ (0, ω) (DESIGN.md). Used by halfspin-stepstudy's reference series (--baseline) and
// the baseline/first_order_normalized benchmarks, so both measure the same code.
//
// Tool code (not part of the installed library).

#include <cmath>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin::tools {

inline constexpr const char* first_order_normalized_name = "first_order_normalized";
inline constexpr const char* first_order_normalized_label = "first-order firmware update";

// One step of the first-order firmware update: q (unit, scalar-first) advanced by rate w (rad/s)
// held over dt (s), renormalized by q/‖q‖. No validation: a firmware doing this has none either.
template <class T>
Quaternion<T> first_order_normalized_step(const Quaternion<T>& q, const Vector3<T>& w,
                                          T dt) noexcept {
  const T hx = T(0.5) * dt * w.x;
  const T hy = T(0.5) * dt * w.y;
  const T hz = T(0.5) * dt * w.z;
  // q ⊗ (0, h) written out, added to q.
  const T a = q.w - q.x * hx - q.y * hy - q.z * hz;
  const T b = q.x + q.w * hx + q.y * hz - q.z * hy;
  const T c = q.y + q.w * hy - q.x * hz + q.z * hx;
  const T d = q.z + q.w * hz + q.x * hy - q.y * hx;
  const T inverse_norm = T(1) / std::sqrt(a * a + b * b + c * c + d * d);
  return {a * inverse_norm, b * inverse_norm, c * inverse_norm, d * inverse_norm};
}

}  // namespace halfspin::tools
