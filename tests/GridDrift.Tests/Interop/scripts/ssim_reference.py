"""SSIM map by scikit-image (Debian python3-skimage): structural_similarity(gaussian_weights=True,
sigma=1.5, use_sample_covariance=False, data_range=L, full=True) on two float64 fields.

usage: ssim_reference.py A.bin B.bin ROWS COLUMNS DATA_RANGE OUT.bin"""
import sys

import numpy as np
from skimage.metrics import structural_similarity

a_path, b_path, rows, columns, data_range, out = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), float(sys.argv[5]), sys.argv[6]
a = np.fromfile(a_path, dtype="<f8").reshape(rows, columns)
b = np.fromfile(b_path, dtype="<f8").reshape(rows, columns)
mean, full = structural_similarity(a, b, gaussian_weights=True, sigma=1.5, use_sample_covariance=False, data_range=data_range, full=True)
full.astype("<f8").tofile(out)
print(repr(float(mean)))
