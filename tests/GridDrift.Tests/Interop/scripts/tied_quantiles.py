"""The tie-aware area-weighted quantile (docs/methods.md), written independently in numpy, on a
packed int16 field with many tied values, stored south-to-north and north-to-south.

Writes FOLDER/sn.nc and FOLDER/ns.nc (the same field, latitude axis reversed) and prints JSON
{"p10": [...], "p50": [...], "p90": [...]} per frame, weights being the exact cell areas on the
sphere, R^2 dlon (sin lat2 - sin lat1).

usage: tied_quantiles.py FOLDER"""
import json
import sys

import netCDF4
import numpy as np

folder = sys.argv[1]
rng = np.random.default_rng(5)
nt, ny, nx = 3, 24, 48
lat = -90 + 7.5 / 2 + 7.5 * np.arange(ny)
lon = 7.5 * np.arange(nx)
packed = rng.integers(-20, 21, (nt, ny, nx)).astype("i2")  # 41 distinct values over 1152 cells: many ties
scale, offset = np.float32(0.5), np.float32(250)


def write(path, flip):
    with netCDF4.Dataset(path, "w", format="NETCDF3_64BIT_OFFSET") as ds:
        ds.createDimension("time", None)
        ds.createDimension("lat", ny)
        ds.createDimension("lon", nx)
        t = ds.createVariable("time", "f8", ("time",))
        t.units = "days since 2031-01-01"
        t[:] = np.arange(nt)
        la = ds.createVariable("lat", "f4", ("lat",))
        la.units = "degrees_north"
        la[:] = lat[::-1] if flip else lat
        lo = ds.createVariable("lon", "f4", ("lon",))
        lo.units = "degrees_east"
        lo[:] = lon
        v = ds.createVariable("tb", "i2", ("time", "lat", "lon"))
        v.scale_factor = scale
        v.add_offset = offset
        v.units = "K"
        v.set_auto_maskandscale(False)
        v[:] = packed[:, ::-1, :] if flip else packed


write(f"{folder}/sn.nc", False)
write(f"{folder}/ns.nc", True)

edges = np.radians(np.concatenate([[-90], (lat[:-1] + lat[1:]) / 2, [90]]))
band = np.sin(edges[1:]) - np.sin(edges[:-1])
area = np.repeat(band[:, None], nx, axis=1) * np.radians(7.5)


def quantile(values, weights, p):
    atoms, inverse = np.unique(values, return_inverse=True)
    w = np.bincount(inverse, weights=weights)
    mids = (np.cumsum(w) - w / 2) / w.sum()
    return float(np.interp(p, mids, atoms))


out = {"p10": [], "p50": [], "p90": []}
for k in range(nt):
    x = (packed[k].astype("f4") * scale + offset).ravel()
    for name, p in (("p10", 0.1), ("p50", 0.5), ("p90", 0.9)):
        out[name].append(quantile(x, area.ravel(), p))
print(json.dumps(out))
