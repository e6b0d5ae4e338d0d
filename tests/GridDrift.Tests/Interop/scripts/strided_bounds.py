"""A latitude-longitude subset taken with a stride of 2 along latitude that keeps each cell's own
CF bounds (CF 7.1), so neighbouring cells do not touch; numpy's exact areas of those cells
(R^2 dlon (sin lat2 - sin lat1), R = 6371008.8 m) and the area-weighted mean of the field.

Writes FOLDER/strided.nc; prints JSON {"area": total area, "mean": [per frame]}.

usage: strided_bounds.py FOLDER"""
import json
import sys

import netCDF4
import numpy as np

folder = sys.argv[1]
R = 6371008.8
edges = np.arange(-90, 91, 5.0)
south, north = edges[:-1][::2], edges[1:][::2]          # every other 5-degree row
lat = (south + north) / 2
lon_w = np.arange(0, 360, 10.0)
lon = lon_w + 5
rng = np.random.default_rng(3)
x = rng.normal(30, 8, (2, len(lat), len(lon))).astype("f4")
with netCDF4.Dataset(f"{folder}/strided.nc", "w", format="NETCDF3_64BIT_OFFSET") as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", len(lat))
    ds.createDimension("lon", len(lon))
    ds.createDimension("nv", 2)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "days since 2031-01-01"
    t[:] = [0, 1]
    la = ds.createVariable("lat", "f8", ("lat",))
    la.units = "degrees_north"
    la.bounds = "lat_bnds"
    la[:] = lat
    lb = ds.createVariable("lat_bnds", "f8", ("lat", "nv"))
    lb[:] = np.stack([south, north], axis=1)
    lo = ds.createVariable("lon", "f8", ("lon",))
    lo.units = "degrees_east"
    lo.bounds = "lon_bnds"
    lo[:] = lon
    ob = ds.createVariable("lon_bnds", "f8", ("lon", "nv"))
    ob[:] = np.stack([lon_w, lon_w + 10], axis=1)
    v = ds.createVariable("tcwv", "f4", ("time", "lat", "lon"))
    v.units = "kg m-2"
    v[:] = x
area = R * R * np.radians(10.0) * (np.sin(np.radians(north)) - np.sin(np.radians(south)))[:, None] * np.ones(len(lon))
print(json.dumps({"area": float(area.sum()), "mean": [float((x[k] * area).sum() / area.sum()) for k in range(2)]}))
