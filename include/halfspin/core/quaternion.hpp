#pragma once
/// @file
/// Quaternion<T>: scalar-first (w, x, y, z), Hamilton product (i·j = k). As an attitude, a unit q
/// maps body-frame vectors into the reference frame: v_ref = q ⊗ (0, v_body) ⊗ q*.

#include <cmath>

#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A quaternion (w, x, y, z), scalar first; the identity by default.
template <class T>
struct Quaternion {
  T w{T(1)};  ///< scalar part
  T x{};      ///< i component
  T y{};      ///< j component
  T z{};      ///< k component

  /// The identity rotation (1, 0, 0, 0).
  static constexpr Quaternion identity() noexcept { return {T(1), T(0), T(0), T(0)}; }
  /// A quaternion from its scalar part and vector part.
  static constexpr Quaternion from_parts(T scalar, const Vector3<T>& v) noexcept {
    return {scalar, v.x, v.y, v.z};
  }
  /// The vector (imaginary) part (x, y, z).
  constexpr Vector3<T> vector() const noexcept { return {x, y, z}; }
};

/// Floating-point operations of the Hamilton product: 16 multiplications, 12 additions.
inline constexpr int quaternion_product_flops = 28;

/// Hamilton product a ⊗ b. For attitudes, a ⊗ b applies b first, then a (frames compose as
/// q_ref←body = q_ref←mid ⊗ q_mid←body).
template <class T>
constexpr Quaternion<T> operator*(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return {
      a.w * b.w - a.x * b.x - a.y * b.y - a.z * b.z, a.w * b.x + a.x * b.w + a.y * b.z - a.z * b.y,
      a.w * b.y - a.x * b.z + a.y * b.w + a.z * b.x, a.w * b.z + a.x * b.y - a.y * b.x + a.z * b.w};
}

/// Component-wise scaling s·q (not a rotation by itself; used by integrators and series).
template <class T>
constexpr Quaternion<T> operator*(T s, const Quaternion<T>& q) noexcept {
  return {s * q.w, s * q.x, s * q.y, s * q.z};
}
/// Component-wise sum a + b.
template <class T>
constexpr Quaternion<T> operator+(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return {a.w + b.w, a.x + b.x, a.y + b.y, a.z + b.z};
}
/// Component-wise difference a − b.
template <class T>
constexpr Quaternion<T> operator-(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return {a.w - b.w, a.x - b.x, a.y - b.y, a.z - b.z};
}
/// Negation: −q is the same rotation as q (double cover), a different point of SU(2).
template <class T>
constexpr Quaternion<T> operator-(const Quaternion<T>& q) noexcept {
  return {-q.w, -q.x, -q.y, -q.z};
}
/// Exact component equality (bit-level questions such as "was the state left unchanged").
template <class T>
constexpr bool operator==(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return a.w == b.w && a.x == b.x && a.y == b.y && a.z == b.z;
}
/// Negation of operator==.
template <class T>
constexpr bool operator!=(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return !(a == b);
}

/// Conjugate q* = (w, −x, −y, −z); for a unit quaternion, the inverse rotation.
template <class T>
constexpr Quaternion<T> conjugate(const Quaternion<T>& q) noexcept {
  return {q.w, -q.x, -q.y, -q.z};
}

/// Four-dimensional dot product a·b; for unit quaternions |a·b| = cos(angle between them / 2).
template <class T>
constexpr T dot(const Quaternion<T>& a, const Quaternion<T>& b) noexcept {
  return a.w * b.w + a.x * b.x + a.y * b.y + a.z * b.z;
}

/// Squared norm |q|².
template <class T>
constexpr T squared_norm(const Quaternion<T>& q) noexcept {
  return dot(q, q);
}

/// Norm |q|.
template <class T>
T norm(const Quaternion<T>& q) noexcept {
  return std::sqrt(squared_norm(q));
}

/// Inverse q⁻¹ = q* / |q|²; the caller guarantees q ≠ 0.
template <class T>
constexpr Quaternion<T> inverse(const Quaternion<T>& q) noexcept {
  const T n2 = squared_norm(q);
  return {q.w / n2, -q.x / n2, -q.y / n2, -q.z / n2};
}

/// q / |q|, dividing each component by the norm (one rounding each, not two through a reciprocal);
/// the caller guarantees q ≠ 0 and finite.
template <class T>
Quaternion<T> normalized(const Quaternion<T>& q) noexcept {
  const T n = norm(q);
  return {q.w / n, q.x / n, q.y / n, q.z / n};
}

/// Rotates a vector by a unit quaternion: returns q ⊗ (0, v) ⊗ q* (body → reference for an
/// attitude). Uses v + w·t + u×t with t = 2·u×v, 15 multiplications; q must be unit.
template <class T>
constexpr Vector3<T> rotate(const Quaternion<T>& q, const Vector3<T>& v) noexcept {
  const Vector3<T> u = q.vector();
  const Vector3<T> t = T(2) * cross(u, v);
  return v + q.w * t + cross(u, t);
}

/// True when every component is finite (no NaN, no infinity).
template <class T>
bool is_finite(const Quaternion<T>& q) noexcept {
  return std::isfinite(q.w) && std::isfinite(q.x) && std::isfinite(q.y) && std::isfinite(q.z);
}

}  // namespace halfspin
