"""The times of a file inside a window [START, END) (either end may be ".."), decoded by cftime in
the file's own calendar, as ISO strings, one JSON list.

usage: period_times.py FILE TIMEVAR START END   (START/END as YYYY-MM-DD or YYYY-MM-DDTHH:MM)"""
import json
import sys

import cftime
import netCDF4

path, name, start, end = sys.argv[1:5]
with netCDF4.Dataset(path) as ds:
    t = ds[name]
    calendar = getattr(t, "calendar", "standard")
    times = cftime.num2date(t[:], t.units, calendar)


def bound(text):
    if text == "..":
        return None
    date, _, clock = text.partition("T")
    y, m, d = (int(x) for x in date.split("-"))
    hh, mm = (int(x) for x in (clock or "00:00").split(":")[:2])
    return cftime.datetime(y, m, d, hh, mm, calendar=calendar)


lo, hi = bound(start), bound(end)
print(json.dumps([x.isoformat() for x in times if (lo is None or x >= lo) and (hi is None or x < hi)]))
