// The gyro calibration stage (propagation/gyro_calibration.hpp) and the calibrated propagator:
// recovery of a known M and b(T) against Eigen 3 (Debian libeigen3-dev, the reference library for
// matrix algebra) within a rounding bound derived below, the delta-angle form, the temperature,
// validation at construction (κ∞ computed with Eigen), bad input of every class leaving the state
// bit-identical, and the default propagator's unchanged layout.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <string>
#include <type_traits>

#include "halfspin/bounds/roundoff_floor.hpp"
#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/exponential_map_step.hpp"
#include "halfspin/propagation/gyro_calibration.hpp"
#include "halfspin/propagation/magnus4.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/truth/classical_coning.hpp"
#include "halfspin/truth/synthetic_gyro.hpp"
#include "propagation_test_steppers.hpp"
#include "rejection_checks.hpp"
#include "test_support.hpp"

using namespace halfspin;

namespace {

using LdMatrix = Eigen::Matrix<long double, 3, 3>;
using LdVector = Eigen::Matrix<long double, 3, 1>;

template <class T>
constexpr GyroLimits<T> limits{T(35), T(0.1)};  // 2000 °/s full scale; gaps above 100 ms

using test::same_bits;

template <class T>
LdMatrix to_eigen(const Matrix3<T>& m) {
  LdMatrix r;
  for (Eigen::Index i = 0; i < 3; ++i) {
    for (Eigen::Index j = 0; j < 3; ++j) {
      r(i, j) =
          static_cast<long double>(m(static_cast<std::size_t>(i), static_cast<std::size_t>(j)));
    }
  }
  return r;
}
template <class T>
LdVector to_eigen(const Vector3<T>& v) {
  return LdVector(static_cast<long double>(v.x), static_cast<long double>(v.y),
                  static_cast<long double>(v.z));
}
template <class T>
Vector3<T> rounded(const LdVector& v) {
  return {static_cast<T>(v(0)), static_cast<T>(v(1)), static_cast<T>(v(2))};
}

// κ∞(M) = ‖M‖∞·‖M⁻¹‖∞ with Eigen (long double LU inverse): the outside source for the limit.
long double eigen_condition(const LdMatrix& m) {
  const LdMatrix inverse = m.inverse();
  return m.cwiseAbs().rowwise().sum().maxCoeff() * inverse.cwiseAbs().rowwise().sum().maxCoeff();
}

// An invented calibration: scale factors within 2 %, misalignments of a few mrad, a bias of a few
// mrad/s with a slope of tens of µrad/s per °C, calibrated from −40 °C to 85 °C around 25 °C.
// Values are exact in float (so M, b0, b1 mean the same numbers in float and double).
template <class T>
GyroCalibrationParameters<T> invented_parameters() {
  GyroCalibrationParameters<T> p;
  p.scale_misalignment = {{{T(1.0185f), T(0.0042f), T(-0.0031f)},
                           {T(-0.0027f), T(0.9862f), T(0.0056f)},
                           {T(0.0038f), T(-0.0049f), T(1.0097f)}}};
  p.bias = {T(0.0043f), T(-0.0029f), T(0.0061f)};
  p.bias_slope = {T(3.5e-5f), T(-2.25e-5f), T(4.75e-5f)};
  p.reference_temperature = T(25);
  p.min_temperature = T(-40);
  p.max_temperature = T(85);
  return p;
}

// γ_n = n·u/(1 − n·u) (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §3.1).
template <class T>
long double gamma_n(int n) {
  const long double u = static_cast<long double>(std::numeric_limits<T>::epsilon()) / 2;
  return n * u / (1 - n * u);
}

// The rounding bound of the stage on one sample, per component i, for raw input r (in T, exact)
// against the exact M·(r − β·scale) with β = b0 + (T − T0)·b1 (scale = 1 for rates, dt for
// delta-angles). Derivation (Higham §2.2, §3.1; every operation rounds with |δ| ≤ u = ε/2):
//  - b̂ = fl(b0 + fl(fl(T − T0)·b1)): three roundings, |b̂ − β| ≤ γ_3·B, B = |b0| + |T − T0|·|b1|;
//    for delta-angles fl(b̂·dt) adds one: ≤ γ_4·B·dt. Write B' = B·scale and k = 3 (rates) or
//    4 (delta-angles).
//  - d̂ = fl(r − b̂'): |d̂ − (r − β')| ≤ γ_k·B' + u·(|r| + (1 + γ_k)·B') ≤ γ_{k+1}·s,
//    s = |r| + B' componentwise (Higham Lemma 3.3: γ_a + γ_b + γ_a·γ_b ≤ γ_{a+b}), and
//    |d̂| ≤ (1 + γ_{k+1})·s.
//  - ŷ_i = fl((m_i0·d̂_0 + m_i1·d̂_1) + m_i2·d̂_2), a dot product of length 3:
//    |ŷ_i − Σ_j m_ij·d̂_j| ≤ γ_3·Σ_j |m_ij|·|d̂_j| (Higham (3.5)).
//  - Together |ŷ_i − (M·(r − β'))_i| ≤ (γ_{k+1} + γ_3·(1 + γ_{k+1}))·Σ_j |m_ij|·s_j
//    ≤ γ_{k+4}·Σ_j |m_ij|·s_j: γ_7 for rates, γ_8 for delta-angles.
template <class T>
LdVector stage_bound(const LdMatrix& m, const LdVector& raw, const LdVector& bias_size, int k) {
  const LdVector s = raw.cwiseAbs() + bias_size;
  return gamma_n<T>(k + 4) * (m.cwiseAbs() * s);
}

// Recovers known true samples (ClassicalConingMotion through SyntheticGyro in long double, no
// sensor errors) from raw samples made by the inverse distortion, raw = M⁻¹·truth + b(T)·scale
// (M⁻¹ by Eigen in long double, then rounded to T), and checks the calibrated samples against
// the truth within the bound above plus the raw sample's own rounding to T, u·|M|·|raw|, plus the
// generation's residual |M·(raw_ld − β') − truth| computed in long double (Eigen). Returns the
// worst error/tolerance ratio seen. `stale` runs the same check on a stage left at T0 (b0 instead
// of b(T)) and returns the best ratio instead, which must exceed 1 for the check to mean anything.
template <class T>
long double recovery_ratio(GyroOutputForm form, bool stale) {
  const GyroCalibrationParameters<T> p = invented_parameters<T>();
  GyroCalibration<T> stage(p);
  REQUIRE(stage.valid());
  const T celsius = T(41.5);
  if (!stale) {
    REQUIRE(stage.set_temperature(celsius) == Status::ok);
  }
  const LdMatrix m = to_eigen(p.scale_misalignment);
  const LdMatrix m_inverse = m.inverse();
  const long double delta_t = static_cast<long double>(celsius - p.reference_temperature);
  const LdVector beta = to_eigen(p.bias) + delta_t * to_eigen(p.bias_slope);
  const LdVector bias_size =
      to_eigen(p.bias).cwiseAbs() + std::fabs(delta_t) * to_eigen(p.bias_slope).cwiseAbs();
  const long double u = static_cast<long double>(std::numeric_limits<T>::epsilon()) / 2;
  const long double u_ld = std::numeric_limits<long double>::epsilon() / 2;
  const long double dt = 1.0L / 512;
  const bool deltas = form == GyroOutputForm::delta_angle;
  const long double scale = deltas ? dt : 1.0L;
  const int k = deltas ? 4 : 3;
  SyntheticGyro<long double, ClassicalConingMotion<long double>> gyro(
      ClassicalConingMotion<long double>{0.3L, 2.0L * 3.14159265358979323846L * 3.0L}, form, dt, {},
      1);
  long double worst = 0;
  long double best = std::numeric_limits<long double>::infinity();
  for (int n = 0; n < 2000; ++n) {
    const LdVector truth = to_eigen(gyro.next());
    const LdVector raw_ld = m_inverse * truth + beta * scale;
    const Vector3<T> raw = rounded<T>(raw_ld);
    const Vector3<T> got = deltas ? stage.delta_angle(raw, static_cast<T>(dt)) : stage.rate(raw);
    const LdVector residual = m * (raw_ld - beta * scale) - truth;
    const LdVector tolerance = stage_bound<T>(m, to_eigen(raw), bias_size * scale, k) +
                               u * (m.cwiseAbs() * raw_ld.cwiseAbs()) + residual.cwiseAbs() +
                               4 * u_ld * (m.cwiseAbs() * (raw_ld.cwiseAbs() + bias_size * scale));
    const LdVector error = (to_eigen(got) - truth).cwiseAbs();
    for (Eigen::Index i = 0; i < 3; ++i) {
      worst = std::max(worst, error(i) / tolerance(i));
      best = std::min(best, error(i) / tolerance(i));
    }
  }
  return stale ? best : worst;
}

// A rate stepper's attitude from calibrated raw samples against the same stepper fed the true
// rates (rounded to T), both plain accumulation: the exact-arithmetic runs differ by at most
// Σ dt·‖input difference‖ (each step q ⊗ exp(ω·dt/2) in quaternion form; the angle metric is
// bi-invariant and the exponential map does not increase distances for |φ| < π,
// bounds/magnus_family_bounds.hpp §0), the input difference is at most the stage bound plus
// u·|truth| (rounding the truth to T); each run is within the roundoff floor of its exact run
// (bounds/roundoff_floor.hpp, Higham's model). Returns {tolerance, the two runs' angle, the
// uncalibrated run's angle}.
template <class T>
std::array<long double, 3> attitude_against_undistorted() {
  using Stepper = ExponentialMapHoldEnd;
  const GyroCalibrationParameters<T> p = invented_parameters<T>();
  const T celsius = T(-12.5);
  GyroCalibration<T> stage(p);
  REQUIRE(stage.set_temperature(celsius) == Status::ok);
  const LdMatrix m = to_eigen(p.scale_misalignment);
  const LdMatrix m_inverse = m.inverse();
  const long double delta_t = static_cast<long double>(celsius - p.reference_temperature);
  const LdVector beta = to_eigen(p.bias) + delta_t * to_eigen(p.bias_slope);
  const LdVector bias_size =
      to_eigen(p.bias).cwiseAbs() + std::fabs(delta_t) * to_eigen(p.bias_slope).cwiseAbs();
  const long double u = static_cast<long double>(std::numeric_limits<T>::epsilon()) / 2;
  const T dt = T(1) / T(512);
  const int steps = 1024;
  SyntheticGyro<long double, ClassicalConingMotion<long double>> gyro(
      ClassicalConingMotion<long double>{0.3L, 2.0L * 3.14159265358979323846L * 3.0L},
      GyroOutputForm::rate, static_cast<long double>(dt), {}, 1);
  const Quaternion<T> q0{T(0.6), T(0), T(0.8), T(0)};
  Propagator<T, Stepper, FirstOrderRenormalization, PlainAccumulation> reference(q0, limits<T>);
  Propagator<T, Stepper, FirstOrderRenormalization, PlainAccumulation> uncalibrated(q0, limits<T>);
  CalibratedPropagator<T, Stepper, FirstOrderRenormalization, PlainAccumulation> calibrated(
      q0, limits<T>, stage);
  long double input_bound = 0;
  long double largest_rate = 0;
  for (int n = 0; n < steps; ++n) {
    const LdVector truth = to_eigen(gyro.next());
    const LdVector raw_ld = m_inverse * truth + beta;
    const Vector3<T> raw = rounded<T>(raw_ld);
    const LdVector residual = m * (raw_ld - beta) - truth;
    const LdVector difference = stage_bound<T>(m, to_eigen(raw), bias_size, 3) +
                                u * (m.cwiseAbs() * raw_ld.cwiseAbs()) + residual.cwiseAbs() +
                                u * truth.cwiseAbs();
    input_bound += static_cast<long double>(dt) * difference.norm();
    largest_rate = std::max(largest_rate, truth.norm() + difference.norm());
    REQUIRE(reference.push(rounded<T>(truth), dt) == Status::ok);
    REQUIRE(uncalibrated.push(raw, dt) == Status::ok);
    REQUIRE(calibrated.push(raw, dt) == Status::ok);
  }
  const T theta = static_cast<T>(largest_rate * static_cast<long double>(dt) * 1.01L);
  const long double floor = static_cast<long double>(
      roundoff_floor_worst<Stepper, T, PlainAccumulation>(theta, std::int64_t{steps}));
  const long double tolerance = input_bound + 2 * floor;
  return {tolerance,
          static_cast<long double>(angle_between(calibrated.attitude(), reference.attitude())),
          static_cast<long double>(angle_between(uncalibrated.attitude(), reference.attitude()))};
}

}  // namespace

