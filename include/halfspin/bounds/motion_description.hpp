#pragma once
/// @file
/// Motion descriptions: what the firmware engineer knows about the rates the gyro will see, in the
/// form the error bounds need.
///
/// RateEnvelope: bounds D_k ≥ max over the flight of ‖dᵏω/dtᵏ‖ (rad/s^(k+1)), k = 0..5; an unknown
/// one is +∞ (a bound that needs it is then +∞: we do not guess; horizon_bound.hpp says which D_k
/// a stepper needs). Built from what a datasheet or a flight envelope gives:
///  - from_derivatives(D0, D1, …): the known leading bounds, the rest unknown;
///  - from_bandwidth(max rate, B) / from_axis_rates_and_bandwidth((r_x, r_y, r_z), B): the maximum
///    rate (magnitude, or per body axis) and the manoeuvre bandwidth B (Hz), with
///    D_k = (2πB)ᵏ·D0 by Bernstein's inequality: a bounded function whose spectrum lies in
///    [−2πB, 2πB] (an entire function of exponential type 2πB bounded on the real line) obeys
///    sup|f′| ≤ 2πB·sup|f| (Bernstein's inequality; R. P. Boas, "Entire Functions", Academic
///    Press 1954, cited from memory, see REFERENCES.md), and f′ is again bounded and of the same
///    type, so sup|f⁽ᵏ⁾| ≤ (2πB)ᵏ·sup|f| by induction; sin(2πBt) attains it. Assumption, which the
///    user must own: every rate component is band-limited to B (no spectral content above B at all,
///    not merely attenuated; a vibration above B must be described as a vibration line). Vector
///    form: for a unit vector e the projection e·ω is band-limited with sup|e·ω| ≤ D0, so |e·ω⁽ᵏ⁾|
///    ≤ (2πB)ᵏ·D0 for every e, i.e. ‖ω⁽ᵏ⁾‖ ≤ (2πB)ᵏ·D0; with per-axis maxima r_i, |ω_i⁽ᵏ⁾| ≤
///    (2πB)ᵏ·r_i and ‖ω⁽ᵏ⁾‖ ≤ (2πB)ᵏ·‖r‖.
///
/// VibrationLine: one sinusoidal line at f Hz, per body axis an amplitude and a phase:
/// ω_i(t) = A_i·cos(2πf·t + φ_i). The amplitude is entered in explicit units — an angle amplitude
/// θ_i (rad or degrees; A_i = 2πf·θ_i, the rate of an oscillation of θ_i about that axis) or a rate
/// amplitude (rad/s or °/s) — and stored as the rate amplitude A_i (rad/s). Phases known or
/// unknown: with unknown phases every bound holds for every choice of phases (the worst-case
/// coning of each pair of axes, below). Derivative bounds: ‖dᵏω/dtᵏ‖ ≤ ‖A‖·(2πf)ᵏ.
/// Its coning content: ω(t) = X cos Ωt − Y sin Ωt with X + iY = (A_i e^{iφ_i}) traces an ellipse
/// of semi-axes a ≥ b, a² + b² = |X|² + |Y|² = ‖A‖² and a·b = |X × Y| (the area of the
/// parallelogram of two conjugate semi-diameters); it is the sum of a circle turning with the
/// line, radius ρ₊ = (a + b)/2, and one turning against it, radius ρ₋ = (a − b)/2 (common
/// practice, no source). With unknown phases |X × Y|² = Σ_{i<j} A_i²A_j² sin²(φ_j − φ_i) ≤
/// Σ_{i<j} A_i²A_j² (each pair of axes in quadrature: its worst-case coning), so ρ₊ ≤
/// √(‖A‖² + 2P)/2 with P that bound (at most ‖A‖²/2), and ρ₋ ≤ ‖A‖/2.
///
/// ConingSpec: classical coning of half-angle a at frequency f (truth/classical_coning.hpp): body
/// rate (−Ω(1 − cos a), −Ω sin a sin Ωt, Ω sin a cos Ωt), Ω = 2πf; ‖ω‖ = 2Ω sin(a/2) and
/// ‖dᵏω/dtᵏ‖ = Ωᵏ⁺¹ sin a for k ≥ 1.
///
/// MotionDescription combines a maneuver envelope, vibration lines and coning. Its envelope() adds
/// the parts' derivative bounds (the triangle inequality: safe for any superposition); the bounds
/// of the exponential-map, Magnus and coning steppers also keep the cones apart (exact error) and
/// bound what the rest adds (mixed_motion_bound.hpp).
///
/// converted<U>() gives the same description in another scalar type (explicit: a float
/// description and a double horizon are converted, never mixed silently).

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <type_traits>

