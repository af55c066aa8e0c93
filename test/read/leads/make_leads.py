"""Writes cfgrib/xarray-style lead layouts with python3-xarray and prints numpy's daily box means (JSON).

Layouts: `step` with a scalar forecast_reference_time `time` and `valid_time(step)` (as cfgrib writes them);
the same with `valid_time(time, step)` 2-D and a size-1 `time` dimension; `lead_time` with the reference only as a
global ISO attribute. Expected values: cells whose centre lies in the box, weighted by the exact cell area
(sin(lat_n) - sin(lat_s)), daily mean of the 6-hourly samples 00..18 UTC of each day.
"""
import json, sys
import numpy as np, pandas as pd, xarray as xr

out = sys.argv[1]
lat = np.arange(-15, -2.9, 1.5); lon = np.arange(0, 360, 1.5)
steps = pd.to_timedelta(np.arange(0, 78, 6), unit='h'); ref = np.datetime64('2026-11-23T00:00')
data = (280 + np.random.default_rng(1).random((2, len(steps), len(lat), len(lon))) * 10).astype('f4')
ds = xr.Dataset({'t2m': (('number', 'step', 'latitude', 'longitude'), data, {'units': 'K'})},
                coords={'number': [0, 1], 'step': steps, 'latitude': lat, 'longitude': lon, 'time': ref,
                        'valid_time': ('step', ref + steps.values)})
ds.time.attrs['standard_name'] = 'forecast_reference_time'; ds.step.attrs['standard_name'] = 'forecast_period'
ds.to_netcdf(f'{out}/step.nc')
d2 = ds.expand_dims('time').assign_coords(valid_time=(('time', 'step'), (ref + steps.values)[None, :]))
d2.to_netcdf(f'{out}/valid2d.nc')
d3 = xr.Dataset({'t2m': (('number', 'lead_time', 'latitude', 'longitude'), data, {'units': 'K'})},
                coords={'number': [0, 1], 'lead_time': ('lead_time', np.arange(0, 78, 6), {'units': 'hours'}),
                        'latitude': lat, 'longitude': lon})
d3.attrs['forecast_reference_time'] = '2026-11-23T00:00:00Z'
d3.to_netcdf(f'{out}/leadattr.nc')
lonw = np.where(lon > 180, lon - 360, lon)
iy = (lat >= -12) & (lat <= -9); ix = (lonw >= -3.5) & (lonw <= -0.5)
w = (np.sin(np.radians(lat + 0.75)) - np.sin(np.radians(lat - 0.75)))[iy]
box = data[:, :, iy][:, :, :, ix].astype('f8')
means = (box * w[None, None, :, None]).sum(axis=(2, 3)) / (w.sum() * ix.sum())
print(json.dumps([[float(means[m, 4 * d:4 * d + 4].mean()) for d in range(3)] for m in range(2)]))
