#!/usr/bin/python3
# check-combine.py: checks how starledger-cli combines several sources'
# measurements of one star against numpy and scipy (Debian python3-numpy,
# python3-scipy), which share no code with ours:
#   (a) weighted-mean: each exported parallax and V magnitude is numpy's
#       inverse-variance weighted mean, sum(x/s^2)/sum(1/s^2), and its
#       68% interval is the mean -/+ sum(1/s^2)^-1/2 (Taylor 1997, ch. 7);
#   (b) the agreement test: a star is flagged sources_disagree exactly when
#       scipy.stats.chi2.sf(chi2, n - 1) of its parallaxes or of its V
#       magnitudes is below the level (0.01), and explain --json reports
#       scipy's probability;
#   (c) priority: with a source order, the first listed source's row wins
#       whatever its error; stars it did not measure fall to the next.
# 300 stars measured by three invented sources, some offset by many
# sigma on purpose so that both outcomes of the test occur.
#
# Speaks TAP; exits 1 if any check failed.  Environment: STARLEDGER_CLI.

import json
import math
import os
import random
import sys
import tempfile

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(__file__))
import starledger_tap as tap_lib  # noqa: E402

try:
    import numpy as np
    from scipy.stats import chi2
except ImportError:
    tap_lib.skip_all("numpy or scipy is not installed (Debian: python3-numpy, python3-scipy)")

SEED = 20261202
N_STARS = 300
SOURCES = ["ridge", "valley", "summit"]
LEVEL = 0.01
# The exports carry 15 significant digits.
TOLERANCE = 1e-12


def text(value, digits=9):
    return "" if value is None else "%.*g" % (digits, value)


def make_sources(rng):
    """rows[source][star id] = {parallax, parallax_err, vmag, vmag_err}, as
    the files will say them; a source skips some stars."""
    rows = {name: {} for name in SOURCES}
    for i in range(N_STARS):
        star = "C%03d" % i
        parallax, vmag = rng.uniform(2, 80), rng.uniform(5, 12)
        # Every sixth star: one source is off by 8 sigma.
        offender = rng.choice(SOURCES) if i % 6 == 0 else None
        for name in SOURCES:
            if name != "ridge" and rng.random() < 0.2:
                continue
            p_err, v_err = rng.uniform(0.02, 0.8), rng.uniform(0.005, 0.05)
            shift = 8.0 if name == offender else 0.0
            row = {"parallax": parallax + (rng.gauss(0, 1) + shift) * p_err, "parallax_err": p_err,
                   "vmag": vmag + (rng.gauss(0, 1) + shift) * v_err, "vmag_err": v_err}
            rows[name][star] = {k: float(text(v, 9)) for k, v in row.items()}
    return rows


def reference(rows, star, field):
    """numpy's weighted mean, its error, and scipy's chi-square tail."""
    x = np.array([rows[s][star][field] for s in SOURCES if star in rows[s]])
    e = np.array([rows[s][star][field + "_err"] for s in SOURCES if star in rows[s]])
    w = 1.0 / e**2
    mean = float(np.sum(w * x) / np.sum(w))
    c2 = float(np.sum(w * (x - mean) ** 2))
    p = float(chi2.sf(c2, len(x) - 1)) if len(x) > 1 else math.nan
    return mean, float(1.0 / math.sqrt(np.sum(w))), p, len(x)


