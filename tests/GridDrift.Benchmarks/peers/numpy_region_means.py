"""Peer for the stats benchmark: numpy masked area-weighted means of 172 regions (global,
bands:20, tiles:20x20) over 721 x 1440 float32 frames, the way a careful numpy user writes it:
per region a precomputed flat index array and its exact area weights, then per frame a gather,
a NaN mask and a weighted sum. Prints seconds per frame and a checksum."""
import sys
import time

import numpy as np

frames = int(sys.argv[1])
nlat, nlon = 721, 1440
lat = np.linspace(90, -90, nlat)
lon = np.arange(nlon) * 0.25
lat_e = np.clip(np.concatenate([[90.125], 0.5 * (lat[1:] + lat[:-1]), [-90.125]]), -90, 90)
lon_e = np.concatenate([[-0.125], 0.5 * (lon[1:] + lon[:-1]), [359.875]])
R = 6371008.8


def region(south, north, west, east):
    s = np.maximum(np.minimum(lat_e[:-1], lat_e[1:]), south)
    n = np.minimum(np.maximum(lat_e[:-1], lat_e[1:]), north)
    fy = np.where(n > s, np.sin(np.deg2rad(n)) - np.sin(np.deg2rad(s)), 0)
    w0 = np.maximum(lon_e[:-1], west)
    e0 = np.minimum(lon_e[1:], east)
    fx = np.deg2rad(np.where(e0 > w0, e0 - w0, 0))
    w = R * R * fy[:, None] * fx[None, :]
    idx = np.flatnonzero(w)
    return idx, w.ravel()[idx]


regions = [region(-90, 90, -1, 361)]
regions += [region(s, s + 20, -1, 361) for s in range(-90, 90, 20)]
regions += [region(s, s + 20, w, w + 20) for s in range(-90, 90, 20) for w in range(0, 360, 20)]
rng = np.random.default_rng(3)
data = (250 + 20 * rng.standard_normal((4, nlat, nlon))).astype("f4")
data[:, 100:120, 200:400] = np.nan
total = 0.0
start = time.perf_counter()
for i in range(frames):
    flat = data[i % 4].ravel()
    for idx, w in regions:
        v = flat[idx]
        ok = ~np.isnan(v)
        total += np.dot(w[ok], v[ok]) / w[ok].sum()
elapsed = time.perf_counter() - start
print(f"{elapsed / frames:.6f} {total:.6e} {len(regions)}")
