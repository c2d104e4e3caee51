#!/usr/bin/python3
"""The script a user would otherwise write, for the benchmarks: read the
benchmark catalogue and derive what `starledger-cli derive --errors linear`
derives, vectorised, with first-order uncertainties, all in memory (nothing
is stored, no provenance is kept).

    /usr/bin/python3 tests/bench/pipeline.py numpy|astropy CATALOGUE.csv

numpy: numpy.loadtxt and numpy arithmetic, the ecliptic by the IAU 2006
obliquity rotation.  astropy: astropy.table.Table.read, the same
arithmetic, and the ecliptic by astropy.coordinates (BarycentricMeanEcliptic,
as an astropy user would do it).  The relations are Starledger's (see
tests/reference/check-uncertainties.py): distance 1/parallax, the Flower
(1996) / Torres (2010) Teff and BC polynomials, M_bol,sun on the same BC
scale, radius from L and Teff, vtan = 4.74 mu d, the parallax ellipse.
Prints the number of stars and a checksum of the results, so that a
pipeline that skipped work would show."""

import math
import sys

import numpy as np

LOGT = (3.979145106714099, -0.654992268598245, 1.740690042385095, -4.608815154057166,
        6.792599779944473, -5.396909891322525, 2.192970376522490, -0.359495739295671)
BC_COOL = (-0.190537291496456e+05, 0.155144866764412e+05, -0.421278819301717e+04, 0.381476328422343e+03)
BC_MIDDLE = (-0.370510203809015e+05, 0.385672629965804e+05, -0.150651486316025e+05,
             0.261724637119416e+04, -0.170623810323864e+03)
BC_HOT = (-0.118115450538963e+06, 0.137145973583929e+06, -0.636233812100225e+05,
          0.147412923562646e+05, -0.170587278406872e+04, 0.788731721804990e+02)
V_SUN = -26.76
DISTMOD_AU = 5.0 * math.log10(10.0 * 648000.0 / math.pi)
T_SUN = 5772.0
K_VTAN = 149597870.7 / (365.25 * 86400.0)
OBLIQUITY_J2000 = math.radians(84381.406 / 3600.0)   # IAU 2006


def poly_and_slope(coeffs, x):
    value = np.zeros_like(x)
    slope = np.zeros_like(x)
    for c in reversed(coeffs):
        slope = slope * x + value
        value = value * x + c
    return value, slope


def bc(logt):
    pieces = [(logt < 3.70, BC_COOL), ((logt >= 3.70) & (logt < 3.90), BC_MIDDLE), (logt >= 3.90, BC_HOT)]
    value = np.zeros_like(logt)
    slope = np.zeros_like(logt)
    for mask, coeffs in pieces:
        v, s = poly_and_slope(coeffs, logt)
        value = np.where(mask, v, value)
        slope = np.where(mask, s, slope)
    return value, slope


def derive(ra, dec, plx, plx_err, pmra, pmdec, vmag, vmag_err, bv, bv_err, ecliptic_lat):
    out = {}
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        good = plx > 0
        dist = np.where(good, 1000.0 / plx, np.nan)
        dist_err = dist * plx_err / plx
        distmod = 5.0 * np.log10(dist) - 5.0
        distmod_err = 5.0 / math.log(10.0) * plx_err / plx
        absmag = vmag - distmod
        absmag_err = np.hypot(vmag_err, distmod_err)
        logt, dlogt = poly_and_slope(LOGT, bv)
        teff = 10.0 ** logt
        teff_err = teff * math.log(10.0) * np.abs(dlogt) * bv_err
        bcv, dbc = bc(logt)
        mbol = absmag + bcv
        mbol_err = np.hypot(absmag_err, dbc * dlogt * bv_err)
        mbol_sun = V_SUN + DISTMOD_AU + bc(np.array([math.log10(T_SUN)]))[0][0]
        lum = 10.0 ** (-0.4 * (mbol - mbol_sun))
        lum_err = lum * 0.4 * math.log(10.0) * mbol_err
        radius = np.sqrt(lum) * (T_SUN / teff) ** 2
        radius_err = radius * np.hypot(0.5 * lum_err / lum, 2.0 * teff_err / teff)
        mu = np.hypot(pmra, pmdec)
        vtan = K_VTAN * mu / 1000.0 * dist
        vtan_err = vtan * plx_err / plx
        beta = ecliptic_lat(ra, dec)
        out.update(dist=dist, dist_err=dist_err, absmag=absmag, absmag_err=absmag_err, teff=teff,
                   teff_err=teff_err, bc=bcv, mbol=mbol, lum=lum, lum_err=lum_err, radius=radius,
                   radius_err=radius_err, vtan=vtan, vtan_err=vtan_err, elat=beta,
                   ellipse_a=plx, ellipse_b=plx * np.abs(np.sin(np.radians(beta))))
    return out


def ecliptic_lat_numpy(ra, dec):
    a, d = np.radians(ra), np.radians(dec)
    eps = OBLIQUITY_J2000
    sin_beta = np.sin(d) * math.cos(eps) - np.cos(d) * math.sin(eps) * np.sin(a)
    return np.degrees(np.arcsin(np.clip(sin_beta, -1.0, 1.0)))


def ecliptic_lat_astropy(ra, dec):
    from astropy import units as u
    from astropy.coordinates import BarycentricMeanEcliptic, SkyCoord

    sky = SkyCoord(ra=ra * u.deg, dec=dec * u.deg, frame="icrs")
    return sky.transform_to(BarycentricMeanEcliptic()).lat.deg


def run_numpy(path):
    cols = np.loadtxt(path, delimiter=",", skiprows=1, usecols=range(1, 11), unpack=True)
    ra, dec, plx, plx_err, pmra, pmdec, vmag, vmag_err, bv, bv_err = cols
    return derive(ra, dec, plx, plx_err, pmra, pmdec, vmag, vmag_err, bv, bv_err, ecliptic_lat_numpy)


def run_astropy(path):
    from astropy.table import Table

    t = Table.read(path, format="ascii.csv")
    c = {name: np.asarray(t[name], dtype=float) for name in t.colnames if name != "id"}
    return derive(c["ra"], c["dec"], c["parallax"], c["parallax_err"], c["pmra"], c["pmdec"], c["vmag"],
                  c["vmag_err"], c["bv"], c["bv_err"], ecliptic_lat_astropy)


def main():
    kind, path = sys.argv[1], sys.argv[2]
    results = {"numpy": run_numpy, "astropy": run_astropy}[kind](path)
    checksum = sum(float(np.sum(v[np.isfinite(v)])) for v in results.values())
    print(f"{kind}: {len(results['dist'])} stars, checksum {checksum:.6g}")


main()
