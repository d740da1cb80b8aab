// The C interface (halfspin_c.h) over the C++ Propagator: the one C++ translation unit that ships
// with the package (target halfspin::c, or add this file to a firmware build).
//
// Each configuration is one Propagator<T, Stepper, Renormalization, Accumulation> instantiation,
// reached through a constant table of functions per scalar (in flash on a microcontroller). A
// propagator's storage holds a small header (a marker and the table index) and the C++ object,
// placement-constructed; the C functions never allocate, never throw and check every argument,
// so no call from C reaches undefined behaviour through a bad configuration, a null pointer or
// storage that init did not set up. The float and double functions and tables are separate, so
// a float-only firmware linked with --gc-sections keeps no double code.

#include "halfspin_c.h"

#include <array>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <limits>
#include <new>
#include <type_traits>

#include "halfspin/core/quaternion.hpp"
#include "halfspin/core/vector3.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "halfspin/propagation/renormalization.hpp"
#include "halfspin/propagation/status.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "halfspin/propagation/stepper_traits.hpp"
#include "halfspin/representations/euler_angles.hpp"

namespace {

using halfspin::CompensatedAccumulation;
using halfspin::ExactRenormalization;
using halfspin::FirstOrderRenormalization;
using halfspin::GyroLimits;
using halfspin::PlainAccumulation;
using halfspin::PropagationCounters;
using halfspin::Quaternion;
using halfspin::Status;
using halfspin::Ticks;
using halfspin::Vector3;

// ---- The C enums agree with the library ---------------------------------------------------------

static_assert(HALFSPIN_OK == static_cast<int>(Status::ok), "status values match Status");
static_assert(HALFSPIN_WAITING_FOR_SAMPLES == static_cast<int>(Status::waiting_for_samples), "");
static_assert(HALFSPIN_NON_FINITE == static_cast<int>(Status::non_finite), "");
static_assert(HALFSPIN_NON_POSITIVE_STEP == static_cast<int>(Status::non_positive_step), "");
static_assert(HALFSPIN_STEP_TOO_LONG == static_cast<int>(Status::step_too_long), "");
static_assert(HALFSPIN_OVER_RANGE == static_cast<int>(Status::over_range), "");
static_assert(HALFSPIN_NO_TICK_PERIOD == static_cast<int>(Status::no_tick_period), "");
static_assert(HALFSPIN_EULER_ZYX == static_cast<int>(halfspin::EulerSequence::zyx), "");
static_assert(HALFSPIN_EULER_ZYZ == static_cast<int>(halfspin::EulerSequence::zyz), "");
static_assert(HALFSPIN_EULER_XYX == static_cast<int>(halfspin::EulerSequence::xyx), "");

// The catalogue id of a stepper type (−1 if it is not catalogued).
template <class Stepper, class... Entries>
constexpr int catalogue_id(halfspin::TypeList<Entries...> /*entries*/) noexcept {
  int id = -1;
  static_cast<void>(((std::is_same<typename Entries::stepper, Stepper>::value
                          ? (id = static_cast<int>(Entries::id), true)
                          : false) ||
                     ...));
  return id;
}
template <class Stepper>
constexpr int catalogue_id() noexcept {
  return catalogue_id<Stepper>(halfspin::StepperCatalogue::entries{});
}

// One C stepper value and its C++ type; the value must be the catalogue's id.
template <halfspin_stepper Value, class Stepper>
struct StepperChoice {
  static constexpr halfspin_stepper value = Value;
  using type = Stepper;
  static_assert(catalogue_id<Stepper>() == static_cast<int>(Value),
                "a C stepper value is the stepper's catalogue id");
  static_assert(Stepper::layout != halfspin::SampleLayout::rate_function,
                "the C interface takes samples, not rate functions");
  static constexpr halfspin_input_kind input = halfspin::carries_delta_angles(Stepper::layout)
                                                   ? HALFSPIN_INPUT_DELTA_ANGLE
                                                   : HALFSPIN_INPUT_RATE;
};

// The configurations' steppers (c/README.md lists them: keep it in step).
template <class... Choices>
struct ChoiceList {
  static constexpr std::size_t size = sizeof...(Choices);
};
using Steppers = ChoiceList<
    StepperChoice<HALFSPIN_EXPONENTIAL_MAP_HOLD_END, halfspin::ExponentialMapHoldEnd>,
    StepperChoice<HALFSPIN_EXPONENTIAL_MAP_MIDPOINT_MEAN, halfspin::ExponentialMapMidpointMean>,
    StepperChoice<HALFSPIN_MAGNUS_4, halfspin::Magnus4>,
    StepperChoice<HALFSPIN_CONING_1_SAMPLE, halfspin::Coning1Sample>,
    StepperChoice<HALFSPIN_CONING_2_SAMPLE, halfspin::Coning2Sample>,
    StepperChoice<HALFSPIN_CONING_3_SAMPLE, halfspin::Coning3Sample>,
    StepperChoice<HALFSPIN_CONING_4_SAMPLE, halfspin::Coning4Sample>>;

template <class Policy>
constexpr halfspin_renormalization renormalization_value() noexcept {
  return std::is_same<Policy, ExactRenormalization>::value ? HALFSPIN_RENORMALIZATION_EXACT
                                                           : HALFSPIN_RENORMALIZATION_FIRST_ORDER;
}
template <class Policy>
constexpr halfspin_accumulation accumulation_value() noexcept {
  return std::is_same<Policy, CompensatedAccumulation>::value ? HALFSPIN_ACCUMULATION_COMPENSATED
                                                              : HALFSPIN_ACCUMULATION_PLAIN;
}

// ---- One configuration's functions --------------------------------------------------------------

template <class T>
struct Operations {
  halfspin_configuration configuration;  // accumulation PLAIN or COMPENSATED, never DEFAULT
  halfspin_input_kind input;
  std::size_t size;
  std::size_t alignment;
  void (*construct)(void* where, const Quaternion<T>& initial, const GyroLimits<T>& limits,
                    T tick_period) noexcept;
  Status (*push)(void* object, const Vector3<T>& sample, T dt) noexcept;
  Status (*push_ticks)(void* object, const Vector3<T>& sample, Ticks ticks) noexcept;
  void (*reset)(void* object, const Quaternion<T>& attitude) noexcept;
  Quaternion<T> (*attitude)(const void* object) noexcept;
  PropagationCounters (*counters)(const void* object) noexcept;
  std::uint64_t (*elapsed_ticks)(const void* object) noexcept;
  T (*elapsed_seconds)(const void* object) noexcept;
};

template <class T, class Choice, class Renormalization, class Accumulation>
struct Binding {
  using P = halfspin::Propagator<T, typename Choice::type, Renormalization, Accumulation>;
  static_assert(std::is_trivially_destructible<P>::value,
                "storage is reused without a destructor call");
  static_assert(std::is_trivially_copyable<P>::value,
                "halfspin_c.h promises that copying the storage copies the propagator");

