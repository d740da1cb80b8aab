#pragma once
/// @file
/// Quaternion ↔ Euler angles in all 12 sequences.
///
/// Convention. Sequence "abc" means intrinsic rotations: about body axis a by `first`, then about
/// the new b by `second`, then about the newest c by `third`. The attitude (body → reference) is
///     q = q_a(first) ⊗ q_b(second) ⊗ q_c(third),   q_a(θ) = (cos θ/2, sin θ/2 · e_a),
/// so R(q) = R_a(first)·R_b(second)·R_c(third). Thus zyx is the aerospace 3-2-1 yaw–pitch–roll
/// (first = yaw, second = pitch, third = roll) and zxz is 3-1-3. Angles are in radians.
/// Ranges returned by to_euler_angles: first, third in (−π, π]; second in [−π/2, π/2] for
/// Tait–Bryan sequences (three distinct axes), [0, π] for proper Euler sequences (a, b, a).
///
/// Why the inverse works from the quaternion and not from matrix elements: asin/acos of a matrix
/// element loses half the digits of the middle angle near the singularity, and two separate atan2
/// calls for first and third lose the determined combination (first ± third) there. Instead, with
/// s = +1 when (a, b, c) is a cyclic permutation of (x, y, z) and −1 otherwise, and (w, qa, qb, qc)
/// the components of q on the scalar and the sequence's axes (c the remaining axis for a proper
/// sequence), θ± = (first ± third)/2 are read off well-conditioned pairs:
///   proper:      (w, qa) = cos(θ2/2)·(cos θ+, sin θ+),   (qb, s·qc) = sin(θ2/2)·(cos θ−, sin θ−),
///                θ2 = 2·atan2(|(qb, s·qc)|, |(w, qa)|);
///   Tait–Bryan:  with y' = s·qb, (w + y', qa + qc) = √(1 + sin θ2)·(cos θ+, sin θ+) and
///                (w − y', qa − qc) = √(1 − sin θ2)·(cos θ−, sin θ−),
///                θ2 = atan2(2(w·qb + s·qa·qc), |(w + y', qa + qc)|·|(w − y', qa − qc)|).
/// Each middle-angle formula is accurate in absolute terms for every rotation and relatively
/// accurate for tiny angles. For Tait–Bryan sequences with |θ2| ≤ 1 rad, first and third instead
/// come from one atan2 each of quadratic forms (the sum θ+ + θ− would cancel when |first| ≪
/// |third|, while 2(w·qa − y'·qc) keeps a tiny first angle to full relative accuracy); there the
/// forms have magnitude cos θ2 ≥ 0.54, so absolute accuracy is the same as through θ±.
///
/// Singularities (gimbal lock): Tait–Bryan second = ±π/2, proper second = 0 or π. There only
/// first + third or first − third is determined. Exactly at the singularity (the pair that would
/// give the undetermined combination is exactly zero) third = 0 and the determined combination goes
/// into first. Near it, the exact decomposition of the given quaternion is still returned (so
/// quaternion → angles → quaternion stays accurate to a few ε), but its first/third split moves by
/// about ε/u rad per ε of rounding in q, u being the distance of the middle angle from the
/// singular value. near_singular flags u < EulerSingularBand<T>::half_width = ε^(1/3): inside it
/// the split has lost more than a third of its digits (float: 4.9e-3 rad ≈ 0.28°; double: 6.1e-6
/// rad). A third rather than half because at half the double band would be only 2e-8 rad, too
/// narrow to warn a user whose attitude sits 1e-7 rad from gimbal lock that first and third are
/// already known only to a few 1e-9 rad.

#include <array>
#include <cmath>
#include <cstdint>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// The 12 Euler sequences (see the convention above).
enum class EulerSequence : std::uint8_t {
  /// Tait–Bryan (three distinct axes)
  xyz,  ///< 1-2-3
  xzy,  ///< 1-3-2
  yxz,  ///< 2-1-3
  yzx,  ///< 2-3-1
  zxy,  ///< 3-1-2
  zyx,  ///< 3-2-1 (aerospace yaw, pitch, roll)
  /// proper Euler (first axis repeated)
  xyx,  ///< 1-2-1
  xzx,  ///< 1-3-1
  yxy,  ///< 2-1-2
  yzy,  ///< 2-3-2
  zxz,  ///< 3-1-3
  zyz   ///< 3-2-3
};