// Outside sources: Eigen 3 (M⁻¹ and the products in long double), the rounding model of Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed. (§2.2, §3.1, Lemma 3.3).
TEMPLATE_TEST_CASE("the stage recovers known rates through M and b(T) within its rounding bound",
                   "[propagation][calibration][reference]", float, double) {
  using T = TestType;
  const long double worst = recovery_ratio<T>(GyroOutputForm::rate, false);
  test::report_worst(std::string("calibrated rate error / derived bound, ") + test::type_name<T>(),
                     worst);
  REQUIRE(worst <= 1);
  // The check can fail: a stage left at T0 misses every sample (bias off by 16.5 °C of slope).
  REQUIRE(recovery_ratio<T>(GyroOutputForm::rate, true) > 1);
}

// Outside sources as above: the delta-angle form M·(Δθ − b·dt) against Eigen, bound γ_8.
TEMPLATE_TEST_CASE("the stage recovers known delta-angles through M and b(T)·dt",
                   "[propagation][calibration][reference]", float, double) {
  using T = TestType;
  const long double worst = recovery_ratio<T>(GyroOutputForm::delta_angle, false);
  test::report_worst(
      std::string("calibrated delta-angle error / derived bound, ") + test::type_name<T>(), worst);
  REQUIRE(worst <= 1);
  REQUIRE(recovery_ratio<T>(GyroOutputForm::delta_angle, true) > 1);
}

