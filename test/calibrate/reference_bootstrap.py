#!/usr/bin/python3
"""Independent reference for the fair Brier score (Ferro 2014, eq. 8), the year-block bootstrap intervals and
the Weibull (Hyndman-Fan type 6) percentile of src/calibrate/ and src/core/percentile.ts (numpy + scipy, Debian).

Reads JSON from stdin: {"i": [...], "m": [...], "o": [...], "year": [...], "resamples": R, "seed": S,
"samples": [[...]], "qs": [...]} where case k has i[k] of m[k] members above the threshold. Writes JSON with the
mean fair Brier score, fair BSS, and the 5th/95th percentiles of BSS, fair BSS and ROC area (scipy
mannwhitneyu U / (n1 n0)) over R resamples of whole years drawn with replacement by numpy's default_rng(S)
(its own generator: results agree with Forelight's only within Monte-Carlo error), and
numpy.percentile(method='weibull') of each sample at each q.
Run by test/calibrate/bootstrap.test.ts as: /usr/bin/python3 test/calibrate/reference_bootstrap.py < input.json
"""
import json
import sys

import numpy as np
from scipy.stats import mannwhitneyu

d = json.load(sys.stdin)
i = np.asarray(d["i"], dtype=float)
m = np.asarray(d["m"], dtype=float)
o = np.asarray(d["o"], dtype=float)
year = np.asarray(d["year"])
p = i / m


def fair_bs(i, m, o):
    return np.mean((i / m - o) ** 2 - i * (m - i) / (m ** 2 * (m - 1)))


def scores(i, m, o):
    p = i / m
    s = o.mean()
    ref = s * (1 - s)
    bss = 1 - np.mean((p - o) ** 2) / ref
    fbss = 1 - fair_bs(i, m, o) / ref
    u = mannwhitneyu(p[o == 1], p[o == 0], alternative="two-sided").statistic
    return bss, fbss, float(u) / (np.sum(o == 1) * np.sum(o == 0))


rng = np.random.default_rng(d["seed"])
years = np.unique(year)
rows = {y: np.flatnonzero(year == y) for y in years}
out = []
for _ in range(d["resamples"]):
    pick = rng.choice(years, size=len(years), replace=True)
    idx = np.concatenate([rows[y] for y in pick])
    if o[idx].sum() in (0, len(idx)):
        continue
    out.append(scores(i[idx], m[idx], o[idx]))
out = np.asarray(out)
lo = np.percentile(out, 5, axis=0, method="linear")
hi = np.percentile(out, 95, axis=0, method="linear")
s = o.mean()
json.dump({
    "fair_bs": float(fair_bs(i, m, o)),
    "fair_bss": float(1 - fair_bs(i, m, o) / (s * (1 - s))),
    "bss": [float(lo[0]), float(hi[0])], "fair": [float(lo[1]), float(hi[1])], "auc": [float(lo[2]), float(hi[2])],
    "weibull": [[float(np.percentile(np.asarray(x, dtype=float), q, method="weibull")) for q in d["qs"]] for x in d["samples"]],
}, sys.stdout)
