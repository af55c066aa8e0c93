#!/usr/bin/python3
"""Independent reference for tercile categories, the ranked probability score and its skill scores (Epstein
1969; Weigel, Liniger & Appenzeller 2007 debiased RPSS), and reliability bins with Broecker & Smith (2007)
consistency bars, for src/calibrate/terciles.ts, rpss.ts and reliability.ts (numpy, Debian /usr/bin/python3).

Reads JSON from stdin: {"hindcast": [[[...members] per lead] per year], "observed": [[... per lead] per year],
"years": [...], "resamples": R, "seed": S, "p": [...], "o": [...], "edges": [...]}. Writes JSON with, per lead,
the cross-validated tercile cases (probabilities, observed category), RPS, RPSS, RPSS_D and the 5th/95th
percentiles of RPSS_D over R year-block resamples (numpy default_rng(S): its own generator, so only Monte-Carlo
agreement is expected), and the reliability bins of p, o with consistency bars from R consistency resamples.
Written from the papers' formulas, not from Forelight's code: categories via numpy.percentile (linear) and
numpy.digitize-like comparisons, the RPS via numpy.cumsum.
Run by test/calibrate/categories.test.ts as: /usr/bin/python3 test/calibrate/reference_categories.py < input.json
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
hc = np.asarray(d["hindcast"], dtype=float)  # [year, lead, member]
ob = np.asarray(d["observed"], dtype=float)  # [year, lead]
years = np.asarray(d["years"])
R = int(d["resamples"])
rng = np.random.default_rng(int(d["seed"]))
CLIM = np.array([1 / 3, 1 / 3, 1 / 3])


def category(x, lo, hi):
    return 0 if x < lo else (2 if x > hi else 1)


def rps(f, k):
    obs = np.zeros(3)
    obs[k] = 1
    return float(np.sum((np.cumsum(f) - np.cumsum(obs)) ** 2))


def skill(F, K, M, w):
    r = np.sum(w * np.array([rps(f, k) for f, k in zip(F, K)]))
    c = np.sum(w * np.array([rps(CLIM, k) for k in K]))
    dd = np.sum(w * (2 / 9 + 2 / 9) / M)  # Weigel et al. (2007) D for equal thirds: sum_k P_k (1 - P_k) / M
    n = np.sum(w)
    return r / n, c / n, 1 - r / c, 1 - (r / n) / (c / n + dd / n)


leads = []
for l in range(hc.shape[1]):
    F, K, M, Y = [], [], [], []
    for y in range(len(years)):
        rest = np.arange(len(years)) != y
        lo, hi = np.percentile(hc[rest, l, :].ravel(), [100 / 3, 200 / 3])
        olo, ohi = np.percentile(ob[rest, l], [100 / 3, 200 / 3])
        cats = np.array([category(x, lo, hi) for x in hc[y, l, :]])
        F.append(np.bincount(cats, minlength=3) / len(cats))
        K.append(category(ob[y, l], olo, ohi))
        M.append(len(cats))
        Y.append(years[y])
    F, K, M, Y = np.array(F), np.array(K), np.array(M, dtype=float), np.array(Y)
    r, c, rpss, rpssd = skill(F, K, M, np.ones(len(K)))
    uy = np.unique(Y)
    boot = []
    for _ in range(R):
        drawn = rng.choice(uy, size=len(uy), replace=True)
        w = np.array([np.sum(drawn == yy) for yy in Y], dtype=float)
        boot.append(skill(F, K, M, w)[3])
    leads.append(
        {
            "probabilities": F.ravel().tolist(),
            "observed": K.tolist(),
            "rps": r,
            "rps_clim": c,
            "rpss": rpss,
            "rpss_d": rpssd,
            "low": float(np.percentile(boot, 5)),
            "high": float(np.percentile(boot, 95)),
        }
    )

p = np.asarray(d["p"], dtype=float)
o = np.asarray(d["o"], dtype=float)
edges = np.asarray(d["edges"], dtype=float)
b = np.searchsorted(edges, p, side="right")  # bin k: edges[k-1] <= p < edges[k]
nb = len(edges) + 1
diffs = [[] for _ in range(nb)]
for _ in range(R):
    idx = rng.integers(0, len(p), size=len(p))
    ps = p[idx]
    os_ = (rng.random(len(p)) < ps).astype(float)
    bs = b[idx]
    for k in range(nb):
        sel = bs == k
        if sel.any():
            diffs[k].append(os_[sel].mean() - ps[sel].mean())
bins = []
for k in range(nb):
    sel = b == k
    if not sel.any():
        continue
    mean = p[sel].mean()
    bins.append(
        {
            "count": int(sel.sum()),
            "forecast_mean": float(mean),
            "observed_frequency": float(o[sel].mean()),
            "low": float(np.clip(mean + np.percentile(diffs[k], 5), 0, 1)),
            "high": float(np.clip(mean + np.percentile(diffs[k], 95), 0, 1)),
        }
    )
json.dump({"leads": leads, "bins": bins}, sys.stdout)
