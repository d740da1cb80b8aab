#pragma once
// halfspin-stepstudy --log: the step study of a gyro log without truth (log_study.cpp; the
// runs and the Richardson estimate in log_runs.hpp; `halfspin-stepstudy --help` and README.md
// document it). Tool code.

#include "options.hpp"

namespace halfspin::tools::stepstudy {

// Runs the log study the options describe, prints it and writes its files; the exit code.
int run_log_study(const Options& o);

}  // namespace halfspin::tools::stepstudy
