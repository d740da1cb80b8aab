#pragma once
/// @file
/// Vector3<T>: a fixed-size 3-vector (a body-frame rate in rad/s, a rotation vector in rad, ...).

#include <cmath>
#include <limits>

namespace halfspin {

/// A 3-vector (x, y, z); zero by default.
template <class T>
struct Vector3 {
  T x{};  ///< first component
  T y{};  ///< second component
  T z{};  ///< third component

  /// The zero vector.
  static constexpr Vector3 zero() noexcept { return {T(0), T(0), T(0)}; }
  /// Component by index 0, 1, 2 (x, y, z); the index must be in range.
  constexpr T operator[](int i) const noexcept { return i == 0 ? x : (i == 1 ? y : z); }
};

/// Component-wise sum a + b.
template <class T>
constexpr Vector3<T> operator+(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return {a.x + b.x, a.y + b.y, a.z + b.z};
}
/// Component-wise difference a − b.
template <class T>
constexpr Vector3<T> operator-(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return {a.x - b.x, a.y - b.y, a.z - b.z};
}
/// Negation −a.
template <class T>
constexpr Vector3<T> operator-(const Vector3<T>& a) noexcept {
  return {-a.x, -a.y, -a.z};
}
/// Scaling a·s.
template <class T>
constexpr Vector3<T> operator*(const Vector3<T>& a, T s) noexcept {
  return {a.x * s, a.y * s, a.z * s};
}
/// Scaling s·a.
template <class T>
constexpr Vector3<T> operator*(T s, const Vector3<T>& a) noexcept {
  return {s * a.x, s * a.y, s * a.z};
}
/// Division a/s of each component.
template <class T>
constexpr Vector3<T> operator/(const Vector3<T>& a, T s) noexcept {
  return {a.x / s, a.y / s, a.z / s};
}
/// Adds b to a in place.
template <class T>
constexpr Vector3<T>& operator+=(Vector3<T>& a, const Vector3<T>& b) noexcept {
  a.x += b.x;
  a.y += b.y;
  a.z += b.z;
  return a;
}
/// Exact component equality.
template <class T>
constexpr bool operator==(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return a.x == b.x && a.y == b.y && a.z == b.z;
}
/// Negation of operator==.
template <class T>
constexpr bool operator!=(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return !(a == b);
}

/// Dot product a·b.
template <class T>
constexpr T dot(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return a.x * b.x + a.y * b.y + a.z * b.z;
}

/// Cross product a×b (right-handed).
template <class T>
constexpr Vector3<T> cross(const Vector3<T>& a, const Vector3<T>& b) noexcept {
  return {a.y * b.z - a.z * b.y, a.z * b.x - a.x * b.z, a.x * b.y - a.y * b.x};
}

/// Squared Euclidean norm |a|².
template <class T>
constexpr T squared_norm(const Vector3<T>& a) noexcept {
  return dot(a, a);
}

/// Euclidean norm |a|; scaled so that components near the overflow or underflow limits still give
/// the right length (the common case, |a|² representable, takes one square root and no division).
template <class T>
T norm(const Vector3<T>& a) noexcept {
  const T n2 = squared_norm(a);
  if (n2 >= std::numeric_limits<T>::min() && n2 <= std::numeric_limits<T>::max()) {
    return std::sqrt(n2);
  }
  const T m = std::fmax(std::fabs(a.x), std::fmax(std::fabs(a.y), std::fabs(a.z)));
  if (m == T(0) || !std::isfinite(m)) {
    return m;
  }
  const Vector3<T> s = a / m;
  return m * std::sqrt(squared_norm(s));
}

/// True when every component is finite (no NaN, no infinity).
template <class T>
bool is_finite(const Vector3<T>& a) noexcept {
  return std::isfinite(a.x) && std::isfinite(a.y) && std::isfinite(a.z);
}

/// a/|a|, a unit vector along a (to a few ulps for every finite a ≠ 0); the caller guarantees a ≠ 0
/// and finite. When |a|² leaves T's normal range (|a| below about √min or above √max, e.g. a
/// subnormal or near-overflow a), a is first scaled by 2^−e, e the exponent of its largest
/// component: exact, it leaves the direction alone and brings the largest component into [1, 2), so
/// |a·2^−e| lies in [1, 2√3) and keeps full precision. Dividing by a subnormal or infinite |a|
/// instead would lose the precision the quotient needs (a non-unit or zero result).
template <class T>
Vector3<T> normalized(const Vector3<T>& a) noexcept {
  const T n2 = squared_norm(a);
  if (n2 >= std::numeric_limits<T>::min() && n2 <= std::numeric_limits<T>::max()) {
    return a / std::sqrt(n2);  // the common case: as norm() computes |a| here
  }
  const T m = std::fmax(std::fabs(a.x), std::fmax(std::fabs(a.y), std::fabs(a.z)));
  if (!(m > T(0)) || !is_finite(a)) {
    return a / norm(a);  // zero or non-finite: outside the contract, non-finite as before
  }
  const int e = std::ilogb(m);
  const Vector3<T> s{std::scalbn(a.x, -e), std::scalbn(a.y, -e), std::scalbn(a.z, -e)};
  return s / std::sqrt(squared_norm(s));
}

}  // namespace halfspin
