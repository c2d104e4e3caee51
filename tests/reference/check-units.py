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

import math
import os
import random
import sys
import tempfile

# The shared module sits beside this script; no bytecode cache is written
# into the source tree.
sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402

try:
    import astropy.units as u
    from astropy.coordinates import Angle
except ImportError:
    tap_lib.skip_all("astropy is not installed (Debian: python3-astropy)")

SEED = 20260401
N_STARS = 50
DEG_TOLERANCE = 1e-9        # deg, for positions
MAS_TOLERANCE = 1e-9        # mas and mas/yr
MINUS = "\u2212"            # U+2212 MINUS SIGN

RA_STYLES = ("blanks", "colons", "letters")
DEC_STYLES = ("blanks", "colons", "letters", "symbols")


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


# ---- the command line --------------------------------------------------------

def import_and_export(tap, directory, name, csv_path, maps, what):
    """Creates project NAME, imports CSV_PATH with MAPS and returns the
    exported rows by id (empty if a step failed)."""
    project = os.path.join(directory, name + ".starledger")
    if not tap_lib.new_project(tap, project, name):
        return {}
    tap_lib.import_csv(tap, project, csv_path, what,
                       args=[arg for spec in maps for arg in ("--map", spec)])
    return tap_lib.export_rows(tap, project, what=what, expected=N_STARS)


# ---- comparisons -------------------------------------------------------------

def compare(tap, stars, rows, column, reference, tolerance, unit, description):
    """Checks ROWS[id][COLUMN] against REFERENCE(star) for every star and
    reports the worst one, with the texts it was imported from."""
    items = [("star %s (ra_h=%r dec_d=%r) %s" % (star["id"], star["ra_h"], star["dec_d"], column),
              reference(star), tap_lib.number(rows.get(star["id"], {}), column))
             for star in stars]
    return tap_lib.compare(tap, items, description, unit, tolerance, noun="stars")


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
    tap_lib.required_env("STARLEDGER_CLI")
    rng = random.Random(SEED)
    stars = [make_star(rng, i) for i in range(1, N_STARS + 1)]
    tap = tap_lib.Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-units-") as directory:
        path = os.path.join(directory, "reference.csv")
        tap_lib.write_csv(path, COLUMNS, stars)

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
