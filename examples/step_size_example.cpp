// Choosing a step size, twice (both vehicles invented).
// 1. From a datasheet: a 2 kHz gyro, manoeuvres up to 3 rad/s with a 4 Hz manoeuvre bandwidth, a
//    120 Hz motor vibration of 0.01 rad about one axis (phase unknown), 0.05° over 20 minutes in
//    float on the board, or over the 10 s between attitude fixes. Prints the description the
//    library builds (Bernstein's inequality for the manoeuvre's derivatives), what meets the budget
//    at 2 kHz over each horizon, and the longest time between fixes at that rate.
// 2. A survey drone whose engine vibration cones its gyro frame (0.02° half-angle at 85 Hz), on
//    top of banked turns (|ω| ≤ 0.6 rad/s, |ω̇| ≤ 1 rad/s², |ω̈| ≤ 5 rad/s³). Budget: 0.1° over 10
//    minutes. Prints, for a few steppers, the largest step that meets the budget under the
//    pure-coning description and with the turns added, and the cheapest stepper at a 1 kHz gyro:
//    in double, then in float as the board runs it, with the compensated accumulation (and what
//    the plain float accumulation allows). Caution: bounds support engineering
// judgement; validate in hardware-in-the-loop and flight test under local airworthiness rules and
// licensed practice.
#include <cstdio>

#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;
constexpr double degree = 3.14159265358979323846 / 180.0;

template <class T>
MotionDescription<T> narrowed(const MotionDescription<double>& d) {
  return d.converted<T>();
}

template <class Stepper, class T, class Accumulation>
void row(const MotionDescription<double>& motion, double budget, double horizon) {
  const StepSelection<T> s = select_step<Stepper, T, Accumulation>(
      narrowed<T>(motion), static_cast<T>(budget), static_cast<T>(horizon));
  if (s.status == StepSelectionStatus::ok) {
    std::printf("  %-30s step %9.3e s  (%8.1f Hz updates, %8.1f Hz gyro)  bound %.3e deg\n",
                Stepper::name, static_cast<double>(s.step_s), static_cast<double>(s.update_rate_hz),
                static_cast<double>(s.sample_rate_hz), static_cast<double>(s.bound_rad) / degree);
  } else {
    std::printf("  %-30s no step meets the budget (best bound %.3e deg at %.3e s)\n", Stepper::name,
                static_cast<double>(s.minimum_bound_rad) / degree,
                static_cast<double>(s.minimizing_step_s));
  }
}

template <class T, class Accumulation, class... S>
void table(const char* title, const MotionDescription<double>& motion, double budget,
           double horizon) {
  std::printf("%s\n", title);
  (row<S, T, Accumulation>(motion, budget, horizon), ...);
}

template <class T, class Accumulation>
void recommendation(const MotionDescription<double>& motion, double budget, double horizon) {
  const auto r = recommend_stepper<T, Accumulation>(
      StepperList<ExponentialMapHoldEnd, ExponentialMapMidpointMean, Coning1Sample, Coning2Sample,
                  Coning3Sample, Magnus4>{},
      narrowed<T>(motion), static_cast<T>(budget), static_cast<T>(horizon), T(1000));
  std::printf(
      "At a 1 kHz gyro, %s with the %s accumulation, the cheapest stepper meeting the budget: %s",
      sizeof(T) == sizeof(float) ? "float" : "double", Accumulation::name,
      r.found ? r.name : "none");
  if (r.found) {
    std::printf(" (%.0f flop/s, step %.3e s, bound %.3e deg)",
                static_cast<double>(r.cost_flops_per_s),
                static_cast<double>(r.candidates[r.index].step_s),
                static_cast<double>(r.bound_rad) / degree);
  }
  std::printf("\n");
}

// Part 1: what the library makes of the datasheet quantities, and its answers.
template <class Stepper>
void fixes_row(const MotionDescription<float>& d, float dt, float budget) {
  const FixInterval<float> f =
      longest_fix_interval<Stepper, float, CompensatedAccumulation>(d, dt, budget);
  if (f.status == FixIntervalStatus::ok) {
    std::printf("  %-30s step %.2e s: fixes at most %9.3f s apart (bound there %.3e deg)\n",
                Stepper::name, static_cast<double>(dt), static_cast<double>(f.interval_s),
                static_cast<double>(f.bound_rad) / degree);
  } else {
    std::printf("  %-30s step %.2e s: %s\n", Stepper::name, static_cast<double>(dt),
                f.status == FixIntervalStatus::unbounded ? "meets the budget at every horizon tried"
                                                         : "not even one step meets the budget");
  }
}

