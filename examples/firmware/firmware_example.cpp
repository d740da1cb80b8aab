// Firmware example for the emulated MPS2 boards (Cortex-M4F / Cortex-M3 under qemu-system-arm): a
// fixed-rate attitude loop fed by a simulated gyro interrupt.
//
//  - The real SysTick timer of the core fires at 1 kHz. Its handler plays the IMU's data-ready
//    interrupt: it produces the delta-angle of the last millisecond of an invented motion (a
//    steady roll with a 40 Hz coning vibration, simulated_motion.hpp, computed in float) and puts
//    it in a single-producer/single-consumer ring buffer (spsc_ring.hpp).
//  - The main loop drains the ring and pushes each frame into a Propagator<float, Coning2Sample>
//    with its interval in timer ticks, and handles every Status code.
//  - The simulated IMU also injects faults: a NaN frame, an over-range frame, a repeated frame
//    (zero-tick interval) and a 20 ms dropout (a gap). Each must be rejected with its status.
//  - At the end it reports attitude, truth and counters over semihosting and returns 0 only if
//    the attitude is within the error budget of the motion's closed form and every fault was
//    rejected with the right status (qemu returns main's value as its exit code).
//
// Invented motion and faults for a demonstration; not flight software (see README.md).
#include <array>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <limits>

#include "halfspin/core/angle_between.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/propagator.hpp"
#include "simulated_motion.hpp"
#include "spsc_ring.hpp"

