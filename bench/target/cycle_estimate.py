#!/usr/bin/env python3
"""Estimated Cortex-M4F cycles per step for each stepper, from the disassembly of its step function.

  python3 bench/target/cycle_estimate.py build/<dir>/target-cortex-m4f

Reads footprint/footprint_<stepper>_float_step.elf (tests/target/footprint.cmake), disassembles
halfspin_footprint_step (the stepper's step function with the stepper inlined, call and return
included) with arm-none-eabi-objdump -d, builds its control-flow graph and walks every acyclic path
from entry to return. The "series path" is the costliest path that calls no function: for the
exponential-map steppers that is the small-angle series branch of quaternion_exp (the usual case
for a gyro step); the other branch (square root, sinf, cosf) is reported separately with its calls
listed, not costed. Where the compiler kept a loop (GCC 12 at -O3 does for the Runge-Kutta
stage loop of some configurations) no estimate is printed: the trip count is not in the
disassembly.

ASSUMPTIONS (Cortex-M4 technical reference manual instruction timings, FROM MEMORY, not checked):
  VADD/VSUB/VMUL/VNMUL/VNEG/VABS/VMOV/VCMP/VCVT/VMRS (single)  1 cycle
  VMLA/VMLS/VNMLA/VNMLS/VFMA/VFMS/VFNMA/VFNMS                   3 (none are emitted: -ffp-contract=off)
  VDIV.F32, VSQRT.F32                                           14
  VLDR/VSTR                                                     2, or 1 right after another load/store (pipelined)
  VPUSH/VPOP/VLDM/VSTM                                          1 + number of single registers
  LDR/STR (all widths)                                          2, or 1 right after another load/store
  LDRD/STRD                                                     3
  PUSH/POP/LDM/STM                                              1 + number of registers (+P if PC is loaded)
  integer ALU, MOV, MUL, IT, NOP                                1;  MLA/MLS 2;  SDIV/UDIV 12 (worst case)
  branch taken, BL, BX                                          1 + P with P = 2 (pipeline refill)  → 3
  branch not taken                                              1
  no wait states (code and data in zero-wait-state memory), no interrupts, no FPU
  register-dependency stalls, no lazy-stacking: real parts with flash wait states are slower.
Library calls (sinf, cosf, sqrtf, atan2f) are not costed: their cost depends on the argument
(newlib's argument reduction) and was not measured.
"""
import os
import re
import subprocess
import sys

P = 2
FUNCTION = "halfspin_footprint_step"


def disassemble(elf):
    out = subprocess.run(["arm-none-eabi-objdump", "-d", "--no-show-raw-insn", elf], check=True,
                         capture_output=True, text=True).stdout
    body = []
    inside = False
    for line in out.splitlines():
        if line.endswith(f"<{FUNCTION}>:"):
            inside = True
            continue
        if inside:
            if not line.strip():
                break
            m = re.match(r"^\s*([0-9a-f]+):\s+(\S+)\s*(.*)$", line)
            if not m:
                continue
            mnemonic = m.group(2)
            if mnemonic.startswith("."):  # literal pool data
                continue
            body.append((int(m.group(1), 16), mnemonic, m.group(3)))
    if not body:
        raise SystemExit(f"{FUNCTION} not found in {elf}")
    return body


def register_count(operands):
    regs = re.search(r"\{([^}]*)\}", operands)
    if not regs:
        return 1
    n = 0
    for part in regs.group(1).split(","):
        part = part.strip()
        r = re.match(r"([rsd])(\d+)-[rsd](\d+)", part)
        if r:
            k = int(r.group(3)) - int(r.group(2)) + 1
            n += 2 * k if r.group(1) == "d" else k
        else:
            n += 2 if part.startswith("d") else 1
    return n


CONDITIONS = ("eq", "ne", "cs", "cc", "hs", "lo", "mi", "pl", "vs", "vc", "hi", "ls", "ge", "lt",
              "gt", "le")


def classify(mnemonic, operands, previous_memory):
    """(cycles, class, is_memory) for one instruction that is not a branch."""
    base = mnemonic.split(".")[0]
    if base in ("vmla", "vmls", "vnmla", "vnmls", "vfma", "vfms", "vfnma", "vfnms"):
        return 3, "fp multiply-accumulate", False
    if base in ("vdiv", "vsqrt"):
        return 14, "fp divide/sqrt", False
    if base in ("vadd", "vsub", "vmul", "vnmul", "vneg", "vabs", "vcmp", "vcmpe", "vcvt"):
        return 1, "fp add/sub/mul", False
    if base in ("vmov", "vmrs", "vmsr"):
        return 1, "fp move", False
    if base in ("vldr", "vstr"):
        return (1 if previous_memory else 2), "fp load/store", True
    if base in ("vpush", "vpop", "vldmia", "vstmia", "vldmdb", "vstmdb", "vldm", "vstm"):
        return 1 + register_count(operands), "fp load/store multiple", True
    if base in ("ldrd", "strd"):
        return 3, "load/store", True
    if re.match(r"^(ldr|str)(b|h|sb|sh)?$", base):
        return (1 if previous_memory else 2), "load/store", True
    if base in ("push", "pop", "ldmia", "stmia", "ldm", "stm", "stmdb"):
        extra = P if "pc" in operands else 0
        return 1 + register_count(operands) + extra, "load/store multiple", True
    if base in ("mla", "mls"):
        return 2, "integer", False
    if base in ("sdiv", "udiv"):
        return 12, "integer divide", False
    return 1, "integer", False


