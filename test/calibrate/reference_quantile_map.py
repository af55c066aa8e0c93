"""Independent reference for empirical quantile mapping of an absolute threshold (Deque 2007, Global and Planetary
Change 57:16-26): percent rank of the value in the observations (numpy.interp on the sorted sample against plotting
positions k/(n-1), the inverse of numpy's default 'linear' percentile), then numpy.percentile of the model sample at
that percent. Also the leave-one-year-out variant (year y left out of both samples).
stdin JSON {obs: [[year, value]...], model: [[year, value]...], thresholds: [...]}
stdout JSON {all: [mapped...], loyo: {year: [mapped...]}}"""
import json
import sys

import numpy as np


def mapped(obs, mod, x):
    o = np.sort(np.asarray(obs, dtype=float))
    if x < o[0] or x > o[-1]:
        pct = 0.0 if x < o[0] else 100.0
    else:
        pct = float(np.interp(x, o, np.linspace(0.0, 100.0, o.size)))
    return float(np.percentile(np.asarray(mod, dtype=float), pct))


def main():
    d = json.load(sys.stdin)
    obs = np.asarray(d["obs"], dtype=float)
    mod = np.asarray(d["model"], dtype=float)
    out = {"all": [mapped(obs[:, 1], mod[:, 1], x) for x in d["thresholds"]], "loyo": {}}
    for year in np.unique(obs[:, 0]):
        o = obs[obs[:, 0] != year, 1]
        m = mod[mod[:, 0] != year, 1]
        out["loyo"][str(int(year))] = [mapped(o, m, x) for x in d["thresholds"]]
    json.dump(out, sys.stdout)


main()