namespace {

using halfspin::Quaternion;
using halfspin::Status;
using halfspin::Vector3;

// ---------------------------------------------------------------------------------------------
// The core's system timer (Armv7-M architecture: SYST_CSR, SYST_RVR, SYST_CVR, SYST_CALIB at
// 0xE000E010..0xE000E01C; field layout from memory).
struct SysTickRegisters {
  volatile std::uint32_t control;      // CSR: bit 0 ENABLE, 1 TICKINT, 2 CLKSOURCE (1 = core clock)
  volatile std::uint32_t reload;       // RVR: the counter reloads with this; period = reload + 1
  volatile std::uint32_t current;      // CVR: any write clears it
  volatile std::uint32_t calibration;  // CALIB: bits 0–23 TENMS, 30 SKEW, 31 NOREF
};
SysTickRegisters& systick() { return *reinterpret_cast<SysTickRegisters*>(0xE000E010u); }
constexpr std::uint32_t systick_enable = 1u << 0;
constexpr std::uint32_t systick_interrupt = 1u << 1;

// What this example relies on, measured under qemu 7.2 (see README.md): SYST_CALIB reads
// 0x0000270F, i.e. a reference clock is present (NOREF = 0), TENMS = 9999 is exact (SKEW = 0):
// 10 000 reference ticks per 10 ms, a 1 MHz reference clock; the core clock (CLKSOURCE = 1) is
// 25 MHz. Driving the timer from the reference clock with a reload taken from TENMS needs no
// board-specific constant at all.
struct TimerSetup {
  bool usable;
  std::uint32_t reload;  // for a 1 ms period on the reference clock
  std::uint32_t tenms;
  bool noref;
  bool skew;
};
TimerSetup one_millisecond_from_calibration() {
  const std::uint32_t calib = systick().calibration;
  TimerSetup s{};
  s.tenms = calib & 0x00FFFFFFu;
  s.noref = (calib >> 31) != 0;
  s.skew = ((calib >> 30) & 1u) != 0;
  s.usable = !s.noref && !s.skew && s.tenms != 0 && (s.tenms + 1) % 10 == 0;
  s.reload = (s.tenms + 1) / 10 - 1;
  return s;
}

// ---------------------------------------------------------------------------------------------
// Semihosting (Arm semihosting specification: on M-profile, BKPT 0xAB with the operation in r0
// and its argument in r1). printf goes through newlib's rdimon; these two read the host's clock.
std::uint32_t semihosting(std::uint32_t operation, void* argument) {
  std::uint32_t result;
  __asm volatile("mov r0, %1\n\tmov r1, %2\n\tbkpt 0xab\n\tmov %0, r0"
                 : "=r"(result)
                 : "r"(operation), "r"(argument)
                 : "r0", "r1", "memory");
  return result;
}
// SYS_ELAPSED (0x30): host ticks since the program started; SYS_TICKFREQ (0x31): ticks per second.
// Unlike SYS_CLOCK (newlib's clock()), which qemu answers with its own CPU time, these follow the
// host's wall clock, which is what qemu's timers (no -icount) run on.
double host_seconds() {
  std::uint32_t block[2] = {0, 0};
  if (semihosting(0x30, block) != 0) {
    return -1.0;
  }
  const std::uint32_t frequency = semihosting(0x31, nullptr);
  const double ticks = static_cast<double>(block[1]) * 4294967296.0 + static_cast<double>(block[0]);
  return frequency == 0 || frequency == 0xFFFFFFFFu ? -1.0 : ticks / static_cast<double>(frequency);
}

// ---------------------------------------------------------------------------------------------
// The simulated IMU

// One frame as the driver would read it: the IMU's sample counter (its timestamp, in 1 ms timer
// ticks) and the delta-angle (rad) over the interval that ends at it. `injected` is test
// bookkeeping only: ok for a real frame, otherwise the rejection the firmware must report.
struct ImuFrame {
  std::uint32_t tick;
  Vector3<float> delta_angle;
  Status injected;
};

constexpr std::uint32_t run_ticks = 5000;        // 5 s at 1 kHz
constexpr std::uint32_t nan_tick = 1000;         // a corrupted frame with a NaN, before frame 1000
constexpr std::uint32_t over_range_tick = 1500;  // a frame reading 40 rad/s, before frame 1500
constexpr std::uint32_t repeat_tick = 2001;      // frame 2000 delivered again, before frame 2001
constexpr std::uint32_t dropout_first = 3000;    // frames 3000..3019 never arrive (20 ms)
constexpr std::uint32_t dropout_last = 3019;

// The invented motion: roll 0.5 rad/s, coning half-angle 2 mrad at 40 Hz (25 samples a cycle).
const firmware::RollWithConing motion{0.5, 2e-3, 25, 1e-3};
// Its float delta-angle constants, computed once at start-up (static initialization).
const firmware::DeltaAngleSource imu_source(motion);

firmware::SpscRing<ImuFrame, 64> imu_ring;
volatile std::uint32_t imu_tick = 0;
volatile std::uint32_t imu_overruns = 0;
volatile bool imu_finished = false;

void emit(const ImuFrame& frame) {
  if (!imu_ring.push(frame)) {
    imu_overruns = imu_overruns + 1;  // the main loop fell behind: shows up as a gap
  }
}

}  // namespace

// The IMU data-ready interrupt, played by SysTick (cmake/boards/mps2/startup.c puts
// SysTick_Handler in vector 15 and lets the application define it).
extern "C" void SysTick_Handler() {
  // After the last frame the counter is stopped, but a tick that became pending while this
  // handler ran (qemu on a loaded host can fall that far behind) would still be taken once:
  // ignore it, the run is over.
  if (imu_finished) {
    return;
  }
  const firmware::DeltaAngleSource& source = imu_source;
  const std::uint32_t k = imu_tick + 1;
  imu_tick = k;
  if (k == nan_tick) {
    Vector3<float> bad = source(k);
    bad.y = std::numeric_limits<float>::quiet_NaN();
    emit({k, bad, Status::non_finite});
  }
  if (k == over_range_tick) {
    emit({k, Vector3<float>{0.04f, 0.0f, 0.0f}, Status::over_range});  // 40 rad/s > 35 rad/s
  }
  if (k == repeat_tick) {
    emit({k - 1, source(k - 1), Status::non_positive_step});
  }
  if (k < dropout_first || k > dropout_last) {
    emit({k, source(k), k == dropout_last + 1 ? Status::step_too_long : Status::ok});
  }
  if (k == run_ticks) {
    systick().control = 0;
    imu_finished = true;
  }
}

