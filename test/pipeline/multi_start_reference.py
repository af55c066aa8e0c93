"""Multi-start hindcast fixture and its reference box means, by xarray/numpy (independent of Forelight).

  multi_start_reference.py write OUT.nc
      One file holding 3 hindcast starts (2010/2011/2012-11-23) in cfgrib's layout of C3S-style hindcasts,
      t2m(number, time, step, latitude, longitude) with `time` = forecast_reference_time (CF 1.11 §4.4) and
      `step` the lead, `valid_time(time, step)`; the layout is common practice, no source.
  multi_start_reference.py boxmean FILE START_INDEX LAT LON_WEST LON_EAST
      JSON [[value per step] per member]: plain mean in K over the cells of latitude row LAT with
      LON_WEST <= lon <= LON_EAST (one row, so every cell weighs the same), of that start.
"""
import json
import sys

import numpy as np
import xarray as xr


def write(out):
    rng = np.random.default_rng(14)
    starts = np.array(["2010-11-23", "2011-11-23", "2012-11-23"], dtype="datetime64[ns]")
    steps = np.array([0, 6, 12, 18, 24, 30, 36, 42], dtype="timedelta64[h]").astype("timedelta64[ns]")
    lat = np.array([3.0, 2.0, 1.0, 0.0, -1.0])
    lon = np.array([-1.5, -0.5, 0.5, 1.5])
    shape = (2, starts.size, steps.size, lat.size, lon.size)
    t2m = (295.0 + 4.0 * rng.random(shape) + np.arange(starts.size)[None, :, None, None, None]).astype("float32")
    ds = xr.Dataset(
        {"t2m": (("number", "time", "step", "latitude", "longitude"), t2m, {"units": "K", "GRIB_stepType": "instant"})},
        coords={
            "number": ("number", np.array([0, 1]), {"standard_name": "realization"}),
            "time": ("time", starts, {"standard_name": "forecast_reference_time"}),
            "step": ("step", steps, {"standard_name": "forecast_period"}),
            "latitude": ("latitude", lat, {"units": "degrees_north", "standard_name": "latitude"}),
            "longitude": ("longitude", lon, {"units": "degrees_east", "standard_name": "longitude"}),
            "valid_time": (("time", "step"), starts[:, None] + steps[None, :], {"standard_name": "time"}),
        },
    )
    enc = {"time": {"units": "seconds since 1970-01-01", "calendar": "proleptic_gregorian"},
           "valid_time": {"units": "seconds since 1970-01-01", "calendar": "proleptic_gregorian"},
           "step": {"units": "hours", "dtype": "float64"}}
    ds.to_netcdf(out, encoding=enc)


def boxmean(path, k, lat, west, east):
    with xr.open_dataset(path) as ds:
        row = ds.t2m.isel(time=int(k)).sel(latitude=float(lat))
        row = row.where((row.longitude >= float(west)) & (row.longitude <= float(east)), drop=True)
        means = row.astype("float64").mean("longitude").transpose("number", "step").values
    print(json.dumps(means.tolist()))


if __name__ == "__main__":
    {"write": write, "boxmean": boxmean}[sys.argv[1]](*sys.argv[2:])
