"""Make a netCDF-4 file with nested groups, a dimension without a coordinate variable, NC_STRING
data and attributes, an unlimited dimension, deflate+shuffle chunks, and user-defined types
(compound, enum, vlen) that GridDrift must list and refuse clearly. Values are invented."""
import sys

import netCDF4
import numpy as np

path = sys.argv[1]
with netCDF4.Dataset(path, "w", format="NETCDF4") as ds:
    ds.title = "GridDrift netCDF-4 structure check (invented values)"
    ds.setncattr_string("sources", ["satellite channel 6.2 um", "reanalysis"])
    ds.createDimension("time", None)
    ds.createDimension("station", 3)  # no coordinate variable
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "hours since 2031-01-01"
    t.calendar = "proleptic_gregorian"
    t[:] = [0, 1, 2, 3, 4]
    names = ds.createVariable("station_name", str, ("station",))
    names[:] = np.array(["Alpha ridge", "Beta", "Γάμμα"], dtype=object)
    obs = ds.createGroup("observations")
    obs.createDimension("lat", 4)
    obs.createDimension("lon", 6)
    lat = obs.createVariable("lat", "f4", ("lat",))
    lat.units = "degrees_north"
    lat[:] = [-45, -15, 15, 45]
    lon = obs.createVariable("lon", "f4", ("lon",))
    lon.units = "degrees_east"
    lon[:] = np.arange(6) * 60
    tb = obs.createVariable("tb", "f4", ("time", "lat", "lon"), zlib=True, complevel=5, shuffle=True,
                            chunksizes=(1, 4, 6), fill_value=-1e30)
    tb.units = "K"
    data = 230 + np.arange(5 * 4 * 6, dtype="f4").reshape(5, 4, 6) * 0.37
    data[2, 1, 3] = np.ma.masked
    tb[:] = data
    deep = obs.createGroup("quality")
    flags = deep.createVariable("flags", "u1", ("station",))
    flags[:] = [0, 3, 255]
    counts = deep.createVariable("counts", "i8", ("time", "station"))
    counts[:] = np.arange(15).reshape(5, 3) * 1000000000
    cmp_t = ds.createCompoundType(np.dtype([("x", "f4"), ("y", "f8")]), "pair_t")
    pairs = ds.createVariable("pairs", cmp_t, ("station",))
    pairs[:] = np.array([(1, 2), (3, 4), (5, 6)], dtype=cmp_t.dtype)
    enum_t = ds.createEnumType("u1", "sky_t", {"clear": 0, "cloudy": 1})
    sky = ds.createVariable("sky", enum_t, ("station",))
    sky[:] = [0, 1, 0]
    vlen_t = ds.createVLType("i4", "ragged_t")
    ragged = ds.createVariable("ragged", vlen_t, ("station",))
    ragged[0] = np.array([1], "i4")
    ragged[1] = np.array([1, 2], "i4")
    ragged[2] = np.array([1, 2, 3], "i4")