// Outside sources: Eigen 3 for the distortion, Higham's rounding model for the bound
// (bounds/roundoff_floor.hpp applies it to the propagation).
TEMPLATE_TEST_CASE("a calibrated propagation of distorted rates matches the undistorted run",
                   "[propagation][calibration][reference]", float, double) {
  using T = TestType;
  const std::array<long double, 3> r = attitude_against_undistorted<T>();
  INFO("tolerance " << static_cast<double>(r[0]) << " rad, calibrated " << static_cast<double>(r[1])
                    << " rad, uncalibrated " << static_cast<double>(r[2]) << " rad");
  test::report_worst(std::string("calibrated attitude angle / tolerance, ") + test::type_name<T>(),
                     r[1] / r[0]);
  REQUIRE(r[1] <= r[0]);
  // Without the stage the same raw samples miss by far more (bias·t and scale factor·angle).
  REQUIRE(r[2] > 10 * r[0]);
}

// b(T) = b0 + b1·(T − T0) is computed once at set_temperature, in the documented order.
TEMPLATE_TEST_CASE("set_temperature computes the linear bias once", "[propagation][calibration]",
                   float, double) {
  using T = TestType;
  const GyroCalibrationParameters<T> p = invented_parameters<T>();
  GyroCalibration<T> stage(p);
  REQUIRE(same_bits(stage.bias(), p.bias));
  REQUIRE(stage.temperature() == p.reference_temperature);
  for (const T celsius : {T(-40), T(-3.25), T(25), T(60.5), T(85)}) {
    REQUIRE(stage.set_temperature(celsius) == Status::ok);
    const Vector3<T> expected = p.bias + (celsius - p.reference_temperature) * p.bias_slope;
    REQUIRE(same_bits(stage.bias(), expected));
    REQUIRE(stage.temperature() == celsius);
    const Vector3<T> raw{T(0.25), T(-0.5), T(1.0)};
    REQUIRE(same_bits(stage.rate(raw), p.scale_misalignment * (raw - expected)));
    REQUIRE(same_bits(stage.delta_angle(raw * T(0.002), T(0.002)),
                      p.scale_misalignment * (raw * T(0.002) - expected * T(0.002))));
  }
  REQUIRE(stage.rejected_temperatures() == 0);
}

