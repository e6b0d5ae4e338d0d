"""SSIM map with missing cells by normalised convolution, re-implemented in float64 with
numpy/scipy from the documented form (Wang et al. 2004 eq. 13, Gaussian window sigma 1.5
truncated at 3.5 sigma, K1 = 0.01, K2 = 0.03, population moments; Knutsson & Westin 1993 for
normalised convolution): every local moment is the Gaussian-filtered product over the cells
valid in both fields divided by the filtered validity mask; a cell missing in either field, or
whose valid window weight is below 0.5, gets NaN. Rows reflect (scipy's half-sample 'reflect');
columns reflect or wrap.

usage: ssim_masked_reference.py A.bin B.bin ROWS COLUMNS DATA_RANGE reflect|wrap OUT.bin"""
import sys

import numpy as np
from scipy.ndimage import gaussian_filter

a_path, b_path, rows, columns, data_range, x_mode, out = (sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]),
                                                          float(sys.argv[5]), sys.argv[6], sys.argv[7])
x = np.fromfile(a_path, dtype="<f8").reshape(rows, columns)
y = np.fromfile(b_path, dtype="<f8").reshape(rows, columns)
valid = ~(np.isnan(x) | np.isnan(y))
m = valid.astype(np.float64)
x0 = np.where(valid, x, 0.0)
y0 = np.where(valid, y, 0.0)


def smooth(field):
    return gaussian_filter(field, sigma=1.5, truncate=3.5, mode=("reflect", x_mode))


w = smooth(m)
with np.errstate(divide="ignore", invalid="ignore"):
    mx, my = smooth(x0) / w, smooth(y0) / w
    vx = smooth(x0 * x0) / w - mx * mx
    vy = smooth(y0 * y0) / w - my * my
    cxy = smooth(x0 * y0) / w - mx * my
    c1, c2 = (0.01 * data_range) ** 2, (0.03 * data_range) ** 2
    ssim = (2 * mx * my + c1) * (2 * cxy + c2) / ((mx * mx + my * my + c1) * (vx + vy + c2))
ssim[~valid | (w < 0.5)] = np.nan
ssim.astype("<f8").tofile(out)