  static P* object(void* where) noexcept { return std::launder(static_cast<P*>(where)); }
  static const P* object(const void* where) noexcept {
    return std::launder(static_cast<const P*>(where));
  }
  static void construct(void* where, const Quaternion<T>& initial, const GyroLimits<T>& limits,
                        T tick_period) noexcept {
    ::new (where) P(initial, limits, tick_period, Renormalization{});
  }
  static Status push(void* where, const Vector3<T>& sample, T dt) noexcept {
    return object(where)->push(sample, dt);
  }
  static Status push_ticks(void* where, const Vector3<T>& sample, Ticks ticks) noexcept {
    return object(where)->push(sample, ticks);
  }
  static void reset(void* where, const Quaternion<T>& attitude) noexcept {
    object(where)->reset(attitude);
  }
  static Quaternion<T> attitude(const void* where) noexcept { return object(where)->attitude(); }
  static PropagationCounters counters(const void* where) noexcept {
    return object(where)->counters();
  }
  static std::uint64_t elapsed_ticks(const void* where) noexcept {
    return object(where)->elapsed_ticks();
  }
  static T elapsed_seconds(const void* where) noexcept { return object(where)->elapsed_seconds(); }

  static constexpr Operations<T> operations() noexcept {
    return {{Choice::value, renormalization_value<Renormalization>(),
             accumulation_value<Accumulation>()},
            Choice::input,
            sizeof(P),
            alignof(P),
            &construct,
            &push,
            &push_ticks,
            &reset,
            &attitude,
            &counters,
            &elapsed_ticks,
            &elapsed_seconds};
  }
};

// Every stepper × {first order, exact} × {plain, compensated}, policies outermost.
template <class T, class... Choices>
constexpr auto every_candidate(ChoiceList<Choices...> /*choices*/) noexcept {
  return std::array<Operations<T>, 4 * sizeof...(Choices)>{
      {Binding<T, Choices, FirstOrderRenormalization, PlainAccumulation>::operations()...,
       Binding<T, Choices, FirstOrderRenormalization, CompensatedAccumulation>::operations()...,
       Binding<T, Choices, ExactRenormalization, PlainAccumulation>::operations()...,
       Binding<T, Choices, ExactRenormalization, CompensatedAccumulation>::operations()...}};
}

// The build's selection (halfspin_c.h: HALFSPIN_C_STEPPERS, HALFSPIN_C_RENORMALIZATIONS,
// HALFSPIN_C_ACCUMULATIONS, bit masks; all listed configurations by default). A configuration left
// out is neither instantiated nor linked, and init refuses it as unsupported.
constexpr unsigned long every_value = ~0UL;
#ifdef HALFSPIN_C_STEPPERS
constexpr unsigned long selected_steppers = HALFSPIN_C_STEPPERS;
#else
constexpr unsigned long selected_steppers = every_value;
#endif
#ifdef HALFSPIN_C_RENORMALIZATIONS
constexpr unsigned long selected_renormalizations = HALFSPIN_C_RENORMALIZATIONS;
#else
constexpr unsigned long selected_renormalizations = every_value;
#endif
#ifdef HALFSPIN_C_ACCUMULATIONS
constexpr unsigned long selected_accumulations = HALFSPIN_C_ACCUMULATIONS;
#else
constexpr unsigned long selected_accumulations = every_value;
#endif

template <class T>
constexpr bool selected(const Operations<T>& op) noexcept {
  const auto bit = [](int value) { return value >= 0 && value < 32 ? 1UL << value : 0UL; };
  return (selected_steppers & bit(static_cast<int>(op.configuration.stepper))) != 0 &&
         (selected_renormalizations & bit(static_cast<int>(op.configuration.renormalization))) !=
             0 &&
         (selected_accumulations & bit(static_cast<int>(op.configuration.accumulation))) != 0;
}

template <class T>
constexpr std::size_t selected_count() noexcept {
  std::size_t n = 0;
  for (const Operations<T>& op : every_candidate<T>(Steppers{})) {
    if (selected(op)) {
      ++n;
    }
  }
  return n;
}

// Only the selected candidates' functions are odr-used (the others are compile-time values in a
// constant expression), so only they are emitted.
template <class T>
constexpr std::array<Operations<T>, selected_count<T>()> make_table() noexcept {
  std::array<Operations<T>, selected_count<T>()> table{};
  std::size_t n = 0;
  for (const Operations<T>& op : every_candidate<T>(Steppers{})) {
    if (selected(op)) {
      table[n++] = op;
    }
  }
  return table;
}

template <class T>
struct Table {
  static constexpr auto entries = make_table<T>();
};
static_assert(!Table<float>::entries.empty(),
              "HALFSPIN_C_STEPPERS, _RENORMALIZATIONS and _ACCUMULATIONS leave no configuration");

// ---- Storage: a header, then the propagator ----------------------------------------------------

constexpr std::uint32_t initialized_marker = 0x68733163U;  // set by init, checked by every call
struct Header {
  std::uint32_t marker;
  std::uint32_t index;  // into Table<T>::entries
};
constexpr std::size_t object_offset = 8;
static_assert(sizeof(Header) <= object_offset, "the header fits before the propagator");

template <class T>
struct Storage;
template <>
struct Storage<float> {
  using type = halfspin_propagator_f;
  static constexpr std::size_t bytes = HALFSPIN_PROPAGATOR_F_STORAGE;
};
template <>
struct Storage<double> {
  using type = halfspin_propagator_d;
  static constexpr std::size_t bytes = HALFSPIN_PROPAGATOR_D_STORAGE;
};

template <class T>
constexpr bool every_configuration_fits() noexcept {
  using S = typename Storage<T>::type;
  if (sizeof(S) < Storage<T>::bytes) {
    return false;
  }
  for (const Operations<T>& op : every_candidate<T>(Steppers{})) {  // selected or not
    if (object_offset + op.size > Storage<T>::bytes || op.alignment > alignof(S) ||
        object_offset % op.alignment != 0) {
      return false;
    }
  }
  return true;
}
static_assert(every_configuration_fits<float>(),
              "raise HALFSPIN_PROPAGATOR_F_STORAGE: a float configuration does not fit");
static_assert(every_configuration_fits<double>(),
              "raise HALFSPIN_PROPAGATOR_D_STORAGE: a double configuration does not fit");

// The storage's bytes: the header at 0, the propagator at object_offset. The C union is an opaque
// byte array whose other members only align it; only these two functions reach into it.
template <class S>
unsigned char* bytes_of(S* p) noexcept {
  return &p->storage.bytes[0];  // NOLINT(cppcoreguidelines-pro-type-union-access): see above
}
template <class S>
const unsigned char* bytes_of(const S* p) noexcept {
  return &p->storage.bytes[0];  // NOLINT(cppcoreguidelines-pro-type-union-access): see above
}
// Where the propagator lives (placement-constructed there by init; every_configuration_fits).
template <class S>
void* object_in(S* p) noexcept {
  return bytes_of(p) + object_offset;  // NOLINT(cppcoreguidelines-pro-bounds-pointer-arithmetic)
}
template <class S>
const void* object_in(const S* p) noexcept {
  return bytes_of(p) + object_offset;  // NOLINT(cppcoreguidelines-pro-bounds-pointer-arithmetic)
}

// A C array of N values in, or out: copied whole, bit for bit.
template <std::size_t N, class T>
std::array<T, N> from_c(const T* values) noexcept {
  std::array<T, N> a{};
  std::memcpy(a.data(), values, sizeof a);
  return a;
}
template <std::size_t N, class T>
void to_c(const std::array<T, N>& a, T* out) noexcept {
  std::memcpy(out, a.data(), sizeof a);
}
template <class T>
Quaternion<T> quaternion_from_c(const T* wxyz) noexcept {
  const std::array<T, 4> q = from_c<4>(wxyz);
  return {q[0], q[1], q[2], q[3]};
}
template <class T>
Vector3<T> vector_from_c(const T* xyz) noexcept {
  const std::array<T, 3> v = from_c<3>(xyz);
  return {v[0], v[1], v[2]};
}

// The configuration's operations if *p was set up by init, else null.
template <class T>
const Operations<T>* operations_of(const typename Storage<T>::type* p) noexcept {
  if (p == nullptr) {
    return nullptr;
  }
  Header header{};
  std::memcpy(&header, bytes_of(p), sizeof header);
  if (header.marker != initialized_marker || header.index >= Table<T>::entries.size()) {
    return nullptr;
  }
  return &Table<T>::entries[header.index];
}

template <class T>
halfspin_status not_set_up(const typename Storage<T>::type* p) noexcept {
  return p == nullptr ? HALFSPIN_INVALID_ARGUMENT : HALFSPIN_NOT_INITIALIZED;
}

// An attitude init and reset accept: ‖q‖² positive and finite (so no NaN or infinity), as the
// propagator requires of its state. Not required to be unit: the C++ constructor takes it as given.
template <class T>
bool usable_attitude(const Quaternion<T>& q) noexcept {
  const T n2 = q.w * q.w + q.x * q.x + q.y * q.y + q.z * q.z;
  return n2 > T(0) && n2 <= std::numeric_limits<T>::max();  // false for NaN too
}

template <class T>
constexpr halfspin_accumulation resolved(halfspin_accumulation a) noexcept {
  if (a != HALFSPIN_ACCUMULATION_DEFAULT) {
    return a;
  }
  return std::is_same<halfspin::DefaultAccumulation<T>, CompensatedAccumulation>::value
             ? HALFSPIN_ACCUMULATION_COMPENSATED
             : HALFSPIN_ACCUMULATION_PLAIN;
}

template <class T>
halfspin_status init(typename Storage<T>::type* p, halfspin_configuration configuration,
                     const T* initial, T max_rate, T max_step, T tick_period) noexcept {
  if (p == nullptr || initial == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const Quaternion<T> q = quaternion_from_c(initial);
  if (!usable_attitude(q)) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const halfspin_accumulation accumulation = resolved<T>(configuration.accumulation);
  for (std::size_t i = 0; i < Table<T>::entries.size(); ++i) {
    const Operations<T>& op = Table<T>::entries[i];
    if (op.configuration.stepper == configuration.stepper &&
        op.configuration.renormalization == configuration.renormalization &&
        op.configuration.accumulation == accumulation) {
      op.construct(object_in(p), q, GyroLimits<T>{max_rate, max_step}, tick_period);
      const Header header{initialized_marker, static_cast<std::uint32_t>(i)};
      std::memcpy(bytes_of(p), &header, sizeof header);
      return HALFSPIN_OK;
    }
  }
  return HALFSPIN_UNSUPPORTED_CONFIGURATION;
}

// A sample over an interval in seconds (T) or in ticks (Ticks).
template <class T, class Interval>
halfspin_status push(typename Storage<T>::type* p, const T* sample, Interval interval,
                     halfspin_input_kind kind) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (sample == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  if (op->input != kind) {
    return HALFSPIN_WRONG_INPUT_KIND;
  }
  if constexpr (std::is_same<Interval, Ticks>::value) {
    return static_cast<halfspin_status>(
        op->push_ticks(object_in(p), vector_from_c(sample), interval));
  } else {
    return static_cast<halfspin_status>(op->push(object_in(p), vector_from_c(sample), interval));
  }
}

template <class T>
halfspin_status reset(typename Storage<T>::type* p, const T* attitude) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (attitude == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const Quaternion<T> q = quaternion_from_c(attitude);
  if (!usable_attitude(q)) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  op->reset(object_in(p), q);
  return HALFSPIN_OK;
}

template <class T>
halfspin_status attitude(const typename Storage<T>::type* p, T* out) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (out == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const Quaternion<T> q = op->attitude(object_in(p));
  to_c(std::array<T, 4>{{q.w, q.x, q.y, q.z}}, out);
  return HALFSPIN_OK;
}

template <class T>
halfspin_status euler_angles(const typename Storage<T>::type* p, halfspin_euler_sequence sequence,
                             T* out, int* out_near_singular) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  const int s = static_cast<int>(sequence);
  if (out == nullptr || out_near_singular == nullptr || s < 0 ||
      s > static_cast<int>(HALFSPIN_EULER_ZYZ)) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const halfspin::EulerDecomposition<T> e = halfspin::to_euler_angles(
      op->attitude(object_in(p)), static_cast<halfspin::EulerSequence>(s));
  to_c(std::array<T, 3>{{e.angles.first, e.angles.second, e.angles.third}}, out);
  *out_near_singular = e.near_singular ? 1 : 0;
  return HALFSPIN_OK;
}

template <class T>
halfspin_status counters(const typename Storage<T>::type* p, halfspin_counters* out) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (out == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  const void* object = object_in(p);
  const PropagationCounters c = op->counters(object);
  out->samples_accepted = c.samples_accepted;
  out->steps = c.steps;
  out->rejected_non_finite = c.rejected_non_finite;
  out->rejected_non_positive_step = c.rejected_non_positive_step;
  out->rejected_step_too_long = c.rejected_step_too_long;
  out->rejected_over_range = c.rejected_over_range;
  out->rejected_no_tick_period = c.rejected_no_tick_period;
  out->discarded_samples = c.discarded_samples;
  out->elapsed_ticks = op->elapsed_ticks(object);
  return HALFSPIN_OK;
}

template <class T>
halfspin_status elapsed_seconds(const typename Storage<T>::type* p, T* out) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (out == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  *out = op->elapsed_seconds(object_in(p));
  return HALFSPIN_OK;
}

template <class T>
halfspin_status configuration_of(const typename Storage<T>::type* p,
                                 halfspin_configuration* out) noexcept {
  const Operations<T>* op = operations_of<T>(p);
  if (op == nullptr) {
    return not_set_up<T>(p);
  }
  if (out == nullptr) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  *out = op->configuration;
  return HALFSPIN_OK;
}

// Name and input kind of a listed stepper.
struct StepperFacts {
  halfspin_stepper value;
  const char* name;
  halfspin_input_kind input;
};
template <class... Choices>
constexpr std::array<StepperFacts, sizeof...(Choices)> stepper_facts(
    ChoiceList<Choices...> /*choices*/) noexcept {
  return {{{Choices::value, Choices::type::name, Choices::input}...}};
}
constexpr auto listed_steppers = stepper_facts(Steppers{});

const StepperFacts* facts_of(halfspin_stepper stepper) noexcept {
  for (const StepperFacts& f : listed_steppers) {
    if (f.value == stepper) {
      return &f;
    }
  }
  return nullptr;
}

}  // namespace

