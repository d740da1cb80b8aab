#!/usr/bin/env python3
"""Writes the seed corpora of the binary harnesses (fuzz_propagator, fuzz_representations) into
fuzz/corpus/<harness>/. Deterministic; rerun after changing a harness's byte layout:
    python3 fuzz/make_seeds.py
The CSV seeds (fuzz/corpus/fuzz_gyro_log_csv/) are hand-written files. Invented values only.
Byte layouts are documented at the top of each harness."""
import math
import os
import re
import struct

HERE = os.path.dirname(os.path.abspath(__file__))


def u16(v):
    return struct.pack("<H", v)


def frac(x):
    """signed_fraction: x in [-1, 1] -> u16."""
    return u16(max(0, min(65535, round((x + 1.0) / 2.0 * 65535))))


def log_u8(value, lo, hi):
    return bytes([max(0, min(255, round((math.log10(value) - lo) / (hi - lo) * 255)))])


def scaled(x):
    """mostly_scaled: kind < 224, then the fraction of the scale."""
    return bytes([0]) + frac(x)


def dt_fraction(f):
    """decode_dt: kind < 208, then max_step * (u16 + 1) / 65536."""
    return bytes([0]) + u16(max(0, min(65535, round(f * 65536) - 1)))


def write(harness, name, data):
    d = os.path.join(HERE, "corpus", harness)
    os.makedirs(d, exist_ok=True)
    with open(os.path.join(d, name), "wb") as f:
        f.write(data)


def catalogue():
    """(id, run-time name) of every stepper, from include/halfspin/propagation/stepper_catalogue.hpp
    (the harness selects steppers by these stable ids)."""
    path = os.path.join(HERE, "..", "include", "halfspin", "propagation", "stepper_catalogue.hpp")
    entries = []
    with open(path, encoding="utf-8") as f:
        for m in re.finditer(r"CatalogueEntry<(\d+), *([A-Za-z0-9_]+)>", f.read()):
            name = re.sub(r"([a-z0-9])([A-Z])", r"\1_\2", m.group(2))
            name = re.sub(r"([A-Za-z])([0-9])", r"\1_\2", name)
            name = re.sub(r"([0-9])([A-Za-z])", r"\1_\2", name).lower()
            entries.append((int(m.group(1)), name))
    return entries


def propagator_seeds():
    # First byte: bit 0 the scalar, bit 1 the compensated accumulation (float only here: the
    # policy the rounding matters for; the fuzzer reaches the other combinations by mutation).
    for index, name in catalogue():
        for scalar in (0, 1, 2):
            policy = (index + scalar) % 5
            out = bytes([scalar, index])
            out += log_u8(35.0, -2, 3) + log_u8(0.01, -6, 0) + log_u8(1e-3, -7, -1)
            out += frac(0.6) + frac(0.0) + frac(0.8) + frac(0.0)  # initial attitude
            out += bytes([policy, 15])
            # A slow coning-like motion in a fraction of the range, 12 samples at 0.25 max_step,
            # one sample by ticks (3 ticks of 1 ms), one gap, one NaN, one reset.
            for k in range(12):
                a = 0.1 * math.sin(0.7 * k)
                b = 0.1 * math.cos(0.7 * k)
                out += bytes([0]) + dt_fraction(0.25) + scaled(0.02) + scaled(a) + scaled(b)
            out += bytes([5, 3]) + scaled(0.01) + scaled(0.02) + scaled(-0.01)
            out += bytes([0, 208]) + bytes([1]) + scaled(0.0) + scaled(0.0) + scaled(0.0)  # gap
            out += bytes([0]) + dt_fraction(0.25) + bytes([224]) + scaled(0.0) + scaled(0.0)  # NaN
            out += bytes([6]) + frac(1.0) + frac(0.0) + frac(0.0) + frac(0.0)  # reset
            for k in range(4):
                out += bytes([1]) + dt_fraction(0.25) + scaled(0.05) + scaled(-0.05) + scaled(0.1)
            suffix = {0: "float", 1: "double", 2: "float_compensated"}[scalar]
            write("fuzz_propagator", f"{name}_{suffix}", out)


def representations_seeds():
    s2 = math.sqrt(0.5)
    quats = [(1, 0, 0, 0), (0, 1, 0, 0), (s2, 0, s2, 0), (0.5, 0.5, 0.5, 0.5),
             (math.cos(0.5 * (math.pi / 2 - 1e-4)), 0, math.sin(0.5 * (math.pi / 2 - 1e-4)), 0),
             (1.0, 1e-20, -1e-20, 1e-20), (1e-20, 0.6, 0.0, 0.8), (-0.2, 0.3, -0.4, 0.84)]
    for scalar, fmt in ((0, "<f"), (1, "<d")):
        out = bytes([scalar])
        for q, other in zip(quats, quats[1:] + quats[:1]):
            out += bytes([0]) + b"".join(struct.pack(fmt, c) for c in q + other)
        for v, angle in (((0.1, -0.2, 0.3), 2.0), ((3.0, 0.0, 1e30), -7.0), ((1e-40, 0, 0), 1e20)):
            out += bytes([1]) + b"".join(struct.pack(fmt, c) for c in v + (angle,)) + bytes([5])
        c, s = math.cos(0.3), math.sin(0.3)
        for m in ((1, 0, 0, 0, 1, 0, 0, 0, 1), (c, -s, 0, s, c, 0, 0, 0, 1), (-1, 0, 0, 0, -1, 0, 0, 0, 1)):
            out += bytes([2]) + b"".join(struct.pack(fmt, x) for x in m)
        write("fuzz_representations", "tour_" + ("float" if scalar == 0 else "double"), out)


if __name__ == "__main__":
    propagator_seeds()
    representations_seeds()
