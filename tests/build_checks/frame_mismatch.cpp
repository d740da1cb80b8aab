// Compile-time frame safety of FramedRotation composition (core/framed_rotation.hpp).
//
// HALFSPIN_EXPECT_MISMATCH=0: the positive control. (World <- Body) * (Body <- Sensor) must compile
//   and give (World <- Sensor), checked by static_assert on the type and on the constexpr value.
// HALFSPIN_EXPECT_MISMATCH=1: the same code with the inner frames differing, (World <- Body) *
//   (Gimbal <- Sensor); it must not compile, and the only error must be the missing operator* on
//   the line marked "frame-check: composition" (the build check driver verifies both).
// The two builds differ in one type alias, so the positive control proves that everything else
// in this file is valid and the failure is the frame mismatch alone.

#include <type_traits>

#include "halfspin/core/framed_rotation.hpp"
#include "halfspin/core/quaternion.hpp"

#ifndef HALFSPIN_EXPECT_MISMATCH
#error "define HALFSPIN_EXPECT_MISMATCH to 0 (frames match) or 1 (frames differ)"
#endif

namespace {

struct World {};
struct Body {};
struct Gimbal {};
struct Sensor {};

#if HALFSPIN_EXPECT_MISMATCH == 0
using SecondTo = Body;
#else
using SecondTo = Gimbal;
#endif

using halfspin::FramedRotation;
using halfspin::Quaternion;

// Half turns about z and x: exact in binary, so the composed value can be checked exactly.
constexpr FramedRotation<double, World, Body> world_from_body{
    Quaternion<double>{0.0, 0.0, 0.0, 1.0}};
constexpr FramedRotation<double, SecondTo, Sensor> second{Quaternion<double>{0.0, 1.0, 0.0, 0.0}};

[[maybe_unused]] constexpr auto composed = world_from_body * second;  // frame-check: composition

}  // namespace

#if HALFSPIN_EXPECT_MISMATCH == 0
static_assert(std::is_same<std::remove_const_t<decltype(composed)>,
                           FramedRotation<double, World, Sensor>>::value,
              "composition keeps the outer frames");
// Hamilton product k * i = j (common practice, no source).
static_assert(composed.quaternion() == Quaternion<double>{0.0, 0.0, 1.0, 0.0},
              "composition is the quaternion product, outer rotation on the left");
#endif

int main() { return 0; }
