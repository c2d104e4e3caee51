# starledger_tap.py: what the Python checks (tests/reference/check-*.py,
# tests/check-potfiles.py) share, so that each script holds only its own
# references: a TAP printer, the starledger-cli runner, reading an export
# back, and the worst-case comparison.  Standard library only, since the
# scripts must run (or skip cleanly) on a machine without numpy or astropy.
#
# A script does
#     sys.dont_write_bytecode = True
#     sys.path.insert(0, os.path.dirname(__file__))
#     import starledger_tap as tap_lib
# before anything else of its own: meson runs the scripts from the build
# directory, so the module is found next to the script, not on the path,
# and the tests leave the source tree as they found it (no __pycache__).
#
# TAP as meson reads it: "1..N", then "ok K - description" or
# "not ok K - description" followed by "# ..." diagnostics; the script
# exits 1 if any check failed.

import csv
import io
import math
import os
import subprocess
import sys


class Tap:
    """Collects results and prints them as TAP at the end.  The plan comes
    first, so the checks are numbered only once all are known: a script
    whose early step fails runs fewer checks, never a wrong plan."""

    def __init__(self):
        self.lines = []
        self.failed = 0

    def check(self, passed, description, details=()):
        number = len(self.lines) + 1
        text = ("ok %d - %s" if passed else "not ok %d - %s") % (number, description)
        if not passed:
            self.failed += 1
            text += "".join("\n# " + line for line in details)
        self.lines.append(text)
        return passed

    def finish(self):
        print("1..%d" % len(self.lines))
        for line in self.lines:
            print(line)
        sys.exit(1 if self.failed else 0)


def skip_all(reason):
    """A reference library that is not installed skips the script, it does
    not fail it: the reference is optional, the build is not."""
    print("1..0 # SKIP %s" % reason)
    sys.exit(0)


def required_env(name):
    """The value of environment variable NAME, which meson's test_env sets;
    without it nothing can be checked, so the script bails out."""
    value = os.environ.get(name)
    if not value:
        print("Bail out! %s is not set" % name)
        sys.exit(1)
    return value


# ---- the command line --------------------------------------------------------

def run_cli(*args):
    return subprocess.run([os.environ["STARLEDGER_CLI"], *args],
                          capture_output=True, text=True, timeout=60)


def check_run(tap, result, description):
    """RESULT (of run_cli) exited 0; if not, its first lines of stderr say why."""
    return tap.check(result.returncode == 0, description,
                     ["exit status %d" % result.returncode]
                     + result.stderr.strip().splitlines()[:10])


def _what(what):
    return " (%s)" % what if what else ""


def new_project(tap, project, what=None):
    return check_run(tap, run_cli("new", project), "starledger-cli new%s" % _what(what))


def import_csv(tap, project, csv_path, what=None, args=()):
    """Imports CSV_PATH into PROJECT with extra ARGS (--map ...) and checks
    that it exits 0 and rejects no row: import prints its notes and summary
    on stdout, so any line on stderr is a rejected row.  Returns whether
    both held."""
    result = run_cli("import", project, csv_path, *args)
    ok = check_run(tap, result, "starledger-cli import%s exits 0" % _what(what))
    rejected = result.stderr.strip().splitlines()
    return tap.check(ok and not rejected, "import%s rejects no row" % _what(what), rejected[:10])


def write_csv(path, columns, rows):
    """ROWS are dicts of text; a column a row lacks is written empty."""
    with open(path, "w", encoding="utf-8", newline="") as f:
        writer = csv.writer(f, lineterminator="\n")
        writer.writerow(columns)
        for row in rows:
            writer.writerow([row.get(c, "") for c in columns])


def parse_export(text):
    """The rows of an export's CSV, by star id."""
    return {row["id"]: row for row in csv.DictReader(io.StringIO(text))}


def export_rows(tap, project, columns=None, what=None, expected=None):
    """Exports PROJECT (only COLUMNS, if given) and returns its rows by id,
    or {} if the export failed.  With EXPECTED, also checks that that many
    stars came back: a missing star would otherwise only show up as NaNs."""
    args = ["export", project] + (["--columns", ",".join(columns)] if columns else [])
    result = run_cli(*args)
    if not check_run(tap, result, "starledger-cli export%s" % _what(what)):
        return {}
    rows = parse_export(result.stdout)
    if expected is not None:
        tap.check(len(rows) == expected, "export%s has all %d stars" % (_what(what), expected),
                  ["want %d rows" % expected, "got %d rows" % len(rows)])
    return rows


def number(row, column):
    """ROW[COLUMN] as a float; NaN for an empty or missing cell, so that a
    comparison with it fails instead of raising."""
    try:
        return float(row.get(column, ""))
    except (TypeError, ValueError):
        return math.nan


# ---- comparisons -------------------------------------------------------------

def worst(items, difference):
    """(difference, item) for the item of ITEMS whose DIFFERENCE(item) is
    largest, or None if there is none.  A non-finite difference (a missing
    value gives NaN) counts as infinite, so no later item can hide it."""
    found = None
    for item in items:
        diff = difference(item)
        if not math.isfinite(diff):
            diff = math.inf
        if found is None or diff > found[0]:
            found = (diff, item)
    return found


def relative_difference(got, want):
    """|got - want| / |want|, or |got - want| where WANT is 0."""
    return abs(got - want) / abs(want) if want != 0 else abs(got - want)


def compare(tap, items, description, unit, tolerance, relative=False, noun="values"):
    """ITEMS: (label, want, got) triples.  Passes if every |got - want| (or
    relative difference) is within TOLERANCE; reports the worst, whose
    label says where to look."""
    items = list(items)
    if relative:
        found = worst(items, lambda item: relative_difference(item[2], item[1]))
    else:
        found = worst(items, lambda item: abs(item[2] - item[1]))
    if found is None:
        return tap.check(False, description, ["nothing to compare"])
    diff, (label, want, got) = found
    kind = "relative" if relative else unit
    unit = " " + unit if unit else ""
    return tap.check(diff <= tolerance,
                     "%s (%d %s, worst %.3g %s)" % (description, len(items), noun, diff, kind),
                     ["%s: want %.15g%s (tolerance %g %s)" % (label, want, unit, tolerance, kind),
                      "%s: got  %.15g%s" % (label, got, unit)])
