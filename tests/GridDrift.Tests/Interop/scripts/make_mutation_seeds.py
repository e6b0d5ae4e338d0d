"""Make the invented seed files of the mutation campaign with python netCDF4: a packed int16
classic file (scale_factor, add_offset, _FillValue, valid_range), a deflate+shuffle netCDF-4
file, and a netCDF-4 file with a string variable and groups.

usage: make_mutation_seeds.py FOLDER"""
import sys

import netCDF4
import numpy as np

folder = sys.argv[1]
rng = np.random.default_rng(11)


def grid(ds, n_time=4, n_lat=6, n_lon=8):
    ds.createDimension("time", None)
    ds.createDimension("lat", n_lat)
    ds.createDimension("lon", n_lon)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "hours since 2031-01-01"
    t.standard_name = "time"
    la = ds.createVariable("lat", "f4", ("lat",))
    la.units = "degrees_north"
    la[:] = np.linspace(-75, 75, n_lat)
    lo = ds.createVariable("lon", "f4", ("lon",))
    lo.units = "degrees_east"
    lo[:] = np.arange(n_lon) * (360 / n_lon)
    t[:] = np.arange(n_time) * 6.0


with netCDF4.Dataset(f"{folder}/packed.nc", "w", format="NETCDF3_64BIT_OFFSET") as ds:
    grid(ds)
    v = ds.createVariable("tb", "i2", ("time", "lat", "lon"), fill_value=np.int16(-32767))
    v.scale_factor = np.float32(0.01)
    v.add_offset = np.float32(250)
    v.valid_range = np.array([-7000, 7000], dtype="i2")
    v.units = "K"
    v.set_auto_maskandscale(False)
    v[:] = rng.integers(-6000, 6000, (4, 6, 8)).astype("i2")

with netCDF4.Dataset(f"{folder}/deflate.nc", "w", format="NETCDF4") as ds:
    grid(ds)
    v = ds.createVariable("tcwv", "f4", ("time", "lat", "lon"), zlib=True, complevel=4, shuffle=True, chunksizes=(1, 6, 8))
    v.units = "kg m-2"
    v[:] = (25 + 5 * rng.standard_normal((4, 6, 8))).astype("f4")

with netCDF4.Dataset(f"{folder}/strings.nc", "w", format="NETCDF4") as ds:
    grid(ds)
    ds.createDimension("station", 3)
    s = ds.createVariable("station_name", str, ("station",))
    s[:] = np.array(["north", "equator", "south"], dtype=object)
    g = ds.createGroup("extra")
    g.title = "a group"
    v = ds.createVariable("q", "f8", ("time", "lat", "lon"))
    v.units = "kg kg-1"
    v[:] = rng.random((4, 6, 8)) * 0.02
print("ok")
