#pragma once
/// @file
/// Frame-tagged rotations and vectors: the compiler checks that frames chain correctly.
/// FramedRotation<T, To, From> maps vectors expressed in From into To (the attitude of a body
/// frame is FramedRotation<T, Reference, Body>). Tags are any empty types the user declares.

#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// A vector expressed in Frame.
template <class T, class Frame>
struct FramedVector {
  Vector3<T> value;  ///< the components, in Frame
};

/// The rotation that maps vectors from frame From into frame To.
template <class T, class To, class From>
class FramedRotation {
 public:
  using to_frame = To;      ///< the frame vectors are mapped into
  using from_frame = From;  ///< the frame vectors are mapped from

  /// Wraps a unit quaternion that maps From-frame vectors into To.
  constexpr explicit FramedRotation(const Quaternion<T>& q) noexcept : q_(q) {}
  /// The identity, valid only between a frame and itself.
  static constexpr FramedRotation identity() noexcept {
    static_assert(std::is_same<To, From>::value, "the identity rotation maps a frame to itself");
    return FramedRotation(Quaternion<T>::identity());
  }
  /// The underlying unit quaternion.
  constexpr const Quaternion<T>& quaternion() const noexcept { return q_; }

 private:
  Quaternion<T> q_;
};

/// (A ← B) ∘ (B ← C) = (A ← C). Compiles only when the inner frames are the same type.
template <class T, class A, class B, class C>
constexpr FramedRotation<T, A, C> operator*(const FramedRotation<T, A, B>& a_from_b,
                                            const FramedRotation<T, B, C>& b_from_c) noexcept {
  return FramedRotation<T, A, C>(a_from_b.quaternion() * b_from_c.quaternion());
}

/// The inverse maps To back into From.
template <class T, class A, class B>
constexpr FramedRotation<T, B, A> inverse(const FramedRotation<T, A, B>& a_from_b) noexcept {
  return FramedRotation<T, B, A>(conjugate(a_from_b.quaternion()));
}

/// Rotates a From-frame vector into To. Compiles only when the vector's frame is From.
template <class T, class A, class B>
constexpr FramedVector<T, A> operator*(const FramedRotation<T, A, B>& a_from_b,
                                       const FramedVector<T, B>& v) noexcept {
  return FramedVector<T, A>{rotate(a_from_b.quaternion(), v.value)};
}

}  // namespace halfspin
