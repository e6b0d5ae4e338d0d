"""The model-to-observation chain: an invented noleap model record and an observation grid, and
the numpy expectation of the daily column water vapour.

usage: model_chain_reference.py make MODEL OBS    writes both files with python netCDF4
       model_chain_reference.py check MODEL OURS  prints JSON describing OURS and its errors

MODEL: noleap, 6-hourly, 2032-02-26 .. 2032-03-02 (a leap year in the standard calendar),
q (kg/kg) on 6 levels in hPa, on a 4 x 8 grid, the same in every cell at a given time (so any
conservative remap keeps it), varying in time. OBS: a 3 x 6 grid of its own. Expected value
per standard-calendar day: the mean over that day's four times of (1/g) * trapz(q, p in Pa).
"""
import sys, json
import numpy as np
import netCDF4
import cftime

plev = np.array([1000, 850, 700, 500, 300, 100], dtype="f8")

def q_at(k):
    return 0.012 * (plev / 1000.0) ** 2.5 * (1 + 0.1 * np.sin(k * 0.7))

if sys.argv[1] == "make":
    model, obs = sys.argv[2], sys.argv[3]
    n = 6 * 4  # six noleap days (26, 27, 28 February, 1, 2, 3 March) at 6-hourly steps
    with netCDF4.Dataset(model, "w", format="NETCDF4") as ds:
        ds.createDimension("time", None); ds.createDimension("plev", plev.size); ds.createDimension("lat", 4); ds.createDimension("lon", 8)
        t = ds.createVariable("time", "f8", ("time",)); t.units = "hours since 2032-02-26 00:00:00"; t.calendar = "noleap"; t[:] = np.arange(n) * 6.0
        p = ds.createVariable("plev", "f8", ("plev",)); p.units = "hPa"; p.standard_name = "air_pressure"; p.positive = "down"; p[:] = plev
        y = ds.createVariable("lat", "f8", ("lat",)); y.units = "degrees_north"; y.standard_name = "latitude"; y[:] = [-67.5, -22.5, 22.5, 67.5]
        x = ds.createVariable("lon", "f8", ("lon",)); x.units = "degrees_east"; x.standard_name = "longitude"; x[:] = np.arange(8) * 45 + 22.5
        q = ds.createVariable("hus", "f4", ("time", "plev", "lat", "lon")); q.units = "kg kg-1"; q.standard_name = "specific_humidity"
        q[:] = np.stack([np.broadcast_to(q_at(k)[:, None, None], (plev.size, 4, 8)) for k in range(n)]).astype("f4")
    with netCDF4.Dataset(obs, "w", format="NETCDF3_64BIT_OFFSET") as ds:
        ds.createDimension("time", 1); ds.createDimension("lat", 3); ds.createDimension("lon", 6)
        t = ds.createVariable("time", "f8", ("time",)); t.units = "days since 2032-01-01"; t[:] = [0]
        y = ds.createVariable("lat", "f8", ("lat",)); y.units = "degrees_north"; y.standard_name = "latitude"; y[:] = [-60, 0, 60]
        x = ds.createVariable("lon", "f8", ("lon",)); x.units = "degrees_east"; x.standard_name = "longitude"; x[:] = np.arange(6) * 60 + 30
        v = ds.createVariable("tb", "f4", ("time", "lat", "lon")); v.units = "K"; v[:] = 250
else:
    model, ours = sys.argv[2], sys.argv[3]
    with netCDF4.Dataset(model) as ds:
        times = netCDF4.num2date(ds["time"][:], ds["time"].units, "noleap", only_use_cftime_datetimes=True)
        q = ds["hus"][:, :, 0, 0].astype("f8")
    columns = {}
    order = np.argsort(plev)
    for k, tt in enumerate(times):
        columns.setdefault((tt.year, tt.month, tt.day), []).append(np.trapz(q[k][order], plev[order] * 100.0) / 9.80665)
    with netCDF4.Dataset(ours) as ds:
        tv = ds["time"]
        days = netCDF4.num2date(tv[:], tv.units, tv.calendar, only_use_cftime_datetimes=True)
        bounds = netCDF4.num2date(ds[tv.bounds][:], tv.units, tv.calendar, only_use_cftime_datetimes=True)
        values = ds["tcwv"][:].astype("f8")
        out = {"calendar": tv.calendar, "dates": [d.strftime("%Y-%m-%d") for d in days],
               "bounds": [[b[0].isoformat(), b[1].isoformat()] for b in bounds],
               "cell_methods": ds["tcwv"].cell_methods, "standard_name": ds["tcwv"].standard_name, "units": ds["tcwv"].units,
               "shape": list(values.shape), "max_rel": 0.0}
        for i, d in enumerate(days):
            expected = np.mean(columns[(d.year, d.month, d.day)])
            out["max_rel"] = max(out["max_rel"], float(np.max(np.abs(values[i] - expected)) / expected))
    print(json.dumps(out))
