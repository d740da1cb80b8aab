// Test helper: writes a static gyro log (the tools' gyro-log CSV) from halfspin's SyntheticGyro
// with chosen noise terms, for the halfspin-gyro-noise tests and the tool's README example
// (invented figures). Not a user tool.
//   static_log_writer OUTPUT rate|delta HZ SAMPLES SEED N B BAND_LO BAND_HI K BIAS ANGLE_LSB
//   [float]
// N rad/√s, B rad/s over [BAND_LO, BAND_HI] s, K rad/s/√s, BIAS rad/s on every axis (x: BIAS,
// y: −BIAS/2, z: 2·BIAS), ANGLE_LSB rad (delta-angles, residual carried; 0 for none).
#include <cstdio>
#include <cstdlib>
#include <string>

#include "halfspin/truth/constant_rate.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"

namespace {

template <class T>
int write(const char* path, bool delta, double hz, long long samples, unsigned long long seed,
          const double* terms) {
  using namespace halfspin;
  GyroErrorModel<T> model;
  model.noise_density = static_cast<T>(terms[0]);
  model.bias_instability = static_cast<T>(terms[1]);
  model.flicker_band_shortest = static_cast<T>(terms[2]);
  model.flicker_band_longest = static_cast<T>(terms[3]);
  model.rate_random_walk = static_cast<T>(terms[4]);
  const auto bias = static_cast<T>(terms[5]);
  model.bias = {bias, -bias / 2, 2 * bias};
  model.angle_quantum = static_cast<T>(terms[6]);
  const ConstantRateMotion<T> still{Quaternion<T>::identity(), {0, 0, 0}};
  SyntheticGyro<T, ConstantRateMotion<T>> gyro(
      still, delta ? GyroOutputForm::delta_angle : GyroOutputForm::rate, static_cast<T>(1 / hz),
      model, seed);
  std::FILE* f = std::fopen(path, "w");
  if (f == nullptr) return 1;
  std::fprintf(f, "%s\n", delta ? "t,dx,dy,dz" : "t,wx,wy,wz");
  for (long long i = 0; i < samples; ++i) {
    const long long k = gyro.next_index();
    const Vector3<T> v = gyro.next();
    std::fprintf(f, "%.17g,%.17g,%.17g,%.17g\n", static_cast<double>(k) / hz,
                 static_cast<double>(v.x), static_cast<double>(v.y), static_cast<double>(v.z));
  }
  return std::fclose(f) == 0 ? 0 : 1;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 13 && argc != 14) {
    std::fprintf(stderr,
                 "usage: static_log_writer OUTPUT rate|delta HZ SAMPLES SEED N B BAND_LO "
                 "BAND_HI K BIAS ANGLE_LSB [float]\n");
    return 2;
  }
  const bool delta = std::string(argv[2]) == "delta";
  const double hz = std::atof(argv[3]);
  const long long samples = std::atoll(argv[4]);
  const unsigned long long seed = std::strtoull(argv[5], nullptr, 10);
  double terms[7];
  for (int i = 0; i < 7; ++i) terms[i] = std::atof(argv[6 + i]);
  if (argc == 14 && std::string(argv[13]) == "float") {
    return write<float>(argv[1], delta, hz, samples, seed, terms);
  }
  return write<double>(argv[1], delta, hz, samples, seed, terms);
}
