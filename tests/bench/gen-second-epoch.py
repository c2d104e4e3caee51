#!/usr/bin/python3
# Writes a second-epoch catalogue of the stars of a gen-catalogue.py file
# for the cross-match benchmark: the same sky seen 16 years later (J2016.0;
# the first file is taken as J2000.0), with other names, in another order.
# Each star is moved by its proper motion and parallax with ERFA's
# eraPmsafe (python3-erfa) and offset by up to 0.3 arcsec in a random
# direction; 5% of the stars are left out and as many new, random stars
# put in.  Deterministic for a given input and seed.
#
# Usage: /usr/bin/python3 tests/bench/gen-second-epoch.py FIRST.csv OUT.csv TRUTH.txt [--seed S]
#
# OUT.csv columns: id,ra,dec,epoch,vmag (deg, deg, Julian year, mag).
# TRUTH.txt: one line per row of OUT.csv, the first file's id of its star,
# or "-" for a new star.

import argparse
import sys
import warnings

import erfa
import numpy as np

OFFSET_MAX_ARCSEC = 0.3
LEFT_OUT = 0.05
EPOCH_1, EPOCH_2 = 2000.0, 2016.0


def main(argv):
    ap = argparse.ArgumentParser(description="Write a second-epoch catalogue for the cross-match benchmark.")
    ap.add_argument("first")
    ap.add_argument("out")
    ap.add_argument("truth")
    ap.add_argument("--seed", type=int, default=2)
    args = ap.parse_args(argv)
    rng = np.random.default_rng(args.seed)
    # Stars without a usable parallax: ERFA puts them far away and says so.
    warnings.simplefilter("ignore", erfa.ErfaWarning)

    ids = np.loadtxt(args.first, delimiter=",", skiprows=1, usecols=0, dtype=str)
    ra, dec, plx, pmra, pmdec, vmag = np.loadtxt(args.first, delimiter=",", skiprows=1,
                                                 usecols=(1, 2, 3, 5, 6, 7), unpack=True, ndmin=2)
    n = len(ra)
    mas = np.pi / 180 / 3600e3
    ra_r, dec_r = np.radians(ra), np.radians(dec)
    j1 = erfa.epj2jd(EPOCH_1)
    j2 = erfa.epj2jd(EPOCH_2)
    with np.errstate(all="ignore"):
        moved = erfa.pmsafe(ra_r, dec_r, pmra * mas / np.cos(dec_r), pmdec * mas,
                            np.where(plx > 0, plx / 1000, 0.0), np.zeros(n),
                            j1[0], j1[1], j2[0], j2[1])
    ra2, dec2 = moved[0], moved[1]

    # Offset along a random direction by a random angle (on the sphere).
    angle = rng.uniform(0, 2 * np.pi, n)
    dist = rng.uniform(0, OFFSET_MAX_ARCSEC, n) * np.pi / 180 / 3600
    sd, cd = np.sin(dec2), np.cos(dec2)
    new_dec = np.arcsin(sd * np.cos(dist) + cd * np.sin(dist) * np.cos(angle))
    new_ra = ra2 + np.arctan2(np.sin(angle) * np.sin(dist) * cd, np.cos(dist) - sd * np.sin(new_dec))

    keep = rng.uniform(0, 1, n) >= LEFT_OUT
    k = int(n - keep.sum())
    extra_ra = rng.uniform(0, 2 * np.pi, k)
    extra_dec = np.arcsin(rng.uniform(-1, 1, k))
    out_ra = np.degrees(np.concatenate([new_ra[keep], extra_ra])) % 360.0
    out_dec = np.degrees(np.concatenate([new_dec[keep], extra_dec]))
    out_vmag = np.concatenate([vmag[keep] + rng.normal(0, 0.02, keep.sum()), rng.uniform(8, 16, k)])
    truth = np.concatenate([ids[keep], np.full(k, "-")])
    order = rng.permutation(len(out_ra))

    with open(args.out, "w") as f, open(args.truth, "w") as t:
        f.write("id,ra,dec,epoch,vmag\n")
        for i, j in enumerate(order):
            f.write("E%07d,%.9f,%.9f,2016.0,%.3f\n" % (i + 1, out_ra[j], out_dec[j], out_vmag[j]))
            t.write(truth[j] + "\n")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
