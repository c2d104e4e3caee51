#!/usr/bin/python3
# check-montecarlo.py: checks starledger-cli's Monte Carlo uncertainties and
# its EDSD distances against distributions computed here independently
# (Python's statistics.NormalDist and Debian's python3-numpy):
#   (a) `derive --errors mc:20000 --seed 7` with the inverse distance: the
#       median and 15.87/84.13 percentiles of dist, distmod, teff and absmag
#       against the exact distributions of 1000/parallax for a Gaussian
#       parallax, of 10^P((B-V)0) for a Gaussian colour (Flower 1996 /
#       Torres 2010, Table 2), and of V - A_V + 5 log10(parallax) - 10
#       (numerical convolution), within 4 standard errors of a sample
#       quantile, sqrt(q (1 - q) / N) / pdf; and Procyon against the Monte
#       Carlo values of REFERENCES.md 11;
#   (b) `derive --distance edsd:L=1350` on the parallaxes of the table of
#       REFERENCES.md 2.2: the posterior of Bailer-Jones (2015, PASP 127,
#       994), r^2 exp(-r/L) N(parallax | 1/r, sigma), integrated here on a
#       fine grid: its mode and 68% highest-density interval (the Bailer-
#       Jones et al. 2018 convention) within 0.5%, where the first order
#       is used (S/N >= 5); its median and percentiles within the sampling
#       error where Monte Carlo is (S/N < 5, and --errors mc:20000);
#   (c) reproducibility: the same seed gives byte-identical exports, another
#       seed different ones, and verify recomputes the Monte Carlo run.
#
# Speaks TAP: "1..N", then "ok K - description" or "not ok K - description"
# followed by "# want/got" lines for the worst star; exits 1 if any failed.
#
# Environment: STARLEDGER_CLI, the path of starledger-cli.

import math
import os
import sys
import tempfile
from statistics import NormalDist

# The shared module sits beside this script; no bytecode cache is written
# into the source tree.
sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402
from starledger_tap import check_run, number, run_cli  # noqa: E402

try:
    import numpy as np
except ImportError:
    tap_lib.skip_all("numpy is not installed (Debian: python3-numpy)")

DRAWS = 20000
SEED = "7"
P16, P50, P84 = NormalDist().cdf(-1.0), 0.5, NormalDist().cdf(1.0)   # 68% central interval
QUANTILES = (("p16", "_lo", P16), ("median", "", P50), ("p84", "_hi", P84))
# Tolerance of a sample quantile, in its standard errors.  The script makes
# about 100 such comparisons: at 3 a correct engine would fail one of them
# about one time in four whenever its sequence of draws changes (a module
# added, say); at 4, about one time in 150.
SAMPLING_SIGMAS = 4.0
EDSD_RELATIVE = 0.005           # mode and HDI against the numerical posterior
EDSD_L = 1350.0                 # pc, Astraatmadja & Bailer-Jones (2016)
HDI_MASS = 0.6827               # 68% highest-density interval
RV = 3.1

# Flower (1996) log Teff((B-V)0), coefficients of Torres (2010, Table 2).
LOGT_COEFFS = (3.979145106714099, -0.654992268598245, 1.740690042385095, -4.608815154057166,
               6.792599779944473, -5.396909891322525, 2.192970376522490, -0.359495739295671)

# Gaussian inputs (value, error); the inverse distance needs S/N >= 5.
MC_STARS = [
    {"id": "MC 1", "parallax": (10.0, 1.5), "vmag": (9.0, 0.02), "bv": (0.65, 0.02)},
    {"id": "MC 2", "parallax": (2.0, 0.3), "vmag": (12.0, 0.05), "bv": (0.30, 0.03), "ebv": (0.10, 0.02)},
    {"id": "MC 3", "parallax": (50.0, 7.0), "vmag": (7.0, 0.01), "bv": (1.20, 0.03)},
    {"id": "MC 4", "parallax": (120.0, 20.0), "vmag": (5.5, 0.01), "bv": (-0.15, 0.02), "ebv": (0.03, 0.01)},
]
# Procyon A (van Leeuwen 2007, A&A 474, 653) with the Monte Carlo values
# of REFERENCES.md 11 (N = 2e5, seed-independent to the digits shown):
# quantity -> (median, sigma, half a unit in the last digit).
PROCYON = {"id": "Procyon", "parallax": (284.56, 1.26), "vmag": (0.34, 0.01), "bv": (0.42, 0.01)}
PROCYON_MC = {"absmag": (2.6109, 0.0139, 0.00005), "teff": (6633.0, 46.0, 0.5),
              "lum": (6.95, 0.09, 0.005), "radius": (1.997, 0.033, 0.0005)}

