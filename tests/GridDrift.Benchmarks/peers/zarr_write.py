"""Writes the formats benchmark's Zarr v2 record with python3-zarr: FRAMES frames of ROWS x
COLUMNS float32 'tcwv' with xarray's dimension names, in chunks of CHUNK_T frames by the whole
grid, compressed by zarr's default (blosc with lz4, byte shuffle) or zstd. Invented values."""
import sys

import numcodecs
import numpy as np
import zarr

path, frames, rows, columns, chunk_t, codec = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4]), int(sys.argv[5]), sys.argv[6]
compressor = numcodecs.Blosc(cname="lz4", clevel=5, shuffle=numcodecs.Blosc.SHUFFLE) if codec == "blosc" else numcodecs.Zstd(level=3)
root = zarr.open_group(path, mode="w")
t = root.create_dataset("time", data=np.arange(frames, dtype="f8"))
t.attrs.update({"_ARRAY_DIMENSIONS": ["time"], "units": "hours since 2031-01-01 00:00:00"})
lat = root.create_dataset("lat", data=np.linspace(90, -90, rows))
lat.attrs.update({"_ARRAY_DIMENSIONS": ["lat"], "units": "degrees_north"})
lon = root.create_dataset("lon", data=np.arange(columns) * 360.0 / columns)
lon.attrs.update({"_ARRAY_DIMENSIONS": ["lon"], "units": "degrees_east"})
v = root.create_dataset("tcwv", shape=(frames, rows, columns), chunks=(chunk_t, rows, columns), dtype="f4", compressor=compressor, fill_value=np.nan)
v.attrs.update({"_ARRAY_DIMENSIONS": ["time", "lat", "lon"], "units": "kg m-2"})
j, i = np.meshgrid(np.arange(rows), np.arange(columns), indexing="ij")
base = 25 + 20 * np.cos(np.deg2rad(90 - 180.0 * j / (rows - 1))) ** 2
rng = np.random.default_rng(3)
for t0 in range(0, frames, chunk_t):
    block = np.stack([base + 5 * np.sin(2 * np.pi * i / columns * 3 - t / 10.0) + rng.normal(0, 0.5, size=base.shape)
                      for t in range(t0, min(frames, t0 + chunk_t))]).astype("f4")
    v[t0:t0 + len(block)] = block
zarr.consolidate_metadata(path)
