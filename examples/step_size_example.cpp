// Choosing a step size: an invented survey drone whose engine vibration cones its gyro frame
// (0.02° half-angle at 85 Hz), on top of banked turns (|ω| ≤ 0.6 rad/s, |ω̇| ≤ 1 rad/s²,
// |ω̈| ≤ 5 rad/s³). Budget: 0.1° over 10 minutes. Prints, for a few steppers, the largest step that
// meets the budget under the pure-coning description and under the full envelope, and the cheapest
// stepper at a 1 kHz gyro. Caution: bounds support engineering judgement; validate in
// hardware-in-the-loop and flight test under local airworthiness rules and licensed practice.
#include <cstdio>

#include "halfspin/halfspin.hpp"

namespace {

using namespace halfspin;
constexpr double degree = 3.14159265358979323846 / 180.0;

template <class Stepper>
void row(const MotionDescription<double>& motion, double budget, double horizon) {
  const StepSelection<double> s = select_step<Stepper>(motion, budget, horizon);
  if (s.status == StepSelectionStatus::ok) {
    std::printf("  %-30s step %9.3e s  (%8.1f Hz updates, %8.1f Hz gyro)  bound %.3e deg\n",
                Stepper::name, s.step_s, s.update_rate_hz, s.sample_rate_hz, s.bound_rad / degree);
  } else {
    std::printf("  %-30s no step meets the budget (best bound %.3e deg at %.3e s)\n", Stepper::name,
                s.minimum_bound_rad / degree, s.minimizing_step_s);
  }
}

template <class... S>
void table(const char* title, const MotionDescription<double>& motion, double budget,
           double horizon) {
  std::printf("%s\n", title);
  (row<S>(motion, budget, horizon), ...);
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
  table<ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled, Coning1Sample, Coning2Sample,
        Coning3Sample>("Vibration alone (pure coning 0.02 deg at 85 Hz):", coning, budget, horizon);
  std::printf("\n");
  table<ExponentialMapMidpointMean, Magnus4, RungeKutta4Sampled, Coning1Sample, Coning2Sample,
        Coning3Sample>("Turns plus vibration, as a rate envelope (worst-case linear accumulation):",
                       full, budget, horizon);
  const auto r =
      recommend_stepper(StepperList<ExponentialMapHoldEnd, ExponentialMapMidpointMean,
                                    Coning1Sample, Coning2Sample, Coning3Sample, Magnus4>{},
                        full, budget, horizon, 1000.0);
  std::printf(
      "\nAt a 1 kHz gyro, the cheapest stepper meeting the budget: %s (%.0f flop/s, bound "
      "%.3e deg)\n",
      r.found ? r.name : "none", r.found ? r.cost_flops_per_s : 0.0,
      r.found ? r.bound_rad / degree : 0.0);
  std::printf(
      "Caution: bounds support engineering judgement; validate in hardware-in-the-loop and\n"
      "flight test, under local airworthiness rules and licensed practice.\n");
  return 0;
}