# REFERENCES.md 2.2 (L = 1350 pc): parallax, sigma [mas] -> mode, q05, q16,
# median, q84, q95 [pc].
EDSD_TABLE = [
    ("EDSD 1", 10.0, 1.0, (102.002, 88.8, 94.3, 104.3, 116.8, 126.6)),
    ("EDSD 2", 1.0, 0.1, (1012.82, 882.6, 936.6, 1034.8, 1156.1, 1250.8)),
    ("EDSD 3", 1.0, 0.2, (1054.19, 834.1, 940.7, 1175.6, 1572.5, 2011.0)),
    ("EDSD 4", 1.0, 0.5, (1500.000, 946.5, 1363.0, 2658.1, 5037.9, 7183.8)),
    ("EDSD 5", 0.5, 0.5, (2487.33, 1353.0, 1946.4, 3502.6, 6017.6, 8200.9)),
    ("EDSD 6", 0.0, 1.0, (2864.52, 1375.0, 2081.1, 3801.7, 6425.9, 8653.9)),
    ("EDSD 7", -0.5, 1.0, (3064.09, 1508.6, 2237.9, 3981.8, 6618.3, 8850.9)),
]


# ---- the command line --------------------------------------------------------

def make_project(tap, directory, name, columns, rows):
    csv_path = os.path.join(directory, name + ".csv")
    project = os.path.join(directory, name + ".starledger")
    tap_lib.write_csv(csv_path, columns, rows)
    tap_lib.new_project(tap, project, name)
    tap_lib.import_csv(tap, project, csv_path, name)
    return project


def derive(tap, project, *args):
    return check_run(tap, run_cli("derive", project, "--all", *args),
                     "starledger-cli derive %s" % " ".join(args))


def export(project):
    """The whole export, unchecked: the reproducibility checks compare it
    byte for byte."""
    return run_cli("export", project)


def worst_check(tap, items, description, unit):
    """ITEMS: (label, want, got, tolerance).  Passes if every |got - want|
    is within its tolerance; reports the worst in units of tolerance, since
    each sample quantile has a tolerance of its own."""
    found = tap_lib.worst(items, lambda item: abs(item[2] - item[1]) / item[3])
    if found is None:
        return tap.check(False, description, ["nothing to compare"])
    ratio, (label, want, got, tolerance) = found
    off = ("%.3g%%" % (100.0 * abs(got - want) / abs(want))) if want else ("%.3g %s" % (abs(got - want), unit))
    return tap.check(ratio <= 1.0,
                     "%s (%d values; worst %s off by %s, %.2f of its tolerance)"
                     % (description, len(items), label, off, ratio),
                     ["%s: want %.10g %s (tolerance %.3g)" % (label, want, unit, tolerance),
                      "%s: got  %.10g %s" % (label, got, unit)])


# ---- the exact distributions --------------------------------------------------

def quantile_tolerance(q, pdf, n=DRAWS):
    """SAMPLING_SIGMAS standard errors of the Q sample quantile of N draws
    from a distribution of density PDF there."""
    return SAMPLING_SIGMAS * math.sqrt(q * (1.0 - q) / n) / pdf


def logt(x):
    return sum(c * x ** i for i, c in enumerate(LOGT_COEFFS))


def dlogt(x):
    return sum(i * c * x ** (i - 1) for i, c in enumerate(LOGT_COEFFS) if i > 0)


def gaussian_bv0(star):
    bv, sbv = star["bv"]
    ebv, sebv = star.get("ebv", (0.0, 0.0))
    return NormalDist(bv - ebv, math.hypot(sbv, sebv))


