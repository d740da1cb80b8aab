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
  stepper_row<ExpMapHoldEnd>();
  stepper_row<ExpMapHoldStart>();
  stepper_row<ExpMapMidpointMean>();
  stepper_row<ExpMapMidpointSample>();
  stepper_row<Magnus4>();
  stepper_row<RungeKutta2Sampled>();
  stepper_row<RungeKutta2Interpolated>();
  stepper_row<RungeKutta2RateFunction>();
  stepper_row<RungeKutta3Sampled>();
  stepper_row<RungeKutta3Interpolated>();
  stepper_row<RungeKutta3RateFunction>();
  stepper_row<RungeKutta4Sampled>();
  stepper_row<RungeKutta4Interpolated>();
  stepper_row<RungeKutta4RateFunction>();
  stepper_row<BogackiShampine32RateFunction>();
  stepper_row<DormandPrince54RateFunction>();
  stepper_row<MuntheKaas4Sampled>();
  stepper_row<MuntheKaas4Interpolated>();
  stepper_row<MuntheKaas4RateFunction>();
  stepper_row<ConingOneSample>();
  stepper_row<ConingOneSamplePlusPrevious>();
  stepper_row<ConingTwoSample>();
  stepper_row<ConingThreeSample>();
  stepper_row<ConingThreeSampleOlder>();
  stepper_row<ConingFourSample>();
  std::printf("\n");
  std::printf("| stepper | renormalization | window (samples) | sizeof, float (bytes) | sizeof, double (bytes) |\n");
  std::printf("| --- | --- | --- | --- | --- |\n");
  row<ExpMapHoldEnd>();
  row<ExpMapHoldStart>();
  row<ExpMapMidpointMean>();
  row<ExpMapMidpointSample>();
  row<Magnus4>();
  row<RungeKutta2Sampled>();
  row<RungeKutta3Sampled>();
  row<RungeKutta4Sampled>();
  row<RungeKutta4Interpolated>();
  row<RungeKutta4RateFunction>();
  row<BogackiShampine32RateFunction>();
  row<DormandPrince54RateFunction>();
  row<MuntheKaas4Sampled>();
  row<ConingOneSample>();
  row<ConingOneSamplePlusPrevious>();
  row<ConingTwoSample>();
  row<ConingThreeSample>();
  row<ConingFourSample>();
  row<ExpMapMidpointMean, PeriodicRenormalization<ExactRenormalization>>();
  row<MuntheKaas4Sampled, NoRenormalization>();
  return 0;
}