TEMPLATE_TEST_CASE("a rejected temperature changes nothing and is counted",
                   "[propagation][calibration]", float, double) {
  using T = TestType;
  GyroCalibrationParameters<T> p = invented_parameters<T>();
  GyroCalibration<T> stage(p);
  REQUIRE(stage.set_temperature(T(30)) == Status::ok);
  const Vector3<T> bias = stage.bias();
  const T nan = std::numeric_limits<T>::quiet_NaN();
  const T inf = std::numeric_limits<T>::infinity();
  REQUIRE(stage.set_temperature(nan) == Status::non_finite);
  REQUIRE(stage.set_temperature(inf) == Status::non_finite);
  REQUIRE(stage.set_temperature(-inf) == Status::non_finite);
  REQUIRE(stage.set_temperature(T(85.5)) == Status::over_range);
  REQUIRE(stage.set_temperature(T(-40.25)) == Status::over_range);
  REQUIRE(same_bits(stage.bias(), bias));
  REQUIRE(stage.temperature() == T(30));
  REQUIRE(stage.rejected_temperatures() == 5);
  // A finite, in-range temperature whose b(T) overflows T: rejected as non_finite.
  p.bias_slope = {std::numeric_limits<T>::max() / T(4), T(0), T(0)};
  GyroCalibration<T> steep(p);
  REQUIRE(steep.valid());
  const Vector3<T> steep_bias = steep.bias();
  REQUIRE(steep.set_temperature(T(80)) == Status::non_finite);
  REQUIRE(same_bits(steep.bias(), steep_bias));
  REQUIRE(steep.temperature() == p.reference_temperature);
  REQUIRE(steep.rejected_temperatures() == 1);
}

