#!/usr/bin/env python3
"""Fail when a Markdown document of the repository links to a file that does not exist.

The README is a front page that links the documents under docs/ and the folder READMEs; a moved or
renamed file must not leave a dead link behind. Scans every *.md under the given root (skipping
build/, .git/ and fixtures/) for inline links and images `[text](target)` whose target is a relative path
(not http(s), mailto or a bare #anchor), strips any #anchor, resolves it against the document's
folder and prints <file>:<line>: <target> for each that does not exist; exit status 1 if any.
Fenced code blocks are skipped.

    check_doc_links.py <repository root>
"""
import pathlib
import re
import sys

LINK = re.compile(r'!?\[[^\]]*\]\(([^)\s]+)\)')
SKIPPED = {"build", ".git", "Testing", "fixtures"}  # fixtures: the checkers' own test inputs


def main():
    root = pathlib.Path(sys.argv[1]).resolve()
    bad = 0
    checked = 0
    for path in sorted(root.rglob("*.md")):
        if SKIPPED & set(path.relative_to(root).parts):
            continue
        fenced = False
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if line.lstrip().startswith("```"):
                fenced = not fenced
                continue
            if fenced:
                continue
            for match in LINK.finditer(line):
                target = match.group(1)
                if re.match(r'^(https?:|mailto:|#)', target):
                    continue
                checked += 1
                if not (path.parent / target.split("#", 1)[0]).exists():
                    print("%s:%d: dead link: %s" % (path.relative_to(root), number, target))
                    bad += 1
    print("%d relative links checked, %d dead" % (checked, bad))
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
