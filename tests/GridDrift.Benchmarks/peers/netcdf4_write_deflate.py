"""Makes the deflate netCDF-4 copy of the benchmark record with python netCDF4: one chunk per
frame, deflate level 1 with shuffle (a common production setting). Values are invented."""
import sys

import netCDF4
import numpy as np

path, frames, nlat, nlon = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4])
rng = np.random.default_rng(1)
lat = np.linspace(-90, 90, nlat)
lon = np.arange(nlon) * 360.0 / nlon
with netCDF4.Dataset(path, "w", format="NETCDF4") as ds:
    ds.createDimension("time", None)
    ds.createDimension("lat", nlat)
    ds.createDimension("lon", nlon)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "hours since 2031-01-01"
    ds.createVariable("lat", "f4", ("lat",))[:] = lat
    ds.createVariable("lon", "f4", ("lon",))[:] = lon
    v = ds.createVariable("tb", "f4", ("time", "lat", "lon"), zlib=True, complevel=1, shuffle=True,
                          chunksizes=(1, nlat, nlon), fill_value=np.float32(-999))
    v.units = "K"
    phi = np.deg2rad(lat)[:, None]
    lam = np.deg2rad(lon)[None, :]
    for i in range(frames):
        t[i] = i
        v[i] = (240 + 20 * np.cos(phi) + 5 * np.sin(3 * lam - i / 10) + rng.normal(0, 0.5, (nlat, nlon))).astype("f4")