namespace {

// ---------------------------------------------------------------------------------------------
// The attitude loop

constexpr std::size_t status_count = 7;
const char* const status_names[status_count] = {
    "ok",         "waiting_for_samples", "non_finite", "non_positive_step", "step_too_long",
    "over_range", "no_tick_period"};

struct Gap {
  std::uint32_t last_step_tick;  // the attitude stands at the truth of this tick
  std::uint32_t resume_tick;     // propagation resumes from this tick
};

struct LoopState {
  std::array<std::uint32_t, status_count> by_status{};
  std::uint32_t last_tick = 0;       // timestamp of the last accepted frame
  std::uint32_t last_step_tick = 0;  // timestamp that ended the last step
  std::uint32_t waiting = 0;         // accepted frames since the last step
  std::uint32_t injected = 0;
  std::uint32_t injected_right = 0;
  std::uint32_t unexpected = 0;  // real frames rejected, or accepted faults
  std::uint32_t expected_discards = 0;
  std::uint64_t lost_ticks = 0;  // intervals of frames rejected as gaps
  std::array<Gap, 4> gaps{};
  std::size_t gap_count = 0;
};

void handle(halfspin::Propagator<float, halfspin::Coning2Sample>& attitude, LoopState& st,
            const ImuFrame& frame) {
  // Unsigned difference: right across a wrap of the 32-bit counter; a repeated frame gives 0.
  const std::uint32_t interval = frame.tick - st.last_tick;
  const Status s = attitude.push(frame.delta_angle, halfspin::Ticks{interval});
  ++st.by_status[static_cast<std::size_t>(s)];
  switch (s) {
    case Status::ok:  // a step was taken: the attitude now stands at this frame's time
      st.last_tick = frame.tick;
      st.last_step_tick = frame.tick;
      st.waiting = 0;
      break;
    case Status::waiting_for_samples:  // accepted; the two-sample window is half full
      st.last_tick = frame.tick;
      ++st.waiting;
      break;
    case Status::non_finite:  // a corrupted frame: dropped; the next one counts from the last good
    case Status::over_range:  // saturated or corrupted: dropped the same way
      break;
    case Status::non_positive_step:  // a repeated or out-of-order frame: dropped
      break;
    case Status::no_tick_period:  // never: the attitude is built with the timer's tick period
      break;
    case Status::step_too_long:
      // Frames were missed: the rotation since the last step is lost (the propagator restarts
      // its window, discarding a waiting frame). Flight code would now ask its aiding sensors
      // to re-anchor the attitude; here the loss is recorded so the check can account for it.
      if (st.gap_count < st.gaps.size()) {
        st.gaps[st.gap_count] = {st.last_step_tick, frame.tick};
      }
      ++st.gap_count;
      st.expected_discards += st.waiting;
      st.waiting = 0;
      st.lost_ticks += interval;
      st.last_tick = frame.tick;  // the next frame's interval starts here
      st.last_step_tick = frame.tick;
      break;
  }
  if (frame.injected != Status::ok) {
    ++st.injected;
    if (s == frame.injected) {
      ++st.injected_right;
    } else {
      std::printf("injected fault at tick %lu: expected %s, got %s\n",
                  static_cast<unsigned long>(frame.tick), halfspin::status_name(frame.injected),
                  halfspin::status_name(s));
    }
  } else if (halfspin::is_rejection(s)) {
    ++st.unexpected;
    std::printf("real frame at tick %lu rejected: %s\n", static_cast<unsigned long>(frame.tick),
                halfspin::status_name(s));
  }
}

// The truth the attitude should match: the closed form, minus the rotation lost in each gap:
// q(b1) ⊗ q(r1)* ⊗ q(b2) ⊗ q(r2)* ⊗ … ⊗ q(b_end).
Quaternion<double> expected_attitude(const LoopState& st) {
  Quaternion<double> e = motion.attitude(0);
  std::uint32_t from = 0;
  for (std::size_t i = 0; i < st.gap_count && i < st.gaps.size(); ++i) {
    e = e * halfspin::conjugate(motion.attitude(from)) * motion.attitude(st.gaps[i].last_step_tick);
    from = st.gaps[i].resume_tick;
  }
  return e * halfspin::conjugate(motion.attitude(from)) * motion.attitude(st.last_step_tick);
}

int failures = 0;
void require(bool ok, const char* what) {
  std::printf("  [%s] %s\n", ok ? "ok" : "FAIL", what);
  failures += ok ? 0 : 1;
}

}  // namespace

