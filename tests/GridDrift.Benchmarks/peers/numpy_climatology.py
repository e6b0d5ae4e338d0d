"""Peer for the climatology benchmark: the numpy group-by a careful user writes. Reads the
whole variable with python netCDF4, decodes the times with cftime, then per slot (month, or
month x hour of day) selects the frames and takes nanmean, nanstd and the valid count over
time, and writes the three (slot, lat, lon) float32 fields to a 64-bit-offset NetCDF file with
python netCDF4 (the same job as GridDrift's, which writes its climatology too). Prints the
seconds taken (read and write included) and a checksum.

usage: numpy_climatology.py FILE VAR month|hour-by-month OUT"""
import sys
import time
import warnings

import netCDF4
import numpy as np

path, var, kind, out = sys.argv[1:5]
start = time.perf_counter()
with netCDF4.Dataset(path) as ds:
    t = ds["time"]
    dates = netCDF4.num2date(t[:], t.units, getattr(t, "calendar", "standard"), only_use_cftime_datetimes=True)
    data = ds[var][:]
    data = np.ma.filled(data.astype(np.float32), np.nan)
months = np.array([d.month for d in dates])
if kind == "month":
    keys = months - 1
else:
    hours = np.array([d.hour for d in dates])
    keys = (months - 1) * 24 + hours
checksum = 0.0
slots = np.unique(keys)
means = np.empty((slots.size,) + data.shape[1:], np.float32)
stds = np.empty_like(means)
counts = np.empty_like(means)
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    for k, key in enumerate(slots):
        sel = data[keys == key]
        means[k] = np.nanmean(sel, axis=0)
        stds[k] = np.nanstd(sel, axis=0)
        counts[k] = np.sum(~np.isnan(sel), axis=0)
        checksum += float(means[k, 0, 0] + stds[k, 0, 0] + counts[k, 0, 0])
with netCDF4.Dataset(out, "w", format="NETCDF3_64BIT_OFFSET") as ds:
    ds.createDimension("time", slots.size)
    ds.createDimension("lat", data.shape[1])
    ds.createDimension("lon", data.shape[2])
    for name, values in (("mean", means), ("std", stds), ("count", counts)):
        ds.createVariable(name, "f4", ("time", "lat", "lon"))[:] = values
print(f"{time.perf_counter() - start:.3f} {checksum:.6f}")
