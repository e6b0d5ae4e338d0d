"""numpy least squares of a series on a constant, a linear trend and three annual harmonics.

Reads JSON {"days": [...], "x": [...]} on stdin; the design is 1, (t - t0)/(t_last - t0),
cos(2 pi k t / 365.2425), sin(2 pi k t / 365.2425) for k = 1..3, solved by numpy.linalg.lstsq.
Prints JSON {"residuals": [...]}.
"""
import sys, json
import numpy as np

d = json.load(sys.stdin)
t, x = np.array(d["days"], float), np.array(d["x"], float)
cols = [np.ones_like(t), (t - t[0]) / (t[-1] - t[0])]
for k in range(1, 4):
    cols += [np.cos(2 * np.pi * k * t / 365.2425), np.sin(2 * np.pi * k * t / 365.2425)]
a = np.column_stack(cols)
beta, *_ = np.linalg.lstsq(a, x, rcond=None)
print(json.dumps({"residuals": (x - a @ beta).tolist()}))
