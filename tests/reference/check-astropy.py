#!/usr/bin/python3
# check-astropy.py: checks starledger-cli's derived quantities against
# astropy (Debian python3-astropy), an implementation that shares no code
# with ours:
#   (a) the distance modulus (and distance) of ~50 random parallaxes with
#       S/N >= 5 against Distance(parallax=...).distmod;
#   (b) ecliptic coordinates of ~200 random ICRS positions against astropy's
#       ICRS -> BarycentricMeanEcliptic(equinox='J2000') transform (mean
#       ecliptic and equinox of J2000, IAU 2006), to 1 mas, and their
#       first-order errors against astropy's transform differentiated
#       numerically;
#   (c) the constants behind vtan, radius and lum: the tangential velocity
#       against (pm_total * distance).to(km/s, dimensionless_angles()); the
#       Stefan-Boltzmann radius against the IAU 2015 B3 nominal R_sun and
#       L_sun and CODATA 2018 sigma (astropy.constants); the luminosity
#       scale's M_bol,sun = V_sun + 5 log10(10 pc / 1 au) + BC(5772 K)
#       against the parsec and au of astropy.units, and against the IAU 2015
#       B2 zero point L_bol0.
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
from starledger_tap import compare, number  # noqa: E402

try:
    import numpy as np
    import astropy.units as u
    from astropy.constants import codata2018, iau2015
    from astropy.coordinates import BarycentricMeanEcliptic, Distance, SkyCoord
except ImportError:
    tap_lib.skip_all("astropy or numpy is not installed (Debian: python3-astropy, python3-numpy)")

SEED = 20260402
N_PARALLAXES = 50
N_POSITIONS = 200
N_VTAN = 20

DISTMOD_TOLERANCE = 1e-9        # mag
DIST_RELATIVE = 1e-12
ECLIPTIC_TOLERANCE_MAS = 1.0
ECLIPTIC_SIGMA_RELATIVE = 1e-5  # fixed-obliquity derivatives vs ERFA's matrix, finite differences
VTAN_RELATIVE = 1e-9
RADIUS_RATIO_RELATIVE = 1e-12   # the ratio form itself, printed to 15 digits
RADIUS_SI_RELATIVE = 3e-6       # IAU 2015 B3 nominal values close Stefan-Boltzmann to 2.4e-6 in L
MBOL_SUN_TOLERANCE = 1e-9       # mag
V_SUN_ERROR = 0.03              # mag, Torres (2010): V_sun = -26.76 +/- 0.03
V_SUN = -26.76                  # Torres (2010, AJ 140, 1158)
T_SUN = 5772.0                  # K, IAU 2015 Resolution B3


# ---- the command line --------------------------------------------------------

def derive_and_export(tap, directory, name, columns, rows, export_columns,
                      overrides=(), derive_args=()):
    """Writes ROWS to a CSV, creates project NAME, imports it, sets the
    OVERRIDES (id, quantity, value), derives with DERIVE_ARGS and returns the
    exported rows by id (empty if a step failed)."""
    csv_path = os.path.join(directory, name + ".csv")
    project = os.path.join(directory, name + ".starledger")
    tap_lib.write_csv(csv_path, columns, rows)
    if not tap_lib.new_project(tap, project, name):
        return {}
    tap_lib.import_csv(tap, project, csv_path, name)
    for star, quantity, value in overrides:
        result = tap_lib.run_cli("override", project, star, quantity, value,
                                 "--reason", "check-astropy: a given %s" % quantity)
        if result.returncode != 0:
            tap_lib.check_run(tap, result, "starledger-cli override %s %s" % (star, quantity))
            return {}
    if not tap_lib.check_run(tap, tap_lib.run_cli("derive", project, *derive_args),
                             "starledger-cli derive (%s)" % name):
        return {}
    return tap_lib.export_rows(tap, project, export_columns, name, expected=len(rows))


# ---- (a) distance modulus ----------------------------------------------------

def parallax_stars(rng):
    stars = []
    for i in range(1, N_PARALLAXES + 1):
        plx = 10 ** rng.uniform(math.log10(0.2), math.log10(900.0))
        snr = 5.0 if i == 1 else 10 ** rng.uniform(math.log10(5.0), 3.0)
        if i == 2:
            plx = 100.0                     # 10 pc: distmod exactly 0
        plx_text = "%.9g" % plx
        stars.append({"id": "PLX %02d" % i, "parallax": plx_text,
                      "parallax_err": "%.9g" % (float(plx_text) / snr)})
    # S/N exactly 5 must still give a distance.
    stars[0]["parallax_err"] = "%.9g" % (float(stars[0]["parallax"]) / 5.0)
    return stars


