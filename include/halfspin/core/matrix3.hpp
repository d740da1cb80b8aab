#pragma once
/// @file
/// Matrix3<T>: a fixed-size 3×3 matrix, row-major; as a rotation matrix it maps body-frame vectors
/// into the reference frame (v_ref = R · v_body), the same sense as the attitude quaternion.

#include <cstddef>

#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A 3×3 matrix, row-major (see the file comment for its sense as a rotation).
template <class T>
struct Matrix3 {
  /// Row-major; a C array keeps the documented brace initializer {{{r0}, {r1}, {r2}}}.
  T m[3][3]{};  // NOLINT(cppcoreguidelines-avoid-c-arrays): public aggregate layout (see above)

  /// The identity matrix.
  static constexpr Matrix3 identity() noexcept {
    return {{{T(1), T(0), T(0)}, {T(0), T(1), T(0)}, {T(0), T(0), T(1)}}};
  }
  /// Element at row r, column c (0-based).
  constexpr T operator()(std::size_t r, std::size_t c) const noexcept { return m[r][c]; }
  /// Element at row r, column c (0-based), writable.
  constexpr T& operator()(std::size_t r, std::size_t c) noexcept { return m[r][c]; }
  /// Row r as a vector.
  constexpr Vector3<T> row(std::size_t r) const noexcept { return {m[r][0], m[r][1], m[r][2]}; }
  /// Column c as a vector.
  constexpr Vector3<T> column(std::size_t c) const noexcept { return {m[0][c], m[1][c], m[2][c]}; }
};

/// Matrix product a·b.
template <class T>
constexpr Matrix3<T> operator*(const Matrix3<T>& a, const Matrix3<T>& b) noexcept {
  Matrix3<T> r{};
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      r.m[i][j] = a.m[i][0] * b.m[0][j] + a.m[i][1] * b.m[1][j] + a.m[i][2] * b.m[2][j];
    }
  }
  return r;
}

/// Matrix–vector product a·v.
template <class T>
constexpr Vector3<T> operator*(const Matrix3<T>& a, const Vector3<T>& v) noexcept {
  return {a.m[0][0] * v.x + a.m[0][1] * v.y + a.m[0][2] * v.z,
          a.m[1][0] * v.x + a.m[1][1] * v.y + a.m[1][2] * v.z,
          a.m[2][0] * v.x + a.m[2][1] * v.y + a.m[2][2] * v.z};
}

/// Transpose; for a rotation matrix, its inverse (the opposite direction between the two frames).
template <class T>
constexpr Matrix3<T> transpose(const Matrix3<T>& a) noexcept {
  Matrix3<T> r{};
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      r.m[i][j] = a.m[j][i];
    }
  }
  return r;
}

/// Determinant; +1 for a proper rotation.
template <class T>
constexpr T determinant(const Matrix3<T>& a) noexcept {
  return a.m[0][0] * (a.m[1][1] * a.m[2][2] - a.m[1][2] * a.m[2][1]) -
         a.m[0][1] * (a.m[1][0] * a.m[2][2] - a.m[1][2] * a.m[2][0]) +
         a.m[0][2] * (a.m[1][0] * a.m[2][1] - a.m[1][1] * a.m[2][0]);
}

/// The cross-product matrix [v×], so that [v×]·u = v × u.
template <class T>
constexpr Matrix3<T> cross_matrix(const Vector3<T>& v) noexcept {
  return {{{T(0), -v.z, v.y}, {v.z, T(0), -v.x}, {-v.y, v.x, T(0)}}};
}

}  // namespace halfspin
