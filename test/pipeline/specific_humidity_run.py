"""Specific humidity with surface pressure for a whole run, with python3-netCDF4/numpy and NCO.

`convert FILE...`: replaces each file's dewpoint `tdps` [K] by 2 m specific humidity `huss` [kg kg-1] and surface
pressure `ps` [Pa], as portals deliver humidity: ps = 101325 exp(-h / 8434.5) over an invented terrain h (0..1800 m,
isothermal scale height, common practice, no source), plus a small daily wave; q = eps e / (p - (1 - eps) e) with
e = 6.1094 exp(17.625 Td / (243.04 + Td)) (WMO-No. 8 Annex 4.B; Alduchov & Eskridge 1996 eq. 21). Then
`ncks -x -v tdps` removes the dewpoint, so nothing but q and p can give it.

`heat`: reads {"tmax", "q", "p"} region means (degC, kg/kg, hPa; [member][day]) on stdin and prints
{"td", "hi"}: the dewpoint of e = q p / (eps + (1 - eps) q) by the inverse Magnus form (Alduchov & Eskridge 1996),
and the NWS Heat Index of the WPC algorithm page "The Heat Index Equation" (Rothfusz 1990 regression with the NWS
adjustments, Steadman's simple formula below 80 F), capped at the NWS chart's 137 F; RH from the same Magnus form.
"""
import json, subprocess, sys
import numpy as np

EPS, C, A, B = 0.62198, 6.1094, 17.625, 243.04


def convert(path):
    import netCDF4
    with netCDF4.Dataset(path, 'a') as ds:
        td = ds.variables['tdps'][:].astype('f8') - 273.15  # (time, number, lat, lon)
        lat, lon = ds.variables['lat'][:], ds.variables['lon'][:]
        h = 900 * (1 + np.sin(np.radians(12 * (lat[:, None] + 16))) * np.cos(np.radians(9 * (lon[None, :] + 6))))
        day = np.arange(td.shape[0])[:, None, None, None]
        p = 101325 * np.exp(-h[None, None] / 8434.5) + 150 * np.sin(0.9 * day)
        e = C * np.exp(A * td / (B + td))
        q = EPS * e / (p / 100 - (1 - EPS) * e)
        dims = ds.variables['tdps'].dimensions
        for name, values, units, long in (('huss', q, 'kg kg-1', 'Near-surface specific humidity'),
                                          ('ps', p, 'Pa', 'Surface air pressure')):
            v = ds.createVariable(name, 'f4', dims, fill_value=np.float32(1e20))
            v.units, v.long_name, v.cell_methods = units, long, 'time: mean'
            v[:] = values.astype('f4')
    subprocess.run(['ncks', '-O', '-x', '-v', 'tdps', path, path], check=True)


def heat(series):
    t, q, p = (np.array(series[k], dtype='f8') for k in ('tmax', 'q', 'p'))
    e = q * p / (EPS + (1 - EPS) * q)
    g = np.log(e / C)
    td = B * g / (A - g)
    rh = 100 * np.exp(A * td / (B + td) - A * t / (B + t))
    rh = np.where(rh > 100.5, np.nan, np.minimum(rh, 100))
    f = 1.8 * t + 32
    simple = 0.5 * (f + 61 + 1.2 * (f - 68) + 0.094 * rh)
    reg = (-42.379 + 2.04901523 * f + 10.14333127 * rh - 0.22475541 * f * rh - 6.83783e-3 * f * f
           - 5.481717e-2 * rh * rh + 1.22874e-3 * f * f * rh + 8.5282e-4 * f * rh * rh - 1.99e-6 * f * f * rh * rh)
    low = (rh < 13) & (f >= 80) & (f <= 112)
    high = (rh > 85) & (f >= 80) & (f <= 87)
    with np.errstate(invalid='ignore'):
        reg = reg - np.where(low, (13 - rh) / 4 * np.sqrt(np.abs(17 - np.abs(f - 95)) / 17), 0)
    reg = reg + np.where(high, (rh - 85) / 10 * (87 - f) / 5, 0)
    hi_f = np.minimum(np.where(simple < 80, simple, reg), 137)
    hi_f = np.where((f >= 40) & (rh >= 0) & (rh <= 100), hi_f, np.nan)
    return {'td': td.tolist(), 'hi': ((hi_f - 32) / 1.8).tolist()}


if sys.argv[1] == 'convert':
    for path in sys.argv[2:]:
        convert(path)
else:
    print(json.dumps(heat(json.load(sys.stdin)), allow_nan=True))
