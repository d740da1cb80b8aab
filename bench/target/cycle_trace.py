#!/usr/bin/env python3
"""Cycles per step on Cortex-M4F from the instructions qemu actually executes (the path the
disassembly walk in cycle_estimate.py cannot follow: loops kept by the compiler, calls).

  python3 bench/target/cycle_trace.py build/<dir>/target-cortex-m4f
  python3 bench/target/cycle_trace.py build/<dir>/target-cortex-m4f --listing <image> [k]
(the second prints the executed instructions of the k-th call from the end, 1 = the last, each
with its price: <image> is a footprint image without `footprint_` and `.elf`, e.g.
exponential_map_hold_end_float_propagator).

For each footprint/footprint_<stepper>_float_step.elf, runs it under qemu-system-arm with one
instruction per translation block (-singlestep) and an execution log (-d exec,nochain), cuts the
log into calls of halfspin_footprint_step (from its entry until control is back in main, callees
included: the rate function of rate-function steppers, any libm call), and prices every executed
instruction with the same Cortex-M4 timing table as cycle_estimate.py (FROM MEMORY; branches are
"taken" when the next executed address is not the next instruction). qemu models no time: these
are instruction-timing estimates along the executed path, not measurements, and assume zero wait
states and no stalls. Reported: executed instructions and estimated cycles per step (mean over
the image's calls). Propagator images without a step image (`<stepper>+calibrated`: the gyro
calibration stage) get a row of their own and the cycles they add per sample to `<stepper>`.
"""
import os
import re
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from cycle_estimate import P, classify  # noqa: E402  (same timing table)

FUNCTION = "halfspin_footprint_step"
PUSH_FUNCTION = "halfspin_footprint_push"  # the propagator images' entry point


def disassembly(elf):
    """address → (mnemonic, operands, next_address) for every instruction, and symbol ranges."""
    out = subprocess.run(["arm-none-eabi-objdump", "-d", "--no-show-raw-insn", elf], check=True,
                         capture_output=True, text=True).stdout
    insns = {}
    symbols = {}
    current = None
    order = []
    for line in out.splitlines():
        m = re.match(r"^([0-9a-f]+) <([^>]+)>:$", line)
        if m:
            current = m.group(2)
            symbols[current] = [int(m.group(1), 16), None]
            continue
        m = re.match(r"^\s*([0-9a-f]+):\s+(\S+)\s*(.*)$", line)
        if m and current and not m.group(2).startswith("."):
            addr = int(m.group(1), 16)
            insns[addr] = [m.group(2), m.group(3), None]
            order.append(addr)
            symbols[current][1] = addr
    for a, b in zip(order, order[1:]):
        insns[a][2] = b
    return insns, symbols


def executed_pcs(machine, elf):
    with tempfile.TemporaryDirectory() as tmp:
        log = os.path.join(tmp, "trace.log")
        subprocess.run(["qemu-system-arm", "-M", machine, "-nographic", "-monitor", "none",
                        "-semihosting-config", "enable=on,target=native", "-singlestep",
                        "-d", "exec,nochain", "-D", log, "-kernel", elf],
                       check=True, capture_output=True, timeout=600)
        pcs = []
        with open(log) as f:
            for line in f:
                m = re.search(r"\[[0-9a-f]+/([0-9a-f]+)/", line)
                if m:
                    pcs.append(int(m.group(1), 16))
        return pcs


def price(elf, machine="mps2-an386", function=FUNCTION, listing=None):
    insns, symbols = disassembly(elf)
    start = symbols[function][0]
    main_lo, main_hi = symbols["main"]
    pcs = executed_pcs(machine, elf)
    calls = 0
    cycles = 0
    count = 0
    inside = False
    previous_memory = False
    for i, pc in enumerate(pcs):
        if pc == start:
            inside = True
            calls += 1
            if listing is not None:
                listing.append([])
        elif inside and main_lo <= pc <= main_hi:
            inside = False
        if not inside or pc not in insns:
            continue
        mnemonic, operands, sequential_next = insns[pc]
        nxt = pcs[i + 1] if i + 1 < len(pcs) else None
        base = mnemonic.split(".")[0]
        is_branch = (base in ("b", "bl", "blx", "bx", "cbz", "cbnz") or
                     (base.startswith("b") and len(base) == 3) or
                     ("pc" in operands and base in ("pop", "ldmia", "ldm")))
        if is_branch and base not in ("pop", "ldmia", "ldm"):
            c, mem = (1 + P if nxt is not None and nxt != sequential_next else 1), False
        else:
            c, _, mem = classify(mnemonic, operands, previous_memory)
        previous_memory = mem
        if listing is not None:
            listing[-1].append((pc, mnemonic, operands, c))
        cycles += c
        count += 1
    if calls == 0:
        raise SystemExit(f"{function} never ran in {elf}")
    return count / calls, cycles / calls, calls


