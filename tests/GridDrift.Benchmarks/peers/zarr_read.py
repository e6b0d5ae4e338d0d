"""Peer of the formats benchmark: python3-zarr reads the record a chunk of frames at a time (so
each chunk is decoded once) and sums every frame, as GridDrift does. Prints seconds, peak
resident memory (MiB) and the sum."""
import resource
import sys
import time

import numpy as np
import zarr

path, name = sys.argv[1], sys.argv[2]
start = time.perf_counter()
v = zarr.open_consolidated(path)[name]
step = v.chunks[0]
total = 0.0
for t0 in range(0, v.shape[0], step):
    block = v[t0:t0 + step]
    for frame in block:
        total += float(np.nansum(frame, dtype=np.float64))
elapsed = time.perf_counter() - start
print(f"{elapsed:.4f} {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.1f} {total:.6e}")