extern "C" {

const char* halfspin_status_name(halfspin_status status) {
  switch (status) {
    case HALFSPIN_OK:
    case HALFSPIN_WAITING_FOR_SAMPLES:
    case HALFSPIN_NON_FINITE:
    case HALFSPIN_NON_POSITIVE_STEP:
    case HALFSPIN_STEP_TOO_LONG:
    case HALFSPIN_OVER_RANGE:
    case HALFSPIN_NO_TICK_PERIOD:
      return halfspin::status_name(static_cast<Status>(status));
    case HALFSPIN_INVALID_ARGUMENT:
      return "invalid_argument";
    case HALFSPIN_UNSUPPORTED_CONFIGURATION:
      return "unsupported_configuration";
    case HALFSPIN_WRONG_INPUT_KIND:
      return "wrong_input_kind";
    case HALFSPIN_NOT_INITIALIZED:
      return "not_initialized";
  }
  return "unknown";
}

int halfspin_is_rejection(halfspin_status status) {
  return status != HALFSPIN_OK && status != HALFSPIN_WAITING_FOR_SAMPLES ? 1 : 0;
}

const char* halfspin_stepper_name(halfspin_stepper stepper) {
  const StepperFacts* f = facts_of(stepper);
  return f != nullptr ? f->name : "unknown";
}

halfspin_input_kind halfspin_stepper_input(halfspin_stepper stepper) {
  const StepperFacts* f = facts_of(stepper);
  return f != nullptr ? f->input : HALFSPIN_INPUT_UNKNOWN;
}

size_t halfspin_configuration_count(void) { return Table<float>::entries.size(); }

halfspin_status halfspin_configuration_at(size_t index, halfspin_configuration* out) {
  if (out == nullptr || index >= Table<float>::entries.size()) {
    return HALFSPIN_INVALID_ARGUMENT;
  }
  *out = Table<float>::entries[index].configuration;
  return HALFSPIN_OK;
}

halfspin_status halfspin_init_f(halfspin_propagator_f* p, halfspin_configuration configuration,
                                const float initial_wxyz[4], float max_rate, float max_step,
                                float tick_period) {
  return init<float>(p, configuration, initial_wxyz, max_rate, max_step, tick_period);
}
halfspin_status halfspin_push_rate_f(halfspin_propagator_f* p, const float rate[3], float dt) {
  return push<float>(p, rate, dt, HALFSPIN_INPUT_RATE);
}
halfspin_status halfspin_push_delta_angle_f(halfspin_propagator_f* p, const float delta_angle[3],
                                            float dt) {
  return push<float>(p, delta_angle, dt, HALFSPIN_INPUT_DELTA_ANGLE);
}
halfspin_status halfspin_push_rate_ticks_f(halfspin_propagator_f* p, const float rate[3],
                                           uint32_t ticks) {
  return push<float>(p, rate, Ticks{ticks}, HALFSPIN_INPUT_RATE);
}
halfspin_status halfspin_push_delta_angle_ticks_f(halfspin_propagator_f* p,
                                                  const float delta_angle[3], uint32_t ticks) {
  return push<float>(p, delta_angle, Ticks{ticks}, HALFSPIN_INPUT_DELTA_ANGLE);
}
halfspin_status halfspin_reset_f(halfspin_propagator_f* p, const float attitude_wxyz[4]) {
  return reset<float>(p, attitude_wxyz);
}
halfspin_status halfspin_attitude_f(const halfspin_propagator_f* p, float out_wxyz[4]) {
  return attitude<float>(p, out_wxyz);
}
halfspin_status halfspin_euler_angles_f(const halfspin_propagator_f* p,
                                        halfspin_euler_sequence sequence, float out_angles[3],
                                        int* out_near_singular) {
  return euler_angles<float>(p, sequence, out_angles, out_near_singular);
}
halfspin_status halfspin_counters_f(const halfspin_propagator_f* p, halfspin_counters* out) {
  return counters<float>(p, out);
}
halfspin_status halfspin_elapsed_seconds_f(const halfspin_propagator_f* p, float* out) {
  return elapsed_seconds<float>(p, out);
}
halfspin_status halfspin_configuration_f(const halfspin_propagator_f* p,
                                         halfspin_configuration* out) {
  return configuration_of<float>(p, out);
}

halfspin_status halfspin_init_d(halfspin_propagator_d* p, halfspin_configuration configuration,
                                const double initial_wxyz[4], double max_rate, double max_step,
                                double tick_period) {
  return init<double>(p, configuration, initial_wxyz, max_rate, max_step, tick_period);
}
halfspin_status halfspin_push_rate_d(halfspin_propagator_d* p, const double rate[3], double dt) {
  return push<double>(p, rate, dt, HALFSPIN_INPUT_RATE);
}
halfspin_status halfspin_push_delta_angle_d(halfspin_propagator_d* p, const double delta_angle[3],
                                            double dt) {
  return push<double>(p, delta_angle, dt, HALFSPIN_INPUT_DELTA_ANGLE);
}
halfspin_status halfspin_push_rate_ticks_d(halfspin_propagator_d* p, const double rate[3],
                                           uint32_t ticks) {
  return push<double>(p, rate, Ticks{ticks}, HALFSPIN_INPUT_RATE);
}
halfspin_status halfspin_push_delta_angle_ticks_d(halfspin_propagator_d* p,
                                                  const double delta_angle[3], uint32_t ticks) {
  return push<double>(p, delta_angle, Ticks{ticks}, HALFSPIN_INPUT_DELTA_ANGLE);
}
halfspin_status halfspin_reset_d(halfspin_propagator_d* p, const double attitude_wxyz[4]) {
  return reset<double>(p, attitude_wxyz);
}
halfspin_status halfspin_attitude_d(const halfspin_propagator_d* p, double out_wxyz[4]) {
  return attitude<double>(p, out_wxyz);
}
halfspin_status halfspin_euler_angles_d(const halfspin_propagator_d* p,
                                        halfspin_euler_sequence sequence, double out_angles[3],
                                        int* out_near_singular) {
  return euler_angles<double>(p, sequence, out_angles, out_near_singular);
}
halfspin_status halfspin_counters_d(const halfspin_propagator_d* p, halfspin_counters* out) {
  return counters<double>(p, out);
}
halfspin_status halfspin_elapsed_seconds_d(const halfspin_propagator_d* p, double* out) {
  return elapsed_seconds<double>(p, out);
}
halfspin_status halfspin_configuration_d(const halfspin_propagator_d* p,
                                         halfspin_configuration* out) {
  return configuration_of<double>(p, out);
}

}  // extern "C"