#include "halfspin/core/scalar_traits.hpp"
#include "halfspin/core/vector3.hpp"

namespace halfspin {

/// Bounds D_k on the derivatives of the body rate (see the file comment).
template <class T>
struct RateEnvelope {
  /// D_k for k = 0..5 (rad/s^(k+1)); +∞ where unknown.
  std::array<T, 6> derivative{
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity(),
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity(),
      std::numeric_limits<T>::infinity(), std::numeric_limits<T>::infinity()};

  /// The known leading bounds D0, D1, … (rad/s, rad/s², …), at most six, each converted to T
  /// with static_cast; the rest unknown (+∞).
  template <class... D>
  static constexpr RateEnvelope from_derivatives(D... known) noexcept {
    static_assert(sizeof...(D) <= 6, "at most six derivative bounds, D0..D5");
    static_assert((std::is_arithmetic<D>::value && ...), "derivative bounds are numbers");
    RateEnvelope e{};
    const std::array<T, sizeof...(D)> given{{static_cast<T>(known)...}};
    for (std::size_t k = 0; k < sizeof...(D); ++k) {
      e.derivative[k] = given[k];
    }
    return e;
  }
  /// From max ‖ω‖ (rad/s), max ‖ω̇‖ (rad/s²), max ‖ω̈‖ (rad/s³); higher derivatives unknown.
  static constexpr RateEnvelope from_rate_bounds(T max_rate, T max_rate_derivative,
                                                 T max_second_derivative) noexcept {
    return from_derivatives(max_rate, max_rate_derivative, max_second_derivative);
  }
  /// From the maximum rate magnitude (rad/s) and the manoeuvre bandwidth (Hz): D_k = (2πB)ᵏ·D0,
  /// Bernstein's inequality (header comment; it assumes every rate component band-limited to B).
  static RateEnvelope from_bandwidth(T max_rate, T bandwidth_hz) noexcept {
    RateEnvelope e{};
    const T w = T(2) * pi<T> * bandwidth_hz;
    T p = max_rate;
    for (std::size_t k = 0; k < 6; ++k) {
      e.derivative[k] = p;
      p *= w;
    }
    return e;
  }
  /// From the maximum rate per body axis (rad/s) and the bandwidth (Hz): D_k = (2πB)ᵏ·‖r‖.
  static RateEnvelope from_axis_rates_and_bandwidth(const Vector3<T>& max_axis_rate,
                                                    T bandwidth_hz) noexcept {
    return from_bandwidth(norm(max_axis_rate), bandwidth_hz);
  }
  /// A constant rate of magnitude |ω| (rad/s): every derivative is zero.
  static constexpr RateEnvelope constant_rate(T rate) noexcept {
    return {{rate, T(0), T(0), T(0), T(0), T(0)}};
  }
  /// No motion at all (the neutral element of +).
  static constexpr RateEnvelope none() noexcept { return {{T(0), T(0), T(0), T(0), T(0), T(0)}}; }
  /// D_k (rad/s^(k+1)).
  constexpr T operator[](std::size_t k) const noexcept { return derivative[k]; }
  /// Whether D_k is known (finite).
  bool known(std::size_t k) const noexcept { return std::isfinite(derivative[k]); }
  /// The same bounds in scalar U (explicit conversion).
  template <class U>
  constexpr RateEnvelope<U> converted() const noexcept {
    RateEnvelope<U> r{};
    for (std::size_t k = 0; k < 6; ++k) {
      r.derivative[k] = static_cast<U>(derivative[k]);
    }
    return r;
  }
};

/// Sum of envelopes: bounds for the sum of two rate signals.
template <class T>
constexpr RateEnvelope<T> operator+(const RateEnvelope<T>& a, const RateEnvelope<T>& b) noexcept {
  RateEnvelope<T> r{};
  for (std::size_t k = 0; k < 6; ++k) {
    r.derivative[k] = a.derivative[k] + b.derivative[k];
  }
  return r;
}

/// The radii (rad/s) of the two circles a vibration line's rate ellipse splits into (header
/// comment): ρ₊ turns with the line, ρ₋ against it; with unknown phases, their worst cases.
template <class T>
struct CircularParts {
  T with_line;     ///< ρ₊ (rad/s): the circle that turns with the line
  T against_line;  ///< ρ₋ (rad/s): the circle that turns against it
};

/// One vibration line (header comment): ω_i(t) = A_i·cos(2πf·t + φ_i), A_i ≥ 0 in rad/s.
template <class T>
struct VibrationLine {
  T frequency_hz{};             ///< f (Hz)
  Vector3<T> rate_amplitude{};  ///< A_i (rad/s)
  Vector3<T> phase{};           ///< φ_i (rad); meaningful only when phases_known
  bool phases_known = false;    ///< whether `phase` holds the phases

