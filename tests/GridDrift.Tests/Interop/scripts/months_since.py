"""Time axes in "months since" / "years since", and the dates cftime gives them.

Writes FOLDER/standard.nc (standard calendar, whole "months since 2031-01-15", 24 values),
FOLDER/years.nc (standard, whole "years since 2031-07-01"), FOLDER/d360.nc (360_day, "months
since 2031-01-01") and FOLDER/fraction.nc (standard, half months). Prints JSON with the ISO
dates: calendar months built with cftime.datetime for the standard calendar (where
cftime.num2date refuses month units), cftime.num2date for 360_day (30-day months).

usage: months_since.py FOLDER"""
import json
import sys

import cftime
import netCDF4
import numpy as np

folder = sys.argv[1]


def write(name, units, calendar, values):
    with netCDF4.Dataset(f"{folder}/{name}.nc", "w", format="NETCDF3_CLASSIC") as ds:
        ds.createDimension("time", None)
        ds.createDimension("lat", 2)
        ds.createDimension("lon", 3)
        t = ds.createVariable("time", "f8", ("time",))
        t.units = units
        t.calendar = calendar
        t[:] = values
        la = ds.createVariable("lat", "f4", ("lat",))
        la.units = "degrees_north"
        la[:] = [-45, 45]
        lo = ds.createVariable("lon", "f4", ("lon",))
        lo.units = "degrees_east"
        lo[:] = [0, 120, 240]
        v = ds.createVariable("x", "f4", ("time", "lat", "lon"))
        v[:] = np.arange(len(values) * 6, dtype="f4").reshape(len(values), 2, 3)


months = np.arange(24)
write("standard", "months since 2031-01-15", "standard", months)
write("years", "years since 2031-07-01", "standard", np.arange(3))
write("d360", "months since 2031-01-01", "360_day", np.arange(12))
write("fraction", "months since 2031-01-15", "standard", months * 0.5)
out = {
    "standard": [cftime.datetime(2031 + (k // 12), 1 + k % 12, 15, calendar="standard").isoformat() for k in months],
    "years": [cftime.datetime(2031 + k, 7, 1, calendar="standard").isoformat() for k in range(3)],
    "d360": [d.isoformat() for d in cftime.num2date(np.arange(12), "months since 2031-01-01", "360_day")],
}
print(json.dumps(out))