namespace {

template <class T>
CalibrationCheck check_of(const GyroCalibrationParameters<T>& p) {
  return GyroCalibration<T>(p).check();
}

template <class T>
GyroCalibrationParameters<T> with_matrix(const LdMatrix& m) {
  GyroCalibrationParameters<T> p = invented_parameters<T>();
  for (std::size_t i = 0; i < 3; ++i) {
    for (std::size_t j = 0; j < 3; ++j) {
      p.scale_misalignment(i, j) =
          static_cast<T>(m(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j)));
    }
  }
  return p;
}

}  // namespace

TEMPLATE_TEST_CASE("non-finite parameters and a bad temperature range are rejected at construction",
                   "[propagation][calibration]", float, double) {
  using T = TestType;
  REQUIRE(check_of(invented_parameters<T>()) == CalibrationCheck::valid);
  REQUIRE(check_of(GyroCalibrationParameters<T>{}) == CalibrationCheck::valid);  // identity
  for (const T bad : {std::numeric_limits<T>::quiet_NaN(), std::numeric_limits<T>::infinity(),
                      -std::numeric_limits<T>::infinity()}) {
    for (std::size_t i = 0; i < 3; ++i) {
      for (std::size_t j = 0; j < 3; ++j) {
        GyroCalibrationParameters<T> p = invented_parameters<T>();
        p.scale_misalignment(i, j) = bad;
        REQUIRE(check_of(p) == CalibrationCheck::non_finite_parameter);
      }
    }
    for (int field = 0; field < 9; ++field) {
      GyroCalibrationParameters<T> p = invented_parameters<T>();
      switch (field) {
        case 0:
          p.bias.x = bad;
          break;
        case 1:
          p.bias.y = bad;
          break;
        case 2:
          p.bias.z = bad;
          break;
        case 3:
          p.bias_slope.x = bad;
          break;
        case 4:
          p.bias_slope.y = bad;
          break;
        case 5:
          p.bias_slope.z = bad;
          break;
        case 6:
          p.reference_temperature = bad;
          break;
        case 7:
          p.min_temperature = bad;
          break;
        default:
          p.max_temperature = bad;
          break;
      }
      INFO("field " << field);
      REQUIRE(check_of(p) == CalibrationCheck::non_finite_parameter);
    }
  }
  GyroCalibrationParameters<T> p = invented_parameters<T>();
  p.reference_temperature = T(90);  // above max_temperature
  REQUIRE(check_of(p) == CalibrationCheck::bad_temperature_range);
  p.reference_temperature = T(-41);
  REQUIRE(check_of(p) == CalibrationCheck::bad_temperature_range);
  p = invented_parameters<T>();
  p.min_temperature = T(30);  // min above T0 (and below max)
  REQUIRE(check_of(p) == CalibrationCheck::bad_temperature_range);
  // Stable names for logs: one per check, none "unknown".
  const std::array<std::string, 5> names{
      calibration_check_name(CalibrationCheck::valid),
      calibration_check_name(CalibrationCheck::non_finite_parameter),
      calibration_check_name(CalibrationCheck::bad_temperature_range),
      calibration_check_name(CalibrationCheck::not_positive_determinant),
      calibration_check_name(CalibrationCheck::ill_conditioned)};
  REQUIRE(names[2] == "bad_temperature_range");
  for (std::size_t i = 0; i < names.size(); ++i) {
    REQUIRE(names[i] != "unknown");
    for (std::size_t j = 0; j < i; ++j) {
      REQUIRE(names[i] != names[j]);
    }
  }
  // A valid stage gives its parameters back as given; an invalid one NaN in M and the biases.
  const GyroCalibrationParameters<T> given = invented_parameters<T>();
  const GyroCalibrationParameters<T> back = GyroCalibration<T>(given).parameters();
  REQUIRE(std::memcmp(&back, &given, sizeof given) == 0);
  GyroCalibrationParameters<T> broken = given;
  broken.bias.y = std::numeric_limits<T>::quiet_NaN();
  const GyroCalibrationParameters<T> poisoned = GyroCalibration<T>(broken).parameters();
  REQUIRE(std::isnan(poisoned.scale_misalignment(1, 1)));
  REQUIRE(std::isnan(poisoned.bias.x));
  REQUIRE(std::isnan(poisoned.bias_slope.z));
  REQUIRE(poisoned.max_temperature == given.max_temperature);
}

