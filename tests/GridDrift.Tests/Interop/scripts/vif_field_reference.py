"""VIF terms as cell maps over a whole field, in numpy/scipy float64, written from the region
form's description in docs/methods.md (independently of GridDrift's code): values rescaled to
0..255 over the data range; cells missing in either field take that field's mean of the cells
valid in both; at scale s = 1..4 the window is the normalised Gaussian of N = 2**(5-s)+1 taps
with sigma = N/5; from the second scale on both images are filtered ('same' size) and every
second row and column kept (x[::2, ::2]); the local moments are 'same'-size filters; x edges
wrap when PERIODIC is 1 and reflect half-sample otherwise (scipy.ndimage mode 'wrap' /
'reflect'), y edges reflect; the information terms use sigma_nsq = 2 and the 1e-10 guards of
Sheikh & Bovik's released code, and the terms of scale s are added to cell (2**(s-1)*J,
2**(s-1)*I). Missing cells get NaN.

usage: vif_field_reference.py A.bin B.bin ROWS COLUMNS LOW HIGH PERIODIC NUM_OUT.bin DEN_OUT.bin"""
import sys

import numpy as np
from scipy.ndimage import correlate1d


def kernel(n):
    sigma = n / 5.0
    r = n // 2
    x = np.arange(-r, r + 1)
    w = np.exp(-0.5 * x * x / (sigma * sigma))
    return w / w.sum()


def smooth(field, w, periodic):
    field = correlate1d(field, w, axis=1, mode="wrap" if periodic else "reflect")
    return correlate1d(field, w, axis=0, mode="reflect")


def terms(x, y, w, periodic):
    mu1, mu2 = smooth(x, w, periodic), smooth(y, w, periodic)
    s1 = np.maximum(smooth(x * x, w, periodic) - mu1 * mu1, 0)
    s2 = np.maximum(smooth(y * y, w, periodic) - mu2 * mu2, 0)
    s12 = smooth(x * y, w, periodic) - mu1 * mu2
    g = s12 / (s1 + 1e-10)
    sv = s2 - g * s12
    flat1 = s1 < 1e-10
    g[flat1] = 0
    sv[flat1] = s2[flat1]
    s1[flat1] = 0
    flat2 = s2 < 1e-10
    g[flat2] = 0
    sv[flat2] = 0
    negative = g < 0
    sv[negative] = s2[negative]
    g[negative] = 0
    sv[sv <= 1e-10] = 1e-10
    return np.log10(1 + g * g * s1 / (sv + 2.0)), np.log10(1 + s1 / 2.0)


a_path, b_path = sys.argv[1], sys.argv[2]
rows, columns = int(sys.argv[3]), int(sys.argv[4])
low, high, periodic = float(sys.argv[5]), float(sys.argv[6]), sys.argv[7] == "1"
a = np.fromfile(a_path, dtype="<f8").reshape(rows, columns)
b = np.fromfile(b_path, dtype="<f8").reshape(rows, columns)
valid = ~(np.isnan(a) | np.isnan(b))
x = (a - low) * 255 / (high - low)
y = (b - low) * 255 / (high - low)
x[~valid] = x[valid].mean()
y[~valid] = y[valid].mean()
num = np.zeros((rows, columns))
den = np.zeros((rows, columns))
for s in range(1, 5):
    n = 2 ** (5 - s) + 1
    w = kernel(n)
    if s > 1:
        x = smooth(x, w, periodic)[::2, ::2]
        y = smooth(y, w, periodic)[::2, ::2]
    tn, td = terms(x, y, w, periodic)
    step = 2 ** (s - 1)
    num[::step, ::step][: tn.shape[0], : tn.shape[1]] += tn
    den[::step, ::step][: td.shape[0], : td.shape[1]] += td
num[~valid] = np.nan
den[~valid] = np.nan
num.astype("<f8").tofile(sys.argv[8])
den.astype("<f8").tofile(sys.argv[9])