def check_distance_modulus(tap, directory, rng):
    stars = parallax_stars(rng)
    rows = derive_and_export(tap, directory, "distmod", ("id", "parallax", "parallax_err"),
                             stars, ["dist", "distmod"])
    distmod, dist = [], []
    for star in stars:
        d = Distance(parallax=float(star["parallax"]) * u.mas)
        row = rows.get(star["id"], {})
        label = "%s parallax %s mas" % (star["id"], star["parallax"])
        distmod.append((label, d.distmod.to_value(u.mag), number(row, "distmod")))
        dist.append((label, d.to_value(u.pc), number(row, "dist")))
    compare(tap, dist, "dist equals astropy Distance(parallax=...) in pc", "pc",
            DIST_RELATIVE, relative=True)
    compare(tap, distmod, "distmod equals astropy Distance(parallax=...).distmod", "mag",
            DISTMOD_TOLERANCE)


# ---- (b) ecliptic coordinates ------------------------------------------------

def ecliptic_positions(rng):
    special = [(0.0, 0.0), (359.999999999, 0.0), (0.0, 90.0), (180.0, -90.0),
               (270.0, 66.560708333), (90.0, -66.560708333),   # near the ecliptic poles
               (0.0, 1e-9), (180.0, 0.0), (90.0, 23.4392911)]
    stars = []
    for i in range(N_POSITIONS):
        if i < len(special):
            ra, dec = special[i]
        else:
            ra = rng.uniform(0.0, 360.0)
            dec = math.degrees(math.asin(rng.uniform(-1.0, 1.0)))
        stars.append({"id": "ECL %03d" % (i + 1), "ra": "%.12f" % ra, "dec": "%.12f" % dec,
                      "ra_err": "%.4f" % rng.uniform(0.05, 50.0),
                      "dec_err": "%.4f" % rng.uniform(0.05, 50.0)})
    return stars


def astropy_ecliptic(ra_deg, dec_deg):
    coord = SkyCoord(ra=np.asarray(ra_deg) * u.deg, dec=np.asarray(dec_deg) * u.deg, frame="icrs")
    ecl = coord.transform_to(BarycentricMeanEcliptic(equinox="J2000"))
    return ecl.lon.to_value(u.deg), ecl.lat.to_value(u.deg)


def separation_mas(lon1, lat1, lon2, lat2):
    """Great-circle separation (Vincenty's formula), mas."""
    l1, b1, l2, b2 = (np.radians(x) for x in (lon1, lat1, lon2, lat2))
    dl = l2 - l1
    num = np.hypot(np.cos(b2) * np.sin(dl),
                   np.cos(b1) * np.sin(b2) - np.sin(b1) * np.cos(b2) * np.cos(dl))
    den = np.sin(b1) * np.sin(b2) + np.cos(b1) * np.cos(b2) * np.cos(dl)
    return np.degrees(np.arctan2(num, den)) * 3.6e6


