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

import csv
import io
import math
import os
import random
import subprocess
import sys
import tempfile

try:
    from uncertainties import ufloat, umath
except ImportError:
    print("1..0 # SKIP uncertainties is not installed (Debian: python3-uncertainties)")
    sys.exit(0)

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


def write_catalogue(path, stars):
    with open(path, "w", encoding="utf-8", newline="") as f:
        writer = csv.writer(f, lineterminator="\n")
        writer.writerow(COLUMNS)
        for star in stars:
            writer.writerow([star["id"]] + [repr(star[c]) for c in COLUMNS[1:]])


# ---- the command line --------------------------------------------------------

def run_cli(*args):
    return subprocess.run([os.environ["STARLEDGER_CLI"], *args],
                          capture_output=True, text=True, timeout=60)


def check_run(tap, result, description):
    return tap.check(result.returncode == 0, description,
                     ["exit status %d" % result.returncode]
                     + result.stderr.strip().splitlines()[:10])


def derive_and_export(tap, project, derive_args, what):
    if not check_run(tap, run_cli("derive", project, *derive_args),
                     "starledger-cli derive %s" % " ".join(derive_args)):
        return {}
    exported = run_cli("export", project, "--columns", ",".join(QUANTITIES + ("flags",)))
    if not check_run(tap, exported, "starledger-cli export (%s)" % what):
        return {}
    rows = {row["id"]: row for row in csv.DictReader(io.StringIO(exported.stdout))}
    tap.check(len(rows) == N_STARS, "export (%s) has all %d stars" % (what, N_STARS),
              ["want %d rows" % N_STARS, "got %d rows" % len(rows)])
    return rows


def number(row, column):
    try:
        return float(row.get(column, ""))
    except (TypeError, ValueError):
        return math.nan


# ---- comparisons -------------------------------------------------------------

def relative_difference(got, want):
    diff = abs(got - want) / abs(want) if want != 0 else abs(got - want)
    return diff if math.isfinite(diff) else math.inf


def compare_quantity(tap, stars, rows, references, quantity, what):
    """Values and half-widths of QUANTITY for every star; the worst of each."""
    worst_value = worst_sigma = None
    for star in stars:
        ref = references[star["id"]][quantity]
        row = rows.get(star["id"], {})
        got = number(row, quantity)
        got_sigma = (number(row, quantity + "_hi") - number(row, quantity + "_lo")) / 2.0
        d_value = relative_difference(got, ref.nominal_value)
        d_sigma = relative_difference(got_sigma, ref.std_dev)
        if worst_value is None or d_value > worst_value[0]:
            worst_value = (d_value, star, ref.nominal_value, got)
        if worst_sigma is None or d_sigma > worst_sigma[0]:
            worst_sigma = (d_sigma, star, ref.std_dev, got_sigma, row)
    d, star, want, got = worst_value
    tap.check(d <= RELATIVE_TOLERANCE,
              "%s value equals the uncertainties.umath chain (%s; %d stars, worst %.3g relative)"
              % (quantity, what, len(stars), d),
              ["star %s" % star["id"], "want %s = %.15g (tolerance %g relative)" % (quantity, want, RELATIVE_TOLERANCE),
               "got  %s = %.15g" % (quantity, got)])
    d, star, want, got, row = worst_sigma
    tap.check(d <= RELATIVE_TOLERANCE,
              "%s 1-sigma (hi - lo)/2 equals uncertainties' std_dev (%s; %d stars, worst %.3g relative)"
              % (quantity, what, len(stars), d),
              ["star %s" % star["id"],
               "want sigma %s = %.15g (tolerance %g relative)" % (quantity, want, RELATIVE_TOLERANCE),
               "got  sigma %s = %.15g (lo %s, hi %s)" % (quantity, got, row.get(quantity + "_lo"),
                                                        row.get(quantity + "_hi"))])
    return worst_value[0], worst_sigma[0]


def main():
    if not os.environ.get("STARLEDGER_CLI"):
        print("Bail out! STARLEDGER_CLI is not set")
        sys.exit(1)
    rng = random.Random(SEED)
    stars = make_stars(rng)
    tap = Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-uncertainties-") as directory:
        path = os.path.join(directory, "stars.csv")
        project = os.path.join(directory, "stars.starledger")
        write_catalogue(path, stars)
        check_run(tap, run_cli("new", project), "starledger-cli new")
        result = run_cli("import", project, path)
        check_run(tap, result, "starledger-cli import exits 0")
        tap.check(result.returncode == 0 and result.stderr.strip() == "", "import rejects no row",
                  result.stderr.strip().splitlines()[:10])

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
