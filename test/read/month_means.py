"""Month means of a daily-mean file in its own calendar, computed with cftime (python3-netCDF4) and numpy, for the
calendars CDO does not know (it reads `julian` as the standard calendar). Each value is end-stamped at 00:00 of the
next day (cell_methods time: mean), so it belongs to the model date of stamp - 1 s. Box mean: the cells of
test/read/cdl-fixture.ts's BOX (centres at -8, -6 N and 12, 14, 16 E), weighted by sin(lat_n) - sin(lat_s) as
CDO's fldmean weights a regular grid. Prints JSON {"months": [YYYY-MM], "means": [member][month]} over whole months.
argv: file variable."""
import datetime, json, sys
import numpy as np, netCDF4

with netCDF4.Dataset(sys.argv[1]) as ds:
    time = ds.variables['time']
    dates = netCDF4.num2date(time[:], time.units, calendar=time.calendar)
    days = [d - datetime.timedelta(seconds=1) for d in dates]
    lat = ds.variables['lat'][:]; lon = ds.variables['lon'][:]
    values = ds.variables[sys.argv[2]][:].astype('f8')  # (time, number, lat, lon)
iy = (lat >= -9) & (lat <= -5); ix = (lon >= 11) & (lon <= 17)
w = np.sin(np.radians(lat[iy] + 1)) - np.sin(np.radians(lat[iy] - 1))
box = (values[:, :, iy][:, :, :, ix] * w[None, None, :, None]).sum(axis=(2, 3)) / (w.sum() * ix.sum())
keys = [f'{d.year:04d}-{d.month:02d}' for d in days]
firsts = [i for i, d in enumerate(days) if d.day == 1]
months, means = [], []
for a, b in zip(firsts, firsts[1:] + [len(days)]):
    nxt = days[b - 1] + datetime.timedelta(days=1)
    if nxt.day != 1:  # the series ends inside this month
        break
    months.append(keys[a]); means.append(box[a:b].mean(axis=0))
print(json.dumps({'months': months, 'means': np.array(means).T.tolist()}))
