#!/usr/bin/python3
# Generates the Starledger demo catalogues astrometry.csv, photometry.csv and
# second-epoch.csv for the invented "Larkspur Hill Observatory nearby-star
# programme".
# Every star, designation, partner catalogue and number written here is
# fictitious: a synthetic, physically consistent population drawn from a
# fixed-seed random generator, so the output is byte-for-byte reproducible.
#
# Usage: /usr/bin/python3 data/demo/generate.py OUTPUT_DIR
#
# A handful of deliberately bad rows are planted at fixed places (see
# README.md next to this script); every other value is valid.

import math
import os
import random
import sys

SEED = 20260325
EPOCH = 2026.25          # epoch of the programme's own astrometry (Julian year)
PHOT_EPOCH = 2000.0      # epoch of the partner's photometry coordinates
DT = EPOCH - PHOT_EPOCH  # 26.25 yr
K_PM = 4.74047           # km/s per (AU/yr)
MAS_PER_DEG = 3.6e6

# Population: main-sequence stars per spectral class, giants, white dwarfs.
MS_COUNTS = [("O", 4), ("B", 12), ("A", 20), ("F", 30),
             ("G", 45), ("K", 70), ("M", 108)]
N_GIANTS = 25
N_WD = 6
# Stars placed far away (0.8-5 kpc): all O stars, some B stars, some giants.
FAR_B = 8
FAR_GIANTS = 13

# Intrinsic colour (B-V)0 range drawn for each main-sequence class.
MS_BV0 = {"O": (-0.33, -0.301), "B": (-0.30, -0.005), "A": (0.00, 0.295),
          "F": (0.30, 0.575), "G": (0.58, 0.805), "K": (0.81, 1.395),
          "M": (1.40, 1.80)}

# Distance range (pc) for the nearby part of each group.
NEAR_RANGE = {"B": (40.0, 140.0), "A": (15.0, 140.0), "F": (10.0, 140.0),
              "G": (8.0, 120.0), "K": (5.0, 70.0), "M": (5.0, 35.0),
              "giant": (30.0, 140.0), "WD": (5.0, 40.0)}

# Main sequence: absolute magnitude M_V against (B-V)0, linear between anchors.
MS_ANCHORS = [(-0.33, -5.0), (-0.30, -4.0), (-0.20, -1.5), (0.00, 1.0),
              (0.30, 2.6), (0.58, 4.4), (0.65, 4.8), (0.81, 5.9),
              (1.15, 7.4), (1.40, 8.8), (1.50, 10.3), (1.80, 14.5)]

# Spectral subtype against (B-V)0, as a running index: O=0, B=10, A=20,
# F=30, G=40, K=50, M=60 (so 42 means G2).
MS_TYPE_ANCHORS = [(-0.33, 5.0), (-0.31, 9.0), (-0.30, 10.0), (-0.24, 12.0),
                   (-0.17, 15.0), (-0.11, 18.0), (0.00, 20.0), (0.15, 25.0),
                   (0.30, 30.0), (0.44, 35.0), (0.58, 40.0), (0.65, 42.0),
                   (0.68, 45.0), (0.81, 50.0), (1.15, 55.0), (1.40, 60.0),
                   (1.50, 62.0), (1.80, 65.0)]
GIANT_TYPE_ANCHORS = [(0.86, 45.0), (0.94, 48.0), (1.00, 50.0), (1.16, 52.0),
                      (1.30, 53.0), (1.42, 54.0), (1.50, 55.0), (1.56, 60.0),
                      (1.60, 62.0)]
TYPE_LETTERS = "OBAFGKM"

