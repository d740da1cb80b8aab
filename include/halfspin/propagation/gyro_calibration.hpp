#pragma once
/// @file
/// Gyro calibration stage: what the propagator applies to each raw sample before its stepper sees
/// it, as a policy (the Propagator's fifth template parameter, propagator.hpp).
///
/// Convention. A rate sample (rad/s) is calibrated as
///     ω_cal = M·(ω_raw − b(T)),
/// a delta-angle sample (rad over its interval dt, s) as
///     Δθ_cal = M·(Δθ_raw − b(T)·dt),
/// with the bias b(T) = b0 + b1·(T − T0) (rad/s; b1 in rad/s per °C; temperatures T, T0 in °C) and
/// M the 3×3 scale-factor-and-misalignment matrix (dimensionless, row-major, raw sensor axes in,
/// body axes out; a mounting rotation may be folded into it). Order of operations, which the
/// bit-exact replay relies on: b(T) = b0 + (T − T0)·b1 componentwise, rounded once per operation;
/// then the subtraction (b·dt rounded first for delta-angles); then each row of M as
/// (m0·v0 + m1·v1) + m2·v2.
///
/// Temperature. The stage starts at T = T0 (b = b0). set_temperature(T) computes b(T) once, so the
/// per-sample cost is M·(ω − b) alone. A temperature that is not finite is rejected as non_finite,
/// one outside the calibrated range [min_temperature, max_temperature] as over_range, and one whose
/// b(T) is not finite as non_finite; a rejected temperature changes nothing (the stage keeps the
/// bias of the last accepted temperature) and is counted in rejected_temperatures(). Why reject
/// rather than extrapolate: a linear fit is only known to hold where it was measured; for a
/// temperature drifting slowly out of the range and read often, the bias kept is that of the range
/// edge, and a user who trusts the fit further widens the range. The default range is all of T.
///
/// Validation at construction, in this order (the first failed rule is check()):
///  1. non_finite_parameter: every entry of M, b0, b1, T0 and the range is finite;
///  2. bad_temperature_range: min_temperature ≤ T0 ≤ max_temperature;
///  3. not_positive_determinant: det M > 0. Zero is a singular matrix (two sensor axes measuring
///     the same direction); a negative determinant is a reflection, which would mirror every
///     rotation (a right-handed turn integrated as a left-handed one). A singular M whose computed
///     det rounds to a tiny positive number fails rule 4 instead (its κ∞ is of order 1/u);
///  4. ill_conditioned: κ∞(M) = ‖M‖∞·‖M⁻¹‖∞ ≤ max_condition_number = 4 (‖·‖∞ the largest row sum
///     of absolute values). Why 4: κ∞ is scale-invariant, and for M = c·(I + E) with ‖E‖∞ = e < 1,
///     κ∞ ≤ (1 + e)/(1 − e) (‖(I + E)⁻¹‖∞ ≤ 1/(1 − e), Neumann series; common practice, no source):
///     a few per cent of scale-factor error and misalignment (e ≤ 0.05) give at most 1.11. A
///     rotation R has κ∞(R) = ‖R‖∞·‖Rᵀ‖∞ ≤ √3·√3 = 3 (its rows and columns are unit vectors, whose
///     1-norm is at most √3), so a mounting rotation folded into a real calibration stays below
///     3·1.11 = 3.3. What fails is a mistake: a unit slip on one axis (degrees for radians gives
///     κ∞ ≈ 57), a row typed twice, a fit that nearly lost an axis.
///     κ∞ is computed from M divided by its largest |entry| (entries in [−1, 1], so nothing
///     overflows), as ‖M‖∞·‖adj M‖∞/det M in T; its relative rounding error is a few ulps times
///     κ∞, far below the distance of real matrices (≈ 1.1) from the limit.
/// A stage that fails a rule cannot be used silently: it keeps check() (and valid() false), and
/// its M and biases are NaN, so every sample it calibrates is non-finite: a propagator holding it
/// rejects every sample as non_finite (counted, attitude bit-identical) and every temperature as
/// non_finite. Read check() (calibration_check_name gives a stable name for logs) before flight.
///
/// Per sample (propagator.hpp): the raw sample is validated as without a stage (finite, interval,
/// range against the gyro's full scale, which is a property of the raw reading), then calibrated;
/// a calibrated sample that is not finite (overflow of M·(ω − b) near T's range, or an invalid
/// stage) is rejected as non_finite with the state bit-identical, and counted.
///
/// Rounding: each calibrated component is within γ₇·Σ_j |m_ij|·(|r_j| + B_j) of the exact
/// M·(r − b(T)) for a raw rate r, B = |b0| + |T − T0|·|b1| (γ₈ and |r_j| + B_j·dt for
/// delta-angles), γ_n = n·u/(1 − n·u), u = ε/2, the rounding of b(T) included (derivation:
/// tests/propagation/test_gyro_calibration.cpp, stage_bound).
///
/// Cost per sample: 3 subtractions, 9 multiplies, 6 additions (3 more multiplies for b·dt with
/// delta-angles), and the finiteness check of the result; on the Cortex-M4F about 42–47 cycles
/// (an estimate: 12 loads of M and b, the 18 operations, the check) and 28–220 B of code, measured
/// in README.md (the footprint table's note, images `<stepper>+calibrated`) and bench/README.md.
/// Without a stage (NoCalibration, the default) the propagator compiles to the code it had before
/// the stage existed.
///
/// A stage of your own: a type with `static constexpr bool identity = false`, and
/// `Vector3<T> rate(const Vector3<T>&) const noexcept` and
/// `Vector3<T> delta_angle(const Vector3<T>&, T dt) const noexcept` (plus set_temperature(T) if the
/// propagator's set_temperature is to be called).

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>

