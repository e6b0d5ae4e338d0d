"""Peer of the formats benchmark: python3-eccodes reads a GRIB file message by message, decodes
each message's values and sums them, as GridDrift does. Prints seconds, peak resident memory
(MiB) and the sum."""
import resource
import sys
import time

import eccodes
import numpy as np

path = sys.argv[1]
start = time.perf_counter()
total = 0.0
with open(path, "rb") as f:
    while True:
        h = eccodes.codes_grib_new_from_file(f)
        if h is None:
            break
        total += float(np.sum(eccodes.codes_get_values(h), dtype=np.float64))
        eccodes.codes_release(h)
elapsed = time.perf_counter() - start
print(f"{elapsed:.4f} {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.1f} {total:.6e}")