  /// Angle amplitude per axis θ_i (rad) at f (Hz): A_i = 2πf·θ_i. Phases unknown.
  static VibrationLine from_angle_amplitude(T frequency_hz, const Vector3<T>& angle_rad) noexcept {
    const T w = T(2) * pi<T> * frequency_hz;
    return {frequency_hz, absolute_each(angle_rad) * w, {}, false};
  }
  /// Angle amplitude per axis in degrees at f (Hz). Phases unknown.
  static VibrationLine from_angle_amplitude_deg(T frequency_hz,
                                                const Vector3<T>& angle_deg) noexcept {
    return from_angle_amplitude(frequency_hz, angle_deg * (pi<T> / T(180)));
  }
  /// Rate amplitude per axis (rad/s) at f (Hz). Phases unknown.
  static VibrationLine from_rate_amplitude(T frequency_hz, const Vector3<T>& rate_rad_s) noexcept {
    return {frequency_hz, absolute_each(rate_rad_s), {}, false};
  }
  /// Rate amplitude per axis in °/s at f (Hz). Phases unknown.
  static VibrationLine from_rate_amplitude_deg_s(T frequency_hz,
                                                 const Vector3<T>& rate_deg_s) noexcept {
    return from_rate_amplitude(frequency_hz, rate_deg_s * (pi<T> / T(180)));
  }
  /// A line along one fixed axis: ω(t) = v·cos(2πf·t + φ) with v (rad/s) a signed vector and φ
  /// (rad) its phase (A_i = |v_i|, φ_i = φ or φ + π): a single-axis oscillation. Phases known.
  static VibrationLine along_axis(T frequency_hz, const Vector3<T>& v, T phase_rad) noexcept {
    const T flip = phase_rad + pi<T>;
    return {frequency_hz,
            absolute_each(v),
            {v.x < T(0) ? flip : phase_rad, v.y < T(0) ? flip : phase_rad,
             v.z < T(0) ? flip : phase_rad},
            true};
  }
  /// The same line with known phases φ_i (rad).
  VibrationLine with_phases(const Vector3<T>& phase_rad) const noexcept {
    VibrationLine l = *this;
    l.phase = phase_rad;
    l.phases_known = true;
    return l;
  }

  /// Ω = 2πf (rad/s).
  T angular_frequency() const noexcept { return T(2) * pi<T> * frequency_hz; }
  /// The rate (rad/s) at t (s); with unknown phases, at phases 0.
  Vector3<T> rate(T t) const noexcept {
    const T w = angular_frequency();
    const Vector3<T> p = phases_known ? phase : Vector3<T>{};
    return {rate_amplitude.x * std::cos(w * t + p.x), rate_amplitude.y * std::cos(w * t + p.y),
            rate_amplitude.z * std::cos(w * t + p.z)};
  }
  /// Derivative bounds ‖A‖·(2πf)ᵏ.
  RateEnvelope<T> envelope() const noexcept {
    const T w = angular_frequency();
    RateEnvelope<T> e{};
    T p = norm(rate_amplitude);
    for (std::size_t k = 0; k < 6; ++k) {
      e.derivative[k] = p;
      p *= w;
    }
    return e;
  }
  /// ρ₊ and ρ₋ (rad/s): exact with known phases, worst case over all phases otherwise.
  CircularParts<T> circular_parts() const noexcept {
    const T s = squared_norm(rate_amplitude);
    const Vector3<T>& a = rate_amplitude;
    T area;  // a·b = |X × Y|, or its bound
    if (phases_known) {
      const Vector3<T> x{a.x * std::cos(phase.x), a.y * std::cos(phase.y), a.z * std::cos(phase.z)};
      const Vector3<T> y{a.x * std::sin(phase.x), a.y * std::sin(phase.y), a.z * std::sin(phase.z)};
      area = norm(cross(x, y));
    } else {
      area = std::sqrt(a.x * a.x * a.y * a.y + a.y * a.y * a.z * a.z + a.x * a.x * a.z * a.z);
    }
    area = area < T(0.5) * s ? area : T(0.5) * s;
    const T sum = std::sqrt(s + T(2) * area);  // a + b
    const T gap = s - T(2) * area;
    const T difference = std::sqrt(gap > T(0) ? gap : T(0));  // a − b
    if (phases_known) {
      return {T(0.5) * sum, T(0.5) * difference};
    }
    return {T(0.5) * sum, T(0.5) * std::sqrt(s)};
  }
  /// The same line in scalar U.
  template <class U>
  VibrationLine<U> converted() const noexcept {
    return {static_cast<U>(frequency_hz), vector_as<U>(rate_amplitude), vector_as<U>(phase),
            phases_known};
  }

