"""Peer of the formats benchmark: python3-eccodes reads a GRIB file message by message, decodes
each message's values and sums them, as GridDrift does. With --by-name it first reads each
message's shortName and decodes only NAME's messages, as GridDrift opens a variable by name (the
first shortName costs ecCodes' parameter tables, as GridDrift's names do). Prints seconds, peak
resident memory (MiB) and the sum.

usage: grib_read.py PATH NAME [--by-name]"""
import resource
import sys
import time

import eccodes
import numpy as np

path, name, by_name = sys.argv[1], sys.argv[2], "--by-name" in sys.argv[3:]
start = time.perf_counter()
total = 0.0
with open(path, "rb") as f:
    while True:
        h = eccodes.codes_grib_new_from_file(f)
        if h is None:
            break
        if not by_name or eccodes.codes_get(h, "shortName") == name:
            total += float(np.sum(eccodes.codes_get_values(h), dtype=np.float64))
        eccodes.codes_release(h)
elapsed = time.perf_counter() - start
print(f"{elapsed:.4f} {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.1f} {total:.6e}")
