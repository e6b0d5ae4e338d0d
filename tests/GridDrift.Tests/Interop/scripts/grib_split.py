"""Splits a GRIB file into one file per validity date, as archives deliver days (python3-eccodes
copies each message unchanged).

usage: grib_split.py IN.grib OUT_PREFIX    (writes OUT_PREFIX_YYYYMMDD.grib)"""
import sys

import eccodes

src, prefix = sys.argv[1], sys.argv[2]
outputs = {}
with open(src, "rb") as f:
    while True:
        h = eccodes.codes_grib_new_from_file(f)
        if h is None:
            break
        day = eccodes.codes_get(h, "validityDate")
        if day not in outputs:
            outputs[day] = open(f"{prefix}_{day}.grib", "wb")
        eccodes.codes_write(h, outputs[day])
        eccodes.codes_release(h)
for out in outputs.values():
    out.close()
print(" ".join(sorted(f"{prefix}_{day}.grib" for day in outputs)))
