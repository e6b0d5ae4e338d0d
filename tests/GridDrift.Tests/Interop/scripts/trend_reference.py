"""Trend references for a series read as JSON {"t": [...], "x": [...]} on stdin.

scipy.stats.kendalltau(t, x) gives tau (tau-b; without ties S = tau n(n-1)/2); the textbook
tie-corrected Var(S) = [n(n-1)(2n+5) - sum t(t-1)(2t+5)]/18 and the continuity-corrected
normal p (2 norm.sf |z|) are computed here with numpy and scipy; scipy.stats.theilslopes(x, t, 0.95)
gives Sen's slope, intercept and confidence bounds. Prints JSON.
"""
import sys, json
import numpy as np
from scipy import stats

d = json.load(sys.stdin)
t, x = np.array(d["t"], float), np.array(d["x"], float)
n = len(x)
tau, _ = stats.kendalltau(t, x)
s = sum(np.sign(x[j] - x[i]) for i in range(n) for j in range(i + 1, n))
_, counts = np.unique(x, return_counts=True)
var = (n * (n - 1) * (2 * n + 5) - sum(c * (c - 1) * (2 * c + 5) for c in counts)) / 18.0
z = (s - np.sign(s)) / np.sqrt(var)
p = 2 * stats.norm.sf(abs(z))
sen = stats.theilslopes(x, t, 0.95)
print(json.dumps({"tau": tau, "s_bruteforce": float(s), "var_s": var, "z": z, "p": p,
                  "sen_slope": sen.slope, "sen_intercept": sen.intercept, "sen_low": sen.low_slope, "sen_high": sen.high_slope}))
