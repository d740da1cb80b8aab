#pragma once
/// @file
/// Per-scalar-type constants: machine epsilon and the small-angle thresholds below which the
/// exponential and logarithm maps switch to truncated Taylor series.

#include <limits>
#include <type_traits>

namespace halfspin {

/// Why the thresholds have these values: exp's series of cos(θ/2) and sin(θ/2)/θ would already be
/// accurate to under half an ulp through θ⁴ while the first dropped term, θ⁶/46080, stays below
/// ε/4: θ² < 0.1 for float (θ < 0.316, 0.18 ε) and θ² < 1e-4 for double (θ < 0.01, 0.1 ε). The
/// θ⁶ terms are kept anyway, because a dropped term of fixed sign biases every step of a long
/// propagation the same way (a norm drift of 1e-4 over 1e5 float steps at θ ≈ 0.25 was measured);
/// with them the truncation is θ⁸/10321920, below 1e-3 ε at both thresholds.
/// log keeps 2·atan(r)/r through r⁶ (r = |v|/w), thresholds r² < 5e-3 for float and r² < 5e-6
/// for double, where the first dropped term r⁸/9 is below 1e-3 ε.
/// Below the thresholds no square root or trigonometric call is made, which is the common case of
/// a gyro step (|ω|·dt is small) and also keeps denormal-sized rotation vectors exact.
template <class T>
struct ScalarTraits {
  static_assert(std::is_floating_point<T>::value, "halfspin works on IEEE floating-point types");
  static constexpr T epsilon = std::numeric_limits<T>::epsilon();  ///< machine epsilon of T
  static constexpr T exp_series_angle_squared = T(1e-5);  ///< θ² below which exp uses its series
  static constexpr T log_series_ratio_squared = T(5e-8);  ///< r² below which log uses its series
};

/// The float thresholds (see the comment above ScalarTraits).
template <>
struct ScalarTraits<float> {
  /// Machine epsilon of float.
  static constexpr float epsilon = std::numeric_limits<float>::epsilon();
  static constexpr float exp_series_angle_squared = 0.1f;  ///< θ² below which exp uses its series
  static constexpr float log_series_ratio_squared = 5e-3f;  ///< r² below which log uses its series
};

/// The double thresholds (see the comment above ScalarTraits).
template <>
struct ScalarTraits<double> {
  /// Machine epsilon of double.
  static constexpr double epsilon = std::numeric_limits<double>::epsilon();
  static constexpr double exp_series_angle_squared = 1e-4;  ///< θ² below which exp uses its series
  static constexpr double log_series_ratio_squared = 5e-6;  ///< r² below which log uses its series
};

/// π in the scalar type, correctly rounded.
template <class T>
constexpr T pi = T(3.141592653589793238462643383279502884L);

}  // namespace halfspin
