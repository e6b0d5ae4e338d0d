"""Writes an invented record for the climatology tests with python netCDF4 (the reference writer).

usage: make_climatology_fixture.py OUT CALENDAR FORMAT STEP_HOURS YEARS

Times start 2030-01-01 in CALENDAR, every STEP_HOURS hours for YEARS years of that calendar.
The grid is 5 x 7 with DESCENDING latitudes and 0..360 longitudes (orientation the products
must keep). Values: a seasonal and diurnal cycle plus noise, with about 3 % of cells missing
(_FillValue) at random.
"""
import sys
import numpy as np
import netCDF4
import cftime

out, calendar, fmt, step, years = sys.argv[1], sys.argv[2], sys.argv[3], float(sys.argv[4]), int(sys.argv[5])
start = cftime.datetime(2030, 1, 1, calendar=calendar)
end = cftime.datetime(2030 + years, 1, 1, calendar=calendar)
units = "hours since 2030-01-01 00:00:00"
n = int(round(netCDF4.date2num(end, units, calendar) / step))
hours = np.arange(n) * step
lat = np.array([40.0, 20.0, 0.0, -20.0, -40.0])
lon = np.arange(7) * 50.0 + 10.0
rng = np.random.default_rng(7)
with netCDF4.Dataset(out, "w", format=fmt) as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", lat.size)
    ds.createDimension("lon", lon.size)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = units
    t.calendar = calendar
    t.standard_name = "time"
    y = ds.createVariable("lat", "f8", ("lat",)); y.units = "degrees_north"; y.standard_name = "latitude"; y[:] = lat
    x = ds.createVariable("lon", "f8", ("lon",)); x.units = "degrees_east"; x.standard_name = "longitude"; x[:] = lon
    v = ds.createVariable("tcwv", "f4", ("time", "lat", "lon"), fill_value=np.float32(-999.0))
    v.units = "kg m-2"
    v.standard_name = "atmosphere_mass_content_of_water_vapor"
    v.long_name = "total column water vapour (invented)"
    t[:] = hours
    phase = 2 * np.pi * hours / (24 * 365.0)
    diurnal = 2 * np.pi * (hours % 24) / 24
    base = 25 + 10 * np.cos(np.deg2rad(lat))[None, :, None] + 0.01 * lon[None, None, :]
    data = base + 6 * np.sin(phase)[:, None, None] + 1.5 * np.cos(diurnal)[:, None, None] + rng.normal(0, 2, (n, lat.size, lon.size))
    data = np.ma.masked_array(data.astype(np.float32), mask=rng.random(data.shape) < 0.03)
    v[:] = data
