// Hygiene fixture (must FAIL the check): -fno-exceptions does not stop library code from
// throwing: std::array::at reports an out-of-range index through libstdc++'s throw helper, which
// links __cxa_throw and the unwinder. host_footprint.cmake requires the check to fail naming the
// exception machinery.
#include <array>
#include <cstddef>

extern "C" {
// The board links with -nostartfiles (no crtbegin.o), and libstdc++'s exception globals register
// a destructor against the DSO handle: without this definition the fixture would not link at all.
void* __dso_handle = nullptr;
volatile std::size_t halfspin_fixture_index = 1;
volatile float halfspin_fixture_output;
}

int main() {
  const std::array<float, 3> values{1.0f, 2.0f, 3.0f};
  halfspin_fixture_output = values.at(halfspin_fixture_index);
  return 0;
}
