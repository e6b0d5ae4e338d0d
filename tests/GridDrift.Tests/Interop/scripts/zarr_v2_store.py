"""An invented CF record as a Zarr v2 store, written by python3-zarr (Debian) with one compressor,
then read back by python3-zarr as the witness.

The store: time (float64, hours since 2031-01-01), lat (float32, 25 rows, north to south),
lon (float32, 144 columns), tcwv (float32, time x lat x lon, chunks of 3 x 13 x 72 so edge
chunks are partial, fill value NaN, a few cells NaN, one chunk never written) and q (big-endian
int16 packed with scale_factor, chunks of one frame, '/' as the key separator).

usage: zarr_v2_store.py STORE COMPRESSOR CONSOLIDATE(0|1) OUT.bin
COMPRESSOR: none zlib gzip zstd lz4 blosc-lz4-shuffle blosc-zstd-bitshuffle blosc-zlib-noshuffle blosc-blosclz-shuffle
OUT.bin: tcwv then q's stored integers, as little-endian float64, as python3-zarr reads them."""
import sys

import numcodecs
import numpy as np
import zarr

store_path, name, consolidate, out = sys.argv[1], sys.argv[2], sys.argv[3] == "1", sys.argv[4]
if name == "none":
    compressor = None
elif name == "zlib":
    compressor = numcodecs.Zlib(level=4)
elif name == "gzip":
    compressor = numcodecs.GZip(level=4)
elif name == "zstd":
    compressor = numcodecs.Zstd(level=3)
elif name == "lz4":
    compressor = numcodecs.LZ4()
elif name.startswith("blosc-"):
    _, cname, shuffle = name.split("-")
    compressor = numcodecs.Blosc(cname=cname, clevel=5, shuffle={"noshuffle": 0, "shuffle": 1, "bitshuffle": 2}[shuffle])
else:
    raise SystemExit("unknown compressor " + name)

nt, ny, nx = 7, 25, 144
root = zarr.open_group(store_path, mode="w")
root.attrs.update({"title": "invented water-vapour record (synthetic)", "Conventions": "CF-1.8"})
time = root.create_dataset("time", data=np.arange(nt) * 6.0, chunks=(nt,), compressor=compressor)
time.attrs.update({"_ARRAY_DIMENSIONS": ["time"], "units": "hours since 2031-01-01 00:00:00", "calendar": "standard", "standard_name": "time"})
lat = root.create_dataset("lat", data=np.linspace(60, -60, ny).astype("f4"), chunks=(ny,), compressor=compressor)
lat.attrs.update({"_ARRAY_DIMENSIONS": ["lat"], "units": "degrees_north", "standard_name": "latitude"})
lon = root.create_dataset("lon", data=(np.arange(nx) * 2.5).astype("f4"), chunks=(nx,), compressor=compressor)
lon.attrs.update({"_ARRAY_DIMENSIONS": ["lon"], "units": "degrees_east", "standard_name": "longitude"})

t, y, x = np.meshgrid(np.arange(nt), np.arange(ny), np.arange(nx), indexing="ij")
field = (25 + 15 * np.cos(np.deg2rad(60 - 5 * y)) * np.sin(x / 9.0) + 0.7 * t + 0.01 * x).astype("f4")
field[2, 4, 10:20] = np.nan
tcwv = root.create_dataset("tcwv", shape=field.shape, chunks=(3, 13, 72), dtype="f4", fill_value=np.nan, compressor=compressor)
tcwv.attrs.update({"_ARRAY_DIMENSIONS": ["time", "lat", "lon"], "units": "kg m-2",
                   "standard_name": "atmosphere_mass_content_of_water_vapor", "long_name": "total column water vapour (invented)"})
tcwv[:] = field
q = root.create_dataset("q", shape=field.shape, chunks=(1, ny, nx), dtype=">i2", fill_value=-32767, compressor=compressor,
                        dimension_separator="/")
q.attrs.update({"_ARRAY_DIMENSIONS": ["time", "lat", "lon"], "units": "kg kg-1", "scale_factor": 0.0001, "add_offset": 0.0})
q[:] = np.where(np.isnan(field), -32767, np.round(field * 10)).astype(">i2")
if consolidate:
    zarr.consolidate_metadata(store_path)

# one chunk never written: the readers must give the fill value there
store = zarr.DirectoryStore(store_path)
del store["tcwv/2.1.1"]
back = zarr.open_group(store_path, mode="r")
np.concatenate([np.asarray(back["tcwv"][:], dtype="<f8").ravel(), np.asarray(back["q"][:], dtype="<f8").ravel()]).tofile(out)

# the same record as NetCDF, written by netCDF4-python from the values python3-zarr reads back
if len(sys.argv) > 5:
    import netCDF4

    with netCDF4.Dataset(sys.argv[5], "w", format="NETCDF4") as nc:
        nc.setncatts(dict(back.attrs))
        for dim, n in (("time", nt), ("lat", ny), ("lon", nx)):
            nc.createDimension(dim, n)
        for name in ("time", "lat", "lon", "tcwv", "q"):
            array = back[name]
            attrs = {k: v for k, v in array.attrs.items() if k != "_ARRAY_DIMENSIONS"}
            dtype = array.dtype.newbyteorder("=")
            fill = array.fill_value if name in ("tcwv", "q") else None
            var = nc.createVariable(name, dtype, tuple(array.attrs["_ARRAY_DIMENSIONS"]), fill_value=fill)
            var.set_auto_maskandscale(False)
            var.setncatts(attrs)
            var[:] = np.asarray(array[:]).astype(dtype)
