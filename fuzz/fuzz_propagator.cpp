// libFuzzer harness: the Propagator fed arbitrary bytes as its configuration and as a sequence of
// operations (rate or delta-angle samples with dt in seconds or in ticks, rate-function steps,
// re-anchoring). After every call it checks what docs/guarantees.md and propagator.hpp promise:
//   status ok or waiting_for_samples ⇒ the sample was counted as accepted (steps +1 on ok), no
//     rejection counted; on ok the attitude is finite with | ‖q‖ − 1 | within the tolerance of
//     its renormalization policy and stepper family (norm_tolerance below, derived there);
//   a rejection ⇒ exactly the counter of its class went up by one and every other byte of the
//     propagator object is as it was (attitude, history, time, policy state: memcmp of the whole
//     object outside the counters), except that a gap (step_too_long) sets the one-byte gap flag.
// Byte layout (any input is valid; reads past the end give zeros): scalar and accumulation (bit 0:
// float or double; bit 1: plain or compensated accumulation, so that every input stored before the
// compensated policy existed, whose first byte had bit 1 clear, keeps its meaning), stepper
// catalogue id
// (a byte naming no stepper ends the input), gyro range,
// longest step, tick period, initial attitude, policy and its parameter, then operations (one
// byte each: push in seconds, push in ticks, reset, or a rate-function step, and their values).
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <limits>
#include <new>
#include <type_traits>

#include "fuzz_support.hpp"
#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"

