"""Compares the numeric variables of NetCDF products in two folders, read by python netCDF4.

usage: compare_products.py DIR_A DIR_B FILE...

For each FILE and each numeric variable: whether the values are identical (NaN equal to NaN,
same shape), whether they are missing in the same places, and the largest absolute difference. Also the global attributes of the files of both folders.
Prints JSON {file: {"variables": {name: {"identical": bool, "max_abs": float}}, "attributes": {...}}}.
"""
import sys, json
import numpy as np
import netCDF4

a_dir, b_dir, files = sys.argv[1], sys.argv[2], sys.argv[3:]
result = {}
for f in files:
    with netCDF4.Dataset(f"{a_dir}/{f}") as a, netCDF4.Dataset(f"{b_dir}/{f}") as b:
        variables = {}
        for name, va in a.variables.items():
            if va.dtype.kind not in "fiu":
                continue
            x = np.ma.filled(va[:].astype(np.float64), np.nan)
            y = np.ma.filled(b[name][:].astype(np.float64), np.nan)
            same_shape = x.shape == y.shape
            identical = same_shape and bool(np.array_equal(x, y, equal_nan=True))
            diff = float(np.nanmax(np.abs(x - y))) if same_shape and x.size and not np.all(np.isnan(x - y)) else 0.0
            same_missing = same_shape and bool(np.array_equal(np.isnan(x), np.isnan(y)))
            variables[name] = {"identical": identical, "same_shape": same_shape, "same_missing": same_missing, "max_abs": diff, "max_value": float(np.nanmax(np.abs(x))) if x.size else 0.0}
        result[f] = {"variables": variables, "attributes": {k: str(b.getncattr(k)) for k in b.ncattrs()},
                     "attributes_a": {k: str(a.getncattr(k)) for k in a.ncattrs()}}
print(json.dumps(result))
