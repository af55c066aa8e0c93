"""Reference cell weights for region polygons, with shapely (GEOS) — independent of Forelight's code.

Reads JSON on stdin: {"grids": {name: {"latBounds": [[s, n], ...], "lonBounds": [[w, e], ...]}},
"regions": [{"id": ..., "geometry": GeoJSON Polygon/MultiPolygon}]}; writes JSON on stdout:
  weights[grid][region] = [[row, column, area_sr], ...]   (exact cell ∩ polygon area on the unit sphere)
  equal_area[region]     = region area (sr) in the Lambert cylindrical equal-area projection (x = λ, y = sin φ)
                           after densifying every edge to 0.001° (a check on the exact formula, by another route)
  valid[region]          = shapely's is_valid after putting each ring in a continuous longitude frame.
  edges_meet_at[region]  = for each [lon, lat] of request "points"[region]: whether two edges of the region that are
                           not neighbours on one ring (or lie on two rings) both pass within 1e-6° of it (shapely
                           distance), i.e. whether the boundary really crosses or touches itself there (at lon ± 360 too).

Geometry model (RFC 7946 §3.1.1): edges are straight in longitude/latitude. The intersection is computed by
GEOS in that plane; its area on the sphere is the exact line integral A = -∮ sin φ dλ along straight edges
(Green's theorem; ∫ sin φ dλ = Δλ · (cos φ1 − cos φ2)/(φ2 − φ1), or Δλ · sin φ1 when φ1 = φ2).
"""
import json
import math
import sys

import numpy as np
from shapely.geometry import Polygon, box
from shapely.geometry import LineString, Point

DEG = math.pi / 180


def unwrap(ring):
    out = [tuple(ring[0])]
    for lon, lat in ring[1:]:
        prev = out[-1][0]
        while lon - prev > 180:
            lon -= 360
        while lon - prev < -180:
            lon += 360
        out.append((lon, lat))
    if abs(out[-1][0] - out[0][0]) > 1e-9:
        return [tuple(p) for p in ring]  # encircles a pole: keep as written
    return out


def framed_polygons(geometry):
    parts = [geometry["coordinates"]] if geometry["type"] == "Polygon" else geometry["coordinates"]
    out = []
    for rings in parts:
        outer = unwrap(rings[0])
        west = min(p[0] for p in outer)
        shift = -360 * math.floor((west + 180) / 360)
        outer = [(x + shift, y) for x, y in outer]
        holes = []
        for h in rings[1:]:
            h = unwrap(h)
            k = round((outer[0][0] - h[0][0]) / 360)
            holes.append([(x + 360 * k, y) for x, y in h])
        out.append(Polygon(outer, holes))
    return out


def ring_area(coords):
    xy = np.asarray(coords, dtype=float) * DEG
    lam, phi = xy[:, 0], xy[:, 1]
    dlam = lam[1:] - lam[:-1]
    p1, p2 = phi[:-1], phi[1:]
    flat = np.abs(p2 - p1) < 1e-15
    safe = np.where(flat, 1.0, p2 - p1)
    term = np.where(flat, np.sin(p1) * dlam, dlam * (np.cos(p1) - np.cos(p2)) / safe)
    return abs(-term.sum())


def sphere_area(geom):
    if geom.is_empty:
        return 0.0
    if geom.geom_type == "Polygon":
        return ring_area(geom.exterior.coords) - sum(ring_area(r.coords) for r in geom.interiors)
    if hasattr(geom, "geoms"):
        return sum(sphere_area(g) for g in geom.geoms if g.geom_type in ("Polygon", "MultiPolygon", "GeometryCollection"))
    return 0.0


def densify(coords, step):
    pts = []
    for (x1, y1), (x2, y2) in zip(coords[:-1], coords[1:]):
        n = max(1, int(math.ceil(max(abs(x2 - x1), abs(y2 - y1)) / step)))
        for i in range(n):
            t = i / n
            pts.append((x1 + t * (x2 - x1), y1 + t * (y2 - y1)))
    pts.append(coords[-1])
    return pts


def equal_area(poly):
    def project(coords):
        return [(x * DEG, math.sin(y * DEG)) for x, y in densify(list(coords), 0.001)]
    return Polygon(project(poly.exterior.coords), [project(r.coords) for r in poly.interiors]).area


def cell_weights(polys, lat_bounds, lon_bounds):
    areas = {}
    for poly in polys:
        minx, miny, maxx, maxy = poly.bounds
        for y, (a, b) in enumerate(lat_bounds):
            s, n = max(-90.0, min(a, b)), min(90.0, max(a, b))
            if n <= miny or s >= maxy:
                continue
            for x, (c, d) in enumerate(lon_bounds):
                w, e = min(c, d), max(c, d)
                k = math.ceil((minx - e) / 360)
                while w + 360 * k < maxx:
                    piece = poly.intersection(box(w + 360 * k, s, e + 360 * k, n))
                    area = sphere_area(piece)
                    if area > 0:
                        areas[(y, x)] = areas.get((y, x), 0.0) + area
                    k += 1
    return [[y, x, a] for (y, x), a in sorted(areas.items())]


def edges_meet(polys, point):
    for shift in (-360, 0, 360):
        p = Point(point[0] + shift, point[1])
        for poly in polys:
            near = []
            for r, ring in enumerate([poly.exterior, *poly.interiors]):
                c = list(ring.coords)
                n = len(c) - 1
                near += [(r, i, n) for i in range(n) if LineString([c[i], c[i + 1]]).distance(p) < 1e-6]
            for a in near:
                for b in near:
                    if a < b and (a[0] != b[0] or (abs(a[1] - b[1]) > 1 and abs(a[1] - b[1]) != a[2] - 1)):
                        return True
    return False


def main():
    req = json.load(sys.stdin)
    out = {"weights": {}, "equal_area": {}, "valid": {}, "edges_meet_at": {}}
    for r in req["regions"]:
        polys = framed_polygons(r["geometry"])
        out["valid"][r["id"]] = all(p.is_valid for p in polys)
        if r["id"] in req.get("points", {}):
            out["edges_meet_at"][r["id"]] = [edges_meet(polys, pt) for pt in req["points"][r["id"]]]
        if req.get("areas", True):
            out["equal_area"][r["id"]] = sum(equal_area(p) for p in polys)
    for name, g in req["grids"].items():
        out["weights"][name] = {}
        for r in req["regions"]:
            out["weights"][name][r["id"]] = cell_weights(framed_polygons(r["geometry"]), g["latBounds"], g["lonBounds"])
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
