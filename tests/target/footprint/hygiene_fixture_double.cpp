// Hygiene fixture (must FAIL the check): float code that computes in double, the accidental
// promotion the double-helper check exists to catch (an explicit cast, so -Wdouble-promotion
// stays quiet, as it would for a promotion hidden in a libm overload). host_footprint.cmake
// requires the check to fail naming a double-precision helper.
extern "C" {
volatile float halfspin_fixture_value = 1.5f;
volatile float halfspin_fixture_output;
}

int main() {
  const double wide = static_cast<double>(halfspin_fixture_value) * 1.0000001;
  halfspin_fixture_output = static_cast<float>(wide);
  return 0;
}
