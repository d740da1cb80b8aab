#!/usr/bin/env python3
"""Flash and RAM per stepper on Cortex-M4F and Cortex-M3, as a Markdown table.

Reads the footprint images that tests/target/footprint.cmake builds (one per stepper, scalar and
mode; manifest in <target build>/footprint/manifest.txt), with arm-none-eabi-size, arm-none-eabi-nm
and the linker map of each image. Nothing here is needed by ctest.

  python3 bench/target/footprint_report.py build/<dir>/target-cortex-m4f build/<dir>/target-cortex-m3

(the target build directories are made by `ctest -L target` in a host build, or by
 cmake -S tests/target -B <dir> --toolchain cmake/arm-none-eabi.cmake -DHALFSPIN_TARGET_CPU=<cpu>
 && cmake --build <dir>).

Columns (bytes):
  flash       text + rodata + vectors + init tables of the whole image (arm-none-eabi-size text)
  halfspin    the halfspin code: the image's non-inlined halfspin_footprint_push/_step function,
              into which the propagator and stepper are inlined, with its literal pool, plus
              any symbol in namespace halfspin (nm -S sizes)
  libm        flash linked from libm.a (sinf/cosf/sqrtf and their argument reduction), from the map
  libgcc+libc flash from libgcc.a and libc.a (memset for the static constructor, errno)
  startup     the rest: minimal reset, vector table, main and the static constructor of the harness
  RAM         data + bss of the whole image
  object      the Propagator object (bytes of RAM it owns; in .bss here)
  stack       stack frame of the halfspin function (-fstack-usage), bytes
  newlib RAM  data + bss from libc.a (impure_data: newlib's reentrancy struct, pulled in by
              errno, which libm's sinf/cosf/sqrtf may set), included in RAM
The images are built with the target build's flags (Release: -O3, -ffunction-sections
-fdata-sections, --gc-sections, -ffp-contract=off, -fno-exceptions -fno-rtti).
"""
import os
import re
import subprocess
import sys

TOOL_PREFIX = "arm-none-eabi-"
FLASH_SECTIONS = (".text", ".rodata", ".vectors", ".ARM.exidx", ".ARM.extab", ".init_array",
                  ".preinit_array", ".fini_array", ".init", ".fini")
RAM_SECTIONS = (".data", ".bss", "COMMON")
HALFSPIN_FUNCTIONS = ("halfspin_footprint_push", "halfspin_footprint_step")


def run(*args):
    return subprocess.run(args, check=True, capture_output=True, text=True).stdout


def read_manifest(build):
    path = os.path.join(build, "footprint", "manifest.txt")
    with open(path) as f:
        for line in f:
            parts = line.split()
            if len(parts) >= 4:
                yield dict(image=parts[0], stepper=parts[1], scalar=parts[2], mode=parts[3])


def berkeley_size(elf):
    out = run(TOOL_PREFIX + "size", elf).splitlines()[1].split()
    return int(out[0]), int(out[1]), int(out[2])


def symbol_sizes(elf):
    """name -> (type, size) for every sized symbol, names demangled."""
    sizes = {}
    for line in run(TOOL_PREFIX + "nm", "-S", "-C", "--defined-only", elf).splitlines():
        m = re.match(r"^[0-9a-f]+ ([0-9a-f]+) (\w) (.+)$", line)
        if m:
            sizes[m.group(3)] = (m.group(2), int(m.group(1), 16))
    return sizes