#include "halfspin/core/matrix3.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/status.hpp"

namespace halfspin {

/// The default stage: none. Empty, so the propagator holds it at no cost (empty-base optimization);
/// `identity` makes the propagator skip the stage at compile time.
struct NoCalibration {
  static constexpr bool identity = true;  ///< true: the propagator skips the stage
};

/// The result of a stage's validation: valid, or the first rule it failed (see the header comment).
enum class CalibrationCheck : std::uint8_t {
  valid,
  non_finite_parameter,      ///< NaN or infinity in M, b0, b1, T0 or the temperature range
  bad_temperature_range,     ///< min_temperature > T0, or T0 > max_temperature
  not_positive_determinant,  ///< det M ≤ 0: singular, or a reflection
  ill_conditioned            ///< κ∞(M) above GyroCalibration<T>::max_condition_number
};

/// A short, stable name for logs and telemetry ("valid", "ill_conditioned", ...).
constexpr const char* calibration_check_name(CalibrationCheck c) noexcept {
  switch (c) {
    case CalibrationCheck::valid:
      return "valid";
    case CalibrationCheck::non_finite_parameter:
      return "non_finite_parameter";
    case CalibrationCheck::bad_temperature_range:
      return "bad_temperature_range";
    case CalibrationCheck::not_positive_determinant:
      return "not_positive_determinant";
    case CalibrationCheck::ill_conditioned:
      return "ill_conditioned";
  }
  return "unknown";
}

/// What a gyro calibration measured. Defaults: no correction (M = I, b = 0), any temperature.
template <class T>
struct GyroCalibrationParameters {
  Matrix3<T> scale_misalignment = Matrix3<T>::identity();  ///< M, dimensionless
  Vector3<T> bias{};                                       ///< b0 (rad/s) at reference_temperature
  Vector3<T> bias_slope{};                                 ///< b1 (rad/s per °C)
  T reference_temperature = T(0);                          ///< T0 (°C)
  T min_temperature = std::numeric_limits<T>::lowest();    ///< calibrated range (°C)
  T max_temperature = std::numeric_limits<T>::max();       ///< calibrated range (°C), upper end
};

namespace detail {

// Largest row sum of |a_ij|.
template <class T>
T infinity_norm(const Matrix3<T>& a) noexcept {
  T worst = T(0);
  for (std::size_t r = 0; r < 3; ++r) {
    const T sum = std::fabs(a.m[r][0]) + std::fabs(a.m[r][1]) + std::fabs(a.m[r][2]);
    worst = sum > worst ? sum : worst;
  }
  return worst;
}

// The adjugate (transposed cofactors): a·adj(a) = det(a)·I.
template <class T>
Matrix3<T> adjugate(const Matrix3<T>& a) noexcept {
  Matrix3<T> r{};
  for (std::size_t i = 0; i < 3; ++i) {
    const std::size_t i1 = (i + 1) % 3;
    const std::size_t i2 = (i + 2) % 3;
    for (std::size_t j = 0; j < 3; ++j) {
      const std::size_t j1 = (j + 1) % 3;
      const std::size_t j2 = (j + 2) % 3;
      // Cyclic indices give the signed cofactor of (i, j) directly; stored at (j, i).
      r.m[j][i] = a.m[i1][j1] * a.m[i2][j2] - a.m[i1][j2] * a.m[i2][j1];
    }
  }
  return r;
}

// The first rule of the header comment that p fails, or valid.
template <class T>
CalibrationCheck check_parameters(const GyroCalibrationParameters<T>& p, T max_condition) noexcept {
  const Matrix3<T>& a = p.scale_misalignment;
  bool finite = is_finite(p.bias) && is_finite(p.bias_slope) &&
                std::isfinite(p.reference_temperature) && std::isfinite(p.min_temperature) &&
                std::isfinite(p.max_temperature);
  T largest = T(0);
  for (std::size_t r = 0; r < 3; ++r) {
    finite = finite && is_finite(a.row(r));
    for (std::size_t c = 0; c < 3; ++c) {
      largest = std::fabs(a.m[r][c]) > largest ? std::fabs(a.m[r][c]) : largest;
    }
  }
  if (!finite) {
    return CalibrationCheck::non_finite_parameter;
  }
  if (!(p.min_temperature <= p.reference_temperature &&
        p.reference_temperature <= p.max_temperature)) {
    return CalibrationCheck::bad_temperature_range;
  }
  if (!(largest > T(0))) {
    return CalibrationCheck::not_positive_determinant;  // the zero matrix
  }
  // Divided by its largest |entry| (no libm: firmware pays no ilogb/scalbn for this) to entries in
  // [−1, 1]: no overflow in the products below; κ∞ and the sign of det are those of M up to the
  // division's rounding, a relative u per entry.
  Matrix3<T> s{};
  for (std::size_t r = 0; r < 3; ++r) {
    for (std::size_t c = 0; c < 3; ++c) {
      s.m[r][c] = a.m[r][c] / largest;
    }
  }
  const T det = determinant(s);
  if (!(det > T(0))) {
    return CalibrationCheck::not_positive_determinant;
  }
  const T kappa = infinity_norm(s) * infinity_norm(adjugate(s)) / det;
  if (!(kappa <= max_condition)) {  // also catches an infinite or NaN κ (det underflowed)
    return CalibrationCheck::ill_conditioned;
  }
  return CalibrationCheck::valid;
}

}  // namespace detail

/// The calibration stage: validated parameters and the bias at the current temperature.
template <class T>
class GyroCalibration {
 public:
  using scalar = T;                        ///< the scalar type
  static constexpr bool identity = false;  ///< false: the propagator runs the stage
  /// The largest κ∞(M) accepted (see the header comment for why 4).
  static constexpr T max_condition_number = T(4);