def check_ecliptic(tap, directory, rng):
    stars = ecliptic_positions(rng)
    rows = derive_and_export(tap, directory, "ecliptic",
                             ("id", "ra", "ra_err", "dec", "dec_err"), stars, ["elon", "elat"])
    ra = np.array([float(s["ra"]) for s in stars])
    dec = np.array([float(s["dec"]) for s in stars])
    want_lon, want_lat = astropy_ecliptic(ra, dec)
    got_lon = np.array([number(rows.get(s["id"], {}), "elon") for s in stars])
    got_lat = np.array([number(rows.get(s["id"], {}), "elat") for s in stars])

    sep = separation_mas(want_lon, want_lat, got_lon, got_lat)
    sep = np.where(np.isfinite(sep), sep, np.inf)
    k = int(np.argmax(sep))
    tap.check(sep[k] <= ECLIPTIC_TOLERANCE_MAS,
              "(elon, elat) equals astropy ICRS -> BarycentricMeanEcliptic(equinox='J2000') "
              "(IAU 2006) within %g mas (%d positions, max separation %.3g mas)"
              % (ECLIPTIC_TOLERANCE_MAS, len(stars), sep[k]),
              ["%s: ra %s dec %s" % (stars[k]["id"], stars[k]["ra"], stars[k]["dec"]),
               "want (astropy) elon %.12f elat %.12f deg" % (want_lon[k], want_lat[k]),
               "got            elon %.12f elat %.12f deg" % (got_lon[k], got_lat[k])])

    lat_diff = np.abs(got_lat - want_lat) * 3.6e6
    k = int(np.nanargmax(np.where(np.isfinite(lat_diff), lat_diff, np.inf)))
    tap.check(bool(np.all(lat_diff <= ECLIPTIC_TOLERANCE_MAS)),
              "elat equals astropy BarycentricMeanEcliptic lat within %g mas (max %.3g mas)"
              % (ECLIPTIC_TOLERANCE_MAS, lat_diff[k]),
              ["%s: want %.12f deg, got %.12f deg" % (stars[k]["id"], want_lat[k], got_lat[k])])

    in_range = [(s["id"], lo, la) for s, lo, la in zip(stars, got_lon, got_lat)
                if not (0.0 <= lo < 360.0 and -90.0 <= la <= 90.0)]
    tap.check(not in_range, "elon in [0, 360) and elat in [-90, 90], as astropy's Longitude/Latitude",
              ["%s: elon %r elat %r" % x for x in in_range[:5]])

    # First-order errors: astropy's transform differentiated by central
    # differences, the RA error taken on the sky (divided by cos dec) as the
    # vocabulary says.  Away from both poles, where the derivatives are tame.
    h = 1e-5   # deg
    lon_pa, lat_pa = astropy_ecliptic(ra + h, dec)
    lon_ma, lat_ma = astropy_ecliptic(ra - h, dec)
    lon_pd, lat_pd = astropy_ecliptic(ra, np.minimum(dec + h, 90.0))   # the poles are skipped below
    lon_md, lat_md = astropy_ecliptic(ra, np.maximum(dec - h, -90.0))
    wrap = lambda x: (x + 180.0) % 360.0 - 180.0
    dl_da, dl_dd = wrap(lon_pa - lon_ma) / (2 * h), wrap(lon_pd - lon_md) / (2 * h)
    db_da, db_dd = (lat_pa - lat_ma) / (2 * h), (lat_pd - lat_md) / (2 * h)
    sig_a = np.array([float(s["ra_err"]) for s in stars]) / 3.6e6 / np.cos(np.radians(dec))
    sig_d = np.array([float(s["dec_err"]) for s in stars]) / 3.6e6
    want_sl = np.hypot(dl_da * sig_a, dl_dd * sig_d)
    want_sb = np.hypot(db_da * sig_a, db_dd * sig_d)
    lon_items, lat_items = [], []
    for i, s in enumerate(stars):
        if abs(dec[i]) > 89.0 or abs(want_lat[i]) > 89.0:
            continue
        row = rows.get(s["id"], {})
        label = "%s ra %s dec %s" % (s["id"], s["ra"], s["dec"])
        lon_items.append((label, want_sl[i], (number(row, "elon_hi") - number(row, "elon_lo")) / 2))
        lat_items.append((label, want_sb[i], (number(row, "elat_hi") - number(row, "elat_lo")) / 2))
    compare(tap, lon_items, "elon 1-sigma half-width equals astropy transform's numerical Jacobian "
            "applied to the ra/dec errors", "deg", ECLIPTIC_SIGMA_RELATIVE, relative=True)
    compare(tap, lat_items, "elat 1-sigma half-width equals astropy transform's numerical Jacobian "
            "applied to the ra/dec errors", "deg", ECLIPTIC_SIGMA_RELATIVE, relative=True)


# ---- (c) constants -----------------------------------------------------------

def vtan_stars(rng):
    # Procyon (van Leeuwen 2007, as in REFERENCES.md 12) and random stars.
    stars = [{"id": "VT 01", "parallax": "284.56", "parallax_err": "1.26",
              "pmra": "-714.59", "pmdec": "-1036.80"}]
    for i in range(2, N_VTAN + 1):
        plx = 10 ** rng.uniform(0.0, 2.5)
        stars.append({"id": "VT %02d" % i, "parallax": "%.6f" % plx,
                      "parallax_err": "%.6f" % (plx / rng.uniform(6.0, 500.0)),
                      "pmra": "%.4f" % rng.uniform(-3000.0, 3000.0),
                      "pmdec": "%.4f" % rng.uniform(-3000.0, 3000.0)})
    stars[-1]["pmra"], stars[-1]["pmdec"] = "0.0000", "-0.0100"      # a tiny motion
    return stars


