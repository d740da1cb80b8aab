#pragma once
/// @file
/// Quaternion ↔ rotation matrix (direction cosine matrix). The matrix R maps body-frame vectors
/// into the reference frame, v_ref = R · v_body, so R(q1 ⊗ q2) = R(q1)·R(q2) and R(−q) = R(q).
/// The reference-to-body direction cosine matrix of many aerospace texts is transpose(R).

#include <cmath>

#include "halfspin/core/matrix3.hpp"
#include "halfspin/core/quaternion.hpp"

namespace halfspin {

/// Unit quaternion → rotation matrix (body → reference). A slightly non-unit q is treated as
/// q/|q| (the factor 2/|q|² costs one division and keeps R orthogonal to rounding).
template <class T>
Matrix3<T> to_rotation_matrix(const Quaternion<T>& q) noexcept {
  const T s = T(2) / squared_norm(q);
  const T xx = q.x * q.x, yy = q.y * q.y, zz = q.z * q.z;
  const T xy = q.x * q.y, xz = q.x * q.z, yz = q.y * q.z;
  const T wx = q.w * q.x, wy = q.w * q.y, wz = q.w * q.z;
  return {{{T(1) - s * (yy + zz), s * (xy - wz), s * (xz + wy)},
           {s * (xy + wz), T(1) - s * (xx + zz), s * (yz - wx)},
           {s * (xz - wy), s * (yz + wx), T(1) - s * (xx + yy)}}};
}

/// Rotation matrix (body → reference) → unit quaternion with w ≥ 0, by Shepperd's method: the
/// largest of 4w², 4x², 4y², 4z² (from the trace and the diagonal) is taken by square root and the
/// other three come from off-diagonal sums or differences divided by it, so no division by a small
/// number occurs for any rotation, including 180° ones. The result is normalized, so a matrix that
/// is orthogonal only to rounding still yields a unit quaternion.
template <class T>
Quaternion<T> quaternion_from_rotation_matrix(const Matrix3<T>& r) noexcept {
  const T trace = r.m[0][0] + r.m[1][1] + r.m[2][2];
  Quaternion<T> q;
  if (trace >= r.m[0][0] && trace >= r.m[1][1] && trace >= r.m[2][2]) {
    const T w4 = T(2) * std::sqrt(T(1) + trace);  // 4w
    q = {T(0.25) * w4, (r.m[2][1] - r.m[1][2]) / w4, (r.m[0][2] - r.m[2][0]) / w4,
         (r.m[1][0] - r.m[0][1]) / w4};
  } else if (r.m[0][0] >= r.m[1][1] && r.m[0][0] >= r.m[2][2]) {
    const T x4 = T(2) * std::sqrt(T(1) + r.m[0][0] - r.m[1][1] - r.m[2][2]);  // 4x
    q = {(r.m[2][1] - r.m[1][2]) / x4, T(0.25) * x4, (r.m[0][1] + r.m[1][0]) / x4,
         (r.m[0][2] + r.m[2][0]) / x4};
  } else if (r.m[1][1] >= r.m[2][2]) {
    const T y4 = T(2) * std::sqrt(T(1) - r.m[0][0] + r.m[1][1] - r.m[2][2]);  // 4y
    q = {(r.m[0][2] - r.m[2][0]) / y4, (r.m[0][1] + r.m[1][0]) / y4, T(0.25) * y4,
         (r.m[1][2] + r.m[2][1]) / y4};
  } else {
    const T z4 = T(2) * std::sqrt(T(1) - r.m[0][0] - r.m[1][1] + r.m[2][2]);  // 4z
    q = {(r.m[1][0] - r.m[0][1]) / z4, (r.m[0][2] + r.m[2][0]) / z4, (r.m[1][2] + r.m[2][1]) / z4,
         T(0.25) * z4};
  }
  if (q.w < T(0)) {
    q = -q;
  }
  return normalized(q);
}

}  // namespace halfspin
