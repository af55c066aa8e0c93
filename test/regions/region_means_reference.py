"""Writes a CF NetCDF file with netCDF4-python (Unidata) and prints area-weighted region means computed from
shapely cell weights (overlap_reference.py). argv: output .nc path; stdin: {"regions": [{"id", "geometry"}]}.
Field: tas = 280 + 15 cos(lat) + 5 sin(2 lon) + day (K), 1° global grid with lat_bnds/lon_bnds, 3 daily steps.
stdout: {id: [mean of day 0, 1, 2] in degC}; with "share_above_c": L in stdin instead {id: [% of the region's
area whose cell value exceeds L °C (strictly), day 0, 1, 2]}.
"""
import json
import sys

import netCDF4
import numpy as np

from overlap_reference import cell_weights, framed_polygons

path = sys.argv[1]
lat = np.arange(-89.5, 90, 1.0)
lon = np.arange(-179.5, 180, 1.0)
lat_b = np.stack([lat - 0.5, lat + 0.5], axis=1)
lon_b = np.stack([lon - 0.5, lon + 0.5], axis=1)
days = 3
field = np.empty((days, lat.size, lon.size))
for t in range(days):
    field[t] = 280 + 15 * np.cos(np.radians(lat))[:, None] + 5 * np.sin(np.radians(2 * lon))[None, :] + t

with netCDF4.Dataset(path, "w", format="NETCDF3_CLASSIC") as nc:
    nc.createDimension("time", None)
    nc.createDimension("lat", lat.size)
    nc.createDimension("lon", lon.size)
    nc.createDimension("bnds", 2)
    v = nc.createVariable("time", "f8", ("time",)); v.units = "days since 2026-01-01 00:00:00"; v.calendar = "standard"; v.standard_name = "time"; v[:] = np.arange(days)
    v = nc.createVariable("lat", "f8", ("lat",)); v.units = "degrees_north"; v.standard_name = "latitude"; v.bounds = "lat_bnds"; v[:] = lat
    v = nc.createVariable("lon", "f8", ("lon",)); v.units = "degrees_east"; v.standard_name = "longitude"; v.bounds = "lon_bnds"; v[:] = lon
    nc.createVariable("lat_bnds", "f8", ("lat", "bnds"))[:] = lat_b
    nc.createVariable("lon_bnds", "f8", ("lon", "bnds"))[:] = lon_b
    v = nc.createVariable("tas", "f4", ("time", "lat", "lon")); v.units = "K"; v.standard_name = "air_temperature"; v[:] = field

stored = np.asarray(netCDF4.Dataset(path).variables["tas"][:], dtype=float)  # float32 as stored
request = json.load(sys.stdin)
level = request.get("share_above_c")
out = {}
for r in request["regions"]:
    w = cell_weights(framed_polygons(r["geometry"]), lat_b.tolist(), lon_b.tolist())
    ys = np.array([c[0] for c in w]); xs = np.array([c[1] for c in w]); ws = np.array([c[2] for c in w])
    celsius = [stored[t, ys, xs] - 273.15 for t in range(days)]
    if level is None:
        out[r["id"]] = [float((celsius[t] * ws).sum() / ws.sum()) for t in range(days)]
    else:
        out[r["id"]] = [float(100 * ws[celsius[t] > level].sum() / ws.sum()) for t in range(days)]
json.dump(out, sys.stdout)