def print_listing(directory, name, back=1):
    """The priced instructions of one call of one image, the back-th from the end (1: the last):
    `<name>` is the footprint image's name without `footprint_` and `.elf` (e.g.
    exponential_map_hold_end_float_propagator)."""
    elf = os.path.join(directory, "footprint", f"footprint_{name}.elf")
    function = PUSH_FUNCTION if name.endswith("_propagator") else FUNCTION
    calls_listed = []
    _, total, calls = price(elf, function=function, listing=calls_listed)
    listing = calls_listed[-back]
    print(f"{name}: call {calls - back + 1} of {calls} of {function}, each executed instruction with its "
          "estimated cycles (timing table from memory; mean over all calls "
          f"{total:.1f} cycles)\n")
    for pc, mnemonic, operands, c in listing:
        print(f"{pc:8x}  {c:2d}  {mnemonic:10s} {operands}")
    print(f"\n{len(listing)} instructions, {sum(x[3] for x in listing)} cycles")
    return 0


def main(argv):
    if len(argv) < 2:
        print(__doc__)
        return 2
    if len(argv) in (4, 5) and argv[2] == "--listing":
        return print_listing(argv[1], argv[3], int(argv[4]) if len(argv) == 5 else 1)
    footprint = os.path.join(argv[1], "footprint")
    images = sorted(f for f in os.listdir(footprint) if f.endswith("_float_step.elf"))
    print("Cortex-M4F cycles from the executed path under qemu (float; timing table from memory, "
          "zero wait states). Step: the step function with callees (increment and accumulation, "
          "no renormalization). Propagator: one push() of a sample into the validating "
          "propagator (first-order renormalization), averaged over every push of the image, "
          "including those that only store a sample of a multi-sample window.\n")
    print("| stepper | executed instructions per step | estimated cycles per step "
          "| executed instructions per sample, propagator | estimated cycles per sample, "
          "propagator |")
    print("|---|---:|---:|---:|---:|")
    propagator_cycles = {}
    for image in images:
        name = image[len("footprint_"):-len("_float_step.elf")]
        n, c, _ = price(os.path.join(footprint, image))
        propagator = os.path.join(footprint, image[:-len("step.elf")] + "propagator.elf")
        if os.path.exists(propagator):
            pn, pc, _ = price(propagator, function=PUSH_FUNCTION)
            propagator_cycles[name] = (pn, pc)
            print(f"| `{name}` | {n:.0f} | {c:.0f} | {pn:.0f} | {pc:.0f} |")
        else:
            print(f"| `{name}` | {n:.0f} | {c:.0f} | – | – |")
    # Propagator images without a step image: the calibration stage (<stepper>+calibrated), which
    # acts per sample before the stepper, so only its propagator image means something.
    only = sorted(f for f in os.listdir(footprint) if f.endswith("_float_propagator.elf") and
                  f[:-len("propagator.elf")] + "step.elf" not in images)
    added = []
    for image in only:
        name = image[len("footprint_"):-len("_float_propagator.elf")]
        pn, pc, _ = price(os.path.join(footprint, image), function=PUSH_FUNCTION)
        print(f"| `{name}` | – | – | {pn:.0f} | {pc:.0f} |")
        base = name.split("+")[0]
        if name.endswith("+calibrated") and base in propagator_cycles:
            bn, bc = propagator_cycles[base]
            added.append(f"| `{base}` | {pn - bn:.1f} | {pc - bc:.1f} |")
    if added:
        print("\nAdded by the gyro calibration stage (gyro_calibration.hpp) per sample, "
              "`<stepper>+calibrated` minus `<stepper>` (same plain accumulation):\n")
        print("| stepper | executed instructions added per sample | estimated cycles added per "
              "sample |")
        print("|---|---:|---:|")
        for line in added:
            print(line)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
