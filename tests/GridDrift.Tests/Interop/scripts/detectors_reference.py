"""numpy references for three outlier detectors on a series read as JSON {"x": [...]} on stdin.

robust z = (x - median) / (1.4826 MAD); Tukey fences from np.percentile (linear, the default)
at 25 and 75; Hampel with a centred window of 2k+1 values (k = 3, shrinking at the ends),
t = 3. Prints JSON lists of scores and of flagged indices.
"""
import sys, json
import numpy as np

x = np.array(json.load(sys.stdin)["x"], float)
med = np.median(x)
mad = np.median(np.abs(x - med))
z = (x - med) / (1.4826 * mad)
q1, q3 = np.percentile(x, [25, 75])
iqr = q3 - q1
tukey = np.where(x < q1, (q1 - x) / iqr, np.where(x > q3, (x - q3) / iqr, 0.0))
k = 3
hampel = []
for i in range(len(x)):
    w = x[max(0, i - k): i + k + 1]
    m = np.median(w)
    s = 1.4826 * np.median(np.abs(w - m))
    hampel.append(abs(x[i] - m) / s if s > 0 else (0.0 if x[i] == m else float("inf")))
hampel = np.array(hampel)
print(json.dumps({
    "robust_z": z.tolist(), "robust_z_flags": np.flatnonzero(np.abs(z) > 3.5).tolist(),
    "tukey": tukey.tolist(), "tukey_flags": np.flatnonzero(tukey > 1.5).tolist(),
    "hampel": [h if np.isfinite(h) else 1e308 for h in hampel], "hampel_flags": np.flatnonzero(hampel > 3).tolist(),
}))