def branch_info(mnemonic, operands):
    """(kind, target) with kind in call, return, cond, uncond, or None."""
    base = mnemonic.split(".")[0]
    target = re.match(r"^([0-9a-f]+)\s*<([^>]*)>", operands)
    if base == "bl":
        return "call", target.group(2) if target else operands
    if base == "bx" and operands.strip() == "lr":
        return "return", None
    if base in ("pop", "ldmia", "ldm") and "pc" in operands:
        return "return", None
    if base == "b":
        return "uncond", int(target.group(1), 16)
    if base in ("cbz", "cbnz"):
        t = re.search(r"([0-9a-f]+) <", operands)
        return "cond", int(t.group(1), 16)
    if base.startswith("b") and base[1:] in CONDITIONS:
        return "cond", int(target.group(1), 16)
    return None, None


class LoopFound(Exception):
    """The step function kept a loop (the compiler did not unroll it): the straight-line walk
    cannot know its trip count, so no estimate is printed rather than a wrong one."""


def paths(body):
    index = {addr: i for i, (addr, _, _) in enumerate(body)}
    results = []

    def walk(i, on_path, trace):
        while True:
            if i in on_path:
                raise LoopFound()
            on_path = on_path | {i}
            addr, mnemonic, operands = body[i]
            kind, target = branch_info(mnemonic, operands)
            if kind == "return":
                results.append(trace + [(i, "return")])
                return
            if kind == "uncond":
                if target not in index:  # a tail call into another function
                    results.append(trace + [(i, "call")])
                    return
                trace = trace + [(i, "taken")]
                i = index[target]
                continue
            if kind == "cond":
                walk(index[target], on_path, trace + [(i, "taken")])
                trace = trace + [(i, "not taken")]
                i += 1
                continue
            trace = trace + [(i, "call" if kind == "call" else "plain")]
            i += 1

    walk(0, frozenset(), [])
    return results


def cost(body, trace):
    cycles = 0
    classes = {}
    calls = []
    previous_memory = False
    for i, how in trace:
        _, mnemonic, operands = body[i]
        if how in ("taken", "not taken"):
            c, cls, mem = (1 + P if how == "taken" else 1), "branch", False
        elif how == "call":
            c, cls, mem = 1 + P, "call", False
            calls.append(branch_info(mnemonic, operands)[1])
        elif how == "return":
            c, cls, mem = classify(mnemonic, operands, previous_memory)
            if mnemonic.startswith("bx"):
                c, cls, mem = 1 + P, "branch", False
        else:
            c, cls, mem = classify(mnemonic, operands, previous_memory)
        previous_memory = mem
        cycles += c
        classes[cls] = classes.get(cls, 0) + 1
    return cycles, classes, calls, len(trace)


def main(argv):
    if len(argv) < 2:
        print(__doc__)
        return 2
    build = argv[1]
    manifest = os.path.join(build, "footprint", "manifest.txt")
    steppers = []
    with open(manifest) as f:
        for line in f:
            parts = line.split()
            if parts[2] == "float" and parts[3] == "step":
                steppers.append((parts[1], os.path.join(build, "footprint", parts[0] + ".elf")))
    print("Estimated Cortex-M4F cycles per step (float, step function only; assumptions in "
          "bench/target/cycle_estimate.py, instruction timings from memory).\n")
    print("| stepper | instructions | fp add/sub/mul | fp div/sqrt | fp/int load-store | "
          "est. cycles, series path | other path: cycles + calls |")
    print("|---|---:|---:|---:|---:|---:|---|")
    for name, elf in steppers:
        body = disassemble(elf)
        try:
            costed = [cost(body, t) for t in paths(body)]
        except LoopFound:
            print(f"| `{name}` | {len(body)} (static) | – | – | – | not estimated: the compiler "
                  f"kept a loop in the step function | |")
            continue
        no_calls = [c for c in costed if not c[2]]
        with_calls = [c for c in costed if c[2]]
        if not no_calls:
            print(f"| `{name}` | – | – | – | – | every path calls a function | |")
            continue
        cycles, classes, _, count = max(no_calls, key=lambda c: c[0])
        memory = sum(v for k, v in classes.items() if "load/store" in k)
        other = "–"
        if with_calls:
            worst = max(with_calls, key=lambda c: c[0])
            other = f"{worst[0]} + {', '.join(sorted(set(worst[2])))}"
        print(f"| `{name}` | {count} | {classes.get('fp add/sub/mul', 0)} | "
              f"{classes.get('fp divide/sqrt', 0)} | {memory} | {cycles} | {other} |")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
