"""Reference pair metrics for GridDrift's similarity step on a limited-area lat-lon record made by
make_similarity_fixture.py: the SSIM map of scikit-image (structural_similarity with
gaussian_weights=True, sigma=1.5, use_sample_covariance=False, data_range=L, full=True)
averaged with exact cell-area weights over each region (not skimage's own cropped mean), and
area-weighted Pearson correlation, RMS difference and mean absolute change from numpy.

usage: similarity_reference.py FILE VAR L SOUTH NORTH WEST EAST   (the box region; 'global' is the whole domain)"""
import json
import sys

import netCDF4
import numpy as np
from skimage.metrics import structural_similarity

path, name, L = sys.argv[1], sys.argv[2], float(sys.argv[3])
south, north, west, east = (float(v) for v in sys.argv[4:8])
with netCDF4.Dataset(path) as ds:
    lat = ds["lat"][:].astype("f8")
    lon = ds["lon"][:].astype("f8")
    data = ds[name][:].astype("f8")


def edges(c):
    e = np.empty(c.size + 1)
    e[1:-1] = 0.5 * (c[1:] + c[:-1])
    e[0] = c[0] - 0.5 * (c[1] - c[0])
    e[-1] = c[-1] + 0.5 * (c[-1] - c[-2])
    return e


R = 6371008.8
le, oe = edges(lat), edges(lon)


def area(s, n, w, e):
    lo = np.maximum(np.minimum(le[:-1], le[1:]), s)
    hi = np.minimum(np.maximum(le[:-1], le[1:]), n)
    fy = np.where(hi > lo, np.sin(np.deg2rad(hi)) - np.sin(np.deg2rad(lo)), 0)
    wl = np.maximum(oe[:-1], w)
    el = np.minimum(oe[1:], e)
    fx = np.deg2rad(np.where(el > wl, el - wl, 0))
    return R * R * fy[:, None] * fx[None, :]


regions = {"global": area(-90, 90, -360, 720), "box": area(south, north, west, east)}
out = {k: {"ssim": [], "corr": [], "rmsd": [], "mean_abs_change": []} for k in regions}
for t in range(1, data.shape[0]):
    a, b = data[t - 1], data[t]
    _, full = structural_similarity(a, b, gaussian_weights=True, sigma=1.5, use_sample_covariance=False, data_range=L, full=True)
    for k, w in regions.items():
        W = w.sum()
        out[k]["ssim"].append(float((w * full).sum() / W))
        ma, mb = (w * a).sum() / W, (w * b).sum() / W
        cov = (w * (a - ma) * (b - mb)).sum() / W
        out[k]["corr"].append(float(cov / np.sqrt((w * (a - ma) ** 2).sum() / W * (w * (b - mb) ** 2).sum() / W)))
        out[k]["rmsd"].append(float(np.sqrt((w * (b - a) ** 2).sum() / W)))
        out[k]["mean_abs_change"].append(float((w * np.abs(b - a)).sum() / W))
json.dump(out, sys.stdout)