def gaussian_v0(star):
    """V - A_V, A_V = R_V E(B-V): Gaussian."""
    v, sv = star["vmag"]
    ebv, sebv = star.get("ebv", (0.0, 0.0))
    return NormalDist(v - RV * ebv, math.hypot(sv, RV * sebv))


def dist_quantile(star, q):
    """1000/parallax decreases with the parallax: its Q quantile is 1000
    over the parallax's 1 - Q quantile."""
    plx = NormalDist(*star["parallax"])
    r = 1000.0 / plx.inv_cdf(1.0 - q)
    return r, plx.pdf(1000.0 / r) * 1000.0 / r ** 2


def distmod_quantile(star, q):
    r, pdf_r = dist_quantile(star, q)
    return 5.0 * math.log10(r) - 5.0, pdf_r * r * math.log(10.0) / 5.0


def teff_quantile(star, q):
    """Teff = 10^P((B-V)0) decreases with the colour over Flower's range."""
    bv0 = gaussian_bv0(star)
    x = bv0.inv_cdf(1.0 - q)
    t = 10.0 ** logt(x)
    return t, bv0.pdf(x) / (t * math.log(10.0) * abs(dlogt(x)))


_erf = np.frompyfunc(math.erf, 1, 1)


def absmag_quantile(star, q):
    """M_V = (V - A_V) + 5 log10(parallax) - 10, a Gaussian plus a function
    of another: CDF(m) = E_parallax[Phi((m - 5 log10 p + 10 - mu) / s)],
    integrated over the parallax on a grid, solved for Q by bisection."""
    plx_mu, plx_sigma = star["parallax"]
    g = gaussian_v0(star)
    p = np.linspace(max(plx_mu - 9 * plx_sigma, plx_mu * 1e-3), plx_mu + 9 * plx_sigma, 4001)
    w = np.exp(-0.5 * ((p - plx_mu) / plx_sigma) ** 2)
    w /= w.sum()
    shift = 5.0 * np.log10(p) - 10.0 + g.mean

    def cdf(m):
        z = (m - shift) / (g.stdev * math.sqrt(2.0))
        return float(np.sum(w * (0.5 * (1.0 + _erf(z).astype(float)))))

    lo, hi = float(shift.min()) - 10 * g.stdev, float(shift.max()) + 10 * g.stdev
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if cdf(mid) < q:
            lo = mid
        else:
            hi = mid
    m = 0.5 * (lo + hi)
    pdf = float(np.sum(w * np.exp(-0.5 * ((m - shift) / g.stdev) ** 2))) / (g.stdev * math.sqrt(2 * math.pi))
    return m, pdf


# ---- the EDSD posterior, on a fine grid -------------------------------------

class EdsdPosterior:
    """P(r | parallax) proportional to r^2 exp(-r/L) exp(-(parallax - 1/r)^2 /
    (2 sigma^2)) (Bailer-Jones 2015), tabulated on 400 001 points evenly
    spaced in ln r and integrated by trapezoids."""

    def __init__(self, parallax_mas, sigma_mas, length_pc, points=400001):
        w, s, L = parallax_mas / 1000.0, sigma_mas / 1000.0, length_pc
        r_min = 1.0 / (w + 12 * s) if w + 12 * s > 0 else 1e-4 * L
        r_max = min(1.0 / (w - 12 * s), 80 * L) if w - 12 * s > 0 else 80 * L
        self.r = np.exp(np.linspace(math.log(r_min), math.log(r_max), points))
        log_p = 2 * np.log(self.r) - self.r / L - (w - 1.0 / self.r) ** 2 / (2 * s * s)
        self.log_p = log_p
        p = np.exp(log_p - log_p.max())
        steps = 0.5 * (p[1:] + p[:-1]) * np.diff(self.r)
        total = steps.sum()
        self.density = p / total                                   # per pc
        self.cdf = np.concatenate(([0.0], np.cumsum(steps))) / total

    def mode(self):
        """The grid maximum refined by a parabola through its neighbours (in r)."""
        k = int(np.argmax(self.log_p))
        r0, r1, r2 = self.r[k - 1:k + 2]
        y0, y1, y2 = self.log_p[k - 1:k + 2]
        num = (r1 - r0) ** 2 * (y1 - y2) - (r1 - r2) ** 2 * (y1 - y0)
        den = (r1 - r0) * (y1 - y2) - (r1 - r2) * (y1 - y0)
        return r1 - 0.5 * num / den

    def quantile(self, q):
        return float(np.interp(q, self.cdf, self.r))

    def pdf(self, r):
        return float(np.interp(r, self.r, self.density))

    def hdi(self, mass):
        """The interval where the density exceeds the level c that encloses
        MASS, found by bisection on c; the ends interpolated in the density."""
        peak = self.density.max()
        lo_c, hi_c = 0.0, peak
        for _ in range(80):
            c = 0.5 * (lo_c + hi_c)
            inside = self.density >= c
            i, j = np.argmax(inside), len(inside) - 1 - np.argmax(inside[::-1])
            if self.cdf[j] - self.cdf[i] > mass:
                lo_c = c
            else:
                hi_c = c
        i, j = int(i), int(j)
        d = self.density
        left = self.r[i - 1] + (c - d[i - 1]) / (d[i] - d[i - 1]) * (self.r[i] - self.r[i - 1]) if i > 0 else self.r[0]
        right = self.r[j] + (c - d[j]) / (d[j + 1] - d[j]) * (self.r[j + 1] - self.r[j]) if j + 1 < len(d) else self.r[-1]
        return left, right