  /// Validates p (check() tells the outcome) and starts at T = T0.
  explicit GyroCalibration(const GyroCalibrationParameters<T>& p) noexcept
      : matrix_(p.scale_misalignment),
        bias_(p.bias),
        temperature_(p.reference_temperature),
        bias0_(p.bias),
        bias_slope_(p.bias_slope),
        reference_temperature_(p.reference_temperature),
        min_temperature_(p.min_temperature),
        max_temperature_(p.max_temperature),
        check_(detail::check_parameters(p, max_condition_number)) {
    if (check_ != CalibrationCheck::valid) {
      // Poisoned: every calibrated sample and every bias is NaN, so nothing passes unnoticed.
      const T nan = std::numeric_limits<T>::quiet_NaN();
      for (std::size_t r = 0; r < 3; ++r) {
        for (std::size_t c = 0; c < 3; ++c) {
          matrix_.m[r][c] = nan;
        }
      }
      bias_ = bias0_ = bias_slope_ = Vector3<T>{nan, nan, nan};
    }
  }

  /// valid, or the first validation rule the parameters failed.
  [[nodiscard]] constexpr CalibrationCheck check() const noexcept { return check_; }
  /// Whether check() is valid.
  [[nodiscard]] constexpr bool valid() const noexcept { return check_ == CalibrationCheck::valid; }

  /// Sets the sensor temperature (°C) and computes b(T) for the samples that follow. Returns ok,
  /// or non_finite / over_range with nothing changed (see the header comment).
  Status set_temperature(T celsius) noexcept {
    if (!std::isfinite(celsius)) {
      ++rejected_temperatures_;
      return Status::non_finite;
    }
    if (celsius < min_temperature_ || celsius > max_temperature_) {
      ++rejected_temperatures_;
      return Status::over_range;
    }
    const Vector3<T> b = bias0_ + (celsius - reference_temperature_) * bias_slope_;
    if (!is_finite(b)) {
      ++rejected_temperatures_;
      return Status::non_finite;
    }
    bias_ = b;
    temperature_ = celsius;
    return Status::ok;
  }

  /// ω_cal = M·(ω_raw − b), rad/s.
  constexpr Vector3<T> rate(const Vector3<T>& raw) const noexcept {
    return matrix_ * (raw - bias_);
  }
  /// Δθ_cal = M·(Δθ_raw − b·dt), rad over the sample interval dt (s).
  constexpr Vector3<T> delta_angle(const Vector3<T>& raw, T dt) const noexcept {
    return matrix_ * (raw - bias_ * dt);
  }

  /// The bias in use, b(T) (rad/s), and the temperature it was computed for (°C).
  constexpr const Vector3<T>& bias() const noexcept { return bias_; }
  /// The temperature the bias in use was computed for (°C).
  constexpr T temperature() const noexcept { return temperature_; }
  /// The parameters as given (NaN-poisoned M and biases if invalid).
  constexpr GyroCalibrationParameters<T> parameters() const noexcept {
    return {matrix_,          bias0_,          bias_slope_, reference_temperature_,
            min_temperature_, max_temperature_};
  }
  /// Temperatures rejected by set_temperature.
  constexpr std::uint64_t rejected_temperatures() const noexcept { return rejected_temperatures_; }

 private:
  // The per-sample data first and together (M then b: one block load on the Cortex-M4F).
  Matrix3<T> matrix_;
  Vector3<T> bias_;
  T temperature_;
  Vector3<T> bias0_;
  Vector3<T> bias_slope_;
  T reference_temperature_;
  T min_temperature_;
  T max_temperature_;
  std::uint64_t rejected_temperatures_ = 0;
  CalibrationCheck check_;
};

}  // namespace halfspin
