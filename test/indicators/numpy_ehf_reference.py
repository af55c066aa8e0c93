#!/usr/bin/python3
"""Independent numpy computation of the Excess Heat Factor (Nairn & Fawcett 2015), T95 (numpy.percentile,
method 'linear' = Hyndman & Fan 1996 type 7), hot-day runs and heat load, for series.test.ts.

Usage: /usr/bin/python3 test/indicators/numpy_ehf_reference.py INPUT.json  > OUTPUT.json
INPUT: {"tmax": [[member0 days...], ...], "tmin": [...], "antecedent_dmt": [30 values] | [],
        "climatology_dmt": [...], "tmax_antecedent": [...], "threshold": [per antecedent+forecast day],
        "load_window": int, "clim_tmax": [...], "clim_tmin": [...]}
Output values are null where undefined.
"""
import json
import sys

import numpy as np
from numpy.lib.stride_tricks import sliding_window_view


def ehf(tmax, tmin, antecedent, t95):
    members, steps = tmax.shape
    dmt = (tmax[:, :-1] + tmin[:, 1:]) / 2.0  # Tmax of day i with Tmin of the next morning
    a = len(antecedent)
    ext = np.concatenate([np.tile(antecedent, (members, 1)), dmt], axis=1)
    t3 = sliding_window_view(ext, 3, axis=1).mean(axis=2)  # t3[:, j] = mean(ext[:, j:j+3])
    csum = np.concatenate([np.zeros((members, 1)), np.cumsum(ext, axis=1)], axis=1)
    out = np.full((members, steps), np.nan)
    for i in range(steps - 3):
        j = a + i
        lo = max(0, j - 30)
        sig = t3[:, j] - t95
        if j == lo:
            out[:, i] = sig  # no prior day at all: acclimatisation factor 1
        else:
            t30 = (csum[:, j] - csum[:, lo]) / (j - lo)
            out[:, i] = sig * np.maximum(1.0, t3[:, j] - t30)
    return out


def runs_and_load(tmax, antecedent, threshold, window):
    members, steps = tmax.shape
    a = len(antecedent)
    ext = np.concatenate([np.tile(antecedent, (members, 1)), tmax], axis=1)
    above = ext > threshold[None, :]
    idx = np.arange(a + steps)
    last_cool = np.maximum.accumulate(np.where(above, -1, idx), axis=1)
    run = idx[None, :] - last_cool
    excess = np.maximum(0.0, ext - threshold[None, :])
    sums = sliding_window_view(excess, window, axis=1).sum(axis=2)  # sums[:, k] covers k..k+window-1
    load = np.full(ext.shape, np.nan)
    load[:, window - 1:] = sums
    return run[:, a:], load[:, a:]


def ehf_climatology(tmax, tmin):
    """T95 of all DMT and EHF85 of the positive EHF on days with a full 30-day T30."""
    t95 = float(np.percentile((tmax[:-1] + tmin[1:]) / 2.0, 95))
    e = ehf(tmax[None, :], tmin[None, :], np.zeros(0), t95)[0, 30:]
    positive = e[e > 0]
    return t95, float(np.percentile(positive, 85))


def to_json(x):
    return [[None if np.isnan(v) else float(v) for v in row] for row in x]


def main():
    with open(sys.argv[1]) as f:
        d = json.load(f)
    tmax = np.array(d["tmax"], dtype=float)
    tmin = np.array(d["tmin"], dtype=float)
    t95 = float(np.percentile(np.array(d["climatology_dmt"], dtype=float), 95))
    run, load = runs_and_load(tmax, np.array(d["tmax_antecedent"], dtype=float),
                              np.array(d["threshold"], dtype=float), int(d["load_window"]))
    clim_t95, clim_ehf85 = ehf_climatology(np.array(d["clim_tmax"], dtype=float), np.array(d["clim_tmin"], dtype=float))
    json.dump({
        "t95": t95,
        "clim_t95": clim_t95,
        "clim_ehf85": clim_ehf85,
        "ehf": to_json(ehf(tmax, tmin, np.array(d["antecedent_dmt"], dtype=float), t95)),
        "ehf_no_antecedent": to_json(ehf(tmax, tmin, np.zeros(0), t95)),
        "run": to_json(run.astype(float)),
        "load": to_json(load),
    }, sys.stdout)


if __name__ == "__main__":
    main()
