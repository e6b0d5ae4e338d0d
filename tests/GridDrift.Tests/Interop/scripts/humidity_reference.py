"""Humidity conversions with numpy from the published formulas, on a fixture of python netCDF4.

usage: humidity_reference.py make OUT           q (g/kg) and t (degC) on levels in hPa; td (K) and ps (hPa) at the surface
       humidity_reference.py rh OUT OURS        max relative error of our hur against numpy
       humidity_reference.py q OUT OURS         max relative error of our hus against numpy
Bolton (1980) eq. 10: es = 6.112 exp(17.67 T / (T + 243.5)) hPa, T in degC; e = q p / (0.622 + 0.378 q);
RH = 100 e / es; q = 0.622 e / (p - 0.378 e) with e = es(dew point).
"""
import sys, json
import numpy as np
import netCDF4

def es(celsius):
    return 611.2 * np.exp(17.67 * celsius / (celsius + 243.5))

if sys.argv[1] == "make":
    rng = np.random.default_rng(2)
    plev = np.array([1000, 850, 500], "f8")
    with netCDF4.Dataset(sys.argv[2], "w", format="NETCDF4") as ds:
        ds.createDimension("time", None); ds.createDimension("plev", 3); ds.createDimension("lat", 3); ds.createDimension("lon", 4)
        t = ds.createVariable("time", "f8", ("time",)); t.units = "days since 2031-01-01"; t.calendar = "noleap"; t[:] = [0, 1]
        p = ds.createVariable("plev", "f8", ("plev",)); p.units = "hPa"; p.standard_name = "air_pressure"; p.positive = "down"; p[:] = plev
        y = ds.createVariable("lat", "f8", ("lat",)); y.units = "degrees_north"; y[:] = [-30, 0, 30]
        x = ds.createVariable("lon", "f8", ("lon",)); x.units = "degrees_east"; x[:] = [0, 90, 180, 270]
        q = ds.createVariable("hus", "f4", ("time", "plev", "lat", "lon")); q.units = "g/kg"; q.standard_name = "specific_humidity"
        q[:] = rng.uniform(0.5, 15, (2, 3, 3, 4))
        ta = ds.createVariable("ta", "f4", ("time", "plev", "lat", "lon")); ta.units = "degC"; ta.standard_name = "air_temperature"
        ta[:] = rng.uniform(-25, 30, (2, 3, 3, 4))
        td = ds.createVariable("tdps", "f4", ("time", "lat", "lon")); td.units = "K"; td.standard_name = "dew_point_temperature"
        td[:] = rng.uniform(250, 300, (2, 3, 4))
        ps = ds.createVariable("ps", "f4", ("time", "lat", "lon")); ps.units = "hPa"; ps.standard_name = "surface_air_pressure"
        ps[:] = rng.uniform(950, 1030, (2, 3, 4))
else:
    kind, src, ours = sys.argv[1], sys.argv[2], sys.argv[3]
    with netCDF4.Dataset(src) as ds:
        if kind == "rh":
            q = ds["hus"][:].astype("f8") * 1e-3
            t = ds["ta"][:].astype("f8")
            p = ds["plev"][:].astype("f8")[None, :, None, None] * 100
            e = q * p / (0.622 + 0.378 * q)
            expected = 100 * e / es(t)
        else:
            td = ds["tdps"][:].astype("f8") - 273.15
            p = ds["ps"][:].astype("f8") * 100
            e = es(td)
            expected = 0.622 * e / (p - 0.378 * e)
    with netCDF4.Dataset(ours) as ds:
        got = ds["hur" if kind == "rh" else "hus"][:].astype("f8")
        units = ds["hur" if kind == "rh" else "hus"].units
    print(json.dumps({"max_rel": float(np.max(np.abs(got - expected) / np.abs(expected))), "units": units, "shape": list(got.shape)}))
