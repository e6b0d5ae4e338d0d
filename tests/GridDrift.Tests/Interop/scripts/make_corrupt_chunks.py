"""Make an invented deflate-compressed netCDF-4 record (16 frames of 90 x 180, one chunk per
frame) and copies of it with one bit flipped at spread positions of the file, then say for each
copy whether python netCDF4 reads all of its data.

usage: make_corrupt_chunks.py FOLDER COPIES
Prints one line per copy: NAME ok|error"""
import sys

import netCDF4
import numpy as np

folder, copies = sys.argv[1], int(sys.argv[2])
clean = f"{folder}/clean.nc"
with netCDF4.Dataset(clean, "w") as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", 90)
    ds.createDimension("lon", 180)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "hours since 2031-01-01"
    t.standard_name = "time"
    la = ds.createVariable("lat", "f4", ("lat",))
    la.units = "degrees_north"
    la[:] = np.linspace(-89, 89, 90)
    lo = ds.createVariable("lon", "f4", ("lon",))
    lo.units = "degrees_east"
    lo[:] = np.arange(180) * 2.0
    v = ds.createVariable("tb", "f4", ("time", "lat", "lon"), zlib=True, complevel=4, chunksizes=(1, 90, 180))
    v.units = "K"
    v.valid_min, v.valid_max = np.float32(180), np.float32(320)
    rng = np.random.default_rng(5)
    for i in range(16):
        t[i] = i
        v[i] = (240 + 10 * rng.standard_normal((90, 180))).astype("f4")
data = open(clean, "rb").read()
for k in range(copies):
    b = bytearray(data)
    b[int(len(b) * (0.25 + 0.7 * k / copies))] ^= 0x10
    name = f"{folder}/flip{k}.nc"
    open(name, "wb").write(b)
    try:
        with netCDF4.Dataset(name) as ds:
            ds["tb"][:]
        print(f"{name} ok")
    except Exception:
        print(f"{name} error")
