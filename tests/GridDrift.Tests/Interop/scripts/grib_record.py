"""An invented reanalysis record as GRIB, written by ecCodes itself (python3-eccodes, from
ecCodes' own sample templates), then read back by python3-eccodes as the witness.

Messages, in a shuffled order: total column water vapour (tcwv) at the surface and specific
humidity (q) on 850, 700 and 500 hPa, at six validity times reached by two reference times and
their steps; one tcwv field has a bitmap (a box of missing points).

usage: grib_record.py OUT.grib EDITION(1|2) GRID(ll|gg) SCAN(ns|sn) WITNESS.json [COPY.nc]
COPY.nc: the same record as NetCDF, written by netCDF4-python from the values python3-eccodes reads.
WITNESS.json: per message, in file order, what python3-eccodes reads: shortName, typeOfLevel,
level, validityDate, validityTime, the row latitudes and column longitudes, and the values
(missing points as null)."""
import json
import random
import sys

import eccodes
import numpy as np

out_path, edition, grid, scan, witness_path = sys.argv[1], int(sys.argv[2]), sys.argv[3], sys.argv[4], sys.argv[5]
sample = f"regular_{grid}_{'sfc' if grid == 'll' else 'sfc'}_grib{edition}"


def base():
    h = eccodes.codes_grib_new_from_samples(sample)
    if grid == "ll":
        # 5 degree global grid, 37 rows x 72 columns
        eccodes.codes_set_long(h, "Ni", 72)
        eccodes.codes_set_long(h, "Nj", 37)
        eccodes.codes_set(h, "iDirectionIncrementInDegrees", 5.0)
        eccodes.codes_set(h, "jDirectionIncrementInDegrees", 5.0)
        eccodes.codes_set(h, "longitudeOfFirstGridPointInDegrees", 0.0)
        eccodes.codes_set(h, "longitudeOfLastGridPointInDegrees", 355.0)
        first, last = (90.0, -90.0) if scan == "ns" else (-90.0, 90.0)
    else:
        first = eccodes.codes_get(h, "latitudeOfFirstGridPointInDegrees")
        last = eccodes.codes_get(h, "latitudeOfLastGridPointInDegrees")
        if scan == "sn":
            first, last = last, first
    eccodes.codes_set_long(h, "jScansPositively", 0 if scan == "ns" else 1)
    eccodes.codes_set(h, "latitudeOfFirstGridPointInDegrees", first)
    eccodes.codes_set(h, "latitudeOfLastGridPointInDegrees", last)
    if edition == 2:
        eccodes.codes_set_long(h, "bitsPerValue", 16)
    else:
        eccodes.codes_set_long(h, "bitsPerValue", 16)
    return h


messages = []
for reference, steps in (("20310101", (0, 6, 12)), ("20310101T12", (6, 12, 18))):
    date, hour = (reference, 0) if "T" not in reference else (reference.split("T")[0], int(reference.split("T")[1]))
    for step in steps:
        messages.append(("tcwv", "surface", 0, date, hour, step))
        for level in (850, 700, 500):
            messages.append(("q", "isobaricInhPa", level, date, hour, step))
random.Random(7).shuffle(messages)

with open(out_path, "wb") as f:
    for k, (short, level_type, level, date, hour, step) in enumerate(messages):
        h = base()
        eccodes.codes_set(h, "dataDate", int(date))
        eccodes.codes_set(h, "dataTime", hour * 100)
        eccodes.codes_set(h, "stepUnits", "h")
        eccodes.codes_set(h, "stepRange", str(step))
        eccodes.codes_set(h, "typeOfLevel", level_type)
        eccodes.codes_set(h, "level", level)
        eccodes.codes_set(h, "shortName", short)
        ni, nj = eccodes.codes_get(h, "Ni"), eccodes.codes_get(h, "Nj")
        j, i = np.meshgrid(np.arange(nj), np.arange(ni), indexing="ij")
        t = int(hour) + step
        if short == "tcwv":
            values = 20 + 25 * np.cos(np.deg2rad(2.5 * j)) ** 2 + 3 * np.sin(i / 7.0 + t / 10.0)
        else:
            values = (0.002 + 0.01 * np.cos(np.deg2rad(2.5 * j)) ** 2) * (level / 1000.0) ** 2 * (1 + 0.1 * np.sin(i / 5.0 + t / 8.0))
        values = values.ravel()
        if short == "tcwv" and step == 12 and hour == 0:
            eccodes.codes_set(h, "bitmapPresent", 1)
            eccodes.codes_set(h, "missingValue", 9999)
            box = ((j >= 5) & (j < 9) & (i >= 10) & (i < 20)).ravel()
            values = np.where(box, 9999, values)
        eccodes.codes_set_values(h, values)
        eccodes.codes_write(h, f)
        eccodes.codes_release(h)