/// Every sequence, Tait–Bryan first, in the enum's order (for sweeps and configuration menus).
inline constexpr std::array<EulerSequence, 12> all_euler_sequences{
    EulerSequence::xyz, EulerSequence::xzy, EulerSequence::yxz, EulerSequence::yzx,
    EulerSequence::zxy, EulerSequence::zyx, EulerSequence::xyx, EulerSequence::xzx,
    EulerSequence::yxy, EulerSequence::yzy, EulerSequence::zxz, EulerSequence::zyz};

/// Angles (rad) of one sequence; see the convention at the top of this header.
template <class T>
struct EulerAngles {
  T first;                 ///< about the first axis (rad)
  T second;                ///< about the second axis (rad)
  T third;                 ///< about the third axis (rad)
  EulerSequence sequence;  ///< the sequence
};

/// Result of to_euler_angles: near_singular is set when the middle angle lies within
/// EulerSingularBand<T>::half_width of a gimbal-lock value (first/third split ill-conditioned).
template <class T>
struct EulerDecomposition {
  EulerAngles<T> angles;  ///< the angles
  bool near_singular;     ///< middle angle near gimbal lock
};

/// Axis indices (0 = x, 1 = y, 2 = z) of a sequence's three rotations, in order.
struct EulerAxes {
  int first;   ///< axis of the first rotation
  int second;  ///< axis of the second rotation
  int third;   ///< axis of the third rotation
};

/// The axis indices of a sequence (0 = x, 1 = y, 2 = z).
constexpr EulerAxes euler_axes(EulerSequence sequence) noexcept {
  switch (sequence) {
    case EulerSequence::xyz:
      return {0, 1, 2};
    case EulerSequence::xzy:
      return {0, 2, 1};
    case EulerSequence::yxz:
      return {1, 0, 2};
    case EulerSequence::yzx:
      return {1, 2, 0};
    case EulerSequence::zxy:
      return {2, 0, 1};
    case EulerSequence::zyx:
      return {2, 1, 0};
    case EulerSequence::xyx:
      return {0, 1, 0};
    case EulerSequence::xzx:
      return {0, 2, 0};
    case EulerSequence::yxy:
      return {1, 0, 1};
    case EulerSequence::yzy:
      return {1, 2, 1};
    case EulerSequence::zxz:
      return {2, 0, 2};
    case EulerSequence::zyz:
      return {2, 1, 2};
  }
  return {0, 1, 2};  // unreachable for valid enumerators
}

/// True for the six proper Euler sequences (first and third axis equal), false for Tait–Bryan.
constexpr bool is_proper_euler(EulerSequence sequence) noexcept {
  const EulerAxes a = euler_axes(sequence);
  return a.first == a.third;
}

/// The axis not used by the first two rotations (the third axis of a Tait–Bryan sequence).
constexpr int euler_remaining_axis(EulerSequence sequence) noexcept {
  const EulerAxes a = euler_axes(sequence);
  return 3 - a.first - a.second;
}

/// True when (first axis, second axis, remaining axis) is a cyclic permutation of (x, y, z);
/// the sign s of the formulas above is +1 then, −1 otherwise.
constexpr bool is_cyclic_euler(EulerSequence sequence) noexcept {
  const EulerAxes a = euler_axes(sequence);
  return (a.first + 1) % 3 == a.second;
}

namespace detail {

// ε^(1/3) by Newton's iteration, so the band is constexpr for any floating-point type.
template <class T>
constexpr T cube_root_of_epsilon() noexcept {
  const T e = ScalarTraits<T>::epsilon;
  T r = T(1);
  for (int i = 0; i < 200; ++i) {
    const T next = (T(2) * r + e / (r * r)) / T(3);
    if (next == r) {
      break;
    }
    r = next;
  }
  return r;
}

// Wraps an angle in (−3π, 3π] into (−π, π]; for the sums formed below the subtraction of 2π is
// exact (Sterbenz), so wrapping adds no rounding.
template <class T>
constexpr T wrap_to_pi(T angle) noexcept {
  if (angle > pi<T>) {
    return angle - T(2) * pi<T>;
  }
  if (angle <= -pi<T>) {
    return angle + T(2) * pi<T>;
  }
  return angle;
}

// (cos θ/2, sin θ/2 · e_axis): rotation by θ (rad) about a coordinate axis.
template <class T>
Quaternion<T> axis_rotation(int axis, T angle) noexcept {
  const T half = T(0.5) * angle;
  const T s = std::sin(half);
  return {std::cos(half), axis == 0 ? s : T(0), axis == 1 ? s : T(0), axis == 2 ? s : T(0)};
}

}  // namespace detail

