"""Independent read-back of the generated Veloria sample with Debian python3-netcdf4 + numpy (CF decoding by
netCDF4: scale_factor/add_offset/_FillValue applied, masked arrays). Prints one JSON object of diagnostics.

Command (run by test/sample/generate.test.ts):
    /usr/bin/python3 test/sample/summarize_sample.py <sample-dir> <first-hindcast-year> <last-hindcast-year>
"""
import json
import sys

import numpy as np
from netCDF4 import Dataset, num2date

root, y0, y1 = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
BOXES = {  # (south, north, west, east) of the brief's regions (Tulva Delta as its bounding box)
    "kessan-lowlands": (-12, -9, -3.5, -0.5),
    "marrow-highlands": (-9, -6.5, -1.5, 1.5),
    "tulva-delta": (-13.5, -10.5, 0.5, 3.5),
    "orrin-coast": (-8.5, -6, 2, 4),
}


def box_mean(ds, name, box):
    """Cos-lat weighted mean over the box; returns array with the lat/lon axes reduced."""
    lat, lon = ds["lat"][:], ds["lon"][:]
    s, n, w, e = box
    iy = np.where((lat >= s) & (lat <= n))[0]
    ix = np.where((lon >= w) & (lon <= e))[0]
    v = ds[name][..., iy[0]:iy[-1] + 1, ix[0]:ix[-1] + 1].astype("f8")
    wts = np.cos(np.deg2rad(lat[iy]))[:, None] * np.ones(len(ix))[None, :]
    return (v * wts).sum(axis=(-2, -1)) / wts.sum()


def member_series(ds, name, box):
    """Box mean of an ensemble variable (time, number, lat, lon) as [member, time]."""
    return box_mean(ds, name, box).T


out = {}
obs = Dataset(f"{root}/observed/observed_daily.nc")
otime = num2date(obs["time"][:], obs["time"].units, obs["time"].calendar)
odates = np.array([d.strftime("%Y-%m-%d") for d in otime])
out["observed"] = {
    "first": odates[0], "last": odates[-1], "days": len(odates),
    "masked_cells": int(np.ma.getmaskarray(obs["tasmax"][0]).sum()),
    "kessan_tmax_nov_C": float(box_mean(obs, "tasmax", BOXES["kessan-lowlands"])[[d[5:7] == "11" for d in odates]].mean() - 273.15),
    "marrow_tmax_nov_C": float(box_mean(obs, "tasmax", BOXES["marrow-highlands"])[[d[5:7] == "11" for d in odates]].mean() - 273.15),
    "orrin_pr_jan_mm_day": float(box_mean(obs, "pr", BOXES["orrin-coast"])[[d[5:7] == "01" for d in odates]].mean() * 86400),
    "orrin_pr_jul_mm_day": float(box_mean(obs, "pr", BOXES["orrin-coast"])[[d[5:7] == "07" for d in odates]].mean() * 86400),
    "tdps_le_tasmax": bool(np.all(obs["tdps"][:] <= obs["tasmax"][:])),
}
okessan = box_mean(obs, "tasmax", BOXES["kessan-lowlands"])
index = {d: i for i, d in enumerate(odates)}

# Skill: correlation over hindcast years of the ensemble-mean Kessan tasmax anomaly with the observed one.
for src, prefix in (("short", "short"), ("subseasonal", "subs")):
    ens, ob = [], []
    for y in range(y0, y1 + 1):
        ds = Dataset(f"{root}/{src}/hindcast/{prefix}_{y}1126.nc")
        ens.append(member_series(ds, "tasmax", BOXES["kessan-lowlands"]).mean(axis=0))
        i0 = index[f"{y}-11-26"]
        ob.append(okessan[i0:i0 + len(ens[-1])])
    ens, ob = np.array(ens), np.array(ob)
    ea, oa = ens - ens.mean(axis=0), ob - ob.mean(axis=0)
    corr = (ea * oa).sum(axis=0) / np.sqrt((ea ** 2).sum(axis=0) * (oa ** 2).sum(axis=0))
    out[f"{src}_kessan_tmax_corr_by_lead"] = [round(float(c), 3) for c in corr]

# Scenario: Kessan tasmax exceedance of (hindcast-ensemble p90 at the same lead) in the three issues.
for src, prefix in (("short", "short"), ("subseasonal", "subs")):
    hc = np.concatenate([member_series(Dataset(f"{root}/{src}/hindcast/{prefix}_{y}1126.nc"), "tasmax", BOXES["kessan-lowlands"]) for y in range(y0, y1 + 1)])
    p90 = np.percentile(np.ma.filled(hc, np.nan), 90, axis=0)
    probs = {}
    for issue in ("20261123", "20261126", "20261130"):
        fc = member_series(Dataset(f"{root}/{src}/{prefix}_{issue}.nc"), "tasmax", BOXES["kessan-lowlands"])
        day = {"20261123": 17, "20261126": 14, "20261130": 10}[issue] - 1  # lead index of 2026-12-09 (minus one)
        if day < fc.shape[1]:
            probs[issue] = round(float((fc[:, day] > p90[day]).mean()), 3)
    out[f"{src}_kessan_p_gt_p90_on_20261209"] = probs

seas = Dataset(f"{root}/seasonal/seas_20261126.nc")
tp = member_series(seas, "tp", BOXES["orrin-coast"]).mean(axis=0)
daily = np.diff(np.concatenate([[0.0], tp])) * 1000
hseas = [member_series(Dataset(f"{root}/seasonal/hindcast/seas_{y}1126.nc"), "tp", BOXES["orrin-coast"]).mean(axis=0) for y in range(y0, y1 + 1)]
hdaily = np.mean([np.diff(np.concatenate([[0.0], h])) * 1000 for h in hseas], axis=0)
out["seasonal_orrin_rain_mm_by_month_2026"] = [round(float(daily[i:i + 30].sum()), 1) for i in range(0, 180, 30)]
out["seasonal_orrin_rain_mm_by_month_hindcast"] = [round(float(hdaily[i:i + 30].sum()), 1) for i in range(0, 180, 30)]
out["seasonal_tp_nondecreasing"] = bool(np.all(np.diff(seas["tp"][:], axis=0) >= -1e-6))
print(json.dumps(out))
