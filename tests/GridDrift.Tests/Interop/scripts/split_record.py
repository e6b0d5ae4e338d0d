"""Split a NetCDF file along its unlimited time dimension into N files with python netCDF4 (every
dimension, variable and attribute copied; variables along time sliced), named PREFIX_1.nc …

usage: split_record.py IN PREFIX N"""
import sys

import netCDF4
import numpy as np

source, prefix, parts = sys.argv[1], sys.argv[2], int(sys.argv[3])
with netCDF4.Dataset(source) as src:
    src.set_auto_maskandscale(False)
    n = len(src.dimensions["time"])
    cuts = np.linspace(0, n, parts + 1).astype(int)
    for k in range(parts):
        lo, hi = cuts[k], cuts[k + 1]
        with netCDF4.Dataset(f"{prefix}_{k + 1}.nc", "w", format=src.data_model) as dst:
            dst.setncatts({a: src.getncattr(a) for a in src.ncattrs()})
            for name, dim in src.dimensions.items():
                dst.createDimension(name, None if dim.isunlimited() else len(dim))
            for name, var in src.variables.items():
                fill = var.getncattr("_FillValue") if "_FillValue" in var.ncattrs() else None
                out = dst.createVariable(name, var.dtype, var.dimensions, fill_value=fill)
                out.setncatts({a: var.getncattr(a) for a in var.ncattrs() if a != "_FillValue"})
                out.set_auto_maskandscale(False)
                if var.dimensions and var.dimensions[0] == "time":
                    out[:] = var[lo:hi]
                else:
                    out[:] = var[:]
print("ok")
