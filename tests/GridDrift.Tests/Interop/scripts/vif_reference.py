"""Pixel-domain multi-scale VIF re-implemented in numpy/scipy from the algorithm of Sheikh &
Bovik (2006) as the authors' released code vifp_mscale.m computes it (written from that code's
published description, independently of GridDrift): 4 scales, N = 2**(5-s)+1, sigma = N/5,
'valid' 2-D filtering with the normalised Gaussian window, decimation by 2 after filtering
from the second scale on, sigma_nsq = 2, the 1e-10 guards.

usage: vif_reference.py REF.bin DIST.bin ROWS COLUMNS   (values already on 0..255)"""
import sys

import numpy as np
from scipy.signal import correlate2d


def window(n, sigma):
    r = (n - 1) / 2
    x = np.arange(-r, r + 1)
    g = np.exp(-(x[:, None] ** 2 + x[None, :] ** 2) / (2 * sigma ** 2))
    return g / g.sum()


def vifp(ref, dist):
    sigma_nsq = 2.0
    num = den = 0.0
    for scale in range(1, 5):
        n = 2 ** (4 - scale + 1) + 1
        win = window(n, n / 5.0)
        if scale > 1:
            ref = correlate2d(ref, win, mode="valid")[::2, ::2]
            dist = correlate2d(dist, win, mode="valid")[::2, ::2]
        mu1 = correlate2d(ref, win, mode="valid")
        mu2 = correlate2d(dist, win, mode="valid")
        sigma1_sq = correlate2d(ref * ref, win, mode="valid") - mu1 * mu1
        sigma2_sq = correlate2d(dist * dist, win, mode="valid") - mu2 * mu2
        sigma12 = correlate2d(ref * dist, win, mode="valid") - mu1 * mu2
        sigma1_sq[sigma1_sq < 0] = 0
        sigma2_sq[sigma2_sq < 0] = 0
        g = sigma12 / (sigma1_sq + 1e-10)
        sv_sq = sigma2_sq - g * sigma12
        g[sigma1_sq < 1e-10] = 0
        sv_sq[sigma1_sq < 1e-10] = sigma2_sq[sigma1_sq < 1e-10]
        sigma1_sq[sigma1_sq < 1e-10] = 0
        g[sigma2_sq < 1e-10] = 0
        sv_sq[sigma2_sq < 1e-10] = 0
        sv_sq[g < 0] = sigma2_sq[g < 0]
        g[g < 0] = 0
        sv_sq[sv_sq <= 1e-10] = 1e-10
        num += np.sum(np.log10(1 + g ** 2 * sigma1_sq / (sv_sq + sigma_nsq)))
        den += np.sum(np.log10(1 + sigma1_sq / sigma_nsq))
    return num / den


rows, columns = int(sys.argv[3]), int(sys.argv[4])
ref = np.fromfile(sys.argv[1], dtype="<f8").reshape(rows, columns)
dist = np.fromfile(sys.argv[2], dtype="<f8").reshape(rows, columns)
print(repr(float(vifp(ref, dist))))
