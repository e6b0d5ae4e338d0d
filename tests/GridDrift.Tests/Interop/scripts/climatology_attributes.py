"""The CF Conventions 7.4 structure of a climatology file as python netCDF4 sees it.

usage: climatology_attributes.py FILE VAR
Prints JSON: per variable its dimensions and attributes; the global attributes; the
climatology bounds and times decoded by cftime as ISO strings; the latitudes.
"""
import sys, json
import netCDF4

path, var = sys.argv[1:3]
with netCDF4.Dataset(path) as ds:
    t = ds["time"]
    cal = t.calendar
    bounds_name = getattr(t, "climatology", None)
    out = {
        "variables": {name: {"dimensions": list(v.dimensions), "attributes": {k: str(v.getncattr(k)) for k in v.ncattrs()}} for name, v in ds.variables.items()},
        "globals": {k: str(ds.getncattr(k)) for k in ds.ncattrs()},
        "times": [d.isoformat() for d in netCDF4.num2date(t[:], t.units, cal, only_use_cftime_datetimes=True)],
        "lat": [float(x) for x in ds["lat"][:]],
    }
    if bounds_name is not None:
        b = ds[bounds_name][:]
        out["bounds"] = [[d.isoformat() for d in netCDF4.num2date(row, t.units, cal, only_use_cftime_datetimes=True)] for row in b]
print(json.dumps(out))
