"""Writes an invented (time, region) series file with python netCDF4 for the events tests.

usage: make_region_series.py OUT SHIFT_DATE
NETCDF4 format, region labels as variable-length strings (region_label). Six regions, daily
values 2031-01-01 .. 2036-12-31 (standard calendar): 20 + a 3-unit annual cycle + white noise
of sigma 1, with +1.5 added to regions "east_box" and "polar_cap" from SHIFT_DATE on, and
single spikes of +8 on 2032-03-10 in "tropics".
"""
import sys
import numpy as np
import netCDF4
import cftime

out, shift = sys.argv[1], sys.argv[2]
regions = ["global", "tropics", "east_box", "west_box", "midlat", "polar_cap"]
start = cftime.datetime(2031, 1, 1, calendar="standard")
n = int(netCDF4.date2num(cftime.datetime(2037, 1, 1, calendar="standard"), "days since 2031-01-01", "standard"))
days = np.arange(n, dtype=float)
shift_day = netCDF4.date2num(cftime.datetime.strptime(shift, "%Y-%m-%d", calendar="standard"), "days since 2031-01-01", "standard")
spike_day = netCDF4.date2num(cftime.datetime(2032, 3, 10, calendar="standard"), "days since 2031-01-01", "standard")
rng = np.random.default_rng(3)
data = 20 + 3 * np.sin(2 * np.pi * days / 365.2425)[:, None] + rng.normal(0, 1, (n, len(regions)))
for name in ("east_box", "polar_cap"):
    data[days >= shift_day, regions.index(name)] += 1.5
data[int(spike_day), regions.index("tropics")] += 8
with netCDF4.Dataset(out, "w", format="NETCDF4") as ds:
    ds.createDimension("time", None)
    ds.createDimension("region", len(regions))
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "days since 2031-01-01"
    t.calendar = "standard"
    t[:] = days
    label = ds.createVariable("region_label", str, ("region",))
    for i, r in enumerate(regions):
        label[i] = r
    v = ds.createVariable("tcwv_mean", "f8", ("time", "region"))
    v.units = "kg m-2"
    v.coordinates = "region_label"
    v[:] = data
