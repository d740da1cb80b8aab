// A downstream program built against halfspin with the embedded flag set (no exceptions, no
// RTTI, all warnings as errors). It rotates a vector with the public API in float and double
// and exits non-zero if a result is wrong. With --expect-opposite-sense it expects the reversed
// rotation, so it must exit non-zero: proof that the check can fail.
#include <halfspin/halfspin.hpp>

#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>

namespace {

struct Reference {};
struct Body {};

template <class T>
bool near(const halfspin::Vector3<T>& got, const halfspin::Vector3<T>& want, const char* what,
          const char* type) {
  // A few rounding errors of a unit-length result: cos/sin of π/4 rounded once each, then at
  // most three products and sums per component.
  const T tolerance = T(4) * std::numeric_limits<T>::epsilon();
  const bool ok = std::fabs(got.x - want.x) <= tolerance &&
                  std::fabs(got.y - want.y) <= tolerance && std::fabs(got.z - want.z) <= tolerance;
  std::printf("%s %-6s got (%.9g, %.9g, %.9g), want (%.9g, %.9g, %.9g): %s\n", what, type,
              static_cast<double>(got.x), static_cast<double>(got.y), static_cast<double>(got.z),
              static_cast<double>(want.x), static_cast<double>(want.y), static_cast<double>(want.z),
              ok ? "ok" : "WRONG");
  return ok;
}

template <class T>
int check(bool expect_opposite_sense, const char* type) {
  // A right-handed quarter turn about +z maps +x to +y, and +y to −x (common practice, no source).
  const T half_angle = halfspin::pi<T> / T(4);
  const halfspin::Quaternion<T> q{std::cos(half_angle), T(0), T(0), std::sin(half_angle)};
  const T sense = expect_opposite_sense ? T(-1) : T(1);
  const halfspin::Vector3<T> x_axis{T(1), T(0), T(0)};
  const halfspin::Vector3<T> y_axis{T(0), T(1), T(0)};

  int failures = 0;
  failures += !near(halfspin::rotate(q, x_axis), halfspin::Vector3<T>{T(0), sense, T(0)},
                    "rotate(q, x)          ", type);
  // The same rotation through the frame-tagged API.
  const halfspin::FramedRotation<T, Reference, Body> reference_from_body(q);
  const halfspin::FramedVector<T, Body> y_body{y_axis};
  const halfspin::FramedVector<T, Reference> y_reference = reference_from_body * y_body;
  failures += !near(y_reference.value, halfspin::Vector3<T>{-sense, T(0), T(0)},
                    "framed rotation of y  ", type);
  // The same rotation as a rotation vector (exponential map) and as a rotation matrix.
  const halfspin::Quaternion<T> from_vector =
      halfspin::quaternion_exp(halfspin::Vector3<T>{T(0), T(0), T(2) * half_angle});
  failures += !near(halfspin::rotate(from_vector, x_axis), halfspin::Vector3<T>{T(0), sense, T(0)},
                    "exp(pi/2 z) applied   ", type);
  failures += !near(halfspin::to_rotation_matrix(q) * x_axis,
                    halfspin::Vector3<T>{T(0), sense, T(0)}, "R(q) * x              ", type);
  return failures;
}

}  // namespace

int main(int argc, char** argv) {
  const bool expect_opposite_sense =
      argc > 1 && std::strcmp(argv[1], "--expect-opposite-sense") == 0;
  const int failures =
      check<float>(expect_opposite_sense, "float") + check<double>(expect_opposite_sense, "double");
  std::printf("%d wrong result(s)\n", failures);
  return failures == 0 ? 0 : 1;
}
