"""What a user would script with Debian python3-netcdf4 + numpy: ONE pass over each file, computing the
cos(latitude)-weighted box mean of every region for every variable, member and time step.

    /usr/bin/python3 bench/python-baseline.py REGIONS_JSON OUT_JSON FILE [FILE ...]

Boxes are in degrees with longitudes -180..180; the file grid may use 0..360. A cell belongs to a box when
its centre lies inside (edges inclusive). OUT_JSON ("-": none) gets {file: {region: {variable: [[member][time]]}}}.
"""
import json
import sys

import numpy as np
from netCDF4 import Dataset

VARIABLES = ("tasmax", "tasmin", "tdps")


def box_indices(lat, lon, box):
    iy = np.where((lat >= box["south"]) & (lat <= box["north"]))[0]
    rel = (lon - box["west"]) % 360.0  # degrees east of the western edge, handles 0/360 and crossing 0
    ix = np.where(rel <= (box["east"] - box["west"]) % 360.0)[0]
    return iy, ix


def main():
    regions = json.load(open(sys.argv[1]))["regions"]
    results = {}
    for path in sys.argv[3:]:
        ds = Dataset(path)
        lat, lon = ds["lat"][:].astype("f8"), ds["lon"][:].astype("f8")
        selections = []
        for r in regions:
            iy, ix = box_indices(lat, lon, r)
            w = np.cos(np.deg2rad(lat[iy]))[:, None] * np.ones(len(ix))[None, :]
            selections.append((r["id"], iy, ix, w))
        out = {rid: {} for rid, _, _, _ in selections}
        for name in VARIABLES:
            var = ds[name]  # (time, number, lat, lon)
            nt, nm = var.shape[0], var.shape[1]
            means = {rid: np.empty((nm, nt)) for rid, _, _, _ in selections}
            for t in range(nt):
                field = np.ma.filled(var[t].astype("f8"), np.nan)  # one read per step: all members, whole grid
                for rid, iy, ix, w in selections:
                    sub = field[:, iy[0]:iy[-1] + 1, :][:, :, ix]
                    valid = ~np.isnan(sub)
                    means[rid][:, t] = np.where(valid, sub, 0.0).reshape(nm, -1) @ w.ravel() / (valid.reshape(nm, -1) @ w.ravel())
            for rid in means:
                out[rid][name] = means[rid]
        ds.close()
        results[path] = out
    if sys.argv[2] != "-":  # "-": the means stay in memory (timing only)
        json.dump({p: {r: {v: a.tolist() for v, a in o.items()} for r, o in f.items()} for p, f in results.items()}, open(sys.argv[2], "w"))


main()
