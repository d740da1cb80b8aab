#!/usr/bin/env python3
"""What each guarantee of the validating propagator costs on this host: an ablation.

  python3 bench/propagator_ablation.py [--repetitions 5] [--min-time 0.1] [--rounds 2]
  python3 bench/propagator_ablation.py --check    (only that every patch still applies; CI)

Copies include/ to a temporary directory and builds the same small Google Benchmark program
against it several times, each time with one more of the propagator's duties cut out of
propagator.hpp by a text patch (cumulative, in this order):

  shipped           the header as it is
  no time sum       elapsed time as a plain sum instead of the Kahan sum
  no validation     every sample accepted without the range and finiteness test
  no counters       the step and sample counters not incremented
  no renormalization
                    the step's result kept as it is: no norm, no Newton factor, no result check

The last variant is no longer a propagator anyone should run: the cuts exist only to price each
duty. Then alternatives, each patched onto the shipped header alone (ALTERNATIVES below: the
Newton factor from the previous attitude's norm, off the product's chain). Every binary measures the bare step (step/), the propagator (propagator/) and the Eigen
baseline, float and double, with the runs of bench/callgrind (the harness of bench/measure.hpp);
the binaries are run in turn for --rounds rounds and each figure is the median over all of their
repetitions. A patch that no longer finds its text in propagator.hpp stops the script: the
ablation must be updated with the header. Needs g++, libbenchmark-dev and libeigen3-dev.
"""
import argparse
import json
import os
import shutil
import statistics
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
HEADER = os.path.join("halfspin", "propagation", "propagator.hpp")

# (variant name, [(text in propagator.hpp, replacement)]), applied cumulatively.
PATCHES = [
    ("shipped", []),
    ("no time sum", [(
        """    const T y = dt - elapsed_carry_;
    const T t = elapsed_sum_ + y;
    elapsed_carry_ = (t - elapsed_sum_) - y;
    elapsed_sum_ = t;""",
        "    elapsed_sum_ += dt;")]),
    ("no validation", [(
        """    if (!accepted) {
      const Status s = classify(sample, dt);""",
        """    static_cast<void>(accepted);
    if (false) {
      const Status s = classify(sample, dt);""")]),
    ("no counters", [
        ("    ++counters_.steps;\n", "\n"),
        ("      ++counters_.samples_accepted;\n      return Status::ok;",
         "      return Status::ok;"),
        ("    ++counters_.samples_accepted;\n    shift_history();", "    shift_history();"),
    ]),
    ("no renormalization", [(
        """    const T estimate = increment.error_estimate;
    if constexpr (detail::has_near_unit_form<Renormalization, T>::value) {
      constexpr T range""",
        """    const T estimate = increment.error_estimate;
    if (true) {
      state_ = Accumulation::with_attitude(advanced, next);
      count_step(estimate, dt);
      return true;
    }
    if constexpr (detail::has_near_unit_form<Renormalization, T>::value) {
      constexpr T range""")]),
]

# Alternatives measured on the shipped header alone (not cumulative), as extra columns:
#   lagged factor   the Newton factor from ‖q‖²·‖1 + δ‖² (the previous attitude's norm times the
#                   increment's, equal to ‖next‖² in exact arithmetic) instead of ‖next‖², so
#                   that it could run beside the product instead of after it (it changes bits).
ALTERNATIVES = [
    ("lagged factor", [(
        """      const T s = squared_norm(next);""",
        """      const Quaternion<T> one_plus{increment.delta.w + T(1), increment.delta.x,
                                   increment.delta.y, increment.delta.z};
      const T s = squared_norm(Accumulation::attitude(state_)) * squared_norm(one_plus);""")]),
]

STEPPERS = ["ExponentialMapHoldEnd", "Coning2Sample", "Coning4Sample", "RungeKutta4Sampled"]

PROGRAM = """#include <benchmark/benchmark.h>
#include "baseline_runs.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"
#include "measure.hpp"
#include "runs.hpp"
using namespace halfspin;
using namespace halfspin::bench;
// The counters are cut in one variant, so health is the attitude's alone (finite, near unit norm).
template <class S, class T>
struct AblationRun : PropagatorRun<S, T> {
  bool healthy_after(std::uint64_t) const noexcept { return healthy(this->attitude()); }
};
#define HALFSPIN_ABLATION(S, T) \\
  BENCHMARK(measure<BareStepRun<S, T>>)->Name("step/" #S "/" #T); \\
  BENCHMARK(measure<AblationRun<S, T>>)->Name("propagator/" #S "/" #T);
""" + "".join(f"HALFSPIN_ABLATION({s}, float)\nHALFSPIN_ABLATION({s}, double)\n" for s in STEPPERS) + """
BENCHMARK(measure<EigenExponentialMapRun<float>>)->Name("baseline/eigen/float");
BENCHMARK(measure<EigenExponentialMapRun<double>>)->Name("baseline/eigen/double");
BENCHMARK_MAIN();
"""