/// Half-width (rad) of the band around a gimbal-lock value of the middle angle inside which
/// to_euler_angles sets near_singular; ε^(1/3) (see the top of this header for why).
template <class T>
struct EulerSingularBand {
  static constexpr T half_width = detail::cube_root_of_epsilon<T>();  ///< ε^(1/3) (rad)
};

/// Euler angles (rad, any values; convention at the top of this header) → unit quaternion
/// q = q_a(first) ⊗ q_b(second) ⊗ q_c(third), body → reference.
template <class T>
Quaternion<T> quaternion_from_euler_angles(const EulerAngles<T>& angles) noexcept {
  const EulerAxes a = euler_axes(angles.sequence);
  return detail::axis_rotation(a.first, angles.first) *
         detail::axis_rotation(a.second, angles.second) *
         detail::axis_rotation(a.third, angles.third);
}

/// Unit quaternion (body → reference; q and −q alike, any nonzero scale) → Euler angles (rad) of
/// the given sequence in the ranges stated at the top of this header, with the gimbal-lock flag.
template <class T>
EulerDecomposition<T> to_euler_angles(const Quaternion<T>& q, EulerSequence sequence) noexcept {
  const EulerAxes ax = euler_axes(sequence);
  const Vector3<T> v = q.vector();
  const T s = is_cyclic_euler(sequence) ? T(1) : T(-1);
  const T w = q.w;
  const T qa = v[ax.first];
  const T qb = v[ax.second];
  const T qc = v[euler_remaining_axis(sequence)];
  const T band = EulerSingularBand<T>::half_width;

  T first;
  T second;
  T third;
  bool near_singular = false;
  if (is_proper_euler(sequence)) {
    const T sc = s * qc;
    second = T(2) * std::atan2(std::hypot(qb, sc), std::hypot(w, qa));
    if (qb == T(0) && sc == T(0)) {  // second = 0: only first + third is determined
      first = T(2) * std::atan2(qa, w);
      third = T(0);
    } else if (w == T(0) && qa == T(0)) {  // second = π: only first − third is determined
      first = T(2) * std::atan2(sc, qb);
      third = T(0);
    } else {
      const T plus = std::atan2(qa, w);
      const T minus = std::atan2(sc, qb);
      first = plus + minus;
      third = plus - minus;
    }
    near_singular = second < band || pi<T> - second < band;
  } else {
    const T yp = s * qb;
    const T px = w + yp;
    const T py = qa + qc;
    const T mx = w - yp;
    const T my = qa - qc;
    second = std::atan2(T(2) * (w * qb + s * (qa * qc)), std::hypot(px, py) * std::hypot(mx, my));
    if (mx == T(0) && my == T(0)) {  // s·second = +π/2: only first + third is determined
      first = T(2) * std::atan2(py, px);
      third = T(0);
    } else if (px == T(0) && py == T(0)) {  // s·second = −π/2: only first − third is determined
      first = T(2) * std::atan2(my, mx);
      third = T(0);
    } else if (std::fabs(second) <= T(1)) {
      const T w2 = w * w - yp * yp;
      const T d2 = qa * qa - qc * qc;
      first = std::atan2(T(2) * (w * qa - yp * qc), w2 - d2);
      third = std::atan2(T(2) * (w * qc - yp * qa), w2 + d2);
    } else {
      const T plus = std::atan2(py, px);
      const T minus = std::atan2(my, mx);
      first = plus + minus;
      third = plus - minus;
    }
    near_singular = T(0.5) * pi<T> - std::fabs(second) < band;
  }
  return {{detail::wrap_to_pi(first), second, detail::wrap_to_pi(third), sequence}, near_singular};
}

}  // namespace halfspin
