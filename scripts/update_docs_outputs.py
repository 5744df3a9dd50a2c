#!/usr/bin/env python3
"""Reruns every ```text block that starts with `$ dressing ...` in the given
markdown files and pastes the program's current output under the command.

Usage:  cargo build --release && python3 scripts/update_docs_outputs.py docs/guide.md [README.md ...]

tests/guide.rs fails when a block no longer matches; run this after a change
to the program's output, read the diff, and commit both.
"""

import shlex
import subprocess
import sys

BIN = "./target/release/dressing"


def update(path):
    lines = open(path, encoding="utf-8").read().split("\n")
    out, i = [], 0
    while i < len(lines):
        out.append(lines[i])
        if lines[i].strip() == "```text" and i + 1 < len(lines) and lines[i + 1].startswith("$ dressing "):
            cmd = lines[i + 1]
            j = i + 2
            while lines[j].strip() != "```":
                j += 1
            run = subprocess.run([BIN] + shlex.split(cmd[len("$ dressing "):]), capture_output=True, text=True)
            out.append(cmd)
            out.extend(run.stdout.rstrip("\n").split("\n"))
            i = j
            continue
        i += 1
    open(path, "w", encoding="utf-8").write("\n".join(out))


if __name__ == "__main__":
    for p in sys.argv[1:]:
        update(p)
