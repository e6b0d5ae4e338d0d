"""numpy monthly moments of a record beside a merged partial climatology state, for comparison.

usage: partial_state_reference.py INPUT VAR STATE

The reference is computed in float64 from the record as python netCDF4 reads it: per calendar
month and cell, numpy nanmean, nanstd (ddof = 0) and the count of valid values. STATE is a
GridDrift partial state (count, mean, m2 per slot and cell); its standard deviation is
sqrt(m2 / count). Prints JSON of both, flattened slot-major, missing values as null.
"""
import sys, json, warnings
import numpy as np
import netCDF4

path, var, state = sys.argv[1:4]
with netCDF4.Dataset(path) as ds:
    tv = ds["time"]
    dates = netCDF4.num2date(tv[:], tv.units, getattr(tv, "calendar", "standard"), only_use_cftime_datetimes=True)
    data = ds[var][:].astype(np.float64).filled(np.nan)
months = np.array([d.month - 1 for d in dates])
flat = data.reshape(data.shape[0], -1)
mean = np.full((12, flat.shape[1]), np.nan)
std = np.full_like(mean, np.nan)
count = np.zeros_like(mean)
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    for m in range(12):
        sel = flat[months == m]
        if sel.shape[0]:
            mean[m], std[m], count[m] = np.nanmean(sel, 0), np.nanstd(sel, 0), np.sum(~np.isnan(sel), 0)
with netCDF4.Dataset(state) as ds:
    n, mu, m2 = ds["count"][:], ds["mean"][:], ds["m2"][:]
    with np.errstate(invalid="ignore", divide="ignore"):
        ours_mean = np.where(n > 0, mu, np.nan)
        ours_std = np.where(n > 0, np.sqrt(np.maximum(m2, 0) / n), np.nan)
def out(a):
    return [None if np.isnan(v) else float(v) for v in np.asarray(a, dtype=np.float64).ravel()]
print(json.dumps({"reference": {"mean": out(mean), "std": out(std), "count": out(count)},
                  "ours": {"mean": out(ours_mean), "std": out(ours_std), "count": out(n)}}))