# ---- (a) Monte Carlo with the inverse distance -------------------------------

def inverse_rows():
    rows = []
    for star in MC_STARS + [PROCYON]:
        row = {"id": star["id"]}
        for field in ("parallax", "vmag", "bv", "ebv"):
            if field in star:
                row[field], row[field + "_err"] = (repr(x) for x in star[field])
        rows.append(row)
    return rows


INPUT_COLUMNS = ("id", "parallax", "parallax_err", "vmag", "vmag_err", "bv", "bv_err", "ebv", "ebv_err")


def check_inverse_mc(tap, directory):
    project = make_project(tap, directory, "inverse", INPUT_COLUMNS, inverse_rows())
    if not derive(tap, project, "--errors", "mc:%d" % DRAWS, "--seed", SEED):
        return project
    rows = tap_lib.export_rows(tap, project, ["dist", "distmod", "teff", "absmag", "lum", "radius", "flags"],
                       "inverse, mc:%d" % DRAWS)

    # The colours stay where log Teff(B-V) is monotonic (the quantile map
    # above assumes it): check that over +/- 6 sigma first.
    for star in MC_STARS:
        bv0 = gaussian_bv0(star)
        xs = np.linspace(bv0.mean - 6 * bv0.stdev, bv0.mean + 6 * bv0.stdev, 601)
        if not all(dlogt(x) < 0 for x in xs):
            print("Bail out! log Teff(B-V) is not monotonic around %s" % star["id"])
            sys.exit(1)

    references = (
        ("dist", "pc", dist_quantile, "1000/parallax for a Gaussian parallax (NormalDist quantiles)"),
        ("distmod", "mag", distmod_quantile, "5 log10(1000/parallax) - 5 for a Gaussian parallax"),
        ("teff", "K", teff_quantile,
         "10^P((B-V)0), Flower/Torres Table 2, for a Gaussian (B-V)0 (NormalDist quantiles)"),
        ("absmag", "mag", absmag_quantile,
         "V - A_V + 5 log10(parallax) - 10 for Gaussian V, E(B-V), parallax (numpy convolution)"),
    )
    for quantity, unit, reference, what in references:
        for name, suffix, q in QUANTILES:
            items = []
            for star in MC_STARS:
                want, pdf = reference(star, q)
                items.append(("%s %s %s" % (star["id"], quantity, name), want,
                              number(rows.get(star["id"], {}), quantity + suffix), quantile_tolerance(q, pdf)))
            worst_check(tap, items, "mc:%d %s %s equals the %s quantile of %s, within %g sampling "
                        "standard errors" % (DRAWS, quantity, name, name, what, SAMPLING_SIGMAS), unit)

    row = rows.get(PROCYON["id"], {})
    items_median, items_sigma = [], []
    for quantity, (median, sigma, rounding) in PROCYON_MC.items():
        # A median's standard error is 1.2533 sigma / sqrt(N), a 1-sigma
        # half-width's at most 1.51 sigma / sqrt(N) for a near-Gaussian.
        items_median.append(("Procyon %s" % quantity, median, number(row, quantity),
                             rounding + SAMPLING_SIGMAS * 1.2533 * sigma / math.sqrt(DRAWS)))
        items_sigma.append(("Procyon %s (hi - lo)/2" % quantity, sigma,
                            (number(row, quantity + "_hi") - number(row, quantity + "_lo")) / 2,
                            rounding + SAMPLING_SIGMAS * 1.51 * sigma / math.sqrt(DRAWS)))
    worst_check(tap, items_median, "Procyon mc:%d medians of absmag, teff, lum, radius equal REFERENCES.md 11 "
                "(M_V 2.6109, T 6633 K, L 6.95, R 1.997)" % DRAWS, "")
    worst_check(tap, items_sigma, "Procyon mc:%d 68%% half-widths of absmag, teff, lum, radius equal "
                "REFERENCES.md 11 (0.0139, 46 K, 0.09, 0.033)" % DRAWS, "")
    return project


