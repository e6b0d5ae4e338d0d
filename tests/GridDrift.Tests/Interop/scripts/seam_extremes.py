"""Minimum and maximum over boxes that cross a grid's longitude seam, in numpy: the cells whose
latitude and longitude intervals overlap the box's by a positive width (longitudes compared
modulo 360). Two grids of 5 degree cells holding the same random field: longitudes 0..360 and
-180..180. Writes FOLDER/east.nc and FOLDER/west.nc; prints JSON {file: {box: [[min, max] per
frame]}} for the boxes of BOXES (NAME=S,N,W,E, W > E crossing the date line as in GridDrift).

usage: seam_extremes.py FOLDER BOX..."""
import json
import sys

import netCDF4
import numpy as np

folder, boxes = sys.argv[1], sys.argv[2:]
rng = np.random.default_rng(9)
nt, ny, nx = 3, 36, 72
lat = -87.5 + 5 * np.arange(ny)
field = rng.normal(0, 10, (nt, ny, nx)).astype("f4")
grids = {"east": 2.5 + 5 * np.arange(nx), "west": -177.5 + 5 * np.arange(nx)}


def overlaps(lo, hi, w, e):
    """Positive-width overlap of [lo, hi] with the box [w, e] (e may be below w: across 180)."""
    if e < w:
        e += 360
    for shift in (-720, -360, 0, 360, 720):
        if min(hi + shift, e) - max(lo + shift, w) > 0:
            return True
    return False


out = {}
for name, lon in grids.items():
    east_lon = np.mod(lon, 360)  # the same field at the same places on both grids
    data = field[:, :, np.searchsorted(2.5 + 5 * np.arange(nx), east_lon)]
    with netCDF4.Dataset(f"{folder}/{name}.nc", "w", format="NETCDF3_64BIT_OFFSET") as ds:
        ds.createDimension("time", None)
        ds.createDimension("lat", ny)
        ds.createDimension("lon", nx)
        t = ds.createVariable("time", "f8", ("time",))
        t.units = "days since 2031-01-01"
        t[:] = np.arange(nt)
        la = ds.createVariable("lat", "f4", ("lat",))
        la.units = "degrees_north"
        la[:] = lat
        lo = ds.createVariable("lon", "f4", ("lon",))
        lo.units = "degrees_east"
        lo[:] = lon
        v = ds.createVariable("x", "f4", ("time", "lat", "lon"))
        v[:] = data
    out[name] = {}
    for spec in boxes:
        box, bounds = spec.split("=")
        s, n, w, e = (float(b) for b in bounds.split(","))
        rows = [j for j in range(ny) if min(lat[j] + 2.5, n) - max(lat[j] - 2.5, s) > 0]
        cols = [i for i in range(nx) if overlaps(lon[i] - 2.5, lon[i] + 2.5, w, e)]
        sel = data[:, rows][:, :, cols]
        out[name][box] = [[float(sel[k].min()), float(sel[k].max())] for k in range(nt)]
print(json.dumps(out))
