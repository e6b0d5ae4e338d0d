"""numpy anomalies of a record against a climatology file, beside GridDrift's anomaly file.

usage: anomalies_reference.py INPUT VAR CLIMATOLOGY KIND SLOTS OURS RADIUS

KIND: absolute | relative | standardized; SLOTS: month (slot = month - 1) or noleap-day
(slot = day of year - 1). The climatology (mean and VAR_std) is read with python netCDF4.
Prints JSON: "expected" and "ours" anomaly fields (slot-major flattening, null where
missing) and "global": the area-weighted mean of the expected anomaly per frame with exact
cell areas R^2 dlon (sin phi2 - sin phi1) from midpoint edges clamped at +-90 (NaN cells
left out; null when a frame has none).
"""
import sys, json, warnings
import numpy as np
import netCDF4

path, var, clim_path, kind, slots_kind, ours, radius = sys.argv[1:8]
radius = float(radius)
with netCDF4.Dataset(path) as ds:
    t = ds["time"]
    dates = netCDF4.num2date(t[:], t.units, getattr(t, "calendar", "standard"), only_use_cftime_datetimes=True)
    data = ds[var][:].astype(np.float64).filled(np.nan)
    lat = ds["lat"][:].astype(np.float64)
    lon = ds["lon"][:].astype(np.float64)
with netCDF4.Dataset(clim_path) as ds:
    mean = ds[var][:].astype(np.float64).filled(np.nan)
    std = ds[var + "_std"][:].astype(np.float64).filled(np.nan)
slots = np.array([d.month - 1 if slots_kind == "month" else d.dayofyr - 1 for d in dates])
m, s = mean[slots], std[slots]
with warnings.catch_warnings():
    warnings.simplefilter("ignore", RuntimeWarning)
    if kind == "absolute":
        a = data - m
    elif kind == "relative":
        a = np.where(np.abs(m) > 1e-12, 100 * (data - m) / m, np.nan)
    else:
        a = np.where(s > np.maximum(1e-12, 1e-6 * np.abs(m)), (data - m) / s, np.nan)


def edges(c):
    e = np.empty(c.size + 1)
    e[1:-1] = 0.5 * (c[1:] + c[:-1])
    e[0] = c[0] - 0.5 * (c[1] - c[0])
    e[-1] = c[-1] + 0.5 * (c[-1] - c[-2])
    return e


lat_e = np.clip(edges(lat), -90, 90)
area = radius ** 2 * np.abs(np.sin(np.deg2rad(lat_e[1:])) - np.sin(np.deg2rad(lat_e[:-1])))[:, None] * np.deg2rad(np.abs(np.diff(edges(lon))))[None, :]
series = []
for f in a:
    ok = ~np.isnan(f)
    series.append(float(np.sum(f[ok] * area[ok]) / np.sum(area[ok])) if ok.any() else None)


def flat(x):
    x = np.ma.masked_invalid(x) if not np.ma.isMaskedArray(x) else x
    return [None if mk else float(v) for v, mk in zip(np.ma.getdata(x).ravel(), np.ma.getmaskarray(x).ravel())]


with netCDF4.Dataset(ours) as ds:
    theirs = ds[var][:].astype(np.float64)
print(json.dumps({"expected": flat(a), "ours": flat(theirs), "global": series, "area": float(area.sum())}))
