#!/usr/bin/python3
# check-demo-current.py: the demo catalogues in data/demo are generated
# files, never edited by hand.  This regenerates them with
# data/demo/generate.py into a scratch directory and checks that each
# committed CSV is byte-for-byte what the script writes, and that the
# script writes no CSV that is not committed.
#
# Speaks TAP: "1..N", then "ok K - description" or "not ok K - description"
# with "# want/got" lines; exits 1 if any check failed.
#
# Environment: STARLEDGER_SOURCE_DIR, the top of the source tree.

import os
import subprocess
import sys
import tempfile

# The shared module sits beside this script; no bytecode cache is written
# into the source tree.
sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402


def csv_files(directory):
    return sorted(name for name in os.listdir(directory) if name.endswith(".csv"))


def first_difference(a, b):
    """Where two byte strings first differ: (offset, line number)."""
    offset = next((i for i, (x, y) in enumerate(zip(a, b)) if x != y), min(len(a), len(b)))
    return offset, a.count(b"\n", 0, offset) + 1


def line_at(data, offset):
    start = data.rfind(b"\n", 0, offset) + 1
    end = data.find(b"\n", offset)
    return data[start:end if end >= 0 else len(data)]


def compare_file(tap, name, committed_path, generated_path):
    """The generated file is what is wanted; the committed one is checked."""
    with open(committed_path, "rb") as f:
        committed = f.read()
    with open(generated_path, "rb") as f:
        generated = f.read()
    details = []
    if committed != generated:
        offset, line = first_difference(generated, committed)
        details = ["committed and generated %s differ first at byte %d (line %d)"
                   % (name, offset, line),
                   "want (generated): %r" % line_at(generated, offset),
                   "got (committed):  %r" % line_at(committed, offset),
                   "sizes: committed %d bytes, generated %d bytes"
                   % (len(committed), len(generated)),
                   "regenerate: /usr/bin/python3 data/demo/generate.py data/demo"]
    tap.check(committed == generated,
              "data/demo/%s is byte-identical to generate.py's output" % name, details)


def main():
    source_dir = tap_lib.required_env("STARLEDGER_SOURCE_DIR")
    demo_dir = os.path.join(source_dir, "data", "demo")
    script = os.path.join(demo_dir, "generate.py")
    tap = tap_lib.Tap()

    with tempfile.TemporaryDirectory(prefix="starledger-demo-") as out_dir:
        result = subprocess.run([sys.executable, script, out_dir],
                                capture_output=True, text=True, timeout=120)
        tap.check(result.returncode == 0, "generate.py runs and exits 0",
                  ["exit status %d" % result.returncode]
                  + result.stderr.strip().splitlines()[-10:])

        committed = csv_files(demo_dir)
        generated = csv_files(out_dir)
        tap.check(committed == generated and committed != [],
                  "generate.py writes exactly the committed CSV files",
                  ["want (generated): %s" % ", ".join(generated),
                   "got (committed):  %s" % ", ".join(committed)])
        for name in sorted(set(committed) & set(generated)):
            compare_file(tap, name, os.path.join(demo_dir, name), os.path.join(out_dir, name))
    tap.finish()


if __name__ == "__main__":
    main()
