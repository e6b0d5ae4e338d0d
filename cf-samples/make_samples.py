"""Make GridDrift's small CF sample files. Everything here is INVENTED: a fictional 2031 record
on coarse grids, for examples and first runs, not observations of any real atmosphere.

    /usr/bin/python3 cf-samples/make_samples.py cf-samples

needs Debian's python3-netcdf4 and python3-numpy. The output is deterministic (fixed seed).
"""
import os
import sys

import netCDF4
import numpy as np

out = sys.argv[1] if len(sys.argv) > 1 else os.path.dirname(os.path.abspath(__file__))
rng = np.random.default_rng(2031)


def provenance(ds, title):
    ds.Conventions = "CF-1.12"
    ds.title = title
    ds.institution = "GridDrift project (synthetic sample)"
    ds.source = "invented by cf-samples/make_samples.py; not real data"
    ds.history = "created by cf-samples/make_samples.py"


# 1. Total column water vapour, 3-hourly, 5 degree global grid, standard calendar, CDF-2.
with netCDF4.Dataset(os.path.join(out, "tcwv_synthetic_2031.nc"), "w", format="NETCDF3_64BIT_OFFSET") as ds:
    provenance(ds, "Synthetic total column water vapour, 3-hourly, January 2031 (invented)")
    ds.createDimension("time", None)
    ds.createDimension("lat", 36)
    ds.createDimension("lon", 72)
    ds.createDimension("nv", 2)
    t = ds.createVariable("time", "f8", ("time",))
    t.standard_name = "time"
    t.units = "hours since 2031-01-01 00:00:00"
    t.calendar = "standard"
    t.axis = "T"
    lat = ds.createVariable("lat", "f4", ("lat",))
    lat.standard_name = "latitude"
    lat.units = "degrees_north"
    lat.bounds = "lat_bnds"
    lat[:] = -87.5 + 5 * np.arange(36)
    lb = ds.createVariable("lat_bnds", "f4", ("lat", "nv"))
    lb[:] = np.stack([lat[:] - 2.5, lat[:] + 2.5], axis=1)
    lon = ds.createVariable("lon", "f4", ("lon",))
    lon.standard_name = "longitude"
    lon.units = "degrees_east"
    lon[:] = 2.5 + 5 * np.arange(72)
    v = ds.createVariable("tcwv", "f4", ("time", "lat", "lon"), fill_value=np.float32(-999.0))
    v.standard_name = "atmosphere_mass_content_of_water_vapor"
    v.long_name = "total column water vapour (synthetic)"
    v.units = "kg m-2"
    v.valid_min = np.float32(0.0)
    v.valid_max = np.float32(100.0)
    phi = np.deg2rad(lat[:])[:, None]
    lam = np.deg2rad(lon[:])[None, :]
    hours = np.arange(0, 48 * 3, 3.0)
    for i, h in enumerate(hours):
        # moist tropics, a diurnal wobble and a travelling wave; a few cells missing
        field = 8 + 42 * np.cos(phi) ** 4 + 3 * np.sin(2 * np.pi * h / 24 + lam) * np.cos(phi) \
            + 4 * np.sin(3 * lam - 2 * np.pi * h / 120) * np.cos(phi) ** 2 + rng.normal(0, 0.8, (36, 72))
        field = np.clip(field, 0, 100).astype("f4")
        if i % 7 == 3:
            field[10:12, 20:26] = np.nan
        t[i] = h
        v[i] = np.ma.masked_invalid(field)

# 2. Specific humidity on pressure levels, daily, noleap model calendar, packed int16, netCDF-4 deflate.
with netCDF4.Dataset(os.path.join(out, "q_levels_noleap_2031.nc"), "w", format="NETCDF4") as ds:
    provenance(ds, "Synthetic model specific humidity on pressure levels, daily, noleap calendar (invented)")
    ds.createDimension("time", None)
    ds.createDimension("plev", 4)
    ds.createDimension("lat", 18)
    ds.createDimension("lon", 36)
    t = ds.createVariable("time", "f8", ("time",))
    t.standard_name = "time"
    t.units = "days since 2031-02-25"
    t.calendar = "noleap"
    p = ds.createVariable("plev", "f4", ("plev",))
    p.standard_name = "air_pressure"
    p.units = "hPa"
    p.positive = "down"
    p[:] = [1000, 850, 700, 500]
    lat = ds.createVariable("lat", "f4", ("lat",))
    lat.units = "degrees_north"
    lat[:] = 85 - 10 * np.arange(18)  # north to south, as many reanalyses store it
    lon = ds.createVariable("lon", "f4", ("lon",))
    lon.units = "degrees_east"
    lon[:] = -175 + 10 * np.arange(36)
    q = ds.createVariable("q", "i2", ("time", "plev", "lat", "lon"), zlib=True, complevel=4, shuffle=True,
                          chunksizes=(1, 4, 18, 36), fill_value=np.int16(-32767))
    q.standard_name = "specific_humidity"
    q.units = "kg kg-1"
    q.scale_factor = 1e-6
    q.add_offset = 0.02
    phi = np.deg2rad(lat[:])[None, :, None]
    scale_height = np.array([1.0, 0.7, 0.45, 0.2])[:, None, None]
    for d in range(6):  # 25, 26, 27, 28 February, then 1 and 2 March: noleap has no 29 February
        t[d] = d
        field = (0.018 * np.cos(phi) ** 3 * scale_height + rng.normal(0, 2e-4, (4, 18, 36))).clip(1e-6, 0.03)
        q[d] = field
print("wrote", sorted(f for f in os.listdir(out) if f.endswith(".nc")))