# Fixed places of the special rows (designation numbers).
QUOTED_ID = 42            # written as "LHO 0042" (valid RFC 4180 quoting)
BAD_DEC_ID = 87           # (a) dec of 91.3
BAD_PLX_ID = 133          # (b) parallax written 12.7.1
ZERO_PLXERR_ID = 171      # (c) parallax_err of 0
DUP_AFTER_ID = 230        # (d) duplicate row goes after this star ...
DUP_OF_ID = 64            #     ... repeating this star's designation
EMPTY_ID_AFTER_ID = 260   # (e) row with an empty id goes after this star
NEAR_EQUATOR_IDS = (118, 257)  # placed at -1 < dec < 0
N_MISSING_FROM_PHOT = 14  # programme stars absent from the partner extract
N_COMPANIONS = 8          # partner-only stars (fainter companions)
# Data-row positions (0-based, after sorting by RA) of the bad photometry rows.
PHOT_BAD_DEC_ROW = 77     # (f) dec_sexa with 61 arcminutes
PHOT_BAD_V_ROW = 154      # (g) v of 41.20
PHOT_BAD_UTF8_FROM = 231  # (h) first G star with a type from this row on

MISSING = "99.99"         # the partner's legacy missing-value marker

# The second-epoch catalogue: another invented partner, the Tarn Ridge
# survey, with its own designations, measured at another epoch.  It has its
# own random generator, so the two files above do not change with it.
SECOND_SEED = 20260326
SECOND_EPOCH = 2016.0
SECOND_RADIUS = 1.0       # arcsec: the match radius the walk-through uses
N_SECOND_COMMON = 40      # programme stars it measured (besides the fast ones)
N_SECOND_FAST = 6         # the fastest programme stars, all in it
N_SECOND_PAIRS = 2        # programme stars it resolves into two rows
N_SECOND_NEW = 5          # stars the programme does not list
# Two common stars are unresolved binaries: the orbit bends the photocentre's
# path, so the survey's proper motion (over its own baseline) differs from
# the programme's by far more than either error, and combining the two
# catalogues must flag them (sources_disagree).  Added after the random
# draws, so no other row changes.
N_SECOND_WOBBLE = 2
WOBBLE_PM = (31.0, -22.0)  # mas/yr added to the survey's pmra, pmdec


def interp(anchors, x):
    """Piecewise-linear interpolation, extrapolating the end segments."""
    if x <= anchors[0][0]:
        (x0, y0), (x1, y1) = anchors[0], anchors[1]
    elif x >= anchors[-1][0]:
        (x0, y0), (x1, y1) = anchors[-2], anchors[-1]
    else:
        for i in range(len(anchors) - 1):
            if anchors[i][0] <= x <= anchors[i + 1][0]:
                (x0, y0), (x1, y1) = anchors[i], anchors[i + 1]
                break
    return y0 + (y1 - y0) * (x - x0) / (x1 - x0)


def clip(x, lo, hi):
    return lo if x < lo else hi if x > hi else x


def fmt(spec, x):
    """Format a number, never writing a negative zero."""
    s = spec % x
    if s.startswith("-") and s.strip("-0.") == "":
        s = s[1:]
    return s


