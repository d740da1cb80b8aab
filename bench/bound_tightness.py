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
               "--duration", str(duration), "--csv", path]
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
                if measured > floor:
                    per_method[row["method"]].append((bound / measured, motion))
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
    print("%-38s %4s %10s %10s  %-12s %s" % ("method", "n", "median", "worst", "worst on",
                                              "target (median, worst)"))
    for method in order:
        points = per_method[method]
        median_target, worst_target = family_target(method)
        if not points:
            print("%-38s %4d %10s %10s" % (method, 0, "-", "-"))
            continue
        median = statistics.median(r for r, _ in points)
        worst, where = max(points)
        verdict = "met" if median <= median_target and (
            worst_target is None or worst <= worst_target) else "missed"
        target = "%g, %s" % (median_target, "%g" % worst_target if worst_target else "-")
        print("%-38s %4d %10.3g %10.3g  %-12s %s: %s" % (method, len(points), median, worst, where,
                                                         target, verdict))


if __name__ == "__main__":
    main()