# ---- (b) the EDSD posterior ----------------------------------------------------

def check_edsd(tap, directory):
    posteriors = {sid: EdsdPosterior(plx, sigma, EDSD_L) for sid, plx, sigma, _ in EDSD_TABLE}

    # First the reference itself: the grid posterior must reproduce the
    # table of REFERENCES.md 2.2 to the digits shown.
    items = []
    for sid, plx, sigma, table in EDSD_TABLE:
        post = posteriors[sid]
        mine = (post.mode(), post.quantile(0.05), post.quantile(P16), post.quantile(0.5),
                post.quantile(P84), post.quantile(0.95))
        for label, want, got in zip(("mode", "q05", "q16", "median", "q84", "q95"), table, mine):
            items.append(("%s (%g +/- %g mas) %s" % (sid, plx, sigma, label), want, got, 6e-4 * want))
    worst_check(tap, items, "the numpy grid posterior reproduces the EDSD table of REFERENCES.md 2.2 "
                "(mode and quantiles, 0.06%)", "pc")

    rows = [{"id": sid, "parallax": repr(plx), "parallax_err": repr(sigma)} for sid, plx, sigma, _ in EDSD_TABLE]
    project = make_project(tap, directory, "edsd", ("id", "parallax", "parallax_err"), rows)

    def check_mode_and_hdi(got, label):
        items = [("%s mode" % sid, posteriors[sid].mode(), number(got.get(sid, {}), "dist"),
                  EDSD_RELATIVE * posteriors[sid].mode()) for sid, _, _, _ in EDSD_TABLE]
        worst_check(tap, items, "%s: dist equals the mode of the Bailer-Jones (2015) posterior "
                    "integrated with numpy, within 0.5%%" % label, "pc")
        items = []
        for sid, _, _, _ in EDSD_TABLE:
            lo, hi = posteriors[sid].hdi(HDI_MASS)
            row = got.get(sid, {})
            items.append(("%s HDI lower end" % sid, lo, number(row, "dist_lo"), EDSD_RELATIVE * lo))
            items.append(("%s HDI upper end" % sid, hi, number(row, "dist_hi"), EDSD_RELATIVE * hi))
        worst_check(tap, items, "%s: dist_lo, dist_hi equal the 68%% highest-density interval of the "
                    "numpy posterior (Bailer-Jones et al. 2018 convention), within 0.5%%" % label, "pc")

    def check_drawn_distmod(got, stars, draws, label):
        """Draws come from the posterior itself: the percentiles of
        distmod = 5 log10(r) - 5 are those of r, transformed."""
        items = []
        for sid, _, _, _ in stars:
            post = posteriors[sid]
            for name, suffix, q in QUANTILES:
                r = post.quantile(q)
                want = 5.0 * math.log10(r) - 5.0
                tolerance = 5.0 / (r * math.log(10.0)) * quantile_tolerance(q, post.pdf(r), draws)
                items.append(("%s %s" % (sid, name), want, number(got.get(sid, {}), "distmod" + suffix),
                              tolerance))
        worst_check(tap, items, "%s: distmod median and percentiles equal 5 log10 r - 5 at the numpy "
                    "posterior's quantiles, within %g sampling standard errors" % (label, SAMPLING_SIGMAS),
                    "mag")

    # The default error method: first order at S/N >= 5, Monte Carlo
    # (1000 draws from the posterior) below it; dist itself is always the
    # posterior mode with its HDI.
    if derive(tap, project, "--distance", "edsd:L=%g" % EDSD_L):
        got = tap_lib.export_rows(tap, project, ["dist", "distmod", "flags"], "edsd, linear")
        drawn = [t for t in EDSD_TABLE if t[1] / t[2] < 5.0]
        check_mode_and_hdi(got, "edsd:L=1350")
        check_drawn_distmod(got, drawn, 1000, "edsd:L=1350, S/N < 5 (Monte Carlo of 1000 draws)")

        want_flags = {}
        for sid, plx, sigma, _ in EDSD_TABLE:
            flags = set()
            if plx / sigma < 5.0:
                flags |= {"low_parallax_snr", "monte_carlo_auto"}
            if plx <= 0.0:
                flags.add("nonpositive_parallax")
            if plx <= 0.0 or sigma / plx > 0.5:
                flags.add("prior_dominated")
            want_flags[sid] = flags
        bad = []
        for sid, flags in want_flags.items():
            have = set(got.get(sid, {}).get("flags", "").split("|")) - {"extinction_assumed_zero", ""}
            if have != flags:
                bad.append("%s: want %s, got %s" % (sid, "|".join(sorted(flags)), "|".join(sorted(have))))
        tap.check(not bad, "edsd flags: low S/N below 5, prior-dominated above sigma/parallax 0.5 or "
                  "parallax <= 0 (Bailer-Jones 2015; REFERENCES.md 2.4)", bad)

    # Monte Carlo for every star: draws from the posterior itself.
    if derive(tap, project, "--distance", "edsd:L=%g" % EDSD_L, "--errors", "mc:%d" % DRAWS, "--seed", SEED):
        got = tap_lib.export_rows(tap, project, ["dist", "distmod"], "edsd, mc:%d" % DRAWS)
        check_mode_and_hdi(got, "edsd:L=1350 mc:%d" % DRAWS)
        check_drawn_distmod(got, EDSD_TABLE, DRAWS, "edsd:L=1350 mc:%d" % DRAWS)


