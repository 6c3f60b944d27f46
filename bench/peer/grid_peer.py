#!/usr/bin/python3
"""A vectorised scientific-Python peer for `deno task bench`: the grid parts
of a report, written the way an analyst would with Python's array, planar-geometry
and imaging packages, to time hotfield's whole report against.

    /usr/bin/python3 bench/peer/grid_peer.py SLIDE.geojson [--stride-um 25]

It reads the annotation GeoJSON, builds the valid region (tissue, within the
tumour outline when there is one, less the exclusions), keeps the figures
labelled "mitotic figure" (or unlabelled) inside it, counts every 2.37 mm²
4:3 window on the stride grid exactly (each figure adds to the corners of a
difference array, as hotfield's stamp does, then two cumulative sums), finds
each window's coverage from a 5 µm raster of the region (a summed-area
table), and prints the best admissible grid count and the count percentiles
as JSON. It does less than `hotfield report`: no exact hotspot between grid
positions, no top windows, best field set, scan test or report files.

Needs Debian's python3-numpy, python3-shapely and python3-pil.
"""

import argparse
import json
import sys
import time

import numpy as np
from shapely.geometry import MultiPolygon, Polygon, shape
from shapely.ops import unary_union
from shapely import vectorized
from PIL import Image, ImageDraw


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("geojson")
    ap.add_argument("--stride-um", type=float, default=25.0)
    ap.add_argument("--area-mm2", type=float, default=2.37)
    ap.add_argument("--min-coverage", type=float, default=0.95)
    ap.add_argument("--raster-um", type=float, default=5.0)
    a = ap.parse_args()
    t0 = time.perf_counter()

    with open(a.geojson, "rb") as f:
        doc = json.load(f)
    mpp = doc["slide"]["mpp"]
    mx, my = (mpp, mpp) if not isinstance(mpp, list) else mpp

    regions = {"tissue": [], "tumour": [], "exclude": []}
    xs, ys = [], []
    for feat in doc["features"]:
        p = feat.get("properties") or {}
        role = p.get("role")
        g = feat["geometry"]
        if role in regions:
            regions[role].append(shape(g))
        elif role == "figure" and p.get("label", "mitotic figure") == "mitotic figure":
            if (p.get("score") if p.get("score") is not None else 1) < 0:
                continue
            if g["type"] == "Point":
                xs.append(g["coordinates"][0])
                ys.append(g["coordinates"][1])
            elif g["type"] == "MultiPoint":
                for c in g["coordinates"]:
                    xs.append(c[0])
                    ys.append(c[1])

    def to_um(geom):
        from shapely.affinity import scale

        return scale(geom, xfact=mx, yfact=my, origin=(0, 0))

    valid = unary_union([to_um(g) for g in regions["tissue"]])
    if regions["tumour"]:
        valid = valid.intersection(unary_union([to_um(g) for g in regions["tumour"]]))
    if regions["exclude"]:
        valid = valid.difference(unary_union([to_um(g) for g in regions["exclude"]]))

    x = np.asarray(xs, dtype=np.float64) * mx
    y = np.asarray(ys, dtype=np.float64) * my
    inside = vectorized.contains(valid, x, y)
    x, y = x[inside], y[inside]

    # The window and the grid of centres over the region's bounds.
    area_um2 = a.area_mm2 * 1e6
    w = np.sqrt(area_um2 * 4 / 3)
    h = area_um2 / w
    s = a.stride_um
    x0, y0, x1, y1 = valid.bounds
    nx = int(np.floor((x1 - x0) / s)) + 1
    ny = int(np.floor((y1 - y0) / s)) + 1

    # Exact counts: each figure stamps the rectangle of centres whose window holds it.
    i0 = np.clip(np.ceil((x - w / 2 - x0) / s), 0, nx).astype(np.int64)
    i1 = np.clip(np.floor((x + w / 2 - x0) / s) + 1, 0, nx).astype(np.int64)
    j0 = np.clip(np.ceil((y - h / 2 - y0) / s), 0, ny).astype(np.int64)
    j1 = np.clip(np.floor((y + h / 2 - y0) / s) + 1, 0, ny).astype(np.int64)
    w1 = nx + 1
    size = w1 * (ny + 1)
    diff = (
        np.bincount(j0 * w1 + i0, minlength=size)
        - np.bincount(j0 * w1 + i1, minlength=size)
        - np.bincount(j1 * w1 + i0, minlength=size)
        + np.bincount(j1 * w1 + i1, minlength=size)
    ).reshape(ny + 1, w1)
    counts = diff.cumsum(0).cumsum(1)[:ny, :nx]

    # Coverage: a raster of the region and a summed-area table.
    r = a.raster_um
    rw = int(np.ceil((x1 - x0 + w) / r)) + 2
    rh = int(np.ceil((y1 - y0 + h) / r)) + 2
    ox, oy = x0 - w / 2 - r, y0 - h / 2 - r
    image = Image.new("L", (rw, rh), 0)
    draw = ImageDraw.Draw(image)
    polys = valid.geoms if isinstance(valid, MultiPolygon) else [valid]
    ring = lambda coords: [((px - ox) / r, (py - oy) / r) for px, py in coords]  # noqa: E731
    for poly in polys:
        if not isinstance(poly, Polygon):
            continue
        draw.polygon(ring(poly.exterior.coords), fill=1)
        for hole in poly.interiors:
            draw.polygon(ring(hole.coords), fill=0)
    mask = np.asarray(image)
    sat = np.zeros((rh + 1, rw + 1), dtype=np.int64)
    sat[1:, 1:] = mask.cumsum(0).cumsum(1)
    cx = x0 + np.arange(nx) * s
    cy = y0 + np.arange(ny) * s
    ca = np.clip(np.round((cx - w / 2 - ox) / r).astype(np.int64), 0, rw)
    cb = np.clip(np.round((cx + w / 2 - ox) / r).astype(np.int64), 0, rw)
    ra = np.clip(np.round((cy - h / 2 - oy) / r).astype(np.int64), 0, rh)
    rb = np.clip(np.round((cy + h / 2 - oy) / r).astype(np.int64), 0, rh)
    inside_px = (
        sat[rb[:, None], cb[None, :]]
        - sat[ra[:, None], cb[None, :]]
        - sat[rb[:, None], ca[None, :]]
        + sat[ra[:, None], ca[None, :]]
    )
    coverage = inside_px * (r * r) / area_um2
    admissible = coverage >= a.min_coverage

    c = counts[admissible]
    out = {
        "figures_counted": int(x.size),
        "grid": [nx, ny],
        "admissible": int(admissible.sum()),
        "best_grid_count": int(c.max()) if c.size else None,
        "percentiles": {str(q): float(np.percentile(c, q)) for q in (5, 25, 50, 75, 95)}
        if c.size
        else None,
        "seconds": round(time.perf_counter() - t0, 3),
    }
    json.dump(out, sys.stdout)
    sys.stdout.write("\n")
    return 0


if __name__ == "__main__":
    sys.exit(main())
