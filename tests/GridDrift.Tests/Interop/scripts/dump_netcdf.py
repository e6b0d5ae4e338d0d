"""Dump a NetCDF file as JSON through python netCDF4 (netCDF-C underneath): the witness the
interop tests compare GridDrift's reader with.

usage: dump_netcdf.py FILE [raw|decoded] [max_elements]
  raw      values as stored (no masking, no scale/offset)
  decoded  values after CF masking and unpacking, missing as null
"""
import json
import math
import sys
import warnings

import netCDF4
import numpy as np


def plain(value):
    if isinstance(value, (bytes, np.bytes_)):
        return value.decode("utf-8", "replace")
    if isinstance(value, str):
        return value
    arr = np.atleast_1d(np.asarray(value))
    if arr.dtype.kind in "SU":
        return [plain(x) for x in arr.tolist()]
    if arr.dtype.kind == "O":
        return [str(x) for x in arr.tolist()]
    if arr.dtype.names:
        return "compound"
    return [number(x) for x in arr.tolist()]


def number(x):
    if isinstance(x, float) and not math.isfinite(x):
        return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
    return x


def kind_of(var):
    dt = var.datatype
    if isinstance(dt, netCDF4.CompoundType):
        return "compound"
    if isinstance(dt, netCDF4.VLType):
        return "string" if dt.dtype == str else "variable-length"
    if isinstance(dt, netCDF4.EnumType):
        return "enum"
    if var.dtype == str:
        return "string"
    return np.dtype(var.dtype).name


def walk(group, prefix, out, mode, limit):
    for name, dim in group.dimensions.items():
        out["dimensions"][prefix + name] = {"size": len(dim), "unlimited": dim.isunlimited()}
    for name, var in group.variables.items():
        entry = {"kind": kind_of(var), "dims": [prefix + d if d in group.dimensions else d for d in var.dimensions],
                 "shape": list(var.shape), "attributes": {}}
        for att in var.ncattrs():
            try:
                entry["attributes"][att] = plain(var.getncattr(att))
            except Exception as e:  # unreadable attribute types
                entry["attributes"][att] = f"unreadable: {e}"
        if entry["kind"] not in ("compound", "variable-length", "enum") and int(np.prod(var.shape, dtype=np.int64)) <= limit:
            is_char = np.dtype(var.dtype).kind == "S" if var.dtype != str else False
            var.set_auto_maskandscale(mode == "decoded" and not is_char)
            if entry["kind"] == "string":
                entry["values"] = [str(x) for x in np.asarray(var[...]).ravel().tolist()]
            else:
                data = var[...]
                if np.ma.isMaskedArray(data):
                    flat = data.astype(np.float64).filled(np.nan).ravel()
                else:
                    data = np.asarray(data)
                    if data.dtype.kind == "S":
                        data = data.view(np.uint8)
                    flat = data.astype(np.float64).ravel()
                entry["values"] = [number(float(x)) for x in flat.tolist()]
        out["variables"][prefix + name] = entry
    for name, sub in group.groups.items():
        walk(sub, prefix + name + "/", out, mode, limit)


def main():
    path = sys.argv[1]
    mode = sys.argv[2] if len(sys.argv) > 2 else "raw"
    limit = int(sys.argv[3]) if len(sys.argv) > 3 else 200000
    warnings.simplefilter("ignore")
    with netCDF4.Dataset(path) as ds:
        out = {"format": ds.data_model, "disk_format": ds.disk_format, "dimensions": {}, "variables": {},
               "attributes": {}}
        for a in ds.ncattrs():
            try:
                out["attributes"][a] = plain(ds.getncattr(a))
            except Exception as e:  # user-defined attribute types netCDF4-python cannot read
                out["attributes"][a] = f"unreadable: {e}"
        walk(ds, "", out, mode, limit)
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
