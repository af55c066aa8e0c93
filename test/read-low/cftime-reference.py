"""Reference dates from cftime (Unidata) num2date for CF time decoding tests.

Usage: /usr/bin/python3 test/read-low/cftime-reference.py '[[values, units, calendar], ...]'
Prints JSON: one list of 'YYYY-MM-DDTHH:MM:SS[.ffffff]' strings per case (dates in the case's calendar).
"""
import json
import sys

import cftime

cases = json.loads(sys.argv[1])
out = []
for values, units, calendar in cases:
    dates = cftime.num2date(values, units, calendar=calendar)
    texts = []
    for d in dates:
        text = f"{d.year:04d}-{d.month:02d}-{d.day:02d}T{d.hour:02d}:{d.minute:02d}:{d.second:02d}"
        texts.append(text + (f".{d.microsecond:06d}" if d.microsecond else ""))
    out.append(texts)
print(json.dumps(out))
