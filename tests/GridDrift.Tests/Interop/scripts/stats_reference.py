"""Independent numpy reference for GridDrift's area-weighted region statistics on a rectilinear
grid: exact cell areas R^2 dlon (sin phi2 - sin phi1) from midpoint edges clamped at +-90, exact
overlap with latitude bands, NaN-aware weighted moments, minimum and maximum, valid fraction and
Hazen-position weighted quantiles. Prints JSON {region: {stat: [per frame]}}.

usage: stats_reference.py FILE VAR BAND_STEP RADIUS"""
import json
import sys

import netCDF4
import numpy as np

path, name, step, radius = sys.argv[1], sys.argv[2], float(sys.argv[3]), float(sys.argv[4])
with netCDF4.Dataset(path) as ds:
    lat = ds["lat"][:].astype("f8")
    lon = ds["lon"][:].astype("f8")
    data = ds[name][:].astype("f8").filled(np.nan)


def edges(c):
    e = np.empty(c.size + 1)
    e[1:-1] = 0.5 * (c[1:] + c[:-1])
    e[0] = c[0] - 0.5 * (c[1] - c[0])
    e[-1] = c[-1] + 0.5 * (c[-1] - c[-2])
    return e


lat_e = np.clip(edges(lat), -90, 90)
lon_e = edges(lon)
lo_s = np.minimum(lat_e[:-1], lat_e[1:])
hi_s = np.maximum(lat_e[:-1], lat_e[1:])
dlon = np.deg2rad(np.abs(np.diff(lon_e)))


def weights(south, north):
    s = np.maximum(lo_s, south)
    n = np.minimum(hi_s, north)
    band = np.where(n > s, np.sin(np.deg2rad(n)) - np.sin(np.deg2rad(s)), 0.0)
    return radius ** 2 * band[:, None] * dlon[None, :]


def hazen(x, w, p):
    order = np.argsort(x, kind="stable")
    x, w = x[order], w[order]
    c = (np.cumsum(w) - 0.5 * w) / w.sum()
    return float(np.interp(p, c, x))


regions = {"global": (-90, 90)}
s = -90.0
while s < 90 - 1e-9:
    n = min(90.0, s + step)
    regions[f"band_{'s' if s < 0 else 'n'}{abs(s):02g}_{'s' if n < 0 else 'n'}{abs(n):02g}"] = (s, n)
    s += step
out = {}
for rname, (south, north) in regions.items():
    w = weights(south, north)
    area = w.sum()
    res = {k: [] for k in ("mean", "std", "min", "max", "p10", "p50", "p90", "valid", "area")}
    for f in data:
        ok = np.isfinite(f) & (w > 0)
        ww, xx = w[ok], f[ok]
        mean = (ww * xx).sum() / ww.sum()
        res["mean"].append(mean)
        res["std"].append(float(np.sqrt((ww * (xx - mean) ** 2).sum() / ww.sum())))
        res["min"].append(float(xx.min()))
        res["max"].append(float(xx.max()))
        for p in (10, 50, 90):
            res[f"p{p}"].append(hazen(xx, ww, p / 100))
        res["valid"].append(float(ww.sum() / area))
        res["area"].append(float(area))
    out[rname] = res
json.dump(out, sys.stdout)
