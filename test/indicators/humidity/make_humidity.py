"""Writes daily ensemble files holding humidity as portals deliver it, with python3-xarray, and prints numpy's
reference values (JSON): region daily means, the dewpoint derived from them, and the humidex of that dewpoint.

Files: `qp.nc` 2 m specific humidity q2m [kg kg-1] with surface pressure sp [Pa]; `qp-g-hpa.nc` the same values
in g kg-1 and hPa; `rh.nc` relative humidity hurs [%] with the daily mean temperature tas. All with tasmax [K],
daily values stamped at noon with one-day time_bnds (CF 1.11 §7.1) and cell_methods (§7.3).
Region mean: cells whose centre lies in the box, weighted by the exact cell area sin(lat_n) - sin(lat_s).
Formulas, written here independently of Forelight:
  e = q p / (eps + (1 - eps) q), eps = 0.62198 (WMO-No. 8 Annex 4.B mixing ratio and specific humidity)
  Td = b g / (a - g), g = ln(e / c); from RH: g = ln(RH/100) + a T / (b + T)  (Alduchov & Eskridge 1996, eq. 21:
  c = 6.1094 hPa, a = 17.625, b = 243.04 degC)
  humidex H = T + 0.5555 (6.11 exp(5417.7530 (1/273.16 - 1/(273.15 + Td))) - 10)  (Masterton & Richardson 1979)
"""
import json, sys
import numpy as np, pandas as pd, xarray as xr

out = sys.argv[1]
rng = np.random.default_rng(14)
lat = np.arange(-15, -2.9, 1.5); lon = np.arange(0, 360, 1.5)
days = pd.date_range('2026-11-23T12:00', periods=3, freq='D')
bnds = np.stack([days - pd.Timedelta('12h'), days + pd.Timedelta('12h')], axis=1)
shape = (2, len(days), len(lat), len(lon))
tasmax = (298 + rng.random(shape) * 12).astype('f4')
tas = (tasmax - 4 - rng.random(shape) * 3).astype('f4')
q = (0.008 + rng.random(shape) * 0.014).astype('f4')
sp = (88000 + rng.random(shape) * 14000).astype('f4')
hurs = (35 + rng.random(shape) * 60).astype('f4')
dims = ('number', 'time', 'latitude', 'longitude')

def write(name, variables):
    ds = xr.Dataset(
        {k: (dims, v, {'units': u, 'cell_methods': m}) for k, (v, u, m) in variables.items()},
        coords={'number': [0, 1], 'time': ('time', days, {'bounds': 'time_bnds'}), 'latitude': lat, 'longitude': lon},
    )
    ds['time_bnds'] = (('time', 'bnds'), bnds)
    ds.time.encoding['units'] = 'hours since 2026-11-23 00:00:00'
    ds.time_bnds.encoding['units'] = 'hours since 2026-11-23 00:00:00'
    ds.to_netcdf(f'{out}/{name}')

TX = (tasmax, 'K', 'time: maximum')
write('qp.nc', {'tasmax': TX, 'q2m': (q, 'kg kg-1', 'time: mean'), 'sp': (sp, 'Pa', 'time: mean')})
write('qp-g-hpa.nc', {'tasmax': TX, 'q2m': (q * np.float32(1000), 'g kg-1', 'time: mean'), 'sp': (sp / np.float32(100), 'hPa', 'time: mean')})
write('rh.nc', {'tasmax': TX, 'tas': (tas, 'K', 'time: mean'), 'hurs': (hurs, '%', 'time: mean')})

lonw = np.where(lon > 180, lon - 360, lon)
iy = (lat >= -12) & (lat <= -9); ix = (lonw >= -3.5) & (lonw <= -0.5)
w = (np.sin(np.radians(lat + 0.75)) - np.sin(np.radians(lat - 0.75)))[iy]
def box(v):
    b = v[:, :, iy][:, :, :, ix].astype('f8')
    return (b * w[None, None, :, None]).sum(axis=(2, 3)) / (w.sum() * ix.sum())

A, B, C, EPS = 17.625, 243.04, 6.1094, 0.62198
tx = box(tasmax) - 273.15
qm, pm = box(q), box(sp) / 100
e = qm * pm / (EPS + (1 - EPS) * qm)
g = np.log(e / C)
td_qp = B * g / (A - g)
tm, rhm = box(tas) - 273.15, box(hurs)
g = np.log(rhm / 100) + A * tm / (B + tm)
td_rh = B * g / (A - g)
humidex = lambda t, td: t + 0.5555 * (6.11 * np.exp(5417.7530 * (1 / 273.16 - 1 / (273.15 + td))) - 10)
print(json.dumps({'tdQp': td_qp.tolist(), 'humidexQp': humidex(tx, td_qp).tolist(),
                  'tdRh': td_rh.tolist(), 'humidexRh': humidex(tx, td_rh).tolist()}))