# ---- (c) reproducibility ---------------------------------------------------------

def check_reproducible(tap, directory, project):
    """PROJECT was derived with --errors mc:DRAWS --seed SEED."""
    first = export(project)
    twin = make_project(tap, directory, "inverse-twin", INPUT_COLUMNS, inverse_rows())
    derive(tap, twin, "--errors", "mc:%d" % DRAWS, "--seed", SEED)
    second = export(twin)
    tap.check(first.returncode == 0 and first.stdout == second.stdout and first.stdout != "",
              "two projects derived with --seed %s give byte-identical exports" % SEED,
              ["the exports differ (%d and %d bytes)" % (len(first.stdout), len(second.stdout))])

    check_run(tap, run_cli("verify", project), "verify recomputes the mc:%d run bit for bit" % DRAWS)

    derive(tap, twin, "--errors", "mc:%d" % DRAWS, "--seed", "8")
    other = export(twin)
    tap.check(other.returncode == 0 and other.stdout != first.stdout,
              "--seed 8 gives an export different from --seed %s" % SEED, ["the exports are identical"])

    derive(tap, twin, "--errors", "mc:%d" % DRAWS, "--seed", SEED)
    again = export(twin)
    tap.check(again.stdout == first.stdout,
              "deriving again with --seed %s gives back the byte-identical export" % SEED,
              ["the exports differ"])


def main():
    tap_lib.required_env("STARLEDGER_CLI")
    tap = tap_lib.Tap()
    with tempfile.TemporaryDirectory(prefix="starledger-check-montecarlo-") as directory:
        project = check_inverse_mc(tap, directory)
        check_edsd(tap, directory)
        check_reproducible(tap, directory, project)
    tap.finish()


if __name__ == "__main__":
    main()