 private:
  static Vector3<T> absolute_each(const Vector3<T>& v) noexcept {
    return {std::fabs(v.x), std::fabs(v.y), std::fabs(v.z)};
  }
  template <class U>
  static Vector3<U> vector_as(const Vector3<T>& v) noexcept {
    return {static_cast<U>(v.x), static_cast<U>(v.y), static_cast<U>(v.z)};
  }
};

/// Up to four vibration lines (an engine or rotor and its harmonics, a structure mode).
template <class T>
struct VibrationSpec {
  static constexpr std::size_t capacity = 4;      ///< the most lines a description holds
  std::array<VibrationLine<T>, capacity> line{};  ///< the lines; the first `count` are used
  std::size_t count = 0;                          ///< lines in use

  /// Appends a line; false (and nothing changes) when full.
  bool add(const VibrationLine<T>& l) noexcept {
    if (count >= capacity) {
      return false;
    }
    line[count++] = l;
    return true;
  }
  /// The sum of the lines' derivative bounds (the triangle inequality).
  RateEnvelope<T> envelope() const noexcept {
    RateEnvelope<T> e = RateEnvelope<T>::none();
    for (std::size_t i = 0; i < count; ++i) {
      e = e + line[i].envelope();
    }
    return e;
  }
  /// The same lines in scalar type U.
  template <class U>
  VibrationSpec<U> converted() const noexcept {
    VibrationSpec<U> r{};
    for (std::size_t i = 0; i < count; ++i) {
      r.line[i] = line[i].template converted<U>();
    }
    r.count = count;
    return r;
  }
};

/// Classical coning: half-angle (rad) and frequency (Hz).
template <class T>
struct ConingSpec {
  T half_angle{};    ///< half-angle (rad)
  T frequency_hz{};  ///< f (Hz)

  /// Ω = 2πf (rad/s).
  T angular_frequency() const noexcept { return T(2) * pi<T> * frequency_hz; }
  /// Whether there is coning at all.
  bool present() const noexcept { return half_angle != T(0) && frequency_hz != T(0); }
  /// Exact derivative bounds of the classical coning rate.
  RateEnvelope<T> envelope() const noexcept {
    const T w = angular_frequency();
    RateEnvelope<T> e{};
    e.derivative[0] = T(2) * w * std::sin(T(0.5) * half_angle);
    T p = w * w * std::sin(half_angle);
    for (std::size_t k = 1; k < 6; ++k) {
      e.derivative[k] = p;
      p *= w;
    }
    return e;
  }
  /// The same coning in scalar type U.
  template <class U>
  ConingSpec<U> converted() const noexcept {
    return {static_cast<U>(half_angle), static_cast<U>(frequency_hz)};
  }
};

/// What the bounds take: a maneuver envelope plus vibration lines plus coning, any part empty.
template <class T>
struct MotionDescription {
  /// The maneuver's derivative bounds (none by default).
  RateEnvelope<T> maneuver = RateEnvelope<T>::none();
  VibrationSpec<T> vibration{};  ///< vibration lines (none by default)
  ConingSpec<T> coning{};        ///< classical coning (none by default)

  /// True when the motion is pure classical coning (no maneuver, no vibration): the bounds then
  /// use the exact per-step error of coning, which is the same at every step.
  bool is_pure_coning() const noexcept {
    bool quiet = vibration.count == 0;
    for (std::size_t k = 0; k < 6; ++k) {
      quiet = quiet && maneuver.derivative[k] == T(0);
    }
    return quiet && coning.present();
  }
  /// Derivative bounds of the whole motion (sum of the parts').
  RateEnvelope<T> envelope() const noexcept {
    RateEnvelope<T> e = maneuver + vibration.envelope();
    if (coning.present()) {
      e = e + coning.envelope();
    }
    return e;
  }
  /// The same description in scalar U (explicit conversion).
  template <class U>
  MotionDescription<U> converted() const noexcept {
    return {maneuver.template converted<U>(), vibration.template converted<U>(),
            coning.template converted<U>()};
  }
};

}  // namespace halfspin
