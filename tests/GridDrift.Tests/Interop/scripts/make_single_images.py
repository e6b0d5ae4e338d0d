"""One image per file, as geostationary archives deliver them: the frames of a geostationary
sample, brightness temperature packed as int16 and the x/y scan angles packed as int16 too, each
image in its own file with a scalar time coordinate (CF 5.7) and no time dimension, under names
that do not sort in time order; and the same packed values stacked in one file along time.

usage: make_single_images.py SAMPLE FOLDER"""
import sys

import netCDF4
import numpy as np

sample, folder = sys.argv[1], sys.argv[2]
with netCDF4.Dataset(sample) as src:
    src.set_auto_maskandscale(True)
    tb = src["tb"][:].filled(np.nan).astype("f8")
    x, y = src["x"][:].astype("f8"), src["y"][:].astype("f8")
    times = netCDF4.num2date(src["time"][:], src["time"].units, "standard", only_use_cftime_datetimes=False)
    mapping = {a: src["geostationary"].getncattr(a) for a in src["geostationary"].ncattrs()}
tb_scale, tb_offset = 0.01, 250.0
packed_tb = np.where(np.isnan(tb), -32768, np.round((tb - tb_offset) / tb_scale)).astype("i2")
angle_scale = 5.6e-5
packed_x, packed_y = np.round(x / angle_scale).astype("i2"), np.round(y / angle_scale).astype("i2")
seconds = np.array([(t - times[0]).total_seconds() for t in times]) + 3600.0


def common(ds, dims):
    ds.createDimension("y", len(y))
    ds.createDimension("x", len(x))
    g = ds.createVariable("geostationary", "i4")
    g.setncatts(mapping)
    for name, values in (("x", packed_x), ("y", packed_y)):
        v = ds.createVariable(name, "i2", (name,))
        v.scale_factor = angle_scale
        v.add_offset = 0.0
        v.units = "rad"
        v.standard_name = f"projection_{name}_angular_coordinate"
        v.axis = name.upper()
        v.set_auto_maskandscale(False)
        v[:] = values
    v = ds.createVariable("tb", "i2", dims, fill_value=np.int16(-32768))
    v.scale_factor = tb_scale
    v.add_offset = tb_offset
    v.units = "K"
    v.standard_name = "toa_brightness_temperature"
    v.grid_mapping = "geostationary"
    v.set_auto_maskandscale(False)
    return v


with netCDF4.Dataset(f"{folder}/stacked.nc", "w", format="NETCDF3_64BIT_OFFSET") as ds:
    ds.createDimension("time", None)
    t = ds.createVariable("time", "f8", ("time",))
    t.units = "seconds since 2031-01-01 00:00:00"
    t.standard_name = "time"
    t[:] = seconds
    v = common(ds, ("time", "y", "x"))
    v[:] = packed_tb
order = np.random.default_rng(4).permutation(len(seconds))
for rank, k in enumerate(order):
    with netCDF4.Dataset(f"{folder}/scan_{rank:03d}_{(k * 7919) % 1000:03d}.nc", "w", format="NETCDF4") as ds:
        t = ds.createVariable("t", "f8")
        t.units = "seconds since 2031-01-01 00:00:00"
        t.standard_name = "time"
        t[...] = seconds[k]
        v = common(ds, ("y", "x"))
        v.coordinates = "t"
        v[:] = packed_tb[k]
print("ok")
