#pragma once
/// @file
/// Quaternion ↔ SU(2) matrix. U(q) = w·I − i(x σ1 + y σ2 + z σ3)
///   = [[w − i z, −y − i x], [y − i x, w + i z]]
/// with the Pauli matrices σ1 = [[0, 1], [1, 0]], σ2 = [[0, −i], [i, 0]], σ3 = [[1, 0], [0, −1]].
/// Why this sign choice: the map 1 → I, i → −iσ1, j → −iσ2, k → −iσ3 respects i·j = k, so U is a
/// homomorphism for the Hamilton product, U(q1 ⊗ q2) = U(q1)·U(q2), and it acts on Hermitian
/// traceless matrices as the attitude acts on body vectors: U (v·σ) U† = (R(q) v)·σ with R the
/// body → reference matrix of to_rotation_matrix. U(−q) = −U(q): SU(2) tells q and −q apart, so a
/// 2π turn is −I and only a 4π turn is +I.

#include <complex>
#include <cstddef>

#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// An SU(2) matrix (see the file comment).
template <class T>
struct Su2Matrix {
  /// The entries, row-major.
  // NOLINTNEXTLINE(cppcoreguidelines-avoid-c-arrays): aggregate, initialized {{{a, b}, {c, d}}}
  std::complex<T> m[2][2];

  /// Element at row r, column c (0-based).
  constexpr const std::complex<T>& operator()(std::size_t r, std::size_t c) const noexcept {
    return m[r][c];
  }
};

/// Unit quaternion (body → reference attitude) → its SU(2) matrix U(q) above; exact (entries are
/// the quaternion's components, some negated), unitary with det 1 to the extent |q| = 1.
template <class T>
constexpr Su2Matrix<T> to_su2_matrix(const Quaternion<T>& q) noexcept {
  return {{{std::complex<T>(q.w, -q.z), std::complex<T>(-q.y, -q.x)},
           {std::complex<T>(q.y, -q.x), std::complex<T>(q.w, q.z)}}};
}

/// SU(2) matrix in the convention of U(q) above → quaternion (w, x, y, z), body → reference. Each
/// component appears twice in the matrix; the two copies are averaged, which is the orthogonal
/// projection onto matrices of the form U(q), so rounding in the off-quaternion directions cancels.
/// Not normalized: a matrix unitary only to rounding gives |q| = 1 to the same rounding.
template <class T>
constexpr Quaternion<T> quaternion_from_su2_matrix(const Su2Matrix<T>& u) noexcept {
  return {T(0.5) * (u.m[0][0].real() + u.m[1][1].real()),
          T(-0.5) * (u.m[0][1].imag() + u.m[1][0].imag()),
          T(0.5) * (u.m[1][0].real() - u.m[0][1].real()),
          T(0.5) * (u.m[1][1].imag() - u.m[0][0].imag())};
}

}  // namespace halfspin
