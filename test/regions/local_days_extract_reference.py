"""End-to-end reference for `forelight extract --daily max --time-zone Europe/Lisbon`: writes with netCDF4-python an
hourly file (period-ending hours with time_bnds, 2026-03-27 to 2026-04-01 UTC, over Lisbon's spring change on
2026-03-29 01:00 UTC) on a 1° grid, and prints the daily maxima and means of the cell (38.5° N, 8.5° W) by local day in
Europe/Lisbon with Python's zoneinfo (PEP 615): an hour belongs to the local date of its midpoint; a day is kept
when its hours cover the day's real length (23 h on the change day). argv: output .nc path.
stdout: {"days": [ISO dates], "max_c": [daily max in degC], "mean_c": [daily mean in degC], "hours": [hours per day]}.
"""
import json
import sys
from datetime import datetime, timedelta, timezone
from zoneinfo import ZoneInfo

import netCDF4
import numpy as np

path = sys.argv[1]
zone = ZoneInfo("Europe/Lisbon")
hours = 5 * 24 + 7  # ends mid-day: the last local day is partial and must be left out
lat = np.arange(36.5, 41, 1.0)
lon = np.arange(-10.5, -6, 1.0)
t_end = np.arange(1, hours + 1, dtype=float)  # hours since 2026-03-27 00:00 UTC, period ending
rng = np.random.default_rng(20261203)
field = (285 + 8 * np.sin(2 * np.pi * (t_end - 15) / 24))[:, None, None] + rng.normal(0, 1.5, (hours, lat.size, lon.size))

with netCDF4.Dataset(path, "w", format="NETCDF3_CLASSIC") as nc:
    nc.createDimension("time", None)
    nc.createDimension("lat", lat.size)
    nc.createDimension("lon", lon.size)
    nc.createDimension("bnds", 2)
    v = nc.createVariable("time", "f8", ("time",)); v.units = "hours since 2026-03-27 00:00:00"; v.calendar = "standard"; v.standard_name = "time"; v.bounds = "time_bnds"; v[:] = t_end
    nc.createVariable("time_bnds", "f8", ("time", "bnds"))[:] = np.stack([t_end - 1, t_end], axis=1)
    v = nc.createVariable("lat", "f8", ("lat",)); v.units = "degrees_north"; v.standard_name = "latitude"; v[:] = lat
    v = nc.createVariable("lon", "f8", ("lon",)); v.units = "degrees_east"; v.standard_name = "longitude"; v[:] = lon
    v = nc.createVariable("tas", "f4", ("time", "lat", "lon")); v.units = "K"; v.standard_name = "air_temperature"; v.cell_methods = "time: mean"; v[:] = field

stored = np.asarray(netCDF4.Dataset(path).variables["tas"][:], dtype=float)[:, list(lat).index(38.5), list(lon).index(-8.5)]
t0 = datetime(2026, 3, 27, tzinfo=timezone.utc)
by_day = {}
for k, end in enumerate(t_end):
    mid = t0 + timedelta(hours=end - 0.5)
    by_day.setdefault(mid.astimezone(zone).date(), []).append(stored[k] - 273.15)


def day_hours(d):
    start = datetime(d.year, d.month, d.day, tzinfo=zone)
    nxt = start + timedelta(days=1)
    return round((nxt.astimezone(timezone.utc) - start.astimezone(timezone.utc)).total_seconds() / 3600)


kept = sorted(d for d, v in by_day.items() if len(v) == day_hours(d))
json.dump({"days": [d.isoformat() for d in kept], "max_c": [max(by_day[d]) for d in kept],
           "mean_c": [float(np.mean(by_day[d])) for d in kept], "hours": [len(by_day[d]) for d in kept]}, sys.stdout)
