"""Writes seasonal monthly-mean files whose time axis is a lead in MONTHS, with python3-xarray, and prints numpy's
expectations (JSON): month labels and box means per member and month.

Layouts: `forecastMonth` 1..6 beside a size-1 `forecast_reference_time` dimension, as the Copernicus C3S seasonal
monthly products are laid out (no units, month 1 = the month of the start); `leadtime` in months 0.5..5.5 (mid-month,
as the NMME archive writes its lead) after a 360_day forecast_reference_time; `leadtime` in whole months 1..6
with the reference only as a global ISO 8601 attribute (each lead closing its month). Box means: cells whose centre
lies in the box, weighted by the exact cell area (sin(lat_n) - sin(lat_s)).
"""
import json, sys
import numpy as np, xarray as xr

out = sys.argv[1]
lat = np.arange(-15, -2.9, 1.5); lon = np.arange(0, 360, 1.5)
rng = np.random.default_rng(7)
t2m = (285 + rng.random((3, 6, len(lat), len(lon))) * 15).astype('f4')
rate = (rng.random((3, 6, len(lat), len(lon))) * 1e-7).astype('f4')  # m s-1 (0..8.6 mm/day)
space = ('latitude', 'longitude')

c3s = xr.Dataset(
    {'t2m': (('number', 'forecast_reference_time', 'forecastMonth') + space, t2m[:, None], {'units': 'K'}),
     'tprate': (('number', 'forecast_reference_time', 'forecastMonth') + space, rate[:, None], {'units': 'm s**-1'})},
    coords={'number': [0, 1, 2], 'forecast_reference_time': [np.datetime64('2026-11-01T00:00', 'ns')],
            'forecastMonth': ('forecastMonth', np.arange(1, 7), {'long_name': 'forecastMonth'}),
            'latitude': lat, 'longitude': lon})
c3s.forecast_reference_time.attrs['standard_name'] = 'forecast_reference_time'
c3s.to_netcdf(f'{out}/c3s.nc')

mid = xr.Dataset(
    {'t2m': (('number', 'leadtime') + space, t2m, {'units': 'K'}),
     'tprate': (('number', 'leadtime') + space, rate, {'units': 'm s**-1'})},
    coords={'number': [0, 1, 2], 'leadtime': ('leadtime', np.arange(6) + 0.5, {'units': 'months'}),
            'latitude': lat, 'longitude': lon,
            'forecast_reference_time': ((), 0.0, {'units': 'days since 2026-12-01 00:00:00', 'calendar': '360_day',
                                                  'standard_name': 'forecast_reference_time'})})
mid.to_netcdf(f'{out}/leadtime-360.nc')

whole = mid.assign_coords(leadtime=('leadtime', np.arange(1, 7), {'units': 'months'})).drop_vars('forecast_reference_time')
whole.attrs['forecast_reference_time'] = '2027-01-01T00:00:00Z'
whole.to_netcdf(f'{out}/leadtime-whole.nc')

lonw = np.where(lon > 180, lon - 360, lon)
iy = (lat >= -12) & (lat <= -9); ix = (lonw >= -3.5) & (lonw <= -0.5)
w = (np.sin(np.radians(lat + 0.75)) - np.sin(np.radians(lat - 0.75)))[iy]

def box(a):
    b = a[:, :, iy][:, :, :, ix].astype('f8')
    return ((b * w[None, None, :, None]).sum(axis=(2, 3)) / (w.sum() * ix.sum())).tolist()

def months(year, month):
    return [f'{year + (month - 1 + k) // 12:04d}-{(month - 1 + k) % 12 + 1:02d}' for k in range(6)]

print(json.dumps({'t2m': box(t2m), 'rateMmDay': (np.array(box(rate)) * 86400 * 1000).tolist(),
                  'months': {'c3s.nc': months(2026, 11), 'leadtime-360.nc': months(2026, 12), 'leadtime-whole.nc': months(2027, 1)}}))
