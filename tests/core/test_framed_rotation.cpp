// Frame-tagged rotations: composition chains frames and matches the plain quaternion product.
// (That mismatched frames do not compile is proven by the build check frame_mismatch.)
#include <catch2/catch.hpp>

#include <type_traits>

#include "halfspin/core/exponential_map.hpp"
#include "halfspin/core/framed_rotation.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {
struct Navigation {};
struct Body {};
struct Sensor {};
}  // namespace

TEMPLATE_TEST_CASE("framed composition chains frames and equals the quaternion product", "[core]",
                   float, double) {
  using T = TestType;
  test::RandomRotations rng(41);
  for (int n = 0; n < 1000; ++n) {
    const auto qnb = rng.quaternion<T>(), qbs = rng.quaternion<T>();
    const FramedRotation<T, Navigation, Body> nav_from_body(qnb);
    const FramedRotation<T, Body, Sensor> body_from_sensor(qbs);
    const auto nav_from_sensor = nav_from_body * body_from_sensor;
    static_assert(std::is_same<std::decay_t<decltype(nav_from_sensor)>,
                               FramedRotation<T, Navigation, Sensor>>::value,
                  "composition takes the outer frames");
    REQUIRE(nav_from_sensor.quaternion() == qnb * qbs);
    const auto sensor_from_nav = inverse(nav_from_sensor);
    static_assert(std::is_same<std::decay_t<decltype(sensor_from_nav)>,
                               FramedRotation<T, Sensor, Navigation>>::value,
                  "inverse swaps the frames");
    const FramedVector<T, Sensor> v{rng.unit_vector<T>()};
    const FramedVector<T, Navigation> in_nav = nav_from_sensor * v;
    const FramedVector<T, Sensor> again = sensor_from_nav * in_nav;
    REQUIRE(test::vector_error_eps(again.value, v.value) <= 16);
    const auto self = FramedRotation<T, Body, Body>::identity();
    REQUIRE((nav_from_body * self).quaternion() == qnb);
  }
}
