#!/usr/bin/python3
# check-epoch.py: checks starledger-cli export --epoch against astropy
# (Debian python3-astropy), which shares no code with ours but ERFA's
# space-motion routine:
#   (a) positions: ~300 stars at epoch 2016 with proper motions up to
#       6 arcsec/yr, parallaxes (some missing) and radial velocities,
#       exported at J2030.0 and at J1991.25; each position must be within
#       0.01 mas of SkyCoord.apply_space_motion's;
#   (b) uncertainties: each half-interval of ra (on the sky, times
#       cos dec) and dec must be the first-order growth
#       sqrt(sigma0^2 + (dt sigma_mu)^2), computed here with numpy;
#   (c) stars without a proper motion keep their catalogue position and
#       epoch and carry the flag position_not_propagated; the others
#       have the epoch asked for in their epoch column.
#
# Speaks TAP; exits 1 if any check failed.  Environment: STARLEDGER_CLI.

import math
import os
import random
import sys
import tempfile
import warnings

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402

try:
    import numpy as np
    import astropy.units as u
    from astropy.coordinates import SkyCoord
    from astropy.time import Time
    from erfa import ErfaWarning
except ImportError:
    tap_lib.skip_all("astropy or numpy is not installed (Debian: python3-astropy, python3-numpy)")

SEED = 20261203
N_STARS = 300
CATALOGUE_EPOCH = 2016.0
POSITION_TOLERANCE_ARCSEC = 1e-5      # 0.01 mas: both are eraPmsafe
# The CSV has 15 significant digits: 1e-12 deg at RA 100 is 3.6e-9 arcsec.
ERROR_TOLERANCE_MAS = 1e-5
FLAG = "position_not_propagated"


def make_stars(rng):
    stars = []
    for i in range(N_STARS):
        speed, angle = rng.uniform(0, 6000), rng.uniform(0, 2 * math.pi)
        star = {"id": "E%d" % i, "ra": rng.uniform(0, 360),
                "dec": math.degrees(math.asin(rng.uniform(-0.98, 0.98))),
                "ra_err": rng.uniform(0.01, 5), "dec_err": rng.uniform(0.01, 5),
                "pmra": speed * math.cos(angle), "pmdec": speed * math.sin(angle),
                "pmra_err": rng.uniform(0.005, 2), "pmdec_err": rng.uniform(0.005, 2),
                # Every fifth star has no parallax: both let ERFA choose a
                # great distance.
                "parallax": rng.uniform(speed / 50 + 1, 800) if i % 5 else None,
                "vrad": rng.uniform(-200, 200)}
        # Every seventh has no proper motion at all.
        if i % 7 == 3:
            star["pmra"] = star["pmdec"] = star["pmra_err"] = star["pmdec_err"] = None
        stars.append(star)
    return stars


def astropy_positions(stars, epoch):
    """{id: (ra, dec)} of the moving stars at EPOCH by apply_space_motion."""
    t0 = Time(CATALOGUE_EPOCH, format="jyear", scale="tdb")
    t1 = Time(epoch, format="jyear", scale="tdb")
    out = {}
    moving = [s for s in stars if s["pmra"] is not None]
    for with_plx in (True, False):
        group = [s for s in moving if (s["parallax"] is not None) == with_plx]
        kwargs = dict(ra=np.array([s["ra"] for s in group]) * u.deg,
                      dec=np.array([s["dec"] for s in group]) * u.deg,
                      pm_ra_cosdec=np.array([s["pmra"] for s in group]) * u.mas / u.yr,
                      pm_dec=np.array([s["pmdec"] for s in group]) * u.mas / u.yr,
                      radial_velocity=np.array([s["vrad"] for s in group]) * u.km / u.s,
                      frame="icrs", obstime=t0)
        if with_plx:
            kwargs["distance"] = (np.array([s["parallax"] for s in group]) * u.mas).to(
                u.pc, u.parallax())
        moved = SkyCoord(**kwargs).apply_space_motion(new_obstime=t1)
        for s, ra, dec in zip(group, moved.ra.deg, moved.dec.deg):
            out[s["id"]] = (ra, dec)
    return out


def text(value, digits=12):
    return "" if value is None else "%.*f" % (digits, value)


