#pragma once
// The options of halfspin-stepstudy's study of a gyro log without truth (--log, log_study.hpp):
// their values and the rules for combining them with the other options. Tool code.

#include <string>

namespace halfspin::tools::stepstudy {

// The largest --steps in log mode: coarsenings k = 1, 2, ..., 2^15 log periods per sample.
inline constexpr int max_log_levels = 16;
// The default --steps in log mode: k = 1 .. 32.
inline constexpr int default_log_levels = 6;

struct LogStudyOptions {
  std::string file;             // --log: the gyro log (form from its header)
  std::string truth;            // --log-truth: its truth attitude, to check the truth-free study
  bool duration_given = false;  // --duration given: study only the log's first seconds
};

// The log-mode rules, checked once the command line is read. A template on the Options type so
// that this header does not need its definition (options.hpp includes this one).
template <class Options>
bool check_log_options(const Options& o, bool step_given, bool have_horizon, std::string& error) {
  if (o.log.file.empty()) {
    error = "--log-truth needs --log (the log whose truth it is)";
    return false;
  }
  const char* excluded = nullptr;
  if (!o.motion.empty()) {
    excluded = "--motion";
  } else if (o.bounds_only) {
    excluded =
        "a description (--envelope, --max-rate*, --axis-rates*, --bandwidth, --vibration, "
        "--coning)";
  } else if (o.step_min > 0 || o.step_max > 0 || step_given) {
    excluded = "--step, --step-min or --step-max (a log's steps are whole log periods: --steps)";
  } else if (o.local_errors) {
    excluded = "--local-errors (it needs a truth motion)";
  } else if (o.baseline) {
    excluded = "--baseline (it needs a truth motion)";
  } else if (o.fixes) {
    excluded = "--fixes (bounds need a description of the motion)";
  } else if (!o.recommendation_file.empty()) {
    excluded = "--recommendation-file (bounds need a description of the motion)";
  }
  if (excluded != nullptr) {
    error = std::string("--log cannot be combined with ") + excluded;
    return false;
  }
  if (o.has_budget && !have_horizon) {
    error = "--budget needs --horizon (the extrapolation's horizon)";
    return false;
  }
  if (o.steps_given && o.steps > max_log_levels) {
    error = "--steps: with --log at most " + std::to_string(max_log_levels) +
            " (coarsenings 1, 2, 4, ... log periods per sample)";
    return false;
  }
  return true;
}

}  // namespace halfspin::tools::stepstudy
