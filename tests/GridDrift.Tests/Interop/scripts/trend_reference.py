"""Trend references for a series read as JSON {"t": [...], "x": [...]} on stdin.

scipy.stats.kendalltau(t, x) gives tau (tau-b; without ties S = tau n(n-1)/2); the textbook
tie-corrected Var(S) = [n(n-1)(2n+5) - sum t(t-1)(2t+5)]/18 and the continuity-corrected
normal p are computed here with numpy; scipy.stats.theilslopes(x, t, 0.95) gives Sen's slope,
intercept and confidence bounds; the Hamed & Rao (1998) factor n/n* comes from
statsmodels.tsa.stattools.acf (adjusted=False) of the ranks of the Sen-detrended series,
keeping lags with |rho| > 1.96/sqrt(n). Prints JSON.
"""
import sys, json
import numpy as np
from scipy import stats
from statsmodels.tsa.stattools import acf

d = json.load(sys.stdin)
t, x = np.array(d["t"], float), np.array(d["x"], float)
n = len(x)
tau, _ = stats.kendalltau(t, x)
s = sum(np.sign(x[j] - x[i]) for i in range(n) for j in range(i + 1, n))
_, counts = np.unique(x, return_counts=True)
var = (n * (n - 1) * (2 * n + 5) - sum(c * (c - 1) * (2 * c + 5) for c in counts)) / 18.0
z = (s - np.sign(s)) / np.sqrt(var)
p = 2 * (1 - stats.norm.cdf(abs(z)))
sen = stats.theilslopes(x, t, 0.95)
detrended = x - sen.slope * t
ranks = stats.rankdata(detrended)
rho = acf(ranks, nlags=n - 1, adjusted=False, fft=False)
bound = 1.96 / np.sqrt(n)
total = sum((n - k) * (n - k - 1) * (n - k - 2) * rho[k] for k in range(1, n) if abs(rho[k]) > bound)
factor = 1 + 2.0 / (n * (n - 1) * (n - 2)) * total
print(json.dumps({"tau": tau, "s_bruteforce": float(s), "var_s": var, "z": z, "p": p,
                  "sen_slope": sen.slope, "sen_intercept": sen.intercept, "sen_low": sen.low_slope, "sen_high": sen.high_slope,
                  "hamed_rao_factor": factor}))
