"""Make GridDrift's small CF sample files. Everything here is INVENTED: a fictional 2031 record
on coarse grids, for examples and first runs, not observations of any real atmosphere.

    /usr/bin/python3 cf-samples/make_samples.py cf-samples

needs Debian's python3-netcdf4 and python3-numpy; the GRIB sample also python3-eccodes and the
Zarr sample python3-zarr (each is skipped, saying so, where its module is missing). The output is
deterministic (fixed seed).
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
# 3. Brightness temperature on a Gaussian grid (uneven latitudes), 6-hourly, CDF-5.
glat = np.rad2deg(np.arcsin(np.polynomial.legendre.leggauss(32)[0]))[::-1]  # N16: 32 Gaussian latitudes, north to south
with netCDF4.Dataset(os.path.join(out, "tb_gaussian_2031.nc"), "w", format="NETCDF3_64BIT_DATA") as ds:
    provenance(ds, "Synthetic 6.2 um water-vapour-channel brightness temperature on a Gaussian N16 grid (invented)")
    ds.createDimension("time", None)
    ds.createDimension("lat", glat.size)
    ds.createDimension("lon", 64)
    t = ds.createVariable("time", "f8", ("time",))
    t.standard_name = "time"
    t.units = "hours since 2031-07-01 00:00:00"
    t.calendar = "proleptic_gregorian"
    lat = ds.createVariable("lat", "f8", ("lat",))
    lat.standard_name = "latitude"
    lat.units = "degrees_north"
    lat[:] = glat
    lon = ds.createVariable("lon", "f8", ("lon",))
    lon.standard_name = "longitude"
    lon.units = "degrees_east"
    lon[:] = np.arange(64) * 5.625
    tb = ds.createVariable("tb", "f4", ("time", "lat", "lon"), fill_value=np.float32(-999.0))
    tb.standard_name = "toa_brightness_temperature"
    tb.long_name = "water-vapour-channel brightness temperature (synthetic)"
    tb.units = "K"
    phi = np.deg2rad(glat)[:, None]
    lam = np.deg2rad(lon[:])[None, :]
    for i in range(8):
        t[i] = 6 * i
        tb[i] = (228 + 14 * np.sin(phi) ** 2 + 4 * np.sin(2 * lam - i / 3) * np.cos(phi) + rng.normal(0, 0.7, (32, 64))).astype("f4")

# 4. Specific humidity on a curvilinear (rotated) grid, daily, 360_day model calendar.
ny, nx = 30, 40
yy, xx = np.meshgrid(np.linspace(-15, 15, ny), np.linspace(-20, 20, nx), indexing="ij")
pole_lat, pole_lon = np.deg2rad(39.25), np.deg2rad(-162.0)  # a rotated pole putting the domain over Europe
ry, rx = np.deg2rad(yy), np.deg2rad(xx)
glat2 = np.arcsin(np.sin(ry) * np.sin(pole_lat) + np.cos(ry) * np.cos(rx) * np.cos(pole_lat))
glon2 = pole_lon + np.pi - np.arctan2(np.cos(ry) * np.sin(rx),
                                      np.sin(ry) * np.cos(pole_lat) - np.cos(ry) * np.cos(rx) * np.sin(pole_lat))
glat2, glon2 = np.rad2deg(glat2), (np.rad2deg(glon2) + 180) % 360 - 180
with netCDF4.Dataset(os.path.join(out, "q_curvilinear_360day.nc"), "w", format="NETCDF4_CLASSIC") as ds:
    provenance(ds, "Synthetic regional-model specific humidity on a rotated-pole grid, 360_day calendar (invented)")
    ds.createDimension("time", None)
    ds.createDimension("rlat", ny)
    ds.createDimension("rlon", nx)
    t = ds.createVariable("time", "f8", ("time",))
    t.standard_name = "time"
    t.units = "days since 2031-02-27"
    t.calendar = "360_day"
    la = ds.createVariable("lat", "f4", ("rlat", "rlon"))
    la.standard_name = "latitude"
    la.units = "degrees_north"
    la[:] = glat2
    lo = ds.createVariable("lon", "f4", ("rlat", "rlon"))
    lo.standard_name = "longitude"
    lo.units = "degrees_east"
    lo[:] = glon2
    q = ds.createVariable("huss", "f4", ("time", "rlat", "rlon"), fill_value=np.float32(1e20))
    q.standard_name = "specific_humidity"
    q.units = "1"
    q.coordinates = "lat lon"
    for d in range(5):  # 27, 28, 29, 30 February, then 1 March: 360_day months have 30 days
        t[d] = d
        q[d] = (0.004 + 0.006 * np.cos(np.deg2rad(glat2)) ** 2 + rng.normal(0, 2e-4, (ny, nx))).astype("f4")

# 5. Brightness temperature in geostationary scan angles (CF grid_mapping geostationary), netCDF-4.
n = 64
scan = (np.arange(n) - (n - 1) / 2) * (2 * 0.1535 / n)  # just beyond the Earth's disk (+-0.151 rad)
with netCDF4.Dataset(os.path.join(out, "tb_geostationary_2031.nc"), "w", format="NETCDF4") as ds:
    provenance(ds, "Synthetic geostationary water-vapour-channel brightness temperature, full disk at 0 deg E (invented)")
    ds.createDimension("time", None)
    ds.createDimension("y", n)
    ds.createDimension("x", n)
    t = ds.createVariable("time", "f8", ("time",))
    t.standard_name = "time"
    t.units = "minutes since 2031-01-01 00:00:00"
    x = ds.createVariable("x", "f8", ("x",))
    x.standard_name = "projection_x_angular_coordinate"
    x.units = "rad"
    x.axis = "X"
    x[:] = scan
    y = ds.createVariable("y", "f8", ("y",))
    y.standard_name = "projection_y_angular_coordinate"
    y.units = "rad"
    y.axis = "Y"
    y[:] = scan[::-1]  # north at the top
    gm = ds.createVariable("geostationary", "i4")
    gm.grid_mapping_name = "geostationary"
    gm.perspective_point_height = 35785831.0
    gm.semi_major_axis = 6378137.0
    gm.semi_minor_axis = 6356752.31414
    gm.longitude_of_projection_origin = 0.0
    gm.sweep_angle_axis = "y"
    tb = ds.createVariable("tb", "f4", ("time", "y", "x"), fill_value=np.float32(-999.0), zlib=True)
    tb.standard_name = "toa_brightness_temperature"
    tb.units = "K"
    tb.grid_mapping = "geostationary"
    X, Y = np.meshgrid(scan, scan[::-1])
    on_disk = (X / 0.1512) ** 2 + (Y / 0.1507) ** 2 < 1
    for i in range(6):
        t[i] = 15 * i
        f = (235 + 10 * np.cos(8 * Y) + 3 * np.sin(10 * X - i / 2) + rng.normal(0, 0.5, (n, n))).astype("f4")
        tb[i] = np.ma.masked_where(~on_disk, f)

# 6. The same invented total column water vapour as GRIB 2, as an archive delivers it: the first
#    two days of sample 1 (6-hourly, validity time = reference time + step), with specific
#    humidity on 850, 700 and 500 hPa; 16-bit simple packing, missing cells in a bitmap.
try:
    import eccodes
except ImportError:
    print("skipped tcwv_synthetic_2031.grib2: needs python3-eccodes")
    eccodes = None
if eccodes is not None:
    with netCDF4.Dataset(os.path.join(out, "tcwv_synthetic_2031.nc")) as src, open(os.path.join(out, "tcwv_synthetic_2031.grib2"), "wb") as f:
        tcwv = src["tcwv"][:16:2]  # 6-hourly, two days
        lat = src["lat"][:]
        for k in range(tcwv.shape[0]):
            hour = 6 * k
            for short, level_type, level in [("tcwv", "entireAtmosphere", 0), ("q", "isobaricInhPa", 850), ("q", "isobaricInhPa", 700), ("q", "isobaricInhPa", 500)]:
                h = eccodes.codes_grib_new_from_samples("regular_ll_pl_grib2" if short == "q" else "regular_ll_sfc_grib2")
                eccodes.codes_set_long(h, "Ni", 72)
                eccodes.codes_set_long(h, "Nj", 36)
                eccodes.codes_set(h, "latitudeOfFirstGridPointInDegrees", 87.5)
                eccodes.codes_set(h, "latitudeOfLastGridPointInDegrees", -87.5)
                eccodes.codes_set(h, "longitudeOfFirstGridPointInDegrees", 2.5)
                eccodes.codes_set(h, "longitudeOfLastGridPointInDegrees", 357.5)
                eccodes.codes_set(h, "iDirectionIncrementInDegrees", 5.0)
                eccodes.codes_set(h, "jDirectionIncrementInDegrees", 5.0)
                eccodes.codes_set_long(h, "jScansPositively", 0)
                # reference times every 12 h, steps 0 and 6 h
                eccodes.codes_set(h, "dataDate", 20310101 + (hour // 24))
                eccodes.codes_set(h, "dataTime", (hour % 24) // 12 * 1200)
                eccodes.codes_set(h, "stepRange", str(hour % 12))
                eccodes.codes_set(h, "typeOfLevel", level_type)
                if level_type == "isobaricInhPa":
                    eccodes.codes_set(h, "level", level)
                eccodes.codes_set(h, "shortName", short)
                eccodes.codes_set_long(h, "bitsPerValue", 16)
                field = tcwv[k][::-1]  # north to south
                if short == "q":
                    values = 0.0004 * np.ma.filled(field, 20.0) * (level / 1000.0) ** 3
                    eccodes.codes_set_values(h, values.astype("f8").ravel())
                else:
                    eccodes.codes_set(h, "bitmapPresent", 1)
                    eccodes.codes_set(h, "missingValue", 9999)
                    eccodes.codes_set_values(h, np.ma.filled(field.astype("f8"), 9999).ravel())
                eccodes.codes_write(h, f)
                eccodes.codes_release(h)

# 7. The same invented record as a Zarr v2 store, as analysis-ready copies are kept: sample 1's
#    first five days, chunks of 8 frames, zlib, xarray's dimension names, consolidated metadata.
try:
    import numcodecs
    import zarr
except ImportError:
    print("skipped tcwv_synthetic_2031.zarr: needs python3-zarr")
    zarr = None
if zarr is not None:
    store = os.path.join(out, "tcwv_synthetic_2031.zarr")
    with netCDF4.Dataset(os.path.join(out, "tcwv_synthetic_2031.nc")) as src:
        root = zarr.open_group(store, mode="w")
        root.attrs.update({k: src.getncattr(k) for k in src.ncattrs()})
        root.attrs["history"] = "created by cf-samples/make_samples.py"
        for name in ("time", "lat", "lon", "tcwv"):
            var = src[name]
            var.set_auto_mask(False)
            data = var[:40] if name in ("time", "tcwv") else var[:]
            if name == "tcwv":
                data = np.where(data == var._FillValue, np.nan, data).astype("f4")
            chunks = (8, 36, 72) if name == "tcwv" else data.shape
            array = root.create_dataset(name, data=data, chunks=chunks, compressor=numcodecs.Zlib(level=6),
                                        fill_value=np.nan if name == "tcwv" else None)
            attrs = {k: var.getncattr(k) for k in var.ncattrs() if k not in ("_FillValue", "bounds")}
            array.attrs.update({k: (v.item() if hasattr(v, "item") else v) for k, v in attrs.items()})
            array.attrs["_ARRAY_DIMENSIONS"] = list(var.dimensions)
    zarr.consolidate_metadata(store)

print("wrote", sorted(f for f in os.listdir(out) if f.endswith((".nc", ".grib2", ".zarr"))))
