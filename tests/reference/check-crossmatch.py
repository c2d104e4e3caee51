#!/usr/bin/python3
# check-crossmatch.py: checks starledger-cli import --match-radius against
# astropy (Debian python3-astropy), which shares no code with ours but
# ERFA's space-motion routine:
#   (a) propagation: ~300 stars at epoch 2000 with proper motions up to
#       6 arcsec/yr, parallaxes (some missing) and radial velocities are
#       carried to 2030 by SkyCoord.apply_space_motion; a second catalogue
#       puts a row exactly there (without motion of its own).  Imported
#       with a match radius, every row must join its own star, and the
#       stored separation is the distance between our propagation and
#       astropy's: it must be below 0.01 mas;
#   (b) matching: 8,000 random stars and 8,000 random rows (half of them
#       within ~1.5 arcsec of a star, clusters near RA 0 and the poles
#       included): the pairs astropy's match_coordinates_sky finds within
#       1 arcsec (each row's nearest star) must be exactly our pairs: the
#       star a row joined, or for an ambiguous row its nearest candidate;
#       rows astropy leaves unmatched must be new stars; the separations
#       must agree to 1e-6 arcsec.  match_coordinates_sky needs scipy
#       (python3-scipy, which build-aux/dev installs); without it the
#       nearest star is found by brute force over every pair and measured
#       with astropy's angular_separation, and the check says so.
#
# Speaks TAP; exits 1 if any check failed.  Environment: STARLEDGER_CLI.

import math
import os
import random
import sqlite3
import sys
import tempfile
import warnings

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402

try:
    import numpy as np
    import astropy.units as u
    from astropy.coordinates import SkyCoord, angular_separation, match_coordinates_sky
    from astropy.time import Time
    from erfa import ErfaWarning
except ImportError:
    tap_lib.skip_all("astropy or numpy is not installed (Debian: python3-astropy, python3-numpy)")

SEED = 20261202
N_MOVING = 300
N_RANDOM = 8000
RADIUS_ARCSEC = 1.0
PROPAGATION_TOLERANCE_ARCSEC = 1e-5   # 0.01 mas: both are eraPmsafe
SEPARATION_TOLERANCE_ARCSEC = 1e-6


def project_matches(project):
    """{line: (status, star designation or nearest candidate, separation)}
    of the second source's rows with a match record."""
    db = sqlite3.connect(project)
    rows = db.execute(
        "SELECT m.line, x.status, CASE x.status WHEN 'matched' THEN s.designation "
        "ELSE x.candidates ->> '$[0].designation' END, x.separation_arcsec "
        "FROM matches x JOIN measurements m ON m.id = x.measurement_id "
        "JOIN stars s ON s.id = m.star_id WHERE m.source_id = 2").fetchall()
    db.close()
    return {line: (status, star, sep) for line, status, star, sep in rows}


