#!/usr/bin/python3
"""Counts the test cases of meson test runs and prints the closing line.

Most test programs speak TAP, so one program holds many cases: this reads
meson's testlog.json and counts the TAP lines of each program.  A program
that failed without a "not ok" line (a crash, a timeout) counts as one
failure; one judged by its exit status alone (the window's smoke test)
counts as one case.  A line of the log that cannot be read counts as a
failure, never as nothing.  Prints "tests: N passed, M failed[, K skipped]" and exits 1 if
anything failed.
"""
import json
import re
import sys

TAP_RESULT = re.compile(r"^(not ok|ok)\b(.*)$")


def count(log_path):
    passed = failed = skipped = 0
    with open(log_path, encoding="utf-8") as log:
        for line in log:
            try:
                entry = json.loads(line)
            except json.JSONDecodeError:
                print("count-tests: an unreadable line in the test log", file=sys.stderr)
                failed += 1
                continue
            program_failed = entry.get("result") not in ("OK", "SKIP", "EXPECTEDFAIL")
            not_ok = 0
            for out_line in (entry.get("stdout") or "").splitlines():
                match = TAP_RESULT.match(out_line.strip())
                if not match:
                    continue
                directive = match.group(2).upper()
                if "# SKIP" in directive:
                    skipped += 1
                elif match.group(1) == "ok":
                    passed += 1
                elif "# TODO" not in directive:
                    failed += 1
                    not_ok += 1
            tap_lines = 0
            for out_line in (entry.get("stdout") or "").splitlines():
                if TAP_RESULT.match(out_line.strip()):
                    tap_lines += 1
            if entry.get("result") == "SKIP" and not_ok == 0:
                skipped += 1
            elif program_failed and not_ok == 0:
                failed += 1
            elif not program_failed and tap_lines == 0:
                passed += 1
    return passed, failed, skipped


def main():
    # One log or several (the main build's and the fuzz build's).
    passed = failed = skipped = 0
    for log_path in sys.argv[1:]:
        p, f, s = count(log_path)
        passed, failed, skipped = passed + p, failed + f, skipped + s
    line = f"tests: {passed} passed, {failed} failed"
    if skipped:
        line += f", {skipped} skipped"
    print(line)
    return 1 if failed or passed == 0 else 0


if __name__ == "__main__":
    sys.exit(main())
