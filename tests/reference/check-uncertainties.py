#!/usr/bin/python3
# check-uncertainties.py: checks starledger-cli's first-order (linear)
# uncertainties against python3-uncertainties (Debian), which propagates
# errors by automatic differentiation with code that shares nothing with
# ours.  The chain is re-implemented here with uncertainties.umath from the
# published formulas (REFERENCES.md):
#   dist = 1000 / parallax[mas]; distmod = 5 log10(dist) - 5;
#   A_V = R_V E(B-V) (Cardelli et al. 1989, R_V = 3.1); (B-V)0 = B-V - E(B-V);
#   M_V = V - distmod - A_V;
#   log Teff = sum c_i (B-V)0^i (Flower 1996, Torres 2010 Table 2);
#   BC_V = polynomial in log Teff, three pieces (Flower 1996, Torres 2010
#   Table 1); M_bol = M_V + BC_V;
#   L = 10^(-0.4 (M_bol - M_bol,sun)), M_bol,sun = -26.76 + 5 log10(10 pc /
#   1 au) + BC_V(5772 K) (Torres 2010; IAU 2015 B2, B3);
#   R = sqrt(L) (5772 K / Teff)^2 (IAU 2015 B3, ratio form);
#   vtan = A sqrt(pmra^2 + pmdec^2) / 1000 x dist, A = 1 au / Julian year.
# On ~30 random stars with V, B-V, parallax (S/N >= 20), E(B-V) and proper
# motions, all with errors, the CLI's values and 1-sigma half-widths
# ((hi - lo) / 2) must agree to 1e-6 relative; a second run gives R_V an
# error of its own (sigma_AV^2 = (R_V sigma_E)^2 + (E sigma_RV)^2).
#
# Not checked: the log Teff - log L correlation the engine computes for the
# HR diagram, which neither export nor explain --json shows.
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
    from uncertainties import ufloat, umath
except ImportError:
    tap_lib.skip_all("uncertainties is not installed (Debian: python3-uncertainties)")

SEED = 20260403
N_STARS = 30
RELATIVE_TOLERANCE = 1e-6

# Flower (1996, ApJ 469, 355), coefficients as corrected by Torres (2010,
# AJ 140, 1158): Table 2 (log Teff from B-V; main sequence, subgiants,
# giants) and Table 1 (BC_V from log Teff, three pieces).
LOGT_COEFFS = (3.979145106714099, -0.654992268598245, 1.740690042385095, -4.608815154057166,
               6.792599779944473, -5.396909891322525, 2.192970376522490, -0.359495739295671)
BC_COOL = (-0.190537291496456e+05, 0.155144866764412e+05, -0.421278819301717e+04,
           0.381476328422343e+03)
BC_MIDDLE = (-0.370510203809015e+05, 0.385672629965804e+05, -0.150651486316025e+05,
             0.261724637119416e+04, -0.170623810323864e+03)
BC_HOT = (-0.118115450538963e+06, 0.137145973583929e+06, -0.636233812100225e+05,
          0.147412923562646e+05, -0.170587278406872e+04, 0.788731721804990e+02)

V_SUN = -26.76                                        # Torres (2010)
DISTMOD_AU_AT_10PC = 5.0 * math.log10(10.0 * 648000.0 / math.pi)   # = 31.572126 (IAU 2015 B2 parsec)
T_SUN = 5772.0                                        # IAU 2015 B3
AU_PER_JULIAN_YEAR_KM_S = 149597870.7 / (365.25 * 86400.0)          # IAU 2012 B2 au

QUANTITIES = ("dist", "distmod", "av", "bv0", "absmag", "teff", "bc", "mbol", "lum", "radius", "vtan")


# ---- the reference chain -------------------------------------------------------

def polynomial(coeffs, x):
    total = 0.0
    for c in reversed(coeffs):
        total = total * x + c
    return total


def bc_flower(log_teff):
    """The piece is chosen by the nominal value: first below 3.70, second
    below 3.90, third from 3.90 (Torres 2010, Table 1)."""
    value = log_teff.nominal_value if hasattr(log_teff, "nominal_value") else log_teff
    if value < 3.70:
        return polynomial(BC_COOL, log_teff)
    if value < 3.90:
        return polynomial(BC_MIDDLE, log_teff)
    return polynomial(BC_HOT, log_teff)


def reference_chain(star, rv):
    """The chain with uncertainties.ufloat inputs; RV a float or a ufloat."""
    plx = ufloat(star["parallax"], star["parallax_err"], "parallax")
    vmag = ufloat(star["vmag"], star["vmag_err"], "vmag")
    bv = ufloat(star["bv"], star["bv_err"], "bv")
    ebv = ufloat(star["ebv"], star["ebv_err"], "ebv")
    pmra = ufloat(star["pmra"], star["pmra_err"], "pmra")
    pmdec = ufloat(star["pmdec"], star["pmdec_err"], "pmdec")

    q = {}
    q["dist"] = 1000.0 / plx
    q["distmod"] = 5.0 * umath.log10(q["dist"]) - 5.0
    q["av"] = rv * ebv
    q["bv0"] = bv - ebv
    q["absmag"] = vmag - q["distmod"] - q["av"]
    log_teff = polynomial(LOGT_COEFFS, q["bv0"])
    q["teff"] = 10.0 ** log_teff
    q["bc"] = bc_flower(umath.log10(q["teff"]))
    q["mbol"] = q["absmag"] + q["bc"]
    mbol_sun = V_SUN + DISTMOD_AU_AT_10PC + bc_flower(math.log10(T_SUN))
    q["lum"] = 10.0 ** (-0.4 * (q["mbol"] - mbol_sun))
    q["radius"] = umath.sqrt(q["lum"]) * (T_SUN / q["teff"]) ** 2
    mu = umath.sqrt(pmra ** 2 + pmdec ** 2)
    q["vtan"] = AU_PER_JULIAN_YEAR_KM_S * mu / 1000.0 * q["dist"]
    return q


