"""An invented limited-area record (20-45 N, 100-140.5 E, 0.5 degree) of brightness temperature,
6-hourly, four frames of a drifting wave pattern plus noise, for the similarity checks.

usage: make_similarity_fixture.py OUT"""
import sys

import netCDF4
import numpy as np

rng = np.random.default_rng(11)
lat = np.arange(20, 45.01, 0.5)
lon = np.arange(100, 140.51, 0.5)
with netCDF4.Dataset(sys.argv[1], "w", format="NETCDF3_64BIT_OFFSET") as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", lat.size)
    ds.createDimension("lon", lon.size)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "hours since 2031-05-01"
    t.standard_name = "time"
    ds.createVariable("lat", "f4", ("lat",), fill_value=False)[:] = lat
    ds["lat"].units = "degrees_north"
    ds.createVariable("lon", "f4", ("lon",), fill_value=False)[:] = lon
    ds["lon"].units = "degrees_east"
    v = ds.createVariable("tb", "f4", ("time", "lat", "lon"))
    v.units = "K"
    v.standard_name = "toa_brightness_temperature"
    Y, X = np.meshgrid(np.deg2rad(lat), np.deg2rad(lon), indexing="ij")
    for i in range(4):
        t[i] = 6 * i
        v[i] = (240 + 12 * np.sin(6 * X - 0.4 * i) * np.cos(5 * Y) + 4 * np.sin(11 * Y + 0.3 * i) + rng.normal(0, 0.8 + i, X.shape)).astype("f4")
