#!/usr/bin/env python3
"""The benchmark targets of halfspin as ratios measured within one run of halfspin_bench.

Runs halfspin_bench once with --benchmark_format=json on the benchmarks the ratios need, with
repetitions and random interleaving (so that a load change on a shared machine hits both sides of a
ratio alike), takes the median CPU time of each, and prints every ratio with its target:

  baseline/eigen_exponential_map / propagator/exponential_map_hold_end  ≥ 1.8 (both scalars)
  baseline/odeint_rk4 / step/runge_kutta_4_sampled                      ≥ 1.5 (both)
  step/exponential_map_hold_end / floor/exponential_map                 ≤ 1.3 (both)
  propagator/<m> / step/<m>                   ≤ 1.25 (every sample-driven stepper, both scalars)

(issue 18: the validating propagator's fixed cost at most a quarter of its step, and so faster than
the general-purpose libraries' unvalidated updates). Also printed without a target: the compensated
accumulation's cost, propagator_compensated/<m> / propagator/<m>, and the first-order firmware
update, baseline/first_order_normalized, against the propagator's cheapest steps. Each line says
whether its target holds; a last line counts the misses.

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
        report = run_bench(args.bench, "^(step|propagator|propagator_compensated|baseline|floor)/",
                           args.repetitions,
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
        ratio("eigen_exponential_map / propagator exponential_map_hold_end", s,
              "baseline/eigen_exponential_map/" + s, "propagator/exponential_map_hold_end/" + s,
              1.8, True)
        ratio("odeint_rk4 / step runge_kutta_4_sampled", s, "baseline/odeint_rk4/" + s,
              "step/runge_kutta_4_sampled/" + s, 1.5, True)
        ratio("step exponential_map_hold_end / floor exponential_map", s,
              "step/exponential_map_hold_end/" + s, "floor/exponential_map/" + s, 1.3, False)
    # Sample-driven steppers: the ones measured with push() (rate-function ones take advance()).
    methods = sorted({n.split("/")[1] for n in t if n.startswith("propagator/")} -
                     {m for m in {n.split("/")[1] for n in t} if m.endswith("_rate_function")})
    for m in methods:
        for s in SCALARS:
            ratio("propagator / step %s" % m, s, "propagator/%s/%s" % (m, s), "step/%s/%s" % (m, s), 1.25, False)
    info = []  # (what, scalar, numerator, denominator, ratio)
    for m in methods:
        for s in SCALARS:
            a, b = t.get("propagator_compensated/%s/%s" % (m, s)), t.get("propagator/%s/%s" % (m, s))
            if a is not None and b is not None:
                info.append(("propagator_compensated / propagator %s" % m, s, a, b, a / b))
    for s in SCALARS:
        base = t.get("baseline/first_order_normalized/" + s)
        for m in ("exponential_map_hold_end", "coning_1_sample", "coning_2_sample"):
            p_ns = t.get("propagator/%s/%s" % (m, s))
            if base is not None and p_ns is not None:
                info.append(("propagator %s / baseline first_order_normalized" % m, s, p_ns, base,
                             p_ns / base))

    print("| ratio | scalar | numerator (ns) | denominator (ns) | ratio | target | holds |")
    print("| --- | --- | ---: | ---: | ---: | --- | --- |")
    for what, s, a, b, r, target, holds in rows:
        if r is None:
            print("| %s | %s | – | – | – | | not measured |" % (what, s))
            continue
        sign = "≥" if what.startswith(("eigen", "odeint")) else "≤"
        print("| %s | %s | %s | %s | %.2f | %s %.2f | %s |" % (what, s, a, b, r, sign, target,
                                                               "yes" if holds else "**no**"))
    missed = [r for r in rows if r[6] is False]
    unmeasured = [r for r in rows if r[6] is None]
    print()
    print("targets: %d held, %d missed, %d not measured" % (
        len(rows) - len(missed) - len(unmeasured), len(missed), len(unmeasured)))
    if info:
        print()
        print("| without a target | scalar | numerator (ns) | denominator (ns) | ratio |")
        print("| --- | --- | ---: | ---: | ---: |")
        for what, s, a, b, r in info:
            print("| %s | %s | %.1f | %.1f | %.2f |" % (what, s, a, b, r))


if __name__ == "__main__":
    main()
