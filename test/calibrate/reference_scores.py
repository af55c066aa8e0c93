#!/usr/bin/python3
"""Independent reference for the verification scores in src/calibrate/verify.ts (numpy + scipy, Debian).

Reads JSON from stdin: {"p": [...], "o": [...], "thresholds": [...], "alphas": [...], "percentile_samples": [[...]],
"qs": [...]} and writes JSON with BS, BSS (sample climatology), AUC (scipy.stats.mannwhitneyu U / (n1 n0)),
hit and false-alarm rates for "warn if p >= t", relative economic value (Richardson 2000) for each (t, alpha),
and numpy.percentile(method='linear') of each sample at each q.
Run by test/calibrate/reference-python.test.ts as: /usr/bin/python3 test/calibrate/reference_scores.py < input.json
"""
import json
import sys

import numpy as np
from scipy.stats import mannwhitneyu

d = json.load(sys.stdin)
p = np.asarray(d["p"], dtype=float)
o = np.asarray(d["o"], dtype=int)
s = o.mean()
bs = float(np.mean((p - o) ** 2))
bss = 1.0 - bs / (s * (1.0 - s))
u = mannwhitneyu(p[o == 1], p[o == 0], alternative="two-sided").statistic
auc = float(u) / (np.sum(o == 1) * np.sum(o == 0))
rates = []
for t in d["thresholds"]:
    warn = p >= t
    a = np.sum(warn & (o == 1)); b = np.sum(warn & (o == 0))
    c = np.sum(~warn & (o == 1)); dd = np.sum(~warn & (o == 0))
    h = a / (a + c); f = b / (b + dd)
    rev = []
    for al in d["alphas"]:
        e_clim = min(al, s); e_perf = s * al; e_fc = f * al * (1 - s) - h * s * (1 - al) + s
        rev.append(float((e_clim - e_fc) / (e_clim - e_perf)))
    rates.append({"t": t, "H": float(h), "F": float(f), "rev": rev})
pct = [[float(np.percentile(np.asarray(x, dtype=float), q, method="linear")) for q in d["qs"]] for x in d["percentile_samples"]]
json.dump({"bs": bs, "bss": float(bss), "auc": auc, "rates": rates, "percentiles": pct}, sys.stdout)
