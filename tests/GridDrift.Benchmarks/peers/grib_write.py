"""Writes the formats benchmark's GRIB record with ecCodes (python3-eccodes): FRAMES hourly
messages of total column water vapour on a global ROWS x COLUMNS regular latitude-longitude grid,
GRIB edition 2, simple packing at 16 bits (how reanalysis archives deliver it). Invented values."""
import sys

import eccodes
import numpy as np

path, frames, rows, columns = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4])
h = eccodes.codes_grib_new_from_samples("regular_ll_sfc_grib2")
eccodes.codes_set_long(h, "Ni", columns)
eccodes.codes_set_long(h, "Nj", rows)
eccodes.codes_set(h, "iDirectionIncrementInDegrees", 360.0 / columns)
eccodes.codes_set(h, "jDirectionIncrementInDegrees", 180.0 / (rows - 1))
eccodes.codes_set(h, "latitudeOfFirstGridPointInDegrees", 90.0)
eccodes.codes_set(h, "latitudeOfLastGridPointInDegrees", -90.0)
eccodes.codes_set(h, "longitudeOfFirstGridPointInDegrees", 0.0)
eccodes.codes_set(h, "longitudeOfLastGridPointInDegrees", 360.0 - 360.0 / columns)
eccodes.codes_set(h, "shortName", "tcwv")
eccodes.codes_set_long(h, "bitsPerValue", 16)
j, i = np.meshgrid(np.arange(rows), np.arange(columns), indexing="ij")
base = 25 + 20 * np.cos(np.deg2rad(90 - 180.0 * j / (rows - 1))) ** 2
rng = np.random.default_rng(3)
with open(path, "wb") as f:
    for t in range(frames):
        eccodes.codes_set(h, "dataDate", 20310101 + t // 24)
        eccodes.codes_set(h, "dataTime", (t % 24) * 100)
        values = base + 5 * np.sin(2 * np.pi * i / columns * 3 - t / 10.0) + rng.normal(0, 0.5, size=base.shape)
        eccodes.codes_set_values(h, values.ravel())
        eccodes.codes_write(h, f)
