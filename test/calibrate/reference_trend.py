#!/usr/bin/python3
"""Independent reference for the trend-aware climate (src/calibrate/trend-climate.ts), numpy and scipy (Debian).

Reads JSON from stdin: {"years": [...] (one per entry), "values": [[[...]]] (entry x member x lead, null =
missing), "target": issue year, "q": percentile}. Per lead, numpy.polyfit(year, value, 1) over every valid
(entry year, member value) pair gives the slope b; the values moved to the target year are x + b (target - year).
Writes {"slope": b, "threshold": [numpy.percentile(method='linear') of the moved values per lead],
"loyo": [[per held-out year: lstsq without that year, the other years moved to it,
numpy.percentile(method='weibull')] per lead],
"stderr": scipy.stats.linregress(year, year mean of value - its lead's mean).stderr, "t90": scipy.stats.t.ppf(0.95,
n_years - 2), "loyoStderr" and "loyoSlope": the same per held-out year}.
Run by test/calibrate/trend-climate.test.ts as: /usr/bin/python3 test/calibrate/reference_trend.py < input.json
"""
import json
import sys

import numpy as np
from scipy import stats

d = json.load(sys.stdin)
years = np.asarray(d["years"], dtype=float)
values = np.asarray([[[np.nan if v is None else v for v in member] for member in entry] for entry in d["values"]], dtype=float)
target = float(d["target"])
q = float(d["q"])
n_entries, n_members, n_leads = values.shape
year_of = np.repeat(years, n_members).reshape(n_entries, n_members)


def slope_of(keep):
    rows, ys = [], []
    for lead in range(n_leads):
        x = year_of[keep].ravel()
        y = values[keep, :, lead].ravel()
        ok = ~np.isnan(y)
        for year, v in zip(x[ok], y[ok]):
            row = np.zeros(n_leads + 1)
            row[lead] = 1.0
            row[n_leads] = year
            rows.append(row)
            ys.append(v)
    coef = np.linalg.lstsq(np.asarray(rows), np.asarray(ys), rcond=None)[0]
    return coef[n_leads]


def moved(lead, keep, to, slope):
    x = year_of[keep].ravel()
    y = values[keep, :, lead].ravel()
    ok = ~np.isnan(y)
    return y[ok] + slope * (to - x[ok])


everything = np.ones(n_entries, dtype=bool)
slope = slope_of(everything)
without = {year: slope_of(years != year) for year in years}
thresholds = [float(np.percentile(moved(lead, everything, target, slope), q, method="linear")) for lead in range(n_leads)]
loyo = [
    [float(np.percentile(moved(lead, years != year, year, without[year]), q, method="weibull")) for year in years]
    for lead in range(n_leads)
]


def stderr_of(keep):
    kept = values[keep]
    anomalies = kept - np.nanmean(kept, axis=(0, 1))[None, None, :]
    return float(stats.linregress(years[keep], np.nanmean(anomalies, axis=(1, 2))).stderr)


json.dump(
    {
        "slope": float(slope),
        "threshold": thresholds,
        "loyo": loyo,
        "stderr": stderr_of(everything),
        "t90": float(stats.t.ppf(0.95, n_entries - 2)),
        "t90loyo": float(stats.t.ppf(0.95, n_entries - 3)),
        "loyoStderr": [stderr_of(years != year) for year in years],
        "loyoSlope": [float(without[year]) for year in years],
    },
    sys.stdout,
)
