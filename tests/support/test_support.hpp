#pragma once
// Shared test helpers: seeded random rotations and ulp/epsilon-based error measures.
// Test-only code: may use the whole standard library.

#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/core/matrix3.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/sign_continuity.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin::test {

// Number of random rotations each property test draws (the issue asks for at least 10,000).
inline constexpr int property_samples = 10000;

// A seeded source of random rotations and vectors. Uniform rotations are drawn as normalized
// 4-D Gaussian vectors (uniform on S³, hence Haar-uniform on SO(3)); the draw is made in long
// double and rounded once to T, then renormalized in T.
class RandomRotations {
 public:
  explicit RandomRotations(std::uint64_t seed) : engine_(seed) {}

  template <class T>
  Quaternion<T> quaternion() {
    long double a, b, c, d, n2;
    do {
      a = gauss_(engine_);
      b = gauss_(engine_);
      c = gauss_(engine_);
      d = gauss_(engine_);
      n2 = a * a + b * b + c * c + d * d;
    } while (n2 < 1e-6L);
    const long double n = std::sqrt(n2);
    return normalized(Quaternion<T>{static_cast<T>(a / n), static_cast<T>(b / n),
                                    static_cast<T>(c / n), static_cast<T>(d / n)});
  }

  // A random unit vector.
  template <class T>
  Vector3<T> unit_vector() {
    long double a, b, c, n2;
    do {
      a = gauss_(engine_);
      b = gauss_(engine_);
      c = gauss_(engine_);
      n2 = a * a + b * b + c * c;
    } while (n2 < 1e-6L);
    const long double n = std::sqrt(n2);
    return {static_cast<T>(a / n), static_cast<T>(b / n), static_cast<T>(c / n)};
  }

  // Uniform in [lo, hi).
  template <class T>
  T uniform(T lo, T hi) {
    std::uniform_real_distribution<long double> u(static_cast<long double>(lo),
                                                  static_cast<long double>(hi));
    return static_cast<T>(u(engine_));
  }

  // Log-uniform magnitude in [lo, hi) (lo > 0): exercises many binades.
  template <class T>
  T log_uniform(T lo, T hi) {
    std::uniform_real_distribution<long double> u(std::log(static_cast<long double>(lo)),
                                                  std::log(static_cast<long double>(hi)));
    return static_cast<T>(std::exp(u(engine_)));
  }

 private:
  std::mt19937_64 engine_;
  std::normal_distribution<long double> gauss_{0.0L, 1.0L};
};

// With HALFSPIN_REPORT_WORST set in the environment, prints a measured worst error: how the
// tolerances asserted beside it were chosen (the measured worst case with a 2–4× margin).
inline void report_worst(const std::string& what, long double worst) {
  if (std::getenv("HALFSPIN_REPORT_WORST") != nullptr) {
    std::printf("worst %-64s %.3Lg\n", what.c_str(), worst);
  }
}

// "float" or "double", for messages.
template <class T>
const char* type_name() {
  return sizeof(T) == sizeof(float) ? "float" : "double";
}

// Widening to long double, explicit so that -Wdouble-promotion stays quiet in tests.
template <class T>
constexpr long double ld(T x) {
  return static_cast<long double>(x);
}

// Euclidean length of a T-valued vector, evaluated in long double.
template <class T>
long double length_ld(const Vector3<T>& v) {
  return std::sqrt(ld(v.x) * ld(v.x) + ld(v.y) * ld(v.y) + ld(v.z) * ld(v.z));
}

// Norm of a T-valued quaternion, evaluated in long double.
template <class T>
long double norm_ld(const Quaternion<T>& q) {
  return std::sqrt(ld(q.w) * ld(q.w) + ld(q.x) * ld(q.x) + ld(q.y) * ld(q.y) + ld(q.z) * ld(q.z));
}