void datasheet_vehicle() {
  const double gyro_hz = 2000.0;
  const double budget = 0.05 * degree;
  MotionDescription<double> d{};
  d.maneuver = RateEnvelope<double>::from_bandwidth(3.0, 4.0);
  d.vibration.add(VibrationLine<double>::from_angle_amplitude(120.0, {0.01, 0.0, 0.0}));
  std::printf(
      "1. From a datasheet: 2 kHz gyro, |w| <= 3 rad/s with a 4 Hz manoeuvre bandwidth,\n"
      "   0.01 rad of 120 Hz vibration about x (phase unknown); budget 0.05 deg.\n"
      "   Manoeuvre envelope (Bernstein, assuming no manoeuvre content above 4 Hz):");
  for (std::size_t k = 0; k < 6; ++k) {
    std::printf(" D%zu = %.3g", k, d.maneuver[k]);
  }
  std::printf("\n   Vibration line: rate amplitude %.3f rad/s on x\n",
              d.vibration.line[0].rate_amplitude.x);
  const MotionDescription<float> f = narrowed<float>(d);
  for (const double horizon : {1200.0, 10.0}) {
    std::printf("\n   Over %.0f s, in float (compensated accumulation):\n", horizon);
    table<float, CompensatedAccumulation, ExponentialMapMidpointMean, Magnus4, Coning1Sample,
          Coning2Sample, Coning3Sample>("", d, budget, horizon);
    const auto r = recommend_stepper<float, CompensatedAccumulation>(
        StepperList<ExponentialMapHoldEnd, ExponentialMapMidpointMean, Coning1Sample, Coning2Sample,
                    Coning3Sample, Magnus4>{},
        f, static_cast<float>(budget), horizon, static_cast<float>(gyro_hz));
    std::printf("   At the 2 kHz gyro: %s", r.found ? r.name : "nothing meets the budget");
    if (r.found) {
      std::printf(" (step %.2e s, bound %.3e deg)",
                  static_cast<double>(r.candidates[r.index].step_s),
                  static_cast<double>(r.bound_rad) / degree);
    }
    std::printf("\n");
  }
  std::printf("\n   Longest time between attitude fixes at the 2 kHz gyro, float (compensated):\n");
  fixes_row<Coning1Sample>(f, 1.0f / 2000.0f, static_cast<float>(budget));
  fixes_row<Coning2Sample>(f, 2.0f / 2000.0f, static_cast<float>(budget));
  fixes_row<Coning3Sample>(f, 3.0f / 2000.0f, static_cast<float>(budget));
}

}  // namespace

int main() {
  datasheet_vehicle();
  std::printf("\n2. The survey drone:\n");
  const double budget = 0.1 * degree;
  const double horizon = 600.0;
  MotionDescription<double> coning{};
  coning.coning = {0.02 * degree, 85.0};
  MotionDescription<double> full = coning;  // the cone kept exact, the turns as an envelope
  full.maneuver = RateEnvelope<double>::from_derivatives(0.6, 1.0, 5.0, 40.0, 400.0, 4000.0);

  std::printf("Budget %.2f deg over %.0f s (double)\n\n", budget / degree, horizon);
  table<double, PlainAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>(
      "Vibration alone (pure coning 0.02 deg at 85 Hz):", coning, budget, horizon);
  std::printf("\n");
  table<double, PlainAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>(
      "Turns plus vibration (the cone exact, the turns as an envelope; linear accumulation):", full,
      budget, horizon);
  std::printf("\n");
  recommendation<double, PlainAccumulation>(full, budget, horizon);

  std::printf("\nThe same in float, as the board runs it, with the compensated accumulation:\n");
  table<float, CompensatedAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>("Turns plus vibration:", full, budget,
                                                     horizon);
  std::printf("\n");
  recommendation<float, CompensatedAccumulation>(full, budget, horizon);
  recommendation<float, PlainAccumulation>(full, budget, horizon);
  std::printf(
      "Caution: bounds support engineering judgement; validate in hardware-in-the-loop and\n"
      "flight test, under local airworthiness rules and licensed practice.\n");
  return 0;
}
