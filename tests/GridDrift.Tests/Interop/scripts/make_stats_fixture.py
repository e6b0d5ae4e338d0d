"""Make an invented (time, lat, lon) record in a given netCDF format with python netCDF4, for the
stats checks: a 0.75 degree global grid whose cells are centred on the poles and on +-30 degrees
(so band edges at +-30 cut cells in half), a smooth field plus noise, and missing cells.

usage: make_stats_fixture.py OUT FORMAT [calendar]   FORMAT: NETCDF3_CLASSIC, NETCDF3_64BIT_OFFSET,
NETCDF3_64BIT_DATA, NETCDF4_CLASSIC, NETCDF4"""
import sys

import netCDF4
import numpy as np

out, fmt = sys.argv[1], sys.argv[2]
calendar = sys.argv[3] if len(sys.argv) > 3 else "standard"
rng = np.random.default_rng(7)
lat = np.linspace(90, -90, 241)          # north to south, centred on the poles, as ERA grids
lon = np.arange(0, 360, 1.5)             # 240 columns, 0..360
with netCDF4.Dataset(out, "w", format=fmt) as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", lat.size)
    ds.createDimension("lon", lon.size)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "days since 2031-02-27"
    t.calendar = calendar
    t.standard_name = "time"
    la = ds.createVariable("lat", "f4", ("lat",))
    la.units = "degrees_north"
    la[:] = lat
    lo = ds.createVariable("lon", "f4", ("lon",))
    lo.units = "degrees_east"
    lo[:] = lon
    kw = {"zlib": True, "complevel": 2} if fmt.startswith("NETCDF4") else {}
    v = ds.createVariable("tcwv", "f4", ("time", "lat", "lon"), fill_value=np.float32(-999), **kw)
    v.units = "kg m-2"
    phi = np.deg2rad(lat)[:, None]
    lam = np.deg2rad(lon)[None, :]
    for i in range(5):
        t[i] = i
        f = (10 + 40 * np.cos(phi) ** 3 + 5 * np.sin(2 * lam + i) * np.cos(phi) + rng.normal(0, 1, (lat.size, lon.size))).astype("f4")
        f[rng.random(f.shape) < 0.05] = np.nan          # scattered missing cells
        if i == 3:
            f[lat > 60, :] = np.nan                       # the whole northern cap missing: bands below --min-valid
        v[i] = np.ma.masked_invalid(f)
