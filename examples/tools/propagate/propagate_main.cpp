// halfspin-propagate: runs a gyro log through a chosen stepper with the library's Propagator (the
// code the board runs) and writes the attitude after every step. `--help` documents it all.
//
//   propagate_options.hpp   the command line and the help text
//   propagate_run.hpp       the run: the log, line by line, through the propagator
//   propagate_output.hpp    the output CSV, the summary, the bad-input reports, the method list
//   truth_track.hpp         the --truth file, read in step with the output
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "gyro_log.hpp"
#include "method_registry.hpp"
#include "propagate_options.hpp"
#include "propagate_output.hpp"
#include "propagate_run.hpp"
#include "truth_track.hpp"

namespace {

using namespace halfspin;
using namespace halfspin::tools;
using namespace halfspin::tools::propagate;

int usage_error(const std::string& message) {
  std::fprintf(stderr, "halfspin-propagate: %s (see --help)\n", message.c_str());
  return exit_usage;
}

// The catalogue entry of the stepper visit_method() runs for `name`; nullptr if there is none.
const MethodInfo* find_method(const std::string& name) {
  const MethodInfo* found = nullptr;
  visit_method(name, [&found](auto tag) {
    using S = typename decltype(tag)::type;
    for (const MethodInfo& m : method_catalogue()) {
      if (std::string_view(m.name) == S::name) found = &m;
    }
  });
  return found;
}

// A method given on the command line must exist and run on a log: the usage error, or "".
std::string check_method(const std::string& name) {
  const MethodInfo* info = find_method(name);
  if (info == nullptr) return "unknown method '" + name + "' (--list-methods)";
  if (info->layout == SampleLayout::rate_function) {
    return "method '" + name + "' needs a rate function (a model of the motion), not a gyro log";
  }
  return "";
}

// The unit options must fit the log's form: the usage error, or "".
std::string match_units_to_form(const Options& opt, GyroLogForm form) {
  if (form == GyroLogForm::delta_angle && !opt.rate_unit.empty()) {
    return "--rate-unit applies to rate logs, but " + opt.log +
           " is a delta-angle log (its unit: --angle-unit rad|deg)";
  }
  if (form == GyroLogForm::rate && !opt.angle_unit.empty()) {
    return "--angle-unit applies to delta-angle logs, but " + opt.log +
           " is a rate log (its unit: --rate-unit rad/s|deg/s)";
  }
  return "";
}

// The method takes the log's form (the default method for the form when none was given): the
// usage error, or "".
std::string match_method_to_form(Options& opt, GyroLogForm form) {
  if (opt.method.empty()) {
    opt.method = form == GyroLogForm::rate ? "exponential_map_midpoint_mean" : "coning_2_sample";
  }
  const bool takes_deltas = carries_delta_angles(find_method(opt.method)->layout);
  if (takes_deltas == (form == GyroLogForm::delta_angle)) return "";
  return std::string("method '") + opt.method + "' takes " +
         (takes_deltas ? "delta-angles" : "rates") + " but " + opt.log + " is a " +
         (form == GyroLogForm::rate ? "rate" : "delta-angle") + " log";
}

// Opens --truth and checks its header; false (reported) if it cannot be read.
bool open_truth(TruthTrack& truth, const std::string& path) {
  if (!truth.open(path)) {
    std::fprintf(stderr, "%s: cannot read: %s\n", path.c_str(), std::strerror(errno));
    return false;
  }
  return truth.header();
}

// The output file takes the place of FILE only after a complete run; otherwise it is discarded.
int finish_output(StagedOutputFile& out, const std::string& path, int code) {
  if (code != exit_ok) {
    out.discard();
    return code;
  }
  if (!out.commit()) {
    std::fprintf(stderr, "halfspin-propagate: cannot write %s: %s\n", path.c_str(),
                 std::strerror(errno));
    return exit_input;
  }
  std::fprintf(stderr, "wrote %s\n", path.c_str());
  return exit_ok;
}

// Everything after the command line: the method, the log and its form, --truth, the output.
int propagate_log(Options& opt) {
  if (!opt.method.empty()) {
    const std::string error = check_method(opt.method);
    if (!error.empty()) return usage_error(error);
  }
  std::ifstream in(opt.log, std::ios::binary);
  if (!in) {
    std::fprintf(stderr, "%s: cannot read: %s\n", opt.log.c_str(), std::strerror(errno));
    return exit_input;
  }
  NumericCsvReader<4> reader(in);
  const std::optional<GyroLogLayout> layout =
      read_gyro_log_layout(reader, opt.log, opt.form, opt.columns);
  if (!layout) return exit_input;
  std::string mismatch = match_units_to_form(opt, layout->form);
  if (mismatch.empty()) mismatch = match_method_to_form(opt, layout->form);
  if (!mismatch.empty()) return usage_error(mismatch);
  TruthTrack truth;
  if (!opt.truth.empty() && !open_truth(truth, opt.truth)) return exit_input;
  StagedOutputFile out;
  if (!out.open(opt.output)) {
    return usage_error("cannot create a temporary file beside --output " + opt.output + ": " +
                       std::strerror(errno));
  }
  int code = run_log(opt, reader, *layout, out.get(), opt.truth.empty() ? nullptr : &truth);
  if (code == exit_ok && in.bad()) {
    std::fprintf(stderr, "%s: read error\n", opt.log.c_str());
    code = exit_input;
  }
  return finish_output(out, opt.output, code);
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::string> args;
  for (int i = 1; i < argc; ++i) {
    // NOLINTNEXTLINE(cppcoreguidelines-pro-bounds-pointer-arithmetic): main's argv, index < argc
    args.emplace_back(argv[i]);
  }
  Options opt;
  const ParseResult parsed = parse_options(args, opt);
  if (!parsed.error.empty()) return usage_error(parsed.error);
  if (parsed.command == Command::help) {
    std::fputs(help_text, stdout);
    return exit_ok;
  }
  if (parsed.command == Command::list_methods) {
    list_methods();
    return exit_ok;
  }
  return propagate_log(opt);
}
