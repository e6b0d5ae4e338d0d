"""Compares variables of two NetCDF files read by python netCDF4 (any format).

usage: compare_variables.py A B VAR...

Prints JSON {VAR: {"identical": bool, "shape_a": [...], "shape_b": [...], "filters_b": {...}|null,
"chunking_b": [...]|"contiguous"}} with the HDF5 filters and chunking python netCDF4 reports for B.
"""
import sys, json
import numpy as np
import netCDF4

a_path, b_path, names = sys.argv[1], sys.argv[2], sys.argv[3:]
out = {}
with netCDF4.Dataset(a_path) as a, netCDF4.Dataset(b_path) as b:
    out["_format_b"] = b.data_model
    out["_unlimited_b"] = [n for n, d in b.dimensions.items() if d.isunlimited()]
    for n in names:
        x = np.ma.filled(a[n][:].astype(np.float64), np.nan)
        y = np.ma.filled(b[n][:].astype(np.float64), np.nan)
        chunking = b[n].chunking()
        out[n] = {"identical": x.shape == y.shape and bool(np.array_equal(x, y, equal_nan=True)),
                  "shape_a": list(x.shape), "shape_b": list(y.shape),
                  "filters_b": b[n].filters(), "chunking_b": chunking if chunking == "contiguous" else list(chunking),
                  "attributes_equal": {k: str(a[n].getncattr(k)) for k in a[n].ncattrs()} == {k: str(b[n].getncattr(k)) for k in b[n].ncattrs()}}
print(json.dumps(out))
