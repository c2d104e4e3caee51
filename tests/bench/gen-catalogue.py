#!/usr/bin/python3
# Writes a synthetic star catalogue for Starledger's import benchmarks.
# All stars are fictitious; the output is deterministic for a given N and seed.
#
# Usage: /usr/bin/python3 tests/bench/gen-catalogue.py N OUT.csv [--seed S]
#
# Columns: id,ra,dec,parallax,parallax_err,pmra,pmdec,vmag,vmag_err,bv,bv_err
# (ra/dec in degrees, parallax in mas, proper motions in mas/yr, magnitudes in
# mag). Rows are about 84 bytes each. Every value is valid for the importer:
# ra in [0,360), dec in [-90,90], errors > 0, magnitudes within [-30,30],
# |parallax| <= 1000 mas, |pm| <= 20000 mas/yr. Distant faint stars sometimes
# get a slightly negative measured parallax.

import argparse
import math
import random
import sys

CHUNK = 50000  # rows formatted and written per block


def parse_args(argv):
    ap = argparse.ArgumentParser(
        description="Write a deterministic synthetic catalogue (CSV).")
    ap.add_argument("n", type=int, help="number of rows")
    ap.add_argument("out", help="output CSV file")
    ap.add_argument("--seed", type=int, default=1, help="random seed")
    args = ap.parse_args(argv)
    if args.n < 0:
        ap.error("N must be zero or more")
    return args


def generate(n, out, seed):
    rng = random.Random(seed)
    rand = rng.random
    gauss = rng.gauss
    asin = math.asin
    cos = math.cos
    sin = math.sin
    log10 = math.log10
    deg = 180.0 / math.pi
    two_pi = 2.0 * math.pi
    row_fmt = ("B%07d,%.7f,%.7f,%.3f,%.3f,%.3f,%.3f,%.3f,%.3f,%.3f,%.3f\n")

    with open(out, "wb") as f:
        f.write(b"id,ra,dec,parallax,parallax_err,pmra,pmdec,"
                b"vmag,vmag_err,bv,bv_err\n")
        i = 0
        while i < n:
            stop = min(n, i + CHUNK)
            buf = []
            append = buf.append
            for k in range(i + 1, stop + 1):
                # Position uniform on the sphere.
                ra = 360.0 * rand()
                if ra >= 359.99999995:  # would print as 360.0000000
                    ra = 0.0
                dec = asin(2.0 * rand() - 1.0) * deg
                # Distance 10 pc .. 2 kpc, uniform in volume.
                dist = 10.0 + 1990.0 * rand() ** 0.3333333
                plx_true = 1000.0 / dist
                # Intrinsic colour and a rough main-sequence absolute magnitude.
                bv0 = -0.2 + 1.9 * rand() ** 0.7
                absmag = 0.8 + 5.5 * bv0 + 0.4 * gauss(0.0, 1.0)
                ebv = 0.0003 * dist * rand()
                vmag = absmag + 5.0 * log10(dist) - 5.0 + 3.1 * ebv
                faint = vmag - 8.0
                if faint < 0.0:
                    faint = 0.0
                plx_err = 0.02 + 0.004 * faint * faint
                if plx_err > 2.0:
                    plx_err = 2.0
                vmag_err = 0.002 + 0.0004 * faint * faint
                if vmag_err > 0.3:
                    vmag_err = 0.3
                # Proper motion from a tangential velocity of 5..80 km/s.
                mu = (5.0 + 75.0 * rand()) * plx_true / 4.74047
                pa = two_pi * rand()
                append(row_fmt % (
                    k, ra, dec,
                    plx_true + plx_err * gauss(0.0, 1.0), plx_err,
                    mu * sin(pa), mu * cos(pa),
                    vmag, vmag_err,
                    bv0 + ebv, vmag_err * 1.4))
            f.write("".join(buf).encode("ascii"))
            i = stop


def main(argv):
    args = parse_args(argv)
    generate(args.n, args.out, args.seed)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