def spectral_type(rng, st):
    cls, bv0 = st["cls"], st["bv0"]
    if cls == "WD":
        return rng.choice(["DA", "DA", "DA", "DB", "DC"])
    if cls == "giant":
        idx = int(math.floor(interp(GIANT_TYPE_ANCHORS, bv0)))
        letter, sub = TYPE_LETTERS[idx // 10], idx % 10
        if letter == "K":
            sub = min(sub, 7)
        return "%s%d III" % (letter, sub)
    idx = interp(MS_TYPE_ANCHORS, bv0)
    letter = cls
    sub = int(math.floor(idx)) - 10 * TYPE_LETTERS.index(letter)
    lo_sub, hi_sub = {"O": (3, 9), "K": (0, 7)}.get(letter, (0, 9))
    sub = clip(sub, lo_sub, hi_sub)
    return "%s%d V" % (letter, sub)


def draw_intrinsic(rng, cls):
    """(B-V)0 and M_V for a star of the given group."""
    if cls == "WD":
        bv0 = rng.uniform(-0.2, 0.5)
        mv = clip(10.5 + 4.0 * (bv0 + 0.2) / 0.7 + rng.gauss(0.0, 0.3),
                  10.5, 14.5)
    elif cls == "giant":
        bv0 = rng.uniform(0.9, 1.6)
        if bv0 < 1.15 and rng.random() < 0.6:      # red clump
            mv = 0.7 + rng.gauss(0.0, 0.15)
        else:                                      # red giant branch
            mv = 1.5 - 2.5 * (bv0 - 0.9) / 0.7 + rng.gauss(0.0, 0.3)
        mv = clip(mv, -1.0, 1.5)
    else:
        lo, hi = MS_BV0[cls]
        bv0 = rng.uniform(lo, hi)
        mv = interp(MS_ANCHORS, bv0) + rng.gauss(0.0, 0.3)
    return bv0, mv


def noise_level(v):
    """0 for bright stars, rising to 1 at V = 18 and beyond."""
    return clip((v - 3.0) / 15.0, 0.0, 1.0)


def scaled_err(rng, s, lo, hi):
    return clip(lo + (hi - lo) * s * s * rng.uniform(0.7, 1.3), lo, hi)


def make_star(rng, cls, far, dist=None):
    st = {"cls": cls, "far": far}
    st["bv0"], st["mv"] = draw_intrinsic(rng, cls)
    if dist is not None:
        r = dist
    elif far:
        r = 800.0 + 4200.0 * rng.random() ** 0.6
    else:
        lo, hi = NEAR_RANGE[cls]
        r = (lo ** 3 + rng.random() * (hi ** 3 - lo ** 3)) ** (1.0 / 3.0)
    st["r"] = r
    if r < 70.0:
        ebv = 0.0
    else:
        ebv = max(0.0, 0.0003 * r * (1.0 + rng.gauss(0.0, 0.3)))
    st["ebv"] = ebv
    v_true = st["mv"] + 5.0 * math.log10(r) - 5.0 + 3.1 * ebv
    s = noise_level(v_true)
    st["v_err"] = scaled_err(rng, s, 0.005, 0.05)
    st["bv_err"] = scaled_err(rng, s, 0.006, 0.05)
    st["v"] = v_true + rng.gauss(0.0, st["v_err"])
    st["bv"] = st["bv0"] + ebv + rng.gauss(0.0, st["bv_err"])

    # Astrometry at the programme epoch.
    st["ra"] = rng.uniform(0.0, 360.0)
    st["dec"] = math.degrees(math.asin(rng.uniform(-1.0, 1.0)))
    st["ra_err"] = scaled_err(rng, s, 0.05, 2.0)
    st["dec_err"] = scaled_err(rng, s, 0.05, 2.0)
    plx_true = 1000.0 / r
    if far:
        st["plx_err"] = rng.uniform(0.3, 0.9)
    else:
        st["plx_err"] = scaled_err(rng, s, 0.05, 1.0)
    st["plx"] = plx_true + rng.gauss(0.0, st["plx_err"])
    vt = rng.uniform(10.0, 80.0)
    pa = rng.uniform(0.0, 2.0 * math.pi)
    mu = vt * plx_true / K_PM
    st["pm_err"] = scaled_err(rng, s, 0.02, 1.0)
    st["pmra_err"] = clip(st["pm_err"] * rng.uniform(0.85, 1.15), 0.02, 1.0)
    st["pmdec_err"] = clip(st["pm_err"] * rng.uniform(0.85, 1.15), 0.02, 1.0)
    st["pmra"] = mu * math.sin(pa) + rng.gauss(0.0, st["pmra_err"])
    st["pmdec"] = mu * math.cos(pa) + rng.gauss(0.0, st["pmdec_err"])
    if rng.random() < 0.6:
        st["vrad_err"] = clip(0.1 + 2.9 * s ** 1.5 * rng.uniform(0.7, 1.3),
                              0.1, 3.0)
        st["vrad"] = rng.uniform(-80.0, 80.0) + rng.gauss(0.0, st["vrad_err"])
    else:
        st["vrad_err"] = st["vrad"] = None
    st["has_type"] = rng.random() < 0.7
    st["sptype"] = spectral_type(rng, st)
    return st


def to_epoch_2000(st):
    """Move the programme position back to the partner's epoch 2000.0."""
    cosd = math.cos(math.radians(st["dec"]))
    ra = (st["ra"] - st["pmra"] * DT / cosd / MAS_PER_DEG) % 360.0
    dec = st["dec"] - st["pmdec"] * DT / MAS_PER_DEG
    assert -90.0 < dec < 90.0
    st["ra2000"], st["dec2000"] = ra, dec


def ra_sexa(ra_deg):
    ms = int(round(ra_deg / 15.0 * 3600.0 * 1000.0)) % (24 * 3600 * 1000)
    h, rest = divmod(ms, 3600 * 1000)
    m, rest = divmod(rest, 60 * 1000)
    return "%02d %02d %02d.%03d" % (h, m, rest // 1000, rest % 1000)


def dec_sexa(dec_deg):
    sign = "-" if dec_deg < 0.0 else "+"
    cs = int(round(abs(dec_deg) * 3600.0 * 100.0))
    d, rest = divmod(cs, 3600 * 100)
    m, rest = divmod(rest, 60 * 100)
    return "%s%02d %02d %02d.%02d" % (sign, d, m, rest // 100, rest % 100)


def designation(n):
    return "LHO %04d" % n


def astrometry_row(ident, st):
    vrad = "" if st["vrad"] is None else fmt("%.2f", st["vrad"])
    vrad_err = "" if st["vrad_err"] is None else fmt("%.2f", st["vrad_err"])
    return [ident, fmt("%.9f", st["ra"]), fmt("%.3f", st["ra_err"]),
            fmt("%.9f", st["dec"]), fmt("%.3f", st["dec_err"]),
            "%.2f" % EPOCH, fmt("%.4f", st["plx"]), fmt("%.4f", st["plx_err"]),
            fmt("%.3f", st["pmra"]), fmt("%.3f", st["pmra_err"]),
            fmt("%.3f", st["pmdec"]), fmt("%.3f", st["pmdec_err"]),
            vrad, vrad_err]


def build(rng):
    # Group list, shuffled so designations do not follow spectral class.
    groups = []
    for cls, n in MS_COUNTS:
        for i in range(n):
            far = cls == "O" or (cls == "B" and i < FAR_B)
            groups.append((cls, far))
    groups += [("giant", i < FAR_GIANTS) for i in range(N_GIANTS)]
    groups += [("WD", False)] * N_WD
    rng.shuffle(groups)

    stars = {}
    for n, (cls, far) in enumerate(groups, start=1):
        st = make_star(rng, cls, far)
        st["n"] = n
        if n in NEAR_EQUATOR_IDS:
            st["dec"] = rng.uniform(-0.85, -0.15)
        stars[n] = st

    # Peculiar spectral types with a comma (quoted in the partner file).
    special = set(NEAR_EQUATOR_IDS) | {QUOTED_ID}
    giant = min((n for n in sorted(stars)
                 if stars[n]["cls"] == "giant" and not stars[n]["far"]
                 and n not in special),
                key=lambda n: (abs(stars[n]["bv0"] - 1.0), n))
    stars[giant]["sptype"] = "K0 III, Ba"
    stars[giant]["has_type"] = True
    astar = next(n for n in sorted(stars)
                 if n > 150 and stars[n]["cls"] == "A" and n not in special)
    stars[astar]["sptype"] = stars[astar]["sptype"].replace(" V", " Vp, Si")
    stars[astar]["has_type"] = True
    special |= {giant, astar}

    for st in stars.values():
        to_epoch_2000(st)

    # Extra astrometry rows: a duplicate designation and an empty id.
    dup = make_star(rng, "K", False)
    empty = make_star(rng, "M", False)

    # Programme stars that the partner's extract does not cover.
    candidates = [n for n in sorted(stars) if n not in special]
    missing = set(rng.sample(candidates, N_MISSING_FROM_PHOT))

    # Fainter companions that only the partner lists.
    primaries = [n for n in sorted(stars)
                 if stars[n]["cls"] in ("F", "G", "K") and not stars[n]["far"]
                 and n not in missing and n not in special]
    companions = []
    for i, p in enumerate(sorted(rng.sample(primaries, N_COMPANIONS))):
        prim = stars[p]
        cls = "WD" if i in (2, 6) else "M"
        comp = make_star(rng, cls, False, dist=prim["r"])
        comp["n"] = len(stars) + 1 + i
        sep = rng.uniform(3.0, 40.0) / 3600.0
        pa = rng.uniform(0.0, 2.0 * math.pi)
        comp["dec2000"] = prim["dec2000"] + sep * math.cos(pa)
        comp["ra2000"] = (prim["ra2000"] + sep * math.sin(pa)
                          / math.cos(math.radians(prim["dec2000"]))) % 360.0
        companions.append(comp)
    return stars, dup, empty, missing, companions, special


def write_astrometry(path, stars, dup, empty):
    lines = [
        "# Larkspur Hill Observatory nearby-star programme: astrometric reduction",
        "# reduction date 2026-05-14, pipeline run 7; synthetic demonstration data, all stars fictitious",
        "# positions ICRS, epoch 2026.25; ra_err and dec_err in mas, ra_err is on the sky (includes cos dec)",
        "# parallax in mas; pmra (includes cos dec) and pmdec in mas/yr; vrad in km/s, empty when not measured",
        "id,ra,ra_err,dec,dec_err,epoch,parallax,parallax_err,pmra,pmra_err,"
        "pmdec,pmdec_err,vrad,vrad_err",
    ]
    for n in sorted(stars):
        ident = designation(n)
        row = astrometry_row(ident, stars[n])
        if n == QUOTED_ID:
            row[0] = '"%s"' % ident
        if n == BAD_DEC_ID:
            row[3] = "91.300000000"
        if n == BAD_PLX_ID:
            row[6] = "12.7.1"
        if n == ZERO_PLXERR_ID:
            row[7] = "0"
        lines.append(",".join(row))
        if n == DUP_AFTER_ID:
            lines.append(",".join(astrometry_row(designation(DUP_OF_ID), dup)))
        if n == EMPTY_ID_AFTER_ID:
            lines.append(",".join(astrometry_row("", empty)))
    with open(path, "wb") as f:
        f.write(("\n".join(lines) + "\n").encode("ascii"))


def phot_cell(rng, value, spec):
    if rng.random() < 0.05:
        return MISSING
    return fmt(spec, value)


def write_photometry(path, rng, stars, missing, companions, special):
    entries = [stars[n] for n in sorted(stars) if n not in missing]
    entries += companions
    entries.sort(key=lambda st: (st["ra2000"], st["n"]))

    # Row for the invalid UTF-8 spectral type: first G star with a type.
    utf8_row = next(i for i in range(PHOT_BAD_UTF8_FROM, len(entries))
                    if entries[i]["cls"] == "G" and entries[i]["has_type"]
                    and entries[i]["n"] not in special)
    bad_rows = {PHOT_BAD_DEC_ROW, PHOT_BAD_V_ROW, utf8_row}
    for i in bad_rows:
        assert entries[i]["n"] not in special

    header = ("star;ra_sexa;dec_sexa;v;v_sigma;b_minus_v;b_minus_v_sigma;"
              "reddening;reddening_sigma;spectral_type")
    out = [b"\xef\xbb\xbf" + header.encode("ascii")]
    for i, st in enumerate(entries):
        sp = st["sptype"] if st["has_type"] else ""
        if any(c in sp for c in ',;"'):
            sp = '"%s"' % sp.replace('"', '""')
        reddening = phot_cell(rng, st["ebv"], "%.3f")
        # The partner quotes E(B-V) to 0.01 mag plus 5 per cent (no draw,
        # so the other cells keep their values).
        reddening_sigma = (MISSING if reddening == MISSING
                           else fmt("%.3f", 0.01 + 0.05 * st["ebv"]))
        cells = [designation(st["n"]), ra_sexa(st["ra2000"]),
                 dec_sexa(st["dec2000"]), fmt("%.3f", st["v"]),
                 phot_cell(rng, st["v_err"], "%.3f"), fmt("%.3f", st["bv"]),
                 phot_cell(rng, st["bv_err"], "%.3f"),
                 reddening, reddening_sigma, sp]
        if i == PHOT_BAD_DEC_ROW:
            cells[2] = "+12 61 10.0"
        if i == PHOT_BAD_V_ROW:
            cells[3] = "41.20"
        raw = [c.encode("ascii") for c in cells]
        if i == utf8_row:
            raw[9] = b"G5 \xff V"
        out.append(b";".join(raw))
    with open(path, "wb") as f:
        f.write(b"\r\n".join(out) + b"\r\n")


def second_designation(k):
    return "TRS J%04d" % k


def back_to(st, epoch):
    """The programme position of ST moved linearly to EPOCH, and the motion
    in arcsec between the two epochs."""
    dt = epoch - EPOCH
    cosd = math.cos(math.radians(st["dec"]))
    ra = (st["ra"] + st["pmra"] * dt / cosd / MAS_PER_DEG) % 360.0
    dec = st["dec"] + st["pmdec"] * dt / MAS_PER_DEG
    return ra, dec, math.hypot(st["pmra"], st["pmdec"]) * abs(dt) / 1000.0


def offset_by(ra, dec, arcsec, pa):
    """(RA, DEC) moved ARCSEC towards position angle PA (radians)."""
    d = arcsec / 3600.0
    return ((ra + d * math.sin(pa) / math.cos(math.radians(dec))) % 360.0,
            dec + d * math.cos(pa))


def build_second(stars, skip):
    """The Tarn Ridge rows: (cells, kind) with kind 'common', 'fast',
    'pair' or 'new', sorted by RA and named in that order."""
    rng = random.Random(SECOND_SEED)
    usable = [n for n in sorted(stars) if n not in skip]
    speed = {n: math.hypot(stars[n]["pmra"], stars[n]["pmdec"]) for n in usable}
    fast = sorted(usable, key=lambda n: (-speed[n], n))[:N_SECOND_FAST]
    rest = [n for n in usable if n not in fast]
    chosen = rng.sample(rest, N_SECOND_COMMON + N_SECOND_PAIRS)
    pairs, common = chosen[:N_SECOND_PAIRS], chosen[N_SECOND_PAIRS:]

    rows = []

    wobbling = set(common[:N_SECOND_WOBBLE])

    def row(ra, dec, st, kind, pm=True):
        # The survey's errors are larger than the programme's, so the
        # programme's astrometry stays what a matched star shows.
        ra_err = max(rng.uniform(4.0, 12.0), 2.0 * st["ra_err"]) if st else rng.uniform(4.0, 12.0)
        dec_err = max(rng.uniform(4.0, 12.0), 2.0 * st["dec_err"]) if st else rng.uniform(4.0, 12.0)
        ra, dec = offset_by(ra, dec, math.hypot(rng.gauss(0, ra_err), rng.gauss(0, dec_err)) / 1000.0,
                            rng.uniform(0, 2 * math.pi))
        if st and pm:
            pm_err = max(rng.uniform(1.5, 4.0), 2.0 * st["pm_err"])
            pmra = st["pmra"] + rng.gauss(0, pm_err)
            pmdec = st["pmdec"] + rng.gauss(0, pm_err)
            if st["n"] in wobbling:
                pmra, pmdec = pmra + WOBBLE_PM[0], pmdec + WOBBLE_PM[1]
            pm_cells = [fmt("%.2f", pmra), fmt("%.2f", pm_err), fmt("%.2f", pmdec), fmt("%.2f", pm_err)]
        elif pm:
            pm_err = rng.uniform(1.5, 4.0)
            pm_cells = [fmt("%.2f", rng.gauss(0, 30)), fmt("%.2f", pm_err),
                        fmt("%.2f", rng.gauss(0, 30)), fmt("%.2f", pm_err)]
        else:
            pm_cells = ["", "", "", ""]
        rows.append(([fmt("%.8f", ra), fmt("%.2f", ra_err), fmt("%.8f", dec), fmt("%.2f", dec_err),
                      "%.1f" % SECOND_EPOCH] + pm_cells, kind, st["n"] if st else None))

    for n in fast + common:
        ra, dec, _ = back_to(stars[n], SECOND_EPOCH)
        row(ra, dec, stars[n], "fast" if n in fast else "common")
    # Two components 0.3-0.4 arcsec either side of where the programme
    # sees one star: both are its nearest, within the radius, so neither
    # may be merged silently.
    for n in pairs:
        ra, dec, _ = back_to(stars[n], SECOND_EPOCH)
        pa = rng.uniform(0, math.pi)
        for side in (0.0, math.pi):
            r2, d2 = offset_by(ra, dec, rng.uniform(0.3, 0.4), pa + side)
            rows.append(([fmt("%.8f", r2), "15.00", fmt("%.8f", d2), "15.00", "%.1f" % SECOND_EPOCH,
                          "", "", "", ""], "pair", n))
    # Stars the programme does not list, well away from every star.
    while sum(1 for r in rows if r[1] == "new") < N_SECOND_NEW:
        ra = rng.uniform(0, 360)
        dec = math.degrees(math.asin(rng.uniform(-1, 1)))
        if all(abs(dec - st["dec"]) > 0.1 or abs(((ra - st["ra"] + 180) % 360) - 180) > 0.2
               for st in stars.values()):
            row(ra, dec, None, "new")
    rows.sort(key=lambda r: float(r[0][0]))
    return fast, pairs, rows, sorted(wobbling)


def write_second(path, rows):
    lines = [
        "# Tarn Ridge survey, second-epoch astrometry extract (synthetic demonstration data, all stars fictitious)",
        "# positions ICRS at epoch 2016.0, errors in mas (ra_err on the sky); proper motions in mas/yr",
        "trs_id,ra_deg,ra_err_mas,dec_deg,dec_err_mas,epoch,pmra,pmra_err,pmdec,pmdec_err",
    ]
    for k, (cells, _, _) in enumerate(rows, start=1):
        lines.append(",".join([second_designation(k)] + cells))
    with open(path, "wb") as f:
        f.write(("\n".join(lines) + "\n").encode("ascii"))


def main(argv):
    if len(argv) != 2:
        sys.stderr.write("usage: generate.py OUTPUT_DIR\n")
        return 2
    outdir = argv[1]
    os.makedirs(outdir, exist_ok=True)
    rng = random.Random(SEED)
    stars, dup, empty, missing, companions, special = build(rng)

    # The tricky-but-valid cases the demo relies on.
    negative = [n for n in stars if stars[n]["plx"] < 0.0]
    assert len(negative) >= 5, "need at least five negative parallaxes"
    assert all(-1.0 < stars[n]["dec2000"] < 0.0 for n in NEAR_EQUATOR_IDS)

    write_astrometry(os.path.join(outdir, "astrometry.csv"), stars, dup, empty)
    write_photometry(os.path.join(outdir, "photometry.csv"), rng, stars,
                     missing, companions, special)

    # Rows that name a programme star must find it: not the stars whose
    # astrometry row is bad (they exist only at the photometry's epoch).
    skip = {BAD_DEC_ID, BAD_PLX_ID, ZERO_PLXERR_ID, DUP_OF_ID, QUOTED_ID} | set(NEAR_EQUATOR_IDS)
    fast, pairs, rows, wobbling = build_second(stars, skip)
    moved = [back_to(stars[n], SECOND_EPOCH)[2] for n in fast]
    assert min(moved) > 3 * SECOND_RADIUS, "the fast stars must move well beyond the radius"
    write_second(os.path.join(outdir, "second-epoch.csv"), rows)
    if os.environ.get("DEMO_SECOND_REPORT"):
        for k, (cells, kind, n) in enumerate(rows, start=1):
            line = k + 3
            extra = ""
            if n is not None:
                extra = " %s moves %.2f arcsec" % (designation(n), back_to(stars[n], SECOND_EPOCH)[2])
            if n in wobbling:
                extra += ", binary: proper motions disagree"
            print("line %d %s %s%s" % (line, second_designation(k), kind, extra))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
