// Compile-time frame safety of rotating a FramedVector (core/framed_rotation.hpp).
//
// HALFSPIN_EXPECT_MISMATCH=0: the positive control. (World <- Body) * (vector in Body) must compile
//   and give a vector in World, checked by static_assert on the type and on the constexpr value.
// HALFSPIN_EXPECT_MISMATCH=1: the same code with the vector expressed in Sensor instead of Body;
//   it must not compile, and the only error must be the missing operator* on the line marked
//   "frame-check: vector" (the build check driver verifies both).
// The two builds differ in one type alias, so the positive control proves that everything else
// in this file is valid and the failure is the frame mismatch alone.

#include <type_traits>

#include "halfspin/core/framed_rotation.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"

#ifndef HALFSPIN_EXPECT_MISMATCH
#error "define HALFSPIN_EXPECT_MISMATCH to 0 (frames match) or 1 (frames differ)"
#endif

namespace {

struct World {};
struct Body {};
struct Sensor {};

#if HALFSPIN_EXPECT_MISMATCH == 0
using VectorFrame = Body;
#else
using VectorFrame = Sensor;
#endif

using halfspin::FramedRotation;
using halfspin::FramedVector;
using halfspin::Quaternion;
using halfspin::Vector3;

// A half turn about z: exact in binary, so the rotated value can be checked exactly.
constexpr FramedRotation<double, World, Body> world_from_body{
    Quaternion<double>{0.0, 0.0, 0.0, 1.0}};
constexpr FramedVector<double, VectorFrame> v{Vector3<double>{1.0, 2.0, 3.0}};

[[maybe_unused]] constexpr auto in_world = world_from_body * v;  // frame-check: vector

}  // namespace

#if HALFSPIN_EXPECT_MISMATCH == 0
static_assert(
    std::is_same<std::remove_const_t<decltype(in_world)>, FramedVector<double, World>>::value,
    "rotation expresses the vector in the rotation's To frame");
// A half turn about z maps (x, y, z) to (−x, −y, z) (common practice, no source).
static_assert(in_world.value == Vector3<double>{-1.0, -2.0, 3.0},
              "the framed rotation rotates the vector by its quaternion");
#endif

int main() { return 0; }