def check_propagation(tap, directory):
    rng = random.Random(SEED)
    stars, rows = [], []
    ra, dec, pmra, pmdec, plx, rv = [], [], [], [], [], []
    for i in range(N_MOVING):
        ra.append(rng.uniform(0, 360))
        dec.append(math.degrees(math.asin(rng.uniform(-0.99, 0.99))))
        speed, angle = rng.uniform(0, 6000), rng.uniform(0, 2 * math.pi)
        pmra.append(speed * math.cos(angle))
        pmdec.append(speed * math.sin(angle))
        # Every fifth star has no parallax: astropy and we both let ERFA
        # choose a great distance.
        plx.append(rng.uniform(speed / 50 + 1, 800) if i % 5 else None)
        rv.append(rng.uniform(-200, 200))
    have_plx = np.array([p is not None for p in plx])
    t0 = Time(2000.0, format="jyear", scale="tdb")
    t1 = Time(2030.0, format="jyear", scale="tdb")
    moved_ra, moved_dec = np.empty(N_MOVING), np.empty(N_MOVING)
    for mask in (have_plx, ~have_plx):
        idx = np.nonzero(mask)[0]
        kwargs = dict(ra=np.array(ra)[idx] * u.deg, dec=np.array(dec)[idx] * u.deg,
                      pm_ra_cosdec=np.array(pmra)[idx] * u.mas / u.yr,
                      pm_dec=np.array(pmdec)[idx] * u.mas / u.yr,
                      radial_velocity=np.array(rv)[idx] * u.km / u.s,
                      frame="icrs", obstime=t0)
        if mask is have_plx:
            kwargs["distance"] = (np.array([plx[i] for i in idx]) * u.mas).to(u.pc, u.parallax())
        moved = SkyCoord(**kwargs).apply_space_motion(new_obstime=t1)
        moved_ra[idx] = moved.ra.deg
        moved_dec[idx] = moved.dec.deg

    for i in range(N_MOVING):
        stars.append({"id": "P%d" % i, "ra": "%.12f" % ra[i], "dec": "%.12f" % dec[i], "epoch": "2000",
                      "pmra": "%.9f" % pmra[i], "pmdec": "%.9f" % pmdec[i],
                      "parallax": "" if plx[i] is None else "%.9f" % plx[i], "vrad": "%.9f" % rv[i]})
        rows.append({"id": "Q%d" % i, "ra": "%.12f" % moved_ra[i], "dec": "%.12f" % moved_dec[i],
                     "epoch": "2030"})
    project = os.path.join(directory, "moving.starledger")
    stars_csv = os.path.join(directory, "moving-2000.csv")
    rows_csv = os.path.join(directory, "moving-2030.csv")
    tap_lib.write_csv(stars_csv, ["id", "ra", "dec", "epoch", "pmra", "pmdec", "parallax", "vrad"], stars)
    tap_lib.write_csv(rows_csv, ["id", "ra", "dec", "epoch"], rows)
    if not tap_lib.new_project(tap, project, "moving stars"):
        return
    tap_lib.import_csv(tap, project, stars_csv, "epoch 2000")
    tap_lib.import_csv(tap, project, rows_csv, "epoch 2030, --match-radius",
                       ["--match-radius", str(RADIUS_ARCSEC)])
    matches = project_matches(project)
    wrong = [(line, m) for line, m in sorted(matches.items())
             if m[0] != "matched" or m[1] != "P%d" % (line - 2)]
    tap.check(len(matches) == N_MOVING and not wrong,
              "every row at astropy's 2030 position joins its own star (%d stars moving up to "
              "180 arcsec)" % N_MOVING,
              ["want %d matched rows, got %d" % (N_MOVING, len(matches))]
              + ["line %d: %s" % w for w in wrong[:5]])
    tap_lib.compare(tap, [(line, 0.0, m[2]) for line, m in matches.items()],
                    "propagation to 2030 against SkyCoord.apply_space_motion", "arcsec",
                    PROPAGATION_TOLERANCE_ARCSEC)


def random_sky(rng, n):
    """N positions: uniform, a band across RA 0 and caps at the poles."""
    ra, dec = [], []
    for i in range(n):
        kind = i % 4
        if kind == 0 or kind == 1:
            ra.append(rng.uniform(0, 360))
            dec.append(math.degrees(math.asin(rng.uniform(-1, 1))))
        elif kind == 2:
            ra.append(rng.uniform(-0.2, 0.2) % 360)
            dec.append(rng.uniform(-1, 1))
        else:
            ra.append(rng.uniform(0, 360))
            dec.append(rng.choice((1, -1)) * (90 - rng.uniform(0, 0.2)))
    return ra, dec


def offset(rng, ra, dec, max_arcsec):
    """A point up to MAX_ARCSEC from (RA, DEC), in a random direction."""
    c = SkyCoord(ra * u.deg, dec * u.deg)
    moved = c.directional_offset_by(rng.uniform(0, 360) * u.deg, rng.uniform(0, max_arcsec) * u.arcsec)
    return moved.ra.deg, moved.dec.deg


