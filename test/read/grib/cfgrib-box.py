"""Reference box means of a GRIB file read by python3-cfgrib + xarray (independent of Forelight and of
grib_to_netcdf): cells whose centre lies in the box (edges inclusive, longitudes modulo 360), weighted by
cos(latitude) (exactly proportional to the cell area on an evenly spaced grid). Optional daily reduction per
cell over UTC days before the box mean. Prints JSON {"times": [...], "members": [[...]...]} in the file's units.

usage: cfgrib-box.py FILE VAR S N W E [max|min|mean|period-max|accum-sum]
  max|min|mean  instantaneous values, each on the day of its valid time
  period-max    values over the period (previous step, step] (GRIB stepType max), each on the day of its period's
                midpoint, the day's maximum
  accum-sum     accumulations since the reference time (stepType accum): differenced step by step (zero at the
                reference time), each on the day of its period's midpoint, the day's sum
"""
import json
import sys

import numpy as np
import xarray as xr

path, var = sys.argv[1], sys.argv[2]
s, n, w, e = map(float, sys.argv[3:7])
daily = sys.argv[7] if len(sys.argv) > 7 else None
ds = xr.open_dataset(path, engine='cfgrib', backend_kwargs={'indexpath': '', 'filter_by_keys': {'cfVarName': var}})
da = ds[var]
if 'number' not in da.dims:
    da = da.expand_dims('number')
if daily in ('period-max', 'accum-sum'):
    ends = ds['step'].values.astype('timedelta64[s]').astype('int64')
    previous = np.concatenate(([0], ends[:-1]))
    if daily == 'accum-sum':
        da = xr.concat([da.isel(step=[0]), da.diff('step', label='upper')], 'step')
    middle = ds['time'].values + ((previous + ends) // 2).astype('timedelta64[s]')
    da = da.assign_coords(step=middle).rename(step='vt')
    daily = 'max' if daily == 'period-max' else 'sum'
elif 'step' in da.dims:
    da = da.assign_coords(step=ds['valid_time'].values).rename(step='vt')
else:  # a single step: cfgrib gives it as a scalar
    da = da.drop_vars(['step', 'time', 'valid_time'], errors='ignore').expand_dims(vt=[ds['valid_time'].values])
lon = da['longitude'].values % 360
span = (e - w) % 360
inlon = ((lon - w) % 360) <= span + 1e-6
lat = da['latitude'].values
inlat = (lat >= s - 1e-6) & (lat <= n + 1e-6)
box = da.isel(latitude=np.where(inlat)[0], longitude=np.where(inlon)[0]).astype('float64')
if daily:
    box = getattr(box.resample(vt='1D'), daily)()
weights = np.cos(np.deg2rad(box['latitude']))
means = box.weighted(weights).mean(('latitude', 'longitude'))
times = [str(t)[:19] for t in means['vt'].values]
print(json.dumps({'times': times, 'members': means.transpose('number', 'vt').values.tolist()}))
