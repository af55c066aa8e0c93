"""Hindcast files holding several starts, and their reference box means, by xarray/numpy (independent of Forelight).

  multi_start_layouts.py cfgrib OUT.nc
      One file of 3 starts (2010/2011/2012-11-23) in cfgrib's layout of C3S-style hindcasts:
      t2m(number, time, step, latitude, longitude), `time` = forecast_reference_time (CF 1.11 §4.4), `step` the lead
      in hours (6-hourly instantaneous values, 14 days), `valid_time(time, step)`; 2 members. Layout: common
      practice, no source.
  multi_start_layouts.py parts DIR
      DIR/part_K.nc for the same 3 starts, one start per file: t2m(member, lead, lat, lon) daily means (cell_methods
      time: mean, lead in days with bounds [k, k+1], CF 1.11 §4.4 forecast_period and §7.1 bounds) and a scalar
      forecast_reference_time; NCO then stacks them along a reference-time dimension `init` (see the test).
  multi_start_layouts.py daily FILE START_INDEX LAT LON_WEST LON_EAST
      JSON [[mean per day] per member] in K over the cells of latitude row LAT with LON_WEST <= lon <= LON_EAST
      (one row, so every cell weighs the same) of that start: a day is the mean of its 00/06/12/18 UTC values for
      the cfgrib file, the value at lead day k for a file with a `lead` axis. Works on any dimension order.
"""
import json
import sys

import numpy as np
import xarray as xr

STARTS = np.array(["2010-11-23", "2011-11-23", "2012-11-23"], dtype="datetime64[ns]")
LAT = np.array([3.0, 2.0, 1.0, 0.0, -1.0])
LON = np.array([-1.5, -0.5, 0.5, 1.5])
DAYS = 14


def cfgrib(out):
    rng = np.random.default_rng(141)
    steps = (np.arange(DAYS * 4) * 6).astype("timedelta64[h]").astype("timedelta64[ns]")
    shape = (2, STARTS.size, steps.size, LAT.size, LON.size)
    t2m = (293.0 + 8.0 * rng.random(shape) + 2.0 * np.arange(STARTS.size)[None, :, None, None, None]).astype("float32")
    ds = xr.Dataset(
        {"t2m": (("number", "time", "step", "latitude", "longitude"), t2m, {"units": "K", "GRIB_stepType": "instant"})},
        coords={
            "number": ("number", np.array([0, 1]), {"standard_name": "realization"}),
            "time": ("time", STARTS, {"standard_name": "forecast_reference_time"}),
            "step": ("step", steps, {"standard_name": "forecast_period"}),
            "latitude": ("latitude", LAT, {"units": "degrees_north", "standard_name": "latitude"}),
            "longitude": ("longitude", LON, {"units": "degrees_east", "standard_name": "longitude"}),
            "valid_time": (("time", "step"), STARTS[:, None] + steps[None, :], {"standard_name": "time"}),
        },
    )
    enc = {"time": {"units": "seconds since 1970-01-01", "calendar": "proleptic_gregorian"},
           "valid_time": {"units": "seconds since 1970-01-01", "calendar": "proleptic_gregorian"},
           "step": {"units": "hours", "dtype": "float64"}}
    ds.to_netcdf(out, encoding=enc)


def parts(folder):
    rng = np.random.default_rng(142)
    lead = np.arange(DAYS, dtype="float64")
    for k, start in enumerate(STARTS):
        t2m = (294.0 + 6.0 * rng.random((2, DAYS, LAT.size, LON.size)) + k).astype("float32")
        ds = xr.Dataset(
            {
                "t2m": (("member", "lead", "lat", "lon"), t2m, {"units": "K", "cell_methods": "lead: mean"}),
                "lead_bnds": (("lead", "bnds"), np.stack([lead, lead + 1.0], axis=1)),
            },
            coords={
                "member": ("member", np.array([1, 2], dtype="int32"), {"standard_name": "realization"}),
                "lead": ("lead", lead, {"units": "days", "standard_name": "forecast_period", "bounds": "lead_bnds"}),
                "lat": ("lat", LAT, {"units": "degrees_north", "standard_name": "latitude"}),
                "lon": ("lon", LON, {"units": "degrees_east", "standard_name": "longitude"}),
                "forecast_reference_time": ((), start, {"standard_name": "forecast_reference_time"}),
            },
        )
        enc = {"forecast_reference_time": {"units": "days since 2000-01-01", "calendar": "standard", "dtype": "float64"}}
        ds.to_netcdf(f"{folder}/part_{k}.nc", encoding=enc)


def daily(path, k, lat, west, east):
    with xr.open_dataset(path, decode_timedelta=False) as ds:
        ref = next(n for n in ds.variables if ds[n].attrs.get("standard_name") == "forecast_reference_time")
        v = ds.t2m.isel({ds[ref].dims[0]: int(k)})
        lat_name = "latitude" if "latitude" in v.dims else "lat"
        lon_name = "longitude" if "longitude" in v.dims else "lon"
        row = v.sel({lat_name: float(lat)})
        row = row.where((row[lon_name] >= float(west)) & (row[lon_name] <= float(east)), drop=True).astype("float64").mean(lon_name)
        member = "number" if "number" in row.dims else "member"
        if "step" in row.dims:
            values = row.transpose(member, "step").values
            means = values.reshape(values.shape[0], -1, 4).mean(axis=2)
        else:
            means = row.transpose(member, "lead").values
    print(json.dumps(means.tolist()))


if __name__ == "__main__":
    {"cfgrib": cfgrib, "parts": parts, "daily": daily}[sys.argv[1]](*sys.argv[2:])