// Outside source: Eigen 3 (determinant and κ∞ in long double).
TEMPLATE_TEST_CASE("singular, reflecting and ill-conditioned matrices are rejected",
                   "[propagation][calibration][reference]", float, double) {
  using T = TestType;
  const LdMatrix good = to_eigen(invented_parameters<T>().scale_misalignment);
  REQUIRE(eigen_condition(good) < 1.1L);  // what a real M looks like
  LdMatrix m = good;
  m.row(2) = m.row(0);  // a row typed twice: singular
  REQUIRE(m.fullPivLu().rank() == 2);
  // Its computed determinant is 0 or a rounding error of either sign: rejected either way, as
  // not_positive_determinant or (a tiny positive det, so κ∞ of order 1/u) as ill_conditioned.
  const CalibrationCheck singular = check_of(with_matrix<T>(m));
  REQUIRE((singular == CalibrationCheck::not_positive_determinant ||
           singular == CalibrationCheck::ill_conditioned));
  REQUIRE(check_of(with_matrix<T>(LdMatrix::Zero())) == CalibrationCheck::not_positive_determinant);
  m = good;
  m.row(1).swap(m.row(2));  // two axes swapped: a reflection
  REQUIRE(m.determinant() < 0);
  REQUIRE(check_of(with_matrix<T>(m)) == CalibrationCheck::not_positive_determinant);
  m = good;
  m.row(0) *= -1;  // an axis with its sign flipped: a reflection
  REQUIRE(check_of(with_matrix<T>(m)) == CalibrationCheck::not_positive_determinant);
  m = good;
  m.row(1) *= 180 / 3.14159265358979323846L;  // one axis scaled to degrees: κ∞ ≈ 57
  REQUIRE(eigen_condition(m) > 50);
  REQUIRE(check_of(with_matrix<T>(m)) == CalibrationCheck::ill_conditioned);
  // A cyclic permutation of the axes (a proper rotation, κ∞ = 1) and a 45° mounting rotation
  // about z folded in (κ∞ ≈ 2.1 with this M) are accepted; so is any positive multiple.
  m.setZero();
  m(0, 1) = m(1, 2) = m(2, 0) = 1;
  REQUIRE(check_of(with_matrix<T>(m * good)) == CalibrationCheck::valid);
  const long double c = std::sqrt(0.5L);
  LdMatrix rotation;
  rotation << c, -c, 0, c, c, 0, 0, 0, 1;
  REQUIRE(eigen_condition(rotation * good) > 2);
  REQUIRE(check_of(with_matrix<T>(rotation * good)) == CalibrationCheck::valid);
  REQUIRE(check_of(with_matrix<T>(1e-3L * good)) == CalibrationCheck::valid);
}

// Outside source: Eigen 3. The family M(t) = R·diag(1, 1, t)·M_good has κ∞ growing as t falls
// below 1; bisection on Eigen's κ∞ finds t* with κ∞ = 4 (the limit), and matrices with κ∞ a
// relative 10⁻⁴ inside and outside of it (by Eigen) must be accepted and rejected.
TEMPLATE_TEST_CASE("a condition number just inside the limit passes and just outside fails",
                   "[propagation][calibration][reference]", float, double) {
  using T = TestType;
  const LdMatrix good = to_eigen(invented_parameters<T>().scale_misalignment);
  const long double c = std::cos(0.3L);
  const long double s = std::sin(0.3L);
  LdMatrix rotation;
  rotation << c, -s, 0, s, c, 0, 0, 0, 1;
  const auto member = [&](long double t) {
    LdMatrix d = LdMatrix::Identity();
    d(2, 2) = t;
    return LdMatrix(rotation * d * good);
  };
  const auto kappa = [&](long double t) { return eigen_condition(member(t)); };
  const long double limit = static_cast<long double>(GyroCalibration<T>::max_condition_number);
  REQUIRE(limit == 4);
  long double lo = 0.05L;  // κ∞ above the limit
  long double hi = 1.0L;   // κ∞ below it
  REQUIRE(kappa(lo) > limit);
  REQUIRE(kappa(hi) < limit);
  for (int i = 0; i < 200; ++i) {
    const long double mid = (lo + hi) / 2;
    (kappa(mid) > limit ? lo : hi) = mid;
  }
  // t with κ∞ = limit·(1 ∓ 10⁻⁴), by bisection again, on the matrices as rounded to T.
  const auto rounded_kappa = [&](long double t) {
    return eigen_condition(to_eigen(with_matrix<T>(member(t)).scale_misalignment));
  };
  const auto solve = [&](long double target) {
    long double a = lo / 2;
    long double b = 1.0L;
    for (int i = 0; i < 200; ++i) {
      const long double mid = (a + b) / 2;
      (rounded_kappa(mid) > target ? a : b) = mid;
    }
    return b;
  };
  const long double inside = solve(limit * (1 - 1e-4L));
  const long double outside = solve(limit * (1 + 1e-4L)) * (1 - 1e-6L);
  INFO("κ∞ inside " << static_cast<double>(rounded_kappa(inside)) << ", outside "
                    << static_cast<double>(rounded_kappa(outside)));
  REQUIRE(rounded_kappa(inside) < limit);
  REQUIRE(rounded_kappa(outside) > limit);
  REQUIRE(rounded_kappa(outside) < limit * (1 + 2e-4L));
  REQUIRE(check_of(with_matrix<T>(member(inside))) == CalibrationCheck::valid);
  REQUIRE(check_of(with_matrix<T>(member(outside))) == CalibrationCheck::ill_conditioned);
}