def map_attribution(map_path):
    """{'flash': {origin: bytes}, 'ram': {origin: bytes}} from the linker map's input sections."""
    result = {"flash": {}, "ram": {}}
    with open(map_path) as f:
        text = f.read()
    start = text.find("Linker script and memory map")
    lines = text[start:].splitlines()
    pending = None
    for line in lines:
        m = re.match(r"^ (\S+)\s+0x([0-9a-f]+)\s+0x([0-9a-f]+)\s+(\S.*)$", line)
        if not m and pending:
            m2 = re.match(r"^\s+0x([0-9a-f]+)\s+0x([0-9a-f]+)\s+(\S.*)$", line)
            if m2:
                m = (pending, m2.group(1), m2.group(2), m2.group(3))
            pending = None
        elif not m:
            m1 = re.match(r"^ (\.\S+|COMMON)\s*$", line)
            pending = m1.group(1) if m1 else None
            continue
        if m is None:
            continue
        if not isinstance(m, tuple):
            m = (m.group(1), m.group(2), m.group(3), m.group(4))
        section, address, size, origin = m
        size = int(size, 16)
        if size == 0 or int(address, 16) == 0 and not section.startswith(".vectors"):
            # zero-sized, or discarded/not allocated
            if size == 0:
                continue
        archive = re.search(r"([^/]+\.a)\(", origin)
        origin_name = archive.group(1) if archive else os.path.basename(origin.strip())
        if section.startswith(FLASH_SECTIONS):
            kind = "flash"
        elif section.startswith(RAM_SECTIONS):
            kind = "ram"
        else:
            continue
        result[kind][origin_name] = result[kind].get(origin_name, 0) + size
    return result


def stack_usage(build, image):
    path = os.path.join(build, "CMakeFiles", image + ".dir", "footprint", "footprint_image.cpp.su")
    if not os.path.exists(path):
        return None
    with open(path) as f:
        for line in f:
            if any(fn in line for fn in HALFSPIN_FUNCTIONS):
                return int(line.split("\t")[1])
    return None


def measure(build, entry):
    elf = os.path.join(build, "footprint", entry["image"] + ".elf")
    text, data, bss = berkeley_size(elf)
    symbols = symbol_sizes(elf)
    halfspin = sum(size for name, (kind, size) in symbols.items()
                   if kind in "TtWw" and (name in HALFSPIN_FUNCTIONS or name.startswith("halfspin::")))
    halfspin += sum(size for name, (kind, size) in symbols.items()
                    if kind in "Rr" and name.startswith("halfspin::"))
    attribution = map_attribution(os.path.join(build, "footprint", entry["image"] + ".map"))
    flash = attribution["flash"]
    ram = attribution["ram"]
    libm = flash.get("libm.a", 0)
    libgcc_libc = flash.get("libgcc.a", 0) + flash.get("libc.a", 0) + flash.get("libnosys.a", 0)
    startup = text - halfspin - libm - libgcc_libc
    obj = symbols.get("halfspin_footprint_propagator", ("", None))[1]
    return dict(flash=text, halfspin=halfspin, libm=libm, libgcc_libc=libgcc_libc,
                startup=startup, ram=data + bss, object=obj,
                stack=stack_usage(build, entry["image"]),
                newlib_ram=ram.get("libc.a", 0))


def cpu_of(build):
    base = os.path.basename(os.path.normpath(build))
    return base.replace("target-", "")


def fmt(value):
    return "–" if value is None else str(value)


def main(argv):
    builds = argv[1:]
    if not builds:
        print(__doc__)
        return 2
    rows = {}
    order = []
    for build in builds:
        cpu = cpu_of(build)
        for entry in read_manifest(build):
            key = (entry["stepper"], entry["scalar"])
            if key not in rows:
                rows[key] = {}
                order.append(key)
            rows[key][(cpu, entry["mode"])] = measure(build, entry)
    cpus = [cpu_of(b) for b in builds]
    print("Flash and RAM in bytes per footprint image (Propagator<T, stepper> with the default "
          "first-order renormalization, pushing samples; \"step only\" is the stepper's step "
          "function alone).\n")
    for cpu in cpus:
        print(f"**{cpu}**\n")
        print("| stepper | scalar | flash | halfspin code | halfspin code, step only | libm | "
              "libgcc+libc | startup+harness | RAM | propagator object | stack (push) | "
              "stack (step) | of RAM: newlib |")
        print("|---|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|")
        for key in order:
            p = rows[key].get((cpu, "propagator"))
            s = rows[key].get((cpu, "step"))
            if p is None:
                continue
            print(f"| `{key[0]}` | {key[1]} | {p['flash']} | {p['halfspin']} | "
                  f"{fmt(s['halfspin'] if s else None)} | {p['libm']} | {p['libgcc_libc']} | "
                  f"{p['startup']} | {p['ram']} | {fmt(p['object'])} | {fmt(p['stack'])} | "
                  f"{fmt(s['stack'] if s else None)} | {p['newlib_ram']} |")
        print()
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
