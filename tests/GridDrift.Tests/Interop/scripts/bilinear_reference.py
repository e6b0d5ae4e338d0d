"""scipy.interpolate.RegularGridInterpolator (linear) on a global lat-lon field, read as JSON
{"lat": [...], "lon": [...], "field": [[...]...], "points": [[lat, lon], ...]} on stdin.
Longitude is made periodic by padding one column on each side (lon - 360 and lon + 360).
Prints JSON {"values": [...]}."""
import sys, json
import numpy as np
from scipy.interpolate import RegularGridInterpolator

d = json.load(sys.stdin)
lat, lon, f = np.array(d["lat"]), np.array(d["lon"]), np.array(d["field"])
lon_p = np.concatenate([[lon[-1] - 360], lon, [lon[0] + 360]])
f_p = np.concatenate([f[:, -1:], f, f[:, :1]], axis=1)
interp = RegularGridInterpolator((lat, lon_p), f_p, method="linear")
print(json.dumps({"values": interp(np.array(d["points"])).tolist()}))
