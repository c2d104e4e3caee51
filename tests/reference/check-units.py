#!/usr/bin/python3
# check-units.py: imports ~50 random stars written in sexagesimal hours and
# degrees, radians, arcseconds and arcsec/yr through starledger-cli and
# checks every exported value against astropy (Debian python3-astropy), an
# implementation of the same conversions that shares no code with ours.
#
# Speaks TAP: "1..N", then "ok K - description" or "not ok K - description"
# followed by "# want/got" lines for the worst star; exits 1 if any failed.
#
# Environment: STARLEDGER_CLI, the path of starledger-cli.

import csv
import io
import math
import os
import random
import subprocess
import sys
import tempfile

try:
    import astropy.units as u
    from astropy.coordinates import Angle
except ImportError:
    print("1..0 # SKIP astropy is not installed (Debian: python3-astropy)")
    sys.exit(0)

SEED = 20260401
N_STARS = 50
DEG_TOLERANCE = 1e-9        # deg, for positions
MAS_TOLERANCE = 1e-9        # mas and mas/yr
MINUS = "\u2212"            # U+2212 MINUS SIGN

RA_STYLES = ("blanks", "colons", "letters")
DEC_STYLES = ("blanks", "colons", "letters", "symbols")


class Tap:
    """Collects results and prints them as TAP at the end."""

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


# ---- the stars ---------------------------------------------------------------

def format_ra(h, m, s, style):
    if style == "blanks":
        return "%02d %02d %07.4f" % (h, m, s)
    if style == "colons":
        return "%02d:%02d:%07.4f" % (h, m, s)
    return "%02dh%02dm%07.4fs" % (h, m, s)


def format_dec(sign, d, m, s, style, unicode_minus):
    sign_text = (MINUS if unicode_minus else "-") if sign < 0 else "+"
    if style == "blanks":
        body = "%02d %02d %06.3f" % (d, m, s)
    elif style == "colons":
        body = "%02d:%02d:%06.3f" % (d, m, s)
    elif style == "letters":
        body = "%02dd%02dm%06.3fs" % (d, m, s)
    else:
        body = "%02d\u00b0%02d\u2032%06.3f\u2033" % (d, m, s)
    return sign_text + body


def make_star(rng, i):
    """One star: sexagesimal texts drawn part by part, so no part rounds up
    to 60, and the same position in radians from the exact parts."""
    h, m_ra, s_ra = rng.randint(0, 23), rng.randint(0, 59), round(rng.uniform(0, 59.9999), 4)
    if i == 1:
        h, m_ra, s_ra = 23, 59, 59.9999      # just below 24 h
    elif i == 2:
        h, m_ra, s_ra = 0, 0, 0.0001         # just above 0 h
    sign = -1 if rng.random() < 0.5 else 1
    d = rng.randint(0, 89)
    if i % 5 == 0:
        sign, d = -1, 0                      # the "-00" trap
    m_dec, s_dec = rng.randint(0, 59), round(rng.uniform(0, 59.999), 3)
    ra_deg = 15.0 * (h + m_ra / 60.0 + s_ra / 3600.0)
    dec_deg = sign * (d + m_dec / 60.0 + s_dec / 3600.0)
    return {
        "id": "REF %03d" % i,
        "ra_style": RA_STYLES[i % len(RA_STYLES)],
        "dec_style": DEC_STYLES[i % len(DEC_STYLES)],
        "ra_h": format_ra(h, m_ra, s_ra, RA_STYLES[i % len(RA_STYLES)]),
        "dec_d": format_dec(sign, d, m_dec, s_dec, DEC_STYLES[i % len(DEC_STYLES)], i % 7 == 3),
        "negative_zero": sign < 0 and d == 0,
        "ra_rad": repr(math.radians(ra_deg)),
        "dec_rad": repr(math.radians(dec_deg)),
        "plx_as": "%.7f" % rng.uniform(-0.002, 0.8),
        "pmra_as": "%.6f" % rng.uniform(-5.0, 5.0),
        "pmdec_as": "%.6f" % rng.uniform(-5.0, 5.0),
    }


COLUMNS = ("id", "ra_h", "dec_d", "ra_rad", "dec_rad", "plx_as", "pmra_as", "pmdec_as")


def write_catalogue(path, stars):
    with open(path, "w", encoding="utf-8", newline="") as f:
        writer = csv.writer(f, lineterminator="\n")
        writer.writerow(COLUMNS)
        for star in stars:
            writer.writerow([star[c] for c in COLUMNS])


# ---- the command line --------------------------------------------------------

def run_cli(*args):
    return subprocess.run([os.environ["STARLEDGER_CLI"], *args],
                          capture_output=True, text=True, timeout=60)


def check_run(tap, result, description):
    return tap.check(result.returncode == 0, description,
                     ["exit status %d" % result.returncode]
                     + result.stderr.strip().splitlines()[:10])


def import_and_export(tap, directory, name, csv_path, maps, what):
    """Creates project NAME, imports CSV_PATH with MAPS and returns the
    exported rows by id (empty if a step failed)."""
    project = os.path.join(directory, name + ".starledger")
    args = ["import", project, csv_path]
    for spec in maps:
        args += ["--map", spec]
    if not check_run(tap, run_cli("new", project), "starledger-cli new %s" % name):
        return {}
    result = run_cli(*args)
    check_run(tap, result, "starledger-cli import (%s) exits 0" % what)
    tap.check(result.stderr.strip() == "", "import (%s) rejects no row" % what,
              result.stderr.strip().splitlines()[:10])
    exported = run_cli("export", project)
    if not check_run(tap, exported, "starledger-cli export (%s)" % what):
        return {}
    rows = {row["id"]: row for row in csv.DictReader(io.StringIO(exported.stdout))}
    tap.check(len(rows) == N_STARS, "export (%s) has all %d stars" % (what, N_STARS),
              ["want %d rows" % N_STARS, "got %d rows" % len(rows)])
    return rows