def nearest(rows, stars):
    """(index of the nearest star, separation in arcsec) of each row: astropy's
    match_coordinates_sky (a k-d tree in scipy), or without scipy every
    pair by brute force on unit vectors, measured with astropy's
    angular_separation (Vincenty)."""
    try:
        import scipy  # noqa: F401
    except ImportError:
        pass
    else:
        idx, d2d, _ = match_coordinates_sky(rows, stars)
        return idx, d2d.to_value(u.arcsec), "match_coordinates_sky"
    s = stars.cartesian.xyz.value
    r = rows.cartesian.xyz.value
    idx = np.empty(r.shape[1], dtype=int)
    for first in range(0, r.shape[1], 200):
        block = r[:, first:first + 200]
        chord2 = sum((block[k][:, None] - s[k][None, :]) ** 2 for k in range(3))
        idx[first:first + 200] = np.argmin(chord2, axis=1)
    sep = angular_separation(rows.ra, rows.dec, stars.ra[idx], stars.dec[idx]).to_value(u.arcsec)
    return idx, sep, "every pair with astropy's angular_separation (no scipy for match_coordinates_sky)"


def check_pairs(tap, directory):
    rng = random.Random(SEED + 1)
    star_ra, star_dec = random_sky(rng, N_RANDOM)
    row_ra, row_dec = random_sky(rng, N_RANDOM)
    for j in range(0, N_RANDOM, 2):
        i = rng.randrange(N_RANDOM)
        row_ra[j], row_dec[j] = offset(rng, star_ra[i], star_dec[i], 1.5 * RADIUS_ARCSEC)
    project = os.path.join(directory, "random.starledger")
    stars_csv = os.path.join(directory, "random-stars.csv")
    rows_csv = os.path.join(directory, "random-rows.csv")
    tap_lib.write_csv(stars_csv, ["id", "ra", "dec"],
                      [{"id": "S%d" % i, "ra": "%.12f" % star_ra[i], "dec": "%.12f" % star_dec[i]}
                       for i in range(N_RANDOM)])
    tap_lib.write_csv(rows_csv, ["id", "ra", "dec"],
                      [{"id": "R%d" % j, "ra": "%.12f" % (row_ra[j] % 360), "dec": "%.12f" % row_dec[j]}
                       for j in range(N_RANDOM)])
    if not tap_lib.new_project(tap, project, "random sky"):
        return
    tap_lib.import_csv(tap, project, stars_csv, "random stars")
    tap_lib.import_csv(tap, project, rows_csv, "random rows, --match-radius",
                       ["--match-radius", str(RADIUS_ARCSEC)])

    stars = SkyCoord(np.array(star_ra) * u.deg, np.array(star_dec) * u.deg)
    # The rows as written to the file, so both sides see the same numbers.
    rows = SkyCoord(np.array([float("%.12f" % (r % 360)) for r in row_ra]) * u.deg,
                    np.array([float("%.12f" % d) for d in row_dec]) * u.deg)
    idx, sep, how = nearest(rows, stars)
    want = {j + 2: ("S%d" % idx[j], sep[j]) for j in range(N_RANDOM) if sep[j] <= RADIUS_ARCSEC}
    got = project_matches(project)
    missing = sorted(set(want) - set(got))
    extra = sorted(set(got) - set(want))
    different = sorted(line for line in set(want) & set(got) if want[line][0] != got[line][1])
    ambiguous = sum(1 for m in got.values() if m[0] == "ambiguous")
    tap.check(not missing and not extra and not different,
              "the pairs within %g arcsec are astropy's (%s): %d of %d rows, %d of them ambiguous"
              % (RADIUS_ARCSEC, how, len(want), N_RANDOM, ambiguous),
              ["rows astropy pairs and we do not (line): %s" % missing[:5],
               "rows we pair and astropy does not: %s" % extra[:5],
               "rows paired with another star: %s" % [(l, want[l], got[l]) for l in different[:5]]])
    tap.check(len(want) > N_RANDOM // 5 and ambiguous > 0,
              "the random set has many pairs and some ambiguous rows",
              ["%d pairs, %d ambiguous" % (len(want), ambiguous)])
    tap_lib.compare(tap, [(line, want[line][1], got[line][2]) for line in set(want) & set(got)],
                    "separations against astropy's", "arcsec", SEPARATION_TOLERANCE_ARCSEC)


def main():
    # Stars without a parallax: ERFA puts them far away and says so.
    warnings.simplefilter("ignore", ErfaWarning)
    tap = tap_lib.Tap()
    with tempfile.TemporaryDirectory(prefix="check-crossmatch-") as directory:
        check_propagation(tap, directory)
        check_pairs(tap, directory)
    tap.finish()


if __name__ == "__main__":
    main()
