#!/usr/bin/python3
"""Independent reference for the out-of-sample cost/loss triggers of src/calibrate/trigger-tuning.ts (numpy + scipy,
Debian /usr/bin/python3).

Reads JSON from stdin: {"p": [...], "o": [...], "year": [...], "alphas": [...], "resamples": R, "seed": S,
"kn": [[k, n], ...]}. For each cost/loss ratio alpha and each year, the warning threshold of maximum relative
economic value (Richardson 2000, QJRMS 126:649-667: V = (min(a, s) - F a (1 - s) + H s (1 - a) - s) / (min(a, s) - s a))
is chosen among the distinct forecast values above 0 of the other years (on equal value the higher threshold),
then applied to the left-out year; the value of those decisions, its hit and false-alarm rates, and the 5th/95th
percentiles (numpy 'linear') of the value over R resamples of whole years drawn with replacement by numpy's
default_rng(S) (its own generator: agreement with Forelight only within Monte-Carlo error). For each [k, n]:
scipy.stats.beta(k, n - k + 1).median() and scipy.stats.binom.sf(k - 1, n, that median) (should be 1/2).
Run by test/calibrate/trigger-tuning.test.ts as: /usr/bin/python3 test/calibrate/reference_triggers.py < input.json
"""
import json
import sys

import numpy as np
from scipy.stats import beta, binom

d = json.load(sys.stdin)
p = np.asarray(d["p"], dtype=float)
o = np.asarray(d["o"], dtype=float)
year = np.asarray(d["year"])
years = np.unique(year)


def value(h, f, s, a):
    clim = min(a, s)
    return (clim - (f * a * (1 - s) - h * s * (1 - a) + s)) / (clim - s * a)


def rates(warn, o):
    ev = o == 1
    return warn[ev].mean(), warn[~ev].mean()


def best_threshold(p, o, a):
    s = o.mean()
    best, best_t = None, np.nan
    for t in sorted(set(p[p > 0]), reverse=True):
        h, f = rates(p >= t, o)
        v = value(h, f, s, a)
        if best is None or v > best:
            best, best_t = v, t
    if best is None or not np.isfinite(best):
        return np.nan, np.nan  # no threshold with value (no event, or no non-event): none chosen
    return best_t, best


out = []
for a in d["alphas"]:
    warn = np.zeros(len(p), dtype=bool)
    for y in years:
        test = year == y
        t, _ = best_threshold(p[~test], o[~test], a)
        warn[test] = np.isfinite(t) & (p[test] >= t)
    h, f = rates(warn, o)
    v = value(h, f, o.mean(), a)
    rng = np.random.default_rng(d["seed"])
    rows = {y: np.flatnonzero(year == y) for y in years}
    boot = []
    for _ in range(d["resamples"]):
        idx = np.concatenate([rows[y] for y in rng.choice(years, size=len(years), replace=True)])
        if o[idx].sum() in (0, len(idx)):
            continue
        bh, bf = rates(warn[idx], o[idx])
        boot.append(value(bh, bf, o[idx].mean(), a))
    t_all, v_all = best_threshold(p, o, a)
    out.append({
        "value": float(v), "H": float(h), "F": float(f),
        "low": float(np.percentile(boot, 5, method="linear")), "high": float(np.percentile(boot, 95, method="linear")),
        "threshold": float(t_all), "in_sample": float(v_all), "warn": warn.astype(int).tolist(),
    })
medians = [float(beta(k, n - k + 1).median()) for k, n in d["kn"]]
json.dump({
    "curve": out,
    "median": medians,
    "tail": [float(binom.sf(k - 1, n, q)) for (k, n), q in zip(d["kn"], medians)],
}, sys.stdout)