int main() {
  std::printf("halfspin firmware example (%s): 1 kHz delta-angles, Propagator<float, %s>\n",
#if defined(__ARM_FP)
              "Cortex-M4F, hard float",
#else
              "Cortex-M3, soft float",
#endif
              halfspin::Coning2Sample::name);

  const TimerSetup timer = one_millisecond_from_calibration();
  std::printf(
      "SysTick: SYST_CALIB TENMS %lu, NOREF %d, SKEW %d -> reference clock %.3f MHz, "
      "reload %lu for 1 ms\n",
      static_cast<unsigned long>(timer.tenms), timer.noref ? 1 : 0, timer.skew ? 1 : 0,
      static_cast<double>(timer.tenms + 1) / 1e4, static_cast<unsigned long>(timer.reload));
  if (!timer.usable) {
    std::printf("firmware example: FAIL (SysTick calibration gives no exact 1 ms period)\n");
    return 1;
  }

  // The gyro's limits: 35 rad/s per axis (a 2000 deg/s part); an interval over 1.5 ticks means
  // a frame was missed. Tick period 1 ms, from the calibrated reference clock.
  const Quaternion<double> q0 = motion.attitude(0);
  halfspin::Propagator<float, halfspin::Coning2Sample> attitude(
      Quaternion<float>{static_cast<float>(q0.w), static_cast<float>(q0.x),
                        static_cast<float>(q0.y), static_cast<float>(q0.z)},
      halfspin::GyroLimits<float>{35.0f, 1.5e-3f}, 1e-3f);
  LoopState st;

  const double started = host_seconds();
  SysTickRegisters& t = systick();
  t.reload = timer.reload;
  t.current = 0;
  t.control = systick_enable | systick_interrupt;  // CLKSOURCE = 0: the reference clock

  for (;;) {
    ImuFrame frame;
    while (imu_ring.pop(frame)) {
      handle(attitude, st, frame);
    }
    // Sleep until the next interrupt. Interrupts are masked across the test so that a frame
    // arriving between it and WFI cannot be slept through: WFI still wakes on the pending
    // interrupt, which runs as soon as they are unmasked.
    __asm volatile("cpsid i" ::: "memory");
    const bool finished = imu_finished && imu_ring.empty();
    if (!finished && imu_ring.empty()) {
      __asm volatile("wfi" ::: "memory");
    }
    __asm volatile("cpsie i" ::: "memory");
    if (finished) {
      break;
    }
  }
  const double seconds = host_seconds() - started;

  // ------------------------------------------------------------------------------------------
  // Report
  const halfspin::PropagationCounters& c = attitude.counters();
  const Quaternion<float> q = attitude.attitude();
  const Quaternion<double> qd{static_cast<double>(q.w), static_cast<double>(q.x),
                              static_cast<double>(q.y), static_cast<double>(q.z)};
  const Quaternion<double> truth = expected_attitude(st);
  const double error = halfspin::angle_between(qd, truth);
  // Budget: the two-sample algorithm's coning drift, λ⁵/30 · sin²a per step for classical coning
  // (coning_compensation.hpp; λ = Ωh, with the lateral amplitude (r + Ω) sin a here, hence the
  // factor ((r + Ω)/Ω)²), plus rounding: 0.25 · steps · ε, the limit the on-target constant-rate
  // test holds for this stepper (measured 0.076 there).
  const double lambda = motion.cone_rate() * motion.sample_period;
  const double amplitude = (motion.roll_rate + motion.cone_rate()) / motion.cone_rate();
  const double sin_a = std::sin(motion.cone_angle);
  const double steps = static_cast<double>(c.steps);
  const double drift = steps * std::pow(lambda, 5) / 30.0 * sin_a * sin_a * amplitude * amplitude;
  const double rounding = 0.25 * steps * static_cast<double>(std::numeric_limits<float>::epsilon());
  const double budget = drift + rounding;
  const double rate_hz = seconds > 0 ? static_cast<double>(imu_tick) / seconds : -1.0;

  std::printf("interrupts %lu in %.3f s of host time: %.1f Hz; ring overruns %lu\n",
              static_cast<unsigned long>(imu_tick), seconds, rate_hz,
              static_cast<unsigned long>(imu_overruns));
  std::printf("status counts:");
  for (std::size_t i = 0; i < status_count; ++i) {
    std::printf(" %s %lu", status_names[i], static_cast<unsigned long>(st.by_status[i]));
  }
  std::printf("\n");
  std::printf(
      "counters: samples_accepted %llu steps %llu rejected non_finite %llu "
      "non_positive_step %llu step_too_long %llu over_range %llu discarded %llu "
      "elapsed_ticks %llu\n",
      static_cast<unsigned long long>(c.samples_accepted), static_cast<unsigned long long>(c.steps),
      static_cast<unsigned long long>(c.rejected_non_finite),
      static_cast<unsigned long long>(c.rejected_non_positive_step),
      static_cast<unsigned long long>(c.rejected_step_too_long),
      static_cast<unsigned long long>(c.rejected_over_range),
      static_cast<unsigned long long>(c.discarded_samples),
      static_cast<unsigned long long>(attitude.elapsed_ticks()));
  for (std::size_t i = 0; i < st.gap_count && i < st.gaps.size(); ++i) {
    std::printf("gap: attitude held at tick %lu, propagation resumed after tick %lu\n",
                static_cast<unsigned long>(st.gaps[i].last_step_tick),
                static_cast<unsigned long>(st.gaps[i].resume_tick));
  }
  std::printf("attitude at tick %lu: (%.7f, %.7f, %.7f, %.7f)\n",
              static_cast<unsigned long>(st.last_step_tick), qd.w, qd.x, qd.y, qd.z);
  std::printf("closed form (gap excluded): (%.7f, %.7f, %.7f, %.7f)\n", truth.w, truth.x, truth.y,
              truth.z);
  std::printf(
      "final attitude error %.3e rad (%.2e deg); budget %.3e rad (coning drift %.2e + "
      "rounding %.2e)\n",
      error, error * 57.29577951308232, budget, drift, rounding);

  std::printf("checks:\n");
  require(error <= budget, "final attitude within the budget of the closed form");
  require(st.injected == 4 && st.injected_right == 4,
          "every injected fault rejected with the right status (4 of 4)");
  require(st.unexpected == 0 && imu_overruns == 0, "no real frame rejected, no ring overrun");
  require(c.rejected_non_finite == 1 && c.rejected_over_range == 1 &&
              c.rejected_non_positive_step == 1 && c.rejected_step_too_long == 1,
          "propagator counters: one rejection of each class");
  require(st.gap_count == 1 && c.discarded_samples == st.expected_discards,
          "one gap; the frame waiting at the gap discarded and counted");
  require(c.steps == st.by_status[0] && c.samples_accepted == st.by_status[0] + st.by_status[1] &&
              attitude.elapsed_ticks() == run_ticks - st.lost_ticks,
          "steps, accepted samples and elapsed ticks add up");
  // The interrupt rate against host time is reported, not asserted: it depends on how loaded the
  // machine running qemu is (timing figures belong to measurements, not to pass/fail checks).
  require(imu_tick == run_ticks, "every simulated IMU frame was produced");
  std::printf("firmware example: %s\n", failures == 0 ? "PASS" : "FAIL");
  return failures == 0 ? 0 : 1;
}
