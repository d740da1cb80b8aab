// Prints, as Markdown tables, what each stepper declares (input layout, window, order, cost) and
// sizeof of each propagator configuration in float and double: the RAM a firmware build pays per
// propagated attitude (the propagator owns attitude, sample history, counters, error estimate and
// time), for every stepper of the catalogue. The tables of docs/steppers.md are this program's
// output (ctest examples.stepper_tables fails when they differ).
#include <cstdio>
#include <type_traits>

#include "halfspin/halfspin.hpp"

namespace {

const char* layout_name(halfspin::SampleLayout layout) {
  switch (layout) {
    case halfspin::SampleLayout::rate_at_end:
      return "rate at step end";
    case halfspin::SampleLayout::rates_spanning:
      return "rates spanning the step";
    case halfspin::SampleLayout::delta_angles:
      return "delta-angles tiling the step";
    case halfspin::SampleLayout::delta_angles_with_previous:
      return "previous + new delta-angles";
    case halfspin::SampleLayout::rate_function:
      return "rate function";
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
  std::printf("| `%s` | `%s` | %zu | %zu | %zu |\n", Stepper::name, Renormalization::name,
              Stepper::window, sizeof(halfspin::Propagator<float, Stepper, Renormalization>),
              sizeof(halfspin::Propagator<double, Stepper, Renormalization>));
}

}  // namespace

int main() {
  using namespace halfspin;
  std::printf("| stepper | input | window | order (under pure coning) | flops per step |\n");
  std::printf("| --- | --- | --- | --- | --- |\n");
  StepperCatalogue::for_each([](auto entry) { stepper_row<typename decltype(entry)::stepper>(); });
  std::printf("\n");
  std::printf(
      "| stepper | renormalization | window (samples) | sizeof, float (bytes) | sizeof, double "
      "(bytes) |\n");
  std::printf("| --- | --- | --- | --- | --- |\n");
  StepperCatalogue::for_each([](auto entry) { row<typename decltype(entry)::stepper>(); });
  row<ExponentialMapMidpointMean, PeriodicRenormalization<ExactRenormalization>>();
  row<MuntheKaas4Sampled, NoRenormalization>();
  return 0;
}
