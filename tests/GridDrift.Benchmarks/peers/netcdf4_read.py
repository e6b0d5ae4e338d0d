"""Peer for the read benchmark: python netCDF4 (netCDF-C underneath) reads a variable frame by
frame and sums each frame, as GridDrift does. Prints seconds and peak resident memory (MiB)."""
import resource
import sys
import time

import netCDF4
import numpy as np

path, name, frames = sys.argv[1], sys.argv[2], int(sys.argv[3])
with netCDF4.Dataset(path) as ds:
    v = ds.variables[name]
    v.set_auto_maskandscale(True)
    start = time.perf_counter()
    total = 0.0
    for i in range(frames):
        total += float(np.ma.sum(v[i], dtype=np.float64))
    elapsed = time.perf_counter() - start
print(f"{elapsed:.4f} {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.1f} {total:.6e}")
