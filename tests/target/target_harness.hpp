#pragma once
// A minimal test harness for the target (no exceptions, no heap, printf over semihosting): each
// check prints a line on failure and counts it; main returns the failure count, which qemu
// returns as its exit code.
#include <cstdio>

namespace halfspin::target {

struct Tally {
  int checks = 0;
  int failures = 0;
};

inline Tally& tally() {
  static Tally t;
  return t;
}

// Records one check; on failure prints what and where.
inline bool check(bool ok, const char* what, const char* file, int line) {
  ++tally().checks;
  if (!ok) {
    ++tally().failures;
    std::printf("FAILED %s:%d: %s\n", file, line, what);
  }
  return ok;
}

// Prints the summary line ("N passed, M failed") and returns the exit status.
inline int finish(const char* suite) {
  const Tally& t = tally();
  std::printf("%s: %d passed, %d failed\n", suite, t.checks - t.failures, t.failures);
  return t.failures == 0 ? 0 : 1;
}

}  // namespace halfspin::target

// File and line are what a macro is for; everything else is a function.
#define HALFSPIN_CHECK(condition) \
  ::halfspin::target::check((condition), #condition, __FILE__, __LINE__)