namespace {

// Every input class against a twin (support/rejection_checks.hpp), on a calibrated propagator at
// 47 °C; the range is the raw reading's: 36 rad/s is over a 35 rad/s gyro even where the stage
// would scale it below (M's diagonal is 0.986–1.019, so not here either way). Then a raw sample
// that is finite and within a gyro range of T's maximum, whose calibrated value overflows (M's
// largest entry 1.0185 times a raw 0.99·max; over dt = 1 s for delta-angles, so that max_rate·dt
// admits it): non_finite, state intact.
template <class T, class Stepper>
void check_all_classes(T scale, bool delta_angles) {
  GyroCalibration<T> stage(invented_parameters<T>());
  REQUIRE(stage.set_temperature(T(47)) == Status::ok);
  const auto make_with = [&stage](const GyroLimits<T>& lim) {
    return [&stage, lim](const Quaternion<T>& q0) {
      return CalibratedPropagator<T, Stepper>(q0, lim, stage, T(1e-4));
    };
  };
  test::check_every_input_class<T>(make_with(limits<T>), scale, delta_angles, 602);
  const GyroLimits<T> wide{std::numeric_limits<T>::max(), T(2)};
  const Vector3<T> huge{std::numeric_limits<T>::max() * T(0.99), T(0), T(0)};
  test::check_rejection_against_twin<T>(
      "calibrated sample overflows", Status::non_finite, make_with(wide),
      [&](auto& p) { return p.push(huge, T(1)); }, scale, 602);
}

}  // namespace

TEMPLATE_TEST_CASE("a calibrated propagator rejects every bad-input class with state intact",
                   "[propagation][calibration]", float, double) {
  using T = TestType;
  check_all_classes<T, Magnus4>(T(1), false);                         // rates, window of 3
  check_all_classes<T, ExponentialMapHoldEnd>(T(1), false);           // rates, window of 1
  check_all_classes<T, Coning2Sample>(T(1e-3), true);                 // delta-angles, window 2
  check_all_classes<T, test::WithPreviousDeltaAngle>(T(1e-3), true);  // with history
}

TEMPLATE_TEST_CASE("a calibrated propagator steps on the calibrated samples, bit for bit",
                   "[propagation][calibration]", float, double) {
  using T = TestType;
  GyroCalibration<T> stage(invented_parameters<T>());
  REQUIRE(stage.set_temperature(T(5.5)) == Status::ok);
  const Quaternion<T> q0{T(0.6), T(0), T(0.8), T(0)};
  CalibratedPropagator<T, Coning2Sample> deltas(q0, limits<T>, stage);
  Propagator<T, Coning2Sample> by_hand_deltas(q0, limits<T>);
  CalibratedPropagator<T, Magnus4> rates(q0, limits<T>, stage);
  Propagator<T, Magnus4> by_hand_rates(q0, limits<T>);
  CalibratedPropagator<T, test::MidpointRateFunction> function(q0, limits<T>, stage);
  Propagator<T, test::MidpointRateFunction> by_hand_function(q0, limits<T>);
  test::RandomRotations rng(603);
  const T dt = T(2e-3);
  for (int k = 0; k < 30; ++k) {
    const Vector3<T> w = rng.unit_vector<T>() * T(0.7);
    REQUIRE(deltas.push(w * dt, dt) == by_hand_deltas.push(stage.delta_angle(w * dt, dt), dt));
    REQUIRE(same_bits(deltas.attitude(), by_hand_deltas.attitude()));
    REQUIRE(rates.push(w, dt) == by_hand_rates.push(stage.rate(w), dt));
    REQUIRE(same_bits(rates.attitude(), by_hand_rates.attitude()));
    const auto rate_at = [&w](T tau) { return w + tau * Vector3<T>{T(1), T(0), T(-1)}; };
    const auto calibrated_at = [&](T tau) { return stage.rate(rate_at(tau)); };
    REQUIRE(function.advance(rate_at, dt) == Status::ok);
    REQUIRE(by_hand_function.advance(calibrated_at, dt) == Status::ok);
    REQUIRE(same_bits(function.attitude(), by_hand_function.attitude()));
  }
  // The propagator's set_temperature reaches its stage.
  REQUIRE(rates.set_temperature(T(70)) == Status::ok);
  REQUIRE(rates.calibration().temperature() == T(70));
  REQUIRE(rates.set_temperature(T(100)) == Status::over_range);
  REQUIRE(rates.calibration().temperature() == T(70));
  REQUIRE(rates.calibration().rejected_temperatures() == 1);
}

