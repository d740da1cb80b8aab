// Hygiene fixture (must FAIL the check): a float image that allocates with operator new and
// frees with operator delete. tests/target/host_footprint.cmake runs the hygiene script on it and
// requires a failure naming the heap symbols; proves the heap check can fail.
extern "C" {
// operator new reports exhaustion by throwing std::bad_alloc, which links libstdc++'s exception
// globals; they register a destructor against the DSO handle that crtbegin.o would define (the
// images link with -nostartfiles).
void* __dso_handle = nullptr;
volatile float halfspin_fixture_value = 1.5f;
volatile float halfspin_fixture_output;
// The pointer escapes through a volatile object: otherwise the compiler may elide the
// new/delete pair (allowed since C++14) and the fixture would prove nothing.
float* volatile halfspin_fixture_pointer = nullptr;
}

int main() {
  halfspin_fixture_pointer = new float(halfspin_fixture_value);
  halfspin_fixture_output = *halfspin_fixture_pointer * 2.0f;
  delete halfspin_fixture_pointer;
  return 0;
}
