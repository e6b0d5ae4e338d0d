"""Peers for the similarity benchmark, on 721 x 1440 float32 frame pairs: scikit-image's
structural_similarity (Gaussian window, sigma 1.5, population covariance, fixed data range,
full map), and a numpy/scipy pixel-domain multi-scale VIF (scipy.ndimage separable Gaussian
filtering, 'valid' crops), each the fastest of several timed pairs. Prints seconds per SSIM pair and
per VIF pair."""
import sys
import time

import numpy as np
from scipy.ndimage import correlate1d
from skimage.metrics import structural_similarity

pairs = int(sys.argv[1])
rng = np.random.default_rng(5)
a = (240 + 20 * rng.standard_normal((721, 1440))).astype("f4")
b = (a + rng.standard_normal((721, 1440))).astype("f4")

def fastest(run, times):
    """The shortest of several timed calls: on a shared machine, noise only ever adds time."""
    best = float("inf")
    for _ in range(times):
        start = time.perf_counter()
        run()
        best = min(best, time.perf_counter() - start)
    return best


ssim = fastest(lambda: structural_similarity(a, b, gaussian_weights=True, sigma=1.5, use_sample_covariance=False, data_range=140.0, full=True), pairs)


def window(n):
    s = n / 5.0
    x = np.arange(n) - (n - 1) / 2
    g = np.exp(-x ** 2 / (2 * s * s))
    return g / g.sum()


def valid(x, w):
    r = len(w) // 2
    y = correlate1d(correlate1d(x, w, axis=0, mode="constant"), w, axis=1, mode="constant")
    return y[r:-r, r:-r]


def vifp(ref, dist):
    num = den = 0.0
    for scale in range(1, 5):
        w = window(2 ** (5 - scale) + 1)
        if scale > 1:
            ref = valid(ref, w)[::2, ::2]
            dist = valid(dist, w)[::2, ::2]
        mu1, mu2 = valid(ref, w), valid(dist, w)
        s1 = np.maximum(valid(ref * ref, w) - mu1 * mu1, 0)
        s2 = np.maximum(valid(dist * dist, w) - mu2 * mu2, 0)
        s12 = valid(ref * dist, w) - mu1 * mu2
        g = s12 / (s1 + 1e-10)
        sv = s2 - g * s12
        g[s1 < 1e-10] = 0
        sv[s1 < 1e-10] = s2[s1 < 1e-10]
        s1[s1 < 1e-10] = 0
        g[s2 < 1e-10] = 0
        sv[s2 < 1e-10] = 0
        sv[g < 0] = s2[g < 0]
        g[g < 0] = 0
        sv[sv <= 1e-10] = 1e-10
        num += np.log10(1 + g * g * s1 / (sv + 2)).sum()
        den += np.log10(1 + s1 / 2).sum()
    return num / den


ra = (a.astype("f8") - 180) * 255 / 140
rb = (b.astype("f8") - 180) * 255 / 140
vif = fastest(lambda: vifp(ra, rb), max(1, pairs // 2))
print(f"{ssim:.6f} {vif:.6f}")
