#!/usr/bin/env python3
"""Instructions per step of every halfspin stepper, counted by valgrind's callgrind.

Runs halfspin_callgrind_driver under `valgrind --tool=callgrind` at two step counts per stepper and
scalar type and divides the difference of the instruction totals (Ir) by the difference of the step
counts, so that process start-up, table set-up and printing cancel. Instruction counts do not depend
on the load of the machine, so they are repeatable where timings are not. Prints a table: method,
scalar, path, instructions per step, declared flops, instructions / flops.

    bench/callgrind/instruction_counts.py --driver build/x/bench/halfspin_callgrind_driver
        [--methods exponential_map_hold_end,runge_kutta_4_sampled] [--scalars float,double]
        [--propagator exponential_map_hold_end,coning_1_sample,...] [--baselines] [--steps 2560 12800]
        [--format table|csv]

Python 3 standard library only.
"""
import argparse
import os
import re
import subprocess
import sys
import tempfile

DEFAULT_PROPAGATOR = ["exponential_map_hold_end", "exponential_map_hold_start", "coning_1_sample",
                      "coning_2_sample", "magnus_4", "runge_kutta_4_sampled", "runge_kutta_4_rate_function"]
BASELINES = [("eigen_exponential_map", "baseline/eigen_exponential_map"), ("odeint_rk4", "baseline/odeint_rk4"),
             ("first_order_normalized", "baseline/first_order_normalized"),
             ("floor_exponential_map", "floor/exponential_map")]


def list_methods(driver):
    out = subprocess.run([driver, "--list"], check=True, capture_output=True, text=True).stdout
    methods = []
    for line in out.splitlines():
        name, flops, sample_driven = line.split()
        methods.append((name, int(flops), sample_driven == "1"))
    return methods


def total_instructions(driver, method, scalar, steps, mode, workdir):
    """Ir total of one driver run under callgrind."""
    out_file = os.path.join(workdir, "callgrind.out")
    cmd = ["valgrind", "--tool=callgrind", "--callgrind-out-file=" + out_file,
           driver, method, scalar, str(steps), mode]
    result = subprocess.run(cmd, capture_output=True, text=True)
    if result.returncode != 0:
        raise RuntimeError("driver failed: %s\n%s" % (" ".join(cmd), result.stderr))
    with open(out_file) as f:
        for line in f:
            m = re.match(r"^(?:summary|totals):\s+(\d+)", line)
            if m:
                return int(m.group(1))
    raise RuntimeError("no instruction total in " + out_file)


def per_step(driver, method, scalar, mode, steps, workdir):
    low, high = steps
    a = total_instructions(driver, method, scalar, low, mode, workdir)
    b = total_instructions(driver, method, scalar, high, mode, workdir)
    return (b - a) / (high - low)


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--driver", required=True, help="path of halfspin_callgrind_driver")
    p.add_argument("--methods", default="", help="comma-separated stepper names (default: all)")
    p.add_argument("--scalars", default="float,double")
    p.add_argument("--propagator", default=",".join(DEFAULT_PROPAGATOR),
                   help="steppers also counted through the Propagator ('' for none)")
    p.add_argument("--baselines", action="store_true", help="also count the baselines and floor")
    p.add_argument("--steps", nargs=2, type=int, default=[2560, 12800],
                   help="the two step counts (multiples of 256 keep the per-table normalization exact)")
    p.add_argument("--format", choices=["table", "csv"], default="table")
    args = p.parse_args()

    catalogue = list_methods(args.driver)
    wanted = [m for m in args.methods.split(",") if m]
    scalars = [s for s in args.scalars.split(",") if s]
    prop = [m for m in args.propagator.split(",") if m]
    known = {name for name, _, _ in catalogue}
    for m in wanted + prop:
        if m not in known:
            sys.exit("unknown method %s" % m)

    rows = []  # (label, scalar, path, instructions per step, flops)
    with tempfile.TemporaryDirectory() as workdir:
        for name, flops, _ in catalogue:
            if wanted and name not in wanted:
                continue
            for s in scalars:
                rows.append((name, s, "step", per_step(args.driver, name, s, "step", args.steps, workdir), flops))
        for name, flops, _ in catalogue:
            if name not in prop:
                continue
            for s in scalars:
                rows.append((name, s, "propagator",
                             per_step(args.driver, name, s, "propagator", args.steps, workdir), flops))
        if args.baselines:
            for driver_name, label in BASELINES:
                for s in scalars:
                    rows.append((label, s, "step",
                                 per_step(args.driver, driver_name, s, "step", args.steps, workdir), None))

    if args.format == "csv":
        print("method,scalar,path,instructions_per_step,declared_flops,ratio")
        for name, s, path, ins, flops in rows:
            ratio = "" if not flops else "%.2f" % (ins / flops)
            print("%s,%s,%s,%.1f,%s,%s" % (name, s, path, ins, "" if flops is None else flops, ratio))
        return
    print("| method | scalar | path | instructions per step | declared flops | instructions / flops |")
    print("| --- | --- | --- | ---: | ---: | ---: |")
    for name, s, path, ins, flops in rows:
        ratio = "" if not flops else "%.2f" % (ins / flops)
        print("| `%s` | %s | %s | %.1f | %s | %s |" % (name, s, path, ins, "" if flops is None else flops, ratio))


if __name__ == "__main__":
    main()