def check_weighted_mean(tap, project, rows):
    result = tap_lib.run_cli("combine", project, "--rule", "all=weighted-mean", "--level", str(LEVEL))
    tap_lib.check_run(tap, result, "combine --rule all=weighted-mean")
    tap_lib.check_run(tap, tap_lib.run_cli("derive", project), "derive with weighted means")
    exported = tap_lib.export_rows(tap, project, ["parallax", "vmag", "flags"], "weighted-mean",
                                   expected=N_STARS)
    values, bounds, wrong_flags = [], [], []
    for star, row in sorted(exported.items()):
        disagree = False
        for field in ("parallax", "vmag"):
            mean, error, p, n = reference(rows, star, field)
            values.append(("%s %s" % (star, field), mean, tap_lib.number(row, field)))
            bounds.append(("%s %s_lo" % (star, field), mean - error, tap_lib.number(row, field + "_lo")))
            bounds.append(("%s %s_hi" % (star, field), mean + error, tap_lib.number(row, field + "_hi")))
            disagree = disagree or (n > 1 and p < LEVEL)
        flagged = "sources_disagree" in row.get("flags", "").split("|")
        if flagged != disagree:
            wrong_flags.append("%s: scipy says %s, flags %s" % (star, disagree, row.get("flags")))
    tap_lib.compare(tap, values, "weighted means against numpy", "", TOLERANCE, relative=True)
    tap_lib.compare(tap, bounds, "mean -/+ sum(1/s^2)^-1/2 against numpy", "", TOLERANCE, relative=True)
    n_flagged = sum(1 for r in exported.values() if "sources_disagree" in r.get("flags", ""))
    tap.check(not wrong_flags and 0 < n_flagged < N_STARS,
              "sources_disagree exactly where scipy.stats.chi2.sf < %g (%d of %d stars)"
              % (LEVEL, n_flagged, N_STARS), wrong_flags[:10])

    # explain --json: the probability of a few stars' parallaxes.
    wrong = []
    for i in range(0, N_STARS, 37):
        star = "C%03d" % i
        _, _, p, n = reference(rows, star, "parallax")
        result = tap_lib.run_cli("explain", project, star, "parallax", "--json")
        if result.returncode != 0:
            wrong.append("%s: explain failed: %s" % (star, result.stderr.strip()))
            continue
        sources = json.loads(result.stdout).get("sources", [])
        got = sources[0]["p_value"] if sources and sources[0].get("p_value") is not None else math.nan
        if n > 1 and not abs(got - p) <= 1e-12 * max(p, 1e-300) + 1e-300:
            wrong.append("%s: explain P %r, scipy %r" % (star, got, p))
        if n == 1 and sources:
            wrong.append("%s: one source, yet a sources entry" % star)
    tap.check(not wrong, "explain --json gives scipy's chi-square probability", wrong[:10])


def check_priority(tap, project, rows):
    result = tap_lib.run_cli("combine", project, "--rule", "parallax=priority",
                             "--source-order", "summit", "--source-order", "valley")
    tap_lib.check_run(tap, result, "combine --rule parallax=priority --source-order summit, valley")
    tap_lib.check_run(tap, tap_lib.run_cli("derive", project), "derive with a source order")
    exported = tap_lib.export_rows(tap, project, ["parallax"], "priority", expected=N_STARS)
    items = []
    for star, row in sorted(exported.items()):
        want = next((rows[s][star]["parallax"] for s in ("summit", "valley") if star in rows[s]),
                    rows["ridge"][star]["parallax"])
        items.append((star, want, tap_lib.number(row, "parallax")))
    tap_lib.compare(tap, items, "the first listed source's parallax", "mas", 0.0)


def main():
    tap = tap_lib.Tap()
    rng = random.Random(SEED)
    rows = make_sources(rng)
    with tempfile.TemporaryDirectory(prefix="check-combine-") as directory:
        project = os.path.join(directory, "combine.starledger")
        ok = tap_lib.new_project(tap, project, "combine")
        for name in SOURCES:
            path = os.path.join(directory, name + ".csv")
            tap_lib.write_csv(path, ["id", "parallax", "parallax_err", "vmag", "vmag_err"],
                              [dict({"id": star}, **{k: text(v) for k, v in r.items()})
                               for star, r in sorted(rows[name].items())])
            ok = ok and tap_lib.import_csv(tap, project, path, name, ("--source-name", name))
        if ok:
            check_weighted_mean(tap, project, rows)
            check_priority(tap, project, rows)
    tap.finish()


if __name__ == "__main__":
    main()