def check_epoch(tap, project, stars, epoch):
    label = "J%g" % epoch
    result = tap_lib.run_cli("export", project, "--columns", "ra,dec,flags", "--epoch", "%g" % epoch)
    if not tap_lib.check_run(tap, result, "starledger-cli export --epoch %g" % epoch):
        return
    rows = tap_lib.parse_export(result.stdout)
    want = astropy_positions(stars, epoch)
    moving = [s for s in stars if s["pmra"] is not None]
    still = [s for s in stars if s["pmra"] is None]

    items = []
    for s in moving:
        row = rows.get(s["id"], {})
        ra, dec = tap_lib.number(row, "ra"), tap_lib.number(row, "dec")
        sep = SkyCoord(ra * u.deg, dec * u.deg).separation(
            SkyCoord(want[s["id"]][0] * u.deg, want[s["id"]][1] * u.deg)).to_value(u.arcsec) \
            if math.isfinite(ra) and math.isfinite(dec) else math.nan
        items.append((s["id"], 0.0, sep))
    tap_lib.compare(tap, items, "%s positions against SkyCoord.apply_space_motion" % label,
                    "arcsec", POSITION_TOLERANCE_ARCSEC, noun="stars")

    # (b) The half-intervals, back in mas on the sky.
    dt = epoch - CATALOGUE_EPOCH
    ra_items, dec_items = [], []
    for s in moving:
        row = rows.get(s["id"], {})
        dec = tap_lib.number(row, "dec")
        cos_dec = math.cos(math.radians(dec))
        ra_half = (tap_lib.number(row, "ra_hi") - tap_lib.number(row, "ra_lo")) / 2 * 3.6e6 * cos_dec
        dec_half = (tap_lib.number(row, "dec_hi") - tap_lib.number(row, "dec_lo")) / 2 * 3.6e6
        ra_items.append((s["id"], float(np.hypot(s["ra_err"], dt * s["pmra_err"])), ra_half))
        dec_items.append((s["id"], float(np.hypot(s["dec_err"], dt * s["pmdec_err"])), dec_half))
    tap_lib.compare(tap, ra_items, "%s RA errors grow as sqrt(sigma0^2 + (dt sigma_pmra)^2)" % label,
                    "mas", ERROR_TOLERANCE_MAS, noun="stars")
    tap_lib.compare(tap, dec_items, "%s Dec errors grow as sqrt(sigma0^2 + (dt sigma_pmdec)^2)" % label,
                    "mas", ERROR_TOLERANCE_MAS, noun="stars")

    # (c) The epoch column and the flag.
    wrong = []
    for s in moving:
        row = rows.get(s["id"], {})
        if tap_lib.number(row, "epoch") != epoch or FLAG in row.get("flags", ""):
            wrong.append((s["id"], row.get("epoch"), row.get("flags")))
    for s in still:
        row = rows.get(s["id"], {})
        if (tap_lib.number(row, "epoch") != CATALOGUE_EPOCH or FLAG not in row.get("flags", "").split("|")
                or abs(tap_lib.number(row, "ra") - s["ra"]) > 1e-9
                or abs(tap_lib.number(row, "dec") - s["dec"]) > 1e-9):
            wrong.append((s["id"], row.get("epoch"), row.get("flags")))
    tap.check(len(rows) == N_STARS and not wrong and still,
              "%s: %d moved stars have epoch %g; %d without proper motion stay at %g, flagged %s"
              % (label, len(moving), epoch, len(still), CATALOGUE_EPOCH, FLAG),
              ["want %d rows, got %d" % (N_STARS, len(rows))]
              + ["%s: epoch %s, flags %s" % w for w in wrong[:5]])


def main():
    warnings.simplefilter("ignore", ErfaWarning)
    tap = tap_lib.Tap()
    rng = random.Random(SEED)
    stars = make_stars(rng)
    with tempfile.TemporaryDirectory(prefix="check-epoch-") as directory:
        project = os.path.join(directory, "epoch.starledger")
        path = os.path.join(directory, "stars-2016.csv")
        columns = ["id", "ra", "ra_err", "dec", "dec_err", "epoch", "pmra", "pmra_err",
                   "pmdec", "pmdec_err", "parallax", "vrad"]
        tap_lib.write_csv(path, columns,
                          [{"id": s["id"], "ra": text(s["ra"]), "ra_err": text(s["ra_err"], 6),
                            "dec": text(s["dec"]), "dec_err": text(s["dec_err"], 6),
                            "epoch": "%g" % CATALOGUE_EPOCH,
                            "pmra": text(s["pmra"], 9), "pmra_err": text(s["pmra_err"], 6),
                            "pmdec": text(s["pmdec"], 9), "pmdec_err": text(s["pmdec_err"], 6),
                            "parallax": text(s["parallax"], 9), "vrad": text(s["vrad"], 9)}
                           for s in stars])
        # Read back what the file says, so both sides see the same numbers.
        for s in stars:
            for key in ("ra", "dec"):
                s[key] = float(text(s[key]))
            for key, digits in (("ra_err", 6), ("dec_err", 6), ("pmra", 9), ("pmdec", 9),
                                ("pmra_err", 6), ("pmdec_err", 6), ("parallax", 9), ("vrad", 9)):
                if s[key] is not None:
                    s[key] = float(text(s[key], digits))
        if tap_lib.new_project(tap, project, "epoch") and tap_lib.import_csv(tap, project, path, "epoch 2016"):
            check_epoch(tap, project, stars, 2030.0)
            check_epoch(tap, project, stars, 1991.25)
    tap.finish()


if __name__ == "__main__":
    main()
