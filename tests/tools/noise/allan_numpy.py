#!/usr/bin/env python3
"""Independent check of halfspin-gyro-noise's overlapping Allan deviation with numpy.

Usage: allan_numpy.py LOG TABLE TOLERANCE

LOG is the gyro log (header t,wx,wy,wz or t,dx,dy,dz, SI units), TABLE the tool's --table output.
The overlapping Allan variance is computed here in array code from IEEE Std 952-1997 Annex C's
definition, with the same index convention as the tool (README): theta_0 = 0,
theta_k = cumulative sum of the mean-removed samples (N + 1 points), for cluster size m
    sigma^2 = sum_{k=0}^{N-2m} (theta_{k+2m} - 2 theta_{k+m} + theta_k)^2 / (2 s^2 (N - 2m + 1)),
s = m for rate logs, s = m * tau0 for delta-angle logs, tau0 = (t_last - t_first)/(N - 1).
Every table row (tau, clusters, terms, deviation per axis) must match to TOLERANCE relative.
Exit 0 when all agree, 1 otherwise (each mismatch printed), 2 on bad usage.
"""
import sys

import numpy as np


def main():
    if len(sys.argv) != 4:
        print(__doc__, file=sys.stderr)
        return 2
    log_path, table_path, tolerance = sys.argv[1], sys.argv[2], float(sys.argv[3])
    with open(log_path) as f:
        header = f.readline().strip().split(",")
    data = np.loadtxt(log_path, delimiter=",", skiprows=1, dtype=np.float64)
    rates = "wx" in header
    names = ["wx", "wy", "wz"] if rates else ["dx", "dy", "dz"]
    t = data[:, header.index("t")]
    n = len(t)
    tau0 = (t[-1] - t[0]) / (n - 1)
    table = np.loadtxt(table_path, delimiter=",", skiprows=1, dtype=np.float64, ndmin=2)
    failures = 0
    worst = 0.0
    for axis, name in enumerate(names):
        x = data[:, header.index(name)]
        theta = np.concatenate(([0.0], np.cumsum(x - x.mean())))
        for row in table:
            m = int(row[1])
            d = theta[2 * m:] - 2 * theta[m:n + 1 - m] + theta[:n + 1 - 2 * m]
            s = m if rates else m * tau0
            deviation = np.sqrt(np.sum(d * d) / (2 * s * s * (n - 2 * m + 1)))
            tool = row[4 + 3 * axis]
            relative = abs(tool / deviation - 1)
            worst = max(worst, relative)
            checks = [
                (abs(row[0] - m * tau0) <= 1e-12 * row[0], "tau"),
                (int(row[2]) == n // m, "clusters"),
                (int(row[3]) == n - 2 * m + 1, "terms"),
                (relative <= tolerance, "deviation"),
            ]
            for ok, what in checks:
                if not ok:
                    failures += 1
                    print(f"{name} m={m}: {what} differs: tool row {row.tolist()}, "
                          f"numpy deviation {deviation!r} (relative {relative:.3g})")
    print(f"numpy check: {len(table)} averaging times x 3 axes, worst relative difference "
          f"{worst:.3g} (tolerance {tolerance:g})")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
