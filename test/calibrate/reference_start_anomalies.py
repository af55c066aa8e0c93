#!/usr/bin/python3
"""Independent reference for start-anomaly pooling (src/calibrate/start-anomalies.ts), numpy only (Debian).

Reads JSON from stdin: {"offsets": [...] (days from the forecast's lead day 1 to each entry's, one per entry),
"values": [[[...]]] (entry x member x lead, null = missing), "q": percentile}. Per start (entries sharing an
offset) and lead, the start's climate is the mean over its entries and members; per lead numpy.polyfit(offsets,
climates, 1) gives the line whose value at offset 0 is the forecast start's climate; every value is moved by
(that value - its start's climate). Writes {"pooled": [numpy.percentile(method='linear') of the moved values per
lead], "raw": [the same of the values as given]}.
Run by test/calibrate/start-anomalies.test.ts as: /usr/bin/python3 test/calibrate/reference_start_anomalies.py < input.json
"""
import json
import sys

import numpy as np

d = json.load(sys.stdin)
offsets = np.asarray(d["offsets"], dtype=float)
values = np.asarray([[[np.nan if v is None else v for v in member] for member in entry] for entry in d["values"]], dtype=float)
q = float(d["q"])
starts = np.unique(offsets)
n_leads = values.shape[2]
moved = values.copy()
for lead in range(n_leads):
    climates = np.array([np.nanmean(values[offsets == s, :, lead]) for s in starts])
    slope, intercept = np.polyfit(starts, climates, 1)
    for s, c in zip(starts, climates):
        moved[offsets == s, :, lead] += intercept - c
pooled = [float(np.percentile(moved[:, :, lead][~np.isnan(moved[:, :, lead])], q, method="linear")) for lead in range(n_leads)]
raw = [float(np.percentile(values[:, :, lead][~np.isnan(values[:, :, lead])], q, method="linear")) for lead in range(n_leads)]
json.dump({"pooled": pooled, "raw": raw}, sys.stdout)