def patched(text, patches):
    for old, new in patches:
        if text.count(old) != 1:
            raise SystemExit(f"propagator_ablation.py: a patch no longer matches {HEADER} exactly "
                             f"once:\n{old}")
        text = text.replace(old, new, 1)
    return text


def build(workdir, index, patches):
    include = os.path.join(workdir, f"include{index}")
    shutil.copytree(os.path.join(ROOT, "include"), include)
    path = os.path.join(include, HEADER)
    with open(path) as f:
        text = patched(f.read(), patches)
    with open(path, "w") as f:
        f.write(text)
    source = os.path.join(workdir, "ablation.cpp")
    with open(source, "w") as f:
        f.write(PROGRAM)
    binary = os.path.join(workdir, f"ablation{index}")
    subprocess.run(["g++", "-std=c++17", "-O3", "-DNDEBUG", "-I" + include,
                    "-I" + os.path.join(ROOT, "examples", "tools", "common"),
                    "-I" + os.path.join(ROOT, "bench"),
                    "-I" + os.path.join(ROOT, "bench", "callgrind"), "-I/usr/include/eigen3",
                    source, "-o", binary, "-lbenchmark", "-lpthread"], check=True)
    return binary


def run(binary, repetitions, min_time):
    out = subprocess.run([binary, f"--benchmark_repetitions={repetitions}",
                          f"--benchmark_min_time={min_time}", "--benchmark_format=json"],
                         check=True, capture_output=True, text=True).stdout
    times = {}
    for b in json.loads(out)["benchmarks"]:
        if b.get("run_type") == "iteration":
            if b.get("error_occurred"):
                raise SystemExit(f"{b['name']}: {b.get('error_message')}")
            times.setdefault(b["run_name"], []).append(b["real_time"])
    return times


def main():
    parser = argparse.ArgumentParser(description=__doc__,
                                     formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--repetitions", type=int, default=5)
    parser.add_argument("--min-time", type=float, default=0.1)
    parser.add_argument("--rounds", type=int, default=2)
    parser.add_argument("--check", action="store_true",
                        help="only check that every patch applies to include/ as it is")
    args = parser.parse_args()
    if args.check:
        with open(os.path.join(ROOT, "include", HEADER)) as f:
            text = f.read()
        applied = []
        for name, patches in PATCHES:
            applied = applied + patches
            patched(text, applied)
        for name, patches in ALTERNATIVES:
            patched(text, patches)
        print(f"propagator_ablation.py: all {len(PATCHES) - 1} cuts and {len(ALTERNATIVES)} "
              f"alternatives apply to {HEADER}")
        return 0
    with tempfile.TemporaryDirectory() as workdir:
        binaries = []
        applied = []
        for index, (name, patches) in enumerate(PATCHES):
            applied = applied + patches
            print(f"building: {name}", file=sys.stderr)
            binaries.append((name, build(workdir, index, applied)))
        for index, (name, patches) in enumerate(ALTERNATIVES, start=len(PATCHES)):
            print(f"building: {name}", file=sys.stderr)
            binaries.append((name, build(workdir, index, patches)))
        samples = {name: {} for name, _ in binaries}
        for r in range(args.rounds):
            for name, binary in binaries:
                print(f"round {r + 1}: {name}", file=sys.stderr)
                for bench, t in run(binary, args.repetitions, args.min_time).items():
                    samples[name].setdefault(bench, []).extend(t)
    median = {n: {b: statistics.median(t) for b, t in s.items()} for n, s in samples.items()}
    shipped = median["shipped"]
    print("ns per step, median of", args.rounds * args.repetitions, "repetitions; each column "
          "up to `no renormalization` cuts one more of the propagator's duties (cumulative); "
          "the columns after it are alternatives on the shipped header. step = the bare step, "
          "the same in every build.\n")
    names = [n for n, _ in PATCHES + ALTERNATIVES]

    def rows(scalar):
        """(stepper, bare step ns, propagator ns per column) for one scalar."""
        for s in STEPPERS:
            step = statistics.median(median[n][f"step/{s}/{scalar}"] for n in names)
            yield s, step, [median[n][f"propagator/{s}/{scalar}"] for n in names]

    print("| benchmark | step | " + " | ".join(names) + " |")
    print("|---|---:|" + "---:|" * len(names))
    for scalar in ("float", "double"):
        for s, step, times in rows(scalar):
            print(f"| `{s}` {scalar} | {step:.1f} | " + " | ".join(f"{t:.1f}" for t in times) + " |")
        eigen = shipped[f"baseline/eigen/{scalar}"]
        print(f"| Eigen baseline {scalar} | | {eigen:.1f} |" + " |" * (len(names) - 1))
    print("\nPropagator ÷ step per column (issue 18 asks ≤ 1.25 with every duty kept):\n")
    print("| stepper | " + " | ".join(names) + " |")
    print("|---|" + "---:|" * len(names))
    for scalar in ("float", "double"):
        for s, step, times in rows(scalar):
            print(f"| `{s}` {scalar} | " + " | ".join(f"{t / step:.2f}" for t in times) + " |")
    return 0


if __name__ == "__main__":
    sys.exit(main())
