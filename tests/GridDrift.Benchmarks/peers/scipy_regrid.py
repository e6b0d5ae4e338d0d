"""Peer for the regrid benchmark: first-order conservative weights between regular lat-lon grids
built the way a careful scipy user does — the exact overlap of each source and target latitude
band (in sin(lat)) and longitude interval, as two 1-D sparse matrices combined by a Kronecker
product — then per frame y = (W x) / (W 1) with scipy.sparse. Prints the build seconds, the
seconds per frame and a checksum.

usage: scipy_regrid.py NLAT NLON DEG FRAMES"""
import sys, time
import numpy as np
import scipy.sparse as sp

nlat, nlon, deg, frames = int(sys.argv[1]), int(sys.argv[2]), float(sys.argv[3]), int(sys.argv[4])

def overlap(src, dst, f=lambda v: v):
    rows, cols, vals = [], [], []
    for t in range(len(dst) - 1):
        lo, hi = min(dst[t], dst[t + 1]), max(dst[t], dst[t + 1])
        for s in range(len(src) - 1):
            a, b = max(lo, min(src[s], src[s + 1])), min(hi, max(src[s], src[s + 1]))
            if b > a:
                rows.append(t); cols.append(s); vals.append(f(b) - f(a))
    return sp.csr_matrix((vals, (rows, cols)), shape=(len(dst) - 1, len(src) - 1))

start = time.perf_counter()
dlat, dlon = 180.0 / (nlat - 1), 360.0 / nlon
lat_c = 90 - dlat * np.arange(nlat)
lat_e = np.clip(np.concatenate([[lat_c[0] + dlat / 2], 0.5 * (lat_c[1:] + lat_c[:-1]), [lat_c[-1] - dlat / 2]]), -90, 90)
lon_e = np.concatenate([[-dlon / 2], dlon * np.arange(nlon) + dlon / 2])
tlat_e = np.arange(-90, 90 + deg / 2, deg)
tlon_e = np.arange(0, 360 + deg / 2, deg)
wlat = overlap(lat_e, tlat_e, lambda v: np.sin(np.deg2rad(v)))
# periodic longitudes: the source interval [-dlon/2, dlon/2] also counts at [360 - dlon/2, 360 + dlon/2]
wlon = overlap(lon_e, tlon_e) + overlap(lon_e + 360, tlon_e)
w = sp.kron(wlat, np.deg2rad(1) * wlon, format="csr")
norm = w @ np.ones(nlat * nlon)
build = time.perf_counter() - start
rng = np.random.default_rng(1)
x = (240 + 20 * rng.random(nlat * nlon)).astype(np.float32)
for _ in range(2):
    y = (w @ x) / norm
start = time.perf_counter()
for _ in range(frames):
    y = (w @ x) / norm
per = (time.perf_counter() - start) / frames
print(f"{build:.4f} {per:.5f} {float(y.sum()):.3f}")
