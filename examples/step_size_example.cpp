// Choosing a step size: an invented survey drone whose engine vibration cones its gyro frame
// (0.02° half-angle at 85 Hz), on top of banked turns (|ω| ≤ 0.6 rad/s, |ω̇| ≤ 1 rad/s²,
// |ω̈| ≤ 5 rad/s³). Budget: 0.1° over 10 minutes. Prints, for a few steppers, the largest step that
// meets the budget under the pure-coning description and under the full envelope, and the cheapest
// stepper at a 1 kHz gyro: in double, then in float as the board runs it, with the compensated
// accumulation (and what the plain float accumulation allows). Caution: bounds support engineering
// judgement; validate in hardware-in-the-loop and flight test under local airworthiness rules and
// licensed practice.
#include <cstdio>

#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;
constexpr double degree = 3.14159265358979323846 / 180.0;

template <class T>
MotionDescription<T> narrowed(const MotionDescription<double>& d) {
  MotionDescription<T> r{};
  for (std::size_t k = 0; k < d.maneuver.derivative.size(); ++k) {
    r.maneuver.derivative[k] = static_cast<T>(d.maneuver.derivative[k]);
  }
  r.coning = {static_cast<T>(d.coning.half_angle), static_cast<T>(d.coning.frequency_hz)};
  return r;
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

}  // namespace

int main() {
  const double budget = 0.1 * degree;
  const double horizon = 600.0;
  MotionDescription<double> coning{};
  coning.coning = {0.02 * degree, 85.0};
  MotionDescription<double> full = coning;
  full.coning = {};  // described by its derivative bounds instead, added to the maneuver
  full.maneuver = RateEnvelope<double>::from_rate_bounds(0.6, 1.0, 5.0) + coning.coning.envelope();
  full.maneuver.derivative[3] = 40.0 + coning.coning.envelope()[3];  // turns: |ω⃛| ≤ 40 rad/s⁴
  full.maneuver.derivative[4] = 400.0 + coning.coning.envelope()[4];
  full.maneuver.derivative[5] = 4000.0 + coning.coning.envelope()[5];

  std::printf("Budget %.2f deg over %.0f s (double)\n\n", budget / degree, horizon);
  table<double, PlainAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>(
      "Vibration alone (pure coning 0.02 deg at 85 Hz):", coning, budget, horizon);
  std::printf("\n");
  table<double, PlainAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>(
      "Turns plus vibration, as a rate envelope (worst-case linear accumulation):", full, budget,
      horizon);
  std::printf("\n");
  recommendation<double, PlainAccumulation>(full, budget, horizon);

  std::printf("\nThe same in float, as the board runs it, with the compensated accumulation:\n");
  table<float, CompensatedAccumulation, ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled,
        Coning1Sample, Coning2Sample, Coning3Sample>(
      "Turns plus vibration, as a rate envelope:", full, budget, horizon);
  std::printf("\n");
  recommendation<float, CompensatedAccumulation>(full, budget, horizon);
  recommendation<float, PlainAccumulation>(full, budget, horizon);
  std::printf(
      "Caution: bounds support engineering judgement; validate in hardware-in-the-loop and\n"
      "flight test, under local airworthiness rules and licensed practice.\n");
  return 0;
}
