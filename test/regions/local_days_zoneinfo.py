"""Local days of a step series in an IANA zone with Python's zoneinfo (PEP 615, tz database) — the reference for
Forelight's planLocalDays. stdin: {"zone", "start_ms", "end_ms" (step intervals, ms since 1970 UTC)};
stdout: {"days": [ISO dates kept], "day_of_step": [index into days or -1]}.
Rules (Forelight's, documented in src/read/daily.ts): a step belongs to the local date of its interval midpoint;
a day is kept when its steps' lengths add up to min(24 h, the day's real length).
"""
import json
import sys
from datetime import date, datetime, time, timedelta, timezone
from zoneinfo import ZoneInfo

req = json.load(sys.stdin)
zone = ZoneInfo(req["zone"])
starts, ends = req["start_ms"], req["end_ms"]
spacing = sorted(e - s for s, e in zip(starts, ends))[len(starts) // 2] or sorted(b - a for a, b in zip(starts, starts[1:]))[len(starts) // 2]


def day_start_ms(d):
    return datetime.combine(d, time(0), tzinfo=zone).timestamp() * 1000  # fold=0: a skipped midnight maps to the change


coverage = {}
day_of = []
for s, e in zip(starts, ends):
    mid = (s + e) / 2
    d = datetime.fromtimestamp(mid / 1000, tz=timezone.utc).astimezone(zone).date()
    length = (e - s) if e > s else spacing
    coverage[d] = coverage.get(d, 0) + length
    day_of.append(d)
kept = sorted(d for d, ms in coverage.items() if ms >= min(86400000, day_start_ms(d + timedelta(days=1)) - day_start_ms(d)) - 1000)
index = {d: k for k, d in enumerate(kept)}
json.dump({"days": [d.isoformat() for d in kept], "day_of_step": [index.get(d, -1) for d in day_of]}, sys.stdout)