def check_vtan(tap, directory, rng):
    stars = vtan_stars(rng)
    rows = derive_and_export(tap, directory, "vtan",
                             ("id", "parallax", "parallax_err", "pmra", "pmdec"), stars, ["vtan"])
    items = []
    for s in stars:
        pm_total = math.hypot(float(s["pmra"]), float(s["pmdec"])) * u.mas / u.yr
        distance = Distance(parallax=float(s["parallax"]) * u.mas)
        want = (pm_total * distance).to_value(u.km / u.s, u.dimensionless_angles())
        items.append(("%s pm (%s, %s) mas/yr, parallax %s mas" % (s["id"], s["pmra"], s["pmdec"],
                                                                  s["parallax"]),
                      want, number(rows.get(s["id"], {}), "vtan")))
    compare(tap, items, "vtan equals astropy (pm_total * Distance(parallax)).to(km/s, "
            "dimensionless_angles()) (IAU 2012 au, Julian year)", "km/s", VTAN_RELATIVE, relative=True)


def astropy_distmod_au_at_10pc():
    """5 log10(10 pc / 1 au) from astropy's parsec and au (IAU 2015 B2, 2012 B2)."""
    return 5.0 * math.log10((10.0 * u.pc / u.au).to_value(u.dimensionless_unscaled))


