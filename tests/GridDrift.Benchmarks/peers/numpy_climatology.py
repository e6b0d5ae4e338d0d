"""Peer for the climatology benchmark: the numpy group-by a careful user writes. Reads the
whole variable with python netCDF4, decodes the times with cftime, then per slot (month, or
month x hour of day) selects the frames and takes nanmean, nanstd and the valid count over
time. Prints the seconds taken (read included) and a checksum.

usage: numpy_climatology.py FILE VAR month|hour-by-month"""
import sys
import time
import warnings

import netCDF4
import numpy as np

path, var, kind = sys.argv[1:4]
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
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    for key in np.unique(keys):
        sel = data[keys == key]
        mean = np.nanmean(sel, axis=0)
        std = np.nanstd(sel, axis=0)
        count = np.sum(~np.isnan(sel), axis=0)
        checksum += float(mean[0, 0] + std[0, 0] + count[0, 0])
print(f"{time.perf_counter() - start:.3f} {checksum:.6f}")