namespace {

using namespace halfspin;
using fuzz::ByteReader;

// Lie-group steppers end every step with q ⊗ exp(φ/2), a product of unit quaternions: the norm
// changes only by rounding. Runge–Kutta steppers add the truncation error of the step to it.
enum class Family { lie_group, runge_kutta };
enum class PolicyKind { none, exact, first_order, periodic, threshold };

template <class T>
struct Setup {
  GyroLimits<T> limits;
  T tick_period;
  Quaternion<T> initial;
};

template <class T>
constexpr T eps = std::numeric_limits<T>::epsilon();

// Norm error one Lie-group step may add: the product of two unit quaternions and the exponential
// each round every component a few times (measured ≤ 0.25 ε per step on average, stepper headers);
// 8 ε bounds one step's worst case with margin.
template <class T>
constexpr T lie_step_drift = T(8) * eps<T>;
// After an exact normalization (q/‖q‖: a square root and four divisions) | ‖q‖ − 1 | ≤ 2 ε; the
// first-order step from rounding-level input gives the same.
template <class T>
constexpr T corrected = T(4) * eps<T>;

// Runge–Kutta with first-order renormalization: the largest step angle θ = √3·max_rate·(step
// length) (rad) for which a norm bound is claimed, and the bound, θ⁴/2. Derivation (RK2
// midpoint, whose stage rates come from samples that need not agree: the mid sample can be the
// opposite of the start one): from unit q one step gives q ⊗ P with
// P = 1 + (h/2)ω_m + (h²/8)ω₀ω_m, so ‖q‖² changes by e ∈ [−θ²/4, θ²/2 + θ³/8 + θ⁴/32]; the Newton
// step leaves 1 − 3e²/4 + e³/4, i.e. | ‖q‖ − 1 | ≈ 3e²/8 ≤ about 0.1·θ⁴ (0.0077 at θ = 0.5).
// Measured worst over 2·10⁵ adversarial full-range steps (alternating signs): 0.19·θ⁴ for RK2
// sampled, 0.15·θ⁴ RK3 sampled, 0.01·θ⁴ RK4 sampled, below 0.006·θ⁴ for the interpolated forms, at
// θ = 0.1, 0.25, 0.5; θ⁴/2 leaves a margin of 2.5 over the worst. Beyond θ = 0.5 the Newton step
// stops converging for adversarial samples (it diverges once ‖q‖² > 3); no bound is claimed.
template <class T>
constexpr T first_order_step_angle = T(0.5);
template <class T>
T first_order_runge_kutta(T step_angle) {
  const T t2 = step_angle * step_angle;
  return T(0.5) * t2 * t2;
}

// The documented bound on | ‖q‖ − 1 | after an accepted step, or infinity where the library
// documents none (Runge–Kutta steppers without a policy, or between periodic corrections: their
// truncation drift grows without bound, renormalization.hpp). `since_anchor`: steps since the
// start or the last reset (the anchors are unit to 2 ε); `since_correction`: steps since the
// periodic policy last corrected.
template <class T>
T norm_tolerance(PolicyKind kind, Family family, std::uint64_t since_anchor,
                 std::uint64_t since_correction, T threshold, T step_angle) {
  const T unbounded = std::numeric_limits<T>::infinity();
  switch (kind) {
    case PolicyKind::none:
      return family == Family::lie_group
                 ? T(2) * eps<T> + static_cast<T>(since_anchor) * lie_step_drift<T>
                 : unbounded;
    case PolicyKind::exact:
      return corrected<T>;
    case PolicyKind::first_order:
      // Runge–Kutta: the Newton step maps ‖q‖² = 1 + e to 1 − 3e²/4 + e³/4, so the norm settles
      // near 3/8 of the square of one step's change of ‖q‖²; bounded only for step angles up to
      // first_order_step_angle (the caller checks), by first_order_runge_kutta above.
      return family == Family::lie_group ? corrected<T>
                                         : corrected<T> + first_order_runge_kutta(step_angle);
    case PolicyKind::periodic:
      if (since_correction == 0) return corrected<T>;
      return family == Family::lie_group
                 ? corrected<T> + static_cast<T>(since_correction) * lie_step_drift<T>
                 : unbounded;
    case PolicyKind::threshold:
      // |‖q‖² − 1| ≤ threshold after the policy, so | ‖q‖ − 1 | ≤ threshold (plus rounding).
      return threshold + corrected<T>;
  }
  return unbounded;
}

template <class T>
bool same_bits(const T& a, const T& b) {
  return std::memcmp(&a, &b, sizeof(T)) == 0;
}

// A time step: mostly in (0, max_step], sometimes just over it, zero, negative or not finite.
template <class T>
T decode_dt(ByteReader& in, T max_step) {
  const std::uint8_t kind = in.u8();
  if (kind < 208) return max_step * (static_cast<T>(in.u16()) + T(1)) / T(65536);
  switch (kind % 6) {
    case 0:
      return max_step * (T(1) + T(1e-3) * static_cast<T>(in.u8() + 1));  // a gap
    case 1:
      return T(0);
    case 2:
      return -max_step;
    case 3:
      return std::numeric_limits<T>::quiet_NaN();
    case 4:
      return std::numeric_limits<T>::infinity();
    default:
      return in.raw<T>();
  }
}

template <class T>
Vector3<T> decode_vector(ByteReader& in, T scale) {
  const T x = in.mostly_scaled(scale);
  const T y = in.mostly_scaled(scale);
  const T z = in.mostly_scaled(scale);
  return {x, y, z};
}

// A unit quaternion from bytes (the identity if the four fractions are all zero).
template <class T>
Quaternion<T> decode_attitude(ByteReader& in) {
  const T w = in.signed_fraction<T>();
  const T x = in.signed_fraction<T>();
  const T y = in.signed_fraction<T>();
  const T z = in.signed_fraction<T>();
  const Quaternion<T> q{w, x, y, z};
  return squared_norm(q) > T(1e-6) ? normalized(q) : Quaternion<T>::identity();
}

// Offset of the counters inside the propagator (private member; found through its accessor).
template <class P>
std::size_t counters_offset(const P& p) {
  return static_cast<std::size_t>(reinterpret_cast<const unsigned char*>(&p.counters()) -
                                  reinterpret_cast<const unsigned char*>(&p));
}

std::uint64_t rejection_counter(const PropagationCounters& c, Status s) {
  switch (s) {
    case Status::non_finite:
      return c.rejected_non_finite;
    case Status::non_positive_step:
      return c.rejected_non_positive_step;
    case Status::step_too_long:
      return c.rejected_step_too_long;
    case Status::over_range:
      return c.rejected_over_range;
    case Status::no_tick_period:
      return c.rejected_no_tick_period;
    case Status::ok:
    case Status::waiting_for_samples:
      break;
  }
  return 0;
}

// The compensated accumulation (compensated_accumulation.hpp) scales its pair by the policy's
// factor (renormalization.hpp `scaling`: f and f − 1 to a few u·(f + |f − 1|), at most as far
// from the norm the policy's apply reaches as apply's own rounding; far from the unit sphere both
// words are scaled and renormalized, ≤ 2u), adds κ·q_hi with four double-word additions (≤ 2u²
// each), and its public attitude fl(q_hi + q_lo) rounds once more (≤ u): 6 ε on top of the plain
// tolerance, with margin. Its per-step drift without a policy is below the plain one (it rounds
// q ⊗ δ, of size |δ|, not q).
template <class T>
constexpr T compensated_extra = T(6) * eps<T>;

template <class T, class Stepper, class Accumulation, class Policy>
void run(ByteReader& in, const Setup<T>& setup, Policy policy, PolicyKind kind, Family family,
         T threshold) {
  using P = Propagator<T, Stepper, Policy, Accumulation>;
  static_assert(std::is_trivially_copyable<P>::value, "the whole state is compared with memcmp");
  constexpr bool rate_function = Stepper::layout == SampleLayout::rate_function;
  constexpr bool delta_angles = carries_delta_angles(Stepper::layout);

  // Zeroed storage, so that padding bytes compare equal between snapshots.
  alignas(P) unsigned char storage[sizeof(P)];
  std::memset(storage, 0, sizeof storage);
  P* p =
      ::new (static_cast<void*>(storage)) P(setup.initial, setup.limits, setup.tick_period, policy);
  const std::size_t counters_at = counters_offset(*p);
  const T max_rate = setup.limits.max_rate;
  const T max_step = setup.limits.max_step;

  // The largest step angle (rad) valid input allows: every axis at the gyro range over the
  // longest step, which spans periods_per_step sample periods.
  const T step_angle = std::sqrt(T(3)) * max_rate * max_step *
                       static_cast<T>(periods_per_step(Stepper::layout, Stepper::window));
  std::uint64_t since_anchor = 0;
  std::uint64_t since_correction = 0;
  bool unchecked_since_anchor = false;  // an accepted step on input the bounds do not cover
  for (int ops = 0; ops < 2048 && !in.empty(); ++ops) {
    unsigned char before[sizeof(P)];
    std::memcpy(before, storage, sizeof(P));
    const PropagationCounters c0 = p->counters();
    const Quaternion<T> attitude0 = p->attitude();
    const std::uint64_t ticks0 = p->elapsed_ticks();
    const std::uint8_t op = in.u8() % 8;

    Status status = Status::ok;
    bool pushed = false;  // push(): a sample that is counted when accepted
    bool reset = false;
    bool valid_rates = true;  // false when a rate function leaves the gyro range (unchecked input)
    std::uint32_t ticks = 0;
    bool by_ticks = false;
    Quaternion<T> anchor{};

    if (op == 6) {
      anchor = decode_attitude<T>(in);
      p->reset(anchor);
      reset = true;
    } else if constexpr (rate_function) {
      // rate_at(τ): linear from a to b over the step; sometimes NaN or beyond range at τ = dt.
      const T dt = decode_dt(in, max_step);
      const Vector3<T> a = decode_vector(in, max_rate);
      const Vector3<T> b = decode_vector(in, max_rate);
      for (const T c : {a.x, a.y, a.z, b.x, b.y, b.z}) {
        if (!(std::fabs(c) <= max_rate)) valid_rates = false;
      }
      const auto rate_at = [a, b, dt](T tau) {
        const T f = tau / dt;
        return Vector3<T>{a.x + (b.x - a.x) * f, a.y + (b.y - a.y) * f, a.z + (b.z - a.z) * f};
      };
      status = p->advance(rate_at, dt);
    } else {
      if (op == 5) {
        by_ticks = true;
        const std::uint8_t k = in.u8();
        ticks = k < 240 ? static_cast<std::uint32_t>(k % 8) : in.u32();
      }
      const T dt = by_ticks ? static_cast<T>(ticks) * setup.tick_period : decode_dt(in, max_step);
      // Delta-angles in range are at most max_rate·dt per axis.
      const T scale = delta_angles
                          ? max_rate * (std::fabs(dt) <= max_step ? std::fabs(dt) : max_step)
                          : max_rate;
      const Vector3<T> sample = decode_vector(in, scale);
      status = by_ticks ? p->push(sample, Ticks{ticks}) : p->push(sample, dt);
      pushed = true;
    }

    const PropagationCounters& c1 = p->counters();
    HALFSPIN_FUZZ_REQUIRE(c1.steps >= c0.steps && c1.discarded_samples >= c0.discarded_samples);
    if (reset) {
      HALFSPIN_FUZZ_REQUIRE(same_bits(p->attitude(), anchor));
      HALFSPIN_FUZZ_REQUIRE(c1.samples_accepted == c0.samples_accepted && c1.steps == c0.steps &&
                            c1.rejected() == c0.rejected());
      since_anchor = 0;
      since_correction = 0;
      unchecked_since_anchor = false;
      continue;
    }
    if (is_rejection(status)) {
      // Exactly its class counted, nothing else.
      HALFSPIN_FUZZ_REQUIRE(rejection_counter(c1, status) == rejection_counter(c0, status) + 1);
      HALFSPIN_FUZZ_REQUIRE(c1.rejected() == c0.rejected() + 1);
      HALFSPIN_FUZZ_REQUIRE(c1.samples_accepted == c0.samples_accepted && c1.steps == c0.steps &&
                            c1.discarded_samples == c0.discarded_samples);
      // Everything outside the counters bit-identical; a gap may set one flag byte to 1.
      int changed = 0;
      for (std::size_t i = 0; i < sizeof(P); ++i) {
        if (i >= counters_at && i < counters_at + sizeof(PropagationCounters)) continue;
        if (storage[i] != before[i]) {
          ++changed;
          HALFSPIN_FUZZ_REQUIRE(status == Status::step_too_long && before[i] == 0 &&
                                storage[i] == 1);
        }
      }
      HALFSPIN_FUZZ_REQUIRE(changed <= 1);
      continue;
    }
    // Accepted.
    HALFSPIN_FUZZ_REQUIRE(c1.rejected() == c0.rejected());
    HALFSPIN_FUZZ_REQUIRE(c1.samples_accepted == c0.samples_accepted + (pushed ? 1u : 0u));
    HALFSPIN_FUZZ_REQUIRE(c1.steps == c0.steps + (status == Status::ok ? 1u : 0u));
    HALFSPIN_FUZZ_REQUIRE(p->elapsed_ticks() == ticks0 + ticks);
    if (status == Status::waiting_for_samples) {
      HALFSPIN_FUZZ_REQUIRE(!rate_function);
      HALFSPIN_FUZZ_REQUIRE(same_bits(p->attitude(), attitude0));
      continue;
    }
    HALFSPIN_FUZZ_REQUIRE(status == Status::ok);
    ++since_anchor;
    if constexpr (std::is_same<Policy, PeriodicRenormalization<ExactRenormalization>>::value) {
      since_correction = p->renormalization().count;
    }
    const Quaternion<T>& q = p->attitude();
    HALFSPIN_FUZZ_REQUIRE(is_finite(q));
    HALFSPIN_FUZZ_REQUIRE(std::isfinite(p->elapsed_seconds()));
    const T estimate = p->last_error_estimate();
    HALFSPIN_FUZZ_REQUIRE(estimate >= T(0) && std::isfinite(estimate));
    // The norm: what the policy documents, for valid input (a rate function beyond the gyro range
    // is input the propagator cannot check) and, for Runge–Kutta with first-order
    // renormalization, step angles up to first_order_step_angle. Elsewhere only finiteness is
    // promised (checked above); see the fuzz README for what happens there.
    // A step on out-of-range rates leaves a norm the bounds do not cover; the next reset
    // re-anchors (found by the bounded run: a first-order policy still converging from it).
    if (!valid_rates) unchecked_since_anchor = true;
    const bool documented = !unchecked_since_anchor &&
                            !(kind == PolicyKind::first_order && family == Family::runge_kutta &&
                              step_angle > first_order_step_angle<T>);
    const T extra =
        std::is_same<Accumulation, CompensatedAccumulation>::value ? compensated_extra<T> : T(0);
    const T tolerance = documented ? norm_tolerance(kind, family, since_anchor, since_correction,
                                                    threshold, step_angle) +
                                         extra
                                   : std::numeric_limits<T>::infinity();
    if (std::isfinite(tolerance)) {
      const T norm_error = std::fabs(norm(q) - T(1));
      if (!(norm_error <= tolerance)) {
        std::fprintf(stderr,
                     "norm error %.9g above tolerance %.9g (%s, policy %d, step angle %.9g)\n",
                     static_cast<double>(norm_error), static_cast<double>(tolerance), Stepper::name,
                     static_cast<int>(kind), static_cast<double>(step_angle));
      }
      HALFSPIN_FUZZ_REQUIRE(norm_error <= tolerance);
    }
  }
}

template <class T, class Stepper, class A>
void with_policy(ByteReader& in, const Setup<T>& setup, Family family) {
  const std::uint8_t choice = in.u8();
  const std::uint8_t parameter = in.u8();
  switch (choice % 5) {
    case 0:
      run<T, Stepper, A>(in, setup, NoRenormalization{}, PolicyKind::none, family, T(0));
      break;
    case 1:
      run<T, Stepper, A>(in, setup, ExactRenormalization{}, PolicyKind::exact, family, T(0));
      break;
    case 2:
      run<T, Stepper, A>(in, setup, FirstOrderRenormalization{}, PolicyKind::first_order, family,
                         T(0));
      break;
    case 3: {
      PeriodicRenormalization<ExactRenormalization> periodic{};
      periodic.period = 1u + parameter % 64u;
      run<T, Stepper, A>(in, setup, periodic, PolicyKind::periodic, family, T(0));
      break;
    }
    default: {
      // threshold in [10 ε, 1e-2] (a threshold below rounding would fire every step anyway)
      ThresholdRenormalization<T, ExactRenormalization> threshold{};
      const T lo = std::log10(T(10) * eps<T>);
      threshold.threshold = std::pow(T(10), lo + (T(-2) - lo) * static_cast<T>(parameter) / T(255));
      run<T, Stepper, A>(in, setup, threshold, PolicyKind::threshold, family, threshold.threshold);
      break;
    }
  }
}

// Explicit Runge–Kutta steppers (embedded pairs included) add their truncation error to the norm;
// every other family ends its step with a unit increment exp(φ/2) (family data, not a list).
template <class Family>
struct is_runge_kutta_family : std::false_type {};
template <class Tableau, SampleLayout L, std::size_t W>
struct is_runge_kutta_family<ExplicitRungeKutta<Tableau, L, W>> : std::true_type {};

template <class T, class A>
void with_stepper(ByteReader& in) {
  // The stepper by its stable catalogue id (stepper_catalogue.hpp), so that stored corpora and
  // regression inputs keep their meaning when steppers are added; a byte that names no stepper
  // ends the input.
  const std::uint8_t id = in.u8();
  Setup<T> setup{};
  // Gyro range 0.01–1000 rad/s per axis; longest step 1 µs – 1 s; tick 0.1 µs – 0.1 s.
  setup.limits.max_rate = in.log_uniform<T>(T(-2), T(3));
  setup.limits.max_step = in.log_uniform<T>(T(-6), T(0));
  setup.tick_period = in.log_uniform<T>(T(-7), T(-1));
  setup.initial = decode_attitude<T>(in);
  StepperCatalogue::visit_id(id, [&](auto entry) {
    using S = typename decltype(entry)::stepper;
    constexpr Family family =
        is_runge_kutta_family<typename S::family>::value ? Family::runge_kutta : Family::lie_group;
    with_policy<T, S, A>(in, setup, family);
  });
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  ByteReader in(data, size);
  const std::uint8_t scalar_and_accumulation = in.u8();
  const bool compensated = (scalar_and_accumulation & 2u) != 0;
  if (scalar_and_accumulation % 2 == 0) {
    compensated ? with_stepper<float, CompensatedAccumulation>(in)
                : with_stepper<float, PlainAccumulation>(in);
  } else {
    compensated ? with_stepper<double, CompensatedAccumulation>(in)
                : with_stepper<double, PlainAccumulation>(in);
  }
  return 0;
}