def check_solar_scale(tap, directory):
    dm = astropy_distmod_au_at_10pc()
    # Radius: luminosity and temperature given by hand (a spectroscopic
    # analysis, say); SUN10 is the Sun at 10 pc (REFERENCES.md 5, closure
    # test), its V from astropy's units, its Teff the nominal 5772 K.
    given = [("RAD 1", 1.0, 5772.0), ("RAD 2", 0.0035, 3100.0), ("RAD 3", 85000.0, 35000.0),
             ("RAD 4", 6.93, 6530.0), ("RAD 5", 120.0, 4300.0), ("RAD 6", 2.5e-4, 2950.0)]
    stars = [{"id": sid, "parallax": "10", "parallax_err": "0.1"} for sid, _, _ in given]
    stars.append({"id": "SUN10", "parallax": "100", "parallax_err": "0.01",
                  "vmag": repr(V_SUN + dm), "vmag_err": "0.001"})
    # Stars whose Teff comes from the colour, for M_bol,sun from lum and mbol.
    for i, (bv, v, plx) in enumerate([(0.42, 0.34, 284.56), (0.65, 8.2, 12.5), (1.3, 11.0, 40.0),
                                      (-0.1, 6.0, 3.2), (0.9, 9.5, 7.7)], start=1):
        stars.append({"id": "COL %d" % i, "parallax": repr(plx), "parallax_err": repr(plx / 50),
                      "vmag": repr(v), "vmag_err": "0.01", "bv": repr(bv), "bv_err": "0.01"})
    overrides = [(sid, "lum", repr(lum)) for sid, lum, _ in given]
    overrides += [(sid, "teff", repr(teff)) for sid, _, teff in given]
    overrides.append(("SUN10", "teff", repr(T_SUN)))
    rows = derive_and_export(tap, directory, "solar",
                             ("id", "parallax", "parallax_err", "vmag", "vmag_err", "bv", "bv_err"),
                             stars, ["teff", "bc", "mbol", "lum", "radius"], overrides=overrides)

    # The ratio form with the nominal 5772 K.
    items = [("%s L %g T %g" % (sid, lum, teff), math.sqrt(lum) * (T_SUN / teff) ** 2,
              number(rows.get(sid, {}), "radius")) for sid, lum, teff in given]
    compare(tap, items, "radius equals sqrt(L) (5772 K / T)^2 for given L, T (IAU 2015 B3 nominal "
            "T_sun)", "R_sun", RADIUS_RATIO_RELATIVE, relative=True)

    # The same radius from the Stefan-Boltzmann law in SI with astropy's
    # nominal L_sun, R_sun (IAU 2015 B3) and CODATA 2018 sigma.
    sigma = codata2018.sigma_sb
    items = []
    for sid, lum, teff in given:
        r_si = np.sqrt(lum * iau2015.L_sun / (4 * math.pi * sigma * (teff * u.K) ** 4))
        items.append(("%s L %g T %g" % (sid, lum, teff), (r_si / iau2015.R_sun).to_value(u.one),
                      number(rows.get(sid, {}), "radius")))
    compare(tap, items, "radius equals sqrt(L L_sun / (4 pi sigma T^4)) / R_sun with astropy iau2015 "
            "L_sun, R_sun and codata2018 sigma_sb (nominal values close to 2.4e-6 in L)",
            "R_sun", RADIUS_SI_RELATIVE, relative=True)

    # The solar temperature implied by the CLI's radii against the one
    # implied by astropy's nominal L_sun, R_sun and sigma.
    t_astropy = ((iau2015.L_sun / (4 * math.pi * sigma * iau2015.R_sun ** 2)) ** 0.25).to_value(u.K)
    items = []
    for sid, lum, teff in given:
        radius = number(rows.get(sid, {}), "radius")
        items.append(("%s: T sqrt(R / sqrt(L))" % sid, t_astropy, teff * math.sqrt(radius / math.sqrt(lum))))
    compare(tap, items, "T_sun implied by the radii equals (L_sun / (4 pi sigma R_sun^2))^(1/4) from "
            "astropy iau2015 (%.6f K)" % t_astropy, "K", 1e-6, relative=True)

    # Luminosity scale: the closure test, and M_bol,sun = mbol + 2.5 log10 lum
    # for every star against V_sun + 5 log10(10 pc/1 au) [astropy] + BC(5772 K).
    sun = rows.get("SUN10", {})
    bc_sun = number(sun, "bc")
    tap.check(abs(number(sun, "teff") - T_SUN) < 1e-9 and abs(bc_sun - (-0.0810)) < 5e-5,
              "Sun at 10 pc: teff is the nominal 5772 K and BC(5772 K) = -0.0810 (REFERENCES.md 3.3)",
              ["want teff 5772, bc -0.0810", "got  teff %s, bc %s" % (sun.get("teff"), sun.get("bc"))])
    compare(tap, [("SUN10 V = -26.76 + %.12f" % dm, 1.0, number(sun, "lum")),
                  ("SUN10 radius", 1.0, number(sun, "radius"))],
            "Sun at 10 pc (V = -26.76 + 5 log10(10 pc/1 au) from astropy units, Teff 5772 K) has "
            "lum 1 and radius 1", "L_sun or R_sun", 1e-9, relative=True)
    mbol_sun = V_SUN + dm + bc_sun
    items = []
    for s in stars:
        row = rows.get(s["id"], {})
        if s["id"] == "SUN10" or s["id"].startswith("COL"):
            items.append(("%s mbol %s lum %s" % (s["id"], row.get("mbol"), row.get("lum")), mbol_sun,
                          number(row, "mbol") + 2.5 * math.log10(number(row, "lum"))))
    compare(tap, items, "mbol + 2.5 log10(lum) equals M_bol,sun = -26.76 + 5 log10(10 pc/1 au) "
            "[astropy: %.9f] + BC(5772 K)" % dm, "mag", MBOL_SUN_TOLERANCE)

    iau_mbol_sun = -2.5 * math.log10((iau2015.L_sun / iau2015.L_bol0).to_value(u.one))
    diff = mbol_sun - iau_mbol_sun
    tap.check(abs(diff) < V_SUN_ERROR,
              "the Flower/Torres-scale M_bol,sun (%.4f) is within the V_sun error (0.03 mag) of the IAU "
              "2015 B2 value -2.5 log10(L_sun / L_bol0) = %.4f from astropy iau2015 (difference %.4f mag)"
              % (mbol_sun, iau_mbol_sun, diff),
              ["want |difference| < %g mag" % V_SUN_ERROR, "got  %.6f mag" % diff])


def main():
    tap_lib.required_env("STARLEDGER_CLI")
    rng = random.Random(SEED)
    tap = tap_lib.Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-astropy-") as directory:
        check_distance_modulus(tap, directory, rng)
        check_ecliptic(tap, directory, rng)
        check_vtan(tap, directory, rng)
        check_solar_scale(tap, directory)
    tap.finish()


if __name__ == "__main__":
    main()
