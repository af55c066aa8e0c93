"""Reference population weights and population-weighted region means, with shapely (GEOS) — independent of
Forelight's code. Each source cell of the region weighs Σ over raster pixels p of count(p) × |p ∩ cell ∩ region| / |p|
(people spread evenly within a pixel), areas on the unit sphere by the exact line integral of overlap_reference.py.

stdin: {"nc": path of a file written by region_means_reference.py, "regions": [{"id", "geometry"}],
        "raster": {"south", "west", "step", "counts": [[row 0 = southmost], ...]} (None = no data = nobody)}
        optional "share_above_c": L
stdout: {"weights": {id: [[row, column, people], ...]}, "means": {id: [day 0, 1, 2 in degC]},
         "shares": {id: [% of the region's people whose cell exceeds L °C (strictly), day 0, 1, 2]} (with L only)}.
"""
import json
import math
import sys

import netCDF4
import numpy as np
from shapely.geometry import box

from overlap_reference import framed_polygons, sphere_area

DEG = math.pi / 180
req = json.load(sys.stdin)
ras = req["raster"]
counts = ras["counts"]
step, south, west = ras["step"], ras["south"], ras["west"]
nc = netCDF4.Dataset(req["nc"])
lat_b = np.asarray(nc.variables["lat_bnds"][:], dtype=float)
lon_b = np.asarray(nc.variables["lon_bnds"][:], dtype=float)
tas = np.asarray(nc.variables["tas"][:], dtype=float)

level = req.get("share_above_c")
out = {"weights": {}, "means": {}, "shares": {}}
for r in req["regions"]:
    polys = framed_polygons(r["geometry"])
    cells = {}
    for poly in polys:
        minx, miny, maxx, maxy = poly.bounds
        for i, row in enumerate(counts):
            ps, pn = south + i * step, south + (i + 1) * step
            if pn <= miny or ps >= maxy:
                continue
            for j, count in enumerate(row):
                pw, pe = west + j * step, west + (j + 1) * step
                if pe <= minx or pw >= maxx or not count:
                    continue
                pixel_sr = (math.sin(pn * DEG) - math.sin(ps * DEG)) * (pe - pw) * DEG
                for y in np.nonzero((lat_b[:, 1] > ps) & (lat_b[:, 0] < pn))[0]:
                    s, n = max(ps, lat_b[y, 0]), min(pn, lat_b[y, 1])
                    if n <= s:
                        continue
                    for x in np.nonzero((lon_b[:, 1] > pw) & (lon_b[:, 0] < pe))[0]:
                        w, e = max(pw, lon_b[x, 0]), min(pe, lon_b[x, 1])
                        if e <= w:
                            continue
                        area = sphere_area(poly.intersection(box(w, s, e, n)))
                        if area > 0:
                            cells[(int(y), int(x))] = cells.get((int(y), int(x)), 0.0) + count * area / pixel_sr
    items = sorted(cells.items())
    out["weights"][r["id"]] = [[y, x, w] for (y, x), w in items]
    ws = np.array([w for _, w in items])
    ys = np.array([y for (y, _), _ in items])
    xs = np.array([x for (_, x), _ in items])
    out["means"][r["id"]] = [float((tas[t, ys, xs] * ws).sum() / ws.sum() - 273.15) for t in range(tas.shape[0])]
    if level is not None:
        out["shares"][r["id"]] = [float(100 * ws[tas[t, ys, xs] - 273.15 > level].sum() / ws.sum()) for t in range(tas.shape[0])]
json.dump(out, sys.stdout)
