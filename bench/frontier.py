#!/usr/bin/env python3
"""Cost-accuracy frontier from a halfspin-stepstudy CSV.

Usage: frontier.py STUDY.csv [--scalar double|float] [--budget RAD]

Reads the columns method,scalar,step_s,max_error_rad,bound_rad,ns_per_step that
`halfspin-stepstudy --csv` writes. The cost of a (method, step) point is the CPU time it takes to
propagate one second of flight: ns_per_step / step_s (ns per simulated second; divide by 1e9 for the
fraction of one core). A point is on the frontier when no other point has both a lower cost and a
lower max error (Pareto). Prints every frontier point, cheapest first, and the methods that own it;
with --budget, the cheapest frontier point whose measured error meets the budget.

The measured error is over the study's run (--duration of the study), not the budget horizon; the
ns per step are measured on the machine the study ran on (noisy if it was shared).
"""
import argparse
import csv
import sys


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("csv")
    p.add_argument("--scalar", default="double", choices=["double", "float"])
    p.add_argument("--budget", type=float, default=None, help="max error budget (rad)")
    a = p.parse_args()

    points = []
    with open(a.csv, newline="") as f:
        reader = csv.DictReader(f)
        expected = ["method", "scalar", "step_s", "max_error_rad", "bound_rad", "ns_per_step"]
        if reader.fieldnames != expected:
            sys.exit(f"{a.csv}: expected columns {','.join(expected)}")
        for row in reader:
            if row["scalar"] != a.scalar or not row["max_error_rad"] or not row["ns_per_step"]:
                continue
            step = float(row["step_s"])
            ns = float(row["ns_per_step"])
            err = float(row["max_error_rad"])
            points.append((ns / step, err, row["method"], step, ns))
    if not points:
        sys.exit(f"{a.csv}: no measured {a.scalar} rows")

    points.sort(key=lambda x: (x[0], x[1]))
    frontier = []
    best_error = float("inf")
    for pt in points:
        if pt[1] < best_error:
            frontier.append(pt)
            best_error = pt[1]

    print(f"Cost-accuracy frontier ({a.scalar}; cost = ns per simulated second = ns/step / step):")
    print(f"  {'method':34} {'step (s)':>10} {'ns/step':>8} {'ms CPU per s':>13} {'max error (rad)':>16}")
    for cost, err, method, step, ns in frontier:
        print(f"  {method:34} {step:10.3e} {ns:8.1f} {cost / 1e6:13.4f} {err:16.3e}")
    owners = []
    for pt in frontier:
        if pt[2] not in owners:
            owners.append(pt[2])
    print("Methods on the frontier: " + ", ".join(owners))
    if a.budget is not None:
        meeting = [pt for pt in frontier if pt[1] <= a.budget]
        if meeting:
            cost, err, method, step, ns = meeting[0]
            print(f"Cheapest frontier point within {a.budget:.3e} rad: {method} at step {step:.3e} s "
                  f"({cost / 1e6:.4f} ms CPU per simulated second, error {err:.3e} rad)")
        else:
            print(f"No measured point within {a.budget:.3e} rad")


if __name__ == "__main__":
    main()