# the witness: every message as python3-eccodes reads it back
records = []
with open(out_path, "rb") as f:
    while True:
        h = eccodes.codes_grib_new_from_file(f)
        if h is None:
            break
        ni, nj = eccodes.codes_get(h, "Ni"), eccodes.codes_get(h, "Nj")
        lats = eccodes.codes_get_array(h, "latitudes").reshape(nj, ni)[:, 0]
        lons = eccodes.codes_get_array(h, "longitudes").reshape(nj, ni)[0, :]
        eccodes.codes_set(h, "missingValue", 1e300)
        values = eccodes.codes_get_values(h)
        records.append({
            "shortName": eccodes.codes_get(h, "shortName"),
            "cfName": eccodes.codes_get(h, "cfName"),
            "units": eccodes.codes_get(h, "units"),
            "typeOfLevel": eccodes.codes_get(h, "typeOfLevel"),
            "level": eccodes.codes_get(h, "level"),
            "validityDate": eccodes.codes_get(h, "validityDate"),
            "validityTime": eccodes.codes_get(h, "validityTime"),
            "latitudes": [float(x) for x in lats],
            "longitudes": [float(x) for x in lons],
            "values": [None if v == 1e300 else float(v) for v in values],
        })
        eccodes.codes_release(h)
with open(witness_path, "w") as w:
    json.dump(records, w)

if len(sys.argv) > 6:
    import datetime

    import netCDF4

    def valid(r):
        d, t = str(r["validityDate"]), int(r["validityTime"])
        return datetime.datetime(int(d[:4]), int(d[4:6]), int(d[6:]), t // 100, t % 100)

    times = sorted({valid(r) for r in records})
    levels = [850, 700, 500]
    first = records[0]
    lats, lons = first["latitudes"], first["longitudes"]
    with netCDF4.Dataset(sys.argv[6], "w", format="NETCDF4") as nc:
        nc.createDimension("time", len(times))
        nc.createDimension("isobaricInhPa", len(levels))
        nc.createDimension("latitude", len(lats))
        nc.createDimension("longitude", len(lons))
        tv = nc.createVariable("time", "f8", ("time",))
        tv.units, tv.calendar, tv.standard_name = "seconds since 1970-01-01 00:00:00", "proleptic_gregorian", "time"
        tv[:] = [(t - datetime.datetime(1970, 1, 1)).total_seconds() for t in times]
        pv = nc.createVariable("isobaricInhPa", "f8", ("isobaricInhPa",))
        pv.units, pv.positive, pv.axis, pv.standard_name = "hPa", "down", "Z", "air_pressure"
        pv[:] = levels
        la = nc.createVariable("latitude", "f8", ("latitude",))
        la.units, la.standard_name = "degrees_north", "latitude"
        la[:] = lats
        lo = nc.createVariable("longitude", "f8", ("longitude",))
        lo.units, lo.standard_name = "degrees_east", "longitude"
        lo[:] = lons
        tcwv = nc.createVariable("tcwv", "f4", ("time", "latitude", "longitude"), fill_value=np.float32(np.nan))
        q = nc.createVariable("q", "f4", ("time", "isobaricInhPa", "latitude", "longitude"), fill_value=np.float32(np.nan))
        tcwv.units, q.units = "kg m-2", "kg kg-1"
        for r in records:
            field = np.array([np.nan if v is None else v for v in r["values"]], dtype="f4").reshape(len(lats), len(lons))
            t = times.index(valid(r))
            if r["shortName"] == "tcwv":
                tcwv[t] = field
            else:
                q[t, levels.index(r["level"])] = field
