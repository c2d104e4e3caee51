#!/usr/bin/python3
# The cross-match a user would otherwise write with astropy, on the
# benchmark's catalogues: the first (gen-catalogue.py, epoch J2000.0)
# moved to J2016.0 with SkyCoord.apply_space_motion, then each row of the
# second (gen-second-epoch.py) given its nearest star by
# match_coordinates_sky, kept within the radius.
#
# Usage: /usr/bin/python3 tests/bench/astropy-crossmatch.py FIRST.csv SECOND.csv RADIUS_ARCSEC PAIRS.txt
#
# Prints "read S s, propagate S s, match S s" and writes PAIRS.txt as
# bench-crossmatch does (the FIRST id of each row's star, or "-").  Exits 3
# if scipy (python3-scipy), which match_coordinates_sky needs, is missing.

import sys
import time
import warnings

import numpy as np


def main(argv):
    if len(argv) != 4:
        sys.stderr.write(__doc__)
        return 2
    first, second, radius, pairs_path = argv[0], argv[1], float(argv[2]), argv[3]
    try:
        import scipy  # noqa: F401
    except ImportError:
        print("astropy's match_coordinates_sky needs scipy (Debian: python3-scipy), which is not installed")
        return 3
    import astropy.units as u
    from astropy.coordinates import SkyCoord, match_coordinates_sky
    from astropy.time import Time
    from erfa import ErfaWarning

    warnings.simplefilter("ignore", ErfaWarning)
    t0 = time.perf_counter()
    ids = np.loadtxt(first, delimiter=",", skiprows=1, usecols=0, dtype=str)
    ra, dec, plx, pmra, pmdec = np.loadtxt(first, delimiter=",", skiprows=1, usecols=(1, 2, 3, 5, 6),
                                           unpack=True, ndmin=2)
    ra2, dec2 = np.loadtxt(second, delimiter=",", skiprows=1, usecols=(1, 2), unpack=True, ndmin=2)
    t1 = time.perf_counter()
    # A parallax of zero or less: no distance, as Starledger does (astropy
    # then lets ERFA choose one).
    has = plx > 0
    moved_ra, moved_dec = ra.copy(), dec.copy()
    for mask in (has, ~has):
        kwargs = dict(ra=ra[mask] * u.deg, dec=dec[mask] * u.deg, pm_ra_cosdec=pmra[mask] * u.mas / u.yr,
                      pm_dec=pmdec[mask] * u.mas / u.yr, frame="icrs",
                      obstime=Time(2000.0, format="jyear", scale="tdb"))
        if mask is has:
            kwargs["distance"] = (plx[mask] * u.mas).to(u.pc, u.parallax())
        c = SkyCoord(**kwargs).apply_space_motion(new_obstime=Time(2016.0, format="jyear", scale="tdb"))
        moved_ra[mask], moved_dec[mask] = c.ra.deg, c.dec.deg
    t2 = time.perf_counter()
    stars = SkyCoord(moved_ra * u.deg, moved_dec * u.deg)
    rows = SkyCoord(ra2 * u.deg, dec2 * u.deg)
    idx, d2d, _ = match_coordinates_sky(rows, stars)
    within = d2d.to_value(u.arcsec) <= radius
    t3 = time.perf_counter()
    with open(pairs_path, "w") as f:
        for j in range(len(idx)):
            f.write((ids[idx[j]] if within[j] else "-") + "\n")
    print("read %.2f s, propagate %.2f s, match %.2f s: %d of %d rows within %g arcsec"
          % (t1 - t0, t2 - t1, t3 - t2, within.sum(), len(idx), radius))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
