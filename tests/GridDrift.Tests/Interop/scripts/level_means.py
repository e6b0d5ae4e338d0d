"""The global area-weighted mean of VAR at one pressure level, per time step, by python netCDF4
(CF unpacking) and numpy with exact cell areas (edges halfway between the 1-D coordinates,
clamped at the poles); and what a GridDrift series PRODUCT says: its global mean and its
scalar coordinate.

usage: level_means.py INPUT VAR LEVEL_IN_FILE_UNITS PRODUCT"""
import json
import sys

import netCDF4
import numpy as np

path, name, level, product = sys.argv[1], sys.argv[2], float(sys.argv[3]), sys.argv[4]
with netCDF4.Dataset(path) as ds:
    plev = ds["plev"][:]
    k = int(np.flatnonzero(np.isclose(plev, level))[0])
    x = ds[name][:, k, :, :].astype("f8")
    lat = ds["lat"][:].astype("f8")
edges = np.concatenate([[lat[0] - (lat[1] - lat[0]) / 2], (lat[:-1] + lat[1:]) / 2, [lat[-1] + (lat[-1] - lat[-2]) / 2]])
edges = np.clip(edges, -90, 90)
band = np.abs(np.sin(np.radians(edges[1:])) - np.sin(np.radians(edges[:-1])))
w = np.repeat(band[:, None], x.shape[2], axis=1)
expected = [float((x[t] * w).sum() / w.sum()) for t in range(x.shape[0])]
with netCDF4.Dataset(product) as p:
    names = [n.strip() for n in netCDF4.chartostring(p["region_name"][:])]
    mean = p["mean"][:, names.index("global")].tolist()
    out = {"expected": expected, "product": mean, "plev": float(p["plev"][...]), "units": p["plev"].units,
           "standard_name": getattr(p["plev"], "standard_name", None), "coordinates": p["mean"].coordinates}
print(json.dumps(out))
