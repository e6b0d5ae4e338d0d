"""numpy climatology of a record, beside GridDrift's own climatology file, for comparison.

usage: climatology_reference.py INPUT VAR KIND OURS [BASE_START BASE_END]

KIND: month | day-of-year | hour-by-month. Slots follow the rules GridDrift documents:
month - 1; day of year: (month - 1) * 30 + day - 1 for 360_day, dayofyr - 1 for noleap and
all_leap, and for calendars with leap years the day's index in a leap year (29 February its
own slot); hour-by-month: (month - 1) * T + index of the time of day among the T sorted times
of day present. Base period: BASE_START <= t < BASE_END (ISO dates), default everything.
Statistics per slot and cell: numpy nanmean, nanstd (ddof = 0) and the count of valid values.
Prints JSON: the reference and OURS read back by python netCDF4 (masked values as null),
flattened slot-major.
"""
import sys, json
import numpy as np
import netCDF4
import cftime

path, var, kind, ours = sys.argv[1:5]
with netCDF4.Dataset(path) as ds:
    tv = ds["time"]
    cal = getattr(tv, "calendar", "standard")
    dates = netCDF4.num2date(tv[:], tv.units, cal, only_use_cftime_datetimes=True)
    data = ds[var][:].astype(np.float64).filled(np.nan)
if len(sys.argv) > 5:
    lo = cftime.datetime.strptime(sys.argv[5], "%Y-%m-%d", calendar=cal)
    hi = cftime.datetime.strptime(sys.argv[6], "%Y-%m-%d", calendar=cal)
    keep = np.array([lo <= d < hi for d in dates])
    dates, data = dates[keep], data[keep]

leap_start = np.cumsum([0, 31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30])
if kind == "month":
    slots, n = np.array([d.month - 1 for d in dates]), 12
elif kind == "day-of-year":
    if cal == "360_day":
        slots, n = np.array([(d.month - 1) * 30 + d.day - 1 for d in dates]), 360
    elif cal in ("noleap", "365_day"):
        slots, n = np.array([d.dayofyr - 1 for d in dates]), 365
    elif cal in ("all_leap", "366_day"):
        slots, n = np.array([d.dayofyr - 1 for d in dates]), 366
    else:
        slots, n = np.array([leap_start[d.month - 1] + d.day - 1 for d in dates]), 366
else:
    tod = np.array([d.hour * 3600 + d.minute * 60 + d.second for d in dates])
    uniq = sorted(set(tod.tolist()))
    slots = np.array([(d.month - 1) * len(uniq) + uniq.index(s) for d, s in zip(dates, tod)])
    n = 12 * len(uniq)

mean = np.full((n,) + data.shape[1:], np.nan)
std = np.full_like(mean, np.nan)
count = np.zeros_like(mean)
import warnings
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    for s in range(n):
        sel = data[slots == s]
        if sel.shape[0] == 0:
            continue
        mean[s] = np.nanmean(sel, axis=0)
        std[s] = np.nanstd(sel, axis=0)
        count[s] = np.sum(~np.isnan(sel), axis=0)

def flat(a):
    a = np.ma.masked_invalid(np.ma.filled(a.astype(np.float64), np.nan)) if not np.ma.isMaskedArray(a) else a.astype(np.float64)
    return [None if m else float(v) for v, m in zip(np.ma.getdata(a).ravel(), np.ma.getmaskarray(a).ravel())]

with netCDF4.Dataset(ours) as ds:
    result = {
        "reference": {"mean": flat(mean), "std": flat(std), "count": flat(count)},
        "ours": {"mean": flat(ds[var][:]), "std": flat(ds[var + "_std"][:]), "count": flat(ds[var + "_count"][:])},
        "slots": int(n),
    }
print(json.dumps(result))
