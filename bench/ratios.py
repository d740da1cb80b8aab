#!/usr/bin/env python3
"""The benchmark targets of halfspin as ratios measured within one run of halfspin_bench.

Runs halfspin_bench once with --benchmark_format=json on the benchmarks the ratios need, with
repetitions and random interleaving (so that a load change on a shared machine hits both sides of a
ratio alike), takes the median CPU time of each, and prints every ratio with its target:

  baseline/eigen_exponential_map / propagator/exponential_map_hold_end   ≥ 4 (double), ≥ 1.5 (float)
  baseline/eigen_exponential_map / propagator/coning_1_sample   ≥ 4 (double), ≥ 1.5 (float)
  baseline/odeint_rk4 / step/runge_kutta_4_sampled               ≥ 2 (both)
  step/exponential_map_hold_end / floor/exponential_map                  ≤ 1.3 (both)
  propagator/<m> / step/<m>                            ≤ 1.25 (every sample-driven stepper)

    bench/ratios.py --bench build/x/bench/halfspin_bench [--repetitions 5] [--min-time 0.2]
        [--json-out run.json] [--from-json run.json]

Figures (speed) on a shared or noisy machine vary; the ratios are what to compare. Exit status 0
unless the benchmark run fails. Python 3 standard library only.
"""
import argparse
import json
import subprocess
import sys

SCALARS = ("float", "double")


def run_bench(binary, pattern, repetitions, min_time):
    cmd = [binary, "--benchmark_format=json", "--benchmark_filter=" + pattern,
           "--benchmark_repetitions=%d" % repetitions, "--benchmark_min_time=%g" % min_time,
           "--benchmark_enable_random_interleaving=true", "--benchmark_report_aggregates_only=true"]
    result = subprocess.run(cmd, capture_output=True, text=True)
    if result.returncode != 0:
        sys.exit("halfspin_bench failed:\n" + result.stderr)
    return json.loads(result.stdout)


def medians(report):
    """Median CPU time (ns) per benchmark name; with a single repetition, the plain figure."""
    out = {}
    plain = {}
    for b in report["benchmarks"]:
        if b.get("error_occurred"):
            sys.exit("benchmark %s reported an error: %s" % (b["name"], b.get("error_message")))
        scale = {"ns": 1.0, "us": 1e3, "ms": 1e6, "s": 1e9}[b.get("time_unit", "ns")]
        if b.get("run_type") == "aggregate":
            if b.get("aggregate_name") == "median":
                out[b["run_name"]] = b["cpu_time"] * scale
        else:
            plain[b.get("run_name", b["name"])] = b["cpu_time"] * scale
    for k, v in plain.items():
        out.setdefault(k, v)
    return out


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--bench", help="path of halfspin_bench")
    p.add_argument("--repetitions", type=int, default=5)
    p.add_argument("--min-time", type=float, default=0.2, help="seconds per repetition")
    p.add_argument("--json-out", help="also save the benchmark's JSON report here")
    p.add_argument("--from-json", help="compute the ratios from a saved JSON report instead")
    args = p.parse_args()

    if args.from_json:
        with open(args.from_json) as f:
            report = json.load(f)
    else:
        if not args.bench:
            sys.exit("--bench or --from-json is required")
        report = run_bench(args.bench, "^(step|propagator|baseline|floor)/", args.repetitions,
                           args.min_time)
        if args.json_out:
            with open(args.json_out, "w") as f:
                json.dump(report, f, indent=1)
    t = medians(report)

    ctx = report.get("context", {})
    print("# %s, %s CPUs at %s MHz, load average %s; median CPU time of %s repetitions" % (
        ctx.get("host_name", "?"), ctx.get("num_cpus", "?"), ctx.get("mhz_per_cpu", "?"),
        ctx.get("load_avg", "?"), args.repetitions if not args.from_json else "the saved"))
    rows = []  # (what, scalar, numerator, denominator, ratio, target text, holds)

    def ratio(what, scalar, num, den, target, at_least):
        a, b = t.get(num), t.get(den)
        if a is None or b is None:
            rows.append((what, scalar, num, den, None, target, None))
            return
        r = a / b
        rows.append((what, scalar, "%.1f" % a, "%.1f" % b, r, target, r >= target if at_least else r <= target))

    for s in SCALARS:
        fast = 4.0 if s == "double" else 1.5
        for m in ("exponential_map_hold_end", "coning_1_sample"):
            ratio("eigen_exponential_map / propagator %s" % m, s, "baseline/eigen_exponential_map/" + s,
                  "propagator/%s/%s" % (m, s), fast, True)
        ratio("odeint_rk4 / step runge_kutta_4_sampled", s, "baseline/odeint_rk4/" + s, "step/runge_kutta_4_sampled/" + s, 2.0, True)
        ratio("step exponential_map_hold_end / floor exponential_map", s, "step/exponential_map_hold_end/" + s, "floor/exponential_map/" + s, 1.3, False)
    methods = sorted({n.split("/")[1] for n in t if n.startswith("propagator/")})
    for m in methods:
        for s in SCALARS:
            ratio("propagator / step %s" % m, s, "propagator/%s/%s" % (m, s), "step/%s/%s" % (m, s), 1.25, False)

    print("| ratio | scalar | numerator (ns) | denominator (ns) | ratio | target | holds |")
    print("| --- | --- | ---: | ---: | ---: | --- | --- |")
    for what, s, a, b, r, target, holds in rows:
        if r is None:
            print("| %s | %s | – | – | – | | not measured |" % (what, s))
            continue
        sign = "≥" if what.startswith(("eigen", "odeint")) else "≤"
        print("| %s | %s | %s | %s | %.2f | %s %.2f | %s |" % (what, s, a, b, r, sign, target,
                                                               "yes" if holds else "**no**"))


if __name__ == "__main__":
    main()