TEMPLATE_TEST_CASE("an invalid stage makes the propagator reject every sample as non_finite",
                   "[propagation][calibration]", float, double) {
  using T = TestType;
  GyroCalibrationParameters<T> p = invented_parameters<T>();
  p.scale_misalignment(2, 2) = -p.scale_misalignment(2, 2);  // a reflection
  const GyroCalibration<T> stage(p);
  REQUIRE_FALSE(stage.valid());
  REQUIRE(stage.check() == CalibrationCheck::not_positive_determinant);
  const Quaternion<T> q0{T(0.6), T(0), T(0.8), T(0)};
  CalibratedPropagator<T, Coning2Sample> deltas(q0, limits<T>, stage);
  CalibratedPropagator<T, ExponentialMapHoldEnd> rates(q0, limits<T>, stage);
  const T dt = T(1e-3);
  for (int k = 0; k < 10; ++k) {
    const Vector3<T> w{T(0.1), T(0.2), T(-0.3)};
    REQUIRE(deltas.push(w * dt, dt) == Status::non_finite);
    REQUIRE(rates.push(w, dt) == Status::non_finite);
  }
  REQUIRE(same_bits(deltas.attitude(), q0));
  REQUIRE(same_bits(rates.attitude(), q0));
  REQUIRE(deltas.counters().rejected_non_finite == 10);
  REQUIRE(deltas.counters().samples_accepted == 0);
  REQUIRE(rates.counters().steps == 0);
  REQUIRE(rates.set_temperature(T(30)) == Status::non_finite);
  REQUIRE(rates.calibration().check() == CalibrationCheck::not_positive_determinant);
}

namespace {
struct FirstMemberLikeThePropagator : detail::CalibrationSlot<NoCalibration> {
  Quaternion<float> state;
};
}  // namespace

// Zero cost when unused: the default stage is empty and held as an empty base, so the default
// propagator has exactly the members it had (the Cortex-M4F footprint images show the same object
// size and code; README, footprint table note).
TEST_CASE("the default propagator holds no calibration state", "[propagation][calibration]") {
  static_assert(std::is_empty<NoCalibration>::value);
  static_assert(std::is_empty<detail::CalibrationSlot<NoCalibration>>::value);
  static_assert(sizeof(FirstMemberLikeThePropagator) == sizeof(Quaternion<float>));
  static_assert(std::is_same<Propagator<float, Coning2Sample>,
                             Propagator<float, Coning2Sample, FirstOrderRenormalization,
                                        DefaultAccumulation<float>, NoCalibration>>::value);
  static_assert(
      std::is_same<CalibratedPropagator<double, Magnus4>,
                   Propagator<double, Magnus4, FirstOrderRenormalization,
                              DefaultAccumulation<double>, GyroCalibration<double>>>::value);
  // A calibrated propagator cannot be built without its stage.
  static_assert(!std::is_constructible<CalibratedPropagator<float, Magnus4>, Quaternion<float>,
                                       GyroLimits<float>>::value);
  static_assert(std::is_constructible<Propagator<float, Magnus4>, Quaternion<float>,
                                      GyroLimits<float>>::value);
  static_assert(sizeof(CalibratedPropagator<float, Magnus4>) >=
                sizeof(Propagator<float, Magnus4>) + sizeof(GyroCalibration<float>));
  SUCCEED("compile-time checks");
}
