"""Column water vapour references with numpy, and a fixture written with python netCDF4.

usage: column_water_reference.py make OUT       writes the invented fixture
       column_water_reference.py check IN OURS  prints JSON {"max_abs": ..., "max_rel": ..., "n": ...}

Fixture: noleap daily, 3 days, q in g/kg on 8 levels given in hPa (descending), surface
pressure ps in Pa (time, lat, lon) both above and below 1000 hPa. Reference per column, with
numpy only: the levels above the surface (p < ps), plus the surface itself with q from
np.interp (linear in pressure; held at the deepest level's value below it), integrated by
np.trapz in Pa, times 1e-3 (g/kg to kg/kg), divided by g = 9.80665.
"""
import sys, json
import numpy as np
import netCDF4

if sys.argv[1] == "make":
    out = sys.argv[2]
    plev = np.array([1000, 925, 850, 700, 500, 300, 200, 100], dtype="f4")
    rng = np.random.default_rng(11)
    with netCDF4.Dataset(out, "w", format="NETCDF4") as ds:
        ds.createDimension("time", None); ds.createDimension("plev", plev.size); ds.createDimension("lat", 4); ds.createDimension("lon", 5)
        t = ds.createVariable("time", "f8", ("time",)); t.units = "days since 2031-01-01"; t.calendar = "noleap"; t[:] = [0, 1, 2]
        p = ds.createVariable("plev", "f4", ("plev",)); p.units = "hPa"; p.standard_name = "air_pressure"; p.positive = "down"; p[:] = plev
        y = ds.createVariable("lat", "f4", ("lat",)); y.units = "degrees_north"; y[:] = [-45, -15, 15, 45]
        x = ds.createVariable("lon", "f4", ("lon",)); x.units = "degrees_east"; x[:] = [0, 72, 144, 216, 288]
        q = ds.createVariable("hus", "f4", ("time", "plev", "lat", "lon")); q.units = "g/kg"; q.standard_name = "specific_humidity"
        q[:] = (16 * (plev[None, :, None, None] / 1000.0) ** 3 * (1 + 0.2 * rng.random((3, plev.size, 4, 5)))).astype("f4")
        ps = ds.createVariable("ps", "f4", ("time", "lat", "lon")); ps.units = "Pa"; ps.standard_name = "surface_air_pressure"
        ps[:] = rng.uniform(80000, 103000, (3, 4, 5)).astype("f4")
else:
    src, ours = sys.argv[2], sys.argv[3]
    with netCDF4.Dataset(src) as ds:
        plev = ds["plev"][:].astype("f8") * 100.0
        q = ds["hus"][:].astype("f8") * 1e-3
        ps = ds["ps"][:].astype("f8")
    with netCDF4.Dataset(ours) as ds:
        got = ds["tcwv"][:].astype("f8")
    order = np.argsort(plev)
    p_sorted = plev[order]
    worst_abs, worst_rel, n = 0.0, 0.0, 0
    for t in range(q.shape[0]):
        for j in range(q.shape[2]):
            for i in range(q.shape[3]):
                col = q[t, :, j, i][order]
                keep = p_sorted < ps[t, j, i]
                pp = np.append(p_sorted[keep], ps[t, j, i])
                qq = np.append(col[keep], np.interp(ps[t, j, i], p_sorted, col))
                expected = np.trapz(qq, pp) / 9.80665
                worst_abs = max(worst_abs, abs(got[t, j, i] - expected))
                worst_rel = max(worst_rel, abs(got[t, j, i] - expected) / abs(expected))
                n += 1
    print(json.dumps({"max_abs": worst_abs, "max_rel": worst_rel, "n": n}))
