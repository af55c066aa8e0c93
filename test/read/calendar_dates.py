"""Real dates of a model-calendar file's time steps, by the rule of src/read/coordinates-time.ts, computed
independently with cftime (through python3-netCDF4): the anchor (forecast_reference_time, else the first time)
keeps its date components, every other time is the anchor plus the elapsed model time (cftime date arithmetic).
Prints JSON: {"calendar": ..., "model": [ISO], "real": [ISO]}."""
import datetime
import json
import sys

import netCDF4

with netCDF4.Dataset(sys.argv[1]) as ds:
    time = ds.variables["time"]
    calendar = getattr(time, "calendar", "standard")
    model = netCDF4.num2date(time[:], time.units, calendar=calendar)
    if "forecast_reference_time" in ds.variables:
        ref = ds.variables["forecast_reference_time"]
        anchor = netCDF4.num2date(ref[...], ref.units, calendar=calendar)
    else:
        anchor = model[0]
    try:
        real_anchor = datetime.datetime(anchor.year, anchor.month, anchor.day, anchor.hour, anchor.minute, anchor.second)
    except ValueError:  # 29/30 February that the Gregorian calendar lacks: last day of that month
        last = (datetime.date(anchor.year, 3, 1) - datetime.timedelta(days=1)).day
        real_anchor = datetime.datetime(anchor.year, anchor.month, last, anchor.hour, anchor.minute, anchor.second)
    real = [real_anchor + (d - anchor) for d in model]
    print(json.dumps({
        "calendar": calendar,
        "model": [d.isoformat() for d in model],
        "real": [d.strftime("%Y-%m-%d") for d in real],
    }))
