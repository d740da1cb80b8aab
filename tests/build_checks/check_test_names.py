#!/usr/bin/env python3
"""Fail when a Catch2 test name contains ';'.

catch_discover_tests hands each discovered name to CMake, where ';' separates list elements: a
name with ';' becomes two ctest tests whose filters match no test case, and ctest reports them as
passed although nothing ran. Scans every .cpp under the given directory for TEST_CASE,
TEMPLATE_TEST_CASE and TEMPLATE_LIST_TEST_CASE names (adjacent string literals joined) and prints
<file>:<line>: <name> for each offender; exit status 1 if any.

    check_test_names.py <tests directory>
"""
import pathlib
import re
import sys

NAME = re.compile(r'\b(?:TEMPLATE_LIST_TEST_CASE|TEMPLATE_TEST_CASE|TEST_CASE)\s*\(\s*((?:"(?:[^"\\]|\\.)*"\s*)+)')


def main():
    root = pathlib.Path(sys.argv[1])
    bad = 0
    for path in sorted(root.rglob("*.cpp")):
        text = path.read_text(encoding="utf-8")
        for match in NAME.finditer(text):
            name = "".join(re.findall(r'"((?:[^"\\]|\\.)*)"', match.group(1)))
            if ";" in name:
                line = text.count("\n", 0, match.start()) + 1
                print("%s:%d: test name contains ';': %s" % (path, line, name))
                bad += 1
    if bad:
        print("check_test_names: %d name(s) with ';' (ctest would split them and run nothing)" % bad)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
