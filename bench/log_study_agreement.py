#!/usr/bin/env python3
"""How well the truth-free log study agrees with the truth.

Usage: log_study_agreement.py [--build DIR] [--rate HZ] [--duration S] [--keep DIR]

For each truth motion of halfspin-gyro-log (constant, oscillation, coning, body, demo; invented
parameters) and each log form (delta, rate), writes the exact log and its truth attitude, runs
`halfspin-stepstudy --log LOG --log-truth TRUTH --methods all --scalar float,double --csv`, and
reads the CSV:
  - agreement factor of each (method, scalar, step) row: max(d/e, e/d), d the max difference from
    the log's finest solution (max_error_rad), e the max error against the truth at the same step
    ends (true_error_rad); reported separately for rows flagged "at the reference's resolution"
    (at_reference_resolution = 1) and the others;
  - whether the reference's true error lies in the Richardson interval the tool states
    (reference_error_low_rad .. reference_error_high_rad), and its ratio to the estimate.
Prints one line per log and a summary; exits 1 if an unflagged row disagrees by more than 1.1 (the
triangle-inequality limit the flag threshold implies) or a reference's true error is outside its
interval. Figures, not a unit test: the tools' tests check one motion per form (test_log_study).
"""
import argparse
import csv
import math
import os
import subprocess
import sys
import tempfile

MOTIONS = ["constant", "oscillation", "coning", "body", "demo"]


def main():
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--build", default="build/check", help="build directory (default build/check)")
    p.add_argument("--rate", type=float, default=1000.0, help="log rate (Hz, default 1000)")
    p.add_argument("--duration", type=float, default=10.0, help="log length (s, default 10)")
    p.add_argument("--keep", default=None, help="write the logs and CSVs here (default: a temporary directory)")
    a = p.parse_args()
    gyro_log = os.path.join(a.build, "examples/tools/propagate/halfspin-gyro-log")
    stepstudy = os.path.join(a.build, "examples/tools/stepstudy/halfspin-stepstudy")
    work = a.keep or tempfile.mkdtemp(prefix="log_study_agreement_")
    os.makedirs(work, exist_ok=True)

    worst_clean = 1.0
    worst_flagged = 1.0
    clean_rows = flagged_rows = 0
    bad = []
    ratios = []  # true/estimate where the estimate is reliable
    print(f"{'log':18} {'rows':>5} {'flagged':>7} {'worst factor':>12} {'flagged worst':>13} "
          f"{'ref est (rad)':>13} {'ref true (rad)':>14} {'true/est':>8} {'interval':>9} {'estimate':>10}")
    for motion in MOTIONS:
        truth = os.path.join(work, f"{motion}-truth.csv")
        for form in ["delta", "rate"]:
            log = os.path.join(work, f"{motion}-{form}.csv")
            subprocess.run([gyro_log, "--motion", motion, "--form", form, "--rate", str(a.rate),
                            "--duration", str(a.duration), "--output", log, "--truth", truth],
                           check=True, capture_output=True)
            out = os.path.join(work, f"{motion}-{form}-study.csv")
            subprocess.run([stepstudy, "--log", log, "--log-truth", truth, "--methods", "all",
                            "--scalar", "float,double", "--csv", out],
                           check=True, stdout=subprocess.DEVNULL)
            with open(out, newline="") as f:
                rows = list(csv.DictReader(f))
            clean = flagged = 1.0
            n_flagged = 0
            for r in rows:
                d = float(r["max_error_rad"])
                e = float(r["true_error_rad"])
                factor = max(d / e, e / d) if d > 0 and e > 0 else math.inf
                if r["at_reference_resolution"] == "1":
                    n_flagged += 1
                    flagged = max(flagged, factor)
                else:
                    clean = max(clean, factor)
                    if factor > 1.1:
                        bad.append(f"{motion}-{form} {r['method']} {r['scalar']} k={r['log_periods_per_sample']}: {factor:.4f}")
            clean_rows += len(rows) - n_flagged
            flagged_rows += n_flagged
            worst_clean = max(worst_clean, clean)
            worst_flagged = max(worst_flagged, flagged)
            est = float(rows[0]["reference_error_rad"])
            low = float(rows[0]["reference_error_low_rad"])
            high = float(rows[0]["reference_error_high_rad"])
            true = float(rows[0]["reference_true_error_rad"])
            inside = low <= true <= high
            if not inside:
                bad.append(f"{motion}-{form}: reference true error {true:.3e} outside {low:.3e}..{high:.3e}")
            ratio = true / est if est > 0 else math.inf
            reliable = low > 0  # the tool sets the low end to 0 for an unreliable estimate
            if reliable:
                ratios.append(ratio)
            print(f"{motion + '-' + form:18} {len(rows):5d} {n_flagged:7d} {clean:12.6f} {flagged:13.3g} "
                  f"{est:13.3e} {true:14.3e} {ratio:8.3f} {'inside' if inside else 'OUTSIDE':>9} "
                  f"{'reliable' if reliable else 'unreliable':>10}")
    print(f"\nunflagged rows {clean_rows}: worst agreement factor {worst_clean:.6f}")
    print(f"flagged rows {flagged_rows} (at the reference's resolution): worst factor {worst_flagged:.3g}")
    if ratios:
        print(f"reference's true error / estimate where reliable ({len(ratios)} logs): "
              f"{min(ratios):.3f} .. {max(ratios):.3f}")
    print(f"files in {work}")
    if bad:
        print("\n".join(["FAILED:"] + bad))
        sys.exit(1)


if __name__ == "__main__":
    main()