// Widening of a T-valued quaternion or vector to long double (truth is evaluated there).
template <class T>
Quaternion<long double> widen(const Quaternion<T>& q) {
  return {ld(q.w), ld(q.x), ld(q.y), ld(q.z)};
}
template <class T>
Vector3<long double> widen(const Vector3<T>& v) {
  return {ld(v.x), ld(v.y), ld(v.z)};
}
// Rounding of a long double truth value to T (what a sensor or an initial condition in T holds).
template <class T>
Quaternion<T> narrow(const Quaternion<long double>& q) {
  return {static_cast<T>(q.w), static_cast<T>(q.x), static_cast<T>(q.y), static_cast<T>(q.z)};
}
template <class T>
Vector3<T> narrow(const Vector3<long double>& v) {
  return {static_cast<T>(v.x), static_cast<T>(v.y), static_cast<T>(v.z)};
}

// Least-squares slope of log(y) against log(x): the observed order of an error y against a step x.
template <class R>
R log_log_slope(const std::vector<R>& x, const std::vector<R>& y) {
  R mx = 0, my = 0;
  const R n = static_cast<R>(x.size());
  for (std::size_t i = 0; i < x.size(); ++i) {
    mx += std::log(x[i]) / n;
    my += std::log(y[i]) / n;
  }
  R sxy = 0, sxx = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    sxy += (std::log(x[i]) - mx) * (std::log(y[i]) - my);
    sxx += (std::log(x[i]) - mx) * (std::log(x[i]) - mx);
  }
  return sxy / sxx;
}

// Machine epsilon of T as long double, for stating tolerances "in units of ε".
template <class T>
constexpr long double eps() {
  return static_cast<long double>(std::numeric_limits<T>::epsilon());
}

// Spacing of T at |x| (one ulp); denorm_min at zero.
template <class T>
long double ulp_at(long double x) {
  const T ax = static_cast<T>(std::fabs(x));
  if (ax == T(0)) {
    return static_cast<long double>(std::numeric_limits<T>::denorm_min());
  }
  return static_cast<long double>(std::nextafter(ax, std::numeric_limits<T>::infinity())) -
         static_cast<long double>(ax);
}

// Error of a T result against a long double reference, in ulps of T at the reference.
template <class T>
long double ulp_error(T value, long double reference) {
  return std::fabs(static_cast<long double>(value) - reference) / ulp_at<T>(reference);
}

// Largest absolute component difference of two quaternions after aligning signs, in units of ε.
template <class T>
long double quaternion_error_eps(const Quaternion<T>& a, const Quaternion<T>& b) {
  const Quaternion<T> bb = nearest_sign(b, a);
  const long double d = std::fmax(
      std::fmax(std::fabs(static_cast<long double>(a.w) - static_cast<long double>(bb.w)),
                std::fabs(static_cast<long double>(a.x) - static_cast<long double>(bb.x))),
      std::fmax(std::fabs(static_cast<long double>(a.y) - static_cast<long double>(bb.y)),
                std::fabs(static_cast<long double>(a.z) - static_cast<long double>(bb.z))));
  return d / eps<T>();
}

// Largest absolute element difference of two matrices, in units of ε.
template <class T>
long double matrix_error_eps(const Matrix3<T>& a, const Matrix3<T>& b) {
  long double d = 0;
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      d = std::fmax(
          d, std::fabs(static_cast<long double>(a(i, j)) - static_cast<long double>(b(i, j))));
    }
  }
  return d / eps<T>();
}

// Largest absolute component difference of two vectors, in units of ε.
template <class T>
long double vector_error_eps(const Vector3<T>& a, const Vector3<T>& b) {
  return std::fmax(
             std::fabs(static_cast<long double>(a.x) - static_cast<long double>(b.x)),
             std::fmax(std::fabs(static_cast<long double>(a.y) - static_cast<long double>(b.y)),
                       std::fabs(static_cast<long double>(a.z) - static_cast<long double>(b.z)))) /
         eps<T>();
}

}  // namespace halfspin::test