# ---- the stars ---------------------------------------------------------------

def make_stars(rng):
    stars = []
    while len(stars) < N_STARS:
        i = len(stars) + 1
        bv = rng.uniform(-0.25, 1.65)
        ebv = rng.uniform(0.0, 0.3)
        bv0 = bv - ebv
        if not -0.30 <= bv0 <= 1.70:
            continue
        log_teff = polynomial(LOGT_COEFFS, bv0)
        # Keep away from the BC pieces' edges, where the derivative jumps.
        if min(abs(log_teff - 3.70), abs(log_teff - 3.90)) < 0.01:
            continue
        plx = 10 ** rng.uniform(-0.5, 2.7)
        star = {
            "id": "UNC %02d" % i,
            "parallax": plx, "parallax_err": plx / rng.uniform(20.0, 500.0),
            "vmag": rng.uniform(-1.0, 15.0), "vmag_err": rng.uniform(0.002, 0.05),
            "bv": bv, "bv_err": rng.uniform(0.003, 0.03),
            "ebv": ebv, "ebv_err": rng.uniform(0.005, 0.04),
            "pmra": rng.uniform(-2000.0, 2000.0), "pmra_err": rng.uniform(0.01, 3.0),
            "pmdec": rng.uniform(-2000.0, 2000.0), "pmdec_err": rng.uniform(0.01, 3.0),
        }
        # Round-trip through the text written to the CSV, so both sides
        # start from the same numbers.
        for key in list(star):
            if key != "id":
                star[key] = float(repr(star[key]))
        stars.append(star)
    return stars


COLUMNS = ("id", "parallax", "parallax_err", "vmag", "vmag_err", "bv", "bv_err", "ebv", "ebv_err",
           "pmra", "pmra_err", "pmdec", "pmdec_err")


def catalogue_rows(stars):
    """The stars as CSV text: repr() gives back the very floats the
    reference chain starts from."""
    return [{c: star[c] if c == "id" else repr(star[c]) for c in COLUMNS} for star in stars]


# ---- the command line --------------------------------------------------------

def derive_and_export(tap, project, derive_args, what):
    if not tap_lib.check_run(tap, tap_lib.run_cli("derive", project, *derive_args),
                             "starledger-cli derive %s" % " ".join(derive_args)):
        return {}
    return tap_lib.export_rows(tap, project, QUANTITIES + ("flags",), what, expected=N_STARS)


# ---- comparisons -------------------------------------------------------------

def compare_quantity(tap, stars, rows, references, quantity, what):
    """Values and half-widths of QUANTITY for every star; the worst of each."""
    values, sigmas = [], []
    for star in stars:
        ref = references[star["id"]][quantity]
        row = rows.get(star["id"], {})
        got_sigma = (tap_lib.number(row, quantity + "_hi") - tap_lib.number(row, quantity + "_lo")) / 2.0
        values.append(("star %s %s" % (star["id"], quantity), ref.nominal_value,
                       tap_lib.number(row, quantity)))
        sigmas.append(("star %s sigma %s (lo %s, hi %s)" % (star["id"], quantity, row.get(quantity + "_lo"),
                                                           row.get(quantity + "_hi")),
                       ref.std_dev, got_sigma))
    tap_lib.compare(tap, values, "%s value equals the uncertainties.umath chain, %s" % (quantity, what),
                    "", RELATIVE_TOLERANCE, relative=True, noun="stars")
    tap_lib.compare(tap, sigmas, "%s 1-sigma (hi - lo)/2 equals uncertainties' std_dev, %s"
                    % (quantity, what), "", RELATIVE_TOLERANCE, relative=True, noun="stars")


def main():
    tap_lib.required_env("STARLEDGER_CLI")
    rng = random.Random(SEED)
    stars = make_stars(rng)
    tap = tap_lib.Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-uncertainties-") as directory:
        path = os.path.join(directory, "stars.csv")
        project = os.path.join(directory, "stars.starledger")
        tap_lib.write_csv(path, COLUMNS, catalogue_rows(stars))
        tap_lib.new_project(tap, project)
        tap_lib.import_csv(tap, project, path)

        # R_V = 3.1 exactly (the default).
        rows = derive_and_export(tap, project, ["--all"], "R_V 3.1")
        references = {s["id"]: reference_chain(s, 3.1) for s in stars}
        flagged = ["%s: %s" % (s["id"], rows.get(s["id"], {}).get("flags")) for s in stars
                   if rows.get(s["id"], {}).get("flags", "") != ""]
        tap.check(not flagged, "no star is flagged (every input has an error, S/N >= 20, colours in "
                  "Flower's range)", flagged[:5])
        for quantity in QUANTITIES:
            compare_quantity(tap, stars, rows, references, quantity, "R_V 3.1")

        # R_V = 3.1 +/- 0.2: one more independent error source.
        rows = derive_and_export(tap, project, ["--all", "--extinction-ratio", "3.1",
                                                "--extinction-ratio-error", "0.2"], "R_V 3.1 +/- 0.2")
        rv = ufloat(3.1, 0.2, "rv")
        references = {s["id"]: reference_chain(s, rv) for s in stars}
        for quantity in ("av", "absmag", "mbol", "lum", "radius"):
            compare_quantity(tap, stars, rows, references, quantity, "R_V 3.1 +/- 0.2")
    tap.finish()


if __name__ == "__main__":
    main()
