"""Decode CF time values with cftime (the calendar library under python netCDF4): the witness for
GridDrift's calendar arithmetic. Reads 'CALENDAR|UNITS|v1,v2,...' lines on stdin, prints one line
of ISO 8601 dates per input line."""
import sys

import cftime

for line in sys.stdin:
    line = line.strip()
    if not line:
        continue
    calendar, units, values = line.split("|")
    nums = [float(v) for v in values.split(",")]
    dates = cftime.num2date(nums, units, calendar=calendar)
    print(",".join(d.strftime("%Y-%m-%dT%H:%M:%S") for d in dates))
