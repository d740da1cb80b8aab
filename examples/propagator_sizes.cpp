// Prints, as Markdown tables, what each stepper declares (input layout, window, order, cost) and
// sizeof of each propagator configuration in float and double: the RAM a firmware build pays per
// propagated attitude (the propagator owns attitude, sample history, counters, error estimate and
// time). The README's tables are this program's output.
#include <cstdio>
#include <type_traits>

#include "halfspin/halfspin.hpp"
#include "halfspin/propagation/coning_compensation.hpp"
#include "halfspin/propagation/embedded_runge_kutta.hpp"
#include "halfspin/propagation/explicit_runge_kutta.hpp"
#include "halfspin/propagation/lie_group_runge_kutta.hpp"

namespace {

const char* layout_name(halfspin::SampleLayout layout) {
  switch (layout) {
    case halfspin::SampleLayout::rate_at_end: return "rate at step end";
    case halfspin::SampleLayout::rates_spanning: return "rates spanning the step";
    case halfspin::SampleLayout::delta_angles: return "delta-angles tiling the step";
    case halfspin::SampleLayout::delta_angles_with_previous: return "previous + new delta-angles";
    case halfspin::SampleLayout::rate_function: return "rate function";
  }
  return "?";
}

template <class S, class = void>
struct coning_order_of {
  static constexpr int value = 0;
};
template <class S>
struct coning_order_of<S, std::void_t<decltype(S::coning_order)>> {
  static constexpr int value = S::coning_order;
};

template <class Stepper>
void stepper_row() {
  char coning[16] = "";
  if (coning_order_of<Stepper>::value > 0) {
    std::snprintf(coning, sizeof coning, " (%d)", coning_order_of<Stepper>::value);
  }
  std::printf("| `%s` | %s | %zu | %d%s | %d |\n", Stepper::name, layout_name(Stepper::layout),
              Stepper::window, Stepper::order, coning, Stepper::flops);
}

template <class Stepper, class Renormalization = halfspin::FirstOrderRenormalization>
void row() {
  std::printf("| `%s` | `%s` | %zu | %zu | %zu |\n", Stepper::name, Renormalization::name, Stepper::window,
              sizeof(halfspin::Propagator<float, Stepper, Renormalization>),
              sizeof(halfspin::Propagator<double, Stepper, Renormalization>));
}

}  // namespace

int main() {
  using namespace halfspin;
  std::printf("| stepper | input | window | order (under pure coning) | flops per step |\n");
  std::printf("| --- | --- | --- | --- | --- |\n");
  stepper_row<ExponentialMapHoldEnd>();
  stepper_row<ExponentialMapHoldStart>();
  stepper_row<ExponentialMapMidpointMean>();
  stepper_row<ExponentialMapMidpointSample>();
  stepper_row<Magnus4>();
  stepper_row<RungeKutta2MidpointSampled>();
  stepper_row<RungeKutta2MidpointInterpolated>();
  stepper_row<RungeKutta2MidpointRateFunction>();
  stepper_row<RungeKutta3KuttaSampled>();
  stepper_row<RungeKutta3KuttaInterpolated>();
  stepper_row<RungeKutta3KuttaRateFunction>();
  stepper_row<RungeKutta4Sampled>();
  stepper_row<RungeKutta4Interpolated>();
  stepper_row<RungeKutta4RateFunction>();
  stepper_row<BogackiShampine32RateFunction>();
  stepper_row<DormandPrince54RateFunction>();
  stepper_row<MuntheKaas4Sampled>();
  stepper_row<MuntheKaas4Interpolated>();
  stepper_row<MuntheKaas4RateFunction>();
  stepper_row<Coning1Sample>();
  stepper_row<Coning1SamplePlusPrevious>();
  stepper_row<Coning2Sample>();
  stepper_row<Coning3Sample>();
  stepper_row<Coning3SampleMiller>();
  stepper_row<Coning4Sample>();
  std::printf("\n");
  std::printf("| stepper | renormalization | window (samples) | sizeof, float (bytes) | sizeof, double (bytes) |\n");
  std::printf("| --- | --- | --- | --- | --- |\n");
  row<ExponentialMapHoldEnd>();
  row<ExponentialMapHoldStart>();
  row<ExponentialMapMidpointMean>();
  row<ExponentialMapMidpointSample>();
  row<Magnus4>();
  row<RungeKutta2MidpointSampled>();
  row<RungeKutta3KuttaSampled>();
  row<RungeKutta4Sampled>();
  row<RungeKutta4Interpolated>();
  row<RungeKutta4RateFunction>();
  row<BogackiShampine32RateFunction>();
  row<DormandPrince54RateFunction>();
  row<MuntheKaas4Sampled>();
  row<Coning1Sample>();
  row<Coning1SamplePlusPrevious>();
  row<Coning2Sample>();
  row<Coning3Sample>();
  row<Coning4Sample>();
  row<ExponentialMapMidpointMean, PeriodicRenormalization<ExactRenormalization>>();
  row<MuntheKaas4Sampled, NoRenormalization>();
  return 0;
}