# ---- comparisons -------------------------------------------------------------

def compare(tap, stars, rows, column, reference, tolerance, unit, description):
    """Checks ROWS[id][COLUMN] against REFERENCE(star) for every star and
    reports the worst one."""
    worst = None
    for star in stars:
        want = reference(star)
        cell = rows.get(star["id"], {}).get(column, "")
        try:
            got = float(cell)
        except ValueError:
            got = math.nan
        diff = abs(got - want)
        if not math.isfinite(diff):
            diff = math.inf   # an empty cell is a failure, never hidden by a later star
        if worst is None or diff > worst[0]:
            worst = (diff, star, want, cell)
    if worst is None:
        return tap.check(False, description, ["no star to compare"])
    diff, star, want, cell = worst
    return tap.check(diff <= tolerance,
                     "%s (%d stars, worst %.3g %s)" % (description, len(stars), diff, unit),
                     ["star %s: ra_h=%r dec_d=%r" % (star["id"], star["ra_h"], star["dec_d"]),
                      "want %s = %.15g %s (tolerance %g)" % (column, want, unit, tolerance),
                      "got  %s = %s" % (column, cell or "(empty)")])


def astropy_hours(star):
    return Angle(star["ra_h"], unit=u.hourangle).degree


def astropy_dms(star):
    return Angle(star["dec_d"], unit=u.deg).degree


def astropy_mas(column):
    return lambda star: (float(star[column]) * u.arcsec).to(u.mas).value


def astropy_mas_per_yr(column):
    return lambda star: (float(star[column]) * u.arcsec / u.yr).to(u.mas / u.yr).value


def astropy_rad(column):
    return lambda star: Angle(float(star[column]), unit=u.rad).degree


def check_sexagesimal(tap, stars, rows):
    for style in RA_STYLES:
        subset = [s for s in stars if s["ra_style"] == style]
        compare(tap, subset, rows, "ra", astropy_hours, DEG_TOLERANCE, "deg",
                "ra from hms written with %s equals astropy Angle hourangle" % style)
    for style in DEC_STYLES:
        subset = [s for s in stars if s["dec_style"] == style]
        compare(tap, subset, rows, "dec", astropy_dms, DEG_TOLERANCE, "deg",
                "dec from dms written with %s equals astropy Angle deg" % style)
    subset = [s for s in stars if s["negative_zero"]]
    compare(tap, subset, rows, "dec", astropy_dms, DEG_TOLERANCE, "deg",
            "dec from '-00 ..' is negative and equals astropy Angle deg")
    subset = [s for s in stars if MINUS in s["dec_d"]]
    compare(tap, subset, rows, "dec", astropy_dms, DEG_TOLERANCE, "deg",
            "dec with U+2212 minus equals astropy Angle deg")


def check_small_angles(tap, stars, rows):
    compare(tap, stars, rows, "parallax", astropy_mas("plx_as"), MAS_TOLERANCE, "mas",
            "parallax arcsec->mas equals astropy Quantity.to(u.mas)")
    compare(tap, stars, rows, "pmra", astropy_mas_per_yr("pmra_as"), MAS_TOLERANCE, "mas/yr",
            "pmra arcsec/yr->mas/yr equals astropy Quantity.to(u.mas/u.yr)")
    compare(tap, stars, rows, "pmdec", astropy_mas_per_yr("pmdec_as"), MAS_TOLERANCE, "mas/yr",
            "pmdec arcsec/yr->mas/yr equals astropy Quantity.to(u.mas/u.yr)")


def check_radians(tap, stars, rows):
    compare(tap, stars, rows, "ra", astropy_rad("ra_rad"), DEG_TOLERANCE, "deg",
            "ra from rad equals astropy Angle rad->deg")
    compare(tap, stars, rows, "dec", astropy_rad("dec_rad"), DEG_TOLERANCE, "deg",
            "dec from rad equals astropy Angle rad->deg")


def main():
    if not os.environ.get("STARLEDGER_CLI"):
        print("Bail out! STARLEDGER_CLI is not set")
        sys.exit(1)
    rng = random.Random(SEED)
    stars = [make_star(rng, i) for i in range(1, N_STARS + 1)]
    tap = Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-units-") as directory:
        path = os.path.join(directory, "reference.csv")
        write_catalogue(path, stars)

        rows = import_and_export(tap, directory, "sexagesimal", path,
                                 ["ra=ra_h:hms", "dec=dec_d:dms", "parallax=plx_as:arcsec",
                                  "pmra=pmra_as:arcsec/yr", "pmdec=pmdec_as:arcsec/yr"],
                                 "hms, dms, arcsec")
        check_sexagesimal(tap, stars, rows)
        check_small_angles(tap, stars, rows)

        rows = import_and_export(tap, directory, "radians", path,
                                 ["ra=ra_rad:rad", "dec=dec_rad:rad"], "rad")
        check_radians(tap, stars, rows)
    tap.finish()


if __name__ == "__main__":
    main()
