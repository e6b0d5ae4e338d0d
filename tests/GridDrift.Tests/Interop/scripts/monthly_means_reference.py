"""numpy monthly means of a record, for the library example's climatology check: per calendar
month present, nanmean over the frames of that month, cell by cell (slot-major, month - 1 first).

usage: monthly_means_reference.py INPUT VAR
Prints JSON {"MONTH": [values, null where no sample]}."""
import json
import sys
import warnings

import netCDF4
import numpy as np

path, var = sys.argv[1:3]
with netCDF4.Dataset(path) as ds:
    tv = ds["time"]
    dates = netCDF4.num2date(tv[:], tv.units, getattr(tv, "calendar", "standard"), only_use_cftime_datetimes=True)
    data = ds[var][:].astype(np.float64).filled(np.nan)
months = np.array([d.month for d in dates])
out = {}
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    for m in sorted(set(months.tolist())):
        mean = np.nanmean(data[months == m], axis=0).ravel()
        out[str(m)] = [None if np.isnan(x) else float(x) for x in mean]
print(json.dumps(out))
