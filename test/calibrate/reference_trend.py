#!/usr/bin/python3
"""Independent reference for the trend-aware climate (src/calibrate/trend-climate.ts), numpy only (Debian).

Reads JSON from stdin: {"years": [...] (one per entry), "values": [[[...]]] (entry x member x lead, null =
missing), "target": issue year, "q": percentile}. Per lead, numpy.polyfit(year, value, 1) over every valid
(entry year, member value) pair gives the slope b; the values moved to the target year are x + b (target - year).
Writes {"slope": [b per lead], "threshold": [numpy.percentile(method='linear') of the moved values per lead],
"loyo": [[per held-out year: polyfit without that year, the other years moved to it,
numpy.percentile(method='weibull')] per lead]}.
Run by test/calibrate/trend-climate.test.ts as: /usr/bin/python3 test/calibrate/reference_trend.py < input.json
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
years = np.asarray(d["years"], dtype=float)
values = np.asarray([[[np.nan if v is None else v for v in member] for member in entry] for entry in d["values"]], dtype=float)
target = float(d["target"])
q = float(d["q"])
n_entries, n_members, n_leads = values.shape
year_of = np.repeat(years, n_members).reshape(n_entries, n_members)


def moved(lead, keep, to):
    x = year_of[keep].ravel()
    y = values[keep, :, lead].ravel()
    ok = ~np.isnan(y)
    slope = np.polyfit(x[ok], y[ok], 1)[0]
    shifted = y[ok] + slope * (to - x[ok])
    return slope, shifted


slopes, thresholds, loyo = [], [], []
for lead in range(n_leads):
    everything = np.ones(n_entries, dtype=bool)
    slope, shifted = moved(lead, everything, target)
    slopes.append(float(slope))
    thresholds.append(float(np.percentile(shifted, q, method="linear")))
    per_year = []
    for year in years:
        _, others = moved(lead, years != year, year)
        per_year.append(float(np.percentile(others, q, method="weibull")))
    loyo.append(per_year)
json.dump({"slope": slopes, "threshold": thresholds, "loyo": loyo}, sys.stdout)
