#!/usr/bin/env python3
"""How tight the a-priori horizon bounds are: bound/measured per stepper over the project's motions.

Runs halfspin-stepstudy on each truth motion (constant, oscillation, coning, body, demo) with every
stepper of the catalogue in double, reads its CSV (max error over the run against the exact truth,
and the library's horizon bound over the same duration), and prints per stepper the number of
points, the median and the worst bound/measured, and the motion of the worst. Only points where
truncation dominates are counted: measured error above --floor rad (default 1e-11, about 100 times
double's rounding over the runs' 10³–10⁵ steps); below it the ratio measures rounding, not the
bound. The issue targets it reports against (describe-a-vehicle issue): median ≤ 10 and worst ≤ 100
for the exponential-map, Magnus and coning families, median ≤ 100 for the Runge–Kutta family.

It also asks stepstudy for the sum of each run's local errors (--local-errors: every step started
from the exact attitude) and splits bound/measured into two factors:

    bound/measured = (bound / sum of local errors) × (sum of local errors / measured)

The second factor is what cancels between steps: a horizon bound that adds up local errors cannot
go below the sum even with exact local errors, so where its median alone exceeds the target, the
target is out of reach for any bound of that form and needs one that follows the errors' directions
over the horizon. The first factor is the looseness of the local bound itself (and of the start-up,
rounding and growth terms the horizon bound adds).

    bench/bound_tightness.py --stepstudy build/check/examples/tools/stepstudy/halfspin-stepstudy
        [--duration 5] [--floor 1e-11] [--csv-dir DIR] [--from-csv-dir DIR]

Takes about a minute per motion on one core. Python 3 standard library only.
"""
import argparse
import csv
import os
import statistics
import subprocess
import sys
import tempfile

MOTIONS = ("constant", "oscillation", "coning", "body", "demo")
ROTATION_VECTOR_FAMILY = ("exponential_map", "magnus", "coning")


def family_target(method):
    """(median target, worst target or None) by family."""
    if method.startswith(ROTATION_VECTOR_FAMILY):
        return 10.0, 100.0
    return 100.0, None


def run(stepstudy, directory, duration):
    for motion in MOTIONS:
        path = os.path.join(directory, motion + ".csv")
        cmd = [stepstudy, "--motion", motion, "--methods", "all", "--scalar", "double",
               "--duration", str(duration), "--local-errors", "--csv", path]
        result = subprocess.run(cmd, capture_output=True, text=True)
        if result.returncode != 0:
            sys.exit("halfspin-stepstudy failed on %s:\n%s" % (motion, result.stderr))


def ratios(directory, floor):
    per_method = {}
    order = []
    for motion in MOTIONS:
        with open(os.path.join(directory, motion + ".csv"), newline="") as f:
            for row in csv.DictReader(f):
                measured = float(row["max_error_rad"])
                bound = float(row["bound_rad"]) if row["bound_rad"] else float("inf")
                if row["method"] not in per_method:
                    per_method[row["method"]] = []
                    order.append(row["method"])
                local = float(row["local_error_sum_rad"])
                if measured > floor:
                    per_method[row["method"]].append((bound / measured, motion, local / measured))
    return order, per_method


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--stepstudy", help="path of halfspin-stepstudy")
    parser.add_argument("--duration", type=float, default=5.0, help="run length (s), default 5")
    parser.add_argument("--floor", type=float, default=1e-11,
                        help="count points with measured error above this (rad)")
    parser.add_argument("--csv-dir", help="keep the stepstudy CSVs here")
    parser.add_argument("--from-csv-dir", help="recompute from CSVs kept earlier")
    args = parser.parse_args()
    if args.from_csv_dir:
        directory = args.from_csv_dir
    else:
        if not args.stepstudy:
            parser.error("--stepstudy or --from-csv-dir is required")
        directory = args.csv_dir or tempfile.mkdtemp(prefix="halfspin-tightness-")
        os.makedirs(directory, exist_ok=True)
        run(args.stepstudy, directory, args.duration)
    order, per_method = ratios(directory, args.floor)
    print("bound/measured over %s (double, points with measured error > %g rad)"
          % (", ".join(MOTIONS), args.floor))
    print("'exact sum': sum of the run's local errors/measured, the least bound/measured any bound")
    print("that adds up local errors can reach (it would need exact local errors to get there)")
    print("%-38s %4s %9s %9s  %-12s %9s %9s  %s" % (
        "method", "n", "median", "worst", "worst on", "exact sum", "its worst",
        "target (median, worst): verdict"))
    for method in order:
        points = per_method[method]
        median_target, worst_target = family_target(method)
        if not points:
            print("%-38s %4d %9s %9s" % (method, 0, "-", "-"))
            continue
        median = statistics.median(p[0] for p in points)
        worst, where = max((p[0], p[1]) for p in points)
        sum_median = statistics.median(p[2] for p in points)
        sum_worst = max(p[2] for p in points)

        def meets(m, w):
            return m <= median_target and (worst_target is None or w <= worst_target)

        if meets(median, worst):
            verdict = "met"
        elif not meets(sum_median, sum_worst):
            verdict = "missed; out of reach for a summing bound (cancellation between steps)"
        else:
            verdict = "missed; the local bound (exact local errors, summed, would meet it)"
        target = "%g, %s" % (median_target, "%g" % worst_target if worst_target else "-")
        print("%-38s %4d %9.3g %9.3g  %-12s %9.3g %9.3g  %s: %s" % (
            method, len(points), median, worst, where, sum_median, sum_worst, target, verdict))


if __name__ == "__main__":
    main()
