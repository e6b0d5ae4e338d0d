"""Read each file named in LIST (from line SKIP on) with python netCDF4, raw (no masking or scaling), and print one
JSON line per file: {"file": ..., "error": true} when netCDF4 refuses it, else per root variable
its shape, the sum of its finite values, the count of non-finite ones, and its attributes.

usage: mutant_digests.py LIST [SKIP]"""
import json
import sys
import warnings

import netCDF4
import numpy as np

warnings.simplefilter("ignore")
skip = int(sys.argv[2]) if len(sys.argv) > 2 else 0
for path in open(sys.argv[1]).read().split("\n")[skip:]:
    if not path:
        continue
    out = {"file": path}
    try:
        with netCDF4.Dataset(path) as ds:
            ds.set_auto_maskandscale(False)
            variables = {}
            for name, v in ds.variables.items():
                if int(np.prod(v.shape, dtype=np.float64)) > 2 ** 24:
                    # a corrupt length can ask for terabytes; no seed holds more than this (GridDrift's side refuses the same)
                    raise ValueError("larger than any seed")
                if v.dtype == str or v.dtype.kind in "SUO":
                    values = [str(x) for x in np.ravel(v[:])]
                    variables[name] = {"shape": list(v.shape), "text": values}
                    continue
                a = np.asarray(v[:], dtype="f8")
                finite = np.isfinite(a)
                variables[name] = {"shape": list(a.shape), "sum": float(a[finite].sum()), "nonfinite": int((~finite).sum()),
                                   "attrs": sorted(v.ncattrs())}
            out["variables"] = variables
    except Exception:
        out["error"] = True
    print(json.dumps(out), flush=True)
